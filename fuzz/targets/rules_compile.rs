//! The rule-language parser and compiler on arbitrary text (seeded with the
//! bundled rule files, so most inputs are mutations of real rule-sets). A
//! rule-set that compiles is then used: a lexicon made of its examples'
//! parts, every example split and joined, each analysis verified.
//!
//! Shared by the fuzz target (`fuzz/fuzz_targets/rules_compile.rs`) and the
//! regression tests (`tests/fuzz_regressions.rs`), which replay crashes through it.

use juncture::analyzer::Analyzer;
use juncture::lattice::ScopeFilter;
use juncture::lexicon::{LexiconBuilder, Tags};
use juncture::proof;
use juncture::rules::{compile, CompileOptions, RuleSet};

/// One fuzz input.
pub fn run(data: &[u8]) {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    // Select every declared variant on odd lengths, none on even ones.
    let variants = if data.len() % 2 == 1 {
        text.lines()
            .filter_map(|l| l.trim_start().strip_prefix("variant "))
            .filter_map(|l| l.split(|c: char| !c.is_alphanumeric()).next())
            .map(str::to_string)
            .collect()
    } else {
        Vec::new()
    };
    match compile("fuzz.jr", text, None, &CompileOptions { variants }) {
        Err(diagnostics) => {
            let _ = diagnostics.to_string();
            let _ = diagnostics.error_count();
        }
        Ok(set) => {
            for w in &set.warnings {
                let _ = w.to_string();
            }
            use_rule_set(&set);
        }
    }
}

fn use_rule_set(set: &RuleSet) {
    let mut builder = LexiconBuilder::new(&set.normalizer);
    for ex in set.examples.iter().take(16) {
        for part in &ex.parts {
            builder.add(part, Some(10.0), Tags::new());
        }
    }
    let Ok(lexicon) = builder.build() else {
        return;
    };
    let mut analyzer = Analyzer::new(set, &lexicon);
    analyzer.lattice.max_edges = 50_000;
    analyzer.lattice.max_input_chars = 256;
    analyzer.search.max_pops = 50_000;
    for ex in set.examples.iter().take(8) {
        let record = analyzer.split(&ex.surface, 5);
        for a in &record.analyses {
            if let Err(e) = proof::verify(set, a, &ex.surface) {
                panic!("analysis of {:?} does not verify: {e}", ex.surface);
            }
        }
        let _ = serde_json::to_string(&record).unwrap();
        let _ = juncture::output::split_text(&record);
        let parts: Vec<&str> = ex.parts.iter().map(String::as_str).collect();
        let joined = proof::join(set, &lexicon, &parts, ScopeFilter::Any, 5);
        let _ = juncture::output::join_text(&joined);
    }
}
