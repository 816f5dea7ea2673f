//! Joining parts forward in the demo language (Velmish, invented): every
//! surface the rules allow, cheapest first, with the rule used at each
//! junction; snapshotted as text and JSON, through the library and the CLI.

mod common;

use common::{demo_lexicon, demo_rules};
use juncture::lattice::ScopeFilter;
use juncture::output;
use juncture::proof::{self, JoinResult};

const PART_SETS: &[&str] = &[
    "sola+avi",
    "kale+om",
    "ketap+ura",
    "tala+iso",
    "tam+ora",
    "dal+lon",
    "ve+tor",
    "tor+mek",
    "eth+ano",
    "sola + avi + tor",
    "tor",
    "tor+ve",
];

fn join_all(scope: ScopeFilter) -> Vec<JoinResult> {
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    PART_SETS
        .iter()
        .map(|set| {
            let parts: Vec<&str> = set.split('+').collect();
            proof::join(&rules, &lexicon, &parts, scope, 100)
        })
        .collect()
}

#[test]
fn every_embedded_example_is_among_the_joins_of_its_parts() {
    let rules = demo_rules();
    let lexicon = demo_lexicon(&rules);
    for ex in &rules.examples {
        let parts: Vec<&str> = ex.parts.iter().map(String::as_str).collect();
        let r = proof::join(&rules, &lexicon, &parts, ScopeFilter::Any, 100);
        let hit = r.results.iter().find(|j| j.surface == ex.surface);
        let hit = hit.unwrap_or_else(|| {
            panic!(
                "{} does not join to {}: {:?}",
                ex.parts.join(" + "),
                ex.surface,
                r.results.iter().map(|j| &j.surface).collect::<Vec<_>>()
            )
        });
        if let Some(rule) = ex.rule {
            let name = &rules.rules[rule].name;
            assert!(
                hit.junctions.iter().any(|s| &s.rule == name),
                "{} is not made by rule {name}",
                ex.surface
            );
        }
    }
}

#[test]
fn joins_are_cheapest_first_and_each_applies_forward() {
    let rules = demo_rules();
    for (set, r) in PART_SETS.iter().zip(join_all(ScopeFilter::Any)) {
        assert_eq!(r.count, r.results.len(), "{set}");
        assert!(!r.truncated);
        let words: Vec<String> = set
            .split('+')
            .map(|p| rules.normalizer.normalize(p.trim()))
            .collect();
        for w in r.results.windows(2) {
            assert!(w[0].cost <= w[1].cost, "{set}");
        }
        for (i, j) in r.results.iter().enumerate() {
            assert_eq!(j.rank, i + 1);
            let instances: Vec<usize> = j.junctions.iter().map(|s| s.instance).collect();
            assert_eq!(
                proof::apply(&rules, &words, &instances).as_deref(),
                Ok(j.surface.as_str())
            );
            let cost: f64 = j.junctions.iter().map(|s| s.cost).sum();
            assert!((cost - j.cost).abs() < 1e-9);
        }
    }
}

#[test]
fn conditions_and_edges_limit_the_joins() {
    let results = join_all(ScopeFilter::Any);
    let surfaces = |set: &str| -> Vec<String> {
        let i = PART_SETS.iter().position(|s| *s == set).unwrap();
        results[i]
            .results
            .iter()
            .map(|j| j.surface.clone())
            .collect()
    };
    // `prefix` needs a first-only left word; `join` refuses one.
    let vetor = &results[PART_SETS.iter().position(|s| *s == "ve+tor").unwrap()];
    let rules: Vec<&str> = vetor
        .results
        .iter()
        .filter(|j| j.surface == "vetor")
        .map(|j| j.junctions[0].rule.as_str())
        .collect();
    assert_eq!(rules, vec!["prefix"]);
    // `ve` may not end an input (edge end when left.role != first).
    assert!(surfaces("tor+ve").is_empty());
    // `geminate` needs a short left word: tam is short.
    assert!(surfaces("tam+ora").contains(&"tammora".to_string()));
    // A single part joins to itself.
    assert_eq!(surfaces("tor"), vec!["tor".to_string()]);
}

#[test]
fn scope_compound_leaves_out_phrase_junctions() {
    for r in join_all(ScopeFilter::Compound) {
        for j in &r.results {
            assert!(!j.surface.contains(' '), "{}", j.surface);
            assert!(j.junctions.iter().all(|s| s.rule != "space"));
        }
    }
    let phrase = join_all(ScopeFilter::Phrase);
    let eth = &phrase[PART_SETS.iter().position(|s| *s == "eth+ano").unwrap()];
    let surfaces: Vec<&str> = eth.results.iter().map(|j| j.surface.as_str()).collect();
    assert!(surfaces.contains(&"ed ano") && surfaces.contains(&"edano"));
    assert!(!surfaces.contains(&"ethano"), "join is `in compound`");
}

#[test]
fn text_output_of_the_library() {
    let text: String = join_all(ScopeFilter::Any)
        .iter()
        .map(output::join_text)
        .collect();
    insta::assert_snapshot!("join_text", text);
}

#[test]
fn json_output_of_the_library() {
    insta::assert_json_snapshot!("join_json", join_all(ScopeFilter::Any));
}

#[test]
fn cli_output_equals_the_library() {
    let mut args = vec!["join", "--rules", "demo"];
    args.extend(PART_SETS);
    let out = common::run_args(&args);
    // `tor+ve` cannot be joined: exit 1, still reported.
    assert_eq!(common::code(&out), 1, "{}", common::stderr(&out));
    let library: String = join_all(ScopeFilter::Any)
        .iter()
        .map(output::join_text)
        .collect();
    assert_eq!(common::stdout(&out), library);

    args.extend(["--format", "jsonl"]);
    let out = common::run_args(&args);
    let text = common::stdout(&out);
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), PART_SETS.len());
    for (line, r) in lines.iter().zip(join_all(ScopeFilter::Any)) {
        let v: serde_json::Value = serde_json::from_str(line).unwrap();
        assert_eq!(v, serde_json::to_value(&r).unwrap());
    }
    insta::assert_snapshot!("cli_join_jsonl", text);
}
