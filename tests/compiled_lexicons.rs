//! The compiled lexicons embedded in the binary must be exactly what
//! `scripts/build_compiled_lexicons.sh` makes from the sources today (TSV
//! files; for Sanskrit, the paradigm tables and stem lists run through the
//! generator): a stale one fails here with the command that rebuilds it.

use juncture::lexicon::{
    bundled, compiled, normalizer_fingerprint, sanskrit, Lexicon, LexiconBuilder,
};
use juncture::rules::{compile_named, CompileOptions};
use std::path::Path;

#[test]
fn embedded_compiled_lexicons_are_up_to_date() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    for (name, rule_set, sources, bytes) in bundled::COMPILED {
        let rules =
            compile_named(rule_set, &CompileOptions::default()).expect("bundled rule-set compiles");
        let mut builder = LexiconBuilder::new(&rules.normalizer);
        let mut names = Vec::new();
        let generated = bundled::GENERATED.contains(name);
        if generated {
            // What the script does: `juncture lexicon expand` (the generator,
            // on the inputs as they are on disk now), then `lexicon build`.
            assert_eq!(*name, "sanskrit", "only the Sanskrit generator exists");
            let text = generate_sanskrit(root, sources);
            builder
                .add_tsv(bundled::SANSKRIT_GENERATED_TSV, text.as_bytes())
                .expect("generated TSV reads");
            names.push(bundled::SANSKRIT_GENERATED_TSV.to_string());
        } else {
            for s in *sources {
                builder
                    .add_tsv_file(&root.join(s))
                    .expect("source TSV reads");
                names.push(
                    Path::new(s)
                        .file_name()
                        .unwrap()
                        .to_string_lossy()
                        .into_owned(),
                );
            }
        }
        let fresh = builder.build().expect("lexicon builds").to_compiled(&names);
        let changed = if generated {
            "its sources, the generator in src/lexicon/sanskrit.rs"
        } else {
            "its sources"
        };
        assert!(
            fresh.as_slice() == *bytes,
            "lexicons/compiled/{name}.jlex is stale ({changed} or the `{rule_set}` rule-set's normalization changed): run scripts/build_compiled_lexicons.sh"
        );
    }
}

/// The generated Sanskrit lexicon from the inputs on disk (paradigm tables
/// first, then stem files).
fn generate_sanskrit(root: &Path, inputs: &[&str]) -> String {
    let read = |s: &str| std::fs::read_to_string(root.join(s)).expect("generator input reads");
    let tables = read(inputs[0]);
    let files: Vec<(&str, String)> = inputs[1..].iter().map(|s| (*s, read(s))).collect();
    let files: Vec<(&str, &str)> = files.iter().map(|(n, t)| (*n, t.as_str())).collect();
    sanskrit::expand(&tables, &files).expect("the Sanskrit generator runs")
}

#[test]
fn generated_sanskrit_inputs_are_the_embedded_ones() {
    // The generator the binary runs (`lexicon expand`) reads embedded copies
    // of the files the staleness test reads from disk.
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let (_, _, inputs, _) = bundled::COMPILED
        .iter()
        .find(|(n, _, _, _)| *n == "sanskrit")
        .expect("sanskrit is compiled");
    assert_eq!(
        generate_sanskrit(root, inputs),
        sanskrit::tsv().expect("the Sanskrit generator runs")
    );
}

#[test]
fn bundled_sanskrit_loads_compiled_and_matches_the_generator() {
    let rules = compile_named("sanskrit", &CompileOptions::default()).unwrap();
    let (fast, issues) = Lexicon::for_rules(&rules, &[], true, true).unwrap();
    assert!(issues.is_empty());
    assert_eq!(
        fast.fingerprint(),
        normalizer_fingerprint(&rules.normalizer)
    );
    let mut b = LexiconBuilder::new(&rules.normalizer).strict(true);
    b.add_tsv("generated", sanskrit::tsv().unwrap().as_bytes())
        .unwrap();
    let slow = b.build().unwrap();
    assert_eq!(fast.len(), slow.len());
    for i in 0..slow.len() {
        let (a, b) = (fast.entry(i), slow.entry(i));
        assert_eq!(
            (&a.key, &a.form, &a.readings, a.frequency),
            (&b.key, &b.form, &b.readings, b.frequency)
        );
    }
}

#[test]
fn bundled_default_loads_compiled_and_matches_the_tsv() {
    let rules = compile_named("german", &CompileOptions::default()).unwrap();
    let (fast, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    assert_eq!(
        fast.fingerprint(),
        normalizer_fingerprint(&rules.normalizer)
    );
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv_file(&Path::new(env!("CARGO_MANIFEST_DIR")).join("lexicons/german.tsv"))
        .unwrap();
    let slow = b.build().unwrap();
    assert_eq!(fast.len(), slow.len());
    for key in ["arbeit", "amt", "wetter", "bericht", "schule"] {
        let (a, b) = (
            fast.get(key).map(|i| fast.entry(i)),
            slow.get(key).map(|i| slow.entry(i)),
        );
        let (a, b) = (a.expect(key), b.expect(key));
        assert_eq!(
            (&a.key, &a.form, &a.readings),
            (&b.key, &b.form, &b.readings)
        );
        assert!((a.frequency - b.frequency).abs() <= b.frequency * 1e-6);
    }
    assert!(compiled::is_compiled(bundled::COMPILED[0].3));
}
