//! The stack in wringing order with a tick per block, the total, the achieved angle and its
//! rounding error, swaps, and advice for steep and small angles.

use super::super::app::App;
use super::super::chrome::row_mark;
use super::super::flow::stack::target_height;
use super::super::flow::{height_step, setting};
use super::super::rank::geometry;
use super::super::view::boxed;
use super::arcsec;
use crate::geometry::plan;
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let unit = app.unit();
    let left_w = if area.width >= 120 { 48 } else { 36 };
    let [left, right] =
        Layout::horizontal([Constraint::Length(left_w), Constraint::Min(30)]).areas(area);
    let stack = app.attempt().and_then(|a| a.stack.as_ref());
    let set_worn: Vec<crate::units::Length> = app
        .attempt()
        .and_then(|a| a.block_set.as_ref())
        .and_then(|c| app.shop.set(&c.id))
        .map(|s| s.worn().to_vec())
        .unwrap_or_default();
    let mut lines: Vec<Line> = Vec::new();
    match stack {
        Some(s) => {
            lines.push(Line::styled("   Wrung  #  Block", t.dim()));
            let rows = left.height.saturating_sub(3) as usize;
            let first = app.ui.stack_sel.saturating_sub(rows.saturating_sub(1));
            for (i, b) in s.blocks.iter().enumerate().skip(first).take(rows) {
                let (mark, style) = row_mark(i == app.ui.stack_sel, t);
                let tick = if b.wrung { "[✓]" } else { "[ ]" };
                let note = if b.protector {
                    " protector"
                } else if set_worn.contains(&b.size) {
                    " worn"
                } else {
                    ""
                };
                lines.push(Line::from(vec![Span::styled(
                    format!("{mark} {tick}  {:>2}  {}{note}", i + 1, b.size.show(unit)),
                    style,
                )]));
            }
        }
        None if app.ui.solving => lines.push(Line::raw("working out the stack…")),
        None => lines.push(Line::styled("no stack", t.bad())),
    }
    f.render_widget(
        Paragraph::new(lines).block(boxed("Stack, bottom first", t)),
        left,
    );

    let mut d: Vec<Line> = Vec::new();
    if let Some(s) = stack {
        let wrung = s.blocks.iter().filter(|b| b.wrung).count();
        d.push(Line::from(vec![
            Span::styled("Height   ", t.dim()),
            Span::styled(s.height.show(unit), t.title()),
            Span::raw(format!("  {} blocks, {wrung} wrung", s.blocks.len())),
        ]));
        if let Ok(target) = target_height(app)
            && target != s.height
        {
            d.push(Line::from(vec![
                Span::styled("Planned  ", t.dim()),
                Span::raw(target.show(unit)),
            ]));
        }
        d.push(Line::from(vec![
            Span::styled("Angle    ", t.dim()),
            Span::styled(s.achieved.dms(1), t.title()),
        ]));
        match (aim(app), setting(app)) {
            (Some((aim, n, residual)), _) => {
                d.push(Line::from(vec![
                    Span::styled("Aim      ", t.dim()),
                    Span::raw(aim.dms(1)),
                    Span::styled("   error ", t.dim()),
                    Span::raw(arcsec(s.achieved - aim)),
                ]));
                d.push(Line::styled(
                    format!(
                        "corrected for attempt {n}: its setting less its residual {}",
                        arcsec(residual)
                    ),
                    t.dim(),
                ));
            }
            (None, Some(set)) => {
                d.push(Line::from(vec![
                    Span::styled("Setting  ", t.dim()),
                    Span::raw(set.dms(0)),
                    Span::styled("   error ", t.dim()),
                    Span::raw(arcsec(s.achieved - set)),
                ]));
            }
            (None, None) => {}
        }
        if s.built.is_some() {
            d.push(Line::styled("✓ built and confirmed", t.good()));
        }
        for w in &s.swaps {
            d.push(Line::styled(
                format!("swapped {} for {}", w.planned.show(unit), w.used.show(unit)),
                t.warn(),
            ));
        }
        if s.blocks
            .iter()
            .any(|b| !b.protector && set_worn.contains(&b.size))
        {
            d.push(Line::styled(
                "! a worn block is used: no stack of as many blocks avoids it",
                t.warn(),
            ));
        }
    }
    if let Some(a) = app.attempt() {
        d.push(Line::styled(
            format!(
                "fixture {}  set {}",
                a.fixture.as_ref().map_or("?", |c| c.id.as_str()),
                a.block_set.as_ref().map_or("?", |c| c.id.as_str())
            ),
            t.dim(),
        ));
    }
    d.push(Line::styled(
        "Clean each face, wring with a sliding twist, bottom block first.",
        t.dim(),
    ));
    if let Some(e) = &app.ui.solve_error {
        d.push(Line::styled(format!("✗ {e}"), t.bad()));
    }
    for w in advice(app) {
        d.push(Line::styled(format!("! {w}"), t.warn()));
    }
    // on a tall screen, the setup as it will stand, below the figures
    let (info, view) = if right.height >= 24 {
        let [a, b] = Layout::vertical([Constraint::Length(12), Constraint::Min(10)]).areas(right);
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

/// For an attempt that follows a judged one on the same fixture: the angle to aim at (that
/// attempt's setting less its residual), the attempt's number and its residual.
pub fn aim(app: &App) -> Option<(crate::units::Angle, u32, crate::units::Angle)> {
    let f = app.feature()?;
    let a = f.current_attempt()?;
    let prev = f.attempts.iter().rev().nth(1)?;
    let same = prev.fixture.as_ref()?.id == a.fixture.as_ref()?.id;
    let j = prev.judgement.as_ref()?;
    let built = prev.stack.as_ref()?;
    same.then(|| (built.achieved - j.residual, prev.number, j.residual))
}

/// Steep-angle advice (the complement side by side) for this feature's fixture, and what a
/// compound angle's second plate needs.
pub fn advice(app: &App) -> Vec<String> {
    let (Some(a), Some(angle)) = (app.attempt(), setting(app)) else {
        return Vec::new();
    };
    let mut out = Vec::new();
    if let Some(c) = app.feature().and_then(|f| f.compound.as_ref()) {
        let (near, far) = c.plate_angles();
        out.push(format!(
            "compound angle: this stack sets the near plate to {}; the other plate is set to {} with its own stack from the same set, no block shared. These screens record the near plate only: work out the other with `tiltbook stack {} --fixture {} --set {}` and add a note",
            near.dms(0),
            far.dms(0),
            far.decimal(4),
            a.fixture.as_ref().map_or("ID", |c| c.id.as_str()),
            a.block_set.as_ref().map_or("ID", |c| c.id.as_str()),
        ));
    }
    let Some(fx) = a.fixture.as_ref().and_then(|c| app.doc.fixture(&c.id)) else {
        return Vec::new();
    };
    let unit = app.unit();
    match plan(&geometry(fx), angle, height_step(app), fx.max_stack, unit) {
        Ok(p) => {
            let mut v = out;
            v.extend(p.warnings);
            if let Some(c) = p.complement {
                v.push(format!(
                    "complement {}: stack {}, error {} here against {} direct",
                    c.setting.dms(0),
                    c.height.show(unit),
                    arcsec(c.error),
                    arcsec(p.direct.error)
                ));
            }
            v
        }
        Err(e) => {
            out.push(e.to_string());
            out
        }
    }
}

/// The next action on the stack screen.
pub fn next(app: &App) -> String {
    let unit = app.unit();
    let Some(s) = app.attempt().and_then(|a| a.stack.as_ref()) else {
        return if app.ui.solving {
            "working out the stack…".into()
        } else {
            "no stack can be made: press Esc to choose another block set or fixture".into()
        };
    };
    if s.built.is_some() {
        return "stack confirmed: press Enter for the safety check".into();
    }
    match s.blocks.iter().position(|b| !b.wrung) {
        Some(i) => {
            let b = &s.blocks[i];
            let what = if b.protector { " protector" } else { "" };
            format!(
                "wring block {} ({}{what}), then press Space; s if you used another size",
                i + 1,
                b.size.show(unit)
            )
        }
        None => "every block is wrung: press Enter to confirm the stack".into(),
    }
}
