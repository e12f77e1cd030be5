//! Hostile input: an alias bomb, a very large file and very deep nesting are refused with a
//! message saying what was wrong, without running out of memory or stack, and `tiltbook check`
//! reports them instead of crashing. The attack shapes are the well-known YAML ones
//! (exponential and quadratic alias expansion, deep flow nesting): common practice (no source).

use std::fs;
use std::path::Path;
use std::process::Command;
use tiltbook::store::{self, StoreError};
use tiltbook::traveller::schema::{MAX_BYTES, MAX_DEPTH};
use tiltbook::traveller::{LoadError, parse};

/// The classic "billion laughs": nine levels, each alias list ten times the one below.
fn billion_laughs() -> String {
    let mut s =
        String::from("schema: 1\na0: &a0 [lol, lol, lol, lol, lol, lol, lol, lol, lol, lol]\n");
    for i in 1..10 {
        let p = i - 1;
        s.push_str(&format!(
            "a{i}: &a{i} [*a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}, *a{p}]\n"
        ));
    }
    s.push_str("job: *a9\n");
    s
}

/// Quadratic expansion: one anchored list of `k` items repeated `m` times. Each alias is a
/// single jump, so a limit on jumps alone does not stop it (k·m values from k + m of text).
fn quadratic(k: usize, m: usize) -> String {
    let mut s = String::from("schema: 1\nbig: &b [");
    s.push_str(&vec!["1"; k].join(","));
    s.push_str("]\njob: [");
    s.push_str(&vec!["*b"; m].join(","));
    s.push_str("]\n");
    s
}

fn nested(depth: usize) -> String {
    format!(
        "schema: 1\njob: {}{}\n",
        "[".repeat(depth),
        "]".repeat(depth)
    )
}

fn message(e: &LoadError) -> String {
    e.to_string()
}

fn tiltbook_check(path: &Path) -> (Option<i32>, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .arg("check")
        .arg(path)
        .output()
        .unwrap();
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn the_billion_laughs_is_refused() {
    let e = parse(&billion_laughs()).unwrap_err();
    let m = message(&e);
    assert!(m.contains("aliases (`*name`)"), "{m}");
    assert_eq!((e.pos().line, e.pos().col), (1, 1));
}

#[test]
fn quadratic_alias_expansion_is_refused() {
    // 200 000 values anchored, repeated 200 000 times: 4·10^10 values if expanded
    let text = quadratic(200_000, 200_000);
    let e = parse(&text).unwrap_err();
    let m = message(&e);
    assert!(m.contains("aliases (`*name`) expand to more than"), "{m}");
    assert!(m.contains("write the values out"), "{m}");
}

#[test]
fn a_few_aliases_still_read() {
    // a small anchor used twice is ordinary YAML: not refused by the guard (the file is then
    // judged as a traveller, and this one is not one)
    let text = "schema: 1\nx: &n [1, 2]\njob: {id: J, part: P, notes: *n}\n";
    let m = message(&parse(text).unwrap_err());
    assert!(!m.contains("aliases"), "{m}");
}

#[test]
fn deep_nesting_is_refused_without_overflowing_the_stack() {
    for depth in [MAX_DEPTH + 1, 10_000, 1_000_000] {
        let e = parse(&nested(depth)).unwrap_err();
        let m = message(&e);
        assert!(
            m.contains(&format!("more than the {MAX_DEPTH} levels deep allowed")),
            "{depth}: {m}"
        );
        assert_eq!(e.pos().line, 2, "{m}");
    }
    // the same with block mappings, one level per line: refused at the line that goes too deep
    let mut s = String::from("schema: 1\njob:\n");
    for i in 0..2_000 {
        s.push_str(&" ".repeat(i + 1));
        s.push_str("k:\n");
    }
    let e = parse(&s).unwrap_err();
    assert!(message(&e).contains("levels deep"), "{e}");
    // `job:` on line 2 is level 1 of its own lines; line 3 + 64 is the 65th
    assert_eq!(e.pos().line, MAX_DEPTH + 3, "{e}");
    // `- - - …` on one line, 4 MB of it
    let s = format!("schema: 1\njob:\n{}x\n", "- ".repeat(2_000_000));
    assert!(message(&parse(&s).unwrap_err()).contains("levels deep"));
    // brackets spread over many lines: the YAML reader's own limit, with a clear message
    let s = format!(
        "schema: 1\njob:{}{}\n",
        " [\n".repeat(10_000),
        " ]\n".repeat(10_000)
    );
    let m = message(&parse(&s).unwrap_err());
    assert!(m.contains("more than 128 levels deep"), "{m}");
}

#[test]
fn text_over_the_limit_is_refused_by_parse() {
    let text = format!("schema: 1\n#{}\n", "x".repeat(MAX_BYTES as usize));
    let m = message(&parse(&text).unwrap_err());
    assert!(m.contains("16.8 MB"), "{m}");
    assert!(m.contains(&format!("({MAX_BYTES} bytes)")), "{m}");
}

#[test]
fn a_50_mb_file_is_refused_before_reading() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("big.yaml");
    let f = fs::File::create(&path).unwrap();
    f.set_len(50 * 1024 * 1024).unwrap(); // sparse: a real read would take 50 MB
    let e = store::load(&path).unwrap_err();
    assert!(matches!(e, StoreError::Read { .. }), "{e:?}");
    let m = e.to_string();
    assert!(m.contains("52.4 MB (52428800 bytes)"), "{m}");
    assert!(m.contains("more than the 16.8 MB"), "{m}");
    let e = store::Store::open(&path, "KM").unwrap_err();
    assert!(e.to_string().contains("52428800 bytes"), "{e}");
    assert!(!store::lock_path(&path).exists());
}

#[test]
fn check_reports_each_hostile_file_and_exits_cleanly() {
    let dir = tempfile::tempdir().unwrap();
    let bomb = dir.path().join("bomb.yaml");
    fs::write(&bomb, billion_laughs()).unwrap();
    let (code, out, err) = tiltbook_check(&bomb);
    assert_eq!(code, Some(1), "{out}{err}");
    assert!(
        out.contains("bomb.yaml:1:1: the file's aliases"),
        "{out}{err}"
    );

    let deep = dir.path().join("deep.yaml");
    fs::write(&deep, nested(100_000)).unwrap();
    let (code, out, err) = tiltbook_check(&deep);
    assert_eq!(code, Some(1), "{out}{err}");
    assert!(out.contains("levels deep"), "{out}{err}");

    let big = dir.path().join("big.yaml");
    fs::File::create(&big)
        .unwrap()
        .set_len(50 * 1024 * 1024)
        .unwrap();
    let (code, out, err) = tiltbook_check(&big);
    assert_eq!(code, Some(2), "{out}{err}");
    assert!(err.contains("52.4 MB (52428800 bytes)"), "{out}{err}");
    assert!(!err.contains("panicked"), "{err}");
}
