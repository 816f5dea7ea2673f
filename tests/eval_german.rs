//! The German rule-set and bundled lexicon against the German gold set
//! (`tests/data/gold-german.tsv`), and the evaluation itself on a small gold
//! file written here.
//!
//! The minimum scores asserted are the measured ones rounded down a little
//! (see the README for the numbers and `juncture eval` to reproduce them):
//! a change to the rules, the lexicon or the ranking that makes German
//! splitting worse fails here.

use juncture::analyzer::Analyzer;
use juncture::eval::{evaluate, parse_gold, report_text, EvalOptions, Outcome};
use juncture::lexicon::{Lexicon, LexiconBuilder};
use juncture::rules::{compile_named, CompileOptions};
use std::process::Command;

const GOLD: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/gold-german.tsv");

/// Measured minimums (rounded down): best-analysis accuracy, most of the
/// non-compounds split, least reading recall (expected among the top 5).
/// Measured: 95.9% (466/486), 0.7% (1/135), 99.2% (482/486).
const MIN_ACCURACY: f64 = 0.95;
const MAX_NON_COMPOUNDS_SPLIT: f64 = 0.02;
const MIN_READING_RECALL: f64 = 0.99;

#[test]
fn german_gold_set_meets_the_minimum_scores() {
    let rules = compile_named("german", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let text = std::fs::read_to_string(GOLD).unwrap();
    let gold = parse_gold(GOLD, &text).unwrap();
    assert!(
        gold.len() >= 400,
        "the German gold set has {} entries",
        gold.len()
    );
    let started = std::time::Instant::now();
    let report = evaluate(&analyzer, &gold, &EvalOptions::default());
    let took = started.elapsed();
    let text = report_text(&report);
    assert!(
        report.accuracy >= MIN_ACCURACY,
        "accuracy {:.3} below {MIN_ACCURACY}\n{text}",
        report.accuracy
    );
    assert!(
        report.non_compounds_split <= MAX_NON_COMPOUNDS_SPLIT,
        "{:.3} of the non-compounds split, more than {MAX_NON_COMPOUNDS_SPLIT}\n{text}",
        report.non_compounds_split
    );
    assert!(
        report.reading_recall >= MIN_READING_RECALL,
        "reading recall {:.3} below {MIN_READING_RECALL}\n{text}",
        report.reading_recall
    );
    // A few seconds even in a debug build; well under one in release.
    assert!(took.as_secs() < 30, "evaluating the gold set took {took:?}");
}

const SMALL_LEXICON: &str = "\
Arbeit\t80000\tpos=noun
Amt\t30000\tpos=noun
Schule\t90000\tpos=noun
Kind\t100000\tpos=noun
Zeitung\t50000\tpos=noun
Zeit\t300000\tpos=noun
";

const SMALL_GOLD: &str = "\
# a comment
Arbeitsamt\tArbeit+Amt\tlink-s
Schulkind\tschule+kind\telide-e
Zeitung\tZeitung\tderivation
Arbeitszeit\tArbeit+Zeit | Arbeitszeit\tlink-s
Kindamt\tKind\tnonsense
";

#[test]
fn scores_and_categories_on_a_small_gold_file() {
    let rules = compile_named("german", &CompileOptions::default()).unwrap();
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv("small.tsv", SMALL_LEXICON.as_bytes()).unwrap();
    let lexicon = b.build().unwrap();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let gold = parse_gold("small", SMALL_GOLD).unwrap();
    assert_eq!(gold.len(), 5);
    assert_eq!(gold[3].alternatives.len(), 2);
    let r = evaluate(&analyzer, &gold, &EvalOptions::default());
    let count = |o| r.outcomes.get(&o).copied().unwrap_or(0);
    assert_eq!(r.entries, 5);
    assert_eq!(r.compounds, 3);
    assert_eq!(r.non_compounds, 2);
    // Arbeitsamt, Schulkind (compared case-insensitively), Arbeitszeit.
    assert_eq!(count(Outcome::CorrectSplit), 3, "{}", report_text(&r));
    assert_eq!(count(Outcome::CorrectNonSplit), 1);
    // Kindamt must not be split, but is.
    assert_eq!(count(Outcome::WrongSplit), 1);
    assert_eq!(r.correct, 4);
    assert!((r.non_compounds_split - 0.5).abs() < 1e-9);
    assert_eq!(r.misses.len(), 1);
    assert_eq!(r.misses[0].surface, "Kindamt");
    assert_eq!(r.misses[0].got, "Kind+Amt");
    assert_eq!(r.rules["link-s"].used, 2);
    assert_eq!(r.rules["link-s"].correct, 2);
    assert_eq!(r.categories["link-s"].total, 2);
    // Split points: Arbeits|amt, Schul|kind, Arbeits|zeit right; Kind|amt wrong.
    assert_eq!(r.split_points.true_positives, 3);
    assert_eq!(r.split_points.predicted, 4);
    assert_eq!(r.split_points.expected, 3);
    assert!((r.split_points.recall - 1.0).abs() < 1e-9);
}

#[test]
fn malformed_gold_lines_are_all_reported_with_line_numbers() {
    let errors = parse_gold("bad.tsv", "ok\tok\nno-tab\n\nx\ta++b\n").unwrap_err();
    let lines: Vec<usize> = errors.iter().map(|e| e.line).collect();
    assert_eq!(lines, [2, 4]);
    assert!(errors[0].to_string().starts_with("bad.tsv:2:"));
}

#[test]
fn cli_eval_prints_json_and_exits_zero() {
    let dir = std::env::temp_dir().join(format!("juncture-eval-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let lex = dir.join("lex.tsv");
    let gold = dir.join("gold.tsv");
    std::fs::write(&lex, SMALL_LEXICON).unwrap();
    std::fs::write(&gold, SMALL_GOLD).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(["eval", "--no-default-lexicon", "--lexicon"])
        .arg(&lex)
        .arg(&gold)
        .args(["--format", "json"])
        .output()
        .unwrap();
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["correct"], 4);
    assert_eq!(v["outcomes"]["wrong-split"], 1);
    assert_eq!(v["misses"][0]["surface"], "Kindamt");
    let _ = std::fs::remove_dir_all(&dir);
}
