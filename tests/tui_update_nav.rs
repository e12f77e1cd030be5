//! `update()` with no terminal: going back and forth, changing an earlier choice, quitting
//! mid-step and reopening, help, a terminal too small, read-only, a failed save.

mod tui_support;

use tiltbook::traveller::{self, EventKind, Step};
use tiltbook::tui::app::{Effect, Msg, PromptKind, Screen};
use tiltbook::tui::keymap::{Action, Input};
use tiltbook::tui::update::update;
use tiltbook::units::Length;
use tui_support::*;

#[test]
fn every_step_can_be_seen_again_until_signed() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0"]);
    enter(&mut app, &mut r);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sign));
    let back = [
        Step::Verdict,
        Step::Sweep,
        Step::Settle,
        Step::Safety,
        Step::Stack,
        Step::BlockSet,
        Step::Fixture,
    ];
    let saves = r.saves;
    for s in back {
        esc(&mut app, &mut r);
        assert_eq!(step(&app), Some(s));
    }
    esc(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Overview);
    assert_eq!(r.saves, saves, "looking back changes nothing");
    enter(&mut app, &mut r);
    assert_eq!(
        step(&app),
        Some(Step::Sign),
        "reopening the feature lands where work stopped"
    );
    esc(&mut app, &mut r);
    esc(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    enter(&mut app, &mut r); // empty field, verdict already worked out
    assert_eq!(step(&app), Some(Step::Verdict));
    assert_eq!(events(&app, EventKind::AttemptJudged), 1);
    assert_reopens(&app);
}

#[test]
fn changing_the_fixture_after_work_asks_first() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    for t in ["4", "3", "0"] {
        typ(&mut app, &mut r, t);
        enter(&mut app, &mut r);
    }
    for _ in 0..5 {
        esc(&mut app, &mut r);
    }
    assert_eq!(step(&app), Some(Step::Fixture));
    let first = app.attempt().unwrap().fixture.clone().unwrap().id;
    let other = app
        .ui
        .fixtures
        .iter()
        .position(|o| o.reachable && app.shop.fixtures[o.index].id != first)
        .unwrap();
    app.ui.fixture_sel = other;
    enter(&mut app, &mut r);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Redo(_))
    ));
    esc(&mut app, &mut r);
    assert_eq!(
        app.attempt().unwrap().fixture.as_ref().unwrap().id,
        first,
        "kept"
    );
    assert!(app.attempt().unwrap().sweep.is_some());
    enter(&mut app, &mut r);
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap();
    assert_ne!(a.fixture.as_ref().unwrap().id, first);
    assert!(
        a.stack.is_none() && a.sweep.is_none(),
        "later work is cleared (the log keeps it)"
    );
    assert_eq!(step(&app), Some(Step::BlockSet));
    assert_eq!(events(&app, EventKind::ReadingEntered), 1);
    assert_reopens(&app);
}

#[test]
fn quitting_mid_step_loses_nothing_and_reopening_returns_there() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    typ(&mut app, &mut r, "4");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "5");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "+0.0001");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "0.00"); // typed, not confirmed
    let effects = update(&mut app, Msg::Key(Input::Act(Action::Quit)));
    assert_eq!(
        effects,
        vec![],
        "work is unfinished: a note for the next shift is asked first"
    );
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Handover)
    ));
    // asked again (Ctrl-C in the note), it leaves without a note
    let effects = update(&mut app, Msg::Key(Input::Act(Action::Quit)));
    assert_eq!(effects, vec![Effect::Quit]);
    assert!(app.quit && app.doc.handovers.is_empty());
    // what a save writes, read back as a reopen reads it
    let text = traveller::to_yaml(&app.doc).unwrap();
    let doc = traveller::parse(&text).unwrap().traveller;
    let (again, _) = app_with(doc, Some("JQ"), false);
    assert_eq!(again.flow(), Some((0, Step::Sweep)));
    let sw = again.attempt().unwrap().sweep.clone().unwrap();
    assert_eq!(
        (sw.travel, sw.points, sw.readings.len()),
        (Some(Length::inches(4.0)), Some(5), 1)
    );
    assert_eq!(again.ui.readings.focus, tiltbook::tui::app::RField::Reading);
    assert_eq!(again.ui.readings.travel.text, "4.0000");
    assert_reopens(&app);
}

#[test]
fn quitting_works_from_every_screen_and_overlay() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    act(&mut app, &mut r, Action::Swap); // a prompt is open
    let effects = update(&mut app, Msg::Key(Input::Act(Action::Quit)));
    assert_eq!(effects, vec![]);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Handover)
    ));
    // Esc skips the note and quits
    assert_eq!(
        update(&mut app, Msg::Key(Input::Act(Action::Back))),
        vec![Effect::Quit]
    );
    // nothing done in this session and no feature under way: no note is asked
    let (mut app, _) = tui_support::app();
    update(&mut app, Msg::Key(Input::Act(Action::Help)));
    assert!(app.help);
    assert_eq!(
        update(&mut app, Msg::Key(Input::Act(Action::Quit))),
        vec![Effect::Quit]
    );
    // with work under way, the note's question replaces the help
    let (mut app, mut r) = tui_support::app();
    to_stack(&mut app, &mut r);
    update(&mut app, Msg::Key(Input::Act(Action::Help)));
    assert_eq!(update(&mut app, Msg::Key(Input::Act(Action::Quit))), vec![]);
    assert!(!app.help, "the note's question replaces the help");
    assert_eq!(
        update(&mut app, Msg::Key(Input::Act(Action::Quit))),
        vec![Effect::Quit]
    );
    assert_reopens(&app);
}

#[test]
fn help_opens_and_closes_and_keys_do_not_leak_through() {
    let (mut app, mut r) = app();
    act(&mut app, &mut r, Action::Help);
    assert!(app.help);
    enter(&mut app, &mut r);
    assert!(!app.help);
    assert_eq!(
        app.screen,
        Screen::Overview,
        "the Enter closed the help only"
    );
    act(&mut app, &mut r, Action::Help);
    act(&mut app, &mut r, Action::Down);
    assert_eq!(app.ui.overview_sel, 0);
    esc(&mut app, &mut r);
    assert!(!app.help);
    assert_reopens(&app);
}

#[test]
fn a_terminal_too_small_takes_no_keys_but_quit() {
    let (mut app, mut r) = app();
    update(&mut app, Msg::Resize(60, 20));
    enter(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Overview);
    update(&mut app, Msg::Resize(80, 24));
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Fixture));
    update(&mut app, Msg::Resize(79, 24));
    assert_eq!(
        update(&mut app, Msg::Key(Input::Act(Action::Quit))),
        vec![Effect::Quit]
    );
    assert_reopens(&app);
}

#[test]
fn read_only_changes_nothing() {
    let (mut seed, mut r) = app();
    to_stack(&mut seed, &mut r);
    let doc = seed.doc.clone();
    let (mut app, mut r) = app_with(doc.clone(), None, true);
    assert_eq!(
        app.flow(),
        Some((0, Step::Stack)),
        "no name is asked when only looking"
    );
    act(&mut app, &mut r, Action::Tick);
    act(&mut app, &mut r, Action::Swap);
    enter(&mut app, &mut r);
    esc(&mut app, &mut r);
    esc(&mut app, &mut r);
    enter(&mut app, &mut r);
    assert_eq!(r.saves, 0);
    assert_eq!(app.doc, doc);
    assert_reopens(&app);
}

#[test]
fn a_failed_save_is_shown_and_kept_in_mind() {
    let (mut app, _) = app();
    update(&mut app, Msg::SaveFailed("disk full".into()));
    assert!(app.unsaved);
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("NOT SAVED"))
    );
    update(&mut app, Msg::Saved);
    assert!(!app.unsaved);
    assert_reopens(&app);
}
