//! The lexicon loader on arbitrary bytes: TSV lines → builder → FST index,
//! then every entry walked back through the index, written in the compiled
//! format and loaded again, and a word split with it.
//!
//! Shared by the fuzz target (`fuzz/fuzz_targets/lexicon_tsv.rs`) and the
//! regression tests (`tests/fuzz_regressions.rs`), which replay crashes through it.

use juncture::analyzer::Analyzer;
use juncture::lexicon::compiled::{self, IndexBytes};
use juncture::lexicon::LexiconBuilder;
use juncture::rules::{compile_named, CompileOptions, RuleSet};
use std::sync::OnceLock;

fn rule_sets() -> &'static [RuleSet] {
    static SETS: OnceLock<Vec<RuleSet>> = OnceLock::new();
    SETS.get_or_init(|| {
        ["demo", "plain", "sanskrit", "german"]
            .iter()
            .filter_map(|n| compile_named(n, &CompileOptions::default()).ok())
            .collect()
    })
}

/// One fuzz input.
pub fn run(data: &[u8]) {
    let Some((&selector, tsv)) = data.split_first() else {
        return;
    };
    let sets = rule_sets();
    let rules = &sets[usize::from(selector) % sets.len()];
    let strict = selector & 0x80 != 0;
    let mut builder = LexiconBuilder::new(&rules.normalizer).strict(strict);
    if builder.add_tsv("fuzz.tsv", tsv).is_err() {
        assert!(strict, "only strict mode fails on a bad line");
        return;
    }
    for issue in builder.issues() {
        let _ = issue.to_string();
    }
    let lexicon = match builder.build() {
        Ok(l) => l,
        Err(e) => {
            let _ = e.to_string();
            return;
        }
    };
    let mut n = 0;
    for (id, entry) in lexicon.entries().enumerate() {
        n += 1;
        assert!(entry.frequency.is_finite() && entry.frequency >= 0.0);
        assert_eq!(lexicon.get(&entry.key), Some(id), "{:?}", entry.key);
        let cursor = lexicon.step_str(lexicon.root(), &entry.key);
        assert_eq!(cursor.and_then(|c| lexicon.entry_at(c)), Some(id));
    }
    assert_eq!(n, lexicon.len());

    // The compiled format gives the same lexicon back.
    let bytes = lexicon.to_compiled(&["fuzz.tsv".to_string()]);
    let again = compiled::load(
        "fuzz.lex",
        IndexBytes::owned(bytes),
        Some(lexicon.fingerprint()),
    )
    .expect("a freshly compiled lexicon loads");
    assert_eq!(again.len(), lexicon.len());
    for (a, b) in lexicon.entries().zip(again.entries()) {
        assert_eq!(a.key, b.key);
        assert_eq!(a.readings, b.readings);
        assert!((a.frequency - b.frequency).abs() <= a.frequency.abs() * 1e-6 + 1e-6);
    }

    // And it can be used: split the text of the first line.
    let first: String = String::from_utf8_lossy(tsv)
        .lines()
        .next()
        .unwrap_or("")
        .chars()
        .take(40)
        .collect();
    let mut analyzer = Analyzer::new(rules, &lexicon);
    analyzer.lattice.max_edges = 50_000;
    analyzer.search.max_pops = 50_000;
    let _ = analyzer.split(&first, 3);
}
