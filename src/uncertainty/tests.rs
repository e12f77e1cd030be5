use super::*;

use crate::sweep::Sweep;

fn five_at(deg: f64) -> Setup {
    Setup {
        fixture: SineFixture::equal_rolls(Length::inches(5.0)),
        angle: Angle::from_deg(deg),
    }
}

fn close(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol
}

#[test]
fn stack_line_uses_the_grade_table_and_the_sensitivity_table() {
    // blocks 2 in (50.8 mm, t_e 0.50 µm) and 0.5 in (12.7 mm, t_e 0.30 µm), grade 1:
    // standards.md grade table; u = √((0.5² + 0.3²)/3) µm
    let b = budget(
        &five_at(30.0),
        &[Contribution::Stack {
            blocks: vec![Length::inches(2.0), Length::inches(0.5)],
            grade: Grade::One,
            per_joint_nm: DEFAULT_JOINT_NM,
        }],
    );
    let b = b.as_ref().ok();
    let stack = b.map(|b| &b.lines[0]);
    let u = (0.34f64 / 3.0).sqrt();
    assert!(stack.is_some_and(|l| close(l.value, u, 1e-12)), "{stack:?}");
    // sensitivity.csv: 5 in bar at 30°, 4.763482" per 0.0001 in (= 2.54 µm), mpmath
    assert!(
        stack.is_some_and(|l| close(l.sensitivity, 4.763482 / 2.54, 1e-6)),
        "{stack:?}"
    );
    // one joint at 0.025 µm: common practice (no source)
    let joint = b.map(|b| &b.lines[1]);
    assert!(joint.is_some_and(|l| close(l.value, 0.025, 1e-12) && l.source.contains("1 joint")));
}

#[test]
fn centre_distance_sensitivity_is_tan_theta_over_c() {
    // DOMAIN.md: dθ/dC = tan θ / C; at 45° on 5 in that is 1/127 000 µm rad per µm
    let b = budget(
        &five_at(45.0),
        &[Contribution::CenterCalibration {
            u: Length::from_nm(1000),
        }],
    );
    let want = 206_264.806_247 / 127_000.0;
    assert!(b.is_ok_and(|b| close(b.lines[0].arcsec, want, 1e-6)));
}

#[test]
fn two_readings_over_the_travel() {
    // DOMAIN.md: √2·u_r/travel for two readings: √2 × 0.0001/5 rad = 5.8341"
    let travel = Length::inches(5.0);
    let b = budget(
        &five_at(30.0),
        &[Contribution::IndicatorRepeatability {
            u_r: Length::inches(0.0001),
            sxx_nm2: sxx_two_readings(travel),
        }],
    );
    let want = 2f64.sqrt() * 0.0001 / 5.0 * 206_264.806_247;
    assert!(b.is_ok_and(|b| close(b.lines[0].arcsec, want, 1e-6)));
}

#[test]
fn temperature_roll_and_resolution() {
    // α·H·δT: steel 11.5e-6/K (J. Res. NIST 99, 31 (1994)), H = 2.5 in at 30° on 5 in,
    // δT up to 1 K (/√3): 11.5e-6 × 63 500 µm × 0.57735 K × 1/(127 000 µm·cos 30°)
    let b = budget(
        &five_at(30.0),
        &[
            Contribution::Temperature {
                alpha_per_k: Material::Steel.alpha_per_k(),
                limit_k: 1.0,
            },
            Contribution::RollDifference {
                limit: Length::inches(0.0002),
            },
            Contribution::IndicatorResolution {
                resolution: Length::inches(0.0001),
                sxx_nm2: sxx_two_readings(Length::inches(5.0)),
            },
        ],
    );
    let rad = 206_264.806_247;
    let cos30 = 30f64.to_radians().cos();
    let t = 11.5e-6 * 63_500.0 / 3f64.sqrt() / (127_000.0 * cos30) * rad;
    let r = 0.0001 / 3f64.sqrt() / (5.0 * cos30) * rad;
    let res = 0.0001 / 12f64.sqrt() * 2f64.sqrt() / 5.0 * rad;
    let b = b.ok();
    assert!(
        b.as_ref()
            .is_some_and(|b| close(b.lines[0].arcsec, t, 1e-9)),
        "{b:?}"
    );
    assert!(
        b.as_ref()
            .is_some_and(|b| close(b.lines[1].arcsec, r, 1e-9)),
        "{b:?}"
    );
    assert!(
        b.as_ref()
            .is_some_and(|b| close(b.lines[2].arcsec, res, 1e-9)),
        "{b:?}"
    );
    // GUM: u_c = √Σu², U = 2·u_c
    let uc = (t * t + r * r + res * res).sqrt();
    assert!(b.as_ref().is_some_and(
        |b| close(b.combined.arcsec(), uc, 1e-9) && close(b.expanded.arcsec(), 2.0 * uc, 1e-9)
    ));
    assert!(b.is_some_and(|b| b.text().contains("expanded uncertainty U")));
}

#[test]
fn refuses_what_it_cannot_budget() {
    let s = five_at(30.0);
    let e = budget(
        &s,
        &[Contribution::Stack {
            blocks: vec![],
            grade: Grade::One,
            per_joint_nm: DEFAULT_JOINT_NM,
        }],
    );
    assert_eq!(e.err(), Some(UncertaintyError::NoBlocks));
    let e = budget(
        &s,
        &[Contribution::Stack {
            blocks: vec![Length::mm(200.0)],
            grade: Grade::One,
            per_joint_nm: DEFAULT_JOINT_NM,
        }],
    );
    assert!(e.is_err_and(|e| e.to_string().contains("calibrated uncertainty")));
    let e = budget(
        &s,
        &[Contribution::IndicatorRepeatability {
            u_r: Length::inches(0.0001),
            sxx_nm2: 0.0,
        }],
    );
    assert_eq!(e.err(), Some(UncertaintyError::NoTravel));
    assert!(budget(&five_at(90.0), &[]).is_err());
}

#[test]
fn repeatability_over_a_sweep_is_the_slope_uncertainty() {
    // two readings: Sxx = travel²/2, so u(δ) = √2·u_r/travel (DOMAIN.md)
    let inch = |v: f64| Length::inches(v);
    let two =
        Sweep::even(inch(5.0), vec![inch(0.0), inch(0.001)]).unwrap_or_else(|e| panic!("{e}"));
    assert!(close(two.sxx_nm2(), sxx_two_readings(inch(5.0)), 1e-3));
    // n readings: with u_r equal to the scatter s about the line, the line's contribution is the
    // fit's slope standard deviation s/√Sxx (least squares; NIST StRD define sd(B1) the same way)
    let r = [0.0, 0.0004, 0.0011, 0.0013, 0.0021].map(inch).to_vec();
    let s = Sweep::even(inch(8.0), r).unwrap_or_else(|e| panic!("{e}"));
    let fit = s.fit().unwrap_or_else(|e| panic!("{e}"));
    let sd_nm = fit.line.residual_sd.unwrap_or_default();
    let b = budget(
        &five_at(20.0),
        &[
            Contribution::IndicatorRepeatability {
                u_r: Length::from_nm(sd_nm.round() as i64),
                sxx_nm2: s.sxx_nm2(),
            },
            Contribution::SweepScatter {
                angle_sd: fit.angle_sd.unwrap_or_default(),
            },
        ],
    );
    let b = b.unwrap_or_else(|e| panic!("{e}"));
    // equal to within the nanometre the repeatability was rounded to
    assert!(close(b.lines[0].arcsec, b.lines[1].arcsec, 1e-3), "{b:?}");
    assert!(b.lines[0].arcsec > 1.0, "{b:?}");
}
