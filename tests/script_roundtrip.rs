//! Property tests for `juncture::script`: IAST → X → IAST round trips over
//! generated Sanskrit syllable sequences, direct conversions between the
//! non-IAST scripts, pass-through of non-letters, and no panics on
//! arbitrary input.

use juncture::script::{detect, from_iast, to_iast, transliterate, Script};
use proptest::prelude::*;
use unicode_normalization::{is_nfc, UnicodeNormalization};

const CONSONANTS: [&str; 33] = [
    "k", "kh", "g", "gh", "ṅ", "c", "ch", "j", "jh", "ñ", "ṭ", "ṭh", "ḍ", "ḍh", "ṇ", "t", "th",
    "d", "dh", "n", "p", "ph", "b", "bh", "m", "y", "r", "l", "v", "ś", "ṣ", "s", "h",
];
const VOWELS: [&str; 14] = [
    "a", "ā", "i", "ī", "u", "ū", "ṛ", "ṝ", "ḷ", "ḹ", "e", "ai", "o", "au",
];
const SIGNS: [&str; 3] = ["ṃ", "ḥ", "m\u{310}"];
const SEPARATORS: [&str; 7] = [" ", " ", " ", "-", " | ", " || ", " '"];

/// One syllable: onset cluster (0–3 consonants), vowel, optional coda
/// (a sign or a consonant), and whether an onsetless i/u after a bare `a`
/// is a hiatus (`aï`, `aü`) rather than part of a diphthong.
#[derive(Debug, Clone)]
struct Syllable {
    onset: Vec<usize>,
    vowel: usize,
    coda: Option<(bool, usize)>,
    hiatus: bool,
}

fn syllable() -> impl Strategy<Value = Syllable> {
    (
        prop_oneof![
            1 => Just(Vec::new()),
            4 => prop::collection::vec(0..CONSONANTS.len(), 1..=3),
        ],
        0..VOWELS.len(),
        prop_oneof![
            5 => Just(None),
            1 => (0..SIGNS.len()).prop_map(|i| Some((true, i))),
            1 => (0..CONSONANTS.len()).prop_map(|i| Some((false, i))),
        ],
        any::<bool>(),
    )
        .prop_map(|(onset, vowel, coda, hiatus)| Syllable {
            onset,
            vowel,
            coda,
            hiatus,
        })
}

fn render_word(syllables: &[Syllable]) -> String {
    let mut out = String::new();
    for syl in syllables {
        for &c in &syl.onset {
            out.push_str(CONSONANTS[c]);
        }
        let vowel = VOWELS[syl.vowel];
        let after_bare_a = out.ends_with('a');
        if syl.onset.is_empty() && after_bare_a && syl.hiatus && (vowel == "i" || vowel == "u") {
            out.push_str(if vowel == "i" { "ï" } else { "ü" });
        } else {
            out.push_str(vowel);
        }
        match syl.coda {
            Some((true, i)) => out.push_str(SIGNS[i]),
            Some((false, i)) => out.push_str(CONSONANTS[i]),
            None => {}
        }
    }
    out
}

/// IAST text: 1–5 words of 1–5 syllables, with spaces (sometimes a hyphen,
/// a daṇḍa, or an avagraha) between words and sometimes a number.
fn iast_text() -> impl Strategy<Value = String> {
    prop::collection::vec(
        (
            prop::collection::vec(syllable(), 1..=5),
            0..SEPARATORS.len(),
            prop::option::weighted(0.05, 0u32..1000),
        ),
        1..=5,
    )
    .prop_map(|words| {
        let mut out = String::new();
        for (i, (syllables, sep, number)) in words.iter().enumerate() {
            if i > 0 {
                out.push_str(SEPARATORS[*sep]);
            }
            out.push_str(&render_word(syllables));
            if let Some(n) = number {
                out.push(' ');
                out.push_str(&n.to_string());
            }
        }
        out
    })
}

fn round_trip(text: &str, script: Script) -> Result<(), TestCaseError> {
    let nfc: String = text.nfc().collect();
    let there = from_iast(text, script);
    let back = to_iast(&there, script);
    prop_assert_eq!(&back, &nfc, "via {} {:?}", script, there);
    prop_assert_eq!(transliterate(&there, script, Script::Iast), nfc);
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    #[test]
    fn round_trip_devanagari(text in iast_text()) {
        round_trip(&text, Script::Devanagari)?;
    }

    #[test]
    fn round_trip_harvard_kyoto(text in iast_text()) {
        round_trip(&text, Script::HarvardKyoto)?;
    }

    #[test]
    fn round_trip_slp1(text in iast_text()) {
        round_trip(&text, Script::Slp1)?;
    }

    /// Devanagari, HK and SLP1 convert directly into each other and agree
    /// with the conversion from IAST.
    #[test]
    fn direct_conversions_agree(text in iast_text()) {
        let nfc: String = text.nfc().collect();
        for from in [Script::Devanagari, Script::HarvardKyoto, Script::Slp1] {
            let source = from_iast(&text, from);
            for to in Script::ALL {
                let direct = transliterate(&source, from, to);
                prop_assert_eq!(&direct, &from_iast(&text, to), "{} -> {}", from, to);
                prop_assert_eq!(to_iast(&direct, to), nfc.clone());
            }
        }
    }

    /// Detection recognises generated Devanagari, and IAST with diacritics.
    #[test]
    fn detect_generated(text in iast_text()) {
        prop_assert_eq!(detect(&from_iast(&text, Script::Devanagari)), Script::Devanagari);
        if !text.is_ascii() {
            prop_assert_eq!(detect(&text), Script::Iast);
        }
    }
}

/// Characters that are letters or signs of none of the four schemes.
fn neutral_char() -> impl Strategy<Value = char> {
    prop::sample::select(
        " \t\n,.;:!?()[]{}-+=*/\"«»—…@#$%&<>漢字αβγжщ€"
            .chars()
            .collect::<Vec<_>>(),
    )
}

/// Characters biased towards the ones the readers look at.
fn tricky_char() -> impl Strategy<Value = char> {
    prop_oneof![
        4 => prop::char::range('\u{900}', '\u{97F}'),
        3 => prop::char::range('\u{300}', '\u{36F}'),
        4 => prop::char::range('a', 'z'),
        4 => prop::char::range('A', 'Z'),
        2 => prop::sample::select("āīūṛṝḷḹṃḥṅñṭḍṇśṣṁïü_|'~ 0123456789\u{310}\u{A8F3}\u{200C}\u{200D}".chars().collect::<Vec<_>>()),
        1 => any::<char>(),
    ]
}

fn check_all_functions(text: &str) -> Result<(), TestCaseError> {
    let _ = detect(text);
    for s in Script::ALL {
        let iast = to_iast(text, s);
        prop_assert!(is_nfc(&iast), "to_iast({}) not NFC: {:?}", s, iast);
        let _ = from_iast(text, s);
        for t in Script::ALL {
            let _ = transliterate(text, s, t);
        }
    }
    // Normalising IAST is idempotent.
    let once = to_iast(text, Script::Iast);
    prop_assert_eq!(to_iast(&once, Script::Iast), once.clone());
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(1000))]

    #[test]
    fn no_panic_on_arbitrary_strings(text in any::<String>()) {
        check_all_functions(&text)?;
    }

    #[test]
    fn no_panic_on_tricky_strings(chars in prop::collection::vec(tricky_char(), 0..40)) {
        let text: String = chars.into_iter().collect();
        check_all_functions(&text)?;
    }

    /// Text without any letter of the schemes passes through every
    /// conversion unchanged.
    #[test]
    fn non_letters_pass_through(chars in prop::collection::vec(neutral_char(), 0..40)) {
        let text: String = chars.into_iter().collect();
        for s in Script::ALL {
            prop_assert_eq!(&to_iast(&text, s), &text);
            prop_assert_eq!(&from_iast(&text, s), &text);
            for t in Script::ALL {
                prop_assert_eq!(&transliterate(&text, s, t), &text);
            }
        }
    }

    /// Letters embedded in neutral text keep the neutral characters in place.
    #[test]
    fn mixed_text_keeps_non_letters(
        words in prop::collection::vec((iast_text(), prop::collection::vec(neutral_char(), 1..4)), 1..4)
    ) {
        let mut text = String::new();
        for (w, punct) in &words {
            text.push_str(w);
            text.extend(punct.iter());
        }
        let nfc: String = text.nfc().collect();
        for s in [Script::Devanagari, Script::HarvardKyoto, Script::Slp1] {
            prop_assert_eq!(to_iast(&from_iast(&text, s), s), nfc.clone(), "via {}", s);
        }
    }
}
