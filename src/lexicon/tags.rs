//! The tags of one reading of a lexicon entry (`pos=noun;lemma=Haus`), kept
//! compact: a lexicon with lemma tags has hundreds of thousands of distinct
//! sets, and a stream of running text decodes a good share of them, so a set
//! is one short block of bytes, not a tree of strings.

use serde::de::{MapAccess, Visitor};
use serde::ser::SerializeMap;
use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::fmt;

/// Key=value pairs, sorted by key, each key once.
///
/// Stored in one block of bytes: the number of pairs, the length of each
/// key and value (little-endian u32s), then the keys and values one after
/// the other. A lookup compares lengths before bytes, so for the handful of
/// pairs a reading has it is as fast as a tree, at a tenth of the memory.
#[derive(Clone, Default, PartialEq, Eq, Hash)]
pub struct Tags {
    /// Empty for no pairs (see the type's docs for the layout).
    data: Box<[u8]>,
}

/// Reads the little-endian u32 at `at`, 0 past the end.
fn u32_at(data: &[u8], at: usize) -> usize {
    data.get(at..at + 4)
        .and_then(|b| <[u8; 4]>::try_from(b).ok())
        .map_or(0, |b| u32::from_le_bytes(b) as usize)
}

impl Tags {
    /// No tags.
    pub fn new() -> Self {
        Tags::default()
    }

    /// The value of `key`.
    pub fn get(&self, key: &str) -> Option<&str> {
        let data = &*self.data;
        let n = self.len();
        let mut text = 4 + 8 * n;
        for i in 0..n {
            let (kl, vl) = (u32_at(data, 4 + 8 * i), u32_at(data, 8 + 8 * i));
            if kl == key.len() && data.get(text..text + kl) == Some(key.as_bytes()) {
                let value = data.get(text + kl..text + kl + vl)?;
                return std::str::from_utf8(value).ok();
            }
            text += kl + vl;
        }
        None
    }

    /// Whether `key` has a value.
    pub fn contains_key(&self, key: &str) -> bool {
        self.get(key).is_some()
    }

    /// How many pairs.
    pub fn len(&self) -> usize {
        u32_at(&self.data, 0)
    }

    /// Whether there are no pairs.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The pairs in order of their keys.
    pub fn iter(&self) -> Iter<'_> {
        Iter {
            data: &self.data,
            pair: 0,
            pairs: self.len(),
            text: 4 + 8 * self.len(),
        }
    }

    /// The keys in order.
    pub fn keys(&self) -> impl Iterator<Item = &str> {
        self.iter().map(|(k, _)| k)
    }

    /// The values in the order of their keys.
    pub fn values(&self) -> impl Iterator<Item = &str> {
        self.iter().map(|(_, v)| v)
    }

    /// Sets `key` to `value`, returning the value it replaced.
    pub fn insert(&mut self, key: impl AsRef<str>, value: impl AsRef<str>) -> Option<String> {
        let (key, value) = (key.as_ref(), value.as_ref());
        let mut pairs: Vec<(&str, &str)> = self.iter().collect();
        let old = match pairs.binary_search_by(|(k, _)| (*k).cmp(key)) {
            Ok(at) => Some(std::mem::replace(&mut pairs[at].1, value).to_string()),
            Err(at) => {
                pairs.insert(at, (key, value));
                None
            }
        };
        *self = Tags::from_sorted(&pairs);
        old
    }

    /// Tags of pairs sorted by key with no key twice. A key or value longer
    /// than 4 GiB (no tag is) is cut at a character boundary.
    fn from_sorted(pairs: &[(&str, &str)]) -> Tags {
        if pairs.is_empty() {
            return Tags::default();
        }
        let fit = |s: &str| -> usize {
            let mut n = s.len().min(u32::MAX as usize);
            while !s.is_char_boundary(n) {
                n -= 1;
            }
            n
        };
        let n = pairs.len().min(u32::MAX as usize / 8 - 1);
        let pairs = &pairs[..n];
        let text: usize = pairs.iter().map(|(k, v)| fit(k) + fit(v)).sum();
        let mut data = Vec::with_capacity(4 + 8 * n + text);
        data.extend_from_slice(&(n as u32).to_le_bytes());
        for (k, v) in pairs {
            data.extend_from_slice(&(fit(k) as u32).to_le_bytes());
            data.extend_from_slice(&(fit(v) as u32).to_le_bytes());
        }
        for (k, v) in pairs {
            data.extend_from_slice(&k.as_bytes()[..fit(k)]);
            data.extend_from_slice(&v.as_bytes()[..fit(v)]);
        }
        Tags {
            data: data.into_boxed_slice(),
        }
    }
}

impl Ord for Tags {
    /// As a map's: the pairs compared in order, key first.
    fn cmp(&self, other: &Self) -> std::cmp::Ordering {
        self.iter().cmp(other.iter())
    }
}

impl PartialOrd for Tags {
    fn partial_cmp(&self, other: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(other))
    }
}

/// The pairs of a [`Tags`], in order of their keys.
#[derive(Clone)]
pub struct Iter<'a> {
    data: &'a [u8],
    pair: usize,
    pairs: usize,
    /// Where the next pair's key starts.
    text: usize,
}

impl<'a> Iterator for Iter<'a> {
    type Item = (&'a str, &'a str);

    fn next(&mut self) -> Option<Self::Item> {
        if self.pair >= self.pairs {
            return None;
        }
        let (kl, vl) = (
            u32_at(self.data, 4 + 8 * self.pair),
            u32_at(self.data, 8 + 8 * self.pair),
        );
        let text = |from: usize, len: usize| {
            self.data
                .get(from..from + len)
                .and_then(|b| std::str::from_utf8(b).ok())
                .unwrap_or("")
        };
        let item = (text(self.text, kl), text(self.text + kl, vl));
        self.pair += 1;
        self.text += kl + vl;
        Some(item)
    }
}

impl<'a> IntoIterator for &'a Tags {
    type Item = (&'a str, &'a str);
    type IntoIter = Iter<'a>;

    fn into_iter(self) -> Iter<'a> {
        self.iter()
    }
}

impl<K: AsRef<str>, V: AsRef<str>> FromIterator<(K, V)> for Tags {
    /// Later pairs win over earlier ones with the same key, as with a map.
    fn from_iter<I: IntoIterator<Item = (K, V)>>(pairs: I) -> Tags {
        let owned: Vec<(K, V)> = pairs.into_iter().collect();
        let mut pairs: Vec<(&str, &str)> = Vec::with_capacity(owned.len());
        // Last one first, so that the stable sort and dedup keep it.
        for (k, v) in owned.iter().rev() {
            pairs.push((k.as_ref(), v.as_ref()));
        }
        pairs.sort_by(|a, b| a.0.cmp(b.0));
        pairs.dedup_by(|later, first| later.0 == first.0);
        Tags::from_sorted(&pairs)
    }
}

impl fmt::Debug for Tags {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_map().entries(self.iter()).finish()
    }
}

impl Serialize for Tags {
    /// As a map, keys in order.
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        let mut map = serializer.serialize_map(Some(self.len()))?;
        for (k, v) in self {
            map.serialize_entry(k, v)?;
        }
        map.end()
    }
}

impl<'de> Deserialize<'de> for Tags {
    /// From a map of strings.
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Tags, D::Error> {
        struct TagsVisitor;
        impl<'de> Visitor<'de> for TagsVisitor {
            type Value = Tags;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a map of tag names to values")
            }
            fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Tags, A::Error> {
                let mut pairs: Vec<(std::borrow::Cow<'de, str>, std::borrow::Cow<'de, str>)> =
                    Vec::with_capacity(map.size_hint().unwrap_or(0).min(64));
                while let Some((k, v)) = map.next_entry::<CowStr<'de>, CowStr<'de>>()? {
                    pairs.push((k.0, v.0));
                }
                Ok(pairs.into_iter().collect())
            }
        }
        deserializer.deserialize_map(TagsVisitor)
    }
}

/// A string borrowed from the input where the format allows it.
struct CowStr<'de>(std::borrow::Cow<'de, str>);

impl<'de> Deserialize<'de> for CowStr<'de> {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<CowStr<'de>, D::Error> {
        struct StrVisitor;
        impl<'de> Visitor<'de> for StrVisitor {
            type Value = CowStr<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a string")
            }
            fn visit_borrowed_str<E>(self, s: &'de str) -> Result<CowStr<'de>, E> {
                Ok(CowStr(std::borrow::Cow::Borrowed(s)))
            }
            fn visit_str<E>(self, s: &str) -> Result<CowStr<'de>, E> {
                Ok(CowStr(std::borrow::Cow::Owned(s.to_string())))
            }
            fn visit_string<E>(self, s: String) -> Result<CowStr<'de>, E> {
                Ok(CowStr(std::borrow::Cow::Owned(s)))
            }
        }
        deserializer.deserialize_str(StrVisitor)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::collections::BTreeMap;

    fn map(pairs: &[(&str, &str)]) -> BTreeMap<String, String> {
        pairs
            .iter()
            .map(|(k, v)| (k.to_string(), v.to_string()))
            .collect()
    }

    #[test]
    fn tags_behave_as_a_sorted_map() {
        let mut t = Tags::new();
        assert!(t.is_empty());
        assert_eq!(t.get("pos"), None);
        assert_eq!(t.insert("pos", "noun"), None);
        assert_eq!(t.insert("lemma", "Haus"), None);
        assert_eq!(t.insert("pos", "verb"), Some("noun".to_string()));
        assert_eq!(t.len(), 2);
        assert_eq!(t.get("pos"), Some("verb"));
        assert_eq!(t.get("lemma"), Some("Haus"));
        assert!(!t.contains_key("case"));
        assert_eq!(
            t.iter().collect::<Vec<_>>(),
            vec![("lemma", "Haus"), ("pos", "verb")]
        );
        assert_eq!(format!("{t:?}"), r#"{"lemma": "Haus", "pos": "verb"}"#);
    }

    #[test]
    fn empty_keys_and_values_and_any_characters_survive() {
        let mut t = Tags::new();
        t.insert("", "");
        assert_eq!(t.len(), 1);
        assert_eq!(t.get(""), Some(""));
        t.insert("a\0b", "c\0ṛ");
        assert_eq!(t.get("a\0b"), Some("c\0ṛ"));
        assert_eq!(t.get("a"), None);
        assert_eq!(t.len(), 2);
        assert_eq!(
            t.iter().collect::<Vec<_>>(),
            vec![("", ""), ("a\0b", "c\0ṛ")]
        );
    }

    #[test]
    fn json_round_trip_and_order_match_a_map() {
        let t: Tags = [("pos", "noun"), ("gender", "f"), ("pos", "adj")]
            .into_iter()
            .collect();
        // The later pair wins, as in a map.
        assert_eq!(t.get("pos"), Some("adj"));
        let json = serde_json::to_string(&t).unwrap();
        assert_eq!(
            json,
            serde_json::to_string(&map(&[("gender", "f"), ("pos", "adj")])).unwrap()
        );
        let back: Tags = serde_json::from_str(&json).unwrap();
        assert_eq!(back, t);
        let escaped: Tags = serde_json::from_str(r#"{"lemma":"a\"b"}"#).unwrap();
        assert_eq!(escaped.get("lemma"), Some("a\"b"));
        // Ordering agrees with the map's: pairs compared in order.
        let sets = [
            vec![],
            vec![("a", "x")],
            vec![("a", "x"), ("b", "y")],
            vec![("a", "xy")],
            vec![("ab", "x")],
            vec![("b", "")],
        ];
        for x in &sets {
            for y in &sets {
                let (tx, ty): (Tags, Tags) =
                    (x.iter().copied().collect(), y.iter().copied().collect());
                assert_eq!(tx.cmp(&ty), map(x).cmp(&map(y)), "{x:?} {y:?}");
            }
        }
    }

    proptest::proptest! {
        #[test]
        fn tags_agree_with_a_map(
            a in proptest::collection::vec(("[a-c]{0,3}", "[x-zṛ\\x00]{0,3}"), 0..6),
            b in proptest::collection::vec(("[a-c]{0,3}", "[x-zṛ\\x00]{0,3}"), 0..6),
            probe in "[a-c]{0,3}",
        ) {
            let (ta, tb): (Tags, Tags) = (a.iter().cloned().collect(), b.iter().cloned().collect());
            let (ma, mb): (BTreeMap<String, String>, BTreeMap<String, String>) =
                (a.iter().cloned().collect(), b.iter().cloned().collect());
            proptest::prop_assert_eq!(ta.len(), ma.len());
            proptest::prop_assert_eq!(ta.get(&probe), ma.get(&probe).map(String::as_str));
            let pairs: Vec<(&str, &str)> = ma.iter().map(|(k, v)| (k.as_str(), v.as_str())).collect();
            proptest::prop_assert_eq!(ta.iter().collect::<Vec<_>>(), pairs);
            proptest::prop_assert_eq!(ta.cmp(&tb), ma.cmp(&mb));
            proptest::prop_assert_eq!(ta == tb, ma == mb);
            proptest::prop_assert_eq!(serde_json::to_string(&ta).unwrap(), serde_json::to_string(&ma).unwrap());
            let mut inserted = Tags::new();
            for (k, v) in &a {
                inserted.insert(k, v);
            }
            proptest::prop_assert_eq!(inserted, ta);
        }
    }
}
