//! The screens of the features that are not a plain angle, drawn on a test terminal at 80×24
//! and 120×40 and compared with the accepted snapshots: a compound angle's two stacks, its
//! other view's readings and its verdict on both views; a taper's stack; a small angle's
//! remedies side by side and its two stacks under the rolls.

mod tui_support;

use ratatui::Terminal;
use ratatui::backend::TestBackend;
use tiltbook::tui::App;
use tiltbook::tui::app::Msg;
use tiltbook::tui::update::update;
use tiltbook::tui::view;
use tui_support::*;

fn render(app: &App, w: u16, h: u16) -> Terminal<TestBackend> {
    let mut t = Terminal::new(TestBackend::new(w, h)).expect("a test terminal");
    t.draw(|f| view::draw(f, app)).expect("draws");
    t
}

/// Snapshot the screen as it stands at both sizes; the text at 80×24 is returned.
fn snap(name: &str, app: &mut App) -> String {
    for (w, h) in [(80, 24), (120, 40)] {
        update(app, Msg::Resize(w, h));
        let t = render(app, w, h);
        insta::assert_snapshot!(format!("{name}_{w}x{h}"), t.backend());
    }
    update(app, Msg::Resize(80, 24));
    render(app, 80, 24).backend().to_string()
}

#[test]
fn compound_stack_readings_and_verdict() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 3); // F4, compound A 30° B 20°
    let s = snap("stack_compound", &mut app);
    for want in [
        "Near plate (A)",
        "Other plate (B)",
        "1.5031 in",
        "View B",
        "true slope 34°19'",
    ] {
        assert!(s.contains(want), "{want}:\n{s}");
    }
    stack_to_readings(&mut app, &mut r);
    readings(&mut app, &mut r, "4", &["0", "0.0001", "0"]);
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "4");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "3");
    enter(&mut app, &mut r);
    typ(&mut app, &mut r, "0");
    enter(&mut app, &mut r);
    let s = snap("readings_compound_view_b", &mut app);
    assert!(s.contains("view B (other plate)"), "{s}");
    for v in ["0.0100", "0.0200"] {
        typ(&mut app, &mut r, v);
        enter(&mut app, &mut r);
    }
    enter(&mut app, &mut r);
    let s = snap("verdict_compound", &mut app);
    for want in [
        "FAIL: view B outside the tolerance",
        "view A (near)",
        "view B (other)",
    ] {
        assert!(s.contains(want), "{want}:\n{s}");
    }
}

#[test]
fn taper_stack() {
    let (mut app, mut r) = app();
    to_stack_of(&mut app, &mut r, 1); // F2, taper 1:20
    let s = snap("stack_taper", &mut app);
    assert!(s.contains("half 1°25'56\" · incl 2°51'51\""), "{s}");
}

#[test]
fn small_angle_remedies_and_two_stacks() {
    let (mut app, mut r) = app_with(small_angle_plan(), Some("JQ"), false);
    to_stack_on(&mut app, &mut r, "SB5-117");
    let s = snap("remedy_small_angle", &mut app);
    for want in ["two stacks on SB5-117", "one stack on SP10-042", "★"] {
        assert!(s.contains(want), "{want}:\n{s}");
    }
    enter(&mut app, &mut r);
    let s = snap("stack_two_under_rolls", &mut app);
    assert!(s.contains("Under the pivot roll"), "{s}");
}
