//! The review, sign-off, return, handover and lock-clash screens on a test terminal at 80×24
//! and 120×40, compared with the accepted snapshots in tests/snapshots/.

mod tui_support;

use ratatui::Terminal;
use ratatui::backend::TestBackend;
use ratatui::text::Line;
use ratatui::widgets::Paragraph;
use tiltbook::store::{Liveness, LockInfo};
use tiltbook::traveller::{Role, Stamp, Traveller};
use tiltbook::tui::App;
use tiltbook::tui::app::Msg;
use tiltbook::tui::clash::{locked_message, take_over_question, wrap_message};
use tiltbook::tui::keymap::Action;
use tiltbook::tui::update::update;
use tiltbook::tui::view;
use tui_support::*;

fn render(app: &App, w: u16, h: u16) -> Terminal<TestBackend> {
    let mut t = Terminal::new(TestBackend::new(w, h)).expect("a test terminal");
    t.draw(|f| view::draw(f, app)).expect("draws");
    t
}

/// Snapshot the screen as it stands at both sizes (times stamped by the test run fixed first).
fn snap(name: &str, app: &mut App) {
    fix_times(&mut app.doc);
    for (w, h) in [(80, 24), (120, 40)] {
        update(app, Msg::Resize(w, h));
        let t = render(app, w, h);
        insta::assert_snapshot!(format!("{name}_{w}x{h}"), t.backend());
    }
    update(app, Msg::Resize(80, 24));
}

fn text(app: &mut App, w: u16, h: u16) -> String {
    update(app, Msg::Resize(w, h));
    let s = render(app, w, h).backend().to_string();
    update(app, Msg::Resize(80, 24));
    s
}

/// The finished sample with only the operators' sign-offs: what a lead finds to review.
fn for_review() -> Traveller {
    let mut t = sample("ds-204-finished.yaml");
    t.signoffs.retain(|s| s.role != Role::Lead);
    t
}

#[test]
fn review_list_and_the_flagged_filter() {
    let (mut app, mut r) = review_app(for_review(), Some("LV"), false);
    snap("review_list", &mut app);
    act(&mut app, &mut r, Action::Filter);
    snap("review_flagged", &mut app);
    let s = text(&mut app, 80, 24);
    assert!(!s.contains("F1   dovetail"), "F1 has no flag: hidden\n{s}");
    assert!(s.contains("F3   end chamfer"), "F3's swap is flagged\n{s}");
    assert!(s.contains("swap straight"), "{s}");
}

#[test]
fn review_of_the_corrected_feature_shows_both_attempts() {
    let (mut app, mut r) = review_app(for_review(), Some("LV"), false);
    act(&mut app, &mut r, Action::Down);
    act(&mut app, &mut r, Action::Down);
    enter(&mut app, &mut r);
    snap("review_f3_attempt1", &mut app);
    let s = text(&mut app, 120, 40);
    for want in [
        "1 FAIL",
        "2 PASS",
        "Attempt 1 of 2",
        "Budget",
        "Readings, attempt 1",
        // the flag and the swap it stands on, as the stack screen recorded it
        "! stack swapped by hand: attempt 1 0.1370 in for 0.1360 in",
        "swapped by hand 0.1370 in for 0.1360 in",
        "1 flag",
    ] {
        assert!(s.contains(want), "{want:?} missing:\n{s}");
    }
    act(&mut app, &mut r, Action::Right);
    snap("review_f3_attempt2", &mut app);
    let s = text(&mut app, 120, 40);
    for want in ["Attempt 2 of 2 · PASS", "U = 2·u_c", "Readings, attempt 2"] {
        assert!(s.contains(want), "{want:?} missing:\n{s}");
    }
}

#[test]
fn review_of_a_flagged_feature_names_its_flags() {
    let (mut app, mut r) = review_app(for_review(), Some("LV"), false);
    for _ in 0..4 {
        act(&mut app, &mut r, Action::Down);
    }
    // F5 (PageDown would go to the last feature, F7)
    enter(&mut app, &mut r);
    snap("review_f5", &mut app);
    let s = text(&mut app, 120, 40);
    assert!(s.contains("! stack swapped by hand"), "{s}");
    assert!(s.contains("! large straightness"), "{s}");
}

#[test]
fn review_of_the_compound_feature_shows_both_plates_views_and_verdicts() {
    let (mut app, mut r) = review_app(for_review(), Some("LV"), false);
    for _ in 0..3 {
        act(&mut app, &mut r, Action::Down);
    }
    enter(&mut app, &mut r); // F4
    snap("review_f4_compound", &mut app);
    let charts = text(&mut app, 120, 40);
    update(&mut app, Msg::Resize(120, 40));
    // the whole page as it is wrapped at 120 columns, and the screen for the charts
    let pg = tiltbook::tui::screens::review_feature::page(&app, 3);
    let mut all: String = pg
        .lines
        .iter()
        .map(|l| {
            l.spans
                .iter()
                .map(|s| s.content.as_ref())
                .collect::<String>()
                + "\n"
        })
        .collect();
    all.push_str(&charts);
    for want in [
        "A 30°00' / B 20°00' (true slope 34°19')",
        "plate for view A: 2.0000 + 0.5000 = 2.5000 in",
        "plate for view B: 1.0000 + 0.3000 + 0.1030 + 0.1001",
        "view A: 5 of 5 over 4.0000 in",
        "view B: 5 of 5 over 4.0000 in",
        "DOUBT over both views",
        "view A: DOUBT · deviation",
        "view B: PASS · deviation",
        "Readings, attempt 1, view A",
        "view B",
    ] {
        assert!(all.contains(want), "{want:?} missing:\n{all}");
    }
}

#[test]
fn lead_sign_confirm_and_after() {
    let (mut app, mut r) = review_app(for_review(), Some("LV"), false);
    act(&mut app, &mut r, Action::SignJob);
    snap("review_sign_job_confirm", &mut app);
    enter(&mut app, &mut r);
    snap("review_job_signed", &mut app);
}

#[test]
fn lead_return_comment_and_the_operator_sees_it_first() {
    let (mut app, mut r) = review_app(for_review(), Some("LV"), false);
    for _ in 0..4 {
        act(&mut app, &mut r, Action::Down);
    }
    // F5 (PageDown would go to the last feature, F7)
    act(&mut app, &mut r, Action::ReturnFeature);
    typ(&mut app, &mut r, "clean the face and sweep again");
    snap("review_return_prompt", &mut app);
    enter(&mut app, &mut r);
    snap("review_returned", &mut app);
    let (mut op, mut r) = app_with(app.doc.clone(), Some("KA"), false);
    snap("notice_return", &mut op);
    enter(&mut op, &mut r);
    snap("returned_verdict", &mut op);
    assert!(text(&mut op, 80, 24).contains("Sent back by LV: clean the face"));
}

#[test]
fn the_half_done_sample_shows_its_note_then_the_step() {
    let (mut app, mut r) = app_with(sample("ds-204-half-done.yaml"), Some("KB"), false);
    snap("notice_handover", &mut app);
    enter(&mut app, &mut r);
    snap("resumed_readings", &mut app);
    let s = text(&mut app, 80, 24);
    assert!(s.contains("Readings 3 of 5"), "{s}");
}

#[test]
fn handover_prompt_on_quitting() {
    let (mut app, mut r) = app_with(plan(), Some("KA"), false);
    to_stack(&mut app, &mut r);
    act(&mut app, &mut r, Action::Quit);
    typ(&mut app, &mut r, "F1 stack solved, not wrung yet");
    snap("handover_prompt", &mut app);
}

// ---------------------------------------------------------------- lock messages

fn holder(host: &str) -> LockInfo {
    LockInfo {
        who: "KM".into(),
        host: host.into(),
        pid: 4121,
        since: Stamp::parse("2025-03-04T08:16:00-05:00").unwrap(),
    }
}

/// The terminal after the command, as `tiltbook` prints the message (wrapped to the width).
fn terminal_text(command: &str, message: &str, extra: &[&str], w: u16, h: u16) -> String {
    let mut lines = vec![Line::raw(format!("$ {command}"))];
    let printed = wrap_message(&format!("tiltbook: {message}"), usize::from(w) - 1);
    lines.extend(printed.lines().map(|l| Line::raw(l.to_string())));
    lines.extend(extra.iter().map(|l| Line::raw(l.to_string())));
    let mut t = Terminal::new(TestBackend::new(w, h)).expect("a test terminal");
    t.draw(|f| f.render_widget(Paragraph::new(lines.clone()), f.area()))
        .expect("draws");
    t.backend().to_string()
}

fn snap_message(name: &str, command: &str, message: &str, extra: &[&str]) {
    for (w, h) in [(80u16, 24u16), (120, 40)] {
        let s = terminal_text(command, message, extra, w, h);
        insta::assert_snapshot!(format!("{name}_{w}x{h}"), s);
    }
}

#[test]
fn lock_messages_say_who_where_since_and_what_to_do() {
    let file = "jobs/J-2417.yaml";
    let cmd = "tiltbook open jobs/J-2417.yaml --as TJ";
    let live = locked_message(file, &holder("bench-2"), Liveness::Live, false);
    for want in [
        "open by KM on bench-2 since 2025-03-04 08:16",
        "open read-only with: tiltbook open jobs/J-2417.yaml --read-only",
    ] {
        assert!(live.contains(want), "{want:?} in {live}");
    }
    snap_message("lock_live", cmd, &live, &[]);

    let other = locked_message(file, &holder("bench-9"), Liveness::Unknown, true);
    assert!(other.contains("another computer"), "{other}");
    assert!(other.contains("--review --read-only"), "{other}");
    snap_message(
        "lock_other_computer",
        "tiltbook open jobs/J-2417.yaml --review",
        &other,
        &[],
    );

    let stale = locked_message(file, &holder("bench-2"), Liveness::Stale, false);
    assert!(stale.contains("take it over with:   tiltbook open jobs/J-2417.yaml --take-over"));
    let question = take_over_question(&holder("bench-2"));
    snap_message("lock_stale", cmd, &stale, &[question.trim_end()]);
}
