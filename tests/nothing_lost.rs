//! Nothing is lost: 100,000 mixed lines (valid words, invalid UTF-8, empty
//! lines, 1 MB lines, control characters, right-to-left text, combining
//! marks, NUL bytes, lone CR) fed to `juncture split --rules demo --format
//! jsonl` on stdin give exactly one JSON record per line, in order; each
//! record's `input` is the line (one trailing CR of a CRLF line dropped; a
//! line that is not UTF-8 shown with U+FFFD for the bad bytes, with an
//! `error`); and the record of every valid line is byte-for-byte the record
//! the same line gets when run alone.

use serde_json::Value;
use std::collections::BTreeMap;
use std::io::{Read, Write};
use std::process::{Command, Stdio};

const LINES: usize = 100_000;
const MB: usize = 1 << 20;

/// A small deterministic generator (xorshift64*), so failures reproduce.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n as u64) as usize
    }
    fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.below(items.len())]
    }
}

const WORDS: &[&str] = &[
    "tor", "mek", "tormek", "sola", "avi", "kale", "om", "ketap", "ura", "tala", "iso", "tam",
    "ora", "dal", "lon", "eth", "ano", "ve", "mora",
];

const VALID: &[&str] = &[
    "solanavitor",
    "kalom",
    "ketabura",
    "taleso",
    "tammora",
    "dalon",
    "vetor",
    "tor-12",
    "tor mek",
    "edano",
    "ed ano",
    "Tormek",
    "TORMEK",
    "tor  mek",
    " tor",
    "tor ",
    "12",
    "-",
    "xyzzy",
];

const ODD: &[&str] = &[
    // control characters
    "\u{1}tor",
    "tor\u{1b}[31mmek",
    "\u{7f}",
    "tor\u{b}mek\u{c}",
    "\u{85}",
    "tor\u{2028}mek",
    "\t",
    "tor\tmek",
    // right-to-left text and marks
    "שלום",
    "مرحبا بالعالم",
    "tor\u{202e}mek",
    "\u{200f}tor",
    "\u{202b}sola\u{202c}avi",
    // combining marks
    "to\u{301}r",
    "e\u{301}\u{302}\u{303}\u{304}",
    "\u{301}tor",
    "so\u{308}la\u{308}navi\u{308}tor",
    // NUL
    "tor\u{0}mek",
    "\u{0}",
    "\u{0}\u{0}\u{0}",
    // lone CR (not at the end of the line: that one ends a CRLF line)
    "tor\rmek",
    "\rtor",
    "\r\rx",
    // byte-order mark, other scripts, emoji, non-characters
    "\u{feff}tor",
    "торmek",
    "देवेन्द्र",
    "👍🏽tor",
    "\u{fffe}\u{ffff}",
    "\u{10ffff}",
    "Straße",
    "ǅ",
    "İ",
    "ﬁ",
];

const INVALID: &[&[u8]] = &[
    b"tor\xffmek",
    b"\xc3",
    b"\xed\xa0\x80",
    b"\xf8\x88\x80\x80\x80",
    b"\xc0\xaf",
    b"\xfe\xfe\xff\xff",
    b"sola\x80avi",
    b"\xe2\x82",
];

/// The test input, line by line (without the `\n`).
fn lines() -> Vec<Vec<u8>> {
    let mut rng = Rng(0x9E37_79B9_7F4A_7C15);
    let mut out: Vec<Vec<u8>> = Vec::with_capacity(LINES);
    let big: Vec<Vec<u8>> = vec![
        "tormek".repeat(MB / 6).into_bytes(),
        "é".repeat(MB / 2).into_bytes(),
        {
            let mut v = "sola".repeat(MB / 4).into_bytes();
            v[MB / 2] = 0xff;
            v
        },
        "\u{0}\u{301}".repeat(MB / 3).into_bytes(),
    ];
    let big_at: Vec<usize> = (1..=big.len()).map(|i| i * LINES / 5).collect();
    while out.len() < LINES {
        if let Some(k) = big_at.iter().position(|&at| at == out.len()) {
            out.push(big[k].clone());
            continue;
        }
        let roll = rng.below(100);
        let line: Vec<u8> = match roll {
            0..=49 => {
                // one to three words run together
                let n = 1 + rng.below(3);
                (0..n)
                    .map(|_| *rng.pick(WORDS))
                    .collect::<String>()
                    .into_bytes()
            }
            50..=64 => rng.pick(VALID).as_bytes().to_vec(),
            65..=74 => Vec::new(),
            75..=84 => rng.pick(ODD).as_bytes().to_vec(),
            85..=92 => rng.pick(INVALID).to_vec(),
            93..=95 => {
                // a CRLF line: the CR is dropped
                let mut v = rng.pick(WORDS).as_bytes().to_vec();
                v.push(b'\r');
                v
            }
            96..=97 => {
                // an odd character inside a word
                let mut v = rng.pick(WORDS).to_string();
                v.push_str(*rng.pick(ODD));
                v.push_str(*rng.pick(WORDS));
                v.into_bytes()
            }
            98 if rng.below(50) == 0 => "tormek".repeat(600).into_bytes(),
            _ => rng.pick(WORDS).as_bytes().to_vec(),
        };
        out.push(line);
    }
    out
}

/// What the record's `input` must be for a line.
fn expected_input(line: &[u8]) -> (String, bool) {
    let line = line.strip_suffix(b"\r").unwrap_or(line);
    match std::str::from_utf8(line) {
        Ok(s) => (s.to_string(), true),
        Err(_) => (String::from_utf8_lossy(line).into_owned(), false),
    }
}

/// Runs `juncture split --rules demo -f jsonl` with `input` on stdin.
fn run(input: Vec<u8>) -> (Option<i32>, Vec<u8>, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(["split", "--rules", "demo", "--format", "jsonl"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("spawn juncture");
    let mut stdin = child.stdin.take().unwrap();
    let writer = std::thread::spawn(move || {
        stdin.write_all(&input).expect("write stdin");
    });
    let mut stderr_pipe = child.stderr.take().unwrap();
    let stderr = std::thread::spawn(move || {
        let mut s = String::new();
        stderr_pipe.read_to_string(&mut s).unwrap();
        s
    });
    let mut stdout = Vec::new();
    child
        .stdout
        .take()
        .unwrap()
        .read_to_end(&mut stdout)
        .unwrap();
    writer.join().unwrap();
    let status = child.wait().unwrap();
    (status.code(), stdout, stderr.join().unwrap())
}

fn joined(lines: &[Vec<u8>]) -> Vec<u8> {
    let mut input = Vec::new();
    for l in lines {
        input.extend_from_slice(l);
        input.push(b'\n');
    }
    input
}

#[test]
fn one_record_per_line_in_order_and_the_same_as_alone() {
    let lines = lines();
    assert_eq!(lines.len(), LINES);
    let (code, stdout, stderr) = run(joined(&lines));
    assert_eq!(
        code,
        Some(1),
        "some lines fail, none is fatal; stderr: {stderr}"
    );
    assert!(!stderr.contains("panicked"), "{stderr}");
    let stdout = String::from_utf8(stdout).expect("output is UTF-8");
    assert!(stdout.ends_with('\n'));
    let records: Vec<&str> = stdout.split_terminator('\n').collect();
    assert_eq!(records.len(), LINES, "one record per input line");

    // Distinct valid lines and the first record each got.
    let mut first: BTreeMap<&[u8], &str> = BTreeMap::new();
    let mut invalid = 0;
    for (i, (line, record)) in lines.iter().zip(&records).enumerate() {
        let v: Value = serde_json::from_str(record)
            .unwrap_or_else(|e| panic!("record {} is not JSON ({e})", i + 1));
        let (want, valid) = expected_input(line);
        assert_eq!(
            v["input"].as_str(),
            Some(want.as_str()),
            "record {} does not belong to line {}",
            i + 1,
            i + 1
        );
        if valid {
            let earlier = *first.entry(line.as_slice()).or_insert(record);
            assert_eq!(earlier, *record, "line {} got two different records", i + 1);
        } else {
            invalid += 1;
            assert!(
                v["error"].as_str().is_some_and(|e| e.contains("UTF-8")),
                "line {}: {record}",
                i + 1
            );
            assert_eq!(v["analyses"].as_array().map(Vec::len), Some(0));
        }
    }
    assert!(invalid > 1_000);
    assert!(first.len() > 100);

    // Distinct valid lines alone give the same record: every odd one (not
    // just lowercase letters) and every 10th of the plain words and
    // compounds (some 8,000 distinct; one process each would dominate the
    // test's time without testing anything new).
    let distinct: Vec<(&[u8], &str)> = first
        .into_iter()
        .enumerate()
        .filter(|(i, (line, _))| i % 10 == 0 || !line.iter().all(u8::is_ascii_lowercase))
        .map(|(_, x)| x)
        .collect();
    assert!(distinct.len() > 500);
    let chunks: Vec<_> = distinct.chunks(distinct.len().div_ceil(2)).collect();
    std::thread::scope(|s| {
        for chunk in chunks {
            s.spawn(move || {
                for (line, record) in chunk {
                    let (_, alone, _) = run(joined(&[line.to_vec()]));
                    let alone = String::from_utf8(alone).unwrap();
                    assert_eq!(
                        alone.strip_suffix('\n'),
                        Some(*record),
                        "{:?}: alone and in the batch differ",
                        String::from_utf8_lossy(&line[..line.len().min(80)])
                    );
                }
            });
        }
    });
}

#[test]
fn a_last_line_without_newline_is_still_a_record() {
    let (code, stdout, _) = run(b"tor\nmek".to_vec());
    assert_eq!(code, Some(0));
    let out = String::from_utf8(stdout).unwrap();
    let inputs: Vec<String> = out
        .lines()
        .map(|l| {
            serde_json::from_str::<Value>(l).unwrap()["input"]
                .as_str()
                .unwrap()
                .to_string()
        })
        .collect();
    assert_eq!(inputs, ["tor", "mek"]);
}

#[test]
fn empty_input_gives_no_records() {
    let (code, stdout, _) = run(Vec::new());
    assert_eq!(code, Some(0));
    assert!(stdout.is_empty());
}

#[test]
fn only_newlines_give_one_record_each() {
    let (_, stdout, _) = run(b"\n\n\r\n\n".to_vec());
    let out = String::from_utf8(stdout).unwrap();
    assert_eq!(out.lines().count(), 4);
    for l in out.lines() {
        assert_eq!(serde_json::from_str::<Value>(l).unwrap()["input"], "");
    }
}
