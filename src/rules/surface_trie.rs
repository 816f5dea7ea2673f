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
#[derive(Debug, Clone, Default, serde::Serialize, serde::Deserialize)]
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

    /// Whether there is a number per rule on each side and every number
    /// has an entry in `uses_form`.
    pub(crate) fn is_consistent(&self, rules: usize) -> bool {
        let known = |id: &u32| (*id as usize) < self.uses_form.len();
        self.left.len() == rules
            && self.right.len() == rules
            && self.left.iter().chain(&self.right).all(known)
            && known(&self.edge_start)
            && known(&self.edge_end)
    }
}

/// A node of the surface trie while it is built.
#[derive(Debug, Clone, Default)]
struct SurfaceNode {
    /// Next character and child node, sorted by character.
    children: Vec<(char, u32)>,
    /// The surface ending here, if any (index into the surfaces).
    surface: Option<u32>,
}

/// A node of a left-end trie while it is built.
#[derive(Debug, Clone, Default)]
struct LeftNode {
    /// Next byte and child node, sorted by byte.
    children: Vec<(u8, u32)>,
    /// The run of instances (`start..end` among the surface's instances)
    /// whose left end ends here.
    group: Option<(u32, u32)>,
}

/// Stands for "none" in the number columns.
const NONE: u32 = u32::MAX;

/// Every instance surface of a rule-set, indexed for the lattice. Stored as
/// flat columns of numbers (a few vectors in all, not one per node), so a
/// compiled rule-set reads them as blocks of bytes.
#[derive(Debug, Clone, Default, serde::Serialize, serde::Deserialize)]
pub(crate) struct SurfaceTrie {
    /// Per surface-trie node `n`: its children are
    /// `child_chars/child_nodes[node_children[n]..node_children[n + 1]]`
    /// (sorted by character). One more entry than nodes.
    #[serde(with = "u32_column")]
    node_children: Vec<u32>,
    /// Per node: the surface ending there, or [`NONE`].
    #[serde(with = "u32_column")]
    node_surface: Vec<u32>,
    #[serde(with = "u32_column")]
    child_chars: Vec<u32>,
    #[serde(with = "u32_column")]
    child_nodes: Vec<u32>,
    /// Per surface `s`: its instances are
    /// `instances[surface_instances[s]..surface_instances[s + 1]]`, by left
    /// end, then by index.
    #[serde(with = "u32_column")]
    surface_instances: Vec<u32>,
    #[serde(with = "u32_column")]
    instances: Vec<u32>,
    /// The instances as `usize`, as the lattice takes them.
    #[serde(skip)]
    instances_usize: Vec<usize>,
    /// Per surface: its left-end trie is the nodes
    /// `surface_lefts[s]..surface_lefts[s + 1]`; the first is its root (the
    /// empty left end). Node numbers inside a left trie count from its root.
    #[serde(with = "u32_column")]
    surface_lefts: Vec<u32>,
    /// Per left node (all surfaces together): its children are
    /// `left_child_bytes/left_child_nodes[left_children[l]..left_children[l + 1]]`.
    #[serde(with = "u32_column")]
    left_children: Vec<u32>,
    /// Per left node: the start of its group of instances, or [`NONE`].
    #[serde(with = "u32_column")]
    left_group_from: Vec<u32>,
    /// Per left node: the end of its group of instances.
    #[serde(with = "u32_column")]
    left_group_to: Vec<u32>,
    #[serde(with = "u32_column")]
    left_child_bytes: Vec<u32>,
    #[serde(with = "u32_column")]
    left_child_nodes: Vec<u32>,
    /// Per instance: a small number standing for its right start (equal
    /// right starts get equal numbers; the empty one is 0).
    #[serde(with = "u32_column")]
    right_ids: Vec<u32>,
    /// Per instance: surface length in characters.
    #[serde(with = "u32_column")]
    surface_chars: Vec<u32>,
}

/// One surface of the trie: its instances and its left-end trie.
#[derive(Debug, Clone, Copy)]
pub(crate) struct SurfaceInstances<'t> {
    trie: &'t SurfaceTrie,
    id: usize,
    lefts: usize,
    lefts_len: usize,
}

impl<'t> SurfaceInstances<'t> {
    /// Instance indexes, by left end, then by index.
    pub(crate) fn instances(&self) -> &'t [usize] {
        let trie = self.trie;
        &trie.instances_usize
            [trie.surface_instances[self.id] as usize..trie.surface_instances[self.id + 1] as usize]
    }

    /// Number of nodes of the left-end trie (1: every instance has the
    /// empty left end).
    pub(crate) fn lefts_len(&self) -> usize {
        self.lefts_len
    }

    /// The run of instances (`start..end` in `instances`) whose left end
    /// ends at left node `at`.
    pub(crate) fn group(&self, at: u32) -> Option<(u32, u32)> {
        let l = self.lefts + at as usize;
        let from = self.trie.left_group_from[l];
        (from != NONE).then(|| (from, self.trie.left_group_to[l]))
    }

    /// Next byte and child node of left node `at`, sorted by byte.
    pub(crate) fn children(&self, at: u32) -> impl DoubleEndedIterator<Item = (u8, u32)> + 't {
        let trie = self.trie;
        let l = self.lefts + at as usize;
        let range = trie.left_children[l] as usize..trie.left_children[l + 1] as usize;
        trie.left_child_bytes[range.clone()]
            .iter()
            .zip(&trie.left_child_nodes[range])
            .map(|(&b, &c)| (b as u8, c))
    }
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
        let mut trie = SurfaceTrie::default();
        trie.surface_instances.push(0);
        trie.surface_lefts.push(0);
        trie.left_children.push(0);
        for (surface, list) in lists {
            let node = insert_path(&mut nodes, surface.chars(), |n| &mut n.children);
            let id = trie.surface_instances.len() as u32 - 1;
            nodes[node].surface = Some(id);
            trie.add_surface(list, lefts);
        }
        trie.node_children.push(0);
        for node in &nodes {
            trie.node_surface.push(node.surface.unwrap_or(NONE));
            for &(c, child) in &node.children {
                trie.child_chars.push(c as u32);
                trie.child_nodes.push(child);
            }
            trie.node_children.push(trie.child_chars.len() as u32);
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
        trie.surface_chars = surface_chars.into_iter().map(|c| c as u32).collect();
        trie.finish();
        trie
    }

    /// Fills the columns that are derived, not stored.
    pub(crate) fn finish(&mut self) {
        self.instances_usize = self.instances.iter().map(|&i| i as usize).collect();
    }

    /// Adds one surface's instances and its left-end trie.
    fn add_surface(&mut self, list: &[usize], lefts: &[&str]) {
        let mut lefts_room = 1;
        let mut previous: Option<&str> = None;
        for &i in list {
            if previous != Some(lefts[i]) {
                lefts_room += lefts[i].len();
                previous = Some(lefts[i]);
            }
        }
        let mut nodes: Vec<LeftNode> = Vec::with_capacity(lefts_room);
        nodes.push(LeftNode::default());
        let mut i = 0;
        while i < list.len() {
            let left = lefts[list[i]];
            let mut j = i + 1;
            while j < list.len() && lefts[list[j]] == left {
                j += 1;
            }
            let node = insert_path(&mut nodes, left.bytes(), |n| &mut n.children);
            nodes[node].group = Some((i as u32, j as u32));
            i = j;
        }
        self.instances.extend(list.iter().map(|&i| i as u32));
        self.surface_instances.push(self.instances.len() as u32);
        for node in &nodes {
            let (from, to) = node.group.unwrap_or((NONE, NONE));
            self.left_group_from.push(from);
            self.left_group_to.push(to);
            for &(b, child) in &node.children {
                self.left_child_bytes.push(u32::from(b));
                self.left_child_nodes.push(child);
            }
            self.left_children.push(self.left_child_bytes.len() as u32);
        }
        self.surface_lefts.push(self.left_group_from.len() as u32);
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
        if self.node_surface.is_empty() {
            return;
        }
        let mut node = 0usize;
        let mut len = 0usize;
        loop {
            let s = self.node_surface[node];
            if s != NONE && accept(len) {
                found(s, len);
            }
            if len >= max || len >= chars.len() {
                return;
            }
            let c = chars[len] as u32;
            let range = self.node_children[node] as usize..self.node_children[node + 1] as usize;
            match self.child_chars[range.clone()].binary_search(&c) {
                Ok(i) => node = self.child_nodes[range.start + i] as usize,
                Err(_) => return,
            }
            len += 1;
        }
    }

    /// The instances of a surface.
    pub(crate) fn surface(&self, id: u32) -> SurfaceInstances<'_> {
        let id = id as usize;
        let lefts = self.surface_lefts[id] as usize;
        SurfaceInstances {
            trie: self,
            id,
            lefts,
            lefts_len: self.surface_lefts[id + 1] as usize - lefts,
        }
    }

    /// The number standing for an instance's right start.
    pub(crate) fn right_id(&self, instance: usize) -> u32 {
        self.right_ids[instance]
    }

    /// An instance's surface length in characters.
    pub(crate) fn surface_chars(&self, instance: usize) -> usize {
        self.surface_chars[instance] as usize
    }

    /// Whether every number in the trie points inside it and inside a
    /// rule-set of `instances` instances (checked when a compiled rule-set
    /// is read, so a damaged file cannot make a lookup go out of bounds).
    pub(crate) fn is_consistent(&self, instances: usize) -> bool {
        let nodes = self.node_surface.len();
        let surfaces = self.surface_instances.len().saturating_sub(1);
        let left_nodes = self.left_group_from.len();
        let ranges_ok = |starts: &[u32], items: usize, count: usize| {
            starts.len() == count + 1
                && starts.first() == Some(&0)
                && starts.last().is_some_and(|&l| l as usize == items)
                && starts.windows(2).all(|w| w[0] <= w[1])
        };
        let children_ok = nodes > 0
            && ranges_ok(&self.node_children, self.child_chars.len(), nodes)
            && self.child_nodes.len() == self.child_chars.len()
            && self.child_nodes.iter().all(|&c| (c as usize) < nodes)
            && self
                .node_surface
                .iter()
                .all(|&s| s == NONE || (s as usize) < surfaces);
        let surfaces_ok = ranges_ok(&self.surface_instances, self.instances.len(), surfaces)
            && self.instances.iter().all(|&i| (i as usize) < instances)
            && ranges_ok(&self.surface_lefts, left_nodes, surfaces)
            && self.surface_lefts.windows(2).all(|w| w[0] < w[1]);
        let lefts_ok = surfaces_ok
            && ranges_ok(&self.left_children, self.left_child_bytes.len(), left_nodes)
            && self.left_child_nodes.len() == self.left_child_bytes.len()
            && self.left_group_to.len() == left_nodes
            && self.left_child_bytes.iter().all(|&b| b <= 0xff)
            && (0..surfaces).all(|s| {
                let (first, end) = (
                    self.surface_lefts[s] as usize,
                    self.surface_lefts[s + 1] as usize,
                );
                let len = self.surface_instances[s + 1] - self.surface_instances[s];
                (first..end).all(|l| {
                    let children =
                        self.left_children[l] as usize..self.left_children[l + 1] as usize;
                    let (from, to) = (self.left_group_from[l], self.left_group_to[l]);
                    self.left_child_nodes[children]
                        .iter()
                        .all(|&c| (c as usize) < end - first)
                        && (from == NONE || (from <= to && to <= len))
                })
            });
        children_ok
            && lefts_ok
            && self.right_ids.len() == instances
            && self.surface_chars.len() == instances
    }
}

/// A column of `u32` stored as one block of little-endian bytes.
mod u32_column {
    use serde::{Deserialize, Deserializer, Serializer};

    pub(super) fn serialize<S: Serializer>(column: &[u32], out: S) -> Result<S::Ok, S::Error> {
        let bytes: Vec<u8> = column.iter().flat_map(|v| v.to_le_bytes()).collect();
        out.serialize_bytes(&bytes)
    }

    pub(super) fn deserialize<'de, D: Deserializer<'de>>(input: D) -> Result<Vec<u32>, D::Error> {
        let bytes: &[u8] = Deserialize::deserialize(input)?;
        if bytes.len() % 4 != 0 {
            return Err(serde::de::Error::custom("a number column is cut short"));
        }
        Ok(bytes
            .chunks_exact(4)
            .map(|c| u32::from_le_bytes([c[0], c[1], c[2], c[3]]))
            .collect())
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
        assert_eq!(empty.group(0), Some((0, 1)));
        assert_eq!(empty.instances(), &[0, 1, 2]);
        let children: Vec<(u8, u32)> = empty.children(0).collect();
        assert_eq!(children, vec![(b'e', 1)]);
        assert_eq!(trie.right_id(3), trie.right_id(4));
        assert_eq!(trie.right_id(0), 0);
    }
}
