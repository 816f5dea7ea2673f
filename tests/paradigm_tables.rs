//! Checks the real Sanskrit paradigm tables and lexicons in
//! `lexicons/sanskrit/` against well-known cells of the handbook tables
//! (W. D. Whitney, Sanskrit Grammar, 1889; A. A. Macdonell, A Sanskrit
//! Grammar for Students, 1927), all quoted from memory.

use std::collections::{BTreeMap, BTreeSet, HashMap};
use std::path::PathBuf;
use std::sync::OnceLock;

use juncture::paradigm::{
    expand_all, parse_stems, ExpandedForm, ParadigmError, ParadigmTables, StemLine,
};
use proptest::prelude::*;
use unicode_normalization::is_nfc;

fn lexicon_path(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("lexicons")
        .join("sanskrit")
        .join(name)
}

fn read(name: &str) -> String {
    std::fs::read_to_string(lexicon_path(name))
        .unwrap_or_else(|e| panic!("reading lexicons/sanskrit/{name}: {e}"))
}

fn tables() -> &'static ParadigmTables {
    static TABLES: OnceLock<ParadigmTables> = OnceLock::new();
    TABLES.get_or_init(|| {
        ParadigmTables::from_yaml(&read("paradigms.yaml")).expect("paradigms.yaml parses")
    })
}

fn stems(name: &str) -> Vec<StemLine> {
    parse_stems(&read(name)).unwrap_or_else(|e| panic!("{name}: {e}"))
}

/// Forms of one stem, by `gender.case.number` (or `case.number` for the
/// genderless personal pronouns, `tense.person.number` for verbs).
fn paradigm(stem: &str, class: &str) -> BTreeMap<String, Vec<String>> {
    let t = tables();
    let mut out: BTreeMap<String, Vec<String>> = BTreeMap::new();
    for f in t.expand(stem, class, &[]).unwrap() {
        let key = if let Some(tense) = f.tag("tense") {
            format!(
                "{tense}.{}.{}",
                f.tag("person").unwrap(),
                f.tag("number").unwrap()
            )
        } else {
            let case = f.tag("case").unwrap();
            let number = f.tag("number").unwrap();
            match f.tag("gender") {
                Some(g) => format!("{g}.{case}.{number}"),
                None => format!("{case}.{number}"),
            }
        };
        out.entry(key).or_default().push(f.form);
    }
    out
}

/// Assert that `slot` holds exactly the forms `want` (in order).
fn check(p: &BTreeMap<String, Vec<String>>, slot: &str, want: &[&str]) {
    let got: Vec<&str> = p
        .get(slot)
        .map(|v| v.iter().map(String::as_str).collect())
        .unwrap_or_default();
    assert_eq!(got, want, "slot {slot}");
}

#[test]
fn deva_a_stem_masculine() {
    // Whitney §330, a-stem m. (from memory)
    let p = paradigm("deva", "a-m");
    check(&p, "m.nom.sg", &["devaḥ"]);
    check(&p, "m.acc.sg", &["devam"]);
    check(&p, "m.ins.sg", &["devena"]);
    check(&p, "m.dat.sg", &["devāya"]);
    check(&p, "m.abl.sg", &["devāt"]);
    check(&p, "m.gen.sg", &["devasya"]);
    check(&p, "m.loc.sg", &["deve"]);
    check(&p, "m.voc.sg", &["deva"]);
    check(&p, "m.nom.du", &["devau"]);
    check(&p, "m.acc.du", &["devau"]);
    check(&p, "m.ins.du", &["devābhyām"]);
    check(&p, "m.gen.du", &["devayoḥ"]);
    check(&p, "m.loc.du", &["devayoḥ"]);
    check(&p, "m.nom.pl", &["devāḥ"]);
    check(&p, "m.acc.pl", &["devān"]);
    check(&p, "m.ins.pl", &["devaiḥ"]);
    check(&p, "m.dat.pl", &["devebhyaḥ"]);
    check(&p, "m.abl.pl", &["devebhyaḥ"]);
    check(&p, "m.gen.pl", &["devānām"]);
    check(&p, "m.loc.pl", &["deveṣu"]);
}

#[test]
fn rama_shows_nati() {
    // Whitney §189–§192, n → ṇ after r (from memory)
    let p = paradigm("rāma", "a-m");
    check(&p, "m.ins.sg", &["rāmeṇa"]);
    check(&p, "m.gen.pl", &["rāmāṇām"]);
    check(&p, "m.acc.pl", &["rāmān"]); // final n stays
                                       // Whitney §330, a-stem n. (from memory)
    let p = paradigm("kṣetra", "a-n");
    check(&p, "n.nom.pl", &["kṣetrāṇi"]);
    check(&p, "n.ins.sg", &["kṣetreṇa"]);
    let p = paradigm("ratha", "a-m");
    check(&p, "m.ins.sg", &["rathena"]); // dental th intervenes
}

#[test]
fn phala_a_stem_neuter() {
    // Whitney §330, a-stem n. (from memory)
    let p = paradigm("phala", "a-n");
    check(&p, "n.nom.sg", &["phalam"]);
    check(&p, "n.acc.sg", &["phalam"]);
    check(&p, "n.nom.du", &["phale"]);
    check(&p, "n.nom.pl", &["phalāni"]);
    check(&p, "n.ins.sg", &["phalena"]);
    check(&p, "n.voc.sg", &["phala"]);
}

#[test]
fn agni_i_stem_masculine() {
    // Whitney §339–§340, i-stem m. (from memory)
    let p = paradigm("agni", "i-m");
    check(&p, "m.nom.sg", &["agniḥ"]);
    check(&p, "m.acc.sg", &["agnim"]);
    check(&p, "m.ins.sg", &["agninā"]);
    check(&p, "m.dat.sg", &["agnaye"]);
    check(&p, "m.abl.sg", &["agneḥ"]);
    check(&p, "m.gen.sg", &["agneḥ"]);
    check(&p, "m.loc.sg", &["agnau"]);
    check(&p, "m.voc.sg", &["agne"]);
    check(&p, "m.nom.du", &["agnī"]);
    check(&p, "m.gen.du", &["agnyoḥ"]);
    check(&p, "m.nom.pl", &["agnayaḥ"]);
    check(&p, "m.acc.pl", &["agnīn"]);
    check(&p, "m.ins.pl", &["agnibhiḥ"]);
    check(&p, "m.gen.pl", &["agnīnām"]);
    check(&p, "m.loc.pl", &["agniṣu"]); // ruki
                                        // Whitney §339–§340, i-stem m. with r: nati (from memory)
    let p = paradigm("hari", "i-m");
    check(&p, "m.ins.sg", &["hariṇā"]);
    check(&p, "m.gen.pl", &["harīṇām"]);
    // Whitney §346, pati (from memory)
    let p = paradigm("pati", "pati");
    check(&p, "m.ins.sg", &["patyā"]);
    check(&p, "m.gen.sg", &["patyuḥ"]);
    check(&p, "m.loc.sg", &["patyau"]);
    check(&p, "m.nom.sg", &["patiḥ"]);
    // Whitney §343, sakhi (from memory)
    let p = paradigm("sakhi", "sakhi");
    check(&p, "m.nom.sg", &["sakhā"]);
    check(&p, "m.nom.pl", &["sakhāyaḥ"]);
    check(&p, "m.acc.pl", &["sakhīn"]);
    check(&p, "m.voc.sg", &["sakhe"]);
}

#[test]
fn mati_i_stem_feminine() {
    // Whitney §339–§340, i-stem f. (from memory)
    let p = paradigm("mati", "i-f");
    check(&p, "f.nom.sg", &["matiḥ"]);
    check(&p, "f.ins.sg", &["matyā"]);
    check(&p, "f.dat.sg", &["mataye", "matyai"]);
    check(&p, "f.gen.sg", &["mateḥ", "matyāḥ"]);
    check(&p, "f.loc.sg", &["matau", "matyām"]);
    check(&p, "f.acc.pl", &["matīḥ"]);
    check(&p, "f.loc.pl", &["matiṣu"]);
}

#[test]
fn guru_dhenu_u_stems() {
    // Whitney §339–§341, u-stem m. (from memory)
    let p = paradigm("guru", "u-m");
    check(&p, "m.nom.sg", &["guruḥ"]);
    check(&p, "m.ins.sg", &["guruṇā"]); // nati
    check(&p, "m.dat.sg", &["gurave"]);
    check(&p, "m.gen.sg", &["guroḥ"]);
    check(&p, "m.loc.sg", &["gurau"]);
    check(&p, "m.voc.sg", &["guro"]);
    check(&p, "m.nom.pl", &["guravaḥ"]);
    check(&p, "m.acc.pl", &["gurūn"]);
    check(&p, "m.gen.pl", &["gurūṇām"]);
    check(&p, "m.loc.pl", &["guruṣu"]);
    // Whitney §339–§341, u-stem f. (from memory)
    let p = paradigm("dhenu", "u-f");
    check(&p, "f.nom.sg", &["dhenuḥ"]);
    check(&p, "f.ins.sg", &["dhenvā"]);
    check(&p, "f.dat.sg", &["dhenave", "dhenvai"]);
    check(&p, "f.acc.pl", &["dhenūḥ"]);
    check(&p, "f.gen.pl", &["dhenūnām"]);
    // Whitney §339–§341, u-stem n. (from memory)
    let p = paradigm("madhu", "u-n");
    check(&p, "n.nom.pl", &["madhūni"]);
    check(&p, "n.ins.sg", &["madhunā"]);
    check(&p, "n.loc.pl", &["madhuṣu"]);
}

#[test]
fn sena_a_stem_feminine() {
    // Whitney §364, ā-stem f. (from memory)
    let p = paradigm("senā", "ā-f");
    check(&p, "f.nom.sg", &["senā"]);
    check(&p, "f.acc.sg", &["senām"]);
    check(&p, "f.ins.sg", &["senayā"]);
    check(&p, "f.dat.sg", &["senāyai"]);
    check(&p, "f.abl.sg", &["senāyāḥ"]);
    check(&p, "f.gen.sg", &["senāyāḥ"]);
    check(&p, "f.loc.sg", &["senāyām"]);
    check(&p, "f.voc.sg", &["sene"]);
    check(&p, "f.nom.du", &["sene"]);
    check(&p, "f.nom.pl", &["senāḥ"]);
    check(&p, "f.ins.pl", &["senābhiḥ"]);
    check(&p, "f.loc.pl", &["senāsu"]);
}

#[test]
fn nadi_i_stem_feminine() {
    // Whitney §364, derivative ī-stem f. (from memory)
    let p = paradigm("nadī", "ī-f");
    check(&p, "f.nom.sg", &["nadī"]);
    check(&p, "f.acc.sg", &["nadīm"]);
    check(&p, "f.ins.sg", &["nadyā"]);
    check(&p, "f.dat.sg", &["nadyai"]);
    check(&p, "f.abl.sg", &["nadyāḥ"]);
    check(&p, "f.gen.sg", &["nadyāḥ"]);
    check(&p, "f.loc.sg", &["nadyām"]);
    check(&p, "f.voc.sg", &["nadi"]);
    check(&p, "f.nom.du", &["nadyau"]);
    check(&p, "f.nom.pl", &["nadyaḥ"]);
    check(&p, "f.acc.pl", &["nadīḥ"]);
    check(&p, "f.gen.pl", &["nadīnām"]);
    check(&p, "f.loc.pl", &["nadīṣu"]);
    // Whitney §364, nārī: nati across ī (from memory)
    let p = paradigm("nārī", "ī-f");
    check(&p, "f.gen.pl", &["nārīṇām"]);
    // Whitney §364, ū-stem f. (from memory)
    let p = paradigm("vadhū", "ū-f");
    check(&p, "f.nom.sg", &["vadhūḥ"]);
    check(&p, "f.ins.sg", &["vadhvā"]);
    check(&p, "f.loc.pl", &["vadhūṣu"]);
}

#[test]
fn r_stems() {
    // Whitney §373, ṛ-stems (from memory)
    let p = paradigm("pitṛ", "ṛ-m-rel");
    check(&p, "m.nom.sg", &["pitā"]);
    check(&p, "m.acc.sg", &["pitaram"]);
    check(&p, "m.ins.sg", &["pitrā"]);
    check(&p, "m.gen.sg", &["pituḥ"]);
    check(&p, "m.loc.sg", &["pitari"]);
    check(&p, "m.voc.sg", &["pitar"]);
    check(&p, "m.nom.pl", &["pitaraḥ"]);
    check(&p, "m.acc.pl", &["pitṝn"]);
    check(&p, "m.gen.pl", &["pitṝṇām"]);
    check(&p, "m.loc.pl", &["pitṛṣu"]);
    let p = paradigm("dātṛ", "ṛ-m-agent");
    check(&p, "m.nom.sg", &["dātā"]);
    check(&p, "m.acc.sg", &["dātāram"]);
    check(&p, "m.nom.pl", &["dātāraḥ"]);
    let p = paradigm("mātṛ", "ṛ-f-rel");
    check(&p, "f.acc.pl", &["mātṝḥ"]);
    let p = paradigm("svasṛ", "ṛ-f-svasṛ");
    check(&p, "f.acc.sg", &["svasāram"]);
    check(&p, "f.acc.pl", &["svasṝḥ"]);
}

#[test]
fn rajan_atman_an_stems() {
    // Whitney §420–§424, an-stem m. (from memory)
    let p = paradigm("rājan", "an-m");
    check(&p, "m.nom.sg", &["rājā"]);
    check(&p, "m.acc.sg", &["rājānam"]);
    check(&p, "m.ins.sg", &["rājñā"]);
    check(&p, "m.dat.sg", &["rājñe"]);
    check(&p, "m.abl.sg", &["rājñaḥ"]);
    check(&p, "m.gen.sg", &["rājñaḥ"]);
    check(&p, "m.loc.sg", &["rājani", "rājñi"]);
    check(&p, "m.voc.sg", &["rājan"]);
    check(&p, "m.nom.du", &["rājānau"]);
    check(&p, "m.nom.pl", &["rājānaḥ"]);
    check(&p, "m.acc.pl", &["rājñaḥ"]);
    check(&p, "m.ins.pl", &["rājabhiḥ"]);
    check(&p, "m.gen.pl", &["rājñām"]);
    check(&p, "m.loc.pl", &["rājasu"]);
    // Whitney §424, -man after a consonant (from memory)
    let p = paradigm("ātman", "an-m-ātman");
    check(&p, "m.nom.sg", &["ātmā"]);
    check(&p, "m.ins.sg", &["ātmanā"]);
    check(&p, "m.loc.sg", &["ātmani"]);
    check(&p, "m.acc.pl", &["ātmanaḥ"]);
    let p = paradigm("brahman", "an-m-ātman");
    check(&p, "m.nom.sg", &["brahmā"]);
    check(&p, "m.ins.sg", &["brahmaṇā"]); // nati across h, m
                                          // Whitney §420–§425, an-stem n. (from memory)
    let p = paradigm("nāman", "an-n");
    check(&p, "n.nom.sg", &["nāma"]);
    check(&p, "n.nom.pl", &["nāmāni"]);
    check(&p, "n.ins.sg", &["nāmnā"]);
    let p = paradigm("karman", "an-n-karman");
    check(&p, "n.nom.pl", &["karmāṇi"]);
    check(&p, "n.ins.sg", &["karmaṇā"]);
    check(&p, "n.nom.du", &["karmaṇī"]);
}

#[test]
fn vat_in_consonant_stems() {
    // Whitney §452–§453, -vat (from memory)
    let p = paradigm("bhagavat", "vat");
    check(&p, "m.nom.sg", &["bhagavān"]);
    check(&p, "m.acc.sg", &["bhagavantam"]);
    check(&p, "m.ins.sg", &["bhagavatā"]);
    check(&p, "m.nom.pl", &["bhagavantaḥ"]);
    check(&p, "m.acc.pl", &["bhagavataḥ"]);
    check(&p, "m.ins.pl", &["bhagavadbhiḥ"]);
    check(&p, "m.loc.pl", &["bhagavatsu"]);
    check(&p, "m.voc.sg", &["bhagavan"]);
    check(&p, "n.nom.sg", &["bhagavat"]);
    check(&p, "n.nom.pl", &["bhagavanti"]);
    check(&p, "f.nom.sg", &["bhagavatī"]);
    check(&p, "f.ins.sg", &["bhagavatyā"]);
    // Whitney §450, mahat (from memory)
    let p = paradigm("mahat", "mahat");
    check(&p, "m.nom.sg", &["mahān"]);
    check(&p, "m.acc.sg", &["mahāntam"]);
    check(&p, "m.ins.sg", &["mahatā"]);
    // present participle (from memory)
    let p = paradigm("gacchat", "at-ppr");
    check(&p, "m.nom.sg", &["gacchan"]);
    check(&p, "m.acc.sg", &["gacchantam"]);
    check(&p, "f.nom.sg", &["gacchantī"]);
    // Whitney §438–§440, -in (from memory)
    let p = paradigm("balin", "in");
    check(&p, "m.nom.sg", &["balī"]);
    check(&p, "m.acc.sg", &["balinam"]);
    check(&p, "m.ins.sg", &["balinā"]);
    check(&p, "m.loc.pl", &["baliṣu"]);
    check(&p, "m.ins.pl", &["balibhiḥ"]);
    check(&p, "n.nom.pl", &["balīni"]);
    check(&p, "f.nom.sg", &["balinī"]);
    let p = paradigm("karin", "in");
    check(&p, "m.ins.sg", &["kariṇā"]);
}

#[test]
fn manas_havis_s_stems() {
    // Whitney §414–§415, as-stem n. (from memory)
    let p = paradigm("manas", "as-n");
    check(&p, "n.nom.sg", &["manaḥ"]);
    check(&p, "n.ins.sg", &["manasā"]);
    check(&p, "n.loc.sg", &["manasi"]);
    check(&p, "n.nom.pl", &["manāṃsi"]);
    check(&p, "n.ins.pl", &["manobhiḥ"]);
    check(&p, "n.loc.pl", &["manaḥsu", "manassu"]);
    // Whitney §414–§415, is-stem n. (from memory): ruki
    let p = paradigm("havis", "is-n");
    check(&p, "n.nom.sg", &["haviḥ"]);
    check(&p, "n.ins.sg", &["haviṣā"]);
    check(&p, "n.nom.pl", &["havīṃṣi"]);
    check(&p, "n.ins.pl", &["havirbhiḥ"]);
    check(&p, "n.loc.pl", &["haviḥṣu", "haviṣṣu"]);
    let p = paradigm("cakṣus", "us-n");
    check(&p, "n.ins.sg", &["cakṣuṣā"]);
    // Whitney §391–§392, consonant stems (from memory)
    let p = paradigm("vāc", "c-f");
    check(&p, "f.nom.sg", &["vāk"]);
    check(&p, "f.ins.pl", &["vāgbhiḥ"]);
    check(&p, "f.loc.pl", &["vākṣu"]);
    let p = paradigm("marut", "t-m");
    check(&p, "m.ins.pl", &["marudbhiḥ"]);
    let p = paradigm("sarit", "t-f");
    check(&p, "f.nom.pl", &["saritaḥ"]);
}

#[test]
fn tad_etad_demonstratives() {
    // Whitney §495, tad (from memory)
    let p = paradigm("tad", "pron-tad");
    check(&p, "m.nom.sg", &["saḥ"]);
    check(&p, "f.nom.sg", &["sā"]);
    check(&p, "n.nom.sg", &["tat"]);
    check(&p, "m.acc.sg", &["tam"]);
    check(&p, "m.ins.sg", &["tena"]);
    check(&p, "m.dat.sg", &["tasmai"]);
    check(&p, "m.gen.sg", &["tasya"]);
    check(&p, "m.loc.sg", &["tasmin"]);
    check(&p, "m.nom.pl", &["te"]);
    check(&p, "f.nom.pl", &["tāḥ"]);
    check(&p, "m.gen.pl", &["teṣām"]);
    check(&p, "f.gen.pl", &["tāsām"]);
    check(&p, "f.dat.sg", &["tasyai"]);
    assert!(!p.keys().any(|k| k.contains(".voc.")));
    // Whitney §499, etad (from memory)
    let p = paradigm("etad", "pron-tad");
    check(&p, "m.nom.sg", &["eṣaḥ"]);
    check(&p, "f.nom.sg", &["eṣā"]);
    check(&p, "n.nom.sg", &["etat"]);
    check(&p, "m.gen.pl", &["eteṣām"]);
    check(&p, "m.loc.pl", &["eteṣu"]);
    // Whitney §509, yad; §504, kim (from memory)
    let p = paradigm("yad", "pron-yad");
    check(&p, "m.nom.sg", &["yaḥ"]);
    check(&p, "n.nom.sg", &["yat"]);
    check(&p, "m.gen.pl", &["yeṣām"]);
    let p = paradigm("kim", "pron-kim");
    check(&p, "m.nom.sg", &["kaḥ"]);
    check(&p, "f.nom.sg", &["kā"]);
    check(&p, "n.nom.sg", &["kim"]);
    check(&p, "m.dat.sg", &["kasmai"]);
    check(&p, "m.gen.pl", &["keṣām"]);
    // Whitney §501–§502, idam (from memory)
    let p = paradigm("idam", "pron-idam");
    check(&p, "m.nom.sg", &["ayam"]);
    check(&p, "f.nom.sg", &["iyam"]);
    check(&p, "n.nom.sg", &["idam"]);
    check(&p, "m.ins.sg", &["anena"]);
    // Whitney §524, sarva (from memory)
    let p = paradigm("sarva", "pron-sarva");
    check(&p, "m.nom.pl", &["sarve"]);
    check(&p, "n.nom.sg", &["sarvam"]);
    check(&p, "m.dat.sg", &["sarvasmai"]);
    check(&p, "m.gen.pl", &["sarveṣām"]);
    let p = paradigm("anya", "pron-anya");
    check(&p, "n.nom.sg", &["anyat"]);
}

#[test]
fn personal_pronouns() {
    // Whitney §491–§492, first person (from memory)
    let p = paradigm("mad", "pron-1");
    check(&p, "nom.sg", &["aham"]);
    check(&p, "acc.sg", &["mām", "mā"]);
    check(&p, "ins.sg", &["mayā"]);
    check(&p, "dat.sg", &["mahyam", "me"]);
    check(&p, "abl.sg", &["mat"]);
    check(&p, "gen.sg", &["mama", "me"]);
    check(&p, "loc.sg", &["mayi"]);
    check(&p, "nom.du", &["āvām"]);
    check(&p, "acc.du", &["āvām", "nau"]);
    check(&p, "nom.pl", &["vayam"]);
    check(&p, "acc.pl", &["asmān", "naḥ"]);
    check(&p, "gen.pl", &["asmākam", "naḥ"]);
    // Whitney §491–§492, second person (from memory)
    let p = paradigm("tvad", "pron-2");
    check(&p, "nom.sg", &["tvam"]);
    check(&p, "acc.sg", &["tvām", "tvā"]);
    check(&p, "dat.sg", &["tubhyam", "te"]);
    check(&p, "gen.sg", &["tava", "te"]);
    check(&p, "nom.pl", &["yūyam"]);
    check(&p, "acc.pl", &["yuṣmān", "vaḥ"]);
    check(&p, "gen.du", &["yuvayoḥ", "vām"]);
    // the enclitics are tagged
    let t = tables();
    let f = t.expand("mad", "pron-1", &[]).unwrap();
    let me: Vec<&ExpandedForm> = f.iter().filter(|f| f.form == "me").collect();
    assert_eq!(me.len(), 2);
    assert!(me.iter().all(|f| f.tag("enclitic") == Some("yes")));
    assert!(f.iter().all(|f| f.tag("person") == Some("1")));
    assert!(f.iter().all(|f| f.tag("pos") == Some("pron")));
    let mam = f.iter().find(|f| f.form == "mām").unwrap();
    assert_eq!(mam.tag("enclitic"), None);
}

#[test]
fn verb_paradigms() {
    // Whitney §733–§736, thematic present (from memory)
    let p = paradigm("gaccha", "verb-thematic");
    check(&p, "pres.3.sg", &["gacchati"]);
    check(&p, "pres.3.du", &["gacchataḥ"]);
    check(&p, "pres.3.pl", &["gacchanti"]);
    check(&p, "pres.2.sg", &["gacchasi"]);
    check(&p, "pres.1.sg", &["gacchāmi"]);
    check(&p, "pres.1.pl", &["gacchāmaḥ"]);
    check(&p, "impf.3.sg", &["agacchat"]); // Whitney §585, augment
    check(&p, "impf.3.pl", &["agacchan"]);
    check(&p, "impf.1.sg", &["agaccham"]);
    let p = paradigm("iccha", "verb-thematic");
    check(&p, "impf.3.sg", &["aicchat"]);
    let p = paradigm("hara", "verb-thematic");
    check(&p, "pres.3.pl", &["haranti"]); // nati: n before t stays
    let p = paradigm("labha", "verb-thematic-mid");
    check(&p, "pres.3.sg", &["labhate"]);
    check(&p, "pres.1.sg", &["labhe"]);
    check(&p, "impf.3.sg", &["alabhata"]);
    // Whitney §636, as (from memory)
    let p = paradigm("as", "verb-as");
    check(&p, "pres.3.sg", &["asti"]);
    check(&p, "pres.3.du", &["staḥ"]);
    check(&p, "pres.3.pl", &["santi"]);
    check(&p, "pres.2.sg", &["asi"]);
    check(&p, "pres.2.du", &["sthaḥ"]);
    check(&p, "pres.2.pl", &["stha"]);
    check(&p, "pres.1.sg", &["asmi"]);
    check(&p, "pres.1.du", &["svaḥ"]);
    check(&p, "pres.1.pl", &["smaḥ"]);
    check(&p, "impf.3.sg", &["āsīt"]);
    // Whitney §714, kṛ (from memory)
    let p = paradigm("kṛ", "verb-kṛ");
    check(&p, "pres.3.sg", &["karoti"]);
    check(&p, "pres.3.pl", &["kurvanti"]);
    check(&p, "pres.1.pl", &["kurmaḥ"]);
    // Whitney §697–§699, class 5 (from memory): ruki in -oṣi
    let p = paradigm("śṛṇu", "verb-5");
    check(&p, "pres.3.sg", &["śṛṇoti"]);
    check(&p, "pres.2.sg", &["śṛṇoṣi"]);
    check(&p, "pres.3.pl", &["śṛṇvanti"]);
    check(&p, "pres.1.du", &["śṛṇuvaḥ", "śṛṇvaḥ"]);
    let p = paradigm("āpnu", "verb-5-cons");
    check(&p, "pres.3.pl", &["āpnuvanti"]);
    check(&p, "impf.3.sg", &["āpnot"]);
    // Whitney §717–§722, class 9 (from memory): nati in the class sign
    let p = paradigm("krīṇā", "verb-9");
    check(&p, "pres.3.sg", &["krīṇāti"]);
    check(&p, "pres.1.pl", &["krīṇīmaḥ"]);
    let p = paradigm("jānā", "verb-9");
    check(&p, "pres.3.sg", &["jānāti"]);
    check(&p, "pres.3.pl", &["jānanti"]);
    let p = paradigm("gṛhṇā", "verb-9");
    check(&p, "pres.3.pl", &["gṛhṇanti"]);
    check(&p, "impf.3.sg", &["agṛhṇāt"]);
}

#[test]
fn every_file_expands_without_errors() {
    let t = tables();
    for name in [
        "stems.tsv",
        "verb-stems.tsv",
        "indeclinables.tsv",
        "verbs.tsv",
    ] {
        let s = stems(name);
        let (forms, errors) = expand_all(t, &s);
        assert!(errors.is_empty(), "{name}: {errors:#?}");
        assert!(!forms.is_empty(), "{name}");
        for f in &forms {
            assert!(!f.form.is_empty(), "{name}: empty form {f:?}");
            assert!(is_nfc(&f.form), "{name}: not NFC: {f:?}");
            assert!(
                !f.form.chars().any(char::is_whitespace),
                "{name}: white space in {f:?}"
            );
            for (k, v) in &f.tags {
                assert!(is_nfc(k) && is_nfc(v), "{name}: tag not NFC: {f:?}");
            }
            assert!(f.tag("pos").is_some(), "{name}: no pos: {f:?}");
        }
    }
}

#[test]
fn raw_files_are_nfc() {
    for name in [
        "paradigms.yaml",
        "stems.tsv",
        "verb-stems.tsv",
        "indeclinables.tsv",
        "verbs.tsv",
        "README.md",
    ] {
        assert!(is_nfc(&read(name)), "{name} is not NFC");
    }
}

#[test]
fn nominal_tables_are_complete() {
    // Every nominal class has all 8 cases × 3 numbers per gender (pronouns:
    // 7 cases, no vocative), checked on the first stem of each class.
    let t = tables();
    let s = stems("stems.tsv");
    let mut seen = BTreeSet::new();
    for line in &s {
        if !seen.insert(line.class.clone()) {
            continue;
        }
        let forms = t.expand(&line.stem, &line.class, &[]).unwrap();
        if forms.iter().all(|f| f.tag("case").is_none()) {
            continue; // invariant
        }
        let mut slots: BTreeMap<String, BTreeSet<(String, String)>> = BTreeMap::new();
        for f in &forms {
            slots
                .entry(f.tag("gender").unwrap_or("none").to_string())
                .or_default()
                .insert((
                    f.tag("case").unwrap().to_string(),
                    f.tag("number").unwrap().to_string(),
                ));
        }
        let want = if line.class.starts_with("pron-") && line.class != "pron-sarva" {
            21
        } else {
            24
        };
        for (g, cells) in &slots {
            assert_eq!(cells.len(), want, "class {} gender {g}", line.class);
        }
    }
}

#[test]
fn every_class_is_used() {
    let t = tables();
    let mut used: BTreeSet<String> = BTreeSet::new();
    for name in ["stems.tsv", "verb-stems.tsv"] {
        used.extend(stems(name).into_iter().map(|l| l.class));
    }
    // The generator declines nouns by these as possessive compound finals
    // (src/lexicon/sanskrit.rs); the generated lexicon must have their forms.
    let generated = juncture::lexicon::sanskrit::tsv().expect("the Sanskrit lexicon generates");
    for c in ["a-adj", "i-adj", "u-adj-u", "as-adj"] {
        let tag = format!("class={c};");
        assert!(
            generated
                .lines()
                .any(|l| l.contains(&tag) && l.contains("role=last")),
            "no possessive compound final of class {c}"
        );
        used.insert(c.to_string());
    }
    for c in t.classes() {
        if c == "indecl" {
            continue; // indeclinables.tsv lists ready-made forms
        }
        assert!(used.contains(c), "class {c} has no stem");
    }
}

#[test]
fn lexicon_sizes_and_bound_forms() {
    let s = stems("stems.tsv");
    assert!(s.len() >= 300, "only {} stems", s.len());
    for p in [
        "pra", "parā", "apa", "sam", "anu", "ava", "nis", "dus", "vi", "ā", "ni", "adhi", "api",
        "ati", "su", "ud", "abhi", "prati", "pari", "upa",
    ] {
        let l = s
            .iter()
            .find(|l| l.stem == p && l.class == "prefix")
            .unwrap_or_else(|| panic!("prefix {p} missing"));
        let tags: HashMap<_, _> = l.tags.iter().cloned().collect();
        assert_eq!(tags.get("pos").map(String::as_str), Some("prefix"));
        assert_eq!(tags.get("role").map(String::as_str), Some("first"));
    }
    for neg in ["a", "an"] {
        let l = s.iter().find(|l| l.stem == neg).unwrap();
        assert!(l.tags.contains(&("role".into(), "first".into())));
    }
    let t = tables();
    let maha = t.expand("mahā", "first", &[]).unwrap();
    assert_eq!(maha[0].tag("role"), Some("first"));
    for line in &s {
        assert!(
            line.tags.iter().any(|(k, _)| k == "pos"),
            "stems line {}: no pos=",
            line.line
        );
    }
    let ind = stems("indeclinables.tsv");
    assert!(ind.len() >= 40);
    let ind_forms: BTreeSet<&str> = ind.iter().map(|l| l.stem.as_str()).collect();
    for w in [
        "ca", "eva", "iti", "api", "na", "vā", "hi", "tu", "tathā", "yathā", "atha", "iva",
        "punar", "antar", "adya", "atra", "tatra", "kutra", "sadā", "tadā", "yadā", "kadā", "evam",
        "saha", "vinā",
    ] {
        assert!(ind_forms.contains(w), "indeclinable {w} missing");
    }
    assert!(ind
        .iter()
        .all(|l| l.class.is_empty() && l.tags.contains(&("pos".into(), "indecl".into()))));
}

const VERB_KEY_ORDER: [&str; 6] = ["pos", "root", "person", "number", "tense", "voice"];

fn verb_line(f: &ExpandedForm) -> String {
    let mut tags: Vec<String> = Vec::new();
    for k in VERB_KEY_ORDER {
        if let Some(v) = f.tag(k) {
            tags.push(format!("{k}={v}"));
        }
    }
    for (k, v) in &f.tags {
        if !VERB_KEY_ORDER.contains(&k.as_str()) && k != "stem" && k != "class" {
            tags.push(format!("{k}={v}"));
        }
    }
    format!("{}\t\t{}", f.form, tags.join(";"))
}

const VERBS_HEADER: &str = "\
# juncture: finite Sanskrit verb forms (IAST, NFC): present indicative (tense=pres)
# and imperfect (tense=impf), active (voice=act) and middle (voice=mid).
# Columns: form<TAB>(empty class: ready-made form)<TAB>tags.
# GENERATED from verb-stems.tsv with paradigms.yaml; do not edit by hand:
#   JUNCTURE_REGEN_VERBS=1 cargo test --test paradigm_tables
# The project's own work.
";

#[test]
fn verbs_tsv_matches_verb_stems() {
    let t = tables();
    let (forms, errors) = expand_all(t, &stems("verb-stems.tsv"));
    assert!(errors.is_empty(), "{errors:#?}");
    let mut want = String::from(VERBS_HEADER);
    for f in &forms {
        want.push_str(&verb_line(f));
        want.push('\n');
    }
    if std::env::var_os("JUNCTURE_REGEN_VERBS").is_some() {
        std::fs::write(lexicon_path("verbs.tsv"), &want).unwrap();
    }
    let have = read("verbs.tsv");
    assert!(
        have == want,
        "verbs.tsv is out of date; regenerate with JUNCTURE_REGEN_VERBS=1"
    );
    // at least 25 roots with all 9 present-indicative slots
    let lines = stems("verbs.tsv");
    let mut per_root: BTreeMap<String, BTreeSet<(String, String)>> = BTreeMap::new();
    for l in &lines {
        let tags: HashMap<_, _> = l.tags.iter().cloned().collect();
        assert_eq!(tags["pos"], "verb");
        if tags["tense"] == "pres" {
            per_root
                .entry(tags["root"].clone())
                .or_default()
                .insert((tags["person"].clone(), tags["number"].clone()));
        }
    }
    let full = per_root.values().filter(|s| s.len() == 9).count();
    assert!(full >= 25, "only {full} roots with a full present");
    let forms: BTreeSet<&str> = lines.iter().map(|l| l.stem.as_str()).collect();
    for f in [
        "gacchati",
        "bhavati",
        "vadati",
        "paśyati",
        "tiṣṭhati",
        "karoti",
        "asti",
        "staḥ",
        "santi",
        "asi",
        "sthaḥ",
        "stha",
        "asmi",
        "svaḥ",
        "smaḥ",
        "agacchat",
        "abhavat",
    ] {
        assert!(forms.contains(f), "verbs.tsv lacks {f}");
    }
}

#[test]
fn stems_errors_have_line_numbers() {
    let t = tables();
    let s = parse_stems("deva\ta-m\tpos=noun\nsenā\ta-m\tpos=noun\nx\tno-such\n").unwrap();
    let (_, errors) = expand_all(t, &s);
    assert_eq!(errors.len(), 2);
    assert!(matches!(
        errors[0],
        ParadigmError::StemMismatch { line: Some(2), .. }
    ));
    assert!(matches!(
        errors[1],
        ParadigmError::UnknownClass { line: Some(3), .. }
    ));
    match parse_stems("deva\ta-m\n\ndeva a-m\n") {
        Err(ParadigmError::StemsLine { line: 3, .. }) => {}
        other => panic!("{other:?}"),
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    #[test]
    fn from_yaml_never_panics(text in any::<String>()) {
        let _ = ParadigmTables::from_yaml(&text);
    }

    #[test]
    fn from_yaml_near_valid_never_panics(body in "[a-zāīūṛṇṣḥ:=~ \\[\\],\\n\"+.;-]{0,200}") {
        let _ = ParadigmTables::from_yaml(&format!("paradigms:\n  x:\n    forms:\n      m:\n        {body}"));
    }

    #[test]
    fn parse_stems_never_panics(text in any::<String>()) {
        let _ = parse_stems(&text);
    }

    #[test]
    fn expand_never_panics(stem in any::<String>(), class_index in 0usize..64) {
        let t = tables();
        let classes: Vec<&str> = t.classes().collect();
        let class = classes[class_index % classes.len()];
        if let Ok(forms) = t.expand(&stem, class, &[]) {
            for f in forms {
                prop_assert!(!f.form.is_empty());
                prop_assert!(is_nfc(&f.form));
                prop_assert!(!f.form.chars().any(char::is_whitespace));
            }
        }
    }
}

#[test]
fn non_thematic_participles_irregular_an_stems_and_d_j_stems() {
    // Whitney §444 (from memory): non-thematic present participles have the
    // strong stem in -ant only in the masculine's strong cases.
    let p = paradigm("sat", "at-ppr-weak");
    check(&p, "m.nom.sg", &["san"]);
    check(&p, "m.acc.sg", &["santam"]);
    check(&p, "m.acc.pl", &["sataḥ"]);
    check(&p, "m.ins.sg", &["satā"]);
    check(&p, "m.loc.pl", &["satsu"]);
    check(&p, "n.nom.du", &["satī"]);
    check(&p, "n.nom.pl", &["santi"]);
    check(&p, "f.nom.sg", &["satī"]);
    let p = paradigm("kurvat", "at-ppr-weak");
    check(&p, "m.nom.sg", &["kurvan"]);
    check(&p, "f.nom.sg", &["kurvatī"]);
    // ... against the thematic ones (gacchantī).
    check(&paradigm("gacchat", "at-ppr"), "f.nom.sg", &["gacchantī"]);
    // Whitney §427–§428 (from memory): yuvan, śvan, maghavan.
    let p = paradigm("yuvan", "an-m-yuvan");
    check(&p, "m.nom.sg", &["yuvā"]);
    check(&p, "m.acc.sg", &["yuvānam"]);
    check(&p, "m.acc.pl", &["yūnaḥ"]);
    check(&p, "m.ins.sg", &["yūnā"]);
    check(&p, "m.ins.pl", &["yuvabhiḥ"]);
    check(&p, "m.loc.pl", &["yuvasu"]);
    check(&p, "m.voc.sg", &["yuvan"]);
    let p = paradigm("śvan", "an-m-śvan");
    check(&p, "m.nom.sg", &["śvā"]);
    check(&p, "m.acc.pl", &["śunaḥ"]);
    check(&p, "m.ins.du", &["śvabhyām"]);
    let p = paradigm("maghavan", "an-m-maghavan");
    check(&p, "m.nom.sg", &["maghavā"]);
    check(&p, "m.acc.pl", &["maghonaḥ"]);
    // Whitney §389, §391–§392 (from memory): d → t, j → k at the end and
    // before s, voiced before bh.
    let p = paradigm("śarad", "d-f");
    check(&p, "f.nom.sg", &["śarat"]);
    check(&p, "f.ins.sg", &["śaradā"]);
    check(&p, "f.ins.pl", &["śaradbhiḥ"]);
    check(&p, "f.loc.pl", &["śaratsu"]);
    check(&paradigm("suhṛd", "d-m"), "m.nom.pl", &["suhṛdaḥ"]);
    let p = paradigm("vaṇij", "j-m");
    check(&p, "m.nom.sg", &["vaṇik"]);
    check(&p, "m.ins.sg", &["vaṇijā"]);
    check(&p, "m.ins.pl", &["vaṇigbhiḥ"]);
    check(&p, "m.loc.pl", &["vaṇikṣu"]);
    check(&paradigm("sraj", "j-f"), "f.nom.sg", &["srak"]);
}
