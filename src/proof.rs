//! Proof stage: analyses with their proof chains, forward verification, and
//! forward joining of parts.
//!
//! An analysis is a sequence of parts `w1 … wn` and junction instances
//! `r1 … r(n-1)`. Applying the junctions forward, left to right, must give the
//! input back exactly; [`verify`] does that for every analysis reported.
//!
//! Forward application of junction `r` between the text built so far and the
//! next word `w`: the text must end with the rule's underlying left end `L`,
//! `w` must start with its underlying right start `R`; the result is the text
//! without `L`, then the junction's surface, then `w` without `R`. Within one
//! word, the start taken by the junction before it and the end taken by the
//! junction after it may not overlap, and every word must leave a trace on
//! the surface (its own letters, or a junction that prints something).

use crate::lattice::{part_readings, Edge, Lattice, PartSource};
use crate::lexicon::{conditions_hold, Lexicon, Tags};
use crate::rules::{RuleSet, Scope, Separator};
use crate::search::ScoredPath;
use serde::Serialize;
use std::collections::BTreeMap;

/// One part of an analysis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Part {
    /// The lexicon form (as written in the lexicon).
    pub form: String,
    /// The part's stretch of the input, as written there.
    pub surface: String,
    /// Start of that stretch, in characters of the (NFC) input.
    pub start: usize,
    /// End of that stretch.
    pub end: usize,
    /// Tags; where readings differ, the values are joined with `|`.
    pub tags: Tags,
    /// Every reading, when the form has more than one.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub readings: Vec<Tags>,
    /// Where the part came from: `lexicon` or `pattern:NAME`.
    pub source: String,
    /// The normalized form used for matching.
    #[serde(skip)]
    pub key: String,
}

impl Part {
    /// The dictionary forms this part stands for: per reading, its `lemma`
    /// tag, or the form itself when the reading has none (the form is its own
    /// lemma). The first reading comes first; no repeats.
    pub fn lemmas(&self) -> Vec<&str> {
        let mut out: Vec<&str> = Vec::new();
        if self.readings.is_empty() {
            match self.tags.get(LEMMA_TAG) {
                Some(v) => out.extend(v.split('|').filter(|x| !x.is_empty())),
                None => out.push(&self.form),
            }
        } else {
            for r in &self.readings {
                let l = r.get(LEMMA_TAG).unwrap_or(self.form.as_str());
                if !out.contains(&l) {
                    out.push(l);
                }
            }
        }
        if out.is_empty() {
            out.push(&self.form);
        }
        out
    }

    /// The first of [`Part::lemmas`]: the index term of this part.
    pub fn lemma(&self) -> &str {
        self.lemmas().first().copied().unwrap_or(&self.form)
    }
}

/// The lexicon tag that names a form's lemma (dictionary form).
pub const LEMMA_TAG: &str = "lemma";

/// One junction of an analysis: a step of the proof chain.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Junction {
    /// Rule name.
    pub rule: String,
    /// Underlying end of the left word that the rule replaced.
    pub left: String,
    /// Underlying start of the right word that the rule replaced.
    pub right: String,
    /// What the junction shows on the surface (input characters).
    pub surface: String,
    /// Start of that surface in the input, in characters.
    pub at: usize,
    /// Where the boundary falls: `none` (between letters), `space`, `hyphen`, or `merged`.
    pub boundary: Separator,
    /// Compound, phrase or any.
    pub scope: Scope,
    /// The rule's cost.
    pub cost: f64,
    /// Index of the instance in the rule-set.
    #[serde(skip)]
    pub instance: usize,
    /// Characters of `surface` before the boundary.
    #[serde(skip)]
    pub split_at: usize,
}

impl Junction {
    /// The surface with the boundary shown: `an|a`, `d_a`, `(e)` for a merged
    /// segment, `|` when nothing is printed.
    pub fn marked_surface(&self) -> String {
        let chars: Vec<char> = self.surface.chars().collect();
        let cut = self.split_at.min(chars.len());
        let before: String = chars[..cut].iter().collect();
        match self.boundary {
            Separator::Merged => format!("({})", self.surface),
            Separator::None => format!("{before}|{}", chars[cut..].iter().collect::<String>()),
            Separator::Space | Separator::Hyphen => {
                let after: String = chars[(cut + 1).min(chars.len())..].iter().collect();
                format!(
                    "{before}{}{after}",
                    if self.boundary == Separator::Space {
                        "_"
                    } else {
                        "-"
                    }
                )
            }
        }
    }
}

/// A ranked analysis with its proof chain.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Analysis {
    /// 1-based rank.
    pub rank: usize,
    /// Score (higher is better), see the ranking model.
    pub score: f64,
    /// Parts, left to right.
    pub parts: Vec<Part>,
    /// Junctions between consecutive parts.
    pub junctions: Vec<Junction>,
}

impl Analysis {
    /// Parts' lexicon forms joined by ` + `.
    pub fn parts_text(&self) -> String {
        self.parts
            .iter()
            .map(|p| p.form.as_str())
            .collect::<Vec<_>>()
            .join(" + ")
    }
}

fn merge_tags(readings: &[Tags]) -> Tags {
    if let [only] = readings {
        return only.clone();
    }
    let mut out: BTreeMap<String, Vec<String>> = BTreeMap::new();
    for r in readings {
        for (k, v) in r {
            let vals = out.entry(k.to_string()).or_default();
            if !vals.iter().any(|x| x == v) {
                vals.push(v.to_string());
            }
        }
    }
    out.into_iter().map(|(k, v)| (k, v.join("|"))).collect()
}

/// The spelling a lexicon part is shown in. Under `set noun-capitals = on`
/// (an orthography that writes nouns with a capital first letter, as
/// German does) the lexicon's most frequent spelling gives way to what the
/// part's readings say: a part whose readings are all nouns starts with a
/// capital, one with no noun reading with a small letter, and the last part
/// (the head) of an input that starts with a capital always with a capital:
/// the head gives a compound its word class, and a capitalised word is a
/// noun or a nominalisation (*Kinderwagen* ends in the noun *Wagen*, not
/// the verb *wagen*; *Brustschwimmen* in *Schwimmen*). The head of an input
/// that starts with a small letter is written small unless all its readings
/// are nouns (*hellblau*: *hell* + *blau*). Only a
/// spelling that differs from its key in the first letter at most is
/// changed, so *DDR* or *McAllister* stay as written.
///
/// `head` is `None` for a part that is not the last, else whether the input
/// starts with a capital (`None` too when it starts with no letter).
pub fn shown_form(rules: &RuleSet, form: String, readings: &[Tags], head: Option<bool>) -> String {
    let readings: Vec<&Tags> = readings.iter().collect();
    shown_form_of(rules, form, &readings, head)
}

/// The readings of a part that decide its spelling under `noun-capitals`:
/// those that meet the conditions of the junctions on either side (the
/// junction before it tests the right word, the one after it the left
/// word), when any do; the junction licenses the part in those readings
/// (*schreib + Tisch* by the verb-stem rule is the verb). Of what is left,
/// a part that is not the last, written in full before its junction (the
/// junction's underlying left end is empty), with a noun reading and
/// otherwise only verb readings without a `lemma` (the infinitive itself)
/// is a nominalised infinitive, and only its noun readings count:
/// *Lebensmittel* is *Leben* + s + *Mittel*, *Essenszeit* *Essen* + s +
/// *Zeit*. So is one whose other readings are adverbs spelt like the noun
/// (*mittag*, *morgen*): first members are nouns far more often than
/// adverbs (common practice of German word formation), so *Mittagessen* is
/// *Mittag* + *Essen*.
fn shown_readings<'r>(
    rules: &RuleSet,
    key: &str,
    readings: &'r [Tags],
    before: Option<&crate::rules::Instance>,
    after: Option<&crate::rules::Instance>,
) -> Vec<&'r Tags> {
    let holds = |r: &Tags, conditions: &[crate::rules::Condition]| {
        conditions_hold(conditions, key, std::slice::from_ref(r))
    };
    let licensed = |r: &&Tags| {
        before.is_none_or(|i| holds(r, &rules.rules[i.rule].right_conditions))
            && after.is_none_or(|i| holds(r, &rules.rules[i.rule].left_conditions))
    };
    let mut shown: Vec<&Tags> = readings.iter().filter(licensed).collect();
    if shown.is_empty() {
        shown = readings.iter().collect();
    }
    let pos_is = |r: &Tags, pos: &str| r.get("pos").is_some_and(|p| p.split('|').any(|v| v == pos));
    let nominalised = after.is_some_and(|i| i.left.is_empty())
        && shown.iter().any(|r| pos_is(r, "noun"))
        && shown.iter().all(|r| {
            pos_is(r, "noun") || pos_is(r, "adv") || (pos_is(r, "verb") && !r.contains_key("lemma"))
        });
    if nominalised {
        shown.retain(|r| pos_is(r, "noun"));
    }
    shown
}

/// [`shown_form`] of borrowed readings.
fn shown_form_of(rules: &RuleSet, form: String, readings: &[&Tags], head: Option<bool>) -> String {
    if !rules.settings.noun_capitals {
        return form;
    }
    let noun = |r: &Tags| {
        r.get("pos")
            .is_some_and(|p| p.split('|').any(|v| v == "noun"))
    };
    let all_nouns = !readings.is_empty() && readings.iter().all(|r| noun(r));
    let capital = match head {
        Some(true) => true,
        Some(false) => all_nouns,
        None if all_nouns => true,
        None if !readings.is_empty() && !readings.iter().any(|r| noun(r)) => false,
        None => return form,
    };
    let mut chars = form.chars();
    let Some(first) = chars.next() else {
        return form;
    };
    let rest = chars.as_str();
    if rest.chars().any(char::is_uppercase) || first.is_uppercase() == capital {
        return form;
    }
    let mut out = String::with_capacity(form.len() + 2);
    if capital {
        out.extend(first.to_uppercase());
    } else {
        out.extend(first.to_lowercase());
    }
    out.push_str(rest);
    out
}

/// The lexicon form, or the input's own spelling of the word where the two
/// differ only by a fold of the rule-set and the input has the letter that
/// is folded (German folds ß to ss): *Maßnahme* is shown as written, though
/// the lexicon's most frequent spelling is *Massnahme*. The form's first
/// letter keeps its case; a form with capitals inside is kept as it is.
fn spelled_as_in_input(rules: &RuleSet, form: String, written: &str) -> String {
    let normalizer = &rules.normalizer;
    if normalizer.folds.is_empty() {
        return form;
    }
    let folded_letter = |s: &str| {
        s.chars()
            .flat_map(char::to_lowercase)
            .any(|c| normalizer.folds.contains_key(&c))
    };
    let mut form_chars = form.chars();
    let form_first_upper = form_chars.next().is_some_and(char::is_uppercase);
    if !folded_letter(written)
        || folded_letter(&form)
        || form_chars.any(char::is_uppercase)
        || normalizer.normalize(written) != normalizer.normalize(&form)
    {
        return form;
    }
    let mut out = String::with_capacity(written.len());
    for (i, c) in written.chars().enumerate() {
        if i == 0 && form_first_upper {
            out.extend(c.to_uppercase());
        } else {
            out.extend(c.to_lowercase());
        }
    }
    out
}

/// Whether an input starts with a capital (`None`: with no letter), for
/// [`shown_form`].
pub fn head_case(original: &[char]) -> Option<bool> {
    original
        .first()
        .filter(|c| c.is_alphabetic())
        .map(|c| c.is_uppercase())
}

/// Turns a lattice path into an analysis with offsets in the original input.
pub fn analysis(
    lattice: &Lattice,
    rules: &RuleSet,
    lexicon: &Lexicon,
    path: &ScoredPath,
    rank: usize,
) -> Analysis {
    let text = &lattice.text;
    let mut parts = Vec::new();
    let mut junctions = Vec::new();
    // Surface start of the next part (normalized), set by the junction before it.
    let mut next_start = 0usize;
    let mut pending_part: Option<(usize, Part)> = None;
    for &e in &path.edges {
        match &lattice.graph[e] {
            Edge::Word(w) => {
                let mut scratch = Vec::new();
                let readings = part_readings(rules, lexicon, w.source, &mut scratch);
                let (form, source) = match w.source {
                    PartSource::Entry(id) => {
                        let written = format!(
                            "{}{}{}",
                            w.carried,
                            text.original_slice(w.start, w.end),
                            w.left_end
                        );
                        let form = spelled_as_in_input(rules, lexicon.form(id, &w.key), &written);
                        (form, "lexicon".to_string())
                    }
                    PartSource::Pattern(p) => (
                        text.original_slice(w.start, w.end),
                        format!("pattern:{}", rules.patterns[p].name),
                    ),
                };
                let part = Part {
                    form,
                    surface: String::new(),
                    start: next_start,
                    end: w.end,
                    tags: merge_tags(readings),
                    readings: if readings.len() > 1 {
                        readings.to_vec()
                    } else {
                        Vec::new()
                    },
                    source,
                    key: w.key.clone(),
                };
                pending_part = Some((w.end, part));
            }
            Edge::Junction { instance } => {
                let inst = &rules.instances[*instance];
                let rule = &rules.rules[inst.rule];
                let (x_end, mut part) = pending_part.take().expect("a junction follows a word");
                let at = x_end;
                let len = inst.surface_chars();
                let left_len = inst.surface_left.chars().count();
                part.end = at + left_len;
                next_start = match inst.separator {
                    Separator::Merged => at,
                    _ => at + left_len + inst.separator.text().len(),
                };
                parts.push(part);
                junctions.push(Junction {
                    rule: rule.name.clone(),
                    left: inst.left.clone(),
                    right: inst.right.clone(),
                    surface: text.original_slice(at, at + len),
                    at: text.original_offset(at),
                    boundary: inst.separator,
                    scope: inst.scope,
                    cost: rule.cost,
                    instance: *instance,
                    split_at: left_len,
                });
            }
        }
    }
    if let Some((_, part)) = pending_part {
        parts.push(part);
    }
    if rules.settings.noun_capitals {
        let capital_input = head_case(&text.original);
        let last = parts.len().saturating_sub(1);
        for (i, p) in parts.iter_mut().enumerate() {
            if p.source == "lexicon" {
                let readings: &[Tags] = if p.readings.is_empty() {
                    std::slice::from_ref(&p.tags)
                } else {
                    &p.readings
                };
                let instance = |j: Option<usize>| {
                    j.and_then(|j| junctions.get(j))
                        .map(|j: &Junction| &rules.instances[j.instance])
                };
                let before = instance(i.checked_sub(1));
                let after = instance(Some(i)).filter(|_| i < last);
                let shown = shown_readings(rules, &p.key, readings, before, after);
                let form = std::mem::take(&mut p.form);
                let head = capital_input.filter(|_| i == last);
                p.form = shown_form_of(rules, form, &shown, head);
            }
        }
    }
    for p in &mut parts {
        p.surface = text.original_slice(p.start, p.end);
        let (s, e) = (text.original_offset(p.start), text.original_offset(p.end));
        p.start = s;
        p.end = e.max(s);
    }
    Analysis {
        rank,
        score: (path.score * 10_000.0).round() / 10_000.0,
        parts,
        junctions,
    }
}

/// Why forward application failed.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum VerifyError {
    /// Parts and junctions do not alternate.
    #[error("{parts} parts need {} junctions, got {junctions}", parts.saturating_sub(1))]
    Shape {
        /// Parts.
        parts: usize,
        /// Junctions.
        junctions: usize,
    },
    /// A word does not end with the rule's left side.
    #[error("junction {index} ({rule}): `{word}` does not end with `{expected}`")]
    LeftEnd {
        /// Junction index.
        index: usize,
        /// Rule.
        rule: String,
        /// The word.
        word: String,
        /// The rule's left end.
        expected: String,
    },
    /// A word does not start with the rule's right side.
    #[error("junction {index} ({rule}): `{word}` does not start with `{expected}`")]
    RightStart {
        /// Junction index.
        index: usize,
        /// Rule.
        rule: String,
        /// The word.
        word: String,
        /// The rule's right start.
        expected: String,
    },
    /// Two junctions claim the same letters of one word.
    #[error("word `{word}` is too short for the junctions on both its sides")]
    Overlap {
        /// The word.
        word: String,
    },
    /// A word leaves no trace on the surface.
    #[error("word `{word}` would vanish from the surface")]
    NoTrace {
        /// The word.
        word: String,
    },
    /// The junction boundary falls inside a segment.
    #[error("junction {index} ({rule}) cuts a segment of `{word}`")]
    Segment {
        /// Junction index.
        index: usize,
        /// Rule.
        rule: String,
        /// The word.
        word: String,
    },
    /// The result differs from the input.
    #[error("joining gives `{got}`, not `{expected}`")]
    Mismatch {
        /// What joining gave.
        got: String,
        /// The normalized input.
        expected: String,
    },
}

/// Applies junction instances forward to normalized words.
pub fn apply<W: AsRef<str>>(
    rules: &RuleSet,
    words: &[W],
    instances: &[usize],
) -> Result<String, VerifyError> {
    if words.is_empty() || instances.len() + 1 != words.len() {
        return Err(VerifyError::Shape {
            parts: words.len(),
            junctions: instances.len(),
        });
    }
    let seg = &rules.segmenter;
    let mut out = words[0].as_ref().to_string();
    let mut claimed = 0usize; // chars of the current word taken by the junction before it
    for (i, &id) in instances.iter().enumerate() {
        let inst = &rules.instances[id];
        let rule = || rules.rules[inst.rule].name.clone();
        let word = words[i].as_ref();
        let next = words[i + 1].as_ref();
        let word_len = word.chars().count();
        let left_len = inst.left.chars().count();
        let right_len = inst.right.chars().count();
        if !word.ends_with(&inst.left) {
            return Err(VerifyError::LeftEnd {
                index: i,
                rule: rule(),
                word: word.to_string(),
                expected: inst.left.clone(),
            });
        }
        if !next.starts_with(&inst.right) {
            return Err(VerifyError::RightStart {
                index: i,
                rule: rule(),
                word: next.to_string(),
                expected: inst.right.clone(),
            });
        }
        if word_len < claimed + left_len {
            return Err(VerifyError::Overlap {
                word: word.to_string(),
            });
        }
        let no_surface = inst.surface_left.is_empty()
            && inst.separator.text().is_empty()
            && inst.surface_right.is_empty();
        if word_len == claimed + left_len && no_surface {
            return Err(VerifyError::NoTrace {
                word: word.to_string(),
            });
        }
        if !seg.is_boundary(word, word_len - left_len) || !seg.is_boundary(next, right_len) {
            return Err(VerifyError::Segment {
                index: i,
                rule: rule(),
                word: word.to_string(),
            });
        }
        out.truncate(out.len() - inst.left.len());
        out.push_str(&inst.surface_left);
        out.push_str(inst.separator.text());
        out.push_str(&inst.surface_right);
        out.push_str(&next[inst.right.len()..]);
        claimed = right_len;
    }
    Ok(out)
}

/// Checks an analysis by applying its junctions forward: the result must be
/// the (normalized) input exactly.
pub fn verify(rules: &RuleSet, analysis: &Analysis, input: &str) -> Result<(), VerifyError> {
    verify_normalized(rules, analysis, &rules.normalizer.normalize(input))
}

/// [`verify`] against an input already normalized the rule-set's way (the
/// lattice's text), so that several analyses of one input normalize it once.
pub fn verify_normalized(
    rules: &RuleSet,
    analysis: &Analysis,
    expected: &str,
) -> Result<(), VerifyError> {
    let words: Vec<&str> = analysis.parts.iter().map(|p| p.key.as_str()).collect();
    let instances: Vec<usize> = analysis.junctions.iter().map(|j| j.instance).collect();
    let got = apply(rules, &words, &instances)?;
    if got == expected {
        Ok(())
    } else {
        Err(VerifyError::Mismatch {
            got,
            expected: expected.to_string(),
        })
    }
}

/// One way of joining parts.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Joined {
    /// 1-based rank.
    pub rank: usize,
    /// The surface form.
    pub surface: String,
    /// Sum of the rule costs.
    pub cost: f64,
    /// The rule used at each junction.
    pub junctions: Vec<JoinStep>,
}

/// The rule used at one junction of a join.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct JoinStep {
    /// Rule name.
    pub rule: String,
    /// Underlying end of the left part.
    pub left: String,
    /// Underlying start of the right part.
    pub right: String,
    /// What the junction produced.
    pub surface: String,
    /// Boundary kind.
    pub boundary: Separator,
    /// Rule cost.
    pub cost: f64,
    /// Instance index.
    #[serde(skip)]
    pub instance: usize,
}

/// Every surface form the rules allow for these parts, best (cheapest) first.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct JoinResult {
    /// The parts as given.
    pub parts: Vec<String>,
    /// Number of ways found.
    pub count: usize,
    /// Whether the list stopped at the limit.
    pub truncated: bool,
    /// The ways, best first.
    pub results: Vec<Joined>,
}

/// Joins parts forward with every applicable combination of junctions.
/// Tags for rule conditions come from the lexicon where a part is an entry.
pub fn join(
    rules: &RuleSet,
    lexicon: &Lexicon,
    parts: &[&str],
    scope: crate::lattice::ScopeFilter,
    limit: usize,
) -> JoinResult {
    let words: Vec<String> = parts
        .iter()
        .map(|p| rules.normalizer.normalize(p.trim()))
        .collect();
    let readings: Vec<Vec<Tags>> = words
        .iter()
        .map(|w| {
            lexicon
                .get(w)
                .map(|id| lexicon.entry(id).readings.clone())
                .unwrap_or_default()
        })
        .collect();
    let holds = |conds: &[crate::rules::Condition], i: usize| {
        conditions_hold(conds, &words[i], &readings[i])
    };
    let mut result = JoinResult {
        parts: parts.iter().map(|p| p.trim().to_string()).collect(),
        count: 0,
        truncated: false,
        results: Vec::new(),
    };
    if words.is_empty() || words.iter().any(|w| w.is_empty()) {
        return result;
    }
    if !holds(&rules.edge_start, 0) || !holds(&rules.edge_end, words.len() - 1) {
        return result;
    }
    // Candidate instances at each junction.
    let (max_l, max_r) = rules.max_ends();
    let mut candidates: Vec<Vec<usize>> = Vec::new();
    // The joined word starts as the first part is written; known to the
    // lexicon as no noun, it has no head read only as a noun and, written
    // small, no noun before a verb, as `split` reads it (see
    // `lattice::small_word_refuses`).
    let part_readings: Vec<&[Tags]> = readings.iter().map(Vec::as_slice).collect();
    let small = parts
        .first()
        .and_then(|p| p.chars().find(|c| c.is_alphabetic()))
        .is_some_and(char::is_lowercase);
    let checked = (rules.settings.verb_after_noun_capitalised && small)
        || rules.settings.noun_head_capitalised;
    let capitalised_head = rules.settings.noun_head_capitalised
        && parts
            .first()
            .is_some_and(|p| crate::lattice::starts_capitalised(&p.chars().collect::<Vec<_>>()))
        && part_readings.len() > 1
        && part_readings
            .last()
            .is_some_and(|head| crate::lattice::capitalised_head_refused(head));
    let refused = |surface: &str| {
        let key = rules.normalizer.normalize(surface);
        crate::lattice::known_without_noun(lexicon, &key)
            && lexicon.get(&key).is_some_and(|id| {
                crate::lattice::small_word_refuses(
                    &rules.settings,
                    lexicon.readings(id),
                    &part_readings,
                    small,
                )
            })
    };
    for i in 0..words.len().saturating_sub(1) {
        let left: Vec<char> = words[i].chars().collect();
        let right: Vec<char> = words[i + 1].chars().collect();
        let mut here = Vec::new();
        let seg = &rules.segmenter;
        for l in 0..=max_l.min(left.len()) {
            let suffix: String = left[left.len() - l..].iter().collect();
            // A junction meets its words at segment boundaries (`apply`
            // refuses `p` + `hala` in *phala*): ruled out here, not after
            // every combination of the junctions before it was tried.
            if !seg.is_boundary(&words[i], left.len() - l) {
                continue;
            }
            for r in 0..=max_r.min(right.len()) {
                let prefix: String = right[..r].iter().collect();
                if !seg.is_boundary(&words[i + 1], r) {
                    continue;
                }
                for &id in rules.instances_with_ends(&suffix, &prefix) {
                    let inst = &rules.instances[id];
                    let rule = &rules.rules[inst.rule];
                    if scope_allows(scope, inst.scope)
                        && holds(&rule.left_conditions, i)
                        && holds(&rule.right_conditions, i + 1)
                    {
                        here.push(id);
                    }
                }
            }
        }
        candidates.push(here);
    }
    let mut search = JoinSearch {
        rules,
        words: &words,
        candidates: &candidates,
        chosen: Vec::new(),
        found: Vec::new(),
        cap: limit.saturating_mul(20).max(1000),
        truncated: false,
        dead: rustc_hash::FxHashSet::default(),
    };
    search.enumerate();
    result.truncated = search.truncated;
    // A surface that is itself a lexicon word comes first, the more
    // frequent first: the rules allow Arbeitensamt and Arbeitsamt, the
    // lexicon shows which one the language writes. Then ways that write a
    // first word as a form the lexicon does not have for it (a rule's
    // `attested` clause: Arbeit + ens + Amt) are listed after the others,
    // then cheaper first, and at equal costs the surfaces with fewer
    // printed hyphens first (a hyphen twin of `set hyphenated-compounds`
    // after the word written together).
    let known = |surface: &str| {
        lexicon
            .get(&rules.normalizer.normalize(surface))
            .map(|id| lexicon.frequency(id))
    };
    // A way: its cost, its instances and its surface.
    type Way = (f64, Vec<usize>, String);
    let found: Vec<((usize, usize), Way)> = search
        .found
        .into_iter()
        .filter(|way| !capitalised_head && !(checked && refused(&way.2)))
        .map(|way| {
            let unattested = way
                .1
                .iter()
                .enumerate()
                .filter(|&(i, &id)| {
                    let inst = &rules.instances[id];
                    rules.rules[inst.rule].attested
                        && inst.surface_left != inst.left
                        && !crate::lattice::attested(rules, lexicon, &words[i], inst)
                })
                .count();
            let hyphens = way
                .1
                .iter()
                .filter(|&&id| rules.instances[id].separator == crate::rules::Separator::Hyphen)
                .count();
            ((unattested, hyphens), way)
        })
        .collect();
    let found: Vec<(Option<f64>, (usize, usize), Way)> = found
        .into_iter()
        .map(|(k, way)| (known(&way.2), k, way))
        .collect();
    let mut found = found;
    found.sort_by(|(fa, ka, a), (fb, kb, b)| {
        // Known surfaces first, the most frequent first.
        let by_frequency = match (fa, fb) {
            (Some(x), Some(y)) => y.total_cmp(x),
            (Some(_), None) => std::cmp::Ordering::Less,
            (None, Some(_)) => std::cmp::Ordering::Greater,
            (None, None) => std::cmp::Ordering::Equal,
        };
        by_frequency
            .then_with(|| ka.0.cmp(&kb.0))
            .then_with(|| a.0.total_cmp(&b.0))
            .then_with(|| ka.1.cmp(&kb.1))
            .then_with(|| a.2.cmp(&b.2))
    });
    let found: Vec<(f64, Vec<usize>, String)> = found.into_iter().map(|(_, _, way)| way).collect();
    result.count = found.len();
    if found.len() > limit {
        result.truncated = true;
    }
    for (rank, (cost, insts, surface)) in found.into_iter().take(limit).enumerate() {
        let junctions = insts
            .iter()
            .map(|&id| {
                let inst = &rules.instances[id];
                let rule = &rules.rules[inst.rule];
                JoinStep {
                    rule: rule.name.clone(),
                    left: inst.left.clone(),
                    right: inst.right.clone(),
                    surface: inst.surface(),
                    boundary: inst.separator,
                    cost: rule.cost,
                    instance: id,
                }
            })
            .collect();
        // With case folding the rules work on lowercase text; give the result
        // the capital the first part was written with (German nouns).
        let capital = rules.normalizer.fold_case
            && parts
                .first()
                .and_then(|p| p.trim().chars().next())
                .is_some_and(char::is_uppercase);
        let surface = if capital {
            let mut chars = surface.chars();
            chars
                .next()
                .map(|c| c.to_uppercase().chain(chars).collect())
                .unwrap_or_default()
        } else {
            surface
        };
        let surface = if rules.settings.noun_capitals {
            capitals_after_hyphens(rules, parts, &insts, surface)
        } else {
            surface
        };
        result.results.push(Joined {
            rank: rank + 1,
            surface,
            cost,
            junctions,
        });
    }
    result
}

/// Under `set noun-capitals = on`: a part written with a capital keeps it
/// after a printed hyphen (`Zeitungs-Artikel`). The hyphens of the surface
/// are matched to the hyphen junctions in order, so nothing is changed when
/// a part itself contains a hyphen.
fn capitals_after_hyphens(
    rules: &RuleSet,
    parts: &[&str],
    insts: &[usize],
    surface: String,
) -> String {
    let capital_after: Vec<bool> = insts
        .iter()
        .enumerate()
        .filter(|(_, &id)| rules.instances[id].separator == crate::rules::Separator::Hyphen)
        .map(|(i, _)| {
            parts
                .get(i + 1)
                .and_then(|p| p.trim().chars().next())
                .is_some_and(char::is_uppercase)
        })
        .collect();
    if capital_after.is_empty() || surface.matches('-').count() != capital_after.len() {
        return surface;
    }
    let mut out = String::with_capacity(surface.len());
    let mut hyphens = capital_after.iter();
    let mut upper_next = false;
    for c in surface.chars() {
        if upper_next {
            out.extend(c.to_uppercase());
            upper_next = false;
            continue;
        }
        if c == '-' {
            upper_next = hyphens.next().copied().unwrap_or(false);
        }
        out.push(c);
    }
    out
}

fn scope_allows(filter: crate::lattice::ScopeFilter, scope: Scope) -> bool {
    use crate::lattice::ScopeFilter::*;
    match filter {
        Any => true,
        Compound => scope != Scope::Phrase,
        Phrase => scope != Scope::Compound,
    }
}

/// The depth-first search over the junction candidates of [`join`].
struct JoinSearch<'a> {
    rules: &'a RuleSet,
    words: &'a [String],
    candidates: &'a [Vec<usize>],
    chosen: Vec<usize>,
    found: Vec<(f64, Vec<usize>, String)>,
    cap: usize,
    truncated: bool,
    /// (junction, characters of its left word the junction before it took)
    /// from which no join was found. Every test a junction makes looks at
    /// its own two words and that count only, so the same state fails again
    /// whatever came before it: without this, a part that no junction can
    /// follow late in a long compound made the search try every
    /// combination of the junctions before it.
    dead: rustc_hash::FxHashSet<(usize, usize)>,
}

impl JoinSearch<'_> {
    /// Depth first over the junctions, with an explicit stack (a line of
    /// tens of thousands of parts must not exhaust the call stack).
    fn enumerate(&mut self) {
        let rules = self.rules;
        let n = self.candidates.len();
        if n == 0 {
            self.leaf();
            return;
        }
        // Per junction entered: the next candidate to try, the number of
        // ways found when it was entered, and the characters of its left
        // word the junction before it took.
        struct Frame {
            next: usize,
            found_before: usize,
            claimed: usize,
        }
        let mut frames = vec![Frame {
            next: 0,
            found_before: 0,
            claimed: 0,
        }];
        while !frames.is_empty() {
            let i = frames.len() - 1;
            let frame = &mut frames[i];
            let len = self.words[i].chars().count();
            let mut descend = None;
            while let Some(&id) = self.candidates[i].get(frame.next) {
                frame.next += 1;
                // Prune overlaps early: the word before this junction must keep its letters.
                let inst = &rules.instances[id];
                let left_len = inst.left.chars().count();
                if len < frame.claimed + left_len
                    || (len == frame.claimed + left_len && inst.surface().is_empty())
                {
                    continue;
                }
                if self.found.len() >= self.cap {
                    self.truncated = true;
                    return;
                }
                if i + 1 == n {
                    self.chosen.push(id);
                    self.leaf();
                    self.chosen.pop();
                    continue;
                }
                let claimed = inst.right.chars().count();
                if self.dead.contains(&(i + 1, claimed)) {
                    continue;
                }
                descend = Some((id, claimed));
                break;
            }
            if let Some((id, claimed)) = descend {
                self.chosen.push(id);
                frames.push(Frame {
                    next: 0,
                    found_before: self.found.len(),
                    claimed,
                });
                continue;
            }
            // Every candidate of junction i tried.
            let done = frames.pop().expect("a frame is on the stack");
            if self.found.len() == done.found_before && !self.truncated {
                self.dead.insert((i, done.claimed));
            }
            self.chosen.pop();
        }
    }

    /// Applies the chosen junctions; a way that applies is kept.
    fn leaf(&mut self) {
        let rules = self.rules;
        if let Ok(surface) = apply(rules, self.words, &self.chosen) {
            // Folded from +0.0: an empty `sum()` of f64 is -0.0 (printed `-0`).
            let cost = self
                .chosen
                .iter()
                .map(|&id| rules.rules[rules.instances[id].rule].cost)
                .fold(0.0, |a, c| a + c);
            self.found.push((cost, self.chosen.clone(), surface));
        }
    }
}
