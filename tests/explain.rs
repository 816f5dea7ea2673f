//! `juncture explain`: the lattice walk, the score breakdown, and every kind
//! of why-not finding, on Velmish (the invented demo language).

use juncture::analyzer::Analyzer;
use juncture::explain::{explain, ExplainOptions, Explanation, Finding};
use juncture::lexicon::Lexicon;
use juncture::rules::{compile_named, CompileOptions, RuleSet};

fn demo() -> (RuleSet, Lexicon) {
    let rules = compile_named("demo", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    (rules, lexicon)
}

fn run(analyzer: &Analyzer, word: &str, expect: &str) -> Explanation {
    let parts: Vec<String> = expect.split('+').map(str::to_string).collect();
    explain(analyzer, word, Some(&parts), &ExplainOptions::default())
}

/// Every ranked analysis's terms, bonuses included, add up to its score,
/// and so does the breakdown's total.
fn assert_breakdowns_add_up(word: &str, e: &Explanation) {
    for r in &e.ranked {
        let b = &r.breakdown;
        let sum: f64 = b
            .parts
            .iter()
            .map(|p| p.frequency_term + p.part_cost + p.lexicalised_bonus + p.first_member_bonus)
            .sum::<f64>()
            + b.junctions
                .iter()
                .map(|j| j.rule_cost + j.split_cost)
                .sum::<f64>();
        assert!(
            (sum - r.analysis.score).abs() < 1e-3 && (b.total - r.analysis.score).abs() < 1e-3,
            "{word}: {sum} / {} vs {}",
            b.total,
            r.analysis.score
        );
    }
}

fn findings(e: &Explanation) -> &[Finding] {
    &e.expected.as_ref().unwrap().findings
}

#[test]
fn the_lattice_lists_the_words_read_at_each_position() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = explain(&analyzer, "tammora", None, &ExplainOptions::default());
    assert_eq!(e.count.to_string(), "2");
    let at0 = &e.nodes[0];
    assert_eq!(at0.pos, 0);
    let steps: Vec<(String, Option<String>, String)> = at0
        .words
        .iter()
        .map(|w| {
            (
                w.form.clone(),
                w.then.as_ref().map(|j| j.rule.clone()),
                w.paths.to_string(),
            )
        })
        .collect();
    assert!(steps.contains(&("tam".into(), Some("geminate".into()), "1".into())));
    assert!(steps.contains(&("tam".into(), Some("join".into()), "1".into())));
    // degeminate (m + m → |m) is reached but leads nowhere: a dead end.
    assert!(steps.contains(&("tam".into(), Some("degeminate".into()), "0".into())));
    let gem = at0
        .words
        .iter()
        .find(|w| w.then.as_ref().is_some_and(|j| j.rule == "geminate"))
        .unwrap();
    assert!(gem.best);
    assert_eq!((gem.start, gem.end, gem.left_end.as_str()), (0, 2, "m"));
    let j = gem.then.as_ref().unwrap();
    assert_eq!((j.surface.as_str(), j.at, j.to, j.next), ("mm|o", 2, 5, 5));
    // The word after the geminate junction carries its `o` in.
    let carried = e.nodes.iter().find(|n| n.carried == "o").unwrap();
    assert_eq!(carried.pos, 5);
    assert_eq!(carried.words[0].form, "ora");
    // Junctions whose surface is in the input but that no word reached.
    assert!(e.unused.iter().any(|u| u.rule == "elide-e" && u.at == 1));
}

#[test]
fn the_score_breakdown_adds_up_to_the_score() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    for word in ["tammora", "solanavitor", "ketabura", "ed ano", "tor-12"] {
        let e = explain(&analyzer, word, None, &ExplainOptions::default());
        assert!(!e.ranked.is_empty(), "{word}");
        assert_breakdowns_add_up(word, &e);
        for r in &e.ranked {
            assert_eq!(r.breakdown.parts.len(), r.analysis.parts.len());
            assert_eq!(
                r.breakdown.parts[0].part_cost, -2.0,
                "demo sets part-cost = 2"
            );
        }
    }
}

/// With the German bonuses: a lexicalised word (Hochzeit) and a name kept
/// whole (Freiburg) show their bonus, and every breakdown adds up to the
/// score, also for parts shown with a capital the index does not have.
#[test]
fn the_german_breakdown_counts_the_bonuses() {
    let rules = compile_named("german", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    let analyzer = Analyzer::new(&rules, &lexicon);
    for word in ["Hochzeit", "Freiburg", "Hochzeitstag", "Arbeitsamt"] {
        let e = explain(&analyzer, word, None, &ExplainOptions::default());
        assert!(!e.ranked.is_empty(), "{word}");
        assert_breakdowns_add_up(word, &e);
        if word == "Hochzeit" || word == "Freiburg" {
            assert_eq!(e.ranked[0].analysis.parts.len(), 1, "{word}");
            assert_eq!(
                e.ranked[0].breakdown.parts[0].lexicalised_bonus, 6.0,
                "{word}"
            );
        }
    }
}

#[test]
fn why_not_a_part_missing_from_the_lexicon() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = run(&analyzer, "Tormok", "Tor+Mok");
    assert_eq!(
        findings(&e),
        &[Finding::MissingPart {
            part: "Mok".into(),
            normalized: "mok".into(),
            similar: vec!["mek".into()],
        }]
    );
    assert_eq!(
        findings(&e)[0].describe(),
        "the part `Mok` (normalized `mok`) is not in the lexicon; similar entries: `mek`"
    );
}

#[test]
fn why_not_no_rule_produces_the_surface_at_the_junction() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = run(&analyzer, "ketavura", "ketap+ura");
    let [Finding::NoRule {
        junction,
        change,
        at,
        would_give,
        rules_matching,
        ..
    }] = findings(&e)
    else {
        panic!("{:?}", findings(&e));
    };
    assert_eq!(*junction, 0);
    assert_eq!(change, &("p".to_string(), String::new(), "v".to_string()));
    assert_eq!(*at, 4);
    assert_eq!(rules_matching, &["voicing".to_string()]);
    assert!(would_give.contains(&("voicing".into(), "ketabura".into())));
    assert!(would_give.contains(&("join".into(), "ketapura".into())));
}

#[test]
fn why_not_finds_the_first_junction_that_fails() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    // `m` where link-n writes `n`: the first junction, not the second.
    let e = run(&analyzer, "solamavitor", "sola+avi+tor");
    let [Finding::NoRule {
        junction,
        change,
        at,
        ..
    }] = findings(&e)
    else {
        panic!("{:?}", findings(&e));
    };
    assert_eq!(*junction, 0);
    assert_eq!(change, &(String::new(), String::new(), "m".to_string()));
    assert_eq!(*at, 4);
    let e = run(&analyzer, "solanavitxr", "sola+avi+tor");
    assert!(
        matches!(findings(&e), [Finding::NoRule { junction: 1, .. }]),
        "{:?}",
        findings(&e)
    );
}

#[test]
fn why_not_a_condition_rejects_the_part() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    // `ve` is a first-member-only prefix: `join` refuses it on the left, and
    // `prefix` wants a noun on the right (`ano` is a verb).
    let e = run(&analyzer, "veano", "ve+ano");
    let f = findings(&e);
    assert_eq!(f.len(), 1, "{f:?}");
    let Finding::Condition {
        rule,
        condition,
        word,
        tags,
        ..
    } = &f[0]
    else {
        panic!("{f:?}")
    };
    assert!(
        (rule == "join" && condition == "left.role != first" && word == "ve")
            || (rule == "prefix" && condition == "right.pos = noun" && word == "ano"),
        "{f:?}"
    );
    assert!(tags.starts_with("tags: pos="), "{tags}");
}

#[test]
fn why_not_an_edge_condition_rejects_the_last_part() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = run(&analyzer, "torve", "tor+ve");
    assert_eq!(
        findings(&e),
        &[Finding::Edge {
            edge: "end".into(),
            condition: "left.role != first".into(),
            word: "ve".into(),
            tags: "tags: pos=prefix;role=first".into(),
        }]
    );
}

#[test]
fn why_not_the_limits_cut_it() {
    let (rules, lexicon) = demo();
    let mut analyzer = Analyzer::new(&rules, &lexicon);
    analyzer.search.max_parts = 2;
    let e = run(&analyzer, "solanavitor", "sola+avi+tor");
    assert_eq!(findings(&e), &[Finding::MaxParts { parts: 3, max: 2 }]);
    let mut analyzer = Analyzer::new(&rules, &lexicon);
    analyzer.lattice.min_part_length = Some(4);
    let e = run(&analyzer, "tormek", "tor+mek");
    assert_eq!(
        findings(&e)[0],
        Finding::MinPartLength {
            part: "tor".into(),
            length: 3,
            min: 4
        }
    );
}

#[test]
fn why_not_it_is_found_but_outranked_and_by_how_much() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = run(&analyzer, "tammora", "tam+mora");
    assert_eq!(e.expected.as_ref().unwrap().rank, Some(2));
    let [Finding::Outranked {
        rank,
        best,
        by,
        breakdown,
        best_breakdown,
        ..
    }] = findings(&e)
    else {
        panic!("{:?}", findings(&e));
    };
    assert_eq!(*rank, Some(2));
    assert_eq!(best, "tam + ora");
    assert!((by - (best_breakdown.total - breakdown.total)).abs() < 1e-3);
    assert!(*by > 0.0);
    assert_eq!(breakdown.junctions[0].rule, "join");
    assert_eq!(best_breakdown.junctions[0].rule, "geminate");
}

#[test]
fn the_best_analysis_has_no_findings() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = run(&analyzer, "ketabura", "ketap+ura");
    assert!(findings(&e).is_empty());
    assert_eq!(e.expected.as_ref().unwrap().rank, Some(1));
    assert!(e.to_text().contains("it is the best analysis (rank 1)"));
}

#[test]
fn dot_output_is_a_digraph_with_the_best_path_marked() {
    let (rules, lexicon) = demo();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let dot = juncture::explain::to_dot(&analyzer, "tammora");
    assert!(dot.starts_with("digraph lattice {"));
    assert!(dot.trim_end().ends_with('}'));
    assert_eq!(dot.matches("penwidth=2.5").count(), 3, "{dot}"); // tam, geminate, ora
    assert!(dot.contains("label=\"geminate mm|o\""));
}

#[test]
fn the_cli_explains_with_and_without_expect() {
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args([
            "explain", "--rules", "demo", "tammora", "--expect", "tam+mora",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.starts_with("tammora: 2 analyses\n"), "{text}");
    assert!(text.contains("found at rank 2 with score -12.0031, outranked by `tam + ora` (score -11.8198) by 0.1833"), "{text}");
}

mod never_panics {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig { cases: 64, .. ProptestConfig::default() })]
        /// Any input and any expected analysis: an explanation, a picture, no panic.
        #[test]
        fn on_any_input(word in "[a-zA-Z ́ -+]{0,14}", expect in "[a-z+]{0,12}") {
            let (rules, lexicon) = demo();
            let analyzer = Analyzer::new(&rules, &lexicon);
            let parts: Vec<String> = expect.split('+').map(str::to_string).collect();
            let e = explain(&analyzer, &word, Some(&parts), &ExplainOptions::default());
            let _ = e.to_text();
            let svg = juncture::render_svg::render(&e);
            prop_assert!(svg.ends_with("</svg>\n"));
            let _ = juncture::explain::to_dot(&analyzer, &word);
        }
    }
}

/// With the German rules, a verb written small that is read as noun +
/// verb, or an adjective with a noun head, is refused by the small-word
/// settings, and explain says so (and nothing else).
#[test]
fn why_not_a_small_word_is_no_noun() {
    let rules = compile_named("german", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    let analyzer = Analyzer::new(&rules, &lexicon);
    for (word, expect) in [("zugelassen", "Zug+lassen"), ("dramatisch", "Drama+Tisch")] {
        let e = run(&analyzer, word, expect);
        assert_eq!(
            findings(&e),
            &[Finding::SmallWord {
                word: word.to_string()
            }],
            "{word}"
        );
    }
    // Capitalised, the head must be a noun.
    let e = run(&analyzer, "Einkommensteuer", "Einkommen+teuer");
    assert_eq!(
        findings(&e),
        &[Finding::CapitalisedHead {
            head: "teuer".to_string()
        }]
    );
    // Capitalised (at the start of a sentence), an adjective still has no
    // noun head.
    let e = run(&analyzer, "Dramatisch", "Drama+Tisch");
    assert!(
        findings(&e)
            .iter()
            .any(|f| matches!(f, Finding::SmallWord { .. })),
        "{:?}",
        findings(&e)
    );
    // Capitalised, a noun may come before the verb of a nominalised
    // infinitive: no finding of this kind.
    let e = run(&analyzer, "Staubsaugen", "Staub+Saugen");
    assert!(
        !findings(&e)
            .iter()
            .any(|f| matches!(f, Finding::SmallWord { .. })),
        "{:?}",
        findings(&e)
    );
}
