//! Typed syntax tree of a rule file, every node with its source span.

/// A byte range in one source file of a [`SourceMap`](super::diagnostic::SourceMap).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Span {
    /// Index of the file in the source map.
    pub file: usize,
    /// Byte offset of the first byte.
    pub start: usize,
    /// Byte offset after the last byte.
    pub end: usize,
}

/// A value with the span it was written at.
#[derive(Debug, Clone, PartialEq)]
pub struct Spanned<T> {
    /// The value.
    pub value: T,
    /// Where it was written.
    pub span: Span,
}

/// One parsed rule file.
#[derive(Debug, Clone, Default)]
pub struct RuleFile {
    /// Statements in file order.
    pub statements: Vec<Statement>,
}

/// Unicode normalization form declared by `normalize`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub enum NormalForm {
    /// Canonical composition (the default).
    Nfc,
    /// Canonical decomposition.
    Nfd,
    /// Leave text as it is.
    None,
}

/// A top-level statement.
#[derive(Debug, Clone)]
pub enum Statement {
    /// `language NAME`
    Language(Spanned<String>),
    /// `description TEXT`
    Description(Spanned<String>),
    /// `normalize nfc|nfd|none`
    Normalize(Spanned<NormalForm>),
    /// `case fold|keep`; true means fold.
    Case(Spanned<bool>),
    /// `segments ai au kh`
    Segments(Vec<Spanned<String>>),
    /// `include NAME` or `include "path"`
    Include(Spanned<String>),
    /// `class NAME = members`
    Class(ClassDecl),
    /// `set NAME = VALUE`
    Set(SetDecl),
    /// `variant NAME "text": fold A = B`, or `fold A = B` (always applied; empty name)
    Variant(VariantDecl),
    /// `pattern NAME = [class]+ ...`
    Pattern(PatternDecl),
    /// `edge start|end when ...`
    Edge(EdgeDecl),
    /// `rule NAME: change` with clauses
    Rule(RuleDecl),
    /// A top-level `example parts -> surface`
    Example(ExampleDecl),
    /// A line (with its clause lines) that did not parse.
    Unparsed(Span),
}

/// A member of a class: a segment or another class.
#[derive(Debug, Clone)]
pub enum ClassMember {
    /// A literal segment, such as `ai`.
    Segment(Spanned<String>),
    /// `[other]`: every member of another class, in order.
    Class(Spanned<String>),
}

/// `class NAME = members`
#[derive(Debug, Clone)]
pub struct ClassDecl {
    /// The class name.
    pub name: Spanned<String>,
    /// Members in order; order matters for correspondences.
    pub members: Vec<ClassMember>,
    /// The whole statement.
    pub span: Span,
}

/// Value of a `set` statement.
#[derive(Debug, Clone, PartialEq)]
pub enum SetValue {
    /// A number.
    Number(f64),
    /// A name.
    Name(String),
}

/// `set NAME = VALUE`
#[derive(Debug, Clone)]
pub struct SetDecl {
    /// The setting's name.
    pub name: Spanned<String>,
    /// Its value.
    pub value: Spanned<SetValue>,
}

/// `variant NAME "description": fold FROM = TO`
#[derive(Debug, Clone)]
pub struct VariantDecl {
    /// The variant's name (selected with `--variant`).
    pub name: Spanned<String>,
    /// Optional description.
    pub description: Option<String>,
    /// Letter to replace.
    pub from: Spanned<String>,
    /// Replacement.
    pub to: Spanned<String>,
}

/// `pattern NAME = [class]{m,n} uppercase tags k=v`
#[derive(Debug, Clone)]
pub struct PatternDecl {
    /// The pattern's name.
    pub name: Spanned<String>,
    /// The class every segment must belong to.
    pub class: Spanned<String>,
    /// Minimum number of segments.
    pub min: usize,
    /// Maximum number of segments (None: unbounded).
    pub max: Option<usize>,
    /// Whether the run must be written in capitals in the input.
    pub uppercase: bool,
    /// Tags given to the part.
    pub tags: Vec<(String, String)>,
    /// The whole statement.
    pub span: Span,
}

/// Which word a condition looks at.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
pub enum Side {
    /// The word before the junction.
    Left,
    /// The word after the junction.
    Right,
}

/// `left.pos = noun|adj`, `right.role != first`, `left.bound`, `left.letters >= 4`
#[derive(Debug, Clone, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
pub struct Condition {
    /// Which word.
    pub side: Side,
    /// The tag key (`form` is the lexicon form itself, `letters` the number
    /// of its characters).
    pub key: String,
    /// `None`: the tag must be present (unless `bound` is set); `Some((true,
    /// values))`: equal to one of the values; `Some((false, values))`: equal
    /// to none of them.
    pub test: Option<(bool, Vec<String>)>,
    /// `>= N` or `<= N` (then `test` is `None`): the value is a whole number
    /// at least or at most N.
    pub bound: Option<Bound>,
}

/// A numeric comparison of a condition: `>= N` or `<= N`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
pub struct Bound {
    /// `>=` (true) or `<=` (false).
    pub at_least: bool,
    /// N.
    pub value: u64,
}

impl Bound {
    /// Whether `n` meets the bound.
    pub fn admits(self, n: u64) -> bool {
        if self.at_least {
            n >= self.value
        } else {
            n <= self.value
        }
    }
}

/// The condition key that stands for the number of characters of the form.
pub const LETTERS_KEY: &str = "letters";

/// `edge start|end when ...`
#[derive(Debug, Clone)]
pub struct EdgeDecl {
    /// True for `end`, false for `start`.
    pub end: bool,
    /// Conditions every analysis must meet there.
    pub conditions: Vec<Spanned<Condition>>,
    /// The whole statement.
    pub span: Span,
}

/// A slot of a change: `[class]`, `[label:class]`, `[label]`, `[label>class]`.
#[derive(Debug, Clone)]
pub struct Slot {
    /// Explicit label, if written `[label:class]`.
    pub label: Option<String>,
    /// The name inside the brackets (a class, or a label).
    pub name: String,
    /// Target class of a correspondence, `[x>voiced]`.
    pub map_to: Option<String>,
}

/// One item of a change.
#[derive(Debug, Clone)]
pub enum ChangeItem {
    /// Letters written out.
    Literal(String),
    /// A class slot or a reference to one.
    Slot(Slot),
    /// A boundary mark on the surface side.
    Boundary(BoundaryMark),
}

/// How the visible boundary is written on the surface side.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BoundaryMark {
    /// `|` between letters, nothing printed.
    Plain,
    /// `_` a printed space.
    Space,
    /// `_?` a printed space or nothing.
    OptionalSpace,
    /// `-` a printed hyphen.
    Hyphen,
}

/// `LEFT + RIGHT -> SURFACE`
#[derive(Debug, Clone)]
pub struct Change {
    /// End of the left word.
    pub left: Vec<Spanned<ChangeItem>>,
    /// Start of the right word.
    pub right: Vec<Spanned<ChangeItem>>,
    /// What the surface shows.
    pub surface: Vec<Spanned<ChangeItem>>,
    /// The whole change.
    pub span: Span,
}

/// Scope of a junction.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Scope {
    /// Inside a compound.
    Compound,
    /// Between words of a phrase.
    Phrase,
    /// Both.
    Any,
}

/// `example A + B -> surface`
#[derive(Debug, Clone)]
pub struct ExampleDecl {
    /// The parts, as written.
    pub parts: Vec<String>,
    /// The surface, as written.
    pub surface: String,
    /// The whole clause.
    pub span: Span,
}

/// `rule NAME "description": change` plus clauses.
#[derive(Debug, Clone)]
pub struct RuleDecl {
    /// The rule's name.
    pub name: Spanned<String>,
    /// Optional description.
    pub description: Option<String>,
    /// The change it describes.
    pub change: Change,
    /// `cost N`
    pub cost: Option<Spanned<f64>>,
    /// `when ...` conditions (all must hold).
    pub conditions: Vec<Spanned<Condition>>,
    /// `in compound|phrase|any`
    pub scope: Option<Spanned<Scope>>,
    /// `example ...` clauses.
    pub examples: Vec<ExampleDecl>,
    /// `note ...` clauses.
    pub notes: Vec<String>,
    /// `attested`: the left word as the junction writes it must be a
    /// lexicon form of that word.
    pub attested: Option<Span>,
    /// The whole statement.
    pub span: Span,
}
