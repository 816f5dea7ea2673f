//! `juncture induce`: propose junction rules from examples.

use super::common::Failure;
use super::{EXIT_OK, EXIT_SOME_FAILED};
use clap::Args;
use juncture::induce::{induce, InduceOptions};
use std::io::Write;
use std::path::PathBuf;

/// Propose junction rules from examples `part+part<TAB>surface`.
///
/// Each surface is aligned with its parts (the smallest change at each
/// boundary: what of the left part's end and the right part's start is
/// replaced, and by what); changes that share a pattern become one rule —
/// the same letters, a correspondence between two classes (p→b, t→d, k→g),
/// gemination or degemination — with the segments seen next to the boundary
/// as context. The rules are printed as rule-language text, each with the
/// number of examples it explains and up to two of them as `example`
/// clauses, then the examples left unexplained. The text compiles, and every
/// example a rule claims joins to its surface. Exit status 1 when some
/// example is left unexplained.
#[derive(Args, Debug)]
pub struct InduceArgs {
    /// The examples: one `part+part+…<TAB>surface` per line, `#` comments.
    pub examples: PathBuf,
    /// Take classes and segments from this rule file (bundled name or path); the output includes it.
    #[arg(long, value_name = "NAME|PATH")]
    pub include: Option<String>,
    /// Multi-letter segments, e.g. `--segments "th sch"`.
    #[arg(long, value_name = "SEGMENTS")]
    pub segments: Option<String>,
    /// Match case exactly instead of lowercasing (`case keep`).
    #[arg(long)]
    pub keep_case: bool,
    /// Fewest examples a rule must explain.
    #[arg(long, default_value_t = 1, value_name = "N")]
    pub min_examples: usize,
    /// The `language` name written into the rules.
    #[arg(long, default_value = "induced", value_name = "NAME")]
    pub language: String,
}

pub fn run(args: InduceArgs) -> Result<i32, Failure> {
    let text = std::fs::read_to_string(&args.examples).map_err(|e| {
        Failure::Usage(format!(
            "error: cannot read {}: {e}",
            args.examples.display()
        ))
    })?;
    let options = InduceOptions {
        include: args.include.clone(),
        segments: args
            .segments
            .as_deref()
            .map(|s| s.split_whitespace().map(str::to_string).collect())
            .unwrap_or_default(),
        fold_case: !args.keep_case,
        min_examples: args.min_examples,
        language: args.language.clone(),
        source_name: args.examples.display().to_string(),
    };
    let induction = induce(&text, &options).map_err(|e| Failure::Usage(format!("error: {e}")))?;
    let mut out = std::io::stdout().lock();
    out.write_all(induction.text.as_bytes())?;
    out.flush()?;
    Ok(if induction.unexplained.is_empty() {
        EXIT_OK
    } else {
        EXIT_SOME_FAILED
    })
}
