//! Parse tree → typed syntax tree. Every broken statement becomes a
//! diagnostic; the rest of the file is still read.

use super::ast::*;
use super::diagnostic::{Diagnostic, SourceMap};
use super::grammar::{JunctionParser, Rule};
use pest::error::{ErrorVariant, InputLocation};
use pest::iterators::Pair;
use pest::Parser;

/// Parses file `file` of the source map, returning its statements and the
/// syntax errors of every statement that did not parse.
pub fn parse_file(sources: &SourceMap, file: usize) -> (RuleFile, Vec<Diagnostic>) {
    let text = &sources.file(file).text;
    let mut diagnostics = Vec::new();
    let file_pair = match JunctionParser::parse(Rule::file, text) {
        Ok(mut pairs) => pairs.next(),
        Err(error) => {
            // The file rule accepts any line, so this only happens on odd input
            // such as a lone carriage return; report it and carry on with nothing.
            diagnostics.push(syntax_error(sources, file, 0, &error));
            return (RuleFile::default(), diagnostics);
        }
    };
    let mut statements = Vec::new();
    let builder = Builder {
        file,
        errors: Default::default(),
    };
    for pair in file_pair.into_iter().flat_map(|p| p.into_inner()) {
        match pair.as_rule() {
            Rule::EOI => {}
            Rule::unparsed => {
                let span = builder.span(&pair);
                diagnostics.push(reparse_error(sources, file, pair.as_str(), span.start));
                statements.push(Statement::Unparsed(span));
            }
            _ => statements.push(builder.statement(pair)),
        }
    }
    for (span, message, hint) in builder.errors.into_inner() {
        diagnostics.push(
            Diagnostic::error("bad-bound", message, Some(sources.locate(span))).with_hint(hint),
        );
    }
    (RuleFile { statements }, diagnostics)
}

fn reparse_error(sources: &SourceMap, file: usize, chunk: &str, offset: usize) -> Diagnostic {
    let trimmed = chunk.trim_start();
    let first_word: String = trimmed
        .chars()
        .take_while(|c| c.is_alphanumeric() || *c == '-')
        .collect();
    if matches!(first_word.as_str(), "cost" | "when" | "in" | "note") {
        let at = sources.locate(Span {
            file,
            start: offset,
            end: offset + chunk.len(),
        });
        return Diagnostic::error(
            "clause-outside-rule",
            format!("`{first_word}` is a clause of a rule, but it stands outside one"),
            Some(at),
        )
        .with_hint("put it on the lines right after a `rule NAME: ... -> ...` line");
    }
    match JunctionParser::parse(Rule::lone_statement, chunk) {
        Ok(_) => {
            // Parses alone but not in place: something follows it on the line.
            let at = sources.locate(Span {
                file,
                start: offset,
                end: offset + chunk.len(),
            });
            Diagnostic::error(
                "syntax",
                "this statement could not be read in place",
                Some(at),
            )
        }
        Err(error) => syntax_error(sources, file, offset, &error),
    }
}

fn syntax_error(
    sources: &SourceMap,
    file: usize,
    offset: usize,
    error: &pest::error::Error<Rule>,
) -> Diagnostic {
    let (start, end) = match error.location {
        InputLocation::Pos(p) => (p, p + 1),
        InputLocation::Span((s, e)) => (s, e.max(s + 1)),
    };
    let text = &sources.file(file).text;
    let mut start = offset + start;
    while start < text.len() && !text.is_char_boundary(start) {
        start += 1;
    }
    let mut end = (offset + end).min(text.len()).max(start);
    while end < text.len() && !text.is_char_boundary(end) {
        end += 1;
    }
    let at = sources.locate(Span { file, start, end });
    let found = text[start..].chars().next();
    let (message, hint) = match &error.variant {
        ErrorVariant::ParsingError { positives, .. } => describe_expected(positives, found),
        ErrorVariant::CustomError { message } => (message.clone(), None),
    };
    let mut d = Diagnostic::error("syntax", message, Some(at));
    if let Some(h) = hint {
        d = d.with_hint(h);
    }
    d
}

/// Turns the grammar's rule names into words a rule author knows.
fn describe_expected(positives: &[Rule], found: Option<char>) -> (String, Option<String>) {
    let mut words: Vec<&str> = positives.iter().filter_map(|r| rule_words(*r)).collect();
    words.sort();
    words.dedup();
    let found = match found {
        None | Some('\n') | Some('\r') => "the end of the line".to_string(),
        Some(c) => format!("`{c}`"),
    };
    let hint = if positives.contains(&Rule::change) || positives.contains(&Rule::left_side) {
        Some(
            "a rule reads `rule NAME: LEFT + RIGHT -> SURFACE`, e.g. `rule link-s: + -> s|`"
                .to_string(),
        )
    } else if positives
        .iter()
        .any(|r| matches!(r, Rule::language_decl | Rule::rule_decl | Rule::class_decl))
    {
        Some("a line starts with one of: language, description, normalize, case, segments, include, class, set, variant, pattern, edge, rule, example".to_string())
    } else if positives.contains(&Rule::comparison) {
        Some("a condition reads `left.KEY = VALUE`, `right.KEY != VALUE`, `left.KEY` or `left.letters >= N`".to_string())
    } else {
        None
    };
    if words.is_empty() {
        (format!("unexpected {found}"), hint)
    } else {
        (format!("expected {}, found {found}", join_or(&words)), hint)
    }
}

fn join_or(words: &[&str]) -> String {
    match words {
        [] => String::new(),
        [one] => one.to_string(),
        [rest @ .., last] => format!("{} or {last}", rest.join(", ")),
    }
}

fn rule_words(rule: Rule) -> Option<&'static str> {
    Some(match rule {
        Rule::language_decl
        | Rule::description_decl
        | Rule::normalize_decl
        | Rule::case_decl
        | Rule::segments_decl
        | Rule::include_decl
        | Rule::class_decl
        | Rule::set_decl
        | Rule::variant_decl
        | Rule::fold_decl
        | Rule::pattern_decl
        | Rule::edge_decl
        | Rule::rule_decl
        | Rule::example_decl => "a statement",
        Rule::name | Rule::label => "a name",
        Rule::segment | Rule::literal | Rule::surface_literal => "letters",
        Rule::class_ref => "a class in brackets such as `[vowel]`",
        Rule::slot => "a slot such as `[vowel]`",
        Rule::quoted | Rule::string => "a quoted text",
        Rule::boundary => "a boundary mark (`|`, `_`, `_?` or `-`)",
        Rule::change | Rule::left_side => "a change `LEFT + RIGHT -> SURFACE`",
        Rule::right_side => "the right side of the change",
        Rule::surface_side => "the surface side of the change",
        Rule::normal_form => "`nfc`, `nfd` or `none`",
        Rule::case_mode => "`fold` or `keep`",
        Rule::number => "a number",
        Rule::set_value => "a number or a name",
        Rule::repeat => "`+` or `{MIN,MAX}`",
        Rule::count => "a whole number",
        Rule::edge_side => "`start` or `end`",
        Rule::when_clause => "`when CONDITION`",
        Rule::condition => "a condition such as `left.pos = noun`",
        Rule::side => "`left` or `right`",
        Rule::comparison => "`=`, `!=`, `>=` or `<=`",
        Rule::value => "a tag value",
        Rule::scope => "`compound`, `phrase` or `any`",
        Rule::cost_clause
        | Rule::scope_clause
        | Rule::example_clause
        | Rule::note_clause
        | Rule::attested_clause => "a clause",
        Rule::example_parts | Rule::example_part => "the parts of the example",
        Rule::example_surface => "the surface form of the example",
        Rule::tag_pair => "a tag `KEY=VALUE`",
        Rule::uppercase_flag | Rule::tags_option => "`uppercase` or `tags`",
        Rule::EOI => "the end of the line",
        _ => return None,
    })
}

/// Reads the optional quoted description after a name (`rule NAME "…":`,
/// `variant NAME "…":`) and returns it with the pair that follows it.
fn optional_description<'i>(
    inner: &mut pest::iterators::Pairs<'i, Rule>,
) -> (Option<String>, Pair<'i, Rule>) {
    let next = inner.next().expect("grammar: a body follows the name");
    if next.as_rule() != Rule::string {
        return (None, next);
    }
    let description = next.into_inner().next().map(|p| p.as_str().to_string());
    (
        description,
        inner
            .next()
            .expect("grammar: a body follows the description"),
    )
}

struct Builder {
    file: usize,
    /// Errors found while building (span, message, hint), beside the
    /// grammar's own.
    errors: std::cell::RefCell<Vec<(Span, String, String)>>,
}

impl Builder {
    fn span(&self, pair: &Pair<Rule>) -> Span {
        let s = pair.as_span();
        Span {
            file: self.file,
            start: s.start(),
            end: s.end(),
        }
    }

    fn spanned<T>(&self, pair: &Pair<Rule>, value: T) -> Spanned<T> {
        Spanned {
            value,
            span: self.span(pair),
        }
    }

    fn text(&self, pair: Pair<Rule>) -> Spanned<String> {
        // `text` is silent: the pair is either a string or bare_text.
        let span = self.span(&pair);
        let value = match pair.as_rule() {
            Rule::string => pair
                .into_inner()
                .next()
                .map(|p| p.as_str().to_string())
                .unwrap_or_default(),
            _ => pair.as_str().trim().to_string(),
        };
        Spanned { value, span }
    }

    fn statement(&self, pair: Pair<Rule>) -> Statement {
        let span = self.span(&pair);
        let rule = pair.as_rule();
        let mut inner = pair.into_inner();
        match rule {
            Rule::language_decl => {
                Statement::Language(self.text(inner.next().expect("grammar: text")))
            }
            Rule::description_decl => {
                Statement::Description(self.text(inner.next().expect("grammar: text")))
            }
            Rule::normalize_decl => {
                let p = inner.next().expect("grammar: normal form");
                let form = match p.as_str() {
                    "nfd" => NormalForm::Nfd,
                    "none" => NormalForm::None,
                    _ => NormalForm::Nfc,
                };
                Statement::Normalize(self.spanned(&p, form))
            }
            Rule::case_decl => {
                let p = inner.next().expect("grammar: case mode");
                Statement::Case(self.spanned(&p, p.as_str() == "fold"))
            }
            Rule::segments_decl => Statement::Segments(
                inner
                    .map(|p| self.spanned(&p, p.as_str().to_string()))
                    .collect(),
            ),
            Rule::include_decl => {
                Statement::Include(self.text(inner.next().expect("grammar: include target")))
            }
            Rule::class_decl => {
                let name = inner.next().expect("grammar: class name");
                let name = self.spanned(&name, name.as_str().to_string());
                let members = inner
                    .map(|p| match p.as_rule() {
                        Rule::class_ref => {
                            let n = p.into_inner().next().expect("grammar: class ref name");
                            ClassMember::Class(self.spanned(&n, n.as_str().to_string()))
                        }
                        _ => ClassMember::Segment(self.spanned(&p, p.as_str().to_string())),
                    })
                    .collect();
                Statement::Class(ClassDecl {
                    name,
                    members,
                    span,
                })
            }
            Rule::set_decl => {
                let name = inner.next().expect("grammar: set name");
                let value = inner.next().expect("grammar: set value");
                let v = value
                    .clone()
                    .into_inner()
                    .next()
                    .expect("grammar: set value inner");
                let parsed = match v.as_rule() {
                    Rule::number => SetValue::Number(v.as_str().parse().unwrap_or(0.0)),
                    _ => SetValue::Name(v.as_str().to_string()),
                };
                Statement::Set(SetDecl {
                    name: self.spanned(&name, name.as_str().to_string()),
                    value: self.spanned(&value, parsed),
                })
            }
            Rule::fold_decl => {
                let from = inner.next().expect("grammar: fold source");
                let to = inner.next().expect("grammar: fold target");
                Statement::Variant(VariantDecl {
                    name: Spanned {
                        value: String::new(),
                        span,
                    },
                    description: None,
                    from: self.spanned(&from, from.as_str().to_string()),
                    to: self.spanned(&to, to.as_str().to_string()),
                })
            }
            Rule::variant_decl => {
                let name = inner.next().expect("grammar: variant name");
                let (description, next) = optional_description(&mut inner);
                let to = inner.next().expect("grammar: variant fold target");
                Statement::Variant(VariantDecl {
                    name: self.spanned(&name, name.as_str().to_string()),
                    description,
                    from: self.spanned(&next, next.as_str().to_string()),
                    to: self.spanned(&to, to.as_str().to_string()),
                })
            }
            Rule::pattern_decl => {
                let name = inner.next().expect("grammar: pattern name");
                let class = inner
                    .next()
                    .expect("grammar: pattern class")
                    .into_inner()
                    .next()
                    .expect("grammar: class name");
                let repeat = inner.next().expect("grammar: repeat");
                let counts: Vec<usize> = repeat
                    .clone()
                    .into_inner()
                    .map(|c| c.as_str().parse().unwrap_or(usize::MAX))
                    .collect();
                let (min, max) = match counts.as_slice() {
                    [] => (1, None),
                    [n] => (*n, Some(*n)),
                    [a, b, ..] => (*a, Some(*b)),
                };
                let mut uppercase = false;
                let mut tags = Vec::new();
                for option in inner {
                    match option.as_rule() {
                        Rule::uppercase_flag => uppercase = true,
                        Rule::tags_option => {
                            for pair in option.into_inner() {
                                let mut kv = pair.into_inner();
                                let k = kv
                                    .next()
                                    .map(|p| p.as_str().to_string())
                                    .unwrap_or_default();
                                let v = kv
                                    .next()
                                    .map(|p| p.as_str().to_string())
                                    .unwrap_or_default();
                                tags.push((k, v));
                            }
                        }
                        _ => {}
                    }
                }
                Statement::Pattern(PatternDecl {
                    name: self.spanned(&name, name.as_str().to_string()),
                    class: self.spanned(&class, class.as_str().to_string()),
                    min,
                    max,
                    uppercase,
                    tags,
                    span,
                })
            }
            Rule::edge_decl => {
                let side = inner.next().expect("grammar: edge side");
                let when = inner.next().expect("grammar: when clause");
                Statement::Edge(EdgeDecl {
                    end: side.as_str() == "end",
                    conditions: self.conditions(when),
                    span,
                })
            }
            Rule::rule_decl => Statement::Rule(self.rule(inner, span)),
            Rule::example_decl => Statement::Example(self.example(inner, span)),
            other => unreachable!("grammar: unexpected statement {other:?}"),
        }
    }

    fn conditions(&self, when: Pair<Rule>) -> Vec<Spanned<Condition>> {
        when.into_inner()
            .map(|c| {
                let span = self.span(&c);
                let mut parts = c.into_inner();
                let side = match parts.next().map(|p| p.as_str()) {
                    Some("right") => Side::Right,
                    _ => Side::Left,
                };
                let key = parts
                    .next()
                    .map(|p| p.as_str().to_string())
                    .unwrap_or_default();
                let mut test = None;
                let mut bound = None;
                if let Some(cmp) = parts.next() {
                    let values: Vec<String> = parts.map(|v| v.as_str().to_string()).collect();
                    match cmp.as_str() {
                        op @ (">=" | "<=") => {
                            let number = match values.as_slice() {
                                [one] => one.parse::<u64>().ok(),
                                _ => None,
                            };
                            match number {
                                Some(value) => {
                                    bound = Some(Bound {
                                        at_least: op == ">=",
                                        value,
                                    })
                                }
                                None => self.errors.borrow_mut().push((
                                    span,
                                    format!(
                                        "`{op}` compares with one whole number, not `{}`",
                                        values.join("|")
                                    ),
                                    "e.g. `left.letters >= 4`".to_string(),
                                )),
                            }
                        }
                        op => test = Some((op == "=", values)),
                    }
                }
                Spanned {
                    value: Condition {
                        side,
                        key,
                        test,
                        bound,
                    },
                    span,
                }
            })
            .collect()
    }

    fn example(&self, mut inner: pest::iterators::Pairs<Rule>, span: Span) -> ExampleDecl {
        let parts = inner
            .next()
            .expect("grammar: example parts")
            .into_inner()
            .map(|p| p.as_str().to_string())
            .collect();
        let surface = inner
            .next()
            .map(|p| p.as_str().trim().to_string())
            .unwrap_or_default();
        ExampleDecl {
            parts,
            surface,
            span,
        }
    }

    fn items(&self, side: Pair<Rule>) -> Vec<Spanned<ChangeItem>> {
        side.into_inner()
            .map(|p| {
                let span = self.span(&p);
                let item = match p.as_rule() {
                    Rule::slot => {
                        let mut label = None;
                        let mut names = Vec::new();
                        for q in p.into_inner() {
                            match q.as_rule() {
                                Rule::label => label = Some(q.as_str().to_string()),
                                _ => names.push(q.as_str().to_string()),
                            }
                        }
                        let mut names = names.into_iter();
                        ChangeItem::Slot(Slot {
                            label,
                            name: names.next().unwrap_or_default(),
                            map_to: names.next(),
                        })
                    }
                    Rule::boundary => ChangeItem::Boundary(match p.as_str() {
                        "_" => BoundaryMark::Space,
                        "_?" => BoundaryMark::OptionalSpace,
                        "-" => BoundaryMark::Hyphen,
                        _ => BoundaryMark::Plain,
                    }),
                    Rule::quoted => ChangeItem::Literal(
                        p.into_inner()
                            .next()
                            .map(|q| q.as_str().to_string())
                            .unwrap_or_default(),
                    ),
                    _ => ChangeItem::Literal(p.as_str().to_string()),
                };
                Spanned { value: item, span }
            })
            .collect()
    }

    fn rule(&self, mut inner: pest::iterators::Pairs<Rule>, span: Span) -> RuleDecl {
        let name = inner.next().expect("grammar: rule name");
        let name = self.spanned(&name, name.as_str().to_string());
        let (description, next) = optional_description(&mut inner);
        let change_span = self.span(&next);
        let mut sides = next.into_inner();
        let left = self.items(sides.next().expect("grammar: left side"));
        let right = self.items(sides.next().expect("grammar: right side"));
        let surface = self.items(sides.next().expect("grammar: surface side"));
        let mut rule = RuleDecl {
            name,
            description,
            change: Change {
                left,
                right,
                surface,
                span: change_span,
            },
            cost: None,
            conditions: Vec::new(),
            scope: None,
            examples: Vec::new(),
            notes: Vec::new(),
            attested: None,
            span,
        };
        let clauses = inner.flat_map(|p| match p.as_rule() {
            Rule::continuation => p
                .into_inner()
                .flat_map(|q| q.into_inner())
                .collect::<Vec<_>>(),
            _ => vec![p],
        });
        for clause in clauses {
            let cspan = self.span(&clause);
            match clause.as_rule() {
                Rule::cost_clause => {
                    let n = clause.into_inner().next().expect("grammar: cost number");
                    rule.cost = Some(Spanned {
                        value: n.as_str().parse().unwrap_or(0.0),
                        span: self.span(&n),
                    });
                }
                Rule::when_clause => rule.conditions.extend(self.conditions(clause)),
                Rule::scope_clause => {
                    let s = clause.into_inner().next().expect("grammar: scope");
                    let scope = match s.as_str() {
                        "compound" => Scope::Compound,
                        "phrase" => Scope::Phrase,
                        _ => Scope::Any,
                    };
                    rule.scope = Some(Spanned {
                        value: scope,
                        span: cspan,
                    });
                }
                Rule::example_clause => {
                    rule.examples.push(self.example(clause.into_inner(), cspan))
                }
                Rule::note_clause => {
                    if let Some(t) = clause.into_inner().next() {
                        rule.notes.push(self.text(t).value);
                    }
                }
                Rule::attested_clause => rule.attested = Some(cspan),
                _ => {}
            }
        }
        rule
    }
}
