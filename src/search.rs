//! Search stage: exact counting of analyses by dynamic programming on the
//! lattice, and lazy best-first enumeration of the analyses in rank order
//! ([`paths`]; [`best`] takes the first k).
//!
//! Counting never enumerates paths: it sums path counts over the DAG in
//! reverse topological order with arbitrary-precision integers.
//!
//! Ranking uses an exact heuristic: for every node the best score of any
//! completion is computed first, so a best-first (A*) search pops complete
//! analyses in score order and only ever expands partial paths that can lead
//! to one of the k best. Nothing close to the full set of paths is built:
//! [`paths`] is an iterator that searches only as far as the next analysis
//! asked for, so `split --all` can write each analysis as it is found.
//!
//! The **frequency** model (Koehn & Knight 2003) scores an analysis of `n`
//! parts by the geometric mean of the part frequencies, `(1/n) Σ ln f_i`, minus
//! the costs of its junction rules. Because the mean depends on `n`, the search
//! runs once per `n` (exactly `n` parts) and the searches are merged lazily
//! on their next analyses (each comes out best first). The
//! **probability** model scores `Σ ln p_i − Σ cost(r_j) − n · part-cost`, with
//! `p_i` the add-one smoothed relative frequency of the part.

use crate::lattice::{Edge, Lattice, Node, PartSource, Truncation};
use crate::lexicon::Lexicon;
use crate::rules::{Ranking, RuleSet, COMBINING_TAG, FIRST_MEMBER_TAGS, LEXICALISED_TAG};
use num_bigint::BigUint;
use num_traits::{One, Zero};
use petgraph::graph::{EdgeIndex, NodeIndex};
use petgraph::visit::EdgeRef;
use petgraph::Direction;
use std::cmp::Ordering;
use std::collections::BinaryHeap;

/// Options for ranking.
#[derive(Debug, Clone)]
pub struct SearchOptions {
    /// Ranking model.
    pub ranking: Ranking,
    /// Most parts in one analysis (0: no limit).
    pub max_parts: usize,
    /// Cost per part (probability model).
    pub part_cost: f64,
    /// Cost per junction, added to the rule's own cost.
    pub split_cost: f64,
    /// Most partial paths the best-first search may pop.
    pub max_pops: usize,
    /// Added for every part that is a lexicalised word (`lexicalised-bonus`).
    pub lexicalised_bonus: f64,
    /// Added for every part that can be a compound's first member in its
    /// stem form (`first-member-bonus`).
    pub first_member_bonus: f64,
    /// Subtracted when the first of several parts is written in a form its
    /// entry's `combining` tag does not list (`unlisted-combining-cost`).
    pub unlisted_combining_cost: f64,
}

impl SearchOptions {
    /// The options a rule-set's settings give.
    pub fn from_rules(rules: &RuleSet) -> SearchOptions {
        SearchOptions {
            ranking: rules.settings.ranking,
            max_parts: rules.settings.max_parts,
            part_cost: rules.settings.part_cost,
            split_cost: rules.settings.split_cost,
            max_pops: 2_000_000,
            lexicalised_bonus: rules.settings.lexicalised_bonus,
            first_member_bonus: rules.settings.first_member_bonus,
            unlisted_combining_cost: rules.settings.unlisted_combining_cost,
        }
    }
}

/// A complete path through the lattice with its score.
#[derive(Debug, Clone)]
pub struct ScoredPath {
    /// Edges from start to end.
    pub edges: Vec<EdgeIndex>,
    /// Score (higher is better).
    pub score: f64,
    /// Number of parts.
    pub parts: usize,
}

/// The live nodes (on some path from start to end) in topological order
/// (start first). The lattice is acyclic by construction; debug builds
/// check that every edge goes forward.
fn topological(lattice: &Lattice) -> &[NodeIndex] {
    if cfg!(debug_assertions) {
        let mut rank = vec![0usize; lattice.graph.node_count()];
        for (i, n) in lattice.order.iter().enumerate() {
            rank[n.index()] = i;
        }
        debug_assert!(lattice.graph.edge_indices().all(|e| {
            let (a, b) = lattice
                .graph
                .edge_endpoints(e)
                .unwrap_or((lattice.start, lattice.end));
            rank[a.index()] < rank[b.index()]
        }));
    }
    &Adjacency::of(lattice).order
}

/// Exact number of analyses (paths from start to end), optionally with at
/// most `max_parts` parts.
pub fn count(lattice: &Lattice, max_parts: usize) -> BigUint {
    count_within(lattice, max_parts).count
}

/// The count of analyses within a part limit, and whether analyses beyond
/// it exist: what [`count`] gives for `max_parts` and for no limit, in one
/// pass over the lattice.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PartCount {
    /// Analyses with at most `max_parts` parts (all of them when 0).
    pub count: BigUint,
    /// Whether some analysis has more than `max_parts` parts.
    pub more_parts: bool,
}

/// Counts the analyses with at most `max_parts` parts (0: no limit) and
/// tells whether longer ones exist (see [`PartCount`]).
pub fn count_within(lattice: &Lattice, max_parts: usize) -> PartCount {
    let order = topological(lattice);
    let limit = part_limit(lattice, order, max_parts);
    if let Some((within, beyond)) = count_small(lattice, order, limit) {
        return PartCount {
            count: BigUint::from(within),
            more_parts: beyond > 0,
        };
    }
    let count = count_big(lattice, order, limit);
    let more_parts = limit > 0 && count_big(lattice, order, 0) > count;
    PartCount { count, more_parts }
}

/// The counts of [`count_within`] in machine integers: the paths with at
/// most `max_parts` parts and those with more (when `max_parts > 0`, one
/// more column collects every path beyond the limit), or `None` as soon as
/// a sum would overflow; then the [`BigUint`] count is used.
fn count_small(lattice: &Lattice, order: &[NodeIndex], max_parts: usize) -> Option<(u128, u128)> {
    let g = &lattice.graph;
    let adjacency = Adjacency::of(lattice);
    // Columns 0..=max_parts: exactly that many parts; the last: more.
    let width = if max_parts == 0 { 1 } else { max_parts + 2 };
    let mut counts = vec![0u128; g.node_count() * width];
    counts[lattice.end.index() * width] = 1;
    let mut row = vec![0u128; width];
    for &u in order.iter().rev() {
        if u == lattice.end {
            continue;
        }
        row.iter_mut().for_each(|x| *x = 0);
        for &(target, _, is_word) in adjacency.out(u) {
            let v = &counts[target as usize * width..][..width];
            if max_parts == 0 {
                row[0] = row[0].checked_add(v[0])?;
                continue;
            }
            match is_word {
                true => {
                    for r in 1..width - 1 {
                        row[r] = row[r].checked_add(v[r - 1])?;
                    }
                    let more = &mut row[width - 1];
                    *more = more.checked_add(v[width - 2])?.checked_add(v[width - 1])?;
                }
                false => {
                    for r in 0..width {
                        row[r] = row[r].checked_add(v[r])?;
                    }
                }
            }
        }
        counts[u.index() * width..][..width].copy_from_slice(&row);
    }
    let start = &counts[lattice.start.index() * width..][..width];
    if max_parts == 0 {
        return Some((start[0], 0));
    }
    let within = start[..width - 1]
        .iter()
        .try_fold(0u128, |a, &b| a.checked_add(b))?;
    Some((within, start[width - 1]))
}

/// The count with at most `max_parts` parts (0: no limit) in big integers.
fn count_big(lattice: &Lattice, order: &[NodeIndex], max_parts: usize) -> BigUint {
    let g = &lattice.graph;
    if max_parts == 0 {
        let mut counts: Vec<BigUint> = vec![BigUint::zero(); g.node_count()];
        counts[lattice.end.index()] = BigUint::one();
        for &u in order.iter().rev() {
            if u == lattice.end {
                continue;
            }
            let mut total = BigUint::zero();
            for e in g.edges_directed(u, Direction::Outgoing) {
                total += &counts[e.target().index()];
            }
            counts[u.index()] = total;
        }
        return counts[lattice.start.index()].clone();
    }
    let width = max_parts + 1;
    let mut counts: Vec<Vec<BigUint>> = vec![vec![BigUint::zero(); width]; g.node_count()];
    counts[lattice.end.index()][0] = BigUint::one();
    for &u in order.iter().rev() {
        if u == lattice.end {
            continue;
        }
        let mut row = vec![BigUint::zero(); width];
        for e in g.edges_directed(u, Direction::Outgoing) {
            let v = &counts[e.target().index()];
            match e.weight() {
                Edge::Word(_) => {
                    for r in 1..width {
                        row[r] += &v[r - 1];
                    }
                }
                Edge::Junction { .. } => {
                    for r in 0..width {
                        row[r] += &v[r];
                    }
                }
            }
        }
        counts[u.index()] = row;
    }
    counts[lattice.start.index()]
        .iter()
        .fold(BigUint::zero(), |a, b| a + b)
}

/// The part limit that constrains this lattice: 0 (none) when no path has
/// more than `max_parts` parts anyway. Counting and ranking under a limit
/// keep a row of `max_parts + 1` values per node, so an enormous limit
/// (`--max-parts 1000000`) must not be taken literally.
fn part_limit(lattice: &Lattice, order: &[NodeIndex], max_parts: usize) -> usize {
    if max_parts == 0 || max_parts >= most_parts(lattice, order) {
        0
    } else {
        max_parts
    }
}

/// How the part count constrains a search.
#[derive(Debug, Clone, Copy)]
enum Layering {
    /// No constraint.
    Free,
    /// At most this many parts.
    AtMost(usize),
    /// Exactly this many parts.
    Exactly(usize),
}

struct Weights<'a> {
    rules: &'a RuleSet,
    lexicon: &'a Lexicon,
    options: &'a SearchOptions,
}

/// What an edge's weight is made of, apart from the number of parts: its
/// term (for a word in the frequency model, `ln f` before it is divided by
/// the number of parts), and for a lexicon word when a `lexicalised-bonus`
/// is set, the bonus it earns (0 or the bonus).
#[derive(Clone, Copy)]
struct EdgeTerms {
    term: f64,
    bonus: Option<f64>,
    divided: bool,
}

impl EdgeTerms {
    /// The weight of an edge with these terms, for `divisor` parts.
    fn weight(self, divisor: f64) -> f64 {
        let term = if self.divided {
            self.term / divisor
        } else {
            self.term
        };
        match self.bonus {
            Some(b) => term + b,
            None => term,
        }
    }
}

impl Weights<'_> {
    /// The terms of every edge, computed for the live ones only (no search
    /// reads a dead edge's weight: its target cannot reach the end).
    fn live_terms(&self, lattice: &Lattice) -> Vec<EdgeTerms> {
        let live = &Adjacency::of(lattice).live;
        lattice
            .graph
            .edge_references()
            .zip(live)
            .map(|(e, &live)| {
                if live {
                    self.terms(
                        e.weight(),
                        e.target() == lattice.end,
                        e.source() == lattice.start,
                        next_instance(lattice, e.target()),
                    )
                } else {
                    EdgeTerms {
                        term: f64::NEG_INFINITY,
                        bonus: None,
                        divided: false,
                    }
                }
            })
            .collect()
    }

    /// The terms of an edge, computed once per lattice; `last` says the
    /// edge ends the input (a last part earns no `first-member-bonus`),
    /// `first` that it starts it (with `last`: the whole input, which earns
    /// the bonus of a name, see [`whole_word_bonus`]), and `next` is the
    /// junction instance that follows it (for [`combining_cost`], which only
    /// the first part pays: a linking element after a later part follows
    /// the compound up to it, *Schifffahrt* + `s`, not that part alone).
    fn terms(&self, edge: &Edge, last: bool, first: bool, next: Option<usize>) -> EdgeTerms {
        match edge {
            Edge::Word(w) => {
                let (term, divided) = match self.options.ranking {
                    Ranking::Frequency => (w.frequency.max(1.0).ln(), true),
                    Ranking::Probability => (
                        self.lexicon.log_probability(w.frequency) - self.options.part_cost,
                        false,
                    ),
                };
                let bonus = match w.source {
                    PartSource::Entry(id)
                        if self.options.lexicalised_bonus != 0.0
                            || self.options.first_member_bonus != 0.0
                            || self.options.unlisted_combining_cost != 0.0 =>
                    {
                        Some(
                            lexicalised_bonus(self.lexicon, id, self.options)
                                + if first && last {
                                    whole_word_bonus(self.lexicon, id, self.options)
                                } else {
                                    0.0
                                }
                                + if last {
                                    0.0
                                } else {
                                    first_member_bonus(self.lexicon, id, self.options)
                                }
                                - next.filter(|_| first).map_or(0.0, |instance| {
                                    combining_cost(
                                        self.rules,
                                        self.lexicon,
                                        id,
                                        &w.key,
                                        instance,
                                        self.options,
                                    )
                                }),
                        )
                    }
                    _ => None,
                };
                EdgeTerms {
                    term,
                    bonus,
                    divided,
                }
            }
            Edge::Junction { instance } => {
                let rule = &self.rules.rules[self.rules.instances[*instance].rule];
                EdgeTerms {
                    term: -(rule.cost + self.options.split_cost),
                    bonus: None,
                    divided: false,
                }
            }
        }
    }
}

/// What an entry read as the whole input earns besides its
/// [`lexicalised_bonus`]: the `lexicalised-bonus` again when it is read
/// only as a proper noun (every reading `proper=yes`), else 0. A name
/// that is written like a compound is not one in meaning (Freiburg,
/// Wolfsburg, Holland), so it is kept whole like a lexicalised word; a
/// name as one part of a longer word earns nothing (the frequency list's
/// short names, Tom, Ben, would win splits otherwise).
pub fn whole_word_bonus(lexicon: &Lexicon, id: usize, options: &SearchOptions) -> f64 {
    if options.lexicalised_bonus == 0.0 || lexicalised_bonus(lexicon, id, options) != 0.0 {
        return 0.0;
    }
    let readings = lexicon.readings(id);
    if !readings.is_empty() && readings.iter().all(|r| r.get("proper") == Some("yes")) {
        options.lexicalised_bonus
    } else {
        0.0
    }
}

/// The `lexicalised-bonus` an entry earns as a part: the bonus when one of
/// its readings is tagged `lexicalised=yes`, else 0.
pub fn lexicalised_bonus(lexicon: &Lexicon, id: usize, options: &SearchOptions) -> f64 {
    bonus_if_tagged(
        lexicon,
        id,
        options.lexicalised_bonus,
        &[(LEXICALISED_TAG, "yes")],
    )
}

/// The instance of the joint `node` (the junction after a word ending
/// there), if it is one.
fn next_instance(lattice: &Lattice, node: NodeIndex) -> Option<usize> {
    match lattice.graph.node_weight(node) {
        Some(Node::Joint { instance, .. }) => Some(*instance),
        _ => None,
    }
}

/// The `unlisted-combining-cost` of entry `id` (normalized form `key`) as
/// the first member before junction instance `instance`: 0 when no reading
/// of the entry has the [`COMBINING_TAG`], or when one lists the member as
/// the junction writes it (`key` with the instance's left end replaced by
/// the letters it prints before its boundary: *Kind* before the linking
/// `-er-` is written `kinder`; of three equal consonants that the older
/// spelling writes as two, the member keeps its own two), or when that form is a lexicon form of the
/// word (a reading's `lemma` is `key`: the plural *Hände* of *Hand*); else
/// the cost. The tag's forms are
/// normalized as the rule-set normalizes, so a form written with a capital
/// matches.
pub fn combining_cost(
    rules: &RuleSet,
    lexicon: &Lexicon,
    id: usize,
    key: &str,
    instance: usize,
    options: &SearchOptions,
) -> f64 {
    let cost = options.unlisted_combining_cost;
    if cost == 0.0 {
        return 0.0;
    }
    let mut listed = lexicon
        .readings(id)
        .iter()
        .filter_map(|r| r.get(COMBINING_TAG))
        .peekable();
    if listed.peek().is_none() {
        return 0.0;
    }
    let Some(inst) = rules.instances.get(instance) else {
        return 0.0;
    };
    let Some(stem) = key.strip_suffix(inst.left.as_str()) else {
        return 0.0;
    };
    let mut written = String::with_capacity(stem.len() + inst.surface_left.len() + 4);
    written.push_str(stem);
    written.push_str(&inst.surface_left);
    // Of three equal consonants the older spelling writes two (Bett +
    // Tuch: Bettuch): the member is still written with its own two.
    let dropped = inst
        .left
        .strip_prefix(inst.surface_left.as_str())
        .and_then(|d| d.chars().next());
    if let (Some(d), Some(r)) = (dropped, inst.right.chars().next()) {
        if d == r && inst.surface_left.ends_with(r) {
            written.push(r);
        }
    }
    let found = listed.any(|forms| {
        forms
            .split('|')
            .any(|f| f == written || rules.normalizer.normalize(f) == written)
    });
    // A form of the word itself (its plural, Kinder or Hände) is listed
    // by the lexicon.
    if found || crate::lattice::lemma_is(rules, lexicon, lexicon.get(&written), key) {
        0.0
    } else {
        cost
    }
}

/// The `first-member-bonus` an entry earns as a part that is not the last:
/// the bonus when one of its readings is tagged `role=first` and
/// `final=vowel` (a vowel-final compound first member in its stem form),
/// else 0.
pub fn first_member_bonus(lexicon: &Lexicon, id: usize, options: &SearchOptions) -> f64 {
    bonus_if_tagged(lexicon, id, options.first_member_bonus, &FIRST_MEMBER_TAGS)
}

/// `bonus` when one reading of the entry has every `key=value` of `tags`
/// (a value may be one of several joined by `|`), else 0.
fn bonus_if_tagged(lexicon: &Lexicon, id: usize, bonus: f64, tags: &[(&str, &str)]) -> f64 {
    if bonus == 0.0 {
        return 0.0;
    }
    let tagged = lexicon.readings(id).iter().any(|r| {
        tags.iter().all(|(key, value)| {
            r.get(*key)
                .is_some_and(|v| v.split('|').any(|v| v == *value))
        })
    });
    if tagged {
        bonus
    } else {
        0.0
    }
}

/// The part of the lattice the search works on: the nodes and edges on
/// some path from the start to the end (most of a lattice is dead ends:
/// words after which no junction or word follows), with every node's live
/// out-edges in flat arrays, in petgraph's own order.
#[derive(Debug, Clone, Default)]
pub(crate) struct Adjacency {
    /// Per node, the range of its live edges in `edges`.
    spans: Vec<(u32, u32)>,
    /// Target node, edge index, and whether it is a word edge.
    edges: Vec<(u32, u32, bool)>,
    /// The live nodes in topological order (start first).
    order: Vec<NodeIndex>,
    /// Per edge: whether it is live.
    live: Vec<bool>,
}

impl Adjacency {
    fn of(lattice: &Lattice) -> &Adjacency {
        lattice.adjacency.get_or_init(|| {
            let g = &lattice.graph;
            let order = &lattice.order;
            let mut reached = vec![false; g.node_count()];
            reached[lattice.start.index()] = true;
            for &u in order {
                if reached[u.index()] {
                    for e in g.edges_directed(u, Direction::Outgoing) {
                        reached[e.target().index()] = true;
                    }
                }
            }
            let mut ends = vec![false; g.node_count()];
            ends[lattice.end.index()] = reached[lattice.end.index()];
            for &u in order.iter().rev() {
                if reached[u.index()]
                    && g.edges_directed(u, Direction::Outgoing)
                        .any(|e| ends[e.target().index()])
                {
                    ends[u.index()] = true;
                }
            }
            let mut spans = vec![(0u32, 0u32); g.node_count()];
            let mut edges = Vec::new();
            let mut live = vec![false; g.edge_count()];
            let mut live_order = Vec::new();
            for &u in order {
                let i = u.index();
                if !ends[i] {
                    continue;
                }
                let from = edges.len() as u32;
                live_order.push(u);
                for e in g.edges_directed(u, Direction::Outgoing) {
                    if ends[e.target().index()] {
                        live[e.id().index()] = true;
                        edges.push((
                            e.target().index() as u32,
                            e.id().index() as u32,
                            matches!(e.weight(), Edge::Word(_)),
                        ));
                    }
                }
                spans[i] = (from, edges.len() as u32);
            }
            Adjacency {
                spans,
                edges,
                order: live_order,
                live,
            }
        })
    }

    fn out(&self, node: NodeIndex) -> &[(u32, u32, bool)] {
        let (from, to) = self.spans[node.index()];
        &self.edges[from as usize..to as usize]
    }
}

/// Best completion score from every node (per remaining part budget when
/// layered): `h[node * width + budget]`. `w` is the weight of every edge.
fn heuristic(
    lattice: &Lattice,
    order: &[NodeIndex],
    w: &[f64],
    layering: Layering,
    width: usize,
) -> Vec<f64> {
    let adjacency = Adjacency::of(lattice);
    let mut h = vec![f64::NEG_INFINITY; lattice.graph.node_count() * width];
    let end = &mut h[lattice.end.index() * width..][..width];
    match layering {
        Layering::Exactly(_) => end[0] = 0.0,
        _ => end.iter_mut().for_each(|x| *x = 0.0),
    }
    let mut row = vec![f64::NEG_INFINITY; width];
    let free = matches!(layering, Layering::Free);
    for &u in order.iter().rev() {
        if u == lattice.end {
            continue;
        }
        row.iter_mut().for_each(|x| *x = f64::NEG_INFINITY);
        for &(target, edge, is_word) in adjacency.out(u) {
            let w = w[edge as usize];
            let v = &h[target as usize * width..][..width];
            // A word uses one part of the budget; a junction none.
            if free {
                let cand = w + v[0];
                if cand > row[0] {
                    row[0] = cand;
                }
            } else if is_word {
                for (r, &rest) in row[1..].iter_mut().zip(&v[..width - 1]) {
                    let cand = w + rest;
                    if cand > *r {
                        *r = cand;
                    }
                }
            } else {
                for (r, &rest) in row.iter_mut().zip(v) {
                    let cand = w + rest;
                    if cand > *r {
                        *r = cand;
                    }
                }
            }
        }
        h[u.index() * width..][..width].copy_from_slice(&row);
    }
    h
}

/// A partial path: its last edge and the link before it (an index into
/// the search's list of links).
struct PathLink {
    edge: EdgeIndex,
    prev: Option<usize>,
}

struct Item {
    priority: f64,
    seq: u64,
    g: f64,
    node: NodeIndex,
    budget: usize,
    parts: usize,
    path: Option<usize>,
}

impl PartialEq for Item {
    fn eq(&self, other: &Self) -> bool {
        self.cmp(other) == Ordering::Equal
    }
}
impl Eq for Item {}
impl PartialOrd for Item {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for Item {
    fn cmp(&self, other: &Self) -> Ordering {
        self.priority
            .total_cmp(&other.priority)
            .then_with(|| other.seq.cmp(&self.seq))
    }
}

fn collect_path(links: &[PathLink], mut link: Option<usize>) -> Vec<EdgeIndex> {
    let mut edges = Vec::new();
    while let Some(l) = link {
        let l = &links[l];
        edges.push(l.edge);
        link = l.prev;
    }
    edges.reverse();
    edges
}

/// Best-first search under one layering: one complete path per `next()`,
/// best first, expanding only what the next path needs. Its tables (`w`,
/// the weight of every edge, and `h`, the heuristic) may be dropped while it
/// has not started ([`BestFirst::activate`] computes them again) and are
/// dropped once it is done. After `max_pops` pops the search stops (`cut`)
/// and yields nothing more.
struct BestFirst<'l> {
    lattice: &'l Lattice,
    divisor: f64,
    layering: Layering,
    width: usize,
    budget0: usize,
    /// The best score of any path of this search (the start's completion).
    bound: f64,
    w: Vec<f64>,
    h: Vec<f64>,
    /// Started: the start is (or was) on the heap.
    active: bool,
    heap: BinaryHeap<Item>,
    links: Vec<PathLink>,
    seq: u64,
    pops: usize,
    max_pops: usize,
    cut: bool,
}

/// The best completion score from `node` with `budget` parts left.
fn completion(h: &[f64], layering: Layering, width: usize, node: NodeIndex, budget: usize) -> f64 {
    match layering {
        Layering::Free => h[node.index()],
        _ => h[node.index() * width + budget],
    }
}

impl<'l> BestFirst<'l> {
    /// A search with the edge weights of `terms` for `divisor`; its tables
    /// are kept when `keep`, else dropped until it is activated.
    fn new(
        lattice: &'l Lattice,
        terms: &[EdgeTerms],
        divisor: f64,
        layering: Layering,
        max_pops: usize,
        keep: bool,
    ) -> Self {
        let (width, budget0) = match layering {
            Layering::Free => (1, 0),
            Layering::AtMost(p) | Layering::Exactly(p) => (p + 1, p),
        };
        let mut search = BestFirst {
            lattice,
            divisor,
            layering,
            width,
            budget0,
            bound: f64::NEG_INFINITY,
            w: Vec::new(),
            h: Vec::new(),
            active: false,
            heap: BinaryHeap::new(),
            links: Vec::new(),
            seq: 0,
            pops: 0,
            max_pops,
            cut: false,
        };
        search.tables(terms);
        search.bound = completion(&search.h, layering, width, lattice.start, budget0);
        if !keep {
            search.drop_tables();
        }
        search
    }

    /// Computes the weight of every edge and the heuristic.
    fn tables(&mut self, terms: &[EdgeTerms]) {
        self.w = terms.iter().map(|&t| t.weight(self.divisor)).collect();
        let order = topological(self.lattice);
        self.h = heuristic(self.lattice, order, &self.w, self.layering, self.width);
    }

    fn drop_tables(&mut self) {
        self.w = Vec::new();
        self.h = Vec::new();
        self.links = Vec::new();
    }

    /// Numbers the tables hold (kept in bounds by [`TABLE_BUDGET`]).
    fn table_size(&self) -> usize {
        self.lattice.graph.edge_count() + self.lattice.graph.node_count() * self.width
    }

    /// Starts the search, computing its tables again if they were dropped.
    fn activate(&mut self, terms: &[EdgeTerms]) {
        if self.active {
            return;
        }
        self.active = true;
        if !self.bound.is_finite() {
            return;
        }
        if self.h.is_empty() {
            self.tables(terms);
        }
        self.heap.push(Item {
            priority: self.bound,
            seq: 0,
            g: 0.0,
            node: self.lattice.start,
            budget: self.budget0,
            parts: 0,
            path: None,
        });
    }
}

impl Iterator for BestFirst<'_> {
    type Item = ScoredPath;

    fn next(&mut self) -> Option<ScoredPath> {
        debug_assert!(self.active, "a search yields only once activated");
        if self.cut {
            return None;
        }
        let lattice = self.lattice;
        let adjacency = Adjacency::of(lattice);
        let (layering, width) = (self.layering, self.width);
        while let Some(item) = self.heap.pop() {
            self.pops += 1;
            if self.pops > self.max_pops {
                self.cut = true;
                self.heap = BinaryHeap::new();
                self.drop_tables();
                return None;
            }
            if item.node == lattice.end {
                return Some(ScoredPath {
                    edges: collect_path(&self.links, item.path),
                    score: item.g,
                    parts: item.parts,
                });
            }
            for &(target, edge, is_word) in adjacency.out(item.node) {
                let target = NodeIndex::new(target as usize);
                let budget = match layering {
                    Layering::Free => 0,
                    _ if is_word => match item.budget.checked_sub(1) {
                        Some(b) => b,
                        None => continue,
                    },
                    _ => item.budget,
                };
                let rest = completion(&self.h, layering, width, target, budget);
                if !rest.is_finite() {
                    continue;
                }
                let edge = EdgeIndex::new(edge as usize);
                let gnew = item.g + self.w[edge.index()];
                self.seq += 1;
                self.links.push(PathLink {
                    edge,
                    prev: item.path,
                });
                self.heap.push(Item {
                    priority: gnew + rest,
                    seq: self.seq,
                    g: gnew,
                    node: target,
                    budget,
                    parts: item.parts + usize::from(is_word),
                    path: Some(self.links.len() - 1),
                });
            }
        }
        self.drop_tables();
        None
    }
}

/// Most parts on any path, computed once per lattice.
fn most_parts(lattice: &Lattice, order: &[NodeIndex]) -> usize {
    *lattice
        .most_parts
        .get_or_init(|| max_parts_on_paths(lattice, order))
}

/// Most parts on any path (for the per-`n` runs of the frequency model).
fn max_parts_on_paths(lattice: &Lattice, order: &[NodeIndex]) -> usize {
    let g = &lattice.graph;
    let adjacency = Adjacency::of(lattice);
    let mut best: Vec<Option<usize>> = vec![None; g.node_count()];
    best[lattice.end.index()] = Some(0);
    for &u in order.iter().rev() {
        if u == lattice.end {
            continue;
        }
        let mut m: Option<usize> = None;
        for &(target, _, is_word) in adjacency.out(u) {
            if let Some(v) = best[target as usize] {
                let c = v + usize::from(is_word);
                m = Some(m.map_or(c, |x| x.max(c)));
            }
        }
        best[u.index()] = m;
    }
    best[lattice.start.index()].unwrap_or(0)
}

/// Every analysis of a lattice, best first, found lazily: each `next()`
/// runs the best-first search only as far as the next path needs, so taking
/// the first few of astronomically many analyses costs no more than
/// [`best`] with a small `k`. Made by [`paths`].
///
/// Under the probability model this is one search. Under the frequency model
/// it is one search per number of parts `n` (exactly `n` parts, as the score
/// divides by `n`), merged on their next paths: highest score first, on equal
/// scores the one with fewer parts, and within one `n` the search's own order
/// (edge order breaks ties; analyses of equal score whose floating-point
/// sums differ in the last bits also come in that order, which is therefore
/// the same for every number taken). A search is started only when its best score
/// (known from its heuristic) could come next, and advanced only when its
/// next path is needed.
///
/// Each search stops after `max_pops` pops ([`SearchOptions::max_pops`]);
/// then it yields nothing more, and [`truncation`](Self::truncation) says so.
pub struct RankedPaths<'l> {
    /// What the edge weights are made of, for searches that compute their
    /// tables again.
    terms: Vec<EdgeTerms>,
    /// One search per layering (per `n`, fewest parts first, for frequency).
    streams: Vec<BestFirst<'l>>,
    /// The next path of each started search.
    heads: Vec<Option<ScoredPath>>,
    /// The search whose path was taken last: it is advanced at the next
    /// call, not before (so nothing is searched that is not asked for).
    taken: Option<usize>,
    /// The one analysis of a lattice that has only one (found without a
    /// search), until it is taken.
    single: Option<ScoredPath>,
}

/// Most numbers the per-`n` searches of one lattice keep in their tables
/// before they are started (64 MB): beyond it a search's tables are computed
/// for its best score, dropped, and computed again if it is started. The
/// frequency model's searches for all `n` up to `--max-parts 0` of a long
/// input would otherwise hold a table each at once.
const TABLE_BUDGET: usize = 1 << 23;

impl RankedPaths<'_> {
    /// `Some(Truncation::SearchSize)` when a search stopped at its work limit
    /// while a path was being looked for: paths beyond the ones yielded may
    /// be missing. Meaningful once the iterator has given what was wanted.
    pub fn truncation(&self) -> Option<Truncation> {
        self.streams
            .iter()
            .any(|s| s.cut)
            .then_some(Truncation::SearchSize)
    }

    /// Partial paths popped so far, over all searches (the work done).
    pub fn pops(&self) -> usize {
        self.streams.iter().map(|s| s.pops).sum()
    }

    /// How many searches have been started (of one per `n` for frequency).
    pub fn started(&self) -> usize {
        self.streams.iter().filter(|s| s.active).count()
    }
}

impl Iterator for RankedPaths<'_> {
    type Item = ScoredPath;

    fn next(&mut self) -> Option<ScoredPath> {
        if let Some(path) = self.single.take() {
            return Some(path);
        }
        if let Some(i) = self.taken.take() {
            self.heads[i] = self.streams[i].next();
        }
        loop {
            // The best next path; on equal scores the first, i.e. the
            // fewest parts.
            let mut best: Option<(usize, f64)> = None;
            for (i, head) in self.heads.iter().enumerate() {
                if let Some(p) = head {
                    if best.is_none_or(|(_, s)| p.score.total_cmp(&s) == Ordering::Greater) {
                        best = Some((i, p.score));
                    }
                }
            }
            // A search not started yet whose best score could come first
            // (with a margin for rounding, so as not to miss a tie) is
            // started; the one with the highest score first.
            let mut wake: Option<(usize, f64)> = None;
            for (i, s) in self.streams.iter().enumerate() {
                if s.active || !s.bound.is_finite() {
                    continue;
                }
                let could =
                    best.is_none_or(|(_, score)| s.bound + 1e-9 * (1.0 + s.bound.abs()) >= score);
                if could && wake.is_none_or(|(_, b)| s.bound > b) {
                    wake = Some((i, s.bound));
                }
            }
            if let Some((i, _)) = wake {
                self.streams[i].activate(&self.terms);
                self.heads[i] = self.streams[i].next();
                continue;
            }
            let (i, _) = best?;
            self.taken = Some(i);
            return self.heads[i].take();
        }
    }
}

/// Every analysis of `lattice`, best first, as a lazy iterator (see
/// [`RankedPaths`]). The heuristic of each search is computed here (it
/// gives the search's best score); paths are searched for as they are
/// asked for.
pub fn paths<'l>(
    lattice: &'l Lattice,
    rules: &RuleSet,
    lexicon: &Lexicon,
    options: &SearchOptions,
) -> RankedPaths<'l> {
    let weights = Weights {
        rules,
        lexicon,
        options,
    };
    if let Some(single) = unique_path(lattice, &weights, options) {
        return RankedPaths {
            terms: Vec::new(),
            streams: Vec::new(),
            heads: Vec::new(),
            taken: None,
            single,
        };
    }
    searched_paths(lattice, &weights, options)
}

/// [`paths`] by the searches alone (no shortcut for a lattice of one path).
fn searched_paths<'l>(
    lattice: &'l Lattice,
    weights: &Weights<'_>,
    options: &SearchOptions,
) -> RankedPaths<'l> {
    let (terms, streams) = match options.ranking {
        Ranking::Probability => {
            let limit = part_limit(lattice, topological(lattice), options.max_parts);
            let layering = if limit == 0 {
                Layering::Free
            } else {
                Layering::AtMost(limit)
            };
            let terms = weights.live_terms(lattice);
            let search = BestFirst::new(lattice, &terms, 1.0, layering, options.max_pops, true);
            (terms, vec![search])
        }
        Ranking::Frequency => {
            let order = topological(lattice);
            let mut most = most_parts(lattice, order);
            if options.max_parts > 0 {
                most = most.min(options.max_parts);
            }
            // What does not depend on the number of parts is computed once.
            let terms: Vec<EdgeTerms> = if most > 0 {
                weights.live_terms(lattice)
            } else {
                Vec::new()
            };
            let mut kept = 0usize;
            let mut streams = Vec::with_capacity(most);
            for n in 1..=most {
                let layering = Layering::Exactly(n);
                let mut search =
                    BestFirst::new(lattice, &terms, n as f64, layering, options.max_pops, true);
                kept += search.table_size();
                if kept > TABLE_BUDGET {
                    kept -= search.table_size();
                    search.drop_tables();
                }
                streams.push(search);
            }
            (terms, streams)
        }
    };
    RankedPaths {
        terms,
        heads: vec![None; streams.len()],
        streams,
        taken: None,
        single: None,
    }
}

/// The analysis of a lattice with exactly one path from start to end (every
/// live node but the end has one live edge out), scored as the search would
/// score it: its edges' weights added from the start, for its number of
/// parts under the frequency model. `None` when the lattice has another
/// shape, and `Some(None)` when its one path has more parts than allowed.
fn unique_path(
    lattice: &Lattice,
    weights: &Weights<'_>,
    options: &SearchOptions,
) -> Option<Option<ScoredPath>> {
    let live = Adjacency::of(lattice);
    if live.order.is_empty() {
        return None;
    }
    let mut edges = Vec::with_capacity(live.order.len());
    let mut parts = 0;
    let mut node = lattice.start;
    while node != lattice.end {
        let [(target, edge, is_word)] = live.out(node) else {
            return None;
        };
        edges.push(EdgeIndex::new(*edge as usize));
        parts += usize::from(*is_word);
        node = NodeIndex::new(*target as usize);
    }
    // Every live node is on the path: no other path leaves it.
    if edges.len() + 1 != live.order.len() || parts == 0 {
        return None;
    }
    if options.max_parts > 0 && parts > options.max_parts {
        return Some(None);
    }
    let divisor = match options.ranking {
        Ranking::Frequency => parts as f64,
        Ranking::Probability => 1.0,
    };
    let mut score = 0.0;
    for &e in &edges {
        let ends = lattice.graph.edge_endpoints(e);
        let last = ends.is_some_and(|(_, target)| target == lattice.end);
        let first = ends.is_some_and(|(source, _)| source == lattice.start);
        let next = ends.and_then(|(_, target)| next_instance(lattice, target));
        score += weights
            .terms(&lattice.graph[e], last, first, next)
            .weight(divisor);
    }
    Some(Some(ScoredPath {
        edges,
        score,
        parts,
    }))
}

/// The `k` best analyses, best first: the first `k` of [`paths`]. The second
/// value is set when a search stopped at its work limit.
pub fn best(
    lattice: &Lattice,
    rules: &RuleSet,
    lexicon: &Lexicon,
    options: &SearchOptions,
    k: usize,
) -> (Vec<ScoredPath>, Option<Truncation>) {
    let mut ranked = paths(lattice, rules, lexicon, options);
    let found: Vec<ScoredPath> = ranked.by_ref().take(k).collect();
    (found, ranked.truncation())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lattice::{build, LatticeOptions};
    use crate::lexicon::LexiconBuilder;
    use crate::rules::{compile_named, CompileOptions};

    /// `a` and `aa` as words: a run of n letters has Fibonacci(n + 1) readings.
    fn fibonacci_count(n: usize, max_parts: usize) -> (BigUint, BigUint) {
        let rules = compile_named("plain", &CompileOptions::default()).unwrap();
        let mut b = LexiconBuilder::new(&rules.normalizer);
        b.add_tsv("t", b"a\naa\n").unwrap();
        let lexicon = b.build().unwrap();
        let lattice = build(&rules, &lexicon, &"a".repeat(n), &LatticeOptions::default());
        let (mut x, mut y) = (BigUint::one(), BigUint::one());
        for _ in 1..n {
            let z = &x + &y;
            x = y;
            y = z;
        }
        (count(&lattice, max_parts), y)
    }

    #[test]
    fn counts_beyond_machine_integers_are_exact() {
        let (got, expected) = fibonacci_count(200, 0);
        assert!(expected.bits() > 128);
        assert_eq!(got, expected);
        let (small, expected) = fibonacci_count(60, 0);
        assert_eq!(small, expected);
    }

    #[test]
    fn counts_under_a_part_limit_agree_with_big_integers() {
        // With a limit below the longest path, the layered count runs; it
        // must equal the sum of binomials C(parts, n - parts).
        let (got, _) = fibonacci_count(10, 6);
        // readings of 10 letters with p parts (p - (10 - p) doubles): p = 5..=6
        // C(5,5) + C(6,4) = 1 + 15
        assert_eq!(got, BigUint::from(16u32));
        // Beyond 128 bits under a limit: 400 letters, at most 300 parts.
        let (got, _) = fibonacci_count(400, 300);
        let binomial =
            |n: usize, k: usize| (0..k).fold(BigUint::one(), |acc, i| acc * (n - i) / (i + 1));
        let expected = (200..=300).fold(BigUint::zero(), |acc, p| acc + binomial(p, 400 - p));
        assert!(expected.bits() > 128);
        assert_eq!(got, expected);
    }

    #[test]
    fn the_search_skips_dead_ends() {
        let rules = compile_named("plain", &CompileOptions::default()).unwrap();
        let mut b = LexiconBuilder::new(&rules.normalizer);
        b.add_tsv("t", b"ab\nabc\ncd\n").unwrap();
        let lexicon = b.build().unwrap();
        // abc reads on to a part at 3 where no word starts: a dead end
        // (kept here; the builder leaves such words out by default).
        let keep = LatticeOptions {
            keep_dead_ends: true,
            ..LatticeOptions::default()
        };
        let lattice = build(&rules, &lexicon, "abcd", &keep);
        let live = Adjacency::of(&lattice);
        assert!(live.order.len() < lattice.graph.node_count());
        assert_eq!(live.order.first(), Some(&lattice.start));
        assert_eq!(live.order.last(), Some(&lattice.end));
        let words: Vec<&str> = lattice
            .graph
            .edge_indices()
            .filter(|e| live.live[e.index()])
            .filter_map(|e| lattice.word(e).map(|w| w.key.as_str()))
            .collect();
        assert_eq!(words, ["ab", "cd"]);
        assert_eq!(count(&lattice, 0), BigUint::one());
        // Nothing reaches the end: nothing is live.
        let lattice = build(&rules, &lexicon, "abcx", &keep);
        assert!(Adjacency::of(&lattice).order.is_empty());
        assert_eq!(count(&lattice, 0), BigUint::zero());
        assert!(best(
            &lattice,
            &rules,
            &lexicon,
            &SearchOptions::from_rules(&rules),
            3
        )
        .0
        .is_empty());
    }

    #[test]
    fn a_lattice_of_one_path_gives_what_the_search_gives() {
        let rules = compile_named("german", &CompileOptions::default()).unwrap();
        let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
        let mut options = SearchOptions::from_rules(&rules);
        let weights = Weights {
            rules: &rules,
            lexicon: &lexicon,
            options: &options,
        };
        let mut unique = 0;
        for word in [
            "und",
            "der",
            "Haus",
            "Arbeitsamt",
            "schnell",
            "Zeitung",
            "Bahnhof",
        ] {
            let lattice = build(&rules, &lexicon, word, &LatticeOptions::default());
            let fast: Vec<ScoredPath> = paths(&lattice, &rules, &lexicon, &options).collect();
            let searched: Vec<ScoredPath> = searched_paths(&lattice, &weights, &options).collect();
            assert!(same(&fast, &searched), "{word}");
            unique += usize::from(unique_path(&lattice, &weights, &options).is_some());
        }
        assert!(unique > 0, "some of the words have one analysis");
        // Over the part limit, the one path is not listed.
        options.max_parts = 1;
        let lattice = build(&rules, &lexicon, "Arbeitsamt", &LatticeOptions::default());
        let weights = Weights {
            rules: &rules,
            lexicon: &lexicon,
            options: &options,
        };
        let fast: Vec<ScoredPath> = paths(&lattice, &rules, &lexicon, &options).collect();
        let searched: Vec<ScoredPath> = searched_paths(&lattice, &weights, &options).collect();
        assert!(same(&fast, &searched));
    }

    /// `a` and `aa` as words over `n` letters, counted under a part limit.
    fn fibonacci_within(n: usize, max_parts: usize) -> PartCount {
        let rules = compile_named("plain", &CompileOptions::default()).unwrap();
        let mut b = LexiconBuilder::new(&rules.normalizer);
        b.add_tsv("t", b"a\naa\n").unwrap();
        let lexicon = b.build().unwrap();
        let lattice = build(&rules, &lexicon, &"a".repeat(n), &LatticeOptions::default());
        count_within(&lattice, max_parts)
    }

    #[test]
    fn the_count_within_a_limit_says_whether_longer_analyses_exist() {
        // 10 letters: 5 to 10 parts (89 readings in all); at most 6 parts: 16.
        let within = fibonacci_within(10, 6);
        assert_eq!(within.count, BigUint::from(16u32));
        assert!(within.more_parts);
        // The limit is the longest path: nothing beyond it.
        let all = fibonacci_within(10, 10);
        assert_eq!(all.count, BigUint::from(89u32));
        assert!(!all.more_parts);
        assert_eq!(fibonacci_within(10, 0), all);
        // 4 letters (2 to 4 parts) with at most 3: one reading (a+a+a+a) is beyond.
        let within = fibonacci_within(4, 3);
        assert_eq!(within.count, BigUint::from(4u32));
        assert!(within.more_parts);
        // Beyond 128 bits, both answers come from big integers.
        let big = fibonacci_within(400, 300);
        assert!(big.count.bits() > 128);
        assert!(big.more_parts);
        assert!(!fibonacci_within(400, 400).more_parts);
    }

    /// The plain rule-set (concatenation only) with a lexicon of TSV lines.
    fn plain(tsv: &[u8]) -> (RuleSet, Lexicon) {
        let rules = compile_named("plain", &CompileOptions::default()).unwrap();
        let mut b = LexiconBuilder::new(&rules.normalizer);
        b.add_tsv("t", tsv).unwrap();
        let lexicon = b.build().unwrap();
        (rules, lexicon)
    }

    /// What [`best`] returned before the search was lazy: each search run
    /// for `k` paths on its own, then (frequency) all of them sorted by score,
    /// fewer parts first on equal scores, stably, and cut to `k`.
    fn best_collected(
        lattice: &Lattice,
        rules: &RuleSet,
        lexicon: &Lexicon,
        options: &SearchOptions,
        k: usize,
    ) -> Vec<ScoredPath> {
        let weights = Weights {
            rules,
            lexicon,
            options,
        };
        let RankedPaths { terms, streams, .. } = searched_paths(lattice, &weights, options);
        let mut all = Vec::new();
        for mut search in streams {
            search.activate(&terms);
            all.extend(search.by_ref().take(k));
        }
        if options.ranking == Ranking::Frequency {
            all.sort_by(|a, b| b.score.total_cmp(&a.score).then(a.parts.cmp(&b.parts)));
        }
        all.truncate(k);
        all
    }

    fn same(a: &[ScoredPath], b: &[ScoredPath]) -> bool {
        a.len() == b.len()
            && a.iter().zip(b).all(|(x, y)| {
                x.edges == y.edges && x.score.to_bits() == y.score.to_bits() && x.parts == y.parts
            })
    }

    /// The lazy iterator, `best` and the collect-and-sort of before agree
    /// exactly for every `k`, under both models, with and without a part
    /// limit, for runs of letters with readings of many numbers of parts.
    /// Under the frequency model every word has frequency 1 (`ln f = 0`) and
    /// junctions cost nothing, so every analysis scores exactly 0: the
    /// order is the tie order alone (fewer parts first, then each search's
    /// own order).
    #[test]
    fn lazy_paths_are_exactly_what_best_returns_for_every_k() {
        for (ranking, tsv, split_cost) in [
            (
                Ranking::Probability,
                &b"a\t5\naa\t3\naaa\t8\nb\t2\n"[..],
                0.25,
            ),
            (Ranking::Frequency, b"a\t1\naa\t1\naaa\t1\nb\t1\n", 0.0),
            (Ranking::Frequency, b"a\t1\naa\t1\naaa\t1\nb\t1\n", 0.25),
            (Ranking::Frequency, b"a\t1\naa\t1\naaa\t1\nb\t1\n", -0.25),
        ] {
            let (rules, lexicon) = plain(tsv);
            for input in ["aaaaaaa", "aaaaaaaaaa", "aabaaab", "b"] {
                let lattice = build(&rules, &lexicon, input, &LatticeOptions::default());
                for max_parts in [0, 4, 6] {
                    let mut options = SearchOptions::from_rules(&rules);
                    options.ranking = ranking;
                    options.max_parts = max_parts;
                    options.split_cost = split_cost;
                    let total = count(&lattice, max_parts);
                    for k in [0, 1, 2, 3, 5, 8, 13, 40, 1000] {
                        let lazy: Vec<ScoredPath> = paths(&lattice, &rules, &lexicon, &options)
                            .take(k)
                            .collect();
                        let (listed, cut) = best(&lattice, &rules, &lexicon, &options, k);
                        let before = best_collected(&lattice, &rules, &lexicon, &options, k);
                        let what =
                            format!("{input} {ranking:?} {split_cost} max-parts {max_parts} k {k}");
                        assert!(same(&lazy, &listed), "{what}");
                        assert!(same(&lazy, &before), "{what}");
                        assert!(cut.is_none(), "{what}");
                        let expected = total.clone().min(BigUint::from(k));
                        assert_eq!(BigUint::from(lazy.len()), expected, "{what}");
                        assert!(
                            lazy.windows(2).all(|w| w[0].score >= w[1].score),
                            "{what}: best first"
                        );
                    }
                }
            }
        }
    }

    /// With frequencies whose logarithms are inexact, analyses of the same
    /// parts in another order score the same but for the last bits of the
    /// floating-point sums, and one search does not give such near-ties in
    /// strict floating-point order (its priorities are summed in another
    /// order than the scores). The collect-and-sort of before reordered
    /// them; the lazy merge gives each search's order. Everything else is the
    /// same: at every rank the score agrees to rounding, and the complete
    /// listing holds the same analyses.
    #[test]
    fn lazy_paths_differ_from_collect_and_sort_only_within_near_ties() {
        let (rules, lexicon) = plain(b"a\t5\naa\t3\naaa\t8\nb\t2\n");
        for input in ["aaaaaaa", "aaaaaaaaaa", "aabaaab"] {
            let lattice = build(&rules, &lexicon, input, &LatticeOptions::default());
            let mut options = SearchOptions::from_rules(&rules);
            options.ranking = Ranking::Frequency;
            options.split_cost = 0.25;
            let k = 100_000;
            let lazy: Vec<ScoredPath> = paths(&lattice, &rules, &lexicon, &options)
                .take(k)
                .collect();
            let before = best_collected(&lattice, &rules, &lexicon, &options, k);
            assert_eq!(BigUint::from(lazy.len()), count(&lattice, 0), "{input}");
            assert_eq!(lazy.len(), before.len(), "{input}");
            for (x, y) in lazy.iter().zip(&before) {
                assert!((x.score - y.score).abs() < 1e-12, "{input}");
            }
            let sorted = |v: &[ScoredPath]| {
                let mut e: Vec<Vec<EdgeIndex>> = v.iter().map(|p| p.edges.clone()).collect();
                e.sort();
                e
            };
            assert_eq!(sorted(&lazy), sorted(&before), "{input}");
        }
    }

    /// The same with German compounds and the bundled German rule-set and
    /// lexicon (frequency model, one search per number of parts up to five).
    #[test]
    fn lazy_paths_agree_with_best_on_german_compounds() {
        let rules = compile_named("german", &CompileOptions::default()).unwrap();
        let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
        let options = SearchOptions::from_rules(&rules);
        assert_eq!(options.ranking, Ranking::Frequency);
        for input in [
            "Wetterbericht",
            "Arbeitsamt",
            "Schifffahrtsstraße",
            "Donaudampfschifffahrtsgesellschaft",
            "Hochzeitstag",
        ] {
            let lattice = build(&rules, &lexicon, input, &LatticeOptions::default());
            for k in [1, 2, 5, 20, 100] {
                let lazy: Vec<ScoredPath> = paths(&lattice, &rules, &lexicon, &options)
                    .take(k)
                    .collect();
                let before = best_collected(&lattice, &rules, &lexicon, &options, k);
                assert!(same(&lazy, &before), "{input} k {k}");
                assert!(same(
                    &lazy,
                    &best(&lattice, &rules, &lexicon, &options, k).0
                ));
            }
        }
    }

    /// A run of 300 `a` with the words `a` and `aa` has Fibonacci(301)
    /// (about 3.6 · 10^62) analyses: the first few come after a few pops per
    /// path, and under the frequency model (300 searches, one per number of
    /// parts) only the searches whose best score can come first are started.
    #[test]
    fn the_first_paths_do_not_need_the_whole_search() {
        let (rules, lexicon) = plain(b"a\t10\naa\t5\n");
        let lattice = build(
            &rules,
            &lexicon,
            &"a".repeat(300),
            &LatticeOptions::default(),
        );
        assert!(count(&lattice, 0).bits() > 200);
        for ranking in [Ranking::Probability, Ranking::Frequency] {
            let mut options = SearchOptions::from_rules(&rules);
            options.ranking = ranking;
            let mut ranked = paths(&lattice, &rules, &lexicon, &options);
            let first: Vec<ScoredPath> = ranked.by_ref().take(5).collect();
            assert_eq!(first.len(), 5);
            // Far fewer pops than analyses (the per-`n` searches meet many
            // exact ties, which they expand breadth-first); each path has
            // up to 599 edges.
            assert!(
                ranked.pops() < 200_000,
                "{ranking:?}: {} pops",
                ranked.pops()
            );
            assert!(ranked.started() <= 10, "{ranking:?}: {}", ranked.started());
            assert!(ranked.truncation().is_none());
            // More can be taken from where it stopped.
            let more: Vec<ScoredPath> = ranked.by_ref().take(5).collect();
            let ten: Vec<ScoredPath> = paths(&lattice, &rules, &lexicon, &options)
                .take(10)
                .collect();
            let both: Vec<ScoredPath> = first.into_iter().chain(more).collect();
            assert!(same(&both, &ten), "{ranking:?}");
        }
    }

    /// The work limit stops a search and is reported after it ends.
    #[test]
    fn the_work_limit_is_reported_when_it_cuts_the_listing() {
        let (rules, lexicon) = plain(b"a\t10\naa\t5\n");
        let lattice = build(
            &rules,
            &lexicon,
            &"a".repeat(300),
            &LatticeOptions::default(),
        );
        let mut options = SearchOptions::from_rules(&rules);
        options.max_pops = 100;
        let mut ranked = paths(&lattice, &rules, &lexicon, &options);
        assert!(ranked.next().is_none());
        assert_eq!(ranked.truncation(), Some(Truncation::SearchSize));
        let (listed, cut) = best(&lattice, &rules, &lexicon, &options, 3);
        assert!(listed.is_empty());
        assert_eq!(cut, Some(Truncation::SearchSize));
        // Not reached: nothing to report.
        options.max_pops = 1_000_000;
        let (listed, cut) = best(&lattice, &rules, &lexicon, &options, 3);
        assert_eq!(listed.len(), 3);
        assert_eq!(cut, None);
    }
}
