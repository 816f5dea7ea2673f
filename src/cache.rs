//! A cache of recent word types for running text, where the same words come
//! back again and again. Bounded: when full it is cleared (cheap, and natural
//! text refills it with its frequent words at once).

use crate::analyzer::{Analyzer, SplitRecord};
use std::collections::HashMap;
use std::sync::Arc;

/// An analyzer with a bounded cache of results per input string.
#[derive(Debug)]
pub struct CachedAnalyzer<'a> {
    /// The analyzer.
    pub analyzer: Analyzer<'a>,
    cache: HashMap<String, Arc<SplitRecord>>,
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
            cache: HashMap::new(),
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
            return r.clone();
        }
        self.misses += 1;
        let record = Arc::new(self.analyzer.split(input, self.top));
        if self.cache.len() >= self.capacity {
            self.cache.clear();
        }
        self.cache.insert(input.to_string(), record.clone());
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
