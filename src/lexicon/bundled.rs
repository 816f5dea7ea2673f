//! Lexicons embedded in the binary, selectable by name.

use super::compiled::{self, IndexBytes};
use super::{Lexicon, LexiconBuilder, LexiconError};

/// (name, compiled lexicon) for bundled lexicons that ship a compiled index,
/// built by `juncture lexicon build` from the TSV files below (a test checks
/// that each is up to date). Loading one parses nothing.
const COMPILED: &[(&str, &[u8])] = &[];

/// The compiled form of a bundled lexicon, if it ships one built with this
/// normalization (a variant that folds letters needs the TSV instead).
pub fn compiled(name: &str, fingerprint: &str) -> Option<Lexicon> {
    let (_, bytes) = COMPILED.iter().find(|(n, _)| *n == name)?;
    compiled::load(
        &format!("bundled:{name}"),
        IndexBytes::embedded(bytes),
        fingerprint,
    )
    .ok()
}

/// The TSV files of a bundled lexicon: (file name, text).
///
/// Special case: `sanskrit` is not a TSV file but generated, on first use,
/// from the paradigm tables and stem lists in `lexicons/sanskrit/` (see
/// [`super::sanskrit`]); its one "file" is that generated text.
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
const LEXICONS: &[(&str, &str, &str)] = &[
    (
        "demo",
        "lexicons/demo.tsv",
        include_str!("../../lexicons/demo.tsv"),
    ),
    (
        "dutch",
        "lexicons/dutch.tsv",
        include_str!("../../lexicons/dutch.tsv"),
    ),
    (
        "swedish",
        "lexicons/swedish.tsv",
        include_str!("../../lexicons/swedish.tsv"),
    ),
    (
        "swedish",
        "lexicons/swedish-closed-class.tsv",
        include_str!("../../lexicons/swedish-closed-class.tsv"),
    ),
    (
        "danish",
        "lexicons/danish.tsv",
        include_str!("../../lexicons/danish.tsv"),
    ),
    (
        "danish",
        "lexicons/danish-closed-class.tsv",
        include_str!("../../lexicons/danish-closed-class.tsv"),
    ),
    (
        "norwegian",
        "lexicons/norwegian.tsv",
        include_str!("../../lexicons/norwegian.tsv"),
    ),
    (
        "norwegian",
        "lexicons/norwegian-closed-class.tsv",
        include_str!("../../lexicons/norwegian-closed-class.tsv"),
    ),
];

/// The bundled lexicon generated from paradigm tables (see [`sources`]).
const SANSKRIT: &str = "sanskrit";

/// Names of the bundled lexicons.
pub fn names() -> Vec<&'static str> {
    let mut v: Vec<&str> = LEXICONS.iter().map(|(n, _, _)| *n).collect();
    v.push(SANSKRIT);
    v.dedup();
    v
}

/// Adds the files of a bundled lexicon to a builder.
pub fn add_bundled(builder: &mut LexiconBuilder, name: &str) -> Result<(), LexiconError> {
    if name == SANSKRIT {
        let text = super::sanskrit::tsv().map_err(|message| LexiconError::BadIndex {
            file: super::sanskrit::SOURCE_NAME.to_string(),
            message,
        })?;
        return builder.add_tsv(&format!("bundled:{SANSKRIT}"), text.as_bytes());
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
