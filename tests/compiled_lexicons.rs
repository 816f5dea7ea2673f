//! The compiled lexicons embedded in the binary must be exactly what
//! `scripts/build_compiled_lexicons.sh` makes from the TSV sources today: a
//! stale one fails here with the command that rebuilds it.

use juncture::lexicon::{bundled, compiled, normalizer_fingerprint, Lexicon, LexiconBuilder};
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
        let fresh = builder.build().expect("lexicon builds").to_compiled(&names);
        assert!(
            fresh.as_slice() == *bytes,
            "lexicons/compiled/{name}.jlex is stale (sources or the `{rule_set}` rule-set's normalization changed): run scripts/build_compiled_lexicons.sh"
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
