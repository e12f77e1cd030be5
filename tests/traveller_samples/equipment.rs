//! The invented equipment of the sample jobs: a 5 in sine bar, 10 in sine centres, a 5 in
//! compound sine plate and an 81-piece inch set.

use tiltbook::traveller::*;
use tiltbook::units::{Angle, Length, Unit};

fn len(s: &str) -> Length {
    Length::parse(s, Unit::In).unwrap()
}

pub fn fixtures() -> Vec<FixtureSnapshot> {
    let d = |s: &str| s.parse::<jiff::civil::Date>().unwrap();
    vec![
        FixtureSnapshot {
            id: "SB-5A".into(),
            kind: FixtureKind::SineBar,
            description: "5 in sine bar, bench 2".into(),
            centre: len("5.00004in"),
            nominal_centre: Some(len("5in")),
            roll_pivot: len("0.75in"),
            roll_stack: len("0.75in"),
            calibrated: Some(d("2024-09-10")),
            due: Some(d("2025-09-10")),
            centre_u: Some(len("0.00002in")),
            max_stack: Some(len("4.5in")),
            max_angle: Some(Angle::from_deg(60.0)),
        },
        FixtureSnapshot {
            id: "SC-10".into(),
            kind: FixtureKind::SineCentres,
            description: "10 in sine centres".into(),
            centre: len("10.0001in"),
            nominal_centre: Some(len("10in")),
            roll_pivot: len("1in"),
            roll_stack: len("1in"),
            calibrated: Some(d("2024-02-20")),
            due: Some(d("2025-02-20")),
            centre_u: Some(len("0.00004in")),
            max_stack: None,
            max_angle: Some(Angle::from_deg(45.0)),
        },
        FixtureSnapshot {
            id: "CP-5".into(),
            kind: FixtureKind::CompoundPlate,
            description: "5 in compound sine plate".into(),
            centre: len("4.99998in"),
            nominal_centre: Some(len("5in")),
            roll_pivot: len("0.75in"),
            roll_stack: len("0.75in"),
            calibrated: Some(d("2024-11-04")),
            due: Some(d("2025-11-04")),
            centre_u: Some(len("0.00003in")),
            max_stack: None,
            max_angle: Some(Angle::from_deg(60.0)),
        },
    ]
}

pub fn block_set() -> BlockSetSnapshot {
    BlockSetSnapshot {
        id: "GB-81".into(),
        description: "81-piece inch set, steel".into(),
        unit: Unit::In,
        grade: "0".into(),
        calibrated: Some("2024-06-03".parse().unwrap()),
        due: Some("2025-06-03".parse().unwrap()),
        missing: vec![len("0.1007in")],
        worn: vec![len("0.05in")],
        protector: None,
    }
}
