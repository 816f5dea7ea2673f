//! `juncture eval`: score the rules and lexicon against a gold file.

use super::common::{Failure, Source};
use super::EXIT_OK;
use clap::{Args, ValueEnum};
use juncture::analyzer::Analyzer;
use juncture::eval::{self, EvalOptions};
use std::io::Write;
use std::path::PathBuf;

/// Score splits against a gold file.
///
/// The gold file is TSV, one word per line: `surface<TAB>parts[<TAB>category]`;
/// `#` starts a comment line, parts (lexicon forms) are joined by `+`, several
/// acceptable analyses are separated by ` | `, and a single part means the word
/// must not be split. Parts are compared NFC and case-insensitively.
///
/// Reported: accuracy of the best analysis; the share of non-compounds split;
/// split-point precision, recall and F1; the word categories of Koehn & Knight
/// (2003): correct split, correct non-split, wrong non-split (a compound left
/// whole), wrong faulty split (a compound split wrongly), wrong split (a
/// non-compound split); how often the expected analysis is among the top N;
/// per-rule and per-category counts; and every miss. The exit status is 0
/// whatever the scores (2 for an unreadable gold file or a rule/lexicon error).
#[derive(Args, Debug)]
pub struct EvalArgs {
    /// The gold file.
    pub gold: PathBuf,
    #[command(flatten)]
    pub source: Source,
    /// Output format.
    #[arg(long, short = 'f', value_enum, default_value_t = EvalFormat::Text)]
    pub format: EvalFormat,
    /// The expected analysis counts as found when it is among this many best.
    #[arg(long, default_value_t = 5, value_name = "N")]
    pub top: usize,
    /// Most parts in one analysis (0: no limit); default from the rule-set.
    #[arg(long, value_name = "N")]
    pub max_parts: Option<usize>,
    /// Shortest lexicon form allowed as a part of a split; default from the rule-set.
    #[arg(long, value_name = "N")]
    pub min_part_length: Option<usize>,
}

/// Output format of `eval`.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum EvalFormat {
    /// A readable report.
    Text,
    /// One JSON object (scores, counts and misses).
    Json,
}

pub fn run(args: EvalArgs) -> Result<i32, Failure> {
    let name = args.gold.display().to_string();
    let text = std::fs::read_to_string(&args.gold)
        .map_err(|e| Failure::Usage(format!("error: cannot read {name}: {e}")))?;
    let gold = eval::parse_gold(&name, &text).map_err(|errors| {
        Failure::Usage(
            errors
                .iter()
                .map(|e| format!("error: {e}"))
                .collect::<Vec<_>>()
                .join("\n"),
        )
    })?;
    let rules = args.source.load_rules()?;
    let lexicon = args.source.load_lexicon(&rules)?;
    let mut analyzer = Analyzer::new(&rules, &lexicon);
    analyzer.lattice.min_part_length = args.min_part_length;
    if let Some(m) = args.max_parts {
        analyzer.search.max_parts = m;
    }
    let options = EvalOptions {
        top: args.top.max(1),
        ..EvalOptions::default()
    };
    let report = eval::evaluate(&analyzer, &gold, &options);
    let mut out = std::io::stdout().lock();
    match args.format {
        EvalFormat::Text => out.write_all(eval::report_text(&report).as_bytes())?,
        EvalFormat::Json => {
            let body = serde_json::to_string_pretty(&report)
                .map_err(|e| Failure::Usage(format!("error: {e}")))?;
            writeln!(out, "{body}")?;
        }
    }
    out.flush()?;
    Ok(EXIT_OK)
}
