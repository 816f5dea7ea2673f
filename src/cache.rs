//! A cache of recent word types for running text, where the same words come
//! back again and again. Bounded, in two generations, so that the frequent
//! words stay when it is full.

use crate::analyzer::{Analyzer, SplitRecord};
use std::collections::HashMap;
use std::sync::Arc;

/// Values of recent distinct inputs, at most `capacity` of them, in two
/// generations: when the newer one is half the capacity, the older one is
/// dropped and the newer one becomes it; an input found in the older one
/// moves back to the newer. Frequent words (natural text repeats a few
/// heavily) stay, and memory stays bounded. A capacity of 0 keeps nothing.
#[derive(Debug)]
pub struct TypeCache<V> {
    capacity: usize,
    newer: HashMap<String, V>,
    older: HashMap<String, V>,
}

impl<V: Clone> TypeCache<V> {
    /// An empty cache of at most `capacity` inputs.
    pub fn new(capacity: usize) -> Self {
        TypeCache {
            capacity,
            newer: HashMap::new(),
            older: HashMap::new(),
        }
    }

    /// The value of `key`, if it is kept.
    pub fn get(&mut self, key: &str) -> Option<V> {
        if let Some(v) = self.newer.get(key) {
            return Some(v.clone());
        }
        let (key, v) = self.older.remove_entry(key)?;
        self.insert_owned(key, v.clone());
        Some(v)
    }

    /// Keeps `value` for `key` (nothing with a capacity of 0).
    pub fn insert(&mut self, key: &str, value: V) {
        if self.capacity > 0 {
            self.insert_owned(key.to_string(), value);
        }
    }

    /// How many inputs are kept.
    pub fn len(&self) -> usize {
        self.newer.len() + self.older.len()
    }

    /// Whether nothing is kept.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    fn insert_owned(&mut self, key: String, value: V) {
        if self.newer.len() >= self.capacity.div_ceil(2) {
            self.older = std::mem::take(&mut self.newer);
        }
        self.newer.insert(key, value);
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
