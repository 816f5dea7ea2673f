//! Lexicons embedded in the binary, selectable by name.

use super::compiled::{self, IndexBytes};
use super::{Lexicon, LexiconBuilder, LexiconError};

/// Bundled lexicons shipped in compiled form: (name, rule-set it is built
/// for, sources in the repository, compiled bytes). The compiled files are
/// made by `scripts/build_compiled_lexicons.sh` (`juncture lexicon build`);
/// `tests/compiled_lexicons.rs` rebuilds them from the sources and fails
/// when one is stale. Loading one parses nothing.
///
/// The sources are TSV files, except for [`GENERATED`] lexicons: `sanskrit`
/// is generated from the paradigm tables and stem lists listed
/// ([`super::sanskrit::INPUTS`], the tables first), and the generated text,
/// as the file [`SANSKRIT_GENERATED_TSV`], is what is compiled.
pub const COMPILED: &[(&str, &str, &[&str], &[u8])] = &[
    (
        "german",
        "german",
        &["lexicons/german.tsv"],
        include_bytes!("../../lexicons/compiled/german.jlex"),
    ),
    (
        "dutch",
        "dutch",
        &["lexicons/dutch.tsv"],
        include_bytes!("../../lexicons/compiled/dutch.jlex"),
    ),
    (
        "swedish",
        "swedish",
        &["lexicons/swedish.tsv", "lexicons/swedish-closed-class.tsv"],
        include_bytes!("../../lexicons/compiled/swedish.jlex"),
    ),
    (
        "danish",
        "danish",
        &["lexicons/danish.tsv", "lexicons/danish-closed-class.tsv"],
        include_bytes!("../../lexicons/compiled/danish.jlex"),
    ),
    (
        "norwegian",
        "norwegian",
        &[
            "lexicons/norwegian.tsv",
            "lexicons/norwegian-closed-class.tsv",
        ],
        include_bytes!("../../lexicons/compiled/norwegian.jlex"),
    ),
    (
        SANSKRIT,
        "sanskrit",
        super::sanskrit::INPUTS,
        include_bytes!("../../lexicons/compiled/sanskrit.jlex"),
    ),
];

/// Compiled bundled lexicons whose sources are not TSV files but the inputs
/// of a generator (see [`COMPILED`]).
pub const GENERATED: &[&str] = &[SANSKRIT];

/// The file name under which `scripts/build_compiled_lexicons.sh` writes the
/// generated Sanskrit lexicon (`juncture lexicon expand -o DIR/NAME`) before
/// compiling it; the compiled file records it as its source.
pub const SANSKRIT_GENERATED_TSV: &str = "sanskrit-generated.tsv";

/// The compiled form of a bundled lexicon, if it ships one built with this
/// normalization (a variant that folds letters re-normalizes it instead).
pub fn compiled(name: &str, fingerprint: &str) -> Option<Lexicon> {
    let (_, _, _, bytes) = COMPILED.iter().find(|(n, _, _, _)| *n == name)?;
    compiled::load(
        &format!("bundled:{name}"),
        IndexBytes::embedded(bytes),
        Some(fingerprint),
    )
    .ok()
}

/// The TSV files of a bundled lexicon: (file name, text).
///
/// Special case: `sanskrit` is not a TSV file but generated from the
/// paradigm tables and stem lists in `lexicons/sanskrit/` (see
/// [`super::sanskrit`]); its one "file" is that generated text, made here on
/// first use (loading the lexicon uses the compiled form and generates
/// nothing).
pub fn sources(name: &str) -> Vec<(&'static str, &'static str)> {
    if name == SANSKRIT {
        return super::sanskrit::tsv()
            .map(|t| vec![(super::sanskrit::SOURCE_NAME, t)])
            .unwrap_or_default();
    }
    LEXICONS
        .iter()
        .filter(|(n, _, _)| *n == name)
        .map(|(_, f, t)| (*f, *t))
        .collect()
}

/// (name, TSV text) of every bundled lexicon file. A name may have several files.
const LEXICONS: &[(&str, &str, &str)] = &[(
    "demo",
    "lexicons/demo.tsv",
    include_str!("../../lexicons/demo.tsv"),
)];

/// The bundled lexicon generated from paradigm tables (see [`GENERATED`]).
const SANSKRIT: &str = "sanskrit";

/// Names of the bundled lexicons.
pub fn names() -> Vec<&'static str> {
    let mut v: Vec<&str> = LEXICONS.iter().map(|(n, _, _)| *n).collect();
    v.extend(COMPILED.iter().map(|(n, _, _, _)| *n));
    v.dedup();
    v
}

/// Adds the files of a bundled lexicon to a builder.
pub fn add_bundled(builder: &mut LexiconBuilder, name: &str) -> Result<(), LexiconError> {
    if let Some((_, _, _, bytes)) = COMPILED.iter().find(|(n, _, _, _)| *n == name) {
        let lexicon = compiled::load(
            &format!("bundled:{name}"),
            IndexBytes::embedded(bytes),
            None,
        )?;
        builder.add_lexicon(&lexicon);
        return Ok(());
    }
    let mut found = false;
    for (n, file, text) in LEXICONS {
        if *n == name {
            builder.add_tsv(&format!("bundled:{file}"), text.as_bytes())?;
            found = true;
        }
    }
    if found {
        Ok(())
    } else {
        Err(LexiconError::BadIndex {
            file: name.to_string(),
            message: format!(
                "no bundled lexicon named `{name}` (bundled: {})",
                names().join(", ")
            ),
        })
    }
}
