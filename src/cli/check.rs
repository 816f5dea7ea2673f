//! `juncture check`: compile a rule-set and lint it.

use super::common::Failure;
use super::{EXIT_OK, EXIT_USAGE};
use clap::{Args, ValueEnum};
use juncture::check::{check_named, CheckOptions};
use std::io::Write;
use std::path::PathBuf;

/// Check a rule-set: compile it, lint it, and verify its examples both ways.
///
/// Compiler errors are shown as the compiler renders them; then come
/// warnings: classes never used, rules that can never fire with the lexicon,
/// rules shadowed by another rule, correspondences that map a segment onto
/// itself, and examples that fail to join (parts → surface, through their
/// rule) or to split (surface → parts, among the analyses). Exit status 2 when
/// there are errors, 0 otherwise (warnings included).
#[derive(Args, Debug)]
pub struct CheckArgs {
    /// The rule-set: a bundled name or the path of a rule file.
    #[arg(value_name = "RULES")]
    pub rules: String,
    /// Add a lexicon file (TSV: form, frequency, tags). Repeatable.
    #[arg(long, short = 'l', value_name = "PATH")]
    pub lexicon: Vec<PathBuf>,
    /// Do not load the rule-set's bundled lexicon; use only --lexicon files.
    #[arg(long)]
    pub no_default_lexicon: bool,
    /// Select a variant declared by the rule-set. Repeatable.
    #[arg(long, value_name = "NAME")]
    pub variant: Vec<String>,
    /// Output format.
    #[arg(long, short = 'f', value_enum, default_value_t = CheckFormat::Text)]
    pub format: CheckFormat,
}

/// Output formats of `check`.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum CheckFormat {
    /// Compiler-style diagnostics and a summary line.
    Text,
    /// One JSON object with the counts and every diagnostic.
    Json,
}

pub fn run(args: CheckArgs) -> Result<i32, Failure> {
    let options = CheckOptions {
        variants: args.variant.clone(),
        lexicons: args.lexicon.clone(),
        default_lexicon: !args.no_default_lexicon,
        ..CheckOptions::default()
    };
    let report =
        check_named(&args.rules, &options).map_err(|e| Failure::Usage(format!("error: {e}")))?;
    let mut out = std::io::stdout().lock();
    match args.format {
        CheckFormat::Text => out.write_all(report.to_text().as_bytes())?,
        CheckFormat::Json => {
            let body = serde_json::to_string_pretty(&report)
                .map_err(|e| Failure::Usage(format!("error: {e}")))?;
            writeln!(out, "{body}")?;
        }
    }
    out.flush()?;
    Ok(if report.errors > 0 {
        EXIT_USAGE
    } else {
        EXIT_OK
    })
}
