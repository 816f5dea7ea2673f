//! The tutorial (docs/tutorial.md) cannot rot: every command in its
//! ```console blocks (lines starting with `$ `) is run, and its output must
//! be the text that follows it in the block, exactly.
//!
//! Commands run through `sh` in a scratch directory that holds `docs` (a
//! link to the repository's), with the freshly built `juncture` first on
//! PATH; standard output is compared. After changing the tutorial or the
//! program, `TUTORIAL_UPDATE=1 cargo test --test tutorial` writes the real
//! output into the tutorial; review the diff.

use std::path::{Path, PathBuf};
use std::process::Command;

struct Step {
    command: String,
    expected: String,
    /// Line range of the expected output in the file (0-based, end exclusive).
    lines: (usize, usize),
}

fn steps(text: &str) -> Vec<Step> {
    let lines: Vec<&str> = text.lines().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while i < lines.len() {
        if lines[i].trim_end() != "```console" {
            i += 1;
            continue;
        }
        i += 1;
        let mut current: Option<(String, usize)> = None;
        while i < lines.len() && lines[i].trim_end() != "```" {
            if let Some(cmd) = lines[i].strip_prefix("$ ") {
                if let Some((c, start)) = current.take() {
                    out.push(step(c, &lines, start, i));
                }
                current = Some((cmd.to_string(), i + 1));
            }
            i += 1;
        }
        if let Some((c, start)) = current.take() {
            out.push(step(c, &lines, start, i));
        }
        i += 1;
    }
    out
}

fn step(command: String, lines: &[&str], start: usize, end: usize) -> Step {
    let mut expected = lines[start..end].join("\n");
    if !expected.is_empty() {
        expected.push('\n');
    }
    Step {
        command,
        expected,
        lines: (start, end),
    }
}

fn scratch() -> PathBuf {
    let dir = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join("tutorial");
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let docs = Path::new(env!("CARGO_MANIFEST_DIR")).join("docs");
    #[cfg(unix)]
    std::os::unix::fs::symlink(&docs, dir.join("docs")).unwrap();
    dir
}

fn run(command: &str, dir: &Path) -> String {
    let bin = Path::new(env!("CARGO_BIN_EXE_juncture"));
    let path = format!(
        "{}:{}",
        bin.parent().unwrap().display(),
        std::env::var("PATH").unwrap_or_default()
    );
    let out = Command::new("sh")
        .arg("-c")
        .arg(command)
        .current_dir(dir)
        .env("PATH", path)
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&out.stdout).into_owned();
    // Trailing spaces are invisible in the tutorial: compare without them.
    let mut cleaned: String = text
        .lines()
        .map(|l| l.trim_end())
        .collect::<Vec<_>>()
        .join("\n");
    if !cleaned.is_empty() {
        cleaned.push('\n');
    }
    cleaned
}

#[test]
fn every_tutorial_command_prints_what_the_tutorial_shows() {
    let file = Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/tutorial.md");
    let text = std::fs::read_to_string(&file).unwrap();
    let steps = steps(&text);
    assert!(
        steps.len() >= 8,
        "the tutorial has {} commands",
        steps.len()
    );
    let dir = scratch();
    let update = std::env::var_os("TUTORIAL_UPDATE").is_some();
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let mut failures = Vec::new();
    // Replace from the end so earlier line numbers stay valid.
    let mut replacements = Vec::new();
    for s in &steps {
        let got = run(&s.command, &dir);
        if got != s.expected {
            failures.push(format!(
                "$ {}\n--- the tutorial shows:\n{}--- the command prints:\n{}",
                s.command, s.expected, got
            ));
            replacements.push((s.lines, got));
        }
    }
    if update && !replacements.is_empty() {
        for ((start, end), got) in replacements.into_iter().rev() {
            let new: Vec<String> = got.lines().map(str::to_string).collect();
            lines.splice(start..end, new);
        }
        std::fs::write(&file, lines.join("\n") + "\n").unwrap();
        return;
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
