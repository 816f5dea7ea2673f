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
        /// Also include this bundled lexicon's entries.
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
    /// Expand Sanskrit stems into inflected forms: a TSV for `split --lexicon`.
    ///
    /// Each STEMS file has lines `stem<TAB>class<TAB>tags` (an empty class
    /// means a ready-made form), the classes those of the paradigm tables
    /// (`--paradigms`, by default the bundled lexicons/sanskrit/paradigms.yaml).
    /// The output is what the bundled Sanskrit lexicon is made of: every
    /// inflected form with its tags, every nominal stem as a compound first
    /// member (`role=first`), and the tags `bound`, `final` and `pragrhya`
    /// that rule-sets/sanskrit.jr tests.
    ///
    /// With no STEMS files (and no --paradigms): the bundled Sanskrit lexicon
    /// itself, generated from lexicons/sanskrit/. The binary embeds it in
    /// compiled form (lexicons/compiled/sanskrit.jlex), which
    /// scripts/build_compiled_lexicons.sh rebuilds after the tables or stem
    /// lists change: it writes this output to a temporary file
    /// sanskrit-generated.tsv (the name is recorded as the compiled file's
    /// source) and compiles that with `juncture lexicon build FILE --rules
    /// sanskrit`.
    Expand {
        /// Stem files (stem, paradigm class, tags).
        stems: Vec<PathBuf>,
        /// Paradigm tables (YAML) instead of the bundled ones.
        #[arg(long, value_name = "FILE")]
        paradigms: Option<PathBuf>,
        /// Output file (default: standard output).
        #[arg(long, short = 'o', value_name = "FILE")]
        output: Option<PathBuf>,
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
                bundled::add_bundled(&mut builder, name)
                    .map_err(|e| Failure::Usage(format!("error: {e}")))?;
                sources.push(format!("bundled:{name}"));
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
            super::common::write_file(&output, &bytes)?;
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
        LexiconAction::Expand {
            stems,
            paradigms,
            output,
        } => expand(&stems, paradigms.as_deref(), output.as_deref()),
    }
}

/// `juncture lexicon expand`.
fn expand(
    stems: &[PathBuf],
    paradigms: Option<&std::path::Path>,
    output: Option<&std::path::Path>,
) -> Result<i32, Failure> {
    use juncture::lexicon::sanskrit;
    let read = |p: &std::path::Path| {
        std::fs::read_to_string(p)
            .map_err(|e| Failure::Usage(format!("error: cannot read {}: {e}", p.display())))
    };
    let text = if stems.is_empty() && paradigms.is_none() {
        sanskrit::tsv().map(str::to_string)
    } else {
        let tables = match paradigms {
            Some(p) => read(p)?,
            None => sanskrit::bundled_paradigms().to_string(),
        };
        let mut files = Vec::new();
        for p in stems {
            files.push((p.display().to_string(), read(p)?));
        }
        let files: Vec<(&str, &str)> = files
            .iter()
            .map(|(n, t)| (n.as_str(), t.as_str()))
            .collect();
        sanskrit::expand(&tables, &files)
    }
    .map_err(|e| Failure::Usage(format!("error: {e}")))?;
    match output {
        Some(p) => super::common::write_file(p, &text)?,
        None => std::io::stdout().lock().write_all(text.as_bytes())?,
    }
    Ok(EXIT_OK)
}
