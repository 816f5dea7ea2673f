//! `juncture check`: compiler errors pass through, each lint fires on a rule
//! file written to trigger it (and only there), examples are checked in both
//! directions, and every bundled rule-set is clean.

use juncture::check::{check_named, codes, CheckOptions, CheckReport};
use juncture::rules::bundled;
use std::path::PathBuf;
use std::process::Command;

/// Writes a rule file (and optional lexicon) into its own temp directory.
fn write(name: &str, rules: &str, lexicon: Option<&str>) -> (PathBuf, Option<PathBuf>) {
    let dir = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join(format!("check-{name}"));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join(format!("{name}.jr"));
    std::fs::write(&path, rules).unwrap();
    let lex = lexicon.map(|text| {
        let p = dir.join(format!("{name}.tsv"));
        std::fs::write(&p, text).unwrap();
        p
    });
    (path, lex)
}

fn check(path: &std::path::Path, lexicon: Option<PathBuf>) -> CheckReport {
    let options = CheckOptions {
        lexicons: lexicon.into_iter().collect(),
        ..CheckOptions::default()
    };
    check_named(path.to_str().unwrap(), &options).unwrap()
}

fn codes_of(report: &CheckReport) -> Vec<&'static str> {
    report.diagnostics.iter().map(|d| d.code).collect()
}

/// A Velmish rule file (the invented demo language) with one extra line.
fn velmish(extra: &str) -> String {
    format!(
        "language velmish-test\ncase fold\ninclude demo-letters\nset lexicon = demo\nset min-part-length = 2\n\
         rule join: + -> |\n  cost 0\n  example tor + mek -> tormek\n{extra}\n"
    )
}

#[test]
fn every_bundled_rule_set_checks_clean() {
    let mut dirty = Vec::new();
    for name in bundled::rule_set_names() {
        match check_named(name, &CheckOptions::default()) {
            Ok(report) if report.errors + report.warnings == 0 => {}
            Ok(report) => dirty.push(report.to_text()),
            Err(e) => dirty.push(format!("{name}: {e}")),
        }
    }
    assert!(
        dirty.is_empty(),
        "bundled rule-sets with diagnostics:\n{}",
        dirty.join("\n")
    );
}

#[test]
fn the_demo_checks_every_example_both_ways() {
    let report = check_named("demo", &CheckOptions::default()).unwrap();
    assert_eq!(report.examples, 13);
    assert_eq!(report.lexicon_entries, Some(19));
    assert_eq!(
        report.summary(),
        "demo: 0 errors, 0 warnings (11 rules, 13 examples checked, lexicon of 19 entries)"
    );
}

#[test]
fn compile_errors_come_out_as_the_compiler_renders_them() {
    let (path, _) = write("broken", "language x\nrule r: [nope] + -> |\n", None);
    let report = check(&path, None);
    assert_eq!(report.errors, 1);
    let text = report.to_text();
    assert!(text.contains("error[unknown-class]"), "{text}");
    assert!(text.contains("broken.jr:2:9"), "{text}");
    assert!(text.contains("2 | rule r: [nope] + -> |"), "{text}");
    assert!(text.contains("^^^^^^"), "{text}");
    assert!(text.ends_with("0 warnings\n"), "{text}");
}

#[test]
fn an_unused_class_is_reported_where_it_is_defined() {
    let (path, _) = write("unused", &velmish("class spare = x y"), None);
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::UNUSED_CLASS]);
    let loc = report.diagnostics[0].location.as_ref().unwrap();
    assert_eq!((loc.line, loc.column, loc.width), (9, 7, 5));
    // Classes of the included demo-letters file are a library: not reported,
    // though this file uses none of `liquid`'s members directly.
}

#[test]
fn a_correspondence_onto_itself_is_reported() {
    let extra = "class stop2 = p t k b d g\nclass voiced2 = b d g b d g\n\
                 rule voicing: [x:stop2] + [vowel] -> [x>voiced2] | [vowel]\n  example ketap + ura -> ketabura";
    let (path, _) = write("identity", &velmish(extra), None);
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::IDENTITY_CORRESPONDENCE]);
    let d = &report.diagnostics[0];
    assert!(
        d.message.contains("maps `b`, `d`, `g` onto itself"),
        "{}",
        d.message
    );
    assert_eq!(d.location.as_ref().unwrap().column, 38);
}

#[test]
fn a_condition_on_a_tag_no_entry_has_never_holds() {
    let extra = "rule link-s: + -> s |\n  when left.poss = noun\nrule link-z: + -> z |\n  when right.pos = nonu";
    let (path, _) = write("tags", &velmish(extra), None);
    let report = check(&path, None);
    assert_eq!(
        codes_of(&report),
        vec![codes::CONDITION_NEVER_HOLDS, codes::CONDITION_NEVER_HOLDS]
    );
    assert!(report.diagnostics[0]
        .message
        .contains("no lexicon entry has a tag `poss`"));
    assert!(report.diagnostics[1]
        .message
        .contains("no lexicon entry has `pos` = nonu (values in the lexicon: `noun`, `prefix`, `pron`, `verb`)"));
    let loc = report.diagnostics[0].location.as_ref().unwrap();
    assert_eq!((loc.line, loc.column), (10, 8));
}

#[test]
fn lexicon_lints_need_a_lexicon() {
    let text = "language t\nrule r: + -> s |\n  when left.poss = noun\n";
    let (path, _) = write("nolex", text, None);
    assert!(check(&path, None).diagnostics.is_empty());
    let (path, lex) = write("withlex", text, Some("tor\t1\tpos=noun\n"));
    assert_eq!(
        codes_of(&check(&path, lex)),
        vec![codes::CONDITION_NEVER_HOLDS]
    );
}

#[test]
fn a_rule_whose_left_end_no_word_has_never_fires() {
    let (path, _) = write(
        "never",
        &velmish("rule q-drop: q + [vowel] -> | [vowel]"),
        None,
    );
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::RULE_NEVER_FIRES]);
    assert!(report.diagnostics[0]
        .message
        .contains("rule `q-drop` can never fire: no lexicon word ends with `q`"));
}

#[test]
fn a_rule_whose_junctions_another_covers_is_shadowed() {
    // `join-v` is `join` restricted to a vowel before the boundary: the same
    // junctions, so every analysis through it is found twice.
    let (path, _) = write(
        "shadow",
        &velmish("rule join-v: [vowel] + -> [vowel] |\n  cost 0.2"),
        None,
    );
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::SHADOWED_RULE]);
    let d = &report.diagnostics[0];
    assert!(
        d.message
            .starts_with("rule `join-v` is shadowed by rule `join`"),
        "{}",
        d.message
    );
    assert_eq!(d.related.as_ref().unwrap().1.line, 6);
}

#[test]
fn a_stronger_condition_on_the_other_rule_is_not_shadowing() {
    let (path, _) = write(
        "noshadow",
        &velmish("rule join-n: + -> |\n  cost 0.2\n  when left.pos = noun"),
        None,
    );
    // `join` (no condition) covers `join-n` (a condition): join-n is shadowed;
    // the reverse is not reported.
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::SHADOWED_RULE]);
    assert!(report.diagnostics[0]
        .message
        .starts_with("rule `join-n` is shadowed by rule `join`"));
}

#[test]
fn an_example_that_does_not_join_says_what_the_rules_give() {
    let extra = "rule geminate: [n:nasal] + [vowel] -> [n] [n] | [vowel]\n  when left.length = short\n  example tor + ora -> torrora";
    let (path, _) = write("badjoin", &velmish(extra), None);
    let report = check(&path, None);
    let d = report
        .diagnostics
        .iter()
        .find(|d| d.code == codes::EXAMPLE_JOIN)
        .unwrap();
    assert_eq!(
        d.message,
        "`tor + ora` does not join to `torrora`; the rules give torora (join)"
    );
    assert!(d
        .hint
        .as_deref()
        .unwrap()
        .contains("does not apply to `tor` + `ora`: `tor` does not end with any of `m`, `n`"));
    assert_eq!(d.location.as_ref().unwrap().column, 24);
}

#[test]
fn an_example_through_the_wrong_rule_is_reported_with_the_failing_condition() {
    let extra = "rule geminate: [n:nasal] + [vowel] -> [n] [n] | [vowel]\n  when left.length = long\n  example tam + ora -> tammora";
    let (path, _) = write("cond", &velmish(extra), None);
    let report = check(&path, None);
    let join = report
        .diagnostics
        .iter()
        .find(|d| d.code == codes::EXAMPLE_JOIN)
        .unwrap();
    assert!(join.hint.as_deref().unwrap().contains(
        "its condition `left.length = long` does not hold for `tam` (its tags: length=short;pos=noun)"
    ), "{:?}", join.hint);
}

#[test]
fn an_example_part_missing_from_the_lexicon_fails_the_split_direction() {
    let (path, _) = write("missing", &velmish("  example zork + ora -> zorkora"), None);
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::EXAMPLE_SPLIT]);
    let d = &report.diagnostics[0];
    assert_eq!(
        d.message,
        "`zorkora` cannot split into `zork + ora`: the part `zork` is not in the lexicon"
    );
    let loc = d.location.as_ref().unwrap();
    assert_eq!((loc.column, loc.width), (11, 4));
}

#[test]
fn without_a_lexicon_examples_are_joined_only_and_that_is_said_once() {
    let text =
        "language t\nrule link: + -> s |\n  example ab + cd -> abscd\n  example ef + gh -> efsgh\n";
    let (path, _) = write("joinonly", text, None);
    let report = check(&path, None);
    assert_eq!(codes_of(&report), vec![codes::NO_LEXICON]);
    assert!(report.diagnostics[0]
        .message
        .starts_with("2 examples could not be checked"));
}

fn juncture(args: &[&str]) -> (i32, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_juncture"))
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
    )
}

#[test]
fn exit_status_is_two_on_errors_and_zero_on_warnings() {
    let (bad, _) = write("exit-bad", "language x\nrule r: [nope] + -> |\n", None);
    let (warn, _) = write("exit-warn", &velmish("class spare = x"), None);
    assert_eq!(juncture(&["check", bad.to_str().unwrap()]).0, 2);
    let (code, text) = juncture(&["check", warn.to_str().unwrap()]);
    assert_eq!(code, 0);
    assert!(text.contains("warning[unused-class]"));
    assert!(text
        .trim_end()
        .ends_with("0 errors, 1 warning (1 rule, 1 example checked, lexicon of 19 entries)"));
    assert_eq!(juncture(&["check", "demo"]).0, 0);
}

#[test]
fn json_format_lists_the_diagnostics() {
    let (warn, _) = write("json", &velmish("class spare = x"), None);
    let (code, text) = juncture(&["check", warn.to_str().unwrap(), "--format", "json"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(v["warnings"], 1);
    assert_eq!(v["diagnostics"][0]["code"], "unused-class");
    assert_eq!(v["diagnostics"][0]["severity"], "warning");
    assert_eq!(v["diagnostics"][0]["location"]["line"], 9);
}
