//! The compiled lexicon file: an FST plus an entry table, loaded without
//! parsing. Entries are decoded on first use and cached.
//!
//! Layout (all integers little-endian):
//!
//! ```text
//! magic    8 bytes  "JUNCLEX\0"
//! version  u32      FORMAT_VERSION
//! header   u32 length + JSON {entries, total_frequency, tag_keys, normalizer,
//!          sources, reading_sets, spellings}
//! fst      u64 length + bytes of the fst::Map (form → entry number, in key order)
//! records  entries × 8 bytes: f32 frequency, u32 (reading set << 2 | spelling)
//! ```
//!
//! An entry's key is not stored: entry numbers are ranks in key order, so
//! the FST gives the key of a number back (at each state, take the last
//! transition whose output does not pass the number). Tag sets are interned
//! (`reading_sets`); the display spelling is coded as 0 = the key, 1 = the key
//! with its first letter capitalised, 2 = listed in `spellings`.

use super::{Entry, Lexicon, LexiconError, Tags};
use std::sync::{Arc, OnceLock};

/// Magic bytes at the start of a compiled lexicon.
pub const MAGIC: &[u8; 8] = b"JUNCLEX\0";
/// Version of the file layout; files of another version must be rebuilt.
pub const FORMAT_VERSION: u32 = 1;

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
    /// The whole file; `reading_sets` are byte ranges of its header's JSON.
    bytes: IndexBytes,
    /// Where each interned set of readings is written (JSON), decoded when an
    /// entry that has it is first built: a lexicon with lemma tags has
    /// hundreds of thousands of sets, and decoding them all at start-up
    /// would cost more time and memory than the rest of the load.
    reading_sets: Vec<(u32, u32)>,
    spellings: std::collections::HashMap<usize, String>,
    /// Entries built so far, in blocks of [`BLOCK`] allocated when one of
    /// their entries is first built (a slot for every entry at start-up
    /// would mean writing tens of megabytes before the first word).
    cache: Vec<OnceLock<Box<[OnceLock<Entry>]>>>,
    entries: usize,
}

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
        self.reading_sets.len()
    }

    pub(super) fn get(&self, id: usize) -> &Entry {
        let block =
            self.cache[id / BLOCK].get_or_init(|| (0..BLOCK).map(|_| OnceLock::new()).collect());
        block[id % BLOCK].get_or_init(|| {
            let (frequency, meta) = self.record(id);
            let key = key_of(&self.index, id as u64);
            let form = match meta & 3 {
                1 => capitalise(&key),
                2 => self
                    .spellings
                    .get(&id)
                    .cloned()
                    .unwrap_or_else(|| key.clone()),
                _ => key.clone(),
            };
            let readings = self.readings(meta >> 2);
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
    /// Set of readings number `set` (empty if the file does not have it; the
    /// ranges were checked to be JSON when the file was loaded).
    fn readings(&self, set: usize) -> Vec<Tags> {
        let Some(&(start, len)) = self.reading_sets.get(set) else {
            return Vec::new();
        };
        let (start, len) = (start as usize, len as usize);
        self.bytes
            .as_ref()
            .get(start..start + len)
            .and_then(|raw| serde_json::from_slice(raw).ok())
            .unwrap_or_default()
    }
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

/// The header as read: like [`Header`], with the sets of readings left as
/// JSON text (see [`LazyEntries`]).
#[derive(serde::Deserialize)]
struct HeaderIn<'a> {
    entries: usize,
    total_frequency: f64,
    tag_keys: Vec<String>,
    normalizer: String,
    #[serde(borrow)]
    reading_sets: Vec<&'a serde_json::value::RawValue>,
    spellings: Vec<(usize, String)>,
}

#[derive(serde::Serialize, serde::Deserialize)]
struct Header {
    entries: usize,
    total_frequency: f64,
    tag_keys: Vec<String>,
    normalizer: String,
    sources: Vec<String>,
    reading_sets: Vec<Vec<Tags>>,
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
        reading_sets: sets,
        spellings,
    };
    let header = serde_json::to_vec(&header).unwrap_or_default();
    let fst = lexicon.fst_bytes();
    let mut out = Vec::with_capacity(32 + header.len() + fst.len() + records.len());
    out.extend_from_slice(MAGIC);
    out.extend_from_slice(&FORMAT_VERSION.to_le_bytes());
    out.extend_from_slice(&(header.len() as u32).to_le_bytes());
    out.extend_from_slice(&header);
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
    let header_at = r.at;
    let header_bytes = r.take(hlen).ok_or_else(corrupt)?;
    // Byte ranges of the sets of readings within the file. An embedded
    // lexicon was written by `write` and is tested with the binary: its sets
    // are found by a scan of the bytes, and only the rest of the header is
    // parsed (parsing the sets' JSON only to skip it took most of start-up).
    // A file from disk is parsed in full, so a damaged set is refused here.
    let scanned = match bytes.data {
        Data::Static(_) => scan_reading_sets(header_bytes),
        Data::Shared(_) => None,
    };
    let (header, ranges): (HeaderIn, Vec<(usize, usize)>) = match &scanned {
        Some(scan) => {
            let header = serde_json::from_slice(&scan.rest).map_err(|_| corrupt())?;
            let ranges = scan
                .sets
                .iter()
                .map(|&(start, len)| (header_at + start, len))
                .collect();
            (header, ranges)
        }
        None => {
            let header: HeaderIn = serde_json::from_slice(header_bytes).map_err(|_| corrupt())?;
            let base = all.as_ptr() as usize;
            let ranges = header
                .reading_sets
                .iter()
                .map(|raw| {
                    let text = raw.get();
                    ((text.as_ptr() as usize).wrapping_sub(base), text.len())
                })
                .collect();
            (header, ranges)
        }
    };
    let mut reading_sets = Vec::with_capacity(ranges.len());
    for (start, len) in ranges {
        if start.checked_add(len).is_none_or(|end| end > all.len()) {
            return Err(corrupt());
        }
        let (Ok(start), Ok(len)) = (u32::try_from(start), u32::try_from(len)) else {
            return Err(corrupt());
        };
        reading_sets.push((start, len));
    }
    if let Some(expected_normalizer) = expected_normalizer.filter(|e| *e != header.normalizer) {
        return Err(bad(format!(
            "the lexicon was compiled for another normalization ({}) than this rule-set's ({expected_normalizer}); {rebuild}",
            header.normalizer
        )));
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
        bytes: bytes.clone(),
        reading_sets,
        spellings: header.spellings.into_iter().collect(),
        cache: (0..header.entries.div_ceil(BLOCK))
            .map(|_| OnceLock::new())
            .collect(),
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

/// A header split by [`scan_reading_sets`].
struct ScannedHeader {
    /// The header with its `reading_sets` array emptied (`[]`).
    rest: Vec<u8>,
    /// (start, length) of each set within the header.
    sets: Vec<(usize, usize)>,
}

/// Finds the sets of readings in a header written by [`write`]: the value of
/// the top-level key `reading_sets`, an array of arrays, by one pass over the
/// bytes that follows strings and brackets. `None` when the header is not laid
/// out that way (then it is parsed in full).
fn scan_reading_sets(header: &[u8]) -> Option<ScannedHeader> {
    const KEY: &[u8] = b"reading_sets";
    let mut depth = 0usize;
    let mut i = 0;
    // Where the array starts, once the key has been read at depth 1.
    let mut key_seen = false;
    let mut array: Option<usize> = None;
    let mut element = 0;
    let mut sets = Vec::new();
    while i < header.len() {
        match header[i] {
            b'"' => {
                // Only keys and values of other fields are strings here: the
                // sets' own strings are inside brackets deeper down.
                if array.is_some() && depth == 2 {
                    return None;
                }
                let start = i + 1;
                i = start;
                loop {
                    match *header.get(i)? {
                        b'"' => break,
                        b'\\' => i += 2,
                        _ => i += 1,
                    }
                }
                if depth == 1 && &header[start..i] == KEY {
                    // The key, then `:` and the array.
                    let mut after = header[i + 1..].iter().filter(|b| !b.is_ascii_whitespace());
                    if after.next() != Some(&b':') || after.next() != Some(&b'[') {
                        return None;
                    }
                    key_seen = true;
                }
            }
            b'[' | b'{' => {
                depth += 1;
                if key_seen && depth == 2 {
                    if header[i] != b'[' {
                        return None;
                    }
                    key_seen = false;
                    array = Some(i);
                } else if array.is_some() && depth == 3 {
                    if header[i] != b'[' {
                        return None;
                    }
                    element = i;
                }
            }
            b']' | b'}' => {
                if let Some(start) = array {
                    if depth == 3 {
                        sets.push((element, i + 1 - element));
                    } else if depth == 2 {
                        let mut rest = Vec::with_capacity(header.len() - (i - start) + 1);
                        rest.extend_from_slice(&header[..start]);
                        rest.extend_from_slice(b"[]");
                        rest.extend_from_slice(&header[i + 1..]);
                        return Some(ScannedHeader { rest, sets });
                    }
                }
                depth = depth.checked_sub(1)?;
            }
            b',' | b':' | b' ' | b'\n' | b'\r' | b'\t' => {}
            _ if array.is_some() && depth == 2 => return None,
            _ => {}
        }
        i += 1;
    }
    None
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
    fn scanned_and_parsed_headers_give_the_same_readings() {
        let (lex, n) = sample();
        let bytes = lex.to_compiled(&["t.tsv".into()]);
        let fp = normalizer_fingerprint(&n);
        let embedded: &'static [u8] = Box::leak(bytes.clone().into_boxed_slice());
        let scanned = load("x", IndexBytes::embedded(embedded), Some(&fp)).unwrap();
        let parsed = load("x", IndexBytes::owned(bytes), Some(&fp)).unwrap();
        assert_eq!(scanned.len(), parsed.len());
        for id in 0..parsed.len() {
            assert_eq!(scanned.entry(id), parsed.entry(id));
        }
        assert!(
            scan_reading_sets(br#"{"entries":1,"reading_sets":[[{"a":"]"}],[]]}"#)
                .is_some_and(|s| s.sets == vec![(29, 11), (41, 2)] && s.rest.ends_with(b"[]}"))
        );
        assert!(scan_reading_sets(br#"{"x":"reading_sets","reading_sets":null}"#).is_none());
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
