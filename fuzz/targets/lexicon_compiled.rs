//! The compiled-lexicon loader on arbitrary bytes (seeded with real compiled
//! lexicons, so most inputs are corruptions of a valid file): loading must
//! fail with an error or give a lexicon whose every entry can be read and
//! walked.
//!
//! Shared by the fuzz target (`fuzz/fuzz_targets/lexicon_compiled.rs`) and the
//! regression tests (`tests/fuzz_regressions.rs`), which replay crashes through it.

use juncture::lexicon::compiled::{self, IndexBytes};

/// One fuzz input.
pub fn run(data: &[u8]) {
    let _ = compiled::describe(data);
    let lexicon = match compiled::load("fuzz.lex", IndexBytes::owned(data.to_vec()), None) {
        Ok(l) => l,
        Err(e) => {
            let _ = e.to_string();
            return;
        }
    };
    let _ = lexicon.total_frequency();
    let _ = lexicon.tag_keys();
    for (id, entry) in lexicon.entries().enumerate().take(10_000) {
        let _ = (&entry.form, entry.frequency, &entry.readings);
        if let Some(c) = lexicon.step_str(lexicon.root(), &entry.key) {
            let _ = lexicon.entry_at(c);
        }
        let _ = lexicon.get(&entry.key);
        let _ = lexicon.entry(id);
    }
    // Walk a few bytes from the root along whatever exists.
    let mut cursor = lexicon.root();
    for &b in data.iter().take(64) {
        match lexicon.step(cursor, b) {
            Some(c) => cursor = c,
            None => break,
        }
        if let Some(id) = lexicon.entry_at(cursor) {
            if id < lexicon.len() {
                let _ = lexicon.entry(id);
            }
        }
    }
}
