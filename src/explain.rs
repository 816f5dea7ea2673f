//! Explain stage: the lattice of one input made readable, the ranking with
//! its score broken down, and — given an expected analysis — exactly why it
//! is or is not the one found.
//!
//! ```text
//! input ─lattice─▶ positions: the words read from each part node, the
//!                  junction each word ends in, paths through each edge
//!       ─search──▶ ranking, each score split into its terms
//!       ─expect──▶ findings: missing part, limit, no rule, rejecting
//!                  condition, not in the lattice, or outranked (by how much)
//! ```
//!
//! The score breakdown mirrors the search's weights term for term (see
//! [`crate::search`]): with the probability model a part adds
//! `ln p(part) − part-cost` and a junction `−(rule cost + split-cost)`; with
//! the frequency model a part adds `ln f(part) / n` and a junction the same.

use crate::analyzer::{Analyzer, Count};
use crate::check::{condition_text, ends_mismatch, readings_text};
use crate::induce::align_pair;
use crate::lattice::{Edge, Lattice, Node, PartSource, Truncation};
use crate::lexicon::{condition_holds, Lexicon, Tags};
use crate::proof::{self, Analysis};
use crate::rules::{Ranking, RuleSet, Separator};
use crate::search::{self, ScoredPath, SearchOptions};
use num_bigint::BigUint;
use num_traits::{One, Zero};
use petgraph::graph::{EdgeIndex, NodeIndex};
use petgraph::visit::EdgeRef;
use petgraph::Direction;
use serde::Serialize;
use std::collections::HashSet;
use std::fmt::Write;

/// Options of an explanation.
#[derive(Debug, Clone)]
pub struct ExplainOptions {
    /// How many of the best analyses to rank.
    pub top: usize,
    /// How far down the ranking to look for an expected analysis.
    pub rank_limit: usize,
}

impl Default for ExplainOptions {
    fn default() -> Self {
        ExplainOptions {
            top: 5,
            rank_limit: 1000,
        }
    }
}

/// A word read from a part node: one lexicon entry consumed.
#[derive(Debug, Clone, Serialize)]
pub struct WordStep {
    /// The lexicon form (as written in the lexicon), or the pattern text.
    pub form: String,
    /// The normalized form.
    pub key: String,
    /// `lexicon` or `pattern:NAME`.
    pub source: String,
    /// Underlying start already produced by the junction before.
    pub carried: String,
    /// Letters read directly from the surface: start (normalized characters).
    pub start: usize,
    /// End of the letters read directly.
    pub end: usize,
    /// Underlying end the next junction replaces.
    pub left_end: String,
    /// Where the word's visible stretch starts (including the carried letters' surface).
    pub visible_start: usize,
    /// Where the word's visible stretch ends (including the junction's surface before the boundary).
    pub visible_end: usize,
    /// The junction after the word, or `None` at the end of the input.
    pub then: Option<JunctionStep>,
    /// Number of complete analyses through this word edge.
    pub paths: Count,
    /// Whether the edge lies on the best analysis.
    pub best: bool,
}

/// A junction after a word.
#[derive(Debug, Clone, Serialize)]
pub struct JunctionStep {
    /// Rule name.
    pub rule: String,
    /// Underlying end of the left word.
    pub left: String,
    /// Underlying start of the right word.
    pub right: String,
    /// The surface, with the boundary shown (`mm|o`, `d_a`, `(e)`).
    pub surface: String,
    /// Start of the junction's surface (normalized characters).
    pub at: usize,
    /// End of the junction's surface.
    pub to: usize,
    /// Where the boundary falls (the visible end of the left word).
    pub boundary: usize,
    /// Where the next word's visible stretch starts.
    pub next_start: usize,
    /// Position of the next part node.
    pub next: usize,
}

/// A junction instance whose surface matched at a position but that no word
/// reached (tried, not used).
#[derive(Debug, Clone, Serialize)]
pub struct UnusedJunction {
    /// Rule name.
    pub rule: String,
    /// Underlying end it needs on the left word.
    pub left: String,
    /// Underlying start it needs on the right word.
    pub right: String,
    /// Its surface.
    pub surface: String,
    /// Where it matched.
    pub at: usize,
}

/// Everything that starts at one part node.
#[derive(Debug, Clone, Serialize)]
pub struct PartNode {
    /// Surface position.
    pub pos: usize,
    /// Underlying start carried in from the junction before.
    pub carried: String,
    /// Number of analyses that reach this node from the start.
    pub paths_in: Count,
    /// Number of ways on from here to the end.
    pub paths_out: Count,
    /// The words read from here.
    pub words: Vec<WordStep>,
}

/// One ranked analysis with its score broken down.
#[derive(Debug, Clone, Serialize)]
pub struct Ranked {
    /// The analysis (with its proof chain).
    pub analysis: Analysis,
    /// The score, term by term.
    pub breakdown: Breakdown,
}

/// A score, term by term.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Breakdown {
    /// One term per part.
    pub parts: Vec<PartTerm>,
    /// One term per junction.
    pub junctions: Vec<JunctionTerm>,
    /// The sum.
    pub total: f64,
}

/// A part's share of the score.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PartTerm {
    /// The part's form.
    pub form: String,
    /// Its frequency.
    pub frequency: f64,
    /// `ln p` (probability model) or `ln f / n` (frequency model).
    pub frequency_term: f64,
    /// `−part-cost` (probability model; 0 otherwise).
    pub part_cost: f64,
    /// `lexicalised-bonus` when the part is a lexicalised word (else 0, not written).
    #[serde(skip_serializing_if = "is_zero")]
    pub lexicalised_bonus: f64,
    /// `first-member-bonus` when the part can be a compound's first member
    /// in its stem form (else 0, not written).
    #[serde(skip_serializing_if = "is_zero")]
    pub first_member_bonus: f64,
    /// `−unlisted-combining-cost` when the part is a first member written
    /// in a form its entry's `combining` tag does not list (else 0, not
    /// written).
    #[serde(skip_serializing_if = "is_zero")]
    pub combining_cost: f64,
}

fn is_zero(x: &f64) -> bool {
    *x == 0.0
}

/// A junction's share of the score.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct JunctionTerm {
    /// Rule name.
    pub rule: String,
    /// `−cost` of the rule.
    pub rule_cost: f64,
    /// `−split-cost`.
    pub split_cost: f64,
}

/// The lattice and ranking of one input.
#[derive(Debug, Clone, Serialize)]
pub struct Explanation {
    /// The input as given.
    pub input: String,
    /// The normalized input the lattice is built on.
    pub normalized: String,
    /// The ranking model.
    pub ranking: Ranking,
    /// Exact number of analyses.
    pub count: Count,
    /// Set when the lattice or the search is incomplete.
    pub truncated: Option<Truncation>,
    /// Part nodes in surface order.
    pub nodes: Vec<PartNode>,
    /// Junctions whose surface matched somewhere but that no word reached.
    pub unused: Vec<UnusedJunction>,
    /// The best analyses.
    pub ranked: Vec<Ranked>,
    /// Why-not findings, when an analysis was expected.
    pub expected: Option<Expectation>,
}

/// The answer to "why (not) this analysis?".
#[derive(Debug, Clone, Serialize)]
pub struct Expectation {
    /// The expected parts as given.
    pub parts: Vec<String>,
    /// What stands in its way, most basic first; empty when it is the best.
    pub findings: Vec<Finding>,
    /// Its rank when it was found.
    pub rank: Option<usize>,
}

/// One reason an expected analysis is not the best.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
#[non_exhaustive]
pub enum Finding {
    /// A part is not in the lexicon (and no pattern accepts it).
    MissingPart {
        /// The part as given.
        part: String,
        /// After normalization.
        normalized: String,
        /// Lexicon forms one edit away.
        similar: Vec<String>,
    },
    /// A part is shorter than `min-part-length`.
    MinPartLength {
        /// The part.
        part: String,
        /// Its length.
        length: usize,
        /// The limit.
        min: usize,
    },
    /// The analysis has more parts than `max-parts`.
    MaxParts {
        /// Its parts.
        parts: usize,
        /// The limit.
        max: usize,
    },
    /// The lexicon lists the input with no noun reading, and the analysis
    /// has a head the word cannot have (`set noun-head`) or, the input
    /// written small, a noun before a verb (`set verb-after-noun`; see
    /// [`crate::lattice::small_word_refuses`]).
    SmallWord {
        /// The input as one lexicon word.
        word: String,
    },
    /// The input starts with a capital, so its head is a noun, and the last
    /// part has no noun or verb reading (`set noun-head = capitalised`, see
    /// [`crate::lattice::capitalised_head_refused`]).
    CapitalisedHead {
        /// The last part.
        head: String,
    },
    /// No rule turns the two parts' ends into what the surface shows there.
    NoRule {
        /// Junction index (0 = between the first two parts).
        junction: usize,
        /// Left part.
        left: String,
        /// Right part.
        right: String,
        /// What the surface shows there (left end, right start, surface), per the alignment.
        change: (String, String, String),
        /// Where, in normalized characters of the input.
        at: usize,
        /// What the rules would give for these two parts: (rule, surface).
        would_give: Vec<(String, String)>,
        /// Rules whose instances match the two parts' ends.
        rules_matching: Vec<String>,
    },
    /// A rule would produce the surface but one of its conditions rejects a part.
    Condition {
        /// Junction index.
        junction: usize,
        /// The rule.
        rule: String,
        /// The condition, as written.
        condition: String,
        /// The part it tests.
        word: String,
        /// That part's tags.
        tags: String,
    },
    /// An `edge` condition rejects the first or last part.
    Edge {
        /// `start` or `end`.
        edge: String,
        /// The condition.
        condition: String,
        /// The part.
        word: String,
        /// Its tags.
        tags: String,
    },
    /// The lattice was cut before it was complete.
    Truncated {
        /// Why.
        reason: Truncation,
    },
    /// The rules join the parts to the input, but the lattice has no such path.
    NotInLattice {
        /// What joining gives.
        surface: String,
    },
    /// Found, but another analysis ranks higher.
    Outranked {
        /// Its rank (None: below the ranks looked at).
        rank: Option<usize>,
        /// Its score.
        score: f64,
        /// The best analysis.
        best: String,
        /// The best score.
        best_score: f64,
        /// How much higher the best scores.
        by: f64,
        /// Its score, term by term.
        breakdown: Breakdown,
        /// The best analysis's score, term by term.
        best_breakdown: Breakdown,
    },
}

impl Finding {
    /// The finding in one line.
    pub fn describe(&self) -> String {
        match self {
            Finding::MissingPart {
                part,
                normalized,
                similar,
            } => {
                let mut s = format!("the part `{part}`");
                if normalized != part {
                    s.push_str(&format!(" (normalized `{normalized}`)"));
                }
                s.push_str(" is not in the lexicon");
                if !similar.is_empty() {
                    s.push_str(&format!(
                        "; similar entries: {}",
                        similar
                            .iter()
                            .map(|x| format!("`{x}`"))
                            .collect::<Vec<_>>()
                            .join(", ")
                    ));
                }
                s
            }
            Finding::MinPartLength { part, length, min } => format!(
                "the part `{part}` has {length} letter{}, fewer than min-part-length {min}",
                if *length == 1 { "" } else { "s" }
            ),
            Finding::MaxParts { parts, max } => {
                format!("the analysis has {parts} parts, more than max-parts {max}")
            }
            Finding::CapitalisedHead { head } => format!(
                "the input starts with a capital, so its last part is a noun or a nominalised infinitive, and the lexicon reads `{head}` as neither (set noun-head = capitalised)"
            ),
            Finding::SmallWord { word } => format!(
                "the lexicon lists `{word}` with no noun reading, so it is no noun: it takes no head read only as a noun, nor, as a verb, a head that is no verb (set noun-head = capitalised), and, written small, no part read only as a verb after a noun (set verb-after-noun = capitalised)"
            ),
            Finding::NoRule {
                junction,
                left,
                right,
                change,
                at,
                would_give,
                rules_matching,
            } => {
                let (l, r, s) = change;
                let written = if s.is_empty() {
                    "nothing".to_string()
                } else {
                    format!("`{}`", s.replace(' ', "_"))
                };
                let mut out = format!(
                    "junction {} (`{left}` + `{right}`): no rule turns {} + {} into {written}, which the surface shows at {at}",
                    junction + 1,
                    show(l),
                    show(r),
                );
                if !rules_matching.is_empty() {
                    out.push_str(&format!(
                        "; rules matching these ends: {}",
                        rules_matching.join(", ")
                    ));
                }
                if would_give.is_empty() {
                    out.push_str("; the rules join these two parts in no way");
                } else {
                    let g: Vec<String> = would_give
                        .iter()
                        .take(8)
                        .map(|(rule, s)| format!("{s} ({rule})"))
                        .collect();
                    out.push_str(&format!("; the rules would give {}", g.join(", ")));
                    if would_give.len() > 8 {
                        out.push_str(&format!(" and {} more", would_give.len() - 8));
                    }
                }
                out
            }
            Finding::Condition {
                junction,
                rule,
                condition,
                word,
                tags,
            } => format!(
                "junction {}: rule `{rule}` would produce the surface, but its condition `{condition}` rejects `{word}` ({tags})",
                junction + 1
            ),
            Finding::Edge {
                edge,
                condition,
                word,
                tags,
            } => format!(
                "the `edge {edge}` condition `{condition}` rejects `{word}` ({tags})"
            ),
            Finding::Truncated { reason } => format!("the lattice is incomplete: {}", reason.describe()),
            Finding::NotInLattice { surface } => format!(
                "the rules join the parts to `{surface}`, but the lattice has no such path (a segment boundary or a pattern's placement rules it out)"
            ),
            Finding::Outranked {
                rank,
                score,
                best,
                best_score,
                by,
                ..
            } => match rank {
                Some(r) => format!(
                    "found at rank {r} with score {}, outranked by `{best}` (score {}) by {}",
                    round(*score),
                    round(*best_score),
                    round(*by)
                ),
                None => format!(
                    "found, but ranked below the analyses looked at; its score {} is {} below the best, `{best}` ({})",
                    round(*score),
                    round(*by),
                    round(*best_score)
                ),
            },
        }
    }
}

fn round(x: f64) -> f64 {
    (x * 10_000.0).round() / 10_000.0
}

fn show(s: &str) -> String {
    if s.is_empty() {
        "∅".into()
    } else {
        s.to_string()
    }
}

// ------------------------------------------------------------------ paths

/// For every node: analyses from the start to it, and from it to the end.
fn path_counts(lattice: &Lattice) -> (Vec<BigUint>, Vec<BigUint>) {
    let g = &lattice.graph;
    let order = petgraph::algo::toposort(g, None).unwrap_or_else(|_| g.node_indices().collect());
    let mut fwd = vec![BigUint::zero(); g.node_count()];
    let mut bwd = vec![BigUint::zero(); g.node_count()];
    fwd[lattice.start.index()] = BigUint::one();
    for &u in &order {
        if fwd[u.index()].is_zero() {
            continue;
        }
        let here = fwd[u.index()].clone();
        for e in g.edges_directed(u, Direction::Outgoing) {
            fwd[e.target().index()] += &here;
        }
    }
    bwd[lattice.end.index()] = BigUint::one();
    for &u in order.iter().rev() {
        let mut total = bwd[u.index()].clone();
        for e in g.edges_directed(u, Direction::Outgoing) {
            total += &bwd[e.target().index()];
        }
        bwd[u.index()] = total;
    }
    (fwd, bwd)
}

fn form_of(
    rules: &RuleSet,
    lexicon: &Lexicon,
    lattice: &Lattice,
    w: &crate::lattice::WordEdge,
) -> (String, String) {
    match w.source {
        PartSource::Entry(id) => {
            let entry = lexicon.entry(id);
            // A word that ends the input is the head (see `proof::shown_form`).
            let head = crate::proof::head_case(&lattice.text.original)
                .filter(|_| w.end == lattice.text.chars.len());
            let form = crate::proof::shown_form(rules, entry.form.clone(), &entry.readings, head);
            (form, "lexicon".into())
        }
        PartSource::Pattern(p) => (
            lattice.text.original_slice(w.start, w.end),
            format!("pattern:{}", rules.patterns[p].name),
        ),
    }
}

fn marked(inst: &crate::rules::Instance) -> String {
    match inst.separator {
        Separator::Merged => format!("({})", inst.surface_left),
        Separator::None => format!("{}|{}", inst.surface_left, inst.surface_right),
        Separator::Space => format!("{}_{}", inst.surface_left, inst.surface_right),
        Separator::Hyphen => format!("{}-{}", inst.surface_left, inst.surface_right),
    }
}

/// Where the visible stretch of a word read from part node `node` starts:
/// before the surface the incoming junction printed for the word's start.
fn visible_start(lattice: &Lattice, rules: &RuleSet, node: NodeIndex, pos: usize) -> usize {
    let g = &lattice.graph;
    for e in g.edges_directed(node, Direction::Incoming) {
        if let Edge::Junction { instance } = e.weight() {
            let inst = &rules.instances[*instance];
            return match inst.separator {
                Separator::Merged => pos.saturating_sub(inst.surface_chars()),
                _ => pos.saturating_sub(inst.surface_right.chars().count()),
            };
        }
    }
    pos
}

fn junction_step(lattice: &Lattice, rules: &RuleSet, joint: NodeIndex) -> Option<JunctionStep> {
    let g = &lattice.graph;
    let Node::Joint { pos, instance } = g[joint] else {
        return None;
    };
    let inst = &rules.instances[instance];
    let next = g
        .edges_directed(joint, Direction::Outgoing)
        .next()
        .and_then(|e| match &g[e.target()] {
            Node::Part { pos, .. } => Some(*pos),
            _ => None,
        })
        .unwrap_or(pos + inst.surface_chars());
    let left_len = inst.surface_left.chars().count();
    let (boundary, next_start) = match inst.separator {
        Separator::Merged => (pos + inst.surface_chars(), pos),
        Separator::None => (pos + left_len, pos + left_len),
        _ => (pos + left_len, pos + left_len + 1),
    };
    Some(JunctionStep {
        rule: rules.rules[inst.rule].name.clone(),
        left: inst.left.clone(),
        right: inst.right.clone(),
        surface: marked(inst),
        at: pos,
        to: pos + inst.surface_chars(),
        boundary,
        next_start,
        next,
    })
}

// ------------------------------------------------------------------ scores

/// The score of parts (normalized keys, with their frequencies) joined by
/// junction instances, term by term, as the search computes it.
pub fn breakdown(
    rules: &RuleSet,
    options: &SearchOptions,
    lexicon: &Lexicon,
    parts: &[(String, f64)],
    instances: &[usize],
) -> Breakdown {
    let n = parts.len().max(1) as f64;
    let mut total = 0.0;
    let count = parts.len();
    let parts: Vec<PartTerm> = parts
        .iter()
        .enumerate()
        .map(|(i, (form, f))| {
            let (term, cost) = match options.ranking {
                Ranking::Frequency => (f.max(1.0).ln() / n, 0.0),
                Ranking::Probability => (lexicon.log_probability(*f), -options.part_cost),
            };
            // The parts come as shown (Hochzeit); the index holds keys.
            let id = lexicon
                .get(form)
                .or_else(|| lexicon.get(&rules.normalizer.normalize(form)));
            let bonus = id.map_or(0.0, |id| {
                search::lexicalised_bonus(lexicon, id, options)
                    + if count == 1 {
                        search::whole_word_bonus(lexicon, id, options)
                    } else {
                        0.0
                    }
            });
            let first = match id {
                Some(id) if i + 1 < count => search::first_member_bonus(lexicon, id, options),
                _ => 0.0,
            };
            let combining = match (id, instances.get(i)) {
                (Some(id), Some(&instance)) if i == 0 => -search::combining_cost(
                    rules,
                    lexicon,
                    id,
                    &rules.normalizer.normalize(form),
                    instance,
                    options,
                ),
                _ => 0.0,
            };
            total += term + cost + bonus + first + combining;
            PartTerm {
                form: form.clone(),
                frequency: *f,
                frequency_term: round(term),
                part_cost: cost,
                lexicalised_bonus: bonus,
                first_member_bonus: first,
                combining_cost: combining,
            }
        })
        .collect();
    let junctions = instances
        .iter()
        .map(|&i| {
            let rule = &rules.rules[rules.instances[i].rule];
            total -= rule.cost + options.split_cost;
            JunctionTerm {
                rule: rule.name.clone(),
                rule_cost: -rule.cost,
                split_cost: -options.split_cost,
            }
        })
        .collect();
    Breakdown {
        parts,
        junctions,
        total: round(total),
    }
}

fn path_breakdown(analyzer: &Analyzer, lattice: &Lattice, path: &ScoredPath) -> Breakdown {
    let mut parts = Vec::new();
    let mut instances = Vec::new();
    for &e in &path.edges {
        match &lattice.graph[e] {
            Edge::Word(w) => {
                let (form, _) = form_of(analyzer.rules, analyzer.lexicon, lattice, w);
                parts.push((form, w.frequency));
            }
            Edge::Junction { instance } => instances.push(*instance),
        }
    }
    breakdown(
        analyzer.rules,
        &analyzer.search,
        analyzer.lexicon,
        &parts,
        &instances,
    )
}

// ------------------------------------------------------------------ explain

/// Builds the explanation of one input; `expect` (normalized or not) asks why
/// that analysis is or is not the best.
pub fn explain(
    analyzer: &Analyzer,
    input: &str,
    expect: Option<&[String]>,
    options: &ExplainOptions,
) -> Explanation {
    let rules = analyzer.rules;
    let lexicon = analyzer.lexicon;
    let lattice = analyzer.lattice_with_dead_ends(input);
    let g = &lattice.graph;
    let (fwd, bwd) = path_counts(&lattice);
    let count = search::count(&lattice, analyzer.search.max_parts);
    let want = options.top.max(1);
    let (paths, cut) = search::best(&lattice, rules, lexicon, &analyzer.search, want);
    let best_edges: HashSet<EdgeIndex> = paths
        .first()
        .map(|p| p.edges.iter().copied().collect())
        .unwrap_or_default();
    // Part nodes, in surface order.
    let mut part_nodes: Vec<(usize, String, NodeIndex)> = g
        .node_indices()
        .filter_map(|i| match &g[i] {
            Node::Part { pos, carried, .. } => Some((*pos, carried.clone(), i)),
            _ => None,
        })
        .collect();
    part_nodes.sort();
    let mut nodes = Vec::new();
    for (pos, carried, idx) in part_nodes {
        let mut words = Vec::new();
        let vstart = visible_start(&lattice, rules, idx, pos);
        for e in g.edges_directed(idx, Direction::Outgoing) {
            let Edge::Word(w) = e.weight() else { continue };
            let (form, source) = form_of(rules, lexicon, &lattice, w);
            let then = junction_step(&lattice, rules, e.target());
            let through = &fwd[idx.index()] * &bwd[e.target().index()];
            let visible_end = then.as_ref().map_or(w.end, |j| j.boundary);
            let best = best_edges.contains(&e.id());
            words.push(WordStep {
                form,
                key: w.key.clone(),
                source,
                carried: w.carried.clone(),
                start: w.start,
                end: w.end,
                left_end: w.left_end.clone(),
                visible_start: vstart,
                visible_end,
                then,
                paths: Count(through),
                best,
            });
        }
        words.sort_by(|a, b| {
            (a.end, &a.key, a.then.as_ref().map(|j| j.rule.clone())).cmp(&(
                b.end,
                &b.key,
                b.then.as_ref().map(|j| j.rule.clone()),
            ))
        });
        nodes.push(PartNode {
            pos,
            carried,
            paths_in: Count(fwd[idx.index()].clone()),
            paths_out: Count(bwd[idx.index()].clone()),
            words,
        });
    }
    let unused = unused_junctions(&lattice, rules, analyzer);
    let ranked: Vec<Ranked> = paths
        .iter()
        .enumerate()
        .map(|(i, p)| Ranked {
            analysis: proof::analysis(&lattice, rules, lexicon, p, i + 1),
            breakdown: path_breakdown(analyzer, &lattice, p),
        })
        .collect();
    let truncated = lattice.truncated.or(cut);
    let expected = expect.map(|parts| why_not(analyzer, &lattice, input, parts, &ranked, options));
    Explanation {
        input: input.to_string(),
        normalized: lattice.text.normalized(),
        ranking: analyzer.search.ranking,
        count: Count(count),
        truncated,
        nodes,
        unused,
        ranked,
        expected,
    }
}

/// Junction instances whose (non-empty) surface matched somewhere but that no
/// word reached.
fn unused_junctions(
    lattice: &Lattice,
    rules: &RuleSet,
    analyzer: &Analyzer,
) -> Vec<UnusedJunction> {
    let g = &lattice.graph;
    let used: HashSet<(usize, usize)> = g
        .node_indices()
        .filter_map(|i| match g[i] {
            Node::Joint { pos, instance } => Some((pos, instance)),
            _ => None,
        })
        .collect();
    let chars = &lattice.text.chars;
    let n = chars.len();
    let bounds = &lattice.boundaries;
    let mut out = Vec::new();
    for q in 0..=n {
        if !bounds.get(q).copied().unwrap_or(true) {
            continue;
        }
        for len in 1..=rules.max_surface_chars().min(n - q) {
            if !bounds.get(q + len).copied().unwrap_or(true) {
                continue;
            }
            let s: String = chars[q..q + len].iter().collect();
            for &i in rules.instances_with_surface(&s) {
                let inst = &rules.instances[i];
                let scope_ok = match analyzer.lattice.scope {
                    crate::lattice::ScopeFilter::Any => true,
                    crate::lattice::ScopeFilter::Compound => {
                        inst.scope != crate::rules::Scope::Phrase
                    }
                    crate::lattice::ScopeFilter::Phrase => {
                        inst.scope != crate::rules::Scope::Compound
                    }
                };
                if scope_ok && !used.contains(&(q, i)) {
                    out.push(UnusedJunction {
                        rule: rules.rules[inst.rule].name.clone(),
                        left: inst.left.clone(),
                        right: inst.right.clone(),
                        surface: marked(inst),
                        at: q,
                    });
                }
            }
        }
    }
    out
}

// ------------------------------------------------------------------ why not

/// Lexicon forms one edit (insertion, deletion, substitution) away from `key`.
fn similar_entries(lexicon: &Lexicon, key: &str) -> Vec<String> {
    let k: Vec<char> = key.chars().collect();
    let mut out: Vec<String> = lexicon
        .entries()
        .filter(|e| {
            let c: Vec<char> = e.key.chars().collect();
            one_edit(&k, &c)
        })
        .map(|e| e.form.clone())
        .collect();
    out.sort();
    out.truncate(5);
    out
}

fn one_edit(a: &[char], b: &[char]) -> bool {
    if a == b {
        return false;
    }
    let (short, long) = if a.len() <= b.len() { (a, b) } else { (b, a) };
    if long.len() - short.len() > 1 {
        return false;
    }
    let prefix = short.iter().zip(long).take_while(|(x, y)| x == y).count();
    if short.len() == long.len() {
        short[prefix + 1..] == long[prefix + 1..]
    } else {
        short[prefix..] == long[prefix + 1..]
    }
}

fn pattern_accepts(rules: &RuleSet, key: &str) -> bool {
    let segs = rules.segmenter.split(key);
    let len = key.chars().count();
    rules.patterns.iter().any(|p| {
        !segs.is_empty()
            && segs.iter().all(|s| p.members.contains(s))
            && len >= p.min
            && p.max.map_or(true, |m| len <= m)
    })
}

fn readings_of(lexicon: &Lexicon, key: &str) -> (Vec<Tags>, bool) {
    match lexicon.get(key) {
        Some(id) => (lexicon.entry(id).readings.clone(), true),
        None => (Vec::new(), false),
    }
}

fn tags_of(lexicon: &Lexicon, key: &str) -> String {
    let (r, known) = readings_of(lexicon, key);
    if known {
        format!("tags: {}", readings_text(&r))
    } else {
        format!("`{key}` is not in the lexicon")
    }
}

/// The rule-set without any condition (to find what conditions reject).
fn unconditioned(rules: &RuleSet) -> RuleSet {
    let mut free = rules.clone();
    for r in &mut free.rules {
        r.left_conditions.clear();
        r.right_conditions.clear();
    }
    free.edge_start.clear();
    free.edge_end.clear();
    // Reported on their own (`Finding::SmallWord`).
    free.settings.verb_after_noun_capitalised = false;
    free.settings.noun_head_capitalised = false;
    free
}

/// Why the analysis `parts` of `input` is or is not the best.
fn why_not(
    analyzer: &Analyzer,
    lattice: &Lattice,
    input: &str,
    parts: &[String],
    ranked: &[Ranked],
    options: &ExplainOptions,
) -> Expectation {
    let rules = analyzer.rules;
    let lexicon = analyzer.lexicon;
    let keys: Vec<String> = parts
        .iter()
        .map(|p| rules.normalizer.normalize(p.trim()))
        .collect();
    let surface = rules.normalizer.normalize(input);
    let mut findings = Vec::new();
    for (p, k) in parts.iter().zip(&keys) {
        if lexicon.get(k).is_none() && !pattern_accepts(rules, k) {
            findings.push(Finding::MissingPart {
                part: p.trim().to_string(),
                normalized: k.clone(),
                similar: similar_entries(lexicon, k),
            });
        }
    }
    let max = analyzer.search.max_parts;
    if max > 0 && keys.len() > max {
        findings.push(Finding::MaxParts {
            parts: keys.len(),
            max,
        });
    }
    let min = analyzer
        .lattice
        .min_part_length
        .unwrap_or(rules.settings.min_part_length);
    if keys.len() > 1 {
        for (p, k) in parts.iter().zip(&keys) {
            let len = k.chars().count();
            if len < min {
                findings.push(Finding::MinPartLength {
                    part: p.trim().to_string(),
                    length: len,
                    min,
                });
            }
        }
    }
    if let Some(reason) = lattice.truncated {
        findings.push(Finding::Truncated { reason });
    }
    let small = input
        .chars()
        .find(|c| c.is_alphabetic())
        .is_some_and(char::is_lowercase);
    if keys.len() > 1
        && ((rules.settings.verb_after_noun_capitalised && small)
            || rules.settings.noun_head_capitalised)
        && crate::lattice::known_without_noun(lexicon, &surface)
    {
        let readings: Vec<&[crate::lexicon::Tags]> = keys
            .iter()
            .map(|k| lexicon.get(k).map_or(&[][..], |id| lexicon.readings(id)))
            .collect();
        let word = lexicon
            .get(&surface)
            .map_or(&[][..], |id| lexicon.readings(id));
        if crate::lattice::small_word_refuses(&rules.settings, word, &readings, small) {
            findings.push(Finding::SmallWord {
                word: input.trim().to_string(),
            });
        }
    }
    if keys.len() > 1
        && rules.settings.noun_head_capitalised
        && crate::lattice::starts_capitalised(&input.chars().collect::<Vec<_>>())
    {
        let last = &keys[keys.len() - 1];
        if lexicon
            .get(last)
            .is_some_and(|id| crate::lattice::capitalised_head_refused(lexicon.readings(id)))
        {
            findings.push(Finding::CapitalisedHead {
                head: parts[parts.len() - 1].trim().to_string(),
            });
        }
    }
    let key_refs: Vec<&str> = keys.iter().map(String::as_str).collect();
    let scope = analyzer.lattice.scope;
    let joined = proof::join(rules, lexicon, &key_refs, scope, 10_000);
    let hit = joined
        .results
        .iter()
        .find(|j| rules.normalizer.normalize(&j.surface) == surface);
    let mut rank = None;
    match hit {
        Some(hit) => {
            if findings.is_empty() {
                rank = rank_of(
                    analyzer,
                    lattice,
                    &keys,
                    ranked,
                    hit,
                    options,
                    &mut findings,
                );
            }
        }
        None => {
            let free = unconditioned(rules);
            let free_join = proof::join(&free, lexicon, &key_refs, scope, 10_000);
            let free_hits: Vec<&proof::Joined> = free_join
                .results
                .iter()
                .filter(|j| rules.normalizer.normalize(&j.surface) == surface)
                .collect();
            if free_hits.is_empty() {
                findings.extend(no_rule(analyzer, &free, &keys, &surface));
            } else {
                findings.extend(rejecting_conditions(rules, lexicon, &keys, &free_hits));
            }
        }
    }
    Expectation {
        parts: parts.iter().map(|p| p.trim().to_string()).collect(),
        findings,
        rank,
    }
}

/// Conditions that reject the cheapest unconditioned join giving the surface.
fn rejecting_conditions(
    rules: &RuleSet,
    lexicon: &Lexicon,
    keys: &[String],
    hits: &[&proof::Joined],
) -> Vec<Finding> {
    let mut best: Option<Vec<Finding>> = None;
    for hit in hits.iter().take(50) {
        let mut found = Vec::new();
        for (edge, conds, word) in [
            ("start", &rules.edge_start, &keys[0]),
            ("end", &rules.edge_end, &keys[keys.len() - 1]),
        ] {
            let (r, _) = readings_of(lexicon, word);
            for c in conds.iter() {
                if !condition_holds(c, word, &r) {
                    found.push(Finding::Edge {
                        edge: edge.into(),
                        condition: condition_text(c),
                        word: word.clone(),
                        tags: tags_of(lexicon, word),
                    });
                }
            }
        }
        for (i, step) in hit.junctions.iter().enumerate() {
            let rule = &rules.rules[rules.instances[step.instance].rule];
            for (conds, word) in [
                (&rule.left_conditions, &keys[i]),
                (&rule.right_conditions, &keys[i + 1]),
            ] {
                let (r, _) = readings_of(lexicon, word);
                for c in conds.iter() {
                    if !condition_holds(c, word, &r) {
                        found.push(Finding::Condition {
                            junction: i,
                            rule: rule.name.clone(),
                            condition: condition_text(c),
                            word: word.clone(),
                            tags: tags_of(lexicon, word),
                        });
                    }
                }
            }
        }
        if best.as_ref().map_or(true, |b| found.len() < b.len()) {
            best = Some(found);
        }
    }
    best.unwrap_or_default()
}

/// Finds the first junction where no (unconditioned) rule can continue
/// towards the surface, and says what the surface shows there.
fn no_rule(analyzer: &Analyzer, free: &RuleSet, keys: &[String], surface: &str) -> Vec<Finding> {
    let rules = analyzer.rules;
    let lexicon = analyzer.lexicon;
    let n = keys.len();
    if n < 2 {
        return Vec::new();
    }
    // States after each junction: (text so far, letters of the current word claimed).
    let mut states: Vec<(String, usize)> = vec![(keys[0].clone(), 0)];
    let mut failing = n - 2;
    let max_left = free.max_ends().0;
    for i in 0..n - 1 {
        let mut next = Vec::new();
        let right_chars: Vec<char> = keys[i + 1].chars().collect();
        for (text, _claimed) in &states {
            let tchars: Vec<char> = text.chars().collect();
            for l in 0..=tchars.len() {
                let kept: String = tchars[..tchars.len() - l].iter().collect();
                let suffix: String = tchars[tchars.len() - l..].iter().collect();
                for r in 0..=right_chars.len() {
                    let prefix: String = right_chars[..r].iter().collect();
                    let rest: String = right_chars[r..].iter().collect();
                    for &id in free.instances_with_ends(&suffix, &prefix) {
                        if !scope_ok(analyzer, free, id) {
                            continue;
                        }
                        let inst = &free.instances[id];
                        // What is before the next word's own letters is fixed and must
                        // begin the surface; the whole text must be it after the last junction.
                        // The next junction can only replace the last `max_left`
                        // letters of the next word.
                        let rest_chars: Vec<char> = rest.chars().collect();
                        let firm = rest_chars.len().saturating_sub(max_left);
                        let firm: String = rest_chars[..firm].iter().collect();
                        let fixed = format!("{kept}{}{firm}", inst.surface());
                        let out = format!("{kept}{}{rest}", inst.surface());
                        let ok = if i + 1 == n - 1 {
                            out == surface
                        } else {
                            surface.starts_with(&fixed)
                        };
                        if ok && next.len() < 10_000 {
                            next.push((out, inst.right.chars().count()));
                        }
                    }
                }
            }
        }
        next.sort();
        next.dedup();
        if next.is_empty() {
            failing = i;
            break;
        }
        states = next;
    }
    // What the surface shows at the failing junction: align the rest of the
    // surface with the left word's rest and the remaining parts.
    let i = failing;
    let seg = &rules.segmenter;
    let (prefix_len, left_rest) = states
        .iter()
        .map(|(text, claimed)| {
            let word = &keys[i];
            let wchars: Vec<char> = word.chars().collect();
            let tail: String = wchars[(*claimed).min(wchars.len())..].iter().collect();
            let tchars = text.chars().count();
            (tchars.saturating_sub(tail.chars().count()), tail)
        })
        .next()
        .unwrap_or((0, keys[i].clone()));
    let schars: Vec<char> = surface.chars().collect();
    let rest_surface: String = schars[prefix_len.min(schars.len())..].iter().collect();
    let right: String = keys[i + 1..].concat();
    let a = align_pair(
        &seg.split(&left_rest),
        &seg.split(&right),
        &seg.split(&rest_surface),
    );
    let at = prefix_len
        + seg.split(&left_rest)[..a.left_kept]
            .iter()
            .map(|x| x.chars().count())
            .sum::<usize>();
    let pair = [keys[i].as_str(), keys[i + 1].as_str()];
    let gives = proof::join(rules, lexicon, &pair, analyzer.lattice.scope, 50);
    let would_give = gives
        .results
        .iter()
        .map(|j| {
            (
                j.junctions
                    .iter()
                    .map(|s| s.rule.clone())
                    .collect::<Vec<_>>()
                    .join(", "),
                j.surface.clone(),
            )
        })
        .collect();
    let mut matching: Vec<String> = Vec::new();
    for (ri, rule) in rules.rules.iter().enumerate() {
        let any = rules.instances.iter().any(|inst| {
            inst.rule == ri
                && keys[i].ends_with(&inst.left)
                && keys[i + 1].starts_with(&inst.right)
                && !(inst.left.is_empty() && inst.right.is_empty())
        });
        if any {
            matching.push(rule.name.clone());
        }
    }
    let _ = ends_mismatch;
    vec![Finding::NoRule {
        junction: i,
        left: keys[i].clone(),
        right: keys[i + 1].clone(),
        change: (
            a.left_end.concat(),
            a.right_start.concat(),
            a.surface.concat(),
        ),
        at,
        would_give,
        rules_matching: matching,
    }]
}

fn scope_ok(analyzer: &Analyzer, rules: &RuleSet, id: usize) -> bool {
    let scope = rules.instances[id].scope;
    match analyzer.lattice.scope {
        crate::lattice::ScopeFilter::Any => true,
        crate::lattice::ScopeFilter::Compound => scope != crate::rules::Scope::Phrase,
        crate::lattice::ScopeFilter::Phrase => scope != crate::rules::Scope::Compound,
    }
}

/// The rank of the expected analysis, or why the lattice lacks it.
fn rank_of(
    analyzer: &Analyzer,
    lattice: &Lattice,
    keys: &[String],
    ranked: &[Ranked],
    hit: &proof::Joined,
    options: &ExplainOptions,
    findings: &mut Vec<Finding>,
) -> Option<usize> {
    let rules = analyzer.rules;
    let lexicon = analyzer.lexicon;
    let same = |a: &Analysis| {
        a.parts.len() == keys.len() && a.parts.iter().zip(keys).all(|(p, k)| &p.key == k)
    };
    let (paths, _) = search::best(
        lattice,
        rules,
        lexicon,
        &analyzer.search,
        options.rank_limit.max(1),
    );
    let mut found = None;
    for (i, p) in paths.iter().enumerate() {
        let a = proof::analysis(lattice, rules, lexicon, p, i + 1);
        if same(&a) {
            found = Some((i + 1, p.clone()));
            break;
        }
    }
    let best = ranked.first();
    match found {
        Some((1, _)) => Some(1),
        Some((r, p)) => {
            let b = path_breakdown(analyzer, lattice, &p);
            if let Some(best) = best {
                findings.push(Finding::Outranked {
                    rank: Some(r),
                    score: b.total,
                    best: best.analysis.parts_text(),
                    best_score: best.breakdown.total,
                    by: round(best.breakdown.total - b.total),
                    breakdown: b,
                    best_breakdown: best.breakdown.clone(),
                });
            }
            Some(r)
        }
        None => {
            let total = search::count(lattice, analyzer.search.max_parts);
            if BigUint::from(paths.len()) < total {
                let parts: Vec<(String, f64)> = keys
                    .iter()
                    .map(|k| {
                        let f = lexicon
                            .get(k)
                            .map_or(rules.settings.pattern_frequency, |id| {
                                lexicon.entry(id).frequency
                            });
                        let form = lexicon
                            .get(k)
                            .map_or(k.clone(), |id| lexicon.entry(id).form.clone());
                        (form, f)
                    })
                    .collect();
                let instances: Vec<usize> = hit.junctions.iter().map(|s| s.instance).collect();
                let b = breakdown(rules, &analyzer.search, lexicon, &parts, &instances);
                if let Some(best) = best {
                    findings.push(Finding::Outranked {
                        rank: None,
                        score: b.total,
                        best: best.analysis.parts_text(),
                        best_score: best.breakdown.total,
                        by: round(best.breakdown.total - b.total),
                        breakdown: b,
                        best_breakdown: best.breakdown.clone(),
                    });
                }
            } else {
                findings.push(Finding::NotInLattice {
                    surface: hit.surface.clone(),
                });
            }
            None
        }
    }
}

/// Why the analysis `parts` (normalized) of `surface` is not the one found, in one line.
pub fn why_not_summary(analyzer: &Analyzer, surface: &str, parts: &[String]) -> String {
    let options = ExplainOptions {
        top: 1,
        ..ExplainOptions::default()
    };
    let e = explain(analyzer, surface, Some(parts), &options);
    match e.expected.as_ref().and_then(|x| x.findings.first()) {
        Some(f) => f.describe(),
        None => "the expected analysis is not among the analyses found".to_string(),
    }
}

// ------------------------------------------------------------------ text

impl Explanation {
    /// The explanation as readable text.
    pub fn to_text(&self) -> String {
        let mut out = String::new();
        let noun = if self.count.0 == BigUint::one() {
            "analysis"
        } else {
            "analyses"
        };
        let _ = writeln!(out, "{}: {} {noun}", self.input, self.count);
        if let Some(t) = self.truncated {
            let _ = writeln!(out, "  incomplete: {}", t.describe());
        }
        // The letters with their offsets.
        let chars: Vec<char> = self.normalized.chars().collect();
        let mut letters = String::from("  ");
        let mut offsets = String::from("  ");
        for (i, c) in chars.iter().enumerate() {
            let w = i.to_string().len().max(1);
            let shown = if *c == ' ' { '␣' } else { *c };
            let _ = write!(letters, "{shown:<w$} ");
            let _ = write!(offsets, "{i:<w$} ");
        }
        let _ = writeln!(offsets, "{}", chars.len());
        let _ = writeln!(
            out,
            "\nsurface ({} letters, offsets between them):",
            chars.len()
        );
        let _ = writeln!(out, "{}", letters.trim_end());
        out.push_str(&offsets);
        let _ = writeln!(out, "\nlattice: the words read at each position, the junction each ends in, and the analyses through it");
        for node in &self.nodes {
            let carried = if node.carried.is_empty() {
                String::new()
            } else {
                format!(", `{}` carried from the junction before", node.carried)
            };
            let status = if node.paths_out.0.is_zero() {
                "  (dead end: no way on to the end)".to_string()
            } else {
                String::new()
            };
            let _ = writeln!(out, "  at {}{carried}:{status}", node.pos);
            if node.words.is_empty() {
                let _ = writeln!(out, "      no lexicon entry continues here");
            }
            for w in &node.words {
                let read: String = chars
                    [w.start.min(chars.len())..w.end.clamp(w.start.min(chars.len()), chars.len())]
                    .iter()
                    .collect();
                let mut underlying = String::new();
                if !w.carried.is_empty() {
                    underlying.push_str(&format!("{}·", w.carried));
                }
                underlying.push_str(&read);
                if !w.left_end.is_empty() {
                    underlying.push_str(&format!("·{}", w.left_end));
                }
                let then = match &w.then {
                    None => "end of input".to_string(),
                    Some(j) => format!(
                        "{} ({} + {} → {}) at {}..{} → {}",
                        j.rule,
                        show(&j.left),
                        show(&j.right),
                        j.surface,
                        j.at,
                        j.to,
                        j.next
                    ),
                };
                let paths = if w.paths.0.is_zero() {
                    "dead end".to_string()
                } else {
                    format!(
                        "{} {}",
                        w.paths,
                        if w.paths.0 == BigUint::one() {
                            "analysis"
                        } else {
                            "analyses"
                        }
                    )
                };
                let _ = writeln!(
                    out,
                    "    {} {:<10} {:<14} then {then}   [{paths}]",
                    if w.best { "*" } else { " " },
                    w.form,
                    format!("= {underlying}"),
                );
            }
        }
        if !self.unused.is_empty() {
            let _ = writeln!(
                out,
                "\njunctions whose surface is in the input but that no word reached:"
            );
            for u in self.unused.iter().take(40) {
                let _ = writeln!(
                    out,
                    "    at {}: {} ({} + {} → {})",
                    u.at,
                    u.rule,
                    show(&u.left),
                    show(&u.right),
                    u.surface
                );
            }
            if self.unused.len() > 40 {
                let _ = writeln!(out, "    … and {} more", self.unused.len() - 40);
            }
        }
        let _ = writeln!(out, "\nranking ({}):", self.model_text());
        if self.ranked.is_empty() {
            let _ = writeln!(out, "  no analysis reaches the end");
        }
        for r in &self.ranked {
            let _ = writeln!(
                out,
                "  {}. {}    score {}",
                r.analysis.rank,
                r.analysis.parts_text(),
                r.analysis.score
            );
            breakdown_text(&r.breakdown, &mut out);
        }
        if let Some(e) = &self.expected {
            let _ = writeln!(out, "\nexpected {}:", e.parts.join(" + "));
            if e.findings.is_empty() {
                let _ = writeln!(out, "  it is the best analysis (rank 1)");
            }
            for f in &e.findings {
                let _ = writeln!(out, "  - {}", f.describe());
                if let Finding::Outranked {
                    breakdown,
                    best_breakdown,
                    ..
                } = f
                {
                    let _ = writeln!(out, "    expected:");
                    breakdown_text(breakdown, &mut out);
                    let _ = writeln!(out, "    best:");
                    breakdown_text(best_breakdown, &mut out);
                }
            }
        }
        out
    }

    fn model_text(&self) -> &'static str {
        match self.ranking {
            Ranking::Probability => "probability model: Σ ln p(part) − part-cost per part − (rule cost + split-cost) per junction",
            Ranking::Frequency => "frequency model: Σ ln f(part) / parts − (rule cost + split-cost) per junction",
        }
    }
}

fn signed(x: f64) -> String {
    if x == 0.0 {
        "0".to_string()
    } else {
        format!("{x:+}")
    }
}

fn breakdown_text(b: &Breakdown, out: &mut String) {
    for p in &b.parts {
        let _ = writeln!(
            out,
            "       part {:<12} frequency {:<8} {:>9}  part-cost {:>5}{}{}{}",
            p.form,
            p.frequency,
            signed(p.frequency_term),
            signed(p.part_cost),
            if p.lexicalised_bonus == 0.0 {
                String::new()
            } else {
                format!("  lexicalised {}", signed(p.lexicalised_bonus))
            },
            if p.first_member_bonus == 0.0 {
                String::new()
            } else {
                format!("  first-member {}", signed(p.first_member_bonus))
            },
            if p.combining_cost == 0.0 {
                String::new()
            } else {
                format!("  unlisted-combining {}", signed(p.combining_cost))
            }
        );
    }
    for j in &b.junctions {
        let _ = writeln!(
            out,
            "       rule {:<12} cost {:>5}  split-cost {:>5}",
            j.rule,
            signed(j.rule_cost),
            signed(j.split_cost)
        );
    }
    let _ = writeln!(out, "       total {}", b.total);
}

// ------------------------------------------------------------------ DOT

/// The lattice as Graphviz DOT: part nodes as ellipses (position and carried
/// letters), joints as points, words and junctions as labelled edges; the best
/// analysis in bold red.
pub fn to_dot(analyzer: &Analyzer, input: &str) -> String {
    let rules = analyzer.rules;
    let lexicon = analyzer.lexicon;
    let lattice = analyzer.lattice_with_dead_ends(input);
    let g = &lattice.graph;
    let (paths, _) = search::best(&lattice, rules, lexicon, &analyzer.search, 1);
    let best: HashSet<EdgeIndex> = paths
        .first()
        .map(|p| p.edges.iter().copied().collect())
        .unwrap_or_default();
    let esc = |s: &str| s.replace('\\', "\\\\").replace('"', "\\\"");
    let mut out = String::new();
    let _ = writeln!(out, "digraph lattice {{");
    let _ = writeln!(out, "  label=\"{}\";", esc(input));
    let _ = writeln!(out, "  rankdir=LR;");
    let _ = writeln!(
        out,
        "  node [fontname=\"sans-serif\"]; edge [fontname=\"sans-serif\"];"
    );
    let mut ids: Vec<NodeIndex> = g.node_indices().collect();
    ids.sort_by_key(|i| match &g[*i] {
        Node::Part { pos, .. } => (*pos, 0),
        Node::Joint { pos, .. } => (*pos, 1),
        Node::End => (usize::MAX, 2),
    });
    for i in ids {
        let label = match &g[i] {
            Node::Part { pos, carried, .. } if carried.is_empty() => format!("{pos}"),
            Node::Part { pos, carried, .. } => format!("{pos} +{carried}"),
            Node::Joint { pos, .. } => format!("{pos}"),
            Node::End => "end".to_string(),
        };
        let shape = match &g[i] {
            Node::Part { .. } => "ellipse",
            Node::Joint { .. } => "point",
            Node::End => "doublecircle",
        };
        let _ = writeln!(
            out,
            "  n{} [label=\"{}\", shape={shape}];",
            i.index(),
            esc(&label)
        );
    }
    for e in g.edge_references() {
        let label = match e.weight() {
            Edge::Word(w) => form_of(rules, lexicon, &lattice, w).0,
            Edge::Junction { instance } => {
                let inst = &rules.instances[*instance];
                format!("{} {}", rules.rules[inst.rule].name, marked(inst))
            }
        };
        let style = if best.contains(&e.id()) {
            ", color=\"#c0392b\", penwidth=2.5, fontcolor=\"#c0392b\""
        } else if matches!(e.weight(), Edge::Junction { .. }) {
            ", style=dashed"
        } else {
            ""
        };
        let _ = writeln!(
            out,
            "  n{} -> n{} [label=\"{}\"{style}];",
            e.source().index(),
            e.target().index(),
            esc(&label)
        );
    }
    let _ = writeln!(out, "}}");
    out
}
