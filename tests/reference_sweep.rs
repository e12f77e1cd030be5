//! The sweep fit against NIST StRD certified values and the mpmath indicator-slope table.
//!
//! NIST/ITL Statistical Reference Datasets, linear least squares: Norris (y = B0 + B1·x),
//! NoInt1 and NoInt2 (y = B1·x). Files in tests/data/nist-strd/, certified values copied from
//! their headers. Agreement is measured as NIST does, by the log relative error
//! LRE = −log10(|ours − certified| / |certified|), and must be at least 9 significant digits.

use proptest::prelude::*;
use tiltbook::sweep::{Sweep, fit_line, fit_through_origin};
use tiltbook::units::{Length, Unit};

const NORRIS: &str = include_str!("data/nist-strd/Norris.dat");
const NOINT1: &str = include_str!("data/nist-strd/NoInt1.dat");
const NOINT2: &str = include_str!("data/nist-strd/NoInt2.dat");
const INDICATOR_SLOPE: &str = include_str!("data/sine-tables/indicator-slope.csv");

/// The (x, y) data of a StRD file, from the lines its header names ("Data (lines 61 to 96)",
/// 1-based); the first column is y, the second x.
fn strd(text: &str) -> (Vec<f64>, Vec<f64>) {
    let header = text
        .lines()
        .find(|l| l.trim_start().starts_with("Data") && l.contains("(lines"))
        .expect("a 'Data (lines A to B)' header line");
    let nums: Vec<usize> = header
        .split(|c: char| !c.is_ascii_digit())
        .filter_map(|t| t.parse().ok())
        .collect();
    let (first, last) = (nums[0], nums[1]);
    let mut x = Vec::new();
    let mut y = Vec::new();
    for line in text.lines().skip(first - 1).take(last + 1 - first) {
        let cols: Vec<f64> = line
            .split_whitespace()
            .map(|v| v.parse().expect("a number"))
            .collect();
        assert_eq!(cols.len(), 2, "data line {line:?}");
        y.push(cols[0]);
        x.push(cols[1]);
    }
    (x, y)
}

fn lre(ours: f64, certified: f64) -> f64 {
    let rel = ((ours - certified) / certified).abs();
    if rel == 0.0 { 16.0 } else { -rel.log10() }
}

fn check(name: &str, ours: f64, certified: f64, bad: &mut Vec<String>) {
    let l = lre(ours, certified);
    if l < 9.0 {
        bad.push(format!(
            "{name}: {ours:e} vs certified {certified:e} (LRE {l:.1})"
        ));
    }
}

#[test]
fn norris_certified_values() {
    // NIST StRD Norris, certified: B0 = -0.262323073774029 (sd 0.232818234301152),
    // B1 = 1.00211681802045 (sd 0.429796848199937E-03), residual SD 0.884796396144373,
    // R² 0.999993745883712, SSreg 4255954.13232369, SSres 26.6173985294224
    let (x, y) = strd(NORRIS);
    assert_eq!(x.len(), 36);
    let f = fit_line(&x, &y).unwrap();
    let mut bad = Vec::new();
    check("B0", f.intercept, -0.262323073774029, &mut bad);
    check("B1", f.slope, 1.00211681802045, &mut bad);
    check(
        "sd B0",
        f.intercept_sd.unwrap(),
        0.232818234301152,
        &mut bad,
    );
    check(
        "sd B1",
        f.slope_sd.unwrap(),
        0.429796848199937E-03,
        &mut bad,
    );
    check(
        "residual SD",
        f.residual_sd.unwrap(),
        0.884796396144373,
        &mut bad,
    );
    check("R²", f.r_squared, 0.999993745883712, &mut bad);
    check("SSreg", f.ss_regression, 4255954.13232369, &mut bad);
    check("SSres", f.ss_residual, 26.6173985294224, &mut bad);
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn norris_through_the_length_api() {
    // NIST StRD Norris again, each value taken as an exact length in millimetres: the slope is
    // dimensionless and the intercept comes back in millimetres
    let (x, y) = strd(NORRIS);
    let mm = |v: f64| Length::parse(&format!("{v}"), Unit::Mm).unwrap();
    let pairs = x.iter().zip(&y).map(|(a, b)| (mm(*a), mm(*b))).collect();
    let f = Sweep::at(pairs).unwrap().fit().unwrap();
    let mut bad = Vec::new();
    check("B1", f.slope, 1.00211681802045, &mut bad);
    check("B0", f.line.intercept / 1e6, -0.262323073774029, &mut bad);
    check(
        "residual SD",
        f.line.residual_sd.unwrap() / 1e6,
        0.884796396144373,
        &mut bad,
    );
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn noint1_through_origin() {
    // NIST StRD NoInt1, certified: B1 = 2.07438016528926 (sd 0.165289256198347E-01),
    // residual SD 3.56753034006338 (n − 1 degrees of freedom), R² 0.999365492298663 (uncentred),
    // SSreg 200457.727272727, SSres 127.272727272727
    let (x, y) = strd(NOINT1);
    assert_eq!(x.len(), 11);
    let f = fit_through_origin(&x, &y).unwrap();
    let mut bad = Vec::new();
    check("B1", f.slope, 2.07438016528926, &mut bad);
    check(
        "sd B1",
        f.slope_sd.unwrap(),
        0.165289256198347E-01,
        &mut bad,
    );
    check(
        "residual SD",
        f.residual_sd.unwrap(),
        3.56753034006338,
        &mut bad,
    );
    check("R²", f.r_squared, 0.999365492298663, &mut bad);
    check("SSreg", f.ss_regression, 200457.727272727, &mut bad);
    check("SSres", f.ss_residual, 127.272727272727, &mut bad);
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn noint2_through_origin() {
    // NIST StRD NoInt2, certified: B1 = 0.727272727272727 (sd 0.420827318078432E-01),
    // residual SD 0.369274472937998, R² 0.993348115299335 (uncentred),
    // SSreg 40.7272727272727, SSres 0.272727272727273
    let (x, y) = strd(NOINT2);
    assert_eq!(x.len(), 3);
    let f = fit_through_origin(&x, &y).unwrap();
    let mut bad = Vec::new();
    check("B1", f.slope, 0.727272727272727, &mut bad);
    check(
        "sd B1",
        f.slope_sd.unwrap(),
        0.420827318078432E-01,
        &mut bad,
    );
    check(
        "residual SD",
        f.residual_sd.unwrap(),
        0.369274472937998,
        &mut bad,
    );
    check("R²", f.r_squared, 0.993348115299335, &mut bad);
    check("SSreg", f.ss_regression, 40.7272727272727, &mut bad);
    check("SSres", f.ss_residual, 0.272727272727273, &mut bad);
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn every_row_of_indicator_slope() {
    // indicator-slope.csv: θ = atan(rise/travel), arc-seconds (mpmath 1.3.0, 50 digits),
    // checked to the column's 6 decimal places through a two-reading sweep
    let rows: Vec<Vec<&str>> = INDICATOR_SLOPE
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .skip(1)
        .map(|l| l.split(',').map(str::trim).collect())
        .collect();
    assert!(rows.len() >= 9, "only {} rows read", rows.len());
    let mut bad = Vec::new();
    for r in &rows {
        let unit: Unit = r[2].parse().unwrap();
        let rise = Length::parse(r[0], unit).unwrap();
        let travel = Length::parse(r[1], unit).unwrap();
        let want: f64 = r[3].parse().unwrap();
        let f = Sweep::even(travel, vec![Length::ZERO, rise])
            .unwrap()
            .fit()
            .unwrap();
        let ours = f.residual.arcsec();
        if (ours - want).abs() > 0.5e-6 * (1.0 + 1e-9) {
            bad.push(format!("{}: {ours:.9}", r.join(",")));
        }
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn three_readings_over_four_inches() {
    // indicator-slope.csv row 0.0005,4,in = 25.783101"; readings −0.0005, 0, +0.0005 over 4 in
    // rise 0.0010 in over 4 in: atan(0.00025) = 2 × atan(0.0005/4) to first order, so
    // 51.566" (twice the row, less 3e-9" of the cubic term)
    let r = ["-0.0005", "0", "0.0005"].map(|v| Length::parse(v, Unit::In).unwrap());
    let f = Sweep::even(Length::inches(4.0), r.to_vec())
        .unwrap()
        .fit()
        .unwrap();
    assert!(
        (f.residual.arcsec() - 2.0 * 25.783101).abs() < 2e-6,
        "{}",
        f.residual.arcsec()
    );
}

#[test]
fn a_rise_of_fifteen_ten_thousandths_over_five_inches_is_about_a_minute() {
    // common practice (no source): 0.0015 in over 5 in is about one arc-minute
    let r = ["0", "0.0015"].map(|v| Length::parse(v, Unit::In).unwrap());
    let f = Sweep::even(Length::inches(5.0), r.to_vec())
        .unwrap()
        .fit()
        .unwrap();
    assert!(
        (f.residual.arcsec() - 60.0).abs() < 2.5,
        "{}",
        f.residual.arcsec()
    );
}

proptest! {
    #[test]
    fn adding_a_constant_to_every_reading_changes_only_the_intercept(
        readings in prop::collection::vec(-5_000_000i64..5_000_000, 2..12),
        shift in -50_000_000i64..50_000_000,
        travel in 1_000_000i64..500_000_000,
    ) {
        // property: a fit is invariant to a constant added to all readings (the indicator
        // zeroed somewhere else)
        let a: Vec<Length> = readings.iter().map(|v| Length::from_nm(*v)).collect();
        let b: Vec<Length> = readings.iter().map(|v| Length::from_nm(v + shift)).collect();
        let fa = Sweep::even(Length::from_nm(travel), a).unwrap().fit().unwrap();
        let fb = Sweep::even(Length::from_nm(travel), b).unwrap().fit().unwrap();
        let tol = 1e-9 * fa.slope.abs().max(1e-9);
        prop_assert!((fa.slope - fb.slope).abs() <= tol, "{} {}", fa.slope, fb.slope);
        prop_assert!((fa.residual.arcsec() - fb.residual.arcsec()).abs() < 1e-6);
        prop_assert!((fa.straightness.nm() - fb.straightness.nm()).abs() <= 1);
        let di = fb.line.intercept - fa.line.intercept - shift as f64;
        prop_assert!(di.abs() < 1e-3, "intercept moved by {di} nm more than the shift");
    }
}
