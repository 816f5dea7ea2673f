//! The compiler: typed syntax tree → [`RuleSet`], in named passes. Every pass
//! collects all of its errors; compilation fails only after all passes ran.
//!
//! 1. [`load_includes`]: parse the root file and everything it includes.
//! 2. [`read_settings`]: language, normalization, segments, `set`, variants.
//! 3. [`resolve_classes`]: expand class references, catch cycles and duplicates.
//! 4. [`expand_rules`]: resolve slots and labels, check correspondences,
//!    boundaries and conditions, expand each rule into concrete instances.
//! 5. [`check_duplicates`]: rules with the same name or the same instances.
//! 6. [`index`]: forward index by underlying ends, inverse index by surface.

use super::ast::*;
use super::bundled;
use super::diagnostic::{Diagnostic, Diagnostics, Location, Severity, SourceMap};
use super::parse::parse_file;
use super::*;
use crate::normalize::{Normalizer, Segmenter};
use rustc_hash::{FxBuildHasher, FxHashMap};
use std::collections::{BTreeMap, BTreeSet, HashMap};
use std::hash::BuildHasher;
use std::path::{Path, PathBuf};

/// Most instances one rule may expand to.
pub const MAX_INSTANCES_PER_RULE: usize = 100_000;
/// Most instances a rule-set may have in all.
pub const MAX_INSTANCES: usize = 500_000;
/// Deepest include nesting.
pub const MAX_INCLUDE_DEPTH: usize = 16;
/// Deepest nesting of classes made of classes (`class a = [b]`, `class b = [c]`, …).
pub const MAX_CLASS_DEPTH: usize = 64;
/// Most class members in all classes of a rule-set together (after
/// expanding class references), so doubling classes cannot exhaust memory.
pub const MAX_CLASS_MEMBERS: usize = 1_000_000;

/// Options for compiling a rule-set.
#[derive(Debug, Clone, Default)]
pub struct CompileOptions {
    /// Variants to select (`variant NAME: fold A = B`).
    pub variants: Vec<String>,
}

/// Loads a bundled rule-set by name, or a rule file or compiled rule-set
/// (`juncture rules build`) by path. A bundled rule-set without variants
/// comes from its embedded compiled form when that was built from the
/// bundled text as it is now.
pub fn compile_named(name_or_path: &str, options: &CompileOptions) -> Result<RuleSet, Diagnostics> {
    if options.variants.is_empty() {
        if let Some(set) = bundled::compiled_rule_set(name_or_path) {
            return Ok(set);
        }
    }
    compile_from_text(name_or_path, options)
}

/// Compiles a bundled rule-set by name, or a rule file by path, from its
/// text (never from a compiled form); a compiled rule-set file is loaded.
pub fn compile_from_text(
    name_or_path: &str,
    options: &CompileOptions,
) -> Result<RuleSet, Diagnostics> {
    if let Some(text) = bundled::rule_set(name_or_path) {
        return compile(&format!("bundled:{name_or_path}"), text, None, options);
    }
    let path = Path::new(name_or_path);
    match std::fs::read(path) {
        Ok(bytes) if super::compiled::is_compiled(&bytes) => {
            load_compiled_file(name_or_path, &bytes, options)
        }
        Ok(bytes) => match String::from_utf8(bytes) {
            Ok(text) => compile(name_or_path, &text, path.parent(), options),
            Err(e) => Err(Diagnostics(vec![Diagnostic::error(
                "not-utf8",
                "the rule file is not UTF-8",
                Some(bad_byte_location(
                    name_or_path,
                    e.as_bytes(),
                    e.utf8_error().valid_up_to(),
                )),
            )
            .with_hint("save the file as UTF-8")])),
        },
        Err(e) => Err(Diagnostics(vec![Diagnostic::error(
            "no-rule-set",
            format!("no bundled rule-set and no readable file named `{name_or_path}`: {e}"),
            None,
        )
        .with_hint(format!(
            "bundled rule-sets: {}",
            bundled::names().join(", ")
        ))])),
    }
}

/// Reads a compiled rule-set file (variants were chosen when it was built).
fn load_compiled_file(
    file: &str,
    bytes: &[u8],
    options: &CompileOptions,
) -> Result<RuleSet, Diagnostics> {
    let rebuild = |variants: &str| {
        format!("rebuild it from its rule file: juncture rules build RULE-FILE{variants} -o {file}")
    };
    if !options.variants.is_empty() {
        let asked: String = options
            .variants
            .iter()
            .map(|v| format!(" --variant {v}"))
            .collect();
        return Err(Diagnostics(vec![Diagnostic::error(
            "compiled-variant",
            format!("{file} is a compiled rule-set: its variants were chosen when it was built"),
            None,
        )
        .with_hint(rebuild(&asked))]));
    }
    match super::compiled::from_bytes(bytes) {
        Ok(mut set) => {
            set.name = file.to_string();
            Ok(set)
        }
        Err(why) => Err(Diagnostics(vec![Diagnostic::error(
            "bad-compiled-rules",
            format!("{file}: cannot read the compiled rule-set: {why}"),
            None,
        )
        .with_hint(rebuild(""))])),
    }
}

/// The place of the first byte that is not UTF-8, as `file:line:column`.
fn bad_byte_location(file: &str, bytes: &[u8], at: usize) -> Location {
    let line_start = bytes[..at]
        .iter()
        .rposition(|&b| b == b'\n')
        .map_or(0, |i| i + 1);
    let line_end = bytes[at..]
        .iter()
        .position(|&b| b == b'\n')
        .map_or(bytes.len(), |i| at + i);
    Location {
        file: file.to_string(),
        line: bytes[..at].iter().filter(|&&b| b == b'\n').count() + 1,
        column: String::from_utf8_lossy(&bytes[line_start..at])
            .chars()
            .count()
            + 1,
        source_line: String::from_utf8_lossy(&bytes[line_start..line_end])
            .trim_end_matches('\r')
            .to_string(),
        width: 1,
    }
}

/// Compiles rule-file text. `name` is used in diagnostics; `base` is the
/// directory relative includes are looked up in (None: bundled files only).
pub fn compile(
    name: &str,
    text: &str,
    base: Option<&Path>,
    options: &CompileOptions,
) -> Result<RuleSet, Diagnostics> {
    let mut cx = Context {
        sources: SourceMap::default(),
        diagnostics: Vec::new(),
    };
    let files = load_includes(&mut cx, name, text, base);
    let statements: Vec<&Statement> = files.iter().flat_map(|f| f.statements.iter()).collect();
    let header = read_settings(&mut cx, &statements, options);
    let classes = resolve_classes(&mut cx, &statements, &header.normalizer);
    let mut segments: BTreeSet<String> = header.segments.clone();
    for class in classes.values() {
        segments.extend(
            class
                .members
                .iter()
                .filter(|m| m.chars().count() > 1)
                .cloned(),
        );
    }
    let segmenter = Segmenter::new(segments);
    let mut expanded = expand_rules(
        &mut cx,
        &statements,
        &classes,
        &header.normalizer,
        &segmenter,
    );
    let patterns = read_patterns(&mut cx, &statements, &classes);
    let (edge_start, edge_end) = read_edges(&mut cx, &statements);
    check_rule_names(&mut cx, &statements);
    check_duplicates(&mut cx, &expanded);
    if header.settings.hyphenated_compounds {
        add_hyphen_twins(&mut expanded.instances);
    }
    let mut examples = expanded.examples;
    for st in &statements {
        if let Statement::Example(e) = st {
            examples.push(Example {
                rule: None,
                parts: e.parts.clone(),
                surface: e.surface.clone(),
                location: cx.sources.locate(e.span),
            });
        }
    }
    let (errors, warnings): (Vec<_>, Vec<_>) = cx
        .diagnostics
        .into_iter()
        .partition(|d| d.severity == Severity::Error);
    if !errors.is_empty() {
        let mut all = errors;
        all.extend(warnings);
        return Err(Diagnostics(all));
    }
    let mut set = RuleSet {
        name: name.trim_start_matches("bundled:").to_string(),
        language: header.language,
        description: header.description,
        normalizer: header.normalizer,
        segmenter,
        classes: classes.into_values().collect(),
        rules: expanded.rules,
        instances: expanded.instances,
        patterns,
        edge_start,
        edge_end,
        examples,
        variants: header.variants,
        settings: header.settings,
        sources: cx.sources,
        warnings,
        surface_index: Default::default(),
        max_surface_chars: 0,
        surface_trie: Default::default(),
        condition_ids: Default::default(),
        end_index: Default::default(),
        max_left_chars: 0,
        max_right_chars: 0,
    };
    set.classes.sort_by(|a, b| {
        (a.location.file.clone(), a.location.line).cmp(&(b.location.file.clone(), b.location.line))
    });
    index(&mut set);
    Ok(set)
}

struct Context {
    sources: SourceMap,
    diagnostics: Vec<Diagnostic>,
}

impl Context {
    fn at(&self, span: Span) -> Option<Location> {
        Some(self.sources.locate(span))
    }
    fn error(
        &mut self,
        code: &'static str,
        message: impl Into<String>,
        span: Span,
        hint: Option<String>,
    ) {
        let mut d = Diagnostic::error(code, message, self.at(span));
        if let Some(h) = hint {
            d = d.with_hint(h);
        }
        self.diagnostics.push(d);
    }
}

// ------------------------------------------------------------------ pass 1

/// Pass 1: parses the root file and, depth first, every file it includes.
/// A circular include or an unknown include is an error at the `include` line.
fn load_includes(cx: &mut Context, name: &str, text: &str, base: Option<&Path>) -> Vec<RuleFile> {
    let mut out = Vec::new();
    let mut stack = vec![name.to_string()];
    load_one(
        cx,
        name,
        text,
        base.map(Path::to_path_buf),
        &mut stack,
        &mut out,
        &mut BTreeSet::new(),
    );
    out
}

fn load_one(
    cx: &mut Context,
    name: &str,
    text: &str,
    base: Option<PathBuf>,
    stack: &mut Vec<String>,
    out: &mut Vec<RuleFile>,
    seen: &mut BTreeSet<String>,
) {
    let id = cx.sources.add(name, text);
    let (file, diags) = parse_file(&cx.sources, id);
    cx.diagnostics.extend(diags);
    let includes: Vec<Spanned<String>> = file
        .statements
        .iter()
        .filter_map(|s| {
            if let Statement::Include(i) = s {
                Some(i.clone())
            } else {
                None
            }
        })
        .collect();
    out.push(file);
    for inc in includes {
        let (inc_name, inc_text, inc_base) = match resolve_include(&inc.value, base.as_deref()) {
            Ok(found) => found,
            Err(why) => {
                cx.error(
                    "unknown-include",
                    format!("cannot include `{}`: {why}", inc.value),
                    inc.span,
                    Some(format!(
                        "bundled rule files: {}",
                        bundled::names().join(", ")
                    )),
                );
                continue;
            }
        };
        let identity = file_identity(&inc_name);
        if stack.iter().any(|s| file_identity(s) == identity) {
            let chain = stack
                .iter()
                .chain(std::iter::once(&inc_name))
                .cloned()
                .collect::<Vec<_>>()
                .join(" → ");
            cx.error(
                "circular-include",
                format!("circular include: {chain}"),
                inc.span,
                Some("remove one of the includes in this chain".into()),
            );
            continue;
        }
        if stack.len() >= MAX_INCLUDE_DEPTH {
            cx.error(
                "include-depth",
                format!("includes nest deeper than {MAX_INCLUDE_DEPTH} files"),
                inc.span,
                None,
            );
            continue;
        }
        if !seen.insert(identity) {
            // Already included through another path: its definitions are in.
            continue;
        }
        stack.push(inc_name.clone());
        load_one(cx, &inc_name, &inc_text, inc_base, stack, out, seen);
        stack.pop();
    }
}

/// What identifies a rule file for finding circular and repeated includes:
/// its canonical path when it is a file on disk (so `sub/../a.jr`, `./a.jr`
/// and `a.jr` are one file), else its name (`bundled:NAME`).
fn file_identity(name: &str) -> String {
    if name.starts_with("bundled:") {
        return name.to_string();
    }
    std::fs::canonicalize(name).map_or_else(|_| name.to_string(), |p| p.display().to_string())
}

/// `a/./b/../c.jr` → `a/c.jr`, without touching the file system (for the
/// names shown in diagnostics).
fn clean_path(path: &Path) -> PathBuf {
    use std::path::Component;
    let mut out = PathBuf::new();
    for c in path.components() {
        match c {
            Component::CurDir => {}
            Component::ParentDir
                if matches!(out.components().next_back(), Some(Component::Normal(_))) =>
            {
                out.pop();
            }
            other => out.push(other.as_os_str()),
        }
    }
    out
}

fn resolve_include(
    target: &str,
    base: Option<&Path>,
) -> Result<(String, String, Option<PathBuf>), String> {
    if let Some(base) = base {
        for candidate in [base.join(target), base.join(format!("{target}.jr"))] {
            if candidate.is_file() {
                let text = std::fs::read_to_string(&candidate).map_err(|e| e.to_string())?;
                return Ok((
                    clean_path(&candidate).display().to_string(),
                    text,
                    candidate.parent().map(Path::to_path_buf),
                ));
            }
        }
    }
    let bare = target.trim_end_matches(".jr");
    let bare = bare.rsplit('/').next().unwrap_or(bare);
    if let Some(text) = bundled::rule_set(bare) {
        return Ok((format!("bundled:{bare}"), text.to_string(), None));
    }
    Err("no such bundled rule file, and no such file next to the including file".into())
}

// ------------------------------------------------------------------ pass 2

struct Header {
    language: String,
    description: String,
    normalizer: Normalizer,
    segments: BTreeSet<String>,
    settings: Settings,
    variants: Vec<Variant>,
}

/// Pass 2: reads the header statements and `set` values.
fn read_settings(cx: &mut Context, statements: &[&Statement], options: &CompileOptions) -> Header {
    let mut header = Header {
        language: String::new(),
        description: String::new(),
        normalizer: Normalizer::default(),
        segments: BTreeSet::new(),
        settings: Settings::default(),
        variants: Vec::new(),
    };
    let mut seen_sets: HashMap<String, Span> = HashMap::new();
    for st in statements {
        match st {
            Statement::Language(l) => {
                if header.language.is_empty() {
                    header.language = l.value.clone();
                }
            }
            Statement::Description(d) => {
                if header.description.is_empty() {
                    header.description = d.value.clone();
                }
            }
            Statement::Normalize(n) => header.normalizer.form = n.value,
            Statement::Case(c) => header.normalizer.fold_case = c.value,
            Statement::Set(s) => {
                if let Some(first) = seen_sets.get(&s.name.value) {
                    let first = cx.sources.locate(*first);
                    let d = Diagnostic::error(
                        "duplicate-setting",
                        format!("`{}` is set twice", s.name.value),
                        cx.at(s.name.span),
                    )
                    .with_related("first set here", first);
                    cx.diagnostics.push(d);
                    continue;
                }
                seen_sets.insert(s.name.value.clone(), s.name.span);
                apply_setting(cx, &mut header.settings, s);
            }
            Statement::Variant(v) => {
                let from: Vec<char> = v.from.value.chars().collect();
                if from.len() != 1 {
                    cx.error(
                        "variant-fold",
                        "a variant folds one letter into letters",
                        v.from.span,
                        Some("write e.g. `variant swiss: fold ß = ss`".into()),
                    );
                    continue;
                }
                header.variants.push(Variant {
                    name: v.name.value.clone(),
                    description: v.description.clone(),
                    from: v.from.value.clone(),
                    to: v.to.value.clone(),
                    selected: v.name.value.is_empty()
                        || options.variants.iter().any(|n| n == &v.name.value),
                });
            }
            _ => {}
        }
    }
    for wanted in &options.variants {
        if !header.variants.iter().any(|v| &v.name == wanted) {
            let known: Vec<_> = header.variants.iter().map(|v| v.name.clone()).collect();
            cx.diagnostics.push(
                Diagnostic::error(
                    "unknown-variant",
                    format!("this rule-set has no variant `{wanted}`"),
                    None,
                )
                .with_hint(if known.is_empty() {
                    "it declares no variants".to_string()
                } else {
                    format!("variants: {}", known.join(", "))
                }),
            );
        }
    }
    for v in header.variants.iter().filter(|v| v.selected) {
        if let Some(c) = v.from.chars().next() {
            let to = header.normalizer.normalize(&v.to);
            let c = header
                .normalizer
                .normalize(&c.to_string())
                .chars()
                .next()
                .unwrap_or(c);
            header.normalizer.folds.insert(c, to);
        }
    }
    for st in statements {
        if let Statement::Segments(list) = st {
            for s in list {
                header
                    .segments
                    .insert(header.normalizer.normalize(&s.value));
            }
        }
    }
    header
}

const SETTINGS: &[&str] = &[
    "ranking",
    "min-part-length",
    "max-parts",
    "part-cost",
    "split-cost",
    "pattern-frequency",
    "lexicon",
    "script",
    "shadowed-linking",
    "lexicalised-bonus",
    "first-member-bonus",
    "unlisted-combining-cost",
    "noun-capitals",
    "hyphenated-compounds",
    "verb-after-noun",
    "noun-head",
];

fn apply_setting(cx: &mut Context, settings: &mut Settings, s: &SetDecl) {
    let name = s.name.value.as_str();
    let number = |cx: &mut Context, whole: bool| -> Option<f64> {
        match s.value.value {
            SetValue::Number(n) if !whole || (n >= 0.0 && n.fract() == 0.0) => Some(n),
            _ => {
                cx.error(
                    "setting-value",
                    format!(
                        "`{name}` takes {}",
                        if whole { "a whole number" } else { "a number" }
                    ),
                    s.value.span,
                    None,
                );
                None
            }
        }
    };
    let word = |cx: &mut Context| -> Option<String> {
        match &s.value.value {
            SetValue::Name(n) => Some(n.clone()),
            SetValue::Number(_) => {
                cx.error(
                    "setting-value",
                    format!("`{name}` takes a name"),
                    s.value.span,
                    None,
                );
                None
            }
        }
    };
    let on_off = |cx: &mut Context, meaning: &str| -> Option<bool> {
        match word(cx).as_deref() {
            Some("on") => Some(true),
            Some("off") => Some(false),
            Some(other) => {
                cx.error(
                    "setting-value",
                    format!("`{name}` is `on` or `off`, not `{other}`"),
                    s.value.span,
                    Some(meaning.into()),
                );
                None
            }
            None => None,
        }
    };
    // `always` or `capitalised` (true), for the settings about words written small.
    let always_or_capitalised = |cx: &mut Context, meaning: &str| -> Option<bool> {
        match word(cx).as_deref() {
            Some("always") => Some(false),
            Some("capitalised") => Some(true),
            Some(other) => {
                cx.error(
                    "setting-value",
                    format!("unknown value `{other}` of `{name}`"),
                    s.value.span,
                    Some(format!("use `always`, or `capitalised`: {meaning}")),
                );
                None
            }
            None => None,
        }
    };
    match name {
        "ranking" => match word(cx).as_deref() {
            Some("frequency") => settings.ranking = Ranking::Frequency,
            Some("probability") => settings.ranking = Ranking::Probability,
            Some(other) => cx.error(
                "setting-value",
                format!("unknown ranking `{other}`"),
                s.value.span,
                Some("use `frequency` (Koehn & Knight geometric mean) or `probability`".into()),
            ),
            None => {}
        },
        "min-part-length" => {
            if let Some(n) = number(cx, true) {
                settings.min_part_length = n as usize;
            }
        }
        "max-parts" => {
            if let Some(n) = number(cx, true) {
                settings.max_parts = n as usize;
            }
        }
        "part-cost" => {
            if let Some(n) = number(cx, false) {
                settings.part_cost = n;
            }
        }
        "split-cost" => {
            if let Some(n) = number(cx, false) {
                settings.split_cost = n;
            }
        }
        "lexicalised-bonus" => {
            if let Some(n) = number(cx, false) {
                settings.lexicalised_bonus = n;
            }
        }
        "first-member-bonus" => {
            if let Some(n) = number(cx, false) {
                settings.first_member_bonus = n;
            }
        }
        "unlisted-combining-cost" => {
            if let Some(n) = number(cx, false) {
                settings.unlisted_combining_cost = n;
            }
        }
        "pattern-frequency" => {
            if let Some(n) = number(cx, false) {
                settings.pattern_frequency = n.max(0.0);
            }
        }
        "shadowed-linking" => {
            if let Some(on) = on_off(
                cx,
                "`off` drops linking readings that a word of its own spells (Ei + s in Eisberg)",
            ) {
                settings.shadowed_linking = on;
            }
        }
        "noun-capitals" => {
            if let Some(on) = on_off(
                cx,
                "`on` shows parts read as nouns with a capital first letter (German orthography)",
            ) {
                settings.noun_capitals = on;
            }
        }
        "hyphenated-compounds" => {
            if let Some(on) = on_off(
                cx,
                "`on` lets every junction written together in a compound also be written with a hyphen (Zeitungs-Artikel)",
            ) {
                settings.hyphenated_compounds = on;
            }
        }
        "verb-after-noun" => {
            if let Some(capitalised) = always_or_capitalised(
                cx,
                "a part read only as a verb follows one read as a noun only in an input that starts with a capital (German: Autofahren, but not zug + lassen)",
            ) {
                settings.verb_after_noun_capitalised = capitalised;
            }
        }
        "noun-head" => {
            if let Some(capitalised) = always_or_capitalised(
                cx,
                "a last part read only as a noun is refused in a word written small that the lexicon lists as no noun (German: vereinbart is not Verein + Bart)",
            ) {
                settings.noun_head_capitalised = capitalised;
            }
        }
        "lexicon" => settings.lexicon = word(cx),
        "script" => settings.script = word(cx),
        _ => cx.error(
            "unknown-setting",
            format!("unknown setting `{name}`"),
            s.name.span,
            Some(
                match SETTINGS.iter().find(|k| edit_distance(k, name) <= 2) {
                    Some(close) => {
                        format!("did you mean `{close}`? settings: {}", SETTINGS.join(", "))
                    }
                    None => format!("settings: {}", SETTINGS.join(", ")),
                },
            ),
        ),
    }
}

// ------------------------------------------------------------------ pass 3

struct ResolvedClass {
    members: Vec<String>,
    location: Location,
    span: Span,
}

/// Pass 3: resolves every class to its ordered list of segments.
fn resolve_classes(
    cx: &mut Context,
    statements: &[&Statement],
    normalizer: &Normalizer,
) -> BTreeMap<String, Class> {
    let mut decls: BTreeMap<String, &ClassDecl> = BTreeMap::new();
    for st in statements {
        if let Statement::Class(c) = st {
            if let Some(first) = decls.get(&c.name.value) {
                let first = cx.sources.locate(first.name.span);
                let d = Diagnostic::error(
                    "duplicate-class",
                    format!("class `{}` is defined twice", c.name.value),
                    cx.at(c.name.span),
                )
                .with_related("first defined here", first)
                .with_hint("rename one of them, or merge their members");
                cx.diagnostics.push(d);
                continue;
            }
            decls.insert(c.name.value.clone(), c);
        }
    }
    let mut done: BTreeMap<String, ResolvedClass> = BTreeMap::new();
    let names: Vec<String> = decls.keys().cloned().collect();
    let mut budget = MAX_CLASS_MEMBERS;
    for name in names {
        let mut visiting = Vec::new();
        let mut walk = ClassWalk {
            visiting: &mut visiting,
            budget: &mut budget,
        };
        resolve_class(cx, &name, &decls, &mut done, &mut walk, normalizer);
    }
    done.into_iter()
        .map(|(name, c)| {
            let _ = c.span;
            (
                name.clone(),
                Class {
                    name,
                    members: c.members,
                    location: c.location,
                },
            )
        })
        .collect()
}

/// The state of one walk through class references: the classes being
/// resolved (innermost last) and how many members all classes may still have.
struct ClassWalk<'a> {
    visiting: &'a mut Vec<String>,
    budget: &'a mut usize,
}

fn resolve_class(
    cx: &mut Context,
    name: &str,
    decls: &BTreeMap<String, &ClassDecl>,
    done: &mut BTreeMap<String, ResolvedClass>,
    walk: &mut ClassWalk,
    normalizer: &Normalizer,
) -> Option<Vec<String>> {
    if let Some(c) = done.get(name) {
        return Some(c.members.clone());
    }
    let decl = decls.get(name)?;
    let visiting = &mut *walk.visiting;
    if visiting.iter().any(|v| v == name) {
        return None;
    }
    if visiting.len() >= MAX_CLASS_DEPTH {
        // Reported once: every deeper class of the chain would repeat it.
        if !cx.diagnostics.iter().any(|d| d.code == "class-depth") {
            cx.error(
                "class-depth",
                format!(
                    "classes nest deeper than {MAX_CLASS_DEPTH} levels: {} → … → `{name}`",
                    visiting[0]
                ),
                decl.name.span,
                Some(
                    "list the members of some class directly instead of through other classes"
                        .into(),
                ),
            );
        }
        return None;
    }
    visiting.push(name.to_string());
    let mut members = Vec::new();
    let mut too_large = false;
    for m in &decl.members {
        if members.len() >= *walk.budget {
            too_large = true;
            break;
        }
        match m {
            ClassMember::Segment(s) => {
                let normalized = normalizer.normalize(&s.value);
                if s.value.chars().count() == 1 && normalized.chars().count() > 1 {
                    // A letter the rule-set folds (`fold ß = ss`) becomes a
                    // segment of several letters, and the input is then never
                    // cut inside those letters anywhere: easy to write by
                    // accident, so said.
                    let d = Diagnostic::warning(
                        "class-member-folds",
                        format!(
                            "`{}` in class `{name}` is folded to `{normalized}`, which becomes a segment of {} letters: no junction can fall between those letters anywhere in an input",
                            s.value,
                            normalized.chars().count()
                        ),
                        cx.at(s.span),
                    )
                    .with_hint(format!(
                        "leave `{}` out of the class (the input is folded too), or list `{normalized}` if one segment is meant",
                        s.value
                    ));
                    cx.diagnostics.push(d);
                }
                members.push(normalized)
            }
            ClassMember::Class(r) => {
                let visiting = &*walk.visiting;
                if visiting.iter().any(|v| v == &r.value) {
                    let chain = visiting
                        .iter()
                        .chain(std::iter::once(&r.value))
                        .cloned()
                        .collect::<Vec<_>>()
                        .join(" → ");
                    cx.error(
                        "circular-class",
                        format!("class `{name}` contains itself: {chain}"),
                        r.span,
                        Some("a class may only include classes defined without it".into()),
                    );
                    continue;
                }
                if !decls.contains_key(&r.value) {
                    cx.error(
                        "unknown-class",
                        format!("class `{}` is not defined", r.value),
                        r.span,
                        Some(suggest(&r.value, decls.keys())),
                    );
                    continue;
                }
                if let Some(sub) = resolve_class(cx, &r.value, decls, done, walk, normalizer) {
                    if members.len() + sub.len() > *walk.budget {
                        too_large = true;
                        break;
                    }
                    members.extend(sub);
                }
            }
        }
    }
    walk.visiting.pop();
    if too_large {
        cx.error(
            "class-too-large",
            format!(
                "class `{name}` takes the classes of this rule-set past {MAX_CLASS_MEMBERS} members in all"
            ),
            decl.name.span,
            Some("classes made of classes multiply quickly: list fewer members".into()),
        );
        members.clear();
    }
    *walk.budget -= members.len();
    let location = cx.sources.locate(decl.name.span);
    done.insert(
        name.to_string(),
        ResolvedClass {
            members: members.clone(),
            location,
            span: decl.span,
        },
    );
    Some(members)
}

/// A slot names neither a class nor a label of its rule.
fn unknown_slot(cx: &mut Context, name: &str, span: Span, classes: &BTreeMap<String, Class>) {
    cx.error(
        "unknown-class",
        format!("`{name}` is neither a class nor a label of this rule"),
        span,
        Some(suggest(name, classes.keys())),
    );
}

fn suggest<'a>(name: &str, known: impl Iterator<Item = &'a String>) -> String {
    let known: Vec<&String> = known.collect();
    let close = known
        .iter()
        .filter(|k| edit_distance(k, name) <= 2)
        .map(|k| k.as_str())
        .collect::<Vec<_>>();
    if let Some(k) = close.first() {
        format!("did you mean `{k}`?")
    } else if known.is_empty() {
        "no classes are defined; define one with `class NAME = a b c`".into()
    } else {
        format!(
            "defined classes: {}",
            known
                .iter()
                .map(|k| k.as_str())
                .collect::<Vec<_>>()
                .join(", ")
        )
    }
}

fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for i in 1..=a.len() {
        let mut cur = vec![i; b.len() + 1];
        for j in 1..=b.len() {
            let sub = prev[j - 1] + usize::from(a[i - 1] != b[j - 1]);
            cur[j] = sub.min(prev[j] + 1).min(cur[j - 1] + 1);
        }
        prev = cur;
    }
    prev[b.len()]
}

// ------------------------------------------------------------------ pass 4

struct Expanded {
    rules: Vec<JunctionRule>,
    instances: Vec<Instance>,
    examples: Vec<Example>,
    /// For each rule, its name span and the set of instance indices.
    spans: Vec<Span>,
}

/// What an underlying slot stands for during expansion.
#[derive(Clone)]
enum Piece {
    /// Fixed letters.
    Text(String),
    /// The i-th free slot (enumerated over its class).
    Free(usize),
}

/// A surface piece.
#[derive(Clone)]
enum SurfacePiece {
    Text(String),
    Copy(usize),
    Map(usize, Vec<String>),
    Boundary(BoundaryMark),
}

/// Pass 4: resolves each rule's slots and expands it into instances.
fn expand_rules(
    cx: &mut Context,
    statements: &[&Statement],
    classes: &BTreeMap<String, Class>,
    normalizer: &Normalizer,
    segmenter: &Segmenter,
) -> Expanded {
    let mut out = Expanded {
        rules: Vec::new(),
        instances: Vec::new(),
        examples: Vec::new(),
        spans: Vec::new(),
    };
    for st in statements {
        let Statement::Rule(rule) = st else { continue };
        let index = out.rules.len();
        let Some((compiled, instances)) =
            expand_rule(cx, rule, classes, normalizer, segmenter, index)
        else {
            continue;
        };
        if out.instances.len() + instances.len() > MAX_INSTANCES {
            cx.error(
                "too-many-instances",
                format!("the rule-set expands to more than {MAX_INSTANCES} junction instances"),
                rule.name.span,
                Some("split large classes, or write the rule with literals".into()),
            );
            continue;
        }
        for ex in &rule.examples {
            out.examples.push(Example {
                rule: Some(index),
                parts: ex.parts.clone(),
                surface: ex.surface.clone(),
                location: cx.sources.locate(ex.span),
            });
        }
        out.spans.push(rule.name.span);
        out.rules.push(compiled);
        out.instances.extend(instances);
    }
    out
}

fn expand_rule(
    cx: &mut Context,
    rule: &RuleDecl,
    classes: &BTreeMap<String, Class>,
    normalizer: &Normalizer,
    segmenter: &Segmenter,
    index: usize,
) -> Option<(JunctionRule, Vec<Instance>)> {
    let errors_before = cx
        .diagnostics
        .iter()
        .filter(|d| d.severity == Severity::Error)
        .count();
    // Free slots: (class members, class name); labels: name → free slot.
    let mut free: Vec<(Vec<String>, String)> = Vec::new();
    let mut labels: HashMap<String, usize> = HashMap::new();
    let mut implicit: HashMap<String, Option<usize>> = HashMap::new();
    let mut classes_used = BTreeSet::new();
    let mut sides: [Vec<Piece>; 2] = [Vec::new(), Vec::new()];
    for (side_index, items) in [&rule.change.left, &rule.change.right]
        .into_iter()
        .enumerate()
    {
        for item in items {
            match &item.value {
                ChangeItem::Literal(text) => {
                    sides[side_index].push(Piece::Text(normalizer.normalize(text)))
                }
                ChangeItem::Boundary(_) => {
                    unreachable!("grammar: no boundary on the underlying side")
                }
                ChangeItem::Slot(slot) => {
                    if slot.map_to.is_some() {
                        cx.error(
                            "map-on-underlying-side",
                            "a correspondence `[x>class]` belongs on the surface side",
                            item.span,
                            Some("on the left and right sides write the class `[class]` or a label `[x:class]`".into()),
                        );
                        continue;
                    }
                    if slot.label.is_none() {
                        if let Some(&bound) = labels.get(&slot.name) {
                            // A reference to a labelled slot: the same segment again.
                            sides[side_index].push(Piece::Free(bound));
                            continue;
                        }
                    }
                    let Some(class) = classes.get(&slot.name) else {
                        unknown_slot(cx, &slot.name, item.span, classes);
                        continue;
                    };
                    classes_used.insert(class.name.clone());
                    if class.members.is_empty() {
                        cx.error(
                            "empty-class",
                            format!("class `{}` has no members", class.name),
                            item.span,
                            None,
                        );
                        continue;
                    }
                    let id = free.len();
                    free.push((class.members.clone(), class.name.clone()));
                    if let Some(label) = &slot.label {
                        if labels.insert(label.clone(), id).is_some() {
                            cx.error(
                                "duplicate-label",
                                format!("label `{label}` is bound twice in this rule"),
                                item.span,
                                Some(format!("write `[{label}]` to repeat the same segment")),
                            );
                        }
                        if classes.contains_key(label) {
                            cx.error(
                                "label-shadows-class",
                                format!("label `{label}` has the name of a class"),
                                item.span,
                                Some("choose a label that is not a class name".into()),
                            );
                        }
                    } else {
                        implicit
                            .entry(class.name.clone())
                            .and_modify(|e| *e = None)
                            .or_insert(Some(id));
                    }
                    sides[side_index].push(Piece::Free(id));
                }
            }
        }
    }
    // Surface side.
    let mut surface: Vec<SurfacePiece> = Vec::new();
    let mut boundary: Option<(BoundaryMark, Span)> = None;
    for item in &rule.change.surface {
        match &item.value {
            ChangeItem::Literal(text) => {
                surface.push(SurfacePiece::Text(normalizer.normalize(text)))
            }
            ChangeItem::Boundary(mark) => {
                if let Some((_, first)) = boundary {
                    let first = cx.sources.locate(first);
                    let d = Diagnostic::error(
                        "two-boundaries",
                        "the surface side has two boundary marks",
                        cx.at(item.span),
                    )
                    .with_related("first mark here", first)
                    .with_hint("a junction joins two words: mark the one place where they meet");
                    cx.diagnostics.push(d);
                    continue;
                }
                boundary = Some((*mark, item.span));
                surface.push(SurfacePiece::Boundary(*mark));
            }
            ChangeItem::Slot(slot) => {
                if slot.label.is_some() {
                    cx.error(
                        "label-on-surface",
                        "labels are bound on the left and right sides, not on the surface",
                        item.span,
                        Some("write `[x]` or `[x>class]` on the surface".into()),
                    );
                    continue;
                }
                let source = if let Some(&id) = labels.get(&slot.name) {
                    Some(id)
                } else {
                    match implicit.get(&slot.name) {
                        Some(Some(id)) => Some(*id),
                        Some(None) => {
                            cx.error(
                                "ambiguous-slot",
                                format!("`[{}]` could copy more than one underlying slot of class `{}`", slot.name, slot.name),
                                item.span,
                                Some(format!("label the underlying slots, e.g. `[a:{0}] + [b:{0}]`, and write `[a]` or `[b]` here", slot.name)),
                            );
                            None
                        }
                        None => {
                            if classes.contains_key(&slot.name) {
                                cx.error(
                                    "unbound-slot",
                                    format!("`[{}]` on the surface copies nothing: no underlying slot has class `{}`", slot.name, slot.name),
                                    item.span,
                                    Some("a surface slot copies or maps an underlying one; write letters for fixed material".into()),
                                );
                            } else {
                                unknown_slot(cx, &slot.name, item.span, classes);
                            }
                            None
                        }
                    }
                };
                let Some(id) = source else { continue };
                match &slot.map_to {
                    None => surface.push(SurfacePiece::Copy(id)),
                    Some(target) => {
                        let Some(target_class) = classes.get(target) else {
                            cx.error(
                                "unknown-class",
                                format!("class `{target}` is not defined"),
                                item.span,
                                Some(suggest(target, classes.keys())),
                            );
                            continue;
                        };
                        classes_used.insert(target.clone());
                        let (members, from_name) = &free[id];
                        if members.len() != target_class.members.len() {
                            let d = Diagnostic::error(
                                "correspondence-length",
                                format!(
                                    "`[{}>{}]` maps class `{}` ({} members) onto class `{}` ({} members)",
                                    slot.name,
                                    target,
                                    from_name,
                                    members.len(),
                                    target,
                                    target_class.members.len()
                                ),
                                cx.at(item.span),
                            )
                            .with_related(format!("class `{target}` is defined here"), target_class.location.clone())
                            .with_hint("a correspondence pairs members position by position: the two classes need the same number of members");
                            cx.diagnostics.push(d);
                            continue;
                        }
                        surface.push(SurfacePiece::Map(id, target_class.members.clone()));
                    }
                }
            }
        }
    }
    // Conditions.
    let mut left_conditions = Vec::new();
    let mut right_conditions = Vec::new();
    for c in &rule.conditions {
        match c.value.side {
            Side::Left => left_conditions.push(c.value.clone()),
            Side::Right => right_conditions.push(c.value.clone()),
        }
    }
    let scope = rule.scope.as_ref().map_or(Scope::Any, |s| s.value);
    if let (Some(s), Some((BoundaryMark::Space, _))) = (&rule.scope, boundary) {
        if s.value == Scope::Compound {
            cx.error(
                "scope-conflict",
                "a rule `in compound` cannot print a space between the parts",
                s.span,
                Some("use `|` or `-` for compounds, or `in phrase`".into()),
            );
        }
    }
    let errors_now = cx
        .diagnostics
        .iter()
        .filter(|d| d.severity == Severity::Error)
        .count();
    if errors_now > errors_before {
        return None;
    }
    // Expansion.
    let combos: u128 = free.iter().map(|(m, _)| m.len() as u128).product();
    if combos > MAX_INSTANCES_PER_RULE as u128 {
        cx.error(
            "too-many-instances",
            format!(
                "rule `{}` expands to {combos} instances (at most {MAX_INSTANCES_PER_RULE})",
                rule.name.value
            ),
            rule.change.span,
            Some("use labels to tie slots together, or smaller classes".into()),
        );
        return None;
    }
    let mut instances: Vec<Instance> = Vec::new();
    // Instances made so far, by content hash (the same combination of
    // segments can come out of two choices).
    let mut seen: FxHashMap<u64, Vec<u32>> = FxHashMap::default();
    let mut choice = vec![0usize; free.len()];
    loop {
        let render = |pieces: &[Piece]| -> String {
            pieces
                .iter()
                .map(|p| match p {
                    Piece::Text(t) => t.clone(),
                    Piece::Free(i) => free[*i].0[choice[*i]].clone(),
                })
                .collect()
        };
        let left = render(&sides[0]);
        let right = render(&sides[1]);
        let mut before = String::new();
        let mut after = String::new();
        let mut mark = None;
        for p in &surface {
            let text = match p {
                SurfacePiece::Text(t) => t.clone(),
                SurfacePiece::Copy(i) => free[*i].0[choice[*i]].clone(),
                SurfacePiece::Map(i, target) => target[choice[*i]].clone(),
                SurfacePiece::Boundary(m) => {
                    mark = Some(*m);
                    continue;
                }
            };
            if mark.is_some() {
                after.push_str(&text);
            } else {
                before.push_str(&text);
            }
        }
        let separators: Vec<Separator> = match mark {
            None => vec![Separator::Merged],
            Some(BoundaryMark::Plain) => vec![Separator::None],
            Some(BoundaryMark::Space) => vec![Separator::Space],
            Some(BoundaryMark::Hyphen) => vec![Separator::Hyphen],
            Some(BoundaryMark::OptionalSpace) => vec![Separator::Space, Separator::None],
        };
        let last = separators.len().saturating_sub(1);
        let (mut left, mut right, mut before, mut after) = (left, right, before, after);
        for (n, sep) in separators.into_iter().enumerate() {
            // The last separator takes the strings, the others copies.
            let take = |s: &mut String| {
                if n == last {
                    std::mem::take(s)
                } else {
                    s.clone()
                }
            };
            let inst = Instance {
                rule: index,
                left: take(&mut left),
                right: take(&mut right),
                surface_left: take(&mut before),
                separator: sep,
                surface_right: take(&mut after),
                scope: if sep == Separator::Space {
                    Scope::Phrase
                } else {
                    scope
                },
            };
            let same = seen.entry(FxBuildHasher.hash_one(&inst)).or_default();
            if !same.iter().any(|&i| instances[i as usize] == inst) {
                same.push(instances.len() as u32);
                instances.push(inst);
            }
        }
        // Next combination.
        let mut k = 0;
        loop {
            if k == choice.len() {
                break;
            }
            choice[k] += 1;
            if choice[k] < free[k].0.len() {
                break;
            }
            choice[k] = 0;
            k += 1;
        }
        if k == choice.len() {
            break;
        }
    }
    // Structural checks on the expanded form.
    if let Some(first) = instances.first() {
        if first.separator == Separator::Merged && (first.left.is_empty() || first.right.is_empty())
        {
            cx.error(
                "merge-needs-both-sides",
                "this change has no boundary mark, so its surface would be shared by both words, but one side has no underlying material",
                rule.change.span,
                Some("mark where the words meet on the surface: `|` (nothing printed), `_` (space), `-` (hyphen)".into()),
            );
            return None;
        }
        if instances.iter().all(|i| {
            i.left.is_empty()
                && i.right.is_empty()
                && i.surface().is_empty()
                && i.separator == Separator::Merged
        }) {
            cx.error(
                "consumes-nothing",
                "this rule consumes nothing and produces nothing",
                rule.change.span,
                Some("plain concatenation is written `+ -> |`".into()),
            );
            return None;
        }
    }
    let _ = segmenter;
    let change_text = {
        let file = cx.sources.file(rule.change.span.file);
        file.text[rule.change.span.start..rule.change.span.end]
            .trim()
            .to_string()
    };
    let compiled = JunctionRule {
        name: rule.name.value.clone(),
        description: rule.description.clone(),
        change: change_text,
        cost: rule.cost.as_ref().map_or(1.0, |c| c.value),
        scope,
        left_conditions,
        right_conditions,
        notes: rule.notes.clone(),
        attested: rule.attested.is_some(),
        location: cx.sources.locate(rule.name.span),
        classes_used,
    };
    Some((compiled, instances))
}

/// Reads `pattern` statements.
fn read_patterns(
    cx: &mut Context,
    statements: &[&Statement],
    classes: &BTreeMap<String, Class>,
) -> Vec<Pattern> {
    let mut out = Vec::new();
    for st in statements {
        let Statement::Pattern(p) = st else { continue };
        let Some(class) = classes.get(&p.class.value) else {
            cx.error(
                "unknown-class",
                format!("class `{}` is not defined", p.class.value),
                p.class.span,
                Some(suggest(&p.class.value, classes.keys())),
            );
            continue;
        };
        if p.min == 0 || p.max.is_some_and(|m| m < p.min) {
            cx.error(
                "pattern-repeat",
                "a pattern needs at least one segment and MIN ≤ MAX",
                p.span,
                None,
            );
            continue;
        }
        out.push(Pattern {
            name: p.name.value.clone(),
            members: class.members.iter().cloned().collect(),
            min: p.min,
            max: p.max,
            uppercase: p.uppercase,
            tags: p.tags.clone(),
        });
    }
    out
}

/// Reads `edge` statements.
fn read_edges(cx: &mut Context, statements: &[&Statement]) -> (Vec<Condition>, Vec<Condition>) {
    let mut start = Vec::new();
    let mut end = Vec::new();
    for st in statements {
        let Statement::Edge(e) = st else { continue };
        for c in &e.conditions {
            let expected = if e.end { Side::Left } else { Side::Right };
            if c.value.side != expected {
                cx.error(
                    "edge-side",
                    format!(
                        "at the {} of the input only the {} word exists",
                        if e.end { "end" } else { "start" },
                        if e.end { "left" } else { "right" }
                    ),
                    c.span,
                    Some(format!(
                        "write `{}.KEY ...`",
                        if e.end { "left" } else { "right" }
                    )),
                );
                continue;
            }
            if e.end {
                end.push(c.value.clone());
            } else {
                start.push(c.value.clone());
            }
        }
    }
    (start, end)
}

// ------------------------------------------------------------------ pass 5

/// Rule names must be unique, whether or not the rules compiled (so a
/// duplicate is reported together with the other errors of the first one).
fn check_rule_names(cx: &mut Context, statements: &[&Statement]) {
    let mut seen: HashMap<&str, Span> = HashMap::new();
    for st in statements {
        let Statement::Rule(rule) = st else { continue };
        if let Some(first) = seen.get(rule.name.value.as_str()) {
            let first = cx.sources.locate(*first);
            let d = Diagnostic::error(
                "duplicate-rule",
                format!("rule `{}` is defined twice", rule.name.value),
                cx.at(rule.name.span),
            )
            .with_related("first defined here", first)
            .with_hint("rule names identify rules in proofs: give each rule its own name");
            cx.diagnostics.push(d);
            continue;
        }
        seen.insert(&rule.name.value, rule.name.span);
    }
}

/// Pass 5: rule names must be unique; two rules with exactly the same
/// instances, conditions and scope would double every analysis.
/// Under `set hyphenated-compounds = on`: after every instance that a
/// compound may use and that prints nothing between the words (`|`), the
/// same instance with a printed hyphen there, unless an instance of that
/// content exists already (a rule written with `-`). An instance that
/// consumes and prints nothing (plain `+ -> |`) gets no twin: a bare hyphen
/// is a rule of its own (`rule hyphen: + -> -`), with its own cost.
fn add_hyphen_twins(instances: &mut Vec<Instance>) {
    type Content<'i> = (&'i str, &'i str, &'i str, Separator, &'i str);
    fn content(i: &Instance) -> Content<'_> {
        (
            i.left.as_str(),
            i.right.as_str(),
            i.surface_left.as_str(),
            i.separator,
            i.surface_right.as_str(),
        )
    }
    let originals = std::mem::take(instances);
    // Hashes of the contents present (originals, then twins as they are
    // made), each with where to find the instances that have it; a twin is
    // compared in full only with those.
    let mut present: FxHashMap<u64, Vec<(bool, usize)>> = FxHashMap::default();
    for (i, inst) in originals.iter().enumerate() {
        present
            .entry(FxBuildHasher.hash_one(content(inst)))
            .or_default()
            .push((false, i));
    }
    let mut twins: Vec<Option<Instance>> = Vec::with_capacity(originals.len());
    let mut made: Vec<usize> = Vec::new();
    for inst in &originals {
        let wanted = inst.separator == Separator::None
            && inst.scope != Scope::Phrase
            && !(inst.left.is_empty()
                && inst.right.is_empty()
                && inst.surface_left.is_empty()
                && inst.surface_right.is_empty());
        if !wanted {
            twins.push(None);
            continue;
        }
        let twin = Instance {
            separator: Separator::Hyphen,
            scope: Scope::Compound,
            ..inst.clone()
        };
        let key = content(&twin);
        let slot = present.entry(FxBuildHasher.hash_one(key)).or_default();
        let exists = slot.iter().any(|&(is_twin, j)| {
            let other = if is_twin {
                twins[made[j]].as_ref()
            } else {
                originals.get(j)
            };
            other.is_some_and(|o| content(o) == key)
        });
        if exists {
            twins.push(None);
        } else {
            slot.push((true, made.len()));
            made.push(twins.len());
            twins.push(Some(twin));
        }
    }
    let mut out = Vec::with_capacity(originals.len() + made.len());
    for (inst, twin) in originals.into_iter().zip(twins) {
        out.push(inst);
        out.extend(twin);
    }
    *instances = out;
}

fn check_duplicates(cx: &mut Context, expanded: &Expanded) {
    type Content<'e> = Vec<(&'e str, &'e str, &'e str, Separator, &'e str)>;
    let mut by_name: HashMap<&str, usize> = HashMap::new();
    // Rules by a fingerprint of their instances that does not depend on
    // their order (count, wrapping sum and xor of the instances' hashes) and
    // of their clauses; only rules with equal fingerprints are compared in
    // full, so the instance lists are sorted only for likely duplicates.
    let mut by_fingerprint: FxHashMap<(usize, u64, u64, &str), Vec<usize>> = FxHashMap::default();
    let mut per_rule: Vec<Content> = vec![Vec::new(); expanded.rules.len()];
    let mut sums = vec![(0u64, 0u64); expanded.rules.len()];
    for inst in &expanded.instances {
        let content = (
            inst.left.as_str(),
            inst.right.as_str(),
            inst.surface_left.as_str(),
            inst.separator,
            inst.surface_right.as_str(),
        );
        let h = FxBuildHasher.hash_one(content);
        let sum = &mut sums[inst.rule];
        *sum = (sum.0.wrapping_add(h), sum.1 ^ h.rotate_left(17));
        per_rule[inst.rule].push(content);
    }
    let cond_keys: Vec<String> = expanded
        .rules
        .iter()
        .map(|rule| {
            format!(
                "{:?}{:?}{:?}{}",
                rule.left_conditions, rule.right_conditions, rule.scope, rule.attested
            )
        })
        .collect();
    let sorted = |i: usize| -> Content {
        let mut key = per_rule[i].clone();
        key.sort_unstable();
        key
    };
    for (i, rule) in expanded.rules.iter().enumerate() {
        if by_name.contains_key(rule.name.as_str()) {
            continue; // reported by check_rule_names
        }
        by_name.insert(&rule.name, i);
        let fingerprint = (
            per_rule[i].len(),
            sums[i].0,
            sums[i].1,
            cond_keys[i].as_str(),
        );
        let same = by_fingerprint.entry(fingerprint).or_default();
        let first = if same.is_empty() {
            None
        } else {
            let key = sorted(i);
            same.iter().copied().find(|&j| sorted(j) == key)
        };
        if let Some(first) = first {
            let d = Diagnostic::error(
                "duplicate-change",
                format!(
                    "rule `{}` describes exactly the same junctions as rule `{}`",
                    rule.name, expanded.rules[first].name
                ),
                cx.at(expanded.spans[i]),
            )
            .with_related("the other rule", expanded.rules[first].location.clone())
            .with_hint("every analysis would be found twice; remove one rule");
            cx.diagnostics.push(d);
            continue;
        }
        same.push(i);
    }
}

// ------------------------------------------------------------------ pass 6

/// Pass 6: indexes instances by surface (for splitting); the index by
/// underlying ends (for joining) is built on first use.
fn index(set: &mut RuleSet) {
    for inst in &set.instances {
        set.max_surface_chars = set.max_surface_chars.max(inst.surface_chars());
        set.max_left_chars = set.max_left_chars.max(inst.left.chars().count());
        set.max_right_chars = set.max_right_chars.max(inst.right.chars().count());
    }
    let by_surface = surface_index(&set.instances);
    let instances = &set.instances;
    let lefts: Vec<&str> = instances.iter().map(|i| i.left.as_str()).collect();
    let rights: Vec<&str> = instances.iter().map(|i| i.right.as_str()).collect();
    set.surface_trie = surface_trie::SurfaceTrie::build(
        by_surface
            .iter()
            .map(|(s, list)| (s.as_str(), list.as_slice())),
        &lefts,
        &rights,
        instances.iter().map(Instance::surface_chars).collect(),
    );
    set.surface_index = std::sync::OnceLock::from(by_surface);
    set.condition_ids =
        surface_trie::ConditionIds::build(&set.rules, &set.edge_start, &set.edge_end);
}

/// Instances by whole surface, each list by left end, then by index.
pub(crate) fn surface_index(instances: &[Instance]) -> FxHashMap<String, Vec<usize>> {
    let mut index: FxHashMap<String, Vec<usize>> = FxHashMap::default();
    index.reserve(instances.len());
    for (i, inst) in instances.iter().enumerate() {
        index.entry(inst.surface()).or_default().push(i);
    }
    for list in index.values_mut() {
        list.sort_by(|a, b| instances[*a].left.cmp(&instances[*b].left).then(a.cmp(b)));
    }
    index
}

/// Instances by underlying left end and right start.
pub(crate) fn end_index(instances: &[Instance]) -> FxHashMap<(String, String), Vec<usize>> {
    let mut index: FxHashMap<(String, String), Vec<usize>> = FxHashMap::default();
    index.reserve(instances.len());
    for (i, inst) in instances.iter().enumerate() {
        index
            .entry((inst.left.clone(), inst.right.clone()))
            .or_default()
            .push(i);
    }
    index
}

/// Renders diagnostics as one text block (for messages outside the CLI).
pub fn render(diagnostics: &Diagnostics) -> String {
    diagnostics.to_string()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn codes(text: &str) -> Vec<&'static str> {
        match compile("t.jr", text, None, &CompileOptions::default()) {
            Ok(_) => Vec::new(),
            Err(d) => d.0.iter().map(|d| d.code).collect(),
        }
    }

    /// The instances of a rule-set as `rule:left+right->surface`, with the
    /// separator as the grammar writes it.
    fn written(text: &str) -> Vec<String> {
        let set = compile("t.jr", text, None, &CompileOptions::default()).unwrap();
        set.instances
            .iter()
            .map(|i| {
                let mark = match i.separator {
                    Separator::None => "|",
                    Separator::Space => "_",
                    Separator::Hyphen => "-",
                    Separator::Merged => "",
                };
                format!(
                    "{}:{}+{}->{}{mark}{}:{:?}",
                    set.rules[i.rule].name,
                    i.left,
                    i.right,
                    i.surface_left,
                    i.surface_right,
                    i.scope
                )
            })
            .collect()
    }

    #[test]
    fn hyphenated_compounds_twin_every_compound_junction_that_prints_nothing() {
        let rules = "language x\n\
            rule link: + -> s |\n  in compound\n\
            rule plain: + -> |\n  in compound\n\
            rule gap: + -> |\n  in phrase\n\
            rule either: a + b -> a _? b\n\
            rule merge: a + i -> e\n\
            rule dash: + -> x -\n\
            rule dash-twin: + -> x |\n";
        let off = written(rules);
        let hyphenated = |i: &&String| i.split("->").nth(1).is_some_and(|s| s.contains('-'));
        assert_eq!(
            off.iter().filter(hyphenated).collect::<Vec<_>>(),
            ["dash:+->x-:Any"]
        );
        let on = written(&rules.replace(
            "language x\n",
            "language x\nset hyphenated-compounds = on\n",
        ));
        let added: Vec<&String> = on.iter().filter(|i| !off.contains(i)).collect();
        // `link` and the joined half of `either` get twins (compound scope);
        // `plain` consumes and prints nothing, `gap` is a phrase junction,
        // `merge` has no boundary, and `dash-twin`'s twin is `dash` already.
        assert_eq!(
            added,
            ["link:+->s-:Compound", "either:a+b->a-b:Compound"],
            "{on:?}"
        );
        // Each twin comes right after its own instance.
        let link = on.iter().position(|i| i == "link:+->s|:Compound").unwrap();
        assert_eq!(on[link + 1], "link:+->s-:Compound");
        assert_eq!(on.len(), off.len() + 2);
    }

    #[test]
    fn a_setting_that_is_on_or_off_rejects_another_word() {
        for name in ["hyphenated-compounds", "noun-capitals", "shadowed-linking"] {
            let got = codes(&format!("language x\nset {name} = maybe\n"));
            assert_eq!(got, ["setting-value"], "{name}");
        }
    }

    #[test]
    fn first_member_bonus_is_a_number() {
        let set = compile(
            "t.jr",
            "language x\nset first-member-bonus = 0.05\n",
            None,
            &CompileOptions::default(),
        )
        .unwrap();
        assert_eq!(set.settings.first_member_bonus, 0.05);
        let got = codes("language x\nset first-member-bonus = on\n");
        assert_eq!(got, ["setting-value"]);
    }

    #[test]
    fn duplicate_rule_is_reported_even_when_the_first_has_errors() {
        let got = codes("language x\nrule one: [vowle] + -> |\nrule one: + -> |\n");
        assert!(
            got.contains(&"unknown-class") && got.contains(&"duplicate-rule"),
            "{got:?}"
        );
    }

    #[test]
    fn numeric_bounds_parse_and_a_bound_that_is_not_a_number_is_an_error() {
        let set = compile(
            "t.jr",
            "language x\nclass cons = k r\nrule drop: [c:cons] a + -> [c] |\n  when left.letters >= 4 and right.letters <= 9\n",
            None,
            &CompileOptions::default(),
        )
        .unwrap();
        let rule = &set.rules[0];
        assert_eq!(
            rule.left_conditions[0].bound,
            Some(crate::rules::ast::Bound {
                at_least: true,
                value: 4
            })
        );
        assert_eq!(rule.right_conditions[0].bound.map(|b| b.value), Some(9));
        // The class is expanded, the length is not: two instances.
        assert_eq!(set.instances.len(), 2);
        assert_eq!(
            codes("language x\nrule j: + -> |\n  when left.letters >= many\n"),
            vec!["bad-bound"]
        );
        assert_eq!(
            codes("language x\nrule j: + -> |\n  when left.letters <= 3|4\n"),
            vec!["bad-bound"]
        );
    }

    #[test]
    fn top_level_fold_is_always_applied() {
        let set = compile(
            "t.jr",
            "language x\ncase fold\nfold ß = ss\nrule j: + -> |\n",
            None,
            &CompileOptions::default(),
        )
        .unwrap();
        assert_eq!(set.normalizer.normalize("Straße"), "strasse");
    }

    #[test]
    fn unindented_example_after_a_rule_is_top_level() {
        let set = compile(
            "t.jr",
            "language x\nrule j: + -> |\n  example a + b -> ab\nexample a + b + c -> abc\n",
            None,
            &CompileOptions::default(),
        )
        .unwrap();
        assert_eq!(set.examples.len(), 2);
        assert_eq!(set.examples[0].rule, Some(0));
        assert_eq!(set.examples[1].rule, None);
    }
}
