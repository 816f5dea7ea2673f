//! Fuzz target: see `fuzz/targets/rules_compile.rs`.

#![no_main]

#[path = "../targets/rules_compile.rs"]
mod target;

libfuzzer_sys::fuzz_target!(|data: &[u8]| target::run(data));
