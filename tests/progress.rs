//! The progress bar of `split`: on stderr only when stderr is a terminal,
//! stdout is not, and standard input is a file; `--no-progress` turns it off.

mod common;

use std::process::{Command, Stdio};

/// A file of `n` words to feed on standard input.
fn word_file(n: usize) -> std::path::PathBuf {
    let path =
        std::env::temp_dir().join(format!("juncture-progress-{}-{n}.txt", std::process::id()));
    let words: String = ["Arbeitsamt\n", "Haustür\n", "Wetterbericht\n"]
        .iter()
        .cycle()
        .take(n)
        .copied()
        .collect();
    std::fs::write(&path, words).unwrap();
    path
}

#[test]
fn no_bar_when_stderr_is_a_pipe() {
    let input = word_file(300);
    let out = common::juncture()
        .args(["split", "--format", "jsonl"])
        .stdin(std::fs::File::open(&input).unwrap())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .output()
        .unwrap();
    std::fs::remove_file(&input).ok();
    assert!(out.status.success());
    assert_eq!(String::from_utf8_lossy(&out.stdout).lines().count(), 300);
    assert!(
        out.stderr.is_empty(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

/// Runs `juncture split ARGS < input > /dev/null` with stderr on a
/// terminal (through `script`); returns what reached the terminal, or
/// `None` where `script` is not available.
fn on_a_terminal(extra: &str, input: &std::path::Path) -> Option<String> {
    let bin = env!("CARGO_BIN_EXE_juncture");
    let cmd = format!(
        "{bin} split --format jsonl {extra} < {} > /dev/null",
        input.display()
    );
    let out = Command::new("script")
        .args(["-qc", &cmd, "/dev/null"])
        .stdin(Stdio::null())
        .output()
        .ok()?;
    out.status
        .success()
        .then(|| String::from_utf8_lossy(&out.stdout).into_owned())
}

#[test]
fn bar_on_a_terminal_unless_switched_off() {
    let input = word_file(3000);
    let shown = on_a_terminal("", &input);
    let hidden = on_a_terminal("--no-progress", &input);
    std::fs::remove_file(&input).ok();
    let (Some(shown), Some(hidden)) = (shown, hidden) else {
        eprintln!("`script` is not available: terminal case not tested");
        return;
    };
    assert!(shown.contains("%") && shown.contains("MB"), "{shown:?}");
    assert!(!hidden.contains("MB"), "{hidden:?}");
}
