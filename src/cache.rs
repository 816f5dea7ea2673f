//! A cache of recent word types for running text, where the same words come
//! back again and again. Bounded, in two generations, so that the frequent
//! words stay when it is full.

use crate::analyzer::{Analyzer, SplitRecord};
use rustc_hash::FxHashMap;
use std::sync::Arc;

/// Values of recent distinct inputs, at most `capacity` of them and at most
/// `budget` bytes by their own reckoning, in two generations: when the newer
/// one holds half the capacity or half the budget, the older one is dropped
/// and the newer one becomes it; an input found in the older one moves back
/// to the newer. Frequent words (natural text repeats a few heavily) stay,
/// and memory stays bounded. A capacity of 0 keeps nothing.
#[derive(Debug)]
pub struct TypeCache<V> {
    capacity: usize,
    budget: usize,
    newer: Generation<V>,
    older: Generation<V>,
}

/// One generation of a [`TypeCache`]: values with their sizes, and the sum.
#[derive(Debug)]
struct Generation<V> {
    /// Keyed by the input with a fast non-cryptographic hash: the keys are
    /// the tool's own input, and a flooded table only slows it down.
    values: FxHashMap<String, (V, usize)>,
    bytes: usize,
}

impl<V> Default for Generation<V> {
    fn default() -> Self {
        Generation {
            values: FxHashMap::default(),
            bytes: 0,
        }
    }
}

/// What a kept input costs besides its key and value: the table slot, the
/// key's heap block and the value's (common practice for a hash map of
/// strings, rounded up).
const ENTRY_OVERHEAD: usize = 64;

impl<V: Clone> TypeCache<V> {
    /// An empty cache of at most `capacity` inputs (no byte budget).
    pub fn new(capacity: usize) -> Self {
        TypeCache::with_budget(capacity, usize::MAX)
    }

    /// An empty cache of at most `capacity` inputs and `budget` bytes, as
    /// counted by [`insert_sized`](Self::insert_sized).
    pub fn with_budget(capacity: usize, budget: usize) -> Self {
        TypeCache {
            capacity,
            budget,
            newer: Generation::default(),
            older: Generation::default(),
        }
    }

    /// The value of `key`, if it is kept.
    pub fn get(&mut self, key: &str) -> Option<V> {
        if let Some((v, _)) = self.newer.values.get(key) {
            return Some(v.clone());
        }
        let (key, (v, size)) = self.older.values.remove_entry(key)?;
        self.older.bytes -= size;
        self.insert_owned(key, v.clone(), size);
        Some(v)
    }

    /// Keeps `value` for `key` (nothing with a capacity of 0), counting only
    /// the key and a fixed overhead against the budget.
    pub fn insert(&mut self, key: &str, value: V) {
        self.insert_sized(key, value, 0);
    }

    /// Keeps `value`, which takes `value_bytes` of memory besides itself,
    /// for `key` (nothing with a capacity of 0, or when the value alone
    /// would take more than half the budget).
    pub fn insert_sized(&mut self, key: &str, value: V, value_bytes: usize) {
        let size = key
            .len()
            .saturating_add(value_bytes)
            .saturating_add(ENTRY_OVERHEAD);
        if self.capacity > 0 && size <= self.budget / 2 {
            self.insert_owned(key.to_string(), value, size);
        }
    }

    /// How many inputs are kept.
    pub fn len(&self) -> usize {
        self.newer.values.len() + self.older.values.len()
    }

    /// Whether nothing is kept.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The bytes the kept inputs take, as counted against the budget.
    pub fn bytes(&self) -> usize {
        self.newer.bytes + self.older.bytes
    }

    fn insert_owned(&mut self, key: String, value: V, size: usize) {
        if self.newer.values.len() >= self.capacity.div_ceil(2)
            || self.newer.bytes.saturating_add(size) > self.budget / 2
        {
            self.older = std::mem::take(&mut self.newer);
        }
        self.newer.bytes += size;
        if let Some((_, old)) = self.newer.values.insert(key, (value, size)) {
            self.newer.bytes -= old;
        }
    }
}

/// An analyzer with a bounded cache of results per input string.
#[derive(Debug)]
pub struct CachedAnalyzer<'a> {
    /// The analyzer.
    pub analyzer: Analyzer<'a>,
    cache: TypeCache<Arc<SplitRecord>>,
    capacity: usize,
    top: usize,
    hits: u64,
    misses: u64,
}

impl<'a> CachedAnalyzer<'a> {
    /// Caches up to `capacity` distinct inputs (0 disables the cache).
    pub fn new(analyzer: Analyzer<'a>, top: usize, capacity: usize) -> Self {
        CachedAnalyzer {
            analyzer,
            cache: TypeCache::new(capacity),
            capacity,
            top,
            hits: 0,
            misses: 0,
        }
    }

    /// Splits one input, from the cache when it was seen recently.
    pub fn split(&mut self, input: &str) -> Arc<SplitRecord> {
        if self.capacity == 0 {
            return Arc::new(self.analyzer.split(input, self.top));
        }
        if let Some(r) = self.cache.get(input) {
            self.hits += 1;
            return r;
        }
        self.misses += 1;
        let record = Arc::new(self.analyzer.split(input, self.top));
        self.cache.insert(input, record.clone());
        record
    }

    /// (hits, misses) so far.
    pub fn stats(&self) -> (u64, u64) {
        (self.hits, self.misses)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lexicon::Lexicon;
    use crate::rules::{compile_named, CompileOptions};

    #[test]
    fn the_type_cache_keeps_frequent_words_and_stays_bounded() {
        let mut cache = TypeCache::new(4);
        cache.insert("der", 1);
        cache.insert("und", 2);
        // Full generation: it becomes the older one.
        cache.insert("a", 3);
        assert_eq!(cache.get("der"), Some(1)); // moved back to the newer
        cache.insert("b", 4);
        cache.insert("c", 5);
        // `und` was not seen again: it is gone; `der` stays.
        assert_eq!(cache.get("und"), None);
        assert_eq!(cache.get("der"), Some(1));
        for i in 0..100 {
            cache.insert(&format!("w{i}"), i);
            assert!(cache.len() <= 4);
        }
        let mut off = TypeCache::new(0);
        off.insert("x", 1);
        assert_eq!(off.get("x"), None);
    }

    #[test]
    fn the_byte_budget_bounds_the_cache_and_keeps_frequent_words() {
        // Each entry costs its key, its value's bytes and the overhead.
        let each = 1 + 100 + ENTRY_OVERHEAD;
        let mut cache = TypeCache::with_budget(1000, 4 * each);
        cache.insert_sized("a", 1, 100);
        cache.insert_sized("b", 2, 100);
        assert_eq!(cache.bytes(), 2 * each);
        // The newer generation is at half the budget: it becomes the older.
        cache.insert_sized("c", 3, 100);
        assert_eq!(cache.get("a"), Some(1));
        cache.insert_sized("d", 4, 100);
        cache.insert_sized("e", 5, 100);
        assert_eq!(cache.get("b"), None);
        assert_eq!(cache.get("a"), Some(1));
        for i in 0..100 {
            cache.insert_sized(&format!("{}", i % 10), i, 100);
            assert!(cache.bytes() <= 4 * each, "{} bytes", cache.bytes());
        }
        // A value bigger than half the budget is not kept at all.
        cache.insert_sized("huge", 0, 10 * each);
        assert_eq!(cache.get("huge"), None);
        // Replacing a key's value counts it once.
        let mut one = TypeCache::with_budget(10, 100 * each);
        one.insert_sized("a", 1, 100);
        one.insert_sized("a", 2, 100);
        assert_eq!((one.len(), one.bytes(), one.get("a")), (1, each, Some(2)));
    }

    #[test]
    fn cached_results_equal_fresh_ones() {
        let rules = compile_named("demo", &CompileOptions::default()).unwrap();
        let (lex, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
        let mut cached = CachedAnalyzer::new(Analyzer::new(&rules, &lex), 5, 2);
        for w in [
            "tormek", "solanavi", "tormek", "kalom", "tormek", "solanavi",
        ] {
            let a = cached.split(w);
            let b = Analyzer::new(&rules, &lex).split(w, 5);
            assert_eq!(
                serde_json::to_string(&*a).unwrap(),
                serde_json::to_string(&b).unwrap()
            );
        }
        assert!(cached.stats().0 >= 1);
    }
}
