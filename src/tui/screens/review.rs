//! The lead's review list: every feature (or only the flagged ones) with its state, its attempts
//! in order and its flags; the selected feature's flags in words; who signed what.

use super::super::app::App;
use super::super::chrome::row_mark;
use super::super::flags::{ReviewFlag, lead_signoff, review_flags};
use super::super::flow::review::visible;
use super::super::view::boxed;
use super::cell;
use super::review_feature::wrap;
use crate::traveller::{Feature, Verdict};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

/// The verdicts of a feature's attempts in order, e.g. `FAIL→PASS` (`·` for one not judged).
pub fn attempts_text(f: &Feature) -> String {
    if f.attempts.is_empty() {
        return "—".into();
    }
    f.attempts
        .iter()
        .map(|a| match a.judgement.as_ref().map(|j| j.final_verdict()) {
            Some(Verdict::Pass) => "PASS",
            Some(Verdict::Fail) => "FAIL",
            Some(Verdict::Doubt) => "DOUBT",
            None => "·",
        })
        .collect::<Vec<_>>()
        .join("→")
}

/// The state column: the operator's state, or "lead signed" once a lead's sign-off of the
/// feature (or of the whole job, finished features only) stands.
pub fn review_state(app: &App, f: &Feature) -> String {
    let by_job = f.is_finished() && lead_signoff(&app.doc, None).is_some();
    if by_job || lead_signoff(&app.doc, Some(&f.id)).is_some() {
        "lead signed".into()
    } else {
        super::overview::state_text(f)
    }
}

fn tags(flags: &[ReviewFlag]) -> String {
    if flags.is_empty() {
        "—".into()
    } else {
        flags.iter().map(|f| f.tag).collect::<Vec<_>>().join(" ")
    }
}

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let doc = &app.doc;
    let vis = visible(app);
    let flagged = doc
        .features
        .iter()
        .filter(|x| !review_flags(doc, x).is_empty())
        .count();
    // the selected feature's flags are shown whole; the list gives up rows (and scrolls to
    // keep the selection in view) before they are cut, down to three rows of features
    let inner_w = area.width.saturating_sub(2) as usize;
    let flag_lines: usize = doc
        .features
        .get(app.ui.review.sel)
        .filter(|_| !vis.is_empty())
        .map_or(1, |feat| {
            review_flags(doc, feat)
                .iter()
                .map(|x| wrap(&format!("! {}", x.words), inner_w).len())
                .sum::<usize>()
                .max(1)
        });
    let room = area.height.saturating_sub(3);
    let flags_h = (flag_lines as u16 + 2).max(3);
    let table_h = (vis.len().max(1) as u16 + 3)
        .min(room.saturating_sub(flags_h).max(6))
        .min(area.height.saturating_sub(6));
    let [head, table, detail, job] = Layout::vertical([
        Constraint::Length(1),
        Constraint::Length(table_h),
        Constraint::Min(3),
        Constraint::Length(2),
    ])
    .areas(area);
    let (done, total) = doc.progress();
    let showing = if app.ui.review.flagged_only {
        "showing flagged only"
    } else {
        "showing all"
    };
    f.render_widget(
        Paragraph::new(Line::from(vec![
            Span::styled(format!("Review of {}", doc.job.id), t.title()),
            Span::raw(format!(
                " · {done} of {total} finished · {flagged} flagged · {showing}"
            )),
        ])),
        head,
    );
    // columns: marker, id, name, state, attempts, flags
    let w = table.width.saturating_sub(2) as usize;
    let (wid, wst, wat) = (5, 14, 15);
    let wide = w >= 100;
    let wname = if wide { 28 } else { 16 };
    let wfl = w.saturating_sub(2 + wid + wname + wst + wat).max(6);
    let mut lines = vec![Line::from(vec![
        cell("  ", 2, t.dim()),
        cell("Id", wid, t.dim()),
        cell("Feature", wname, t.dim()),
        cell("State", wst, t.dim()),
        cell("Attempts", wat, t.dim()),
        cell("Flags", wfl, t.dim()),
    ])];
    let rows = table.height.saturating_sub(3) as usize;
    let sel_pos = vis
        .iter()
        .position(|i| *i == app.ui.review.sel)
        .unwrap_or(0);
    let first = sel_pos.saturating_sub(rows.saturating_sub(1));
    for i in vis.iter().copied().skip(first).take(rows) {
        let Some(feat) = doc.features.get(i) else {
            continue;
        };
        let (mark, style) = row_mark(i == app.ui.review.sel, t);
        let fl = review_flags(doc, feat);
        let fstyle = if i == app.ui.review.sel || fl.is_empty() {
            style
        } else {
            t.warn()
        };
        lines.push(Line::from(vec![
            cell(mark, 2, style),
            cell(&feat.id, wid, style),
            cell(&feat.name, wname, style),
            cell(&review_state(app, feat), wst, style),
            cell(&attempts_text(feat), wat, style),
            cell(&tags(&fl), wfl, fstyle),
        ]));
    }
    if vis.is_empty() {
        lines.push(Line::styled(
            "  no feature is flagged; f shows them all",
            t.dim(),
        ));
    }
    f.render_widget(Paragraph::new(lines).block(boxed("Features", t)), table);

    let mut words: Vec<Line> = Vec::new();
    let sel = doc
        .features
        .get(app.ui.review.sel)
        .filter(|_| !vis.is_empty());
    let title = match sel {
        Some(feat) => {
            let fl = review_flags(doc, feat);
            if fl.is_empty() {
                words.push(Line::raw("no flags"));
            }
            for x in fl {
                words.push(Line::styled(format!("! {}", x.words), t.warn()));
            }
            format!("{} {}: flags", feat.id, feat.name)
        }
        None => "Flags".into(),
    };
    f.render_widget(
        Paragraph::new(words)
            .wrap(Wrap { trim: false })
            .block(boxed(&title, t)),
        detail,
    );

    let job_line = match lead_signoff(doc, None) {
        Some(s) => format!(
            "Job sign-off: {} (lead) {}, digest {}…",
            s.by,
            s.at.short(),
            s.digest.chars().take(12).collect::<String>()
        ),
        None => "Job sign-off: not signed by a lead yet".into(),
    };
    let returns = doc.returns.len();
    let notes = doc.handovers.len();
    // notes nobody has read stay in the lead's view, even on a finished job
    let unread: Vec<&str> = doc
        .handovers
        .iter()
        .filter(|h| h.read_by.is_empty())
        .map(|h| h.text.as_str())
        .collect();
    let unread_text = match unread.last() {
        Some(text) => format!(" ({} not read by anyone: \"{text}\")", unread.len()),
        None => String::new(),
    };
    f.render_widget(
        Paragraph::new(vec![
            Line::raw(job_line),
            Line::styled(
                format!(
                    "{returns} return{} · {} events in the log · {notes} handover note{}{unread_text}",
                    if returns == 1 { "" } else { "s" },
                    doc.events.len(),
                    if notes == 1 { "" } else { "s" },
                ),
                if unread.is_empty() { t.dim() } else { t.warn() },
            ),
        ]),
        job,
    );
}

/// The next action on the review list, in words.
pub fn next(app: &App) -> String {
    match app.doc.features.get(app.ui.review.sel) {
        Some(f) if !visible(app).is_empty() => format!(
            "Enter shows {}'s attempts; s signs it as lead, r sends it back; S signs the job; f {}",
            f.id,
            if app.ui.review.flagged_only {
                "shows all"
            } else {
                "shows flagged only"
            }
        ),
        _ => "f shows every feature again".into(),
    }
}
