//! The compiled rule-set, the lexicon and the analyzer are `Send + Sync` and
//! give the same results used from many threads at once as from one. And no
//! `unsafe` in the crate without a `SAFETY:` comment saying why it is sound.

use juncture::analyzer::{Analyzer, SplitRecord};
use juncture::lexicon::Lexicon;
use juncture::rules::{bundled, compile_named, CompileOptions, Diagnostics, RuleSet};
use std::path::Path;

/// Compile-time: fails to build if any of these stops being Send + Sync.
const _: () = {
    const fn send_sync<T: Send + Sync>() {}
    send_sync::<RuleSet>();
    send_sync::<Lexicon>();
    send_sync::<Analyzer<'static>>();
    send_sync::<SplitRecord>();
    send_sync::<Diagnostics>();
};

const THREADS: usize = 8;

fn load(name: &str) -> (RuleSet, Lexicon) {
    let rules = compile_named(name, &CompileOptions::default()).unwrap_or_else(|d| panic!("{d}"));
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    (rules, lexicon)
}

/// Words to split: the rule-set's example surfaces, pairs of them run
/// together, and a few odd strings.
fn words(rules: &RuleSet) -> Vec<String> {
    let mut w: Vec<String> = rules.examples.iter().map(|e| e.surface.clone()).collect();
    w.sort();
    w.dedup();
    w.truncate(60);
    let pairs: Vec<String> = w
        .iter()
        .zip(w.iter().rev())
        .map(|(a, b)| format!("{a}{b}"))
        .collect();
    w.extend(pairs);
    w.extend(
        ["", " ", "x", "\u{0}", "ab\u{301}c", "שלום", "tor-12 mek"]
            .iter()
            .map(|s| s.to_string()),
    );
    w
}

fn render(analyzer: &Analyzer, word: &str) -> String {
    serde_json::to_string(&analyzer.split(word, 10)).unwrap()
}

fn same_results_from_many_threads(name: &str) {
    let (rules, lexicon) = load(name);
    let analyzer = Analyzer::new(&rules, &lexicon);
    let words = words(&rules);
    let expected: Vec<String> = words.iter().map(|w| render(&analyzer, w)).collect();
    let results: Vec<Vec<(usize, String)>> = std::thread::scope(|s| {
        let handles: Vec<_> = (0..THREADS)
            .map(|t| {
                let analyzer = &analyzer;
                let words = &words;
                s.spawn(move || {
                    // Each thread walks the words in its own order, several
                    // rounds, so that the threads overlap on different words.
                    let n = words.len();
                    let mut out = Vec::new();
                    for round in 0..3 {
                        for k in 0..n {
                            let i = (k * (2 * t + 1) + round * 7 + t) % n;
                            out.push((i, render(analyzer, &words[i])));
                        }
                    }
                    out
                })
            })
            .collect();
        handles.into_iter().map(|h| h.join().unwrap()).collect()
    });
    for (t, out) in results.iter().enumerate() {
        assert_eq!(out.len(), 3 * words.len());
        for (i, got) in out {
            assert_eq!(
                got, &expected[*i],
                "{name}: thread {t} split {:?} differently",
                words[*i]
            );
        }
    }
}

#[test]
fn demo_from_eight_threads() {
    same_results_from_many_threads("demo");
}

#[test]
fn every_bundled_rule_set_from_eight_threads() {
    for name in bundled::rule_set_names() {
        same_results_from_many_threads(name);
    }
}

#[test]
fn each_thread_may_own_its_analyzer_and_share_rules_and_lexicon() {
    let (rules, lexicon) = load("demo");
    let one = Analyzer::new(&rules, &lexicon);
    let expected = render(&one, "solanavitor");
    std::thread::scope(|s| {
        for t in 0..THREADS {
            let (rules, lexicon, expected) = (&rules, &lexicon, &expected);
            s.spawn(move || {
                let mut a = Analyzer::new(rules, lexicon);
                a.search.max_parts = t % 2 * 5; // different options per thread
                if t % 2 == 0 {
                    assert_eq!(&render(&a, "solanavitor"), expected);
                }
            });
        }
    });
}

#[test]
fn rule_sets_compile_concurrently() {
    let expected: Vec<usize> = bundled::rule_set_names()
        .iter()
        .map(|n| load(n).0.instances.len())
        .collect();
    std::thread::scope(|s| {
        for _ in 0..3 {
            let expected = &expected;
            s.spawn(move || {
                for (n, want) in bundled::rule_set_names().iter().zip(expected) {
                    assert_eq!(load(n).0.instances.len(), *want, "{n}");
                }
            });
        }
    });
}

/// Every `unsafe` in src/ must have a `SAFETY:` comment on one of the three
/// lines above it. (There is none today.)
#[test]
fn no_unsafe_without_a_safety_comment() {
    let mut offenders = Vec::new();
    visit(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("src").as_path(),
        &mut |path, text| {
            let lines: Vec<&str> = text.lines().collect();
            for (i, line) in lines.iter().enumerate() {
                let code = line.split("//").next().unwrap_or("");
                let is_unsafe = code
                    .split(|c: char| !(c.is_alphanumeric() || c == '_'))
                    .any(|w| w == "unsafe");
                if is_unsafe {
                    let before = &lines[i.saturating_sub(3)..i];
                    if !before.iter().any(|l| l.contains("SAFETY:")) {
                        offenders.push(format!("{}:{}: {}", path.display(), i + 1, line.trim()));
                    }
                }
            }
        },
    );
    assert!(
        offenders.is_empty(),
        "unsafe without a SAFETY: comment:\n{}",
        offenders.join("\n")
    );
}

fn visit(dir: &Path, f: &mut dyn FnMut(&Path, &str)) {
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.is_dir() {
            visit(&path, f);
        } else if path.extension().is_some_and(|e| e == "rs") {
            f(&path, &std::fs::read_to_string(&path).unwrap());
        }
    }
}
