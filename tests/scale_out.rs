//! Scale-out recipe: `juncture split` is stateless line-in/line-out, so GNU
//! parallel (or any engine that pipes shards through a program) can run it
//! over shards. The recipe in the README must give byte-for-byte the same
//! output as one process.
//!
//! GNU parallel comes from Debian's `parallel` package (installed by
//! `.ci/run`). When CI is set the test requires it; elsewhere it says it
//! did not run.

use std::io::Write;
use std::process::{Command, Stdio};

fn juncture() -> &'static str {
    env!("CARGO_BIN_EXE_juncture")
}

fn input() -> String {
    let words = [
        "tormek", "solanavi", "kalom", "ketabura", "taleso", "tammora", "dalon", "vetor", "zzz",
        "", "tor-12",
    ];
    (0..600)
        .map(|i| words[i % words.len()])
        .collect::<Vec<_>>()
        .join("\n")
        + "\n"
}

fn run_single(text: &str) -> Vec<u8> {
    let mut child = Command::new(juncture())
        .args(["split", "--rules", "demo", "--format", "jsonl"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .expect("juncture runs");
    child
        .stdin
        .take()
        .unwrap()
        .write_all(text.as_bytes())
        .unwrap();
    child.wait_with_output().unwrap().stdout
}

#[test]
fn gnu_parallel_recipe_matches_one_process() {
    if Command::new("parallel")
        .arg("--version")
        .stdout(Stdio::null())
        .status()
        .is_err()
    {
        assert!(
            std::env::var_os("CI").is_none(),
            "GNU parallel is missing on CI: .ci/run must install Debian's `parallel`"
        );
        eprintln!("GNU parallel is not installed here: scale-out recipe not exercised");
        return;
    }
    let text = input();
    let expected = run_single(&text);
    // The README's recipe: --pipe cuts stdin into blocks of whole lines,
    // --keep-order (-k) writes the blocks' output in input order.
    let mut child = Command::new("parallel")
        .args([
            "--pipe",
            "--keep-order",
            "--block",
            "2k",
            "-j",
            "2",
            juncture(),
            "split",
            "--rules",
            "demo",
            "--format",
            "jsonl",
        ])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::null())
        .spawn()
        .expect("parallel runs");
    child
        .stdin
        .take()
        .unwrap()
        .write_all(text.as_bytes())
        .unwrap();
    let out = child.wait_with_output().unwrap();
    assert_eq!(
        String::from_utf8_lossy(&out.stdout).lines().count(),
        text.lines().count()
    );
    assert!(
        out.stdout == expected,
        "sharded output differs from one process"
    );
}
