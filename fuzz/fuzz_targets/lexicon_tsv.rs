//! Fuzz target: see `fuzz/targets/lexicon_tsv.rs`.

#![no_main]

#[path = "../targets/lexicon_tsv.rs"]
mod target;

libfuzzer_sys::fuzz_target!(|data: &[u8]| target::run(data));
