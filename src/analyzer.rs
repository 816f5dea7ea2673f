//! The pipeline put together: normalize → lattice → count → rank → proof →
//! verify, for one input at a time. This is what the CLI's `split` calls.

use crate::lattice::{self, ConditionMemo, Edge, LatticeOptions, Truncation};
use crate::lexicon::Lexicon;
use crate::proof::{self, Analysis};
use crate::rules::RuleSet;
use crate::search::{self, ScoredPath, SearchOptions};
use num_bigint::BigUint;
use num_traits::ToPrimitive;
use petgraph::visit::EdgeRef;
use serde::{Serialize, Serializer};
use std::sync::Arc;
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
    /// Condition results shared by the lattices of all inputs.
    memo: Arc<ConditionMemo>,
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
            memo: Arc::new(ConditionMemo::new(rules, lexicon)),
        }
    }

    /// Builds the lattice of one input with this analyzer's limits.
    pub fn lattice(&self, input: &str) -> lattice::Lattice {
        let mut options = self.lattice.clone();
        if let Some(t) = self.timeout {
            options.deadline = Some(Instant::now() + t);
        }
        lattice::build_with(self.rules, self.lexicon, input, &options, &self.memo)
    }

    /// The lattice of one input with the words that lead to a dead end kept
    /// (see [`LatticeOptions::keep_dead_ends`]), for showing why an
    /// analysis is missing.
    pub fn lattice_with_dead_ends(&self, input: &str) -> lattice::Lattice {
        let mut options = self.lattice.clone();
        options.keep_dead_ends = true;
        if let Some(t) = self.timeout {
            options.deadline = Some(Instant::now() + t);
        }
        lattice::build_with(self.rules, self.lexicon, input, &options, &self.memo)
    }

    /// Analyses one input: exact count and the `top` best analyses, each verified.
    pub fn split(&self, input: &str, top: usize) -> SplitRecord {
        let mut analyses = Vec::new();
        let summary = self.split_streaming(input, top, |step| {
            if let Streamed::Analysis(a) = step {
                analyses.push(a);
            }
            Ok::<(), std::convert::Infallible>(())
        });
        let summary = match summary {
            Ok(s) => s,
            Err(never) => match never {},
        };
        SplitRecord {
            input: input.to_string(),
            count: summary.count,
            truncated: summary.truncated,
            reason: summary.reason,
            analyses,
            error: summary.error,
        }
    }

    /// Analyses one input like [`split`](Self::split), handing each step to
    /// `on` as soon as it is known instead of collecting a record: first
    /// [`Streamed::Head`] (the exact count, computed before any analysis is
    /// searched for), then each of the `limit` best analyses as the search
    /// finds it ([`Streamed::Analysis`], rendered and verified exactly as in
    /// the record), best first. The analyses are not kept, so `limit` may be
    /// far larger than what fits in memory. Returns what the record would say
    /// besides the analyses; an error from `on` stops the search and is
    /// returned.
    pub fn split_streaming<E>(
        &self,
        input: &str,
        limit: usize,
        mut on: impl FnMut(Streamed) -> Result<(), E>,
    ) -> Result<SplitSummary, E> {
        let started = Instant::now();
        let lattice = self.lattice(input);
        let search::PartCount { count, more_parts } =
            search::count_within(&lattice, self.search.max_parts);
        let error = (lattice.truncated == Some(Truncation::InputLength))
            .then(|| Truncation::InputLength.describe().to_string());
        // The time limit covers the ranked search too: when building the
        // lattice used it up, nothing is listed (the count is still exact
        // for the lattice built).
        let timed_out = self.timeout.is_some_and(|t| started.elapsed() > t);
        let parts_cut = !timed_out && more_parts;
        let expected = lattice
            .truncated
            .or(timed_out.then_some(Truncation::Time))
            .or_else(|| (BigUint::from(limit) < count).then_some(Truncation::Limit))
            .or(parts_cut.then_some(Truncation::Parts));
        on(Streamed::Head(SplitHead {
            count: Count(count.clone()),
            reason: expected,
            error: error.clone(),
        }))?;
        let mut listed = 0usize;
        let cut = if timed_out {
            Some(Truncation::Time)
        } else {
            let normalized = lattice.text.normalized();
            let mut ranked = search::paths(&lattice, self.rules, self.lexicon, &self.search);
            for (i, path) in ranked.by_ref().take(limit).enumerate() {
                if let Some(a) = self.verified(input, &lattice, &normalized, &path, i + 1) {
                    listed += 1;
                    on(Streamed::Analysis(a))?;
                }
            }
            ranked.truncation()
        };
        let mut reason = Self::reason(&lattice, cut, listed, &count);
        if parts_cut && reason.is_none() {
            // Only analyses within the part limit are counted and listed.
            reason = Some(Truncation::Parts);
        }
        Ok(SplitSummary {
            count: Count(count),
            listed,
            truncated: reason.is_some(),
            reason,
            error,
        })
    }

    /// The greedy longest-match segmentation (a baseline): at each position
    /// take the longest lexicon entry, with any junction after it.
    pub fn split_greedy(&self, input: &str) -> SplitRecord {
        let lattice = self.lattice(input);
        let count = search::count(&lattice, self.search.max_parts);
        // Nodes from which the end can still be reached: the longest match is
        // taken among the words (and junctions) the rest of the input can follow.
        let mut alive = vec![false; lattice.graph.node_count()];
        alive[lattice.end.index()] = true;
        for &u in lattice.order.iter().rev() {
            if lattice.graph.edges(u).any(|e| alive[e.target().index()]) {
                alive[u.index()] = true;
            }
        }
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
                .filter(|e| alive[e.target().index()])
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
                match lattice
                    .graph
                    .edges(node)
                    .find(|e| alive[e.target().index()])
                {
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
        let mut record = self.record(input, &lattice, count, paths, None);
        // One segmentation is the whole answer of the baseline, not a cut list.
        if record.reason == Some(Truncation::Limit) {
            record.reason = None;
            record.truncated = false;
        }
        record
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
        let normalized = lattice.text.normalized();
        for (i, p) in paths.iter().enumerate() {
            analyses.extend(self.verified(input, lattice, &normalized, p, i + 1));
        }
        let reason = Self::reason(lattice, cut, analyses.len(), &count);
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

    /// The analysis of a path with rank `rank`, if it verifies (forward, on
    /// the normalized input); debug builds assert that it does.
    fn verified(
        &self,
        input: &str,
        lattice: &lattice::Lattice,
        normalized: &str,
        path: &ScoredPath,
        rank: usize,
    ) -> Option<Analysis> {
        let a = proof::analysis(lattice, self.rules, self.lexicon, path, rank);
        match proof::verify_normalized(self.rules, &a, normalized) {
            Ok(()) => Some(a),
            Err(e) => {
                debug_assert!(false, "analysis of {input:?} failed verification: {e}");
                None
            }
        }
    }

    /// Why a listing of `listed` analyses out of `count` is incomplete: a
    /// limit of the lattice, then one of the search (`cut`), then the number
    /// listed.
    fn reason(
        lattice: &lattice::Lattice,
        cut: Option<Truncation>,
        listed: usize,
        count: &BigUint,
    ) -> Option<Truncation> {
        lattice
            .truncated
            .or(cut)
            .or_else(|| (BigUint::from(listed) < *count).then_some(Truncation::Limit))
    }
}

/// One step of [`Analyzer::split_streaming`].
#[derive(Debug, Clone)]
pub enum Streamed {
    /// What is known before the search: comes first, once.
    Head(SplitHead),
    /// The next analysis, best first.
    Analysis(Analysis),
}

/// The start of a streamed split: what is known before any analysis.
#[derive(Debug, Clone)]
pub struct SplitHead {
    /// Exact number of analyses.
    pub count: Count,
    /// The reason the listing will be incomplete as far as it is known
    /// before the search: a limit of the lattice (or the time it took), the
    /// number asked for being below the count, or the part limit. The
    /// [`SplitSummary`] has the final word (the ranked search may still reach
    /// its work limit).
    pub reason: Option<Truncation>,
    /// Set when the line could not be analysed at all.
    pub error: Option<String>,
}

/// The end of a streamed split: the record's fields besides its analyses.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SplitSummary {
    /// Exact number of analyses.
    pub count: Count,
    /// How many analyses were listed.
    pub listed: usize,
    /// Whether fewer analyses are listed than exist, or the search was cut.
    pub truncated: bool,
    /// Why, when truncated.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reason: Option<Truncation>,
    /// Set when the line could not be analysed at all.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub error: Option<String>,
}

impl SplitSummary {
    /// The summary of a complete record.
    pub fn of(record: &SplitRecord) -> SplitSummary {
        SplitSummary {
            count: record.count.clone(),
            listed: record.analyses.len(),
            truncated: record.truncated,
            reason: record.reason,
            error: record.error.clone(),
        }
    }

    /// Whether the line counts as not analysed (for the exit status), as
    /// [`SplitRecord::is_failure`].
    pub fn is_failure(&self) -> bool {
        self.error.is_some() || self.listed == 0
    }
}

/// Why a token is passed through unsplit (for indexing: `split --format terms`
/// and `--passthrough`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Passthrough {
    /// Digits, optionally with a sign, decimal or group separators, or a
    /// trailing `%` (`2024`, `-3,5`, `1.000.000`, `12:30`, `50%`).
    Number,
    /// Starts with a URL scheme (`https://`, `ftp://`, `mailto:`) or `www.`.
    Url,
    /// `local@domain.tld`.
    Email,
    /// Letters of more than one script (e.g. Latin and Cyrillic).
    MixedScript,
    /// Longer than the token-length limit.
    TooLong,
}

impl Passthrough {
    /// The reason in words.
    pub fn describe(self) -> &'static str {
        match self {
            Passthrough::Number => "a number",
            Passthrough::Url => "a URL",
            Passthrough::Email => "an e-mail address",
            Passthrough::MixedScript => "letters of more than one script",
            Passthrough::TooLong => "longer than the token-length limit",
        }
    }
}

/// The reason a token is not analysed but passed through as it is, if any.
/// `max_chars` is the token-length limit in characters.
pub fn passthrough(token: &str, max_chars: usize) -> Option<Passthrough> {
    let t = token.trim();
    if t.chars().count() > max_chars {
        return Some(Passthrough::TooLong);
    }
    if is_url(t) {
        return Some(Passthrough::Url);
    }
    if is_email(t) {
        return Some(Passthrough::Email);
    }
    if is_number(t) {
        return Some(Passthrough::Number);
    }
    if is_mixed_script(t) {
        return Some(Passthrough::MixedScript);
    }
    None
}

fn is_number(t: &str) -> bool {
    let body = t.strip_prefix(['-', '+', '−']).unwrap_or(t);
    let body = body.strip_suffix('%').unwrap_or(body);
    let mut digits = 0usize;
    let mut prev_sep = true;
    for c in body.chars() {
        if c.is_numeric() {
            digits += 1;
            prev_sep = false;
        } else if matches!(c, '.' | ',' | ':' | '\'' | '\u{202F}' | '\u{00A0}') && !prev_sep {
            prev_sep = true;
        } else {
            return false;
        }
    }
    digits > 0 && !prev_sep
}

fn is_url(t: &str) -> bool {
    let lower = t.to_lowercase();
    if lower.starts_with("www.") && lower.len() > 4 {
        return true;
    }
    if lower.starts_with("mailto:") {
        return true;
    }
    match lower.find("://") {
        Some(i) if i > 0 => {
            lower[..i]
                .chars()
                .all(|c| c.is_ascii_alphanumeric() || matches!(c, '+' | '-' | '.'))
                && lower[..i].starts_with(|c: char| c.is_ascii_alphabetic())
                && lower.len() > i + 3
        }
        _ => false,
    }
}

fn is_email(t: &str) -> bool {
    let Some((local, domain)) = t.split_once('@') else {
        return false;
    };
    let local_ok = !local.is_empty()
        && local
            .chars()
            .all(|c| c.is_alphanumeric() || "._%+-!#$&'*/=?^`{|}~".contains(c));
    let labels: Vec<&str> = domain.split('.').collect();
    let domain_ok = labels.len() >= 2
        && labels.iter().all(|l| {
            !l.is_empty()
                && !l.starts_with('-')
                && !l.ends_with('-')
                && l.chars().all(|c| c.is_alphanumeric() || c == '-')
        })
        && labels
            .last()
            .is_some_and(|tld| tld.chars().count() >= 2 && tld.chars().all(char::is_alphabetic));
    local_ok && domain_ok
}

/// The script of a letter, by Unicode block ranges (enough to tell the
/// scripts of European and Indic text apart); `None` for characters that
/// belong to no script in particular (digits, punctuation, combining marks).
fn script_of(c: char) -> Option<&'static str> {
    if !c.is_alphabetic() {
        return None;
    }
    let u = c as u32;
    Some(match u {
        0x0300..=0x036F | 0x1AB0..=0x1AFF | 0x1DC0..=0x1DFF | 0x20D0..=0x20FF => return None,
        0x0041..=0x024F | 0x0250..=0x02AF | 0x1D00..=0x1DBF | 0x1E00..=0x1EFF => "latin",
        0x2C60..=0x2C7F | 0xA720..=0xA7FF | 0xAB30..=0xAB6F | 0xFF21..=0xFF5A => "latin",
        0x02B0..=0x02FF => return None,
        0x0370..=0x03FF | 0x1F00..=0x1FFF => "greek",
        0x0400..=0x052F | 0x1C80..=0x1C8F | 0x2DE0..=0x2DFF | 0xA640..=0xA69F => "cyrillic",
        0x0530..=0x058F => "armenian",
        0x0590..=0x05FF => "hebrew",
        0x0600..=0x06FF | 0x0750..=0x077F | 0x08A0..=0x08FF => "arabic",
        0x0900..=0x097F | 0xA8E0..=0xA8FF => "devanagari",
        0x0980..=0x09FF => "bengali",
        0x0A00..=0x0DFF => "indic",
        0x0E00..=0x0E7F => "thai",
        0x10A0..=0x10FF => "georgian",
        0x1100..=0x11FF | 0xAC00..=0xD7AF | 0x3130..=0x318F => "hangul",
        0x3040..=0x309F => "hiragana",
        0x30A0..=0x30FF => "katakana",
        0x3400..=0x4DBF | 0x4E00..=0x9FFF | 0xF900..=0xFAFF | 0x20000..=0x2FFFF => "han",
        _ => "other",
    })
}

fn is_mixed_script(t: &str) -> bool {
    let mut first: Option<&str> = None;
    for c in t.chars() {
        if let Some(s) = script_of(c) {
            match first {
                None => first = Some(s),
                Some(f) if f != s => {
                    // Japanese mixes kana and kanji in one word.
                    let japanese = |x: &str| matches!(x, "han" | "hiragana" | "katakana");
                    if !(japanese(f) && japanese(s)) {
                        return true;
                    }
                }
                Some(_) => {}
            }
        }
    }
    false
}

/// A split record together with the reason the token was passed through, if
/// it was (then it has no analyses and is not a failure).
#[derive(Debug, Clone, Serialize)]
pub struct TokenRecord {
    /// The record (empty for a passed-through token).
    #[serde(flatten)]
    pub record: SplitRecord,
    /// Why the token was not analysed.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub passthrough: Option<Passthrough>,
}

impl TokenRecord {
    /// Whether the token counts as not analysed (for the exit status); a
    /// passed-through token does not.
    pub fn is_failure(&self) -> bool {
        self.passthrough.is_none() && self.record.is_failure()
    }
}

impl Analyzer<'_> {
    /// Like [`split`](Self::split), but a token that is a number, URL,
    /// e-mail address, of mixed scripts or longer than `max_token_chars` is
    /// passed through without analysis.
    pub fn split_token(&self, token: &str, top: usize, max_token_chars: usize) -> TokenRecord {
        match passthrough(token, max_token_chars) {
            Some(reason) => TokenRecord {
                record: SplitRecord {
                    input: token.to_string(),
                    count: Count(BigUint::default()),
                    truncated: false,
                    reason: None,
                    analyses: Vec::new(),
                    error: None,
                },
                passthrough: Some(reason),
            },
            None => TokenRecord {
                record: self.split(token, top),
                passthrough: None,
            },
        }
    }
}

/// The tokens of a line of running text, for indexing: pieces between
/// whitespace, with punctuation around them removed (quotes, brackets,
/// `.,;:!?…`); hyphens, `%`, `@` and `/` are kept. Empty pieces are dropped.
pub fn index_tokens(line: &str) -> Vec<&str> {
    const TRIM: &[char] = &[
        '"', '\'', '(', ')', '[', ']', '{', '}', '<', '>', '«', '»', '„', '“', '”', '‚', '‘', '’',
        '‹', '›', ',', ';', ':', '!', '?', '.', '…', '¡', '¿', '*',
    ];
    line.split_whitespace()
        .map(|t| t.trim_matches(TRIM))
        .filter(|t| !t.is_empty())
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::rules::{compile_named, CompileOptions};

    /// The streamed steps are the record: the head first with the count,
    /// then the analyses as `split` lists them, then the summary.
    #[test]
    fn streamed_steps_are_the_record() {
        let rules = compile_named("demo", &CompileOptions::default()).unwrap();
        let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, true).unwrap();
        let analyzer = Analyzer::new(&rules, &lexicon);
        for input in ["tormek", "solanavitor", "ed ano", "xyz", ""] {
            for limit in [0, 1, 2, 100] {
                let record = analyzer.split(input, limit);
                let mut steps = Vec::new();
                let summary = analyzer
                    .split_streaming(input, limit, |s| {
                        steps.push(s);
                        Ok::<(), ()>(())
                    })
                    .unwrap();
                let Some(Streamed::Head(head)) = steps.first() else {
                    panic!("the head comes first");
                };
                assert_eq!(head.count, record.count);
                let analyses: Vec<&Analysis> = steps[1..]
                    .iter()
                    .map(|s| match s {
                        Streamed::Analysis(a) => a,
                        Streamed::Head(_) => panic!("one head"),
                    })
                    .collect();
                assert_eq!(analyses, record.analyses.iter().collect::<Vec<_>>());
                assert_eq!(summary, SplitSummary::of(&record));
            }
        }
    }

    /// An error from the caller (e.g. a closed output) stops the search.
    #[test]
    fn an_error_from_the_caller_stops_the_listing() {
        let rules = compile_named("demo", &CompileOptions::default()).unwrap();
        let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, true).unwrap();
        let analyzer = Analyzer::new(&rules, &lexicon);
        let mut seen = 0;
        let result = analyzer.split_streaming(&"tormek".repeat(40), usize::MAX, |s| {
            if matches!(s, Streamed::Analysis(_)) {
                seen += 1;
            }
            if seen == 3 {
                Err("closed")
            } else {
                Ok(())
            }
        });
        assert_eq!(result, Err("closed"));
        assert_eq!(seen, 3);
    }
}
