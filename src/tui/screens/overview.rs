//! The job overview: every feature with its state, nominal, tolerance and verdict; progress;
//! the next action. And the one-time name question.

use super::super::app::{App, step_name};
use super::super::chrome::row_mark;
use super::super::view::{boxed, nominal_parts, nominal_text};
use super::cell;
use crate::traveller::{Feature, FeatureState, Verdict};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Gauge, Paragraph, Wrap};

/// The verdict column: the verdict that stands, in words.
pub fn verdict_text(f: &Feature) -> String {
    let v = f
        .accepted_attempt()
        .and_then(|a| a.judgement.as_ref())
        .map(|j| j.final_verdict());
    let word = match v {
        Some(Verdict::Pass) => "PASS",
        Some(Verdict::Fail) => "FAIL",
        Some(Verdict::Doubt) => "DOUBT",
        None => "—",
    };
    if f.state == FeatureState::Nonconforming {
        format!("{word} (NC)")
    } else {
        word.to_string()
    }
}

/// Where a feature's work stands, in words.
pub fn state_text(f: &Feature) -> String {
    match f.current_attempt() {
        Some(a) if !f.is_finished() && f.state != FeatureState::Returned => {
            format!("at {}", step_name(a.step).to_lowercase())
        }
        _ => f.state.label().to_string(),
    }
}

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let [head, gauge, table] = Layout::vertical([
        Constraint::Length(2),
        Constraint::Length(1),
        Constraint::Min(3),
    ])
    .areas(area);
    let job = &app.doc.job;
    let mut info = vec![
        Span::styled(job.part.clone(), t.title()),
        Span::raw(format!(
            "  qty {}  unit {}",
            job.quantity,
            job.unit.symbol()
        )),
    ];
    if !job.drawing.is_empty() {
        info.push(Span::raw(format!(
            "  drawing {} {}",
            job.drawing, job.revision
        )));
    }
    if !job.material.is_empty() {
        info.push(Span::raw(format!("  {}", job.material)));
    }
    f.render_widget(
        Paragraph::new(vec![
            Line::from(info),
            Line::styled(app.file_label.clone(), t.dim()),
        ]),
        head,
    );
    let (done, total) = app.doc.progress();
    let ratio = if total == 0 {
        0.0
    } else {
        done as f64 / total as f64
    };
    f.render_widget(
        Gauge::default()
            .ratio(ratio)
            .label(format!("{done} of {total} features finished"))
            .gauge_style(t.good()),
        gauge,
    );
    // columns: marker, id, name, state, nominal, tolerance, verdict; the nominal column is as
    // wide as the widest nominal, and a long one (a compound angle's true slope, a taper's
    // included angle) takes a second line when the name would be squeezed
    // every column is as wide as its widest entry (or its heading) and one blank after it
    let w = table.width.saturating_sub(2) as usize;
    let widest = |f: &dyn Fn(&Feature) -> usize| app.doc.features.iter().map(f).max().unwrap_or(0);
    let wid = widest(&|x| x.id.chars().count()).max(2) + 2;
    let wst = widest(&|x| state_text(x).chars().count()).max(5) + 1;
    // a narrow screen says "Tol." and gives the name the room
    let tol_head = if w < 100 { "Tol." } else { "Tolerance" };
    let wtol = widest(&|x| x.tolerance.to_string().chars().count()).max(tol_head.len()) + 1;
    let wv = widest(&|x| verdict_text(x).chars().count()).max(7) + 1;
    let fixed = 2 + wid + wst + wtol + wv;
    let full = widest(&|x| nominal_text(x).chars().count()) + 1;
    let two_lines = w.saturating_sub(fixed + full.max(12)) < 24;
    let wnom = if two_lines {
        widest(&|x| {
            let (a, b) = nominal_parts(x);
            a.chars().count().max(b.map_or(0, |b| b.chars().count()))
        }) + 1
    } else {
        full
    }
    .clamp(12, 42);
    let wname = w.saturating_sub(fixed + wnom).max(8);
    let mut lines = vec![Line::from(vec![
        cell("  ", 2, t.dim()),
        cell("Id", wid, t.dim()),
        cell("Feature", wname, t.dim()),
        cell("State", wst, t.dim()),
        cell("Nominal", wnom, t.dim()),
        cell(tol_head, wtol, t.dim()),
        cell("Verdict", wv, t.dim()),
    ])];
    let sel = app.ui.overview_sel;
    // every line with the feature it belongs to
    let mut all: Vec<(usize, Line)> = Vec::new();
    for (i, feat) in app.doc.features.iter().enumerate() {
        let (mark, style) = row_mark(i == sel, t);
        let v = verdict_text(feat);
        let vstyle = if i == sel {
            style
        } else if v.starts_with("PASS") {
            t.good()
        } else if v.starts_with("FAIL") {
            t.bad()
        } else if v.starts_with("DOUBT") {
            t.warn()
        } else {
            style
        };
        let (nom, more) = if two_lines {
            nominal_parts(feat)
        } else {
            (nominal_text(feat), None)
        };
        all.push((
            i,
            Line::from(vec![
                cell(mark, 2, style),
                cell(&feat.id, wid, style),
                cell(&feat.name, wname - 1, style),
                cell(" ", 1, style),
                cell(&state_text(feat), wst, style),
                cell(&nom, wnom, style),
                cell(&feat.tolerance.to_string(), wtol, style),
                cell(&v, wv, vstyle),
            ]),
        ));
        if let Some(more) = more {
            all.push((
                i,
                Line::from(vec![
                    cell("", 2 + wid + wname + wst, style),
                    cell(&more, wnom, style),
                    cell("", wtol + wv, style),
                ]),
            ));
        }
    }
    let rows = table.height.saturating_sub(3) as usize;
    let last = all.iter().rposition(|(i, _)| *i == sel).unwrap_or(0);
    let first = (last + 1).saturating_sub(rows);
    lines.extend(all.into_iter().skip(first).take(rows).map(|(_, l)| l));
    f.render_widget(Paragraph::new(lines).block(boxed("Features", t)), table);
}

/// The next action for the job, in words.
pub fn next_for_job(app: &App) -> String {
    let sel = app.doc.features.get(app.ui.overview_sel);
    match sel {
        Some(feat) if feat.is_finished() => match app.doc.next_feature() {
            Some(n) => format!(
                "{} is finished; next is {}: select it (↑↓) and press Enter",
                feat.id, n.id
            ),
            None => match super::super::flags::lead_signoff(&app.doc, None) {
                Some(s) => format!(
                    "the job is signed by {} (lead) on {}: nothing is left to do",
                    s.by,
                    s.at.short()
                ),
                None => {
                    "every feature is finished: the traveller goes to the lead for review".into()
                }
            },
        },
        Some(feat) if feat.state == FeatureState::Returned => format!(
            "{} was sent back by the lead: press Enter to see it, then try again (n) or sign again",
            feat.id
        ),
        Some(feat) => match feat.current_attempt() {
            Some(a) => format!(
                "press Enter to go on with {} at {}",
                feat.id,
                step_name(a.step).to_lowercase()
            ),
            None => format!("press Enter to start {} {}", feat.id, feat.name),
        },
        None => "this job has no features; add them to the plan file".into(),
    }
}

pub fn draw_name(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let (question, goes) = if app.review_mode {
        (
            "Who is reviewing this job?",
            "Your name or initials go with every sign-off and return you make.",
        )
    } else {
        (
            "Who is working on this job?",
            "Your name or initials go beside every entry you confirm.",
        )
    };
    let lines = vec![
        Line::raw(""),
        Line::styled(question, t.title()),
        Line::raw(""),
        Line::raw(goes),
        Line::raw("(Next time give it with --as NAME, or put it in the shop file.)"),
        Line::raw(""),
        Line::from(vec![
            Span::raw("Name: "),
            Span::styled(format!("{}▏", app.ui.name.text), t.field()),
        ]),
    ];
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed("Operator", t)),
        area,
    );
}
