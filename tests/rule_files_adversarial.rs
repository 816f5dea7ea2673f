//! Adversarial rule files: malformed text, circular and deeply nested
//! includes, huge and exploding classes, rules that insert without consuming,
//! conditions on tags no entry has. Each must give a clear error (a code,
//! `file:line:column`, the line and a caret) or compile, and none may hang:
//! every case runs on its own thread with a time bound (a hang fails the test
//! instead of stalling the suite; the bound is generous, it is not a speed
//! assertion).

use juncture::lexicon::LexiconBuilder;
use juncture::rules::{compile, CompileOptions, Diagnostics, RuleSet};
use std::path::{Path, PathBuf};
use std::sync::mpsc;
use std::time::Duration;

/// Generous: every case here finishes in well under a second in release.
const BOUND: Duration = Duration::from_secs(60);

/// Runs `f` on a thread of the default (2 MiB) stack size and fails if it
/// has not finished within [`BOUND`].
fn within<T: Send + 'static>(what: &str, f: impl FnOnce() -> T + Send + 'static) -> T {
    let (tx, rx) = mpsc::channel();
    std::thread::Builder::new()
        .name(what.to_string())
        .spawn(move || {
            let _ = tx.send(f());
        })
        .expect("spawn");
    match rx.recv_timeout(BOUND) {
        Ok(v) => v,
        Err(mpsc::RecvTimeoutError::Timeout) => panic!("{what}: no answer within {BOUND:?} (hang)"),
        Err(mpsc::RecvTimeoutError::Disconnected) => panic!("{what}: the thread panicked"),
    }
}

/// Compiles `text` as file `name` in `dir` (includes resolve there).
fn compile_in(
    what: &str,
    dir: Option<PathBuf>,
    name: &str,
    text: String,
) -> Result<RuleSet, Diagnostics> {
    let name = name.to_string();
    within(what, move || {
        compile(&name, &text, dir.as_deref(), &CompileOptions::default())
    })
}

fn compile_text(what: &str, text: impl Into<String>) -> Result<RuleSet, Diagnostics> {
    compile_in(what, None, "test.jr", text.into())
}

/// The error diagnostics, asserting that there is one with `code` and that
/// the rendering names file:line:column and shows a caret.
fn expect_error(result: Result<RuleSet, Diagnostics>, code: &str) -> Diagnostics {
    let d = match result {
        Ok(_) => panic!("expected error `{code}`, but the rule file compiled"),
        Err(d) => d,
    };
    let text = d.to_string();
    assert!(
        d.0.iter().any(|x| x.code == code),
        "expected error `{code}`, got:\n{text}"
    );
    let diag = d.0.iter().find(|x| x.code == code).unwrap();
    let loc = diag
        .location
        .as_ref()
        .unwrap_or_else(|| panic!("`{code}` has no location:\n{text}"));
    assert!(loc.line >= 1 && loc.column >= 1);
    assert!(
        text.contains(&format!("{}:{}:{}", loc.file, loc.line, loc.column)),
        "{text}"
    );
    assert!(text.contains('^'), "no caret:\n{text}");
    assert!(
        text.lines().count() < 2_000,
        "error output runs to {} lines",
        text.lines().count()
    );
    d
}

fn scratch(name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_TARGET_TMPDIR")).join(format!("adversarial-{name}"));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// `n` distinct three-letter segments.
fn segments(n: usize) -> Vec<String> {
    let letters: Vec<char> = "bcdfghjklmnpqrstvwxz".chars().collect();
    let mut out = Vec::new();
    'outer: for a in &letters {
        for b in &letters {
            for c in &letters {
                out.push(format!("{a}{b}{c}"));
                if out.len() == n {
                    break 'outer;
                }
            }
        }
    }
    assert_eq!(out.len(), n);
    out
}

// ------------------------------------------------------------ malformed text

#[test]
fn garbage_lines_are_each_reported_with_place_and_caret() {
    let text = "language x\nrule : + -> |\nclass = a b\n]]]] ->\nrule ok: + -> |\nset = 3\n";
    let d = expect_error(compile_text("garbage", text), "syntax");
    assert!(d.error_count() >= 3, "{d}");
    let lines: Vec<usize> =
        d.0.iter()
            .filter_map(|x| x.location.as_ref().map(|l| l.line))
            .collect();
    for l in [2, 3, 4, 6] {
        assert!(lines.contains(&l), "no error on line {l}:\n{d}");
    }
}

#[test]
fn binary_noise_and_odd_text_give_errors_not_panics() {
    let cases: Vec<String> = vec![
        "\u{0}\u{1}\u{2}rule".into(),
        "rule x: [".into(),
        "rule x: [a:".into(),
        "rule x: + -> [".into(),
        "rule x: \"unterminated + -> |".into(),
        "class c = [".into(),
        "include".into(),
        "include \"".into(),
        "set a =".into(),
        "rule x: + -> |\n  cost 1e999999".into(),
        "rule x: + -> |\n  cost -1".into(),
        "rule x: + -> |\n  cost NaN".into(),
        "pattern p = [nope]{9999999999999999999999,1}".into(),
        "\u{202E}rule x: + -> |".into(),
        "rule x: + -> |\r\n  cost 1\r".into(),
        "[".repeat(100_000),
        "rule x: ".to_string() + &"[".repeat(50_000) + " + -> |",
        "rule x: ".to_string() + &"a".repeat(1 << 20) + " + -> |",
        "# only a comment".into(),
        String::new(),
        "\u{FEFF}language bom\nrule j: + -> |".into(),
    ];
    for (i, text) in cases.into_iter().enumerate() {
        let what = format!("odd text {i}");
        // Either outcome is fine; errors must render.
        if let Err(d) = compile_text(&what, text) {
            assert!(d.error_count() > 0 || !d.0.is_empty());
            let _ = d.to_string();
        }
    }
}

#[test]
fn a_rule_file_that_is_not_utf8_is_an_error() {
    let dir = scratch("not-utf8");
    let path = dir.join("bad.jr");
    std::fs::write(&path, b"language x\nrule j: + -> \xff|\n").unwrap();
    let path_s = path.display().to_string();
    let d = within("not utf8", move || {
        juncture::rules::compile_named(&path_s, &CompileOptions::default())
    })
    .err()
    .expect("must not compile");
    assert!(d.0.iter().any(|x| x.code == "not-utf8"), "{d}");
    assert!(d.to_string().contains("bad.jr:2:14"), "{d}");
}

// ------------------------------------------------------------------ includes

#[test]
fn circular_includes_are_an_error_naming_the_chain() {
    let dir = scratch("circular");
    std::fs::write(dir.join("a.jr"), "include \"b.jr\"\nclass v = a\n").unwrap();
    std::fs::write(dir.join("b.jr"), "include \"c.jr\"\n").unwrap();
    std::fs::write(dir.join("c.jr"), "include \"a.jr\"\n").unwrap();
    let root = "language x\ninclude \"a.jr\"\nrule j: + -> |\n".to_string();
    let d = expect_error(
        compile_in(
            "circular",
            Some(dir.clone()),
            &dir.join("root.jr").display().to_string(),
            root,
        ),
        "circular-include",
    );
    let text = d.to_string();
    assert!(
        text.contains("a.jr → ") && text.contains("c.jr → "),
        "{text}"
    );
}

#[test]
fn a_file_including_itself_is_circular() {
    let dir = scratch("self");
    let path = dir.join("self.jr");
    let text = "language x\ninclude \"self.jr\"\nrule j: + -> |\n".to_string();
    std::fs::write(&path, &text).unwrap();
    expect_error(
        compile_in("self include", Some(dir), &path.display().to_string(), text),
        "circular-include",
    );
}

#[test]
fn deeply_nested_includes_stop_at_the_depth_limit() {
    let dir = scratch("deep");
    let depth = 200;
    for i in 0..depth {
        std::fs::write(
            dir.join(format!("f{i}.jr")),
            format!("include \"f{}.jr\"\nclass c{i} = a\n", i + 1),
        )
        .unwrap();
    }
    std::fs::write(dir.join(format!("f{depth}.jr")), "class last = a\n").unwrap();
    let root = "language x\ninclude \"f0.jr\"\nrule j: + -> |\n".to_string();
    let d = expect_error(
        compile_in(
            "deep includes",
            Some(dir.clone()),
            &dir.join("root.jr").display().to_string(),
            root,
        ),
        "include-depth",
    );
    assert_eq!(
        d.0.iter().filter(|x| x.code == "include-depth").count(),
        1,
        "{d}"
    );
}

#[test]
fn includes_within_the_limit_and_diamonds_compile() {
    let dir = scratch("diamond");
    // 12 levels, each file including the next one twice (through two names):
    // read once each, not 2^12 times.
    for i in 0..12 {
        std::fs::write(
            dir.join(format!("d{i}.jr")),
            format!(
                "include \"d{n}.jr\"\ninclude \"./d{n}.jr\"\nclass c{i} = a\n",
                n = i + 1
            ),
        )
        .unwrap();
    }
    std::fs::write(dir.join("d12.jr"), "class last = a\n").unwrap();
    let root = "language x\ninclude \"d0.jr\"\nrule j: + -> |\n".to_string();
    let set = compile_in(
        "diamond",
        Some(dir.clone()),
        &dir.join("root.jr").display().to_string(),
        root,
    )
    .unwrap_or_else(|d| panic!("{d}"));
    assert_eq!(set.classes.len(), 13);
}

#[test]
fn including_a_directory_or_a_device_is_an_unknown_include() {
    let dir = scratch("include-odd");
    std::fs::create_dir_all(dir.join("sub.jr")).unwrap();
    for target in ["sub.jr", "/dev/zero", "/dev/stdin", "/"] {
        let root = format!("language x\ninclude \"{target}\"\nrule j: + -> |\n");
        expect_error(
            compile_in(
                target,
                Some(dir.clone()),
                &dir.join("root.jr").display().to_string(),
                root,
            ),
            "unknown-include",
        );
    }
}

// ------------------------------------------------------------------- classes

#[test]
fn a_class_of_5000_members_in_a_three_slot_rule_is_a_clear_error() {
    let members = segments(5000).join(" ");
    let text = format!(
        "language huge\nclass big = {members}\nrule r3: [x:big] [y:big] + [z:big] -> [x] [y] | [z]\n"
    );
    let d = expect_error(compile_text("5000 × 3", text), "too-many-instances");
    let text = d.to_string();
    assert!(text.contains("125000000000 instances"), "{text}");
    assert!(text.contains("test.jr:3:"), "{text}");
}

#[test]
fn a_class_of_5000_members_in_one_slot_compiles() {
    let members = segments(5000).join(" ");
    let text = format!("language big\nclass big = {members}\nrule drop: [big] + -> |\n");
    let set = compile_text("5000 × 1", text).unwrap_or_else(|d| panic!("{d}"));
    assert_eq!(set.instances.len(), 5000);
}

#[test]
fn too_many_instances_in_all_is_an_error() {
    // Six rules of 90,000 instances each: each is allowed alone, not together.
    let members = segments(300).join(" ");
    let mut text = format!("language many\nclass c = {members}\n");
    for (i, mark) in ["|", "-", "_", "a |", "e |", "o |"].iter().enumerate() {
        text.push_str(&format!("rule r{i}: [x:c] + [y:c] -> [x] {mark} [y]\n"));
    }
    expect_error(compile_text("500k instances", text), "too-many-instances");
}

#[test]
fn a_chain_of_20000_classes_does_not_overflow_the_stack() {
    let n = 20_000;
    let mut text = String::from("language chain\n");
    for i in 0..n {
        text.push_str(&format!("class c{i} = [c{}]\n", i + 1));
    }
    text.push_str(&format!("class c{n} = a\nrule r: [c0] + -> |\n"));
    let d = expect_error(compile_text("class chain", text), "class-depth");
    assert_eq!(
        d.0.iter().filter(|x| x.code == "class-depth").count(),
        1,
        "{d}"
    );
}

#[test]
fn classes_nested_within_the_limit_compile() {
    let n = 40;
    let mut text = String::from("language chain\n");
    for i in 0..n {
        text.push_str(&format!("class c{i} = [c{}] x{i}\n", i + 1));
    }
    text.push_str(&format!("class c{n} = a\nrule r: [c0] + -> |\n"));
    let set = compile_text("short chain", text).unwrap_or_else(|d| panic!("{d}"));
    assert_eq!(set.instances.len(), n + 1);
}

#[test]
fn doubling_classes_are_stopped_before_memory_runs_out() {
    // c39 would have 2^40 members.
    let mut text = String::from("language dbl\nclass c0 = a b\n");
    for i in 1..40 {
        text.push_str(&format!("class c{i} = [c{p}] [c{p}]\n", p = i - 1));
    }
    text.push_str("rule r: [c39] + -> |\n");
    let d = expect_error(compile_text("doubling", text), "class-too-large");
    assert!(d.to_string().contains("1000000"), "{d}");
}

#[test]
fn a_circular_class_is_an_error() {
    let text = "language x\nclass a = [b] x\nclass b = [a] y\nrule r: [a] + -> |\n";
    expect_error(compile_text("circular class", text), "circular-class");
}

#[test]
fn twenty_thousand_rules_compile() {
    let segs = segments(5000);
    let mut text = String::from("language many\n");
    for i in 0..20_000 {
        text.push_str(&format!(
            "rule r{i}: {} + {}{} -> x |\n",
            segs[i % 5000],
            segs[(i * 7) % 5000],
            "a".repeat(i / 5000)
        ));
    }
    let set = compile_text("20000 rules", text).unwrap_or_else(|d| panic!("{d}"));
    assert_eq!(set.rules.len(), 20_000);
}

#[test]
fn many_errors_are_all_reported() {
    let mut text = String::from("language x\n");
    for i in 0..5_000 {
        text.push_str(&format!("rule r{i}: [nope{i}] + -> |\n"));
    }
    let d = within("5000 errors", move || {
        compile("many.jr", &text, None, &CompileOptions::default())
    })
    .err()
    .expect("must not compile");
    assert_eq!(
        d.0.iter().filter(|x| x.code == "unknown-class").count(),
        5_000
    );
}

// ---------------------------------------------- inserting without consuming

/// Our semantics: a rule may produce surface material with nothing
/// underlying (a linking element, `+ -> s |`) or consume underlying material
/// with nothing on the surface (elision, `e + -> |`). What is an error: a
/// merged surface (no boundary mark) with no underlying material on one side,
/// and a rule that consumes and produces nothing without saying where the
/// boundary is.
#[test]
fn a_linking_element_with_nothing_underlying_is_legitimate_and_splits() {
    let text = "language link\nrule link-s: + -> s |\nrule join: + -> |\n".to_string();
    let rules = compile_text("link-s", text).unwrap_or_else(|d| panic!("{d}"));
    let mut b = LexiconBuilder::new(&rules.normalizer);
    b.add_tsv("t.tsv", b"arbeit\t10\namt\t10\ns\t5\n").unwrap();
    let lexicon = b.build().unwrap();
    let analyzer = juncture::analyzer::Analyzer::new(&rules, &lexicon);
    let r = within_ref(&analyzer, "arbeitsamt");
    assert!(
        r.iter().any(|p| p == "arbeit+amt"),
        "no arbeit+amt among {r:?}"
    );
    // A string made only of linking elements cannot loop: every junction
    // moves forward.
    let r = within_ref(&analyzer, &"s".repeat(200));
    assert!(!r.is_empty());
}

fn within_ref(analyzer: &juncture::analyzer::Analyzer, input: &str) -> Vec<String> {
    let record = analyzer.split(input, 20);
    record
        .analyses
        .iter()
        .map(|a| {
            a.parts
                .iter()
                .map(|p| p.form.clone())
                .collect::<Vec<_>>()
                .join("+")
        })
        .collect()
}

#[test]
fn a_merged_surface_without_underlying_material_is_an_error() {
    for change in ["+ -> s", "a + -> e", "+ a -> e", "[v:vowel] + -> [v]"] {
        let text = format!("language x\nclass vowel = a e\nrule bad: {change}\n");
        let d = expect_error(compile_text(change, text), "merge-needs-both-sides");
        assert!(d.to_string().contains("test.jr:3:"), "{d}");
    }
}

#[test]
fn a_rule_producing_and_consuming_nothing_is_an_error() {
    // With no boundary mark this is caught as a merge with empty sides; with
    // nothing at all after the arrow it must still be an error, never a
    // rule that matches everywhere without moving.
    for change in ["+ ->", "+ -> \"\""] {
        let text = format!("language x\nrule nothing: {change}\n");
        let d = compile_text(change, text)
            .err()
            .unwrap_or_else(|| panic!("`{change}` compiled"));
        assert!(
            d.0.iter().any(|x| matches!(
                x.code,
                "merge-needs-both-sides" | "consumes-nothing" | "syntax"
            )),
            "{d}"
        );
    }
}

#[test]
fn elision_with_nothing_on_the_surface_is_legitimate() {
    let text = "language x\nrule elide: e + -> |\n".to_string();
    compile_text("elide", text).unwrap_or_else(|d| panic!("{d}"));
}

// --------------------------------------------------- conditions on unknown tags

#[test]
fn a_condition_on_an_unknown_tag_compiles_and_check_warns_about_it() {
    let dir = scratch("unknown-tag");
    let path = dir.join("unk.jr");
    std::fs::write(
        &path,
        "language unk\nset lexicon = demo\nrule join: + -> |\n  when left.colour = red\n",
    )
    .unwrap();
    // Compiling alone cannot know the tags: no error.
    let text = std::fs::read_to_string(&path).unwrap();
    compile_text("unknown tag", text).unwrap_or_else(|d| panic!("{d}"));
    // With the lexicon known, `juncture check` warns.
    let out = within("check", move || {
        std::process::Command::new(env!("CARGO_BIN_EXE_juncture"))
            .arg("check")
            .arg(&path)
            .output()
            .unwrap()
    });
    let stderr =
        String::from_utf8_lossy(&out.stderr).to_string() + &String::from_utf8_lossy(&out.stdout);
    assert!(stderr.contains("warning"), "{stderr}");
    assert!(stderr.contains("colour"), "{stderr}");
    assert!(stderr.contains("unk.jr:4:"), "{stderr}");
}

// ------------------------------------------------------------------ the CLI

#[test]
fn the_cli_reports_rule_errors_with_exit_2_quickly() {
    let dir = scratch("cli");
    let path = dir.join("huge.jr");
    let members = segments(5000).join(" ");
    std::fs::write(
        &path,
        format!("language huge\nclass big = {members}\nrule r3: [x:big] [y:big] + [z:big] -> [x] [y] | [z]\n"),
    )
    .unwrap();
    let out = within("cli huge", move || {
        std::process::Command::new(env!("CARGO_BIN_EXE_juncture"))
            .args(["split", "--no-default-lexicon", "--rules"])
            .arg(&path)
            .arg("tor")
            .output()
            .unwrap()
    });
    assert_eq!(out.status.code(), Some(2));
    assert!(out.stdout.is_empty());
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("error[too-many-instances]"), "{stderr}");
    assert!(stderr.contains("huge.jr:3:10"), "{stderr}");
}
