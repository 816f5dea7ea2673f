//! Sanskrit paradigm expander.
//!
//! Stems carry a *paradigm class* (`deva` → `a-m`, `phala` → `a-n`, …).  The
//! classes are written as data, in YAML (see `lexicons/sanskrit/paradigms.yaml`
//! for the format, documented at the top of that file), and this module turns
//! every stem into its inflected forms, each carrying tags such as
//! `case=ins`, `number=sg`, `gender=m`.
//!
//! # In short
//!
//! * A class names what to strip from the stem to get the inflection *base*
//!   (`strip: a` turns `deva` into `dev`), and gives tables of endings per
//!   gender (nominals) or per tense (verbs), one row per case (or person),
//!   three cells per row (sg, du, pl).
//! * A cell is an ending (`ena`), a list of alternative endings (`[ani, ni]`),
//!   a full form that replaces base + ending (`=aham`), `~` (nothing here, or:
//!   inherited from the class named by `like:`), or `[]` (no form).  A cell
//!   item may carry tags of its own after a `;` (`=mā;enclitic=yes`).
//! * Endings are joined to the base and then internal sandhi is applied, as
//!   code, at the junction (the last letter of the base and the ending):
//!   [`nati`] (n → ṇ), [`ruki`] (s → ṣ) and [`palatal_n`] (n → ñ after c, j).
//!   Each class can switch each rule off (`nati: false`, …); all default on.
//!   Full forms (`=…`) are taken as written.
//!
//! # Tags produced
//!
//! Every form carries `stem=`, `class=`, `pos=` (the class's default, or the
//! stem line's own `pos=`), then `gender=`, `case=`, `number=` (nominals) or
//! `person=`, `number=`, `tense=` (verbs), then the class's fixed `tags:`, the
//! cell's own tags, and last the extra tags of the stem line.  A stem line's
//! `gender=` tag (`gender=m` or `gender=m,n`) restricts a class that covers
//! several genders to those genders.  An extra tag that repeats a produced tag
//! with the same value is dropped; one with a different value is an error
//! ([`ParadigmError::ConflictingTag`]).
//!
//! A stems line whose class column is empty is a ready-made form: it expands
//! to itself with exactly its own tags (this is how `indeclinables.tsv` and
//! `verbs.tsv` are read).
//!
//! All text is IAST in Unicode NFC; input is normalised to NFC on reading.

use std::collections::{HashMap, HashSet};
use std::fmt;

use serde::de::{self, Deserializer, MapAccess, Visitor};
use serde::Deserialize;
use serde_yaml::Value;
use unicode_normalization::UnicodeNormalization;

/// The eight cases, in the order of the handbooks' tables.
pub const CASES: [&str; 8] = ["nom", "acc", "ins", "dat", "abl", "gen", "loc", "voc"];
/// The three numbers.
pub const NUMBERS: [&str; 3] = ["sg", "du", "pl"];
/// The three persons, in the order of the Sanskrit grammarians (3rd first).
pub const PERSONS: [&str; 3] = ["3", "2", "1"];
/// Gender keys of a nominal class; `none` inflects without a `gender=` tag
/// (the personal pronouns).
pub const GENDERS: [&str; 4] = ["m", "f", "n", "none"];

/// One inflected form produced from a stem.
#[derive(Debug, Clone, PartialEq)]
pub struct ExpandedForm {
    /// The form, IAST, NFC.
    pub form: String,
    /// Tags, `(key, value)`, in a fixed order (see the module documentation).
    pub tags: Vec<(String, String)>,
}

impl ExpandedForm {
    /// The value of the first tag named `key`.
    pub fn tag(&self, key: &str) -> Option<&str> {
        self.tags
            .iter()
            .find(|(k, _)| k == key)
            .map(|(_, v)| v.as_str())
    }
}

/// One line of a stems file: `stem<TAB>class<TAB>tags`.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct StemLine {
    /// 1-based line number in the file.
    pub line: usize,
    /// The stem (or, with an empty class, the ready-made form).
    pub stem: String,
    /// The paradigm class; empty for a ready-made form.
    pub class: String,
    /// The tags of the third column, in file order.
    pub tags: Vec<(String, String)>,
}

/// Everything that can go wrong reading paradigm tables or stems, or
/// expanding a stem.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum ParadigmError {
    /// The paradigm YAML is not well-formed YAML, or does not have the shape
    /// of a paradigm file (unknown field, wrong type, duplicate class…).
    /// `line`/`column` are serde_yaml's location, 1-based, where it has one
    /// (the message names it too).
    #[error("paradigm YAML: {message}")]
    Yaml {
        /// serde_yaml's message (it names the field path where it can).
        message: String,
        /// Line of the error, if known.
        line: Option<usize>,
        /// Column of the error, if known.
        column: Option<usize>,
    },
    /// A paradigm class is well-formed YAML but inconsistent: a bad slot
    /// name, a malformed cell, a reference to an unknown class or table, a
    /// `like:` cycle…  `line` is the line where the class starts, where found.
    #[error("paradigm `{class}`{}{}: {reason}", slot_text(.slot), near_line(.line))]
    Paradigm {
        /// The class being defined.
        class: String,
        /// The slot, e.g. `forms.m.nom.sg`; empty for the class as a whole.
        slot: String,
        /// What is wrong.
        reason: String,
        /// Line where the class's definition starts, if found.
        line: Option<usize>,
    },
    /// A line of a stems file is malformed.
    #[error("stems line {line}: {reason}")]
    StemsLine {
        /// 1-based line number.
        line: usize,
        /// What is wrong.
        reason: String,
    },
    /// A stem names a paradigm class that the tables do not define.
    #[error("{}unknown paradigm class `{class}` for stem `{stem}`", line_prefix(.line))]
    UnknownClass {
        /// The stem.
        stem: String,
        /// The class asked for.
        class: String,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
    /// The stem is empty (or only white space).
    #[error("{}empty stem for class `{class}`", line_prefix(.line))]
    EmptyStem {
        /// The class asked for.
        class: String,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
    /// The stem contains white space or control characters.
    #[error("{}stem `{stem}` contains white space or control characters", line_prefix(.line))]
    InvalidStem {
        /// The stem as given.
        stem: String,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
    /// The stem does not end in what its class strips off (`strip:`).
    #[error("{}stem `{stem}` does not fit class `{class}`: it should end in {}", line_prefix(.line), quoted_list(.strip))]
    StemMismatch {
        /// The stem.
        stem: String,
        /// The class.
        class: String,
        /// What the class strips (any one of these).
        strip: Vec<String>,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
    /// A `gender=` tag asks for a gender the class has no table for.
    #[error("{}class `{class}` has no gender `{gender}` (stem `{stem}`)", line_prefix(.line))]
    UnknownGender {
        /// The stem.
        stem: String,
        /// The class.
        class: String,
        /// The gender asked for.
        gender: String,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
    /// An extra tag contradicts a tag that the expansion produces itself
    /// (e.g. `person=2` on a stem of a first-person class).
    #[error("{}stem `{stem}`: tag `{key}={given}` contradicts the produced `{key}={produced}`", line_prefix(.line))]
    ConflictingTag {
        /// The stem.
        stem: String,
        /// The tag key.
        key: String,
        /// The value given on the stem line.
        given: String,
        /// The value the expansion produces.
        produced: String,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
    /// Base + ending came out empty (e.g. a stem that is all strip and an
    /// empty ending).
    #[error("{}stem `{stem}` (class `{class}`) gives an empty form in slot {slot}", line_prefix(.line))]
    EmptyForm {
        /// The stem.
        stem: String,
        /// The class.
        class: String,
        /// The slot, e.g. `m.nom.sg`.
        slot: String,
        /// Stems-file line, when expanding a file.
        line: Option<usize>,
    },
}

impl ParadigmError {
    /// The line the error refers to (YAML line, class start, or stems line),
    /// where known.
    pub fn line(&self) -> Option<usize> {
        match self {
            ParadigmError::Yaml { line, .. }
            | ParadigmError::Paradigm { line, .. }
            | ParadigmError::UnknownClass { line, .. }
            | ParadigmError::EmptyStem { line, .. }
            | ParadigmError::InvalidStem { line, .. }
            | ParadigmError::StemMismatch { line, .. }
            | ParadigmError::UnknownGender { line, .. }
            | ParadigmError::ConflictingTag { line, .. }
            | ParadigmError::EmptyForm { line, .. } => *line,
            ParadigmError::StemsLine { line, .. } => Some(*line),
        }
    }

    fn with_line(mut self, n: usize) -> Self {
        match &mut self {
            ParadigmError::UnknownClass { line, .. }
            | ParadigmError::EmptyStem { line, .. }
            | ParadigmError::InvalidStem { line, .. }
            | ParadigmError::StemMismatch { line, .. }
            | ParadigmError::UnknownGender { line, .. }
            | ParadigmError::ConflictingTag { line, .. }
            | ParadigmError::EmptyForm { line, .. } => *line = Some(n),
            _ => {}
        }
        self
    }
}

fn slot_text(slot: &str) -> String {
    if slot.is_empty() {
        String::new()
    } else {
        format!(", slot {slot}")
    }
}

fn near_line(line: &Option<usize>) -> String {
    match line {
        Some(l) => format!(" (class starts at line {l})"),
        None => String::new(),
    }
}

fn line_prefix(line: &Option<usize>) -> String {
    match line {
        Some(l) => format!("stems line {l}: "),
        None => String::new(),
    }
}

fn quoted_list(items: &[String]) -> String {
    items
        .iter()
        .map(|s| format!("`{s}`"))
        .collect::<Vec<_>>()
        .join(" or ")
}

fn nfc(s: &str) -> String {
    s.nfc().collect()
}

// ---------------------------------------------------------------------------
// Internal sandhi
// ---------------------------------------------------------------------------

fn is_vowel(c: char) -> bool {
    matches!(
        c,
        'a' | 'ā' | 'i' | 'ī' | 'u' | 'ū' | 'ṛ' | 'ṝ' | 'ḷ' | 'ḹ' | 'e' | 'o'
    )
}

/// Consonants that stop the n → ṇ rule: palatals, retroflexes and dentals
/// (with l and s), i.e. everything but gutturals, labials, y v h, ṃ ḥ.
fn blocks_nati(c: char) -> bool {
    matches!(
        c,
        'c' | 'j' | 'ñ' | 'ś' | 'ṭ' | 'ḍ' | 'ṇ' | 't' | 'd' | 'n' | 'l' | 's'
    )
}

/// Internal sandhi rule "nati", n → ṇ (from memory; Whitney §189–§192).
///
/// Rule: a dental `n` becomes retroflex `ṇ` when it is preceded in the same
/// word by `ṛ`, `ṝ`, `r` or `ṣ`, with no palatal, retroflex or dental
/// consonant in between (vowels, gutturals, labials, `y v h` and anusvāra
/// may intervene), and is followed by a vowel, `n`, `m`, `y` or `v` (so a
/// final `n` stays).  `rāma + ena → rāmeṇa`, `deva + ena → devena`,
/// `rāma + ānām → rāmāṇām`, `rāma + ān → rāmān`.
///
/// Only an `n` at char index `from` or later is changed (the trigger may be
/// anywhere before it).  The word is processed left to right, so a `ṇ` just
/// made blocks a later `n` (`gṛh + nanti → gṛhṇanti`).
pub fn nati(word: &str, from: usize) -> String {
    let mut chars: Vec<char> = word.chars().collect();
    for i in from..chars.len() {
        if chars[i] != 'n' {
            continue;
        }
        let followed = match chars.get(i + 1) {
            Some(&c) => is_vowel(c) || matches!(c, 'n' | 'm' | 'y' | 'v'),
            None => false,
        };
        if !followed {
            continue;
        }
        let mut trigger = false;
        for j in (0..i).rev() {
            let c = chars[j];
            if matches!(c, 'ṛ' | 'ṝ' | 'r' | 'ṣ') {
                trigger = true;
                break;
            }
            if blocks_nati(c) {
                break;
            }
        }
        if trigger {
            chars[i] = 'ṇ';
        }
    }
    chars.into_iter().collect()
}

/// Internal sandhi rule "ruki", s → ṣ (from memory; Whitney §180–§181).
///
/// Rule: a dental `s` becomes retroflex `ṣ` when it immediately follows
/// `i ī u ū ṛ ṝ e ai o au`, `k` or `r` (an anusvāra `ṃ` or visarga `ḥ` may
/// stand between), unless it is final or followed by `r`.
/// `agni + su → agniṣu`, `e + sā → eṣā`, `havi + ṃsi → haviṃṣi`, but
/// `senā + su → senāsu`, `manaḥ` keeps its `ḥ`.
///
/// Only an `s` at char index `from` or later is changed.
pub fn ruki(word: &str, from: usize) -> String {
    let mut chars: Vec<char> = word.chars().collect();
    for i in from..chars.len() {
        if chars[i] != 's' {
            continue;
        }
        match chars.get(i + 1) {
            None | Some('r') => continue,
            Some(_) => {}
        }
        if i == 0 {
            continue;
        }
        let mut j = i - 1;
        if matches!(chars[j], 'ṃ' | 'ḥ') {
            if j == 0 {
                continue;
            }
            j -= 1;
        }
        if matches!(
            chars[j],
            'i' | 'ī' | 'u' | 'ū' | 'ṛ' | 'ṝ' | 'e' | 'o' | 'k' | 'r'
        ) {
            chars[i] = 'ṣ';
        }
    }
    chars.into_iter().collect()
}

/// Internal sandhi: `n` → `ñ` directly after a palatal stop `c` or `j`
/// (from memory; Whitney §201): `rāj + nā → rājñā`, `yaj + na → yajña`.
///
/// Only an `n` at char index `from` or later is changed.
pub fn palatal_n(word: &str, from: usize) -> String {
    let mut chars: Vec<char> = word.chars().collect();
    for i in from.max(1)..chars.len() {
        if chars[i] == 'n' && matches!(chars[i - 1], 'c' | 'j') {
            chars[i] = 'ñ';
        }
    }
    chars.into_iter().collect()
}

/// The augment `a-` of the past tenses, with vṛddhi before an initial vowel
/// (from memory; Whitney §585): `a + gacchat → agacchat`,
/// `a + icchat → aicchat`, `a + arhat → ārhat`, `a + ṛcchat → ārcchat`.
fn augment(form: &str) -> String {
    if form.starts_with("ai") || form.starts_with("au") {
        // a + ai → ai, a + au → au
        return form.to_string();
    }
    let mut chars = form.chars();
    let first = chars.next();
    let rest: String = chars.collect();
    match first {
        Some('a' | 'ā') => format!("ā{rest}"),
        Some('i' | 'ī' | 'e') => format!("ai{rest}"),
        Some('u' | 'ū' | 'o') => format!("au{rest}"),
        Some('ṛ' | 'ṝ') => format!("ār{rest}"),
        Some('ḷ') => format!("āl{rest}"),
        _ => format!("a{form}"),
    }
}

// ---------------------------------------------------------------------------
// Tables
// ---------------------------------------------------------------------------

#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
enum Kind {
    Nominal,
    Verb,
    Invariant,
}

impl Kind {
    fn default_pos(self) -> &'static str {
        match self {
            Kind::Nominal => "noun",
            Kind::Verb => "verb",
            Kind::Invariant => "indecl",
        }
    }
}

#[derive(Debug, Clone)]
struct Cell {
    /// `true`: `text` is the whole form; `false`: an ending.
    full: bool,
    text: String,
    tags: Vec<(String, String)>,
}

/// One row: sg, du, pl.  `None` = unspecified (inherited through `like:`,
/// otherwise no form); `Some(vec![])` = explicitly no form.
type Row = [Option<Vec<Cell>>; 3];

#[derive(Debug, Clone, Default)]
struct Table {
    augment: Option<bool>,
    rows: Vec<(String, Row)>,
}

impl Table {
    fn row(&self, key: &str) -> Option<&Row> {
        self.rows.iter().find(|(k, _)| k == key).map(|(_, r)| r)
    }

    /// Overlay `other` onto `self`, cell by cell.
    fn overlay(&mut self, other: &Table) {
        if other.augment.is_some() {
            self.augment = other.augment;
        }
        for (key, row) in &other.rows {
            match self.rows.iter_mut().find(|(k, _)| k == key) {
                Some((_, mine)) => {
                    for (m, o) in mine.iter_mut().zip(row.iter()) {
                        if o.is_some() {
                            *m = o.clone();
                        }
                    }
                }
                None => self.rows.push((key.clone(), row.clone())),
            }
        }
    }

    fn with_prefix(&self, prefix: &str) -> Table {
        let mut t = self.clone();
        for (_, row) in &mut t.rows {
            for cell in row.iter_mut().flatten() {
                for item in cell.iter_mut() {
                    if !item.full {
                        item.text = format!("{prefix}{}", item.text);
                    }
                }
            }
        }
        t
    }
}

#[derive(Debug, Clone)]
enum TableSpec {
    /// `"class"` or `"prefix + class"`: the same-keyed table of another class.
    Ref {
        prefix: String,
        class: String,
    },
    Table(Table),
}

#[derive(Debug, Clone)]
struct Paradigm {
    kind: Kind,
    pos: String,
    strip: Vec<String>,
    nati: bool,
    ruki: bool,
    palatal: bool,
    tags: Vec<(String, String)>,
    /// Gender (nominal) or tense (verb) → table, in file order.
    tables: Vec<(String, Table)>,
}

/// A class as written, before `like:` and references are resolved.
#[derive(Debug, Clone)]
struct Spec {
    kind: Option<Kind>,
    pos: Option<String>,
    strip: Option<Vec<String>>,
    nati: Option<bool>,
    ruki: Option<bool>,
    palatal: Option<bool>,
    tags: Vec<(String, String)>,
    like: Option<String>,
    tables: Vec<(String, TableSpec)>,
    line: Option<usize>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFile {
    paradigms: OrderedParadigms,
}

struct OrderedParadigms(Vec<(String, RawParadigm)>);

impl<'de> Deserialize<'de> for OrderedParadigms {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = OrderedParadigms;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a mapping from paradigm class names to class definitions")
            }
            fn visit_map<A: MapAccess<'de>>(self, mut m: A) -> Result<Self::Value, A::Error> {
                let mut v: Vec<(String, RawParadigm)> = Vec::new();
                while let Some((k, val)) = m.next_entry::<String, RawParadigm>()? {
                    if v.iter().any(|(kk, _)| *kk == k) {
                        return Err(de::Error::custom(format!("duplicate paradigm class `{k}`")));
                    }
                    v.push((k, val));
                }
                Ok(OrderedParadigms(v))
            }
        }
        d.deserialize_map(V)
    }
}

#[derive(Deserialize)]
#[serde(untagged)]
enum OneOrMany {
    One(String),
    Many(Vec<String>),
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawParadigm {
    #[serde(default)]
    #[allow(dead_code)]
    model: Option<Value>,
    #[serde(default)]
    #[allow(dead_code)]
    description: Option<String>,
    #[serde(default)]
    kind: Option<Kind>,
    #[serde(default)]
    pos: Option<String>,
    #[serde(default)]
    strip: Option<OneOrMany>,
    #[serde(default)]
    nati: Option<bool>,
    #[serde(default)]
    ruki: Option<bool>,
    #[serde(default)]
    palatal: Option<bool>,
    #[serde(default)]
    tags: Option<serde_yaml::Mapping>,
    #[serde(default)]
    like: Option<String>,
    #[serde(default)]
    forms: Option<Value>,
}

/// Paradigm tables parsed from YAML.
#[derive(Debug, Clone)]
pub struct ParadigmTables {
    order: Vec<String>,
    paradigms: HashMap<String, Paradigm>,
}

type SlotErr = (String, String);

fn scalar_string(v: &Value) -> Option<String> {
    match v {
        Value::String(s) => Some(s.clone()),
        Value::Number(n) => Some(n.to_string()),
        Value::Bool(b) => Some(b.to_string()),
        _ => None,
    }
}

fn check_word(text: &str) -> Result<(), String> {
    if text.chars().any(|c| c.is_whitespace() || c.is_control()) {
        return Err(format!("`{text}` contains white space"));
    }
    Ok(())
}

fn parse_tag_list(text: &str) -> Result<Vec<(String, String)>, String> {
    let mut tags: Vec<(String, String)> = Vec::new();
    for piece in text.split(';') {
        let piece = piece.trim();
        if piece.is_empty() {
            continue;
        }
        let Some((k, v)) = piece.split_once('=') else {
            return Err(format!("tag `{piece}` is not key=value"));
        };
        let (k, v) = (nfc(k.trim()), nfc(v.trim()));
        if k.is_empty() {
            return Err(format!("tag `{piece}` has an empty key"));
        }
        if k.chars().any(|c| c.is_whitespace() || c == '=') {
            return Err(format!("tag key `{k}` contains white space or `=`"));
        }
        if tags.iter().any(|(kk, _)| *kk == k) {
            return Err(format!("tag `{k}` given twice"));
        }
        tags.push((k, v));
    }
    Ok(tags)
}

fn parse_cell_item(s: &str) -> Result<Cell, String> {
    let s = nfc(s.trim());
    let (spec, tags) = match s.split_once(';') {
        Some((a, b)) => (a.trim().to_string(), parse_tag_list(b)?),
        None => (s.clone(), Vec::new()),
    };
    if let Some(full) = spec.strip_prefix('=') {
        let full = full.trim();
        if full.is_empty() {
            return Err("a full form `=` with nothing after it".into());
        }
        check_word(full)?;
        Ok(Cell {
            full: true,
            text: full.to_string(),
            tags,
        })
    } else {
        check_word(&spec)?;
        Ok(Cell {
            full: false,
            text: spec,
            tags,
        })
    }
}

fn parse_cell(v: &Value) -> Result<Option<Vec<Cell>>, String> {
    match v {
        Value::Null => Ok(None),
        Value::String(s) => Ok(Some(vec![parse_cell_item(s)?])),
        Value::Sequence(items) => {
            let mut out = Vec::new();
            for item in items {
                match item {
                    Value::String(s) => out.push(parse_cell_item(s)?),
                    other => {
                        return Err(format!(
                            "an alternative must be a string, found {}",
                            describe(other)
                        ))
                    }
                }
            }
            Ok(Some(out))
        }
        other => Err(format!(
            "a cell must be an ending, a list of endings or ~, found {}",
            describe(other)
        )),
    }
}

fn describe(v: &Value) -> &'static str {
    match v {
        Value::Null => "null",
        Value::Bool(_) => "a boolean",
        Value::Number(_) => "a number",
        Value::String(_) => "a string",
        Value::Sequence(_) => "a list",
        Value::Mapping(_) => "a mapping",
        Value::Tagged(_) => "a tagged value",
    }
}

fn parse_row(path: &str, v: &Value) -> Result<Row, SlotErr> {
    let mut row: Row = [None, None, None];
    match v {
        Value::Null => {}
        Value::Sequence(cells) => {
            if cells.len() != 3 {
                return Err((
                    path.to_string(),
                    format!("a row needs 3 cells (sg, du, pl), found {}", cells.len()),
                ));
            }
            for (i, c) in cells.iter().enumerate() {
                row[i] = parse_cell(c).map_err(|e| (format!("{path}.{}", NUMBERS[i]), e))?;
            }
        }
        Value::Mapping(m) => {
            for (k, c) in m {
                let key = scalar_string(k).unwrap_or_default();
                let Some(i) = NUMBERS.iter().position(|n| *n == key) else {
                    return Err((
                        path.to_string(),
                        format!("unknown number `{key}` (expected sg, du or pl)"),
                    ));
                };
                row[i] = parse_cell(c).map_err(|e| (format!("{path}.{key}"), e))?;
            }
        }
        other => {
            return Err((
                path.to_string(),
                format!(
                    "a row must be a list [sg, du, pl] or a mapping, found {}",
                    describe(other)
                ),
            ))
        }
    }
    Ok(row)
}

fn parse_table_spec(path: &str, v: &Value) -> Result<TableSpec, SlotErr> {
    match v {
        Value::String(s) => {
            let s = nfc(s.trim());
            let (prefix, class) = match s.split_once('+') {
                Some((p, c)) => (p.trim().to_string(), c.trim().to_string()),
                None => (String::new(), s.clone()),
            };
            if class.is_empty() {
                return Err((path.to_string(), format!("reference `{s}` names no class")));
            }
            check_word(&prefix).map_err(|e| (path.to_string(), e))?;
            Ok(TableSpec::Ref { prefix, class })
        }
        Value::Mapping(m) => {
            let mut t = Table::default();
            for (k, rv) in m {
                let Some(key) = scalar_string(k) else {
                    return Err((path.to_string(), "a row key must be a scalar".into()));
                };
                let rpath = format!("{path}.{key}");
                if key == "augment" {
                    match rv {
                        Value::Bool(b) => t.augment = Some(*b),
                        other => {
                            return Err((
                                rpath,
                                format!("augment must be true or false, found {}", describe(other)),
                            ))
                        }
                    }
                    continue;
                }
                if t.rows.iter().any(|(k, _)| *k == key) {
                    return Err((rpath, "row given twice".into()));
                }
                let row = parse_row(&rpath, rv)?;
                t.rows.push((key, row));
            }
            Ok(TableSpec::Table(t))
        }
        other => Err((
            path.to_string(),
            format!(
                "a table must be a mapping of rows or the name of a class, found {}",
                describe(other)
            ),
        )),
    }
}

fn spec_from_raw(raw: RawParadigm, line: Option<usize>) -> Result<Spec, SlotErr> {
    let strip = raw.strip.map(|s| match s {
        OneOrMany::One(x) => vec![nfc(x.trim())],
        OneOrMany::Many(v) => v.iter().map(|x| nfc(x.trim())).collect(),
    });
    if let Some(strip) = &strip {
        for s in strip {
            check_word(s).map_err(|e| ("strip".to_string(), e))?;
        }
    }
    let mut tags = Vec::new();
    if let Some(m) = raw.tags {
        for (k, v) in &m {
            let (Some(k), Some(v)) = (scalar_string(k), scalar_string(v)) else {
                return Err(("tags".into(), "tags must be a mapping of scalars".into()));
            };
            tags.push((nfc(k.trim()), nfc(v.trim())));
        }
    }
    let mut tables = Vec::new();
    match &raw.forms {
        None | Some(Value::Null) => {}
        Some(Value::Mapping(m)) => {
            for (k, v) in m {
                let Some(key) = scalar_string(k) else {
                    return Err(("forms".into(), "a table key must be a scalar".into()));
                };
                let path = format!("forms.{key}");
                if tables.iter().any(|(k, _)| *k == key) {
                    return Err((path, "table given twice".into()));
                }
                tables.push((key, parse_table_spec(&path, v)?));
            }
        }
        Some(other) => {
            return Err((
                "forms".into(),
                format!("forms must be a mapping, found {}", describe(other)),
            ))
        }
    }
    Ok(Spec {
        kind: raw.kind,
        pos: raw.pos.map(|p| nfc(p.trim())),
        strip,
        nati: raw.nati,
        ruki: raw.ruki,
        palatal: raw.palatal,
        tags,
        like: raw.like.map(|l| nfc(l.trim())),
        tables,
        line,
    })
}

/// Line of `class:` directly under `paradigms:` (a best effort for errors
/// that serde_yaml cannot locate).
fn class_lines(text: &str) -> HashMap<String, usize> {
    let mut out = HashMap::new();
    let mut indent: Option<usize> = None;
    let mut inside = false;
    for (i, line) in text.lines().enumerate() {
        let t = line.trim_start();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let ind = line.len() - t.len();
        if ind == 0 {
            inside = t.starts_with("paradigms:");
            indent = None;
            continue;
        }
        if !inside {
            continue;
        }
        let want = *indent.get_or_insert(ind);
        if ind == want {
            if let Some((k, _)) = t.split_once(':') {
                let k = k.trim().trim_matches(|c| c == '"' || c == '\'');
                out.entry(nfc(k)).or_insert(i + 1);
            }
        }
    }
    out
}

struct Resolver<'a> {
    specs: &'a HashMap<String, Spec>,
    done: HashMap<String, Paradigm>,
    visiting: HashSet<String>,
}

impl Resolver<'_> {
    fn err(&self, class: &str, slot: &str, reason: String) -> ParadigmError {
        ParadigmError::Paradigm {
            class: class.to_string(),
            slot: slot.to_string(),
            reason,
            line: self.specs.get(class).and_then(|s| s.line),
        }
    }

    fn resolve(&mut self, name: &str) -> Result<Paradigm, ParadigmError> {
        if let Some(p) = self.done.get(name) {
            return Ok(p.clone());
        }
        let spec = self.specs[name].clone();
        if !self.visiting.insert(name.to_string()) {
            return Err(self.err(name, "", "`like:` or table references form a cycle".into()));
        }
        let parent = match &spec.like {
            Some(l) => {
                if !self.specs.contains_key(l) {
                    return Err(self.err(name, "like", format!("unknown class `{l}`")));
                }
                Some(self.resolve(l)?)
            }
            None => None,
        };
        let kind = spec
            .kind
            .or(parent.as_ref().map(|p| p.kind))
            .unwrap_or(Kind::Nominal);
        let pos = spec
            .pos
            .clone()
            .or(parent.as_ref().map(|p| p.pos.clone()))
            .unwrap_or_else(|| kind.default_pos().to_string());
        let strip = spec
            .strip
            .clone()
            .or(parent.as_ref().map(|p| p.strip.clone()))
            .unwrap_or_default();
        let flag = |own: Option<bool>, f: fn(&Paradigm) -> bool| {
            own.or(parent.as_ref().map(f)).unwrap_or(true)
        };
        let nati = flag(spec.nati, |p| p.nati);
        let ruki = flag(spec.ruki, |p| p.ruki);
        let palatal = flag(spec.palatal, |p| p.palatal);
        let mut tags = parent.as_ref().map(|p| p.tags.clone()).unwrap_or_default();
        for (k, v) in &spec.tags {
            match tags.iter_mut().find(|(kk, _)| kk == k) {
                Some(slot) => slot.1 = v.clone(),
                None => tags.push((k.clone(), v.clone())),
            }
        }
        let mut tables: Vec<(String, Table)> = parent
            .as_ref()
            .map(|p| p.tables.clone())
            .unwrap_or_default();
        for (key, ts) in &spec.tables {
            let path = format!("forms.{key}");
            let table = match ts {
                TableSpec::Ref { prefix, class } => {
                    // `class` (same key) or `class.key`.
                    let (class, want) = if self.specs.contains_key(class) {
                        (class.as_str(), key.as_str())
                    } else {
                        match class.rsplit_once('.') {
                            Some((c, k)) if self.specs.contains_key(c) => (c, k),
                            _ => {
                                return Err(self.err(
                                    name,
                                    &path,
                                    format!("unknown class `{class}`"),
                                ))
                            }
                        }
                    };
                    let other = self.resolve(class)?;
                    let Some((_, t)) = other.tables.iter().find(|(k, _)| k == want) else {
                        return Err(self.err(
                            name,
                            &path,
                            format!("class `{class}` has no table `{want}`"),
                        ));
                    };
                    t.with_prefix(prefix)
                }
                TableSpec::Table(t) => match tables.iter().find(|(k, _)| k == key) {
                    Some((_, base)) => {
                        let mut merged = base.clone();
                        merged.overlay(t);
                        merged
                    }
                    None => t.clone(),
                },
            };
            match tables.iter_mut().find(|(k, _)| k == key) {
                Some(slot) => slot.1 = table,
                None => tables.push((key.clone(), table)),
            }
        }
        // Validate keys against the kind.
        match kind {
            Kind::Invariant => {
                if !tables.is_empty() {
                    return Err(self.err(
                        name,
                        "forms",
                        "an invariant class has no forms table".into(),
                    ));
                }
            }
            Kind::Nominal | Kind::Verb => {
                if tables.is_empty() {
                    return Err(self.err(name, "forms", "no forms given".into()));
                }
                for (key, t) in &tables {
                    if kind == Kind::Nominal && !GENDERS.contains(&key.as_str()) {
                        return Err(self.err(
                            name,
                            &format!("forms.{key}"),
                            format!("unknown gender `{key}` (expected m, f, n or none)"),
                        ));
                    }
                    if kind == Kind::Nominal && t.augment.is_some() {
                        return Err(self.err(
                            name,
                            &format!("forms.{key}.augment"),
                            "augment is for verb tenses only".into(),
                        ));
                    }
                    let allowed: &[&str] = if kind == Kind::Nominal {
                        &CASES
                    } else {
                        &PERSONS
                    };
                    for (rk, _) in &t.rows {
                        if !allowed.contains(&rk.as_str()) {
                            let what = if kind == Kind::Nominal {
                                "case (nom acc ins dat abl gen loc voc)"
                            } else {
                                "person (1, 2, 3)"
                            };
                            return Err(self.err(
                                name,
                                &format!("forms.{key}.{rk}"),
                                format!("unknown {what} `{rk}`"),
                            ));
                        }
                    }
                }
            }
        }
        let p = Paradigm {
            kind,
            pos,
            strip,
            nati,
            ruki,
            palatal,
            tags,
            tables,
        };
        self.visiting.remove(name);
        self.done.insert(name.to_string(), p.clone());
        Ok(p)
    }
}

impl ParadigmTables {
    /// Parse paradigm tables from YAML (the format is documented at the top
    /// of `lexicons/sanskrit/paradigms.yaml`).  Errors name the class and the
    /// slot and say why; YAML-level errors carry serde_yaml's line/column.
    pub fn from_yaml(text: &str) -> Result<ParadigmTables, ParadigmError> {
        let raw: RawFile = serde_yaml::from_str(text).map_err(|e| {
            let loc = e.location();
            ParadigmError::Yaml {
                message: e.to_string(),
                line: loc.as_ref().map(|l| l.line()),
                column: loc.as_ref().map(|l| l.column()),
            }
        })?;
        let lines = class_lines(text);
        let mut order = Vec::new();
        let mut specs = HashMap::new();
        for (name, rp) in raw.paradigms.0 {
            let name = nfc(name.trim());
            let line = lines.get(&name).copied();
            if name.is_empty() || name.chars().any(char::is_whitespace) {
                return Err(ParadigmError::Paradigm {
                    class: name,
                    slot: String::new(),
                    reason: "a class name must be non-empty and without white space".into(),
                    line,
                });
            }
            if specs.contains_key(&name) {
                return Err(ParadigmError::Paradigm {
                    class: name,
                    slot: String::new(),
                    reason: "class defined twice".into(),
                    line,
                });
            }
            let spec =
                spec_from_raw(rp, line).map_err(|(slot, reason)| ParadigmError::Paradigm {
                    class: name.clone(),
                    slot,
                    reason,
                    line,
                })?;
            order.push(name.clone());
            specs.insert(name, spec);
        }
        let mut r = Resolver {
            specs: &specs,
            done: HashMap::new(),
            visiting: HashSet::new(),
        };
        for name in &order {
            r.resolve(name)?;
        }
        Ok(ParadigmTables {
            order,
            paradigms: r.done,
        })
    }

    /// The class names, in the order of the YAML file.
    pub fn classes(&self) -> impl Iterator<Item = &str> {
        self.order.iter().map(String::as_str)
    }

    /// Whether `class` is defined.
    pub fn has_class(&self, class: &str) -> bool {
        self.paradigms.contains_key(class)
    }

    /// Expand one stem of a class; `extra` tags (e.g. gloss) are copied onto
    /// each form.  An empty `class` means `stem` is a ready-made form: the
    /// result is that one form with exactly the `extra` tags.
    pub fn expand(
        &self,
        stem: &str,
        class: &str,
        extra: &[(String, String)],
    ) -> Result<Vec<ExpandedForm>, ParadigmError> {
        let stem = nfc(stem.trim());
        let class = nfc(class.trim());
        if stem.is_empty() {
            return Err(ParadigmError::EmptyStem { class, line: None });
        }
        if stem.chars().any(|c| c.is_whitespace() || c.is_control()) {
            return Err(ParadigmError::InvalidStem { stem, line: None });
        }
        let extra: Vec<(String, String)> = extra.iter().map(|(k, v)| (nfc(k), nfc(v))).collect();
        if class.is_empty() {
            return Ok(vec![ExpandedForm {
                form: stem,
                tags: extra,
            }]);
        }
        let Some(p) = self.paradigms.get(&class) else {
            return Err(ParadigmError::UnknownClass {
                stem,
                class,
                line: None,
            });
        };
        // The inflection base.
        let base = if p.strip.is_empty() {
            stem.clone()
        } else {
            match p.strip.iter().find(|s| stem.ends_with(s.as_str())) {
                Some(s) => stem[..stem.len() - s.len()].to_string(),
                None => {
                    return Err(ParadigmError::StemMismatch {
                        stem,
                        class,
                        strip: p.strip.clone(),
                        line: None,
                    })
                }
            }
        };
        let base_len = base.chars().count();
        let from = base_len.saturating_sub(1);

        let pos = extra
            .iter()
            .find(|(k, _)| k == "pos")
            .map(|(_, v)| v.clone())
            .unwrap_or_else(|| p.pos.clone());
        let genders: Option<Vec<String>> = extra
            .iter()
            .find(|(k, _)| k == "gender")
            .filter(|_| p.kind == Kind::Nominal)
            .map(|(_, v)| v.split(',').map(|g| g.trim().to_string()).collect());
        if let Some(gs) = &genders {
            for g in gs {
                if !p.tables.iter().any(|(k, _)| k == g) || g == "none" {
                    return Err(ParadigmError::UnknownGender {
                        stem,
                        class,
                        gender: g.clone(),
                        line: None,
                    });
                }
            }
        }

        let head = vec![
            ("stem".to_string(), stem.clone()),
            ("class".to_string(), class.clone()),
            ("pos".to_string(), pos),
        ];
        let finish = |mut tags: Vec<(String, String)>,
                      cell_tags: &[(String, String)]|
         -> Result<Vec<(String, String)>, ParadigmError> {
            for t in p.tags.iter().chain(cell_tags) {
                if !tags.iter().any(|(k, _)| *k == t.0) {
                    tags.push(t.clone());
                }
            }
            for (k, v) in &extra {
                if k == "pos" {
                    continue;
                }
                if k == "gender" && genders.is_some() {
                    continue;
                }
                match tags.iter().find(|(kk, _)| kk == k) {
                    Some((_, produced)) if produced == v => {}
                    Some((_, produced)) => {
                        return Err(ParadigmError::ConflictingTag {
                            stem: stem.clone(),
                            key: k.clone(),
                            given: v.clone(),
                            produced: produced.clone(),
                            line: None,
                        })
                    }
                    None => tags.push((k.clone(), v.clone())),
                }
            }
            Ok(tags)
        };

        if p.kind == Kind::Invariant {
            return Ok(vec![ExpandedForm {
                form: stem.clone(),
                tags: finish(head, &[])?,
            }]);
        }

        let mut out = Vec::new();
        for (key, table) in &p.tables {
            if let Some(gs) = &genders {
                if !gs.contains(key) {
                    continue;
                }
            }
            let rows: &[&str] = if p.kind == Kind::Nominal {
                &CASES
            } else {
                &PERSONS
            };
            for rk in rows {
                let Some(row) = table.row(rk) else { continue };
                for (ni, cell) in row.iter().enumerate() {
                    let Some(items) = cell else { continue };
                    for item in items {
                        let form = if item.full {
                            item.text.clone()
                        } else {
                            let mut w = format!("{base}{}", item.text);
                            if p.palatal {
                                w = palatal_n(&w, from);
                            }
                            if p.ruki {
                                w = ruki(&w, from);
                            }
                            if p.nati {
                                w = nati(&w, from);
                            }
                            if table.augment == Some(true) {
                                w = augment(&w);
                            }
                            w
                        };
                        let form = nfc(&form);
                        if form.is_empty() {
                            return Err(ParadigmError::EmptyForm {
                                stem,
                                class,
                                slot: format!("{key}.{rk}.{}", NUMBERS[ni]),
                                line: None,
                            });
                        }
                        let mut tags = head.clone();
                        if p.kind == Kind::Nominal {
                            if key != "none" {
                                tags.push(("gender".into(), key.clone()));
                            }
                            tags.push(("case".into(), rk.to_string()));
                            tags.push(("number".into(), NUMBERS[ni].into()));
                        } else {
                            tags.push(("person".into(), rk.to_string()));
                            tags.push(("number".into(), NUMBERS[ni].into()));
                            tags.push(("tense".into(), key.clone()));
                        }
                        out.push(ExpandedForm {
                            form,
                            tags: finish(tags, &item.tags)?,
                        });
                    }
                }
            }
        }
        Ok(out)
    }
}

/// Parse a stems TSV: `stem<TAB>class<TAB>tags`, tags `key=value;key=value`
/// (optional).  Blank lines and lines whose first non-blank character is `#`
/// are skipped.  The class column may be empty (the stem is then a
/// ready-made form).  A line without a TAB, with more than three columns,
/// with white space inside the stem or class, or with a malformed tag is an
/// error carrying its 1-based line number.
pub fn parse_stems(text: &str) -> Result<Vec<StemLine>, ParadigmError> {
    let mut out = Vec::new();
    for (i, raw) in text.split('\n').enumerate() {
        let line = i + 1;
        let raw = raw.strip_suffix('\r').unwrap_or(raw);
        let t = raw.trim();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let err = |reason: String| ParadigmError::StemsLine { line, reason };
        let cols: Vec<&str> = raw.split('\t').collect();
        if cols.len() < 2 {
            return Err(err(
                "expected TAB-separated columns `stem<TAB>class<TAB>tags`".into(),
            ));
        }
        if cols.len() > 3 {
            return Err(err(format!(
                "expected at most 3 TAB-separated columns, found {}",
                cols.len()
            )));
        }
        let stem = nfc(cols[0].trim());
        let class = nfc(cols[1].trim());
        if stem.is_empty() {
            return Err(err("empty stem".into()));
        }
        if stem.chars().any(|c| c.is_whitespace() || c.is_control()) {
            return Err(err(format!("stem `{stem}` contains white space")));
        }
        if class.chars().any(|c| c.is_whitespace() || c.is_control()) {
            return Err(err(format!("class `{class}` contains white space")));
        }
        let tags = match cols.get(2) {
            Some(t) => parse_tag_list(t).map_err(err)?,
            None => Vec::new(),
        };
        out.push(StemLine {
            line,
            stem,
            class,
            tags,
        });
    }
    Ok(out)
}

/// Expand a whole stems file against the tables.  Returns all forms, in
/// file order (duplicates kept: the same form from different slots is a
/// separate reading), and one error per failing line (carrying its line).
pub fn expand_all(
    tables: &ParadigmTables,
    stems: &[StemLine],
) -> (Vec<ExpandedForm>, Vec<ParadigmError>) {
    let mut forms = Vec::new();
    let mut errors = Vec::new();
    for s in stems {
        match tables.expand(&s.stem, &s.class, &s.tags) {
            Ok(f) => forms.extend(f),
            Err(e) => errors.push(e.with_line(s.line)),
        }
    }
    (forms, errors)
}

/// Render forms as lines `form<TAB><TAB>key=value;…` (the format of
/// `verbs.tsv` and `indeclinables.tsv`), leaving out the tags named in
/// `drop`.
pub fn forms_to_tsv(forms: &[ExpandedForm], drop: &[&str]) -> String {
    let mut out = String::new();
    for f in forms {
        let tags: Vec<String> = f
            .tags
            .iter()
            .filter(|(k, _)| !drop.contains(&k.as_str()))
            .map(|(k, v)| format!("{k}={v}"))
            .collect();
        out.push_str(&f.form);
        out.push_str("\t\t");
        out.push_str(&tags.join(";"));
        out.push('\n');
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn forms(t: &ParadigmTables, stem: &str, class: &str) -> Vec<ExpandedForm> {
        t.expand(stem, class, &[]).unwrap()
    }

    fn cell(fs: &[ExpandedForm], key: &str, case: &str, number: &str) -> Vec<String> {
        fs.iter()
            .filter(|f| {
                f.tag("case") == Some(case)
                    && f.tag("number") == Some(number)
                    && (key.is_empty() || f.tag("gender") == Some(key))
            })
            .map(|f| f.form.clone())
            .collect()
    }

    const SMALL: &str = r#"
paradigms:
  a-m:
    model: deva
    strip: a
    forms:
      m:
        nom: [aḥ, au, āḥ]
        acc: [am, au, ān]
        ins: [ena, ābhyām, aiḥ]
        gen: [asya, ayoḥ, ānām]
        loc: [e, ayoḥ, esu]
  i-m:
    strip: ""
    forms:
      m:
        nom: [ḥ, ~, ~]
        loc: [~, ~, su]
  no-nati:
    like: a-m
    nati: false
  an-m:
    strip: an
    forms:
      m:
        ins: [nā, abhyām, abhiḥ]
        loc: [[ani, ni], ~, asu]
  pron-1:
    pos: pron
    tags: {person: 1}
    forms:
      none:
        nom: [=aham, =āvām, =vayam]
        acc: [[=mām, "=mā;enclitic=yes"], ~, ~]
  ī-f:
    strip: ī
    forms:
      f:
        nom: [ī, yau, yaḥ]
        ins: [yā, ībhyām, ībhiḥ]
  adj:
    pos: adj
    strip: a
    forms:
      m: a-m
      f: ī-f
  vat:
    strip: at
    forms:
      m:
        nom: [ān, antau, antaḥ]
      f: "at + ī-f"
  ī-m:
    forms:
      m: "ī-f.f"
  verb:
    kind: verb
    strip: a
    forms:
      pres:
        3: [ati, ataḥ, anti]
      impf:
        augment: true
        3: [at, atām, an]
  indecl:
    kind: invariant
"#;

    fn small() -> ParadigmTables {
        ParadigmTables::from_yaml(SMALL).unwrap()
    }

    #[test]
    fn nati_rule() {
        // Whitney §189–§192 (from memory).
        assert_eq!(nati("rāmena", 3), "rāmeṇa");
        assert_eq!(nati("devena", 3), "devena");
        assert_eq!(nati("rāmān", 3), "rāmān"); // final n stays
        assert_eq!(nati("rāmānām", 3), "rāmāṇām");
        assert_eq!(nati("rathena", 3), "rathena"); // t intervenes
        assert_eq!(nati("vṛkṣena", 3), "vṛkṣeṇa"); // ṣ triggers
        assert_eq!(nati("karṇena", 4), "karṇena"); // ṇ intervenes
        assert_eq!(nati("gṛhnanti", 2), "gṛhṇanti"); // second n blocked by ṇ
        assert_eq!(nati("rāmanti", 3), "rāmanti"); // followed by t
        assert_eq!(nati("brahmanā", 4), "brahmaṇā"); // h, m intervene
        assert_eq!(nati("rāmena", 5), "rāmena"); // before `from`: unchanged
    }

    #[test]
    fn ruki_rule() {
        // Whitney §180–§181 (from memory).
        assert_eq!(ruki("agnisu", 3), "agniṣu");
        assert_eq!(ruki("senāsu", 3), "senāsu");
        assert_eq!(ruki("esā", 0), "eṣā");
        assert_eq!(ruki("havīṃsi", 2), "havīṃṣi"); // across anusvāra
        assert_eq!(ruki("haviḥsu", 2), "haviḥṣu"); // across visarga
        assert_eq!(ruki("manāṃsi", 2), "manāṃsi");
        assert_eq!(ruki("agnis", 3), "agnis"); // final s stays
        assert_eq!(ruki("isra", 0), "isra"); // before r
        assert_eq!(ruki("vāksu", 2), "vākṣu"); // after k
        assert_eq!(ruki("s", 0), "s");
    }

    #[test]
    fn palatal_rule() {
        assert_eq!(palatal_n("rājnā", 2), "rājñā");
        assert_eq!(palatal_n("rājanā", 2), "rājanā");
        assert_eq!(palatal_n("n", 0), "n");
    }

    #[test]
    fn augment_rule() {
        assert_eq!(augment("gacchat"), "agacchat");
        assert_eq!(augment("icchat"), "aicchat");
        assert_eq!(augment("arhat"), "ārhat");
        assert_eq!(augment("ṛcchat"), "ārcchat");
        assert_eq!(augment("ukṣat"), "aukṣat");
        assert_eq!(augment("aiṣat"), "aiṣat");
    }

    #[test]
    fn expands_small_tables() {
        let t = small();
        let d = forms(&t, "deva", "a-m");
        assert_eq!(cell(&d, "m", "ins", "sg"), ["devena"]);
        assert_eq!(cell(&d, "m", "loc", "pl"), ["deveṣu"]);
        let r = forms(&t, "rāma", "a-m");
        assert_eq!(cell(&r, "m", "ins", "sg"), ["rāmeṇa"]);
        assert_eq!(cell(&r, "m", "gen", "pl"), ["rāmāṇām"]);
        assert_eq!(cell(&r, "m", "acc", "pl"), ["rāmān"]);
        let r = forms(&t, "rāma", "no-nati");
        assert_eq!(cell(&r, "m", "ins", "sg"), ["rāmena"]);
        let a = forms(&t, "agni", "i-m");
        assert_eq!(cell(&a, "m", "nom", "sg"), ["agniḥ"]);
        assert_eq!(cell(&a, "m", "loc", "pl"), ["agniṣu"]);
        assert_eq!(a.len(), 2); // ~ cells give nothing
        let k = forms(&t, "rājan", "an-m");
        assert_eq!(cell(&k, "m", "ins", "sg"), ["rājñā"]);
        assert_eq!(cell(&k, "m", "loc", "sg"), ["rājani", "rājñi"]);
        let f = forms(&t, "sundara", "adj");
        assert_eq!(cell(&f, "f", "ins", "sg"), ["sundaryā"]);
        assert_eq!(cell(&f, "m", "ins", "sg"), ["sundareṇa"]);
        let f = forms(&t, "bhagavat", "vat");
        assert_eq!(cell(&f, "m", "nom", "sg"), ["bhagavān"]);
        assert_eq!(cell(&f, "f", "ins", "sg"), ["bhagavatyā"]); // "at + ī-f"
        let f = forms(&t, "nadī", "ī-m"); // "ī-f.f": another key's table
        assert_eq!(cell(&f, "m", "ins", "sg"), ["nadīyā"]);
    }

    #[test]
    fn tags_and_options() {
        let t = small();
        let extra = vec![("gloss".to_string(), "god".to_string())];
        let d = t.expand("deva", "a-m", &extra).unwrap();
        assert_eq!(
            d[0].tags,
            vec![
                ("stem".to_string(), "deva".to_string()),
                ("class".into(), "a-m".into()),
                ("pos".into(), "noun".into()),
                ("gender".into(), "m".into()),
                ("case".into(), "nom".into()),
                ("number".into(), "sg".into()),
                ("gloss".into(), "god".into()),
            ]
        );
        let p = forms(&t, "mad", "pron-1");
        assert_eq!(cell(&p, "", "acc", "sg"), ["mām", "mā"]);
        assert_eq!(p[0].tag("person"), Some("1"));
        assert_eq!(p[0].tag("gender"), None);
        assert_eq!(p[0].tag("pos"), Some("pron"));
        assert_eq!(p[4].tag("enclitic"), Some("yes"));
        // pos override, gender filter
        let extra = vec![
            ("pos".to_string(), "adj".to_string()),
            ("gender".to_string(), "f".to_string()),
        ];
        let f = t.expand("priya", "adj", &extra).unwrap();
        assert!(f.iter().all(|x| x.tag("gender") == Some("f")));
        assert!(f
            .iter()
            .all(|x| x.tags.iter().filter(|t| t.0 == "gender").count() == 1));
        // same value: dropped; other value: error
        let same = vec![("person".to_string(), "1".to_string())];
        let p = t.expand("mad", "pron-1", &same).unwrap();
        assert_eq!(p[0].tags.iter().filter(|t| t.0 == "person").count(), 1);
        let other = vec![("person".to_string(), "2".to_string())];
        assert!(matches!(
            t.expand("mad", "pron-1", &other),
            Err(ParadigmError::ConflictingTag { .. })
        ));
        let bad = vec![("gender".to_string(), "n".to_string())];
        assert!(matches!(
            t.expand("priya", "adj", &bad),
            Err(ParadigmError::UnknownGender { .. })
        ));
        // verbs
        let v = forms(&t, "gaccha", "verb");
        let v: Vec<_> = v.iter().map(|f| f.form.as_str()).collect();
        assert_eq!(
            v,
            [
                "gacchati",
                "gacchataḥ",
                "gacchanti",
                "agacchat",
                "agacchatām",
                "agacchan"
            ]
        );
        let v = forms(&t, "iccha", "verb");
        assert_eq!(v[3].form, "aicchat");
        assert_eq!(v[3].tag("tense"), Some("impf"));
        assert_eq!(v[3].tag("person"), Some("3"));
        // invariant and ready-made
        let i = forms(&t, "ca", "indecl");
        assert_eq!(i.len(), 1);
        assert_eq!(i[0].tag("pos"), Some("indecl"));
        let r = t.expand("ca", "", &extra).unwrap();
        assert_eq!(r[0].tags, extra);
    }

    #[test]
    fn expand_errors() {
        let t = small();
        assert!(matches!(
            t.expand("deva", "nope", &[]),
            Err(ParadigmError::UnknownClass { .. })
        ));
        assert!(matches!(
            t.expand("senā", "a-m", &[]),
            Err(ParadigmError::StemMismatch { .. })
        ));
        assert!(matches!(
            t.expand("  ", "a-m", &[]),
            Err(ParadigmError::EmptyStem { .. })
        ));
        assert!(matches!(
            t.expand("de va", "a-m", &[]),
            Err(ParadigmError::InvalidStem { .. })
        ));
        let e = t.expand("a", "a-m", &[]).unwrap();
        assert_eq!(e[0].form, "aḥ");
    }

    #[test]
    fn classes_in_file_order() {
        let t = small();
        let c: Vec<_> = t.classes().collect();
        assert_eq!(
            c,
            [
                "a-m", "i-m", "no-nati", "an-m", "pron-1", "ī-f", "adj", "vat", "ī-m", "verb",
                "indecl"
            ]
        );
    }

    #[test]
    fn malformed_yaml_reports_location() {
        let e = ParadigmTables::from_yaml("paradigms:\n  a-m:\n    strip: [a\n").unwrap_err();
        match e {
            ParadigmError::Yaml { line, .. } => assert!(line.is_some()),
            other => panic!("{other:?}"),
        }
        let e = ParadigmTables::from_yaml("paradigms:\n  a-m:\n    stirp: a\n").unwrap_err();
        match &e {
            ParadigmError::Yaml { message, line, .. } => {
                assert!(message.contains("stirp"), "{message}");
                assert_eq!(*line, Some(3));
            }
            other => panic!("{other:?}"),
        }
        let e = ParadigmTables::from_yaml("other: 1\n").unwrap_err();
        assert!(matches!(e, ParadigmError::Yaml { .. }));
    }

    #[test]
    fn inconsistent_paradigms_name_class_and_slot() {
        let check = |yaml: &str, slot: &str, words: &str| match ParadigmTables::from_yaml(yaml)
            .unwrap_err()
        {
            ParadigmError::Paradigm {
                class,
                slot: s,
                reason,
                line,
            } => {
                assert_eq!(class, "x", "{yaml}");
                assert_eq!(s, slot, "{reason}");
                assert!(reason.contains(words), "{reason}");
                assert_eq!(line, Some(4), "{yaml}");
            }
            other => panic!("{other:?}"),
        };
        let head = "paradigms:\n  ok:\n    kind: invariant\n";
        check(
            &format!("{head}  x:\n    forms:\n      m:\n        nomm: [a, b, c]\n"),
            "forms.m.nomm",
            "unknown case",
        );
        check(
            &format!("{head}  x:\n    forms:\n      m:\n        nom: [a, b]\n"),
            "forms.m.nom",
            "3 cells",
        );
        check(
            &format!("{head}  x:\n    forms:\n      q:\n        nom: [a, b, c]\n"),
            "forms.q",
            "unknown gender",
        );
        check(
            &format!("{head}  x:\n    forms:\n      m:\n        nom: [a, {{}}, c]\n"),
            "forms.m.nom.du",
            "cell",
        );
        check(
            &format!("{head}  x:\n    forms:\n      m:\n        nom: [a, b c, c]\n"),
            "forms.m.nom.du",
            "white space",
        );
        check(
            &format!("{head}  x:\n    forms:\n      m:\n        nom: [\"=\", b, c]\n"),
            "forms.m.nom.sg",
            "full form",
        );
        check(
            &format!("{head}  x:\n    like: y\n"),
            "like",
            "unknown class",
        );
        check(
            &format!("{head}  x:\n    forms:\n      m: ok\n"),
            "forms.m",
            "no table",
        );
        check(&format!("{head}  x:\n    strip: a\n"), "forms", "no forms");
        check(
            &format!("{head}  x:\n    kind: verb\n    forms:\n      pres:\n        4: [a, b, c]\n"),
            "forms.pres.4",
            "unknown person",
        );
        check(
            &format!("{head}  x:\n    like: x\n    forms:\n      m:\n        nom: [a, b, c]\n"),
            "",
            "cycle",
        );
    }

    #[test]
    fn stems_parsing() {
        let text = "# comment\n\ndeva\ta-m\tpos=noun;gloss=god\r\nca\t\tpos=indecl\nphala\ta-n\n";
        let s = parse_stems(text).unwrap();
        assert_eq!(s.len(), 3);
        assert_eq!(s[0].line, 3);
        assert_eq!(s[0].stem, "deva");
        assert_eq!(s[0].tags[1], ("gloss".to_string(), "god".to_string()));
        assert_eq!(s[1].class, "");
        assert_eq!(s[2].tags, vec![]);
        // decomposed input comes out NFC
        let s = parse_stems("ra\u{0304}ma\ta-m\n").unwrap();
        assert_eq!(s[0].stem, "rāma");
    }

    #[test]
    fn stems_errors_carry_line_numbers() {
        let bad = [
            ("deva\ta-m\n deva a-m\n", 2),
            ("deva\ta-m\tpos=noun\textra\n", 1),
            ("\n\n\ta-m\n", 3),
            ("deva\ta-m\tpos\n", 1),
            ("deva\ta-m\t=x\n", 1),
            ("deva\ta-m\tpos=a;pos=b\n", 1),
            ("de va\ta-m\n", 1),
            ("deva\ta m\n", 1),
        ];
        for (text, line) in bad {
            match parse_stems(text) {
                Err(ParadigmError::StemsLine { line: l, .. }) => assert_eq!(l, line, "{text:?}"),
                other => panic!("{text:?}: {other:?}"),
            }
        }
    }

    #[test]
    fn expand_all_keeps_going_and_numbers_errors() {
        let t = small();
        let stems = parse_stems("deva\ta-m\nsenā\ta-m\nca\t\tpos=indecl\nx\tnope\n").unwrap();
        let (forms, errors) = expand_all(&t, &stems);
        assert_eq!(forms.len(), 15 + 1);
        assert_eq!(errors.len(), 2);
        assert_eq!(errors[0].line(), Some(2));
        assert_eq!(errors[1].line(), Some(4));
        assert!(errors[1].to_string().contains("stems line 4"));
    }

    #[test]
    fn tsv_rendering() {
        let f = ExpandedForm {
            form: "gacchati".into(),
            tags: vec![
                ("stem".into(), "gaccha".into()),
                ("pos".into(), "verb".into()),
            ],
        };
        assert_eq!(forms_to_tsv(&[f], &["stem"]), "gacchati\t\tpos=verb\n");
    }
}
