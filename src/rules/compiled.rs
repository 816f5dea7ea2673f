//! The compiled rule-set file: a [`RuleSet`] after every compile pass,
//! stored so that loading it skips parsing, class expansion and indexing.
//! The bundled rule-sets are embedded in this form (start-up of `split`
//! with the bundled German rules would otherwise spend most of its time
//! compiling some twenty thousand junction instances); `juncture rules
//! build` writes one for any rule file.
//!
//! Layout (integers little-endian):
//!
//! ```text
//! magic     8 bytes  "JUNCRUL\0"
//! version   u32      FORMAT_VERSION
//! juncture  u8 length + the version of juncture that wrote it
//! checksum  u64      FNV-1a of the body
//! body      the RuleSet, in postcard encoding
//! ```
//!
//! The body mirrors the library's own types, so a file is read only by the
//! juncture version that wrote it; any other version asks for a rebuild.
//! Compiler warnings are not stored (they were shown when it was built).

use super::RuleSet;

/// Magic bytes at the start of a compiled rule-set.
pub const MAGIC: &[u8; 8] = b"JUNCRUL\0";
/// Version of the file layout.
pub const FORMAT_VERSION: u32 = 3;
/// The juncture version that writes and reads compiled rule-sets.
const WRITER: &str = env!("CARGO_PKG_VERSION");

/// Whether `bytes` start like a compiled rule-set.
pub fn is_compiled(bytes: &[u8]) -> bool {
    bytes.starts_with(MAGIC)
}

/// Encodes a compiled rule-set.
pub fn to_bytes(set: &RuleSet) -> Vec<u8> {
    // Encoding plain data into a vector cannot fail; an empty body would
    // only make the file unreadable, which `from_bytes` reports.
    let body = postcard::to_allocvec(set).unwrap_or_default();
    let mut out = Vec::with_capacity(body.len() + 32);
    out.extend_from_slice(MAGIC);
    out.extend_from_slice(&FORMAT_VERSION.to_le_bytes());
    out.push(WRITER.len() as u8);
    out.extend_from_slice(WRITER.as_bytes());
    out.extend_from_slice(&fnv1a(&body).to_le_bytes());
    out.extend_from_slice(&body);
    out
}

/// Decodes a compiled rule-set read from a file. The error says what is
/// wrong; the caller adds how to rebuild the file.
pub fn from_bytes(bytes: &[u8]) -> Result<RuleSet, String> {
    decode(bytes, true)
}

/// Decodes a compiled rule-set embedded in the binary: built by the
/// project's own script and checked by its tests, so the checksum and the
/// index check (a third of the time to read German) are skipped.
pub(crate) fn from_embedded(bytes: &'static [u8]) -> Result<RuleSet, String> {
    decode(bytes, false)
}

fn decode(bytes: &[u8], check: bool) -> Result<RuleSet, String> {
    let rest = bytes
        .strip_prefix(MAGIC.as_slice())
        .ok_or("not a compiled rule-set (it does not start with the compiled rule-set mark)")?;
    let (version, rest) = split_u32(rest).ok_or("the file is cut short")?;
    let (&writer_len, rest) = rest.split_first().ok_or("the file is cut short")?;
    let writer = rest
        .get(..writer_len as usize)
        .ok_or("the file is cut short")?;
    let rest = &rest[writer_len as usize..];
    let writer = String::from_utf8_lossy(writer);
    if version != FORMAT_VERSION || writer != WRITER {
        return Err(format!(
            "written by juncture {writer} (format {version}); this is juncture {WRITER} (format {FORMAT_VERSION})"
        ));
    }
    let (checksum, body) = split_u64(rest).ok_or("the file is cut short")?;
    if check && fnv1a(body) != checksum {
        return Err("the file is damaged (its checksum does not match)".into());
    }
    let mut set: RuleSet =
        postcard::from_bytes(body).map_err(|e| format!("the file is damaged ({e})"))?;
    if check {
        check_indexes(&set)?;
    }
    set.surface_trie.finish();
    Ok(set)
}

/// The indexes point inside the rule-set (a damaged file that passes the
/// checksum must still not make the search index out of bounds).
fn check_indexes(set: &RuleSet) -> Result<(), String> {
    let instances = set.instances.len();
    let rules = set.rules.len();
    let bad = set.instances.iter().any(|i| i.rule >= rules)
        || !set.surface_trie.is_consistent(instances)
        || !set.condition_ids.is_consistent(rules);
    if bad {
        Err("the file is damaged (an index points outside the rule-set)".into())
    } else {
        Ok(())
    }
}

fn split_u32(bytes: &[u8]) -> Option<(u32, &[u8])> {
    let (head, rest) = bytes.split_first_chunk::<4>()?;
    Some((u32::from_le_bytes(*head), rest))
}

fn split_u64(bytes: &[u8]) -> Option<(u64, &[u8])> {
    let (head, rest) = bytes.split_first_chunk::<8>()?;
    Some((u64::from_le_bytes(*head), rest))
}

/// 64-bit FNV-1a (common practice for a cheap integrity check).
fn fnv1a(bytes: &[u8]) -> u64 {
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for &b in bytes {
        hash ^= u64::from(b);
        hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
    }
    hash
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::rules::CompileOptions;

    fn demo() -> RuleSet {
        crate::rules::compile(
            "demo.jr",
            crate::rules::bundled::rule_set("demo").unwrap(),
            None,
            &CompileOptions::default(),
        )
        .unwrap()
    }

    #[test]
    fn a_rule_set_survives_the_round_trip() {
        let set = demo();
        let bytes = to_bytes(&set);
        let back = from_bytes(&bytes).unwrap();
        assert_eq!(to_bytes(&back), bytes);
        assert_eq!(back.instances, set.instances);
        assert_eq!(back.settings, set.settings);
        assert_eq!(back.name, "demo.jr");
    }

    #[test]
    fn every_damaged_byte_is_an_error_not_a_panic() {
        let bytes = to_bytes(&demo());
        for at in (0..bytes.len()).step_by(7) {
            let mut bad = bytes.clone();
            bad[at] ^= 0x5a;
            assert!(from_bytes(&bad).is_err(), "byte {at} changed, still read");
        }
        for len in (0..bytes.len()).step_by(11) {
            assert!(from_bytes(&bytes[..len]).is_err());
        }
    }

    #[test]
    fn another_version_asks_for_a_rebuild() {
        let mut bytes = to_bytes(&demo());
        bytes[8] = bytes[8].wrapping_add(1);
        let e = from_bytes(&bytes).unwrap_err();
        assert!(e.contains("written by juncture"), "{e}");
    }

    #[test]
    fn a_rule_file_is_not_taken_for_a_compiled_one() {
        assert!(!is_compiled(b"language demo\n"));
        assert!(from_bytes(b"language demo\n")
            .unwrap_err()
            .starts_with("not a compiled rule-set"));
    }
}
