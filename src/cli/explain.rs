//! `juncture explain`: the lattice of one word, the ranking, and why (not).

use super::common::{Failure, ScopeArg, Source};
use super::EXIT_OK;
use clap::{Args, ValueEnum};
use juncture::analyzer::Analyzer;
use juncture::explain::{explain, to_dot, ExplainOptions};
use std::io::Write;
use std::path::PathBuf;

/// Explain how a word is analysed: the lattice, the ranking, and why not.
///
/// Shows, at each surface position, the lexicon entries read there and the
/// junction each ends in (with the underlying letters it replaced), how many
/// analyses pass through each, the junctions whose surface is in the input
/// but that no word reached, and the best analyses with their score broken
/// into its terms. With `--expect A+B+C` it says where that analysis fails:
/// a part missing from the lexicon, no rule for the surface at a junction, a
/// condition that rejects it, a limit, or a better analysis (and by how much).
#[derive(Args, Debug)]
pub struct ExplainArgs {
    /// The word (or line) to explain.
    pub word: String,
    #[command(flatten)]
    pub source: Source,
    /// The analysis you expected, as parts joined by `+`.
    #[arg(long, value_name = "PART+PART+…")]
    pub expect: Option<String>,
    /// How many of the best analyses to rank.
    #[arg(long, short = 'k', default_value_t = 5, value_name = "K")]
    pub top: usize,
    /// Write the lattice as Graphviz DOT to standard output instead.
    #[arg(long)]
    pub dot: bool,
    /// Also draw the lattice as an SVG picture into FILE.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    /// Output format.
    #[arg(long, short = 'f', value_enum, default_value_t = ExplainFormat::Text)]
    pub format: ExplainFormat,
    /// Which junctions may be used.
    #[arg(long, value_enum, default_value_t = ScopeArg::Any)]
    pub scope: ScopeArg,
    /// Most parts in one analysis (0: no limit); default from the rule-set.
    #[arg(long, value_name = "N")]
    pub max_parts: Option<usize>,
    /// Shortest lexicon form allowed as a part of a split; default from the rule-set.
    #[arg(long, value_name = "N")]
    pub min_part_length: Option<usize>,
}

/// Output formats of `explain`.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum ExplainFormat {
    /// Readable text.
    Text,
    /// One JSON object.
    Json,
}

pub fn run(args: ExplainArgs) -> Result<i32, Failure> {
    let rules = args.source.load_rules()?;
    let lexicon = args.source.load_lexicon(&rules)?;
    let mut analyzer = Analyzer::new(&rules, &lexicon);
    analyzer.lattice.scope = args.scope.into();
    analyzer.lattice.min_part_length = args.min_part_length;
    if let Some(m) = args.max_parts {
        analyzer.search.max_parts = m;
    }
    let mut out = std::io::stdout().lock();
    if args.dot {
        out.write_all(to_dot(&analyzer, &args.word).as_bytes())?;
        return Ok(EXIT_OK);
    }
    let expect: Option<Vec<String>> = args
        .expect
        .as_ref()
        .map(|e| e.split('+').map(|p| p.trim().to_string()).collect());
    let options = ExplainOptions {
        top: args.top,
        ..ExplainOptions::default()
    };
    let explanation = explain(&analyzer, &args.word, expect.as_deref(), &options);
    if let Some(path) = &args.svg {
        let svg = juncture::render_svg::render(&explanation);
        super::common::write_file(path, svg)?;
    }
    match args.format {
        ExplainFormat::Text => out.write_all(explanation.to_text().as_bytes())?,
        ExplainFormat::Json => {
            let body = serde_json::to_string_pretty(&explanation)
                .map_err(|e| Failure::Usage(format!("error: {e}")))?;
            writeln!(out, "{body}")?;
        }
    }
    out.flush()?;
    Ok(EXIT_OK)
}
