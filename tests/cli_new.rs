//! `tiltbook new`: a plan skeleton that explains itself, whose commented example is a valid
//! feature once uncommented, and that never writes over a file.

use std::path::Path;
use std::process::Command;
use tiltbook::traveller::{check_text, parse};
use tiltbook::units::{Angle, Unit};

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_tiltbook"))
}

/// The skeleton with its example feature uncommented in place of `features: []`.
fn uncomment_example(text: &str) -> String {
    let mut out = Vec::new();
    let mut inside = false;
    for line in text.lines() {
        if line == "# features:" {
            inside = true;
        }
        if inside && line == "#" {
            inside = false;
        }
        if inside {
            out.push(line.trim_start_matches("# ").to_string());
        } else if line != "features: []" {
            out.push(line.to_string());
        }
    }
    out.join("\n") + "\n"
}

#[test]
fn writes_a_plan_that_asks_for_features_and_whose_example_is_valid() {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("j-3001.yaml");
    let out = bin()
        .args(["new"])
        .arg(&p)
        .args(["--part", "TP-9 test plate", "--drawing", "TP-9"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    let so = String::from_utf8_lossy(&out.stdout);
    assert!(
        so.contains("tiltbook check") && so.contains("tiltbook open"),
        "{so}"
    );
    let text = std::fs::read_to_string(&p).unwrap();
    let t = parse(&text).unwrap().traveller;
    assert_eq!(t.job.id, "j-3001");
    assert_eq!(t.job.part, "TP-9 test plate");
    assert_eq!(t.job.drawing, "TP-9");
    assert_eq!(t.job.unit, Unit::In);
    // as written it has no features yet, and check says where to add them
    let problems: Vec<String> = check_text(&text).iter().map(|p| p.to_string()).collect();
    assert_eq!(problems.len(), 1, "{problems:?}");
    assert!(problems[0].contains("no features"), "{problems:?}");
    let check = bin().arg("check").arg(&p).output().unwrap();
    assert_eq!(check.status.code(), Some(1));
    // the commented example, uncommented, is a clean plan
    let filled = uncomment_example(&text);
    assert!(
        check_text(&filled).is_empty(),
        "{:?}\n{filled}",
        check_text(&filled)
    );
    let t = parse(&filled).unwrap().traveller;
    assert_eq!(t.features.len(), 1);
    assert_eq!(t.features[0].nominal, Some(Angle::from_deg(30.0)));
}

#[test]
fn millimetres_on_request() {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("j-3002.yaml");
    let out = bin()
        .arg("new")
        .arg(&p)
        .args(["--part", "gib: left", "--units", "mm"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    let t = parse(&std::fs::read_to_string(&p).unwrap())
        .unwrap()
        .traveller;
    assert_eq!(t.job.unit, Unit::Mm);
    assert_eq!(t.job.part, "gib: left");
}

#[test]
fn never_writes_over_a_file() {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("job.yaml");
    std::fs::write(&p, "work already here\n").unwrap();
    let out = bin()
        .arg("new")
        .arg(&p)
        .args(["--part", "x"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let se = String::from_utf8_lossy(&out.stderr);
    assert!(
        se.contains("exists already") && se.contains("new file name"),
        "{se}"
    );
    assert_eq!(std::fs::read_to_string(&p).unwrap(), "work already here\n");
}

#[test]
fn bad_input_says_what_to_type() {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("j.yaml");
    let out = bin()
        .arg("new")
        .arg(&p)
        .args(["--part", "x", "--units", "ft"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("use in or mm"));
    let out = bin()
        .arg("new")
        .arg(&p)
        .args(["--part", "  "])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("the part is empty"));
    assert!(!Path::new(&p).exists(), "nothing written on bad input");
}
