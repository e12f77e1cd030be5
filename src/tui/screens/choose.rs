//! Choosing the fixture (ranked for the angle) and the block set (missing and worn blocks).

use super::super::app::App;
use super::super::chrome::row_mark;
use super::super::flow::{height_step, setting};
use super::super::rank::sizes_text;
use super::super::view::boxed;
use super::{arcsec, cell};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

fn split(area: Rect, list_rows: usize) -> (Rect, Rect) {
    let want = (list_rows as u16 + 3).min(area.height.saturating_sub(4));
    let [a, b] = Layout::vertical([Constraint::Length(want), Constraint::Min(3)]).areas(area);
    (a, b)
}

pub fn draw_fixtures(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let unit = app.unit();
    let (list, detail) = split(area, app.ui.fixtures.len());
    let w = list.width.saturating_sub(2) as usize;
    let (wid, wwhat, wh, we, wu) = (11, 15, 11, 8, 8);
    let wst = w.saturating_sub(2 + wid + wwhat + wh + we + wu).max(6);
    let mut lines = vec![Line::from(vec![
        cell("", 2, t.dim()),
        cell("Fixture", wid, t.dim()),
        cell("Kind", wwhat, t.dim()),
        cell("Stack", wh, t.dim()),
        cell("Error", we, t.dim()),
        cell("U est.", wu, t.dim()),
        cell("Can it be used?", wst, t.dim()),
    ])];
    let rows = list.height.saturating_sub(3) as usize;
    let first = app.ui.fixture_sel.saturating_sub(rows.saturating_sub(1));
    for (i, o) in app.ui.fixtures.iter().enumerate().skip(first).take(rows) {
        let fx = &app.shop.fixtures[o.index];
        let (mark, style) = row_mark(i == app.ui.fixture_sel, t);
        let state = match (&o.why_not, o.out_of_date) {
            (Some(w), _) => format!("no: {w}"),
            (None, true) => "OUT OF DATE (reason)".into(),
            (None, false) if !o.suitable => "not made for this".into(),
            (None, false) if !o.buildable => "not in one stack".into(),
            (None, false) if !o.warnings.is_empty() => "yes, see warnings".into(),
            (None, false) => "yes".into(),
        };
        let sstyle = if i == app.ui.fixture_sel {
            style
        } else if o.why_not.is_some() || !o.suitable {
            t.dim()
        } else if o.out_of_date {
            t.warn()
        } else {
            style
        };
        let what = kind_words(fx.kind);
        lines.push(Line::from(vec![
            cell(mark, 2, style),
            cell(&fx.id, wid, style),
            cell(what, wwhat, style),
            cell(&o.height.map_or("—".into(), |h| h.show(unit)), wh, style),
            cell(&o.error.map_or("—".into(), arcsec), we, style),
            cell(
                &o.u.map_or("—".into(), |u| format!("{:.1}\"", u.arcsec())),
                wu,
                style,
            ),
            cell(&state, wst, sstyle),
        ]));
    }
    let what = match app.feature().map(|f| f.kind) {
        Some(crate::traveller::FeatureKind::Taper) => "the half angle ",
        Some(crate::traveller::FeatureKind::Compound) => "the near plate ",
        _ => "",
    };
    let title = match setting(app) {
        Some(a) => format!(
            "Fixtures for {what}{} (stack rounded to {})",
            a.dms(0),
            height_step(app).show_fine(unit)
        ),
        None => "Fixtures".into(),
    };
    f.render_widget(Paragraph::new(lines).block(boxed(&title, t)), list);

    let mut d: Vec<Line> = Vec::new();
    if let Some(o) = app.ui.fixtures.get(app.ui.fixture_sel) {
        let fx = &app.shop.fixtures[o.index];
        d.push(Line::from(vec![
            Span::styled(format!("{}  ", fx.id), t.title()),
            Span::raw(format!(
                "C {} (calibrated){}  rolls {} / {}",
                fx.centre.show_fine(unit),
                fx.centre_u.map_or(String::new(), |u| format!(
                    " u {}",
                    u.show_fine(crate::units::Unit::Mm)
                )),
                fx.roll_pivot.number(unit, unit.places() + 1),
                fx.roll_stack.show_fine(unit)
            )),
        ]));
        if let Some((_, note)) = fx.description.split_once("; ") {
            d.push(Line::raw(format!("note: {note}")));
        }
        let due = fx.due.map_or("not given".into(), |d| d.to_string());
        d.push(Line::raw(format!(
            "calibration due {due}{}{}",
            fx.max_stack.map_or(String::new(), |m| format!(
                "  largest stack {}",
                m.show(unit)
            )),
            fx.max_angle
                .map_or(String::new(), |m| format!("  rated to {}", m.dm()))
        )));
        for w in &o.warnings {
            d.push(Line::styled(format!("! {w}"), t.warn()));
        }
        if let Some(w) = &o.why_not {
            d.push(Line::styled(format!("cannot be used: {w}"), t.bad()));
        }
        let stack = match &app.ui.rank_set {
            Some((id, grade, true)) => format!("a stack of {id}'s grade ({grade})"),
            Some((id, grade, false)) => {
                format!("no stack term ({id}'s grade {grade} has no limits in tiltbook's table)")
            }
            None => "no stack term (the shop has no block set)".into(),
        };
        d.push(Line::styled(
            format!(
                "Error: what rounding the stack leaves; U est.: centre distance and {stack} (k = 2)"
            ),
            t.dim(),
        ));
    } else {
        d.push(Line::raw(
            "The shop file lists no fixtures: add one, then open the job again.",
        ));
    }
    f.render_widget(
        Paragraph::new(d)
            .wrap(Wrap { trim: false })
            .block(boxed("Selected", t)),
        detail,
    );
}

pub fn draw_sets(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let (list, detail) = split(area, app.ui.sets.len());
    let w = list.width.saturating_sub(2) as usize;
    let (wid, wg, wn, wm, ww) = (8, 11, 7, 9, 7);
    let wd = w.saturating_sub(2 + wid + wg + wn + wm + ww + 14).max(8);
    let mut lines = vec![Line::from(vec![
        cell("", 2, t.dim()),
        cell("Set", wid, t.dim()),
        cell("Description", wd, t.dim()),
        cell("Grade", wg, t.dim()),
        cell("Blocks", wn, t.dim()),
        cell("Missing", wm, t.dim()),
        cell("Worn", ww, t.dim()),
        cell("Calibration", 14, t.dim()),
    ])];
    for (i, o) in app.ui.sets.iter().enumerate() {
        let s = &app.shop.sets[o.index];
        let (mark, style) = row_mark(i == app.ui.set_sel, t);
        let cal = if o.out_of_date {
            "OUT OF DATE"
        } else {
            "in date"
        };
        lines.push(Line::from(vec![
            cell(mark, 2, style),
            cell(&s.snap.id, wid, style),
            cell(&s.snap.description, wd, style),
            cell(&s.snap.grade, wg, style),
            cell(&s.count().to_string(), wn, style),
            cell(&s.missing().len().to_string(), wm, style),
            cell(&s.worn().len().to_string(), ww, style),
            cell(
                cal,
                14,
                if o.out_of_date && i != app.ui.set_sel {
                    t.warn()
                } else {
                    style
                },
            ),
        ]));
    }
    f.render_widget(Paragraph::new(lines).block(boxed("Block sets", t)), list);
    let mut d: Vec<Line> = Vec::new();
    if let Some(o) = app.ui.sets.get(app.ui.set_sel) {
        let s = &app.shop.sets[o.index];
        let unit = s.snap.unit;
        d.push(Line::from(vec![
            Span::styled("Missing or damaged: ", t.warn()),
            Span::raw(sizes_text(s.missing(), unit)),
        ]));
        d.push(Line::from(vec![
            Span::styled(
                "Worn (used only when no other stack of as many blocks will do): ",
                t.warn(),
            ),
            Span::raw(sizes_text(s.worn(), unit)),
        ]));
        d.push(Line::raw(format!(
            "Protector blocks: {}   resolution {}   due {}",
            s.snap
                .protector
                .map_or("none".into(), |p| format!("a pair of {}", p.show(unit))),
            s.resolution().show_fine(unit),
            s.snap.due.map_or("not given".into(), |d| d.to_string())
        )));
    } else {
        d.push(Line::raw(
            "The shop file lists no block sets: add one, then open the job again.",
        ));
    }
    f.render_widget(
        Paragraph::new(d)
            .wrap(Wrap { trim: false })
            .block(boxed("Selected set", t)),
        detail,
    );
}

/// The kind of a fixture in words.
pub fn kind_words(k: crate::traveller::FixtureKind) -> &'static str {
    use crate::traveller::FixtureKind as K;
    match k {
        K::SineBar => "sine bar",
        K::SinePlate => "sine plate",
        K::SineVise => "sine vise",
        K::SineCentres => "sine centres",
        K::CompoundPlate => "compound plate",
    }
}
