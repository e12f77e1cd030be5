//! The sample jobs: they pass `check`, and their numbers agree with tables computed outside the
//! project. `cargo test --test traveller_samples -- --ignored regenerate` rewrites the half-done
//! and finished travellers from the plan (the story is in `sample_story` below).

#[path = "traveller_samples/generate.rs"]
mod samples_gen;

use std::path::Path;
use tiltbook::traveller::{FeatureState, Verdict, check_text, parse};

fn read(name: &str) -> String {
    let p = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("sample-jobs")
        .join(name);
    std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

#[test]
#[ignore = "rewrites sample-jobs/; run by hand after a model change"]
fn regenerate() {
    samples_gen::write_all(&Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs"));
}

#[test]
fn every_sample_passes_check() {
    for name in [
        "ds-204-plan.yaml",
        "ds-204-half-done.yaml",
        "ds-204-finished.yaml",
    ] {
        let problems = check_text(&read(name));
        assert!(problems.is_empty(), "{name}: {problems:#?}");
    }
}

#[test]
fn half_done_job_stops_mid_sweep_with_a_handover() {
    let t = parse(&read("ds-204-half-done.yaml")).unwrap().traveller;
    assert_eq!(t.handovers.len(), 1);
    assert_eq!(t.feature("F1").unwrap().state, FeatureState::Signed);
    let f2 = t.feature("F2").unwrap();
    assert_eq!(f2.state, FeatureState::Sweeping);
    let a = f2.current_attempt().unwrap();
    assert_eq!(a.step, tiltbook::traveller::Step::Sweep);
    let s = a.sweep.as_ref().unwrap();
    assert!(!s.complete() && !s.readings.is_empty());
    assert_eq!(t.next_feature().map(|f| f.id.as_str()), Some("F2"));
}

#[test]
fn finished_job_has_a_failed_then_passed_feature() {
    let t = parse(&read("ds-204-finished.yaml")).unwrap().traveller;
    let f3 = t.feature("F3").unwrap();
    let v: Vec<Verdict> = f3
        .attempts
        .iter()
        .filter_map(|a| a.judgement.as_ref().map(|j| j.verdict))
        .collect();
    assert_eq!(v, vec![Verdict::Fail, Verdict::Pass]);
    assert!(
        f3.attempts[0]
            .judgement
            .as_ref()
            .unwrap()
            .correction
            .is_some()
    );
    assert_eq!(t.progress(), (5, 5));
}

/// Source: sine-tables/stack-heights.csv (mpmath, 50 digits), copied to tests/data/sine/.
#[test]
fn sample_stacks_agree_with_the_sine_table() {
    let t = parse(&read("ds-204-finished.yaml")).unwrap().traveller;
    // 5 in bar at 30°: H = 2.5 in (table row `5in,in,30,0,0,2.5`); the fixture's calibrated
    // centre 5.00004 in adds 0.00002 in, which rounds away at 0.0001 in.
    let f1 = t.feature("F1").unwrap().accepted_attempt().unwrap();
    assert_eq!(
        f1.stack
            .as_ref()
            .unwrap()
            .height
            .show(tiltbook::units::Unit::In),
        "2.5000 in"
    );
}

#[test]
fn the_corrected_feature_carries_its_swap_and_the_kinds_are_complete() {
    use tiltbook::units::{Length, Unit};
    let t = parse(&read("ds-204-finished.yaml")).unwrap().traveller;
    let inch = |s: &str| Length::parse(s, Unit::In).unwrap();
    // F3, attempt 1: the 0.137 typed in for the 0.136 as the stack screen records it
    let f3 = t.feature("F3").unwrap();
    let s = f3.attempts[0].stack.as_ref().unwrap();
    assert_eq!(s.swaps.len(), 1);
    assert_eq!(
        (s.swaps[0].planned, s.swaps[0].used),
        (inch("0.136"), inch("0.137"))
    );
    assert!(s.swaps[0].reason.is_empty());
    assert_eq!(s.height, inch("1.3372"));
    // θ = asin(H/C) on the 5.00004 in bar (DOMAIN; angles-from-stack.csv method)
    let want = (1.3372f64 / 5.00004).asin().to_degrees();
    assert!(
        (s.achieved.deg() - want).abs() < 1e-6,
        "{}",
        s.achieved.deg()
    );
    assert_eq!(
        tiltbook::traveller::report::flags(&t, f3),
        vec![tiltbook::traveller::report::Flag::SwappedByHand]
    );
    // F4: both plates, both sweeps, a verdict on both
    let a = &t.feature("F4").unwrap().attempts[0];
    // compound.csv row 30,20 on 5 in: 2.5 and 1.50313289 in; on the 4.99998 in plate the
    // other is 1.50312688 in, 1.5031 in on the 0.0001 in grid
    assert_eq!(a.stack.as_ref().unwrap().height, inch("2.5"));
    assert_eq!(a.stack_b.as_ref().unwrap().height, inch("1.5031"));
    assert!(a.sweep.as_ref().unwrap().complete() && a.sweep_b.as_ref().unwrap().complete());
    let j = a.judgement.as_ref().unwrap();
    let v = j.view_b.as_ref().expect("view B judged");
    assert_eq!((j.verdict, v.verdict), (Verdict::Doubt, Verdict::Pass));
    // view B's residual is atan of its own sweep's slope (indicator-slope rule)
    // (the file keeps angles to 0.001")
    let want = tiltbook::units::Angle::from_rad(v.fit.slope.atan());
    assert!((v.residual.arcsec() - want.arcsec()).abs() <= 0.001);
    // F2: the taper, set at its half angle on the 10.0001 in centres: tapers.csv 1:20 →
    // 1.4320961842°, H = 10.0001·sin(half) = 0.249924 in → 0.2499 in
    let f2 = t.feature("F2").unwrap();
    let a = f2.accepted_attempt().unwrap();
    assert_eq!(a.stack.as_ref().unwrap().height, inch("0.2499"));
    assert!((f2.setting_angle().unwrap().deg() - 1.4320961842).abs() < 1e-9);
    assert_eq!(a.judgement.as_ref().unwrap().verdict, Verdict::Pass);
    assert_eq!(f2.state, FeatureState::Signed);
}
