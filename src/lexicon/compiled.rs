//! The compiled lexicon file: an FST plus an entry table, loaded without
//! parsing. Entries are decoded on first use and cached.
//!
//! Layout (all integers little-endian):
//!
//! ```text
//! magic    8 bytes  "JUNCLEX\0"
//! version  u32      FORMAT_VERSION
//! header   u32 length + JSON {entries, total_frequency, tag_keys, normalizer,
//!          sources, spellings}
//! sets     u32 count, (count + 1) × u32 offsets into the texts, then the
//!          texts: each set of readings as a JSON array of tag maps
//! fst      u64 length + bytes of the fst::Map (form → entry number, in key order)
//! records  entries × 8 bytes: f32 frequency, u32 (reading set << 2 | spelling)
//! ```
//!
//! An entry's key is not stored: entry numbers are ranks in key order, so
//! the FST gives the key of a number back (at each state, take the last
//! transition whose output does not pass the number). Tag sets are interned
//! (`sets`, decoded when an entry that has one is first built: start-up
//! reads nothing of them); the display spelling is coded as 0 = the key, 1 =
//! the key with its first letter capitalised, 2 = listed in `spellings`
//! (sorted by entry number).

use super::{Entry, Lexicon, LexiconError, Tags};
use std::sync::{Arc, OnceLock};

/// Magic bytes at the start of a compiled lexicon.
pub const MAGIC: &[u8; 8] = b"JUNCLEX\0";
/// Version of the file layout; files of another version must be rebuilt.
pub const FORMAT_VERSION: u32 = 2;

/// Bytes of a compiled lexicon: embedded in the binary or read from a file.
#[derive(Clone)]
pub struct IndexBytes {
    data: Data,
    start: usize,
    end: usize,
}

#[derive(Clone)]
enum Data {
    Static(&'static [u8]),
    Shared(Arc<Vec<u8>>),
}

impl std::fmt::Debug for IndexBytes {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "IndexBytes({} bytes)", self.end - self.start)
    }
}

impl IndexBytes {
    /// Wraps owned bytes.
    pub fn owned(bytes: Vec<u8>) -> Self {
        let end = bytes.len();
        IndexBytes {
            data: Data::Shared(Arc::new(bytes)),
            start: 0,
            end,
        }
    }

    /// Wraps bytes embedded in the binary.
    pub fn embedded(bytes: &'static [u8]) -> Self {
        IndexBytes {
            data: Data::Static(bytes),
            start: 0,
            end: bytes.len(),
        }
    }

    fn slice(&self, start: usize, end: usize) -> IndexBytes {
        IndexBytes {
            data: self.data.clone(),
            start: self.start + start,
            end: self.start + end,
        }
    }
}

impl AsRef<[u8]> for IndexBytes {
    fn as_ref(&self) -> &[u8] {
        let all: &[u8] = match &self.data {
            Data::Static(s) => s,
            Data::Shared(v) => v.as_slice(),
        };
        &all[self.start..self.end]
    }
}

/// Entries of a compiled lexicon, decoded on demand.
#[derive(Debug, Clone)]
pub(super) struct LazyEntries {
    index: fst::Map<IndexBytes>,
    records: IndexBytes,
    /// The offset table of the sets of readings (`sets + 1` little-endian
    /// u32s) and, after it, their JSON texts. A set is decoded when an entry
    /// that has it is first built: a lexicon with lemma tags has hundreds of
    /// thousands of sets, and decoding them all at start-up would cost more
    /// time and memory than the rest of the load.
    set_table: IndexBytes,
    sets: usize,
    /// Display spellings other than the key, by entry number (sorted).
    spellings: Vec<(usize, String)>,
    /// Entries built so far, in blocks of [`BLOCK`] allocated when one of
    /// their entries is first built (a slot for every entry at start-up
    /// would mean writing tens of megabytes before the first word).
    cache: Blocks<Entry>,
    /// Sets of readings decoded so far, in blocks like `cache`: conditions
    /// and ranking read an entry's tags without building the entry (whose
    /// key has to be walked out of the FST).
    set_cache: Blocks<Vec<Tags>>,
    entries: usize,
}

/// Values built on first use, in blocks of [`BLOCK`], each block allocated
/// when one of its values is first built.
type Blocks<T> = Vec<OnceLock<Box<[OnceLock<T>]>>>;

/// Entries per block of [`LazyEntries`]'s cache.
const BLOCK: usize = 64;

impl LazyEntries {
    pub(super) fn len(&self) -> usize {
        self.entries
    }

    fn record(&self, id: usize) -> (f64, usize) {
        let rec = &self.records.as_ref()[id * 8..id * 8 + 8];
        let frequency = f32::from_le_bytes([rec[0], rec[1], rec[2], rec[3]]) as f64;
        let meta = u32::from_le_bytes([rec[4], rec[5], rec[6], rec[7]]) as usize;
        (frequency, meta)
    }

    /// An entry's frequency, read from its record (without building the entry).
    pub(super) fn frequency(&self, id: usize) -> f64 {
        self.record(id).0
    }

    /// The number of an entry's set of readings: entries with the same
    /// number have the same readings.
    pub(super) fn reading_set(&self, id: usize) -> usize {
        self.record(id).1 >> 2
    }

    /// How many sets of readings the file has.
    pub(super) fn reading_set_count(&self) -> usize {
        self.sets
    }

    /// An entry's display spelling, given its key (without building the
    /// entry, whose key would be walked out of the FST).
    pub(super) fn form(&self, id: usize, key: &str) -> String {
        if let Some(e) = self.cache[id / BLOCK]
            .get()
            .and_then(|b| b[id % BLOCK].get())
        {
            return e.form.clone();
        }
        match self.record(id).1 & 3 {
            1 => capitalise(key),
            2 => match self.spellings.binary_search_by_key(&id, |s| s.0) {
                Ok(i) => self.spellings[i].1.clone(),
                Err(_) => key.to_string(),
            },
            _ => key.to_string(),
        }
    }

    pub(super) fn get(&self, id: usize) -> &Entry {
        let block =
            self.cache[id / BLOCK].get_or_init(|| (0..BLOCK).map(|_| OnceLock::new()).collect());
        block[id % BLOCK].get_or_init(|| {
            let (frequency, meta) = self.record(id);
            let key = key_of(&self.index, id as u64);
            let form = match meta & 3 {
                1 => capitalise(&key),
                2 => match self.spellings.binary_search_by_key(&id, |s| s.0) {
                    Ok(i) => self.spellings[i].1.clone(),
                    Err(_) => key.clone(),
                },
                _ => key.clone(),
            };
            let readings = self.set_readings(meta >> 2).to_vec();
            Entry {
                key,
                form,
                frequency,
                readings,
            }
        })
    }
}

impl LazyEntries {
    /// An entry's readings, decoded once per set of readings.
    pub(super) fn readings(&self, id: usize) -> &[Tags] {
        self.set_readings(self.reading_set(id))
    }

    /// Set of readings number `set` (empty if the file does not have it; a
    /// file from disk had its sets checked when it was loaded).
    fn set_readings(&self, set: usize) -> &[Tags] {
        const EMPTY: &[Tags] = &[];
        if set >= self.sets {
            return EMPTY;
        }
        let Some(block) = self.set_cache.get(set / BLOCK) else {
            return EMPTY;
        };
        let block = block.get_or_init(|| (0..BLOCK).map(|_| OnceLock::new()).collect());
        block[set % BLOCK].get_or_init(|| {
            set_text(self.set_table.as_ref(), self.sets, set)
                .and_then(|raw| serde_json::from_slice(raw).ok())
                .unwrap_or_default()
        })
    }
}

/// The JSON text of set `set` in a set table (offsets, then texts).
fn set_text(table: &[u8], sets: usize, set: usize) -> Option<&[u8]> {
    let offset = |i: usize| -> Option<usize> {
        let b = table.get(i * 4..i * 4 + 4)?;
        Some(u32::from_le_bytes(b.try_into().ok()?) as usize)
    };
    let texts = (sets + 1) * 4;
    let (start, end) = (offset(set)?, offset(set + 1)?);
    table.get(texts.checked_add(start)?..texts.checked_add(end)?)
}

fn capitalise(key: &str) -> String {
    let mut chars = key.chars();
    match chars.next() {
        Some(first) => first.to_uppercase().chain(chars).collect(),
        None => String::new(),
    }
}

/// The key with rank `id` in an FST whose values are ranks in key order.
fn key_of(index: &fst::Map<IndexBytes>, id: u64) -> String {
    let fst = index.as_fst();
    let mut node = fst.root();
    let mut out = 0u64;
    let mut key = Vec::new();
    loop {
        if node.is_final() && out + node.final_output().value() == id {
            break;
        }
        let mut chosen = None;
        for t in node.transitions() {
            if out + t.out.value() <= id {
                chosen = Some(t);
            } else {
                break;
            }
        }
        let Some(t) = chosen else { break };
        key.push(t.inp);
        out += t.out.value();
        node = fst.node(t.addr);
    }
    String::from_utf8(key).unwrap_or_default()
}

#[derive(serde::Serialize, serde::Deserialize)]
struct Header {
    entries: usize,
    total_frequency: f64,
    tag_keys: Vec<String>,
    normalizer: String,
    sources: Vec<String>,
    spellings: Vec<(usize, String)>,
}

struct Reader<'a> {
    bytes: &'a [u8],
    at: usize,
}

impl<'a> Reader<'a> {
    fn take(&mut self, n: usize) -> Option<&'a [u8]> {
        let s = self.bytes.get(self.at..self.at.checked_add(n)?)?;
        self.at += n;
        Some(s)
    }
    fn u32(&mut self) -> Option<u32> {
        Some(u32::from_le_bytes(self.take(4)?.try_into().ok()?))
    }
    fn u64(&mut self) -> Option<u64> {
        Some(u64::from_le_bytes(self.take(8)?.try_into().ok()?))
    }
}

/// Writes a lexicon in the compiled format.
pub fn write(lexicon: &Lexicon, sources: &[String]) -> Vec<u8> {
    let n = lexicon.len();
    let mut records = Vec::with_capacity(n * 8);
    let mut sets: Vec<Vec<Tags>> = Vec::new();
    let mut set_ids: std::collections::HashMap<Vec<Tags>, usize> = std::collections::HashMap::new();
    let mut spellings = Vec::new();
    for id in 0..n {
        let e = lexicon.entry(id);
        let set = *set_ids.entry(e.readings.clone()).or_insert_with(|| {
            sets.push(e.readings.clone());
            sets.len() - 1
        });
        let spelling = if e.form == e.key {
            0
        } else if e.form == capitalise(&e.key) {
            1
        } else {
            spellings.push((id, e.form.clone()));
            2
        };
        records.extend_from_slice(&(e.frequency as f32).to_le_bytes());
        records.extend_from_slice(&(((set as u32) << 2) | spelling).to_le_bytes());
    }
    let header = Header {
        entries: n,
        total_frequency: lexicon.total_frequency(),
        tag_keys: lexicon.tag_keys().iter().cloned().collect(),
        normalizer: lexicon.fingerprint.clone(),
        sources: sources.to_vec(),
        spellings,
    };
    let header = serde_json::to_vec(&header).unwrap_or_default();
    let mut texts = Vec::new();
    let mut offsets = Vec::with_capacity(4 * (sets.len() + 1));
    offsets.extend_from_slice(&0u32.to_le_bytes());
    for set in &sets {
        serde_json::to_writer(&mut texts, set).unwrap_or_default();
        offsets.extend_from_slice(&(texts.len() as u32).to_le_bytes());
    }
    let fst = lexicon.fst_bytes();
    let mut out = Vec::with_capacity(
        40 + header.len() + offsets.len() + texts.len() + fst.len() + records.len(),
    );
    out.extend_from_slice(MAGIC);
    out.extend_from_slice(&FORMAT_VERSION.to_le_bytes());
    out.extend_from_slice(&(header.len() as u32).to_le_bytes());
    out.extend_from_slice(&header);
    out.extend_from_slice(&(sets.len() as u32).to_le_bytes());
    out.extend_from_slice(&offsets);
    out.extend_from_slice(&texts);
    out.extend_from_slice(&(fst.len() as u64).to_le_bytes());
    out.extend_from_slice(fst);
    out.extend_from_slice(&records);
    out
}

/// Whether bytes start like a compiled lexicon.
pub fn is_compiled(bytes: &[u8]) -> bool {
    bytes.starts_with(MAGIC)
}

/// Loads a compiled lexicon. `expected_normalizer` is the fingerprint of the
/// rule-set's normalization; a file built for another one is refused (None:
/// accept any, e.g. to re-normalize its entries into a builder).
pub fn load(
    file: &str,
    bytes: IndexBytes,
    expected_normalizer: Option<&str>,
) -> Result<Lexicon, LexiconError> {
    let bad = |message: String| LexiconError::BadIndex {
        file: file.to_string(),
        message,
    };
    let rebuild = "rebuild it with `juncture lexicon build SOURCE.tsv… --rules RULES -o FILE`";
    let all = bytes.as_ref();
    if !is_compiled(all) {
        return Err(bad(format!(
            "not a compiled lexicon (no JUNCLEX header); {rebuild}, or pass the TSV itself"
        )));
    }
    let mut r = Reader {
        bytes: all,
        at: MAGIC.len(),
    };
    let version = r
        .u32()
        .ok_or_else(|| bad(format!("the file is cut short; {rebuild}")))?;
    if version != FORMAT_VERSION {
        return Err(bad(format!("compiled lexicon format version {version}, this juncture reads version {FORMAT_VERSION}; {rebuild}")));
    }
    let corrupt = || {
        bad(format!(
            "the compiled lexicon is corrupt or cut short; {rebuild}"
        ))
    };
    let hlen = r.u32().ok_or_else(corrupt)? as usize;
    let header: Header =
        serde_json::from_slice(r.take(hlen).ok_or_else(corrupt)?).map_err(|_| corrupt())?;
    if let Some(expected_normalizer) = expected_normalizer.filter(|e| *e != header.normalizer) {
        return Err(bad(format!(
            "the lexicon was compiled for another normalization ({}) than this rule-set's ({expected_normalizer}); {rebuild}",
            header.normalizer
        )));
    }
    let sets = r.u32().ok_or_else(corrupt)? as usize;
    let table_start = r.at;
    let offsets = r.take((sets + 1) * 4).ok_or_else(corrupt)?;
    let texts_len = offsets
        .get(sets * 4..)
        .and_then(|b| b.try_into().ok())
        .map(|b: [u8; 4]| u32::from_le_bytes(b) as usize)
        .ok_or_else(corrupt)?;
    r.take(texts_len).ok_or_else(corrupt)?;
    let set_table = bytes.slice(table_start, r.at);
    // A file from disk may be damaged: every set must be JSON readings, at
    // offsets that go forward. Embedded lexicons are built and tested with
    // the binary and skip this.
    if !matches!(bytes.data, Data::Static(_)) {
        let table = set_table.as_ref();
        for set in 0..sets {
            let text = set_text(table, sets, set).ok_or_else(corrupt)?;
            serde_json::from_slice::<Vec<Tags>>(text).map_err(|_| corrupt())?;
        }
    }
    if !header.spellings.windows(2).all(|w| w[0].0 < w[1].0) {
        return Err(corrupt());
    }
    let flen = r.u64().ok_or_else(corrupt)? as usize;
    let fst_start = r.at;
    r.take(flen).ok_or_else(corrupt)?;
    let rec_start = r.at;
    let rec_len = header.entries.checked_mul(8).ok_or_else(corrupt)?;
    if rec_start.checked_add(rec_len) != Some(all.len()) {
        return Err(corrupt());
    }
    let index = fst::Map::new(bytes.slice(fst_start, fst_start + flen)).map_err(|_| corrupt())?;
    if index.len() != header.entries {
        return Err(corrupt());
    }
    // A file from disk may be damaged: walking a corrupt FST panics or loops,
    // so its checksum is verified first (one pass over the bytes). Lexicons
    // embedded in the binary are built and tested with it and skip this.
    if !matches!(bytes.data, Data::Static(_)) && index.as_fst().verify().is_err() {
        return Err(corrupt());
    }
    let lazy = LazyEntries {
        index: index.clone(),
        records: bytes.slice(rec_start, rec_start + rec_len),
        set_table,
        sets,
        spellings: header.spellings,
        cache: (0..header.entries.div_ceil(BLOCK))
            .map(|_| OnceLock::new())
            .collect(),
        set_cache: (0..sets.div_ceil(BLOCK)).map(|_| OnceLock::new()).collect(),
        entries: header.entries,
    };
    Ok(Lexicon::from_compiled(
        index,
        lazy,
        header.total_frequency,
        header.tag_keys.into_iter().collect(),
        header.normalizer,
    ))
}

/// A one-paragraph description of a compiled lexicon's header.
pub fn describe(bytes: &[u8]) -> Result<String, String> {
    if !is_compiled(bytes) {
        return Err("not a compiled lexicon (no JUNCLEX header)".into());
    }
    let mut r = Reader {
        bytes,
        at: MAGIC.len(),
    };
    let version = r.u32().ok_or("cut short")?;
    let hlen = r.u32().ok_or("cut short")? as usize;
    let header: Header =
        serde_json::from_slice(r.take(hlen).ok_or("cut short")?).map_err(|e| e.to_string())?;
    Ok(format!(
        "format version {version}\nentries {}\ntotal frequency {}\nnormalization {}\ntag keys {}\nsources {}",
        header.entries,
        header.total_frequency,
        header.normalizer,
        header.tag_keys.join(", "),
        header.sources.join(", ")
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lexicon::{normalizer_fingerprint, LexiconBuilder};
    use crate::normalize::Normalizer;

    fn sample() -> (Lexicon, Normalizer) {
        let n = Normalizer {
            fold_case: true,
            ..Normalizer::default()
        };
        let mut b = LexiconBuilder::new(&n);
        b.add_tsv(
            "t.tsv",
            "Arbeit\t10\tpos=noun\nAmt\t5\nessen\t3\tpos=verb\nEssen\t4\tpos=noun\nMcKinsey\t2\nämter\t1.5\n".as_bytes(),
        )
        .unwrap();
        (b.build().unwrap(), n)
    }

    #[test]
    fn round_trip_keeps_every_entry() {
        let (lex, n) = sample();
        let bytes = lex.to_compiled(&["t.tsv".into()]);
        let back = load(
            "x",
            IndexBytes::owned(bytes),
            Some(&normalizer_fingerprint(&n)),
        )
        .unwrap();
        assert_eq!(back.len(), lex.len());
        for id in 0..lex.len() {
            let (a, b) = (back.entry(id), lex.entry(id));
            assert_eq!(
                (&a.key, &a.form, &a.readings),
                (&b.key, &b.form, &b.readings)
            );
            assert!((a.frequency - b.frequency).abs() <= b.frequency * 1e-6);
        }
        let c = back.step_str(back.root(), "arbeit").unwrap();
        assert_eq!(back.entry(back.entry_at(c).unwrap()).form, "Arbeit");
        assert_eq!(back.total_frequency(), lex.total_frequency());
    }

    #[test]
    fn forms_and_readings_without_building_entries_agree_with_entries() {
        let (lex, n) = sample();
        let bytes = lex.to_compiled(&[]);
        let fp = normalizer_fingerprint(&n);
        let fresh = load("x", IndexBytes::owned(bytes.clone()), Some(&fp)).unwrap();
        let built = load("x", IndexBytes::owned(bytes), Some(&fp)).unwrap();
        for id in 0..lex.len() {
            let e = lex.entry(id);
            assert_eq!(fresh.form(id, &e.key), e.form, "{}", e.key);
            assert_eq!(fresh.readings(id), e.readings.as_slice());
            let _ = built.entry(id);
            assert_eq!(built.form(id, &e.key), e.form);
        }
    }

    #[test]
    fn embedded_and_checked_files_give_the_same_readings() {
        let (lex, n) = sample();
        let bytes = lex.to_compiled(&["t.tsv".into()]);
        let fp = normalizer_fingerprint(&n);
        let embedded: &'static [u8] = Box::leak(bytes.clone().into_boxed_slice());
        let unchecked = load("x", IndexBytes::embedded(embedded), Some(&fp)).unwrap();
        let checked = load("x", IndexBytes::owned(bytes), Some(&fp)).unwrap();
        assert_eq!(unchecked.len(), checked.len());
        for id in 0..checked.len() {
            assert_eq!(unchecked.entry(id), checked.entry(id));
        }
        assert_eq!(unchecked.reading_set_count(), checked.reading_set_count());
    }

    #[test]
    fn a_damaged_set_of_readings_is_refused() {
        let (lex, n) = sample();
        let fp = normalizer_fingerprint(&n);
        let mut bytes = lex.to_compiled(&[]);
        // The first set's JSON starts with `[`; make it invalid.
        let hlen = u32::from_le_bytes(bytes[12..16].try_into().unwrap()) as usize;
        let sets = u32::from_le_bytes(bytes[16 + hlen..20 + hlen].try_into().unwrap()) as usize;
        let first_text = 20 + hlen + (sets + 1) * 4;
        assert_eq!(bytes[first_text], b'[');
        bytes[first_text] = b'!';
        let err = load("x", IndexBytes::owned(bytes), Some(&fp)).unwrap_err();
        assert!(err.to_string().contains("corrupt"), "{err}");
    }

    #[test]
    fn wrong_normalization_is_refused_with_a_hint() {
        let (lex, _) = sample();
        let bytes = lex.to_compiled(&[]);
        let err = load(
            "x.jlex",
            IndexBytes::owned(bytes),
            Some(&normalizer_fingerprint(&Normalizer::default())),
        )
        .unwrap_err();
        assert!(err.to_string().contains("rebuild"), "{err}");
    }

    #[test]
    fn corrupt_or_stale_files_give_clear_errors() {
        let (lex, n) = sample();
        let fp = normalizer_fingerprint(&n);
        let bytes = lex.to_compiled(&[]);
        for cut in [0, 8, 12, 20, bytes.len() / 2, bytes.len() - 1] {
            let err = load("x", IndexBytes::owned(bytes[..cut].to_vec()), Some(&fp)).unwrap_err();
            assert!(err.to_string().contains("rebuild"), "cut {cut}: {err}");
        }
        let mut stale = bytes.clone();
        stale[8] = 9;
        assert!(load("x", IndexBytes::owned(stale), Some(&fp))
            .unwrap_err()
            .to_string()
            .contains("version 9"));
    }
}
