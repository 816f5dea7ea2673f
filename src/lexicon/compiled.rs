//! The compiled lexicon file: an FST plus an entry table, loaded without
//! parsing. Entries are decoded on first use and cached.
//!
//! Layout (all integers little-endian):
//!
//! ```text
//! magic    8 bytes  "JUNCLEX\0"
//! version  u32      FORMAT_VERSION
//! header   u32 length + JSON {entries, total_frequency, tag_keys, normalizer, sources}
//! fst      u64 length + bytes of the fst::Map (form → entry number)
//! offsets  (entries + 1) × u64: start of each entry in the blob
//! blob     per entry: f64 frequency, str key, str form ("" = same as key),
//!          u16 readings, per reading u16 tags, per tag str key, str value
//!          (str = u32 length + UTF-8 bytes)
//! ```

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
    offsets: IndexBytes,
    blob: IndexBytes,
    cache: Vec<OnceLock<Entry>>,
}

impl LazyEntries {
    pub(super) fn len(&self) -> usize {
        self.cache.len()
    }

    pub(super) fn get(&self, id: usize) -> &Entry {
        self.cache[id].get_or_init(|| {
            let offsets = self.offsets.as_ref();
            let at = |i: usize| {
                u64::from_le_bytes(offsets[i * 8..i * 8 + 8].try_into().unwrap_or([0; 8])) as usize
            };
            let blob = self.blob.as_ref();
            let (start, end) = (at(id), at(id + 1));
            decode_entry(blob.get(start..end).unwrap_or(&[])).unwrap_or_else(|| Entry {
                key: String::new(),
                form: String::new(),
                frequency: 1.0,
                readings: vec![Tags::new()],
            })
        })
    }
}

#[derive(serde::Serialize, serde::Deserialize)]
struct Header {
    entries: usize,
    total_frequency: f64,
    tag_keys: Vec<String>,
    normalizer: String,
    sources: Vec<String>,
}

fn put_str(out: &mut Vec<u8>, s: &str) {
    out.extend_from_slice(&(s.len() as u32).to_le_bytes());
    out.extend_from_slice(s.as_bytes());
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
    fn u16(&mut self) -> Option<u16> {
        Some(u16::from_le_bytes(self.take(2)?.try_into().ok()?))
    }
    fn u32(&mut self) -> Option<u32> {
        Some(u32::from_le_bytes(self.take(4)?.try_into().ok()?))
    }
    fn u64(&mut self) -> Option<u64> {
        Some(u64::from_le_bytes(self.take(8)?.try_into().ok()?))
    }
    fn f64(&mut self) -> Option<f64> {
        Some(f64::from_le_bytes(self.take(8)?.try_into().ok()?))
    }
    fn str(&mut self) -> Option<&'a str> {
        let n = self.u32()? as usize;
        std::str::from_utf8(self.take(n)?).ok()
    }
}

fn decode_entry(bytes: &[u8]) -> Option<Entry> {
    let mut r = Reader { bytes, at: 0 };
    let frequency = r.f64()?;
    let key = r.str()?.to_string();
    let form = r.str()?;
    let form = if form.is_empty() {
        key.clone()
    } else {
        form.to_string()
    };
    let n = r.u16()?;
    let mut readings = Vec::with_capacity(n as usize);
    for _ in 0..n {
        let t = r.u16()?;
        let mut tags = Tags::new();
        for _ in 0..t {
            let k = r.str()?.to_string();
            let v = r.str()?.to_string();
            tags.insert(k, v);
        }
        readings.push(tags);
    }
    Some(Entry {
        key,
        form,
        frequency,
        readings,
    })
}

/// Writes a lexicon in the compiled format.
pub fn write(lexicon: &Lexicon, sources: &[String]) -> Vec<u8> {
    let n = lexicon.len();
    let mut blob = Vec::new();
    let mut offsets = Vec::with_capacity((n + 1) * 8);
    for id in 0..n {
        offsets.extend_from_slice(&(blob.len() as u64).to_le_bytes());
        let e = lexicon.entry(id);
        blob.extend_from_slice(&e.frequency.to_le_bytes());
        put_str(&mut blob, &e.key);
        put_str(&mut blob, if e.form == e.key { "" } else { &e.form });
        blob.extend_from_slice(&(e.readings.len().min(u16::MAX as usize) as u16).to_le_bytes());
        for r in e.readings.iter().take(u16::MAX as usize) {
            blob.extend_from_slice(&(r.len().min(u16::MAX as usize) as u16).to_le_bytes());
            for (k, v) in r.iter().take(u16::MAX as usize) {
                put_str(&mut blob, k);
                put_str(&mut blob, v);
            }
        }
    }
    offsets.extend_from_slice(&(blob.len() as u64).to_le_bytes());
    let header = Header {
        entries: n,
        total_frequency: lexicon.total_frequency(),
        tag_keys: lexicon.tag_keys().iter().cloned().collect(),
        normalizer: lexicon.fingerprint.clone(),
        sources: sources.to_vec(),
    };
    let header = serde_json::to_vec(&header).unwrap_or_default();
    let fst = lexicon.fst_bytes();
    let mut out = Vec::with_capacity(32 + header.len() + fst.len() + offsets.len() + blob.len());
    out.extend_from_slice(MAGIC);
    out.extend_from_slice(&FORMAT_VERSION.to_le_bytes());
    out.extend_from_slice(&(header.len() as u32).to_le_bytes());
    out.extend_from_slice(&header);
    out.extend_from_slice(&(fst.len() as u64).to_le_bytes());
    out.extend_from_slice(fst);
    out.extend_from_slice(&offsets);
    out.extend_from_slice(&blob);
    out
}

/// Whether bytes start like a compiled lexicon.
pub fn is_compiled(bytes: &[u8]) -> bool {
    bytes.starts_with(MAGIC)
}

/// Loads a compiled lexicon. `expected_normalizer` is the fingerprint of the
/// rule-set's normalization; a file built for another one is refused.
pub fn load(
    file: &str,
    bytes: IndexBytes,
    expected_normalizer: &str,
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
    if header.normalizer != expected_normalizer {
        return Err(bad(format!(
            "the lexicon was compiled for another normalization ({}) than this rule-set's ({expected_normalizer}); {rebuild}",
            header.normalizer
        )));
    }
    let flen = r.u64().ok_or_else(corrupt)? as usize;
    let fst_start = r.at;
    r.take(flen).ok_or_else(corrupt)?;
    let off_start = r.at;
    let off_len = header
        .entries
        .checked_add(1)
        .and_then(|n| n.checked_mul(8))
        .ok_or_else(corrupt)?;
    r.take(off_len).ok_or_else(corrupt)?;
    let blob_start = r.at;
    let index = fst::Map::new(bytes.slice(fst_start, fst_start + flen)).map_err(|_| corrupt())?;
    if index.len() != header.entries {
        return Err(corrupt());
    }
    let lazy = LazyEntries {
        offsets: bytes.slice(off_start, off_start + off_len),
        blob: bytes.slice(blob_start, all.len()),
        cache: (0..header.entries).map(|_| OnceLock::new()).collect(),
    };
    // The last offset must be the blob's length.
    let last = u64::from_le_bytes(
        all[off_start + off_len - 8..off_start + off_len]
            .try_into()
            .unwrap_or([0; 8]),
    ) as usize;
    if last != all.len() - blob_start {
        return Err(corrupt());
    }
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
            "Arbeit\t10\tpos=noun\nAmt\t5\nessen\t3\tpos=verb\nEssen\t4\tpos=noun\n".as_bytes(),
        )
        .unwrap();
        (b.build().unwrap(), n)
    }

    #[test]
    fn round_trip_keeps_every_entry() {
        let (lex, n) = sample();
        let bytes = lex.to_compiled(&["t.tsv".into()]);
        let back = load("x", IndexBytes::owned(bytes), &normalizer_fingerprint(&n)).unwrap();
        assert_eq!(back.len(), lex.len());
        for id in 0..lex.len() {
            assert_eq!(back.entry(id), lex.entry(id));
        }
        let c = back.step_str(back.root(), "arbeit").unwrap();
        assert_eq!(back.entry(back.entry_at(c).unwrap()).form, "Arbeit");
        assert_eq!(back.total_frequency(), lex.total_frequency());
    }

    #[test]
    fn wrong_normalization_is_refused_with_a_hint() {
        let (lex, _) = sample();
        let bytes = lex.to_compiled(&[]);
        let err = load(
            "x.jlex",
            IndexBytes::owned(bytes),
            &normalizer_fingerprint(&Normalizer::default()),
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
            let err = load("x", IndexBytes::owned(bytes[..cut].to_vec()), &fp).unwrap_err();
            assert!(err.to_string().contains("rebuild"), "cut {cut}: {err}");
        }
        let mut stale = bytes.clone();
        stale[8] = 9;
        assert!(load("x", IndexBytes::owned(stale), &fp)
            .unwrap_err()
            .to_string()
            .contains("version 9"));
    }
}
