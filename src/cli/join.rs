//! `juncture join`: forward joining.

use super::common::{for_each_input, Failure, FormatArg, RecordWriter, ScopeArg, Source};
use super::{EXIT_OK, EXIT_SOME_FAILED};
use clap::Args;
use juncture::output;
use juncture::proof::{self, JoinResult};

/// Join parts forward: every surface form the rules allow, best first.
///
/// Each argument (or each line of standard input) is one set of parts
/// separated by `+`, e.g. `tat+na` or `Arbeit + Amt`. For each set, every
/// combination of junction rules that applies is listed with the rule used at
/// each junction and the total cost.
#[derive(Args, Debug)]
pub struct JoinArgs {
    /// Parts joined by `+`, one set per argument; read from standard input when none are given.
    pub parts: Vec<String>,
    #[command(flatten)]
    pub source: Source,
    /// Most ways listed per input.
    #[arg(long, default_value_t = 100, value_name = "N")]
    pub limit: usize,
    /// Output format.
    #[arg(long, short = 'f', value_enum, default_value_t = FormatArg::Text)]
    pub format: FormatArg,
    /// Which junctions may be used.
    #[arg(long, value_enum, default_value_t = ScopeArg::Any)]
    pub scope: ScopeArg,
}

pub fn run(args: JoinArgs) -> Result<i32, Failure> {
    let rules = args.source.load_rules()?;
    let lexicon = args.source.load_lexicon(&rules)?;
    let mut writer = RecordWriter::new(args.format.into());
    let mut failed = 0usize;
    for_each_input(&args.parts, |line| {
        let result = match line {
            Ok(text) => {
                let parts: Vec<&str> = text.split('+').collect();
                proof::join(&rules, &lexicon, &parts, args.scope.into(), args.limit)
            }
            Err(_) => JoinResult {
                parts: Vec::new(),
                count: 0,
                truncated: false,
                results: Vec::new(),
            },
        };
        if result.results.is_empty() {
            failed += 1;
        }
        writer.write(
            &result,
            || output::join_text(&result),
            || output::join_tsv(&result),
        )
    })?;
    writer.finish()?;
    Ok(if failed > 0 {
        EXIT_SOME_FAILED
    } else {
        EXIT_OK
    })
}
