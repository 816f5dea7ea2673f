//! `juncture split`: the main job.

use super::common::{
    exit_if_interrupted, for_each_input_with, Failure, FormatArg, InputLine, RecordWriter,
    ScopeArg, Source,
};
use super::progress::Progress;
use super::{EXIT_OK, EXIT_SOME_FAILED};
use clap::{Args, ValueEnum};
use juncture::analyzer::{
    self, index_tokens, Analyzer, Count, Passthrough, SplitHead, SplitRecord, SplitSummary,
    Streamed, TokenRecord,
};
use juncture::cache::TypeCache;
use juncture::lexicon::Lexicon;
use juncture::output::{self, Format, StreamedReading, Streamer, TermsOptions};
use juncture::rules::RuleSet;
use juncture::script::Script;
use juncture::scripted::{self, Reading};
use std::sync::Arc;
use std::time::Duration;

/// Split words or lines into their parts.
///
/// Each argument (or, with none, each line of standard input) is analysed on
/// its own: the exact number of analyses, then the best ones, each with its
/// proof chain (which rule joined which parts, and where). Output line order
/// follows input order and is flushed as it goes.
///
/// `--format terms` is for indexing: each line is cut into tokens at
/// whitespace (punctuation around a token is dropped) and every token gives
/// one output line, `TOKEN<TAB>TERM TERM …`: the token as written, then its
/// index terms separated by spaces: the token itself (unless
/// `--no-original` and it was split), then the lexicon forms of its parts
/// (linking elements removed, elided letters restored), from the best
/// analysis and from every other of the top `-k` analyses whose score is
/// within `--term-margin` of it (ambiguous compounds keep all readings), or
/// from the best one only with `--best-only`; each term once, in order of
/// first appearance. Example: `Arbeitsamt<TAB>Arbeitsamt Arbeit Amt`.
///
/// Pass-through: with `--format terms` (or `--passthrough` for the other
/// formats) a token that is a number, a URL, an e-mail address, mixes
/// scripts (e.g. Latin and Cyrillic letters) or is longer than
/// `--max-token-chars` is not analysed; it is its own only term, and the
/// JSON formats give the reason in a `passthrough` field (`number`, `url`,
/// `email`, `mixed-script`, `too-long`). Such a token is not a failure.
#[derive(Args, Debug)]
pub struct SplitArgs {
    /// Words or lines to split; read from standard input when none are given.
    pub words: Vec<String>,
    #[command(flatten)]
    pub source: Source,
    /// How many of the best analyses to list.
    #[arg(long, short = 'k', default_value_t = 5, value_name = "K")]
    pub top: usize,
    /// List every analysis, best first, up to --limit, each as it is found.
    ///
    /// In text, jsonl and tsv each analysis is written as soon as it is found (a listing of
    /// millions starts at once and is not held in memory): text gives the
    /// `(N shown; …)` note on a line after the listing; jsonl gives one
    /// object per analysis (`input`, `rank`, `score`, `parts`, `junctions`)
    /// and then one trailer object per input (`input`, `count`, `listed`,
    /// `truncated`, `reason`, `error`); tsv names a search cut by its work
    /// limit in a last column. json and yaml still collect each input's
    /// record (one document).
    #[arg(long)]
    pub all: bool,
    /// Most analyses listed with --all.
    #[arg(long, default_value_t = 1000, value_name = "N")]
    pub limit: usize,
    /// Output format.
    #[arg(long, short = 'f', value_enum, default_value_t = SplitFormat::Text)]
    pub format: SplitFormat,
    /// terms: lowercase the token and its terms.
    #[arg(long)]
    pub lowercase: bool,
    /// terms: leave out parts shorter than N characters.
    #[arg(long, default_value_t = 1, value_name = "N")]
    pub min_term_length: usize,
    /// terms: list the token itself first (the default).
    #[arg(long, overrides_with = "no_original")]
    pub keep_original: bool,
    /// terms: do not list the token itself when it was split.
    #[arg(long, overrides_with = "keep_original")]
    pub no_original: bool,
    /// terms: only the best analysis gives terms.
    #[arg(long)]
    pub best_only: bool,
    /// terms: readings scoring at most this much below the best also give terms.
    #[arg(long, default_value_t = 1.0, value_name = "SCORE")]
    pub term_margin: f64,
    /// terms: give each part's lexicon form as it matched (`Hühner`), not its
    /// lemma (`Huhn`, from the lexicon's `lemma` tag; the default).
    #[arg(long)]
    pub term_forms: bool,
    /// Pass numbers, URLs, e-mail addresses, mixed-script and over-long tokens
    /// through unanalysed (always on with --format terms).
    #[arg(long, overrides_with = "no_passthrough")]
    pub passthrough: bool,
    /// Analyse every token, even numbers, URLs and the like.
    #[arg(long, overrides_with = "passthrough")]
    pub no_passthrough: bool,
    /// Longest token analysed with pass-through on, in characters.
    #[arg(long, default_value_t = 80, value_name = "N")]
    pub max_token_chars: usize,
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
    /// Worker threads for a batch of lines (output keeps input order).
    #[arg(long, short = 'j', default_value_t = 1, value_name = "N")]
    pub jobs: usize,
    /// Distinct inputs whose output is remembered per worker, so repeated
    /// words (natural text repeats heavily) are analysed once; 0 turns the
    /// cache off. Only the rendered output is kept; when the cache is full,
    /// the words not seen since it was last half full are forgotten. Not
    /// used by a streamed `--all` listing.
    #[arg(long, default_value_t = 100_000, value_name = "N")]
    pub cache: usize,
    /// Most megabytes of rendered output the type cache of each worker
    /// keeps (a word's JSON record is some hundreds of bytes, its
    /// `--format terms` line a few dozen), so that memory stays bounded
    /// whatever the format; the frequent words stay.
    #[arg(long, default_value_t = 16, value_name = "MB")]
    pub cache_mb: usize,
    /// Script of the input, for rule-sets written in a transliteration
    /// (`set script`: Sanskrit); `auto` detects it line by line. The input is
    /// transliterated before analysis; offsets count characters of that
    /// transliteration, given in the output (`transliteration`).
    #[arg(long, value_enum, default_value_t = ScriptArg::Auto, value_name = "SCRIPT")]
    pub script: ScriptArg,
    /// Script of forms and surfaces in the output; default (`auto`): the input's.
    #[arg(long, value_enum, value_name = "SCRIPT")]
    pub output_script: Option<ScriptArg>,
    /// Do not show the progress bar. It is shown on stderr only when stderr
    /// is a terminal, stdout is not, and standard input is a file (`juncture
    /// split < words.txt > out.jsonl`): bytes read of the file's size.
    #[arg(long)]
    pub no_progress: bool,
}

/// A script for `--script` / `--output-script`.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum ScriptArg {
    /// Detect (input), or the input's (output).
    Auto,
    /// IAST (precomposed or combining diacritics).
    Iast,
    /// Devanagari.
    Devanagari,
    /// Harvard-Kyoto.
    Hk,
    /// SLP1.
    Slp1,
}

impl ScriptArg {
    fn script(self) -> Option<Script> {
        match self {
            ScriptArg::Auto => None,
            ScriptArg::Iast => Some(Script::Iast),
            ScriptArg::Devanagari => Some(Script::Devanagari),
            ScriptArg::Hk => Some(Script::HarvardKyoto),
            ScriptArg::Slp1 => Some(Script::Slp1),
        }
    }
}

pub fn run(args: SplitArgs) -> Result<i32, Failure> {
    // The rule-set and lexicon live until the process ends: freeing their
    // hundreds of thousands of small allocations at exit only costs time.
    let rules: &RuleSet = Box::leak(Box::new(args.source.load_rules()?));
    let lexicon: &Lexicon = Box::leak(Box::new(args.source.load_lexicon(rules)?));
    let mut analyzer = Analyzer::new(rules, lexicon);
    analyzer.lattice.scope = args.scope.into();
    analyzer.lattice.max_input_chars = args.max_chars;
    analyzer.lattice.max_edges = args.max_edges;
    analyzer.lattice.min_part_length = args.min_part_length;
    if let Some(m) = args.max_parts {
        analyzer.search.max_parts = m;
    }
    analyzer.timeout = (args.timeout > 0).then(|| Duration::from_millis(args.timeout));
    let k = if args.all { args.limit } else { args.top };
    if args.format == SplitFormat::Terms || args.passthrough {
        if args.streams() {
            return run_streamed(&args, &analyzer, k, None, Some(args.max_token_chars));
        }
        return run_tokens(&args, &analyzer, k);
    }
    let analysed = scripted::rules_script(rules);
    if analysed.is_none() && (args.script != ScriptArg::Auto || args.output_script.is_some()) {
        return Err(Failure::Usage(format!(
            "error: rule-set `{}` declares no script (`set script = …`), so --script and --output-script do not apply",
            rules.name
        )));
    }
    if args.streams() {
        return run_streamed(&args, &analyzer, k, analysed, None);
    }
    let mut writer = RecordWriter::new(args.format.format());
    let mut failed = 0usize;
    let jobs = args.jobs.max(1);
    // One line at a time for a single worker (streaming, flushed per line);
    // blocks of lines for several.
    let batch_size = if jobs == 1 { 1 } else { 256 * jobs };
    let mut batch: Vec<InputLine> = Vec::with_capacity(batch_size);
    let mut caches: Vec<TypeCache<Arc<Cached>>> = (0..jobs).map(|_| args.type_cache()).collect();
    for_each_input_with(&args.words, progress(&args), |line| {
        if let (Some(analysed), Ok(text)) = (analysed, &line) {
            let to = args.output_script.and_then(ScriptArg::script);
            let record = scripted::split_with(text, args.script.script(), analysed, to, |t| {
                if args.greedy {
                    analyzer.split_greedy(t)
                } else {
                    analyzer.split(t, k)
                }
            });
            if record.is_failure() {
                failed += 1;
            }
            return writer.write(
                &record,
                || scripted::split_text(&record),
                || output::split_tsv(&record.record),
            );
        }
        batch.push(line);
        if batch.len() >= batch_size {
            failed += flush_batch(&mut batch, &mut caches, &analyzer, &args, k, &mut writer)?;
        }
        Ok(())
    })?;
    failed += flush_batch(&mut batch, &mut caches, &analyzer, &args, k, &mut writer)?;
    writer.finish()?;
    Ok(if failed > 0 {
        EXIT_SOME_FAILED
    } else {
        EXIT_OK
    })
}

impl SplitArgs {
    /// Whether each line's analyses are written as they are found (`--all`
    /// with a format that can stream: text, JSONL, TSV).
    fn streams(&self) -> bool {
        self.all
            && matches!(
                self.format,
                SplitFormat::Text | SplitFormat::Jsonl | SplitFormat::Tsv
            )
    }
}

/// `--all` in a format that streams: each line's analyses are written as
/// the search finds them (see [`output::Streamer`] for the layout), flushed
/// after each unless the next input line is already waiting. With several
/// `--jobs`, blocks of lines are analysed in parallel and each line's
/// listing is written, in input order, when its block is done. `analysed`
/// is the rule-set's script (if any); `passthrough` the token-length limit
/// when numbers, URLs and the like are passed through.
fn run_streamed(
    args: &SplitArgs,
    analyzer: &Analyzer,
    k: usize,
    analysed: Option<Script>,
    passthrough: Option<usize>,
) -> Result<i32, Failure> {
    let format = args.format.format();
    let mut writer = RecordWriter::new(format);
    let mut failed = 0usize;
    let jobs = args.jobs.max(1);
    let stream = |line: &InputLine, write: &mut dyn FnMut(&str) -> Result<(), Failure>| {
        stream_line(
            analyzer,
            args,
            k,
            format,
            line,
            analysed,
            passthrough,
            write,
        )
    };
    if jobs == 1 {
        for_each_input_with(&args.words, progress(args), |line| {
            let mut write = |piece: &str| -> Result<(), Failure> {
                if !piece.is_empty() {
                    writer.write_rendered(piece)?;
                    exit_if_interrupted();
                }
                Ok(())
            };
            if stream(&line, &mut write)? {
                failed += 1;
            }
            Ok(())
        })?;
    } else {
        let batch_size = 256 * jobs;
        let mut batch: Vec<InputLine> = Vec::with_capacity(batch_size);
        let flush = |batch: &mut Vec<InputLine>, writer: &mut RecordWriter| {
            let lines = std::mem::take(batch);
            let listings = map_on_threads(&lines, &mut vec![(); jobs], |line, _| {
                let mut out = String::new();
                // Writing to a string cannot fail.
                let failed = stream(line, &mut |piece: &str| {
                    out.push_str(piece);
                    Ok(())
                })
                .unwrap_or(true);
                (out, failed)
            });
            let mut failed = 0;
            for (out, f) in &listings {
                failed += usize::from(*f);
                writer.write_rendered(out)?;
            }
            Ok::<usize, Failure>(failed)
        };
        for_each_input_with(&args.words, progress(args), |line| {
            batch.push(line);
            if batch.len() >= batch_size {
                failed += flush(&mut batch, &mut writer)?;
            }
            Ok(())
        })?;
        failed += flush(&mut batch, &mut writer)?;
    }
    writer.finish()?;
    Ok(if failed > 0 {
        EXIT_SOME_FAILED
    } else {
        EXIT_OK
    })
}

/// Writes one line's listing in the streamed layout through `write`, each
/// piece as soon as it is known: the head, each analysis as the search finds
/// it, the end. A line that is not read, passed through or split greedily
/// has its record first and is written in the same layout. Returns whether
/// the line failed (for the exit status).
#[allow(clippy::too_many_arguments)]
fn stream_line(
    analyzer: &Analyzer,
    args: &SplitArgs,
    k: usize,
    format: Format,
    line: &InputLine,
    analysed: Option<Script>,
    passthrough: Option<usize>,
    write: &mut dyn FnMut(&str) -> Result<(), Failure>,
) -> Result<bool, Failure> {
    let text = match line {
        Ok(text) => text,
        Err(bad) => {
            let record = SplitRecord::failed(bad.lossy.clone(), bad.reason.clone());
            write_streamed_record(format, &record, None, None, write)?;
            return Ok(true);
        }
    };
    if let Some(reason) = passthrough.and_then(|max| analyzer::passthrough(text, max)) {
        let record = SplitRecord {
            input: text.clone(),
            count: Count(Default::default()),
            truncated: false,
            reason: None,
            analyses: Vec::new(),
            error: None,
        };
        write_streamed_record(format, &record, Some(reason), None, write)?;
        return Ok(false);
    }
    let to = args.output_script.and_then(ScriptArg::script);
    if args.greedy {
        return Ok(match analysed {
            Some(analysed) => {
                let r = scripted::split_with(text, args.script.script(), analysed, to, |t| {
                    analyzer.split_greedy(t)
                });
                let reading = StreamedReading {
                    script: r.script,
                    output_script: r.output_script,
                    transliteration: &r.transliteration,
                };
                write_streamed_record(format, &r.record, None, Some(reading), write)?;
                r.is_failure()
            }
            None => {
                let record = analyzer.split_greedy(text);
                write_streamed_record(format, &record, None, None, write)?;
                record.is_failure()
            }
        });
    }
    let reading = analysed.map(|a| Reading::new(text, args.script.script(), a, to));
    let shown = reading.as_ref().map(|r| StreamedReading {
        script: r.from.name(),
        output_script: r.to.name(),
        transliteration: &r.text,
    });
    let mut streamer = Streamer::new(format, text);
    let analysed_text = reading.as_ref().map_or(text.as_str(), |r| r.text.as_str());
    let summary = analyzer.split_streaming(analysed_text, k, |step| match step {
        Streamed::Head(head) => write(&streamer.head(&head, shown.as_ref())),
        Streamed::Analysis(mut a) => {
            if let Some(r) = &reading {
                r.convert(&mut a);
            }
            write(&streamer.analysis(&a))
        }
    })?;
    write(&streamer.end(&summary, None, shown))?;
    Ok(summary.is_failure())
}

/// A complete record in the streamed layout of `--all`.
fn write_streamed_record(
    format: Format,
    record: &SplitRecord,
    passthrough: Option<Passthrough>,
    reading: Option<StreamedReading<'_>>,
    write: &mut dyn FnMut(&str) -> Result<(), Failure>,
) -> Result<(), Failure> {
    let mut streamer = Streamer::new(format, &record.input);
    let head = SplitHead {
        count: record.count.clone(),
        reason: record.reason,
        error: record.error.clone(),
    };
    write(&streamer.head(&head, reading.as_ref()))?;
    for a in &record.analyses {
        write(&streamer.analysis(a))?;
    }
    write(&streamer.end(&SplitSummary::of(record), passthrough, reading))
}

/// The progress bar, unless switched off or words were given as arguments.
fn progress(args: &SplitArgs) -> Option<Progress> {
    if args.words.is_empty() {
        Progress::for_stdin(!args.no_progress)
    } else {
        None
    }
}

/// Output format of `split`: the common ones plus `terms`.
#[derive(ValueEnum, Debug, Clone, Copy, PartialEq, Eq)]
pub enum SplitFormat {
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
    /// Index terms: one line per token, `TOKEN<TAB>TERM TERM …`.
    Terms,
}

impl SplitFormat {
    fn format(self) -> Format {
        match self {
            SplitFormat::Text => FormatArg::Text.into(),
            SplitFormat::Jsonl => FormatArg::Jsonl.into(),
            SplitFormat::Json => FormatArg::Json.into(),
            SplitFormat::Yaml => FormatArg::Yaml.into(),
            SplitFormat::Tsv => FormatArg::Tsv.into(),
            // Written through the text slot of the record writer.
            SplitFormat::Terms => Format::Text,
        }
    }
}

/// Token-wise splitting with pass-through: `--format terms`, or any format
/// with `--passthrough`.
fn run_tokens(args: &SplitArgs, analyzer: &Analyzer, k: usize) -> Result<i32, Failure> {
    let terms = args.format == SplitFormat::Terms;
    let passthrough = !args.no_passthrough;
    let options = TermsOptions {
        lowercase: args.lowercase,
        min_term_length: args.min_term_length,
        keep_original: !args.no_original,
        best_only: args.best_only,
        margin: args.term_margin,
        lemmas: !args.term_forms,
    };
    let max_token = if passthrough {
        args.max_token_chars
    } else {
        usize::MAX
    };
    let mut writer = RecordWriter::new(args.format.format());
    let failed = std::cell::Cell::new(0usize);
    // Rendered output (and whether it failed) of recent tokens: running
    // text repeats its words, and a token's lines depend on it alone.
    let mut cache: TypeCache<Arc<Cached>> = args.type_cache();
    let mut one = |token: &str, writer: &mut RecordWriter| -> Result<(), Failure> {
        if let Some(hit) = cache.get(token) {
            if hit.failed {
                failed.set(failed.get() + 1);
            }
            return writer.write_rendered(&hit.rendered);
        }
        let record = if args.greedy {
            TokenRecord {
                record: analyzer.split_greedy(token),
                passthrough: None,
            }
        } else {
            analyzer.split_token(token, k, max_token)
        };
        let failure = record.is_failure();
        if failure {
            failed.set(failed.get() + 1);
        }
        let rendered = writer.render(
            &record,
            || {
                if terms {
                    output::split_terms(&record, &options)
                } else {
                    let mut text = output::split_text(&record.record);
                    if let Some(p) = record.passthrough {
                        text.push_str(&format!("  passed through: {}\n", p.describe()));
                    }
                    text
                }
            },
            || output::split_tsv(&record.record),
        )?;
        writer.write_rendered(&rendered)?;
        let bytes = rendered.capacity();
        cache.insert_sized(
            token,
            Arc::new(Cached {
                rendered,
                failed: failure,
            }),
            bytes,
        );
        Ok(())
    };
    for_each_input_with(&args.words, progress(&args), |line| match line {
        Ok(text) if terms => {
            for token in index_tokens(&text) {
                one(token, &mut writer)?;
            }
            Ok(())
        }
        Ok(text) => one(&text, &mut writer),
        Err(why) => {
            let record = TokenRecord {
                record: SplitRecord::failed(why.lossy, why.reason),
                passthrough: None,
            };
            failed.set(failed.get() + 1);
            writer.write(
                &record,
                || {
                    if terms {
                        String::new()
                    } else {
                        output::split_text(&record.record)
                    }
                },
                || output::split_tsv(&record.record),
            )
        }
    })?;
    writer.finish()?;
    Ok(if failed.get() > 0 {
        EXIT_SOME_FAILED
    } else {
        EXIT_OK
    })
}

impl SplitArgs {
    /// An empty type cache as `--cache` and `--cache-mb` ask.
    fn type_cache(&self) -> TypeCache<Arc<Cached>> {
        TypeCache::with_budget(self.cache, self.cache_mb.saturating_mul(1 << 20))
    }
}

/// An input's rendered output and whether it failed: what the type cache
/// keeps (a repeated word is neither analysed nor rendered again, and the
/// analysis itself is not kept).
struct Cached {
    rendered: String,
    failed: bool,
}

/// `f` of every item, in order, with the items split into consecutive runs,
/// one per worker state in `workers`, each run on a thread of its own (on
/// this thread when there is one worker or one item).
fn map_on_threads<I: Sync, W: Send, T: Send>(
    items: &[I],
    workers: &mut [W],
    f: impl Fn(&I, &mut W) -> T + Sync,
) -> Vec<T> {
    if workers.len() <= 1 || items.len() <= 1 {
        return match workers.first_mut() {
            Some(w) => items.iter().map(|i| f(i, w)).collect(),
            None => Vec::new(),
        };
    }
    let chunk = items.len().div_ceil(workers.len());
    let f = &f;
    std::thread::scope(|scope| {
        let handles: Vec<_> = items
            .chunks(chunk)
            .zip(workers.iter_mut())
            .map(|(run, w)| scope.spawn(move || run.iter().map(|i| f(i, w)).collect::<Vec<_>>()))
            .collect();
        handles
            .into_iter()
            .flat_map(|h| h.join().unwrap_or_default())
            .collect()
    })
}

/// Analyses a block of lines on `args.jobs` threads (each with its own type
/// cache), renders them there, and writes them in input order. Returns how
/// many failed.
fn flush_batch(
    batch: &mut Vec<InputLine>,
    caches: &mut [TypeCache<Arc<Cached>>],
    analyzer: &Analyzer,
    args: &SplitArgs,
    k: usize,
    writer: &mut RecordWriter,
) -> Result<usize, Failure> {
    if batch.is_empty() {
        return Ok(0);
    }
    let lines = std::mem::take(batch);
    let render = |record: &SplitRecord| -> Result<Arc<Cached>, Failure> {
        let rendered = writer.render(
            record,
            || output::split_text(record),
            || output::split_tsv(record),
        )?;
        Ok(Arc::new(Cached {
            rendered,
            failed: record.is_failure(),
        }))
    };
    let one =
        |line: &InputLine, cache: &mut TypeCache<Arc<Cached>>| -> Result<Arc<Cached>, Failure> {
            match line {
                Ok(text) => {
                    if let Some(hit) = cache.get(text) {
                        return Ok(hit);
                    }
                    let record = if args.greedy {
                        analyzer.split_greedy(text)
                    } else {
                        analyzer.split(text, k)
                    };
                    let cached = render(&record)?;
                    cache.insert_sized(text, Arc::clone(&cached), cached.rendered.capacity());
                    Ok(cached)
                }
                Err(bad) => render(&SplitRecord::failed(bad.lossy.clone(), bad.reason.clone())),
            }
        };
    let records = map_on_threads(&lines, caches, one);
    let mut failed = 0;
    for cached in records {
        let cached = cached?;
        if cached.failed {
            failed += 1;
        }
        writer.write_rendered(&cached.rendered)?;
    }
    Ok(failed)
}
