//! Checks `juncture::script` against `tests/data/translit-fixture.tsv`,
//! a table of Sanskrit words and short phrases whose Devanagari, HK and SLP1
//! columns were produced from the IAST column by the PyPI library
//! `indic_transliteration` (see the fixture's header and
//! `scripts/gen_translit_fixture.py`).
//!
//! Every row is checked in all 12 directions between the four columns.

use juncture::script::{from_iast, to_iast, transliterate, Script};
use unicode_normalization::UnicodeNormalization;

const FIXTURE: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/tests/data/translit-fixture.tsv"
);

const DEVA: Script = Script::Devanagari;
const HK: Script = Script::HarvardKyoto;
const SLP1: Script = Script::Slp1;

/// Entries where the library's convention differs from ours for a reason we
/// keep: (IAST entry, columns the library writes differently, why). A
/// direction is skipped for such an entry only if it starts or ends in one
/// of those columns; the other directions are still checked, and the test
/// fails if a listed column turns out not to differ.
const EXCLUDED: &[(&str, &[Script], &str)] = &[
    (
        "dharmaḥ | satyam ||",
        &[SLP1],
        "the library writes daṇḍas as '.' and '..' in SLP1 (the original SLP1 \
         convention); we write '|' and '||' in every Roman scheme so that \
         full stops pass through",
    ),
    ("iti samāptam ||", &[SLP1], "daṇḍa in SLP1, as above"),
    (
        "praüga",
        &[DEVA, HK, SLP1],
        "IAST diaeresis marks a hiatus (a + u, प्रउग); the library does not \
         know ü and passes it through",
    ),
    ("titaü", &[DEVA, HK, SLP1], "hiatus a + u, as above (तितउ)"),
    (
        "tām̐l lokān",
        &[DEVA, HK, SLP1],
        "IAST m̐ is candrabindu ँ for us; the library writes the Vedic sign ꣳ \
         (U+A8F3) in Devanagari and leaves m̐ unconverted in HK and SLP1",
    ),
    (
        "oṃ namaḥ",
        &[DEVA, HK, SLP1],
        "the library turns oṃ into the ligature ॐ (HK 'OM', SLP1 'AUM'); we \
         convert letter by letter: ओं, oM",
    ),
];

struct Row {
    line: usize,
    cols: [String; 4],
}

fn col_index(s: Script) -> usize {
    Script::ALL.iter().position(|&t| t == s).unwrap()
}

fn read_fixture() -> (Vec<String>, Vec<Row>) {
    let text = std::fs::read_to_string(FIXTURE)
        .unwrap_or_else(|e| panic!("cannot read fixture {FIXTURE}: {e}"));
    let mut header = Vec::new();
    let mut rows = Vec::new();
    let mut saw_columns = false;
    for (n, line) in text.lines().enumerate() {
        if let Some(comment) = line.strip_prefix('#') {
            header.push(comment.trim().to_string());
            continue;
        }
        if line.trim().is_empty() {
            continue;
        }
        let fields: Vec<&str> = line.split('\t').collect();
        assert_eq!(
            fields.len(),
            4,
            "line {}: expected 4 columns: {line:?}",
            n + 1
        );
        if !saw_columns {
            assert_eq!(
                fields,
                ["iast", "devanagari", "hk", "slp1"],
                "column header"
            );
            saw_columns = true;
            continue;
        }
        rows.push(Row {
            line: n + 1,
            cols: [0, 1, 2, 3].map(|i| fields[i].nfc().collect::<String>()),
        });
    }
    (header, rows)
}

/// Our conversion of `text` from `from` to `to`, through the public API that
/// fits the direction.
fn convert(text: &str, from: Script, to: Script) -> String {
    match (from, to) {
        (_, Script::Iast) => to_iast(text, from),
        (Script::Iast, _) => from_iast(text, to),
        _ => transliterate(text, from, to),
    }
}

#[test]
fn fixture_header_names_library_and_version() {
    let (header, rows) = read_fixture();
    let first = header.first().expect("header comment");
    assert!(first.contains("indic_transliteration"), "{first}");
    assert!(
        first.chars().any(|c| c.is_ascii_digit()),
        "no version in {first}"
    );
    assert!(header.iter().any(|h| h.contains("gen_translit_fixture.py")));
    assert!(rows.len() >= 250, "only {} rows", rows.len());
}

#[test]
fn fixture_all_directions() {
    let (_, rows) = read_fixture();
    let mut failures = Vec::new();
    let mut checked = 0usize;
    let mut skipped = 0usize;
    for row in &rows {
        let excluded = EXCLUDED
            .iter()
            .find(|(w, _, _)| *w == row.cols[0])
            .map(|(_, cols, _)| *cols)
            .unwrap_or(&[]);
        for from in Script::ALL {
            for to in Script::ALL {
                if from == to {
                    continue;
                }
                if excluded.contains(&from) || excluded.contains(&to) {
                    skipped += 1;
                    continue;
                }
                let input = &row.cols[col_index(from)];
                let want = &row.cols[col_index(to)];
                let got = convert(input, from, to);
                checked += 1;
                if &got != want {
                    failures.push(format!(
                        "line {}: {from} -> {to}: {input:?} gave {got:?}, fixture has {want:?}",
                        row.line
                    ));
                }
            }
        }
    }
    println!(
        "{} rows, {checked} conversions checked, {skipped} skipped by EXCLUDED",
        rows.len()
    );
    assert!(
        failures.is_empty(),
        "{} of {checked} conversions differ:\n{}",
        failures.len(),
        failures.join("\n")
    );
    assert_eq!(checked + skipped, rows.len() * 12);
}

#[test]
fn exclusions_are_needed_and_present() {
    let (_, rows) = read_fixture();
    for (word, cols, why) in EXCLUDED {
        assert!(!why.is_empty());
        let row = rows
            .iter()
            .find(|r| r.cols[0] == *word)
            .unwrap_or_else(|| panic!("excluded entry {word:?} is not in the fixture"));
        for &s in *cols {
            assert_ne!(s, Script::Iast, "the IAST column is the library's input");
            let ours = from_iast(word, s);
            assert_ne!(
                ours,
                row.cols[col_index(s)],
                "{word:?}: our {s} agrees with the library; remove it from EXCLUDED"
            );
        }
    }
}
