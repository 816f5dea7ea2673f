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

use crate::lexicon::{conditions_hold, Cursor, Lexicon, StepCache, Tags};
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
    /// Build the words whose junction leads to a part that cannot be read on
    /// from (no lexicon word, long enough, starts there and ends the input or
    /// meets a junction). No analysis goes through them; `explain` shows
    /// them as dead ends. Off by default: such words are not added.
    pub keep_dead_ends: bool,
}

impl Default for LatticeOptions {
    fn default() -> Self {
        LatticeOptions {
            scope: ScopeFilter::Any,
            max_input_chars: 4096,
            max_edges: 2_000_000,
            deadline: None,
            min_part_length: None,
            keep_dead_ends: false,
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
    /// Most parts on any path, once the search has computed it.
    pub(crate) most_parts: std::sync::OnceLock<usize>,
    /// The edges out of every node as flat arrays, once the search has
    /// built them.
    pub(crate) adjacency: std::sync::OnceLock<crate::search::Adjacency>,
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
        PartSource::Entry(id) => lexicon.readings(id),
        PartSource::Pattern(p) => {
            let pat = &rules.patterns[p];
            let mut tags: Tags = pat.tags.iter().cloned().collect();
            tags.insert("pattern", &pat.name);
            *pattern_tags = vec![tags];
            pattern_tags
        }
    }
}

/// Whether the left word `key`, written as the junction `inst` writes it
/// (its left end replaced by the letters before the boundary), is a lexicon
/// form of that word: the same form, or a form with a reading whose `lemma`
/// normalizes to `key` (a rule's `attested` clause).
pub fn attested(
    rules: &RuleSet,
    lexicon: &Lexicon,
    key: &str,
    inst: &crate::rules::Instance,
) -> bool {
    let Some(stem) = key.strip_suffix(inst.left.as_str()) else {
        return false;
    };
    let mut written = String::with_capacity(stem.len() + inst.surface_left.len());
    written.push_str(stem);
    written.push_str(&inst.surface_left);
    written == key || lemma_is(rules, lexicon, lexicon.get(&written), key)
}

/// Whether entry `written` (if any) has a reading whose `lemma` normalizes
/// to `key`.
pub(crate) fn lemma_is(
    rules: &RuleSet,
    lexicon: &Lexicon,
    written: Option<usize>,
    key: &str,
) -> bool {
    let Some(id) = written else {
        return false;
    };
    lexicon.readings(id).iter().any(|r| {
        r.get(crate::proof::LEMMA_TAG).is_some_and(|lemmas| {
            lemmas
                .split('|')
                .any(|l| rules.normalizer.normalize(l) == key)
        })
    })
}

/// A fast hash for the small integer keys of the node maps (the standard
/// SipHash guards against hash flooding, which integer keys made here cannot do).
#[derive(Default, Clone, Copy)]
struct IntHasher(u64);

impl std::hash::Hasher for IntHasher {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.write_u64(u64::from(b));
        }
    }
    fn write_u8(&mut self, n: u8) {
        self.write_u64(u64::from(n));
    }
    fn write_u32(&mut self, n: u32) {
        self.write_u64(u64::from(n));
    }
    fn write_u64(&mut self, n: u64) {
        self.0 = (self.0.rotate_left(5) ^ n).wrapping_mul(0x51_7c_c1_b7_27_22_0a_95);
    }
    fn write_usize(&mut self, n: usize) {
        self.write_u64(n as u64);
    }
}

type IntMap<K, V = NodeIndex> = HashMap<K, V, std::hash::BuildHasherDefault<IntHasher>>;

/// Where a word read from a part node ends: it starts at `pos` (after
/// `carried_chars` carried characters), its letters read directly end at
/// `q`, and the junction after it ends at `after`.
#[derive(Clone, Copy)]
struct WordSpan {
    pos: usize,
    carried_chars: usize,
    q: usize,
    after: usize,
    /// Where the walk from `pos` keeps its entries in `Builder::walk_ids`
    /// (`ids..ids_end`).
    ids: usize,
    ids_end: usize,
}

/// A part node waiting to be expanded.
#[derive(Clone, Copy)]
struct PendingPart<'a> {
    node: NodeIndex,
    carried: &'a str,
    /// The number of `carried` (see `SurfaceTrie::right_id`).
    right: u32,
    pending: Option<usize>,
    /// The word before it was read as a noun in an input that starts with
    /// a small letter, under `set verb-after-noun = capitalised`: no word
    /// read only as a verb may be read here (see [`noun_before_verb`]).
    after_noun: bool,
}

/// An entry that a walk of the lexicon from a part node found (see
/// `Builder::walk`): its letters read directly end at `q`, then comes the end
/// of the input (`group` is `None`) or the junction instances
/// `surface.instances[from..to]` of a surface ending at `after`.
#[derive(Clone, Copy)]
struct Found {
    q: usize,
    after: usize,
    id: usize,
    group: Option<(u32, u32, u32)>,
}

struct Builder<'a> {
    rules: &'a RuleSet,
    lexicon: &'a Lexicon,
    options: &'a LatticeOptions,
    chars: Vec<char>,
    /// The normalized input as text, and where each character starts in it
    /// (one more at the end), so a word's letters are copied as one slice.
    text: String,
    char_bytes: Vec<usize>,
    /// The entry whose key is empty, if any (read at the start of a walk
    /// with nothing carried).
    root_entry: Option<usize>,
    original_upper: Vec<bool>,
    bounds: Vec<bool>,
    /// Surfaces found at each position: `matches[match_start[q]..match_start[q + 1]]`
    /// holds (surface, position after it), shortest first.
    matches: Vec<(u32, usize)>,
    match_start: Vec<usize>,
    graph: DiGraph<Node, Edge>,
    /// Joint nodes by (position, instance, whether a noun comes before).
    joints: IntMap<(usize, usize, bool)>,
    /// Part nodes by (position, right start number, pending rule, whether
    /// a noun comes before).
    parts: IntMap<(usize, u32, Option<usize>, bool)>,
    parts_at: Vec<Vec<PendingPart<'a>>>,
    /// Per node: (position, rank at that position) for the topological order.
    order_keys: Vec<(usize, u8)>,
    start: NodeIndex,
    end: NodeIndex,
    min_part: usize,
    truncated: Option<Truncation>,
    /// Part nodes expanded so far (the time limit is checked every 16th).
    expanded: usize,
    /// Scratch stack of the left-end walk: left-trie node, index cursor
    /// and the entry ending there.
    stack: Vec<(u32, Cursor, Option<usize>)>,
    /// Recent steps of the lexicon index (this thread's, see [`STEP_CACHE`]).
    steps: StepCache,
    /// What the lexicon walks found, per (position, carried start number):
    /// a range of `found`.
    walks: IntMap<(usize, u32), (usize, usize, usize, usize)>,
    /// Whether a part at (position, carried start number) can be read on
    /// from (see `Builder::may_continue`).
    finish: IntMap<(usize, u32), bool>,
    found: Vec<Found>,
    /// Per walk, from its position on: the entry (if any) that the carried
    /// start and the letters read so far spell, `walk_ids[start + (q - pos)]`
    /// for the input up to `q` (see [`WordSpan::ids`]).
    walk_ids: Vec<Option<usize>>,
    /// Whether a condition list (by its number) holds for an entry (or, when
    /// the list tests only tags, for every entry with the same readings).
    memo: &'a ConditionMemo,
    /// Scratch text of the word being tested.
    key: String,
    /// `set verb-after-noun` or `set noun-head` is `capitalised`, the input
    /// starts with a small letter and is a lexicon word with no noun
    /// reading (see [`small_word_refuses`]).
    small_non_noun: bool,
    /// `set noun-head = capitalised` and the input, written small or with a
    /// capital, is a lexicon word with no noun reading: its head is no noun
    /// (see [`small_word_refuses`]).
    non_noun: bool,
    /// That input is read by the lexicon only as a verb.
    small_verb: bool,
    /// `set noun-head = capitalised` and the input starts with a capital
    /// followed by a small letter: its head is a noun (see
    /// [`capitalised_head_refused`]).
    capitalised: bool,
}

/// Whether the condition lists of a rule-set hold for the entries of a
/// lexicon, remembered across lattices (an [`Analyzer`](crate::analyzer::Analyzer)
/// keeps one for all its inputs). A list that tests only tags is remembered
/// per set of readings of a compiled lexicon, any other per entry: two bits
/// each (not known yet, false, true), in a table allocated when the list is
/// first tested. Threads share it without locks: the answer for one slot is
/// always the same, whoever stores it.
pub struct ConditionMemo {
    /// Addresses of the rule-set and lexicon it was made for.
    rules: usize,
    lexicon: usize,
    /// Number of sets of readings (compiled lexicon), or `None`.
    sets: Option<usize>,
    entries: usize,
    /// Per list: whether it is remembered per set of readings.
    by_sets: Vec<bool>,
    lists: Vec<std::sync::OnceLock<Box<[std::sync::atomic::AtomicU64]>>>,
}

impl std::fmt::Debug for ConditionMemo {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        let used = self.lists.iter().filter(|l| l.get().is_some()).count();
        write!(
            f,
            "ConditionMemo({} lists, {used} in use)",
            self.lists.len()
        )
    }
}

impl ConditionMemo {
    /// An empty memo for this rule-set and lexicon.
    pub fn new(rules: &RuleSet, lexicon: &Lexicon) -> ConditionMemo {
        let sets = lexicon.reading_set_count();
        let by_sets: Vec<bool> = rules
            .condition_ids
            .uses_form
            .iter()
            .map(|&form| !form && sets.is_some())
            .collect();
        ConditionMemo {
            rules: rules as *const RuleSet as usize,
            lexicon: lexicon as *const Lexicon as usize,
            sets,
            entries: lexicon.len(),
            lists: by_sets.iter().map(|_| std::sync::OnceLock::new()).collect(),
            by_sets,
        }
    }

    /// Whether it was made for this rule-set and lexicon.
    pub fn is_for(&self, rules: &RuleSet, lexicon: &Lexicon) -> bool {
        self.rules == rules as *const RuleSet as usize
            && self.lexicon == lexicon as *const Lexicon as usize
    }

    /// The slot of entry `id` in list `list`'s table, if it has one.
    fn slot(
        &self,
        lexicon: &Lexicon,
        list: u32,
        id: usize,
    ) -> Option<(&std::sync::atomic::AtomicU64, u32)> {
        let list = list as usize;
        let by_sets = *self.by_sets.get(list)?;
        let (index, len) = if by_sets {
            (lexicon.reading_set(id)?, self.sets?)
        } else {
            (id, self.entries)
        };
        if index >= len {
            return None;
        }
        let table = self.lists[list].get_or_init(|| {
            (0..len.div_ceil(32))
                .map(|_| std::sync::atomic::AtomicU64::new(0))
                .collect()
        });
        Some((&table[index / 32], (index % 32) as u32 * 2))
    }

    fn get(&self, lexicon: &Lexicon, list: u32, id: usize) -> Option<bool> {
        let (word, shift) = self.slot(lexicon, list, id)?;
        let bits = word.load(std::sync::atomic::Ordering::Relaxed) >> shift;
        (bits & 1 == 1).then_some(bits & 2 == 2)
    }

    fn set(&self, lexicon: &Lexicon, list: u32, id: usize, holds: bool) {
        if let Some((word, shift)) = self.slot(lexicon, list, id) {
            let bits = (1 | u64::from(holds) << 1) << shift;
            word.fetch_or(bits, std::sync::atomic::Ordering::Relaxed);
        }
    }
}

/// What one lattice build needs besides the lattice itself, kept on its
/// thread for the next build (emptied, with its room): the index steps
/// remembered, and the builder's tables, which a batch would otherwise
/// allocate and grow again for every input.
#[derive(Default)]
struct Scratch {
    steps: StepCache,
    matches: Vec<(u32, usize)>,
    match_start: Vec<usize>,
    joints: IntMap<(usize, usize, bool)>,
    parts: IntMap<(usize, u32, Option<usize>, bool)>,
    order_keys: Vec<(usize, u8)>,
    stack: Vec<(u32, Cursor, Option<usize>)>,
    walks: IntMap<(usize, u32), (usize, usize, usize, usize)>,
    finish: IntMap<(usize, u32), bool>,
    found: Vec<Found>,
    walk_ids: Vec<Option<usize>>,
    key: String,
}

/// Most entries the tables of a [`Scratch`] may hold to be kept for the
/// next build (a huge input's tables are dropped, the index steps kept).
const SCRATCH_KEPT: usize = 1 << 16;

impl Scratch {
    fn clear(&mut self) {
        self.matches.clear();
        self.match_start.clear();
        self.joints.clear();
        self.parts.clear();
        self.order_keys.clear();
        self.stack.clear();
        self.walks.clear();
        self.finish.clear();
        self.found.clear();
        self.walk_ids.clear();
        self.key.clear();
    }

    fn size(&self) -> usize {
        self.matches.capacity()
            + self.match_start.capacity()
            + self.joints.capacity()
            + self.parts.capacity()
            + self.order_keys.capacity()
            + self.walks.capacity()
            + self.finish.capacity()
            + self.found.capacity()
            + self.walk_ids.capacity()
    }
}

thread_local! {
    /// The scratch of the last lattice built on this thread, for the next
    /// (taken by a build, put back when it is done).
    static SCRATCH: std::cell::Cell<Scratch> = std::cell::Cell::new(Scratch::default());
}

/// Builds the lattice of `input`.
pub fn build(rules: &RuleSet, lexicon: &Lexicon, input: &str, options: &LatticeOptions) -> Lattice {
    build_with(
        rules,
        lexicon,
        input,
        options,
        &ConditionMemo::new(rules, lexicon),
    )
}

/// Builds the lattice of `input`, with the condition results remembered in
/// `memo` (used only if it was made for this rule-set and lexicon).
pub fn build_with(
    rules: &RuleSet,
    lexicon: &Lexicon,
    input: &str,
    options: &LatticeOptions,
    memo: &ConditionMemo,
) -> Lattice {
    if !memo.is_for(rules, lexicon) {
        return build(rules, lexicon, input, options);
    }
    let text = rules.normalizer.map(input);
    let chars = text.chars.clone();
    let n = chars.len();
    // Room for a typical lattice (about three nodes and four edges per
    // character), so that building it rarely grows a vector.
    let room = if n > options.max_input_chars { 0 } else { n };
    let mut graph = DiGraph::with_capacity(3 * room + 2, 4 * room + 4);
    let start = graph.add_node(Node::Part {
        pos: 0,
        carried: String::new(),
        pending: None,
    });
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
            most_parts: Default::default(),
            adjacency: Default::default(),
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
    let mut scratch = SCRATCH.with(std::cell::Cell::take);
    scratch.clear();
    lexicon.reset_step_cache(&mut scratch.steps);
    scratch.order_keys.extend([(0, 1), (usize::MAX, 3)]);
    let mut char_bytes = Vec::with_capacity(n + 1);
    let mut normalized = String::with_capacity(n);
    for &c in &chars {
        char_bytes.push(normalized.len());
        normalized.push(c);
    }
    char_bytes.push(normalized.len());
    let mut b = Builder {
        rules,
        lexicon,
        options,
        text: normalized,
        char_bytes,
        root_entry: lexicon.entry_at(lexicon.root()),
        matches: scratch.matches,
        match_start: scratch.match_start,
        chars,
        original_upper,
        bounds,
        graph,
        joints: scratch.joints,
        parts: scratch.parts,
        parts_at: vec![Vec::new(); n + 1],
        order_keys: scratch.order_keys,
        start,
        end,
        min_part: options
            .min_part_length
            .unwrap_or(rules.settings.min_part_length),
        truncated: None,
        expanded: 0,
        stack: scratch.stack,
        steps: scratch.steps,
        walks: scratch.walks,
        finish: scratch.finish,
        found: scratch.found,
        walk_ids: scratch.walk_ids,
        memo,
        key: scratch.key,
        small_non_noun: false,
        non_noun: false,
        small_verb: false,
        capitalised: false,
    };
    let known_non_noun = (rules.settings.verb_after_noun_capitalised
        || rules.settings.noun_head_capitalised)
        && lexicon.get(&b.text).is_some_and(|id| {
            let whole = lexicon.readings(id);
            b.small_verb = only_verb(whole);
            no_noun_reading(whole)
        });
    b.small_non_noun = known_non_noun
        && text
            .original
            .iter()
            .find(|c| c.is_alphabetic())
            .is_some_and(|c| c.is_lowercase());
    b.non_noun = known_non_noun && (b.small_non_noun || rules.settings.noun_head_capitalised);
    b.small_verb &= b.non_noun;
    b.capitalised = rules.settings.noun_head_capitalised && starts_capitalised(&text.original);
    b.parts.insert((0, 0, None, false), start);
    b.parts_at[0].push(PendingPart {
        node: start,
        carried: "",
        right: 0,
        pending: None,
        after_noun: false,
    });
    b.find_junctions();
    for pos in 0..=n {
        let here = std::mem::take(&mut b.parts_at[pos]);
        for part in here {
            if b.truncated.is_some() {
                break;
            }
            b.expand(part, pos);
        }
    }
    let truncated = b.truncated;
    let order = b.topological_order();
    let mut kept = Scratch {
        steps: b.steps,
        matches: b.matches,
        match_start: b.match_start,
        joints: b.joints,
        parts: b.parts,
        order_keys: b.order_keys,
        stack: b.stack,
        walks: b.walks,
        finish: b.finish,
        found: b.found,
        walk_ids: b.walk_ids,
        key: b.key,
    };
    if kept.size() > SCRATCH_KEPT {
        kept = Scratch {
            steps: kept.steps,
            ..Scratch::default()
        };
    }
    SCRATCH.with(|c| c.set(kept));
    Lattice {
        order,
        graph: b.graph,
        start,
        end,
        text,
        boundaries: b.bounds,
        truncated,
        most_parts: Default::default(),
        adjacency: Default::default(),
    }
}

impl<'a> Builder<'a> {
    /// For every position, the instance surfaces that start there (at
    /// segment boundaries, ending at one), shortest first.
    fn find_junctions(&mut self) {
        let n = self.chars.len();
        let max = self.rules.max_surface_chars();
        let trie = &self.rules.surface_trie;
        for q in 0..=n {
            self.match_start.push(self.matches.len());
            if !self.bounds[q] {
                continue;
            }
            let bounds = &self.bounds[q..];
            let matches = &mut self.matches;
            trie.matches(
                &self.chars[q..],
                max,
                |len| bounds[len],
                |surface, len| matches.push((surface, q + len)),
            );
        }
        self.match_start.push(self.matches.len());
    }

    /// Nodes sorted by surface position; at one position, joints whose
    /// junction prints nothing come before part nodes, which come before the
    /// other joints. Every edge goes forward in this order (see the module
    /// docs), so it is a topological order, found without a graph search.
    fn topological_order(&self) -> Vec<NodeIndex> {
        let mut keys: Vec<(usize, u8, u32)> = self
            .order_keys
            .iter()
            .enumerate()
            .map(|(i, &(pos, rank))| (pos, rank, i as u32))
            .collect();
        keys.sort_unstable();
        keys.into_iter()
            .map(|(_, _, i)| NodeIndex::new(i as usize))
            .collect()
    }

    fn joint(&mut self, pos: usize, instance: usize, after_noun: bool) -> (NodeIndex, bool) {
        if let Some(&i) = self.joints.get(&(pos, instance, after_noun)) {
            return (i, false);
        }
        let i = self.graph.add_node(Node::Joint { pos, instance });
        let rank = if self.rules.surface_trie.surface_chars(instance) == 0 {
            0
        } else {
            2
        };
        self.order_keys.push((pos, rank));
        self.joints.insert((pos, instance, after_noun), i);
        (i, true)
    }

    fn part(
        &mut self,
        pos: usize,
        instance: usize,
        pending: Option<usize>,
        after_noun: bool,
    ) -> NodeIndex {
        let right = self.rules.surface_trie.right_id(instance);
        let key = (pos, right, pending, after_noun);
        if let Some(&i) = self.parts.get(&key) {
            return i;
        }
        let carried: &'a str = &self.rules.instances[instance].right;
        let i = self.graph.add_node(Node::Part {
            pos,
            carried: carried.to_string(),
            pending,
        });
        self.order_keys.push((pos, 1));
        self.parts_at[pos].push(PendingPart {
            node: i,
            carried,
            right,
            pending,
            after_noun,
        });
        self.parts.insert(key, i);
        i
    }

    fn add_edge(&mut self, from: NodeIndex, to: NodeIndex, edge: Edge) {
        if self.graph.edge_count() >= self.options.max_edges {
            self.truncated = Some(Truncation::LatticeSize);
            return;
        }
        self.graph.add_edge(from, to, edge);
    }

    /// Whether the conditions `conds` (numbered `list` in the rule-set's
    /// [`ConditionIds`](crate::rules::surface_trie::ConditionIds)) hold for a part;
    /// remembered per lexicon entry.
    fn conditions_hold(
        &self,
        conds: &[Condition],
        list: u32,
        key: &str,
        source: PartSource,
    ) -> bool {
        if conds.is_empty() {
            return true;
        }
        let evaluate = || {
            let mut scratch = Vec::new();
            let readings = part_readings(self.rules, self.lexicon, source, &mut scratch);
            conditions_hold(conds, key, readings)
        };
        let PartSource::Entry(id) = source else {
            return evaluate();
        };
        if let Some(known) = self.memo.get(self.lexicon, list, id) {
            return known;
        }
        let holds = evaluate();
        self.memo.set(self.lexicon, list, id, holds);
        holds
    }

    /// Checks that apply to every word read from `node`, whatever follows it.
    fn word_allowed(
        &self,
        node: NodeIndex,
        pending: Option<usize>,
        after_noun: bool,
        key: &str,
        source: PartSource,
    ) -> bool {
        if after_noun {
            let mut scratch = Vec::new();
            let readings = part_readings(self.rules, self.lexicon, source, &mut scratch);
            if only_verb(readings) {
                return false;
            }
        }
        if let Some(rule) = pending {
            let conds = &self.rules.rules[rule].right_conditions;
            if !self.conditions_hold(conds, self.rules.condition_ids.right[rule], key, source) {
                return false;
            }
        }
        if node == self.start
            && !self.conditions_hold(
                &self.rules.edge_start,
                self.rules.condition_ids.edge_start,
                key,
                source,
            )
        {
            return false;
        }
        true
    }

    fn expand(&mut self, part: PendingPart<'a>, pos: usize) {
        // The clock is read at the first part and then at every 16th (a
        // part's expansion is bounded by one walk of the input).
        self.expanded += 1;
        if let Some(deadline) = self.options.deadline {
            if self.expanded % 16 == 1 && Instant::now() > deadline {
                self.truncated = Some(Truncation::Time);
                return;
            }
        }
        let carried_chars = part.carried.chars().count();
        // Part nodes at one position with the same carried start (they
        // differ in the rule whose right conditions are pending) read the
        // same words: the lexicon is walked once for all of them.
        let (from, to, ids, ids_end) = self.walk_range(pos, part.right, part.carried);
        let rules = self.rules;
        let mut at = None;
        for i in from..to {
            let found = self.found[i];
            // Limits are checked after all the words ending at one position.
            if at != Some(found.q) {
                if self.truncated.is_some() {
                    return;
                }
                at = Some(found.q);
            }
            let span = WordSpan {
                pos,
                carried_chars,
                q: found.q,
                after: found.after,
                ids,
                ids_end,
            };
            match found.group {
                None => self.end_edge(part, span, found.id),
                Some((surface, from, to)) => {
                    let surface = rules.surface_trie.surface(surface);
                    let group = &surface.instances()[from as usize..to as usize];
                    self.group_edges(part, span, group, found.id);
                }
            }
        }
        if self.truncated.is_some() {
            return;
        }
        if part.carried.is_empty() {
            self.pattern_words(part.node, pos, part.pending, part.after_noun);
        }
    }

    /// The normalized input's characters `from..to` as text.
    fn letters(&self, from: usize, to: usize) -> &str {
        &self.text[self.char_bytes[from]..self.char_bytes[to]]
    }

    /// The walk of the lexicon from a part at `pos` with the carried start
    /// `carried` (numbered `right`): its range of `found` and of `walk_ids`,
    /// walked the first time it is asked for.
    fn walk_range(
        &mut self,
        pos: usize,
        right: u32,
        carried: &str,
    ) -> (usize, usize, usize, usize) {
        if let Some(&range) = self.walks.get(&(pos, right)) {
            return range;
        }
        let (from, ids) = (self.found.len(), self.walk_ids.len());
        self.walk(carried, pos);
        let range = (from, self.found.len(), ids, self.walk_ids.len());
        self.walks.insert((pos, right), range);
        range
    }

    /// Whether a part at `pos` with the carried start `carried` (numbered
    /// `right`) can be read on from: the lexicon walk from it finds a word
    /// long enough that ends the input, or ends before a junction instance of
    /// the allowed scopes, or an open-class pattern could start there. Only
    /// this first step is looked at (the parts after that word are not
    /// walked: that would walk parts no edge leads to), and no condition is
    /// tested, so a part that can may still turn out a dead end; one that
    /// cannot is one for sure. Remembered per part.
    fn may_continue(&mut self, pos: usize, right: u32, carried: &'a str) -> bool {
        if let Some(&known) = self.finish.get(&(pos, right)) {
            return known;
        }
        let verdict = self.pattern_may_start(pos, carried) || {
            let (from, to, _, _) = self.walk_range(pos, right, carried);
            let carried_chars = carried.chars().count();
            let rules = self.rules;
            self.found[from..to].iter().any(|found| {
                // The word's length in characters, as the part-length test
                // of the edges counts it.
                let read = carried_chars + (found.q - pos);
                let Some((surface, from, to)) = found.group else {
                    return pos == 0 || read >= self.min_part;
                };
                let group =
                    &rules.surface_trie.surface(surface).instances()[from as usize..to as usize];
                let left_chars = group
                    .first()
                    .map_or(0, |&i| rules.instances[i].left.chars().count());
                read + left_chars >= self.min_part
                    && group
                        .iter()
                        .any(|&i| self.options.scope.allows(rules.instances[i].scope))
            })
        };
        self.finish.insert((pos, right), verdict);
        verdict
    }

    /// Whether an open-class pattern could start a part here (see
    /// [`Builder::pattern_words`]).
    fn pattern_may_start(&self, pos: usize, carried: &str) -> bool {
        !self.rules.patterns.is_empty()
            && carried.is_empty()
            && (pos == 0 || matches!(self.chars[pos - 1], ' ' | '-'))
    }

    /// Walks the lexicon from `carried` along the input from `pos` and
    /// appends to `found`, in the order edges are added, every entry that
    /// ends where a word may end: at the end of the input, or before a
    /// junction starting at a segment boundary `q` whose left end completes
    /// it (the left ends of one surface in byte order, each walked once).
    fn walk(&mut self, carried: &str, pos: usize) {
        let n = self.chars.len();
        let lexicon = self.lexicon;
        let rules = self.rules;
        let mut steps = std::mem::take(&mut self.steps);
        let mut cursor = lexicon.root();
        let mut entry = self.root_entry;
        for &byte in carried.as_bytes() {
            match lexicon.step_cached(&mut steps, cursor, byte) {
                Some(next) => (cursor, entry) = next,
                None => {
                    self.steps = steps;
                    return;
                }
            }
        }
        let mut stack = std::mem::take(&mut self.stack);
        let mut q = pos;
        'walk: loop {
            self.walk_ids.push(entry);
            if self.bounds[q] {
                if q == n {
                    if let Some(id) = entry {
                        self.found.push(Found {
                            q,
                            after: n,
                            id,
                            group: None,
                        });
                    }
                }
                for m in self.match_start[q]..self.match_start[q + 1] {
                    let (surface_id, after) = self.matches[m];
                    if after == pos {
                        continue; // nothing read and nothing on the surface: no progress
                    }
                    let surface = rules.surface_trie.surface(surface_id);
                    if surface.lefts_len() == 1 {
                        // Every instance has the empty left end: the entry
                        // read so far is the word.
                        if let (Some((from, to)), Some(id)) = (surface.group(0), entry) {
                            self.found.push(Found {
                                q,
                                after,
                                id,
                                group: Some((surface_id, from, to)),
                            });
                        }
                        continue;
                    }
                    stack.clear();
                    stack.push((0, cursor, entry));
                    while let Some((at, here, here_entry)) = stack.pop() {
                        if let Some((from, to)) = surface.group(at) {
                            if let Some(id) = here_entry {
                                self.found.push(Found {
                                    q,
                                    after,
                                    id,
                                    group: Some((surface_id, from, to)),
                                });
                            }
                        }
                        for (byte, child) in surface.children(at).rev() {
                            if let Some((next, next_entry)) =
                                lexicon.step_cached(&mut steps, here, byte)
                            {
                                stack.push((child, next, next_entry));
                            }
                        }
                    }
                }
            }
            if q == n {
                break;
            }
            let mut buf = [0u8; 4];
            for &byte in self.chars[q].encode_utf8(&mut buf).as_bytes() {
                match lexicon.step_cached(&mut steps, cursor, byte) {
                    Some(next) => (cursor, entry) = next,
                    None => break 'walk,
                }
            }
            q += 1;
        }
        self.stack = stack;
        self.steps = steps;
    }

    /// The word edge for entry `id` read from `part` to the end of the input.
    fn end_edge(&mut self, part: PendingPart<'a>, span: WordSpan, id: usize) {
        let node = part.node;
        // The entry's key is `carried + chars[pos..q]` (the index was walked
        // along it): built here, so that the entry itself is not.
        let mut key_buf = std::mem::take(&mut self.key);
        key_buf.clear();
        key_buf.push_str(part.carried);
        key_buf.push_str(self.letters(span.pos, span.q));
        let key = key_buf.as_str();
        let whole = node == self.start;
        if self.aligned(key, span.carried_chars, 0)
            && self.word_allowed(
                node,
                part.pending,
                part.after_noun,
                key,
                PartSource::Entry(id),
            )
            && self.conditions_hold(
                &self.rules.edge_end,
                self.rules.condition_ids.edge_end,
                key,
                PartSource::Entry(id),
            )
            && (whole || key.chars().count() >= self.min_part)
            && (whole || !self.capitalised || !capitalised_head_refused(self.lexicon.readings(id)))
            && (whole
                || !self.non_noun
                || !head_refused(
                    &self.rules.settings,
                    part.after_noun,
                    self.small_verb,
                    self.lexicon.readings(id),
                ))
        {
            let edge = WordEdge {
                source: PartSource::Entry(id),
                key: key.to_string(),
                carried: part.carried.to_string(),
                left_end: String::new(),
                start: span.pos,
                end: span.q,
                frequency: self.lexicon.frequency(id),
            };
            self.add_edge(node, self.end, Edge::Word(edge));
        }
        self.key = key_buf;
    }

    /// The word edges for entry `id` ending before the junction instances
    /// `group` (one surface, one left end) at `span.q`. The entry's key is
    /// `carried + chars[pos..q] + left` (the index was walked along it).
    fn group_edges(
        &mut self,
        part: PendingPart<'a>,
        span: WordSpan,
        group: &'a [usize],
        id: usize,
    ) {
        let rules = self.rules;
        let Some(&first) = group.first() else {
            return;
        };
        let left: &str = &rules.instances[first].left;
        let left_chars = left.chars().count();
        if span.carried_chars + (span.q - span.pos) + left_chars < self.min_part {
            return;
        }
        // Every part after this group already known to be a dead end: no
        // edge (what is not known yet is worked out below, for an edge
        // that passes the other checks).
        if !self.options.keep_dead_ends
            && group.iter().all(|&inst_id| {
                self.finish
                    .get(&(span.after, rules.surface_trie.right_id(inst_id)))
                    == Some(&false)
            })
        {
            return;
        }
        let mut key_buf = std::mem::take(&mut self.key);
        key_buf.clear();
        key_buf.push_str(part.carried);
        key_buf.push_str(self.letters(span.pos, span.q));
        key_buf.push_str(left);
        let key = key_buf.as_str();
        let source = PartSource::Entry(id);
        // What depends only on the entry and the left end is checked once.
        let mut word_ok: Option<bool> = None;
        let after_noun = self.noun_before(source);
        for &inst_id in group {
            let inst = &rules.instances[inst_id];
            if !self.options.scope.allows(inst.scope) {
                continue;
            }
            let ok = *word_ok.get_or_insert_with(|| {
                self.aligned(key, span.carried_chars, left_chars)
                    && self.word_allowed(part.node, part.pending, part.after_noun, key, source)
            });
            if !ok {
                break;
            }
            let rule = &rules.rules[inst.rule];
            let list = rules.condition_ids.left[inst.rule];
            if !self.conditions_hold(&rule.left_conditions, list, key, source) {
                continue;
            }
            // The left word as the junction writes it (the input up to the
            // end of the junction's letters before the boundary), as an entry.
            let written_chars = span.q - span.pos + inst.surface_left.chars().count();
            let written = self.walk_ids[span.ids..span.ids_end]
                .get(written_chars)
                .copied()
                .flatten();
            if !rules.settings.shadowed_linking
                && part.carried.is_empty()
                && self.shadowed(inst, key, written_chars, written)
            {
                continue;
            }
            if rule.attested
                && inst.surface_left != inst.left
                && !lemma_is(rules, self.lexicon, written, key)
            {
                continue;
            }
            if !self.options.keep_dead_ends
                && !self.may_continue(
                    span.after,
                    rules.surface_trie.right_id(inst_id),
                    &inst.right,
                )
            {
                continue;
            }
            let pending_next = (!rule.right_conditions.is_empty()).then_some(inst.rule);
            let edge = WordEdge {
                source,
                key: key.to_string(),
                carried: part.carried.to_string(),
                left_end: inst.left.clone(),
                start: span.pos,
                end: span.q,
                frequency: self.lexicon.frequency(id),
            };
            let (q, after) = (span.q, span.after);
            self.join_to(
                part.node,
                q,
                inst_id,
                after,
                pending_next,
                after_noun,
                Edge::Word(edge),
            );
        }
        self.key = key_buf;
    }

    /// Whether the left word `key`, written `own` in the input and followed
    /// by the junction `inst`, is shadowed: the junction adds letters before
    /// its boundary and the word as written with them is a common noun of
    /// its own (see [`crate::rules::SHADOWING_READING`]).
    fn shadowed(
        &self,
        inst: &crate::rules::Instance,
        key: &str,
        written_chars: usize,
        written: Option<usize>,
    ) -> bool {
        if inst.separator != crate::rules::Separator::None || inst.surface_left.is_empty() {
            return false;
        }
        if written_chars <= key.chars().count() {
            return false;
        }
        let Some(id) = written else {
            return false;
        };
        self.lexicon.readings(id).iter().any(|r| {
            r.get("pos")
                .is_some_and(|p| p.split('|').any(|v| v == "noun"))
                && !r.contains_key("lemma")
                && r.get("proper") != Some("yes")
        })
    }

    fn join_to(
        &mut self,
        from: NodeIndex,
        q: usize,
        inst_id: usize,
        after: usize,
        pending_next: Option<usize>,
        after_noun: bool,
        edge: Edge,
    ) {
        let (joint, fresh) = self.joint(q, inst_id, after_noun);
        if fresh {
            let next = self.part(after, inst_id, pending_next, after_noun);
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
    fn pattern_words(
        &mut self,
        node: NodeIndex,
        pos: usize,
        pending: Option<usize>,
        after_noun: bool,
    ) {
        if self.rules.patterns.is_empty() {
            return;
        }
        if pos > 0 && !matches!(self.chars[pos - 1], ' ' | '-') {
            return;
        }
        let rules = self.rules;
        let n = self.chars.len();
        for (pi, pattern) in rules.patterns.iter().enumerate() {
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
                if !self.word_allowed(node, pending, after_noun, &key, source) {
                    continue;
                }
                let noun_before = self.noun_before(source);
                let edge = WordEdge {
                    source,
                    key: key.clone(),
                    carried: String::new(),
                    left_end: String::new(),
                    start: pos,
                    end: q,
                    frequency: rules.settings.pattern_frequency,
                };
                if q == n {
                    if self.conditions_hold(
                        &rules.edge_end,
                        rules.condition_ids.edge_end,
                        &key,
                        source,
                    ) {
                        self.add_edge(node, self.end, Edge::Word(edge.clone()));
                    }
                    continue;
                }
                for m in self.match_start[q]..self.match_start[q + 1] {
                    let (surface, after) = self.matches[m];
                    for &inst_id in rules.surface_trie.surface(surface).instances() {
                        let inst = &rules.instances[inst_id];
                        if !self.options.scope.allows(inst.scope)
                            || !inst.left.is_empty()
                            || !inst.surface_left.is_empty()
                            || !matches!(inst.separator, Separator::Space | Separator::Hyphen)
                        {
                            continue;
                        }
                        let rule = &rules.rules[inst.rule];
                        let list = rules.condition_ids.left[inst.rule];
                        if !self.conditions_hold(&rule.left_conditions, list, &key, source) {
                            continue;
                        }
                        let pending_next = (!rule.right_conditions.is_empty()).then_some(inst.rule);
                        self.join_to(
                            node,
                            q,
                            inst_id,
                            after,
                            pending_next,
                            noun_before,
                            Edge::Word(edge.clone()),
                        );
                    }
                }
            }
        }
    }

    /// Whether the part after a word from `source` has a noun before it,
    /// as `set verb-after-noun = capitalised` reads it in this input (see
    /// [`small_word_refuses`]).
    fn noun_before(&self, source: PartSource) -> bool {
        if !(self.small_non_noun && self.rules.settings.verb_after_noun_capitalised) {
            return false;
        }
        let mut scratch = Vec::new();
        read_as_noun(part_readings(
            self.rules,
            self.lexicon,
            source,
            &mut scratch,
        ))
    }
}

/// Whether `key` (normalized) is a lexicon word none of whose readings is a
/// noun (but for a nominalised adjective): written small, such an input is small by the orthography, not
/// because a pipeline lowered its case (a lowered noun compound,
/// `rinderbraten`, is no lexicon word or is one read as a noun, and is
/// split as the capitalised word would be).
pub fn known_without_noun(lexicon: &Lexicon, key: &str) -> bool {
    lexicon
        .get(key)
        .is_some_and(|id| no_noun_reading(lexicon.readings(id)))
}

/// No reading is a noun but for a nominalised adjective (see
/// [`known_without_noun`]).
fn no_noun_reading(readings: &[Tags]) -> bool {
    !readings.iter().any(|r| {
        r.get("pos")
            .is_some_and(|p| p.split('|').any(|v| v == "noun"))
            && r.get(NOMINALISED_TAG) != Some("yes")
    })
}

/// The lexicon tag of a noun reading that is an adjective used as a noun
/// (`nominalised=yes`: Geheime, Kleine); written small, the form is the
/// adjective, so the reading does not make it a noun for
/// [`known_without_noun`].
const NOMINALISED_TAG: &str = "nominalised";

/// Under `set verb-after-noun = capitalised`, in an input that starts with a
/// small letter and that the lexicon knows as a word with no noun reading
/// (see [`known_without_noun`]), a word read as a noun is not followed by a
/// word read only as a verb. A word written small is no noun and no nominalised infinitive
/// (German orthography), so its last part gives it the word class of a
/// verb, and verbs written as one word take particles, adverbs and
/// adjectives before them, not nouns (zugelassen is not Zug + lassen,
/// verbrennt not Verb + rennt); the few that do (teilnehmen, heimkehren)
/// have a first part the lexicon also reads as a particle. Capitalised, the
/// same letters are a nominalisation and a noun may come first
/// (Autofahren, Sprachlernen). Common practice of German orthography and
/// word formation.
pub fn noun_before_verb(left: &[Tags], right: &[Tags]) -> bool {
    read_as_noun(left) && only_verb(right)
}

/// Whether an analysis with parts of these readings is refused for an input
/// written small that the lexicon lists with no noun reading (see
/// [`known_without_noun`]), under `set verb-after-noun = capitalised` (see
/// [`noun_before_verb`]) and `set noun-head = capitalised`. The last part
/// (the head) gives the word its class, and the word is no noun, so a
/// noun reading of the head does not count: a head read only as a noun is
/// refused under `noun-head` (vereinbart is not Verein + Bart, dramatisch
/// not Drama + Tisch), and one read otherwise only as a verb counts as a
/// verb after a noun (entgehen is not Ente + Gehen). When the lexicon reads
/// the word only as a verb (`word`: its readings), a head with no verb
/// reading is refused under `noun-head` too (gehalten is not gehen + alten,
/// betrat not beten + Rat). A single part is the lexicon word itself and
/// is never refused. `small`: the input starts with a small letter; a
/// capitalised one (at the start of a sentence, or a nominalisation) gets
/// the `noun-head` checks only (dramatische and Dramatische are not Drama +
/// Tische), as a capitalised nominalised infinitive may have a noun before
/// its verb (Autofahren).
pub fn small_word_refuses(
    settings: &crate::rules::Settings,
    word: &[Tags],
    parts: &[&[Tags]],
    small: bool,
) -> bool {
    let Some((head, rest)) = parts.split_last() else {
        return false;
    };
    if rest.is_empty() {
        return false;
    }
    let verbs = small && settings.verb_after_noun_capitalised;
    rest.windows(2)
        .any(|w| verbs && noun_before_verb(w[0], w[1]))
        || head_refused(
            settings,
            verbs && rest.last().is_some_and(|left| read_as_noun(left)),
            only_verb(word),
            head,
        )
}

/// The head of a small non-noun word (see [`small_word_refuses`]), after a
/// noun when `after_noun`, of a word read only as a verb when `verb_word`:
/// refused when its readings but the noun ones are none or, in a verb, have
/// no verb (under `noun-head = capitalised`), or are only verbs after a
/// noun.
fn head_refused(
    settings: &crate::rules::Settings,
    after_noun: bool,
    verb_word: bool,
    head: &[Tags],
) -> bool {
    let is_noun = |r: &Tags| {
        r.get("pos")
            .is_some_and(|p| p.split('|').any(|v| v == "noun"))
    };
    let others: Vec<&Tags> = head.iter().filter(|r| !is_noun(r)).collect();
    if others.is_empty() {
        return settings.noun_head_capitalised && !head.is_empty();
    }
    if settings.noun_head_capitalised
        && verb_word
        && !others.iter().any(|r| {
            r.get("pos")
                .is_some_and(|p| p.split('|').any(|x| x == "verb"))
        })
    {
        return true;
    }
    after_noun
        && others.iter().all(|r| {
            r.get("pos")
                .is_some_and(|p| p.split('|').all(|x| x == "verb"))
        })
}

/// Whether a text starts with a capital letter followed by a small one
/// (Einkommensteuer; not EU-WEIT, whose capitals say nothing of its class).
pub fn starts_capitalised(text: &[char]) -> bool {
    let mut letters = text.iter().filter(|c| c.is_alphabetic());
    letters.next().is_some_and(|c| c.is_uppercase())
        && letters.next().is_none_or(|c| c.is_lowercase())
}

/// Under `set noun-head = capitalised`, the head of an input written with a
/// capital (see [`starts_capitalised`]) is a noun or a nominalisation, as
/// German writes only those with a capital inside a sentence: a last part
/// with neither a noun reading nor a verb reading in its own citation form
/// (no `lemma` tag: the infinitive, as nominalised) is refused.
/// Einkommensteuer is Einkommen + Steuer, not Einkommen + s + teuer, and
/// Nachteil is not Nacht + eil (the imperative of eilen). A capitalised
/// adjective at the start of a sentence is kept whole.
pub fn capitalised_head_refused(head: &[Tags]) -> bool {
    !head.is_empty()
        && !head.iter().any(|r| {
            r.get("pos").is_some_and(|p| {
                p.split('|').any(|v| {
                    v == "noun" || (v == "verb" && !r.contains_key(crate::proof::LEMMA_TAG))
                })
            })
        })
}

/// Some reading has `pos=noun` and none has `pos` adj, adv or other (a
/// form that is also a particle or an adjective is not refused).
fn read_as_noun(readings: &[Tags]) -> bool {
    let has = |r: &Tags, v: &str| r.get("pos").is_some_and(|p| p.split('|').any(|x| x == v));
    readings.iter().any(|r| has(r, "noun"))
        && !readings
            .iter()
            .any(|r| has(r, "adj") || has(r, "adv") || has(r, "other"))
}

/// Every reading has `pos=verb` and no other part of speech.
fn only_verb(readings: &[Tags]) -> bool {
    !readings.is_empty()
        && readings.iter().all(|r| {
            r.get("pos")
                .is_some_and(|p| p.split('|').all(|x| x == "verb"))
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn readings(list: &[&str]) -> Vec<Tags> {
        list.iter()
            .map(|pos| [("pos".to_string(), pos.to_string())].into_iter().collect())
            .collect()
    }

    #[test]
    fn a_noun_before_a_verb_is_told_by_every_reading() {
        let (noun, verb) = (readings(&["noun"]), readings(&["verb"]));
        assert!(noun_before_verb(&noun, &verb));
        // A noun that is also a verb form (Miss, miss) is still a noun here.
        assert!(noun_before_verb(&readings(&["noun", "verb"]), &verb));
        // Also a particle or an adjective: not refused.
        assert!(!noun_before_verb(&readings(&["noun", "other"]), &verb));
        assert!(!noun_before_verb(&readings(&["adj"]), &verb));
        // A second part that is also a noun: not refused.
        assert!(!noun_before_verb(&noun, &readings(&["verb", "noun"])));
        assert!(!noun_before_verb(&noun, &readings(&["noun|verb"])));
        assert!(!noun_before_verb(&noun, &[]));
    }

    /// `ab`+`cd`, and `abc`, after which no word starts: a dead end.
    #[test]
    fn words_into_dead_ends_are_left_out_unless_kept() {
        let rules = crate::rules::compile_named("plain", &Default::default()).unwrap();
        let mut b = crate::lexicon::LexiconBuilder::new(&rules.normalizer);
        b.add_tsv("t", b"ab\nabc\ncd\nx\n").unwrap();
        let lexicon = b.build().unwrap();
        let words = |lattice: &Lattice| -> Vec<String> {
            let mut w: Vec<String> = lattice
                .graph
                .edge_indices()
                .filter_map(|e| lattice.word(e).map(|w| w.key.clone()))
                .collect();
            w.sort();
            w
        };
        let pruned = build(&rules, &lexicon, "abcd", &LatticeOptions::default());
        assert_eq!(words(&pruned), ["ab", "cd"]);
        let keep = LatticeOptions {
            keep_dead_ends: true,
            ..LatticeOptions::default()
        };
        // Kept: also `cd` before an empty junction at the end of the input.
        let kept = build(&rules, &lexicon, "abcd", &keep);
        assert_eq!(words(&kept), ["ab", "abc", "cd", "cd"]);
        // Only the first step is looked ahead: after `abc`, `x` starts a
        // word (which itself leads nowhere), so `abc` is built.
        let kept = build(&rules, &lexicon, "abcxd", &LatticeOptions::default());
        assert!(words(&kept).contains(&"abc".to_string()));
    }
}
