//! Every screen drawn on a test terminal at 80×24 and 120×40 (and the too-small screen),
//! compared with the accepted snapshots in tests/snapshots/.

mod tui_support;

use ratatui::Terminal;
use ratatui::backend::TestBackend;
use tiltbook::tui::App;
use tiltbook::tui::app::Msg;
use tiltbook::tui::keymap::Action;
use tiltbook::tui::update::update;
use tiltbook::tui::view;
use tui_support::*;

fn render(app: &App, w: u16, h: u16) -> Terminal<TestBackend> {
    let mut t = Terminal::new(TestBackend::new(w, h)).expect("a test terminal");
    t.draw(|f| view::draw(f, app)).expect("draws");
    t
}

/// Snapshot the screen as it stands at both sizes.
fn snap(name: &str, app: &mut App) {
    for (w, h) in [(80, 24), (120, 40)] {
        update(app, Msg::Resize(w, h));
        let t = render(app, w, h);
        insta::assert_snapshot!(format!("{name}_{w}x{h}"), t.backend());
    }
    update(app, Msg::Resize(80, 24));
}

/// The text of the screen, for checks that do not need a snapshot.
fn text(app: &App, w: u16, h: u16) -> String {
    render(app, w, h).backend().to_string()
}

#[test]
fn overview_and_name() {
    let (mut app, _) = app();
    snap("overview", &mut app);
    let (mut app, mut r) = app_with(plan(), None, false);
    typ(&mut app, &mut r, "J");
    snap("name", &mut app);
}

#[test]
fn too_small() {
    let (app, _) = app();
    let t = render(&app, 60, 20);
    insta::assert_snapshot!("too_small_60x20", t.backend());
    assert!(text(&app, 80, 23).contains("needs at least 80×24"));
    assert!(!text(&app, 80, 24).contains("needs at least"));
}

#[test]
fn fixture_and_set() {
    let (mut app, mut r) = app();
    enter(&mut app, &mut r);
    snap("fixture", &mut app);
    enter(&mut app, &mut r);
    snap("block_set", &mut app);
}

#[test]
fn out_of_date_reason_prompt() {
    let (mut app, mut r) = app();
    app.today = jiff::civil::date(2027, 3, 20);
    enter(&mut app, &mut r);
    let i = app
        .ui
        .fixtures
        .iter()
        .position(|o| o.out_of_date && o.reachable)
        .unwrap();
    app.ui.fixture_sel = i;
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "lead approv");
    snap("fixture_reason", &mut app);
}

#[test]
fn stack_as_it_is_wrung() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    snap("stack", &mut app);
    act(&mut app, &mut r, Action::Tick);
    act(&mut app, &mut r, Action::Tick);
    snap("stack_two_wrung", &mut app);
}

#[test]
fn safety_and_settle() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    build_stack(&mut app, &mut r);
    snap("safety", &mut app);
    enter(&mut app, &mut r);
    let effects = update(&mut app, Msg::Tick(100));
    r.drain(&mut app, effects);
    snap("settle", &mut app);
}

#[test]
fn readings_as_they_arrive() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    snap("readings_empty", &mut app);
    typ(&mut app, &mut r, "4");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "3");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "+0.0002");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "0.0001");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "0.00x");
    snap("readings_two", &mut app);
}

#[test]
fn verdicts_and_sign() {
    let (mut app, mut r) = app();
    to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "+0.0001", "0"]);
    enter(&mut app, &mut r);
    snap("verdict_pass", &mut app);
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "JQ");
    snap("sign", &mut app);
    enter(&mut app, &mut r);
    esc(&mut app, &mut r);
    snap("overview_one_done", &mut app);

    let (mut app, mut r) = tui_support::app();
    to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0.01"]);
    enter(&mut app, &mut r);
    snap("verdict_fail", &mut app);
    assert!(
        text(&app, 80, 24).contains("FAIL"),
        "the verdict is in words"
    );
    act(&mut app, &mut r, Action::NewAttempt);
    snap("stack_attempt_two", &mut app);
}

#[test]
fn help_overlay() {
    let (mut app, mut r) = app();
    to_stack(&mut app, &mut r);
    act(&mut app, &mut r, Action::Help);
    snap("help_stack", &mut app);
}

#[test]
fn read_only_title() {
    let (mut seed, mut r) = app();
    to_stack(&mut seed, &mut r);
    let (mut app, _) = app_with(seed.doc.clone(), None, true);
    snap("read_only_stack", &mut app);
}

#[test]
fn selection_is_marked_without_colour() {
    let (app, _) = app();
    let s = text(&app, 80, 24);
    assert!(s.contains("▶ F1"), "the selected row has a marker: {s}");
}
