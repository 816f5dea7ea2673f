//! Remembered steps of the lexicon index.
//!
//! Every input of a batch walks the index from its root along its letters,
//! and the junctions' left ends are tried from the node each word reaches, so
//! the same few thousand nodes are stepped from again and again. Each step of
//! the FST decodes the node it starts from and the node it reaches; a
//! [`StepCache`] keeps, for recent (node, byte) pairs, the node reached (or
//! that there is none) and the entry ending there, so that a repeated step is
//! one table lookup. It is a direct-mapped table of fixed size: a new pair
//! replaces the one in its slot, so memory stays bounded whatever the input.
//!
//! A cache belongs to one lexicon at a time ([`Lexicon::reset_step_cache`]
//! empties it for another) and to one thread (the lattice keeps one per
//! thread).

use super::{Cursor, Lexicon};
use fst::raw::Output;
use std::sync::atomic::{AtomicU64, Ordering};

/// log2 of the number of slots (32 bytes each: 2 MiB).
const SLOT_BITS: u32 = 16;
/// Marks an empty slot, a missing transition or a node where no entry ends.
const NONE: u64 = u64::MAX;

/// A number for every lexicon made in this process, so that a cache made for
/// one is never used for another that happens to live at the same address.
static NEXT_LEXICON_ID: AtomicU64 = AtomicU64::new(1);

/// A fresh lexicon identity.
pub(super) fn next_lexicon_id() -> u64 {
    NEXT_LEXICON_ID.fetch_add(1, Ordering::Relaxed)
}

#[derive(Clone, Copy)]
struct Slot {
    /// `(node address << 8 | byte) + 1`, or [`NONE`].
    key: u64,
    /// Address of the node reached, or [`NONE`] when there is no such step.
    next: u64,
    /// The step's output (added to the cursor's).
    out: u64,
    /// The reached node's final output when an entry ends there, else [`NONE`].
    last: u64,
}

const EMPTY: Slot = Slot {
    key: NONE,
    next: NONE,
    out: 0,
    last: NONE,
};

/// Recent steps of one lexicon's index (see the module docs).
#[derive(Default)]
pub struct StepCache {
    /// The lexicon the slots were filled from (0: none yet).
    owner: u64,
    slots: Vec<Slot>,
}

impl std::fmt::Debug for StepCache {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("StepCache")
            .field("owner", &self.owner)
            .field("slots", &self.slots.len())
            .finish()
    }
}

impl StepCache {
    fn slot_of(key: u64) -> usize {
        (key.wrapping_mul(0x9E37_79B9_7F4A_7C15) >> (64 - SLOT_BITS)) as usize
    }
}

impl Lexicon {
    /// Makes `cache` ready for walks of this lexicon: emptied (and allocated)
    /// unless it already belongs to it.
    pub fn reset_step_cache(&self, cache: &mut StepCache) {
        if cache.owner == self.id && !cache.slots.is_empty() {
            return;
        }
        cache.owner = self.id;
        cache.slots.clear();
        cache.slots.resize(1 << SLOT_BITS, EMPTY);
    }

    /// One byte from `from`: the cursor reached and the entry that ends
    /// there, as [`step`](Self::step) and [`entry_at`](Self::entry_at)
    /// give, looked up in `cache` first (which must have been made ready
    /// with [`reset_step_cache`](Self::reset_step_cache)).
    pub fn step_cached(
        &self,
        cache: &mut StepCache,
        from: Cursor,
        byte: u8,
    ) -> Option<(Cursor, Option<usize>)> {
        debug_assert!(cache.owner == self.id, "step cache of another lexicon");
        let key = ((from.addr as u64) << 8 | u64::from(byte)).wrapping_add(1);
        let index = StepCache::slot_of(key);
        let slot = match cache.slots.get(index) {
            Some(slot) if slot.key == key => *slot,
            Some(_) => {
                let slot = self.decode_step(from, byte, key);
                cache.slots[index] = slot;
                slot
            }
            // Not made ready: step without remembering.
            None => self.decode_step(from, byte, key),
        };
        if slot.next == NONE {
            return None;
        }
        let output = Output::new(from.output).cat(Output::new(slot.out)).value();
        let cursor = Cursor {
            addr: slot.next as usize,
            output,
        };
        let entry = (slot.last != NONE)
            .then(|| Output::new(output).cat(Output::new(slot.last)).value() as usize);
        Some((cursor, entry))
    }

    /// The step as the index gives it, for a slot.
    fn decode_step(&self, from: Cursor, byte: u8, key: u64) -> Slot {
        let fst = self.index.as_fst();
        let node = fst.node(from.addr);
        let Some(i) = node.find_input(byte) else {
            return Slot {
                key,
                next: NONE,
                out: 0,
                last: NONE,
            };
        };
        let t = node.transition(i);
        let reached = fst.node(t.addr);
        Slot {
            key,
            next: t.addr as u64,
            out: t.out.value(),
            last: if reached.is_final() {
                reached.final_output().value()
            } else {
                NONE
            },
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lexicon::LexiconBuilder;
    use crate::normalize::Normalizer;

    fn lexicon(tsv: &str) -> Lexicon {
        let mut b = LexiconBuilder::new(&Normalizer::default());
        b.add_tsv("t", tsv.as_bytes()).unwrap();
        b.build().unwrap()
    }

    /// Every prefix of every word, stepped with and without the cache, twice
    /// (the second time from the cache).
    #[test]
    fn cached_steps_agree_with_the_index() {
        let lex = lexicon("arbeit\t10\narbeitsamt\t2\namt\t5\narm\t3\nax\t1\n");
        let mut cache = StepCache::default();
        lex.reset_step_cache(&mut cache);
        for _ in 0..2 {
            for word in ["arbeitsamtx", "armee", "axt", "amt", "b", "ärger"] {
                let (mut plain, mut cached) = (lex.root(), lex.root());
                for &b in word.as_bytes() {
                    let expect = lex.step(plain, b);
                    let got = lex.step_cached(&mut cache, cached, b);
                    assert_eq!(got.map(|(c, _)| c), expect);
                    let Some(next) = expect else { break };
                    assert_eq!(got.and_then(|(_, e)| e), lex.entry_at(next));
                    (plain, cached) = (next, next);
                }
            }
        }
    }

    #[test]
    fn a_cache_moves_to_another_lexicon_emptied() {
        let one = lexicon("ab\t1\n");
        let other = lexicon("ac\t1\n");
        let mut cache = StepCache::default();
        one.reset_step_cache(&mut cache);
        let a = one.step_cached(&mut cache, one.root(), b'a').unwrap().0;
        assert!(one.step_cached(&mut cache, a, b'b').is_some());
        other.reset_step_cache(&mut cache);
        let a = other.step_cached(&mut cache, other.root(), b'a').unwrap().0;
        assert!(other.step_cached(&mut cache, a, b'b').is_none());
        assert!(other.step_cached(&mut cache, a, b'c').unwrap().1.is_some());
    }

    #[test]
    fn an_unprepared_cache_still_steps() {
        let lex = lexicon("ab\t1\n");
        let mut cache = StepCache::default();
        cache.owner = lex.id;
        let a = lex.step_cached(&mut cache, lex.root(), b'a').unwrap().0;
        assert_eq!(lex.step_cached(&mut cache, a, b'b').unwrap().1, Some(0));
    }
}
