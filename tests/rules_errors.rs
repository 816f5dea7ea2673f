//! Rule-file errors: every malformed file under `tests/data/malformed/` is
//! rejected with the expected error codes, and its rendered diagnostics
//! (message, `file:line:column`, source line, caret, hint, related place) are
//! snapshotted. The CLI exits 2 and prints the same diagnostics on stderr.

mod common;

use juncture::rules::{compile, compile_named, CompileOptions, Diagnostics};

/// (file stem, error codes expected, in the order they are reported).
const MALFORMED: &[(&str, &[&str])] = &[
    ("syntax-in-rule", &["syntax"]),
    ("unknown-class", &["unknown-class", "unknown-class"]),
    ("correspondence-length", &["correspondence-length"]),
    ("duplicate-rule", &["duplicate-rule"]),
    ("duplicate-class", &["duplicate-class"]),
    ("circular-a", &["circular-include"]),
    ("cycle-parent", &["circular-include"]),
    ("unknown-include", &["unknown-include"]),
    ("two-boundaries", &["two-boundaries"]),
    ("merge-empty-side", &["merge-needs-both-sides"]),
    ("unknown-setting", &["unknown-setting"]),
    ("clause-outside-rule", &["clause-outside-rule"]),
    ("label-on-surface", &["label-on-surface"]),
    ("ambiguous-slot", &["ambiguous-slot", "ambiguous-slot"]),
    ("edge-wrong-side", &["edge-side"]),
    ("not-utf8", &["not-utf8"]),
    (
        "several-errors",
        &[
            "syntax",
            "unknown-setting",
            "duplicate-class",
            "correspondence-length",
            "unknown-class",
            "edge-side",
            "duplicate-rule",
        ],
    ),
];

fn path(stem: &str) -> String {
    format!("tests/data/malformed/{stem}.jr")
}

fn errors_of(stem: &str) -> Diagnostics {
    match compile_named(&path(stem), &CompileOptions::default()) {
        Ok(_) => panic!("{} compiled, but it is malformed", path(stem)),
        Err(d) => d,
    }
}

#[test]
fn every_malformed_file_is_listed_here() {
    let mut on_disk: Vec<String> = std::fs::read_dir("tests/data/malformed")
        .expect("tests/data/malformed exists")
        .filter_map(|e| {
            let name = e.ok()?.file_name().into_string().ok()?;
            name.strip_suffix(".jr").map(str::to_string)
        })
        .collect();
    on_disk.sort();
    // circular-b.jr is the other half of circular-a.jr.
    let mut listed: Vec<String> = MALFORMED.iter().map(|(s, _)| s.to_string()).collect();
    listed.push("circular-b".into());
    listed.sort();
    assert_eq!(on_disk, listed);
    assert!(MALFORMED.len() >= 12);
}

#[test]
fn malformed_files_give_the_expected_errors() {
    for (stem, codes) in MALFORMED {
        let d = errors_of(stem);
        let got: Vec<&str> = d.0.iter().map(|x| x.code).collect();
        assert_eq!(&got, codes, "error codes of {}", path(stem));
        assert_eq!(d.error_count(), codes.len(), "{}", path(stem));
        for diag in &d.0 {
            let loc = diag
                .location
                .as_ref()
                .unwrap_or_else(|| panic!("{}: `{}` has no location", path(stem), diag.code));
            assert!(loc.line >= 1 && loc.column >= 1 && loc.width >= 1);
            assert!(
                loc.file.starts_with("tests/data/malformed/"),
                "{}: location in {}",
                path(stem),
                loc.file
            );
        }
    }
}

/// The list of bundled rule files grows as languages are added; it is
/// checked on its own, and kept out of the snapshots.
fn redact_bundled_names(text: &str) -> String {
    const HINT: &str = "hint: bundled rule files: ";
    text.lines()
        .map(|line| match line.strip_prefix(HINT) {
            Some(names) => {
                assert!(names.split(", ").any(|n| n == "demo"), "{line}");
                format!("{HINT}[bundled names]")
            }
            None => line.to_string(),
        })
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn diagnostics_render_with_place_source_line_and_caret() {
    for (stem, _) in MALFORMED {
        let text = redact_bundled_names(&errors_of(stem).to_string());
        insta::assert_snapshot!(*stem, text);
    }
}

#[test]
fn duplicate_class_shows_both_places() {
    let d = errors_of("duplicate-class");
    let diag = &d.0[0];
    let (label, first) = diag
        .related
        .as_ref()
        .expect("the first definition is shown");
    assert_eq!(label, "first defined here");
    assert_eq!((first.line, first.column), (3, 7));
    let second = diag.location.as_ref().unwrap();
    assert_eq!((second.line, second.column), (5, 7));
}

#[test]
fn circular_include_names_the_chain() {
    let d = errors_of("circular-a");
    assert_eq!(
        d.0[0].message,
        "circular include: tests/data/malformed/circular-a.jr → \
         tests/data/malformed/circular-b.jr → tests/data/malformed/circular-a.jr"
    );
    // The same cycle through a path with `..` is found as well (not reported
    // as nesting too deep, nor as duplicate definitions).
    let d = errors_of("cycle-parent");
    assert_eq!(d.0.len(), 1, "{d}");
    assert!(
        d.0[0]
            .message
            .ends_with("→ tests/data/malformed/cycle-parent.jr"),
        "{}",
        d.0[0].message
    );
}

#[test]
fn a_file_included_through_two_paths_is_read_once() {
    let dir = std::env::temp_dir().join(format!("juncture-include-{}", std::process::id()));
    std::fs::create_dir_all(dir.join("sub")).unwrap();
    std::fs::write(dir.join("letters.jr"), "class vowel = a e i o u\n").unwrap();
    std::fs::write(dir.join("sub/more.jr"), "include \"../letters.jr\"\n").unwrap();
    let root = dir.join("root.jr");
    std::fs::write(
        &root,
        "language diamond\ninclude letters\ninclude \"sub/more.jr\"\n\
         rule link-n: [v:vowel] + [w:vowel] -> [v] n | [w]\n",
    )
    .unwrap();
    let result = compile_named(root.to_str().unwrap(), &CompileOptions::default());
    std::fs::remove_dir_all(&dir).ok();
    let set = result.unwrap_or_else(|d| panic!("{d}"));
    assert_eq!(set.classes.len(), 1);
    assert_eq!(set.instances.len(), 25);
}

#[test]
fn errors_in_text_compiled_from_memory_name_the_given_file() {
    let d = compile(
        "inline.jr",
        "language x\nrule r: [nope] + -> |\n",
        None,
        &CompileOptions::default(),
    )
    .unwrap_err();
    let text = d.to_string();
    assert!(text.contains(" --> inline.jr:2:9\n"), "{text}");
    assert!(text.contains("2 | rule r: [nope] + -> |\n"), "{text}");
    assert!(text.contains("  |         ^^^^^^\n"), "{text}");
    assert!(text.ends_with("1 error, 0 warnings"), "{text}");
}

#[test]
fn a_missing_rule_file_is_an_error_naming_the_bundled_sets() {
    let d = compile_named(
        "tests/data/malformed/no-such-file.jr",
        &CompileOptions::default(),
    )
    .unwrap_err();
    assert_eq!(d.0[0].code, "no-rule-set");
    let text = d.to_string();
    assert!(text.contains("no-such-file.jr"), "{text}");
    assert!(text.contains("demo"), "{text}");
}

#[test]
fn the_cli_exits_2_and_prints_the_diagnostics_on_stderr() {
    for (stem, codes) in MALFORMED {
        let file = path(stem);
        let out = common::run_args(&["split", "--rules", &file, "word"]);
        assert_eq!(common::code(&out), 2, "{file}");
        assert!(out.stdout.is_empty(), "{file}: stdout must stay clean");
        let err = common::stderr(&out);
        let library = errors_of(stem).to_string();
        assert!(
            err.contains(&library),
            "{file}: stderr differs from the library's diagnostics:\n{err}"
        );
        let first = errors_of(stem).0[0].location.clone().unwrap();
        let place = format!("--> {}:{}:{}", first.file, first.line, first.column);
        assert!(err.contains(&place), "{file}: no `{place}` in\n{err}");
        assert!(err.contains(&first.source_line), "{file}: no source line");
        let caret = format!(
            "| {}{}",
            " ".repeat(first.column - 1),
            "^".repeat(first.width)
        );
        assert!(err.contains(&caret), "{file}: no caret `{caret}` in\n{err}");
        assert!(err.contains(&format!("error[{}]", codes[0])), "{file}");
    }
}

/// A one-letter class member that the rule-set's folds turn into several
/// letters (`fold ß = ss`) makes those letters one segment everywhere: the
/// rule-set compiles, with a warning at the member saying so; a member that
/// stays one letter gives none.
#[test]
fn a_class_member_folded_to_several_letters_is_warned_about() {
    let text = "language x\nfold ß = ss\nclass c = a ß\nrule r \"r\": [x:c] + -> [x] |\n  cost 1\n";
    let set = compile("fold.jr", text, None, &CompileOptions::default()).expect("compiles");
    let codes: Vec<&str> = set.warnings.iter().map(|w| w.code).collect();
    assert_eq!(codes, ["class-member-folds"]);
    let at = set.warnings[0].location.clone().expect("a place");
    assert_eq!((at.line, at.column), (3, 13));
    assert!(set.warnings[0].to_string().contains("`ss`"));
    let plain = text.replace(" ß\n", " b\n");
    let set = compile("fold.jr", &plain, None, &CompileOptions::default()).expect("compiles");
    assert!(set.warnings.is_empty(), "{:?}", set.warnings);
}

#[test]
fn unknown_values_of_the_small_word_settings_are_errors_with_the_choices() {
    let d = compile(
        "inline.jr",
        "language x\nset verb-after-noun = sometimes\n",
        None,
        &CompileOptions::default(),
    )
    .unwrap_err();
    let text = d.to_string();
    assert!(
        text.contains("unknown value `sometimes` of `verb-after-noun`"),
        "{text}"
    );
    assert!(text.contains(" --> inline.jr:2:"), "{text}");
    assert!(text.contains("`always`, or `capitalised`"), "{text}");
}

#[test]
fn an_unknown_noun_head_value_is_an_error_with_the_choices() {
    let d = compile(
        "inline.jr",
        "language x\nset noun-head = never\n",
        None,
        &CompileOptions::default(),
    )
    .unwrap_err();
    let text = d.to_string();
    assert!(
        text.contains("unknown value `never` of `noun-head`"),
        "{text}"
    );
    assert!(text.contains("`always`, or `capitalised`"), "{text}");
}
