//! `juncture induce`: rules induced from examples that the demo rule-set
//! (Velmish, an invented language) generates compile, pass `check`, and
//! reproduce every example they claim; most demo rules are recovered.

use juncture::check::{check_named, CheckOptions};
use juncture::induce::{align_all, induce, InduceOptions, Induction};
use juncture::lattice::ScopeFilter;
use juncture::lexicon::Lexicon;
use juncture::proof;
use juncture::rules::{compile, compile_named, CompileOptions};
use std::collections::{BTreeMap, BTreeSet};
use std::path::PathBuf;

/// A small deterministic generator (no external randomness: the test is stable).
struct Lcg(u64);
impl Lcg {
    fn next(&mut self, n: usize) -> usize {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((self.0 >> 33) as usize) % n.max(1)
    }
}

/// Joins random pairs of demo words with the demo rules; each line is
/// `a+b<TAB>surface`, with the demo rule that made it.
fn generate(count: usize, seed: u64) -> Vec<(String, String)> {
    let rules = compile_named("demo", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    let words: Vec<String> = lexicon.entries().map(|e| e.form.clone()).collect();
    let mut rng = Lcg(seed);
    let mut out = Vec::new();
    let mut seen = BTreeSet::new();
    let mut tries = 0;
    while out.len() < count && tries < count * 50 {
        tries += 1;
        let (a, b) = (&words[rng.next(words.len())], &words[rng.next(words.len())]);
        let joined = proof::join(&rules, &lexicon, &[a, b], ScopeFilter::Any, 100);
        if joined.results.is_empty() {
            continue;
        }
        // Prefer the rules that change something, so each is seen often enough.
        let special: Vec<&proof::Joined> = joined.results.iter().filter(|j| j.cost > 0.0).collect();
        let pick = if !special.is_empty() && rng.next(10) < 7 {
            special[rng.next(special.len())]
        } else {
            &joined.results[rng.next(joined.results.len())]
        };
        let line = format!("{a}+{b}\t{}", pick.surface);
        if seen.insert(line.clone()) {
            out.push((line, pick.junctions[0].rule.clone()));
        }
    }
    out
}

fn demo_induction(lines: &[(String, String)]) -> Induction {
    let text: String = lines.iter().map(|(l, _)| format!("{l}\n")).collect();
    let options = InduceOptions {
        include: Some("demo-letters".into()),
        ..InduceOptions::default()
    };
    induce(&text, &options).unwrap()
}

fn write(name: &str, text: &str) -> PathBuf {
    let dir = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join("induce");
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

#[test]
fn induced_rules_compile_pass_check_and_reproduce_their_examples() {
    let lines = generate(300, 7);
    let induction = demo_induction(&lines);
    assert!(
        induction.unexplained.is_empty(),
        "{:?}",
        induction.unexplained
    );
    // It compiles.
    let set = compile("induced", &induction.text, None, &CompileOptions::default())
        .unwrap_or_else(|d| panic!("{d}\n{}", induction.text));
    // It passes check, examples both ways, with the demo lexicon.
    let path = write("induced.jr", &induction.text);
    let report = check_named(
        path.to_str().unwrap(),
        &CheckOptions {
            lexicons: vec![PathBuf::from("lexicons/demo.tsv")],
            ..CheckOptions::default()
        },
    )
    .unwrap();
    assert_eq!(
        report.errors + report.warnings,
        0,
        "{}\n{}",
        report.to_text(),
        induction.text
    );
    // Every example a rule claims joins to its surface through that rule.
    let by_line: BTreeMap<usize, &String> = lines
        .iter()
        .enumerate()
        .map(|(i, (l, _))| (i + 1, l))
        .collect();
    let empty = Lexicon::empty();
    for rule in &induction.rules {
        assert!(!rule.examples.is_empty());
        for line in &rule.examples {
            let (parts, surface) = by_line[line].split_once('\t').unwrap();
            let parts: Vec<&str> = parts.split('+').collect();
            let joined = proof::join(&set, &empty, &parts, ScopeFilter::Any, 10_000);
            assert!(
                joined.results.iter().any(
                    |j| j.surface == surface && j.junctions.iter().any(|s| s.rule == rule.name)
                ),
                "rule {} claims line {line} ({}) but does not reproduce it",
                rule.name,
                by_line[line]
            );
        }
    }
}

#[test]
fn most_demo_rules_are_recovered() {
    let lines = generate(300, 11);
    let induction = demo_induction(&lines);
    // Lines made by each demo rule, and the induced rules claiming them.
    let mut made: BTreeMap<String, BTreeSet<usize>> = BTreeMap::new();
    for (i, (_, rule)) in lines.iter().enumerate() {
        made.entry(rule.clone()).or_default().insert(i + 1);
    }
    let mut table = String::new();
    let mut recovered = BTreeSet::new();
    for (demo_rule, demo_lines) in &made {
        let claimed: Vec<(&str, usize)> = induction
            .rules
            .iter()
            .map(|r| {
                (
                    r.name.as_str(),
                    r.examples.iter().filter(|l| demo_lines.contains(l)).count(),
                )
            })
            .filter(|(_, n)| *n > 0)
            .collect();
        let whole = claimed.iter().find(|(_, n)| *n == demo_lines.len());
        if let Some((name, _)) = whole {
            recovered.insert(demo_rule.clone());
            let change = induction.rules.iter().find(|r| r.name == *name).unwrap();
            table.push_str(&format!(
                "{demo_rule:<12} {:>3} examples → {name}: {}\n",
                demo_lines.len(),
                change.change
            ));
        } else {
            table.push_str(&format!(
                "{demo_rule:<12} {:>3} examples → split over {claimed:?}\n",
                demo_lines.len()
            ));
        }
    }
    eprintln!("{table}");
    // prefix has the same junctions as join (only its conditions differ, and
    // conditions are not induced); th-voicing's `_?` gives two rules, one per spelling.
    for expected in [
        "voicing",
        "elide-e",
        "merge-ai",
        "link-n",
        "degeminate",
        "space",
        "hyphen",
    ] {
        assert!(
            recovered.contains(expected),
            "{expected} not recovered:\n{table}"
        );
    }
    let voicing = induction
        .rules
        .iter()
        .find(|r| r.change.contains("[x>voiced]"))
        .unwrap();
    assert_eq!(
        voicing.change,
        "[x:voiceless] + [r:vowel] -> [x>voiced] | [r]"
    );
    let link = induction.rules.iter().find(|r| r.name == "link-n").unwrap();
    assert_eq!(link.change, "[a:vowel] + [b:vowel] -> [a] n | [b]");
}

#[test]
fn a_correspondence_without_included_classes_gets_generated_ones() {
    let text = "ketap+ura\tketabura\nlot+om\tlodom\nrak+ano\tragano\n";
    let induction = induce(text, &InduceOptions::default()).unwrap();
    assert_eq!(induction.rules.len(), 1);
    let r = &induction.rules[0];
    // Only vowels follow in these examples, but they are every right start
    // seen, so no restriction is observed and no context slot is written.
    assert_eq!(r.change, "[x:c1] + -> [x>c2] |");
    assert!(induction
        .text
        .contains("class c1 = k p t\nclass c2 = g b d\n"));
    assert!(induction
        .text
        .contains("# explains 3 examples (3 junctions)\n"));
    assert_eq!(r.examples, vec![1, 2, 3]);
}

#[test]
fn unexplained_examples_are_listed_with_the_reason() {
    let text = "tor+mek\ttormek\nbroken line\nkale+om\tkalom\nsola+avi\tsolanavi\n";
    let options = InduceOptions {
        min_examples: 2,
        ..InduceOptions::default()
    };
    let induction = induce(text, &options).unwrap();
    let lines: Vec<usize> = induction.unexplained.iter().map(|u| u.line).collect();
    assert_eq!(lines, vec![1, 2, 3, 4]);
    assert!(induction.unexplained[1]
        .reason
        .contains("part+part<TAB>surface"));
    assert!(induction.text.contains("# Unexplained examples (4):"));
    compile("t", &induction.text, None, &CompileOptions::default()).unwrap();
}

#[test]
fn alignment_of_several_parts_puts_each_change_at_its_junction() {
    let seg = |s: &str| s.chars().map(|c| c.to_string()).collect::<Vec<_>>();
    // ketap+ura+tala+iso → ketaburataleso: voicing at the first junction, a
    // merger at the last; the middle one is plain.
    let parts = vec![seg("ketap"), seg("ura"), seg("tala"), seg("iso")];
    let spans = align_all(&parts, &seg("ketaburataleso")).unwrap();
    let kept: Vec<(usize, usize, usize)> = spans.iter().map(|s| (s.from, s.to, s.at)).collect();
    assert_eq!(kept, vec![(0, 4, 0), (0, 3, 5), (0, 3, 8), (1, 3, 12)]);
}

mod never_panics {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig { cases: 64, .. ProptestConfig::default() })]
        /// Any examples file: rules that compile, and no panic.
        #[test]
        fn on_any_examples(lines in proptest::collection::vec("[a-eptkn +-]{0,6}\\+[a-eptkn+]{0,6}\t[a-eptkn -]{0,10}", 0..12)) {
            let text = lines.join("\n");
            let induction = induce(&text, &InduceOptions::default()).unwrap();
            prop_assert!(compile("t", &induction.text, None, &CompileOptions::default()).is_ok(), "{}", induction.text);
        }
    }
}

#[test]
fn a_hyphen_read_as_a_part_gives_rules_that_compile() {
    // A hyphen between two parts cannot be a class member: the context it
    // stands in is left unrestricted.
    let induction = induce("n+-+k\tn-nk\n", &InduceOptions::default()).unwrap();
    assert!(
        !induction.text.contains("class c1 = -"),
        "{}",
        induction.text
    );
    compile("t", &induction.text, None, &CompileOptions::default()).unwrap();
}
