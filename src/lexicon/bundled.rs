//! Lexicons embedded in the binary, selectable by name.

use super::{LexiconBuilder, LexiconError};

/// (name, TSV text) of every bundled lexicon file. A name may have several files.
const LEXICONS: &[(&str, &str, &str)] = &[(
    "demo",
    "lexicons/demo.tsv",
    include_str!("../../lexicons/demo.tsv"),
)];

/// Names of the bundled lexicons.
pub fn names() -> Vec<&'static str> {
    let mut v: Vec<&str> = LEXICONS.iter().map(|(n, _, _)| *n).collect();
    v.dedup();
    v
}

/// Adds the files of a bundled lexicon to a builder.
pub fn add_bundled(builder: &mut LexiconBuilder, name: &str) -> Result<(), LexiconError> {
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
