//! `update()` with no terminal: safety, the settle wait, the readings, the verdict, a new
//! attempt, nonconforming, and the sign-off.

mod tui_support;

use tiltbook::traveller::{EventKind, FeatureState, Step, SweepMode, Verdict};
use tiltbook::tui::app::{Effect, Msg, PromptKind};
use tiltbook::tui::keymap::Action;
use tiltbook::tui::update::update;
use tiltbook::units::Length;
use tui_support::*;

#[test]
fn safety_then_the_settle_timer_counts_down_and_records() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    build_stack(&mut app, &mut r);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Settle));
    assert!(app.attempt().unwrap().safety.is_some());
    let total = app.shop.settings.settle_minutes * 60;
    assert_eq!(app.ui.settle_left, Some(total));
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Settle), "Enter waits while settling");
    let effects = update(&mut app, Msg::Tick(total - 1));
    r.drain(&mut app, effects);
    assert_eq!(app.ui.settle_left, Some(1));
    assert!(app.attempt().unwrap().settle.is_none());
    let effects = update(&mut app, Msg::Tick(1));
    assert!(effects.contains(&Effect::Save));
    r.drain(&mut app, effects);
    let s = app.attempt().unwrap().settle.clone().unwrap();
    assert!(s.done);
    assert_eq!(events(&app, EventKind::Settled), 1);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    assert_reopens(&app);
}

#[test]
fn the_settle_wait_can_be_skipped_and_the_skip_is_recorded() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    let s = app.attempt().unwrap().settle.clone().unwrap();
    assert!(!s.done && s.reason.contains("skipped"));
    assert_eq!(events(&app, EventKind::SettleSkipped), 1);
    // ticks elsewhere do nothing
    let effects = update(&mut app, Msg::Tick(600));
    assert!(effects.is_empty());
    assert_reopens(&app);
}

#[test]
fn readings_are_checked_as_typed_and_saved_one_by_one() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    typ(&mut app, &mut r, "four");
    let saves = r.saves;
    enter(&mut app, &mut r);
    assert_eq!(r.saves, saves, "a bad travel is not saved");
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("not a length"))
    );
    clear_field(&mut app, &mut r);
    typ(&mut app, &mut r, "4in");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "1");
    enter(&mut app, &mut r);
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("2 to 50"))
    );
    clear_field(&mut app, &mut r);
    typ(&mut app, &mut r, "3");
    enter(&mut app, &mut r);
    for (i, v) in ["+0.0002", "0", "-0.0001"].iter().enumerate() {
        typ(&mut app, &mut r, v);
        enter(&mut app, &mut r);
        let sw = app.attempt().unwrap().sweep.clone().unwrap();
        assert_eq!(sw.readings.len(), i + 1, "reading {} saved", i + 1);
    }
    let sw = app.attempt().unwrap().sweep.clone().unwrap();
    assert_eq!(sw.travel, Some(Length::inches(4.0)));
    assert_eq!(sw.points, Some(3));
    assert_eq!(sw.readings[2], Length::inches(-0.0001));
    assert_eq!(events(&app, EventKind::ReadingEntered), 3);
    // a fourth is refused; Del removes the last
    typ(&mut app, &mut r, "0.0001");
    enter(&mut app, &mut r);
    assert_eq!(
        app.attempt()
            .unwrap()
            .sweep
            .as_ref()
            .unwrap()
            .readings
            .len(),
        3
    );
    clear_field(&mut app, &mut r);
    act(&mut app, &mut r, Action::Remove);
    assert_eq!(
        app.attempt()
            .unwrap()
            .sweep
            .as_ref()
            .unwrap()
            .readings
            .len(),
        2
    );
    assert_eq!(events(&app, EventKind::ReadingRemoved), 1);
    // F2 switches modes only before the first reading
    act(&mut app, &mut r, Action::Mode);
    assert_eq!(
        app.attempt().unwrap().sweep.as_ref().unwrap().mode,
        SweepMode::Spaced
    );
    assert_reopens(&app);
}

#[test]
fn position_reading_pairs() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    act(&mut app, &mut r, Action::Mode);
    assert_eq!(
        app.attempt().unwrap().sweep.as_ref().unwrap().mode,
        SweepMode::Pairs
    );
    for (p, v) in [("0.5", "0"), ("4.5in", "+0.0003")] {
        typ(&mut app, &mut r, p);
        enter(&mut app, &mut r);
        typ(&mut app, &mut r, v);
        enter(&mut app, &mut r);
    }
    let sw = app.attempt().unwrap().sweep.clone().unwrap();
    assert_eq!(sw.pairs.len(), 2);
    assert_eq!(sw.pairs[1].position, Length::inches(4.5));
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Verdict));
    // rise 0.0003 over 4 in: δ = atan(0.000075) = 15.47" (DOMAIN: δ = atan(m))
    let j = app.attempt().unwrap().judgement.clone().unwrap();
    let expect = (0.0003f64 / 4.0).atan().to_degrees() * 3600.0;
    assert!(
        (j.residual.arcsec() - expect).abs() < 0.01,
        "{}",
        j.residual.arcsec()
    );
    assert_reopens(&app);
}

#[test]
fn a_pass_is_signed_and_the_next_feature_opens() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0"]);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Verdict));
    let j = app.attempt().unwrap().judgement.clone().unwrap();
    assert_eq!(j.verdict, Verdict::Pass);
    assert_eq!(app.doc.features[0].state, FeatureState::Judged);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sign));
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sign), "signing needs a name");
    typ(&mut app, &mut r, "JQ");
    enter(&mut app, &mut r);
    assert_eq!(app.doc.features[0].state, FeatureState::Signed);
    assert_eq!(app.doc.signoffs.len(), 1);
    assert!(!app.doc.signoffs[0].digest.is_empty());
    assert_eq!(app.flow(), Some((1, Step::Fixture)), "F2 opens");
    assert_eq!(app.doc.progress(), (1, 7));
    assert_reopens(&app);
}

#[test]
fn a_fail_offers_a_new_attempt_with_the_corrected_stack() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    let built = app.attempt().unwrap().stack.clone().unwrap();
    // a rise of 0.01 in over 4 in is 8.6' (atan 0.0025): outside ±0°05'
    readings(&mut app, &mut r, "4", &["0", "0.01"]);
    enter(&mut app, &mut r);
    let j = app.attempt().unwrap().judgement.clone().unwrap();
    assert_eq!(j.verdict, Verdict::Fail);
    let c = j.correction.clone().expect("a fail has a stack change");
    assert!(
        c.delta.nm() < 0,
        "a surface rising toward the raised end means lower the stack"
    );
    assert_eq!(c.height, built.height + c.delta);
    act(&mut app, &mut r, Action::NewAttempt);
    let f = &app.doc.features[0];
    assert_eq!(f.attempts.len(), 2);
    assert_eq!(f.attempts[0].step, Step::Done);
    assert_eq!(step(&app), Some(Step::Stack));
    let a2 = app.attempt().unwrap();
    assert_eq!(a2.number, 2);
    assert_eq!(
        a2.fixture.as_ref().unwrap().id,
        f.attempts[0].fixture.as_ref().unwrap().id
    );
    let s2 = a2.stack.as_ref().expect("the solver re-ran");
    assert_eq!(s2.height, c.height, "built for the corrected height");
    // the first attempt is kept whole
    assert!(f.attempts[0].judgement.is_some() && f.attempts[0].sweep.is_some());
    assert_reopens(&app);
}

#[test]
fn a_fail_can_be_recorded_nonconforming_with_a_note() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0.01"]);
    enter(&mut app, &mut r);
    act(&mut app, &mut r, Action::Nonconforming);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Nonconforming)
    ));
    enter(&mut app, &mut r);
    assert!(
        app.prompt.as_ref().is_some_and(|p| p.error.is_some()),
        "a note is needed"
    );
    typ(&mut app, &mut r, "flank 9' steep; part to the lead");
    enter(&mut app, &mut r);
    assert_eq!(app.doc.features[0].state, FeatureState::Nonconforming);
    assert_eq!(step(&app), Some(Step::Sign));
    assert_eq!(
        app.attempt().unwrap().note,
        "flank 9' steep; part to the lead"
    );
    typ(&mut app, &mut r, "JQ");
    enter(&mut app, &mut r);
    assert!(app.doc.features[0].is_finished());
    assert_eq!(app.doc.features[0].state, FeatureState::Nonconforming);
    assert_reopens(&app);
}

#[test]
fn readings_stand_once_the_verdict_is_recorded() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0"]);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Verdict));
    esc(&mut app, &mut r);
    let before = app.attempt().unwrap().sweep.clone();
    act(&mut app, &mut r, Action::Remove);
    typ(&mut app, &mut r, "1");
    act(&mut app, &mut r, Action::Mode);
    assert_eq!(app.attempt().unwrap().sweep, before, "nothing changed");
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("new attempt"))
    );
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Verdict));
    // a pass may still be taken again as a new attempt
    act(&mut app, &mut r, Action::NewAttempt);
    assert_eq!(app.doc.features[0].attempts.len(), 2);
    assert_eq!(app.doc.features[0].state, FeatureState::SetChosen);
    assert_reopens(&app);
}
