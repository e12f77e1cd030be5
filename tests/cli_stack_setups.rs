//! `tiltbook stack` for tapers, compound angles and small angles, run on the real binary and
//! checked against sources outside tiltbook:
//! - tests/data/sine-tables/tapers.csv and compound.csv (mpmath 1.3.0 at 50 digits, rounded
//!   half-to-even; see tests/data/README.md);
//! - tests/data/sine-tables/sensitivity.csv (dθ/dH = 1/(L·cos θ), 4.125296" per 0.0001 in at 0°
//!   on 5 in) for the bound on a small-angle setup;
//! - Machinery's Handbook, 31st ed., "Compound Angles" (view slopes 47°14′ and 38°10′, true
//!   slope 53°12′ to the nearest minute);
//! - the standard set compositions in standards.md (inch 81: common practice; metric 88: from
//!   memory), which the complete sets follow.
//!
//! Each printed setup is also recomputed here in plain f64 from the printed blocks
//! (H = C·sin θ, θ = asin(H/C)), independently of tiltbook's code.

use serde_json::Value;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn run(args: &[&str]) -> Output {
    let home = tempfile::tempdir().unwrap();
    let h = home.path();
    Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .args(args)
        .env("HOME", h)
        .env("XDG_CONFIG_HOME", h.join(".config"))
        .env("APPDATA", h.join("AppData"))
        .env_remove("TILTBOOK_SHOP")
        .output()
        .expect("the tiltbook binary runs")
}

fn text(b: &[u8]) -> String {
    String::from_utf8_lossy(b).into_owned()
}

fn ok_text(args: &[&str]) -> String {
    let o = run(args);
    assert_eq!(o.status.code(), Some(0), "{args:?}: {}", text(&o.stderr));
    text(&o.stdout)
}

fn json(args: &[&str]) -> Value {
    let out = ok_text(args);
    serde_json::from_str(&out).unwrap_or_else(|e| panic!("{e}: {out}"))
}

fn rows(file: &str) -> Vec<Vec<String>> {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/data/sine-tables")
        .join(file);
    std::fs::read_to_string(path)
        .unwrap()
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .skip(1)
        .map(|l| l.split(',').map(|c| c.trim().to_string()).collect())
        .collect()
}

fn f(v: &Value) -> f64 {
    match v {
        Value::String(s) => s.parse().unwrap_or(f64::NAN),
        v => v.as_f64().unwrap_or(f64::NAN),
    }
}

/// The blocks of a JSON stack entry, as numbers.
fn sizes(stack: &Value) -> Vec<f64> {
    stack["blocks"]
        .as_array()
        .unwrap_or_else(|| panic!("no blocks: {stack}"))
        .iter()
        .map(f)
        .collect()
}

/// The stacks printed in a text report: (heading, block sizes bottom to top, printed total).
fn printed_stacks(out: &str) -> Vec<(String, Vec<f64>, f64)> {
    let mut v = Vec::new();
    let mut lines = out.lines();
    while let Some(l) = lines.next() {
        if !(l.starts_with("Stack ") && l.ends_with("wring bottom to top:")) {
            continue;
        }
        let mut blocks = Vec::new();
        let mut total = f64::NAN;
        for b in lines.by_ref() {
            let t = b.trim();
            if let Some(rest) = t.strip_prefix("total ") {
                total = rest.split_whitespace().next().unwrap().parse().unwrap();
                break;
            }
            // "  1.     0.1440 in   (bottom)"
            let mut w = t.split_whitespace();
            let n = w.next().unwrap_or("");
            assert!(n.ends_with('.'), "not a block line: {b:?}");
            blocks.push(w.next().unwrap().parse().unwrap());
        }
        v.push((l.to_string(), blocks, total));
    }
    v
}

fn asin_deg(h: f64, c: f64) -> f64 {
    (h / c).asin().to_degrees()
}

/// Half the sensitivity step in arc-seconds: step/(2·C·cos θ).
fn half_step_arcsec(step: f64, c: f64, deg: f64) -> f64 {
    (step / (2.0 * c * deg.to_radians().cos())).to_degrees() * 3600.0
}

#[test]
fn half_a_degree_on_five_inches_takes_two_stacks() {
    // the must-show: 0°30' on a 5 in bar from the 81-piece set; 5·sin 0.5° = 0.0436 in is below
    // the set's smallest block (0.050 in, standards.md), so a stack under each roll
    let out = ok_text(&["stack", "0d30m", "--center", "5in", "--set", "inch-81"]);
    assert!(out.contains("Small angle:"), "{out}");
    assert!(
        out.contains("Chosen (*): two stacks on this fixture"),
        "{out}"
    );
    assert!(out.contains("Caution: clamp the work"), "{out}");
    let st = printed_stacks(&out);
    assert_eq!(st.len(), 2, "{out}");
    assert!(st[0].0.contains("under the raised roll"), "{}", st[0].0);
    assert!(st[1].0.contains("under the pivot roll"), "{}", st[1].0);
    for (h, blocks, total) in &st {
        let sum: f64 = blocks.iter().sum();
        assert!((sum - total).abs() < 1e-9, "{h}: {blocks:?} ≠ {total}");
    }
    // the 81 set has one block of each size: no size in both stacks means no block shared
    for b in &st[0].1 {
        assert!(!st[1].1.contains(b), "block {b} in both stacks");
    }
    let h = st[0].2 - st[1].2;
    let theta = asin_deg(h, 5.0);
    let err = (theta - 0.5) * 3600.0;
    // the bound: 0.0001 in/(2·5 in·cos θ); at 0° that is half of sensitivity.csv's 4.125296"
    let bound = half_step_arcsec(0.0001, 5.0, 0.5);
    assert!((bound - 4.125296 / 2.0 / 0.5f64.to_radians().cos()).abs() < 1e-5);
    assert!(err.abs() <= bound, "error {err}\" > {bound}\"");
    assert!(
        out.contains(&format!("{:+.2}\"", err)),
        "{err:+.2} not printed: {out}"
    );

    let v = json(&[
        "stack", "0d30m", "--center", "5in", "--set", "inch-81", "--json",
    ]);
    assert_eq!(v["setup"], "two stacks");
    assert_eq!(v["small_angle"]["chosen"], "two stacks");
    let s = v["stacks"].as_array().unwrap();
    assert_eq!(s.len(), 2);
    let (r, p) = (sizes(&s[0]), sizes(&s[1]));
    let d = r.iter().sum::<f64>() - p.iter().sum::<f64>();
    assert!((d - f(&v["height"])).abs() < 1e-9, "{d} vs {}", v["height"]);
    assert!((f(&v["achieved_deg"]) - asin_deg(d, 5.0)).abs() < 1e-8);
    assert!((f(&v["error_arcsec"]) - (asin_deg(d, 5.0) - 0.5) * 3600.0).abs() < 0.006);
    assert_eq!(v["block_count"], r.len() + p.len());
    for st in s {
        assert_eq!(st["setting_deg"], 0.5);
        assert!(st["role"].as_str().unwrap().contains("roll"));
    }
}

#[test]
fn the_taper_must_show_on_a_100_mm_fixture() {
    // tapers.csv: 1:20 → half 1.4320961842°, included 2.8641923683°
    let out = ok_text(&[
        "stack",
        "--taper",
        "1:20",
        "--center",
        "100mm",
        "--set",
        "metric-88",
    ]);
    let dms = |deg: f64| {
        let s = (deg * 3600.0).round() as i64;
        format!("{}°{:02}'{:02}\"", s / 3600, s % 3600 / 60, s % 60)
    };
    assert!(
        out.contains(&format!("half angle {}", dms(1.4320961842))),
        "{out}"
    );
    assert!(
        out.contains(&format!("included angle {}", dms(2.8641923683))),
        "{out}"
    );
    assert!(out.contains("Caution: clamp the work"), "{out}");
    let st = printed_stacks(&out);
    assert_eq!(st.len(), 1, "{out}");
    assert!(
        st[0].0.contains("raised roll of the sine centres"),
        "{}",
        st[0].0
    );
    let h: f64 = st[0].1.iter().sum();
    assert!((h - st[0].2).abs() < 1e-9);
    // 100·sin(1.4320961842°) = 2.49922 mm, to the 0.0005 mm grid of the 88 set: 2.499
    let err = (asin_deg(h, 100.0) - 1.4320961842) * 3600.0;
    assert!(err.abs() <= half_step_arcsec(0.0005, 100.0, 1.43), "{err}");
    assert!((h - 2.499).abs() < 1e-9, "{h}");
}

#[test]
fn every_row_of_tapers_csv_through_the_command() {
    // tapers.csv (mpmath): half and included angle to 10 decimals; JSON carries 9 decimals
    let rows = rows("tapers.csv");
    assert!(rows.len() >= 8);
    for r in &rows {
        let (half, included): (f64, f64) = (r[4].parse().unwrap(), r[5].parse().unwrap());
        for spec in [
            r[0].clone(),
            format!("included {}", r[5]),
            format!("half {}", r[4]),
        ] {
            let v = json(&[
                "stack", "--taper", &spec, "--center", "5in", "--set", "inch-81", "--json",
            ]);
            let close = |x: &Value, want: f64| (f(x) - want).abs() <= 6e-10;
            assert!(
                close(&v["half_angle_deg"], half),
                "{spec}: {}",
                v["half_angle_deg"]
            );
            assert!(close(&v["included_angle_deg"], included), "{spec}: {v}");
            assert!(close(&v["angle_deg"], half), "{spec}");
            // what is built really sets the half angle, to within half a step of stack
            let s = v["stacks"].as_array().unwrap();
            let h = match s.len() {
                1 => sizes(&s[0]).iter().sum::<f64>(),
                2 => sizes(&s[0]).iter().sum::<f64>() - sizes(&s[1]).iter().sum::<f64>(),
                n => panic!("{n} stacks"),
            };
            let err = (asin_deg(h, 5.0) - half) * 3600.0;
            assert!(
                err.abs() <= half_step_arcsec(0.0001, 5.0, half) + 1e-6,
                "{spec}: {err}"
            );
            assert!((f(&v["error_arcsec"]) - err).abs() < 0.006, "{spec}");
        }
    }
}

/// A view angle from compound.csv as typed: 47.23333333 is 47°14′ (the 10-decimal upper_u_deg
/// column confirms it), so whole arc-seconds are typed as D-M-S.
fn typed(v: &str) -> String {
    let x: f64 = v.parse().unwrap();
    let s = (x * 3600.0).round();
    if (x - s / 3600.0).abs() < 1e-8 {
        let s = s as i64;
        format!("{}d{}m{}s", s / 3600, s % 3600 / 60, s % 60)
    } else {
        v.to_string()
    }
}

#[test]
fn every_row_of_compound_csv_through_the_command() {
    // compound.csv (mpmath, rotation matrices): upper plate = A, lower plate, true slope (10
    // decimals), stacks for 5 in plates (8 decimals)
    let rows = rows("compound.csv");
    assert!(rows.len() >= 8);
    for r in &rows {
        let arg = format!("{},{}", typed(&r[0]), typed(&r[1]));
        let want: Vec<f64> = r[2..].iter().map(|x| x.parse().unwrap()).collect();
        let v = json(&[
            "stack",
            "--compound",
            &arg,
            "--center",
            "5in",
            "--set",
            "inch-81",
            "--json",
        ]);
        let s = v["stacks"].as_array().unwrap();
        let close = |x: f64, w: f64, tol: f64| (x - w).abs() <= tol;
        assert!(close(f(&s[0]["setting_deg"]), want[0], 6e-10), "{arg}: {v}");
        assert!(close(f(&s[1]["setting_deg"]), want[1], 6e-10), "{arg}: {v}");
        assert!(close(f(&v["true_slope_deg"]), want[2], 6e-10), "{arg}");
        // ideal heights are held to the nearest nanometre (2e-8 in)
        assert!(close(f(&s[0]["ideal_height"]), want[3], 2.6e-8), "{arg}");
        assert!(close(f(&s[1]["ideal_height"]), want[4], 2.6e-8), "{arg}");
        // the two stacks share no block (one block of each size in the 81 set)
        let (a, b) = (sizes(&s[0]), sizes(&s[1]));
        assert!(a.iter().all(|x| !b.contains(x)), "{arg}: {a:?} / {b:?}");
        // recompute the plane they level from the blocks alone
        let (hn, ho) = (a.iter().sum::<f64>(), b.iter().sum::<f64>());
        let (u, l) = ((hn / 5.0).asin(), (ho / 5.0).asin());
        let (ta, tb) = (u.tan(), l.tan() / u.cos());
        let slope = ta.hypot(tb).atan().to_degrees();
        assert!(close(f(&v["achieved_deg"]), slope, 2e-9), "{arg}");
        let (wa, wb) = (
            want[0].to_radians().tan(),
            (r[1].parse::<f64>().unwrap()).to_radians().tan(),
        );
        let n1 = [-ta, -tb, 1.0];
        let n2 = [-wa, -wb, 1.0];
        let dot: f64 = n1.iter().zip(&n2).map(|(x, y)| x * y).sum();
        let len = |n: &[f64; 3]| n.iter().map(|x| x * x).sum::<f64>().sqrt();
        let tilt = (dot / (len(&n1) * len(&n2))).min(1.0).acos().to_degrees() * 3600.0;
        assert!(
            (f(&v["plane_error_arcsec"]) - tilt).abs() < 0.02,
            "{arg}: {} vs {tilt}",
            v["plane_error_arcsec"]
        );
        // each plate within half a step of stack of its setting where the 81 set makes the
        // rounded height; below 0.1001 in only 0.050 in is made (standards.md series), and
        // then the command says that plate is off
        for (k, (st, w, ideal)) in [(&s[0], want[0], want[3]), (&s[1], want[1], want[4])]
            .into_iter()
            .enumerate()
        {
            let h: f64 = sizes(st).iter().sum();
            let e = (asin_deg(h, 5.0) - w) * 3600.0;
            let rounded = (ideal * 1e4).round() / 1e4;
            let makes = rounded >= 0.1001 - 1e-9 || (rounded - 0.05).abs() < 1e-9;
            if makes {
                assert!(
                    e.abs() <= half_step_arcsec(0.0001, 5.0, w) + 1e-6,
                    "{arg}: {e}"
                );
            } else {
                let word = ["upper", "lower"][k];
                let warned = v["warnings"].to_string();
                assert!(
                    warned.contains(&format!("the {word} plate's stack is")),
                    "{arg}: {warned}"
                );
            }
        }
    }
}

#[test]
fn the_compound_must_show() {
    // compound.csv row 30,20: lower plate 17.495240757°, true slope 34.3135770215°,
    // stacks 2.5 and 1.50313289 in on 5 in plates
    let out = ok_text(&[
        "stack",
        "--compound",
        "30,20",
        "--center",
        "5in",
        "--set",
        "inch-81",
    ]);
    assert!(out.contains("true slope      34°18'49\""), "{out}");
    assert!(out.contains("no block is in both"), "{out}");
    assert!(out.contains("Caution: clamp the work"), "{out}");
    let st = printed_stacks(&out);
    assert_eq!(st.len(), 2, "{out}");
    assert!(st[0].0.contains("upper plate") && st[0].0.contains("30°00'00\""));
    assert!(st[1].0.contains("lower plate") && st[1].0.contains("17°29'43\""));
    let (hn, ho): (f64, f64) = (st[0].1.iter().sum(), st[1].1.iter().sum());
    assert!(
        (hn - 2.5).abs() < 1e-9 && (ho - 1.5031).abs() < 1e-9,
        "{hn} {ho}"
    );
    assert!(st[0].1.iter().all(|b| !st[1].1.contains(b)));
    let e = (asin_deg(ho, 5.0) - 17.495240757) * 3600.0;
    assert!(e.abs() <= half_step_arcsec(0.0001, 5.0, 17.5));
}

#[test]
fn handbook_compound_angle_through_the_command() {
    // Machinery's Handbook, 31st ed., "Compound Angles": 47°14′ and 38°10′ → true slope 53°12′
    // to the nearest minute
    let v = json(&[
        "stack",
        "--compound",
        "47d14m,38d10m",
        "--center",
        "5in",
        "--json",
    ]);
    let minutes = (f(&v["true_slope_deg"]) * 60.0).round() as i64;
    assert_eq!((minutes / 60, minutes % 60), (53, 12), "{v}");
    // steep: the upper plate at 47°14′ is warned about
    assert!(
        v["warnings"]
            .to_string()
            .contains("steep angle on the upper plate")
    );
}

#[test]
fn another_remedy_on_request() {
    // 0°30′ on 5 in: one stack on the built-in 10 in plate SP10-042 (10 sin 0.5° = 0.0873 in,
    // in the 81 set's gap between 0.050 and 0.1001 in, so only the nearest height 0.100 in)
    let v = json(&[
        "stack", "0d30m", "--center", "5in", "--set", "inch-81", "--remedy", "longer", "--json",
    ]);
    assert_eq!(v["setup"], "longer fixture");
    assert_eq!(v["fixture"], "SP10-042");
    let h: f64 = sizes(&v["stacks"][0]).iter().sum();
    assert!((h - 0.1).abs() < 1e-9, "{v}");
    // the demo shop's SP10-042 has rolls of 1.00000 and 0.99996 in: H − (d_p − d_r)/2
    let e = (asin_deg(h - 0.00002, 10.0) - 0.5) * 3600.0;
    assert!((f(&v["error_arcsec"]) - e).abs() < 0.006);
    assert!(
        v["small_angle"]["why"]
            .as_str()
            .unwrap()
            .contains("as asked with --remedy longer")
    );
    // the nearest single stack: 0.050 in on 5 in
    let v = json(&[
        "stack", "0d30m", "--center", "5in", "--set", "inch-81", "--remedy", "single", "--json",
    ]);
    assert_eq!(v["setup"], "nearest stack");
    assert_eq!(v["blocks"], serde_json::json!(["0.0500"]));
    // two stacks asked for where one would do: 30° on 5 in, difference exactly 2.5 in
    let v = json(&[
        "stack",
        "30",
        "--center",
        "5in",
        "--set",
        "inch-81",
        "--remedy",
        "two-stacks",
        "--json",
    ]);
    assert_eq!(v["setup"], "two stacks");
    let s = v["stacks"].as_array().unwrap();
    let d = sizes(&s[0]).iter().sum::<f64>() - sizes(&s[1]).iter().sum::<f64>();
    assert!((d - 2.5).abs() < 1e-9, "{d}");
    // --remedy needs a set
    let o = run(&["stack", "0d30m", "--center", "5in", "--remedy", "longer"]);
    assert_eq!(o.status.code(), Some(2));
}

fn setups_shop() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/setups/shop-long-bar.yaml")
}

#[test]
fn a_longer_bar_wins_when_it_is_closer() {
    // the angle whose stack on a 12 in bar is the single 0.131 in block (asin(0.131/12)); on
    // 5 in it needs 0.054583 in, in the gap of the 81 set, so two stacks off by about 0.69"
    let deg = (0.131f64 / 12.0).asin().to_degrees();
    let a = format!("{deg:.12}");
    let shop = setups_shop();
    let v = json(&[
        "stack",
        &a,
        "--fixture",
        "TB-5",
        "--set",
        "inch-81",
        "--shop",
        shop.to_str().unwrap(),
        "--json",
    ]);
    assert_eq!(v["setup"], "longer fixture", "{v}");
    assert_eq!(v["fixture"], "TB-12");
    assert_eq!(v["blocks"], serde_json::json!(["0.1310"]));
    assert!(f(&v["error_arcsec"]).abs() < 0.01);
    let why = v["small_angle"]["why"].as_str().unwrap();
    assert!(why.contains("the smallest angle error"), "{why}");
    // the sine centres in the same shop are not offered for a plain angle
    assert!(!v["small_angle"].to_string().contains("TC-12"), "{v}");
}

#[test]
fn mistakes_say_what_to_type() {
    let o = run(&["stack", "--compound", "30", "--center", "5in"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        text(&o.stderr).contains("e.g. --compound 30,20"),
        "{}",
        text(&o.stderr)
    );
    let o = run(&["stack", "--compound", "30,95", "--center", "5in"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        text(&o.stderr).contains("90° or more"),
        "{}",
        text(&o.stderr)
    );
    let o = run(&["stack", "--taper", "1:0", "--center", "5in"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o.stderr).contains("e.g. 1:20"), "{}", text(&o.stderr));
    let o = run(&["stack", "30", "--taper", "1:20", "--center", "5in"]);
    assert_eq!(o.status.code(), Some(2));
    let o = run(&["stack", "--taper", "1:20"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o.stderr).contains("--center"), "{}", text(&o.stderr));
}

#[test]
fn a_taper_on_the_wrong_fixture_is_warned_about() {
    let shop = setups_shop();
    let v = json(&[
        "stack",
        "--taper",
        "1:20",
        "--fixture",
        "TB-5",
        "--shop",
        shop.to_str().unwrap(),
        "--json",
    ]);
    assert!(v["warnings"].to_string().contains("sine centres"), "{v}");
    let v = json(&[
        "stack",
        "--taper",
        "1:20",
        "--fixture",
        "TC-12",
        "--shop",
        shop.to_str().unwrap(),
        "--json",
    ]);
    assert!(!v["warnings"].to_string().contains("is a sine"), "{v}");
    // 12 in · sin(1.4320961842°) (tapers.csv 1:20) = 0.29993 in → 0.2999
    assert_eq!(v["height"], "0.2999");
}
