//! Batches: `--jobs N` and the type cache must not change a single byte of
//! the output, and output order must follow input order.

use std::io::Write;
use std::process::{Command, Stdio};

fn split(extra: &[&str], input: &str) -> Vec<u8> {
    let mut child = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(["split", "--rules", "demo", "--format", "jsonl"])
        .args(extra)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .expect("juncture runs");
    child
        .stdin
        .take()
        .unwrap()
        .write_all(input.as_bytes())
        .unwrap();
    let out = child.wait_with_output().unwrap();
    out.stdout
}

#[test]
fn jobs_and_cache_keep_output_identical_and_in_order() {
    let words = [
        "tormek",
        "solanavi",
        "kalom",
        "nothing-here",
        "",
        "taleso",
        "tormek",
        "ed ano",
        "dalon",
    ];
    let input: String = (0..3000)
        .map(|i| format!("{}\n", words[(i * 7 + i / 5) % words.len()]))
        .collect();
    let plain = split(&["--cache", "0"], &input);
    for extra in [
        &["--jobs", "1"][..],
        &["--jobs", "2"],
        &["--jobs", "3", "--cache", "2"],
        &["--jobs", "4", "--cache", "0"],
        // A budget too small for any record keeps nothing.
        &["--cache-mb", "0"],
        &["--jobs", "2", "--cache-mb", "1"],
    ] {
        assert!(
            split(extra, &input) == plain,
            "output differs with {extra:?}"
        );
    }
    let lines: Vec<serde_json::Value> = String::from_utf8(plain)
        .unwrap()
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    assert_eq!(lines.len(), 3000);
    for (i, record) in lines.iter().enumerate() {
        assert_eq!(record["input"], words[(i * 7 + i / 5) % words.len()]);
    }
}
