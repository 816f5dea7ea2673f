//! Check stage: compile a rule-set, then lint it, reporting everything with
//! the compiler's [`Diagnostic`] type (`file:line:column`, the source line, a
//! caret and a hint).
//!
//! ```text
//! rule file ─compile─▶ errors (as the compiler renders them)
//!           └▶ RuleSet ─lint─▶ warnings:
//!                 unused-class            a class of the file no rule, pattern or class uses
//!                 condition-never-holds   a `when`/`edge` condition no lexicon entry meets
//!                 rule-never-fires        no pair of lexicon words has the rule's ends
//!                 shadowed-rule           every junction of a rule is also one of another rule
//!                 identity-correspondence `[x>class]` maps a member onto itself
//!                 example-join            an example's parts do not join to its surface
//!                 example-split           an example's surface does not split into its parts
//!                 no-lexicon              examples cannot be split: no lexicon loaded
//!                 lexicon-line            a lexicon line was skipped
//! ```
//!
//! Lints that need the lexicon (`condition-never-holds`, `rule-never-fires`)
//! run only when one is loaded (the rule-set's `set lexicon` and `--lexicon`
//! files). Classes are reported unused only in the checked file itself, not in
//! the files it includes: a shared class file is a library.

use crate::analyzer::Analyzer;
use crate::lattice::ScopeFilter;
use crate::lexicon::{condition_holds, conditions_hold, Lexicon, LexiconError, Tags};
use crate::proof;
use crate::rules::ast::{ChangeItem, ClassMember, RuleFile, Span, Statement, LETTERS_KEY};
use crate::rules::parse::parse_file;
use crate::rules::{
    compile_named, CompileOptions, Condition, Diagnostic, Location, RuleSet, Scope, Separator,
    Severity, Side,
};
use serde::Serialize;
use std::collections::{BTreeSet, HashMap, HashSet};
use std::path::PathBuf;

/// The codes of the warnings `check` adds to the compiler's diagnostics.
pub mod codes {
    /// A class defined in the checked file is used by no rule, pattern or class.
    pub const UNUSED_CLASS: &str = "unused-class";
    /// No lexicon entry satisfies a condition (so what it guards never applies).
    pub const CONDITION_NEVER_HOLDS: &str = "condition-never-holds";
    /// No pair of lexicon words has the underlying ends any instance of the rule needs.
    pub const RULE_NEVER_FIRES: &str = "rule-never-fires";
    /// Every junction a rule describes is also described by another rule with
    /// the same or weaker conditions: each analysis through it is found twice.
    pub const SHADOWED_RULE: &str = "shadowed-rule";
    /// A correspondence `[x>class]` maps a member onto the same letters.
    pub const IDENTITY_CORRESPONDENCE: &str = "identity-correspondence";
    /// An example's parts do not join to its surface (with its rule).
    pub const EXAMPLE_JOIN: &str = "example-join";
    /// An example's surface does not split into its parts.
    pub const EXAMPLE_SPLIT: &str = "example-split";
    /// Examples could not be checked in the split direction: no lexicon.
    pub const NO_LEXICON: &str = "no-lexicon";
    /// A lexicon line was malformed and skipped.
    pub const LEXICON_LINE: &str = "lexicon-line";
    /// The rule-set's lexicon could not be loaded (an error).
    pub const LEXICON: &str = "lexicon";
}

/// What to check a rule-set with.
#[derive(Debug, Clone)]
pub struct CheckOptions {
    /// Variants to select while compiling.
    pub variants: Vec<String>,
    /// Extra lexicon files.
    pub lexicons: Vec<PathBuf>,
    /// Whether to load the rule-set's bundled lexicon (`set lexicon = NAME`).
    pub default_lexicon: bool,
    /// Most analyses looked through when checking an example's split direction.
    pub split_limit: usize,
}

impl Default for CheckOptions {
    fn default() -> Self {
        CheckOptions {
            variants: Vec::new(),
            lexicons: Vec::new(),
            default_lexicon: true,
            split_limit: 1000,
        }
    }
}

/// Errors that stop a check before any diagnostic can be given.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum CheckError {
    /// A lexicon file given with `--lexicon` could not be read.
    #[error(transparent)]
    Lexicon(#[from] LexiconError),
}

/// The result of checking one rule-set.
#[derive(Debug, Clone, Serialize)]
pub struct CheckReport {
    /// The rule-set checked (bundled name or path).
    pub rules: String,
    /// Number of errors.
    pub errors: usize,
    /// Number of warnings.
    pub warnings: usize,
    /// Rules compiled (0 when compilation failed).
    pub rule_count: usize,
    /// Examples checked.
    pub examples: usize,
    /// Entries of the lexicon used, if one was loaded.
    pub lexicon_entries: Option<usize>,
    /// Every diagnostic: compiler errors and warnings, then lints.
    pub diagnostics: Vec<Diagnostic>,
}

impl CheckReport {
    fn new(rules: &str, diagnostics: Vec<Diagnostic>) -> CheckReport {
        let errors = diagnostics
            .iter()
            .filter(|d| d.severity == Severity::Error)
            .count();
        CheckReport {
            rules: rules.to_string(),
            errors,
            warnings: diagnostics.len() - errors,
            rule_count: 0,
            examples: 0,
            lexicon_entries: None,
            diagnostics,
        }
    }

    /// The one-line summary printed after the diagnostics.
    pub fn summary(&self) -> String {
        let plural =
            |n: usize, one: &str, many: &str| format!("{n} {}", if n == 1 { one } else { many });
        let mut s = format!(
            "{}: {}, {}",
            self.rules,
            plural(self.errors, "error", "errors"),
            plural(self.warnings, "warning", "warnings")
        );
        if self.errors == 0 {
            s.push_str(&format!(
                " ({}, {} checked",
                plural(self.rule_count, "rule", "rules"),
                plural(self.examples, "example", "examples")
            ));
            match self.lexicon_entries {
                Some(n) => s.push_str(&format!(", lexicon of {})", plural(n, "entry", "entries"))),
                None => s.push_str(", no lexicon)"),
            }
        }
        s
    }

    /// Diagnostics and summary as text, like a compiler's output.
    pub fn to_text(&self) -> String {
        let mut out = String::new();
        for d in &self.diagnostics {
            out.push_str(&d.to_string());
            out.push('\n');
        }
        out.push_str(&self.summary());
        out.push('\n');
        out
    }
}

/// Compiles and lints a bundled rule-set (by name) or a rule file (by path).
pub fn check_named(name_or_path: &str, options: &CheckOptions) -> Result<CheckReport, CheckError> {
    let compile_options = CompileOptions {
        variants: options.variants.clone(),
    };
    let set = match compile_named(name_or_path, &compile_options) {
        Ok(set) => set,
        Err(diagnostics) => return Ok(CheckReport::new(name_or_path, diagnostics.0)),
    };
    let loads_lexicon =
        !options.lexicons.is_empty() || (options.default_lexicon && set.settings.lexicon.is_some());
    let mut diagnostics = set.warnings.clone();
    let lexicon = if loads_lexicon {
        let loaded = Lexicon::for_rules(&set, &options.lexicons, options.default_lexicon, false);
        let (lexicon, issues) = match loaded {
            Ok(found) => found,
            // A file given on the command line that cannot be read stops the check.
            Err(e @ LexiconError::Io { .. }) => return Err(e.into()),
            // Anything else (e.g. `set lexicon` naming no bundled lexicon) is
            // a problem of the rule-set: report it and check without a lexicon.
            Err(e) => {
                diagnostics.push(
                    Diagnostic::error(codes::LEXICON, e.to_string(), None)
                        .with_hint("fix `set lexicon = NAME`, or give the lexicon with --lexicon"),
                );
                let mut report = CheckReport::new(name_or_path, diagnostics);
                report.rule_count = set.rules.len();
                report.examples = set.examples.len();
                return Ok(report);
            }
        };
        for issue in issues {
            diagnostics.push(
                Diagnostic::warning(
                    codes::LEXICON_LINE,
                    format!("skipped lexicon line {issue}"),
                    None,
                )
                .with_hint("a lexicon line reads `form<TAB>frequency<TAB>key=value;key=value`"),
            );
        }
        Some(lexicon)
    } else {
        None
    };
    diagnostics.extend(lint(&set, lexicon.as_ref(), options));
    let mut report = CheckReport::new(name_or_path, diagnostics);
    report.rule_count = set.rules.len();
    report.examples = set.examples.len();
    report.lexicon_entries = lexicon.as_ref().map(Lexicon::len);
    Ok(report)
}

/// Every lint on a compiled rule-set. `lexicon` is `None` when no lexicon is
/// loaded; the lints that need one are then skipped.
pub fn lint(set: &RuleSet, lexicon: Option<&Lexicon>, options: &CheckOptions) -> Vec<Diagnostic> {
    let files: Vec<RuleFile> = (0..set.sources.files().len())
        .map(|i| parse_file(&set.sources, i).0)
        .collect();
    let mut out = Vec::new();
    unused_classes(set, &files, &mut out);
    identity_correspondences(set, &files, &mut out);
    if let Some(lexicon) = lexicon {
        never_fires(set, &files, lexicon, &mut out);
    }
    shadowed_rules(set, &mut out);
    examples(set, lexicon, options, &mut out);
    out
}

// ------------------------------------------------------------------ helpers

/// A condition as written: `left.pos = noun|adj`.
pub fn condition_text(c: &Condition) -> String {
    let side = match c.side {
        Side::Left => "left",
        Side::Right => "right",
    };
    if let Some(b) = c.bound {
        let op = if b.at_least { ">=" } else { "<=" };
        return format!("{side}.{} {op} {}", c.key, b.value);
    }
    match &c.test {
        None => format!("{side}.{}", c.key),
        Some((equal, values)) => format!(
            "{side}.{} {} {}",
            c.key,
            if *equal { "=" } else { "!=" },
            values.join("|")
        ),
    }
}

/// Tags of an entry shown briefly: `pos=noun;length=short`, readings by ` / `.
pub fn readings_text(readings: &[Tags]) -> String {
    let shown: Vec<String> = readings
        .iter()
        .filter(|r| !r.is_empty())
        .map(|r| {
            r.iter()
                .map(|(k, v)| format!("{k}={v}"))
                .collect::<Vec<_>>()
                .join(";")
        })
        .collect();
    if shown.is_empty() {
        "no tags".to_string()
    } else {
        shown.join(" / ")
    }
}

/// Narrows a location to the first occurrence of `needle` at or after its
/// column on the same line (for pointing at one part of an example).
fn narrow(loc: &Location, needle: &str) -> Location {
    let chars: Vec<char> = loc.source_line.chars().collect();
    let from = loc.column.saturating_sub(1);
    let hay: String = chars[from.min(chars.len())..].iter().collect();
    match hay.find(needle) {
        Some(byte) if !needle.is_empty() => {
            let col = from + hay[..byte].chars().count() + 1;
            Location {
                column: col,
                width: needle.chars().count().max(1),
                ..loc.clone()
            }
        }
        _ => loc.clone(),
    }
}

fn list(items: &[String], most: usize) -> String {
    let shown: Vec<String> = items.iter().take(most).map(|s| format!("`{s}`")).collect();
    let mut s = shown.join(", ");
    if items.len() > most {
        s.push_str(&format!(" and {} more", items.len() - most));
    }
    s
}

fn show(s: &str) -> String {
    if s.is_empty() {
        "∅".into()
    } else {
        s.to_string()
    }
}

// ------------------------------------------------------------------ unused classes

fn unused_classes(set: &RuleSet, files: &[RuleFile], out: &mut Vec<Diagnostic>) {
    let mut used: BTreeSet<String> = BTreeSet::new();
    let statements = files.iter().flat_map(|f| f.statements.iter());
    for st in statements {
        match st {
            Statement::Class(c) => {
                for m in &c.members {
                    if let ClassMember::Class(r) = m {
                        used.insert(r.value.clone());
                    }
                }
            }
            Statement::Pattern(p) => {
                used.insert(p.class.value.clone());
            }
            Statement::Rule(r) => {
                let items = r
                    .change
                    .left
                    .iter()
                    .chain(&r.change.right)
                    .chain(&r.change.surface);
                for item in items {
                    if let ChangeItem::Slot(slot) = &item.value {
                        used.insert(slot.name.clone());
                        if let Some(t) = &slot.map_to {
                            used.insert(t.clone());
                        }
                    }
                }
            }
            _ => {}
        }
    }
    let Some(root) = files.first() else { return };
    for st in &root.statements {
        let Statement::Class(c) = st else { continue };
        if used.contains(&c.name.value) {
            continue;
        }
        out.push(
            Diagnostic::warning(
                codes::UNUSED_CLASS,
                format!(
                    "class `{}` is never used by a rule, a pattern or another class",
                    c.name.value
                ),
                Some(set.sources.locate(c.name.span)),
            )
            .with_hint("use it in a rule as `[NAME]`, or remove it"),
        );
    }
}

// ------------------------------------------------------------------ correspondences

fn identity_correspondences(set: &RuleSet, files: &[RuleFile], out: &mut Vec<Diagnostic>) {
    let class = |name: &str| set.classes.iter().find(|c| c.name == name);
    for st in files.iter().flat_map(|f| f.statements.iter()) {
        let Statement::Rule(rule) = st else { continue };
        // label → class, and the classes of unlabelled underlying slots.
        let mut labels: HashMap<&str, &str> = HashMap::new();
        for item in rule.change.left.iter().chain(&rule.change.right) {
            if let ChangeItem::Slot(s) = &item.value {
                if let Some(l) = &s.label {
                    labels.insert(l, &s.name);
                }
            }
        }
        for item in &rule.change.surface {
            let ChangeItem::Slot(slot) = &item.value else {
                continue;
            };
            let Some(target) = &slot.map_to else { continue };
            let from_name = labels
                .get(slot.name.as_str())
                .copied()
                .unwrap_or(&slot.name);
            let (Some(from), Some(to)) = (class(from_name), class(target)) else {
                continue;
            };
            let same: Vec<&String> = from
                .members
                .iter()
                .zip(&to.members)
                .filter(|(a, b)| a == b)
                .map(|(a, _)| a)
                .collect();
            if same.is_empty() {
                continue;
            }
            // Mapping a member onto itself matters when the instance it gives
            // then changes nothing at all: it repeats plain concatenation (or
            // the plain space or hyphen), so those analyses are found twice.
            let Some(ri) = set.rule_by_name(&rule.name.value) else {
                continue;
            };
            let noops: Vec<String> = set
                .instances
                .iter()
                .filter(|i| {
                    i.rule == ri
                        && i.separator != Separator::Merged
                        && format!("{}{}", i.surface_left, i.surface_right)
                            == format!("{}{}", i.left, i.right)
                        && same.iter().any(|m| i.surface().contains(m.as_str()))
                })
                .map(|i| {
                    format!(
                        "{} + {} → {}",
                        show(&i.left),
                        show(&i.right),
                        show(&i.surface().replace(' ', "_"))
                    )
                })
                .collect();
            if noops.is_empty() {
                continue;
            }
            let same: Vec<String> = same.into_iter().cloned().collect();
            out.push(
                Diagnostic::warning(
                    codes::IDENTITY_CORRESPONDENCE,
                    format!(
                        "`[{}>{}]` maps {} onto itself, so {} of rule `{}` change{} nothing: {}",
                        slot.name,
                        target,
                        list(&same, 6),
                        if noops.len() == 1 { "one junction" } else { "junctions" },
                        rule.name.value,
                        if noops.len() == 1 { "s" } else { "" },
                        list(&noops, 4)
                    ),
                    Some(set.sources.locate(item.span)),
                )
                .with_related(
                    format!("class `{}` is defined here", to.name),
                    to.location.clone(),
                )
                .with_hint(format!(
                    "such a junction repeats plain concatenation and every analysis through it is found twice; remove those members from `{}` and `{}`",
                    from.name, to.name
                )),
            );
        }
    }
}

// ------------------------------------------------------------------ never fires

/// Condition spans of each rule (by name) and of each edge condition.
struct ConditionSpans {
    rules: HashMap<String, Vec<(Condition, Span)>>,
    edges: Vec<(Condition, Span)>,
}

fn condition_spans(files: &[RuleFile]) -> ConditionSpans {
    let mut spans = ConditionSpans {
        rules: HashMap::new(),
        edges: Vec::new(),
    };
    for st in files.iter().flat_map(|f| f.statements.iter()) {
        match st {
            Statement::Rule(r) => {
                spans.rules.insert(
                    r.name.value.clone(),
                    r.conditions
                        .iter()
                        .map(|c| (c.value.clone(), c.span))
                        .collect(),
                );
            }
            Statement::Edge(e) => spans
                .edges
                .extend(e.conditions.iter().map(|c| (c.value.clone(), c.span))),
            _ => {}
        }
    }
    spans
}

/// Tag readings and forms a part can have: lexicon entries and pattern parts.
struct Candidates<'a> {
    lexicon: &'a Lexicon,
    pattern_readings: Vec<Vec<Tags>>,
}

impl Candidates<'_> {
    fn any_entry(&self, conds: &[&Condition], min_len: usize) -> bool {
        self.lexicon.entries().any(|e| {
            e.key.chars().count() >= min_len && conditions_hold(conds, &e.key, &e.readings)
        })
    }

    fn any_pattern(&self, conds: &[&Condition]) -> bool {
        self.pattern_readings.iter().any(|r| {
            conds
                .iter()
                .all(|c| c.key != "form" && c.key != LETTERS_KEY && condition_holds(c, "", r))
        })
    }

    /// Why no entry meets `c`, in words.
    fn why_not(&self, c: &Condition) -> String {
        let mut values: BTreeSet<String> = BTreeSet::new();
        let mut key_seen = false;
        for e in self.lexicon.entries() {
            for r in &e.readings {
                if let Some(v) = r.get(&c.key) {
                    key_seen = true;
                    values.extend(v.split('|').map(str::to_string));
                }
            }
        }
        for rs in &self.pattern_readings {
            for r in rs {
                if let Some(v) = r.get(&c.key) {
                    key_seen = true;
                    values.insert(v.to_string());
                }
            }
        }
        if c.key == "form" {
            return "no lexicon entry has that form".to_string();
        }
        if c.key == LETTERS_KEY {
            return "no lexicon entry has that many letters".to_string();
        }
        if let Some(b) = c.bound {
            let op = if b.at_least { ">=" } else { "<=" };
            return format!(
                "no lexicon entry has a whole number `{}` {op} {}",
                c.key, b.value
            );
        }
        if !key_seen {
            return format!("no lexicon entry has a tag `{}`", c.key);
        }
        let values: Vec<String> = values.into_iter().collect();
        match &c.test {
            Some((true, wanted)) => format!(
                "no lexicon entry has `{}` = {} (values in the lexicon: {})",
                c.key,
                wanted.join("|"),
                list(&values, 8)
            ),
            Some((false, wanted)) => {
                format!("every lexicon entry has `{}` = {}", c.key, wanted.join("|"))
            }
            None => format!("no lexicon entry has a tag `{}`", c.key),
        }
    }
}

/// For the underlying ends and starts the instances need, the lexicon
/// entries that end (start) with each, found in one scan of the lexicon.
struct EndIndex<'a> {
    by_suffix: HashMap<&'a str, Vec<usize>>,
    by_prefix: HashMap<&'a str, Vec<usize>>,
}

fn end_index<'a>(set: &'a RuleSet, lexicon: &Lexicon) -> EndIndex<'a> {
    let lefts: HashSet<&str> = set.instances.iter().map(|i| i.left.as_str()).collect();
    let rights: HashSet<&str> = set.instances.iter().map(|i| i.right.as_str()).collect();
    let left_lens: BTreeSet<usize> = lefts.iter().map(|l| l.len()).filter(|&l| l > 0).collect();
    let right_lens: BTreeSet<usize> = rights.iter().map(|r| r.len()).filter(|&r| r > 0).collect();
    let mut index = EndIndex {
        by_suffix: HashMap::new(),
        by_prefix: HashMap::new(),
    };
    for (id, e) in lexicon.entries().enumerate() {
        let key = e.key.as_str();
        for &l in &left_lens {
            if l <= key.len() && key.is_char_boundary(key.len() - l) {
                if let Some(&left) = lefts.get(&key[key.len() - l..]) {
                    index.by_suffix.entry(left).or_default().push(id);
                }
            }
        }
        for &r in &right_lens {
            if r <= key.len() && key.is_char_boundary(r) {
                if let Some(&right) = rights.get(&key[..r]) {
                    index.by_prefix.entry(right).or_default().push(id);
                }
            }
        }
    }
    index
}

fn never_fires(set: &RuleSet, files: &[RuleFile], lexicon: &Lexicon, out: &mut Vec<Diagnostic>) {
    let spans = condition_spans(files);
    let candidates = Candidates {
        lexicon,
        pattern_readings: set
            .patterns
            .iter()
            .map(|p| {
                let mut t: Tags = p.tags.iter().cloned().collect();
                t.insert("pattern", &p.name);
                vec![t]
            })
            .collect(),
    };
    let min_len = set.settings.min_part_length.max(1);
    let loc_of = |span: Span| set.sources.locate(span);
    // Edge conditions.
    for (c, span) in &spans.edges {
        if !candidates.any_entry(&[c], 1) && !candidates.any_pattern(&[c]) {
            out.push(
                Diagnostic::warning(
                    codes::CONDITION_NEVER_HOLDS,
                    format!(
                        "no lexicon entry satisfies `{}`: {}, so no analysis can pass this edge",
                        condition_text(c),
                        candidates.why_not(c)
                    ),
                    Some(loc_of(*span)),
                )
                .with_hint("check the tag's spelling here and in the lexicon"),
            );
        }
    }
    let index = end_index(set, lexicon);
    for (ri, rule) in set.rules.iter().enumerate() {
        let rule_spans = spans.rules.get(&rule.name);
        let span_of = |c: &Condition| {
            rule_spans
                .and_then(|v| v.iter().find(|(d, _)| d == c).map(|(_, s)| *s))
                .map(|s| loc_of(s))
                .unwrap_or_else(|| rule.location.clone())
        };
        // Each condition alone, then each side's conditions together.
        let mut blocked = false;
        for c in rule.left_conditions.iter().chain(&rule.right_conditions) {
            if !candidates.any_entry(&[c], min_len) && !candidates.any_pattern(&[c]) {
                blocked = true;
                out.push(
                    Diagnostic::warning(
                        codes::CONDITION_NEVER_HOLDS,
                        format!(
                            "rule `{}` can never fire: no lexicon entry satisfies `{}`: {}",
                            rule.name,
                            condition_text(c),
                            candidates.why_not(c)
                        ),
                        Some(span_of(c)),
                    )
                    .with_hint("check the tag's spelling here and in the lexicon"),
                );
            }
        }
        if blocked {
            continue;
        }
        for (side, conds) in [
            ("left", &rule.left_conditions),
            ("right", &rule.right_conditions),
        ] {
            let refs: Vec<&Condition> = conds.iter().collect();
            if refs.len() > 1
                && !candidates.any_entry(&refs, min_len)
                && !candidates.any_pattern(&refs)
            {
                blocked = true;
                out.push(
                    Diagnostic::warning(
                        codes::CONDITION_NEVER_HOLDS,
                        format!(
                            "rule `{}` can never fire: no lexicon entry satisfies all its {side} conditions together ({})",
                            rule.name,
                            refs.iter().map(|c| condition_text(c)).collect::<Vec<_>>().join(" and ")
                        ),
                        Some(span_of(refs[0])),
                    ),
                );
            }
        }
        if blocked {
            continue;
        }
        // Ends: some instance needs a left word ending in its left end and a
        // right word starting with its right start, each meeting the rule's
        // conditions on that side.
        let pattern_left = candidates.any_pattern(&rule.left_conditions.iter().collect::<Vec<_>>());
        let pattern_right =
            candidates.any_pattern(&rule.right_conditions.iter().collect::<Vec<_>>());
        let meets = |id: usize, conds: &[Condition]| {
            let e = lexicon.entry(id);
            e.key.chars().count() >= min_len && conditions_hold(conds, &e.key, &e.readings)
        };
        let mut left_cache: HashMap<(&str, bool), bool> = HashMap::new();
        let mut right_cache: HashMap<&str, bool> = HashMap::new();
        let mut any_left = false;
        let mut any_right = false;
        let mut fires = false;
        for inst in set.instances.iter().filter(|i| i.rule == ri) {
            let printed = matches!(inst.separator, Separator::Space | Separator::Hyphen);
            let surface_empty = inst.surface().is_empty();
            let left_len = inst.left.chars().count();
            let left_ok = *left_cache
                .entry((inst.left.as_str(), surface_empty))
                .or_insert_with(|| {
                    let fits = |id: usize| {
                        meets(id, &rule.left_conditions)
                            && (!surface_empty || lexicon.entry(id).key.chars().count() > left_len)
                    };
                    if inst.left.is_empty() {
                        (0..lexicon.len()).any(fits)
                    } else {
                        index
                            .by_suffix
                            .get(inst.left.as_str())
                            .is_some_and(|ids| ids.iter().any(|&id| fits(id)))
                    }
                })
                || (pattern_left
                    && inst.left.is_empty()
                    && inst.surface_left.is_empty()
                    && printed);
            let right_ok = *right_cache.entry(inst.right.as_str()).or_insert_with(|| {
                if inst.right.is_empty() {
                    (0..lexicon.len()).any(|id| meets(id, &rule.right_conditions))
                } else {
                    index
                        .by_prefix
                        .get(inst.right.as_str())
                        .is_some_and(|ids| ids.iter().any(|&id| meets(id, &rule.right_conditions)))
                }
            }) || (pattern_right
                && inst.right.is_empty()
                && inst.surface_right.is_empty()
                && printed);
            any_left |= left_ok;
            any_right |= right_ok;
            if left_ok && right_ok {
                fires = true;
                break;
            }
        }
        if fires {
            continue;
        }
        let distinct = |f: &dyn Fn(&crate::rules::Instance) -> String| -> Vec<String> {
            let mut v: Vec<String> = set
                .instances
                .iter()
                .filter(|i| i.rule == ri)
                .map(f)
                .collect();
            v.sort();
            v.dedup();
            v
        };
        let qualifier = |conds: &[Condition]| {
            if conds.is_empty() {
                String::new()
            } else {
                format!(
                    " that meets `{}`",
                    conds
                        .iter()
                        .map(condition_text)
                        .collect::<Vec<_>>()
                        .join(" and ")
                )
            }
        };
        let message = if !any_left {
            format!(
                "rule `{}` can never fire: no lexicon word{} ends with {}",
                rule.name,
                qualifier(&rule.left_conditions),
                list(&distinct(&|i| i.left.clone()), 8)
            )
        } else if !any_right {
            format!(
                "rule `{}` can never fire: no lexicon word{} starts with {}",
                rule.name,
                qualifier(&rule.right_conditions),
                list(&distinct(&|i| i.right.clone()), 8)
            )
        } else {
            format!(
                "rule `{}` can never fire: no instance finds both a left word ending in its left end and a right word starting with its right start",
                rule.name
            )
        };
        out.push(
            Diagnostic::warning(codes::RULE_NEVER_FIRES, message, Some(rule.location.clone()))
                .with_hint(if min_len > 1 {
                    format!("only lexicon words of at least {min_len} letters (`set min-part-length`) count; add words to the lexicon, or fix the rule's letters")
                } else {
                    "add words to the lexicon, or fix the rule's letters".to_string()
                }),
        );
    }
}

// ------------------------------------------------------------------ shadowing

/// Whether condition `a` implies condition `b` (every entry meeting `a` meets `b`).
fn implies(a: &Condition, b: &Condition) -> bool {
    if a == b {
        return true;
    }
    if a.side != b.side || a.key != b.key {
        return false;
    }
    match (a.bound, b.bound) {
        (Some(x), Some(y)) => {
            return x.at_least == y.at_least
                && if x.at_least {
                    x.value >= y.value
                } else {
                    x.value <= y.value
                };
        }
        (None, None) => {}
        _ => return false,
    }
    match (&a.test, &b.test) {
        (Some((true, _)), None) => true,
        (Some((true, va)), Some((true, vb))) => va.iter().all(|v| vb.contains(v)),
        (Some((false, va)), Some((false, vb))) => vb.iter().all(|v| va.contains(v)),
        _ => false,
    }
}

/// Whether conditions `weaker` are implied by conditions `stronger`.
fn weaker_or_equal(weaker: &[Condition], stronger: &[Condition]) -> bool {
    weaker
        .iter()
        .all(|w| stronger.iter().any(|s| implies(s, w)))
}

fn scope_contains(outer: Scope, inner: Scope) -> bool {
    outer == Scope::Any || outer == inner
}

fn shadowed_rules(set: &RuleSet, out: &mut Vec<Diagnostic>) {
    let n = set.rules.len();
    let mut by_rule: Vec<Vec<usize>> = vec![Vec::new(); n];
    for (i, inst) in set.instances.iter().enumerate() {
        by_rule[inst.rule].push(i);
    }
    let conds = |r: usize| {
        let rule = &set.rules[r];
        let mut v = rule.left_conditions.clone();
        v.extend(rule.right_conditions.iter().cloned());
        v
    };
    let mut reported: BTreeSet<(usize, usize)> = BTreeSet::new();
    for a in 0..n {
        if by_rule[a].is_empty() {
            continue;
        }
        // Rules covering every instance of `a` so far (None: not started).
        let mut covering: Option<BTreeSet<usize>> = None;
        for &ia in &by_rule[a] {
            let i1 = &set.instances[ia];
            let l1: Vec<char> = i1.left.chars().collect();
            let r1: Vec<char> = i1.right.chars().collect();
            let s1 = i1.surface();
            let mut here: BTreeSet<usize> = BTreeSet::new();
            for x in 0..=l1.len() {
                let prefix_x: String = l1[..x].iter().collect();
                let l2: String = l1[x..].iter().collect();
                for y in 0..=r1.len() {
                    let r2: String = r1[..r1.len() - y].iter().collect();
                    let suffix_y: String = r1[r1.len() - y..].iter().collect();
                    for &ib in set.instances_with_ends(&l2, &r2) {
                        let i2 = &set.instances[ib];
                        if i2.rule == a
                            || i2.separator != i1.separator
                            || !scope_contains(i2.scope, i1.scope)
                        {
                            continue;
                        }
                        if format!("{prefix_x}{}{suffix_y}", i2.surface()) == s1 {
                            here.insert(i2.rule);
                        }
                    }
                }
            }
            covering = Some(match covering {
                None => here,
                Some(prev) => prev.intersection(&here).copied().collect(),
            });
            if covering.as_ref().is_some_and(BTreeSet::is_empty) {
                break;
            }
        }
        let ca = conds(a);
        for b in covering.unwrap_or_default() {
            if !weaker_or_equal(&conds(b), &ca) || reported.contains(&(b, a)) {
                continue;
            }
            reported.insert((a, b));
            let (ra, rb) = (&set.rules[a], &set.rules[b]);
            let mut hint = format!(
                "remove `{}`, or restrict `{}` so that it excludes these junctions",
                ra.name, rb.name
            );
            if ra.cost < rb.cost {
                hint.push_str(&format!(
                    " (if `{}` is meant as a cheaper special case, `{}` must not cover it as well)",
                    ra.name, rb.name
                ));
            }
            out.push(
                Diagnostic::warning(
                    codes::SHADOWED_RULE,
                    format!(
                        "rule `{}` is shadowed by rule `{}`: every junction `{}` describes, `{}` describes too, with the same or weaker conditions, so each analysis through `{}` is found twice",
                        ra.name, rb.name, ra.name, rb.name, ra.name
                    ),
                    Some(ra.location.clone()),
                )
                .with_related(format!("rule `{}` is defined here", rb.name), rb.location.clone())
                .with_hint(hint),
            );
        }
    }
}

// ------------------------------------------------------------------ examples

fn examples(
    set: &RuleSet,
    lexicon: Option<&Lexicon>,
    options: &CheckOptions,
    out: &mut Vec<Diagnostic>,
) {
    let empty = Lexicon::empty();
    let lex = lexicon.unwrap_or(&empty);
    for ex in set.examples.iter().map(top_level_if_unindented) {
        let ex = &ex;
        if let Some(d) = example_join(set, lex, lexicon.is_some(), ex) {
            out.push(d);
        }
        if lexicon.is_some() {
            if let Some(d) = example_split(set, lex, ex, options.split_limit) {
                out.push(d);
            }
        }
    }
    if lexicon.is_none() && !set.examples.is_empty() {
        let n = set.examples.len();
        out.push(
            Diagnostic::warning(
                codes::NO_LEXICON,
                format!(
                    "{n} example{} could not be checked in the split direction: no lexicon is loaded",
                    if n == 1 { "" } else { "s" }
                ),
                set.examples.first().map(|e| e.location.clone()),
            )
            .with_hint("give `--lexicon FILE`, or name a bundled lexicon with `set lexicon = NAME`"),
        );
    }
}

/// The grammar lets a rule's clauses continue on any following line, so an
/// `example` written at the start of a line after the last rule is read as
/// that rule's clause. Clauses are indented by convention; an example that
/// is not is taken to stand on its own (it may use several rules).
fn top_level_if_unindented(ex: &crate::rules::Example) -> crate::rules::Example {
    let mut ex = ex.clone();
    if ex.location.column == 1 {
        ex.rule = None;
    }
    ex
}

/// Checks that an example's parts join to its surface, through its rule.
fn example_join(
    set: &RuleSet,
    lexicon: &Lexicon,
    have_lexicon: bool,
    ex: &crate::rules::Example,
) -> Option<Diagnostic> {
    let parts: Vec<&str> = ex.parts.iter().map(String::as_str).collect();
    let joined = proof::join(set, lexicon, &parts, ScopeFilter::Any, 10_000);
    let want = set.normalizer.normalize(&ex.surface);
    let rule_name = ex.rule.map(|r| set.rules[r].name.as_str());
    let hits: Vec<&proof::Joined> = joined
        .results
        .iter()
        .filter(|j| set.normalizer.normalize(&j.surface) == want)
        .collect();
    let through_rule =
        |j: &&proof::Joined| rule_name.map_or(true, |n| j.junctions.iter().any(|s| s.rule == n));
    if hits.iter().any(through_rule) {
        return None;
    }
    let parts_text = ex.parts.join(" + ");
    let at = Some(narrow(&ex.location, &ex.surface));
    if let (Some(hit), Some(name)) = (hits.first(), rule_name) {
        let used: Vec<String> = hit.junctions.iter().map(|s| s.rule.clone()).collect();
        let mut d = Diagnostic::warning(
            codes::EXAMPLE_JOIN,
            format!(
                "`{parts_text}` joins to `{}` only through {}, not through rule `{name}` the example belongs to",
                ex.surface,
                list(&used, 4)
            ),
            at,
        );
        if let Some(why) = rule_diagnosis(set, lexicon, have_lexicon, &ex.parts, ex.rule) {
            d = d.with_hint(why);
        }
        return Some(d);
    }
    let gives: Vec<String> = joined
        .results
        .iter()
        .take(6)
        .map(|j| {
            format!(
                "{} ({})",
                j.surface,
                j.junctions
                    .iter()
                    .map(|s| s.rule.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            )
        })
        .collect();
    let message = if gives.is_empty() {
        format!(
            "`{parts_text}` does not join to `{}`: the rules join these parts in no way at all",
            ex.surface
        )
    } else {
        format!(
            "`{parts_text}` does not join to `{}`; the rules give {}{}",
            ex.surface,
            gives.join(", "),
            if joined.count > gives.len() {
                format!(" and {} more", joined.count - gives.len())
            } else {
                String::new()
            }
        )
    };
    let mut d = Diagnostic::warning(codes::EXAMPLE_JOIN, message, at);
    if let Some(why) = rule_diagnosis(set, lexicon, have_lexicon, &ex.parts, ex.rule) {
        d = d.with_hint(why);
    } else {
        d = d.with_hint("fix the example, or the rule it is meant to show");
    }
    Some(d)
}

/// Why rule `rule` does not apply between the parts of an example (for
/// two-part examples, or each junction of longer ones).
fn rule_diagnosis(
    set: &RuleSet,
    lexicon: &Lexicon,
    have_lexicon: bool,
    parts: &[String],
    rule: Option<usize>,
) -> Option<String> {
    let r = rule?;
    let rule = &set.rules[r];
    let words: Vec<String> = parts
        .iter()
        .map(|p| set.normalizer.normalize(p.trim()))
        .collect();
    let mut reasons = Vec::new();
    for i in 0..words.len().saturating_sub(1) {
        let (lw, rw) = (&words[i], &words[i + 1]);
        let matching: Vec<&crate::rules::Instance> = set
            .instances
            .iter()
            .filter(|inst| {
                inst.rule == r && lw.ends_with(&inst.left) && rw.starts_with(&inst.right)
            })
            .collect();
        if matching.is_empty() {
            reasons.push(format!(
                "rule `{}` ({}) does not apply to `{lw}` + `{rw}`: {}",
                rule.name,
                rule.change,
                ends_mismatch(set, r, lw, rw)
            ));
            continue;
        }
        let readings = |w: &str| -> (Vec<Tags>, bool) {
            match lexicon.get(w) {
                Some(id) => (lexicon.entry(id).readings.clone(), true),
                None => (Vec::new(), false),
            }
        };
        let mut failed = Vec::new();
        for (conds, word) in [(&rule.left_conditions, lw), (&rule.right_conditions, rw)] {
            let (rs, known) = readings(word);
            for c in conds.iter() {
                if !condition_holds(c, word, &rs) {
                    let tags = if !have_lexicon {
                        "no lexicon is loaded".to_string()
                    } else if known {
                        format!("its tags: {}", readings_text(&rs))
                    } else {
                        format!("`{word}` is not in the lexicon")
                    };
                    failed.push(format!(
                        "its condition `{}` does not hold for `{word}` ({tags})",
                        condition_text(c)
                    ));
                }
            }
        }
        if !failed.is_empty() {
            reasons.push(format!("rule `{}`: {}", rule.name, failed.join("; ")));
            continue;
        }
        let gives: Vec<String> = matching
            .iter()
            .map(|inst| {
                format!(
                    "{} + {} → {}",
                    show(&inst.left),
                    show(&inst.right),
                    show(&inst.surface().replace(' ', "_"))
                )
            })
            .collect();
        reasons.push(format!(
            "between `{lw}` and `{rw}` rule `{}` gives {}",
            rule.name,
            list(&gives, 4)
        ));
    }
    (!reasons.is_empty()).then(|| reasons.join("; "))
}

/// Why no instance of rule `r` has underlying ends matching `lw` + `rw`, in words.
pub fn ends_mismatch(set: &RuleSet, r: usize, lw: &str, rw: &str) -> String {
    let insts: Vec<&crate::rules::Instance> =
        set.instances.iter().filter(|i| i.rule == r).collect();
    let mut lefts: Vec<String> = insts.iter().map(|i| i.left.clone()).collect();
    lefts.sort();
    lefts.dedup();
    let mut rights: Vec<String> = insts.iter().map(|i| i.right.clone()).collect();
    rights.sort();
    rights.dedup();
    let left_ok = insts.iter().any(|i| lw.ends_with(&i.left));
    let right_ok = insts.iter().any(|i| rw.starts_with(&i.right));
    if !left_ok {
        format!("`{lw}` does not end with {}", or_list(&lefts))
    } else if !right_ok {
        format!("`{rw}` does not start with {}", or_list(&rights))
    } else {
        let pairs: Vec<String> = insts
            .iter()
            .filter(|i| lw.ends_with(&i.left))
            .map(|i| format!("{} + {}", show(&i.left), show(&i.right)))
            .collect();
        format!(
            "where `{lw}` ends as the rule needs, the right word must start otherwise ({})",
            list(&pairs, 6)
        )
    }
}

fn or_list(items: &[String]) -> String {
    if items.len() == 1 {
        format!("`{}`", items[0])
    } else {
        format!("any of {}", list(items, 8))
    }
}

/// Checks that an example's surface splits into its parts.
fn example_split(
    set: &RuleSet,
    lexicon: &Lexicon,
    ex: &crate::rules::Example,
    limit: usize,
) -> Option<Diagnostic> {
    let want: Vec<String> = ex
        .parts
        .iter()
        .map(|p| set.normalizer.normalize(p.trim()))
        .collect();
    let analyzer = Analyzer::new(set, lexicon);
    let record = analyzer.split(&ex.surface, limit);
    let rule_name = ex.rule.map(|r| set.rules[r].name.as_str());
    let same_parts = |a: &proof::Analysis| {
        a.parts.len() == want.len() && a.parts.iter().zip(&want).all(|(p, w)| &p.key == w)
    };
    let found: Vec<&proof::Analysis> = record.analyses.iter().filter(|a| same_parts(a)).collect();
    if found
        .iter()
        .any(|a| rule_name.map_or(true, |n| a.junctions.iter().any(|j| j.rule == n)))
    {
        return None;
    }
    let parts_text = ex.parts.join(" + ");
    // Missing parts first: the most common reason, and the most precise.
    for (p, key) in ex.parts.iter().zip(&want) {
        if lexicon.get(key).is_none() && !pattern_accepts(set, key) {
            let normalized = if key != p.trim() {
                format!(" (normalized: `{key}`)")
            } else {
                String::new()
            };
            return Some(
                Diagnostic::warning(
                    codes::EXAMPLE_SPLIT,
                    format!(
                        "`{}` cannot split into `{parts_text}`: the part `{p}`{normalized} is not in the lexicon",
                        ex.surface
                    ),
                    Some(narrow(&ex.location, p)),
                )
                .with_hint(format!("add `{p}` to the lexicon, or fix the example")),
            );
        }
    }
    let at = Some(narrow(&ex.location, &ex.surface));
    if let (Some(a), Some(name)) = (found.first(), rule_name) {
        let used: Vec<String> = a.junctions.iter().map(|j| j.rule.clone()).collect();
        return Some(Diagnostic::warning(
            codes::EXAMPLE_SPLIT,
            format!(
                "`{}` splits into `{parts_text}` only through {}, not through rule `{name}`",
                ex.surface,
                list(&used, 4)
            ),
            at,
        ));
    }
    let why = crate::explain::why_not_summary(&analyzer, &ex.surface, &want);
    let mut d = Diagnostic::warning(
        codes::EXAMPLE_SPLIT,
        format!("`{}` does not split into `{parts_text}`: {why}", ex.surface),
        at,
    );
    d = d.with_hint(format!(
        "run `juncture explain '{}' --rules {} --expect {}` for the whole lattice",
        ex.surface,
        set.name,
        ex.parts.join("+")
    ));
    Some(d)
}

/// Whether some open-class pattern accepts `key` as a whole part.
fn pattern_accepts(set: &RuleSet, key: &str) -> bool {
    let segs = set.segmenter.split(key);
    let len = key.chars().count();
    set.patterns.iter().any(|p| {
        !segs.is_empty()
            && segs.iter().all(|s| p.members.contains(s))
            && len >= p.min
            && p.max.map_or(true, |m| len <= m)
    })
}
