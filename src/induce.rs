//! Induce stage: junction rules proposed from examples `part+part<TAB>surface`.
//!
//! ```text
//! examples ─align─▶ one change per boundary (left end, right start, surface)
//!          ─generalize─▶ rules (literal, correspondence, copy) with context classes
//!          ─verify─▶ rule text that compiles and joins every example it claims
//! ```
//!
//! **Alignment.** For a left part `L`, a right part `R` and the surface `S`,
//! a junction keeps a prefix of `L` and a suffix of `R` and writes some
//! material `M` between them: `S = L[..i] + M + R[k..]`. The change is
//! `(L[i..], R[..k], M)`. Its size, `|L[i..]| + |R[..k]| + |M|`, equals
//! `|L| + |R| + |S| − 2·(i + |R[k..]|)`, so the smallest change keeps the most
//! letters: `i` at most the common prefix of `L` and `S`, the kept suffix at
//! most the common suffix of `R` and `S`, and the two together at most `|S|`.
//! When both cannot be kept whole (`dal + lon → dalon`), the right part is
//! kept whole and the change falls on the left end. Everything is counted in
//! segments, so a multi-letter segment is never cut.

/// One boundary of an example, aligned.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Alignment {
    /// Segments of the left part kept on the surface.
    pub left_kept: usize,
    /// The left part's end the junction replaces (`L[i..]`).
    pub left_end: Vec<String>,
    /// The right part's start the junction replaces (`R[..k]`).
    pub right_start: Vec<String>,
    /// What the surface shows instead (`M`).
    pub surface: Vec<String>,
    /// Segments of the right part kept on the surface.
    pub right_kept: usize,
}

impl Alignment {
    /// Offset (in segments of the surface) where `M` starts.
    pub fn at(&self) -> usize {
        self.left_kept
    }
}

/// Aligns `surface` with `left` + `right` (all as segments): the smallest change.
pub fn align_pair(left: &[String], right: &[String], surface: &[String]) -> Alignment {
    let a = left.iter().zip(surface).take_while(|(x, y)| x == y).count();
    let b = right
        .iter()
        .rev()
        .zip(surface.iter().rev())
        .take_while(|(x, y)| x == y)
        .count();
    let keep_right = b.min(surface.len());
    let keep_left = a.min(surface.len() - keep_right);
    Alignment {
        left_kept: keep_left,
        left_end: left[keep_left..].to_vec(),
        right_start: right[..right.len() - keep_right].to_vec(),
        surface: surface[keep_left..surface.len() - keep_right].to_vec(),
        right_kept: keep_right,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn segs(s: &str) -> Vec<String> {
        s.chars().map(|c| c.to_string()).collect()
    }

    fn change(l: &str, r: &str, s: &str) -> (String, String, String) {
        let a = align_pair(&segs(l), &segs(r), &segs(s));
        (
            a.left_end.concat(),
            a.right_start.concat(),
            a.surface.concat(),
        )
    }

    #[test]
    fn alignments_of_the_demo_changes() {
        let c = |a: &str, b: &str, c: &str| (a.to_string(), b.to_string(), c.to_string());
        assert_eq!(change("sola", "avi", "solanavi"), c("", "", "n"));
        assert_eq!(change("kale", "om", "kalom"), c("e", "", ""));
        assert_eq!(change("ketap", "ura", "ketabura"), c("p", "", "b"));
        assert_eq!(change("tala", "iso", "taleso"), c("a", "i", "e"));
        assert_eq!(change("tam", "ora", "tammora"), c("", "", "m"));
        assert_eq!(change("dal", "lon", "dalon"), c("l", "", ""));
        assert_eq!(change("tor", "mek", "tormek"), c("", "", ""));
        assert_eq!(change("eth", "ano", "ed ano"), c("th", "", "d "));
    }
}
