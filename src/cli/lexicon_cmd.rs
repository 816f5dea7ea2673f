//! `juncture lexicon`: build and inspect compiled lexicons.

use super::common::Failure;
use super::EXIT_OK;
use clap::{Args, Subcommand};
use juncture::lexicon::{bundled, compiled, LexiconBuilder};
use juncture::rules::{compile_named, CompileOptions};
use std::io::Write;
use std::path::PathBuf;

/// Build a compiled lexicon index, or describe one.
///
/// A compiled lexicon (an FST plus an entry table) loads without parsing and
/// is accepted by `split --lexicon` wherever a TSV is. It is built for the
/// normalization of one rule-set (case folding, variants); loading it with a
/// rule-set that normalizes differently is refused with a hint to rebuild.
#[derive(Args, Debug)]
pub struct LexiconArgs {
    #[command(subcommand)]
    pub action: LexiconAction,
}

#[derive(Subcommand, Debug)]
pub enum LexiconAction {
    /// Compile TSV lexicons (and/or bundled ones) into one index file.
    Build {
        /// TSV files to compile (form, frequency, tags).
        inputs: Vec<PathBuf>,
        /// Output file.
        #[arg(long, short = 'o', value_name = "FILE")]
        output: PathBuf,
        /// Rule-set whose normalization the index is built for.
        #[arg(long, short = 'r', default_value = "german", value_name = "NAME|PATH")]
        rules: String,
        /// Also include this bundled lexicon's TSV files.
        #[arg(long, value_name = "NAME")]
        bundled: Option<String>,
        /// Select a variant of the rule-set (changes normalization).
        #[arg(long, value_name = "NAME")]
        variant: Vec<String>,
        /// Treat a malformed line as an error.
        #[arg(long)]
        strict: bool,
    },
    /// Print what a compiled lexicon file holds.
    Info {
        /// The file.
        file: PathBuf,
    },
}

pub fn run(args: LexiconArgs) -> Result<i32, Failure> {
    match args.action {
        LexiconAction::Build {
            inputs,
            output,
            rules,
            bundled: bundled_name,
            variant,
            strict,
        } => {
            let rules = compile_named(&rules, &CompileOptions { variants: variant })
                .map_err(|d| Failure::Usage(d.to_string()))?;
            if inputs.is_empty() && bundled_name.is_none() {
                return Err(Failure::Usage(
                    "error: give TSV files to compile, or --bundled NAME".into(),
                ));
            }
            let mut builder = LexiconBuilder::new(&rules.normalizer).strict(strict);
            let mut sources = Vec::new();
            if let Some(name) = &bundled_name {
                let files = bundled::sources(name);
                if files.is_empty() {
                    return Err(Failure::Usage(format!(
                        "error: no bundled lexicon named `{name}` (bundled: {})",
                        bundled::names().join(", ")
                    )));
                }
                for (file, text) in files {
                    builder
                        .add_tsv(file, text.as_bytes())
                        .map_err(|e| Failure::Usage(format!("error: {e}")))?;
                    sources.push(file.to_string());
                }
            }
            for path in &inputs {
                builder
                    .add_tsv_file(path)
                    .map_err(|e| Failure::Usage(format!("error: {e}")))?;
                sources.push(
                    path.file_name()
                        .map(|f| f.to_string_lossy().into_owned())
                        .unwrap_or_default(),
                );
            }
            let skipped = builder.issues().len();
            for issue in builder.issues().iter().take(10) {
                eprintln!("warning: skipped lexicon line {issue}");
            }
            let lexicon = builder
                .build()
                .map_err(|e| Failure::Usage(format!("error: {e}")))?;
            let bytes = lexicon.to_compiled(&sources);
            std::fs::write(&output, &bytes).map_err(|e| {
                Failure::Usage(format!("error: cannot write {}: {e}", output.display()))
            })?;
            eprintln!(
                "{}: {} entries, {} bytes{}",
                output.display(),
                lexicon.len(),
                bytes.len(),
                if skipped > 0 {
                    format!(", {skipped} malformed lines skipped")
                } else {
                    String::new()
                }
            );
            Ok(EXIT_OK)
        }
        LexiconAction::Info { file } => {
            let bytes = std::fs::read(&file).map_err(|e| {
                Failure::Usage(format!("error: cannot read {}: {e}", file.display()))
            })?;
            let info = compiled::describe(&bytes)
                .map_err(|m| Failure::Usage(format!("error: {}: {m}", file.display())))?;
            let mut out = std::io::stdout().lock();
            writeln!(out, "{info}")?;
            Ok(EXIT_OK)
        }
    }
}
