//! Text normalization and segmentation, shared by the rules, the lexicon and
//! the input: Unicode normal form, case folding, letter folds of a variant,
//! and the multi-letter segments of a rule-set.

use crate::rules::ast::NormalForm;
use std::collections::{BTreeMap, BTreeSet};
use unicode_normalization::UnicodeNormalization;

/// How a rule-set wants text normalized before matching.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Normalizer {
    /// Unicode normal form.
    pub form: NormalForm,
    /// Whether letters are lowercased.
    pub fold_case: bool,
    /// Single letters replaced by strings (from selected variants), e.g. `ß` → `ss`.
    pub folds: BTreeMap<char, String>,
}

impl Default for Normalizer {
    fn default() -> Self {
        Normalizer {
            form: NormalForm::Nfc,
            fold_case: false,
            folds: BTreeMap::new(),
        }
    }
}

/// A normalized text with a map back to the characters of the original.
#[derive(Debug, Clone)]
pub struct MappedText {
    /// The original text, in NFC.
    pub original: Vec<char>,
    /// The normalized characters.
    pub chars: Vec<char>,
    /// For each normalized character, the index of the original character it came from.
    pub origin: Vec<usize>,
}

impl MappedText {
    /// Maps a normalized offset (0..=len) to an original offset.
    pub fn original_offset(&self, normalized: usize) -> usize {
        if normalized >= self.chars.len() {
            self.original.len()
        } else {
            self.origin[normalized]
        }
    }

    /// The original text between two normalized offsets.
    pub fn original_slice(&self, start: usize, end: usize) -> String {
        let a = self.original_offset(start);
        let b = self.original_offset(end).max(a);
        self.original[a..b].iter().collect()
    }

    /// The normalized text as a string.
    pub fn normalized(&self) -> String {
        self.chars.iter().collect()
    }
}

impl Normalizer {
    /// Normalizes a string (lexicon forms, rule literals).
    pub fn normalize(&self, text: &str) -> String {
        self.map(text).chars.into_iter().collect()
    }

    fn fold_char(&self, c: char, out: &mut Vec<char>) {
        let push = |c: char, out: &mut Vec<char>| match self.folds.get(&c) {
            Some(s) => out.extend(s.chars()),
            None => out.push(c),
        };
        if self.fold_case && c.is_uppercase() {
            // German capital sharp s lowercases to ß.
            for l in c.to_lowercase() {
                push(l, out);
            }
        } else {
            push(c, out);
        }
    }

    /// Normalizes a text and keeps the map from normalized to original characters.
    /// Offsets of the original are counted in the NFC form of the input.
    pub fn map(&self, text: &str) -> MappedText {
        let original: Vec<char> = if is_nfc(text.chars()) {
            text.chars().collect()
        } else {
            text.nfc().collect()
        };
        let mut chars = Vec::with_capacity(original.len());
        let mut origin = Vec::with_capacity(original.len());
        // An ASCII letter is its own normal form; folding it is at most
        // lowercasing, unless a fold replaces an ASCII letter.
        let ascii_plain = !self.folds.keys().any(char::is_ascii);
        for (i, &c) in original.iter().enumerate() {
            if ascii_plain && c.is_ascii() {
                chars.push(if self.fold_case {
                    c.to_ascii_lowercase()
                } else {
                    c
                });
                origin.push(i);
                continue;
            }
            let before = chars.len();
            match self.form {
                NormalForm::Nfd => {
                    let mut buf = Vec::new();
                    self.fold_char(c, &mut buf);
                    let s: String = buf.into_iter().collect();
                    chars.extend(s.nfd());
                }
                _ => self.fold_char(c, &mut chars),
            }
            origin.extend(std::iter::repeat(i).take(chars.len() - before));
        }
        if self.form == NormalForm::Nfc
            && (self.fold_case || !self.folds.is_empty())
            && !is_nfc(chars.iter().copied())
        {
            // Folding can leave a decomposed sequence; recompose, keeping the map
            // when the length does not change (the common case).
            let s: String = chars.iter().collect();
            let recomposed: Vec<char> = s.nfc().collect();
            if recomposed.len() != chars.len() {
                origin = recompose_origin(&chars, &origin);
                chars = recomposed;
            } else {
                chars = recomposed;
            }
        }
        MappedText {
            original,
            chars,
            origin,
        }
    }
}

/// Whether a text is certainly in NFC already (then composing it changes
/// nothing): ASCII, or passing Unicode's quick check.
fn is_nfc<I: Iterator<Item = char> + Clone>(chars: I) -> bool {
    chars.clone().all(|c| c.is_ascii())
        || unicode_normalization::is_nfc_quick(chars) == unicode_normalization::IsNormalized::Yes
}

fn recompose_origin(chars: &[char], origin: &[usize]) -> Vec<usize> {
    // Recompose cluster by cluster (a starter and its following marks).
    let mut out = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let mut j = i + 1;
        while j < chars.len()
            && unicode_normalization::char::canonical_combining_class(chars[j]) != 0
        {
            j += 1;
        }
        let cluster: String = chars[i..j].iter().collect();
        let n = cluster.nfc().count();
        out.extend(std::iter::repeat(origin[i]).take(n));
        i = j;
    }
    out
}

/// Splits text into the segments of a rule-set: declared multi-letter units
/// (such as `ai`, `kh`) taken greedily longest-first, else single characters.
#[derive(Debug, Clone, Default, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Segmenter {
    multi: BTreeSet<Vec<char>>,
    longest: usize,
}

impl Segmenter {
    /// A segmenter for these multi-letter segments (already normalized).
    pub fn new<I: IntoIterator<Item = String>>(segments: I) -> Self {
        let multi: BTreeSet<Vec<char>> = segments
            .into_iter()
            .map(|s| s.chars().collect::<Vec<_>>())
            .filter(|s| s.len() > 1)
            .collect();
        let longest = multi.iter().map(|s| s.len()).max().unwrap_or(1);
        Segmenter { multi, longest }
    }

    /// The multi-letter segments.
    pub fn multi_letter(&self) -> impl Iterator<Item = String> + '_ {
        self.multi.iter().map(|s| s.iter().collect())
    }

    /// Whether there are no multi-letter segments.
    pub fn is_trivial(&self) -> bool {
        self.multi.is_empty()
    }

    /// For a text of `n` characters, `n + 1` flags: true where a segment boundary falls.
    pub fn boundaries(&self, chars: &[char]) -> Vec<bool> {
        let mut flags = vec![false; chars.len() + 1];
        flags[0] = true;
        if self.multi.is_empty() {
            flags.iter_mut().for_each(|f| *f = true);
            return flags;
        }
        let mut i = 0;
        while i < chars.len() {
            let mut step = 1;
            for len in (2..=self.longest.min(chars.len() - i)).rev() {
                if self.multi.contains(&chars[i..i + len]) {
                    step = len;
                    break;
                }
            }
            i += step;
            flags[i] = true;
        }
        flags
    }

    /// Whether character offset `at` of `word` is a segment boundary.
    pub fn is_boundary(&self, word: &str, at: usize) -> bool {
        if self.multi.is_empty() || at == 0 {
            return true;
        }
        let chars: Vec<char> = word.chars().collect();
        at <= chars.len() && self.boundaries(&chars)[at]
    }

    /// Splits a text into segments.
    pub fn split(&self, text: &str) -> Vec<String> {
        let chars: Vec<char> = text.chars().collect();
        let flags = self.boundaries(&chars);
        let mut out = Vec::new();
        let mut start = 0;
        for (i, &f) in flags.iter().enumerate().skip(1) {
            if f {
                out.push(chars[start..i].iter().collect());
                start = i;
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn folds_case_and_keeps_offsets() {
        let n = Normalizer {
            fold_case: true,
            ..Normalizer::default()
        };
        let m = n.map("ArbeitsAmt");
        assert_eq!(m.normalized(), "arbeitsamt");
        assert_eq!(m.original_slice(7, 10), "Amt");
    }

    #[test]
    fn combining_input_is_composed() {
        let n = Normalizer::default();
        assert_eq!(n.normalize("a\u{0304}"), "ā");
    }

    #[test]
    fn variant_fold_expands_letters() {
        let mut n = Normalizer {
            fold_case: true,
            ..Normalizer::default()
        };
        n.folds.insert('ß', "ss".into());
        let m = n.map("Straße");
        assert_eq!(m.normalized(), "strasse");
        assert_eq!(m.original_slice(4, 6), "ß");
    }

    #[test]
    fn a_fold_of_an_ascii_letter_still_applies() {
        let mut n = Normalizer {
            fold_case: true,
            ..Normalizer::default()
        };
        n.folds.insert('q', "kw".into());
        let m = n.map("Quai");
        assert_eq!(m.normalized(), "kwuai");
        assert_eq!(m.origin, [0, 0, 1, 2, 3]);
        // Without case folding, ASCII capitals stay.
        let plain = Normalizer::default();
        assert_eq!(plain.normalize("ÄrgerAmt"), "ÄrgerAmt");
    }

    #[test]
    fn segments_are_taken_longest_first() {
        let s = Segmenter::new(["ai".to_string(), "kh".to_string()]);
        assert_eq!(s.split("khaita"), vec!["kh", "ai", "t", "a"]);
        assert!(!s.is_boundary("kha", 1));
        assert!(s.is_boundary("kha", 2));
    }
}
