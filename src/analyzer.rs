//! The pipeline put together: normalize → lattice → count → rank → proof →
//! verify, for one input at a time. This is what the CLI's `split` calls.

use crate::lattice::{self, Edge, LatticeOptions, Truncation};
use crate::lexicon::Lexicon;
use crate::proof::{self, Analysis};
use crate::rules::RuleSet;
use crate::search::{self, ScoredPath, SearchOptions};
use num_bigint::BigUint;
use num_traits::ToPrimitive;
use petgraph::visit::EdgeRef;
use serde::{Serialize, Serializer};
use std::time::{Duration, Instant};

/// An exact count, serialized as a JSON number when it fits in 64 bits and
/// as a string of digits otherwise.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Count(pub BigUint);

impl Serialize for Count {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        match self.0.to_u64() {
            Some(n) => s.serialize_u64(n),
            None => s.serialize_str(&self.0.to_string()),
        }
    }
}

impl std::fmt::Display for Count {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}", self.0)
    }
}

/// The result for one input line.
#[derive(Debug, Clone, Serialize)]
pub struct SplitRecord {
    /// The input line as given.
    pub input: String,
    /// Exact number of analyses.
    pub count: Count,
    /// Whether fewer analyses are listed than exist, or the search was cut.
    pub truncated: bool,
    /// Why, when truncated.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reason: Option<Truncation>,
    /// The listed analyses, best first.
    pub analyses: Vec<Analysis>,
    /// Set when the line could not be analysed at all.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub error: Option<String>,
}

impl SplitRecord {
    /// A record for a line that could not be read.
    pub fn failed(input: impl Into<String>, error: impl Into<String>) -> SplitRecord {
        SplitRecord {
            input: input.into(),
            count: Count(BigUint::default()),
            truncated: false,
            reason: None,
            analyses: Vec::new(),
            error: Some(error.into()),
        }
    }

    /// Whether the line counts as not analysed (for the exit status).
    pub fn is_failure(&self) -> bool {
        self.error.is_some() || self.analyses.is_empty()
    }
}

/// Rules, lexicon and options: everything needed to analyse inputs.
#[derive(Debug, Clone)]
pub struct Analyzer<'a> {
    /// The rule-set.
    pub rules: &'a RuleSet,
    /// The lexicon.
    pub lexicon: &'a Lexicon,
    /// Lattice limits.
    pub lattice: LatticeOptions,
    /// Ranking options.
    pub search: SearchOptions,
    /// Time limit per input.
    pub timeout: Option<Duration>,
}

impl<'a> Analyzer<'a> {
    /// An analyzer with the rule-set's own settings.
    pub fn new(rules: &'a RuleSet, lexicon: &'a Lexicon) -> Self {
        Analyzer {
            rules,
            lexicon,
            lattice: LatticeOptions::default(),
            search: SearchOptions::from_rules(rules),
            timeout: None,
        }
    }

    /// Builds the lattice of one input with this analyzer's limits.
    pub fn lattice(&self, input: &str) -> lattice::Lattice {
        let mut options = self.lattice.clone();
        if let Some(t) = self.timeout {
            options.deadline = Some(Instant::now() + t);
        }
        lattice::build(self.rules, self.lexicon, input, &options)
    }

    /// Analyses one input: exact count and the `top` best analyses, each verified.
    pub fn split(&self, input: &str, top: usize) -> SplitRecord {
        let lattice = self.lattice(input);
        let count = search::count(&lattice, self.search.max_parts);
        let (paths, cut) = search::best(&lattice, self.rules, self.lexicon, &self.search, top);
        self.record(input, &lattice, count, paths, cut)
    }

    /// The greedy longest-match segmentation (a baseline): at each position
    /// take the longest lexicon entry, with any junction after it.
    pub fn split_greedy(&self, input: &str) -> SplitRecord {
        let lattice = self.lattice(input);
        let count = search::count(&lattice, self.search.max_parts);
        let mut edges = Vec::new();
        let mut node = lattice.start;
        let mut ok = false;
        for _ in 0..lattice.graph.node_count() {
            if node == lattice.end {
                ok = true;
                break;
            }
            let best = lattice
                .graph
                .edges(node)
                .filter_map(|e| match e.weight() {
                    Edge::Word(w) => Some((w.end, w.key.chars().count(), e.id(), e.target())),
                    Edge::Junction { .. } => None,
                })
                .max_by_key(|&(end, len, id, _)| (end, len, std::cmp::Reverse(id.index())));
            let Some((_, _, id, target)) = best else {
                break;
            };
            edges.push(id);
            node = target;
            if node != lattice.end {
                match lattice.graph.edges(node).next() {
                    Some(j) => {
                        edges.push(j.id());
                        node = j.target();
                    }
                    None => break,
                }
            }
        }
        let paths = if ok {
            let parts = edges.iter().filter(|e| lattice.word(**e).is_some()).count();
            vec![ScoredPath {
                edges,
                score: 0.0,
                parts,
            }]
        } else {
            Vec::new()
        };
        self.record(input, &lattice, count, paths, None)
    }

    fn record(
        &self,
        input: &str,
        lattice: &lattice::Lattice,
        count: BigUint,
        paths: Vec<ScoredPath>,
        cut: Option<Truncation>,
    ) -> SplitRecord {
        let mut analyses = Vec::with_capacity(paths.len());
        for (i, p) in paths.iter().enumerate() {
            let a = proof::analysis(lattice, self.rules, self.lexicon, p, i + 1);
            match proof::verify(self.rules, &a, input) {
                Ok(()) => analyses.push(a),
                Err(e) => debug_assert!(false, "analysis of {input:?} failed verification: {e}"),
            }
        }
        let reason = lattice
            .truncated
            .or(cut)
            .or_else(|| (BigUint::from(analyses.len()) < count).then_some(Truncation::Limit));
        let error = (lattice.truncated == Some(Truncation::InputLength))
            .then(|| Truncation::InputLength.describe().to_string());
        SplitRecord {
            input: input.to_string(),
            count: Count(count),
            truncated: reason.is_some(),
            reason,
            analyses,
            error,
        }
    }
}
