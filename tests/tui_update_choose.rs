//! `update()` with no terminal: starting a feature, the name, the fixture and set choices,
//! and the stack (ticks, swaps, protectors).

mod tui_support;

use tiltbook::traveller::{EventKind, FeatureState, Step};
use tiltbook::tui::app::{PromptKind, Screen};
use tiltbook::tui::keymap::Action;
use tiltbook::units::{Length, Unit};
use tui_support::*;

#[test]
fn lands_on_the_overview_and_enter_starts_the_first_feature() {
    let (mut app, mut r) = app();
    assert_eq!(app.screen, Screen::Overview);
    assert_eq!(app.ui.overview_sel, 0);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Fixture));
    let f = &app.doc.features[0];
    assert_eq!(f.attempts.len(), 1);
    assert_eq!(events(&app, EventKind::AttemptStarted), 1);
    assert_eq!(r.saves, 1, "starting an attempt is saved at once");
    // Esc from the first step is the overview again; Enter comes back without a new attempt
    esc(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Overview);
    enter(&mut app, &mut r);
    assert_eq!(app.doc.features[0].attempts.len(), 1);
    assert_reopens(&app);
}

#[test]
fn the_name_is_asked_once_when_not_given() {
    let (mut app, mut r) = app_with(plan(), None, false);
    assert_eq!(app.screen, Screen::Name);
    enter(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Name, "a blank name is refused");
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("initials"))
    );
    typ(&mut app, &mut r, "JQ");
    enter(&mut app, &mut r);
    assert_eq!(app.operator, "JQ");
    assert_eq!(app.screen, Screen::Overview);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Fixture));
    let a = app.attempt().unwrap();
    assert_eq!(a.started.as_ref().unwrap().by, "JQ");
    assert_reopens(&app);
}

#[test]
fn choosing_a_fixture_records_it_and_going_back_keeps_it() {
    let (mut app, mut r) = app();
    enter(&mut app, &mut r);
    act(&mut app, &mut r, Action::Down);
    let pick = app.ui.fixtures[app.ui.fixture_sel].index;
    let id = app.shop.fixtures[pick].id.clone();
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::BlockSet));
    let a = app.attempt().unwrap();
    assert_eq!(a.fixture.as_ref().unwrap().id, id);
    assert_eq!(a.step, Step::BlockSet);
    assert!(
        app.doc.fixture(&id).is_some(),
        "the fixture's snapshot is in the traveller"
    );
    assert_eq!(app.doc.features[0].state, FeatureState::FixtureChosen);
    // back: the chosen one is selected; Enter on it goes on without a second event
    esc(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Fixture));
    assert_eq!(app.ui.fixtures[app.ui.fixture_sel].index, pick);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::BlockSet));
    assert_eq!(events(&app, EventKind::FixtureChosen), 1);
    assert_reopens(&app);
}

#[test]
fn an_out_of_date_fixture_needs_a_typed_reason() {
    let (mut app, mut r) = app();
    // the demo shop's SB5-117 is due 2027-03-16
    app.today = jiff::civil::date(2027, 3, 20);
    enter(&mut app, &mut r);
    let i = app
        .ui
        .fixtures
        .iter()
        .position(|o| app.shop.fixtures[o.index].id == "SB5-117")
        .unwrap();
    assert!(app.ui.fixtures[i].out_of_date);
    for _ in 0..i {
        act(&mut app, &mut r, Action::Down);
    }
    enter(&mut app, &mut r);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::FixtureReason(_))
    ));
    enter(&mut app, &mut r);
    assert!(
        app.prompt.as_ref().is_some_and(|p| p.error.is_some()),
        "a blank reason is refused"
    );
    assert!(app.attempt().unwrap().fixture.is_none());
    typ(&mut app, &mut r, "lead approved, recheck booked");
    enter(&mut app, &mut r);
    assert!(app.prompt.is_none());
    let c = app.attempt().unwrap().fixture.clone().unwrap();
    assert_eq!(
        (c.id.as_str(), c.reason.as_str()),
        ("SB5-117", "lead approved, recheck booked")
    );
    // Esc on a prompt cancels without a change
    let (mut app, mut r) = tui_support::app();
    app.today = jiff::civil::date(2027, 3, 20);
    enter(&mut app, &mut r);
    for _ in 0..i {
        act(&mut app, &mut r, Action::Down);
    }
    enter(&mut app, &mut r);
    esc(&mut app, &mut r);
    assert!(app.prompt.is_none() && app.attempt().unwrap().fixture.is_none());
    assert_reopens(&app);
}

#[test]
fn a_fixture_that_cannot_reach_the_angle_is_refused() {
    let mut doc = plan();
    doc.features[0].nominal = Some(tiltbook::units::Angle::from_deg(70.0));
    let (mut app, mut r) = app_with(doc, Some("JQ"), false);
    enter(&mut app, &mut r);
    assert!(
        app.ui.fixtures.iter().all(|o| !o.reachable),
        "the demo shop is rated to 60° at most"
    );
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Fixture));
    assert!(app.attempt().unwrap().fixture.is_none());
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("cannot be used"))
    );
    assert_reopens(&app);
}

#[test]
fn the_set_choice_solves_the_stack_for_the_angle() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Stack));
    let a = app.attempt().unwrap();
    let s = a.stack.as_ref().expect("the solver answered");
    assert_eq!(s.block_total(), s.height);
    // the first fixture ranked; H = C·sin θ + (d_p − d_r)/2 rounded to 0.0001 in (DOMAIN)
    let fx = app.doc.fixture(&a.fixture.as_ref().unwrap().id).unwrap();
    let ideal =
        fx.centre.nm() as f64 * 0.5 + (fx.roll_pivot.nm() - fx.roll_stack.nm()) as f64 / 2.0;
    assert!(
        (s.height.nm() as f64 - ideal).abs() <= 1270.0,
        "{} vs {ideal}",
        s.height.nm()
    );
    assert!(s.blocks.first().unwrap().protector && s.blocks.last().unwrap().protector);
    assert!(s.blocks.iter().all(|b| !b.wrung));
    assert_eq!(app.doc.features[0].state, FeatureState::SetChosen);
    assert_reopens(&app);
}

#[test]
fn every_block_is_ticked_before_the_stack_is_confirmed() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Stack), "nothing ticked yet");
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("not ticked"))
    );
    act(&mut app, &mut r, Action::Tick);
    assert!(app.attempt().unwrap().stack.as_ref().unwrap().blocks[0].wrung);
    assert_eq!(
        app.ui.stack_sel, 1,
        "the selection moves on to the next block"
    );
    act(&mut app, &mut r, Action::Up);
    act(&mut app, &mut r, Action::Tick);
    assert!(
        !app.attempt().unwrap().stack.as_ref().unwrap().blocks[0].wrung,
        "a second tick undoes"
    );
    let saves = r.saves;
    build_stack(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Safety));
    let s = app.attempt().unwrap().stack.clone().unwrap();
    assert!(s.built.is_some() && s.blocks.iter().all(|b| b.wrung));
    assert!(r.saves > saves, "each tick and the confirmation are saved");
    assert_eq!(events(&app, EventKind::StackBuilt), 1);
    assert_reopens(&app);
}

#[test]
fn a_swapped_block_recomputes_from_what_was_built() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    let before = app.attempt().unwrap().stack.clone().unwrap();
    act(&mut app, &mut r, Action::Down); // the first block after the protector
    let planned = before.blocks[1].size;
    act(&mut app, &mut r, Action::Swap);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Swap(1))
    ));
    typ(&mut app, &mut r, "0.1007"); // missing from the demo set
    enter(&mut app, &mut r);
    let err = app
        .prompt
        .as_ref()
        .and_then(|p| p.error.clone())
        .unwrap_or_default();
    assert!(err.contains("has no 0.1007 in block"), "{err}");
    clear_field(&mut app, &mut r);
    typ(&mut app, &mut r, "sandwich");
    enter(&mut app, &mut r);
    assert!(app.prompt.as_ref().is_some_and(|p| p.error.is_some()));
    clear_field(&mut app, &mut r);
    // one 0.0001 in step taller than planned, if the set has it; else one step shorter
    let unit = Unit::In;
    let step_len = Length::inches(0.0001);
    let used = [planned + step_len, planned - step_len]
        .into_iter()
        .find(|l| {
            app.shop.set("BX81-A").unwrap().has(*l, 1)
                && !before.blocks.iter().any(|b| b.size == *l)
        })
        .unwrap_or(Length::inches(0.1009));
    typ(&mut app, &mut r, &used.number(unit, 4));
    enter(&mut app, &mut r);
    assert!(app.prompt.is_none(), "{:?}", app.prompt);
    let s = app.attempt().unwrap().stack.clone().unwrap();
    assert_eq!(s.blocks[1].size, used);
    assert!(s.blocks[1].wrung, "the swapped block is the one wrung");
    assert_eq!(s.height, before.height - planned + used);
    assert_eq!(s.height, s.block_total());
    assert_ne!(
        s.achieved, before.achieved,
        "the angle follows the stack really built"
    );
    assert_eq!(s.swaps.len(), 1);
    assert_eq!((s.swaps[0].planned, s.swaps[0].used), (planned, used));
    assert_eq!(events(&app, EventKind::BlockSwapped), 1);
    assert_reopens(&app);
}

#[test]
fn protectors_come_off_and_on_before_any_block_is_wrung() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    let with = app.attempt().unwrap().stack.clone().unwrap();
    act(&mut app, &mut r, Action::Protectors);
    let without = app.attempt().unwrap().stack.clone().unwrap();
    assert!(without.blocks.iter().all(|b| !b.protector));
    assert_eq!(with.height, without.height, "the same height either way");
    act(&mut app, &mut r, Action::Tick);
    act(&mut app, &mut r, Action::Protectors);
    assert!(
        app.attempt()
            .unwrap()
            .stack
            .as_ref()
            .unwrap()
            .blocks
            .iter()
            .all(|b| !b.protector)
    );
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("already wrung"))
    );
    assert_reopens(&app);
}

#[test]
fn the_set_kept_through_a_fixture_change_is_chosen_again_with_a_reason_when_out_of_date() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    let set = app.attempt().unwrap().block_set.clone().unwrap();
    assert!(set.reason.is_empty());
    // days pass: the demo shop's BX81-A is due 2027-04-30
    app.today = jiff::civil::date(2027, 5, 3);
    while step(&app) != Some(Step::Fixture) {
        esc(&mut app, &mut r);
    }
    let sel = app.ui.fixture_sel;
    let other = (0..app.ui.fixtures.len())
        .find(|&k| k != sel && app.ui.fixtures[k].reachable && app.ui.fixtures[k].suitable)
        .unwrap();
    app.ui.fixture_sel = other;
    enter(&mut app, &mut r); // another fixture
    if app.prompt.is_some() {
        // out of date too by then, or the stack to clear: answer and go on
        typ(&mut app, &mut r, "lead approved");
        enter(&mut app, &mut r);
    }
    assert_eq!(app.feature().unwrap().state, FeatureState::FixtureChosen);
    assert_eq!(step(&app), Some(Step::BlockSet));
    let before = events(&app, EventKind::SetChosen);
    enter(&mut app, &mut r); // the same set, kept
    assert!(
        matches!(
            app.prompt.as_ref().map(|p| &p.kind),
            Some(PromptKind::SetReason(_))
        ),
        "the kept set is now out of date: a reason is asked"
    );
    typ(&mut app, &mut r, "recheck booked for Friday");
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Stack));
    assert_eq!(events(&app, EventKind::SetChosen), before + 1);
    let c = app.attempt().unwrap().block_set.clone().unwrap();
    assert_eq!(
        (c.id.as_str(), c.reason.as_str()),
        (set.id.as_str(), "recheck booked for Friday")
    );
    assert_eq!(app.feature().unwrap().state, FeatureState::SetChosen);
    assert_reopens(&app);
}

#[test]
fn a_swap_that_takes_the_angle_outside_the_tolerance_is_recorded_with_a_warning() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    let before = app.attempt().unwrap().stack.clone().unwrap();
    act(&mut app, &mut r, Action::Down); // the first block after the protector
    let planned = before.blocks[1].size;
    // a block of very different size (the 81-piece set's 0.950 in; common practice (no source))
    let used = Length::inches(0.95);
    assert_ne!(planned, used);
    act(&mut app, &mut r, Action::Swap);
    typ(&mut app, &mut r, "0.950");
    enter(&mut app, &mut r);
    assert!(app.prompt.is_none(), "{:?}", app.prompt);
    assert_eq!(
        app.attempt().unwrap().stack.clone().unwrap().blocks[1].size,
        used
    );
    let said = app
        .status
        .as_ref()
        .map(|s| s.text.clone())
        .unwrap_or_default();
    assert!(
        said.contains("outside the tolerance") && said.contains("swap again"),
        "{said}"
    );
    assert_reopens(&app);
}
