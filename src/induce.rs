//! Induce stage: junction rules proposed from examples `part+part<TAB>surface`.
//!
//! ```text
//! examples ─align─▶ one change per boundary (left end, right start, surface)
//!          ─generalize─▶ rules (literal, correspondence, copy) with context classes
//!          ─verify─▶ rule text that compiles and joins every example it claims
//! ```
//!
//! **Alignment.** For a left part `L`, a right part `R` and the surface `S`,
//! a junction keeps a prefix of `L` and a suffix of `R` and writes some
//! material `M` between them: `S = L[..i] + M + R[k..]`. The change is
//! `(L[i..], R[..k], M)`. Its size, `|L[i..]| + |R[..k]| + |M|`, equals
//! `|L| + |R| + |S| − 2·(i + |R[k..]|)`, so the smallest change keeps the most
//! letters: `i` at most the common prefix of `L` and `S`, the kept suffix at
//! most the common suffix of `R` and `S`, and the two together at most `|S|`.
//! When both cannot be kept whole (`dal + lon → dalon`), the right part is
//! kept whole and the change falls on the left end. Everything is counted in
//! segments, so a multi-letter segment is never cut.

/// One boundary of an example, aligned.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Alignment {
    /// Segments of the left part kept on the surface.
    pub left_kept: usize,
    /// The left part's end the junction replaces (`L[i..]`).
    pub left_end: Vec<String>,
    /// The right part's start the junction replaces (`R[..k]`).
    pub right_start: Vec<String>,
    /// What the surface shows instead (`M`).
    pub surface: Vec<String>,
    /// Segments of the right part kept on the surface.
    pub right_kept: usize,
}

impl Alignment {
    /// Offset (in segments of the surface) where `M` starts.
    pub fn at(&self) -> usize {
        self.left_kept
    }
}

/// Aligns `surface` with `left` + `right` (all as segments): the smallest change.
pub fn align_pair(left: &[String], right: &[String], surface: &[String]) -> Alignment {
    let a = left.iter().zip(surface).take_while(|(x, y)| x == y).count();
    let b = right
        .iter()
        .rev()
        .zip(surface.iter().rev())
        .take_while(|(x, y)| x == y)
        .count();
    let keep_right = b.min(surface.len());
    let keep_left = a.min(surface.len() - keep_right);
    Alignment {
        left_kept: keep_left,
        left_end: left[keep_left..].to_vec(),
        right_start: right[..right.len() - keep_right].to_vec(),
        surface: surface[keep_left..surface.len() - keep_right].to_vec(),
        right_kept: keep_right,
    }
}

// ------------------------------------------------------------------ whole examples

/// Where each part of an example sits on the surface (all in segments).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PartSpan {
    /// First segment of the part kept on the surface.
    pub from: usize,
    /// End of the kept segments of the part.
    pub to: usize,
    /// Where they stand on the surface.
    pub at: usize,
}

/// Aligns a surface with all the parts of an example at once: every part
/// keeps one stretch of its segments (the first part a prefix, the last a
/// suffix), written in order on the surface; what lies between two kept
/// stretches is the junction's surface. The alignment keeps the most
/// segments in all (the smallest total change); among equals it leaves the
/// start of right parts unchanged. None when some part would keep nothing.
pub fn align_all(parts: &[Vec<String>], surface: &[String]) -> Option<Vec<PartSpan>> {
    let n = parts.len();
    let s = surface.len();
    if n == 0 || parts.iter().any(Vec::is_empty) {
        return None;
    }
    // best[j][q]: best score with part j's kept stretch ending at surface q.
    const NONE: i64 = i64::MIN;
    let mut best = vec![vec![NONE; s + 1]; n];
    let mut back: Vec<Vec<Option<(usize, usize, usize)>>> = vec![vec![None; s + 1]; n];
    for j in 0..n {
        let part = &parts[j];
        let plen = part.len();
        // prefix_best[p]: best score of parts 0..j-1 ending at or before p, and where.
        let mut prefix_best = vec![(NONE, 0usize); s + 1];
        if j > 0 {
            let mut run = (NONE, 0usize);
            for (p, slot) in prefix_best.iter_mut().enumerate() {
                if best[j - 1][p] > run.0 {
                    run = (best[j - 1][p], p);
                }
                *slot = run;
            }
        }
        let a_range = if j == 0 { 0..1 } else { 0..plen };
        for a in a_range {
            let p_range = if j == 0 { 0..1 } else { 0..s };
            for p in p_range {
                let before = if j == 0 { 0 } else { prefix_best[p].0 };
                if before == NONE {
                    continue;
                }
                let m = part[a..]
                    .iter()
                    .zip(&surface[p..])
                    .take_while(|(x, y)| x == y)
                    .count();
                for len in 1..=m {
                    let q = p + len;
                    let b = a + len;
                    if j == n - 1 && (q != s || b != plen) {
                        continue;
                    }
                    let score = before + (len as i64) * 1000 - a as i64;
                    if score > best[j][q] {
                        best[j][q] = score;
                        back[j][q] = Some((a, p, if j == 0 { 0 } else { prefix_best[p].1 }));
                    }
                }
            }
        }
    }
    if best[n - 1][s] == NONE {
        return None;
    }
    let mut spans = vec![
        PartSpan {
            from: 0,
            to: 0,
            at: 0
        };
        n
    ];
    let mut q = s;
    for j in (0..n).rev() {
        let (a, p, prev_q) = back[j][q]?;
        spans[j] = PartSpan {
            from: a,
            to: a + (q - p),
            at: p,
        };
        q = prev_q;
    }
    Some(spans)
}

// ------------------------------------------------------------------ changes

/// How the two words meet in an observed change.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
enum Sep {
    None,
    Space,
    Hyphen,
    Merged,
}

impl Sep {
    fn mark(self) -> &'static str {
        match self {
            Sep::None => "|",
            Sep::Space => "_",
            Sep::Hyphen => "-",
            Sep::Merged => "",
        }
    }
}

/// The change observed at one boundary of one example.
#[derive(Debug, Clone)]
struct Change {
    example: usize,
    ls: Vec<String>,
    rp: Vec<String>,
    before: Vec<String>,
    sep: Sep,
    after: Vec<String>,
    /// Last kept segment of the left part, first kept segment of the right part.
    lc: String,
    rc: String,
}

/// What kind of rule explains a group of changes.
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord, Hash)]
enum Kind {
    /// Fixed letters: `ls + rp -> before SEP after`.
    Literal {
        ls: Vec<String>,
        rp: Vec<String>,
        before: Vec<String>,
        sep: Sep,
        after: Vec<String>,
    },
    /// The left end's last segment replaced by its counterpart: `[x:A] rp.. + -> [x>B] SEP`.
    LeftMap { rp: Vec<String>, sep: Sep },
    /// The right start's first segment replaced: `+ [x:A] -> SEP [x>B]`.
    RightMap { ls: Vec<String>, sep: Sep },
    /// The left word's last segment written twice.
    Geminate,
    /// The left word's last segment dropped before the same segment.
    Degeminate,
}

impl Kind {
    fn general(&self) -> bool {
        !matches!(self, Kind::Literal { .. })
    }
}

/// The kinds that could explain a change, with the (from, to) pair for maps.
fn kinds_of(c: &Change) -> Vec<(Kind, Option<(String, String)>)> {
    let mut out = vec![(
        Kind::Literal {
            ls: c.ls.clone(),
            rp: c.rp.clone(),
            before: c.before.clone(),
            sep: c.sep,
            after: c.after.clone(),
        },
        None,
    )];
    if c.ls.is_empty()
        && c.rp.is_empty()
        && c.sep == Sep::None
        && c.after.is_empty()
        && c.before == [c.lc.clone()]
        && is_segment(&c.lc)
    {
        out.push((Kind::Geminate, None));
    }
    if c.ls == [c.rc.clone()]
        && c.rp.is_empty()
        && c.before.is_empty()
        && c.after.is_empty()
        && c.sep == Sep::None
        && is_segment(&c.rc)
    {
        out.push((Kind::Degeminate, None));
    }
    if c.ls.len() == 1
        && c.before.len() == 1
        && c.after.is_empty()
        && c.ls != c.before
        && c.sep != Sep::Merged
        && is_segment(&c.ls[0])
        && is_segment(&c.before[0])
    {
        out.push((
            Kind::LeftMap {
                rp: c.rp.clone(),
                sep: c.sep,
            },
            Some((c.ls[0].clone(), c.before[0].clone())),
        ));
    }
    if c.rp.len() == 1
        && c.after.len() == 1
        && c.before.is_empty()
        && c.rp != c.after
        && c.sep != Sep::Merged
        && is_segment(&c.rp[0])
        && is_segment(&c.after[0])
    {
        out.push((
            Kind::RightMap {
                ls: c.ls.clone(),
                sep: c.sep,
            },
            Some((c.rp[0].clone(), c.after[0].clone())),
        ));
    }
    out
}

// ------------------------------------------------------------------ input

/// One example line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct InduceExample {
    /// 1-based line number in the file.
    pub line: usize,
    /// The parts, as written.
    pub parts: Vec<String>,
    /// The surface, as written.
    pub surface: String,
}

/// An example no induced rule explains, and why.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Unexplained {
    /// 1-based line number.
    pub line: usize,
    /// The line as written.
    pub text: String,
    /// Why.
    pub reason: String,
}

/// Errors that stop induction.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum InduceError {
    /// The examples file could not be read.
    #[error("cannot read {file}: {source}")]
    Io {
        /// File name.
        file: String,
        /// The underlying error.
        source: std::io::Error,
    },
    /// The `--include` rule file does not compile.
    #[error("the rule file to take classes from does not compile:\n{0}")]
    Include(crate::rules::Diagnostics),
}

/// Reads `part+part<TAB>surface` lines; `#` starts a comment line. Malformed
/// lines are returned as unexplained with the reason.
pub fn parse_examples(text: &str) -> (Vec<InduceExample>, Vec<Unexplained>) {
    let mut examples = Vec::new();
    let mut bad = Vec::new();
    for (i, raw) in text.lines().enumerate() {
        let line = raw.trim_end_matches('\r');
        if line.trim().is_empty() || line.trim_start().starts_with('#') {
            continue;
        }
        let mut cols = line.split('\t');
        let (Some(parts), Some(surface)) = (cols.next(), cols.next()) else {
            bad.push(Unexplained {
                line: i + 1,
                text: line.to_string(),
                reason: "not of the form `part+part<TAB>surface`".into(),
            });
            continue;
        };
        let parts: Vec<String> = parts.split('+').map(|p| p.trim().to_string()).collect();
        if parts.len() < 2 || parts.iter().any(String::is_empty) || surface.trim().is_empty() {
            bad.push(Unexplained {
                line: i + 1,
                text: line.to_string(),
                reason: "needs at least two non-empty parts joined by `+` and a surface".into(),
            });
            continue;
        }
        examples.push(InduceExample {
            line: i + 1,
            parts,
            surface: surface.trim().to_string(),
        });
    }
    (examples, bad)
}

// ------------------------------------------------------------------ induction

/// Options of [`induce`].
#[derive(Debug, Clone)]
pub struct InduceOptions {
    /// A rule file (bundled name or path) whose classes and segments to use;
    /// the output includes it.
    pub include: Option<String>,
    /// Multi-letter segments (in addition to the included file's).
    pub segments: Vec<String>,
    /// Lowercase everything before aligning (`case fold` in the output).
    pub fold_case: bool,
    /// Fewest examples a rule must explain.
    pub min_examples: usize,
    /// The `language` of the output.
    pub language: String,
    /// Shown in the header comment.
    pub source_name: String,
}

impl Default for InduceOptions {
    fn default() -> Self {
        InduceOptions {
            include: None,
            segments: Vec::new(),
            fold_case: true,
            min_examples: 1,
            language: "induced".into(),
            source_name: "the examples".into(),
        }
    }
}

/// One induced rule.
#[derive(Debug, Clone, PartialEq)]
pub struct InducedRule {
    /// Its name.
    pub name: String,
    /// The rule's change, as rule-language text.
    pub change: String,
    /// Its cost.
    pub cost: f64,
    /// Lines of the examples it explains (some junction of each).
    pub examples: Vec<usize>,
    /// Number of junctions it explains.
    pub junctions: usize,
}

/// The result of induction.
#[derive(Debug, Clone)]
pub struct Induction {
    /// The rules, most examples first.
    pub rules: Vec<InducedRule>,
    /// Examples left unexplained, with the reason.
    pub unexplained: Vec<Unexplained>,
    /// Examples read.
    pub examples: usize,
    /// The rule-set text (rules, classes, and the unexplained as comments).
    pub text: String,
}

struct Group {
    kind: Kind,
    members: Vec<usize>,
    map: Vec<(String, String)>,
}

/// Whether an example can be written as an `example` clause: the rule
/// language reads a part up to white space, `+`, `#` or an arrow, and the
/// surface up to the end of the line or a comment. Others are left out of
/// the rule text (the rule still explains them).
fn example_writable(parts: &[String], surface: &str) -> bool {
    let part_ok = |p: &String| {
        !p.is_empty()
            && !p.chars().any(|c| c.is_whitespace() || c == '+' || c == '#')
            && !["->", "→", "=>"].iter().any(|a| p.contains(a))
    };
    parts.iter().all(part_ok)
        && !surface.trim().is_empty()
        && surface.trim() == surface
        && !surface.contains(" #")
        && !surface.contains('\n')
}

/// Proposes junction rules for examples. The text returned compiles, and
/// every example a rule claims joins to its surface with the rules.
pub fn induce(examples_text: &str, options: &InduceOptions) -> Result<Induction, InduceError> {
    use crate::normalize::{Normalizer, Segmenter};
    let (examples, mut unexplained) = parse_examples(examples_text);
    let included = match &options.include {
        Some(name) => Some(
            crate::rules::compile_named(name, &crate::rules::CompileOptions::default())
                .map_err(InduceError::Include)?,
        ),
        None => None,
    };
    let normalizer = Normalizer {
        fold_case: options.fold_case,
        ..included
            .as_ref()
            .map(|r| r.normalizer.clone())
            .unwrap_or_default()
    };
    let mut segs: std::collections::BTreeSet<String> = options
        .segments
        .iter()
        .map(|s| normalizer.normalize(s))
        .collect();
    if let Some(inc) = &included {
        segs.extend(inc.segmenter.multi_letter());
    }
    let segmenter = Segmenter::new(segs.iter().cloned());
    // Align every example.
    let mut changes: Vec<Change> = Vec::new();
    let mut per_example: Vec<Vec<usize>> = vec![Vec::new(); examples.len()];
    let mut left_finals = std::collections::BTreeSet::new();
    let mut right_initials = std::collections::BTreeSet::new();
    for (ei, ex) in examples.iter().enumerate() {
        let parts: Vec<Vec<String>> = ex
            .parts
            .iter()
            .map(|p| segmenter.split(&normalizer.normalize(p)))
            .collect();
        let surface = segmenter.split(&normalizer.normalize(&ex.surface));
        let reject = |reason: &str| Unexplained {
            line: ex.line,
            text: format!("{}\t{}", ex.parts.join("+"), ex.surface),
            reason: reason.to_string(),
        };
        if surface.len() > 300 || parts.iter().any(|p| p.len() > 100) {
            unexplained.push(reject("too long to align (300 segments at most)"));
            continue;
        }
        let Some(spans) = align_all(&parts, &surface) else {
            unexplained.push(reject("some part has no letter left on the surface"));
            continue;
        };
        let mut these = Vec::new();
        let mut ok = true;
        for j in 0..parts.len() - 1 {
            let (l, r) = (&parts[j], &parts[j + 1]);
            let (sl, sr) = (&spans[j], &spans[j + 1]);
            let m: Vec<String> = surface[sl.at + (sl.to - sl.from)..sr.at].to_vec();
            let ls = l[sl.to..].to_vec();
            let rp = r[..sr.from].to_vec();
            let seps: Vec<usize> = m
                .iter()
                .enumerate()
                .filter(|(_, x)| *x == " " || *x == "-")
                .map(|(i, _)| i)
                .collect();
            let (before, sep, after) = match seps.as_slice() {
                [] if !ls.is_empty() && !rp.is_empty() && !m.is_empty() => {
                    (m.clone(), Sep::Merged, Vec::new())
                }
                [] if ls.is_empty() && !rp.is_empty() => (Vec::new(), Sep::None, m.clone()),
                [] => (m.clone(), Sep::None, Vec::new()),
                [k] => (
                    m[..*k].to_vec(),
                    if m[*k] == " " {
                        Sep::Space
                    } else {
                        Sep::Hyphen
                    },
                    m[k + 1..].to_vec(),
                ),
                _ => {
                    ok = false;
                    break;
                }
            };
            if ls.len() > 4 || rp.len() > 4 || m.len() > 6 {
                ok = false;
                break;
            }
            these.push(Change {
                example: ei,
                ls,
                rp,
                before,
                sep,
                after,
                lc: l[sl.to - 1].clone(),
                rc: r[sr.from].clone(),
            });
        }
        if !ok {
            unexplained.push(reject("the change at a junction is too large to be a junction rule (more than 4 letters replaced, or two spaces)"));
            continue;
        }
        for c in these {
            left_finals.insert(c.lc.clone());
            right_initials.insert(c.rc.clone());
            per_example[ei].push(changes.len());
            changes.push(c);
        }
    }
    // Generalize: greedy cover, the group explaining most junctions first.
    let mut covered = vec![false; changes.len()];
    let mut groups: Vec<Group> = Vec::new();
    loop {
        let mut candidates: std::collections::BTreeMap<
            Kind,
            Vec<(usize, Option<(String, String)>)>,
        > = std::collections::BTreeMap::new();
        for (i, c) in changes.iter().enumerate() {
            if covered[i] {
                continue;
            }
            for (k, pair) in kinds_of(c) {
                candidates.entry(k).or_default().push((i, pair));
            }
        }
        let mut best: Option<Group> = None;
        for (kind, members) in candidates {
            // For maps, each source segment keeps its most frequent target.
            let (members, map) = if matches!(kind, Kind::LeftMap { .. } | Kind::RightMap { .. }) {
                let mut votes: std::collections::BTreeMap<
                    String,
                    std::collections::BTreeMap<String, usize>,
                > = std::collections::BTreeMap::new();
                for (_, pair) in &members {
                    if let Some((x, y)) = pair {
                        *votes
                            .entry(x.clone())
                            .or_default()
                            .entry(y.clone())
                            .or_default() += 1;
                    }
                }
                let chosen: std::collections::BTreeMap<String, String> = votes
                    .into_iter()
                    .map(|(x, ys)| {
                        let y = ys
                            .iter()
                            .max_by(|a, b| a.1.cmp(b.1).then(b.0.cmp(a.0)))
                            .map(|(y, _)| y.clone())
                            .unwrap_or_default();
                        (x, y)
                    })
                    .collect();
                // With included classes, a correspondence keeps to one pair of
                // them: the pair that pairs the most observed segments.
                let mut chosen = chosen;
                if let Some(inc) = included.as_ref() {
                    let pairs: Vec<(String, String)> = chosen.clone().into_iter().collect();
                    if let Some((_, _, covered)) = best_included_pair(inc, &pairs) {
                        if covered.len() >= 2 {
                            chosen.retain(|x, y| covered.contains(&(x.clone(), y.clone())));
                        }
                    }
                }
                let kept: Vec<usize> = members
                    .iter()
                    .filter(|(_, p)| p.as_ref().is_some_and(|(x, y)| chosen.get(x) == Some(y)))
                    .map(|(i, _)| *i)
                    .collect();
                (kept, chosen.into_iter().collect::<Vec<_>>())
            } else {
                (members.into_iter().map(|(i, _)| i).collect(), Vec::new())
            };
            let distinct = match &kind {
                Kind::LeftMap { .. } | Kind::RightMap { .. } => map.len(),
                Kind::Geminate => members
                    .iter()
                    .map(|&i| &changes[i].lc)
                    .collect::<std::collections::BTreeSet<_>>()
                    .len(),
                Kind::Degeminate => members
                    .iter()
                    .map(|&i| &changes[i].rc)
                    .collect::<std::collections::BTreeSet<_>>()
                    .len(),
                Kind::Literal { .. } => 2,
            };
            if kind.general() && distinct < 2 {
                continue;
            }
            let better = match &best {
                None => true,
                Some(b) => {
                    members.len() > b.members.len()
                        || (members.len() == b.members.len() && kind.general() && !b.kind.general())
                }
            };
            if better {
                best = Some(Group { kind, members, map });
            }
        }
        let Some(g) = best else { break };
        let examples_here: std::collections::BTreeSet<usize> =
            g.members.iter().map(|&i| changes[i].example).collect();
        if examples_here.len() < options.min_examples.max(1) {
            break;
        }
        for &i in &g.members {
            covered[i] = true;
        }
        groups.push(g);
    }
    let total = changes.len().max(1) as f64;
    let mut build = Builder::new(included.as_ref(), left_finals, right_initials);
    let mut rules: Vec<(InducedRule, Vec<usize>)> = Vec::new();
    for g in &groups {
        let change = build.change_text(&g.kind, &g.map, g.members.iter().map(|&i| &changes[i]));
        let name = build.name_for(&g.kind, &g.map);
        let mut lines: Vec<usize> = g
            .members
            .iter()
            .map(|&i| examples[changes[i].example].line)
            .collect();
        lines.sort();
        lines.dedup();
        let cost = ((-(g.members.len() as f64 / total).ln()) * 100.0).round() / 100.0;
        rules.push((
            InducedRule {
                name,
                change,
                cost: cost.max(0.0),
                examples: lines,
                junctions: g.members.len(),
            },
            g.members.clone(),
        ));
    }
    // Examples with a junction no rule explains.
    let claimed: Vec<bool> = {
        let mut v = vec![false; changes.len()];
        for (_, m) in &rules {
            for &i in m {
                v[i] = true;
            }
        }
        v
    };
    let mut fully: Vec<bool> = vec![true; examples.len()];
    for (ei, ids) in per_example.iter().enumerate() {
        if ids.is_empty() {
            fully[ei] = false;
            continue;
        }
        if ids.iter().any(|&i| !claimed[i]) {
            fully[ei] = false;
            let ex = &examples[ei];
            unexplained.push(Unexplained {
                line: ex.line,
                text: format!("{}\t{}", ex.parts.join("+"), ex.surface),
                reason: format!(
                    "a junction's change is seen in fewer than {} examples (--min-examples)",
                    options.min_examples
                ),
            });
        }
    }
    let mut induction = Induction {
        rules: rules.iter().map(|(r, _)| r.clone()).collect(),
        unexplained,
        examples: examples.len(),
        text: String::new(),
    };
    // Verify: the text compiles and every fully explained example joins.
    induction.text = build.text(options, &induction, &examples, &fully);
    let base = std::env::current_dir().ok();
    if let Ok(set) = crate::rules::compile(
        "induced",
        &induction.text,
        base.as_deref(),
        &Default::default(),
    ) {
        let lexicon = crate::lexicon::Lexicon::empty();
        let mut dropped = false;
        for (ei, ex) in examples.iter().enumerate() {
            if !fully[ei] {
                continue;
            }
            let parts: Vec<&str> = ex.parts.iter().map(String::as_str).collect();
            let joined = crate::proof::join(
                &set,
                &lexicon,
                &parts,
                crate::lattice::ScopeFilter::Any,
                10_000,
            );
            let want = set.normalizer.normalize(&ex.surface);
            if !joined
                .results
                .iter()
                .any(|j| set.normalizer.normalize(&j.surface) == want)
            {
                fully[ei] = false;
                dropped = true;
                induction.unexplained.push(Unexplained {
                    line: ex.line,
                    text: format!("{}\t{}", ex.parts.join("+"), ex.surface),
                    reason: "the induced rules do not join its parts to its surface (a part too short for the junctions on both its sides)".into(),
                });
                for r in &mut induction.rules {
                    r.examples.retain(|&l| l != ex.line);
                }
            }
        }
        if dropped {
            induction.text = build.text(options, &induction, &examples, &fully);
        }
    }
    induction.unexplained.sort_by_key(|u| u.line);
    Ok(induction)
}

/// Writes classes, slots and rule text.
struct Builder<'a> {
    included: Option<&'a crate::rules::RuleSet>,
    left_finals: std::collections::BTreeSet<String>,
    right_initials: std::collections::BTreeSet<String>,
    classes: Vec<(String, Vec<String>)>,
    names: std::collections::BTreeSet<String>,
    /// The classes of the last correspondence written, when both were included.
    last_map: Option<(String, String)>,
}

impl<'a> Builder<'a> {
    fn new(
        included: Option<&'a crate::rules::RuleSet>,
        left_finals: std::collections::BTreeSet<String>,
        right_initials: std::collections::BTreeSet<String>,
    ) -> Self {
        Builder {
            included,
            left_finals,
            right_initials,
            classes: Vec::new(),
            names: std::collections::BTreeSet::new(),
            last_map: None,
        }
    }

    /// A class containing `members`: the smallest included class that has
    /// them all, else a generated class of exactly these.
    fn class_for(&mut self, members: &std::collections::BTreeSet<String>) -> String {
        if let Some(inc) = self.included {
            if let Some(c) = inc
                .classes
                .iter()
                .filter(|c| members.iter().all(|m| c.members.contains(m)))
                .min_by_key(|c| (c.members.len(), c.name.clone()))
            {
                return c.name.clone();
            }
        }
        self.generated(members.iter().cloned().collect())
    }

    fn generated(&mut self, members: Vec<String>) -> String {
        if let Some((n, _)) = self.classes.iter().find(|(_, m)| *m == members) {
            return n.clone();
        }
        let name = format!("c{}", self.classes.len() + 1);
        self.classes.push((name.clone(), members));
        name
    }

    /// Classes for a correspondence: included classes A, B pairing every
    /// observed (x, y) at the same position, else generated ones.
    fn map_classes(&mut self, map: &[(String, String)]) -> (String, String) {
        if let Some(inc) = self.included {
            if let Some((a, b, covered)) = best_included_pair(inc, map) {
                if covered.len() == map.len() {
                    self.last_map = Some((a.clone(), b.clone()));
                    return (a, b);
                }
            }
        }
        self.last_map = None;
        let xs: Vec<String> = map.iter().map(|(x, _)| x.clone()).collect();
        let ys: Vec<String> = map.iter().map(|(_, y)| y.clone()).collect();
        (self.generated(xs), self.generated(ys))
    }

    /// A context slot over the observed segments, or None when they are every
    /// segment seen in that place (no restriction observed).
    fn context<'c>(
        &mut self,
        values: impl Iterator<Item = &'c String>,
        left: bool,
    ) -> Option<String> {
        let set: std::collections::BTreeSet<String> = values.cloned().collect();
        let all = if left {
            &self.left_finals
        } else {
            &self.right_initials
        };
        // A class can only hold segments (letters): a context of anything
        // else (a hyphen read as a part) is left unrestricted.
        if set.is_empty() || &set == all || !set.iter().all(|m| is_segment(m)) {
            return None;
        }
        Some(self.class_for(&set))
    }

    fn change_text<'c>(
        &mut self,
        kind: &Kind,
        map: &[(String, String)],
        members: impl Iterator<Item = &'c Change> + Clone,
    ) -> String {
        let lit = |v: &[String]| quote(&v.concat());
        let join = |items: Vec<String>| {
            items
                .into_iter()
                .filter(|s| !s.is_empty())
                .collect::<Vec<_>>()
                .join(" ")
        };
        let lcs = members.clone().map(|c| &c.lc);
        let rcs = members.clone().map(|c| &c.rc);
        match kind {
            Kind::Literal {
                ls,
                rp,
                before,
                sep,
                after,
            } => {
                let plain = ls.is_empty() && rp.is_empty() && before.is_empty() && after.is_empty();
                let (left_ctx, right_ctx) = if plain || (!ls.is_empty() && !rp.is_empty()) {
                    (false, false)
                } else if !ls.is_empty() {
                    (false, true)
                } else if !rp.is_empty() {
                    (true, false)
                } else {
                    (true, true)
                };
                let lslot = if left_ctx {
                    self.context(lcs, true)
                } else {
                    None
                };
                let rslot = if right_ctx {
                    self.context(rcs, false)
                } else {
                    None
                };
                let (la, ra) = ("a", "b");
                let lref = lslot
                    .as_ref()
                    .map(|c| (format!("[{la}:{c}]"), format!("[{la}]")));
                let rref = rslot
                    .as_ref()
                    .map(|c| (format!("[{ra}:{c}]"), format!("[{ra}]")));
                let left = join(vec![
                    lref.as_ref().map(|r| r.0.clone()).unwrap_or_default(),
                    lit(ls),
                ]);
                let right = join(vec![
                    lit(rp),
                    rref.as_ref().map(|r| r.0.clone()).unwrap_or_default(),
                ]);
                let surface = join(vec![
                    lref.map(|r| r.1).unwrap_or_default(),
                    lit(before),
                    sep.mark().to_string(),
                    lit(after),
                    rref.map(|r| r.1).unwrap_or_default(),
                ]);
                let left = if left.is_empty() {
                    String::new()
                } else {
                    format!("{left} ")
                };
                let right = if right.is_empty() {
                    String::new()
                } else {
                    format!(" {right}")
                };
                format!("{left}+{right} -> {surface}")
            }
            Kind::LeftMap { rp, sep } => {
                let (a, b) = self.map_classes(map);
                let rslot = self.context(rcs, false);
                let rref = rslot.map(|c| (format!("[r:{c}]"), "[r]".to_string()));
                let right = join(vec![
                    lit(rp),
                    rref.as_ref().map(|r| r.0.clone()).unwrap_or_default(),
                ]);
                let surface = join(vec![
                    format!("[x>{b}]"),
                    sep.mark().to_string(),
                    rref.map(|r| r.1).unwrap_or_default(),
                ]);
                let right = if right.is_empty() {
                    String::new()
                } else {
                    format!(" {right}")
                };
                format!("[x:{a}] +{right} -> {surface}")
            }
            Kind::RightMap { ls, sep } => {
                let (a, b) = self.map_classes(map);
                let lslot = self.context(lcs, true);
                let lref = lslot.map(|c| (format!("[l:{c}]"), "[l]".to_string()));
                let left = join(vec![
                    lref.as_ref().map(|r| r.0.clone()).unwrap_or_default(),
                    lit(ls),
                ]);
                let surface = join(vec![
                    lref.map(|r| r.1).unwrap_or_default(),
                    sep.mark().to_string(),
                    format!("[x>{b}]"),
                ]);
                let left = if left.is_empty() {
                    String::new()
                } else {
                    format!("{left} ")
                };
                format!("{left}+ [x:{a}] -> {surface}")
            }
            Kind::Geminate => {
                let set: std::collections::BTreeSet<String> = lcs.cloned().collect();
                let c = self.class_for(&set);
                let rslot = self.context(rcs, false);
                match rslot {
                    Some(r) => format!("[x:{c}] + [r:{r}] -> [x] [x] | [r]"),
                    None => format!("[x:{c}] + -> [x] [x] |"),
                }
            }
            Kind::Degeminate => {
                let set: std::collections::BTreeSet<String> = rcs.cloned().collect();
                let c = self.class_for(&set);
                format!("[x:{c}] + [x] -> | [x]")
            }
        }
    }

    fn name_for(&mut self, kind: &Kind, map: &[(String, String)]) -> String {
        let ascii = |v: &[String]| -> String {
            v.concat()
                .chars()
                .filter(|c| c.is_ascii_alphanumeric())
                .collect::<String>()
                .to_ascii_lowercase()
        };
        let with = |base: &str, bit: String| {
            if bit.is_empty() {
                base.to_string()
            } else {
                format!("{base}-{bit}")
            }
        };
        let base = match kind {
            Kind::Literal {
                ls,
                rp,
                before,
                sep,
                after,
            } => {
                let m: Vec<String> = before.iter().chain(after).cloned().collect();
                let core = if ls.is_empty() && rp.is_empty() && m.is_empty() {
                    match sep {
                        Sep::Space => "space".to_string(),
                        Sep::Hyphen => "hyphen".to_string(),
                        _ => "join".to_string(),
                    }
                } else if ls.is_empty() && rp.is_empty() {
                    with("link", ascii(&m))
                } else if m.is_empty() && rp.is_empty() {
                    with("elide", ascii(ls))
                } else if m.is_empty() && ls.is_empty() {
                    with("drop", ascii(rp))
                } else if *sep == Sep::Merged {
                    with(
                        "merge",
                        format!("{}-{}", ascii(ls), ascii(rp))
                            .trim_matches('-')
                            .to_string(),
                    )
                } else {
                    with("change", ascii(ls) + &ascii(rp))
                };
                let printed = !(ls.is_empty() && rp.is_empty() && m.is_empty());
                match (sep, printed) {
                    (Sep::Space, true) => format!("{core}-space"),
                    (Sep::Hyphen, true) => format!("{core}-hyphen"),
                    _ => core,
                }
            }
            Kind::LeftMap { .. } | Kind::RightMap { .. } => {
                let from: Vec<String> = map.iter().map(|(x, _)| x.clone()).collect();
                let to: Vec<String> = map.iter().map(|(_, y)| y.clone()).collect();
                let side = if matches!(kind, Kind::LeftMap { .. }) {
                    "end"
                } else {
                    "start"
                };
                if let Some((a, b)) = self.last_map.take() {
                    return self.unique(format!("{side}-{a}-to-{b}"));
                }
                with(
                    &format!("{side}-map"),
                    format!("{}-{}", ascii(&from), ascii(&to))
                        .trim_matches('-')
                        .to_string(),
                )
            }
            Kind::Geminate => "geminate".to_string(),
            Kind::Degeminate => "degeminate".to_string(),
        };
        self.unique(base)
    }

    fn unique(&mut self, base: String) -> String {
        let mut name = base.clone();
        let mut k = 2;
        while self.names.contains(&name) {
            name = format!("{base}-{k}");
            k += 1;
        }
        self.names.insert(name.clone());
        name
    }

    fn text(
        &self,
        options: &InduceOptions,
        induction: &Induction,
        examples: &[InduceExample],
        fully: &[bool],
    ) -> String {
        let mut out = String::new();
        let explained = fully.iter().filter(|f| **f).count();
        out.push_str(&format!(
            "# Junction rules induced by `juncture induce` from {}: {} examples, {} explained by {} rules.\n",
            options.source_name,
            induction.examples,
            explained,
            induction.rules.len()
        ));
        out.push_str("# Classes are the segments seen in the examples (or the smallest included\n# class holding them): review them, and add conditions, before use.\n");
        out.push_str(&format!("language {}\n", options.language));
        out.push_str(if options.fold_case {
            "case fold\n"
        } else {
            "case keep\n"
        });
        if let Some(inc) = &options.include {
            if inc.contains('/') || inc.contains('.') {
                out.push_str(&format!("include \"{inc}\"\n"));
            } else {
                out.push_str(&format!("include {inc}\n"));
            }
        }
        if !options.segments.is_empty() {
            out.push_str(&format!("segments {}\n", options.segments.join(" ")));
        }
        for (name, members) in &self.classes {
            out.push_str(&format!("class {name} = {}\n", members.join(" ")));
        }
        let by_line: std::collections::HashMap<usize, &InduceExample> =
            examples.iter().map(|e| (e.line, e)).collect();
        let full_line: std::collections::HashSet<usize> = examples
            .iter()
            .zip(fully)
            .filter(|(_, f)| **f)
            .map(|(e, _)| e.line)
            .collect();
        for r in &induction.rules {
            let n = r.examples.len();
            out.push_str(&format!(
                "\n# explains {n} example{} ({} junction{})\n",
                if n == 1 { "" } else { "s" },
                r.junctions,
                if r.junctions == 1 { "" } else { "s" }
            ));
            out.push_str(&format!("rule {}: {}\n", r.name, r.change));
            out.push_str(&format!("  cost {}\n", r.cost));
            let writable = |e: &&&InduceExample| example_writable(&e.parts, &e.surface);
            for line in r.examples.iter().filter(|l| full_line.contains(l)).take(2) {
                if let Some(e) = by_line.get(line).filter(writable) {
                    out.push_str(&format!(
                        "  example {} -> {}\n",
                        e.parts.join(" + "),
                        e.surface
                    ));
                }
            }
        }
        if !induction.unexplained.is_empty() {
            let mut un = induction.unexplained.clone();
            un.sort_by_key(|u| u.line);
            out.push_str(&format!("\n# Unexplained examples ({}):\n", un.len()));
            for u in &un {
                out.push_str(&format!(
                    "#   line {}: {} — {}\n",
                    u.line,
                    u.text.replace('\t', " → "),
                    u.reason
                ));
            }
        }
        out
    }
}

/// The pair of included classes (A, B) of equal length, mapping no member
/// onto itself, that pairs the most of `pairs` position by position (the
/// smallest such classes on ties), with the pairs it covers.
fn best_included_pair(
    inc: &crate::rules::RuleSet,
    pairs: &[(String, String)],
) -> Option<(String, String, Vec<(String, String)>)> {
    let mut found: Option<(usize, usize, String, String, Vec<(String, String)>)> = None;
    for a in &inc.classes {
        for b in &inc.classes {
            if a.members.len() != b.members.len()
                || a.name == b.name
                || a.members.iter().zip(&b.members).any(|(p, q)| p == q)
            {
                continue;
            }
            let covered: Vec<(String, String)> = pairs
                .iter()
                .filter(|(x, y)| {
                    a.members
                        .iter()
                        .position(|m| m == x)
                        .is_some_and(|i| &b.members[i] == y)
                })
                .cloned()
                .collect();
            if covered.is_empty() {
                continue;
            }
            let better = found.as_ref().map_or(true, |f| {
                covered.len() > f.0 || (covered.len() == f.0 && a.members.len() < f.1)
            });
            if better {
                found = Some((
                    covered.len(),
                    a.members.len(),
                    a.name.clone(),
                    b.name.clone(),
                    covered,
                ));
            }
        }
    }
    found.map(|(_, _, a, b, c)| (a, b, c))
}

/// Whether `s` can be a class member (a segment of the rule language:
/// letters, combining marks, digits and the apostrophes and dot).
fn is_segment(s: &str) -> bool {
    !s.is_empty()
        && s.chars().all(|c| {
            c.is_alphanumeric()
                || unicode_normalization::char::is_combining_mark(c)
                || matches!(c, '\'' | '’' | 'ʼ' | '.')
        })
}

/// Letters as rule-language text: quoted when they spell a keyword or hold
/// something a bare literal cannot.
fn quote(s: &str) -> String {
    if s.is_empty() {
        return String::new();
    }
    let keyword = matches!(s, "cost" | "when" | "in" | "example" | "note");
    let bare = s
        .chars()
        .all(|c| c.is_alphanumeric() || matches!(c, '\'' | '’' | 'ʼ' | '.'));
    if keyword || !bare {
        format!("\"{s}\"")
    } else {
        s.to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn segs(s: &str) -> Vec<String> {
        s.chars().map(|c| c.to_string()).collect()
    }

    fn change(l: &str, r: &str, s: &str) -> (String, String, String) {
        let a = align_pair(&segs(l), &segs(r), &segs(s));
        (
            a.left_end.concat(),
            a.right_start.concat(),
            a.surface.concat(),
        )
    }

    #[test]
    fn alignments_of_the_demo_changes() {
        let c = |a: &str, b: &str, c: &str| (a.to_string(), b.to_string(), c.to_string());
        assert_eq!(change("sola", "avi", "solanavi"), c("", "", "n"));
        assert_eq!(change("kale", "om", "kalom"), c("e", "", ""));
        assert_eq!(change("ketap", "ura", "ketabura"), c("p", "", "b"));
        assert_eq!(change("tala", "iso", "taleso"), c("a", "i", "e"));
        assert_eq!(change("tam", "ora", "tammora"), c("", "", "m"));
        assert_eq!(change("dal", "lon", "dalon"), c("l", "", ""));
        assert_eq!(change("tor", "mek", "tormek"), c("", "", ""));
        assert_eq!(change("eth", "ano", "ed ano"), c("th", "", "d "));
    }
}
