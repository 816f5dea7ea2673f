//! Every limit of `split` is an option with a default, and hitting it is
//! reported in that line's record (`"truncated": true` and a `"reason"` in
//! JSON, in the trailer object of a streamed `--all` listing in JSONL, the
//! reason in words in text output), never silent, never a panic.
//!
//! | option | default | reason |
//! |---|---|---|
//! | `--max-chars` | 4096 | `input-length` (and an `error`) |
//! | `--max-parts` | rule-set's `max-parts` (0: none) | `parts` |
//! | `--top` / `--all --limit` | 5 / 1000 | `limit` |
//! | `--max-edges` | 2,000,000 | `lattice-size` |
//! | `--timeout` (ms) | 10,000 | `time` |

use serde_json::Value;
use std::process::{Command, Output};

fn juncture(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(args)
        .output()
        .expect("run juncture")
}

/// Runs `split --rules demo ARGS -f jsonl` and returns the records.
fn records(args: &[&str]) -> Vec<Value> {
    let mut all = vec!["split", "--rules", "demo", "-f", "jsonl"];
    all.extend_from_slice(args);
    let out = juncture(&all);
    assert!(
        matches!(out.status.code(), Some(0 | 1)),
        "exit {:?}: {}",
        out.status,
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout)
        .unwrap()
        .lines()
        .map(|l| serde_json::from_str(l).unwrap_or_else(|e| panic!("{e}: {l}")))
        .collect()
}

fn one(args: &[&str]) -> Value {
    let mut r = records(args);
    assert_eq!(r.len(), 1);
    r.remove(0)
}

fn text(args: &[&str]) -> String {
    let mut all = vec!["split", "--rules", "demo"];
    all.extend_from_slice(args);
    let out = juncture(&all);
    assert!(matches!(out.status.code(), Some(0 | 1)), "{out:?}");
    String::from_utf8(out.stdout).unwrap()
}

fn assert_truncated(r: &Value, reason: &str) {
    assert_eq!(r["truncated"], true, "{r}");
    assert_eq!(r["reason"], reason, "{r}");
}

fn assert_complete(r: &Value) {
    assert_eq!(r["truncated"], false, "{r}");
    assert!(r.get("reason").is_none(), "{r}");
}

#[test]
fn every_limit_is_a_documented_option_with_a_default() {
    let out = juncture(&["split", "--help"]);
    let help = String::from_utf8(out.stdout).unwrap();
    for (option, default) in [
        ("--max-chars", Some("4096")),
        ("--max-parts", None),
        ("--top", Some("5")),
        ("--limit", Some("1000")),
        ("--max-edges", Some("2000000")),
        ("--timeout", Some("10000")),
    ] {
        let at = help
            .find(option)
            .unwrap_or_else(|| panic!("{option} missing from --help:\n{help}"));
        if let Some(d) = default {
            let rest = &help[at..];
            let next = rest[2..].find("\n  -").map_or(rest.len(), |i| i + 2);
            assert!(
                rest[..next].contains(&format!("[default: {d}]")),
                "{option}: no default {d} in:\n{}",
                &rest[..next]
            );
        }
    }
}

#[test]
fn line_length() {
    let r = one(&["--max-chars", "5", "solanavitor"]);
    assert_truncated(&r, "input-length");
    assert_eq!(r["input"], "solanavitor");
    assert!(r["error"].as_str().unwrap().contains("--max-chars"), "{r}");
    assert_complete(&one(&["--max-chars", "11", "solanavitor"]));
    let t = text(&["--max-chars", "5", "solanavitor"]);
    assert!(t.contains("--max-chars"), "{t}");
    // The default admits 4096 characters and no more.
    let long = "tor".repeat(1366); // 4098 characters
    let r = one(&[&long]);
    assert_truncated(&r, "input-length");
    let fits = "tor".repeat(1365); // 4095 characters
    let r = one(&["--top", "1", &fits]);
    assert_ne!(r["reason"], "input-length", "{}", &r.to_string()[..200]);
    assert_eq!(r["analyses"].as_array().unwrap().len(), 1);
}

#[test]
fn parts() {
    // sola + avi + tor: three parts.
    let r = one(&["--max-parts", "2", "solanavitor"]);
    assert_truncated(&r, "parts");
    assert_eq!(r["count"], 0);
    assert_complete(&one(&["--max-parts", "3", "solanavitor"]));
    assert_complete(&one(&["--max-parts", "0", "solanavitor"]));
    let t = text(&["--max-parts", "2", "solanavitor"]);
    assert!(t.contains("--max-parts"), "{t}");
    // Within the limit some analyses remain: counted and listed, still marked.
    let r = one(&["--max-parts", "1", "tormek"]);
    assert_truncated(&r, "parts");
    assert_eq!(r["count"], 1);
    assert_eq!(r["analyses"][0]["parts"].as_array().unwrap().len(), 1);
}

#[test]
fn analyses_listed() {
    let r = one(&["--top", "1", "tormek"]);
    assert_truncated(&r, "limit");
    assert_eq!(r["count"], 2);
    assert_eq!(r["analyses"].as_array().unwrap().len(), 1);
    assert_complete(&one(&["--top", "2", "tormek"]));
    // `--all` streams: one object per analysis, then the trailer with the
    // truncation.
    let r = records(&["--all", "--limit", "1", "tormek"]);
    assert_eq!(r.len(), 2, "{r:?}");
    assert_eq!(r[0]["rank"], 1);
    assert_truncated(&r[1], "limit");
    assert_eq!(r[1]["listed"], 1);
    assert_eq!(r[1]["count"], 2);
    let t = text(&["--all", "--limit", "1", "tormek"]);
    assert!(
        t.ends_with("\n  (1 shown; more analyses exist than were listed (--top / --limit))\n"),
        "{t}"
    );
    let r = one(&["--top", "0", "tormek"]);
    assert_truncated(&r, "limit");
    assert!(r["analyses"].as_array().unwrap().is_empty());
    let t = text(&["--top", "1", "tormek"]);
    assert!(t.contains("1 shown") && t.contains("--top"), "{t}");
}

#[test]
fn lattice_size() {
    let r = one(&["--max-edges", "2", "solanavitor"]);
    assert_truncated(&r, "lattice-size");
    let r = one(&["--max-edges", "0", "solanavitor"]);
    assert_truncated(&r, "lattice-size");
    assert_complete(&one(&["--max-edges", "1000", "solanavitor"]));
    let t = text(&["--max-edges", "2", "solanavitor"]);
    assert!(t.contains("--max-edges"), "{t}");
}

#[test]
fn time_per_input() {
    // 90,000 characters of run-together words: building its lattice takes far
    // longer than 1 ms on any machine.
    let long = "tormek".repeat(15_000);
    let args = ["--max-chars", "100000", "--timeout", "1", long.as_str()];
    let r = one(&args);
    assert_truncated(&r, "time");
    let t = text(&args);
    assert!(
        t.contains("--timeout"),
        "{}",
        &t[t.len().saturating_sub(300)..]
    );
    // The limit is per input: the next line gets its own time.
    let r = records(&["--max-chars", "100000", "--timeout", "1", &long, "tormek"]);
    assert_truncated(&r[0], "time");
    assert_complete(&r[1]);
    // 0 means no limit.
    assert_complete(&one(&["--timeout", "0", "tormek"]));
}

#[test]
fn limits_are_reported_per_line_in_a_batch() {
    let r = records(&[
        "--max-chars",
        "8",
        "--top",
        "1",
        "tormek",
        "solanavitor",
        "tor",
    ]);
    assert_eq!(r.len(), 3);
    assert_truncated(&r[0], "limit");
    assert_truncated(&r[1], "input-length");
    assert_complete(&r[2]);
}

#[test]
fn extreme_limit_values_do_not_panic() {
    for args in [
        vec!["--max-chars", "0", "tor"],
        vec!["--max-chars", "18446744073709551615", "tor"],
        vec!["--max-parts", "18446744073709551615", "tor"],
        vec!["--top", "18446744073709551615", "tor"],
        vec!["--all", "--limit", "0", "tor"],
        vec!["--max-edges", "18446744073709551615", "tor"],
        vec!["--timeout", "18446744073709551615", "tor"],
        vec!["--min-part-length", "0", "tormek"],
        vec!["--min-part-length", "18446744073709551615", "tormek"],
        vec![""],
    ] {
        let mut all = vec!["split", "--rules", "demo", "-f", "jsonl"];
        all.extend_from_slice(&args);
        let out = juncture(&all);
        assert!(
            matches!(out.status.code(), Some(0..=2)),
            "{args:?}: {:?} {}",
            out.status,
            String::from_utf8_lossy(&out.stderr)
        );
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert!(!stderr.contains("panicked"), "{args:?}: {stderr}");
    }
}

#[test]
fn tsv_output_names_a_limit_that_cut_the_search() {
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args([
            "split",
            "--rules",
            "demo",
            "--format",
            "tsv",
            "--max-parts",
            "1",
            "solanavitor",
            "tormek",
        ])
        .output()
        .unwrap();
    let text = String::from_utf8(out.stdout).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), 2);
    assert_eq!(lines[0], "solanavitor\t0\ttruncated: parts");
    // The two-part reading is cut by the limit, the whole word stays.
    assert!(
        lines[1].starts_with("tormek\t1\ttruncated: parts\ttormek\t"),
        "{}",
        lines[1]
    );
}

/// `join` of a long compound: the candidates of every junction are
/// combined depth first up to the listing cap, and a junction that cannot
/// apply (here `p` + `halam`: *ph* is one segment) is ruled out before the
/// junctions ahead of it are combined. Before that, 61 parts took longer
/// than any timeout (2 ways at each of 60 junctions were all tried), so
/// this test would hang rather than fail. The members are common Sanskrit
/// stems; the sequence is the benchmark's constructed compound.
#[test]
fn a_long_join_with_junctions_that_cannot_apply_does_not_try_every_combination() {
    let members = [
        "deva", "indra", "rāja", "putra", "vana", "gaja", "aśva", "nagara", "jala", "phala",
    ];
    let parts: Vec<&str> = (0..60).map(|i| members[i % members.len()]).collect();
    let joined = format!("{} + phalam", parts.join(" + "));
    let out = juncture(&[
        "join", "--rules", "sanskrit", "--scope", "compound", "--limit", "1", "-f", "jsonl",
        &joined,
    ]);
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    let record: Value = serde_json::from_slice(&out.stdout).expect("one JSON record");
    let results = record["results"].as_array().expect("results");
    assert_eq!(results.len(), 1);
    let surface = results[0]["surface"].as_str().unwrap();
    assert!(
        surface.starts_with("devendra") && surface.ends_with("phalam"),
        "{surface}"
    );
    assert_eq!(record["truncated"], true);
}

/// `join` of a line of 100,000 parts: the depth-first search keeps its own
/// stack, so the depth of a line is not limited by the call stack (it
/// aborted with a stack overflow at about 50,000 parts).
#[test]
fn a_join_of_a_hundred_thousand_parts_does_not_overflow_the_stack() {
    use std::io::Write;
    let line = vec!["ab"; 100_000].join("+");
    let mut child = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args([
            "join",
            "--rules",
            "plain",
            "--no-default-lexicon",
            "--limit",
            "1",
            "-f",
            "jsonl",
        ])
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .expect("run juncture");
    child
        .stdin
        .take()
        .expect("stdin")
        .write_all(format!("{line}\n").as_bytes())
        .expect("write the line");
    let out = child.wait_with_output().expect("juncture ends");
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let record: Value = serde_json::from_slice(&out.stdout).expect("one JSON record");
    assert_eq!(
        record["results"][0]["surface"].as_str().map(str::len),
        Some(200_000)
    );
}
