//! Helpers shared by the integration tests: the demo rule-set and lexicon,
//! and running the `juncture` binary.
#![allow(dead_code)]

use juncture::analyzer::Analyzer;
use juncture::lexicon::Lexicon;
use juncture::rules::{compile_named, CompileOptions, RuleSet};
use std::io::Write;
use std::process::{Command, Output, Stdio};

/// The bundled demo rule-set (Velmish, an invented language).
pub fn demo_rules() -> RuleSet {
    compile_named("demo", &CompileOptions::default())
        .unwrap_or_else(|d| panic!("the demo rule-set must compile:\n{d}"))
}

/// The lexicon the demo rule-set names (`set lexicon = demo`).
pub fn demo_lexicon(rules: &RuleSet) -> Lexicon {
    let (lexicon, issues) =
        Lexicon::for_rules(rules, &[], true, true).expect("the demo lexicon must load");
    assert!(issues.is_empty(), "demo lexicon issues: {issues:?}");
    lexicon
}

/// Every analysis listed (the default limits of the rule-set).
pub fn analyzer<'a>(rules: &'a RuleSet, lexicon: &'a Lexicon) -> Analyzer<'a> {
    Analyzer::new(rules, lexicon)
}

/// The `juncture` binary built for this test run.
pub fn juncture() -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_juncture"));
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c
}

/// Runs `juncture ARGS` with `stdin` as standard input.
pub fn run(args: &[&str], stdin: &[u8]) -> Output {
    let mut child = juncture()
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the juncture binary runs");
    {
        let mut input = child.stdin.take().expect("stdin is piped");
        // The child may exit before reading everything (e.g. on a usage error).
        let _ = input.write_all(stdin);
    }
    child.wait_with_output().expect("juncture finishes")
}

/// Runs `juncture ARGS` with an empty standard input.
pub fn run_args(args: &[&str]) -> Output {
    run(args, b"")
}

/// Standard output as text.
pub fn stdout(o: &Output) -> String {
    String::from_utf8(o.stdout.clone()).expect("stdout is UTF-8")
}

/// Standard error as text.
pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// Exit code (panics when killed by a signal).
pub fn code(o: &Output) -> i32 {
    o.status.code().expect("juncture exits with a code")
}

/// The example words of the demo language (every rule of `rule-sets/demo.jr`),
/// plus a compound of three parts, an unsplit word that also splits, and a
/// prefix that may not stand alone.
pub const DEMO_WORDS: &[&str] = &[
    "solanavi",
    "kalom",
    "ketabura",
    "taleso",
    "tammora",
    "dalon",
    "vetor",
    "tor-12",
    "tor mek",
    "ed ano",
    "edano",
    "solanavitor",
    "tormek",
    "ve",
];
