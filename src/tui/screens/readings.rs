//! The readings: fixed spacing over a travel, or position/reading pairs, typed as on the
//! command line and checked as typed; the chart of points and fitted line beside them.

use super::super::app::{App, RField};
use super::super::flow::readings::{check_field, count, current_sweep, fields_for, view_letter};
use super::super::judge::fit_so_far;
use super::super::view::boxed;
use super::super::widgets::sweep_chart;
use super::fit;
use crate::traveller::{Sweep, SweepMode};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

fn sweep(app: &App) -> Option<&Sweep> {
    current_sweep(app)
}

/// The title of the form: which view is swept, for a compound angle.
fn view_words(app: &App) -> String {
    match view_letter(app) {
        Some(v) if app.ui.readings.other_view => format!("Readings of view {v} (other plate)"),
        Some(v) => format!("Readings of view {v} (near plate)"),
        None => "Enter the readings".into(),
    }
}

fn label(r: RField) -> &'static str {
    match r {
        RField::Travel => "Travel",
        RField::Points => "Count",
        RField::Position => "Position",
        RField::Reading => "Reading",
    }
}

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let unit = app.unit();
    let left_w = if area.width >= 120 { 56 } else { 44 };
    let [left, right] =
        Layout::horizontal([Constraint::Length(left_w), Constraint::Min(20)]).areas(area);
    let s = sweep(app);
    let mode = s.map_or(SweepMode::Spaced, |s| s.mode);
    let fields = fields_for(mode);
    let [form, list] = Layout::vertical([
        Constraint::Length(fields.len() as u16 + 5),
        Constraint::Min(3),
    ])
    .areas(left);
    let inner_w = form.width.saturating_sub(2) as usize;
    let mut lines = vec![Line::from(vec![
        Span::raw(match mode {
            SweepMode::Spaced => "Fixed spacing over a travel",
            SweepMode::Pairs => "Position / reading pairs",
        }),
        Span::styled(" · F2 switches", t.dim()),
    ])];
    let mut focused_msg = None;
    for r in fields {
        let fld = match r {
            RField::Travel => &app.ui.readings.travel,
            RField::Points => &app.ui.readings.points,
            RField::Position => &app.ui.readings.position,
            RField::Reading => &app.ui.readings.reading,
        };
        let focus = *r == app.ui.readings.focus && !app.read_only;
        let msg = check_field(app, *r, &fld.text);
        let (mark, lstyle) = if focus {
            ("▶", t.selected())
        } else {
            (" ", t.text())
        };
        let shown = if focus {
            format!("{}▏", fld.text)
        } else {
            fld.text.clone()
        };
        let (mtext, mstyle) = match &msg {
            Ok(m) => (m.clone(), t.good()),
            Err(e) if fld.text.trim().is_empty() => (e.clone(), t.dim()),
            Err(e) => (format!("✗ {e}"), t.bad()),
        };
        let used = 1 + 9 + 12 + 1;
        lines.push(Line::from(vec![
            Span::styled(mark, lstyle),
            Span::styled(fit(label(*r), 8), lstyle),
            Span::raw(" "),
            Span::styled(fit(&shown, 12), t.field()),
            Span::raw(" "),
            Span::styled(fit(&mtext, inner_w.saturating_sub(used)), mstyle),
        ]));
        if focus {
            focused_msg = Some((mtext, mstyle));
        }
    }
    if let Some((m, st)) = focused_msg {
        lines.push(Line::styled(format!("↳ {m}"), st));
    }
    let n = s.map_or(0, count);
    let plan = s.and_then(|s| s.points);
    let view = view_letter(app).map_or(String::new(), |v| format!(", view {v}"));
    let title = match (mode, plan) {
        (SweepMode::Spaced, Some(p)) => format!("Readings {n} of {p}{view}"),
        _ => format!("Readings ({n}){view}"),
    };
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed(&view_words(app), t)),
        form,
    );

    // the fit so far sits on the box's lower edge, so the rows go to the readings themselves
    let summary = s.and_then(fit_so_far).map(|fit| {
        Line::styled(
            format!(
                " residual {:+.1}\"  straightness {} ",
                fit.residual.arcsec(),
                fit.straightness.show_fine(unit)
            ),
            t.title(),
        )
    });
    let mut rows = Vec::new();
    rows.push(Line::styled(
        format!("{:>3}  {:>12}  {:>13}", "#", "at", "reading"),
        t.dim(),
    ));
    if let Some(s) = s {
        let pts = s.points_xy();
        let show = (list.height.saturating_sub(2) as usize).saturating_sub(rows.len());
        let start = pts.len().saturating_sub(show);
        let positions_known = !pts.is_empty() || s.readings.is_empty();
        for (i, (x, r)) in pts.iter().enumerate().skip(start) {
            rows.push(Line::raw(format!(
                "{:>3}  {:>12}  {:>13}",
                i + 1,
                x.show(unit),
                format!("{}{}", if r.nm() > 0 { "+" } else { "" }, r.show_fine(unit))
            )));
        }
        if !positions_known {
            for (i, r) in s.readings.iter().enumerate() {
                rows.push(Line::raw(format!(
                    "{:>3}  {:>12}  {:>13}",
                    i + 1,
                    "?",
                    r.show_fine(unit)
                )));
            }
        }
    }
    let mut list_box = boxed(&title, t);
    if let Some(line) = summary {
        list_box = list_box.title_bottom(line);
    }
    f.render_widget(Paragraph::new(rows).block(list_box), list);

    let chart_title = if s.and_then(fit_so_far).is_some() {
        "Readings ● and fitted line"
    } else {
        "Readings ● (the line appears from two)"
    };
    let chart_title = match (view_letter(app), s.and_then(fit_so_far)) {
        (Some(v), Some(_)) => format!("View {v} ● and fitted line"),
        (Some(v), None) => format!("View {v} ● (line from two)"),
        (None, _) => chart_title.to_string(),
    };
    sweep_chart::draw(f, right, s, unit, boxed(&chart_title, t), t);
}

pub fn next(app: &App) -> String {
    let Some(s) = sweep(app) else {
        return "type the travel (first to last reading), then Enter".into();
    };
    let n = count(s);
    match s.mode {
        SweepMode::Spaced => match (s.travel, s.points) {
            (None, _) => "type the travel (first to last reading), then Enter".into(),
            (_, None) => "type how many readings you will take, then Enter".into(),
            (Some(tr), Some(p)) if (n as u32) < p => {
                let at =
                    crate::units::Length::from_nm(tr.nm() * n as i64 / i64::from(p.max(2) - 1));
                format!(
                    "read at {} from the pivot end: type reading {} of {p}, Enter",
                    at.show(app.unit()),
                    n + 1
                )
            }
            _ if view_letter(app).is_some() && !app.ui.readings.other_view => {
                "all readings in for this view: press Enter for the other view's readings".into()
            }
            _ => "all readings in: press Enter for the verdict".into(),
        },
        SweepMode::Pairs if n >= 2 => {
            "type another position and reading, or Enter on the empty field for the verdict".into()
        }
        SweepMode::Pairs => "type the position, Enter, then the reading, Enter".into(),
    }
}
