//! The lattice picture `explain --svg` draws, for a Velmish word (the
//! invented demo language): a snapshot of the SVG text, plus the properties
//! a reader relies on.

use juncture::analyzer::Analyzer;
use juncture::explain::{explain, ExplainOptions};
use juncture::lexicon::Lexicon;
use juncture::rules::{compile_named, CompileOptions};

fn svg_of(word: &str) -> String {
    let rules = compile_named("demo", &CompileOptions::default()).unwrap();
    let (lexicon, _) = Lexicon::for_rules(&rules, &[], true, false).unwrap();
    let analyzer = Analyzer::new(&rules, &lexicon);
    let e = explain(&analyzer, word, None, &ExplainOptions::default());
    juncture::render_svg::render(&e)
}

#[test]
fn svg_of_a_demo_word() {
    insta::assert_snapshot!("tammoradal", svg_of("tammoradal"));
}

#[test]
fn the_best_analysis_is_highlighted_and_labels_are_escaped() {
    let svg = svg_of("tammoradal");
    assert!(svg.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\""));
    assert!(svg.trim_end().ends_with("</svg>"));
    // tam ▸geminate, ora ▸join, dal: three thick red brackets.
    assert_eq!(svg.matches("stroke-width=\"2.6\"").count(), 3);
    assert!(svg.contains(">tam ▸geminate</text>"));
    assert!(svg.contains("best: tam + ora + dal"));
    let odd = svg_of("<tor>&\"");
    assert!(!odd.contains("<tor>"));
    assert!(odd.contains("&lt;tor&gt;&amp;&quot;"));
}

#[test]
fn a_long_input_stays_within_its_canvas() {
    let word = "solanavitormektalesotammoradalonkalomketaburavetormekdalonom";
    assert_eq!(word.chars().count(), 60);
    let svg = svg_of(word);
    let width: f64 = svg
        .split("width=\"")
        .nth(1)
        .and_then(|s| s.split('"').next())
        .unwrap()
        .parse()
        .unwrap();
    // Every x coordinate lies on the canvas.
    for piece in svg.split(" x=\"").skip(1) {
        let x: f64 = piece.split('"').next().unwrap().parse().unwrap();
        assert!((0.0..=width).contains(&x), "x={x} outside 0..{width}");
    }
    assert!(svg.contains("best: sola + avi + tormek"));
}
