//! `juncture split`: the main job.

use super::common::{for_each_input, Failure, FormatArg, RecordWriter, ScopeArg, Source};
use super::{EXIT_OK, EXIT_SOME_FAILED};
use clap::Args;
use juncture::analyzer::{Analyzer, SplitRecord};
use juncture::output;
use std::time::Duration;

/// Split words or lines into their parts.
///
/// Each argument (or, with none, each line of standard input) is analysed on
/// its own: the exact number of analyses, then the best ones, each with its
/// proof chain (which rule joined which parts, and where). Output line order
/// follows input order and is flushed as it goes.
#[derive(Args, Debug)]
pub struct SplitArgs {
    /// Words or lines to split; read from standard input when none are given.
    pub words: Vec<String>,
    #[command(flatten)]
    pub source: Source,
    /// How many of the best analyses to list.
    #[arg(long, short = 'k', default_value_t = 5, value_name = "K")]
    pub top: usize,
    /// List every analysis, best first, up to --limit.
    #[arg(long)]
    pub all: bool,
    /// Most analyses listed with --all.
    #[arg(long, default_value_t = 1000, value_name = "N")]
    pub limit: usize,
    /// Output format.
    #[arg(long, short = 'f', value_enum, default_value_t = FormatArg::Text)]
    pub format: FormatArg,
    /// Which junctions may be used: inside compounds, between words, or both.
    #[arg(long, value_enum, default_value_t = ScopeArg::Any)]
    pub scope: ScopeArg,
    /// Most parts in one analysis (0: no limit); default from the rule-set.
    #[arg(long, value_name = "N")]
    pub max_parts: Option<usize>,
    /// Shortest lexicon form allowed as a part of a split; default from the rule-set.
    #[arg(long, value_name = "N")]
    pub min_part_length: Option<usize>,
    /// Longest input line analysed, in characters; longer lines are reported, not analysed.
    #[arg(long, default_value_t = 4096, value_name = "N")]
    pub max_chars: usize,
    /// Most lattice edges per input; beyond it the result is marked truncated.
    #[arg(long, default_value_t = 2_000_000, value_name = "N")]
    pub max_edges: usize,
    /// Time limit per input in milliseconds (0: none); when hit the result is marked truncated.
    #[arg(long, default_value_t = 10_000, value_name = "MS")]
    pub timeout: u64,
    /// Give the greedy longest-match segmentation instead (a baseline to compare against).
    #[arg(long)]
    pub greedy: bool,
}

pub fn run(args: SplitArgs) -> Result<i32, Failure> {
    let rules = args.source.load_rules()?;
    let lexicon = args.source.load_lexicon(&rules)?;
    let mut analyzer = Analyzer::new(&rules, &lexicon);
    analyzer.lattice.scope = args.scope.into();
    analyzer.lattice.max_input_chars = args.max_chars;
    analyzer.lattice.max_edges = args.max_edges;
    analyzer.lattice.min_part_length = args.min_part_length;
    if let Some(m) = args.max_parts {
        analyzer.search.max_parts = m;
    }
    analyzer.timeout = (args.timeout > 0).then(|| Duration::from_millis(args.timeout));
    let k = if args.all { args.limit } else { args.top };
    let mut writer = RecordWriter::new(args.format.into());
    let mut failed = 0usize;
    for_each_input(&args.words, |line| {
        let record = match line {
            Ok(text) if args.greedy => analyzer.split_greedy(&text),
            Ok(text) => analyzer.split(&text, k),
            Err(why) => SplitRecord::failed("", why),
        };
        if record.is_failure() {
            failed += 1;
        }
        writer.write(
            &record,
            || output::split_text(&record),
            || output::split_tsv(&record),
        )
    })?;
    writer.finish()?;
    Ok(if failed > 0 {
        EXIT_SOME_FAILED
    } else {
        EXIT_OK
    })
}
