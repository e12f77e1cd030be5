//! The small-angle remedies side by side on the stack screen: why the single stack is poor,
//! each remedy with its angle error and block count, the one chosen and why; beside it the
//! stacks of the remedy under the cursor.

use super::super::app::App;
use super::super::chrome::row_mark;
use super::super::flow::remedy::{Pick, options};
use super::super::view::boxed;
use super::cell;
use crate::blocks::Stack;
use crate::blocks::small::SmallAngle;
use crate::units::{Angle, Unit};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

/// Name, angle error and blocks of a remedy.
pub fn summary(s: &SmallAngle, p: Pick, here: &str) -> (String, Option<Angle>, usize) {
    match p {
        Pick::Two => match &s.two_stacks {
            Ok(t) => (
                format!("two stacks on {here}"),
                Some(t.error),
                t.block_count(),
            ),
            Err(_) => ("two stacks".into(), None, 0),
        },
        Pick::Longer(i) => match s.longer.get(i) {
            Some(l) => (
                format!("one stack on {}", l.candidate.id),
                l.result.as_ref().ok().map(|x| x.error),
                l.result.as_ref().map_or(0, |x| x.stack.block_count()),
            ),
            None => ("longer fixture".into(), None, 0),
        },
        Pick::Nearest => (
            format!("nearest single on {here}"),
            s.nearest.as_ref().map(|x| x.error),
            s.nearest.as_ref().map_or(0, |x| x.stack.block_count()),
        ),
    }
}

fn blocks_text(s: &Stack, unit: Unit) -> String {
    s.blocks
        .iter()
        .map(|b| b.size.number(unit, unit.places()))
        .collect::<Vec<_>>()
        .join(" + ")
}

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let unit = app.unit();
    let Some(r) = app.ui.remedies.as_ref() else {
        return;
    };
    let s = &r.small;
    let wide = area.width >= 120;
    let left_w = if wide { 64 } else { 44 };
    let [left, right] =
        Layout::horizontal([Constraint::Length(left_w), Constraint::Min(30)]).areas(area);
    let inner = left_w.saturating_sub(2) as usize;
    let (wn, we, wb) = (inner.saturating_sub(2 + 9 + 7).max(12), 9, 7);
    let mut lines = vec![
        Line::styled(format!("Why: {}", s.reason), t.dim()),
        Line::raw(""),
        Line::from(vec![
            cell("", 2, t.dim()),
            cell("Remedy", wn, t.dim()),
            cell("Error", we, t.dim()),
            cell("Blocks", wb, t.dim()),
        ]),
    ];
    let list = options(s);
    for (k, p) in list.iter().enumerate() {
        let (name, err, blocks) = summary(s, *p, &r.fixture_id);
        let (mark, style) = row_mark(k == r.sel, t);
        let best = if k == super::super::flow::remedy::default_sel(s) {
            " ★"
        } else {
            ""
        };
        lines.push(Line::from(vec![
            cell(mark, 2, style),
            cell(&name, wn, style),
            cell(
                &err.map_or("—".into(), |e| format!("{:+.2}\"", e.arcsec())),
                we,
                style,
            ),
            cell(&format!("{blocks}{best}"), wb, style),
        ]));
    }
    if list.is_empty() {
        lines.push(Line::styled(
            "nothing the set builds comes near this angle",
            t.bad(),
        ));
    }
    for l in &s.longer {
        if let Err(e) = &l.result {
            lines.push(Line::styled(format!("{}: {e}", l.candidate.id), t.dim()));
        }
    }
    if let Err(e) = &s.two_stacks {
        lines.push(Line::styled(format!("two stacks: {e}"), t.dim()));
    }
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed("Small angle: the single stack is poor", t)),
        left,
    );

    let mut d: Vec<Line> = Vec::new();
    let title = match list.get(r.sel) {
        Some(p) => summary(s, *p, &r.fixture_id).0,
        None => "Remedy".into(),
    };
    let label = |k: &str, v: String| {
        Line::from(vec![
            Span::styled(format!("{k:<11}"), t.dim()),
            Span::styled(v, t.title()),
        ])
    };
    match list.get(r.sel) {
        Some(Pick::Two) => {
            if let Ok(x) = &s.two_stacks {
                d.push(label("Raised", x.raised.height.show(unit)));
                d.push(Line::raw(format!("  {}", blocks_text(&x.raised, unit))));
                d.push(label("Pivot", x.pivot.height.show(unit)));
                d.push(Line::raw(format!("  {}", blocks_text(&x.pivot, unit))));
                d.push(label("Difference", x.height.show(unit)));
                d.push(label("Angle", x.achieved.dms(1)));
                d.push(Line::styled(
                    "A stack under each roll: the fixture tilts by their difference. Both come from the one set, no block in both.",
                    t.dim(),
                ));
            }
        }
        Some(Pick::Longer(i)) => {
            if let Some(l) = s.longer.get(*i)
                && let Ok(x) = &l.result
            {
                d.push(label("Fixture", l.candidate.id.clone()));
                d.push(label("Centre", l.candidate.fixture.center.show(unit)));
                d.push(label("Stack", x.stack.height.show(unit)));
                d.push(Line::raw(format!("  {}", blocks_text(&x.stack, unit))));
                d.push(label("Angle", x.achieved.dms(1)));
                d.push(Line::styled(
                    "Enter makes it this attempt's fixture (recorded with the reason).",
                    t.dim(),
                ));
                if x.nearest_only {
                    d.push(Line::styled(
                        "the nearest height the set builds, not the exact one",
                        t.warn(),
                    ));
                }
            }
        }
        Some(Pick::Nearest) => {
            if let Some(x) = &s.nearest {
                d.push(label("Stack", x.stack.height.show(unit)));
                d.push(Line::raw(format!("  {}", blocks_text(&x.stack, unit))));
                d.push(label("Exact", x.ideal_height.show_fine(unit)));
                d.push(label("Angle", x.achieved.dms(1)));
            }
        }
        None => {}
    }
    d.push(Line::raw(""));
    // the errors are in the table: the reason up to its comparison is enough here
    let why = match s.why.find(" against ") {
        Some(i) => format!("{})", &s.why[..i]),
        None => s.why.clone(),
    };
    d.push(Line::styled(format!("★ chosen: {why}"), t.good()));
    f.render_widget(
        Paragraph::new(d)
            .wrap(Wrap { trim: false })
            .block(boxed(&title, t)),
        right,
    );
}
