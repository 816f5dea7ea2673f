//! Output stage: renderings of split and join results. `text` is a readable
//! proof chain; `jsonl` one JSON object per input line; `json` a JSON array;
//! `yaml` a YAML sequence; `tsv` one line per input.

use crate::analyzer::{Count, Passthrough, SplitHead, SplitRecord, SplitSummary};
use crate::lattice::Truncation;
use crate::proof::{Analysis, JoinResult, Junction, Part};
use serde::Serialize;
use std::fmt::Write;

/// Output formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    /// Readable proof chains.
    Text,
    /// One JSON object per line.
    Jsonl,
    /// One JSON array for the whole run.
    Json,
    /// One YAML sequence for the whole run.
    Yaml,
    /// One tab-separated line per input.
    Tsv,
}

fn show_underlying(s: &str) -> String {
    if s.is_empty() {
        "∅".to_string()
    } else {
        s.to_string()
    }
}

/// One analysis as a readable proof chain (several lines, indented): for each
/// junction the two parts, the underlying letters the rule replaced, the
/// surface it produced (boundary shown as `|`, `_`, `-`, or a merged segment
/// in parentheses), the rule, its cost and the input offset.
pub fn analysis_text(a: &Analysis, out: &mut String) {
    let _ = writeln!(out, "  {}. {}    score {}", a.rank, a.parts_text(), a.score);
    for (i, j) in a.junctions.iter().enumerate() {
        let _ = writeln!(
            out,
            "       {} + {}: {} + {} → {}  by {} (cost {}) at {}",
            a.parts[i].form,
            a.parts[i + 1].form,
            show_underlying(&j.left),
            show_underlying(&j.right),
            j.marked_surface(),
            j.rule,
            j.cost,
            j.at
        );
    }
}

/// The first line of a split in text, `INPUT: COUNT analyses`, without its end.
fn count_line(input: &str, count: &Count, out: &mut String) {
    let noun = if count.0 == 1u32.into() {
        "analysis"
    } else {
        "analyses"
    };
    let _ = write!(out, "{input}: {count} {noun}");
}

/// A split record as text.
pub fn split_text(r: &SplitRecord) -> String {
    let mut out = String::new();
    count_line(&r.input, &r.count, &mut out);
    if let Some(reason) = r.reason {
        if !r.analyses.is_empty() || r.error.is_none() {
            let _ = write!(out, " ({} shown; {})", r.analyses.len(), reason.describe());
        }
    }
    out.push('\n');
    if let Some(e) = &r.error {
        let _ = writeln!(out, "  error: {e}");
    }
    for a in &r.analyses {
        analysis_text(a, &mut out);
    }
    out
}

fn tsv_clean(s: &str) -> String {
    s.replace(['\t', '\n', '\r'], " ")
}

/// The TSV column naming a limit that cut a split, `truncated: REASON`.
fn tsv_truncated(reason: Truncation) -> String {
    format!(
        "truncated: {}",
        serde_json::to_value(reason)
            .ok()
            .and_then(|v| v.as_str().map(str::to_string))
            .unwrap_or_default()
    )
}

/// The columns of a split in TSV before its analyses: input, count, then
/// `error: …` or `truncated: REASON` when a limit other than the number
/// listed cut it; each column after a tab but the first.
fn tsv_head(input: &str, count: &Count, error: Option<&str>, reason: Option<Truncation>) -> String {
    let mut out = format!("{}\t{}", tsv_clean(input), count);
    if let Some(e) = error {
        out.push_str("\terror: ");
        out.push_str(&tsv_clean(e));
    } else if let Some(reason) = reason.filter(|&x| x != Truncation::Limit) {
        // A limit other than the number listed cut the search: say which,
        // in the same place an error would stand.
        out.push('\t');
        out.push_str(&tsv_truncated(reason));
    }
    out
}

/// One analysis as TSV columns, each after a tab: the parts joined by `+`,
/// the rules joined by `,`, and the score.
pub fn analysis_tsv(a: &Analysis, out: &mut String) {
    out.push('\t');
    let parts: Vec<String> = a.parts.iter().map(|p| tsv_clean(&p.form)).collect();
    out.push_str(&parts.join("+"));
    out.push('\t');
    let rules: Vec<&str> = a.junctions.iter().map(|j| j.rule.as_str()).collect();
    out.push_str(&rules.join(","));
    let _ = write!(out, "\t{}", a.score);
}

/// A split record as one TSV line: input, count, then `error: …` or
/// `truncated: REASON` when a limit other than the number listed cut it, then
/// for each analysis the parts joined by `+`, the rules joined by `,`, and the score.
pub fn split_tsv(r: &SplitRecord) -> String {
    let mut out = tsv_head(&r.input, &r.count, r.error.as_deref(), r.reason);
    for a in &r.analyses {
        analysis_tsv(a, &mut out);
    }
    out.push('\n');
    out
}

/// The streamed layout of `split --all` (text, JSONL and TSV), written one
/// piece at a time: [`head`](Self::head) before the search, then
/// [`analysis`](Self::analysis) for each analysis as it is found, then
/// [`end`](Self::end) with the summary. Without `--all` the record formats
/// ([`split_text`], [`split_tsv`], the record as JSON) are used instead.
///
/// - **text**: the record's first line without the `(N shown; …)` note, the
///   `error:` line if any, each analysis as in the record, and last, when the
///   listing is incomplete, the note on a line of its own:
///   `  (N shown; REASON)`.
/// - **jsonl**: one object per analysis, `{"input", "rank", "score",
///   "parts", "junctions"}` (the record's analysis with its input), then one
///   trailer object per input, `{"input", "count", "listed", "truncated",
///   "reason"?, "error"?}` (see [`StreamedEnd`]). An object with `listed`
///   ends the input; a line without analyses has the trailer only.
/// - **tsv**: one line per input as in the record, written column by column;
///   a limit known only after the search (`search-size`) is named in a last
///   column instead of the third.
#[derive(Debug, Clone)]
pub struct Streamer<'a> {
    format: Format,
    input: &'a str,
    head_reason: Option<Truncation>,
}

/// A streamed analysis in JSONL: the record's analysis with its input.
#[derive(Debug, Serialize)]
pub struct StreamedAnalysis<'a> {
    /// The input line as given.
    pub input: &'a str,
    /// 1-based rank.
    pub rank: usize,
    /// Score.
    pub score: f64,
    /// Parts, left to right.
    pub parts: &'a [Part],
    /// Junctions between consecutive parts.
    pub junctions: &'a [Junction],
}

/// The trailer of a streamed split in JSONL: what the record says besides
/// its analyses.
#[derive(Debug, Serialize)]
pub struct StreamedEnd<'a> {
    /// The input line as given.
    pub input: &'a str,
    /// Count, number listed, truncation and error.
    #[serde(flatten)]
    pub summary: &'a SplitSummary,
    /// Why the token was not analysed (`--passthrough`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub passthrough: Option<Passthrough>,
    /// The script read, the script written and the transliteration
    /// analysed, for a rule-set with a script (as in the record).
    #[serde(flatten, skip_serializing_if = "Option::is_none")]
    pub reading: Option<StreamedReading<'a>>,
}

/// The script fields of a streamed trailer.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct StreamedReading<'a> {
    /// The script the input was read in.
    pub script: &'static str,
    /// The script of forms and surfaces.
    pub output_script: &'static str,
    /// The input in the rule-set's script; offsets count its characters.
    pub transliteration: &'a str,
}

impl<'a> Streamer<'a> {
    /// A streamed listing of `input` in `format` (text, JSONL or TSV).
    pub fn new(format: Format, input: &'a str) -> Self {
        Streamer {
            format,
            input,
            head_reason: None,
        }
    }

    /// What comes before the first analysis. `reading` (text only) adds
    /// the `read as SCRIPT: …` line of a rule-set with a script when the
    /// transliteration differs from the input.
    pub fn head(&mut self, head: &SplitHead, reading: Option<&StreamedReading<'_>>) -> String {
        self.head_reason = head.reason;
        match self.format {
            Format::Text => {
                let mut out = String::new();
                count_line(self.input, &head.count, &mut out);
                out.push('\n');
                if let Some(r) = reading.filter(|r| r.transliteration != self.input) {
                    let _ = writeln!(out, "  read as {}: {}", r.script, r.transliteration);
                }
                if let Some(e) = &head.error {
                    let _ = writeln!(out, "  error: {e}");
                }
                out
            }
            Format::Tsv => tsv_head(self.input, &head.count, head.error.as_deref(), head.reason),
            _ => String::new(),
        }
    }

    /// One analysis.
    pub fn analysis(&self, a: &Analysis) -> String {
        let mut out = String::new();
        match self.format {
            Format::Text => analysis_text(a, &mut out),
            Format::Tsv => analysis_tsv(a, &mut out),
            _ => {
                let line = StreamedAnalysis {
                    input: self.input,
                    rank: a.rank,
                    score: a.score,
                    parts: &a.parts,
                    junctions: &a.junctions,
                };
                out = serde_json::to_string(&line)
                    .unwrap_or_else(|e| format!("{{\"error\":\"{e}\"}}"));
                out.push('\n');
            }
        }
        out
    }

    /// What comes after the last analysis. `passthrough` and `reading` go
    /// into the JSONL trailer; `passthrough` also gives the text line
    /// `passed through: …`.
    pub fn end(
        &self,
        summary: &SplitSummary,
        passthrough: Option<Passthrough>,
        reading: Option<StreamedReading<'_>>,
    ) -> String {
        let mut out = String::new();
        match self.format {
            Format::Text => {
                if let Some(reason) = summary.reason {
                    if summary.listed > 0 || summary.error.is_none() {
                        let _ =
                            writeln!(out, "  ({} shown; {})", summary.listed, reason.describe());
                    }
                }
                if let Some(p) = passthrough {
                    let _ = writeln!(out, "  passed through: {}", p.describe());
                }
            }
            Format::Tsv => {
                // A limit found only by the search (its work limit) was not
                // known when the third column was written: it comes last.
                let shown = self.head_reason.filter(|&x| x != Truncation::Limit);
                let late = summary
                    .reason
                    .filter(|&x| x != Truncation::Limit && Some(x) != shown);
                if let Some(late) = late.filter(|_| summary.error.is_none()) {
                    out.push('\t');
                    out.push_str(&tsv_truncated(late));
                }
                out.push('\n');
            }
            _ => {
                let end = StreamedEnd {
                    input: self.input,
                    summary,
                    passthrough,
                    reading,
                };
                out = serde_json::to_string(&end)
                    .unwrap_or_else(|e| format!("{{\"error\":\"{e}\"}}"));
                out.push('\n');
            }
        }
        out
    }
}

/// A join result as text.
pub fn join_text(r: &JoinResult) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "{}: {} way{}{}",
        r.parts.join(" + "),
        r.count,
        if r.count == 1 { "" } else { "s" },
        if r.truncated {
            " (list cut at the limit)"
        } else {
            ""
        }
    );
    for j in &r.results {
        let rules: Vec<String> = j
            .junctions
            .iter()
            .map(|s| {
                format!(
                    "{} ({} + {} → {})",
                    s.rule,
                    show_underlying(&s.left),
                    show_underlying(&s.right),
                    show_underlying(&s.surface.replace(' ', "_"))
                )
            })
            .collect();
        let line = format!(
            "  {}. {}    cost {}    {}",
            j.rank,
            j.surface,
            j.cost,
            rules.join(", ")
        );
        let _ = writeln!(out, "{}", line.trim_end());
    }
    out
}

/// A join result as one TSV line: parts, count, then surface and rules per way.
pub fn join_tsv(r: &JoinResult) -> String {
    let mut cols = vec![r.parts.join("+"), r.count.to_string()];
    for j in &r.results {
        cols.push(j.surface.clone());
        cols.push(
            j.junctions
                .iter()
                .map(|s| s.rule.clone())
                .collect::<Vec<_>>()
                .join(","),
        );
    }
    cols.join("\t") + "\n"
}

/// Serializes a value as one YAML sequence item (for streaming a sequence).
pub fn yaml_item<T: serde::Serialize>(value: &T) -> String {
    let body = serde_yaml::to_string(value).unwrap_or_else(|e| format!("error: {e}\n"));
    let mut out = String::new();
    for (i, line) in body.lines().enumerate() {
        out.push_str(if i == 0 { "- " } else { "  " });
        out.push_str(line);
        out.push('\n');
    }
    out
}

/// Options of the `terms` rendering (index terms of a split).
#[derive(Debug, Clone, PartialEq)]
pub struct TermsOptions {
    /// Lowercase every term (and the original).
    pub lowercase: bool,
    /// Parts shorter than this many characters are not listed as terms (the
    /// original is always listed when kept).
    pub min_term_length: usize,
    /// List the token itself first. A token that is not split is always
    /// listed (it is its own only term).
    pub keep_original: bool,
    /// Only the best analysis gives terms; otherwise every listed analysis
    /// whose score is within `margin` of the best one does.
    pub best_only: bool,
    /// How far below the best score a reading may be and still give terms.
    pub margin: f64,
    /// Parts give their lemma (the lexicon's `lemma` tag, e.g. `Huhn` for
    /// the part `Hühner` of `Hühnerei`) instead of the form, where the
    /// lexicon has one.
    pub lemmas: bool,
}

impl Default for TermsOptions {
    fn default() -> Self {
        TermsOptions {
            lowercase: false,
            min_term_length: 1,
            keep_original: true,
            best_only: false,
            margin: 1.0,
            lemmas: true,
        }
    }
}

/// The index terms of one token: the token itself (unless `keep_original`
/// is off and it was split), then the lexicon forms (or their lemmas, see
/// [`TermsOptions::lemmas`]) of the parts of the chosen readings (linking
/// elements removed, elided letters restored), in
/// order of first appearance, without repeats. A passed-through or
/// unanalysed token gives itself.
pub fn terms(r: &crate::analyzer::TokenRecord, o: &TermsOptions) -> Vec<String> {
    let case = |s: &str| {
        if o.lowercase {
            s.to_lowercase()
        } else {
            s.to_string()
        }
    };
    let token = case(r.record.input.trim());
    let mut out: Vec<String> = Vec::new();
    let push = |t: String, out: &mut Vec<String>| {
        if !t.is_empty() && !out.contains(&t) {
            out.push(t);
        }
    };
    let analyses = &r.record.analyses;
    let Some(best) = analyses.first().filter(|_| r.passthrough.is_none()) else {
        push(token, &mut out);
        return out;
    };
    let chosen: Vec<&Analysis> = if o.best_only {
        vec![best]
    } else {
        analyses
            .iter()
            .filter(|a| a.score >= best.score - o.margin)
            .collect()
    };
    let split = chosen.iter().any(|a| a.parts.len() > 1);
    if o.keep_original || !split {
        push(token.clone(), &mut out);
    }
    for a in chosen {
        if a.parts.len() < 2 {
            continue;
        }
        for p in &a.parts {
            let term = if o.lemmas { p.lemma() } else { &p.form };
            if term.chars().count() >= o.min_term_length {
                push(case(term), &mut out);
            }
        }
    }
    if out.is_empty() {
        push(token, &mut out);
    }
    out
}

/// One token in the `terms` format: the token as given, a tab, and its index
/// terms separated by single spaces (see [`terms`]).
pub fn split_terms(r: &crate::analyzer::TokenRecord, o: &TermsOptions) -> String {
    let clean = |s: &str| s.replace(['\t', '\n', '\r'], " ");
    format!(
        "{}\t{}\n",
        clean(r.record.input.trim()),
        terms(r, o)
            .iter()
            .map(|t| clean(t))
            .collect::<Vec<_>>()
            .join(" ")
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use num_bigint::BigUint;

    fn head(reason: Option<Truncation>) -> SplitHead {
        SplitHead {
            count: Count(BigUint::from(7u32)),
            reason,
            error: None,
        }
    }

    fn summary(listed: usize, reason: Option<Truncation>) -> SplitSummary {
        SplitSummary {
            count: Count(BigUint::from(7u32)),
            listed,
            truncated: reason.is_some(),
            reason,
            error: None,
        }
    }

    /// TSV names a limit known before the search in the third column, as the
    /// record does, and one the search found (its work limit) last.
    #[test]
    fn streamed_tsv_names_a_late_limit_in_a_last_column() {
        let mut s = Streamer::new(Format::Tsv, "Wort");
        assert_eq!(
            s.head(&head(Some(Truncation::Parts)), None),
            "Wort\t7\ttruncated: parts"
        );
        assert_eq!(
            s.end(&summary(7, Some(Truncation::Parts)), None, None),
            "\n"
        );
        let mut s = Streamer::new(Format::Tsv, "Wort");
        assert_eq!(s.head(&head(Some(Truncation::Limit)), None), "Wort\t7");
        assert_eq!(
            s.end(&summary(2, Some(Truncation::Limit)), None, None),
            "\n"
        );
        let mut s = Streamer::new(Format::Tsv, "Wort");
        assert_eq!(s.head(&head(None), None), "Wort\t7");
        assert_eq!(
            s.end(&summary(3, Some(Truncation::SearchSize)), None, None),
            "\ttruncated: search-size\n"
        );
    }

    /// Text gives the note of an incomplete listing after it; JSONL a trailer.
    #[test]
    fn streamed_text_and_jsonl_end_with_the_summary() {
        let mut s = Streamer::new(Format::Text, "Wort");
        assert_eq!(s.head(&head(None), None), "Wort: 7 analyses\n");
        assert_eq!(
            s.end(&summary(3, Some(Truncation::SearchSize)), None, None),
            "  (3 shown; the ranked search reached its work limit)\n"
        );
        let mut s = Streamer::new(Format::Jsonl, "Wort");
        assert_eq!(s.head(&head(None), None), "");
        assert_eq!(
            s.end(&summary(3, Some(Truncation::SearchSize)), None, None),
            "{\"input\":\"Wort\",\"count\":7,\"listed\":3,\"truncated\":true,\"reason\":\"search-size\"}\n"
        );
    }
}
