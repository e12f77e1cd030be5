//! Saves the monkey test (tests/tui_monkey.rs) found the screens making that did not read back
//! clean, cut down to the keys that matter. Fixed ones run in the normal suite; one still open
//! is ignored; run it with `cargo test --test tui_soak_bugs -- --ignored`. The rule broken in each case is
//! the traveller format's own (docs/traveller-format.md; `traveller::validate`).

mod tui_support;
use tiltbook::tui::keymap::Action;
use tui_support::*;

#[test]
fn the_travel_alone_saves_a_sweep_that_reads_back() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    let before = r.saves;
    typ(&mut app, &mut r, "4");
    enter(&mut app, &mut r);
    assert!(r.saves > before, "the travel is saved at once");
    assert_reopens(&app);
}

#[test]
fn switching_to_pairs_after_the_count_saves_a_sweep_that_reads_back() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    typ(&mut app, &mut r, "4");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "3");
    enter(&mut app, &mut r);
    let before = r.saves;
    act(&mut app, &mut r, Action::Mode);
    assert!(r.saves > before, "the switch is saved");
    assert_reopens(&app);
}

#[test]
fn the_same_position_twice_is_refused_or_saves_clean() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    act(&mut app, &mut r, Action::Mode);
    for _ in 0..2 {
        typ(&mut app, &mut r, "1");
        enter(&mut app, &mut r);
        typ(&mut app, &mut r, "0");
        enter(&mut app, &mut r);
    }
    let pairs = app
        .attempt()
        .and_then(|a| a.sweep.as_ref())
        .map_or(0, |s| s.pairs.len());
    assert!(pairs >= 1, "a pair was entered (pairs: {pairs})");
    assert_reopens(&app);
}

#[test]
#[ignore = "bug: a new attempt carries over a block set now out of date without asking why"]
fn a_new_attempt_with_an_overdue_set_records_why_or_asks() {
    let (mut app, mut r) = app_with(sample("ds-204-half-done.yaml"), Some("KM"), false);
    enter(&mut app, &mut r); // the handover note is read
    assert_eq!(
        step(&app),
        Some(tiltbook::traveller::Step::Sweep),
        "F2 mid-sweep"
    );
    for v in ["0.05", "0.1"] {
        typ(&mut app, &mut r, v);
        enter(&mut app, &mut r);
    }
    enter(&mut app, &mut r); // the verdict
    assert_eq!(step(&app), Some(tiltbook::traveller::Step::Verdict));
    act(&mut app, &mut r, Action::NewAttempt);
    assert_eq!(
        app.feature().map(|f| f.attempts.len()),
        Some(2),
        "a second attempt"
    );
    assert_reopens(&app);
}
