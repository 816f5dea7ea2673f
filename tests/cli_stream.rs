//! `split --all` streams: in text, JSONL and TSV each analysis is written as
//! the search finds it, so the first analyses of an input with
//! astronomically many come at once, and nothing but the one being written
//! is held. The streamed layouts carry everything the record did: the JSONL
//! listing is one object per analysis and then a trailer per input (count,
//! listed, truncated, reason); text and TSV are the record's lines, with a
//! truncation note after the listing in text. `json` and `yaml` keep the
//! record layout. Without `--all` nothing changes.

mod common;

use common::{code, run, run_args, stderr, stdout, DEMO_WORDS};
use serde_json::Value;
use std::io::{BufReader, Read, Write};
use std::process::Stdio;
use std::sync::mpsc;
use std::time::Duration;

fn split(extra: &[&str], words: &[&str]) -> std::process::Output {
    let mut args = vec!["split", "--rules", "demo"];
    args.extend_from_slice(extra);
    args.extend_from_slice(words);
    run_args(&args)
}

fn json_lines(text: &str) -> Vec<Value> {
    text.lines()
        .map(|l| serde_json::from_str(l).unwrap_or_else(|e| panic!("not JSON ({e}): {l}")))
        .collect()
}

#[test]
fn text_lists_each_analysis_then_the_truncation_note() {
    let out = split(&["--all", "--limit", "1"], &["tormek", "ed ano"]);
    assert_eq!(code(&out), 0, "{}", stderr(&out));
    assert_eq!(
        stdout(&out),
        "tormek: 2 analyses\n\
         \x20 1. tormek    score -6.9784\n\
         \x20 (1 shown; more analyses exist than were listed (--top / --limit))\n\
         ed ano: 1 analysis\n\
         \x20 1. eth + ano    score -9.6685\n\
         \x20      eth + ano: th + a → d_a  by th-voicing (cost 0.5) at 1\n"
    );
}

#[test]
fn a_complete_listing_in_text_and_tsv_is_the_record_unchanged() {
    for format in ["text", "tsv"] {
        let all = split(&["-f", format, "--all"], DEMO_WORDS);
        let top = split(&["-f", format, "--top", "1000"], DEMO_WORDS);
        assert_eq!(code(&all), code(&top));
        assert_eq!(stdout(&all), stdout(&top), "{format}");
    }
}

#[test]
fn jsonl_is_one_object_per_analysis_then_a_trailer_per_input() {
    let out = split(&["-f", "jsonl", "--all", "--limit", "1"], &["tormek"]);
    let lines: Vec<&str> = std::str::from_utf8(&out.stdout).unwrap().lines().collect();
    assert_eq!(lines.len(), 2, "{lines:?}");
    assert!(
        lines[0]
            .starts_with(r#"{"input":"tormek","rank":1,"score":-6.9784,"parts":[{"form":"tormek""#),
        "{}",
        lines[0]
    );
    assert_eq!(
        lines[1],
        r#"{"input":"tormek","count":2,"listed":1,"truncated":true,"reason":"limit"}"#
    );
}

/// Read back into records, the streamed JSONL gives exactly the records of
/// the same run without `--all`.
#[test]
fn jsonl_listing_and_trailer_hold_what_the_record_held() {
    let streamed = json_lines(&stdout(&split(&["-f", "jsonl", "--all"], DEMO_WORDS)));
    let records = json_lines(&stdout(&split(
        &["-f", "jsonl", "--top", "1000"],
        DEMO_WORDS,
    )));
    let mut rebuilt: Vec<Value> = Vec::new();
    let mut analyses: Vec<Value> = Vec::new();
    for mut line in streamed {
        let object = line.as_object_mut().unwrap();
        if object.contains_key("rank") {
            assert!(!object.contains_key("listed"), "{object:?}");
            object.remove("input");
            analyses.push(line);
            continue;
        }
        // The trailer: everything of the record but its analyses, and how
        // many were listed.
        assert_eq!(object["listed"], analyses.len(), "{}", object["input"]);
        object.remove("listed");
        object.insert(
            "analyses".into(),
            Value::Array(std::mem::take(&mut analyses)),
        );
        rebuilt.push(line);
    }
    assert!(analyses.is_empty(), "every listing ends with its trailer");
    assert_eq!(rebuilt.len(), DEMO_WORDS.len());
    for (r, expected) in rebuilt.iter().zip(&records) {
        let mut expected = expected.clone();
        // Field order aside, the same record.
        for key in ["input", "count", "truncated", "reason", "error", "analyses"] {
            assert_eq!(r.get(key), expected.get(key), "{key} of {}", r["input"]);
            expected.as_object_mut().unwrap().remove(key);
        }
        assert!(expected.as_object().unwrap().is_empty(), "{expected}");
    }
}

#[test]
fn limits_and_errors_are_in_the_trailer() {
    let out = run(
        &[
            "split",
            "--rules",
            "demo",
            "-f",
            "jsonl",
            "--all",
            "--max-parts",
            "1",
        ],
        b"tormek\ntor\xffmek\nxyz\n",
    );
    assert_eq!(code(&out), 1, "`tor\\xffmek` and `xyz` fail");
    let lines = json_lines(&stdout(&out));
    assert_eq!(lines.len(), 4, "{lines:?}");
    assert_eq!(lines[0]["rank"], 1);
    assert_eq!(lines[1]["input"], "tormek");
    assert_eq!(lines[1]["reason"], "parts");
    assert_eq!(lines[1]["listed"], 1);
    assert!(lines[2]["error"].as_str().unwrap().contains("UTF-8"));
    assert_eq!(lines[2]["listed"], 0);
    assert_eq!(lines[3]["input"], "xyz");
    assert_eq!(lines[3]["count"], 0);
    assert_eq!(lines[3]["truncated"], false);
}

#[test]
fn greedy_and_passthrough_use_the_streamed_layout_too() {
    let out = split(&["-f", "jsonl", "--all", "--greedy"], &["solanavitor"]);
    let lines = json_lines(&stdout(&out));
    assert_eq!(lines.len(), 2, "{lines:?}");
    assert_eq!(lines[0]["rank"], 1);
    assert_eq!(lines[1]["listed"], 1);
    let out = split(
        &["-f", "jsonl", "--all", "--passthrough"],
        &["2024", "tormek"],
    );
    let lines = json_lines(&stdout(&out));
    assert_eq!(code(&out), 0, "{}", stderr(&out));
    assert_eq!(lines[0]["passthrough"], "number");
    assert_eq!(lines[0]["listed"], 0);
    assert_eq!(lines.len(), 1 + 2 + 1, "{lines:?}");
}

#[test]
fn json_and_yaml_keep_the_record_layout() {
    for format in ["json", "yaml"] {
        let all = split(&["-f", format, "--all"], DEMO_WORDS);
        let top = split(&["-f", format, "--top", "1000"], DEMO_WORDS);
        assert_eq!(stdout(&all), stdout(&top), "{format}");
    }
}

#[test]
fn several_jobs_write_the_same_listing() {
    let mut input = String::new();
    for i in 0..600 {
        input.push_str(DEMO_WORDS[i % DEMO_WORDS.len()]);
        input.push('\n');
    }
    for format in ["text", "jsonl", "tsv"] {
        let args = |jobs: &'static str| {
            [
                "split", "--rules", "demo", "-f", format, "--all", "--limit", "2", "-j", jobs,
            ]
        };
        let one = run(&args("1"), input.as_bytes());
        let two = run(&args("2"), input.as_bytes());
        assert_eq!(code(&one), 1, "`ve` has no analysis");
        assert_eq!(code(&two), 1);
        assert_eq!(stdout(&one), stdout(&two), "{format}");
    }
}

/// `tormek` is `tormek` or `tor + mek`: fifty of them run together have
/// 2^50 analyses. With a limit far beyond what could be collected, the first
/// analyses still come at once, while standard input is open and long before
/// the listing could end.
#[test]
fn the_first_analyses_are_written_before_the_listing_ends() {
    for format in ["jsonl", "text", "tsv"] {
        let mut child = common::juncture()
            .args([
                "split",
                "--rules",
                "demo",
                "-f",
                format,
                "--all",
                "--limit",
                "1000000000000",
            ])
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
            // Enough for the first analyses: three lines (JSONL), the start
            // of the second analysis (text), or 5,000 bytes (TSV, one line
            // per input).
            let enough = |got: &[u8]| match format {
                "tsv" => got.len() >= 5000,
                "text" => got.windows(6).any(|w| w == b"\n  2. "),
                _ => got.iter().filter(|&&b| b == b'\n').count() >= 3,
            };
            let mut got = Vec::new();
            let mut chunk = [0u8; 4096];
            while !enough(&got) {
                match reader.read(&mut chunk) {
                    Ok(0) | Err(_) => break,
                    Ok(n) => got.extend_from_slice(&chunk[..n]),
                }
            }
            let _ = tx.send(String::from_utf8_lossy(&got).into_owned());
        });
        input
            .write_all(format!("{}\n", "tormek".repeat(50)).as_bytes())
            .unwrap();
        input.flush().unwrap();
        let got = rx
            .recv_timeout(Duration::from_secs(60))
            .expect("the first analyses come before stdin is closed and the listing ends");
        match format {
            "jsonl" => {
                let first: Value = serde_json::from_str(got.lines().next().unwrap()).unwrap();
                assert_eq!(first["rank"], 1, "{got}");
                assert!(got.contains(r#""rank":2,"#), "{got}");
            }
            "text" => {
                assert!(
                    got.starts_with(&format!(
                        "{}: 1125899906842624 analyses\n  1. ",
                        "tormek".repeat(50)
                    )),
                    "{got}"
                );
                assert!(got.contains("\n  2. "), "{got}");
            }
            _ => assert!(
                got.starts_with(&format!(
                    "{}\t1125899906842624\ttormek+",
                    "tormek".repeat(50)
                )),
                "{got}"
            ),
        }
        // The reader is gone: the run ends on the closed pipe, or here.
        let _ = child.kill();
        let _ = child.wait();
        drop(input);
    }
}

#[test]
fn without_all_nothing_streams_and_nothing_changes() {
    let out = split(&["-f", "jsonl", "--top", "1"], &["tormek"]);
    let lines = json_lines(&stdout(&out));
    assert_eq!(lines.len(), 1);
    assert_eq!(lines[0]["analyses"].as_array().unwrap().len(), 1);
    assert_eq!(lines[0]["reason"], "limit");
    let text = stdout(&split(&["--top", "1"], &["tormek"]));
    assert!(
        text.starts_with("tormek: 2 analyses (1 shown; more analyses"),
        "{text}"
    );
}

#[test]
fn help_says_which_formats_stream() {
    let out = run_args(&["split", "--help"]);
    let help = stdout(&out)
        .split_whitespace()
        .collect::<Vec<_>>()
        .join(" ");
    assert!(help.contains("--all"), "{help}");
    assert!(help.contains("trailer"), "{help}");
    assert!(help.contains("json and yaml"), "{help}");
}

/// A rule-set with a script (Sanskrit): forms are written back in the
/// input's script as each analysis comes, the text listing keeps its
/// `read as` line, and the JSONL trailer carries the script fields.
#[test]
fn sanskrit_in_another_script_streams_the_same_analyses() {
    let words = ["तच्छ्रुत्वा", "tan na", "rAmo 'pi"];
    let sanskrit = |extra: &[&str]| {
        let mut args = vec!["split", "--rules", "sanskrit"];
        args.extend_from_slice(extra);
        args.extend_from_slice(&words);
        stdout(&run_args(&args))
    };
    assert_eq!(sanskrit(&["--all"]), sanskrit(&["--top", "1000"]));
    assert!(sanskrit(&["--all"]).contains("  read as devanagari: tacchrutvā\n"));
    let streamed = json_lines(&sanskrit(&["-f", "jsonl", "--all"]));
    let records = json_lines(&sanskrit(&["-f", "jsonl", "--top", "1000"]));
    let trailers: Vec<&Value> = streamed
        .iter()
        .filter(|v| v.get("listed").is_some())
        .collect();
    assert_eq!(trailers.len(), records.len());
    for (t, r) in trailers.iter().zip(&records) {
        for key in [
            "input",
            "count",
            "script",
            "output_script",
            "transliteration",
        ] {
            assert_eq!(t[key], r[key], "{key}");
        }
    }
    let first = streamed.iter().find(|v| v["input"] == words[0]).unwrap();
    assert_eq!(first["parts"], records[0]["analyses"][0]["parts"]);
}
