//! Saves the monkey test (tests/tui_monkey.rs) found the screens making that did not read back
//! clean, cut down to the keys that matter; all fixed, they run in the normal suite. The rule broken in each case is
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
fn a_new_attempt_with_an_overdue_set_asks_why_and_records_it() {
    // the half-done sample's block set BX81-A, made due on 27 November 2026: in date when
    // attempt 1 chose it (23 November), out of date by today (the real date a new attempt is
    // stamped with). F1's sign-off is made again over the changed record, as if signed so.
    use tiltbook::traveller::{Scope, digest};
    let mut doc = sample("ds-204-half-done.yaml");
    let set = doc.block_sets.iter_mut().find(|s| s.id == "BX81-A");
    set.expect("the sample records BX81-A").due = Some(jiff::civil::date(2026, 11, 27));
    for i in 0..doc.signoffs.len() {
        let s = &doc.signoffs[i];
        let fields = digest::digests_for(&doc, s.scope, s.feature.as_deref()).unwrap();
        doc.signoffs[i].digest = digest::combined(&fields);
        doc.signoffs[i].fields = fields;
    }
    assert!(doc.signoffs.iter().all(|s| s.scope == Scope::Feature));
    let (mut app, mut r) = app_with(doc, Some("KM"), false);
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
    let title = app
        .prompt
        .as_ref()
        .map(|p| p.title.clone())
        .unwrap_or_default();
    assert!(
        title.contains("out of date") && title.contains("block set BX81-A (due 2026-11-27)"),
        "asked why the overdue set is used again: {title:?}"
    );
    // Esc keeps the verdict: no attempt is started
    esc(&mut app, &mut r);
    assert_eq!(app.feature().map(|f| f.attempts.len()), Some(1));
    // a reason too short is refused with the prompt kept
    act(&mut app, &mut r, Action::NewAttempt);
    typ(&mut app, &mut r, "ok");
    enter(&mut app, &mut r);
    assert!(
        app.prompt.as_ref().and_then(|p| p.error.as_ref()).is_some(),
        "a two-letter reason is refused"
    );
    typ(&mut app, &mut r, " - lead approved, recheck booked");
    enter(&mut app, &mut r);
    assert_eq!(
        app.feature().map(|f| f.attempts.len()),
        Some(2),
        "a second attempt"
    );
    let reason = app
        .attempt()
        .and_then(|a| a.block_set.as_ref())
        .map(|c| c.reason.clone())
        .unwrap_or_default();
    assert!(reason.contains("lead approved"), "{reason:?}");
    assert_reopens(&app);
}

#[test]
fn the_same_set_kept_through_a_fixture_change_is_logged_again() {
    use tiltbook::traveller::Step;
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    while step(&app) != Some(Step::Fixture) {
        let before = step(&app);
        esc(&mut app, &mut r);
        assert_ne!(step(&app), before, "Esc steps back towards the fixture");
    }
    let first = app.attempt().and_then(|a| a.fixture.clone()).map(|c| c.id);
    // the next usable fixture in the ranking
    let sel = app.ui.fixture_sel;
    let other = (0..app.ui.fixtures.len())
        .find(|&k| k != sel && app.ui.fixtures[k].reachable && !app.ui.fixtures[k].out_of_date)
        .expect("a second usable fixture");
    for _ in 0..other {
        act(&mut app, &mut r, Action::Down);
    }
    if other < sel {
        for _ in 0..(sel - other) {
            act(&mut app, &mut r, Action::Up);
        }
    }
    enter(&mut app, &mut r); // change fixture
    if app.prompt.is_some() {
        enter(&mut app, &mut r); // yes, clear the stack and readings
    }
    let now = app.attempt().and_then(|a| a.fixture.clone()).map(|c| c.id);
    assert_ne!(now, first, "the fixture changed");
    assert_eq!(step(&app), Some(Step::BlockSet));
    enter(&mut app, &mut r); // the same set, kept
    assert_eq!(step(&app), Some(Step::Stack));
    build_stack(&mut app, &mut r);
    assert_reopens(&app);
}
