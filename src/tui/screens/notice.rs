//! What was left for the person opening the job, before anything else: the lead's return
//! comments (what to check or redo) and the handover notes of the shift before.

use super::super::app::App;
use super::super::flow::shift::{item_handover, item_return, notice_items};
use super::super::view::boxed;
use ratatui::Frame;
use ratatui::layout::Rect;
use ratatui::text::Line;
use ratatui::widgets::{Paragraph, Wrap};

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let mut lines: Vec<Line> = Vec::new();
    for item in notice_items(app) {
        if let Some(r) = item_return(app, item) {
            let what = match &r.feature {
                Some(id) => {
                    let name = app.doc.feature(id).map_or("", |f| f.name.as_str());
                    format!("{id} {name}")
                }
                None => "the whole job".into(),
            };
            lines.push(Line::styled(
                format!("Sent back by {} on {}: {what}", r.by, r.at.short()),
                t.warn(),
            ));
            lines.push(Line::styled(format!("  {}", r.comment), t.title()));
            lines.push(Line::raw(""));
        }
        if let Some(h) = item_handover(app, item) {
            lines.push(Line::styled(
                format!("Handover note from {}, {}:", h.by, h.at.short()),
                t.title(),
            ));
            lines.push(Line::raw(format!("  {}", h.text)));
            lines.push(Line::raw(""));
        }
    }
    let who = if app.operator.is_empty() {
        String::new()
    } else {
        format!(" for {}", app.operator)
    };
    lines.push(Line::styled(
        "Press Enter to go on to where the work stopped.",
        t.dim(),
    ));
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed(&format!("Read this first{who}"), t)),
        area,
    );
}
