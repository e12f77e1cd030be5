//! The YAML schema: round trips, the v0 → v1 upgrade, refusing newer files, and the forms a
//! person may hand-write.

use std::path::Path;
use tiltbook::traveller::*;
use tiltbook::units::{Angle, Unit};

fn data(p: &str) -> String {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join(p);
    std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

#[test]
fn finished_sample_round_trips() {
    let text = data("sample-jobs/ds-204-finished.yaml");
    let first = parse(&text).unwrap().traveller;
    let again = to_yaml(&first).unwrap();
    let second = parse(&again).unwrap().traveller;
    assert_eq!(first, second);
    // and the text is a fixed point: writing what was read gives the same text
    assert_eq!(to_yaml(&second).unwrap(), again);
}

#[test]
fn plan_file_reads_the_hand_written_forms() {
    let t = parse(&data("sample-jobs/ds-204-plan.yaml"))
        .unwrap()
        .traveller;
    assert_eq!(t.schema, 1);
    assert_eq!(t.job.quantity, 6);
    let f1 = t.feature("F1").unwrap();
    assert_eq!(f1.nominal, Some(Angle::from_deg(30.0)));
    assert_eq!(f1.state, FeatureState::Planned);
    assert!(f1.attempts.is_empty());
    let f3 = t.feature("F3").unwrap();
    assert!((f3.nominal.unwrap().deg() - 15.5).abs() < 1e-12);
    assert!((f3.tolerance.plus.arcsec() - 120.0).abs() < 1e-9);
    let f5 = t.feature("F5").unwrap();
    assert!((f5.nominal.unwrap().deg() - (5.0 + 43.0 / 60.0)).abs() < 1e-12);
    assert_eq!(t.feature("F2").unwrap().kind, FeatureKind::Taper);
    assert!(t.events.is_empty() && t.signoffs.is_empty());
}

#[test]
fn a_plan_written_back_stays_short() {
    let t = parse(&data("sample-jobs/ds-204-plan.yaml"))
        .unwrap()
        .traveller;
    let y = to_yaml(&t).unwrap();
    for absent in [
        "attempts:",
        "events:",
        "signoffs:",
        "fixtures:",
        "handovers:",
    ] {
        assert!(
            !y.contains(absent),
            "{absent} written for an empty list:\n{y}"
        );
    }
}

#[test]
fn version_0_is_upgraded_on_load() {
    let l = parse(&data("tests/data/travellers-v0/old-plan.yaml")).unwrap();
    assert_eq!(l.upgraded_from, Some(0));
    let t = l.traveller;
    assert_eq!(t.schema, SCHEMA_VERSION);
    assert_eq!(t.job.unit, Unit::Mm);
    assert!((t.feature("F1").unwrap().nominal.unwrap().deg() - 12.5).abs() < 1e-12);
    let y = to_yaml(&t).unwrap();
    assert!(y.starts_with("schema: 1\n"), "{y}");
    assert!(
        y.contains("nominal: 12°30'00\"") && y.contains("unit: mm"),
        "{y}"
    );
    assert!(!y.contains("angle:") && !y.contains("units:"), "{y}");
    assert!(check_text(&y).is_empty(), "{:?}", check_text(&y));
}

#[test]
fn an_upgraded_file_still_points_at_the_line() {
    let e = parse(&data("tests/data/travellers-v0/old-with-typo.yaml")).unwrap_err();
    assert_eq!((e.pos().line, e.pos().col), (8, 5), "{e}");
    assert!(e.to_string().contains("did you mean `tolerance`?"), "{e}");
}

#[test]
fn a_newer_file_is_refused_naming_both_versions() {
    let text = data("sample-jobs/ds-204-plan.yaml").replace("schema: 1", "schema: 2");
    let e = parse(&text).unwrap_err();
    assert!(
        matches!(
            e,
            LoadError::TooNew {
                found: 2,
                supported: 1,
                ..
            }
        ),
        "{e:?}"
    );
    let m = e.to_string();
    assert!(
        m.contains("schema version 2") && m.contains("up to 1"),
        "{m}"
    );
    assert!(m.contains("newer tiltbook"), "{m}");
}

/// Source: tests/data/travellers-ref/tapers.csv (mpmath, 50 digits).
#[test]
fn taper_half_angles_match_the_reference_table() {
    let text = data("tests/data/travellers-ref/tapers.csv");
    let mut n = 0;
    for line in text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("spec"))
    {
        let c: Vec<&str> = line.split(',').collect();
        let (d, len, unit, half, incl) = (c[1], c[2], c[3], c[4], c[5]);
        let taper = if unit == "ratio" {
            Taper {
                ratio: Some(format!("{d}:{len}")),
                ..Taper::default()
            }
        } else {
            assert_eq!(len, "12", "{line}");
            Taper {
                per_foot: Some(
                    tiltbook::units::Length::parse(&format!("{d}in"), Unit::In).unwrap(),
                ),
                ..Taper::default()
            }
        };
        let h = taper.half_angle().unwrap().deg();
        let want: f64 = half.parse().unwrap();
        assert!((h - want).abs() < 1e-9, "{line}: {h}");
        let inc = Taper {
            included: Some(Angle::from_deg(incl.parse().unwrap())),
            ..Taper::default()
        };
        assert!(
            (inc.half_angle().unwrap().deg() - want).abs() < 1e-9,
            "{line}"
        );
        n += 1;
    }
    assert!(n >= 8);
}

/// Source: tests/data/travellers-ref/compound.csv (mpmath, 50 digits; the near plate is the one
/// the table calls upper, set to A).
#[test]
fn compound_plate_angles_match_the_reference_table() {
    let text = data("tests/data/travellers-ref/compound.csv");
    let mut n = 0;
    for line in text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("A_deg"))
    {
        let c: Vec<f64> = line.split(',').map(|v| v.parse().unwrap()).collect();
        let comp = Compound {
            a: Angle::from_deg(c[0]),
            b: Angle::from_deg(c[1]),
            near: NearPlate::A,
        };
        let (near, far) = comp.plate_angles();
        assert!((near.deg() - c[2]).abs() < 1e-7, "{line}");
        assert!((far.deg() - c[3]).abs() < 1e-7, "{line}: {}", far.deg());
        assert!((comp.true_slope().deg() - c[4]).abs() < 1e-7, "{line}");
        n += 1;
    }
    assert!(n >= 8);
}

#[test]
fn times_keep_their_offset_through_a_save() {
    let t = parse(&data("sample-jobs/ds-204-finished.yaml"))
        .unwrap()
        .traveller;
    let y = to_yaml(&t).unwrap();
    assert!(y.contains("at: 2026-11-23T07:12:00-05:00"), "offset lost");
}
