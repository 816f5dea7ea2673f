//! Options shared by several subcommands, input reading and output writing.

use clap::{Args, ValueEnum};
use juncture::lattice::ScopeFilter;
use juncture::lexicon::Lexicon;
use juncture::output::Format;
use juncture::rules::{compile_named, CompileOptions, RuleSet};
use std::io::{self, BufRead, Write};
use std::path::PathBuf;

/// Why a command stopped early.
pub enum Failure {
    /// stdout was closed (e.g. `| head -1`): stop quietly.
    Quiet,
    /// A usage, rule-file or lexicon error, already rendered.
    Usage(String),
}

impl From<io::Error> for Failure {
    fn from(e: io::Error) -> Self {
        if e.kind() == io::ErrorKind::BrokenPipe {
            Failure::Quiet
        } else {
            Failure::Usage(format!("error: {e}"))
        }
    }
}

/// Where rules and lexicons come from.
#[derive(Args, Debug, Clone)]
pub struct Source {
    /// Rule-set: a bundled name (see `juncture rules`) or the path of a rule file.
    #[arg(long, short = 'r', value_name = "NAME|PATH", default_value = "german")]
    pub rules: String,
    /// Add a lexicon file (TSV: form, frequency, tags). Repeatable.
    #[arg(long, short = 'l', value_name = "PATH")]
    pub lexicon: Vec<PathBuf>,
    /// Do not load the rule-set's bundled lexicon; use only --lexicon files.
    #[arg(long)]
    pub no_default_lexicon: bool,
    /// Treat a malformed lexicon line as an error instead of skipping it.
    #[arg(long)]
    pub strict: bool,
    /// Select a variant declared by the rule-set (e.g. `swiss`). Repeatable.
    #[arg(long, value_name = "NAME")]
    pub variant: Vec<String>,
}

/// Output format.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum FormatArg {
    /// Readable proof chains.
    Text,
    /// One JSON object per input line.
    Jsonl,
    /// One JSON array.
    Json,
    /// One YAML sequence.
    Yaml,
    /// One tab-separated line per input.
    Tsv,
}

impl From<FormatArg> for Format {
    fn from(f: FormatArg) -> Format {
        match f {
            FormatArg::Text => Format::Text,
            FormatArg::Jsonl => Format::Jsonl,
            FormatArg::Json => Format::Json,
            FormatArg::Yaml => Format::Yaml,
            FormatArg::Tsv => Format::Tsv,
        }
    }
}

/// Junction scope.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum ScopeArg {
    /// Junctions inside compounds and between words.
    Any,
    /// Only junctions inside compounds.
    Compound,
    /// Only junctions between words of a phrase.
    Phrase,
}

impl From<ScopeArg> for ScopeFilter {
    fn from(s: ScopeArg) -> ScopeFilter {
        match s {
            ScopeArg::Any => ScopeFilter::Any,
            ScopeArg::Compound => ScopeFilter::Compound,
            ScopeArg::Phrase => ScopeFilter::Phrase,
        }
    }
}

impl Source {
    /// Compiles the rule-set; errors are rendered with file:line:column and a caret.
    pub fn load_rules(&self) -> Result<RuleSet, Failure> {
        let options = CompileOptions {
            variants: self.variant.clone(),
        };
        compile_named(&self.rules, &options).map_err(|d| Failure::Usage(d.to_string()))
    }

    /// Loads the lexicon for a rule-set; skipped lines are counted on stderr.
    pub fn load_lexicon(&self, rules: &RuleSet) -> Result<Lexicon, Failure> {
        let (lexicon, issues) =
            Lexicon::for_rules(rules, &self.lexicon, !self.no_default_lexicon, self.strict)
                .map_err(|e| Failure::Usage(format!("error: {e}")))?;
        if !issues.is_empty() {
            for issue in issues.iter().take(10) {
                eprintln!("warning: skipped lexicon line {issue}");
            }
            if issues.len() > 10 {
                eprintln!("warning: … and {} more", issues.len() - 10);
            }
            eprintln!(
                "warning: {} malformed lexicon line{} skipped (use --strict to make this an error)",
                issues.len(),
                if issues.len() == 1 { "" } else { "s" }
            );
        }
        Ok(lexicon)
    }
}

/// One input line: text, or the reason it could not be read.
pub type InputLine = Result<String, String>;

/// Calls `each` for every input: the arguments if any, else the lines of stdin
/// (read as bytes, so a line that is not UTF-8 is reported, not fatal).
pub fn for_each_input(
    args: &[String],
    mut each: impl FnMut(InputLine) -> Result<(), Failure>,
) -> Result<(), Failure> {
    if !args.is_empty() {
        for a in args {
            each(Ok(a.clone()))?;
        }
        return Ok(());
    }
    let stdin = io::stdin();
    let mut reader = stdin.lock();
    let mut buf = Vec::new();
    loop {
        buf.clear();
        let n = reader.read_until(b'\n', &mut buf)?;
        if n == 0 {
            break;
        }
        if buf.last() == Some(&b'\n') {
            buf.pop();
        }
        if buf.last() == Some(&b'\r') {
            buf.pop();
        }
        match std::str::from_utf8(&buf) {
            Ok(s) => each(Ok(s.to_string()))?,
            Err(e) => each(Err(format!(
                "the line is not valid UTF-8 (bad byte at offset {})",
                e.valid_up_to()
            )))?,
        }
    }
    Ok(())
}

/// Writes records in a streaming way: JSON arrays and YAML sequences are
/// opened and closed around the records.
pub struct RecordWriter {
    out: io::BufWriter<io::Stdout>,
    format: Format,
    written: usize,
}

impl RecordWriter {
    pub fn new(format: Format) -> Self {
        RecordWriter {
            out: io::BufWriter::new(io::stdout()),
            format,
            written: 0,
        }
    }

    /// Writes one record and flushes, so output line N belongs to input line N.
    pub fn write<T: serde::Serialize>(
        &mut self,
        record: &T,
        text: impl FnOnce() -> String,
        tsv: impl FnOnce() -> String,
    ) -> Result<(), Failure> {
        match self.format {
            Format::Text => self.out.write_all(text().as_bytes())?,
            Format::Tsv => self.out.write_all(tsv().as_bytes())?,
            Format::Jsonl => {
                let line =
                    serde_json::to_string(record).map_err(|e| Failure::Usage(e.to_string()))?;
                writeln!(self.out, "{line}")?;
            }
            Format::Json => {
                let body = serde_json::to_string_pretty(record)
                    .map_err(|e| Failure::Usage(e.to_string()))?;
                let body = body.replace('\n', "\n  ");
                write!(
                    self.out,
                    "{}\n  {body}",
                    if self.written == 0 { "[" } else { "," }
                )?;
            }
            Format::Yaml => self
                .out
                .write_all(juncture::output::yaml_item(record).as_bytes())?,
        }
        self.written += 1;
        self.out.flush()?;
        Ok(())
    }

    /// Closes a JSON array.
    pub fn finish(mut self) -> Result<(), Failure> {
        if self.format == Format::Json {
            if self.written == 0 {
                writeln!(self.out, "[]")?;
            } else {
                writeln!(self.out, "\n]")?;
            }
        }
        if self.format == Format::Yaml && self.written == 0 {
            writeln!(self.out, "[]")?;
        }
        self.out.flush()?;
        Ok(())
    }
}
