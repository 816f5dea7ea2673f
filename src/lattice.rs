//! Lattice stage: the DAG of every way to read a surface string as lexicon
//! entries joined by junction rules.
//!
//! A **part node** is an analysis state: a surface position plus the
//! underlying material that the junction before it has already accounted for
//! (the start of the next word, e.g. the `n` of `na` in `tan na`). A **joint
//! node** is a surface position where a given junction instance begins. Edges
//! are either a lexicon entry consumed (part node → joint node, or → the end)
//! or a junction rule inverted (joint node → part node).
//!
//! A word read from part node `(p, carried)` is `carried + X + L` where `X` is
//! the surface between `p` and the junction and `L` is the underlying end the
//! junction replaces. Every path from the start to the end node is one
//! analysis; every edge pair moves forward on the surface, so the graph is
//! acyclic.

use crate::lexicon::{condition_holds, Lexicon, Tags};
use crate::normalize::MappedText;
use crate::rules::{Condition, RuleSet, Scope, Separator};
use petgraph::graph::{DiGraph, EdgeIndex, NodeIndex};
use std::collections::HashMap;
use std::time::Instant;

/// Which junctions may be used.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ScopeFilter {
    /// All junctions.
    #[default]
    Any,
    /// Only junctions allowed inside compounds.
    Compound,
    /// Only junctions allowed between words of a phrase.
    Phrase,
}

impl ScopeFilter {
    fn allows(self, scope: Scope) -> bool {
        match self {
            ScopeFilter::Any => true,
            ScopeFilter::Compound => scope != Scope::Phrase,
            ScopeFilter::Phrase => scope != Scope::Compound,
        }
    }
}

/// Limits and options for building a lattice.
#[derive(Debug, Clone)]
pub struct LatticeOptions {
    /// Junction scopes allowed.
    pub scope: ScopeFilter,
    /// Longest input analysed, in characters (longer input is reported, not analysed).
    pub max_input_chars: usize,
    /// Most edges in one lattice (building stops and the result is marked truncated).
    pub max_edges: usize,
    /// Give up building at this moment (the result is marked truncated).
    pub deadline: Option<Instant>,
    /// Override of the rule-set's `min-part-length`.
    pub min_part_length: Option<usize>,
}

impl Default for LatticeOptions {
    fn default() -> Self {
        LatticeOptions {
            scope: ScopeFilter::Any,
            max_input_chars: 4096,
            max_edges: 2_000_000,
            deadline: None,
            min_part_length: None,
        }
    }
}

/// Why a lattice (or a search) is incomplete.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Truncation {
    /// The input was longer than `max_input_chars`.
    InputLength,
    /// The lattice reached `max_edges`.
    LatticeSize,
    /// The time limit passed.
    Time,
    /// More analyses exist than were listed.
    Limit,
    /// The best-first search reached its work limit.
    SearchSize,
    /// Analyses with more parts than `max-parts` exist and are left out.
    Parts,
}

impl Truncation {
    /// The reason in words.
    pub fn describe(self) -> &'static str {
        match self {
            Truncation::InputLength => {
                "the input is longer than the line-length limit (--max-chars)"
            }
            Truncation::LatticeSize => {
                "the lattice reached its size limit (--max-edges): some analyses are missing"
            }
            Truncation::Time => {
                "the time limit per input passed (--timeout): some analyses are missing"
            }
            Truncation::Limit => "more analyses exist than were listed (--top / --limit)",
            Truncation::SearchSize => "the ranked search reached its work limit",
            Truncation::Parts => {
                "analyses with more parts than the part limit (--max-parts) exist and are left out"
            }
        }
    }
}

/// A node of the lattice.
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub enum Node {
    /// A word starts at `pos` (a surface position, in normalized characters);
    /// its first underlying letters `carried` were produced by the junction before.
    Part {
        /// Surface position.
        pos: usize,
        /// Underlying start of the word already accounted for.
        carried: String,
        /// The rule whose conditions on its right word still have to be checked.
        pending: Option<usize>,
    },
    /// Junction instance `instance` begins at surface position `pos`.
    Joint {
        /// Surface position.
        pos: usize,
        /// Index into [`RuleSet::instances`].
        instance: usize,
    },
    /// The end of the input.
    End,
}

/// Where a part comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PartSource {
    /// A lexicon entry.
    Entry(usize),
    /// An open-class pattern (index into [`RuleSet::patterns`]).
    Pattern(usize),
}

/// A lexicon entry (or pattern part) consumed.
#[derive(Debug, Clone, PartialEq)]
pub struct WordEdge {
    /// The entry.
    pub source: PartSource,
    /// The full underlying (normalized) form.
    pub key: String,
    /// Underlying start accounted for by the previous junction.
    pub carried: String,
    /// Underlying end replaced by the next junction.
    pub left_end: String,
    /// Surface span of the letters read directly (`X`), in normalized characters.
    pub start: usize,
    /// End of that span.
    pub end: usize,
    /// Frequency used in ranking.
    pub frequency: f64,
}

/// An edge of the lattice.
#[derive(Debug, Clone, PartialEq)]
pub enum Edge {
    /// A word.
    Word(WordEdge),
    /// A junction inverted.
    Junction {
        /// Index into [`RuleSet::instances`].
        instance: usize,
    },
}

/// The lattice of one input.
#[derive(Debug, Clone)]
pub struct Lattice {
    /// The DAG.
    pub graph: DiGraph<Node, Edge>,
    /// Start node (position 0, nothing carried).
    pub start: NodeIndex,
    /// End node.
    pub end: NodeIndex,
    /// The normalized input with its map to the original.
    pub text: MappedText,
    /// Segment boundaries of the normalized input.
    pub boundaries: Vec<bool>,
    /// Set when the lattice is incomplete.
    pub truncated: Option<Truncation>,
    /// Every node in topological order (start first, end last).
    pub order: Vec<NodeIndex>,
}

impl Lattice {
    /// Number of word edges.
    pub fn word_edges(&self) -> usize {
        self.graph
            .edge_weights()
            .filter(|e| matches!(e, Edge::Word(_)))
            .count()
    }

    /// The word edge at an index, if it is one.
    pub fn word(&self, e: EdgeIndex) -> Option<&WordEdge> {
        match &self.graph[e] {
            Edge::Word(w) => Some(w),
            Edge::Junction { .. } => None,
        }
    }
}

/// Tags of a part for condition checks.
pub fn part_readings<'a>(
    rules: &'a RuleSet,
    lexicon: &'a Lexicon,
    source: PartSource,
    pattern_tags: &'a mut Vec<Tags>,
) -> &'a [Tags] {
    match source {
        PartSource::Entry(id) => &lexicon.entry(id).readings,
        PartSource::Pattern(p) => {
            let pat = &rules.patterns[p];
            let mut tags: Tags = pat.tags.iter().cloned().collect();
            tags.insert("pattern".into(), pat.name.clone());
            *pattern_tags = vec![tags];
            pattern_tags
        }
    }
}

struct Builder<'a> {
    rules: &'a RuleSet,
    lexicon: &'a Lexicon,
    options: &'a LatticeOptions,
    chars: Vec<char>,
    original_upper: Vec<bool>,
    bounds: Vec<bool>,
    matches_at: Vec<std::rc::Rc<Vec<(usize, usize)>>>,
    graph: DiGraph<Node, Edge>,
    nodes: HashMap<Node, NodeIndex>,
    parts_at: Vec<Vec<NodeIndex>>,
    start: NodeIndex,
    end: NodeIndex,
    min_part: usize,
    truncated: Option<Truncation>,
}

/// Builds the lattice of `input`.
pub fn build(rules: &RuleSet, lexicon: &Lexicon, input: &str, options: &LatticeOptions) -> Lattice {
    let text = rules.normalizer.map(input);
    let chars = text.chars.clone();
    let n = chars.len();
    let mut graph = DiGraph::new();
    let start_node = Node::Part {
        pos: 0,
        carried: String::new(),
        pending: None,
    };
    let start = graph.add_node(start_node.clone());
    let end = graph.add_node(Node::End);
    if n > options.max_input_chars {
        return Lattice {
            order: vec![start, end],
            graph,
            start,
            end,
            boundaries: vec![true; n + 1],
            text,
            truncated: Some(Truncation::InputLength),
        };
    }
    let bounds = rules.segmenter.boundaries(&chars);
    let original_upper = (0..n)
        .map(|i| {
            text.original
                .get(text.origin[i])
                .is_some_and(|c| c.is_uppercase())
        })
        .collect();
    let mut b = Builder {
        rules,
        lexicon,
        options,
        matches_at: Vec::new(),
        chars,
        original_upper,
        bounds,
        graph,
        nodes: HashMap::new(),
        parts_at: vec![Vec::new(); n + 1],
        start,
        end,
        min_part: options
            .min_part_length
            .unwrap_or(rules.settings.min_part_length),
        truncated: None,
    };
    b.nodes.insert(start_node, start);
    b.nodes.insert(Node::End, end);
    b.parts_at[0].push(start);
    b.find_junctions();
    for pos in 0..=n {
        let here = std::mem::take(&mut b.parts_at[pos]);
        for node in here {
            if b.truncated.is_some() {
                break;
            }
            b.expand(node);
        }
    }
    let truncated = b.truncated;
    let order = topological_order(rules, &b.graph);
    Lattice {
        order,
        graph: b.graph,
        start,
        end,
        text,
        boundaries: b.bounds,
        truncated,
    }
}

/// Nodes sorted by surface position; at one position, joints whose junction
/// prints nothing come before part nodes, which come before the other joints.
/// Every edge goes forward in this order (see the module docs), so it is a
/// topological order, found without a graph search.
fn topological_order(rules: &RuleSet, graph: &DiGraph<Node, Edge>) -> Vec<NodeIndex> {
    let mut order: Vec<NodeIndex> = graph.node_indices().collect();
    order.sort_by_key(|&i| match &graph[i] {
        Node::Part { pos, .. } => (*pos, 1),
        Node::Joint { pos, instance } => (
            *pos,
            if rules.instances[*instance].surface_chars() == 0 {
                0
            } else {
                2
            },
        ),
        Node::End => (usize::MAX, 3),
    });
    order
}

impl Builder<'_> {
    /// For every position, the junction instances whose surface starts there,
    /// grouped by their underlying left end within each surface (the rule-set's
    /// surface index keeps them so), so each left end is walked once.
    fn find_junctions(&mut self) {
        let n = self.chars.len();
        let max = self.rules.max_surface_chars();
        let mut surface = String::new();
        for q in 0..=n {
            let mut here = Vec::new();
            if self.bounds[q] {
                surface.clear();
                for len in 0..=max.min(n - q) {
                    if len > 0 {
                        surface.push(self.chars[q + len - 1]);
                    }
                    if !self.bounds[q + len] {
                        continue;
                    }
                    for &i in self.rules.instances_with_surface(&surface) {
                        if self.options.scope.allows(self.rules.instances[i].scope) {
                            here.push((i, q + len));
                        }
                    }
                }
            }
            self.matches_at.push(std::rc::Rc::new(here));
        }
    }

    fn node(&mut self, node: Node) -> (NodeIndex, bool) {
        if let Some(&i) = self.nodes.get(&node) {
            return (i, false);
        }
        let i = self.graph.add_node(node.clone());
        if let Node::Part { pos, .. } = node {
            self.parts_at[pos].push(i);
        }
        self.nodes.insert(node, i);
        (i, true)
    }

    fn add_edge(&mut self, from: NodeIndex, to: NodeIndex, edge: Edge) {
        if self.graph.edge_count() >= self.options.max_edges {
            self.truncated = Some(Truncation::LatticeSize);
            return;
        }
        self.graph.add_edge(from, to, edge);
    }

    fn conditions_hold(&self, conds: &[Condition], key: &str, source: PartSource) -> bool {
        if conds.is_empty() {
            return true;
        }
        let mut scratch = Vec::new();
        let readings = part_readings(self.rules, self.lexicon, source, &mut scratch);
        conds.iter().all(|c| condition_holds(c, key, readings))
    }

    /// Checks that apply to every word read from `node`, whatever follows it.
    fn word_allowed(
        &self,
        node: NodeIndex,
        pending: Option<usize>,
        key: &str,
        source: PartSource,
    ) -> bool {
        if let Some(rule) = pending {
            if !self.conditions_hold(&self.rules.rules[rule].right_conditions, key, source) {
                return false;
            }
        }
        if node == self.start && !self.conditions_hold(&self.rules.edge_start, key, source) {
            return false;
        }
        true
    }

    fn expand(&mut self, node: NodeIndex) {
        if let Some(deadline) = self.options.deadline {
            if Instant::now() > deadline {
                self.truncated = Some(Truncation::Time);
                return;
            }
        }
        let Node::Part {
            pos,
            carried,
            pending,
        } = self.graph[node].clone()
        else {
            return;
        };
        let n = self.chars.len();
        let carried_chars = carried.chars().count();
        if let Some(mut cursor) = self.lexicon.step_str(self.lexicon.root(), &carried) {
            let mut q = pos;
            loop {
                if self.bounds[q] {
                    self.word_ends(node, pos, &carried, carried_chars, pending, cursor, q);
                    if self.truncated.is_some() {
                        return;
                    }
                }
                if q == n {
                    break;
                }
                match self.lexicon.step_char(cursor, self.chars[q]) {
                    Some(c) => cursor = c,
                    None => break,
                }
                q += 1;
            }
        }
        if carried.is_empty() {
            self.pattern_words(node, pos, pending);
        }
    }

    #[allow(clippy::too_many_arguments)]
    fn word_ends(
        &mut self,
        node: NodeIndex,
        pos: usize,
        carried: &str,
        carried_chars: usize,
        pending: Option<usize>,
        cursor: crate::lexicon::Cursor,
        q: usize,
    ) {
        let n = self.chars.len();
        if q == n {
            if let Some(id) = self.lexicon.entry_at(cursor) {
                let key = self.lexicon.entry(id).key.clone();
                let whole = node == self.start;
                if self.aligned(&key, carried_chars, 0)
                    && self.word_allowed(node, pending, &key, PartSource::Entry(id))
                    && self.conditions_hold(&self.rules.edge_end, &key, PartSource::Entry(id))
                    && (whole || key.chars().count() >= self.min_part)
                {
                    let edge = WordEdge {
                        source: PartSource::Entry(id),
                        key,
                        carried: carried.to_string(),
                        left_end: String::new(),
                        start: pos,
                        end: q,
                        frequency: self.lexicon.entry(id).frequency,
                    };
                    self.add_edge(node, self.end, Edge::Word(edge));
                }
            }
        }
        let matches = std::rc::Rc::clone(&self.matches_at[q]);
        // Instances are grouped by left end: walk each left end once.
        let mut last: Option<(usize, Option<usize>)> = None;
        for &(inst_id, after) in matches.iter() {
            if after == pos {
                continue; // nothing read and nothing on the surface: no progress
            }
            let inst = &self.rules.instances[inst_id];
            let found = match last {
                Some((prev, found)) if self.rules.instances[prev].left == inst.left => found,
                _ => {
                    let found = self
                        .lexicon
                        .step_str(cursor, &inst.left)
                        .and_then(|c2| self.lexicon.entry_at(c2));
                    last = Some((inst_id, found));
                    found
                }
            };
            let Some(id) = found else {
                continue;
            };
            let key = self.lexicon.entry(id).key.clone();
            let left_chars = inst.left.chars().count();
            let rule = &self.rules.rules[inst.rule];
            if !(self.aligned(&key, carried_chars, left_chars)
                && key.chars().count() >= self.min_part
                && self.word_allowed(node, pending, &key, PartSource::Entry(id))
                && self.conditions_hold(&rule.left_conditions, &key, PartSource::Entry(id)))
            {
                continue;
            }
            let pending_next = (!rule.right_conditions.is_empty()).then_some(inst.rule);
            let edge = WordEdge {
                source: PartSource::Entry(id),
                key,
                carried: carried.to_string(),
                left_end: inst.left.clone(),
                start: pos,
                end: q,
                frequency: self.lexicon.entry(id).frequency,
            };
            self.join_to(node, q, inst_id, after, pending_next, Edge::Word(edge));
        }
    }

    fn join_to(
        &mut self,
        from: NodeIndex,
        q: usize,
        inst_id: usize,
        after: usize,
        pending_next: Option<usize>,
        edge: Edge,
    ) {
        let (joint, fresh) = self.node(Node::Joint {
            pos: q,
            instance: inst_id,
        });
        if fresh {
            let right = self.rules.instances[inst_id].right.clone();
            let (next, _) = self.node(Node::Part {
                pos: after,
                carried: right,
                pending: pending_next,
            });
            self.add_edge(joint, next, Edge::Junction { instance: inst_id });
        }
        self.add_edge(from, joint, edge);
    }

    /// The word `key` must have segment boundaries where the carried start ends
    /// and where the replaced end begins.
    fn aligned(&self, key: &str, carried_chars: usize, left_chars: usize) -> bool {
        let seg = &self.rules.segmenter;
        if seg.is_trivial() {
            return true;
        }
        let len = key.chars().count();
        (carried_chars == 0 || seg.is_boundary(key, carried_chars))
            && (left_chars == 0 || seg.is_boundary(key, len - left_chars))
    }

    /// Open-class parts: a run of segments of a pattern's class, standing at
    /// the start of the input or after a printed space or hyphen, and ending at
    /// the end of the input or before one.
    fn pattern_words(&mut self, node: NodeIndex, pos: usize, pending: Option<usize>) {
        if self.rules.patterns.is_empty() {
            return;
        }
        if pos > 0 && !matches!(self.chars[pos - 1], ' ' | '-') {
            return;
        }
        let n = self.chars.len();
        for (pi, pattern) in self.rules.patterns.iter().enumerate() {
            let mut q = pos;
            let mut count = 0;
            while q < n {
                let mut next = q + 1;
                while next < n && !self.bounds[next] {
                    next += 1;
                }
                let seg: String = self.chars[q..next].iter().collect();
                if !pattern.members.contains(&seg)
                    || (pattern.uppercase && !self.original_upper[q..next].iter().all(|&u| u))
                {
                    break;
                }
                count += next - q;
                q = next;
                if pattern.max.is_some_and(|m| count > m) {
                    break;
                }
                if count < pattern.min {
                    continue;
                }
                let key: String = self.chars[pos..q].iter().collect();
                let source = PartSource::Pattern(pi);
                if !self.word_allowed(node, pending, &key, source) {
                    continue;
                }
                let edge = WordEdge {
                    source,
                    key: key.clone(),
                    carried: String::new(),
                    left_end: String::new(),
                    start: pos,
                    end: q,
                    frequency: self.rules.settings.pattern_frequency,
                };
                if q == n {
                    if self.conditions_hold(&self.rules.edge_end, &key, source) {
                        self.add_edge(node, self.end, Edge::Word(edge.clone()));
                    }
                    continue;
                }
                let matches = std::rc::Rc::clone(&self.matches_at[q]);
                for &(inst_id, after) in matches.iter() {
                    let inst = &self.rules.instances[inst_id];
                    if !inst.left.is_empty()
                        || !inst.surface_left.is_empty()
                        || !matches!(inst.separator, Separator::Space | Separator::Hyphen)
                    {
                        continue;
                    }
                    let rule = &self.rules.rules[inst.rule];
                    if !self.conditions_hold(&rule.left_conditions, &key, source) {
                        continue;
                    }
                    let pending_next = (!rule.right_conditions.is_empty()).then_some(inst.rule);
                    self.join_to(
                        node,
                        q,
                        inst_id,
                        after,
                        pending_next,
                        Edge::Word(edge.clone()),
                    );
                }
                let _ = pending;
            }
        }
    }
}
