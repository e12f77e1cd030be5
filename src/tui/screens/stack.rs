//! The stack in wringing order with a tick per block, the total, the achieved angle and its
//! rounding error, swaps, and advice for steep and small angles. Two stacks (a compound angle's
//! plates, or one under each roll for a small angle) are listed one after the other; while the
//! small-angle remedies are offered, the choice takes the screen (see [`super::remedy`]).

use super::super::app::App;
use super::super::chrome::row_mark;
use super::super::flow::stack::{Which, block_count, locate, part_name, parts};
use super::super::view::boxed;
use super::stack_info::figures;
use crate::traveller::Attempt;
use crate::units::Length;
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

pub use super::stack_info::{advice, aim};

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    if app.ui.remedies.as_ref().is_some_and(|r| r.open) {
        super::remedy::draw(f, area, app);
        return;
    }
    let t = app.theme;
    let left_w = if area.width >= 120 { 48 } else { 36 };
    let [left, right] =
        Layout::horizontal([Constraint::Length(left_w), Constraint::Min(30)]).areas(area);
    let a = app.attempt();
    let lines = match a.filter(|a| a.stack.is_some()) {
        Some(a) => block_lines(app, a, left.height.saturating_sub(2) as usize),
        None if app.ui.solving => vec![Line::raw("working out the stack…")],
        None => vec![Line::styled("no stack", t.bad())],
    };
    let title = if a.is_some_and(|a| parts(a).len() > 1) {
        "Stacks, bottom first"
    } else {
        "Stack, bottom first"
    };
    f.render_widget(Paragraph::new(lines).block(boxed(title, t)), left);

    let d = figures(app);
    // on a tall screen, the setup as it will stand, below the figures
    let info_h = (d.len() as u16 + 2).clamp(12, 16);
    let (info, view) = if right.height >= 24 {
        let [a, b] =
            Layout::vertical([Constraint::Length(info_h), Constraint::Min(10)]).areas(right);
        (a, Some(b))
    } else {
        (right, None)
    };
    f.render_widget(
        Paragraph::new(d)
            .wrap(Wrap { trim: false })
            .block(boxed("What it gives", t)),
        info,
    );
    if let Some(v) = view {
        super::setup::draw_view(f, v, app);
    }
}

/// The blocks of every stack, a heading over each when there are two, scrolled to keep the
/// selection in `rows`.
fn block_lines(app: &App, a: &Attempt, rows: usize) -> Vec<Line<'static>> {
    let t = app.theme;
    let unit = app.unit();
    let set_worn: Vec<Length> = a
        .block_set
        .as_ref()
        .and_then(|c| app.shop.set(&c.id))
        .map(|s| s.worn().to_vec())
        .unwrap_or_default();
    let two = parts(a).len() > 1;
    // every row with the block index it shows (None for a heading)
    let mut all: Vec<(Option<usize>, Line<'static>)> = Vec::new();
    let mut k = 0usize;
    for (w, s) in parts(a) {
        if two {
            let letters = app
                .feature()
                .and_then(|f| f.compound_angles())
                .map(|c| c.letters());
            let what = match (w, letters) {
                (Which::Main, Some((l, _))) | (Which::Second, Some((_, l))) => {
                    format!("{} ({l}) at {}", part_name(a, w), s.achieved.dms(0))
                }
                _ => format!("{}: {}", part_name(a, w), s.height.show(unit)),
            };
            all.push((None, Line::styled(what, t.title())));
        }
        for (i, b) in s.blocks.iter().enumerate() {
            let (mark, style) = row_mark(k == app.ui.stack_sel, t);
            let tick = if b.wrung { "[✓]" } else { "[ ]" };
            let note = if b.protector {
                " protector"
            } else if set_worn.contains(&b.size) {
                " worn"
            } else {
                ""
            };
            all.push((
                Some(k),
                Line::from(vec![Span::styled(
                    format!("{mark} {tick}  {:>2}  {}{note}", i + 1, b.size.show(unit)),
                    style,
                )]),
            ));
            k += 1;
        }
    }
    let rows = rows.saturating_sub(1).max(1);
    let at = all
        .iter()
        .position(|(i, _)| *i == Some(app.ui.stack_sel))
        .unwrap_or(0);
    let first = at.saturating_sub(rows.saturating_sub(1));
    let mut lines = vec![Line::styled("   Wrung  #  Block", t.dim())];
    lines.extend(all.into_iter().skip(first).take(rows).map(|(_, l)| l));
    lines
}

/// The next action on the stack screen.
pub fn next(app: &App) -> String {
    if let Some(r) = app.ui.remedies.as_ref().filter(|r| r.open) {
        let _ = r;
        return "small angle: choose a remedy (↑↓), Enter uses it; the best is chosen already"
            .into();
    }
    let unit = app.unit();
    let Some(a) = app.attempt().filter(|a| a.stack.is_some()) else {
        return if app.ui.solving {
            "working out the stack…".into()
        } else {
            "no stack can be made: press Esc to choose another block set or fixture".into()
        };
    };
    if parts(a).iter().all(|(_, s)| s.built.is_some()) {
        return "stack confirmed: press Enter for the safety check".into();
    }
    let n = block_count(a);
    let next = (0..n).find(|k| {
        locate(a, *k).is_some_and(|(w, i)| {
            parts(a)
                .iter()
                .find(|(x, _)| *x == w)
                .and_then(|(_, s)| s.blocks.get(i))
                .is_some_and(|b| !b.wrung)
        })
    });
    match next.and_then(|k| locate(a, k)) {
        Some((w, i)) => {
            let Some(b) = parts(a)
                .into_iter()
                .find(|(x, _)| *x == w)
                .and_then(|(_, s)| s.blocks.get(i))
            else {
                return String::new();
            };
            let what = if b.protector { " protector" } else { "" };
            let whose = if parts(a).len() > 1 {
                format!("{}: ", part_name(a, w).to_lowercase())
            } else {
                String::new()
            };
            format!(
                "{whose}wring block {} ({}{what}), then press Space; s if you used another size",
                i + 1,
                b.size.show(unit)
            )
        }
        None => "every block is wrung: press Enter to confirm the stack".into(),
    }
}
