//! Inputs that crashed a fuzz target, replayed through the target's own code
//! (`fuzz/targets/*.rs`, shared with the libFuzzer binaries), plus a replay
//! of every committed seed. Each case names what was wrong and what fixed it.
//! See DEVELOPERS.md, section Fuzzing.

#[path = "../fuzz/targets/lexicon_compiled.rs"]
mod lexicon_compiled;
#[path = "../fuzz/targets/lexicon_tsv.rs"]
mod lexicon_tsv;
#[path = "../fuzz/targets/rules_compile.rs"]
mod rules_compile;
#[path = "../fuzz/targets/split_bytes.rs"]
mod split_bytes;

use std::path::Path;

/// A frequency of 1e308 became infinite in the compiled format (stored as
/// f32), so the compiled lexicon no longer matched the TSV one. Fixed by
/// capping frequencies at `lexicon::MAX_FREQUENCY` (f32::MAX) when building.
#[test]
fn lexicon_tsv_huge_frequency() {
    lexicon_tsv::run(b"\x01n\t1e308\t\nm\t1\n");
    // Duplicates whose sum overflows f64 as well.
    lexicon_tsv::run(b"\x00n\t1.7e308\nn\t1.7e308\n");
}

/// A mutated compiled lexicon (one transition address changed) made the FST
/// walk subtract with overflow (a panic; without overflow checks, a wrong
/// address and a panic or an endless walk). Fixed by verifying the FST's
/// checksum when a compiled lexicon is loaded from a file: the file is
/// reported as corrupt.
#[test]
fn lexicon_compiled_corrupt_fst() {
    let data = std::fs::read(
        Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("fuzz/regressions/lexicon_compiled/corrupt-fst-transition"),
    )
    .unwrap();
    lexicon_compiled::run(&data);
    let err = juncture::lexicon::compiled::load(
        "x.jlex",
        juncture::lexicon::compiled::IndexBytes::owned(data),
        None,
    )
    .err()
    .expect("a corrupt file must not load");
    assert!(err.to_string().contains("corrupt"), "{err}");
}

/// Every saved crash input, `fuzz/regressions/<target>/*`, replayed.
#[test]
fn every_saved_crash() {
    replay_dir("regressions", "lexicon_tsv", lexicon_tsv::run);
    replay_dir("regressions", "lexicon_compiled", lexicon_compiled::run);
    replay_dir("regressions", "rules_compile", rules_compile::run);
    replay_dir("regressions", "split_bytes", split_bytes::run);
}

/// Runs every file of `fuzz/corpus/<target>/` through `run`.
fn replay_corpus(target: &str, run: fn(&[u8])) {
    assert!(
        replay_dir("corpus", target, run) > 0,
        "no corpus for {target}"
    );
}

/// Runs every file of `fuzz/<kind>/<target>/` through `run`; how many.
fn replay_dir(kind: &str, target: &str, run: fn(&[u8])) -> usize {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz")
        .join(kind)
        .join(target);
    if !dir.is_dir() {
        return 0;
    }
    let mut n = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        let data = std::fs::read(&path).unwrap();
        run(&data);
        n += 1;
    }
    n
}

#[test]
fn corpus_rules_compile() {
    replay_corpus("rules_compile", rules_compile::run);
}

#[test]
fn corpus_lexicon_tsv() {
    replay_corpus("lexicon_tsv", lexicon_tsv::run);
}

#[test]
fn corpus_lexicon_compiled() {
    replay_corpus("lexicon_compiled", lexicon_compiled::run);
}

#[test]
fn corpus_split_bytes() {
    replay_corpus("split_bytes", split_bytes::run);
}
