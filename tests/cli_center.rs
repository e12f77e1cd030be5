//! `tiltbook center` as a user runs it: exit codes, JSON values and error wording.
//! Expected values follow from C = M − (d₁ + d₂)/2 over the rolls and C = M + (d₁ + d₂)/2
//! between them (DOMAIN.md, "Centre distance from a measurement over the rolls").

use serde_json::Value;
use std::process::{Command, Output};

fn tiltbook(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .args(args)
        .output()
        .expect("the tiltbook binary runs")
}

fn stdout(out: &Output) -> String {
    String::from_utf8_lossy(&out.stdout).into_owned()
}

fn stderr(out: &Output) -> String {
    String::from_utf8_lossy(&out.stderr).into_owned()
}

#[test]
fn over_the_rolls() {
    // 5.625 − (0.625 + 0.625)/2 = 5.000 in
    let out = tiltbook(&["center", "--over", "5.625in", "--rolls", "0.625in,0.625in"]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert!(stdout(&out).contains("5.0000 in"), "{}", stdout(&out));
}

#[test]
fn between_the_rolls_and_one_diameter_for_both() {
    // 4.375 + (0.625 + 0.625)/2 = 5.000 in
    let out = tiltbook(&["center", "--inside", "4.375in", "--rolls", "0.625in"]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert!(stdout(&out).contains("5.0000 in"), "{}", stdout(&out));
}

#[test]
fn json_keys_and_values() {
    // 137.5 − (25 + 25)/2 = 112.5 mm; unequal rolls: 10.7505 − (0.7500 + 0.7490)/2 = 10.0010 in
    let out = tiltbook(&[
        "center",
        "--over",
        "137.5mm",
        "--rolls",
        "25mm,25mm",
        "--json",
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let v: Value = serde_json::from_slice(&out.stdout).expect("JSON");
    assert_eq!(v["center"], "112.500");
    assert_eq!(v["unit"], "mm");
    assert_eq!(v["measured"], "137.500");
    assert_eq!(v["measured_how"], "over");
    assert_eq!(v["rolls"][0], "25.000");
    let out = tiltbook(&[
        "center",
        "--over",
        "10.7505in",
        "--rolls",
        "0.7500in,0.7490in",
        "--json",
    ]);
    let v: Value = serde_json::from_slice(&out.stdout).expect("JSON");
    assert_eq!(v["center"], "10.0010");
    assert_eq!(v["rolls"][1], "0.7490");
}

#[test]
fn bad_input_exits_2_and_says_what_to_type() {
    for (args, words) in [
        (
            vec!["center", "--over", "abc", "--rolls", "0.625in"],
            "not a length",
        ),
        (
            vec![
                "center",
                "--over",
                "5.625in",
                "--rolls",
                "0.625in,0.625in,1in",
            ],
            "two diameters",
        ),
        (
            vec!["center", "--over", "0.5in", "--rolls", "0.625in,0.625in"],
            "more than zero",
        ),
        (
            vec!["center", "--over", "5.625ft", "--rolls", "0.625in"],
            "not a unit",
        ),
        (
            vec!["center", "--over=-5in", "--rolls", "0.625in"],
            "more than zero",
        ),
    ] {
        let out = tiltbook(&args);
        let err = stderr(&out);
        assert_eq!(out.status.code(), Some(2), "{args:?}: {err}");
        assert!(err.contains(words), "{args:?}: {err}");
        assert!(out.stdout.is_empty(), "{args:?} printed on stdout");
    }
    // missing measurement: the parser names what is needed
    let out = tiltbook(&["center", "--rolls", "0.625in"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(stderr(&out).contains("--over"), "{}", stderr(&out));
}
