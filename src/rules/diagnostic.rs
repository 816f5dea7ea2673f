//! Diagnostics for rule files: a message, the place (`file:line:column`), the
//! source line with a caret, and a hint on how to fix it.

use super::ast::Span;
use serde::Serialize;
use std::fmt;

/// The texts of a rule file and of everything it includes.
#[derive(Debug, Clone, Default, serde::Serialize, serde::Deserialize)]
pub struct SourceMap {
    files: Vec<SourceFile>,
}

/// One source text with the name it is reported under.
#[derive(Debug, Clone, serde::Serialize, serde::Deserialize)]
pub struct SourceFile {
    /// Name shown in diagnostics (a path, or `bundled:NAME`).
    pub name: String,
    /// The text.
    pub text: String,
    /// Byte offset where each line starts (so locating a span does not
    /// rescan the file: a rule file of many thousand lines compiles in
    /// linear time).
    line_starts: Vec<usize>,
}

impl SourceMap {
    /// Adds a file and returns its index.
    pub fn add(&mut self, name: impl Into<String>, text: impl Into<String>) -> usize {
        let text = text.into();
        let line_starts = std::iter::once(0)
            .chain(text.match_indices('\n').map(|(i, _)| i + 1))
            .collect();
        self.files.push(SourceFile {
            name: name.into(),
            text,
            line_starts,
        });
        self.files.len() - 1
    }

    /// The file with this index.
    pub fn file(&self, index: usize) -> &SourceFile {
        &self.files[index]
    }

    /// All files.
    pub fn files(&self) -> &[SourceFile] {
        &self.files
    }

    /// Resolves a span into a printable location.
    pub fn locate(&self, span: Span) -> Location {
        let file = &self.files[span.file];
        let start = span.start.min(file.text.len());
        // Index of the line holding `start`: the last line start ≤ start.
        let line_index = file.line_starts.partition_point(|&s| s <= start) - 1;
        let line_start = file.line_starts[line_index];
        let line_end = file
            .line_starts
            .get(line_index + 1)
            .map_or(file.text.len(), |&next| next - 1);
        let line = line_index + 1;
        let column = file.text[line_start..start].chars().count() + 1;
        let end = span.end.clamp(start, line_end.max(start));
        let width = file.text[start..end].chars().count().max(1);
        Location {
            file: file.name.clone(),
            line,
            column,
            source_line: file.text[line_start..line_end]
                .trim_end_matches('\r')
                .to_string(),
            width,
        }
    }
}

/// A resolved place in a source file.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, serde::Deserialize)]
pub struct Location {
    /// File name.
    pub file: String,
    /// 1-based line.
    pub line: usize,
    /// 1-based column, in characters.
    pub column: usize,
    /// The whole source line.
    pub source_line: String,
    /// How many characters the caret underlines.
    pub width: usize,
}

/// How serious a diagnostic is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Severity {
    /// The rule-set cannot be used.
    Error,
    /// The rule-set works but something is probably wrong.
    Warning,
}

/// One message about a rule file.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Diagnostic {
    /// Error or warning.
    pub severity: Severity,
    /// A stable identifier of the kind of problem, e.g. `unknown-class`.
    pub code: &'static str,
    /// What is wrong, in words.
    pub message: String,
    /// Where.
    pub location: Option<Location>,
    /// How to fix it.
    pub hint: Option<String>,
    /// Another place that matters (e.g. the first definition of a duplicate).
    pub related: Option<(String, Location)>,
}

impl Diagnostic {
    /// An error at a span.
    pub fn error(code: &'static str, message: impl Into<String>, at: Option<Location>) -> Self {
        Diagnostic {
            severity: Severity::Error,
            code,
            message: message.into(),
            location: at,
            hint: None,
            related: None,
        }
    }

    /// A warning at a span.
    pub fn warning(code: &'static str, message: impl Into<String>, at: Option<Location>) -> Self {
        Diagnostic {
            severity: Severity::Warning,
            ..Diagnostic::error(code, message, at)
        }
    }

    /// Adds a hint.
    pub fn with_hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        self
    }

    /// Adds a related place.
    pub fn with_related(mut self, label: impl Into<String>, at: Location) -> Self {
        self.related = Some((label.into(), at));
        self
    }
}

fn render_location(f: &mut fmt::Formatter<'_>, loc: &Location) -> fmt::Result {
    let number = loc.line.to_string();
    let pad = " ".repeat(number.len());
    writeln!(f, "{pad}--> {}:{}:{}", loc.file, loc.line, loc.column)?;
    writeln!(f, "{pad} |")?;
    writeln!(f, "{number} | {}", loc.source_line)?;
    let lead: String = loc
        .source_line
        .chars()
        .take(loc.column.saturating_sub(1))
        .map(|c| if c == '\t' { '\t' } else { ' ' })
        .collect();
    writeln!(f, "{pad} | {lead}{}", "^".repeat(loc.width))
}

impl fmt::Display for Diagnostic {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let label = match self.severity {
            Severity::Error => "error",
            Severity::Warning => "warning",
        };
        writeln!(f, "{label}[{}]: {}", self.code, self.message)?;
        if let Some(loc) = &self.location {
            render_location(f, loc)?;
        }
        if let Some((what, loc)) = &self.related {
            writeln!(f, "note: {what}")?;
            render_location(f, loc)?;
        }
        if let Some(hint) = &self.hint {
            writeln!(f, "hint: {hint}")?;
        }
        Ok(())
    }
}

/// Every error (and warning) found in a rule file.
#[derive(Debug, Clone, PartialEq)]
pub struct Diagnostics(pub Vec<Diagnostic>);

impl Diagnostics {
    /// Number of errors.
    pub fn error_count(&self) -> usize {
        self.0
            .iter()
            .filter(|d| d.severity == Severity::Error)
            .count()
    }
}

impl fmt::Display for Diagnostics {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for d in &self.0 {
            writeln!(f, "{d}")?;
        }
        let errors = self.error_count();
        let warnings = self.0.len() - errors;
        write!(
            f,
            "{errors} error{}, {warnings} warning{}",
            if errors == 1 { "" } else { "s" },
            if warnings == 1 { "" } else { "s" }
        )
    }
}

impl std::error::Error for Diagnostics {}
