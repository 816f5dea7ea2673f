use juncture::lattice::ScopeFilter;
use juncture::lexicon::Lexicon;
use juncture::rules::{compile_named, CompileOptions};
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
fn main() {
    let rules = compile_named("german", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
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
    while out.len() < 100_000 && tries < 2_000_000 {
        tries += 1;
        let a = nouns[(rng.next() as usize) % nouns.len()];
        let b = nouns[(rng.next() as usize) % nouns.len()];
        let joined = juncture::proof::join(&rules, &lexicon, &[a, b], ScopeFilter::Compound, 20);
        if let Some(j) = joined
            .results
            .iter()
            .find(|j| !j.surface.contains(['-', ' ']))
        {
            out.insert(j.surface.clone());
        }
    }
    let types: Vec<String> = out.into_iter().collect();
    std::fs::write("/tmp/compound-types.txt", types[..3000].join("\n") + "\n").unwrap();
    let mut cumulative = Vec::new();
    let mut total = 0.0;
    for e in lexicon.entries() {
        total += e.frequency;
        cumulative.push(total);
    }
    let mut rng = Lcg(42);
    let mut seen = std::collections::HashSet::new();
    let mut words = Vec::new();
    while words.len() < 5000 {
        let x = rng.unit() * total;
        let i = cumulative
            .partition_point(|&c| c < x)
            .min(lexicon.len() - 1);
        let f = lexicon.entry(i).form.clone();
        if seen.insert(f.clone()) {
            words.push(f);
        }
    }
    std::fs::write("/tmp/stream-words.txt", words.join("\n") + "\n").unwrap();
}
