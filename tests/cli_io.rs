//! The command line's input and output contract: words as arguments or as
//! lines of standard input, one record per input in input order whatever the
//! line holds, the output formats, exit codes, lexicon warnings and
//! `--strict`, a closed standard output, `--greedy`, `rules` and `--help`.

mod common;

use common::{code, run, run_args, stderr, stdout};
use serde_json::Value;
use std::io::{BufRead, BufReader, Write};
use std::path::PathBuf;
use std::process::Stdio;
use std::sync::mpsc;
use std::time::Duration;

fn jsonl(out: &std::process::Output) -> Vec<Value> {
    stdout(out)
        .lines()
        .map(|l| serde_json::from_str(l).unwrap_or_else(|e| panic!("not JSON ({e}): {l}")))
        .collect()
}

/// A file in a fresh temporary directory (removed when dropped).
struct TempFile {
    dir: PathBuf,
    path: PathBuf,
}

impl TempFile {
    fn new(name: &str, bytes: &[u8]) -> TempFile {
        use std::sync::atomic::{AtomicUsize, Ordering};
        static N: AtomicUsize = AtomicUsize::new(0);
        let dir = std::env::temp_dir().join(format!(
            "juncture-cli-io-{}-{}",
            std::process::id(),
            N.fetch_add(1, Ordering::SeqCst)
        ));
        std::fs::create_dir_all(&dir).unwrap();
        let path = dir.join(name);
        std::fs::write(&path, bytes).unwrap();
        TempFile { dir, path }
    }

    fn path(&self) -> &str {
        self.path.to_str().unwrap()
    }
}

impl Drop for TempFile {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.dir);
    }
}

#[test]
fn arguments_and_stdin_lines_give_the_same_records() {
    let args = run_args(&[
        "split", "--rules", "demo", "-f", "jsonl", "kalom", "dalon", "tormek",
    ]);
    let stdin = run(
        &["split", "--rules", "demo", "-f", "jsonl"],
        b"kalom\ndalon\r\ntormek",
    );
    assert_eq!(code(&args), 0, "{}", stderr(&args));
    assert_eq!(code(&stdin), 0, "{}", stderr(&stdin));
    assert_eq!(stdout(&args), stdout(&stdin));
    let inputs: Vec<Value> = jsonl(&args)
        .into_iter()
        .map(|v| v["input"].clone())
        .collect();
    assert_eq!(inputs, ["kalom", "dalon", "tormek"]);
}

#[test]
fn output_record_n_belongs_to_input_line_n() {
    let words = [
        "solanavi", "ve", "", "tormek", "xyz", "kalom", "tor mek", "ed ano",
    ];
    let mut input = String::new();
    let mut expected = Vec::new();
    for i in 0..300 {
        let w = words[i % words.len()];
        input.push_str(w);
        input.push('\n');
        expected.push(w);
    }
    let out = run(
        &["split", "--rules", "demo", "-f", "jsonl"],
        input.as_bytes(),
    );
    assert_eq!(code(&out), 1, "`ve`, `` and `xyz` have no analysis");
    let records = jsonl(&out);
    assert_eq!(records.len(), expected.len());
    for (r, w) in records.iter().zip(&expected) {
        assert_eq!(r["input"], *w);
    }
}

#[test]
fn every_odd_line_still_gets_exactly_one_record() {
    let long = "a".repeat(100_000);
    let mut input: Vec<u8> = Vec::new();
    let lines: Vec<Vec<u8>> = vec![
        b"kalom".to_vec(),
        b"".to_vec(),
        b"tor\xffmek".to_vec(),
        long.as_bytes().to_vec(),
        "tor\u{7}mek".as_bytes().to_vec(),
        b"\x00".to_vec(),
        b"\x1b[31mtor\x1b[0m".to_vec(),
        b"tor\tmek".to_vec(),
        b"   ".to_vec(),
        b"dalon".to_vec(),
    ];
    for l in &lines {
        input.extend_from_slice(l);
        input.push(b'\n');
    }
    let out = run(&["split", "--rules", "demo", "-f", "jsonl"], &input);
    assert_eq!(code(&out), 1);
    assert!(!stderr(&out).contains("panicked"), "{}", stderr(&out));
    let records = jsonl(&out);
    assert_eq!(records.len(), lines.len(), "one record per input line");
    let analysed = |r: &Value| !r["analyses"].as_array().unwrap().is_empty();
    assert!(
        analysed(&records[0]) && analysed(&records[9]),
        "the run goes on"
    );
    // The line that is not UTF-8 and the over-long line are reported as errors.
    assert!(records[2]["error"].as_str().unwrap().contains("UTF-8"));
    let long_error = records[3]["error"]
        .as_str()
        .expect("the long line is an error");
    assert!(long_error.contains("--max-chars"), "{long_error}");
    assert_eq!(
        records[3]["input"].as_str().unwrap().chars().count(),
        100_000
    );
    for i in [1, 4, 5, 6, 7, 8] {
        assert!(!analysed(&records[i]), "line {i}: {}", records[i]);
        assert_eq!(records[i]["count"], 0);
    }
    // The same lines in TSV: one line each, tabs in the input escaped.
    let out = run(&["split", "--rules", "demo", "-f", "tsv"], &input);
    let text = stdout(&out);
    assert_eq!(text.lines().count(), lines.len(), "{text}");
    assert!(text.lines().nth(7).unwrap().starts_with("tor mek\t0"));
}

#[test]
fn a_long_line_is_analysed_when_the_limit_allows_it() {
    let long = "tor".repeat(2000);
    let out = run(
        &[
            "split",
            "--rules",
            "demo",
            "-f",
            "jsonl",
            "--max-chars",
            "10000",
            "-k",
            "1",
        ],
        long.as_bytes(),
    );
    assert_eq!(code(&out), 0, "{}", stderr(&out));
    let r = &jsonl(&out)[0];
    assert!(r.get("error").is_none(), "{r}");
    assert_eq!(r["analyses"][0]["parts"].as_array().unwrap().len(), 2000);
}

#[test]
fn output_is_flushed_line_by_line() {
    let mut child = common::juncture()
        .args(["split", "--rules", "demo", "-f", "jsonl"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut input = child.stdin.take().unwrap();
    let output = child.stdout.take().unwrap();
    let (tx, rx) = mpsc::channel();
    std::thread::spawn(move || {
        let mut reader = BufReader::new(output);
        let mut line = String::new();
        let _ = reader.read_line(&mut line);
        let _ = tx.send(line);
    });
    input.write_all(b"kalom\n").unwrap();
    input.flush().unwrap();
    // stdin stays open: the record must come before the end of the input.
    let line = rx
        .recv_timeout(Duration::from_secs(60))
        .expect("the record of the first line comes before stdin is closed");
    assert!(line.contains("\"input\":\"kalom\""), "{line}");
    drop(input);
    assert!(child.wait().unwrap().success());
}

#[test]
fn a_closed_stdout_ends_the_run_without_a_panic() {
    let mut child = common::juncture()
        .args(["split", "--rules", "demo", "-f", "jsonl"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut input = child.stdin.take().unwrap();
    let writer = std::thread::spawn(move || {
        for _ in 0..50_000 {
            if input.write_all(b"solanavitor\n").is_err() {
                break;
            }
        }
    });
    {
        let mut reader = BufReader::new(child.stdout.take().unwrap());
        let mut line = String::new();
        reader.read_line(&mut line).unwrap();
        assert!(line.starts_with('{'));
        // reader (the read end of stdout) is dropped here
    }
    let out = child.wait_with_output().unwrap();
    writer.join().unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(!err.contains("panicked"), "{err}");
    assert!(!err.contains("Broken pipe"), "{err}");
    assert_ne!(out.status.code(), Some(101), "a panic exit: {err}");
}

#[test]
fn exit_codes() {
    // 0: every input analysed.
    assert_eq!(
        code(&run_args(&["split", "--rules", "demo", "kalom", "dalon"])),
        0
    );
    // 1: some input not analysed (and still reported).
    let some = run_args(&["split", "--rules", "demo", "-f", "jsonl", "kalom", "qqq"]);
    assert_eq!(code(&some), 1);
    assert_eq!(jsonl(&some).len(), 2);
    // 2: bad rules, missing lexicon file, bad flag, bad flag value.
    let bad_rules = run_args(&["split", "--rules", "tests/data/malformed/no-such.jr", "x"]);
    assert_eq!(code(&bad_rules), 2);
    assert!(stderr(&bad_rules).contains("no-such.jr"));
    let missing = run_args(&[
        "split",
        "--rules",
        "demo",
        "--lexicon",
        "tests/data/no-such-lexicon.tsv",
        "x",
    ]);
    assert_eq!(code(&missing), 2);
    assert!(
        stderr(&missing).contains("tests/data/no-such-lexicon.tsv"),
        "{}",
        stderr(&missing)
    );
    assert!(missing.stdout.is_empty());
    let flag = run_args(&["split", "--rules", "demo", "--frobnicate", "x"]);
    assert_eq!(code(&flag), 2);
    assert!(stderr(&flag).contains("--frobnicate"));
    let value = run_args(&["split", "--rules", "demo", "--format", "xml", "x"]);
    assert_eq!(code(&value), 2);
    assert!(stderr(&value).contains("xml"));
    // join follows the same convention.
    assert_eq!(code(&run_args(&["join", "--rules", "demo", "tor+mek"])), 0);
    assert_eq!(code(&run_args(&["join", "--rules", "demo", "tor+ve"])), 1);
}

const LEXICON_WITH_A_BAD_LINE: &str = "# extra words\nbrel\t30\tpos=noun\nkrum\tmany\nzot\t5\n";

#[test]
fn strict_makes_a_malformed_lexicon_line_fatal() {
    let lex = TempFile::new("extra.tsv", LEXICON_WITH_A_BAD_LINE.as_bytes());
    let out = run_args(&[
        "split",
        "--rules",
        "demo",
        "--lexicon",
        lex.path(),
        "--strict",
        "brel",
    ]);
    assert_eq!(code(&out), 2);
    let err = stderr(&out);
    assert!(err.contains(&format!("{}:3", lex.path())), "{err}");
    assert!(out.stdout.is_empty());
}

#[test]
fn without_strict_malformed_lexicon_lines_are_counted_on_stderr() {
    let lex = TempFile::new("extra.tsv", LEXICON_WITH_A_BAD_LINE.as_bytes());
    let out = run_args(&[
        "split",
        "--rules",
        "demo",
        "--lexicon",
        lex.path(),
        "-f",
        "jsonl",
        "brel",
        "zot",
    ]);
    assert_eq!(code(&out), 0, "{}", stderr(&out));
    let err = stderr(&out);
    assert!(err.contains(&format!("{}:3", lex.path())), "{err}");
    assert!(err.contains("1 malformed lexicon line skipped"), "{err}");
    // stdout stays machine-readable.
    assert_eq!(jsonl(&out).len(), 2);
}

#[test]
fn format_json_is_one_array_in_input_order() {
    let out = run(
        &["split", "--rules", "demo", "--format", "json"],
        b"kalom\nve\n\ntormek\n",
    );
    let v: Value = serde_json::from_str(&stdout(&out)).expect("one valid JSON document");
    let items = v.as_array().expect("a JSON array");
    let inputs: Vec<&str> = items.iter().map(|r| r["input"].as_str().unwrap()).collect();
    assert_eq!(inputs, ["kalom", "ve", "", "tormek"]);
    // No input at all: an empty array.
    let none = run(&["split", "--rules", "demo", "--format", "json"], b"");
    let v: Value = serde_json::from_str(&stdout(&none)).unwrap();
    assert_eq!(v, Value::Array(Vec::new()));
}

#[test]
fn format_yaml_is_one_sequence_in_input_order() {
    let out = run(
        &["split", "--rules", "demo", "--format", "yaml"],
        b"kalom\nve\n\ntor mek\n",
    );
    let v: Vec<serde_yaml::Value> = serde_yaml::from_str(&stdout(&out)).expect("a YAML sequence");
    assert_eq!(v.len(), 4);
    assert_eq!(v[0]["input"].as_str(), Some("kalom"));
    assert_eq!(v[2]["input"].as_str(), Some(""));
    assert_eq!(
        v[3]["analyses"][0]["junctions"][0]["surface"].as_str(),
        Some(" ")
    );
    let none = run(&["split", "--rules", "demo", "--format", "yaml"], b"");
    let v: Vec<serde_yaml::Value> = serde_yaml::from_str(&stdout(&none)).unwrap();
    assert!(v.is_empty());
}

#[test]
fn format_tsv_is_one_line_per_input() {
    let out = run(
        &["split", "--rules", "demo", "--format", "tsv"],
        b"kalom\nve\n\ntormek\n",
    );
    let text = stdout(&out);
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), 4, "{text}");
    assert_eq!(lines[0], "kalom\t1\tkale+om\telide-e\t-9.756");
    assert_eq!(lines[1], "ve\t0");
    assert_eq!(lines[2], "\t0");
    assert!(lines[3].starts_with("tormek\t2\ttormek\t\t"));
}

#[test]
fn greedy_gives_one_longest_match_analysis() {
    let out = run_args(&[
        "split", "--rules", "demo", "--greedy", "-f", "jsonl", "tormek", "tammora", "kalom",
    ]);
    assert_eq!(code(&out), 0, "{}", stderr(&out));
    let records = jsonl(&out);
    for r in &records {
        assert_eq!(r["analyses"].as_array().unwrap().len(), 1, "{r}");
    }
    let parts = |r: &Value| -> Vec<String> {
        r["analyses"][0]["parts"]
            .as_array()
            .unwrap()
            .iter()
            .map(|p| p["form"].as_str().unwrap().to_string())
            .collect()
    };
    // The longest lexicon entry at the start wins, even over a better split.
    assert_eq!(parts(&records[0]), ["tormek"]);
    // tam+mora reads 3 letters before the junction, tam+ora (geminate) 2.
    assert_eq!(parts(&records[1]), ["tam", "mora"]);
    assert_eq!(parts(&records[2]), ["kale", "om"]);
    // The count is still the exact number of analyses.
    assert_eq!(records[1]["count"], 2);

    // A plain rule-set with a lexicon of one's own: greedy takes `them`
    // (longest first), the ranking prefers the frequent `the` + `mat`.
    let lex = TempFile::new("words.tsv", b"the\t100\nthem\t5\nmat\t50\nat\t90\n");
    let args = [
        "split",
        "--rules",
        "plain",
        "--lexicon",
        lex.path(),
        "-f",
        "jsonl",
        "themat",
    ];
    let ranked = jsonl(&run_args(&args));
    assert_eq!(parts(&ranked[0]), ["the", "mat"]);
    assert_eq!(ranked[0]["count"], 2);
    let mut greedy_args = args.to_vec();
    greedy_args.push("--greedy");
    let greedy = jsonl(&run_args(&greedy_args));
    assert_eq!(greedy[0]["analyses"].as_array().unwrap().len(), 1);
    assert_eq!(parts(&greedy[0]), ["them", "at"]);
}

#[test]
fn rules_lists_the_bundled_rule_sets() {
    let out = run_args(&["rules"]);
    assert_eq!(code(&out), 0);
    let text = stdout(&out);
    let names: Vec<&str> = text
        .lines()
        .skip(1)
        .filter_map(|l| l.split_whitespace().next())
        .collect();
    assert!(names.contains(&"plain"), "{text}");
    assert!(names.contains(&"demo"), "{text}");
    assert!(
        !names.contains(&"demo-letters"),
        "an include file is not a rule-set"
    );
    let velmish = text.lines().find(|l| l.starts_with("demo ")).unwrap();
    assert!(velmish.contains("velmish"), "{velmish}");
    // `rules show` prints the file itself.
    let show = run_args(&["rules", "show", "demo"]);
    assert_eq!(code(&show), 0);
    assert_eq!(stdout(&show), include_str!("../rule-sets/demo.jr"));
    assert_eq!(code(&run_args(&["rules", "show", "no-such-set"])), 2);
}

#[test]
fn help_exits_0() {
    let top = run_args(&["--help"]);
    assert_eq!(code(&top), 0);
    for verb in ["split", "join", "rules"] {
        assert!(stdout(&top).contains(verb), "--help names `{verb}`");
    }
    let split = run_args(&["split", "--help"]);
    assert_eq!(code(&split), 0);
    for flag in [
        "--rules",
        "--lexicon",
        "--format",
        "--greedy",
        "--strict",
        "--max-parts",
    ] {
        assert!(stdout(&split).contains(flag), "split --help names {flag}");
    }
    assert_eq!(code(&run_args(&["--version"])), 0);
    // No subcommand at all is a usage error.
    assert_eq!(code(&run_args(&[])), 2);
}
