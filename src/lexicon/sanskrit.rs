//! The bundled Sanskrit lexicon, generated from paradigm tables (a special
//! case among the bundled lexicons, which are otherwise TSV files).
//!
//! This generator is the source of truth, but it does not run when the
//! lexicon is loaded: `scripts/build_compiled_lexicons.sh` writes its output
//! (`juncture lexicon expand`) and compiles it with the `sanskrit` rule-set's
//! normalization into `lexicons/compiled/sanskrit.jlex`, which is embedded
//! like the Germanic lexicons (`bundled::COMPILED`);
//! `tests/compiled_lexicons.rs` fails while that file is stale.
//!
//! ```text
//! lexicons/sanskrit/paradigms.yaml ─┐
//! lexicons/sanskrit/stems.tsv ──────┼─ paradigm::expand ─▶ inflected forms with tags
//! lexicons/sanskrit-sandhi-stems.tsv┘                      + compound stems (role=first)
//! lexicons/sanskrit/indeclinables.tsv, verbs.tsv ─────────▶ ready-made forms
//!                                     ─▶ tags bound / pragrhya ─▶ one TSV text
//! ```
//!
//! What is added to the paradigm expander's output:
//!
//! - **Compound stems.** Every nominal stem also stands as a compound first
//!   member, tagged `role=first` (the `pos`, `stem`, `class` and `gloss` of
//!   the stem line are kept): the stem itself (`deva`, `agni`, `pitṛ`,
//!   `bhagavat`), with final `s` written as visarga (`manas` → `manaḥ`, so
//!   that the visarga rules give `manoratha`), final `c`/`ś` as `k` (`vāc` →
//!   `vāk`, `diś` → `dik`, their pausa forms), and the `n` of `-an` and `-in`
//!   stems dropped (`rājan` → `rāja`, `hastin` → `hasti`), as first members
//!   are formed (Whitney §1203, from memory).
//! - **Possessive compound finals.** Every noun in -a, -ā, -i, -u, -as or -an is
//!   also declined in its other genders as an adjective (see
//!   [`possessive_final`]), tagged `role=last`: the last member of a bahuvrīhi takes the gender of
//!   what it describes (`bala`, n., in `mahābalaḥ`, m.). The rule-set keeps
//!   such forms out of the first place and from after a phrase junction.
//!   A stem line tagged `role=last` itself (the verbal compound finals
//!   `ja`, `da`, `ga`: `paṅkaja`, `jalada`, `khaga`) is declined with that
//!   tag on every form and gets neither a first member nor other genders.
//! - **`bound=yes`** on every reading of a form all of whose readings are
//!   `role=first` (`pra`, `agni`, `rāja`): such a form never ends an analysis
//!   and never stands before a printed space (conditions in
//!   `rule-sets/sanskrit.jr`). A form with some free reading (`deva`, stem
//!   and vocative) is not bound.
//! - **`final=vowel`** on the `role=first` readings of a form ending in a
//!   vowel: such a first member meets a consonant with no change, by a rule
//!   that does not consume its vowel (so `ā` in `gajam ā|rohati` can take
//!   the junction before it too).
//! - **`pragrhya=yes`** on every reading of a form that ends in `ī`, `ū` or
//!   `e` and all of whose readings are dual (`kavī`, `labhete`): the
//!   ordinary vowel rules do not apply to it, only the pragṛhya rule. A form
//!   with dual and other readings (`phale`: loc. sg. and nom. du.) is left to
//!   both.
//!
//! Forms carry no frequency (every part then weighs the same in ranking).
//! The text ([`tsv`]) is built once per process and shared.

use crate::paradigm::{parse_stems, ParadigmTables};
use std::collections::BTreeMap;
use std::sync::OnceLock;

/// File name under which the generated text is reported.
pub const SOURCE_NAME: &str = "lexicons/sanskrit (generated from paradigms.yaml, stems.tsv, sanskrit-sandhi-stems.tsv, indeclinables.tsv, verbs.tsv)";

/// The generator's input files in the repository: the paradigm tables, then
/// the stem files in the order they are expanded.
pub const INPUTS: &[&str] = &[
    "lexicons/sanskrit/paradigms.yaml",
    "lexicons/sanskrit/stems.tsv",
    "lexicons/sanskrit-sandhi-stems.tsv",
    "lexicons/sanskrit/indeclinables.tsv",
    "lexicons/sanskrit/verbs.tsv",
];

const PARADIGMS: &str = include_str!("../../lexicons/sanskrit/paradigms.yaml");
const STEMS: &[(&str, &str)] = &[
    (
        "lexicons/sanskrit/stems.tsv",
        include_str!("../../lexicons/sanskrit/stems.tsv"),
    ),
    (
        "lexicons/sanskrit-sandhi-stems.tsv",
        include_str!("../../lexicons/sanskrit-sandhi-stems.tsv"),
    ),
    (
        "lexicons/sanskrit/indeclinables.tsv",
        include_str!("../../lexicons/sanskrit/indeclinables.tsv"),
    ),
    (
        "lexicons/sanskrit/verbs.tsv",
        include_str!("../../lexicons/sanskrit/verbs.tsv"),
    ),
];

/// The lexicon as TSV text (`form<TAB><TAB>tags`), built on first use.
/// An error names the file and line of the paradigm data that failed.
pub fn tsv() -> Result<&'static str, String> {
    static TEXT: OnceLock<Result<String, String>> = OnceLock::new();
    TEXT.get_or_init(|| expand(PARADIGMS, STEMS))
        .as_ref()
        .map(String::as_str)
        .map_err(Clone::clone)
}

/// The bundled paradigm tables (`lexicons/sanskrit/paradigms.yaml`).
pub fn bundled_paradigms() -> &'static str {
    PARADIGMS
}

/// The form a nominal stem takes as a compound first member.
pub fn compound_stem(stem: &str, class: &str) -> String {
    let chars: Vec<char> = stem.chars().collect();
    let mut out = stem.to_string();
    if (class.starts_with("an-") && stem.ends_with("an")) || (class == "in" && stem.ends_with("in"))
    {
        out.pop();
        return out;
    }
    match chars.last() {
        Some('s') => {
            out.pop();
            out.push('ḥ');
        }
        Some('c') | Some('ś') | Some('j') => {
            out.pop();
            out.push('k');
        }
        // The d-stems' word-final form (suhṛt-, śarat-); the sandhi rules
        // voice it again before a voiced sound (śaradṛtu).
        Some('d') if class.starts_with("d-") => {
            out.pop();
            out.push('t');
        }
        _ => {}
    }
    out
}

/// How a noun is declined as the last member of a possessive (bahuvrīhi)
/// compound, which takes the gender of what it describes: the stem and the
/// adjective class to decline it by, and the noun's own gender (whose forms
/// it has already). Nouns in -a, -i, -u, -as and -an keep their stem
/// (*bala*, n., in *mahābalaḥ*, m.; *buddhi*, f., in *alpabuddhinā*, m.;
/// *bāhu*, m., in *mahābāhūni*, n. pl.; *yaśas*, n., in *mahāyaśāḥ*, m.;
/// *karman*, n., in *viśvakarmā*, m.); a feminine in -ā shortens it
/// (*vidyā* in *alpavidyaḥ*, m.). Whitney §1293–§1300, §334, §418, §424
/// (from memory).
fn possessive_final(
    stem: &str,
    class: &str,
    tags: &[(String, String)],
) -> Option<(String, &'static str, &'static str)> {
    let noun = tags.iter().any(|(k, v)| k == "pos" && v == "noun");
    let proper = tags.iter().any(|(k, v)| k == "proper" && v == "yes");
    if !noun || proper {
        return None;
    }
    let keep = |adj: &'static str, own: &'static str| Some((stem.to_string(), adj, own));
    match class {
        "a-m" => keep("a-adj", "m"),
        "a-n" => keep("a-adj", "n"),
        "i-m" => keep("i-adj", "m"),
        "i-f" => keep("i-adj", "f"),
        "i-n" => keep("i-adj", "n"),
        "u-m" => keep("u-adj-u", "m"),
        "u-f" => keep("u-adj-u", "f"),
        "u-n" => keep("u-adj-u", "n"),
        "ā-f" => stem
            .strip_suffix('ā')
            .map(|base| (format!("{base}a"), "a-adj", "f")),
        "as-n" => keep("as-adj", "n"),
        // An an-stem takes the other gender's an-table (viśvakarmā, m.,
        // on karman, n.); its feminine is left out.
        "an-n" => keep("an-m", "n"),
        "an-n-karman" => keep("an-m-ātman", "n"),
        "an-m" => keep("an-n", "m"),
        "an-m-ātman" => keep("an-n-karman", "m"),
        _ => None,
    }
}

/// The readings of a form, less its `role=last` ones when all the others
/// are `role=first`. The rules test a part's readings one junction at a
/// time, so a form that is only a first member (agni, the stem) and only a
/// last member (agni, the neuter of a possessive compound) would pass both
/// edges of the input and stand alone; such a form keeps its first-member
/// readings (the neuter mahāgni then has no analysis: a rare loss).
fn without_clashing_last_readings(list: &[Vec<(String, String)>]) -> Vec<Vec<(String, String)>> {
    let role =
        |r: &Vec<(String, String)>, value: &str| r.iter().any(|(k, v)| k == "role" && v == value);
    let last = list.iter().any(|r| role(r, "last"));
    let free = list.iter().any(|r| !role(r, "first") && !role(r, "last"));
    if last && !free && list.iter().any(|r| role(r, "first")) {
        list.iter().filter(|r| !role(r, "last")).cloned().collect()
    } else {
        list.to_vec()
    }
}

/// Letters that end a form in a vowel (IAST; `ai`, `au` end in `i`, `u`).
const VOWELS: &str = "aāiīuūṛṝḷḹeo";

fn clean(value: &str) -> String {
    value
        .chars()
        .map(|c| match c {
            ';' | '\t' | '\n' | '\r' => ',',
            '=' => '-',
            c => c,
        })
        .collect::<String>()
        .trim()
        .to_string()
}

/// Expands stem files (`stem<TAB>class<TAB>tags`, given as (name, text))
/// with paradigm tables (YAML text) into lexicon TSV text, adding compound
/// stems and the tags `bound`, `final` and `pragrhya` as described in the
/// module documentation. `juncture lexicon expand` writes this for user stems.
pub fn expand(paradigms: &str, files: &[(&str, &str)]) -> Result<String, String> {
    let tables =
        ParadigmTables::from_yaml(paradigms).map_err(|e| format!("paradigm tables: {e}"))?;
    // form → readings (tag lists), in first-seen order of forms.
    let mut order: Vec<String> = Vec::new();
    let mut readings: BTreeMap<String, Vec<Vec<(String, String)>>> = BTreeMap::new();
    let mut add = |form: String, tags: Vec<(String, String)>| {
        let list = readings.entry(form.clone()).or_insert_with(|| {
            order.push(form);
            Vec::new()
        });
        if !list.contains(&tags) {
            list.push(tags);
        }
    };
    for (file, text) in files {
        let lines = parse_stems(text).map_err(|e| format!("{file}: {e}"))?;
        for line in &lines {
            let forms = tables
                .expand(&line.stem, &line.class, &line.tags)
                .map_err(|e| format!("{file}:{}: {e}", line.line))?;
            // A ready-made form (no class) is no stem: it gets no
            // compound first member (the numeral forms dvau, tribhiḥ).
            let nominal = !line.class.is_empty() && forms.iter().any(|f| f.tag("case").is_some());
            // A stem tagged `role=last` is a compound's last member only
            // (the verbal finals -ja, -da, -ga): no first member, and its
            // forms in every gender are its own already.
            let last_only = line.tags.iter().any(|(k, v)| k == "role" && v == "last");
            if nominal && !last_only {
                let mut tags: Vec<(String, String)> = vec![
                    ("stem".into(), line.stem.clone()),
                    ("class".into(), line.class.clone()),
                ];
                if let Some(pos) = forms[0].tag("pos") {
                    tags.push(("pos".into(), pos.to_string()));
                }
                tags.push(("role".into(), "first".into()));
                if let Some((_, g)) = line.tags.iter().find(|(k, _)| k == "gloss") {
                    tags.push(("gloss".into(), g.clone()));
                }
                add(compound_stem(&line.stem, &line.class), tags);
            }
            for f in forms {
                add(f.form, f.tags);
            }
            if let Some((stem, class, own)) =
                possessive_final(&line.stem, &line.class, &line.tags).filter(|_| !last_only)
            {
                let forms = tables
                    .expand(&stem, class, &line.tags)
                    .map_err(|e| format!("{file}:{}: {e}", line.line))?;
                for f in forms {
                    if f.tag("gender").is_some_and(|g| g != own) {
                        // The noun's own stem (vidyā, not the shortened vidya).
                        let mut tags: Vec<(String, String)> = f
                            .tags
                            .into_iter()
                            .map(|(k, v)| {
                                if k == "stem" {
                                    (k, line.stem.clone())
                                } else {
                                    (k, v)
                                }
                            })
                            .collect();
                        tags.push(("role".into(), "last".into()));
                        add(f.form, tags);
                    }
                }
            }
        }
    }
    let mut out = String::with_capacity(order.len() * 80);
    out.push_str(
        "# juncture: Sanskrit forms expanded from paradigm tables (src/lexicon/sanskrit.rs)\n",
    );
    for form in &order {
        let list = without_clashing_last_readings(&readings[form]);
        let list = &list;
        let all = |key: &str, value: &str| {
            list.iter()
                .all(|r| r.iter().any(|(k, v)| k == key && v == value))
        };
        let bound = all("role", "first");
        let pragrhya = ["ī", "ū", "e"].iter().any(|e| form.ends_with(e)) && all("number", "du");
        let vowel_final = form.chars().last().is_some_and(|c| VOWELS.contains(c));
        for r in list {
            let mut tags: Vec<String> = r
                .iter()
                .map(|(k, v)| format!("{}={}", clean(k), clean(v)))
                .collect();
            if vowel_final && r.iter().any(|(k, v)| k == "role" && v == "first") {
                tags.push("final=vowel".into());
            }
            if bound {
                tags.push("bound=yes".into());
            }
            if pragrhya {
                tags.push("pragrhya=yes".into());
            }
            out.push_str(form);
            out.push_str("\t\t");
            out.push_str(&tags.join(";"));
            out.push('\n');
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn compound_stems() {
        assert_eq!(compound_stem("rājan", "an-m"), "rāja");
        assert_eq!(compound_stem("hastin", "in"), "hasti");
        assert_eq!(compound_stem("manas", "as-n"), "manaḥ");
        assert_eq!(compound_stem("vāc", "c-f"), "vāk");
        assert_eq!(compound_stem("diś", "ś-f"), "dik");
        assert_eq!(compound_stem("vaṇij", "j-m"), "vaṇik");
        assert_eq!(compound_stem("suhṛd", "d-m"), "suhṛt");
        assert_eq!(compound_stem("tad", "pron-tad"), "tad");
        assert_eq!(compound_stem("yuvan", "an-m-yuvan"), "yuva");
        assert_eq!(compound_stem("deva", "a-m"), "deva");
        assert_eq!(compound_stem("bhagavat", "vat"), "bhagavat");
    }

    #[test]
    fn inputs_list_the_embedded_files() {
        let embedded: Vec<&str> = STEMS.iter().map(|(name, _)| *name).collect();
        assert_eq!(INPUTS[0], "lexicons/sanskrit/paradigms.yaml");
        assert_eq!(&INPUTS[1..], embedded.as_slice());
    }

    #[test]
    fn builds_with_tags() {
        let text = tsv().unwrap();
        let lines: Vec<&str> = text.lines().collect();
        assert!(lines.len() > 10_000);
        let has = |form: &str, tag: &str| {
            lines
                .iter()
                .any(|l| l.split('\t').next() == Some(form) && l.contains(tag))
        };
        assert!(has("agni", "bound=yes"));
        assert!(has("deva", "case=voc"));
        assert!(!has("deva", "bound=yes"));
        assert!(has("kavī", "pragrhya=yes"));
        assert!(!has("phale", "pragrhya=yes"));
        assert!(has("manaḥ", "role=first"));
        // A possessive compound's last member in another gender.
        assert!(has("balaḥ", "role=last"));
        assert!(has("buddhinā", "role=last"));
        // Not where the form is also a first member and nothing else.
        assert!(!has("agni", "role=last"));
    }
}
