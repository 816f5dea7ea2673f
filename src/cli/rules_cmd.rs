//! `juncture rules`: list or print bundled rule-sets, or compile one into a file.

use super::common::Failure;
use super::EXIT_OK;
use clap::{Args, Subcommand};
use juncture::rules::{bundled, compile_from_text, compile_named, compiled, CompileOptions};
use std::io::Write;
use std::path::PathBuf;

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
    /// Compile a rule-set into a file that `--rules FILE` loads without
    /// compiling again (a large rule file starts up faster). The file
    /// holds the selected variants and is read only by this version of
    /// juncture. Warnings are shown now, not when the file is loaded.
    Build {
        /// The rule-set: a bundled name or the path of a rule file.
        rules: String,
        /// Select a variant declared by the rule-set. Repeatable.
        #[arg(long, value_name = "NAME")]
        variant: Vec<String>,
        /// Where to write the compiled rule-set.
        #[arg(long, short = 'o', value_name = "PATH")]
        output: PathBuf,
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
        RulesAction::Build {
            rules,
            variant,
            output,
        } => {
            let already = bundled::rule_set(&rules).is_none()
                && std::fs::read(&rules).is_ok_and(|b| compiled::is_compiled(&b));
            if already {
                return Err(Failure::Usage(format!(
                    "error: {rules} is a compiled rule-set already; build from its rule file"
                )));
            }
            let set = compile_from_text(&rules, &CompileOptions { variants: variant })
                .map_err(|d| Failure::Usage(d.to_string()))?;
            for warning in &set.warnings {
                eprintln!("{warning}");
            }
            let bytes = compiled::to_bytes(&set);
            super::common::write_file(&output, &bytes)?;
            eprintln!(
                "wrote {}: {} rules, {} instances, {} bytes",
                output.display(),
                set.rules.len(),
                set.instances.len(),
                bytes.len()
            );
        }
    }
    Ok(EXIT_OK)
}
