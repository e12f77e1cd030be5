//! The setup: the cautions with the shop's rules, the settle wait, and the side view to scale.

use super::super::app::App;
use super::super::flow::setting;
use super::super::view::boxed;
use super::super::widgets::setup_view::{self, SetupScene};
use super::review_feature::wrap;
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Gauge, Paragraph, Wrap};

/// The usual cautions where a setup is made (common practice, no source).
pub const CAUTIONS: [&str; 5] = [
    "Clamp the work against the fixture's stop before any cut or reading.",
    "Never cut on an unsecured stack: the fixture and stack are clamped too.",
    "Wear eye protection.",
    "Handle blocks with gloves or a cloth; wring clean, take the stack apart after the job.",
    "The shop's own rules and local codes come first.",
];

fn split(area: Rect) -> (Rect, Rect) {
    let left = if area.width >= 120 { 56 } else { 40 };
    let [a, b] = Layout::horizontal([Constraint::Length(left), Constraint::Min(20)]).areas(area);
    (a, b)
}

/// The side view for the attempt: the built stack when there is one; both plates of a
/// compound sine plate side by side; a stack under each roll for a small angle.
pub fn draw_view(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let unit = app.unit();
    let a = app.attempt();
    let fx = a
        .and_then(|a| a.fixture.as_ref())
        .and_then(|c| app.doc.fixture(&c.id));
    let Some(fx) = fx else {
        f.render_widget(
            Paragraph::new("no fixture chosen").block(boxed("Side view", t)),
            area,
        );
        return;
    };
    let sizes = |s: &crate::traveller::Stack| s.blocks.iter().map(|b| b.size).collect::<Vec<_>>();
    if let Some(c) = app.feature().and_then(|x| x.compound_angles()) {
        let want = c.setting().ok();
        let near = match a.and_then(|a| a.stack.as_ref()) {
            Some(s) => (s.achieved, sizes(s)),
            None => (want.map(|w| w.near).unwrap_or_default(), Vec::new()),
        };
        let other = match a.and_then(|a| a.stack_b.as_ref()) {
            Some(s) => (s.achieved, sizes(s)),
            None => (want.map(|w| w.other).unwrap_or_default(), Vec::new()),
        };
        let (ln, _) = c.letters();
        let [l, r] = Layout::horizontal([Constraint::Percentage(50), Constraint::Percentage(50)])
            .areas(area);
        let scene = SetupScene::new(fx, near.0, &near.1, unit);
        let lo = c.letters().1;
        setup_view::draw(f, l, &scene, boxed(&format!("Near plate ({ln})"), t), t);
        let scene = SetupScene::new(fx, other.0, &other.1, unit);
        setup_view::draw(f, r, &scene, boxed(&format!("Other plate ({lo})"), t), t);
        return;
    }
    let (angle, blocks) = match a.and_then(|a| a.stack.as_ref()) {
        Some(s) => (s.achieved, sizes(s)),
        None => (setting(app).unwrap_or_default(), Vec::new()),
    };
    let mut scene = SetupScene::new(fx, angle, &blocks, unit);
    if let Some(p) = a.and_then(|a| a.stack_pivot.as_ref()) {
        scene = scene.with_pivot(&sizes(p));
    }
    setup_view::draw(f, area, &scene, boxed("Side view, to scale", t), t);
}

pub fn draw_safety(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let mut lines = Vec::new();
    for (i, c) in CAUTIONS.iter().enumerate() {
        lines.push(Line::from(vec![
            Span::styled(format!("{}. ", i + 1), t.warn()),
            Span::raw(*c),
        ]));
    }
    for r in &app.shop.settings.rules {
        lines.push(Line::from(vec![
            Span::styled("Shop: ", t.warn()),
            Span::raw(r.clone()),
        ]));
    }
    if let Some(m) = app.attempt().and_then(|a| a.safety.as_ref()) {
        lines.push(Line::raw(""));
        lines.push(Line::styled(
            format!("✓ confirmed by {} {}", m.by, m.at.short()),
            t.good(),
        ));
    }
    // every caution and shop rule is shown whole: the text column widens, and the side view
    // gives way altogether, before any of it is cut
    let (left, _) = split(area);
    let needed = |w: u16| -> u16 {
        let inner = usize::from(w.saturating_sub(2)).max(1);
        let rows: usize = lines
            .iter()
            .map(|l| {
                let text: String = l.spans.iter().map(|s| s.content.as_ref()).collect();
                wrap(&text, inner).len()
            })
            .sum();
        u16::try_from(rows).unwrap_or(u16::MAX).saturating_add(2)
    };
    let width = [left.width, 50, 60]
        .into_iter()
        .filter(|w| *w + 20 <= area.width)
        .find(|w| needed(*w) <= area.height)
        .unwrap_or(area.width);
    let [text, view] =
        Layout::horizontal([Constraint::Length(width), Constraint::Min(0)]).areas(area);
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed("Before any reading or cut", t)),
        text,
    );
    if view.width >= 20 {
        draw_view(f, view, app);
    }
}

pub fn draw_settle(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let (left, right) = split(area);
    let total = app.shop.settings.settle_minutes.saturating_mul(60).max(1);
    let recorded = app.attempt().and_then(|a| a.settle.as_ref());
    let [text, gauge, rest] = Layout::vertical([
        Constraint::Length(5),
        Constraint::Length(3),
        Constraint::Min(1),
    ])
    .areas(left);
    let mut lines = vec![Line::raw(
        "Blocks warmed by the hand grow: let the stack and the fixture come to room temperature before the readings.",
    )];
    let ratio;
    let mut label = None;
    match (recorded, app.ui.settle_left) {
        (Some(s), _) => {
            ratio = if s.done { 1.0 } else { 0.0 };
            if !s.done {
                label = Some("skipped");
            }
            lines.push(if s.done {
                Line::styled(
                    format!("✓ settled ({} min)", s.minutes.unwrap_or(0)),
                    t.good(),
                )
            } else {
                Line::styled("! the wait was skipped (recorded)", t.warn())
            });
        }
        (None, Some(left)) => {
            ratio = 1.0 - f64::from(left) / f64::from(total);
            lines.push(Line::styled(
                format!("settling: {}:{:02} left", left / 60, left % 60),
                t.next(),
            ));
        }
        (None, None) => {
            ratio = 0.0;
            lines.push(Line::raw("the wait has not started"));
        }
    }
    f.render_widget(Paragraph::new(lines).wrap(Wrap { trim: false }), text);
    let mut bar = Gauge::default()
        .block(boxed("Settle", t))
        .ratio(ratio.clamp(0.0, 1.0))
        .gauge_style(t.good());
    // a skipped wait is not shown as a full bar
    if let Some(l) = label {
        bar = bar.label(l).gauge_style(t.warn());
    }
    f.render_widget(bar, gauge);
    f.render_widget(
        Paragraph::new(vec![Line::styled(
            "Keep hands off the stack while it settles.",
            t.dim(),
        )])
        .wrap(Wrap { trim: false }),
        rest,
    );
    draw_view(f, right, app);
}

pub fn next(app: &App) -> String {
    if app.attempt().is_some_and(|a| a.settle.is_some()) {
        return "press Enter for the readings".into();
    }
    match app.ui.settle_left {
        Some(l) => format!(
            "let the stack settle ({}:{:02}); s skips the wait",
            l / 60,
            l % 60
        ),
        None => "press s to skip the wait, or Esc to go back".into(),
    }
}
