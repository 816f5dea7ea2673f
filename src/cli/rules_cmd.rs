//! `juncture rules`: list or print bundled rule-sets.

use super::common::Failure;
use super::EXIT_OK;
use clap::{Args, Subcommand};
use juncture::rules::{bundled, compile_named, CompileOptions};
use std::io::Write;

/// List the bundled rule-sets with their languages and rule counts, or print one.
#[derive(Args, Debug)]
pub struct RulesArgs {
    #[command(subcommand)]
    pub action: Option<RulesAction>,
}

#[derive(Subcommand, Debug)]
pub enum RulesAction {
    /// List the bundled rule-sets (the default).
    List,
    /// Print the text of a bundled rule-set or shared rule file.
    Show {
        /// Its name.
        name: String,
    },
}

pub fn run(args: RulesArgs) -> Result<i32, Failure> {
    let mut out = std::io::stdout().lock();
    match args.action.unwrap_or(RulesAction::List) {
        RulesAction::List => {
            writeln!(
                out,
                "{:<14} {:<12} {:>6} {:>10}  description",
                "name", "language", "rules", "instances"
            )?;
            for name in bundled::rule_set_names() {
                match compile_named(name, &CompileOptions::default()) {
                    Ok(set) => writeln!(
                        out,
                        "{:<14} {:<12} {:>6} {:>10}  {}",
                        name,
                        set.language,
                        set.rules.len(),
                        set.instances.len(),
                        set.description
                    )?,
                    Err(e) => writeln!(
                        out,
                        "{name:<14} (does not compile: {} errors)",
                        e.error_count()
                    )?,
                }
            }
        }
        RulesAction::Show { name } => match bundled::rule_set(&name) {
            Some(text) => out.write_all(text.as_bytes())?,
            None => {
                return Err(Failure::Usage(format!(
                    "error: no bundled rule file named `{name}` (bundled: {})",
                    bundled::names().join(", ")
                )))
            }
        },
    }
    Ok(EXIT_OK)
}
