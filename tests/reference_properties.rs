//! Properties that must hold for any input (proptest): a stack for an angle gives that angle
//! back; what tiltbook prints for a length or an angle reads back as the same value.

use proptest::prelude::*;
use tiltbook::geometry::SineFixture;
use tiltbook::units::{Angle, Length, NM_PER_INCH, Unit};

proptest! {
    #[test]
    fn angle_to_height_to_angle(
        center_um in 25_000i64..1_000_000,
        pivot_um in 5_000i64..30_000,
        raised_diff_um in -20i64..20,
        deg in 0.0f64..89.0,
    ) {
        // H = C·sin θ + (d_p − d_r)/2 and θ = asin((H − (d_p − d_r)/2)/C) are inverses
        // (DOMAIN.md); the height is held to the nearest nanometre, so the angle comes back to
        // within what half a nanometre of stack moves it: 0.5 nm/(C·cos θ)
        let f = SineFixture {
            center: Length::from_nm(center_um * 1000),
            pivot_roll: Length::from_nm(pivot_um * 1000),
            raised_roll: Length::from_nm((pivot_um + raised_diff_um) * 1000),
        };
        let a = Angle::from_deg(deg);
        let h = f.ideal_height(a).unwrap();
        let back = f.angle_for_height(h).unwrap();
        let slack = f.sensitivity(a, Length::from_nm(1)).deg() / 2.0 + 1e-12;
        prop_assert!((back.deg() - deg).abs() <= slack, "{deg} came back as {}", back.deg());
    }

    #[test]
    fn millimetres_read_back_exactly(nm in -1_000_000_000_000i64..1_000_000_000_000) {
        // every nanometre is an exact decimal of a millimetre (six places)
        let l = Length::from_nm(nm);
        let text = format!("{}mm", l.exact_number(Unit::Mm, 0));
        prop_assert_eq!(Length::parse(&text, Unit::In), Ok(l), "{}", text);
    }

    #[test]
    fn inches_read_back_exactly(tenth_microinches in -3_900_000_000i64..3_900_000_000) {
        // lengths on a 0.00001 in grid (254 nm) are exact decimals of an inch (up to 990 m)
        let l = Length::from_nm(tenth_microinches * (NM_PER_INCH / 100_000));
        for text in [
            format!("{}in", l.exact_number(Unit::In, 0)),
            l.exact_number(Unit::In, 4),
            l.show_fine(Unit::In),
        ] {
            prop_assert_eq!(Length::parse(&text, Unit::In), Ok(l), "{}", text);
        }
    }

    #[test]
    fn any_length_survives_the_file_format(nm in -1_000_000_000_000i64..1_000_000_000_000) {
        // the traveller writes lengths with their unit and reads them back unchanged
        let l = Length::from_nm(nm);
        let text = serde_json::to_string(&l).unwrap();
        let back: Length = serde_json::from_str(&text).unwrap();
        prop_assert_eq!(back, l, "{}", text);
    }

    #[test]
    fn angles_read_back_to_the_places_shown(deg in -359.0f64..359.0) {
        let a = Angle::from_deg(deg);
        // D-M-S with three places on the seconds: within half a thousandth of a second
        let back = Angle::parse(&a.dms(3)).unwrap();
        prop_assert!((back.arcsec() - a.arcsec()).abs() <= 0.0005 + 1e-9, "{} → {}", deg, a.dms(3));
        // decimal degrees to ten places: within half a unit in the tenth place
        let text = a.decimal(10);
        let back = Angle::parse(text.trim_end_matches('°')).unwrap();
        prop_assert!((back.deg() - deg).abs() <= 0.5e-10 + 1e-12, "{} → {}", deg, text);
    }

    #[test]
    fn whole_seconds_read_back_exactly(secs in -1_295_999i64..1_295_999) {
        // an angle of whole arc-seconds prints and reads back as the same angle
        let a = Angle::from_arcsec(secs as f64);
        for text in [a.dms(0), a.dms(2)] {
            let back = Angle::parse(&text).unwrap();
            prop_assert!((back.arcsec() - a.arcsec()).abs() < 1e-6, "{} → {}", secs, text);
        }
        let text = serde_json::to_string(&a).unwrap();
        let back: Angle = serde_json::from_str(&text).unwrap();
        prop_assert!((back.arcsec() - a.arcsec()).abs() < 1e-6, "{} → {}", secs, text);
    }
}
