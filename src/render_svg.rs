//! Pictures: an explanation's lattice drawn as SVG, by hand (no external
//! program).
//!
//! The input's letters run left to right along an axis, with the offsets
//! between them. Every word of the lattice is a bracket above the axis over
//! the stretch of the input it covers, labelled with its lexicon form and the
//! rule of the junction after it. Brackets are stacked by height: shorter
//! ones lower, and no two labels on one level overlap. Words on the best
//! analysis are red and thicker, words on no complete analysis grey and
//! dashed. Under the letters, the surface each junction of the best analysis
//! wrote is shaded, its boundary marked with a red tick and the rule named.

use crate::explain::Explanation;
use std::collections::BTreeMap;
use std::fmt::Write;

const MARGIN: f64 = 24.0;
const LEVEL: f64 = 22.0;
const LABEL_FONT: f64 = 11.0;
const BEST: &str = "#c0392b";
const LIVE: &str = "#2c3e50";
const DEAD: &str = "#a0a0a0";
const LEGEND: &str =
    "red: best analysis · dark: on some analysis · grey dashed: dead end · ▸rule: the junction after the word";

/// One bracket to draw.
#[derive(Debug, Clone)]
struct Arc {
    start: usize,
    end: usize,
    label: String,
    best: bool,
    live: bool,
    level: usize,
}

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// Estimated width of a label in pixels (sans-serif, average letter width).
fn text_width(s: &str, font: f64) -> f64 {
    s.chars().count() as f64 * font * 0.58 + 6.0
}

/// Width of one letter's cell: wider for short inputs, so labels fit their brackets.
fn cell_for(letters: usize) -> f64 {
    (560.0 / letters.max(1) as f64).clamp(18.0, 34.0)
}

fn x_at(pos: usize, cell: f64) -> f64 {
    MARGIN + pos as f64 * cell
}

/// Horizontal extent an arc occupies on its level (bracket and label).
fn extent(a: &Arc, max_x: f64, cell: f64) -> (f64, f64) {
    let (x1, x2) = (x_at(a.start, cell), x_at(a.end, cell));
    let w = text_width(&a.label, LABEL_FONT);
    let mid = (x1 + x2) / 2.0;
    let (l, r) = label_span(mid, w, max_x);
    (x1.min(l), x2.max(r))
}

/// Where a label of width `w` centred at `mid` goes, kept inside the picture.
fn label_span(mid: f64, w: f64, max_x: f64) -> (f64, f64) {
    let mut l = mid - w / 2.0;
    if l < 2.0 {
        l = 2.0;
    }
    if l + w > max_x - 2.0 {
        l = (max_x - 2.0 - w).max(2.0);
    }
    (l, l + w)
}

/// Assigns levels: shortest arcs first, each on the lowest level where it
/// overlaps nothing already placed.
fn stack(arcs: &mut [Arc], max_x: f64, cell: f64) -> usize {
    let mut order: Vec<usize> = (0..arcs.len()).collect();
    order.sort_by_key(|&i| {
        let a = &arcs[i];
        (a.end - a.start, a.start, !a.best, a.label.clone())
    });
    let mut levels: Vec<Vec<(f64, f64)>> = Vec::new();
    for i in order {
        let (l, r) = extent(&arcs[i], max_x, cell);
        let free = levels
            .iter()
            .position(|taken| taken.iter().all(|&(a, b)| r + 4.0 <= a || l >= b + 4.0));
        let k = match free {
            Some(k) => k,
            None => {
                levels.push(Vec::new());
                levels.len() - 1
            }
        };
        levels[k].push((l, r));
        arcs[i].level = k;
    }
    levels.len()
}

/// The explanation's lattice as an SVG document.
pub fn render(explanation: &Explanation) -> String {
    let letters: Vec<char> = explanation.normalized.chars().collect();
    let n = letters.len();
    // Arcs, one per distinct (stretch, word, rule after).
    let mut by_key: BTreeMap<(usize, usize, String), Arc> = BTreeMap::new();
    let mut best_junctions = Vec::new();
    for node in &explanation.nodes {
        for w in &node.words {
            let rule = w.then.as_ref().map(|j| j.rule.as_str());
            let label = match rule {
                Some(r) => format!("{} ▸{r}", w.form),
                None => w.form.clone(),
            };
            let start = w.visible_start.min(n);
            let end = w.visible_end.clamp(start, n);
            let live = !w.paths.0.is_zero_count();
            let arc = by_key.entry((start, end, label.clone())).or_insert(Arc {
                start,
                end,
                label,
                best: false,
                live: false,
                level: 0,
            });
            arc.best |= w.best;
            arc.live |= live;
            if w.best {
                if let Some(j) = &w.then {
                    best_junctions.push(j.clone());
                }
            }
        }
    }
    let mut arcs: Vec<Arc> = by_key.into_values().collect();
    let cell = cell_for(n);
    let best_text = explanation
        .ranked
        .first()
        .map(|r| {
            format!(
                "best: {}  (score {})",
                r.analysis.parts_text(),
                r.analysis.score
            )
        })
        .unwrap_or_else(|| "no analysis reaches the end".to_string());
    let title = format!(
        "{} — {} analys{}",
        explanation.input,
        explanation.count,
        if explanation.count.to_string() == "1" {
            "is"
        } else {
            "es"
        }
    );
    let width = (MARGIN * 2.0 + n as f64 * cell)
        .max(MARGIN * 2.0 + text_width(LEGEND, 10.0))
        .max(MARGIN * 2.0 + text_width(&best_text, 11.5))
        .max(MARGIN * 2.0 + text_width(&title, 15.0))
        .ceil();
    let levels = stack(&mut arcs, width, cell);
    let title_h = 30.0;
    let axis_y = title_h + levels as f64 * LEVEL + 14.0;
    let letters_y = axis_y + 17.0;
    let offsets_y = axis_y + 31.0;
    let rules_y = axis_y + 48.0;
    // Rule names under the best junctions, on two rows if they would collide.
    best_junctions.sort_by_key(|j| j.at);
    let mut rule_rows: Vec<(f64, usize, String)> = Vec::new();
    let mut row_ends = [f64::NEG_INFINITY; 2];
    for j in &best_junctions {
        let x = x_at(j.boundary.min(n), cell);
        let w = text_width(&j.rule, 10.0);
        let (l, r) = label_span(x, w, width);
        let row = if l >= row_ends[0] + 3.0 {
            0
        } else if l >= row_ends[1] + 3.0 {
            1
        } else {
            0
        };
        row_ends[row] = r;
        rule_rows.push(((l + r) / 2.0, row, j.rule.clone()));
    }
    let rule_rows_h = if rule_rows.iter().any(|r| r.1 == 1) {
        2.0
    } else {
        1.0
    };
    let legend_y = rules_y + rule_rows_h * 13.0 + 14.0;
    let height = legend_y + 22.0;

    let mut out = String::new();
    let _ = writeln!(
        out,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{w}" height="{h}" viewBox="0 0 {w} {h}" font-family="DejaVu Sans, Arial, sans-serif">"#,
        w = width,
        h = height
    );
    let _ = writeln!(out, r#"<rect width="100%" height="100%" fill="white"/>"#);
    let _ = writeln!(
        out,
        r#"<text x="{MARGIN}" y="20" font-size="14" font-weight="bold">{}</text>"#,
        esc(&title)
    );
    // Junction surfaces of the best analysis, shaded behind the letters.
    for j in &best_junctions {
        if j.to > j.at {
            let _ = writeln!(
                out,
                r##"<rect x="{:.1}" y="{:.1}" width="{:.1}" height="20" rx="3" fill="#f9e0d9"/>"##,
                x_at(j.at, cell),
                axis_y + 3.0,
                (j.to - j.at) as f64 * cell
            );
        }
    }
    // Arcs: dead first, then live, then best on top.
    let mut draw_order: Vec<&Arc> = arcs.iter().collect();
    draw_order.sort_by_key(|a| (a.best, a.live, a.level));
    for a in &draw_order {
        let x1 = x_at(a.start, cell) + 2.0;
        let x2 = (x_at(a.end, cell) - 2.0).max(x1 + 2.0);
        let y = axis_y - (a.level as f64 + 1.0) * LEVEL + 6.0;
        let (color, stroke, dash) = if a.best {
            (BEST, 2.6, "")
        } else if a.live {
            (LIVE, 1.2, "")
        } else {
            (DEAD, 1.0, r#" stroke-dasharray="3 2""#)
        };
        let r = 4.0f64.min((x2 - x1) / 2.0);
        let _ = writeln!(
            out,
            r#"<path d="M {x1:.1} {axis:.1} L {x1:.1} {yr:.1} Q {x1:.1} {y:.1} {xr1:.1} {y:.1} L {xr2:.1} {y:.1} Q {x2:.1} {y:.1} {x2:.1} {yr:.1} L {x2:.1} {axis:.1}" fill="none" stroke="{color}" stroke-width="{stroke}"{dash}/>"#,
            axis = axis_y,
            yr = y + r,
            xr1 = x1 + r,
            xr2 = x2 - r,
        );
    }
    // Labels last, with a white halo so lines behind them do not cross the text.
    for a in &draw_order {
        let y = axis_y - (a.level as f64 + 1.0) * LEVEL + 6.0;
        let w = text_width(&a.label, LABEL_FONT);
        let mid = (x_at(a.start, cell) + x_at(a.end, cell)) / 2.0;
        let (l, r) = label_span(mid, w, width);
        let (color, weight) = if a.best {
            (BEST, " font-weight=\"bold\"")
        } else if a.live {
            (LIVE, "")
        } else {
            (DEAD, "")
        };
        let _ = writeln!(
            out,
            r#"<text x="{:.1}" y="{:.1}" font-size="{LABEL_FONT}" text-anchor="middle" fill="{color}"{weight} stroke="white" stroke-width="4" paint-order="stroke">{}</text>"#,
            (l + r) / 2.0,
            y + 4.0,
            esc(&a.label)
        );
    }
    // The axis, the letters and the offsets between them.
    let _ = writeln!(
        out,
        r##"<line x1="{:.1}" y1="{axis_y:.1}" x2="{:.1}" y2="{axis_y:.1}" stroke="#555" stroke-width="1"/>"##,
        x_at(0, cell),
        x_at(n, cell)
    );
    for (i, c) in letters.iter().enumerate() {
        let shown = if *c == ' ' { '␣' } else { *c };
        let _ = writeln!(
            out,
            r#"<text x="{:.1}" y="{letters_y:.1}" font-size="15" font-family="DejaVu Sans Mono, monospace" text-anchor="middle">{}</text>"#,
            x_at(i, cell) + cell / 2.0,
            esc(&shown.to_string())
        );
    }
    for i in 0..=n {
        let _ = writeln!(
            out,
            r##"<line x1="{x:.1}" y1="{:.1}" x2="{x:.1}" y2="{:.1}" stroke="#555" stroke-width="1"/>"##,
            axis_y - 3.0,
            axis_y + 3.0,
            x = x_at(i, cell)
        );
        if n <= 40 || i % 5 == 0 || i == n {
            let _ = writeln!(
                out,
                r##"<text x="{:.1}" y="{offsets_y:.1}" font-size="8" fill="#888" text-anchor="middle">{i}</text>"##,
                x_at(i, cell)
            );
        }
    }
    // Boundaries of the best analysis and the rules there.
    for j in &best_junctions {
        let x = x_at(j.boundary.min(n), cell);
        let _ = writeln!(
            out,
            r#"<line x1="{x:.1}" y1="{:.1}" x2="{x:.1}" y2="{:.1}" stroke="{BEST}" stroke-width="2"/>"#,
            axis_y - 2.0,
            axis_y + 24.0
        );
    }
    for (x, row, rule) in &rule_rows {
        let _ = writeln!(
            out,
            r#"<text x="{x:.1}" y="{:.1}" font-size="10" fill="{BEST}" text-anchor="middle">{}</text>"#,
            rules_y + *row as f64 * 13.0,
            esc(rule)
        );
    }
    // Legend.
    let _ = writeln!(
        out,
        r#"<text x="{MARGIN}" y="{legend_y:.1}" font-size="11" fill="{BEST}" font-weight="bold">{}</text>"#,
        esc(&best_text)
    );
    let _ = writeln!(
        out,
        r##"<text x="{MARGIN}" y="{:.1}" font-size="10" fill="#666">{LEGEND}</text>"##,
        legend_y + 14.0
    );
    out.push_str("</svg>\n");
    out
}

trait ZeroCount {
    fn is_zero_count(&self) -> bool;
}

impl ZeroCount for num_bigint::BigUint {
    fn is_zero_count(&self) -> bool {
        num_traits::Zero::is_zero(self)
    }
}
