//! Splitting the demo language (Velmish, invented; `rule-sets/demo.jr`): one
//! word for every rule, checked by hand-written expectations, snapshotted as
//! text and as JSON, through the library and through the CLI. The JSON shape
//! is the one the design brief promises.

mod common;

use common::{demo_lexicon, demo_rules, DEMO_WORDS};
use juncture::analyzer::{Analyzer, SplitRecord};
use juncture::output;
use serde_json::Value;

fn split_all(top: usize) -> Vec<SplitRecord> {
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    let analyzer = Analyzer::new(&rules, &lexicon);
    DEMO_WORDS.iter().map(|w| analyzer.split(w, top)).collect()
}

/// (input, count, best analysis's parts, its rules).
const EXPECTED: &[(&str, u32, &str, &str)] = &[
    ("solanavi", 1, "sola + avi", "link-n"),
    ("kalom", 1, "kale + om", "elide-e"),
    ("ketabura", 1, "ketap + ura", "voicing"),
    ("taleso", 1, "tala + iso", "merge-ai"),
    ("tammora", 2, "tam + ora", "geminate"),
    ("dalon", 1, "dal + lon", "degeminate"),
    ("vetor", 1, "ve + tor", "prefix"),
    ("tor-12", 1, "tor + 12", "hyphen"),
    ("tor mek", 1, "tor + mek", "space"),
    ("ed ano", 1, "eth + ano", "th-voicing"),
    ("edano", 1, "eth + ano", "th-voicing"),
    ("solanavitor", 1, "sola + avi + tor", "link-n,join"),
    ("tormek", 2, "tormek", ""),
    ("ve", 0, "", ""),
];

#[test]
fn each_demo_word_gets_the_expected_best_analysis() {
    let records = split_all(5);
    assert_eq!(records.len(), EXPECTED.len());
    for (r, (input, count, parts, rules)) in records.iter().zip(EXPECTED) {
        assert_eq!(&r.input, input);
        assert_eq!(r.count.0, (*count).into(), "count of {input}");
        assert!(!r.truncated, "{input}");
        assert!(r.error.is_none(), "{input}");
        assert_eq!(r.analyses.len() as u32, *count, "{input}");
        match r.analyses.first() {
            None => assert!(parts.is_empty(), "{input} has no analysis"),
            Some(best) => {
                assert_eq!(best.parts_text(), *parts, "{input}");
                let used: Vec<&str> = best.junctions.iter().map(|j| j.rule.as_str()).collect();
                assert_eq!(used.join(","), *rules, "{input}");
            }
        }
    }
}

#[test]
fn parts_and_junctions_locate_themselves_in_the_input() {
    let rules = demo_rules();
    for r in split_all(5) {
        let chars: Vec<char> = r.input.chars().collect();
        for a in &r.analyses {
            juncture::proof::verify(&rules, a, &r.input).expect("every analysis verifies");
            for p in &a.parts {
                let text: String = chars[p.start..p.end].iter().collect();
                assert_eq!(text, p.surface, "{}: part {}", r.input, p.form);
            }
            for j in &a.junctions {
                let end = j.at + j.surface.chars().count();
                let text: String = chars[j.at..end].iter().collect();
                assert_eq!(text, j.surface, "{}: junction {}", r.input, j.rule);
            }
        }
    }
}

#[test]
fn offsets_of_the_changed_junctions() {
    let records = split_all(5);
    let find = |w: &str| records.iter().find(|r| r.input == w).unwrap();
    let spans = |w: &str| -> Vec<(String, String, usize, usize)> {
        find(w).analyses[0]
            .parts
            .iter()
            .map(|p| (p.form.clone(), p.surface.clone(), p.start, p.end))
            .collect()
    };
    let s = |f: &str, x: &str, a: usize, b: usize| (f.to_string(), x.to_string(), a, b);
    // The linking n belongs to the left part's stretch of the input.
    assert_eq!(
        spans("solanavi"),
        vec![s("sola", "solan", 0, 5), s("avi", "avi", 5, 8)]
    );
    // Elision: the left part's stretch lacks its final e.
    assert_eq!(
        spans("kalom"),
        vec![s("kale", "kal", 0, 3), s("om", "om", 3, 5)]
    );
    // A merged vowel belongs to both parts.
    assert_eq!(
        spans("taleso"),
        vec![s("tala", "tale", 0, 4), s("iso", "eso", 3, 6)]
    );
    // Across a printed space.
    assert_eq!(
        spans("ed ano"),
        vec![s("eth", "ed", 0, 2), s("ano", "ano", 3, 6)]
    );
    let j = &find("ed ano").analyses[0].junctions[0];
    assert_eq!((j.surface.as_str(), j.at), ("d a", 1));
    // An open-class part (pattern) after a hyphen.
    let tor12 = &find("tor-12").analyses[0];
    assert_eq!(tor12.parts[1].source, "pattern:number");
    assert_eq!(tor12.parts[1].tags.get("pos"), Some("number"));
}

#[test]
fn ranking_prefers_the_unsplit_word_and_cheaper_rules() {
    let records = split_all(5);
    for r in &records {
        for w in r.analyses.windows(2) {
            assert!(w[0].score >= w[1].score, "{}", r.input);
        }
    }
    let tormek = records.iter().find(|r| r.input == "tormek").unwrap();
    assert_eq!(tormek.analyses[0].parts.len(), 1, "the whole word competes");
    assert_eq!(tormek.analyses[1].parts_text(), "tor + mek");
}

#[test]
fn a_smaller_top_lists_fewer_and_says_so() {
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    let analyzer = Analyzer::new(&rules, &lexicon);
    let r = analyzer.split("tammora", 1);
    assert_eq!(r.count.0, 2u32.into());
    assert_eq!(r.analyses.len(), 1);
    assert!(r.truncated);
    let text = output::split_text(&r);
    assert!(text.starts_with("tammora: 2 analyses (1 shown; "), "{text}");
}

#[test]
fn every_embedded_example_splits_back_into_its_parts() {
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    let analyzer = Analyzer::new(&rules, &lexicon);
    assert!(rules.examples.len() >= 12);
    for ex in &rules.examples {
        let r = analyzer.split(&ex.surface, 1000);
        let wanted = ex.parts.join(" + ");
        let found = r.analyses.iter().any(|a| {
            a.parts_text() == wanted
                && ex.rule.map_or(true, |i| {
                    a.junctions.iter().any(|j| j.rule == rules.rules[i].name)
                })
        });
        assert!(
            found,
            "example {wanted} -> {} is not split back",
            ex.surface
        );
    }
}

#[test]
fn text_output_of_the_library() {
    let text: String = split_all(5).iter().map(output::split_text).collect();
    insta::assert_snapshot!("split_text", text);
}

#[test]
fn json_output_of_the_library() {
    let records = split_all(5);
    insta::assert_json_snapshot!("split_json", records);
}

fn assert_keys(v: &Value, required: &[&str], optional: &[&str], what: &str) {
    let obj = v
        .as_object()
        .unwrap_or_else(|| panic!("{what} is not an object: {v}"));
    for k in required {
        assert!(obj.contains_key(*k), "{what} lacks `{k}`: {v}");
    }
    for k in obj.keys() {
        assert!(
            required.contains(&k.as_str()) || optional.contains(&k.as_str()),
            "{what} has an undocumented key `{k}`"
        );
    }
}

/// The shape promised in the design brief (`--format jsonl`), plus the
/// documented extra keys (`reason`, `error`, `source`, `readings`,
/// `boundary`, `scope`, `cost`).
fn assert_brief_shape(record: &Value) {
    assert_keys(
        record,
        &["input", "count", "truncated", "analyses"],
        &["reason", "error"],
        "record",
    );
    assert!(record["input"].is_string());
    assert!(record["count"].is_u64() || record["count"].is_string());
    assert!(record["truncated"].is_boolean());
    for a in record["analyses"].as_array().expect("analyses is an array") {
        assert_keys(a, &["rank", "score", "parts", "junctions"], &[], "analysis");
        assert!(a["rank"].is_u64());
        assert!(a["score"].is_number());
        let parts = a["parts"].as_array().expect("parts is an array");
        let junctions = a["junctions"].as_array().expect("junctions is an array");
        assert_eq!(junctions.len() + 1, parts.len());
        for p in parts {
            assert_keys(
                p,
                &["form", "surface", "start", "end", "tags"],
                &["source", "readings"],
                "part",
            );
            assert!(p["form"].is_string() && p["surface"].is_string());
            assert!(p["start"].is_u64() && p["end"].is_u64());
            let tags = p["tags"].as_object().expect("tags is an object");
            assert!(tags.values().all(Value::is_string));
        }
        for j in junctions {
            assert_keys(
                j,
                &["rule", "left", "right", "surface", "at"],
                &["boundary", "scope", "cost"],
                "junction",
            );
            for k in ["rule", "left", "right", "surface"] {
                assert!(j[k].is_string(), "junction {k}");
            }
            assert!(j["at"].is_u64());
        }
    }
}

#[test]
fn json_shape_is_the_one_of_the_design_brief() {
    for r in split_all(5) {
        let v = serde_json::to_value(&r).unwrap();
        assert_brief_shape(&v);
    }
}

fn cli_split(format: &str) -> String {
    let mut args = vec!["split", "--rules", "demo", "--format", format];
    args.extend(DEMO_WORDS);
    let out = common::run_args(&args);
    // `ve` has no analysis: exit 1, still reported.
    assert_eq!(common::code(&out), 1, "{}", common::stderr(&out));
    common::stdout(&out)
}

#[test]
fn cli_text_output_equals_the_library() {
    let text = cli_split("text");
    let library: String = split_all(5).iter().map(output::split_text).collect();
    assert_eq!(text, library);
    insta::assert_snapshot!("cli_split_text", text);
}

#[test]
fn cli_jsonl_output_is_one_record_per_word_equal_to_the_library() {
    let text = cli_split("jsonl");
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), DEMO_WORDS.len());
    let library = split_all(5);
    for ((line, word), record) in lines.iter().zip(DEMO_WORDS).zip(&library) {
        let v: Value = serde_json::from_str(line).expect("each line is one JSON object");
        assert_brief_shape(&v);
        assert_eq!(v["input"], *word);
        assert_eq!(v, serde_json::to_value(record).unwrap());
    }
    insta::assert_snapshot!("cli_split_jsonl", text);
}
