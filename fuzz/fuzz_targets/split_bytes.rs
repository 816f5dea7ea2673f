//! Fuzz target: see `fuzz/targets/split_bytes.rs`.

#![no_main]

#[path = "../targets/split_bytes.rs"]
mod target;

libfuzzer_sys::fuzz_target!(|data: &[u8]| target::run(data));
