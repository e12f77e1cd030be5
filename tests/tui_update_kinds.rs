//! `update()` with no terminal for the features that are not a plain angle: the compound angle
//! (two plates, two sweeps, a verdict on both), the taper on sine centres (half and included
//! angles), and a small angle (the remedies side by side, two stacks under the rolls), each
//! with going back and forth.

mod tui_support;

use tiltbook::traveller::{EventKind, FeatureState, Step, Verdict};
use tiltbook::tui::app::{Msg, PromptKind};
use tiltbook::tui::flow::remedy::{Pick, options};
use tiltbook::tui::keymap::Action;
use tiltbook::tui::update::update;
use tiltbook::units::{Angle, Length};
use tui_support::*;

/// compound.csv (tests/data/sine-tables, mpmath): A 30°, B 20° → the lower (other) plate at
/// 17.495240757°, stacks on 5 in plates 2.5 and 1.50313289 in.
const OTHER_PLATE_DEG: f64 = 17.495240757;

fn sizes(s: &tiltbook::traveller::Stack) -> Vec<Length> {
    s.blocks.iter().map(|b| b.size).collect()
}

#[test]
fn a_compound_angle_records_both_plates_from_one_set() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3); // F4, compound A 30° B 20° near A
    assert_eq!(step(&app), Some(Step::Stack));
    let a = app.attempt().unwrap().clone();
    assert_eq!(
        a.fixture.as_ref().map(|c| c.id.as_str()),
        Some("CSP5-014"),
        "the compound plate is ranked first"
    );
    let near = a.stack.as_ref().expect("the near plate's stack");
    let other = a.stack_b.as_ref().expect("the other plate's stack");
    // CSP5-014 has C = 5.00000 in: the table's heights on the 0.0001 in grid
    assert_eq!(near.height, Length::inches(2.5));
    assert_eq!(other.height, Length::inches(1.5031));
    assert!((near.achieved.deg() - 30.0).abs() < 1e-9);
    let want = Angle::from_rad((1.5031f64 / 5.0).asin()); // θ = asin(H/C), DOMAIN
    assert!((other.achieved.arcsec() - want.arcsec()).abs() < 0.01);
    assert!((other.achieved.deg() - OTHER_PLATE_DEG).abs() < 2.0 / 3600.0);
    // one set, no block in both (the 81-piece set holds one of each size)
    let mut all = sizes(near);
    all.extend(sizes(other));
    let n = all.len();
    all.sort();
    all.dedup();
    assert_eq!(all.len(), n, "no block in both stacks");
    assert!(a.stack_pivot.is_none());
    // protectors stay off: one pair per set, two stacks
    act(&mut app, &mut r, Action::Protectors);
    assert!(app.status.as_ref().unwrap().text.contains("stay off"));
    // every block of both is ticked before the stack is confirmed
    let total = near.blocks.len() + other.blocks.len();
    for _ in 0..near.blocks.len() {
        act(&mut app, &mut r, Action::Tick);
    }
    enter(&mut app, &mut r);
    assert_eq!(
        step(&app),
        Some(Step::Stack),
        "the other plate is not wrung yet"
    );
    for _ in near.blocks.len()..total {
        act(&mut app, &mut r, Action::Tick);
    }
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Safety));
    let a = app.attempt().unwrap();
    assert!(
        a.stack.as_ref().unwrap().built.is_some() && a.stack_b.as_ref().unwrap().built.is_some()
    );
    let built = app
        .doc
        .events
        .iter()
        .rfind(|e| e.kind == EventKind::StackBuilt)
        .unwrap();
    assert!(
        built.detail.contains("near plate 2.5000 in")
            && built.detail.contains("other plate 1.5031 in")
    );
    // back and forth keeps both
    esc(&mut app, &mut r);
    esc(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::BlockSet));
    enter(&mut app, &mut r); // the same set: nothing is solved again
    assert_eq!(step(&app), Some(Step::Stack));
    assert_eq!(
        app.attempt().unwrap().stack_b.as_ref().unwrap().height,
        Length::inches(1.5031)
    );
    assert_reopens(&app);
}

#[test]
fn a_block_of_either_plate_can_be_swapped_but_not_for_one_the_other_uses() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3);
    let a = app.attempt().unwrap().clone();
    let near_n = a.stack.as_ref().unwrap().blocks.len();
    let other = a.stack_b.as_ref().unwrap();
    let big = a.stack.as_ref().unwrap().blocks[0].size; // 2.0000 in, in the near plate's stack
    // the other plate's 1.0000 in block: swap it for the near plate's 2.0000 in: refused
    let k = other
        .blocks
        .iter()
        .position(|b| b.size == Length::inches(1.0))
        .unwrap();
    app.ui.stack_sel = near_n + k;
    act(&mut app, &mut r, Action::Swap);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Swap(_))
    ));
    assert!(app.prompt.as_ref().unwrap().title.contains("other plate"));
    typ(&mut app, &mut r, &big.number(tiltbook::units::Unit::In, 4));
    enter(&mut app, &mut r);
    let err = app
        .prompt
        .as_ref()
        .and_then(|p| p.error.clone())
        .unwrap_or_default();
    assert!(err.contains("no 2.0000 in block free"), "{err}");
    esc(&mut app, &mut r);
    // the 0.1030 for a 0.1040: the other plate's angle follows what was built
    let k = other
        .blocks
        .iter()
        .position(|b| b.size == Length::inches(0.103))
        .unwrap();
    app.ui.stack_sel = near_n + k;
    act(&mut app, &mut r, Action::Swap);
    typ(&mut app, &mut r, "0.104");
    enter(&mut app, &mut r);
    assert!(app.prompt.is_none());
    let a = app.attempt().unwrap();
    let o = a.stack_b.as_ref().unwrap();
    assert_eq!(o.height, Length::inches(1.5041));
    let want = Angle::from_rad((1.5041f64 / 5.0).asin());
    assert!((o.achieved.arcsec() - want.arcsec()).abs() < 0.01);
    assert_eq!(o.swaps.len(), 1);
    assert!(a.stack.as_ref().unwrap().swaps.is_empty());
    assert_eq!(events(&app, EventKind::BlockSwapped), 1);
    assert_reopens(&app);
}

#[test]
fn a_compound_angle_is_swept_in_both_views_and_passes_only_when_both_do() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3);
    stack_to_readings(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    assert!(!app.ui.readings.other_view, "view A first");
    readings(&mut app, &mut r, "4", &["0", "0.0001", "0"]);
    enter(&mut app, &mut r); // view A is in: on to view B
    assert_eq!(step(&app), Some(Step::Sweep));
    assert!(app.ui.readings.other_view);
    assert!(app.attempt().unwrap().judgement.is_none());
    // back to view A and forward again: nothing is lost
    esc(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    assert!(!app.ui.readings.other_view);
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
    enter(&mut app, &mut r);
    assert!(app.ui.readings.other_view);
    // view B: a rise of 0.0200 in over 4 in is atan(0.005) = 17'11" (indicator-slope rule of
    // DOMAIN), outside ±0°10': the feature fails though view A passes
    readings(&mut app, &mut r, "4", &["0", "0.0100", "0.0200"]);
    let b = app.attempt().unwrap().sweep_b.clone().unwrap();
    assert_eq!(b.readings.len(), 3);
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Verdict));
    let j = app.attempt().unwrap().judgement.clone().unwrap();
    let v = j.view_b.clone().expect("view B judged");
    assert!((v.residual.arcsec() - (0.005f64).atan().to_degrees() * 3600.0).abs() < 0.01);
    assert_eq!(v.verdict, Verdict::Fail);
    assert_eq!(j.verdict, Verdict::Fail, "the worse of the two views");
    assert!(
        j.correction.is_some() && v.correction.is_some(),
        "a change for each plate"
    );
    // the other view's correction levels it: the new plate sets view B less its residual
    let o = v.correction.as_ref().unwrap();
    assert!(
        o.delta.nm() < 0,
        "the surface rises: the other plate comes down"
    );
    let events_b = app
        .doc
        .events
        .iter()
        .filter(|e| e.kind == EventKind::ReadingEntered && e.detail.starts_with("view B"))
        .count();
    assert_eq!(events_b, 3);
    assert_reopens(&app);
    // a new attempt builds both plates again at the corrected heights
    let near_h = j.correction.as_ref().unwrap().height;
    act(&mut app, &mut r, Action::NewAttempt);
    assert_eq!(step(&app), Some(Step::Stack));
    let a = app.attempt().unwrap();
    assert_eq!(a.number, 2);
    assert_eq!(a.stack.as_ref().unwrap().height, near_h);
    assert_eq!(a.stack_b.as_ref().unwrap().height, o.height);
    assert_reopens(&app);
}

#[test]
fn a_compound_verdict_with_both_views_in_signs_and_reopens() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3);
    stack_to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0.0001", "0"]);
    enter(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0", "0.0001"]);
    enter(&mut app, &mut r);
    let j = app.attempt().unwrap().judgement.clone().unwrap();
    assert_eq!(j.verdict, Verdict::Pass);
    assert_eq!(j.view_b.as_ref().unwrap().verdict, Verdict::Pass);
    // from the verdict, Esc shows view B's readings, then view A's
    esc(&mut app, &mut r);
    assert!(app.ui.readings.other_view);
    esc(&mut app, &mut r);
    assert!(!app.ui.readings.other_view);
    enter(&mut app, &mut r); // the verdict stands: straight back to it
    assert_eq!(step(&app), Some(Step::Verdict));
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "JQ");
    enter(&mut app, &mut r);
    assert_eq!(app.doc.feature("F4").unwrap().state, FeatureState::Signed);
    let s = app.doc.signoffs.last().unwrap();
    assert!(s.fields.contains_key("readings_b") && s.fields.contains_key("view_b"));
    assert_reopens(&app);
}

#[test]
fn a_taper_is_set_on_sine_centres_at_its_half_angle() {
    let (mut app, mut r) = app();
    act(&mut app, &mut r, Action::Down);
    enter(&mut app, &mut r); // F2, taper 1:20
    let first = &app.shop.fixtures[app.ui.fixtures[0].index];
    assert_eq!(first.id, "SC5-310", "sine centres come first for a taper");
    enter(&mut app, &mut r);
    enter(&mut app, &mut r);
    // tapers.csv: 1:20 → half angle 1.4320961842°; on 5 in centres H = 5·sin(half)
    // = 0.124961 in → 0.1250 in on the 0.0001 in grid (H = C·sin θ, DOMAIN)
    let half = 1.4320961842f64;
    let h = 5.0 * half.to_radians().sin();
    assert!((h - 0.124961).abs() < 1e-6, "{h}");
    let a = app.attempt().unwrap();
    let s = a.stack.as_ref().unwrap();
    assert_eq!(s.height, Length::inches(0.125));
    assert!(
        s.blocks.iter().all(|b| !b.protector),
        "too short for the protectors"
    );
    assert!(
        app.ui
            .solve_note
            .as_deref()
            .is_some_and(|n| n.contains("protector blocks are left off"))
    );
    stack_to_readings(&mut app, &mut r);
    // back to the settle step and forward again
    esc(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Settle));
    enter(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    readings(&mut app, &mut r, "4", &["0", "0.0001", "0.0001"]);
    enter(&mut app, &mut r);
    let j = app.attempt().unwrap().judgement.clone().unwrap();
    // the deviation is of the half angle, against the half angle
    let s = app.attempt().unwrap().stack.clone().unwrap();
    let want = (s.achieved - Angle::from_deg(half)) - j.residual;
    assert!((j.deviation.arcsec() - want.arcsec()).abs() < 0.01);
    assert_eq!(j.verdict, Verdict::Pass);
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "JQ");
    enter(&mut app, &mut r);
    assert_eq!(app.doc.feature("F2").unwrap().state, FeatureState::Signed);
    assert_reopens(&app);
}

#[test]
fn a_small_angle_offers_two_stacks_and_a_longer_fixture_and_records_the_choice() {
    let (mut app, mut r) = app_with(small_angle_plan(), Some("JQ"), false);
    to_stack_on(&mut app, &mut r, "SB5-117");
    // 5 in · sin 0.5° = 0.0436331 in (direct computation): below the set's 0.0500 in block
    let rem = app.ui.remedies.clone().expect("the remedies are offered");
    assert!(rem.open);
    assert!(
        app.attempt().unwrap().stack.is_none(),
        "nothing is recorded before the choice"
    );
    let list = options(&rem.small);
    assert_eq!(list[0], Pick::Two);
    assert!(list.iter().any(|p| matches!(p, Pick::Longer(_))));
    assert_eq!(list[rem.sel], Pick::Two, "two stacks chosen by default");
    assert!(rem.small.why.contains("smallest angle error"));
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap().clone();
    let raised = a.stack.as_ref().unwrap();
    let pivot = a
        .stack_pivot
        .as_ref()
        .expect("the stack under the pivot roll");
    assert_eq!(raised.height - pivot.height, Length::inches(0.0436));
    // θ = asin((R − P)/C), DOMAIN (small angles); both record it
    let want = Angle::from_rad((0.0436f64 / 5.00002).asin());
    assert!((raised.achieved.arcsec() - want.arcsec()).abs() < 0.01);
    assert_eq!(raised.achieved, pivot.achieved);
    assert!(a.stack_b.is_none());
    assert_reopens(&app);
    // r shows the choice again; the longer fixture becomes the attempt's, with the reason
    act(&mut app, &mut r, Action::Remedies);
    assert!(app.ui.remedies.as_ref().unwrap().open);
    let k = list
        .iter()
        .position(|p| matches!(p, Pick::Longer(_)))
        .unwrap();
    for _ in 0..k {
        act(&mut app, &mut r, Action::Down);
    }
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap().clone();
    let fx = a.fixture.as_ref().unwrap();
    assert_ne!(fx.id, "SB5-117");
    assert!(fx.reason.contains("small angle"));
    assert!(a.stack_pivot.is_none());
    assert_eq!(
        app.doc.feature("F1").unwrap().state,
        FeatureState::SetChosen
    );
    assert_reopens(&app);
    // and back to two stacks: the first fixture again
    act(&mut app, &mut r, Action::Remedies);
    act(&mut app, &mut r, Action::PageUp);
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap().clone();
    assert_eq!(a.fixture.as_ref().unwrap().id, "SB5-117");
    assert!(a.stack_pivot.is_some());
    assert_reopens(&app);
}

#[test]
fn a_failed_two_stack_attempt_corrects_the_difference() {
    let (mut app, mut r) = app_with(small_angle_plan(), Some("JQ"), false);
    to_stack_on(&mut app, &mut r, "SB5-117");
    enter(&mut app, &mut r); // two stacks
    stack_to_readings(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::Sweep));
    // a rise of 0.0040 in over 4 in: 3'26" against ±0°01'
    readings(&mut app, &mut r, "4", &["0", "0.0020", "0.0040"]);
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap().clone();
    let j = a.judgement.clone().unwrap();
    assert_eq!(j.verdict, Verdict::Fail);
    let c = j.correction.clone().unwrap();
    let diff = a.stack.as_ref().unwrap().height - a.stack_pivot.as_ref().unwrap().height;
    assert_eq!(c.height, diff + c.delta, "the change is to the difference");
    // ΔH = C·(sin(θ − δ) − sin θ) (DOMAIN, correction), on the 0.0001 in grid
    let th = a.stack.as_ref().unwrap().achieved.rad();
    let dh = 5.00002 * ((th - j.residual.rad()).sin() - th.sin());
    assert!(
        (c.delta.as_in() - dh).abs() <= 0.00005 + 1e-9,
        "{} {dh}",
        c.delta.as_in()
    );
    act(&mut app, &mut r, Action::NewAttempt);
    let a = app.attempt().unwrap().clone();
    assert_eq!(a.number, 2);
    let (raised, pivot) = (a.stack.unwrap(), a.stack_pivot.expect("two stacks again"));
    assert_eq!(raised.height - pivot.height, c.height);
    assert_reopens(&app);
}

#[test]
fn the_note_for_the_next_shift_is_asked_only_with_something_to_hand_over() {
    // opened and closed: nothing to hand over
    let (mut app, _) = tui_support::app();
    let effects = update(
        &mut app,
        Msg::Key(tiltbook::tui::keymap::Input::Act(Action::Quit)),
    );
    assert!(app.quit && app.prompt.is_none(), "{effects:?}");
    // a feature opened but nothing chosen yet: still nothing
    let (mut app, mut r) = tui_support::app();
    enter(&mut app, &mut r);
    act(&mut app, &mut r, Action::Quit);
    assert!(app.quit);
    // a fixture chosen: asked
    let (mut app, mut r) = tui_support::app();
    enter(&mut app, &mut r);
    enter(&mut app, &mut r);
    act(&mut app, &mut r, Action::Quit);
    assert!(!app.quit);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Handover)
    ));
}

#[test]
fn another_set_clears_both_plates_and_builds_them_again() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3);
    // one block of the other plate on
    app.ui.stack_sel = app.attempt().unwrap().stack.as_ref().unwrap().blocks.len();
    act(&mut app, &mut r, Action::Tick);
    assert!(app.attempt().unwrap().stack_b.as_ref().unwrap().blocks[0].wrung);
    esc(&mut app, &mut r);
    assert_eq!(step(&app), Some(Step::BlockSet));
    act(&mut app, &mut r, Action::Down); // the metric set
    enter(&mut app, &mut r);
    assert!(
        matches!(
            app.prompt.as_ref().map(|p| &p.kind),
            Some(PromptKind::Redo(_))
        ),
        "a wrung block is later work: asked first"
    );
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap();
    assert_eq!(a.block_set.as_ref().unwrap().id, "BX88-B");
    let (n, o) = (a.stack.as_ref().unwrap(), a.stack_b.as_ref().unwrap());
    assert!(
        n.blocks.iter().chain(&o.blocks).all(|b| !b.wrung),
        "built afresh"
    );
    // whole 0.001 mm steps of the metric set (0.0005 mm with its 1.0005 block)
    assert!(n.height.nm() % 500 == 0 && o.height.nm() % 500 == 0);
    assert_reopens(&app);
}

#[test]
fn another_fixture_after_the_readings_clears_both_sweeps() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3);
    stack_to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0.0001", "0"]);
    enter(&mut app, &mut r); // on to view B
    typ(&mut app, &mut r, "4");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "3");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "0");
    enter(&mut app, &mut r);
    assert!(app.attempt().unwrap().sweep_b.is_some());
    // back to the fixtures: view B, view A, settle, safety, stack, set, fixture
    for _ in 0..6 {
        esc(&mut app, &mut r);
    }
    assert_eq!(step(&app), Some(Step::Fixture));
    act(&mut app, &mut r, Action::Down);
    enter(&mut app, &mut r);
    assert!(matches!(
        app.prompt.as_ref().map(|p| &p.kind),
        Some(PromptKind::Redo(_))
    ));
    enter(&mut app, &mut r);
    let a = app.attempt().unwrap();
    assert!(
        a.sweep.is_none() && a.sweep_b.is_none(),
        "both views' readings go"
    );
    assert!(a.stack.is_none() && a.stack_b.is_none());
    assert_reopens(&app);
}
