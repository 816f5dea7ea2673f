//! Lexicon stage: TSV word lists → normalized, merged entries → an FST index
//! that can be walked one character at a time from any state.
//!
//! TSV format: `form<TAB>frequency<TAB>tags`, `#` starts a comment line,
//! frequency and tags are optional, tags are `key=value` pairs separated by
//! `;`. A second column that is not a number but contains `=` is read as tags.
//! Forms are normalized as the rule-set says (Unicode form, case folding,
//! variant folds); forms that normalize to the same key are merged: their
//! frequencies add up, their tag sets are kept as separate readings, and the
//! most frequent spelling is kept for display.

pub mod bundled;
pub mod compiled;
pub mod sanskrit;
mod step_cache;
mod tags;

use crate::normalize::Normalizer;
use crate::rules::{Condition, RuleSet};
use compiled::{IndexBytes, LazyEntries};
use fst::raw::{CompiledAddr, Output};
use std::collections::{BTreeSet, HashMap};
pub use step_cache::StepCache;

/// Largest frequency an entry keeps (larger ones, and sums of duplicates
/// that overflow, are capped): the compiled format stores frequencies as
/// 32-bit floats, and a frequency of `1e308` must neither become infinite
/// there nor make the sum of all frequencies infinite.
pub const MAX_FREQUENCY: f64 = f32::MAX as f64;

pub use tags::Tags;

/// One lexicon entry.
#[derive(Debug, Clone, PartialEq)]
pub struct Entry {
    /// The normalized form used for matching.
    pub key: String,
    /// The form as written in the lexicon (the most frequent spelling).
    pub form: String,
    /// Frequency (1 when no file gave one).
    pub frequency: f64,
    /// Tag sets, one per reading.
    pub readings: Vec<Tags>,
}

/// A problem with one lexicon line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LexiconIssue {
    /// File name.
    pub file: String,
    /// 1-based line number.
    pub line: usize,
    /// What is wrong.
    pub message: String,
}

impl std::fmt::Display for LexiconIssue {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}:{}: {}", self.file, self.line, self.message)
    }
}

/// Errors that stop a lexicon from loading.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum LexiconError {
    /// A malformed line, in strict mode.
    #[error("{0} (strict mode: malformed lines are fatal)")]
    Malformed(LexiconIssue),
    /// The file could not be read.
    #[error("cannot read lexicon {file}: {source}")]
    Io {
        /// File name.
        file: String,
        /// The underlying error.
        source: std::io::Error,
    },
    /// Building the index failed.
    #[error("cannot build the lexicon index: {0}")]
    Index(#[from] fst::Error),
    /// A compiled index file is unusable.
    #[error("{file}: {message}")]
    BadIndex {
        /// File name.
        file: String,
        /// What is wrong and how to fix it.
        message: String,
    },
}

#[derive(Debug, Default)]
struct Accumulator {
    frequency: Option<f64>,
    spellings: Vec<(String, f64)>,
    readings: Vec<Tags>,
}

/// Collects entries from files and builds a [`Lexicon`].
#[derive(Debug)]
pub struct LexiconBuilder {
    normalizer: Normalizer,
    strict: bool,
    entries: HashMap<String, Accumulator>,
    issues: Vec<LexiconIssue>,
    lines_read: usize,
}

impl LexiconBuilder {
    /// A builder normalizing forms as `normalizer` says.
    pub fn new(normalizer: &Normalizer) -> Self {
        LexiconBuilder {
            normalizer: normalizer.clone(),
            strict: false,
            entries: HashMap::new(),
            issues: Vec::new(),
            lines_read: 0,
        }
    }

    /// In strict mode the first malformed line is an error; otherwise it is skipped
    /// and listed in [`issues`](Self::issues).
    pub fn strict(mut self, strict: bool) -> Self {
        self.strict = strict;
        self
    }

    /// Malformed lines skipped so far.
    pub fn issues(&self) -> &[LexiconIssue] {
        &self.issues
    }

    /// Adds one entry.
    pub fn add(&mut self, form: &str, frequency: Option<f64>, tags: Tags) {
        let key = self.normalizer.normalize(form);
        if key.is_empty() {
            return;
        }
        let acc = self.entries.entry(key).or_default();
        if let Some(f) = frequency {
            *acc.frequency.get_or_insert(0.0) += f;
        }
        match acc.spellings.iter_mut().find(|(s, _)| s == form) {
            Some((_, f)) => *f += frequency.unwrap_or(0.0),
            None => acc
                .spellings
                .push((form.to_string(), frequency.unwrap_or(0.0))),
        }
        if !acc.readings.contains(&tags) {
            acc.readings.push(tags);
        }
    }

    fn issue(&mut self, file: &str, line: usize, message: String) -> Result<(), LexiconError> {
        let issue = LexiconIssue {
            file: file.to_string(),
            line,
            message,
        };
        if self.strict {
            return Err(LexiconError::Malformed(issue));
        }
        self.issues.push(issue);
        Ok(())
    }

    /// Adds every line of a TSV text. Lines that are not UTF-8 or malformed
    /// are reported with their line number.
    pub fn add_tsv(&mut self, file: &str, bytes: &[u8]) -> Result<(), LexiconError> {
        for (i, raw) in bytes.split(|&b| b == b'\n').enumerate() {
            let line_no = i + 1;
            let raw = raw.strip_suffix(b"\r").unwrap_or(raw);
            let Ok(line) = std::str::from_utf8(raw) else {
                self.issue(file, line_no, "the line is not UTF-8".into())?;
                continue;
            };
            let line = line.strip_prefix('\u{FEFF}').unwrap_or(line);
            if line.trim().is_empty() || line.trim_start().starts_with('#') {
                continue;
            }
            self.lines_read += 1;
            match parse_line(line) {
                Ok((form, freq, tags)) => self.add(form, freq, tags),
                Err(message) => self.issue(file, line_no, message)?,
            }
        }
        Ok(())
    }

    /// Reads a TSV file from disk.
    pub fn add_tsv_file(&mut self, path: &std::path::Path) -> Result<(), LexiconError> {
        let name = path.display().to_string();
        let bytes = std::fs::read(path).map_err(|source| LexiconError::Io {
            file: name.clone(),
            source,
        })?;
        if compiled::is_compiled(&bytes) {
            // A compiled lexicon given with other sources: its entries are
            // re-normalized the way this builder normalizes.
            let lexicon = compiled::load(&name, IndexBytes::owned(bytes), None)?;
            self.add_lexicon(&lexicon);
            return Ok(());
        }
        self.add_tsv(&name, &bytes)
    }

    /// Adds every entry of another lexicon (each reading separately), by its
    /// display spelling, so that this builder's normalization applies.
    pub fn add_lexicon(&mut self, lexicon: &Lexicon) {
        for e in lexicon.entries() {
            for (i, r) in e.readings.iter().enumerate() {
                let frequency = if i == 0 { Some(e.frequency) } else { None };
                self.add(&e.form, frequency, r.clone());
            }
        }
    }

    /// Builds the index. Frequencies are capped at [`MAX_FREQUENCY`].
    pub fn build(self) -> Result<Lexicon, LexiconError> {
        let mut keys: Vec<(String, Accumulator)> = self.entries.into_iter().collect();
        keys.sort_by(|a, b| a.0.as_bytes().cmp(b.0.as_bytes()));
        let mut builder = fst::MapBuilder::memory();
        let mut entries = Vec::with_capacity(keys.len());
        for (i, (key, acc)) in keys.into_iter().enumerate() {
            builder.insert(key.as_bytes(), i as u64)?;
            let form = acc
                .spellings
                .iter()
                .fold(None::<&(String, f64)>, |best, s| match best {
                    Some(b) if b.1 >= s.1 => Some(b),
                    _ => Some(s),
                })
                .map(|s| s.0.clone())
                .unwrap_or_else(|| key.clone());
            let mut readings = acc.readings;
            if readings.len() > 1 {
                readings.retain(|r| !r.is_empty());
            }
            entries.push(Entry {
                key,
                form,
                frequency: acc.frequency.unwrap_or(1.0).clamp(0.0, MAX_FREQUENCY),
                readings,
            });
        }
        let bytes = builder.into_inner()?;
        let index = fst::Map::new(IndexBytes::owned(bytes))?;
        Ok(Lexicon::from_parts(
            index,
            entries,
            normalizer_fingerprint(&self.normalizer),
        ))
    }
}

fn parse_line(line: &str) -> Result<(&str, Option<f64>, Tags), String> {
    let mut cols = line.split('\t');
    let form = cols.next().unwrap_or("").trim();
    if form.is_empty() {
        return Err("the form (first column) is empty".into());
    }
    let mut frequency = None;
    let mut tags_col = None;
    if let Some(second) = cols.next() {
        let second = second.trim();
        if !second.is_empty() {
            match second.parse::<f64>() {
                Ok(f) if f.is_finite() && f >= 0.0 => frequency = Some(f),
                Ok(_) => return Err(format!("frequency `{second}` is not a finite number ≥ 0")),
                Err(_) if second.contains('=') => tags_col = Some(second),
                Err(_) => return Err(format!("frequency `{second}` is not a number")),
            }
        }
    }
    if let Some(third) = cols.next() {
        if tags_col.is_some() && !third.trim().is_empty() {
            return Err("tags given twice (second and third column)".into());
        }
        if !third.trim().is_empty() {
            tags_col = Some(third.trim());
        }
    }
    if cols.next().is_some_and(|c| !c.trim().is_empty()) {
        return Err("more than three columns".into());
    }
    let tags = match tags_col {
        Some(t) => parse_tags(t)?,
        None => Tags::new(),
    };
    Ok((form, frequency, tags))
}

/// Parses `key=value;key=value`.
pub fn parse_tags(text: &str) -> Result<Tags, String> {
    let mut tags = Tags::new();
    for pair in text.split(';').map(str::trim).filter(|p| !p.is_empty()) {
        let Some((k, v)) = pair.split_once('=') else {
            return Err(format!("tag `{pair}` is not of the form key=value"));
        };
        let (k, v) = (k.trim(), v.trim());
        if k.is_empty() {
            return Err(format!("tag `{pair}` has an empty key"));
        }
        tags.insert(k, v);
    }
    Ok(tags)
}

/// A compiled lexicon: entries plus an FST from normalized form to entry.
#[derive(Debug, Clone)]
pub struct Lexicon {
    /// A number of its own in this process (see [`StepCache`]).
    id: u64,
    /// Address of the index's root node (found once: finding it decodes it).
    root: CompiledAddr,
    index: fst::Map<IndexBytes>,
    store: Store,
    total_frequency: f64,
    tag_keys: BTreeSet<String>,
    fingerprint: String,
}

#[derive(Debug, Clone)]
enum Store {
    Owned(Vec<Entry>),
    Lazy(LazyEntries),
}

/// A short description of a normalization, stored in compiled lexicons so a
/// file built for another normalization is refused.
pub fn normalizer_fingerprint(n: &Normalizer) -> String {
    let folds: Vec<String> = n.folds.iter().map(|(a, b)| format!("{a}={b}")).collect();
    format!(
        "{:?};fold-case={};folds=[{}]",
        n.form,
        n.fold_case,
        folds.join(",")
    )
}

/// A position in the lexicon index: the entries that start with what has been
/// walked so far.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Cursor {
    addr: CompiledAddr,
    output: u64,
}

impl Lexicon {
    fn from_parts(
        index: fst::Map<IndexBytes>,
        entries: Vec<Entry>,
        fingerprint: String,
    ) -> Lexicon {
        let total_frequency = entries.iter().map(|e| e.frequency).sum::<f64>().max(1.0);
        let tag_keys = entries
            .iter()
            .flat_map(|e| e.readings.iter().flat_map(|r| r.keys().map(str::to_string)))
            .collect();
        Lexicon {
            id: step_cache::next_lexicon_id(),
            root: index.as_fst().root().addr(),
            index,
            store: Store::Owned(entries),
            total_frequency,
            tag_keys,
            fingerprint,
        }
    }

    fn from_compiled(
        index: fst::Map<IndexBytes>,
        entries: LazyEntries,
        total_frequency: f64,
        tag_keys: BTreeSet<String>,
        fingerprint: String,
    ) -> Lexicon {
        Lexicon {
            id: step_cache::next_lexicon_id(),
            root: index.as_fst().root().addr(),
            index,
            store: Store::Lazy(entries),
            total_frequency,
            tag_keys,
            fingerprint,
        }
    }

    /// The raw bytes of the FST index.
    pub fn fst_bytes(&self) -> &[u8] {
        self.index.as_fst().as_bytes()
    }

    /// The normalization this lexicon was built with.
    pub fn fingerprint(&self) -> &str {
        &self.fingerprint
    }

    /// Writes the lexicon in the compiled format (see [`compiled`]).
    pub fn to_compiled(&self, sources: &[String]) -> Vec<u8> {
        compiled::write(self, sources)
    }

    /// An empty lexicon.
    pub fn empty() -> Lexicon {
        let bytes = fst::MapBuilder::memory().into_inner().unwrap_or_default();
        let index = fst::Map::new(IndexBytes::owned(bytes)).expect("an empty map always loads");
        Lexicon::from_parts(
            index,
            Vec::new(),
            normalizer_fingerprint(&Normalizer::default()),
        )
    }

    /// Number of entries.
    pub fn len(&self) -> usize {
        match &self.store {
            Store::Owned(v) => v.len(),
            Store::Lazy(l) => l.len(),
        }
    }

    /// Whether there are no entries.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Sum of all frequencies.
    pub fn total_frequency(&self) -> f64 {
        self.total_frequency
    }

    /// Every tag key used by some entry.
    pub fn tag_keys(&self) -> &BTreeSet<String> {
        &self.tag_keys
    }

    /// All entries, in key order.
    pub fn entries(&self) -> impl Iterator<Item = &Entry> + '_ {
        (0..self.len()).map(move |i| self.entry(i))
    }

    /// Entry by index.
    pub fn entry(&self, id: usize) -> &Entry {
        match &self.store {
            Store::Owned(v) => &v[id],
            Store::Lazy(l) => l.get(id),
        }
    }

    /// An entry's display spelling (the same as `entry(id).form`) when its
    /// key is `key`, without building the entry of a compiled lexicon.
    pub fn form(&self, id: usize, key: &str) -> String {
        match &self.store {
            Store::Owned(v) => v[id].form.clone(),
            Store::Lazy(l) => l.form(id, key),
        }
    }

    /// An entry's readings (the same as `entry(id).readings`, without
    /// building the entry of a compiled lexicon).
    pub fn readings(&self, id: usize) -> &[Tags] {
        match &self.store {
            Store::Owned(v) => &v[id].readings,
            Store::Lazy(l) => l.readings(id),
        }
    }

    /// An entry's frequency (the same as `entry(id).frequency`, without
    /// building the entry of a compiled lexicon).
    pub fn frequency(&self, id: usize) -> f64 {
        match &self.store {
            Store::Owned(v) => v[id].frequency,
            Store::Lazy(l) => l.frequency(id),
        }
    }

    /// For a compiled lexicon, the number of an entry's set of readings
    /// (entries with the same number have the same readings); `None` for
    /// other lexicons.
    pub fn reading_set(&self, id: usize) -> Option<usize> {
        match &self.store {
            Store::Owned(_) => None,
            Store::Lazy(l) => Some(l.reading_set(id)),
        }
    }

    /// For a compiled lexicon, how many sets of readings it has (the numbers
    /// [`reading_set`](Self::reading_set) gives are below it in a sound file);
    /// `None` for other lexicons.
    pub fn reading_set_count(&self) -> Option<usize> {
        match &self.store {
            Store::Owned(_) => None,
            Store::Lazy(l) => Some(l.reading_set_count()),
        }
    }

    /// Looks up a normalized key.
    pub fn get(&self, key: &str) -> Option<usize> {
        self.index.get(key.as_bytes()).map(|v| v as usize)
    }

    /// The state before any character.
    pub fn root(&self) -> Cursor {
        Cursor {
            addr: self.root,
            output: 0,
        }
    }

    /// Walks one byte.
    pub fn step(&self, cursor: Cursor, byte: u8) -> Option<Cursor> {
        let fst = self.index.as_fst();
        let node = fst.node(cursor.addr);
        let t = node.transition(node.find_input(byte)?);
        Some(Cursor {
            addr: t.addr,
            output: Output::new(cursor.output).cat(t.out).value(),
        })
    }

    /// Walks the bytes of a string.
    pub fn step_str(&self, mut cursor: Cursor, text: &str) -> Option<Cursor> {
        for b in text.bytes() {
            cursor = self.step(cursor, b)?;
        }
        Some(cursor)
    }

    /// Walks one character.
    pub fn step_char(&self, cursor: Cursor, c: char) -> Option<Cursor> {
        let mut buf = [0u8; 4];
        self.step_str(cursor, c.encode_utf8(&mut buf))
    }

    /// The entry that ends exactly here, if any.
    pub fn entry_at(&self, cursor: Cursor) -> Option<usize> {
        let node = self.index.as_fst().node(cursor.addr);
        node.is_final()
            .then(|| Output::new(cursor.output).cat(node.final_output()).value() as usize)
    }

    /// Whether a condition holds for an entry.
    pub fn holds(&self, id: usize, condition: &Condition) -> bool {
        let e = self.entry(id);
        condition_holds(condition, &e.key, &e.readings)
    }

    /// Log-probability of an entry's frequency, add-one smoothed over the lexicon.
    pub fn log_probability(&self, frequency: f64) -> f64 {
        ((frequency + 1.0) / (self.total_frequency + self.len() as f64 + 1.0)).ln()
    }

    /// Loads the lexicon a rule-set names (`set lexicon = NAME`) plus extra
    /// files (TSV or compiled). With only the bundled lexicon, or only one
    /// compiled file, nothing is parsed: the compiled index is used directly.
    pub fn for_rules(
        rules: &RuleSet,
        extra: &[std::path::PathBuf],
        include_default: bool,
        strict: bool,
    ) -> Result<(Lexicon, Vec<LexiconIssue>), LexiconError> {
        let fingerprint = normalizer_fingerprint(&rules.normalizer);
        let default = if include_default {
            rules.settings.lexicon.as_deref()
        } else {
            None
        };
        if extra.is_empty() {
            if let Some(name) = default {
                if let Some(lex) = bundled::compiled(name, &fingerprint) {
                    return Ok((lex, Vec::new()));
                }
            }
        }
        if default.is_none() && extra.len() == 1 {
            let path = &extra[0];
            let name = path.display().to_string();
            let bytes = std::fs::read(path).map_err(|source| LexiconError::Io {
                file: name.clone(),
                source,
            })?;
            if compiled::is_compiled(&bytes) {
                return Ok((
                    compiled::load(&name, IndexBytes::owned(bytes), Some(&fingerprint))?,
                    Vec::new(),
                ));
            }
        }
        let mut builder = LexiconBuilder::new(&rules.normalizer).strict(strict);
        if let Some(name) = default {
            bundled::add_bundled(&mut builder, name)?;
        }
        for path in extra {
            builder.add_tsv_file(path)?;
        }
        let issues = builder.issues().to_vec();
        Ok((builder.build()?, issues))
    }
}

/// Whether one reading of a form satisfies all the conditions together (a
/// form without readings is tested as having no tags). `Liebes` (an
/// inflected adjective, or the noun Liebe in the genitive) satisfies
/// `pos = noun and inflected != yes` through its noun reading, although its
/// other reading is inflected.
pub fn conditions_hold<C: std::borrow::Borrow<Condition>>(
    conditions: &[C],
    key: &str,
    readings: &[Tags],
) -> bool {
    let all = |rs: &[Tags]| {
        conditions
            .iter()
            .all(|c| condition_holds(c.borrow(), key, rs))
    };
    if readings.len() <= 1 {
        return all(readings);
    }
    readings.iter().any(|r| all(std::slice::from_ref(r)))
}

/// The condition value that matches any value of the key (`left.lemma != *`:
/// the reading has no `lemma` tag).
pub const ANY_VALUE: &str = "*";

/// Evaluates a tag condition against a form and its readings. The key `form`
/// tests the normalized form itself.
pub fn condition_holds(condition: &Condition, key: &str, readings: &[Tags]) -> bool {
    fn value_of<'t>(r: &'t Tags, key: &str) -> Option<&'t str> {
        r.get(key)
    }
    if let Some(bound) = condition.bound {
        // `letters` counts the form's characters; another key's value is
        // read as a whole number (a value that is not one does not hold).
        if condition.key == crate::rules::ast::LETTERS_KEY {
            return bound.admits(key.chars().count() as u64);
        }
        return readings.iter().any(|r| {
            value_of(r, &condition.key).is_some_and(|v| {
                v.split('|')
                    .any(|x| x.parse::<u64>().is_ok_and(|n| bound.admits(n)))
            })
        });
    }
    let is_form = condition.key == "form";
    let matches = |v: &str| match &condition.test {
        Some((_, values)) => v
            .split('|')
            .any(|x| values.iter().any(|w| w == x || w == ANY_VALUE)),
        None => true,
    };
    let test = |v: Option<&str>| v.is_some_and(matches);
    let any = if is_form {
        test(Some(key))
    } else if readings.is_empty() {
        false
    } else {
        readings.iter().any(|r| test(value_of(r, &condition.key)))
    };
    match &condition.test {
        Some((false, _)) => !any,
        _ => any,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lexicon(text: &str) -> (Lexicon, Vec<LexiconIssue>) {
        let n = Normalizer {
            fold_case: true,
            ..Normalizer::default()
        };
        let mut b = LexiconBuilder::new(&n);
        b.add_tsv("t.tsv", text.as_bytes()).unwrap();
        let issues = b.issues().to_vec();
        (b.build().unwrap(), issues)
    }

    fn cond(key: &str, equal: bool, value: &str) -> Condition {
        Condition {
            side: crate::rules::ast::Side::Left,
            key: key.into(),
            bound: None,
            test: Some((equal, vec![value.into()])),
        }
    }

    fn bound(key: &str, at_least: bool, value: u64) -> Condition {
        Condition {
            side: crate::rules::ast::Side::Left,
            key: key.into(),
            bound: Some(crate::rules::ast::Bound { at_least, value }),
            test: None,
        }
    }

    #[test]
    fn letters_bounds_count_characters_and_other_bounds_read_numbers() {
        // `letters` counts characters, not bytes: `kyrka` and `själ` both qualify.
        assert!(condition_holds(&bound("letters", true, 4), "själ", &[]));
        assert!(condition_holds(&bound("letters", true, 5), "kyrka", &[]));
        assert!(!condition_holds(&bound("letters", true, 4), "ska", &[]));
        assert!(condition_holds(&bound("letters", false, 3), "ska", &[]));
        assert!(!condition_holds(&bound("letters", false, 3), "själ", &[]));
        // Another key: some reading's value, read as a whole number.
        let r = vec![tags(&[("syllables", "2")]), tags(&[("syllables", "x")])];
        assert!(condition_holds(&bound("syllables", true, 2), "w", &r));
        assert!(!condition_holds(&bound("syllables", true, 3), "w", &r));
        assert!(!condition_holds(&bound("syllables", false, 1), "w", &[]));
    }

    fn tags(pairs: &[(&str, &str)]) -> Tags {
        pairs
            .iter()
            .map(|(k, v)| (k.to_string(), v.to_string()))
            .collect()
    }

    #[test]
    fn any_value_matches_every_value_and_its_negation_needs_the_tag_absent() {
        let with = [tags(&[("pos", "noun"), ("lemma", "Huhn")])];
        let without = [tags(&[("pos", "noun")])];
        assert!(condition_holds(&cond("lemma", true, "*"), "hühner", &with));
        assert!(!condition_holds(
            &cond("lemma", false, "*"),
            "hühner",
            &with
        ));
        assert!(condition_holds(
            &cond("lemma", false, "*"),
            "huhn",
            &without
        ));
        assert!(!condition_holds(
            &cond("lemma", true, "*"),
            "huhn",
            &without
        ));
    }

    #[test]
    fn a_sides_conditions_hold_together_in_one_reading() {
        // liebes: an inflected adjective, or the noun Liebe in the genitive.
        let readings = [
            tags(&[("pos", "adj"), ("inflected", "yes")]),
            tags(&[("pos", "noun"), ("lemma", "Liebe")]),
        ];
        let noun_not_inflected = [cond("pos", true, "noun"), cond("inflected", false, "yes")];
        assert!(conditions_hold(&noun_not_inflected, "liebes", &readings));
        // No single reading is an adjective that is not inflected.
        let adj_not_inflected = [cond("pos", true, "adj"), cond("inflected", false, "yes")];
        assert!(!conditions_hold(&adj_not_inflected, "liebes", &readings));
        // Although a reading is an adjective.
        assert!(condition_holds(&adj_not_inflected[0], "liebes", &readings));
    }

    #[test]
    fn merges_duplicates_and_keeps_readings() {
        let (lex, issues) =
            lexicon("Essen\t30\tpos=noun\nessen\t50\tpos=verb\n# comment\n\nHaus\n");
        assert!(issues.is_empty());
        assert_eq!(lex.len(), 2);
        let e = lex.entry(lex.get("essen").unwrap());
        assert_eq!(e.frequency, 80.0);
        assert_eq!(e.form, "essen");
        assert_eq!(e.readings.len(), 2);
        assert_eq!(lex.entry(lex.get("haus").unwrap()).frequency, 1.0);
    }

    #[test]
    fn reports_bad_lines_with_numbers() {
        let (lex, issues) = lexicon("gut\t1\nschlecht\tviel\n\tleer\nx\t1\tnotag\n\u{0}ok\t2\n");
        assert_eq!(lex.len(), 2);
        let lines: Vec<usize> = issues.iter().map(|i| i.line).collect();
        assert_eq!(lines, vec![2, 3, 4]);
    }

    #[test]
    fn strict_mode_fails_on_first_bad_line() {
        let mut b = LexiconBuilder::new(&Normalizer::default()).strict(true);
        let err = b.add_tsv("s.tsv", b"ok\nbad\tx\n").unwrap_err();
        assert!(err.to_string().contains("s.tsv:2"));
    }

    #[test]
    fn walks_step_by_step() {
        let (lex, _) = lexicon("arbeit\t10\narbeitsamt\t2\namt\t5\n");
        let c = lex.step_str(lex.root(), "arbeit").unwrap();
        assert_eq!(lex.entry(lex.entry_at(c).unwrap()).key, "arbeit");
        let c = lex.step_char(c, 's').unwrap();
        assert!(lex.entry_at(c).is_none());
        let c = lex.step_str(c, "amt").unwrap();
        assert_eq!(lex.entry(lex.entry_at(c).unwrap()).key, "arbeitsamt");
        assert!(lex.step_char(c, 'x').is_none());
    }

    #[test]
    fn tags_in_second_column() {
        let (lex, issues) = lexicon("ve\tpos=prefix;role=first\n");
        assert!(issues.is_empty());
        assert_eq!(lex.entry(0).readings[0].get("role"), Some("first"));
    }

    #[test]
    fn non_utf8_line_is_reported() {
        let n = Normalizer::default();
        let mut b = LexiconBuilder::new(&n);
        b.add_tsv("b.tsv", b"good\n\xff\xfe\n").unwrap();
        assert_eq!(b.issues()[0].line, 2);
    }
}

impl Lexicon {
    /// The bare-scan baseline: the number of (position, entry) pairs where a
    /// lexicon entry occurs in `chars`, found by walking the index from every
    /// position, with no junction rules. Benchmarks compare full analysis
    /// against it.
    pub fn bare_scan(&self, chars: &[char]) -> usize {
        let mut found = 0;
        for start in 0..chars.len() {
            let mut cursor = self.root();
            for &c in &chars[start..] {
                match self.step_char(cursor, c) {
                    Some(next) => cursor = next,
                    None => break,
                }
                if self.entry_at(cursor).is_some() {
                    found += 1;
                }
            }
        }
        found
    }

    /// [`bare_scan`](Self::bare_scan) with the index steps remembered in
    /// `cache`, as the lattice walks them (see [`StepCache`]); the baseline
    /// the benchmarks report the full analysis against.
    pub fn bare_scan_cached(&self, cache: &mut StepCache, chars: &[char]) -> usize {
        self.reset_step_cache(cache);
        let mut found = 0;
        let mut buf = [0u8; 4];
        for start in 0..chars.len() {
            let mut cursor = self.root();
            'scan: for &c in &chars[start..] {
                let mut entry = None;
                for &byte in c.encode_utf8(&mut buf).as_bytes() {
                    match self.step_cached(cache, cursor, byte) {
                        Some((next, e)) => (cursor, entry) = (next, e),
                        None => break 'scan,
                    }
                }
                if entry.is_some() {
                    found += 1;
                }
            }
        }
        found
    }
}

#[cfg(test)]
mod bare_scan_tests {
    use super::*;

    #[test]
    fn counts_every_occurrence() {
        let mut b = LexiconBuilder::new(&Normalizer::default());
        b.add_tsv("t", b"arbeit\namt\narbeitsamt\nts\n").unwrap();
        let lex = b.build().unwrap();
        let chars: Vec<char> = "arbeitsamt".chars().collect();
        // arbeit, arbeitsamt (at 0), ts (at 5), amt (at 7)
        assert_eq!(lex.bare_scan(&chars), 4);
        let mut cache = StepCache::default();
        for _ in 0..2 {
            assert_eq!(lex.bare_scan_cached(&mut cache, &chars), 4);
        }
    }
}
