//! Output stage: renderings of split and join results. `text` is a readable
//! proof chain; `jsonl` one JSON object per input line; `json` a JSON array;
//! `yaml` a YAML sequence; `tsv` one line per input.

use crate::analyzer::SplitRecord;
use crate::proof::{Analysis, JoinResult};
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

/// A split record as text.
pub fn split_text(r: &SplitRecord) -> String {
    let mut out = String::new();
    let noun = if r.count.0 == 1u32.into() {
        "analysis"
    } else {
        "analyses"
    };
    let _ = write!(out, "{}: {} {}", r.input, r.count, noun);
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

/// A split record as one TSV line: input, count, then `error: …` or
/// `truncated: REASON` when a limit other than the number listed cut it, then
/// for each analysis the parts joined by `+`, the rules joined by `,`, and the score.
pub fn split_tsv(r: &SplitRecord) -> String {
    let clean = |s: &str| s.replace(['\t', '\n', '\r'], " ");
    let mut cols = vec![clean(&r.input), r.count.to_string()];
    if let Some(e) = &r.error {
        cols.push(format!("error: {}", clean(e)));
    } else if let Some(reason) = r.reason.filter(|&x| x != crate::lattice::Truncation::Limit) {
        // A limit other than the number listed cut the search: say which,
        // in the same place an error would stand.
        cols.push(format!(
            "truncated: {}",
            serde_json::to_value(reason)
                .ok()
                .and_then(|v| v.as_str().map(str::to_string))
                .unwrap_or_default()
        ));
    }
    for a in &r.analyses {
        cols.push(
            a.parts
                .iter()
                .map(|p| clean(&p.form))
                .collect::<Vec<_>>()
                .join("+"),
        );
        cols.push(
            a.junctions
                .iter()
                .map(|j| j.rule.clone())
                .collect::<Vec<_>>()
                .join(","),
        );
        cols.push(a.score.to_string());
    }
    cols.join("\t") + "\n"
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
