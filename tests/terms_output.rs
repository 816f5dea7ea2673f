//! Index terms (`split --format terms`) and pass-through tokens, on the
//! German rule-set with a small lexicon written here (the invented
//! frequencies only set up the rankings the tests need).

use juncture::analyzer::{index_tokens, passthrough, Analyzer, Passthrough, TokenRecord};
use juncture::lexicon::{Lexicon, LexiconBuilder};
use juncture::output::{split_terms, terms, TermsOptions};
use juncture::rules::{compile_named, CompileOptions, RuleSet};
use std::process::Command;

const LEXICON: &str = "\
Arbeit\t80000\tpos=noun
Amt\t30000\tpos=noun
Arbeitsamt\t2000\tpos=noun
Schule\t90000\tpos=noun
Kind\t100000\tpos=noun
Stau\t30000\tpos=noun
Becken\t20000\tpos=noun
Staub\t25000\tpos=noun
Ecken\t20000\tpos=noun
Zimmer\t50000\tpos=noun
Wohnung\t40000\tpos=noun
";

fn rules() -> RuleSet {
    compile_named("german", &CompileOptions::default()).expect("the German rule-set compiles")
}

fn lexicon(rules: &RuleSet) -> Lexicon {
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv("test.tsv", LEXICON.as_bytes()).unwrap();
    b.build().unwrap()
}

fn token(word: &str, o: &TermsOptions) -> Vec<String> {
    let rules = rules();
    let lexicon = lexicon(&rules);
    let analyzer = Analyzer::new(&rules, &lexicon);
    terms(&analyzer.split_token(word, 5, 80), o)
}

#[test]
fn terms_are_the_token_then_the_lexicon_forms_of_its_parts() {
    let o = TermsOptions::default();
    assert_eq!(token("Arbeitsamt", &o), ["Arbeitsamt", "Arbeit", "Amt"]);
    // The elided -e is restored: the part's lexicon form, not its surface.
    assert_eq!(token("Schulkind", &o), ["Schulkind", "Schule", "Kind"]);
}

#[test]
fn options_lowercase_no_original_min_length() {
    let o = TermsOptions {
        lowercase: true,
        keep_original: false,
        min_term_length: 4,
        ..TermsOptions::default()
    };
    assert_eq!(token("Arbeitsamt", &o), ["arbeit"]);
    // A token that is not split is its own term even without the original.
    assert_eq!(token("Arbeit", &o), ["arbeit"]);
}

#[test]
fn ambiguous_compounds_keep_every_close_reading_unless_best_only() {
    let all = token("Staubecken", &TermsOptions::default());
    for t in ["Staubecken", "Stau", "Becken", "Staub", "Ecken"] {
        assert!(all.contains(&t.to_string()), "{t} missing from {all:?}");
    }
    let best = token(
        "Staubecken",
        &TermsOptions {
            best_only: true,
            ..TermsOptions::default()
        },
    );
    assert_eq!(best.len(), 3, "{best:?}");
}

#[test]
fn pass_through_reasons() {
    let cases = [
        ("2024", Some(Passthrough::Number)),
        ("-3,5", Some(Passthrough::Number)),
        ("1.000.000", Some(Passthrough::Number)),
        ("50%", Some(Passthrough::Number)),
        ("https://example.org/a?b=c", Some(Passthrough::Url)),
        ("www.example.de", Some(Passthrough::Url)),
        ("name.surname@example.de", Some(Passthrough::Email)),
        // Latin W and tter around a Cyrillic е (U+0435).
        ("W\u{435}tter", Some(Passthrough::MixedScript)),
        ("Arbeitsamt", None),
        ("3-Zimmer-Wohnung", None),
        ("US-Präsident", None),
        ("Ölsardine", None),
        ("1.", None),
        ("a@b", None),
    ];
    for (t, want) in cases {
        assert_eq!(passthrough(t, 80), want, "{t}");
    }
    assert_eq!(passthrough(&"a".repeat(81), 80), Some(Passthrough::TooLong));
    assert_eq!(passthrough(&"a".repeat(80), 80), None);
}

#[test]
fn passed_through_token_is_its_own_term_and_says_why_in_json() {
    let rules = rules();
    let lexicon = lexicon(&rules);
    let analyzer = Analyzer::new(&rules, &lexicon);
    let r: TokenRecord = analyzer.split_token("info@example.de", 5, 80);
    assert!(!r.is_failure());
    assert_eq!(
        split_terms(&r, &TermsOptions::default()),
        "info@example.de\tinfo@example.de\n"
    );
    let json = serde_json::to_value(&r).unwrap();
    assert_eq!(json["passthrough"], "email");
    assert_eq!(json["analyses"].as_array().unwrap().len(), 0);
    let plain = serde_json::to_value(analyzer.split_token("Arbeitsamt", 5, 80)).unwrap();
    assert!(plain.get("passthrough").is_none());
}

#[test]
fn tokens_of_running_text_lose_surrounding_punctuation() {
    assert_eq!(
        index_tokens("„Arbeitsamt“, (siehe www.example.de) 3-Zimmer-Wohnung."),
        ["Arbeitsamt", "siehe", "www.example.de", "3-Zimmer-Wohnung"]
    );
}

#[test]
fn cli_terms_one_line_per_token() {
    let dir = std::env::temp_dir().join(format!("juncture-terms-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let lex = dir.join("lex.tsv");
    std::fs::write(&lex, LEXICON).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(["split", "--no-default-lexicon", "--lexicon"])
        .arg(&lex)
        .args(["--format", "terms", "--lowercase", "--best-only"])
        .arg("Arbeitsamt 2024, info@example.de")
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert_eq!(
        String::from_utf8(out.stdout).unwrap(),
        "Arbeitsamt\tarbeitsamt arbeit amt\n2024\t2024\ninfo@example.de\tinfo@example.de\n"
    );
    let out = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(["split", "--no-default-lexicon", "--lexicon"])
        .arg(&lex)
        .args(["--format", "jsonl", "--passthrough", "https://example.org"])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["passthrough"], "url");
    let _ = std::fs::remove_dir_all(&dir);
}

/// Lexicon entries with `lemma` tags, as the bundled German lexicon writes
/// them (invented frequencies).
const LEMMA_LEXICON: &str = "\
Hühner\t6000\tpos=noun;lemma=Huhn
Ei\t20000\tpos=noun
sprach\t50000\tpos=verb;lemma=sprechen;inflected=yes
Sprache\t90000\tpos=noun
Kurs\t30000\tpos=noun
";

/// The German rule-set's record of `word` with only the lexicon `tsv`.
fn record_with(tsv: &str, word: &str) -> TokenRecord {
    let rules = rules();
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv("test.tsv", tsv.as_bytes()).unwrap();
    let lexicon = b.build().unwrap();
    Analyzer::new(&rules, &lexicon).split_token(word, 5, 80)
}

fn lemma_token(word: &str, o: &TermsOptions) -> (Vec<String>, TokenRecord) {
    let record = record_with(LEMMA_LEXICON, word);
    (terms(&record, o), record)
}

#[test]
fn terms_give_the_lemma_of_an_inflected_part_unless_asked_for_forms() {
    let (t, record) = lemma_token("Hühnerei", &TermsOptions::default());
    assert_eq!(t, ["Hühnerei", "Huhn", "Ei"]);
    let best = &record.record.analyses[0];
    assert_eq!(best.parts[0].lemmas(), ["Huhn"]);
    assert_eq!(best.parts[1].lemmas(), ["Ei"]);
    let forms = TermsOptions {
        lemmas: false,
        ..TermsOptions::default()
    };
    assert_eq!(
        lemma_token("Hühnerei", &forms).0,
        ["Hühnerei", "Hühner", "Ei"]
    );
}

#[test]
fn a_finite_verb_form_is_not_a_compound_member() {
    // `sprach` (past tense of sprechen) is in the lexicon, more frequent
    // here than the right reading's Sprache; the German rule-set still
    // reads Sprache with its final -e elided.
    let (t, _) = lemma_token("Sprachkurs", &TermsOptions::default());
    assert_eq!(t, ["Sprachkurs", "Sprache", "Kurs"]);
}

/// `set shadowed-linking = off` in the German rule-set: a linking element is
/// not read where the first part written with it is a word of its own
/// (invented frequencies; Ei is the more frequent word here).
const SHADOW_LEXICON: &str = "\
Ei\t40000\tpos=noun
Eis\t15000\tpos=noun
Berg\t30000\tpos=noun
Kind\t60000\tpos=noun
Kinder\t5000\tpos=noun;lemma=Kind
Buch\t40000\tpos=noun
";

fn best_forms(word: &str) -> Vec<String> {
    let record = record_with(SHADOW_LEXICON, word);
    let best = &record.record.analyses[0];
    best.parts.iter().map(|p| p.form.clone()).collect()
}

#[test]
fn a_linking_element_is_not_read_where_a_word_of_its_own_is_written() {
    assert!(!rules().settings.shadowed_linking);
    // Eis is a noun of its own: not Ei + s + Berg.
    assert_eq!(best_forms("Eisberg"), ["Eis", "Berg"]);
    // Kinder is a form of Kind (its lemma): Kind + er + Buch stands.
    assert_eq!(best_forms("Kinderbuch"), ["Kind", "Buch"]);
}
