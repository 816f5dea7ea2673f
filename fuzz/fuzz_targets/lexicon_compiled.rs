//! Fuzz target: see `fuzz/targets/lexicon_compiled.rs`.

#![no_main]

#[path = "../targets/lexicon_compiled.rs"]
mod target;

libfuzzer_sys::fuzz_target!(|data: &[u8]| target::run(data));
