//! Splitting text written in another script than the rule-set's.
//!
//! A rule-set that says `set script = iast` (Sanskrit) is written in IAST,
//! but texts come in Devanagari, Harvard-Kyoto or SLP1 too. [`split_with`]
//! transliterates the input into the rule-set's script ([`crate::script`]),
//! analyses that, and writes the forms and surfaces of the result back in
//! the input's script (or another one).
//!
//! **Offsets.** `start`, `end` (parts) and `at` (junctions) are character
//! offsets into the transliterated text, which the record carries as
//! `transliteration`; `input` is the line as given. (A Devanagari akṣara
//! stands for several IAST letters, so offsets into the original would not
//! be able to say where inside `वेऽपि` a boundary falls.) With IAST input
//! `transliteration` is the input in NFC, so the offsets are those of
//! [`crate::analyzer::Analyzer::split`].
//!
//! Converted in the output: each part's `form` and `surface`, each
//! junction's `left`, `right` and `surface`. Tag values (`stem=deva`) stay in
//! the rule-set's script.

use crate::analyzer::SplitRecord;
use crate::proof::{Analysis, Junction};
use crate::rules::{RuleSet, Separator};
use crate::script::{self, Script};
use serde::Serialize;

/// A split record for input in some script.
#[derive(Debug, Clone, Serialize)]
pub struct ScriptedRecord {
    /// The record; `input` is the line as given, forms and surfaces are in `output_script`.
    #[serde(flatten)]
    pub record: SplitRecord,
    /// The script the input was read in (given, or detected).
    pub script: &'static str,
    /// The script of forms and surfaces in `record`.
    pub output_script: &'static str,
    /// The input in the rule-set's script: what was analysed; offsets count its characters.
    pub transliteration: String,
}

impl ScriptedRecord {
    /// Whether the line counts as not analysed (for the exit status).
    pub fn is_failure(&self) -> bool {
        self.record.is_failure()
    }
}

/// The script a rule-set is written in, if it declares one (`set script = iast`).
pub fn rules_script(rules: &RuleSet) -> Option<Script> {
    rules.settings.script.as_deref().and_then(Script::from_name)
}

/// How one input is read: the script it was read in (given, or detected),
/// the script of forms and surfaces in the output, and the transliteration
/// into the rule-set's script that is analysed. [`split_with`] applies it
/// around a whole record; a streamed split (`split --all`) converts each
/// analysis as it comes with [`Reading::convert`].
#[derive(Debug, Clone)]
pub struct Reading {
    /// The script the input was read in.
    pub from: Script,
    /// The script of forms and surfaces in the output.
    pub to: Script,
    /// The rule-set's script.
    pub analysed: Script,
    /// The input in the rule-set's script: what is analysed.
    pub text: String,
}

impl Reading {
    /// Reads `input` from `from` (detected when `None`) into `analysed`, to
    /// be written in `to` (the input's script when `None`).
    pub fn new(input: &str, from: Option<Script>, analysed: Script, to: Option<Script>) -> Reading {
        let from = from.unwrap_or_else(|| script::detect(input));
        let to = to.unwrap_or(from);
        let text = script::transliterate(input, from, analysed);
        Reading {
            from,
            to,
            analysed,
            text,
        }
    }

    /// Writes an analysis's forms and surfaces in the output script.
    pub fn convert(&self, a: &mut Analysis) {
        if self.to == self.analysed {
            return;
        }
        let conv = |s: &str| script::transliterate(s, self.analysed, self.to);
        for p in &mut a.parts {
            p.form = conv(&p.form);
            p.surface = conv(&p.surface);
        }
        for j in &mut a.junctions {
            j.left = conv(&j.left);
            j.right = conv(&j.right);
            convert_surface(j, &conv);
        }
    }
}

/// Transliterates `input` from `from` (detected when `None`) into `analysed`
/// (the rule-set's script), analyses it with `split`, and converts forms and
/// surfaces into `to` (the input's script when `None`).
pub fn split_with(
    input: &str,
    from: Option<Script>,
    analysed: Script,
    to: Option<Script>,
    split: impl FnOnce(&str) -> SplitRecord,
) -> ScriptedRecord {
    let reading = Reading::new(input, from, analysed, to);
    let mut record = split(&reading.text);
    record.input = input.to_string();
    for a in &mut record.analyses {
        reading.convert(a);
    }
    ScriptedRecord {
        record,
        script: reading.from.name(),
        output_script: reading.to.name(),
        transliteration: reading.text,
    }
}

/// Converts a junction's surface piece by piece (before and after the
/// boundary), so that the boundary mark of the text output stays in place.
fn convert_surface(j: &mut Junction, conv: &impl Fn(&str) -> String) {
    if j.boundary == Separator::Merged {
        j.surface = conv(&j.surface);
        j.split_at = j.surface.chars().count();
        return;
    }
    let chars: Vec<char> = j.surface.chars().collect();
    let cut = j.split_at.min(chars.len());
    let before = conv(&chars[..cut].iter().collect::<String>());
    let after = conv(&chars[cut..].iter().collect::<String>());
    j.split_at = before.chars().count();
    j.surface = before + &after;
}

/// The text rendering: that of [`crate::output::split_text`], with a line
/// giving the script read and the transliteration analysed, when they differ
/// from the input.
pub fn split_text(r: &ScriptedRecord) -> String {
    let text = crate::output::split_text(&r.record);
    if r.transliteration == r.record.input {
        return text;
    }
    let mut lines = text.splitn(2, '\n');
    let first = lines.next().unwrap_or("");
    let rest = lines.next().unwrap_or("");
    format!(
        "{first}\n  read as {}: {}\n{rest}",
        r.script, r.transliteration
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn converts_forms_and_keeps_input() {
        let r = split_with("तन्न", None, Script::Iast, None, |t| {
            assert_eq!(t, "tanna");
            SplitRecord::failed(t, "not analysed in this test")
        });
        assert_eq!(r.record.input, "तन्न");
        assert_eq!(r.script, "devanagari");
        assert_eq!(r.transliteration, "tanna");
    }
}
