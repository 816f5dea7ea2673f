//! Benchmarks of the full analysis against a bare-scan baseline measured in
//! the same run (every lexicon entry at every position of each token, the same
//! index, no junction rules).
//!
//! Inputs, all generated here from the bundled data (nothing invented by hand):
//! - `running-text`: a token stream sampled with the German lexicon's own
//!   frequency distribution (Zipf-shaped like running text), split with the
//!   type cache;
//! - `distinct-types`: distinct compound types made by joining pairs of
//!   lexicon nouns forward with the German rules, written as one word
//!   (cold: no cache);
//! - `bare-scan-baseline`: the baseline over the same distinct types, walking
//!   the index with its steps remembered as the analysis does
//!   (`bare-scan-uncached`: every step decoded from the index);
//! - `sanskrit-long-compound`: a constructed compound of 400+ characters,
//!   exact count and top 10.
//!
//! Run: `cargo bench --bench split` (set JUNCTURE_BENCH_TOKENS to change the
//! stream length; default 1,000,000 tokens, with 100,000 distinct compound types;
//! set JUNCTURE_BENCH_WRITE=DIR to also write the two German inputs to
//! DIR/running-text.txt and DIR/compound-types.txt).

/// The allocator of the `juncture` binary, so that the numbers are the CLI's.
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

use criterion::{black_box, criterion_group, criterion_main, Criterion, Throughput};
use juncture::analyzer::Analyzer;
use juncture::cache::CachedAnalyzer;
use juncture::lattice::ScopeFilter;
use juncture::lexicon::Lexicon;
use juncture::rules::{compile_named, CompileOptions, RuleSet};

struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        self.0 >> 11
    }
    fn unit(&mut self) -> f64 {
        (self.next() as f64) / ((1u64 << 53) as f64)
    }
}

fn load(name: &str) -> Option<(RuleSet, Lexicon)> {
    let rules = compile_named(name, &CompileOptions::default()).ok()?;
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).ok()?;
    Some((rules, lexicon))
}

/// Tokens sampled in proportion to lexicon frequency.
fn token_stream(lexicon: &Lexicon, n: usize) -> Vec<String> {
    let mut cumulative = Vec::with_capacity(lexicon.len());
    let mut total = 0.0;
    for e in lexicon.entries() {
        total += e.frequency;
        cumulative.push(total);
    }
    let mut rng = Lcg(42);
    (0..n)
        .map(|_| {
            let x = rng.unit() * total;
            let i = cumulative
                .partition_point(|&c| c < x)
                .min(lexicon.len() - 1);
            lexicon.entry(i).form.clone()
        })
        .collect()
}

/// Distinct compound types: pairs of nouns joined by the rules' cheapest
/// closed surface (written as one word: no hyphen, no space).
fn compound_types(rules: &RuleSet, lexicon: &Lexicon, n: usize) -> Vec<String> {
    let nouns: Vec<&str> = lexicon
        .entries()
        .filter(|e| {
            e.key.chars().count() >= 4 && e.readings.iter().any(|r| r.get("pos") == Some("noun"))
        })
        .take(20_000)
        .map(|e| e.form.as_str())
        .collect();
    let mut rng = Lcg(7);
    let mut out = std::collections::BTreeSet::new();
    let mut tries = 0;
    while out.len() < n && tries < n * 20 && nouns.len() > 1 {
        tries += 1;
        let a = nouns[(rng.next() as usize) % nouns.len()];
        let b = nouns[(rng.next() as usize) % nouns.len()];
        let joined = juncture::proof::join(rules, lexicon, &[a, b], ScopeFilter::Compound, 20);
        if let Some(j) = joined
            .results
            .iter()
            .find(|j| !j.surface.contains(['-', ' ']))
        {
            out.insert(j.surface.clone());
        }
    }
    out.into_iter().collect()
}

fn bench(c: &mut Criterion) {
    // As the `juncture` binary does (see src/main.rs): freed memory is kept.
    // SAFETY: sets a global option of the allocator; any value is valid.
    unsafe { libmimalloc_sys::mi_option_set(15, -1) };
    // And no transparent huge pages (see `no_transparent_huge_pages` there).
    #[cfg(target_os = "linux")]
    // SAFETY: one integer argument; it changes how pages are backed only.
    unsafe {
        libc::prctl(libc::PR_SET_THP_DISABLE, 1, 0, 0, 0);
    }
    let tokens: usize = std::env::var("JUNCTURE_BENCH_TOKENS")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(1_000_000);
    if let Some((rules, lexicon)) = load("german") {
        let stream = token_stream(&lexicon, tokens);
        let types = compound_types(&rules, &lexicon, 100_000);
        if let Ok(dir) = std::env::var("JUNCTURE_BENCH_WRITE") {
            // The inputs as files, one token per line, for profiling the CLI.
            let dir = std::path::Path::new(&dir);
            let _ = std::fs::write(dir.join("running-text.txt"), stream.join("\n") + "\n");
            let _ = std::fs::write(dir.join("compound-types.txt"), types.join("\n") + "\n");
        }
        let mut g = c.benchmark_group("german");
        g.sample_size(10);
        g.throughput(Throughput::Elements(stream.len() as u64));
        g.bench_function("running-text-cached", |b| {
            b.iter(|| {
                let mut cached = CachedAnalyzer::new(Analyzer::new(&rules, &lexicon), 1, 100_000);
                let mut parts = 0usize;
                for t in &stream {
                    parts += cached
                        .split(t)
                        .analyses
                        .first()
                        .map_or(0, |a| a.parts.len());
                }
                black_box(parts)
            })
        });
        g.throughput(Throughput::Elements(types.len() as u64));
        g.bench_function("distinct-types-cold", |b| {
            let analyzer = Analyzer::new(&rules, &lexicon);
            b.iter(|| {
                types
                    .iter()
                    .map(|t| analyzer.split(t, 1).analyses.len())
                    .sum::<usize>()
            })
        });
        // The baseline walks the index as the lattice does, with the steps
        // remembered (the analysis keeps them per thread).
        g.bench_function("bare-scan-baseline", |b| {
            let mut steps = juncture::lexicon::StepCache::default();
            b.iter(|| {
                types
                    .iter()
                    .map(|t| {
                        let chars: Vec<char> = rules.normalizer.normalize(t).chars().collect();
                        lexicon.bare_scan_cached(&mut steps, &chars)
                    })
                    .sum::<usize>()
            })
        });
        g.bench_function("bare-scan-uncached", |b| {
            b.iter(|| {
                types
                    .iter()
                    .map(|t| {
                        let chars: Vec<char> = rules.normalizer.normalize(t).chars().collect();
                        lexicon.bare_scan(&chars)
                    })
                    .sum::<usize>()
            })
        });
        g.finish();
    }
    if let Some((rules, lexicon)) = load("sanskrit") {
        // deva-indra-… style members joined by the rules' own cheapest surfaces.
        let members = [
            "deva", "indra", "rāja", "putra", "vana", "gaja", "aśva", "nagara", "jala", "phala",
        ];
        let mut parts: Vec<&str> = Vec::new();
        let mut i = 0;
        while parts.iter().map(|p| p.chars().count()).sum::<usize>() < 420 {
            parts.push(members[i % members.len()]);
            i += 1;
        }
        let joined = juncture::proof::join(&rules, &lexicon, &parts, ScopeFilter::Compound, 1);
        if let Some(surface) = joined.results.first().map(|j| j.surface.clone()) {
            let analyzer = Analyzer::new(&rules, &lexicon);
            let mut g = c.benchmark_group("sanskrit");
            g.sample_size(10);
            g.bench_function("long-compound-count-top10", |b| {
                b.iter(|| analyzer.split(&surface, 10).count.0.bits())
            });
            g.finish();
        }
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
