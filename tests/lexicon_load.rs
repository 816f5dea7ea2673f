//! Loading lexicons: the TSV format of the design brief (`form<TAB>frequency
//! <TAB>tags`, `#` comments, frequency and tags optional, `key=value;…`
//! tags), normalization as the rule-set says, merging of duplicate forms,
//! line-numbered problems, and extra lexicon files next to a rule-set's own.

mod common;

use common::{demo_lexicon, demo_rules};
use juncture::analyzer::Analyzer;
use juncture::lexicon::{Lexicon, LexiconBuilder, LexiconError};
use juncture::rules::{compile_named, CompileOptions};

fn load(rules: &str, tsv: &[u8]) -> (Lexicon, Vec<(usize, String)>) {
    let rules = compile_named(rules, &CompileOptions::default()).unwrap();
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv("t.tsv", tsv).unwrap();
    let issues = b
        .issues()
        .iter()
        .map(|i| (i.line, i.message.clone()))
        .collect();
    (b.build().unwrap(), issues)
}

#[test]
fn columns_comments_and_optional_fields() {
    let tsv = "\u{FEFF}# a comment\n\nbrel\t30\tpos=noun;role=first\r\nkrum\t12\nzot\nvasp\tpos=verb\n   # indented comment\n";
    let (lex, issues) = load("demo", tsv.as_bytes());
    assert!(issues.is_empty(), "{issues:?}");
    assert_eq!(lex.len(), 4);
    let e = lex.entry(lex.get("brel").unwrap());
    assert_eq!(e.frequency, 30.0);
    assert_eq!(e.readings[0].get("role"), Some("first"));
    assert_eq!(e.readings[0].get("pos"), Some("noun"));
    // Frequency optional (1), tags optional (none), tags in the second column.
    assert_eq!(lex.entry(lex.get("krum").unwrap()).readings[0].len(), 0);
    assert_eq!(lex.entry(lex.get("zot").unwrap()).frequency, 1.0);
    let vasp = lex.entry(lex.get("vasp").unwrap());
    assert_eq!(vasp.frequency, 1.0);
    assert_eq!(vasp.readings[0].get("pos"), Some("verb"));
}

#[test]
fn forms_are_normalized_as_the_rule_set_says() {
    // demo folds case: `Brel` is found in `brel`, and shown as written.
    let (lex, _) = load("demo", b"Brel\t5\n");
    let id = lex.get("brel").expect("case folded");
    assert_eq!(lex.entry(id).form, "Brel");
    // NFC: a decomposed form matches the composed input.
    let (lex, _) = load("plain", "ta\u{0304}t\t5\n".as_bytes());
    assert!(lex.get("tāt").is_some());
}

#[test]
fn duplicate_forms_merge_frequencies_and_keep_readings() {
    let (lex, _) = load(
        "demo",
        b"mora\t40\tpos=noun\nMora\t10\tpos=verb\nmora\t5\tpos=noun\n",
    );
    assert_eq!(lex.len(), 1);
    let e = lex.entry(0);
    assert_eq!(e.frequency, 55.0);
    assert_eq!(e.readings.len(), 2, "{:?}", e.readings);
    assert_eq!(e.form, "mora", "the most frequent spelling is shown");
    // In an analysis the tags of both readings are joined with `|`.
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    let r = Analyzer::new(&rules, &lexicon).split("tammora", 5);
    let mora = r
        .analyses
        .iter()
        .flat_map(|a| &a.parts)
        .find(|p| p.form == "mora")
        .expect("tam + mora");
    assert_eq!(mora.tags.get("pos"), Some("noun|verb"));
    assert_eq!(mora.readings.len(), 2);
}

#[test]
fn malformed_lines_are_reported_with_their_numbers() {
    let tsv = b"good\t1\nbad\tmany\nneg\t-3\n\tnoform\nx\t1\tnotag\ny\t1\tk=v\textra\nok\t2\n\xff\xfe\t1\ninf\tinf\n";
    let (lex, issues) = load("plain", tsv);
    let lines: Vec<usize> = issues.iter().map(|(l, _)| *l).collect();
    assert_eq!(lines, vec![2, 3, 4, 5, 6, 8, 9], "{issues:?}");
    assert!(issues[0].1.contains("many"), "{}", issues[0].1);
    assert_eq!(lex.len(), 2, "good and ok are kept");
    // Strict: the first malformed line is fatal and named.
    let rules = compile_named("plain", &CompileOptions::default()).unwrap();
    let mut b = LexiconBuilder::new(&rules.normalizer).strict(true);
    let err = b.add_tsv("t.tsv", tsv).unwrap_err();
    assert!(matches!(err, LexiconError::Malformed(_)));
    assert!(err.to_string().contains("t.tsv:2"), "{err}");
}

#[test]
fn extra_files_add_to_the_bundled_lexicon() {
    let dir = std::env::temp_dir().join(format!("juncture-lexicon-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let extra = dir.join("extra.tsv");
    std::fs::write(&extra, "brel\t30\tpos=noun|verb\ntor\t100\tpos=noun\n").unwrap();
    let rules = demo_rules();
    let (both, issues) = Lexicon::for_rules(&rules, &[extra.clone()], true, true).unwrap();
    assert!(issues.is_empty());
    assert!(both.get("brel").is_some() && both.get("sola").is_some());
    assert_eq!(both.entry(both.get("tor").unwrap()).frequency, 600.0);
    let (only, _) = Lexicon::for_rules(&rules, &[extra.clone()], false, true).unwrap();
    assert_eq!(only.len(), 2);
    // A tag value `noun|verb` satisfies `right.pos = noun` (the prefix rule).
    let r = Analyzer::new(&rules, &both).split("vebrel", 5);
    assert_eq!(r.analyses[0].parts_text(), "ve + brel");
    assert_eq!(r.analyses[0].junctions[0].rule, "prefix");
    // A missing file is an error naming it.
    let missing = dir.join("missing.tsv");
    let err = Lexicon::for_rules(&rules, &[missing], true, false).unwrap_err();
    assert!(err.to_string().contains("missing.tsv"), "{err}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn the_demo_lexicon_loads_cleanly() {
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    assert_eq!(lexicon.len(), 19, "20 lines, mora twice");
    assert!(lexicon.tag_keys().contains("role"));
    assert!(lexicon.total_frequency() >= 3030.0);
}
