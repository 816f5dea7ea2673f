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
