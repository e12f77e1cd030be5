//! `update()` with no terminal, for the second shift: the note asked on quitting with work
//! unfinished (Esc or empty skips it), the note shown first on opening and marked read, and a
//! half-done job reopened on the exact step, under the new operator's name.

mod tui_support;

use tiltbook::traveller::{self, EventKind, Step};
use tiltbook::tui::app::{Effect, Msg, PromptKind, RField, Screen};
use tiltbook::tui::keymap::{Action, Input};
use tiltbook::tui::update::update;
use tiltbook::units::Length;
use tui_support::*;

fn quit(app: &mut tiltbook::tui::App) -> Vec<Effect> {
    update(app, Msg::Key(Input::Act(Action::Quit)))
}

fn asks_for_a_note(app: &tiltbook::tui::App) -> bool {
    matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Handover)
    )
}

/// KA works F1 to the readings, with one of three readings in.
fn half_done() -> (tiltbook::tui::App, tiltbook::tui::Runner) {
    let (mut app, mut r) = app_with(plan(), Some("KA"), false);
    to_readings(&mut app, &mut r);
    for t in ["4", "3", "+0.0001"] {
        typ(&mut app, &mut r, t);
        enter(&mut app, &mut r);
    }
    (app, r)
}

#[test]
fn quitting_with_work_unfinished_asks_for_a_note_and_keeps_it() {
    let (mut app, mut r) = half_done();
    assert_eq!(quit(&mut app), vec![]);
    assert!(asks_for_a_note(&app) && !app.quit);
    typ(&mut app, &mut r, "F1 on the 5 in bar, 1 of 3 readings in");
    let effects = update(&mut app, Msg::Key(Input::Act(Action::Forward)));
    assert_eq!(
        effects,
        vec![Effect::Save, Effect::Quit],
        "saved, then the lock goes"
    );
    assert!(app.quit);
    let h = app.doc.handovers.last().unwrap();
    assert_eq!(
        (h.text.as_str(), h.by.as_str()),
        ("F1 on the 5 in bar, 1 of 3 readings in", "KA")
    );
    let ev = app.doc.events.last().unwrap();
    assert_eq!((ev.kind, ev.by.as_str()), (EventKind::Handover, "KA"));
    assert_reopens(&app);
}

#[test]
fn esc_or_an_empty_note_quits_without_one() {
    let (mut app, _) = half_done();
    quit(&mut app);
    assert_eq!(
        update(&mut app, Msg::Key(Input::Act(Action::Back))),
        vec![Effect::Quit]
    );
    assert!(app.quit && app.doc.handovers.is_empty());

    let (mut app, mut r) = half_done();
    quit(&mut app);
    typ(&mut app, &mut r, "   ");
    assert_eq!(
        update(&mut app, Msg::Key(Input::Act(Action::Forward))),
        vec![Effect::Quit]
    );
    assert!(app.doc.handovers.is_empty());
    // while typing the note, q is a letter of it
    let (mut app, mut r) = half_done();
    quit(&mut app);
    typ(&mut app, &mut r, "q");
    assert!(!app.quit);
    assert_eq!(
        app.prompt.as_ref().unwrap().field.as_ref().unwrap().text,
        "q"
    );
}

#[test]
fn no_note_is_asked_when_there_is_nothing_to_hand_over() {
    // read-only
    let (mut app, _) = app_with(plan(), None, true);
    assert_eq!(quit(&mut app), vec![Effect::Quit]);
    // the lead's review
    let (mut app, _) = review_app(plan(), Some("LV"), false);
    assert_eq!(quit(&mut app), vec![Effect::Quit]);
    // the name not given yet
    let (mut app, _) = app_with(plan(), None, false);
    assert_eq!(app.screen, Screen::Name);
    assert_eq!(quit(&mut app), vec![Effect::Quit]);
    // every feature finished
    let (mut app, _) = app_with(sample("ds-204-finished.yaml"), Some("TJ"), false);
    assert_eq!(quit(&mut app), vec![Effect::Quit]);
    // a terminal too small to show the question
    let (mut app, _) = half_done();
    update(&mut app, Msg::Resize(60, 20));
    assert_eq!(quit(&mut app), vec![Effect::Quit]);
}

#[test]
fn the_next_shift_sees_the_note_first_then_lands_on_the_exact_step() {
    let (mut a, mut r) = half_done();
    quit(&mut a);
    typ(&mut a, &mut r, "carry on from the 2 in mark");
    enter(&mut a, &mut r);
    let saved = traveller::to_yaml(&a.doc).unwrap();
    let doc = traveller::parse(&saved).unwrap().traveller;

    let (mut b, mut r) = app_with(doc, Some("KB"), false);
    assert_eq!(
        b.screen,
        Screen::Notice,
        "the note comes before anything else"
    );
    assert_eq!(r.saves, 0);
    enter(&mut b, &mut r);
    assert_eq!(r.saves, 1, "marked read, and saved");
    let h = &b.doc.handovers[0];
    assert_eq!(h.read_by.len(), 1);
    assert_eq!(h.read_by[0].by, "KB");
    assert_eq!(events(&b, EventKind::HandoverRead), 1);
    // same feature, same attempt, partial readings kept, ready for the next reading
    assert_eq!(b.flow(), Some((0, Step::Sweep)));
    let at = b.attempt().unwrap();
    assert_eq!(at.number, 1);
    let sw = at.sweep.as_ref().unwrap();
    assert_eq!((sw.points, sw.readings.len()), (Some(3), 1));
    assert_eq!(b.ui.readings.focus, RField::Reading);
    // the next entries are KB's
    for v in ["0", "+0.0001"] {
        typ(&mut b, &mut r, v);
        enter(&mut b, &mut r);
    }
    let sw = b.attempt().unwrap().sweep.clone().unwrap();
    assert_eq!(
        sw.readings,
        vec![Length::inches(0.0001), Length::ZERO, Length::inches(0.0001)]
    );
    assert_eq!(sw.entered.as_ref().unwrap().by, "KB");
    let by: Vec<&str> = b
        .doc
        .events
        .iter()
        .filter(|e| e.kind == EventKind::ReadingEntered)
        .map(|e| e.by.as_str())
        .collect();
    assert_eq!(
        by,
        ["KA", "KB", "KB"],
        "each reading records who entered it"
    );
    assert_reopens(&b);
    // KB reopening later is not shown the note again; KA (who wrote it) never is
    let (again, _) = app_with(b.doc.clone(), Some("KB"), false);
    assert_ne!(again.screen, Screen::Notice);
    let (author, _) = app_with(b.doc.clone(), Some("KA"), false);
    assert_ne!(author.screen, Screen::Notice);
}

#[test]
fn with_no_name_yet_the_note_comes_first_and_is_marked_once_the_name_is_known() {
    let doc = sample("ds-204-half-done.yaml");
    let (mut app, mut r) = app_with(doc, None, false);
    assert_eq!(app.screen, Screen::Notice);
    enter(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Name);
    assert_eq!(r.saves, 0, "nobody to mark it read by yet");
    typ(&mut app, &mut r, "KB");
    enter(&mut app, &mut r);
    assert_eq!(app.doc.handovers[0].read_by[0].by, "KB");
    assert_eq!(
        app.flow(),
        Some((1, Step::Sweep)),
        "F2, where the first shift stopped"
    );
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
    assert_reopens(&app);
}

#[test]
fn read_only_shows_the_note_but_marks_nothing() {
    let doc = sample("ds-204-half-done.yaml");
    let (mut app, mut r) = app_with(doc.clone(), Some("KB"), true);
    assert_eq!(app.screen, Screen::Notice);
    enter(&mut app, &mut r);
    assert_eq!(app.flow(), Some((1, Step::Sweep)));
    assert_eq!(r.saves, 0);
    assert_eq!(app.doc, doc);
}
