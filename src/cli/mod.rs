//! Command-line definition and glue. One file per subcommand.

mod check;
mod common;
mod eval;
mod explain;
mod induce;
mod join;
mod lexicon_cmd;
mod progress;
mod rules_cmd;
mod split;

use clap::{Parser, Subcommand};

/// Exit status: success.
pub const EXIT_OK: i32 = 0;
/// Exit status: some input line could not be analysed (each is still reported).
pub const EXIT_SOME_FAILED: i32 = 1;
/// Exit status: usage, rule-file or lexicon error.
pub const EXIT_USAGE: i32 = 2;

/// Split fused words into their parts, undoing the changes made at the junction.
///
/// juncture reads a junction rule-set (how word boundaries change when words
/// join: linking elements, elision, sandhi) and a lexicon, and finds every
/// analysis of each input word or line, ranked, each with the chain of rules
/// that proves it. German is the default rule-set.
///
/// Exit status: 0 success; 1 some input line could not be analysed (each is
/// still reported); 2 usage, rule-file or lexicon error.
#[derive(Parser, Debug)]
#[command(
    name = "juncture",
    version,
    about,
    long_about,
    propagate_version = true,
    max_term_width = 100
)]
pub struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Split words or lines into parts (the main job).
    Split(split::SplitArgs),
    /// Join parts forward: every surface form the rules allow.
    Join(join::JoinArgs),
    /// List the bundled rule-sets, or print one.
    Rules(rules_cmd::RulesArgs),
    /// Check a rule-set: compile, lint, and verify its examples both ways.
    Check(check::CheckArgs),
    /// Explain how a word is analysed: the lattice, the ranking, why not.
    Explain(explain::ExplainArgs),
    /// Propose junction rules from examples `part+part<TAB>surface`.
    Induce(induce::InduceArgs),
    /// Score splits against a gold file.
    Eval(eval::EvalArgs),
    /// Build a compiled lexicon index, or describe one.
    Lexicon(lexicon_cmd::LexiconArgs),
}

/// Parses the command line and runs it; returns the exit status.
pub fn run() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => {
            let code = if e.use_stderr() { EXIT_USAGE } else { EXIT_OK };
            let _ = e.print();
            return code;
        }
    };
    let result = match cli.command {
        Command::Split(args) => split::run(args),
        Command::Join(args) => join::run(args),
        Command::Rules(args) => rules_cmd::run(args),
        Command::Check(args) => check::run(args),
        Command::Explain(args) => explain::run(args),
        Command::Induce(args) => induce::run(args),
        Command::Eval(args) => eval::run(args),
        Command::Lexicon(args) => lexicon_cmd::run(args),
    };
    match result {
        Ok(code) => code,
        Err(common::Failure::Quiet) => EXIT_OK,
        Err(common::Failure::Usage(message)) => {
            eprintln!("{message}");
            EXIT_USAGE
        }
    }
}
