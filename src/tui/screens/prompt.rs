//! A one-line question over the screen: a reason, a note, a swapped block, or yes/no.

use super::super::app::Prompt;
use super::super::chrome::centered;
use super::super::theme::Theme;
use super::super::view::boxed;
use ratatui::Frame;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Clear, Paragraph, Wrap};

pub fn draw(f: &mut Frame, p: &Prompt, theme: Theme) {
    let area = centered(f.area(), 72, 9);
    f.render_widget(Clear, area);
    let mut lines = vec![Line::raw(p.hint.clone()), Line::raw("")];
    match &p.field {
        Some(field) => lines.push(Line::from(vec![
            Span::styled("▶ ", theme.selected()),
            Span::styled(format!("{}▏", field.text), theme.field()),
        ])),
        None => lines.push(Line::from(vec![
            Span::styled("Enter", theme.key()),
            Span::raw(" yes    "),
            Span::styled("Esc", theme.key()),
            Span::raw(" no"),
        ])),
    }
    if let Some(e) = &p.error {
        lines.push(Line::styled(format!("✗ {e}"), theme.bad()));
    }
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed(&p.title, theme)),
        area,
    );
}
