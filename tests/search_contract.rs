//! The search contract (design brief, "The search contract"), as properties
//! over random rule-sets and lexicons:
//!
//! - **sound**: every analysis reported regenerates the input when its
//!   junctions are applied forward (`proof::verify`), and its offsets locate
//!   its parts and junctions in the input;
//! - **complete**: joining random lexicon words forward with any applicable
//!   junctions gives a surface whose split lists that very analysis (same
//!   parts, same junction instances);
//! - **counted**: `search::count` equals the number of analyses enumerated,
//!   with and without a limit on the number of parts;
//! - **ranked**: analyses come in non-increasing score order, the k best are
//!   the first k of the full list, and scores follow the documented model.
//!
//! Rule-sets are generated as rule-language text over the alphabet
//! {a, b, c, d} from templates (concatenation, insertion, elision,
//! substitution, merger, space, hyphen, optional space, class
//! correspondences, gemination, degemination), with random costs, scopes,
//! tag conditions and edge conditions, and compiled with `rules::compile`.
//! No multi-letter segments occur, so there are no junctions whose boundary
//! falls inside a segment (the one documented exception to completeness).

use juncture::analyzer::Analyzer;
use juncture::lattice::{Edge, Lattice, Node, ScopeFilter};
use juncture::lexicon::{Lexicon, LexiconBuilder};
use juncture::proof::{self, Analysis};
use juncture::rules::{compile, CompileOptions, Ranking, RuleSet, Separator};
use juncture::search::{self, ScoredPath};
use num_bigint::BigUint;
use petgraph::graph::NodeIndex;
use petgraph::visit::EdgeRef;
use proptest::prelude::*;
use proptest::sample::Index;
use proptest::test_runner::TestCaseError;
use std::collections::{BTreeSet, HashMap};
use std::fmt::Write;

/// Inputs with at most this many analyses are enumerated completely.
const SMALL: usize = 2_000;
/// Of inputs with more, the best this many are checked.
const SOME: usize = 100;
/// No join of the generated words has more ways than this.
const ALL: usize = 10_000;

const LETTERS: [&str; 4] = ["a", "b", "c", "d"];

/// Letters, `a` and `b` more often than `c` and `d` (so that words overlap
/// and inputs have several analyses).
fn letters(min: usize, max: usize) -> impl Strategy<Value = String> {
    let letter = prop_oneof![3 => Just("a"), 2 => Just("b"), 1 => Just("c"), 1 => Just("d")];
    prop::collection::vec(letter, min..=max).prop_map(|v| v.concat())
}

/// Two distinct letters, as the members of a class.
fn class_members() -> impl Strategy<Value = (String, String)> {
    prop::sample::subsequence(LETTERS.to_vec(), 2).prop_flat_map(|v| {
        let (x, y) = (v[0].to_string(), v[1].to_string());
        prop_oneof![Just((x.clone(), y.clone())), Just((y, x))]
    })
}

/// The change of a rule, from one of the templates.
fn change() -> impl Strategy<Value = String> {
    prop_oneof![
        // plain concatenation
        3 => Just("+ -> |".to_string()),
        // insertion (linking element) before or after the boundary
        2 => letters(1, 2).prop_map(|x| format!("+ -> {x} |")),
        1 => letters(1, 1).prop_map(|x| format!("+ -> | {x}")),
        // elision of the end of the left word or the start of the right one
        2 => letters(1, 2).prop_map(|x| format!("{x} + -> |")),
        1 => letters(1, 1).prop_map(|x| format!("+ {x} -> |")),
        // substitution
        2 => (letters(1, 1), letters(1, 1), letters(0, 2), letters(0, 1))
            .prop_map(|(x, y, z, w)| format!("{x} + {y} -> {z} | {w}")),
        // merger of two segments into one
        2 => (letters(1, 1), letters(1, 1), letters(1, 1))
            .prop_map(|(x, y, z)| format!("{x} + {y} -> {z}")),
        // printed space, hyphen, optional space
        1 => Just("+ -> _".to_string()),
        1 => Just("+ -> -".to_string()),
        1 => (letters(1, 1), letters(0, 1)).prop_map(|(x, z)| format!("{x} + -> {z} _?")),
        // class correspondences
        1 => Just("[x:p] + -> [x>q] |".to_string()),
        1 => Just("[x:p] + [y:q] -> [x>q] | [y>p]".to_string()),
        1 => Just("[x:p] + [q] -> [x] | [q]".to_string()),
        1 => Just("[x:p] + [y:q] -> [y>p]".to_string()),
        // gemination and degemination
        1 => Just("[x:p] + [q] -> [x] [x] | [q]".to_string()),
        1 => Just("[x:p] + [x] -> | [x]".to_string()),
    ]
}

/// A rule: change, cost, scope and (when allowed) tag conditions.
fn rule(conditions: bool) -> impl Strategy<Value = String> {
    let condition = if conditions {
        prop_oneof![
            4 => Just(None),
            1 => Just(Some("left.pos = n")),
            1 => Just(Some("right.pos = v")),
            1 => Just(Some("left.pos != v")),
            1 => Just(Some("right.bound")),
            1 => Just(Some("left.pos = n and right.pos != n")),
        ]
        .boxed()
    } else {
        Just(None).boxed()
    };
    (
        change(),
        prop::sample::select(vec!["0", "0.5", "1", "2"]),
        prop::sample::select(vec!["", "compound", "phrase", "any"]),
        condition,
    )
        .prop_map(|(change, cost, scope, condition)| {
            let mut text = format!(": {change}\n  cost {cost}\n");
            // A rule `in compound` may not print a space.
            let prints_space = change.ends_with("-> _");
            if !scope.is_empty() && !(scope == "compound" && prints_space) {
                let _ = writeln!(text, "  in {scope}");
            }
            if let Some(c) = condition {
                let _ = writeln!(text, "  when {c}");
            }
            text
        })
}

/// A whole rule file.
fn rule_file(conditions: bool) -> impl Strategy<Value = String> {
    let edges = if conditions {
        prop_oneof![
            3 => Just(""),
            1 => Just("edge end when left.pos != v\n"),
            1 => Just("edge start when right.pos = n\n"),
        ]
        .boxed()
    } else {
        Just("").boxed()
    };
    (
        class_members(),
        class_members(),
        prop::collection::vec(rule(conditions), 1..=6),
        prop::sample::select(vec!["probability", "frequency"]),
        prop::sample::select(vec!["0", "1", "2"]),
        prop::sample::select(vec!["0", "0.5"]),
        if conditions {
            (1usize..=2).boxed()
        } else {
            Just(1usize).boxed()
        },
        edges,
    )
        .prop_map(
            |(p, q, rules, ranking, part_cost, split_cost, min_part, edges)| {
                let mut text = String::from("language generated\ncase keep\n");
                let _ = writeln!(text, "class p = {} {}", p.0, p.1);
                let _ = writeln!(text, "class q = {} {}", q.0, q.1);
                let _ = writeln!(text, "set ranking = {ranking}");
                let _ = writeln!(text, "set part-cost = {part_cost}");
                let _ = writeln!(text, "set split-cost = {split_cost}");
                let _ = writeln!(text, "set min-part-length = {min_part}");
                text.push_str(edges);
                // The same rule twice would be a (correct) compile error.
                let mut seen = BTreeSet::new();
                for r in rules {
                    if seen.insert(r.clone()) {
                        let _ = write!(text, "rule r{}{r}", seen.len());
                    }
                }
                text
            },
        )
}

/// A lexicon TSV: 3–12 words of 1–4 letters, random frequencies and tags,
/// sometimes a second reading of a form.
fn lexicon_tsv() -> impl Strategy<Value = String> {
    let word = (
        letters(1, 4),
        1u32..1000,
        prop::sample::select(vec!["", "pos=n", "pos=v", "pos=n;bound=yes", "bound=yes"]),
        prop::option::weighted(
            0.15,
            (1u32..100, prop::sample::select(vec!["pos=v", "pos=n"])),
        ),
    );
    prop::collection::vec(word, 3..=12).prop_map(|words| {
        let mut tsv = String::from("# generated\n");
        let mut forms = BTreeSet::new();
        for (form, freq, tags, second) in words {
            if !forms.insert(form.clone()) {
                continue;
            }
            let _ = writeln!(tsv, "{form}\t{freq}\t{tags}");
            if let Some((f, t)) = second {
                let _ = writeln!(tsv, "{form}\t{f}\t{t}");
            }
        }
        tsv
    })
}

fn scope_filter() -> impl Strategy<Value = ScopeFilter> {
    prop_oneof![
        3 => Just(ScopeFilter::Any),
        1 => Just(ScopeFilter::Compound),
        1 => Just(ScopeFilter::Phrase),
    ]
}

/// A random rule-set and lexicon, words to join, and a few random strings.
#[derive(Debug, Clone)]
struct Case {
    rules: String,
    lexicon: String,
    sequences: Vec<Vec<Index>>,
    scope: ScopeFilter,
    noise: Vec<String>,
}

fn case(conditions: bool) -> impl Strategy<Value = Case> {
    (
        rule_file(conditions),
        lexicon_tsv(),
        prop::collection::vec(prop::collection::vec(any::<Index>(), 1..=4), 1..=4),
        if conditions {
            scope_filter().boxed()
        } else {
            Just(ScopeFilter::Any).boxed()
        },
        prop::collection::vec(
            prop::collection::vec(
                prop::sample::select(vec!["a", "b", "c", "d", " ", "-"]),
                0..8,
            )
            .prop_map(|v| v.concat()),
            0..3,
        ),
    )
        .prop_map(|(rules, lexicon, sequences, scope, noise)| Case {
            rules,
            lexicon,
            sequences,
            scope,
            noise,
        })
}

struct World {
    rules: RuleSet,
    lexicon: Lexicon,
}

impl World {
    /// Compiles the case; `None` when the generator produced two rules
    /// describing the same junctions (rightly rejected as `duplicate-change`).
    fn new(case: &Case) -> Result<World, TestCaseError> {
        let rules = match compile(
            "generated.jr",
            &case.rules,
            None,
            &CompileOptions::default(),
        ) {
            Ok(r) => r,
            Err(d) if d.0.iter().all(|x| x.code == "duplicate-change") => {
                return Err(TestCaseError::reject("two rules with the same junctions"))
            }
            Err(d) => {
                return Err(TestCaseError::fail(format!(
                    "generated rule file does not compile:\n{}\n{d}",
                    case.rules
                )))
            }
        };
        let mut builder = LexiconBuilder::new(&rules.normalizer).strict(true);
        builder
            .add_tsv("generated.tsv", case.lexicon.as_bytes())
            .map_err(|e| TestCaseError::fail(format!("lexicon: {e}")))?;
        let lexicon = builder
            .build()
            .map_err(|e| TestCaseError::fail(format!("lexicon: {e}")))?;
        Ok(World { rules, lexicon })
    }

    fn analyzer(&self, scope: ScopeFilter, max_parts: usize) -> Analyzer<'_> {
        let mut a = Analyzer::new(&self.rules, &self.lexicon);
        a.lattice.scope = scope;
        a.search.max_parts = max_parts;
        a
    }

    /// The case's sequences of words to join (lexicon keys).
    fn sequences(&self, case: &Case) -> Vec<Vec<String>> {
        let n = self.lexicon.len();
        case.sequences
            .iter()
            .map(|s| {
                s.iter()
                    .map(|i| self.lexicon.entry(i.index(n)).key.clone())
                    .collect()
            })
            .collect()
    }
}

/// Parts and junction instances: what identifies an analysis.
type Key = (Vec<String>, Vec<usize>);

fn key_of(a: &Analysis) -> Key {
    (
        a.parts.iter().map(|p| p.key.clone()).collect(),
        a.junctions.iter().map(|j| j.instance).collect(),
    )
}

/// Everything the search reports for one input, built stage by stage (the
/// analyzer itself drops analyses that fail verification, so soundness is
/// checked here on the raw search output).
struct Found {
    lattice: Lattice,
    count: BigUint,
    /// The count without a part limit.
    unlimited: BigUint,
    /// Whether every analysis is listed (the count is at most [`SMALL`]).
    complete: bool,
    paths: Vec<ScoredPath>,
    analyses: Vec<Analysis>,
}

fn search_input(world: &World, analyzer: &Analyzer, input: &str) -> Result<Found, TestCaseError> {
    let lattice = analyzer.lattice(input);
    prop_assert!(
        lattice.truncated.is_none(),
        "lattice truncated for {input:?}"
    );
    let count = search::count(&lattice, analyzer.search.max_parts);
    let unlimited = search::count(&lattice, 0);
    prop_assert!(count <= unlimited);
    let complete = count <= BigUint::from(SMALL);
    let k = if complete { SMALL } else { SOME };
    let (paths, cut) = search::best(&lattice, &world.rules, &world.lexicon, &analyzer.search, k);
    prop_assert!(cut.is_none(), "search cut for {input:?}");
    let analyses = paths
        .iter()
        .enumerate()
        .map(|(i, p)| proof::analysis(&lattice, &world.rules, &world.lexicon, p, i + 1))
        .collect();
    Ok(Found {
        lattice,
        count,
        unlimited,
        complete,
        paths,
        analyses,
    })
}

/// Soundness, offsets, distinctness, exact count and order for one input.
fn check_input(world: &World, analyzer: &Analyzer, input: &str) -> Result<Found, TestCaseError> {
    let found = search_input(world, analyzer, input)?;
    let chars: Vec<char> = input.chars().collect();
    let slice = |a: usize, b: usize| -> String { chars[a.min(b)..b].iter().collect() };
    let mut keys = BTreeSet::new();
    for (i, a) in found.analyses.iter().enumerate() {
        // (a) sound
        if let Err(e) = proof::verify(&world.rules, a, input) {
            return Err(TestCaseError::fail(format!(
                "analysis {} of {input:?} does not verify: {e}\n{a:#?}",
                a.parts_text()
            )));
        }
        prop_assert_eq!(a.rank, i + 1);
        prop_assert_eq!(a.junctions.len() + 1, a.parts.len());
        if analyzer.search.max_parts > 0 {
            prop_assert!(a.parts.len() <= analyzer.search.max_parts);
        }
        prop_assert_eq!(found.paths[i].parts, a.parts.len());
        // Offsets locate every part and junction in the input.
        let mut last_start = 0;
        for p in &a.parts {
            prop_assert!(
                p.start <= p.end && p.end <= chars.len(),
                "{p:?} in {input:?}"
            );
            prop_assert!(p.start >= last_start, "parts out of order in {input:?}");
            last_start = p.start;
            prop_assert_eq!(
                &p.surface,
                &slice(p.start, p.end),
                "part {:?} of {:?}",
                p,
                input
            );
            prop_assert_eq!(&p.form, &p.key);
        }
        // The parts tile the input: the first starts at 0, the last ends at
        // the end, and each junction's surface sits between its two parts
        // (a merged surface belongs to both).
        prop_assert_eq!(a.parts[0].start, 0);
        prop_assert_eq!(a.parts[a.parts.len() - 1].end, chars.len());
        for (j, junction) in a.junctions.iter().enumerate() {
            let inst = &world.rules.instances[junction.instance];
            prop_assert_eq!(&junction.rule, &world.rules.rules[inst.rule].name);
            prop_assert_eq!(&junction.left, &inst.left);
            prop_assert_eq!(&junction.right, &inst.right);
            prop_assert_eq!(&junction.surface, &inst.surface());
            prop_assert_eq!(junction.boundary, inst.separator);
            let end = junction.at + junction.surface.chars().count();
            prop_assert!(end <= chars.len());
            prop_assert_eq!(&junction.surface, &slice(junction.at, end));
            let before = inst.surface_left.chars().count();
            prop_assert_eq!(
                a.parts[j].end,
                junction.at + before,
                "end of part {} in {:?}",
                j,
                input
            );
            let next_start = match inst.separator {
                Separator::Merged => junction.at,
                Separator::None => junction.at + before,
                Separator::Space | Separator::Hyphen => junction.at + before + 1,
            };
            prop_assert_eq!(
                a.parts[j + 1].start,
                next_start,
                "start of part {} in {:?}",
                j + 1,
                input
            );
        }
        prop_assert!(
            keys.insert(key_of(a)),
            "analysis listed twice for {input:?}"
        );
        // Sound with respect to tag conditions, edges and scope as well:
        // joining the parts forward allows the same junctions (checked where
        // the join lists all its ways).
        if i < 20 && a.parts.len() <= 4 {
            let (words, instances) = key_of(a);
            let parts: Vec<&str> = words.iter().map(String::as_str).collect();
            let joined = proof::join(
                &world.rules,
                &world.lexicon,
                &parts,
                analyzer.lattice.scope,
                ALL,
            );
            let allowed = joined.results.iter().any(|j| {
                j.junctions
                    .iter()
                    .map(|s| s.instance)
                    .eq(instances.iter().copied())
            });
            prop_assert!(
                joined.truncated || allowed,
                "analysis {} of {:?} ({:?}) breaks a condition, edge or scope",
                a.parts_text(),
                input,
                instances
            );
        }
    }
    // (c) the count is exact
    if found.complete {
        prop_assert_eq!(
            BigUint::from(found.analyses.len()),
            found.count.clone(),
            "count differs from the enumeration for {:?}",
            input
        );
    } else {
        prop_assert_eq!(found.analyses.len(), SOME);
    }
    // (d) ranked: non-increasing scores, and the top k are a prefix
    for w in found.paths.windows(2) {
        prop_assert!(
            w[0].score >= w[1].score - 1e-9,
            "scores out of order for {input:?}: {} then {}",
            w[0].score,
            w[1].score
        );
    }
    for w in found.analyses.windows(2) {
        prop_assert!(w[0].score >= w[1].score);
    }
    let top = analyzer.split(input, 3);
    prop_assert_eq!(&top.count.0, &found.count);
    prop_assert_eq!(top.analyses.len(), found.analyses.len().min(3));
    prop_assert!(top.error.is_none());
    // Hitting a limit (analyses listed, or parts) is reported.
    prop_assert_eq!(
        top.truncated,
        found.count > BigUint::from(3u32) || found.unlimited > found.count,
        "truncated flag for {:?}: {:?}",
        input,
        top.reason
    );
    for (a, b) in top.analyses.iter().zip(&found.analyses) {
        prop_assert!(
            (a.score - b.score).abs() < 1e-3,
            "top-3 is not a prefix for {input:?}"
        );
    }
    Ok(found)
}

/// Whether the lattice has the path of this analysis (for inputs with too
/// many analyses to list them all).
fn lattice_has(lattice: &Lattice, key: &Key) -> bool {
    fn walk(lattice: &Lattice, node: NodeIndex, key: &Key, i: usize) -> bool {
        let (words, instances) = key;
        lattice.graph.edges(node).any(|e| {
            let Edge::Word(w) = e.weight() else {
                return false;
            };
            if w.key != words[i] {
                return false;
            }
            if i + 1 == words.len() {
                return e.target() == lattice.end;
            }
            match &lattice.graph[e.target()] {
                Node::Joint { instance, .. } if *instance == instances[i] => lattice
                    .graph
                    .edges(e.target())
                    .any(|j| walk(lattice, j.target(), key, i + 1)),
                _ => false,
            }
        })
    }
    walk(lattice, lattice.start, key, 0)
}

/// The score the documented model gives an analysis.
fn model_score(world: &World, analyzer: &Analyzer, key: &Key) -> f64 {
    let (words, instances) = key;
    let options = &analyzer.search;
    let junctions: f64 = instances
        .iter()
        .map(|&i| world.rules.rules[world.rules.instances[i].rule].cost + options.split_cost)
        .sum();
    let frequency = |w: &String| {
        world
            .lexicon
            .entry(world.lexicon.get(w).expect("a lexicon word"))
            .frequency
    };
    match options.ranking {
        Ranking::Frequency => {
            let n = words.len() as f64;
            words
                .iter()
                .map(|w| frequency(w).max(1.0).ln())
                .sum::<f64>()
                / n
                - junctions
        }
        Ranking::Probability => {
            words
                .iter()
                .map(|w| world.lexicon.log_probability(frequency(w)) - options.part_cost)
                .sum::<f64>()
                - junctions
        }
    }
}

/// (b) the generating analysis is among the analyses of its surface, with
/// the score the model gives it.
fn check_generated(
    world: &World,
    analyzer: &Analyzer,
    checked: &mut HashMap<String, Found>,
    key: &Key,
    surface: &str,
) -> Result<(), TestCaseError> {
    if !checked.contains_key(surface) {
        let found = check_input(world, analyzer, surface)?;
        checked.insert(surface.to_string(), found);
    }
    let found = &checked[surface];
    let (words, _) = key;
    let min = world.rules.settings.min_part_length;
    if words.len() > 1 && words.iter().any(|w| w.chars().count() < min) {
        return Ok(()); // outside the stated limits (min-part-length)
    }
    let expected = model_score(world, analyzer, key);
    if !found.complete {
        // Too many to list: the path is in the lattice, and the best
        // analysis scores at least as well as this one.
        prop_assert!(
            lattice_has(&found.lattice, key),
            "joining {:?} with instances {:?} gives {:?}, but its lattice lacks that analysis",
            words,
            key.1,
            surface
        );
        prop_assert!(found.paths[0].score >= expected - 1e-6);
        return Ok(());
    }
    match found.analyses.iter().position(|a| &key_of(a) == key) {
        None => Err(TestCaseError::fail(format!(
            "joining {words:?} with instances {:?} gives {surface:?}, but its split does not list that analysis; it lists {:?}",
            key.1,
            found.analyses.iter().map(key_of).collect::<Vec<_>>()
        ))),
        Some(i) => {
            prop_assert!(
                (found.paths[i].score - expected).abs() < 1e-6,
                "score {} of {:?}, the model gives {}",
                found.paths[i].score,
                words,
                expected
            );
            Ok(())
        }
    }
}

/// Every combination of instances whose underlying ends fit the words
/// (without looking at conditions), as candidates for `proof::apply`.
fn all_combinations(rules: &RuleSet, words: &[String]) -> Vec<Vec<usize>> {
    let mut combos = vec![Vec::new()];
    for pair in words.windows(2) {
        let fitting: Vec<usize> = rules
            .instances
            .iter()
            .enumerate()
            .filter(|(_, i)| pair[0].ends_with(&i.left) && pair[1].starts_with(&i.right))
            .map(|(id, _)| id)
            .collect();
        combos = combos
            .into_iter()
            .flat_map(|c| {
                fitting.iter().map(move |&id| {
                    let mut c = c.clone();
                    c.push(id);
                    c
                })
            })
            .collect();
    }
    combos
}

fn config() -> ProptestConfig {
    ProptestConfig {
        cases: 1000,
        max_global_rejects: 5000,
        ..ProptestConfig::with_cases(1000)
    }
}

proptest! {
    #![proptest_config(config())]

    /// (a) sound, (c) counted, (d) ranked — on joined surfaces and on random strings.
    #[test]
    fn analyses_verify_are_counted_exactly_and_ranked(case in case(true)) {
        let world = World::new(&case)?;
        let analyzer = world.analyzer(case.scope, 0);
        let mut inputs: Vec<String> = case.noise.clone();
        for words in world.sequences(&case) {
            let parts: Vec<&str> = words.iter().map(String::as_str).collect();
            let joined = proof::join(&world.rules, &world.lexicon, &parts, case.scope, 50);
            inputs.extend(joined.results.iter().map(|j| j.surface.clone()));
            inputs.push(words.concat());
        }
        let inputs: BTreeSet<String> = inputs.into_iter().collect();
        for input in &inputs {
            check_input(&world, &analyzer, input)?;
        }
    }

    /// (b) complete: every way `proof::join` finds to join the words (with
    /// tag conditions, edge conditions and scopes) is found again by `split`.
    #[test]
    fn every_join_is_found_by_split(case in case(true)) {
        let world = World::new(&case)?;
        let analyzer = world.analyzer(case.scope, 0);
        let mut checked = HashMap::new();
        for words in world.sequences(&case) {
            let parts: Vec<&str> = words.iter().map(String::as_str).collect();
            let joined = proof::join(&world.rules, &world.lexicon, &parts, case.scope, ALL);
            prop_assert!(!joined.truncated);
            prop_assert_eq!(joined.count, joined.results.len());
            for j in &joined.results {
                let instances: Vec<usize> = j.junctions.iter().map(|s| s.instance).collect();
                let surface = proof::apply(&world.rules, &words, &instances)
                    .map_err(|e| TestCaseError::fail(format!("join listed an invalid way: {e}")))?;
                prop_assert_eq!(&surface, &j.surface);
                check_generated(
                    &world,
                    &analyzer,
                    &mut checked,
                    &(words.clone(), instances),
                    &surface,
                )?;
            }
        }
    }

    /// (b) complete, without conditions: every combination of instances for
    /// which `proof::apply` succeeds is found by `split`, and by `join`.
    #[test]
    fn every_valid_forward_application_is_found(case in case(false)) {
        let world = World::new(&case)?;
        let analyzer = world.analyzer(ScopeFilter::Any, 0);
        let mut checked = HashMap::new();
        for words in world.sequences(&case) {
            let parts: Vec<&str> = words.iter().map(String::as_str).collect();
            let joined = proof::join(&world.rules, &world.lexicon, &parts, ScopeFilter::Any, ALL);
            let join_ways: BTreeSet<Vec<usize>> = joined
                .results
                .iter()
                .map(|j| j.junctions.iter().map(|s| s.instance).collect())
                .collect();
            let mut valid = 0;
            for instances in all_combinations(&world.rules, &words) {
                let Ok(surface) = proof::apply(&world.rules, &words, &instances) else {
                    continue;
                };
                valid += 1;
                prop_assert!(
                    join_ways.contains(&instances),
                    "join misses {:?} with {:?} → {:?}",
                    words, instances, surface
                );
                check_generated(
                    &world,
                    &analyzer,
                    &mut checked,
                    &(words.clone(), instances),
                    &surface,
                )?;
            }
            prop_assert_eq!(valid, join_ways.len(), "join lists ways that do not apply");
        }
    }

    /// With a part limit, the count and the list are those of the unlimited
    /// enumeration filtered by the number of parts.
    #[test]
    fn part_limit_filters_count_and_list(case in case(true), limit in 1usize..=4) {
        let world = World::new(&case)?;
        let unlimited = world.analyzer(case.scope, 0);
        let limited = world.analyzer(case.scope, limit);
        let mut inputs: Vec<String> = case.noise.clone();
        for words in world.sequences(&case) {
            let parts: Vec<&str> = words.iter().map(String::as_str).collect();
            let joined = proof::join(&world.rules, &world.lexicon, &parts, case.scope, 50);
            inputs.extend(joined.results.iter().map(|j| j.surface.clone()));
        }
        let inputs: BTreeSet<String> = inputs.into_iter().collect();
        for input in &inputs {
            let all = check_input(&world, &unlimited, input)?;
            let some = check_input(&world, &limited, input)?;
            if !all.complete {
                continue;
            }
            let expected: BTreeSet<Key> = all
                .analyses
                .iter()
                .filter(|a| a.parts.len() <= limit)
                .map(key_of)
                .collect();
            let got: BTreeSet<Key> = some.analyses.iter().map(key_of).collect();
            prop_assert_eq!(
                &some.count,
                &BigUint::from(expected.len()),
                "count with at most {} parts of {:?}",
                limit,
                input
            );
            prop_assert_eq!(got, expected, "analyses with at most {} parts of {:?}", limit, input);
        }
    }
}
