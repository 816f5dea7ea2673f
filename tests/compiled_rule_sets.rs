//! The compiled rule-sets embedded in the binary must be exactly what
//! `scripts/build_compiled_rule_sets.sh` makes from the rule files today: a
//! stale one fails here with the command that rebuilds it. Loading one must
//! give the same rule-set as compiling its text.

use juncture::analyzer::Analyzer;
use juncture::lexicon::Lexicon;
use juncture::rules::{bundled, compile_from_text, compile_named, compiled, CompileOptions};

#[test]
fn embedded_compiled_rule_sets_are_up_to_date() {
    for (name, bytes) in bundled::COMPILED {
        let fresh = compile_from_text(name, &CompileOptions::default())
            .unwrap_or_else(|e| panic!("bundled rule-set {name} compiles: {e}"));
        assert!(
            compiled::to_bytes(&fresh).as_slice() == *bytes,
            "rule-sets/compiled/{name}.jrc is stale (its rule file or the compiler changed): run scripts/build_compiled_rule_sets.sh"
        );
        assert!(
            bundled::compiled_rule_set(name).is_some(),
            "the embedded {name} rule-set is not used"
        );
    }
}

#[test]
fn every_standalone_bundled_rule_set_has_a_compiled_form() {
    for name in bundled::rule_set_names() {
        assert!(
            bundled::COMPILED.iter().any(|(n, _)| *n == name),
            "{name} has no compiled form in COMPILED (src/rules/bundled.rs)"
        );
    }
}

#[test]
fn the_compiled_form_analyses_as_the_text_does() {
    for name in ["german", "sanskrit", "dutch"] {
        let from_text = compile_from_text(name, &CompileOptions::default()).unwrap();
        let loaded = compile_named(name, &CompileOptions::default()).unwrap();
        assert_eq!(loaded.instances, from_text.instances);
        assert_eq!(loaded.settings, from_text.settings);
        let (lexicon, _) = Lexicon::for_rules(&loaded, &[], true, false).unwrap();
        let words: &[&str] = match name {
            "german" => &[
                "Arbeitsamt",
                "Zeitungs-Artikel",
                "Wetterbericht",
                "Schifffahrt",
            ],
            "sanskrit" => &["tan na", "devendraḥ", "rāmo 'pi"],
            _ => &["stadsmuur", "boekenkast"],
        };
        let show = |rules: &juncture::rules::RuleSet| -> Vec<String> {
            let analyzer = Analyzer::new(rules, &lexicon);
            words
                .iter()
                .map(|w| format!("{:?}", analyzer.split(w, 10)))
                .collect()
        };
        assert_eq!(show(&loaded), show(&from_text), "{name}");
    }
}

#[test]
fn a_built_file_loads_by_path_and_a_damaged_one_is_refused() {
    let dir = std::env::temp_dir().join(format!("juncture-jrc-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("demo.jrc");
    let set = compile_from_text("demo", &CompileOptions::default()).unwrap();
    std::fs::write(&path, compiled::to_bytes(&set)).unwrap();
    let loaded = compile_named(path.to_str().unwrap(), &CompileOptions::default()).unwrap();
    assert_eq!(loaded.instances, set.instances);
    assert_eq!(loaded.name, path.to_str().unwrap());

    let variant = CompileOptions {
        variants: vec!["x".into()],
    };
    let e = compile_named(path.to_str().unwrap(), &variant).unwrap_err();
    assert!(
        e.to_string()
            .contains("variants were chosen when it was built"),
        "{e}"
    );

    let mut bytes = compiled::to_bytes(&set);
    let last = bytes.len() - 1;
    bytes[last] ^= 1;
    std::fs::write(&path, &bytes).unwrap();
    let e = compile_named(path.to_str().unwrap(), &CompileOptions::default())
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("damaged") && e.contains("juncture rules build"),
        "{e}"
    );
    std::fs::remove_dir_all(&dir).ok();
}

mod common;

#[test]
fn rules_build_writes_a_file_split_reads_like_the_rule_file() {
    let dir = std::env::temp_dir().join(format!("juncture-rules-build-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("demo.jrc");
    let out_s = out.to_str().unwrap();
    let built = common::run(&["rules", "build", "rule-sets/demo.jr", "-o", out_s], b"");
    assert_eq!(built.status.code(), Some(0), "{built:?}");
    let said = String::from_utf8_lossy(&built.stderr);
    assert!(said.contains("11 rules, 83 instances"), "{said}");

    let input = b"tormek\nsolavi\nketaptala\n";
    let from_text = common::run(
        &["split", "--rules", "rule-sets/demo.jr", "--format", "tsv"],
        input,
    );
    let from_file = common::run(&["split", "--rules", out_s, "--format", "tsv"], input);
    assert_eq!(from_file.status.code(), from_text.status.code());
    assert_eq!(from_file.stdout, from_text.stdout);
    assert!(!from_file.stdout.is_empty());

    // A compiled file is not a rule file to build from.
    let again = common::run(&["rules", "build", out_s, "-o", out_s], b"");
    assert_eq!(again.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&again.stderr).contains("compiled rule-set already"));

    // A file of another format or damaged: exit 2 with the rebuild command.
    std::fs::write(&out, b"JUNCRUL\0\x09\x00\x00\x00").unwrap();
    let bad = common::run(&["split", "--rules", out_s, "x"], b"");
    assert_eq!(bad.status.code(), Some(2));
    let said = String::from_utf8_lossy(&bad.stderr);
    assert!(said.contains("juncture rules build"), "{said}");
    std::fs::remove_dir_all(&dir).ok();
}
