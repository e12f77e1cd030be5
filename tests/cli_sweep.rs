//! `tiltbook sweep` as a user runs it: exit codes, JSON values, text and error wording.

use serde_json::Value;
use std::process::{Command, Output};

fn tiltbook(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .args(args)
        .env("NO_COLOR", "1")
        .output()
        .expect("the tiltbook binary runs")
}

fn json(args: &[&str]) -> Value {
    let out = tiltbook(args);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("the output is JSON")
}

fn stderr(out: &Output) -> String {
    String::from_utf8_lossy(&out.stderr).into_owned()
}

fn num(v: &Value, key: &str) -> f64 {
    v[key]
        .as_f64()
        .unwrap_or_else(|| panic!("{key} is not a number in {v}"))
}

#[test]
fn one_and_a_half_tenths_over_five_inches() {
    // indicator-slope.csv (mpmath): atan(0.0015/5) = 61.87944"
    let v = json(&["sweep", "--travel", "5in", "0", "0.0015", "--json"]);
    assert!((num(&v, "residual_arcsec") - 61.87944).abs() < 5e-6, "{v}");
    assert!((num(&v, "slope") - 0.0003).abs() < 1e-15, "{v}");
    assert_eq!(v["readings"], 2);
    assert_eq!(v["unit"], "in");
    assert_eq!(v["straightness"], "0.00000");
    assert_eq!(v["rises"], "raised_end");
    assert!(v["correction"].is_null(), "{v}");
}

#[test]
fn negative_readings_are_readings_not_options() {
    // indicator-slope.csv row 0.0005,4,in = 25.783101"; a rise of 0.0010 over 4 in is
    // atan(0.00025) = 51.566" (twice that row, to the row's rounding)
    let v = json(&[
        "sweep", "--travel", "4in", "-0.0005", "0", "0.0005", "--json",
    ]);
    assert!((num(&v, "residual_arcsec") - 51.566202).abs() < 3e-6, "{v}");
    assert_eq!(v["readings"], 3);
    // and after the options too, or with a unit after --
    let v = json(&[
        "sweep",
        "--json",
        "--travel",
        "4in",
        "--",
        "-0.0005in",
        "0",
        "0.0005in",
    ]);
    assert!((num(&v, "residual_arcsec") - 51.566202).abs() < 3e-6, "{v}");
}

#[test]
fn positions_with_readings_in_every_form() {
    // indicator-slope.csv (mpmath): 0.0015 in over 5 in = 61.87944"
    for args in [
        vec!["sweep", "--at", "0=0", "--at", "5=0.0015", "--json"],
        vec!["sweep", "--at", "0=0", "5in=0.0015in", "--json"],
        vec!["sweep", "--at", "0=0,5=0.0015", "--json"],
        vec!["sweep", "--json", "--at", "5=0.0015", "0=0"],
    ] {
        let v = json(&args);
        assert!(
            (num(&v, "residual_arcsec") - 61.87944).abs() < 5e-6,
            "{args:?}: {v}"
        );
    }
    // a surface falling toward the raised end
    let v = json(&["sweep", "--at", "0=0.0015", "--at", "5=0", "--json"]);
    assert!((num(&v, "residual_arcsec") + 61.87944).abs() < 5e-6, "{v}");
    assert_eq!(v["rises"], "pivot_end");
}

#[test]
fn millimetres() {
    // indicator-slope.csv (mpmath): 0.0291 mm over 100 mm = 60.023057"
    let v = json(&[
        "sweep", "--unit", "mm", "--travel", "100", "0", "0.0291", "--json",
    ]);
    assert!((num(&v, "residual_arcsec") - 60.023057).abs() < 5e-7, "{v}");
    assert_eq!(v["unit"], "mm");
    assert_eq!(v["travel"], "100.000");
    // travel in mm with bare readings: a note says they were read in inches
    let out = tiltbook(&["sweep", "--travel", "100mm", "0", "0.0291"]);
    assert_eq!(out.status.code(), Some(0));
    assert!(stderr(&out).contains("add --unit mm"), "{}", stderr(&out));
}

#[test]
fn straightness_of_a_bowed_surface() {
    // 0, +0.0004, 0 over 4 in: the line through them is level at +0.000133, so the middle
    // reading sits 0.000267 above it and the ends 0.000133 below: max − min = 0.0004
    // (DOMAIN.md definition of straightness)
    let v = json(&["sweep", "--travel", "4in", "0", "0.0004", "0", "--json"]);
    assert_eq!(v["straightness"], "0.00040");
    assert_eq!(v["rises"], "level");
}

#[test]
fn correction_raises_the_stack() {
    // ΔH ≈ −C·cos θ·δ (DOMAIN.md): a fall of 0.0009 in over 5 in at 30° on a 5 in fixture is
    // 5 × cos 30° × 0.00018 = 0.00078 in, so raise the stack 0.0008 in from 2.5000 in
    let args = [
        "sweep", "--travel", "5in", "0", "-0.0009", "--center", "5in", "--angle", "30",
    ];
    let out = tiltbook(&args);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("raise the stack by 0.0008 in to 2.5008 in"),
        "{text}"
    );
    assert!(text.contains("rises toward the pivot end"), "{text}");
    assert!(text.contains("never cut on an unsecured stack"), "{text}");
    let mut with_json = args.to_vec();
    with_json.push("--json");
    let v = json(&with_json);
    let c = &v["correction"];
    assert_eq!(c["delta_height"], "0.0008", "{v}");
    assert_eq!(c["new_height"], "2.5008", "{v}");
    // θ = asin(2.5008/5)
    let want = (2.5008f64 / 5.0).asin().to_degrees();
    assert!((num(c, "achieved_deg") - want).abs() < 1e-9, "{v}");
}

#[test]
fn correction_lowers_the_stack_in_millimetres() {
    // 0.0291 mm over 100 mm (60.02", indicator-slope.csv) at 30° on a 100 mm fixture:
    // ΔH ≈ −100 × cos 30° × 0.000291 = −0.0252 mm → lower 0.025 mm to 49.975 mm
    let v = json(&[
        "sweep", "--unit", "mm", "--travel", "100", "0", "0.0291", "--center", "100", "--angle",
        "30", "--json",
    ]);
    assert_eq!(v["correction"]["delta_height"], "-0.025", "{v}");
    assert_eq!(v["correction"]["new_height"], "49.975", "{v}");
}

#[test]
fn text_for_the_machinist() {
    let out = tiltbook(&["sweep", "--travel", "5in", "0", "0.0015"]);
    assert_eq!(out.status.code(), Some(0));
    let text = String::from_utf8_lossy(&out.stdout);
    // 61.88" is 0°01'02" to the nearest second
    assert!(text.contains("+61.9\""), "{text}");
    assert!(text.contains("0°01'02\""), "{text}");
    assert!(
        text.contains("the surface rises toward the raised end"),
        "{text}"
    );
    assert!(text.contains("straightness"), "{text}");
}

#[test]
fn bad_input_says_what_to_type() {
    for (args, code, words) in [
        (
            vec!["sweep", "--travel", "5in", "0"],
            2,
            "at least two readings",
        ),
        (
            vec!["sweep", "--travel", "0in", "0", "0.001"],
            2,
            "travel is zero",
        ),
        (
            vec!["sweep", "--at", "1=0", "--at", "1=0.001"],
            2,
            "same position",
        ),
        (
            vec!["sweep", "--travel", "5in", "0", "abc"],
            2,
            "reading 2 ('abc')",
        ),
        (vec!["sweep", "--at", "5"], 2, "joined by ="),
        (vec!["sweep"], 2, "--travel 5in 0 0.0015"),
        (
            vec!["sweep", "--travel", "5in", "0", "1", "--unit", "cm"],
            2,
            "use in",
        ),
        (
            vec!["sweep", "--travel", "5in", "0", "0.001", "--center", "5in"],
            2,
            "--angle 30",
        ),
        (
            vec![
                "sweep", "--travel", "5in", "0", "0.001", "--center", "5in", "--angle", "95",
            ],
            2,
            "complement",
        ),
        (
            vec!["sweep", "--at", "0=0", "5=0.001", "0.002"],
            2,
            "joined by =",
        ),
        // levelling would need the fixture below 0°: understood, but cannot be met
        (
            vec![
                "sweep", "--travel", "5in", "0", "0.001", "--center", "5in", "--angle", "0",
            ],
            1,
            "outside 0° to 90°",
        ),
    ] {
        let out = tiltbook(&args);
        let err = stderr(&out);
        assert_eq!(out.status.code(), Some(code), "{args:?}: {err}");
        assert!(err.contains(words), "{args:?}: {err}");
        assert!(out.stdout.is_empty(), "{args:?} printed on stdout");
    }
    // options that need --center are refused by the parser (exit 2)
    let out = tiltbook(&["sweep", "--travel", "5in", "0", "0.001", "--angle", "30"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(stderr(&out).contains("--center"), "{}", stderr(&out));
}
