//! Tapers on sine centres and compound angles on a compound sine plate, against the mpmath
//! tables in tests/data/sine-tables/ (tapers.csv, compound.csv; mpmath 1.3.0 at 50 digits,
//! rounded half-to-even) and the compound-angle example of Machinery's Handbook.

use tiltbook::geometry::{SineFixture, Taper, compound, true_slope};
use tiltbook::units::{Angle, Length};

const TAPERS: &str = include_str!("data/sine-tables/tapers.csv");
const COMPOUND: &str = include_str!("data/sine-tables/compound.csv");

fn rows(text: &str) -> Vec<Vec<&str>> {
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .skip(1)
        .map(|l| l.split(',').map(str::trim).collect())
        .collect()
}

/// Within half a unit in the `p`-th decimal place.
fn agrees(ours: f64, table: f64, p: i32) -> bool {
    (ours - table).abs() <= 0.5 * 10f64.powi(-p) * (1.0 + 1e-9) + table.abs() * 1e-15
}

#[test]
fn every_row_of_tapers() {
    // tapers.csv: half = atan(D/(2·len)), included = 2·half, 10 decimal places (mpmath)
    let rows = rows(TAPERS);
    assert!(rows.len() >= 8, "only {} rows read", rows.len());
    let mut bad = Vec::new();
    for r in &rows {
        let d: f64 = r[1].parse().unwrap();
        let len: f64 = r[2].parse().unwrap();
        let (half, included): (f64, f64) = (r[4].parse().unwrap(), r[5].parse().unwrap());
        // as typed by a person (1:20, 0.75in/ft) and from the two numbers
        for (how, t) in [
            ("typed", Taper::parse(r[0])),
            ("numbers", Ok(Taper::from_change(d, len))),
        ] {
            match t {
                Ok(t)
                    if agrees(t.setting().deg(), half, 10)
                        && agrees(t.included().deg(), included, 10) => {}
                other => bad.push(format!("{} ({how}): {other:?}", r.join(","))),
            }
        }
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn included_and_half_angles_as_typed() {
    // tapers.csv row 1:20: half 1.4320961842°, included 2.8641923683°
    let h = Taper::parse("half 1.4320961842").unwrap();
    let i = Taper::parse("included 2.8641923683").unwrap();
    assert!(agrees(h.included().deg(), 2.8641923683, 9));
    assert!(agrees(i.setting().deg(), 1.4320961842, 9));
}

/// A view angle printed to 8 decimals: when it is within 1e-8° of a whole arc-second it is
/// that arc-second (47.23333333 is 47°14′, as the 10-decimal upper_u_deg column confirms).
fn view_angle(text: &str) -> Angle {
    let v: f64 = text.parse().unwrap();
    let s = (v * 3600.0).round();
    if (v - s / 3600.0).abs() < 1e-8 {
        Angle::from_arcsec(s)
    } else {
        Angle::from_deg(v)
    }
}

#[test]
fn every_row_of_compound() {
    // compound.csv: plate settings that level the plane z = x·tan A + y·tan B, found with
    // rotation matrices (mpmath); upper (near) plate = A, lower = atan(tan B·cos A),
    // true slope atan(√(tan²A + tan²B)); stacks for 5 in plates to 8 decimals
    let rows = rows(COMPOUND);
    assert!(rows.len() >= 8, "only {} rows read", rows.len());
    let five = SineFixture::equal_rolls(Length::inches(5.0));
    let mut bad = Vec::new();
    for r in &rows {
        let (a, b) = (view_angle(r[0]), view_angle(r[1]));
        let want: Vec<f64> = r[2..].iter().map(|v| v.parse().unwrap()).collect();
        let c = compound(a, b).unwrap();
        let near_h = five.ideal_height_nm(c.near).unwrap() / 25_400_000.0;
        let other_h = five.ideal_height_nm(c.other).unwrap() / 25_400_000.0;
        let ok = agrees(c.near.deg(), want[0], 10)
            && agrees(c.other.deg(), want[1], 10)
            && agrees(c.true_slope.deg(), want[2], 10)
            && agrees(near_h, want[3], 8)
            && agrees(other_h, want[4], 8);
        if !ok {
            bad.push(format!(
                "{}: {:.11} {:.11} {:.11} {:.9} {:.9}",
                r.join(","),
                c.near.deg(),
                c.other.deg(),
                c.true_slope.deg(),
                near_h,
                other_h
            ));
        }
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn handbook_compound_angle() {
    // Machinery's Handbook, 31st ed., "Compound Angles": view slopes 47°14′ and 38°10′ give a
    // true slope of 53°12′ (tan²C = tan²A + tan²B), to the nearest minute
    let a = Angle::parse("47°14'").unwrap();
    let b = Angle::parse("38°10'").unwrap();
    assert_eq!(true_slope(a, b).dm(), "53°12'");
    assert_eq!(compound(a, b).unwrap().true_slope.dm(), "53°12'");
    // and the order of the views does not change the true slope
    assert_eq!(compound(b, a).unwrap().true_slope.dm(), "53°12'");
}
