//! Rules stage: rule file text → parse tree (pest) → typed [`ast`] → named
//! compile passes → [`RuleSet`].
//!
//! ```text
//! grammars/junction.pest ─▶ parse::parse_file ─▶ ast::RuleFile
//!     ─▶ compile: load includes → settings → resolve classes → expand rules
//!        → check duplicates → index both ways ─▶ RuleSet
//! ```

pub mod ast;
pub mod bundled;
pub mod compile;
pub mod compiled;
pub mod diagnostic;
pub mod grammar;
pub mod parse;
pub(crate) mod surface_trie;

pub use ast::{Condition, Scope, Side};
pub use compile::{compile, compile_from_text, compile_named, CompileOptions};
pub use diagnostic::{Diagnostic, Diagnostics, Location, Severity, SourceMap};

use crate::normalize::{Normalizer, Segmenter};
use std::collections::BTreeSet;

/// A compiled rule-set: normalization, segments, classes, junction rules
/// expanded into concrete instances, and indexes for both directions.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct RuleSet {
    /// Name it was loaded under (bundled name or file path).
    pub name: String,
    /// `language` statement.
    pub language: String,
    /// `description` statement.
    pub description: String,
    /// How text is normalized.
    pub normalizer: Normalizer,
    /// Multi-letter segments.
    pub segmenter: Segmenter,
    /// Classes, after resolving references.
    pub classes: Vec<Class>,
    /// Junction rules.
    pub rules: Vec<JunctionRule>,
    /// Concrete instances of the rules (one per combination of class members).
    pub instances: Vec<Instance>,
    /// Open-class parts (numbers, acronyms).
    pub patterns: Vec<Pattern>,
    /// Conditions on the first word of every analysis.
    pub edge_start: Vec<Condition>,
    /// Conditions on the last word of every analysis.
    pub edge_end: Vec<Condition>,
    /// Every embedded example.
    pub examples: Vec<Example>,
    /// Declared variants and whether they are selected.
    pub variants: Vec<Variant>,
    /// `set` values, with defaults.
    pub settings: Settings,
    /// Source texts, for diagnostics.
    pub sources: SourceMap,
    /// Warnings found while compiling.
    #[serde(skip)]
    pub warnings: Vec<Diagnostic>,
    /// Instances by whole surface (for `explain`); built on first use
    /// when the rule-set was read from its compiled form.
    #[serde(skip)]
    pub(crate) surface_index: std::sync::OnceLock<rustc_hash::FxHashMap<String, Vec<usize>>>,
    pub(crate) max_surface_chars: usize,
    pub(crate) surface_trie: surface_trie::SurfaceTrie,
    pub(crate) condition_ids: surface_trie::ConditionIds,
    /// Instances by underlying ends (for joining); built on first use.
    #[serde(skip)]
    pub(crate) end_index: std::sync::OnceLock<rustc_hash::FxHashMap<(String, String), Vec<usize>>>,
    pub(crate) max_left_chars: usize,
    pub(crate) max_right_chars: usize,
}

/// A class of segments.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct Class {
    /// Name.
    pub name: String,
    /// Members in order (normalized).
    pub members: Vec<String>,
    /// Where it is defined.
    pub location: Location,
}

/// A junction rule.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct JunctionRule {
    /// Name.
    pub name: String,
    /// Description, if given.
    pub description: Option<String>,
    /// The change as written in the file.
    pub change: String,
    /// Cost used in ranking.
    pub cost: f64,
    /// Declared scope (instances written with a space are always phrase scope).
    pub scope: Scope,
    /// Conditions on the left word.
    pub left_conditions: Vec<Condition>,
    /// Conditions on the right word.
    pub right_conditions: Vec<Condition>,
    /// `note` clauses.
    pub notes: Vec<String>,
    /// `attested`: when splitting, the left word as the junction writes it
    /// (its left end replaced by the letters before the boundary) must be a
    /// lexicon form of the left word: the form itself, or a form with a
    /// reading whose `lemma` is the left word (`Kinder`, lemma `Kind`, for
    /// `Kind + er`). Rules that write the word unchanged are not affected.
    pub attested: bool,
    /// Where it is defined.
    pub location: Location,
    /// Classes the rule mentions.
    pub classes_used: BTreeSet<String>,
}

/// How the two parts meet on the surface.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize, serde::Deserialize,
)]
#[serde(rename_all = "lowercase")]
pub enum Separator {
    /// Nothing printed between them.
    None,
    /// A printed space.
    Space,
    /// A printed hyphen.
    Hyphen,
    /// The surface belongs to both parts (a merged segment).
    Merged,
}

impl Separator {
    /// The printed text.
    pub fn text(self) -> &'static str {
        match self {
            Separator::Space => " ",
            Separator::Hyphen => "-",
            _ => "",
        }
    }
}

/// One concrete way two words can meet.
#[derive(Debug, Clone, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
pub struct Instance {
    /// Index of the rule in [`RuleSet::rules`].
    pub rule: usize,
    /// Underlying end of the left word.
    pub left: String,
    /// Underlying start of the right word.
    pub right: String,
    /// Surface before the boundary (the whole surface when merged).
    pub surface_left: String,
    /// How the boundary is shown.
    pub separator: Separator,
    /// Surface after the boundary.
    pub surface_right: String,
    /// Compound, phrase or both.
    pub scope: Scope,
}

impl Instance {
    /// The whole surface this junction produces.
    pub fn surface(&self) -> String {
        format!(
            "{}{}{}",
            self.surface_left,
            self.separator.text(),
            self.surface_right
        )
    }

    /// Surface length in characters.
    pub fn surface_chars(&self) -> usize {
        self.surface_left.chars().count()
            + self.separator.text().len()
            + self.surface_right.chars().count()
    }
}

/// An open-class part: any run of segments of a class.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct Pattern {
    /// Name, given to the part as tag `pattern=NAME`.
    pub name: String,
    /// Allowed segments.
    pub members: BTreeSet<String>,
    /// Minimum number of characters.
    pub min: usize,
    /// Maximum number of characters.
    pub max: Option<usize>,
    /// Whether the input must show capitals.
    pub uppercase: bool,
    /// Tags of the part.
    pub tags: Vec<(String, String)>,
}

/// An embedded example.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct Example {
    /// The rule it belongs to, if written under one.
    pub rule: Option<usize>,
    /// Parts as written.
    pub parts: Vec<String>,
    /// Surface as written.
    pub surface: String,
    /// Where.
    pub location: Location,
}

/// A declared variant.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct Variant {
    /// Name.
    pub name: String,
    /// Description.
    pub description: Option<String>,
    /// Letter folded.
    pub from: String,
    /// Replacement.
    pub to: String,
    /// Whether it was selected for this compilation.
    pub selected: bool,
}

/// How analyses are ranked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Ranking {
    /// Koehn & Knight (2003): geometric mean of part frequencies, minus rule costs.
    Frequency,
    /// Sum of part log-probabilities, minus rule costs and a cost per part.
    Probability,
}

/// Rule-set settings (`set NAME = VALUE`).
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Settings {
    /// `ranking`: frequency or probability.
    pub ranking: Ranking,
    /// `min-part-length`: shortest lexicon form allowed as a part of a split.
    pub min_part_length: usize,
    /// `max-parts`: most parts in one analysis (0: no limit).
    pub max_parts: usize,
    /// `part-cost`: cost added per part (probability ranking).
    pub part_cost: f64,
    /// `split-cost`: cost added per junction.
    pub split_cost: f64,
    /// `pattern-frequency`: frequency given to open-class parts.
    pub pattern_frequency: f64,
    /// `lexicon`: name of the bundled lexicon used by default.
    pub lexicon: Option<String>,
    /// `script`: the transliteration scheme the rules are written in (e.g. `iast`).
    pub script: Option<String>,
    /// `shadowed-linking`: `off` drops a junction that adds letters to the
    /// end of the left word when the left word as written with them is a
    /// common noun of its own in its citation form (see [`SHADOWING_READING`]).
    pub shadowed_linking: bool,
    /// `lexicalised-bonus`: added to the score of an analysis for every part
    /// whose lexicon entry has a reading tagged [`LEXICALISED_TAG`]`=yes`
    /// (a word whose meaning is not that of its parts: Hochzeit, Maulwurf).
    pub lexicalised_bonus: f64,
    /// `first-member-bonus`: added to the score of an analysis for every
    /// part but the last whose lexicon entry has a reading tagged [`FIRST_MEMBER_TAGS`]
    /// (a vowel-final compound first member in its stem form): where
    /// nothing else tells two readings apart, the one that reads the word
    /// as a compound comes first (Sanskrit *devendraḥ*: deva + indraḥ).
    pub first_member_bonus: f64,
    /// `unlisted-combining-cost`: subtracted from the score of an analysis
    /// whose first part (of two or more) is written in a form that its lexicon
    /// entry's [`COMBINING_TAG`] readings do not list (`Bahn` + `s` in
    /// *Bahnsteig*, where the tag lists only `bahn`); an entry without the
    /// tag costs nothing (see [`crate::search::combining_cost`]).
    pub unlisted_combining_cost: f64,
    /// `noun-capitals`: the orthography writes nouns with a capital first
    /// letter (German), so a part is shown in its noun or its other spelling
    /// as its readings say (see [`crate::proof::shown_form`]).
    pub noun_capitals: bool,
    /// `hyphenated-compounds`: a compound may print a hyphen wherever its
    /// junctions print nothing (`Zeitungs-Artikel`, `deva-putraḥ`): every
    /// such instance gets a twin with a hyphen (see the rules reference).
    pub hyphenated_compounds: bool,
    /// `verb-after-noun = capitalised`: in an input that starts with a small
    /// letter, a part read as a noun is not followed by one read only as a
    /// verb (see [`crate::lattice::noun_before_verb`]); `always` (the
    /// default) allows it everywhere.
    pub verb_after_noun_capitalised: bool,
    /// `noun-head = capitalised`: in an input that starts with a small
    /// letter and that the lexicon lists with no noun reading, the last
    /// part is not one read only as a noun (see
    /// [`crate::lattice::small_word_refuses`]); `always` (the default)
    /// allows it everywhere.
    pub noun_head_capitalised: bool,
}

/// The lexicon tag that lists the forms a word takes as the first member
/// of a compound, as written before the next member (`combining=kinder|kindes`
/// on *Kind*; see [`Settings::unlisted_combining_cost`]).
pub const COMBINING_TAG: &str = "combining";

/// The lexicon tag that marks a lexicalised word: written as a compound of
/// other words, but not one in meaning (`lexicalised=yes`).
pub const LEXICALISED_TAG: &str = "lexicalised";

/// The lexicon tags of a reading that earns the `first-member-bonus`: a
/// compound's first member in its stem form (`role=first`) that ends in a
/// vowel (`final=vowel`). Vowel sandhi hides the length of that vowel, so
/// such a stem ties with another word's inflected form (deva and devā in
/// devendraḥ). A consonant-final stem ties only with its own pausa form
/// (tad and tat), which is the reading to keep before a word that cannot
/// end a compound (tac chrutvā), so it earns nothing.
pub const FIRST_MEMBER_TAGS: [(&str, &str); 2] = [("role", "first"), ("final", "vowel")];

/// What shadows a linking reading under `set shadowed-linking = off`: the
/// left word as written (with the letters the junction adds before the
/// boundary) has a lexicon reading with `pos=noun`, no `lemma` tag and no
/// `proper=yes`. `Eis` shadows `Ei + s` in Eisberg, `Musiker` shadows
/// `Musik + er`; `Kinder` (lemma Kind) does not shadow `Kind + er`.
pub const SHADOWING_READING: &str = "pos=noun, no lemma, not proper=yes";

impl Default for Settings {
    fn default() -> Self {
        Settings {
            ranking: Ranking::Probability,
            min_part_length: 1,
            max_parts: 0,
            part_cost: 1.0,
            split_cost: 0.0,
            pattern_frequency: 1.0,
            lexicon: None,
            script: None,
            shadowed_linking: true,
            noun_capitals: false,
            hyphenated_compounds: false,
            verb_after_noun_capitalised: false,
            noun_head_capitalised: false,
            lexicalised_bonus: 0.0,
            first_member_bonus: 0.0,
            unlisted_combining_cost: 0.0,
        }
    }
}

impl RuleSet {
    /// Instances whose whole surface is exactly `surface`.
    pub fn instances_with_surface(&self, surface: &str) -> &[usize] {
        self.surface_index
            .get_or_init(|| compile::surface_index(&self.instances))
            .get(surface)
            .map_or(&[], |v| v.as_slice())
    }

    /// Longest surface of any instance, in characters.
    pub fn max_surface_chars(&self) -> usize {
        self.max_surface_chars
    }

    /// Instances whose underlying ends are exactly `left` and `right`.
    pub fn instances_with_ends(&self, left: &str, right: &str) -> &[usize] {
        self.end_index
            .get_or_init(|| compile::end_index(&self.instances))
            .get(&(left.to_string(), right.to_string()))
            .map_or(&[], |v| v.as_slice())
    }

    /// Longest underlying left end and right start, in characters.
    pub fn max_ends(&self) -> (usize, usize) {
        (self.max_left_chars, self.max_right_chars)
    }

    /// A rule by name.
    pub fn rule_by_name(&self, name: &str) -> Option<usize> {
        self.rules.iter().position(|r| r.name == name)
    }
}
