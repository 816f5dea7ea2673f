//! Options shared by several subcommands, input reading and output writing.

use super::progress::Progress;
use clap::{Args, ValueEnum};
use juncture::lattice::ScopeFilter;
use juncture::lexicon::Lexicon;
use juncture::output::Format;
use juncture::rules::{compile_named, CompileOptions, RuleSet};
use std::io::{self, BufRead, Write};
use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Mutex, Once};

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

/// Writes `bytes` to `path`; a failure names the file.
pub fn write_file(path: &std::path::Path, bytes: impl AsRef<[u8]>) -> Result<(), Failure> {
    std::fs::write(path, bytes)
        .map_err(|e| Failure::Usage(format!("error: cannot write {}: {e}", path.display())))
}

/// Where rules and lexicons come from.
#[derive(Args, Debug, Clone)]
pub struct Source {
    /// Rule-set: a bundled name (see `juncture rules`), the path of a rule
    /// file, or of a compiled rule-set (`juncture rules build`).
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
pub type InputLine = Result<String, BadLine>;

/// A line of standard input that is not UTF-8.
#[derive(Debug, Clone)]
pub struct BadLine {
    /// The line with every invalid byte sequence replaced by U+FFFD, so that
    /// its record can still be matched up with the input.
    pub lossy: String,
    /// Why it could not be read.
    pub reason: String,
}

impl std::fmt::Display for BadLine {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.reason)
    }
}

impl From<BadLine> for String {
    fn from(b: BadLine) -> String {
        b.reason
    }
}

/// Exit status after Ctrl-C (SIGINT): 128 + 2, as shells report it.
pub const EXIT_INTERRUPTED: i32 = 130;

/// Set by the SIGINT handler.
static INTERRUPTED: AtomicBool = AtomicBool::new(false);
/// Held while one input is analysed and its record written, so that an
/// interrupt never cuts a record in half.
static RECORD: Mutex<()> = Mutex::new(());
/// Standard output, buffered. Records are written to it whole, and it is
/// flushed after a record unless the next input line is already read (see
/// [`NEXT_LINE_READY`]), when the output ends, and before an exit on Ctrl-C:
/// a reader waiting for the answer to a line gets it at once, and a batch
/// does not pay for a write per line.
static OUT: Mutex<Option<io::BufWriter<io::Stdout>>> = Mutex::new(None);
/// Set while the next input line is already in the input buffer (so no
/// one can be waiting for the record just written before sending more).
static NEXT_LINE_READY: AtomicBool = AtomicBool::new(false);

/// Flushes [`OUT`]; errors (a closed stdout) are left to the next write.
fn flush_out() {
    let mut out = OUT.lock().unwrap_or_else(|e| e.into_inner());
    if let Some(w) = out.as_mut() {
        let _ = w.flush();
    }
}

/// Installs the SIGINT handler (once). On Ctrl-C the record being written is
/// finished and flushed, then the process exits with [`EXIT_INTERRUPTED`]:
/// every line written so far is complete. When no record is in progress
/// (e.g. waiting for input) it exits at once.
fn install_interrupt_handler() {
    static ONCE: Once = Once::new();
    ONCE.call_once(|| {
        // Fails only when a handler is installed already; then that one rules.
        let _ = ctrlc::set_handler(|| {
            INTERRUPTED.store(true, Ordering::SeqCst);
            // Waits for the record in progress; the input loop itself exits
            // (holding the lock) if it sees the flag first, so only one
            // thread ever calls exit.
            let _guard = RECORD.lock().unwrap_or_else(|e| e.into_inner());
            flush_out();
            std::process::exit(EXIT_INTERRUPTED);
        });
    });
}

/// Exits with [`EXIT_INTERRUPTED`] after flushing what was written, if
/// Ctrl-C came. For a streamed listing (`split --all`), called after each
/// analysis written, so that an interrupt need not wait for the whole
/// listing of a line.
pub fn exit_if_interrupted() {
    if INTERRUPTED.load(Ordering::SeqCst) {
        flush_out();
        std::process::exit(EXIT_INTERRUPTED);
    }
}

/// Runs `each` for one input while holding the record lock, then exits if
/// Ctrl-C came meanwhile.
fn one_record(
    line: InputLine,
    each: &mut impl FnMut(InputLine) -> Result<(), Failure>,
) -> Result<(), Failure> {
    let _guard = RECORD.lock().unwrap_or_else(|e| e.into_inner());
    let result = each(line);
    if INTERRUPTED.load(Ordering::SeqCst) {
        // The record is written; everything written reaches stdout.
        flush_out();
        std::process::exit(EXIT_INTERRUPTED);
    }
    result
}

/// Calls `each` for every input: the arguments if any, else the lines of stdin
/// (read as bytes, so a line that is not UTF-8 is reported, not fatal). A line
/// ends at `\n`; one `\r` before it is dropped too (CRLF files), any other
/// byte, NUL and lone `\r` included, is part of the line.
///
/// Ctrl-C stops the loop after the current record (exit status 130).
pub fn for_each_input(
    args: &[String],
    each: impl FnMut(InputLine) -> Result<(), Failure>,
) -> Result<(), Failure> {
    for_each_input_with(args, None, each)
}

/// [`for_each_input`], advancing `progress` (if any) by the bytes of each
/// line read from standard input.
pub fn for_each_input_with(
    args: &[String],
    mut progress: Option<Progress>,
    mut each: impl FnMut(InputLine) -> Result<(), Failure>,
) -> Result<(), Failure> {
    install_interrupt_handler();
    if !args.is_empty() {
        for a in args {
            one_record(Ok(a.clone()), &mut each)?;
        }
        return Ok(());
    }
    let stdin = io::stdin();
    // Its own buffer, to see whether the next line is already read.
    let mut reader = io::BufReader::with_capacity(64 * 1024, stdin.lock());
    let mut buf = Vec::new();
    loop {
        buf.clear();
        let n = reader.read_until(b'\n', &mut buf)?;
        if n == 0 {
            break;
        }
        if let Some(p) = progress.as_mut() {
            p.advance(n);
        }
        if buf.last() == Some(&b'\n') {
            buf.pop();
        }
        if buf.last() == Some(&b'\r') {
            buf.pop();
        }
        NEXT_LINE_READY.store(reader.buffer().contains(&b'\n'), Ordering::Relaxed);
        let line = match std::str::from_utf8(&buf) {
            Ok(s) => Ok(s.to_string()),
            Err(e) => Err(BadLine {
                lossy: String::from_utf8_lossy(&buf).into_owned(),
                reason: format!(
                    "the line is not valid UTF-8 (bad byte at offset {})",
                    e.valid_up_to()
                ),
            }),
        };
        one_record(line, &mut each)?;
    }
    NEXT_LINE_READY.store(false, Ordering::Relaxed);
    if let Some(p) = &progress {
        p.finish();
    }
    Ok(())
}

/// Writes records in a streaming way: JSON arrays and YAML sequences are
/// opened and closed around the records.
pub struct RecordWriter {
    format: Format,
    written: usize,
}

impl RecordWriter {
    pub fn new(format: Format) -> Self {
        RecordWriter { format, written: 0 }
    }

    /// Writes one record (flushed unless the next input line is ready, so
    /// output line N belongs to input line N as soon as it is asked for).
    pub fn write<T: serde::Serialize>(
        &mut self,
        record: &T,
        text: impl FnOnce() -> String,
        tsv: impl FnOnce() -> String,
    ) -> Result<(), Failure> {
        let body = self.render(record, text, tsv)?;
        self.write_rendered(&body)
    }

    /// The rendering of one record that does not depend on its place in the
    /// output (for [`write_rendered`](Self::write_rendered)), so that a
    /// repeated input's record is rendered once.
    pub fn render<T: serde::Serialize>(
        &self,
        record: &T,
        text: impl FnOnce() -> String,
        tsv: impl FnOnce() -> String,
    ) -> Result<String, Failure> {
        Ok(match self.format {
            Format::Text => text(),
            Format::Tsv => tsv(),
            Format::Jsonl => {
                let mut line =
                    serde_json::to_string(record).map_err(|e| Failure::Usage(e.to_string()))?;
                line.push('\n');
                line
            }
            Format::Json => serde_json::to_string_pretty(record)
                .map_err(|e| Failure::Usage(e.to_string()))?
                .replace('\n', "\n  "),
            Format::Yaml => juncture::output::yaml_item(record),
        })
    }

    /// Writes a record rendered by [`render`](Self::render).
    pub fn write_rendered(&mut self, body: &str) -> Result<(), Failure> {
        let mut out = OUT.lock().unwrap_or_else(|e| e.into_inner());
        let out = out.get_or_insert_with(|| io::BufWriter::new(io::stdout()));
        if self.format == Format::Json {
            let open = if self.written == 0 { "[" } else { "," };
            write!(out, "{open}\n  {body}")?;
        } else {
            out.write_all(body.as_bytes())?;
        }
        self.written += 1;
        if !NEXT_LINE_READY.load(Ordering::Relaxed) {
            out.flush()?;
        }
        Ok(())
    }

    /// Closes a JSON array.
    pub fn finish(self) -> Result<(), Failure> {
        let mut out = OUT.lock().unwrap_or_else(|e| e.into_inner());
        let out = out.get_or_insert_with(|| io::BufWriter::new(io::stdout()));
        if self.format == Format::Json {
            if self.written == 0 {
                writeln!(out, "[]")?;
            } else {
                writeln!(out, "\n]")?;
            }
        }
        if self.format == Format::Yaml && self.written == 0 {
            writeln!(out, "[]")?;
        }
        out.flush()?;
        Ok(())
    }
}

impl Drop for RecordWriter {
    /// A run that stops on an error still gets out what it wrote.
    fn drop(&mut self) {
        flush_out();
    }
}
