//! The pest parser generated from `grammars/junction.pest`.

#[allow(missing_docs)]
mod generated {
    /// Parser for the rule language; the grammar file is the single source of truth.
    #[derive(pest_derive::Parser)]
    #[grammar = "../grammars/junction.pest"]
    pub struct JunctionParser;
}
pub use generated::{JunctionParser, Rule};
