//! Evaluation stage: a gold file of words with their expected parts, run
//! through an [`Analyzer`], scored the way the compound-splitting literature
//! scores splitters.
//!
//! # Gold file
//!
//! UTF-8 TSV, one word per line: `surface<TAB>parts[<TAB>category]`. `#`
//! starts a comment line. `parts` are lexicon forms joined by `+`; several
//! acceptable analyses are separated by ` | `. A single part means "must not
//! be split". The optional third column is a free category name used to break
//! the accuracy down (e.g. `link-s`, `derivation`).
//!
//! # What is measured
//!
//! Parts are compared as lexicon forms, in Unicode NFC, case-insensitively
//! (and through the rule-set's normalization, so a selected variant such as
//! `ß` = `ss` applies to both sides). A part also matches the gold by its
//! lemma, where the lexicon gives one (`lemma=` tag: the inflected form
//! `Hühner` in `Hühnerei` matches the gold part `Huhn`).
//!
//! - **Accuracy**: the best analysis' parts equal one of the alternatives.
//! - **Word categories** (Koehn & Knight 2003, *Empirical methods for
//!   compound splitting*): a gold entry is a *compound* when one of its
//!   alternatives has two or more parts, else a *non-compound*.
//!   `correct split` (a compound split as expected), `correct non-split` (a
//!   non-compound left whole), `wrong non-split` (a compound left whole),
//!   `wrong faulty split` (a compound split, but not as expected) and `wrong
//!   split` (a non-compound split). The share of non-compounds split is
//!   `wrong split / non-compounds`.
//! - **Split points**: character offsets in the surface where a part other
//!   than the first starts. The predicted ones come from the best analysis.
//!   The expected ones are taken from the analysis the analyzer itself finds
//!   for the expected parts (among its top [`EvalOptions::search_depth`]), so
//!   linking elements and elided letters are placed the way the rules place
//!   them; when the expected parts are not found there, each expected part
//!   after the first is aligned to the earliest place in the rest of the
//!   surface where its first letters (at most three) occur. Micro-averaged
//!   precision, recall and F1 over all words. For an entry with several
//!   alternatives the one matched by the best analysis is used, else the one
//!   sharing most split points with it.
//! - **Reading recall**: the expected analysis is among the top
//!   [`EvalOptions::top`] (5 by default).
//! - **Per rule**: how often each junction rule occurs in best analyses, and in
//!   correct ones.
//! - **Per category** (third column): entries and correct ones.
//! - **Misses**: every entry whose best analysis is wrong.

use crate::analyzer::Analyzer;
use crate::proof::Analysis;
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};
use std::fmt::Write;
use unicode_normalization::UnicodeNormalization;

/// One line of a gold file.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct GoldEntry {
    /// The word as written.
    pub surface: String,
    /// Acceptable analyses, each a list of lexicon forms.
    pub alternatives: Vec<Vec<String>>,
    /// Third column, if any.
    pub category: Option<String>,
    /// 1-based line number in the gold file.
    pub line: usize,
}

impl GoldEntry {
    /// Whether some acceptable analysis has two or more parts.
    pub fn is_compound(&self) -> bool {
        self.alternatives.iter().any(|a| a.len() > 1)
    }

    /// The alternatives as written: parts joined by `+`, alternatives by ` | `.
    pub fn expected_text(&self) -> String {
        self.alternatives
            .iter()
            .map(|a| a.join("+"))
            .collect::<Vec<_>>()
            .join(" | ")
    }
}

/// A malformed gold line.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{file}:{line}: {message}")]
pub struct GoldError {
    /// File name.
    pub file: String,
    /// 1-based line number.
    pub line: usize,
    /// What is wrong.
    pub message: String,
}

/// Parses a gold file. Every malformed line is reported (not only the first).
pub fn parse_gold(file: &str, text: &str) -> Result<Vec<GoldEntry>, Vec<GoldError>> {
    let mut entries = Vec::new();
    let mut errors = Vec::new();
    for (i, raw) in text.lines().enumerate() {
        let line_no = i + 1;
        let line = raw.strip_prefix('\u{FEFF}').unwrap_or(raw);
        let line = line.trim_end_matches('\r');
        if line.trim().is_empty() || line.trim_start().starts_with('#') {
            continue;
        }
        let error = |message: String| GoldError {
            file: file.to_string(),
            line: line_no,
            message,
        };
        let cols: Vec<&str> = line.split('\t').collect();
        if cols.len() < 2 {
            errors.push(error(
                "expected `surface<TAB>parts[<TAB>category]`, found no tab".into(),
            ));
            continue;
        }
        if cols.len() > 3 {
            errors.push(error(format!(
                "expected at most 3 columns, found {}",
                cols.len()
            )));
            continue;
        }
        let surface = cols[0].trim();
        if surface.is_empty() {
            errors.push(error("the surface (first column) is empty".into()));
            continue;
        }
        let mut alternatives = Vec::new();
        let mut bad = None;
        for alt in cols[1].split(" | ") {
            let parts: Vec<String> = alt.split('+').map(|p| p.trim().to_string()).collect();
            if parts.iter().any(String::is_empty) {
                bad = Some(format!("alternative `{}` has an empty part", alt.trim()));
                break;
            }
            alternatives.push(parts);
        }
        if let Some(message) = bad {
            errors.push(error(message));
            continue;
        }
        let category = cols
            .get(2)
            .map(|c| c.trim())
            .filter(|c| !c.is_empty())
            .map(str::to_string);
        entries.push(GoldEntry {
            surface: surface.nfc().collect(),
            alternatives,
            category,
            line: line_no,
        });
    }
    if errors.is_empty() {
        Ok(entries)
    } else {
        Err(errors)
    }
}

/// Options of an evaluation run.
#[derive(Debug, Clone)]
pub struct EvalOptions {
    /// How many analyses count for reading recall (expected among the top N).
    pub top: usize,
    /// How many analyses are searched for the expected parts, to place the
    /// expected split points.
    pub search_depth: usize,
}

impl Default for EvalOptions {
    fn default() -> Self {
        EvalOptions {
            top: 5,
            search_depth: 50,
        }
    }
}

/// The outcome for one word, in the literature's categories.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Outcome {
    /// A compound split as expected.
    CorrectSplit,
    /// A non-compound (or a word that may stay whole) left whole.
    CorrectNonSplit,
    /// A compound left whole.
    WrongNonSplit,
    /// A compound split, but not as expected.
    WrongFaultySplit,
    /// A non-compound split.
    WrongSplit,
    /// No analysis at all.
    NoAnalysis,
}

impl Outcome {
    /// Whether the best analysis was right.
    pub fn is_correct(self) -> bool {
        matches!(self, Outcome::CorrectSplit | Outcome::CorrectNonSplit)
    }

    /// The category in words.
    pub fn describe(self) -> &'static str {
        match self {
            Outcome::CorrectSplit => "correct split",
            Outcome::CorrectNonSplit => "correct non-split",
            Outcome::WrongNonSplit => "wrong non-split",
            Outcome::WrongFaultySplit => "wrong faulty split",
            Outcome::WrongSplit => "wrong split",
            Outcome::NoAnalysis => "no analysis",
        }
    }
}

/// The result for one gold entry.
#[derive(Debug, Clone, Serialize)]
pub struct EntryResult {
    /// The word.
    pub surface: String,
    /// Expected analyses as written (`A+B | C+D`).
    pub expected: String,
    /// Parts of the best analysis joined by `+` (empty when none).
    pub got: String,
    /// Junction rules of the best analysis.
    pub rules: Vec<String>,
    /// Category (third column).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub category: Option<String>,
    /// The literature category.
    pub outcome: Outcome,
    /// Rank of the first analysis matching an expected one, within the top N.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub expected_rank: Option<usize>,
    /// Line in the gold file.
    pub line: usize,
}

/// Counts for one junction rule.
#[derive(Debug, Clone, Default, Serialize)]
pub struct RuleCount {
    /// Junctions of best analyses that used the rule.
    pub used: usize,
    /// … of which in correct best analyses.
    pub correct: usize,
}

/// Entries and correct ones.
#[derive(Debug, Clone, Default, Serialize)]
pub struct Tally {
    /// Entries.
    pub total: usize,
    /// Correct best analyses.
    pub correct: usize,
    /// `correct / total`.
    pub accuracy: f64,
}

/// Split-point precision and recall.
#[derive(Debug, Clone, Default, Serialize)]
pub struct SplitPoints {
    /// Predicted split points that are expected.
    pub true_positives: usize,
    /// All predicted split points.
    pub predicted: usize,
    /// All expected split points.
    pub expected: usize,
    /// `true_positives / predicted` (1 when nothing is predicted).
    pub precision: f64,
    /// `true_positives / expected` (1 when nothing is expected).
    pub recall: f64,
    /// Harmonic mean of precision and recall.
    pub f1: f64,
}

/// The whole evaluation.
#[derive(Debug, Clone, Serialize)]
pub struct Report {
    /// Gold entries evaluated.
    pub entries: usize,
    /// Entries with an expected split.
    pub compounds: usize,
    /// Entries that must stay whole.
    pub non_compounds: usize,
    /// Best analysis equals an expected one.
    pub correct: usize,
    /// `correct / entries`.
    pub accuracy: f64,
    /// Counts per literature category (kebab-case names).
    pub outcomes: BTreeMap<Outcome, usize>,
    /// `wrong split / non-compounds`.
    pub non_compounds_split: f64,
    /// Split-point scores.
    pub split_points: SplitPoints,
    /// How many analyses count for reading recall.
    pub top: usize,
    /// Entries whose expected analysis is among the top N.
    pub in_top: usize,
    /// `in_top / entries`.
    pub reading_recall: f64,
    /// Per junction rule.
    pub rules: BTreeMap<String, RuleCount>,
    /// Per category (third column; entries without one under `-`).
    pub categories: BTreeMap<String, Tally>,
    /// Every entry.
    #[serde(skip)]
    pub results: Vec<EntryResult>,
    /// The entries whose best analysis is wrong.
    pub misses: Vec<EntryResult>,
}

fn ratio(a: usize, b: usize) -> f64 {
    if b == 0 {
        1.0
    } else {
        a as f64 / b as f64
    }
}

/// Lexicon forms compared NFC and case-insensitively, through the rule-set's normalizer.
fn comparable(analyzer: &Analyzer, form: &str) -> String {
    let s: String = form.nfc().collect();
    analyzer.rules.normalizer.normalize(&s).to_lowercase()
}

/// Per part, the names the gold may give it: its lexicon form and its lemmas.
fn parts_of(analyzer: &Analyzer, a: &Analysis) -> Vec<Vec<String>> {
    a.parts
        .iter()
        .map(|p| {
            let mut names = vec![comparable(analyzer, &p.form)];
            for l in p.lemmas() {
                let l = comparable(analyzer, l);
                if !names.contains(&l) {
                    names.push(l);
                }
            }
            names
        })
        .collect()
}

/// Whether an analysis' parts (with their acceptable names) spell an expected analysis.
fn spells(parts: &[Vec<String>], expected: &[String]) -> bool {
    parts.len() == expected.len()
        && parts
            .iter()
            .zip(expected)
            .all(|(names, e)| names.contains(e))
}

/// Split points of an analysis: input offsets where parts after the first start.
fn split_points_of(a: &Analysis) -> BTreeSet<usize> {
    a.parts.iter().skip(1).map(|p| p.start).collect()
}

/// Expected split points by alignment, when the analyzer does not find the
/// expected parts: each part after the first starts at the earliest place
/// after the previous part's start where its first letters (at most three)
/// occur.
fn aligned_points(analyzer: &Analyzer, surface: &str, parts: &[String]) -> BTreeSet<usize> {
    let chars: Vec<char> = comparable(analyzer, surface).chars().collect();
    let mut out = BTreeSet::new();
    let mut prev = 0usize;
    for part in parts.iter().skip(1) {
        let head: Vec<char> = part.chars().take(3).collect();
        let found = (prev + 1..chars.len()).find(|&p| chars[p..].starts_with(&head));
        match found {
            Some(p) => {
                out.insert(p);
                prev = p;
            }
            None => break,
        }
    }
    out
}

/// Runs every gold entry through the analyzer and scores the results.
pub fn evaluate(analyzer: &Analyzer, gold: &[GoldEntry], options: &EvalOptions) -> Report {
    let depth = options.search_depth.max(options.top).max(1);
    let mut outcomes: BTreeMap<Outcome, usize> = BTreeMap::new();
    let mut rules: BTreeMap<String, RuleCount> = BTreeMap::new();
    for r in &analyzer.rules.rules {
        rules.insert(r.name.clone(), RuleCount::default());
    }
    let mut categories: BTreeMap<String, Tally> = BTreeMap::new();
    let mut sp = SplitPoints::default();
    let mut results = Vec::with_capacity(gold.len());
    let (mut correct, mut in_top, mut compounds) = (0usize, 0usize, 0usize);
    for entry in gold {
        let record = analyzer.split(&entry.surface, depth);
        let expected: Vec<Vec<String>> = entry
            .alternatives
            .iter()
            .map(|alt| alt.iter().map(|p| comparable(analyzer, p)).collect())
            .collect();
        let compound = entry.is_compound();
        compounds += usize::from(compound);
        let analyses: Vec<(Vec<Vec<String>>, &Analysis)> = record
            .analyses
            .iter()
            .map(|a| (parts_of(analyzer, a), a))
            .collect();
        let matches = |parts: &Vec<Vec<String>>| expected.iter().position(|e| spells(parts, e));
        let best = analyses.first();
        let best_alt = best.and_then(|(p, _)| matches(p));
        let expected_rank = analyses
            .iter()
            .take(options.top)
            .position(|(p, _)| matches(p).is_some())
            .map(|i| i + 1);
        let outcome = match best {
            None => Outcome::NoAnalysis,
            Some((parts, _)) => match (best_alt.is_some(), parts.len() > 1, compound) {
                (true, true, _) => Outcome::CorrectSplit,
                (true, false, _) => Outcome::CorrectNonSplit,
                (false, false, _) => Outcome::WrongNonSplit,
                (false, true, true) => Outcome::WrongFaultySplit,
                (false, true, false) => Outcome::WrongSplit,
            },
        };
        *outcomes.entry(outcome).or_default() += 1;
        let ok = outcome.is_correct();
        correct += usize::from(ok);
        in_top += usize::from(expected_rank.is_some());

        // Split points.
        let predicted = best.map(|(_, a)| split_points_of(a)).unwrap_or_default();
        let expected_points = |i: usize| -> BTreeSet<usize> {
            match analyses.iter().find(|(p, _)| spells(p, &expected[i])) {
                Some((_, a)) => split_points_of(a),
                None => aligned_points(analyzer, &entry.surface, &expected[i]),
            }
        };
        let gold_points = match best_alt {
            Some(i) => expected_points(i),
            None => (0..expected.len())
                .map(expected_points)
                .max_by_key(|g| {
                    (
                        g.intersection(&predicted).count(),
                        std::cmp::Reverse(g.len()),
                    )
                })
                .unwrap_or_default(),
        };
        sp.true_positives += gold_points.intersection(&predicted).count();
        sp.predicted += predicted.len();
        sp.expected += gold_points.len();

        let used: Vec<String> = best
            .map(|(_, a)| a.junctions.iter().map(|j| j.rule.clone()).collect())
            .unwrap_or_default();
        for r in &used {
            let c = rules.entry(r.clone()).or_default();
            c.used += 1;
            c.correct += usize::from(ok);
        }
        let cat = entry.category.clone().unwrap_or_else(|| "-".to_string());
        let t = categories.entry(cat).or_default();
        t.total += 1;
        t.correct += usize::from(ok);
        results.push(EntryResult {
            surface: entry.surface.clone(),
            expected: entry.expected_text(),
            got: best
                .map(|(_, a)| {
                    a.parts
                        .iter()
                        .map(|p| match p.lemma() {
                            l if l == p.form => p.form.clone(),
                            l => format!("{}[{l}]", p.form),
                        })
                        .collect::<Vec<_>>()
                        .join("+")
                })
                .unwrap_or_default(),
            rules: used,
            category: entry.category.clone(),
            outcome,
            expected_rank,
            line: entry.line,
        });
    }
    for t in categories.values_mut() {
        t.accuracy = ratio(t.correct, t.total);
    }
    sp.precision = ratio(sp.true_positives, sp.predicted);
    sp.recall = ratio(sp.true_positives, sp.expected);
    sp.f1 = if sp.precision + sp.recall > 0.0 {
        2.0 * sp.precision * sp.recall / (sp.precision + sp.recall)
    } else {
        0.0
    };
    let entries = gold.len();
    let non_compounds = entries - compounds;
    let wrong_split = outcomes.get(&Outcome::WrongSplit).copied().unwrap_or(0);
    let misses = results
        .iter()
        .filter(|r| !r.outcome.is_correct())
        .cloned()
        .collect();
    Report {
        entries,
        compounds,
        non_compounds,
        correct,
        accuracy: ratio(correct, entries),
        outcomes,
        non_compounds_split: if non_compounds == 0 {
            0.0
        } else {
            wrong_split as f64 / non_compounds as f64
        },
        split_points: sp,
        top: options.top,
        in_top,
        reading_recall: ratio(in_top, entries),
        rules,
        categories,
        results,
        misses,
    }
}

fn pct(x: f64) -> String {
    format!("{:.1}%", 100.0 * x)
}

/// The report as readable text.
pub fn report_text(r: &Report) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "entries {}  (compounds {}, non-compounds {})",
        r.entries, r.compounds, r.non_compounds
    );
    let _ = writeln!(
        out,
        "accuracy (best analysis)       {}  ({}/{})",
        pct(r.accuracy),
        r.correct,
        r.entries
    );
    let _ = writeln!(
        out,
        "non-compounds split            {}  ({}/{})",
        pct(r.non_compounds_split),
        r.outcomes.get(&Outcome::WrongSplit).copied().unwrap_or(0),
        r.non_compounds
    );
    let _ = writeln!(
        out,
        "expected among the top {}       {}  ({}/{})",
        r.top,
        pct(r.reading_recall),
        r.in_top,
        r.entries
    );
    let s = &r.split_points;
    let _ = writeln!(
        out,
        "split points                   precision {}  recall {}  F1 {}  ({} right of {} predicted, {} expected)",
        pct(s.precision),
        pct(s.recall),
        pct(s.f1),
        s.true_positives,
        s.predicted,
        s.expected
    );
    let _ = writeln!(out, "\noutcomes (Koehn & Knight 2003)");
    for o in [
        Outcome::CorrectSplit,
        Outcome::CorrectNonSplit,
        Outcome::WrongNonSplit,
        Outcome::WrongFaultySplit,
        Outcome::WrongSplit,
        Outcome::NoAnalysis,
    ] {
        let n = r.outcomes.get(&o).copied().unwrap_or(0);
        if n > 0 || o != Outcome::NoAnalysis {
            let _ = writeln!(out, "  {:<20} {n:>5}", o.describe());
        }
    }
    let _ = writeln!(
        out,
        "\nrules (junctions in best analyses: used / in correct ones)"
    );
    for (name, c) in &r.rules {
        let _ = writeln!(out, "  {name:<20} {:>5} {:>5}", c.used, c.correct);
    }
    let _ = writeln!(out, "\ncategories (correct / entries)");
    for (name, t) in &r.categories {
        let _ = writeln!(
            out,
            "  {name:<20} {:>5} / {:<5} {}",
            t.correct,
            t.total,
            pct(t.accuracy)
        );
    }
    let _ = writeln!(out, "\nmisses ({})", r.misses.len());
    for m in &r.misses {
        let _ = writeln!(
            out,
            "  {}\texpected {}\tgot {}{}\t[{}{}]",
            m.surface,
            m.expected,
            if m.got.is_empty() { "-" } else { &m.got },
            if m.rules.is_empty() {
                String::new()
            } else {
                format!(" ({})", m.rules.join(", "))
            },
            m.outcome.describe(),
            match m.expected_rank {
                Some(k) => format!("; expected at rank {k}"),
                None => String::new(),
            }
        );
    }
    out
}
