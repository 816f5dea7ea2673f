//! German rule-set: lexicalised words kept whole (`set lexicalised-bonus`),
//! linking elements tied to the first word's forms (`attested`), and ß
//! spellings in the bundled lexicon. The small lexicons written here have
//! invented frequencies that only set up the rankings the tests need.

use juncture::analyzer::{Analyzer, TokenRecord};
use juncture::lattice::ScopeFilter;
use juncture::lexicon::{Lexicon, LexiconBuilder};
use juncture::proof::join;
use juncture::rules::{compile, compile_named, CompileOptions, RuleSet};

fn compile_str(name: &str, text: &str) -> RuleSet {
    compile(name, text, None, &CompileOptions::default()).expect("the test rule-set compiles")
}

fn german() -> RuleSet {
    compile_named("german", &CompileOptions::default()).expect("the German rule-set compiles")
}

fn bundled(rules: &RuleSet) -> Lexicon {
    Lexicon::for_rules(rules, &[], true, false)
        .expect("bundled lexicon")
        .0
}

fn lexicon(rules: &RuleSet, tsv: &str) -> Lexicon {
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv("test.tsv", tsv.as_bytes()).expect("test lexicon");
    b.build().expect("test lexicon builds")
}

fn record(rules: &RuleSet, lexicon: &Lexicon, word: &str) -> TokenRecord {
    Analyzer::new(rules, lexicon).split_token(word, 10, 80)
}

/// Lexicon forms of the best analysis.
fn best_forms(rules: &RuleSet, lexicon: &Lexicon, word: &str) -> Vec<String> {
    let rec = record(rules, lexicon, word);
    rec.record.analyses[0]
        .parts
        .iter()
        .map(|p| p.form.clone())
        .collect()
}

/// Each word's best analysis is the word itself, one part.
fn assert_whole(rules: &RuleSet, lexicon: &Lexicon, words: &[&str]) {
    for word in words {
        let best = best_forms(rules, lexicon, word);
        assert_eq!(best.len(), 1, "{word}: {best:?}");
    }
}

/// The parts' keys of every analysis, sorted.
fn sorted_keys(rules: &RuleSet, lexicon: &Lexicon, word: &str) -> Vec<Vec<String>> {
    let mut all: Vec<Vec<String>> = record(rules, lexicon, word)
        .record
        .analyses
        .iter()
        .map(|a| a.parts.iter().map(|p| p.key.clone()).collect())
        .collect();
    all.sort();
    all
}

/// Lexicon forms of every analysis, best first.
fn analyses(rules: &RuleSet, lexicon: &Lexicon, word: &str) -> Vec<Vec<String>> {
    record(rules, lexicon, word)
        .record
        .analyses
        .iter()
        .map(|a| a.parts.iter().map(|p| p.form.clone()).collect())
        .collect()
}

const LEXICALISED: &str = "\
hoch\t190000\tpos=adj
Zeit\t970000\tpos=noun
Hochzeit\t30000\tpos=noun;lexicalised=yes
Tag\t500000\tpos=noun
Stück\t90000\tpos=noun
früh\t80000\tpos=adj
Frühstück\t20000\tpos=noun
";

#[test]
fn a_lexicalised_word_ranks_first_whole_and_its_split_is_still_listed() {
    let rules = german();
    assert!(rules.settings.lexicalised_bonus > 0.0);
    let lex = lexicon(&rules, LEXICALISED);
    let all = analyses(&rules, &lex, "Hochzeit");
    assert_eq!(all[0], ["Hochzeit"]);
    assert!(all.contains(&vec!["hoch".to_string(), "Zeit".to_string()]));
    // The same frequencies without the tag: the split wins (Frühstück has
    // no tag in this lexicon).
    assert_eq!(analyses(&rules, &lex, "Frühstück")[0], ["früh", "Stück"]);
}

#[test]
fn a_lexicalised_word_stays_one_part_inside_a_longer_compound() {
    let rules = german();
    let lex = lexicon(&rules, LEXICALISED);
    assert_eq!(
        analyses(&rules, &lex, "Hochzeitstag")[0],
        ["Hochzeit", "Tag"]
    );
}

#[test]
fn the_bonus_is_off_unless_a_rule_set_sets_it() {
    let text = "language x\ncase fold\nset ranking = frequency\nrule join: + -> |\n";
    let plain = compile_str("x.jr", text);
    assert_eq!(plain.settings.lexicalised_bonus, 0.0);
    let lex = lexicon(&plain, LEXICALISED);
    assert_eq!(analyses(&plain, &lex, "hochzeit")[0], ["hoch", "Zeit"]);
    let with = compile_str("x.jr", &format!("{text}set lexicalised-bonus = 4\n"));
    assert_eq!(with.settings.lexicalised_bonus, 4.0);
    assert_eq!(analyses(&with, &lex, "hochzeit")[0], ["Hochzeit"]);
}

const LINKING: &str = "\
Kaffee\t30000\tpos=noun
Ersatz\t3000\tpos=noun
Satz\t60000\tpos=noun
Kind\t100000\tpos=noun
Kinder\t60000\tpos=noun;lemma=Kind
Buch\t40000\tpos=noun
Lied\t20000\tpos=noun
Gast\t20000\tpos=noun
Gäste\t9000\tpos=noun;lemma=Gast
Haus\t90000\tpos=noun
";

#[test]
fn a_linking_element_needs_the_first_word_written_with_it_to_be_a_form_of_that_word() {
    let rules = german();
    assert!(rules
        .rules
        .iter()
        .any(|r| r.name == "link-er" && r.attested));
    let lex = lexicon(&rules, LINKING);
    // Kinder is a form of Kind: Kind + er + Buch.
    assert_eq!(analyses(&rules, &lex, "Kinderbuch")[0], ["Kind", "Buch"]);
    // Gäste is a form of Gast: the umlaut plural is read.
    assert_eq!(analyses(&rules, &lex, "Gästehaus")[0], ["Gast", "Haus"]);
    // Kaffeeer is no form of Kaffee: not Kaffee + er + Satz.
    let all = analyses(&rules, &lex, "Kaffeeersatz");
    assert_eq!(all[0], ["Kaffee", "Ersatz"]);
    assert!(!all.contains(&vec!["Kaffee".to_string(), "Satz".to_string()]));
    // Lieder is not in this lexicon, so Lied + er + Buch is not read here.
    assert!(!analyses(&rules, &lex, "Liederbuch")
        .contains(&vec!["Lied".to_string(), "Buch".to_string()]));
}

#[test]
fn the_attested_clause_parses_and_join_still_writes_every_form() {
    let text =
        "language x\ncase fold\nrule link-er: + -> e r |\n  attested\nrule plain-er: + -> e r |\n";
    let rules = compile_str("x.jr", text);
    assert!(rules.rules[0].attested);
    assert!(!rules.rules[1].attested);
    let lex = lexicon(&rules, LINKING);
    // Splitting: only the rule without the clause reads Kaffee + er + Satz.
    let rec = record(&rules, &lex, "kaffeeersatz");
    let rules_used: Vec<Vec<String>> = rec
        .record
        .analyses
        .iter()
        .filter(|a| a.parts.len() == 2 && a.parts[1].form == "Satz")
        .map(|a| a.junctions.iter().map(|j| j.rule.clone()).collect())
        .collect();
    assert_eq!(rules_used, [["plain-er"]]);
    // Joining writes the form through both rules.
    let joined = join(&rules, &lex, &["Kaffee", "Satz"], ScopeFilter::Any, 10);
    let by: Vec<&str> = joined
        .results
        .iter()
        .filter(|j| j.surface.to_lowercase() == "kaffeeersatz")
        .flat_map(|j| j.junctions.iter().map(|s| s.rule.as_str()))
        .collect();
    assert!(
        by.contains(&"link-er") && by.contains(&"plain-er"),
        "{by:?}"
    );
}

/// `join` lists a way whose `attested` junction writes the first word as a
/// form the lexicon does not have for it after the ways that do not, even
/// when its rule costs less: Kind + er (Kinder, lemma Kind) is attested,
/// Kaffee + er is not (no form Kaffeeer).
#[test]
fn join_lists_unattested_linking_forms_after_the_others() {
    let text = "language x\ncase fold\nrule link-er: + -> e r |\n  cost 0\n  attested\n\
                rule link-en: + -> e n |\n  cost 0.5\n  attested\nrule plain: + -> |\n  cost 1\n";
    let rules = compile_str("x.jr", text);
    let lex = lexicon(&rules, LINKING);
    let surfaces = |a: &str, b: &str| -> Vec<String> {
        join(&rules, &lex, &[a, b], ScopeFilter::Any, 10)
            .results
            .into_iter()
            .map(|j| j.surface)
            .collect()
    };
    // Both -er- and -en- are unattested for Kaffee: the plain join comes
    // first although it costs most, and the unattested ones keep their order.
    assert_eq!(
        surfaces("Kaffee", "Satz"),
        ["Kaffeesatz", "Kaffeeersatz", "Kaffeeensatz"]
    );
    // Kinder is a form of Kind: -er- stays first; -en- (Kinden) goes last.
    assert_eq!(
        surfaces("Kind", "Buch"),
        ["Kinderbuch", "Kindbuch", "Kindenbuch"]
    );
}

/// A joined surface that the lexicon has as a word of its own comes first,
/// whatever its rule costs: the bundled German lexicon has Arbeitsamt and
/// Kindergarten, not the cheaper Arbeitenamt or Kinder-Garten.
#[test]
fn join_lists_surfaces_the_lexicon_knows_first() {
    let rules = german();
    let lexicon = bundled(&rules);
    let first = |a: &str, b: &str| {
        join(&rules, &lexicon, &[a, b], ScopeFilter::Compound, 5)
            .results
            .first()
            .map(|j| j.surface.clone())
    };
    assert_eq!(first("Arbeit", "Amt").as_deref(), Some("Arbeitsamt"));
    assert_eq!(first("Kind", "Garten").as_deref(), Some("Kindergarten"));
    assert_eq!(first("Herz", "Wunsch").as_deref(), Some("Herzenswunsch"));
    assert_eq!(first("Schule", "Buch").as_deref(), Some("Schulbuch"));
    // -ens- belongs to Herz and Schmerz only.
    let kind = join(
        &rules,
        &lexicon,
        &["Kind", "Garten"],
        ScopeFilter::Compound,
        50,
    );
    assert!(kind.results.iter().all(|j| !j.surface.contains("ens")));
}

/// The bundled German lexicon writes ß where the current orthography does
/// (wordfreq's list folds it to ss; the lexicon build puts it back from a
/// spelling dictionary, see lexicons/README.md). Input in either spelling
/// finds the same parts; the parts are shown in the lexicon's spelling, or
/// as the input writes them where it has ß and the lexicon ss (a form the
/// dictionary did not know, or the older orthography).
#[test]
fn the_bundled_lexicon_spells_sharp_s_as_the_current_orthography_does() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    // ß after a long vowel or diphthong (Straße, Fuß, groß) ...
    assert_eq!(best("Straßenbahn"), ["Straße", "Bahn"]);
    assert_eq!(best("Strassenbahn"), ["Straße", "Bahn"]);
    assert_eq!(best("Großstadt"), ["groß", "Stadt"]);
    // ... ss after a short one, also where the older spelling wrote ß
    // (Schloß, Fluß before 1996).
    assert_eq!(best("Schlossgarten"), ["Schloss", "Garten"]);
    assert_eq!(best("Flussufer"), ["Fluss", "Ufer"]);
    // The lexicon's most frequent spelling is Massnahme (Swiss); ß in the
    // input is shown as written, its first letter cased as the lexicon's.
    assert_eq!(best("Maßnahmenpaket"), ["Maßnahme", "Paket"]);
    assert_eq!(best("maßnahmenpaket"), ["Maßnahme", "Paket"]);
    assert_eq!(best("Massnahmenpaket"), ["Massnahme", "Paket"]);
    assert_eq!(best("Schloßgarten"), ["Schloß", "Garten"]);
}

#[test]
fn the_bundled_lexicon_keeps_lexicalised_words_and_their_forms_whole() {
    let rules = german();
    let lexicon = bundled(&rules);
    for word in [
        "Hochzeit",
        "Maulwurf",
        "Bäckerei",
        "Bäckereien",
        "Frühstücks",
    ] {
        assert_eq!(best_forms(&rules, &lexicon, word).len(), 1, "{word}");
    }
}

/// Ambiguous compounds keep both readings near the top (bundled lexicon;
/// the readings are the ones a German reader sees in these words).
#[test]
fn both_readings_of_an_ambiguous_compound_are_among_the_best_five() {
    let rules = german();
    let lexicon = bundled(&rules);
    let cases: [(&str, [&[&str]; 2]); 4] = [
        ("Staubecken", [&["stau", "becken"], &["staub", "ecken"]]),
        (
            "Druckerzeugnis",
            [&["druck", "erzeugnis"], &["drucker", "zeugnis"]],
        ),
        (
            "Musikerleben",
            [&["musik", "erleben"], &["musiker", "leben"]],
        ),
        (
            "Bauerwartungsland",
            [&["bau", "erwartung", "land"], &["bauer", "wartung", "land"]],
        ),
    ];
    for (word, readings) in cases {
        let top: Vec<Vec<String>> = analyses(&rules, &lexicon, word)
            .into_iter()
            .take(5)
            .map(|a| a.iter().map(|f| f.to_lowercase()).collect())
            .collect();
        for reading in readings {
            assert!(
                top.iter().any(|t| t == reading),
                "{word}: {reading:?} not among {top:?}"
            );
        }
    }
}

/// Homographs in the bundled lexicon: the adjective weiß beside the verb
/// form (wissen), and nominalised adjectives (Zentrale, Kleine) that keep
/// their -e as first parts but take the weak -n (Kranke + n + Haus).
#[test]
fn adjective_first_parts_are_read_as_adjectives() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_eq!(best("Weißwein"), ["weiß", "Wein"]);
    assert_eq!(best("Zentralbank"), ["zentral", "Bank"]);
    assert_eq!(best("Kleinstadt"), ["klein", "Stadt"]);
    assert_eq!(best("Krankenhaus"), ["Kranke", "Haus"]);
}

/// `set noun-capitals = on`: the head of a capitalised compound is shown as
/// a noun, a part with no noun reading small, whatever the lexicon's most
/// frequent spelling (the case rule of German orthography, common practice).
/// The lexicon is invented for the test.
#[test]
fn noun_capitals_show_each_part_as_its_readings_and_the_heads_case_say() {
    let tsv = "Kind\t500\tpos=noun\nKinder\t200\tpos=noun;lemma=Kind\nwagen\t900\tpos=verb\nWagen\tpos=noun\n\
               Fahren\t300\tpos=verb\nRad\t400\tpos=noun\nhell\t300\tpos=adj\n\
               Blau\t600\tpos=noun\nblau\tpos=adj\n";
    let on = german();
    let lex = lexicon(&on, tsv);
    assert_eq!(best_forms(&on, &lex, "Kinderwagen"), ["Kind", "Wagen"]);
    assert_eq!(best_forms(&on, &lex, "kinderwagen"), ["Kind", "wagen"]);
    assert_eq!(best_forms(&on, &lex, "Fahrrad"), ["fahren", "Rad"]);
    assert_eq!(best_forms(&on, &lex, "Hellblau"), ["hell", "Blau"]);
    assert_eq!(best_forms(&on, &lex, "hellblau"), ["hell", "blau"]);
    // Off, the lexicon's most frequent spelling is shown.
    let text = std::fs::read_to_string("rule-sets/german.jr").expect("German rules");
    let off = compile_str("german-off", &text.replace("set noun-capitals = on", ""));
    let lex = lexicon(&off, tsv);
    assert_eq!(best_forms(&off, &lex, "Kinderwagen"), ["Kind", "wagen"]);
    assert_eq!(best_forms(&off, &lex, "Fahrrad"), ["Fahren", "Rad"]);
}

/// A part is spelled as the readings its junctions license: a verb stem
/// joined by a verb-stem rule is the verb, and an infinitive written in full
/// before a linking element or a plain junction, with a noun reading too,
/// is the nominalised infinitive (the noun), as an adverb spelt like a noun
/// is the noun. The small lexicon is invented;
/// its frequencies make the verb spelling the lexicon's most frequent one.
#[test]
fn a_part_is_spelled_as_the_readings_its_junctions_license() {
    let tsv = "leben\t900\tpos=verb\nLeben\tpos=noun\nMittel\t500\tpos=noun\n\
               schreiben\t800\tpos=verb\nSchreiben\tpos=noun\nTisch\t400\tpos=noun\n\
               Lauf\t300\tpos=noun\nhoch\t700\tpos=adj\nHoch\tpos=noun\nHaus\t600\tpos=noun\n\
               mittag\t900\tpos=adv\nMittag\tpos=noun\nEssen\t500\tpos=noun\n";
    let rules = german();
    let lex = lexicon(&rules, tsv);
    assert_eq!(
        best_forms(&rules, &lex, "Lebensmittel"),
        ["Leben", "Mittel"]
    );
    assert_eq!(best_forms(&rules, &lex, "Lebenslauf"), ["Leben", "Lauf"]);
    // schreib + Tisch: the verb-stem rule takes the verb reading.
    assert_eq!(
        best_forms(&rules, &lex, "Schreibtisch"),
        ["schreiben", "Tisch"]
    );
    // An adjective with a noun homograph is not an infinitive: as the
    // lexicon spells it.
    assert_eq!(best_forms(&rules, &lex, "Hochhaus"), ["hoch", "Haus"]);
    // An adverb with a noun homograph is the noun as a first member.
    assert_eq!(best_forms(&rules, &lex, "Mittagessen"), ["Mittag", "Essen"]);
}

/// `set hyphenated-compounds = on` in the German rule-set: a hyphen may
/// stand wherever a compound junction prints nothing, with the linking
/// element in front of it (the official spelling rules allow a hyphen in any
/// compound, Amtliches Regelwerk §§ 45–46, from memory). The small lexicon is
/// invented; its frequencies only make the lexicon form `zeitungs` a real
/// competitor.
#[test]
fn a_hyphen_may_follow_a_linking_element_and_the_part_after_it_keeps_its_capital() {
    let rules = german();
    let words = lexicon(
        &rules,
        "Zeitung\t5000\tpos=noun\nZeitungs\t40\tpos=noun\nArtikel\t3000\tpos=noun\nSchule\t4000\tpos=noun\nKind\t6000\tpos=noun\n",
    );
    assert_eq!(
        best_forms(&rules, &words, "Zeitungs-Artikel"),
        ["Zeitung", "Artikel"]
    );
    let rec = record(&rules, &words, "Zeitungs-Artikel");
    let best = &rec.record.analyses[0];
    assert_eq!(best.junctions[0].rule, "link-s");
    assert_eq!(best.junctions[0].surface, "s-");
    // Elision before a hyphen: Schul-Kind is Schule + Kind.
    assert_eq!(best_forms(&rules, &words, "Schul-Kind"), ["Schule", "Kind"]);
    // Joining writes the part after the hyphen with its capital, and lists
    // the form written together before the hyphenated one of the same cost.
    let surfaces: Vec<String> = join(
        &rules,
        &words,
        &["Zeitung", "Artikel"],
        ScopeFilter::Compound,
        100,
    )
    .results
    .into_iter()
    .map(|j| j.surface)
    .collect();
    let together = surfaces.iter().position(|s| s == "Zeitungsartikel");
    let hyphenated = surfaces.iter().position(|s| s == "Zeitungs-Artikel");
    assert!(
        together.is_some() && hyphenated.is_some() && together < hyphenated,
        "{surfaces:?}"
    );
    assert!(!surfaces.iter().any(|s| s.contains("-a")), "{surfaces:?}");
    // Off, the same word has only the bare hyphen: the lexicon form.
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/rule-sets/german.jr"))
        .expect("rule-sets/german.jr");
    assert!(text.contains("set hyphenated-compounds = on\n"));
    let off = compile_str(
        "german-off.jr",
        &text.replace(
            "set hyphenated-compounds = on\n",
            "set hyphenated-compounds = off\n",
        ),
    );
    let lexicon_off = lexicon(
        &off,
        "Zeitung\t5000\tpos=noun\nZeitungs\t40\tpos=noun\nArtikel\t3000\tpos=noun\n",
    );
    assert_eq!(
        best_forms(&off, &lexicon_off, "Zeitungs-Artikel"),
        ["Zeitungs", "Artikel"]
    );
}

/// Replacive -s (Hilfe -> Hilfs-, Geschichte -> Geschichts-) belongs to
/// nouns of two syllables or more: a one-syllable noun in -e is not read
/// with it (Aue + s + Fahrt is not Ausfahrt).
#[test]
fn replacive_s_is_not_read_after_a_one_syllable_noun() {
    let rules = german();
    let lexicon = bundled(&rules);
    assert_eq!(
        best_forms(&rules, &lexicon, "Autobahnausfahrt"),
        ["Auto", "Bahn", "Ausfahrt"]
    );
    assert_eq!(
        best_forms(&rules, &lexicon, "Hilfspaket"),
        ["Hilfe", "Paket"]
    );
    let all = analyses(&rules, &lexicon, "Autobahnausfahrt");
    assert!(
        !all.iter()
            .any(|a| a.windows(2).any(|w| w == ["Aue", "Fahrt"])),
        "{all:?}"
    );
}

/// Words of the bundled lexicon that look like compounds and are not: a
/// present participle is a verb stem and -end- (not + Ende), the short
/// function adverbs form words of their own (sowohl, nochmal), and a verb
/// stem takes no verb after it. Real compounds of the same shapes still
/// split.
#[test]
fn participles_function_adverbs_and_verb_pairs_stay_whole() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    for word in [
        "bestehende",
        "kommenden",
        "fehlende",
        "lebenden",
        "sowohl",
        "nochmal",
        "soweit",
        "daheim",
        "geblieben",
        // See keeps its -e (a long vowel): no See + Kunde.
        "Sekunde",
        "passend",
    ] {
        assert_eq!(best(word).len(), 1, "{word}: {:?}", best(word));
    }
    assert_eq!(best("Wochenende"), ["Woche", "Ende"]);
    assert_eq!(best("Schulbuch"), ["Schule", "Buch"]);
    assert_eq!(best("Hilfsbereitschaft"), ["Hilfe", "Bereitschaft"]);
    assert_eq!(best("Gehweg"), ["gehen", "Weg"]);
    assert_eq!(best("Rinderbraten"), ["Rind", "Braten"]);
    assert_eq!(best("Zusammenarbeit"), ["zusammen", "Arbeit"]);
}

/// Verbs that form no bare-stem first part (modal verbs; geben and werden,
/// whose compounds take Geber-, Gabe-, Werde-), participles in -end- after a
/// noun that spells a verb stem (zero linking or a dropped -e before Ende),
/// and the words the orthography rules of 2006 (§45) no longer count as
/// compounds stay whole (bundled lexicon). Real compounds of the same shapes
/// still split.
#[test]
fn verbs_without_bare_stems_and_participles_after_nouns_stay_whole() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    for word in [
        // not sollen/können + Test
        "solltest",
        "könntest",
        // not geben + Rauch
        "Gebrauch",
        // not Folge/Lauf/Vorsitz/Entscheid + Ende
        "folgende",
        "laufenden",
        "Vorsitzende",
        "entscheidende",
        // §45: not Mitte + Tag, dritte + Teil
        "Mittag",
        "Drittel",
        // a derivation of halten, not gehen + Alt
        "Gehalt",
        "Gehälter",
    ] {
        assert_eq!(best(word).len(), 1, "{word}: {:?}", best(word));
    }
    assert_eq!(best("Schreibtisch"), ["schreiben", "Tisch"]);
    assert_eq!(best("Esszimmer"), ["essen", "Zimmer"]);
    assert_eq!(best("Kriegsende"), ["Krieg", "Ende"]);
    assert_eq!(best("Jahresende"), ["Jahr", "Ende"]);
    assert_eq!(best("Redezeit"), ["reden", "Zeit"]);
    assert_eq!(best("Mittagessen"), ["Mittag", "Essen"]);
}

/// Verb forms whose split would need a noun with its -e dropped before a
/// verb (entlassen: not Ente + lassen) or a junk entry of the frequency list
/// (handelte: not Hand + `lte`, an abbreviation the tagger read as an
/// adjective; such readings are dropped from the bundled lexicon) stay
/// whole. A dropped -e before a noun still splits (bundled lexicon).
#[test]
fn verbs_are_not_read_as_a_noun_without_its_e_or_with_a_junk_head() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    for word in ["entlassen", "handelte"] {
        assert_eq!(best(word).len(), 1, "{word}: {:?}", best(word));
    }
    assert_eq!(best("Schulgarten"), ["Schule", "Garten"]);
    assert_eq!(best("Kirchturm"), ["Kirche", "Turm"]);
}

/// `set verb-after-noun = capitalised`: in a word written small that the
/// lexicon knows with no noun reading, a part read as a noun takes no part
/// read only as a verb after it; capitalised (a nominalised infinitive) it
/// does, a first part also read as an adjective or particle is never
/// refused, and a small word the lexicon does not know (a noun compound
/// whose case a pipeline lowered) splits as before. `split` and `join`
/// agree. Invented lexicon: the forms are German, the frequencies made up.
#[test]
fn a_verb_follows_a_noun_only_in_a_capitalised_word() {
    let text = "language t\ncase fold\nset verb-after-noun = capitalised\n\
                rule join: + -> |\n  in compound\n";
    let rules = compile_str("t.jr", text);
    let tsv = "Haus\t500\tpos=noun\nbauen\t400\tpos=verb\nfest\t300\tpos=adj\n\
               Teil\t300\tpos=noun\nteil\tpos=other\nBau\t200\tpos=noun\n\
               hausbauen\t2\tpos=verb\nfestbauen\t2\tpos=verb\nteilbauen\t2\tpos=verb\n";
    let lexicon = lexicon(&rules, tsv);
    let forms = |word: &str| sorted_keys(&rules, &lexicon, word);
    assert_eq!(forms("hausbauen"), [["hausbauen"]]);
    assert_eq!(
        forms("Hausbauen"),
        [vec!["haus", "bauen"], vec!["hausbauen"]]
    );
    assert_eq!(
        forms("festbauen"),
        [vec!["fest", "bauen"], vec!["festbauen"]]
    );
    assert_eq!(
        forms("teilbauen"),
        [vec!["teil", "bauen"], vec!["teilbauen"]]
    );
    // Not a lexicon word: a lowered noun compound, split as before.
    assert_eq!(
        forms("bauhausbauen"),
        [vec!["bau", "haus", "bauen"], vec!["bau", "hausbauen"]]
    );
    // A noun after a noun is not touched.
    assert_eq!(forms("hausbau"), [["haus", "bau"]]);
    let joined = |parts: &[&str]| -> Vec<String> {
        join(&rules, &lexicon, parts, ScopeFilter::Compound, 10)
            .results
            .into_iter()
            .map(|j| j.surface)
            .collect()
    };
    assert!(joined(&["haus", "bauen"]).is_empty());
    assert_eq!(joined(&["Haus", "bauen"]), ["Hausbauen"]);
    assert_eq!(joined(&["fest", "bauen"]), ["festbauen"]);
    assert_eq!(joined(&["bau", "haus", "bauen"]), ["bauhausbauen"]);
    // Without the setting the small word splits too.
    let always = compile_str("t.jr", &text.replace("= capitalised", "= always"));
    let lexicon = self::lexicon(&always, tsv);
    let rec = record(&always, &lexicon, "hausbauen").record;
    assert_eq!(rec.analyses.len(), 2);
}

/// With the bundled German rules and lexicon, verb forms written small are
/// not read as a noun + verb (zugelassen, verbrennt, beigetragen,
/// geheiratet) and small non-nouns have no noun head (vereinbart, wolltest,
/// entgehen), while the capitalised nominalisation, particle verbs and noun
/// compounds written small still split.
#[test]
fn small_verb_forms_are_not_read_as_noun_plus_verb() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_whole(
        &rules,
        &lexicon,
        &[
            "zugelassen",
            "verbrennt",
            "beigetragen",
            "geheiratet",
            "missbraucht",
            "versendet",
            "vereinbart",
            "wolltest",
            "entgehen",
            "dramatisch",
            "gehalten",
            "betrat",
        ],
    );
    assert_eq!(best("Autofahren"), ["Auto", "Fahren"]);
    assert_eq!(best("teilnehmen").len(), 2);
    // A noun compound whose case a pipeline lowered still splits.
    assert_eq!(best("rinderbraten"), ["Rind", "braten"]);
    assert_eq!(best("kartenspielen"), ["Karte", "spielen"]);
}

/// `set noun-head = capitalised`: a word written small that the lexicon
/// lists with no noun reading has no last part read only as a noun (the
/// head gives the word its class), and a head read as a noun and a verb is
/// the verb. Capitalised (at the start of a sentence) it has no noun head
/// either; not a lexicon word, it splits. Invented lexicon: the forms are
/// German, the frequencies made up.
#[test]
fn a_small_non_noun_word_has_no_noun_head() {
    let text = "language t\ncase fold\nset noun-head = capitalised\n\
                set verb-after-noun = capitalised\nrule join: + -> |\n  in compound\n";
    let rules = compile_str("t.jr", text);
    let tsv = "Drama\t500\tpos=noun\nTisch\t400\tpos=noun\ndramatisch\t50\tpos=adj\n\
               Ente\t300\tpos=noun\nGehen\t300\tpos=noun\ngehen\tpos=verb\n\
               entegehen\t20\tpos=verb\nkalt\t300\tpos=adj\nEis\t300\tpos=noun\n\
               eiskalt\t30\tpos=adj\ngehen\t400\tpos=verb\nalten\t300\tpos=adj\n\
               gehenalten\t50\tpos=verb\n";
    let lexicon = lexicon(&rules, tsv);
    let forms = |word: &str| sorted_keys(&rules, &lexicon, word);
    assert_eq!(forms("dramatisch"), [["dramatisch"]]);
    assert_eq!(forms("Dramatisch"), [["dramatisch"]]);
    // Not a lexicon word: split.
    assert_eq!(
        forms("dramatischtisch"),
        [vec!["drama", "tisch", "tisch"], vec!["dramatisch", "tisch"]]
    );
    // The head read as a noun and a verb counts as the verb, after a noun.
    assert_eq!(forms("entegehen"), [["entegehen"]]);
    // A word read only as a verb has a verb as its head.
    assert_eq!(forms("gehenalten"), [["gehenalten"]]);
    // Capitalised, an adjective head is refused too.
    assert_eq!(forms("Gehenalten"), [["gehenalten"]]);
    // An adjective head is not touched.
    assert_eq!(forms("eiskalt"), [vec!["eis", "kalt"], vec!["eiskalt"]]);
    let joined = |parts: &[&str]| -> usize {
        join(&rules, &lexicon, parts, ScopeFilter::Compound, 10)
            .results
            .len()
    };
    assert_eq!(joined(&["drama", "tisch"]), 0);
    // Capitalised too, as split reads it.
    assert_eq!(joined(&["Drama", "tisch"]), 0);
    assert_eq!(joined(&["ente", "gehen"]), 0);
    assert_eq!(joined(&["eis", "kalt"]), 1);
    assert_eq!(joined(&["gehen", "alten"]), 0);
    assert_eq!(joined(&["Gehen", "alten"]), 0);
    // Capitalised, the head is a noun or a verb: no adjective head.
    assert_eq!(forms("Eiskalt"), [["eiskalt"]]);
    assert_eq!(forms("EISKALT"), [vec!["eis", "kalt"], vec!["eiskalt"]]);
    assert_eq!(joined(&["Eis", "kalt"]), 0);
}

/// Inflected forms of `bar` are no second part (brauchbare is brauchbar +
/// -e), two-letter verb stems no first part (übersichtlich is no üb- +
/// ersichtlich), and a nominalised adjective reading (Geheime) does not
/// make a small adjective a noun (geheime is no gehen + Ime) (bundled
/// lexicon).
#[test]
fn derivations_in_bar_and_uber_and_small_adjectives_stay_whole() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_whole(
        &rules,
        &lexicon,
        &[
            "brauchbare",
            "sichtbare",
            "übersichtlich",
            "überarbeitete",
            "geheime",
            "dramatische",
        ],
    );
    assert_eq!(best("Waschpulver"), ["waschen", "Pulver"]);
}

/// Words that spell a suffix with its ending (Ist, Ion, Lungen, Gen,
/// Ente, Ler, Elle) are no second part: the derivations they would misread
/// stay whole (Journalist, Konzeption, Handlungen, Talente, Tischler), and
/// eigenständig is eigen + ständig, not Ei + Gen + ständig (bundled
/// lexicon).
#[test]
fn suffix_homographs_are_no_second_part() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_whole(
        &rules,
        &lexicon,
        &[
            "Journalist",
            "Konzeption",
            "Handlungen",
            "Verbesserungen",
            "Talente",
            "Tischler",
            "Bestseller",
            "fangen",
        ],
    );
    assert_eq!(best("eigenständig"), ["Eigen", "ständig"]);
    // A capitalised word has a noun head: Steuer, not s + teuer.
    assert_eq!(best("Einkommensteuer"), ["Einkommen", "Steuer"]);
    assert_eq!(best("Umsatzsteuer"), ["Umsatz", "Steuer"]);
    // No function adverb before a name either.
    assert_eq!(best("solange").len(), 1);
    assert_eq!(best("Solingen").len(), 1);
    assert_eq!(best("Raucherlunge"), ["Raucher", "Lunge"]);
}

/// Nouns that keep their -e and take -n- (Ente, Rede, Suppe, Jacke, Pope)
/// lose no -e as first parts, so the words their stems would misread stay
/// whole, while the nouns that do drop it still do (bundled lexicon).
#[test]
fn nouns_that_keep_their_e_are_not_elided() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_whole(
        &rules,
        &lexicon,
        &[
            "Redaktion",
            "Support",
            "Entführung",
            "Transaktion",
            "Jackpot",
            "Fortbildung",
        ],
    );
    assert_eq!(best("Popmusik"), ["Pop", "Musik"]);
    assert_eq!(best("Schulhof"), ["Schule", "Hof"]);
    assert_eq!(best("Lehrbuch"), ["Lehre", "Buch"]);
}

/// A noun's plural in -n/-en that the tagger read only as a verb (spinnen,
/// tasten, klingen) or as a noun of its own (Kanten, Zutaten) is a form of
/// the noun, from the spelling dictionary's plural flags, so the attested
/// linking -n-/-en- reads it (bundled lexicon: Spinnennetz was Spinne +
/// nennen + Netz, Klingenstahl had no analysis, Kantenlänge was Kanten +
/// Länge).
#[test]
fn regular_plurals_attest_the_linking_n() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_eq!(best("Spinnennetz"), ["Spinne", "Netz"]);
    assert_eq!(best("Tastenkombination"), ["Taste", "Kombination"]);
    assert_eq!(best("Klingenstahl"), ["Klinge", "Stahl"]);
    assert_eq!(best("Klappentext"), ["Klappe", "Text"]);
    assert_eq!(best("Kantenlänge"), ["Kante", "Länge"]);
    assert_eq!(best("Zutatenliste"), ["Zutat", "Liste"]);
    // A plural listed as a noun of its own is not made a form of another.
    assert_eq!(best("Postenkette"), ["Posten", "Kette"]);
    let spinnen = lexicon.get("spinnen").expect("spinnen is listed");
    let lemmas: Vec<Option<&str>> = lexicon
        .readings(spinnen)
        .iter()
        .map(|r| r.get("lemma"))
        .collect();
    assert!(lemmas.contains(&Some("Spinne")), "{lemmas:?}");
}

/// An invented rule-set: zero linking and a linking `s`, both free, ranked
/// by frequency as German is, with `unlisted-combining-cost` as given.
fn combining_rules(cost: Option<f64>) -> RuleSet {
    let setting = cost.map_or(String::new(), |c| {
        format!("set unlisted-combining-cost = {c}\n")
    });
    compile_str(
        "combining.jr",
        &format!(
            "language x\ncase fold\nset ranking = frequency\n{setting}rule join: + -> |\n  cost 0\nrule link-s: + -> s |\n  cost 0\n"
        ),
    )
}

/// Invented frequencies: `teig` is far more frequent than `steig`, so
/// without the setting `bahn + s + teig` wins; `bahn` lists only itself as
/// a first member, `zug` lists nothing, `rind` lists its plural form.
const COMBINING: &str = "\
bahn\t100\tpos=noun;combining=bahn
zug\t100\tpos=noun
steig\t10\tpos=noun
teig\t1000\tpos=noun
rind\t100\tpos=noun;combining=rind
rinder\t50\tpos=noun;lemma=rind
braten\t100\tpos=noun
raten\t1000\tpos=noun
";

#[test]
fn a_first_member_in_a_form_its_entry_does_not_list_costs_more() {
    let plain = combining_rules(None);
    let lex = lexicon(&plain, COMBINING);
    assert_eq!(analyses(&plain, &lex, "bahnsteig")[0], ["bahn", "teig"]);
    let costed = combining_rules(Some(3.0));
    let lex = lexicon(&costed, COMBINING);
    let all = analyses(&costed, &lex, "bahnsteig");
    assert_eq!(all[0], ["bahn", "steig"]);
    // The unlisted reading is still found, ranked lower.
    assert!(all.contains(&vec!["bahn".to_string(), "teig".to_string()]));
    // An entry without the tag pays nothing.
    assert_eq!(analyses(&costed, &lex, "zugsteig")[0], ["zug", "teig"]);
    // Only the first part pays: after a later part, the linking element
    // belongs to the compound up to it.
    assert_eq!(
        analyses(&costed, &lex, "zugbahnsteig")[0],
        ["zug", "bahn", "teig"]
    );
    // A form of the word itself (here only a plural with its lemma) is
    // listed by the lexicon: no cost for a member written `rinder`.
    let with_er = compile_str(
        "er.jr",
        "language x\ncase fold\nset ranking = frequency\nset unlisted-combining-cost = 3\nrule join: + -> |\n  cost 0\nrule link-er: + -> e r |\n  cost 0\n",
    );
    let lex = lexicon(&with_er, COMBINING);
    assert_eq!(analyses(&with_er, &lex, "rinderbraten")[0][1], "braten");
    assert_eq!(analyses(&with_er, &lex, "rinderbraten")[0][0], "rind");
}

#[test]
fn the_setting_is_a_number() {
    let rules = combining_rules(Some(1.5));
    assert_eq!(rules.settings.unlisted_combining_cost, 1.5);
    let err = compile(
        "x.jr",
        "language x\nset unlisted-combining-cost = high\n",
        None,
        &CompileOptions::default(),
    )
    .expect_err("a word is no cost");
    assert!(format!("{err:?}").contains("setting-value"), "{err:?}");
}

/// The bundled lexicon lists the spelling dictionary's combining forms, so
/// a first member read with a linking `s` it does not take ranks below the
/// one read as it is (Bahn takes no `s`; Schrift + s + Teller goes too).
#[test]
fn bundled_combining_forms_rank_unlisted_linking_lower() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_eq!(best("Bahnsteig"), ["Bahn", "Steig"]);
    assert_eq!(best("Zeitspanne"), ["Zeit", "Spanne"]);
    assert_ne!(best("Schriftsteller"), ["Schrift", "Teller"]);
    // Listed forms are unaffected.
    assert_eq!(best("Arbeitsamt"), ["Arbeit", "Amt"]);
    assert_eq!(best("Kinderwagen"), ["Kind", "Wagen"]);
    assert_eq!(best("Schulbuch"), ["Schule", "Buch"]);
}

/// A capitalised word's head is a noun or a verb in its citation form (the
/// infinitive, nominalised: Autofahren), not a verb form with a lemma of its
/// own (the imperative eil, the stem scher): Nachteil is not Nacht + eil,
/// Herrscher not Herr + scher. Capitalised at the start of a sentence, a
/// word the lexicon reads as no noun has no noun head (Dramatische is not
/// Drama + Tische, as dramatische is not), while a capitalised nominalised
/// infinitive may still have a noun before its verb (Staubsaugen) (bundled
/// lexicon).
#[test]
fn capitalised_heads_are_nouns_or_infinitives() {
    let rules = german();
    let lexicon = bundled(&rules);
    let best = |word: &str| best_forms(&rules, &lexicon, word);
    assert_whole(
        &rules,
        &lexicon,
        &[
            "Nachteil",
            "Herrscher",
            "Niederschlag",
            "Sandwich",
            "Dramatische",
            "Romantische",
            "Vereinbarte",
            "dramatische",
        ],
    );
    assert_eq!(best("Autofahren"), ["Auto", "Fahren"]);
    assert_eq!(best("Einkommensteuer"), ["Einkommen", "Steuer"]);
    assert_eq!(best("Staubsaugen"), ["Staub", "Saugen"]);
    assert_eq!(best("staubsaugen").len(), 1);
}
