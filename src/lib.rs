//! # juncture
//!
//! Splits fused words back into their parts while undoing the sound and
//! spelling changes made where the parts joined (linking elements, elision,
//! sandhi), and joins parts forward by the same rules.
//!
//! The crate is a pipeline of stages, one module each:
//!
//! ```text
//! rule file ──rules──▶ RuleSet ─────────────┐
//! lexicon TSV ──lexicon──▶ Lexicon ──────────┤
//! surface text ──normalize──▶ lattice (DAG) ◀┘
//! lattice ──search (count, k-best)──▶ proof (analyses, verify) ──▶ output
//! ```
//!
//! - [`rules`]: the rule language (pest grammar in `grammars/junction.pest`),
//!   its typed syntax tree and the compiler to a [`rules::RuleSet`].
//! - [`lexicon`]: word lists, normalized and indexed in an FST.
//! - [`normalize`]: Unicode normal form, case folding, segments.
//! - [`lattice`]: the DAG of all ways to read a surface string.
//! - [`search`]: exact counts and lazy best-first enumeration of analyses.
//! - [`proof`]: analyses with their proof chains, verification, and joining.
//! - [`output`]: text, JSON, YAML and TSV renderings.

#![deny(missing_docs)]

pub mod analyzer;
pub mod cache;
pub mod check;
pub mod eval;
pub mod explain;
pub mod induce;
pub mod lattice;
pub mod lexicon;
pub mod normalize;
pub mod output;
pub mod paradigm;
pub mod proof;
pub mod render_svg;
pub mod rules;
pub mod script;
pub mod scripted;
pub mod search;
