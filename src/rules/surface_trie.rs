//! The index the lattice uses to find junctions: every instance surface in a
//! character trie, so the surfaces starting at one input position are found
//! in a single walk, and, per surface, the underlying left ends of its
//! instances in a byte trie, so a lexicon state is tested against all of them
//! by walking the lexicon once along shared prefixes instead of once per
//! instance.
//!
//! Orders are those of [`RuleSet::instances_with_surface`](super::RuleSet::instances_with_surface):
//! a surface's instances by left end (byte order), then by index; the left
//! trie is walked depth first with children in byte order, which visits the
//! left ends in the same order.

/// Numbers for the condition lists of a rule-set: lists with the same
/// tests (whichever side they are written for) get the same number, so the
/// lattice evaluates each list once per entry. Built with the rule-set; the
/// lattice treats an empty list as always true without looking here.
#[derive(Debug, Clone, Default)]
pub(crate) struct ConditionIds {
    /// Per rule: its left conditions' number.
    pub(crate) left: Vec<u32>,
    /// Per rule: its right conditions' number.
    pub(crate) right: Vec<u32>,
    /// The `edge start` conditions' number.
    pub(crate) edge_start: u32,
    /// The `edge end` conditions' number.
    pub(crate) edge_end: u32,
    /// Per number: whether the list tests the form itself (`form`), not
    /// only tags.
    pub(crate) uses_form: Vec<bool>,
}

impl ConditionIds {
    /// Numbers the lists of `rules` and the edge conditions.
    pub(crate) fn build<'c>(
        rules: &'c [super::JunctionRule],
        edge_start: &'c [super::Condition],
        edge_end: &'c [super::Condition],
    ) -> ConditionIds {
        type Tests<'c> = Vec<(
            &'c str,
            &'c Option<(bool, Vec<String>)>,
            Option<super::ast::Bound>,
        )>;
        let mut seen: rustc_hash::FxHashMap<Tests<'c>, u32> = Default::default();
        let mut uses_form = Vec::new();
        let mut id = |list: &'c [super::Condition]| -> u32 {
            let tests: Tests = list
                .iter()
                .map(|c| (c.key.as_str(), &c.test, c.bound))
                .collect();
            let next = seen.len() as u32;
            *seen.entry(tests).or_insert_with(|| {
                uses_form.push(
                    list.iter()
                        .any(|c| c.key == "form" || c.key == super::ast::LETTERS_KEY),
                );
                next
            })
        };
        let left = rules.iter().map(|r| id(&r.left_conditions)).collect();
        let right = rules.iter().map(|r| id(&r.right_conditions)).collect();
        let (edge_start, edge_end) = (id(edge_start), id(edge_end));
        ConditionIds {
            left,
            right,
            edge_start,
            edge_end,
            uses_form,
        }
    }
}

/// A node of the surface trie.
#[derive(Debug, Clone, Default)]
struct SurfaceNode {
    /// Next character and child node, sorted by character.
    children: Vec<(char, u32)>,
    /// The surface ending here, if any (index into `surfaces`).
    surface: Option<u32>,
}

/// A node of a left-end trie.
#[derive(Debug, Clone, Default)]
pub(crate) struct LeftNode {
    /// Next byte and child node, sorted by byte.
    pub(crate) children: Vec<(u8, u32)>,
    /// The run of instances (`start..end` in [`SurfaceInstances::instances`])
    /// whose left end ends here.
    pub(crate) group: Option<(u32, u32)>,
}

/// The instances of one surface.
#[derive(Debug, Clone, Default)]
pub(crate) struct SurfaceInstances {
    /// Instance indexes, by left end, then by index.
    pub(crate) instances: Vec<usize>,
    /// Byte trie of the left ends; node 0 is the root (the empty left end).
    pub(crate) lefts: Vec<LeftNode>,
}

/// Every instance surface of a rule-set, indexed for the lattice.
#[derive(Debug, Clone, Default)]
pub(crate) struct SurfaceTrie {
    nodes: Vec<SurfaceNode>,
    surfaces: Vec<SurfaceInstances>,
    /// Per instance: a small number standing for its right start (equal
    /// right starts get equal numbers; the empty one is 0).
    right_ids: Vec<u32>,
    /// Per instance: surface length in characters.
    surface_chars: Vec<usize>,
}

impl SurfaceTrie {
    /// Builds the index from the surface lists (each sorted already) and
    /// the instances' right starts and surface lengths.
    pub(crate) fn build<'s>(
        lists: impl Iterator<Item = (&'s str, &'s [usize])>,
        lefts: &[&str],
        rights: &[&str],
        surface_chars: Vec<usize>,
    ) -> SurfaceTrie {
        let lists: Vec<(&str, &[usize])> = lists.collect();
        // Room for the worst case (no shared prefixes), so the node lists
        // never move while they grow.
        let mut nodes = Vec::with_capacity(1 + lists.iter().map(|(s, _)| s.len()).sum::<usize>());
        nodes.push(SurfaceNode::default());
        let mut trie = SurfaceTrie {
            nodes,
            surfaces: Vec::with_capacity(lists.len()),
            ..SurfaceTrie::default()
        };
        for (surface, list) in lists {
            let node = insert_path(&mut trie.nodes, surface.chars(), |n| &mut n.children);
            trie.nodes[node].surface = Some(trie.surfaces.len() as u32);
            trie.surfaces.push(SurfaceInstances::new(list, lefts));
        }
        let mut seen: rustc_hash::FxHashMap<&str, u32> = Default::default();
        seen.insert("", 0);
        trie.right_ids = rights
            .iter()
            .map(|r| {
                let next = seen.len() as u32;
                *seen.entry(r).or_insert(next)
            })
            .collect();
        trie.surface_chars = surface_chars;
        trie
    }

    /// Calls `found(surface, chars)` for every surface that is the text
    /// `chars` starts with, shortest first, where `accept(len)` says a match
    /// of `len` characters may end there.
    pub(crate) fn matches(
        &self,
        chars: &[char],
        max: usize,
        mut accept: impl FnMut(usize) -> bool,
        mut found: impl FnMut(u32, usize),
    ) {
        let mut node = 0usize;
        let mut len = 0usize;
        loop {
            if let Some(s) = self.nodes[node].surface {
                if accept(len) {
                    found(s, len);
                }
            }
            if len >= max || len >= chars.len() {
                return;
            }
            let c = chars[len];
            match self.nodes[node].children.binary_search_by_key(&c, |x| x.0) {
                Ok(i) => node = self.nodes[node].children[i].1 as usize,
                Err(_) => return,
            }
            len += 1;
        }
    }

    /// The instances of a surface.
    pub(crate) fn surface(&self, id: u32) -> &SurfaceInstances {
        &self.surfaces[id as usize]
    }

    /// The number standing for an instance's right start.
    pub(crate) fn right_id(&self, instance: usize) -> u32 {
        self.right_ids[instance]
    }

    /// An instance's surface length in characters.
    pub(crate) fn surface_chars(&self, instance: usize) -> usize {
        self.surface_chars[instance]
    }
}

impl SurfaceInstances {
    fn new(list: &[usize], lefts: &[&str]) -> SurfaceInstances {
        let mut lefts_room = 1;
        let mut previous: Option<&str> = None;
        for &i in list {
            if previous != Some(lefts[i]) {
                lefts_room += lefts[i].len();
                previous = Some(lefts[i]);
            }
        }
        let mut out = SurfaceInstances {
            instances: list.to_vec(),
            lefts: Vec::with_capacity(lefts_room),
        };
        out.lefts.push(LeftNode::default());
        let mut i = 0;
        while i < list.len() {
            let left = lefts[list[i]];
            let mut j = i + 1;
            while j < list.len() && lefts[list[j]] == left {
                j += 1;
            }
            let node = insert_path(&mut out.lefts, left.bytes(), |n| &mut n.children);
            out.lefts[node].group = Some((i as u32, j as u32));
            i = j;
        }
        out
    }
}

/// Walks `path` from the root (node 0) of a trie stored as a list of
/// nodes, adding the nodes that are missing; returns the last node.
fn insert_path<K: Ord + Copy, N: Default>(
    nodes: &mut Vec<N>,
    path: impl Iterator<Item = K>,
    children: impl Fn(&mut N) -> &mut Vec<(K, u32)>,
) -> usize {
    let mut node = 0usize;
    for key in path {
        let next = nodes.len();
        let list = children(&mut nodes[node]);
        node = match list.binary_search_by_key(&key, |x| x.0) {
            Ok(i) => list[i].1 as usize,
            Err(i) => {
                list.insert(i, (key, next as u32));
                nodes.push(N::default());
                next
            }
        };
    }
    node
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_surfaces_shortest_first_and_lefts_in_order() {
        let lefts = ["", "e", "en", "", "e"];
        let rights = ["", "", "", "x", "x"];
        let lists: Vec<(&str, Vec<usize>)> =
            vec![("", vec![0, 1, 2]), ("s", vec![3]), ("se", vec![4])];
        let trie = SurfaceTrie::build(
            lists.iter().map(|(s, l)| (*s, l.as_slice())),
            &lefts,
            &rights,
            vec![0, 0, 0, 1, 2],
        );
        let chars: Vec<char> = "sex".chars().collect();
        let mut got = Vec::new();
        trie.matches(&chars, 5, |_| true, |s, len| got.push((s, len)));
        assert_eq!(got, vec![(0, 0), (1, 1), (2, 2)]);
        let empty = trie.surface(0);
        assert_eq!(empty.lefts[0].group, Some((0, 1)));
        assert_eq!(trie.right_id(3), trie.right_id(4));
        assert_eq!(trie.right_id(0), 0);
    }
}
