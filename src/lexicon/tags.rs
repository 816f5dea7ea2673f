//! The tags of one reading of a lexicon entry (`pos=noun;lemma=Haus`), kept
//! compact: a lexicon with lemma tags has hundreds of thousands of distinct
//! sets, and a stream of running text decodes a good share of them, so a set
//! is one short string, not a tree of strings.

use serde::de::{MapAccess, Visitor};
use serde::ser::SerializeMap;
use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::fmt;

/// Separates keys and values inside [`Tags`]' text. It cannot occur in a key
/// or value (an inserted NUL becomes U+FFFD), and it sorts before every other
/// character, so comparing two texts compares the pairs in order, key first.
const SEPARATOR: char = '\0';

/// Key=value pairs, sorted by key, each key once.
///
/// Stored as one string, `key\0value\0key\0value`; the lookups walk it,
/// which for the handful of pairs a reading has is as fast as a tree and a
/// tenth of the memory.
#[derive(Clone, Default, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct Tags {
    /// The pairs in order of their keys. `n` pairs have `2n - 1`
    /// separators, so the empty text is no pairs and one pair of an empty
    /// key and value is `"\0"`.
    text: Box<str>,
}

impl Tags {
    /// No tags.
    pub fn new() -> Self {
        Tags::default()
    }

    /// The value of `key`.
    pub fn get(&self, key: &str) -> Option<&str> {
        self.iter().find(|(k, _)| *k == key).map(|(_, v)| v)
    }

    /// Whether `key` has a value.
    pub fn contains_key(&self, key: &str) -> bool {
        self.get(key).is_some()
    }

    /// How many pairs.
    pub fn len(&self) -> usize {
        if self.text.is_empty() {
            0
        } else {
            (self.text.matches(SEPARATOR).count() + 1) / 2
        }
    }

    /// Whether there are no pairs.
    pub fn is_empty(&self) -> bool {
        self.text.is_empty()
    }

    /// The pairs in order of their keys.
    pub fn iter(&self) -> Iter<'_> {
        Iter {
            parts: (!self.text.is_empty()).then(|| self.text.split(SEPARATOR)),
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
        let (key, value) = (clean(key.as_ref()), clean(value.as_ref()));
        let mut pairs: Vec<(&str, &str)> = self.iter().collect();
        let old = match pairs.binary_search_by(|(k, _)| (*k).cmp(&key)) {
            Ok(at) => Some(std::mem::replace(&mut pairs[at].1, &value).to_string()),
            Err(at) => {
                pairs.insert(at, (&key, &value));
                None
            }
        };
        *self = Tags::from_sorted(&pairs);
        old
    }

    /// Tags of pairs sorted by key with no key twice.
    fn from_sorted(pairs: &[(&str, &str)]) -> Tags {
        let mut text =
            String::with_capacity(pairs.iter().map(|(k, v)| k.len() + v.len() + 2).sum());
        for (i, (k, v)) in pairs.iter().enumerate() {
            if i > 0 {
                text.push(SEPARATOR);
            }
            text.push_str(k);
            text.push(SEPARATOR);
            text.push_str(v);
        }
        Tags {
            text: text.into_boxed_str(),
        }
    }
}

/// `s` with any NUL (the separator) replaced by U+FFFD.
fn clean(s: &str) -> std::borrow::Cow<'_, str> {
    if s.contains(SEPARATOR) {
        std::borrow::Cow::Owned(s.replace(SEPARATOR, "\u{FFFD}"))
    } else {
        std::borrow::Cow::Borrowed(s)
    }
}

/// The pairs of a [`Tags`], in order of their keys.
#[derive(Clone)]
pub struct Iter<'a> {
    parts: Option<std::str::Split<'a, char>>,
}

impl<'a> Iterator for Iter<'a> {
    type Item = (&'a str, &'a str);

    fn next(&mut self) -> Option<Self::Item> {
        let parts = self.parts.as_mut()?;
        let key = parts.next()?;
        let value = parts.next().unwrap_or("");
        Some((key, value))
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
        let owned: Vec<(String, String)> = pairs
            .into_iter()
            .map(|(k, v)| {
                (
                    clean(k.as_ref()).into_owned(),
                    clean(v.as_ref()).into_owned(),
                )
            })
            .collect();
        let mut pairs: Vec<(&str, &str)> = Vec::with_capacity(owned.len());
        // Last one first, so that the stable sort and dedup keep it.
        for (k, v) in owned.iter().rev() {
            pairs.push((k, v));
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
    fn empty_keys_and_values_and_nul_survive() {
        let mut t = Tags::new();
        t.insert("", "");
        assert_eq!(t.len(), 1);
        assert_eq!(t.get(""), Some(""));
        t.insert("a\0b", "c\0");
        assert_eq!(t.get("a\u{FFFD}b"), Some("c\u{FFFD}"));
        assert_eq!(t.len(), 2);
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
}
