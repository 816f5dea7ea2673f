//! `split` on arbitrary bytes with every bundled rule-set. The first byte
//! picks the rule-set and the lexicon (its bundled one, or a small one made
//! of its examples' parts); the rest is the input line, read the way the CLI
//! reads stdin (invalid UTF-8 rendered lossily). Every analysis must verify
//! (regenerate the input when its rules are applied forward).
//!
//! Shared by the fuzz target (`fuzz/fuzz_targets/split_bytes.rs`) and the
//! regression tests (`tests/fuzz_regressions.rs`), which replay crashes through it.

use juncture::analyzer::Analyzer;
use juncture::lexicon::{Lexicon, LexiconBuilder, Tags};
use juncture::proof;
use juncture::rules::{bundled, compile_named, CompileOptions, RuleSet};
use std::sync::OnceLock;

/// The selector byte's rule-set numbers: 0 plain, 1 demo, 2 german, …
const KNOWN: &[&str] = &[
    "plain",
    "demo",
    "german",
    "dutch",
    "swedish",
    "danish",
    "norwegian",
    "sanskrit",
];

struct Set {
    rules: RuleSet,
    bundled: Lexicon,
    small: Lexicon,
}

fn sets() -> &'static [Set] {
    static SETS: OnceLock<Vec<Set>> = OnceLock::new();
    SETS.get_or_init(|| {
        // A fixed order (then any rule-set added later), so that a saved
        // input keeps selecting the same rule-set.
        let all = bundled::rule_set_names();
        let mut names: Vec<&str> = KNOWN.iter().copied().filter(|n| all.contains(n)).collect();
        names.extend(all.iter().copied().filter(|n| !KNOWN.contains(n)));
        names
            .into_iter()
            .filter_map(|name| {
                let rules = compile_named(name, &CompileOptions::default()).ok()?;
                let (bundled, _) = Lexicon::for_rules(&rules, &[], true, false).ok()?;
                let mut b = LexiconBuilder::new(&rules.normalizer);
                for ex in &rules.examples {
                    for part in &ex.parts {
                        b.add(part, Some(10.0), Tags::new());
                    }
                }
                let small = b.build().ok()?;
                Some(Set {
                    rules,
                    bundled,
                    small,
                })
            })
            .collect()
    })
}

/// One fuzz input.
pub fn run(data: &[u8]) {
    let Some((&selector, bytes)) = data.split_first() else {
        return;
    };
    let sets = sets();
    let set = &sets[usize::from(selector & 0x7f) % sets.len()];
    let lexicon = if selector & 0x80 != 0 {
        &set.small
    } else {
        &set.bundled
    };
    let input = String::from_utf8_lossy(bytes);
    let mut analyzer = Analyzer::new(&set.rules, lexicon);
    // Bounded but deterministic (no time limit): a slow input shows up as a
    // libFuzzer timeout instead of a truncated result.
    analyzer.lattice.max_edges = 200_000;
    analyzer.search.max_pops = 200_000;
    let record = analyzer.split(&input, 5);
    assert_eq!(record.input, input);
    for a in &record.analyses {
        if let Err(e) = proof::verify(&set.rules, a, &input) {
            panic!("analysis of {input:?} does not verify: {e}");
        }
    }
    let _ = serde_json::to_string(&record).unwrap();
    let _ = juncture::output::split_text(&record);
    let _ = juncture::output::split_tsv(&record);
    let _ = analyzer.split_greedy(&input);
    if selector & 0x40 != 0 {
        let _ = analyzer.split_token(&input, 3, 80);
    }
}
