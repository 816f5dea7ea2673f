//! Rule-sets embedded in the binary, selectable by name.

/// (name, file text) of every bundled rule file, including shared files
/// meant for `include`.
const RULE_SETS: &[(&str, &str)] = &[
    ("plain", include_str!("../../rule-sets/plain.jr")),
    ("demo", include_str!("../../rule-sets/demo.jr")),
    (
        "demo-letters",
        include_str!("../../rule-sets/demo-letters.jr"),
    ),
    ("german", include_str!("../../rule-sets/german.jr")),
    (
        "germanic-letters",
        include_str!("../../rule-sets/germanic-letters.jr"),
    ),
    ("dutch", include_str!("../../rule-sets/dutch.jr")),
    ("swedish", include_str!("../../rule-sets/swedish.jr")),
    ("danish", include_str!("../../rule-sets/danish.jr")),
    ("norwegian", include_str!("../../rule-sets/norwegian.jr")),
    ("sanskrit", include_str!("../../rule-sets/sanskrit.jr")),
];

/// (name, bytes) of the compiled form of every bundled rule-set that
/// stands alone, written by `scripts/build_compiled_rule_sets.sh`.
pub const COMPILED: &[(&str, &[u8])] = &[
    (
        "plain",
        include_bytes!("../../rule-sets/compiled/plain.jrc"),
    ),
    ("demo", include_bytes!("../../rule-sets/compiled/demo.jrc")),
    (
        "german",
        include_bytes!("../../rule-sets/compiled/german.jrc"),
    ),
    (
        "dutch",
        include_bytes!("../../rule-sets/compiled/dutch.jrc"),
    ),
    (
        "swedish",
        include_bytes!("../../rule-sets/compiled/swedish.jrc"),
    ),
    (
        "danish",
        include_bytes!("../../rule-sets/compiled/danish.jrc"),
    ),
    (
        "norwegian",
        include_bytes!("../../rule-sets/compiled/norwegian.jrc"),
    ),
    (
        "sanskrit",
        include_bytes!("../../rule-sets/compiled/sanskrit.jrc"),
    ),
];

/// The embedded compiled form of a bundled rule-set, if it reads and was
/// built from the bundled texts as they are now (every source it records
/// is a bundled file with the same text). Otherwise the caller compiles
/// the text; `tests/compiled_rule_sets.rs` fails while a form is stale.
pub fn compiled_rule_set(name: &str) -> Option<super::RuleSet> {
    let (_, bytes) = COMPILED.iter().find(|(n, _)| *n == name)?;
    let set = super::compiled::from_embedded(bytes).ok()?;
    let fresh =
        !set.sources.files().is_empty()
            && set.sources.files().iter().all(|f| {
                f.name.strip_prefix("bundled:").and_then(rule_set) == Some(f.text.as_str())
            });
    fresh.then_some(set)
}

/// The text of a bundled rule file.
pub fn rule_set(name: &str) -> Option<&'static str> {
    RULE_SETS.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// Names of all bundled rule files.
pub fn names() -> Vec<&'static str> {
    RULE_SETS.iter().map(|(n, _)| *n).collect()
}

/// Names of bundled rule-sets that stand alone (files that declare a `language`).
pub fn rule_set_names() -> Vec<&'static str> {
    RULE_SETS
        .iter()
        .filter(|(_, t)| t.lines().any(|l| l.trim_start().starts_with("language ")))
        .map(|(n, _)| *n)
        .collect()
}
