//! What every screen shares: the footer generated from the keymap, the help overlay, the status
//! line, the "needs at least 80×24" screen, and small layout helpers.

use super::keymap::{self, Action, Ctx};
use super::theme::{MARKER, NO_MARKER, Theme};
use ratatui::Frame;
use ratatui::layout::{Alignment, Constraint, Layout, Rect};
use ratatui::style::Style;
use ratatui::text::{Line, Span, Text};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Wrap};
use unicode_width::UnicodeWidthStr;

/// The smallest terminal the screens are laid out for.
pub const MIN_W: u16 = 80;
pub const MIN_H: u16 = 24;

/// Is the area big enough for the screens?
pub fn big_enough(area: Rect) -> bool {
    area.width >= MIN_W && area.height >= MIN_H
}

/// Drawn instead of a screen when the terminal is too small.
pub fn too_small(f: &mut Frame, theme: Theme) {
    let area = f.area();
    let lines = vec![
        Line::styled("tiltbook needs at least 80×24", theme.warn()),
        Line::raw(format!("this terminal is {}×{}", area.width, area.height)),
        Line::raw("make the window larger; nothing is lost"),
        Line::raw("q quits"),
    ];
    let h = (lines.len() as u16).min(area.height);
    let top = area.height.saturating_sub(h) / 2;
    let r = Rect::new(area.x, area.y + top, area.width, h);
    f.render_widget(
        Paragraph::new(lines)
            .alignment(Alignment::Center)
            .wrap(Wrap { trim: true }),
        r,
    );
}

/// The footer line: keys and what they do here, from the keymap.
pub fn footer(f: &mut Frame, area: Rect, ctx: Ctx, typing: bool, hide: &[Action], theme: Theme) {
    // a key and what it does stay on one line: lines break only between them
    let width = usize::from(area.width);
    let mut lines: Vec<Line> = Vec::new();
    let mut spans: Vec<Span> = Vec::new();
    let mut used = 0;
    for (keys, label) in keymap::footer(ctx, typing, hide) {
        let label = format!(" {label}");
        let w = keys.width() + label.width();
        if used > 0 && used + 2 + w > width {
            lines.push(Line::from(std::mem::take(&mut spans)));
            used = 0;
        }
        if used > 0 {
            spans.push(Span::raw("  "));
            used += 2;
        }
        spans.push(Span::styled(keys, theme.key()));
        spans.push(Span::raw(label));
        used += w;
    }
    if !spans.is_empty() {
        lines.push(Line::from(spans));
    }
    f.render_widget(Paragraph::new(lines).wrap(Wrap { trim: true }), area);
}

/// The help overlay for a screen, from the keymap.
pub fn help_overlay(f: &mut Frame, ctx: Ctx, theme: Theme) {
    let area = centered(f.area(), 76, 20);
    f.render_widget(Clear, area);
    let mut lines = vec![Line::styled("Keys on this screen", theme.title())];
    for (keys, help) in keymap::help(ctx) {
        lines.push(Line::from(vec![
            Span::styled(format!("{keys:<22}"), theme.key()),
            Span::raw(help),
        ]));
    }
    lines.push(Line::styled(
        "Arrows, Enter, Esc and Tab always work; letters are shortcuts.",
        theme.dim(),
    ));
    f.render_widget(
        Paragraph::new(lines).wrap(Wrap { trim: false }).block(
            Block::default()
                .borders(Borders::ALL)
                .title(" Help (Esc closes) "),
        ),
        area,
    );
}

/// A rectangle of at most `w`×`h`, centred in `area`.
pub fn centered(area: Rect, w: u16, h: u16) -> Rect {
    let w = w.min(area.width);
    let h = h.min(area.height);
    Rect::new(
        area.x + (area.width - w) / 2,
        area.y + (area.height - h) / 2,
        w,
        h,
    )
}

/// Split a screen into title (1), body, next-step line (2), status (1), footer (1 or 2).
pub struct Frame5 {
    pub title: Rect,
    pub body: Rect,
    pub next: Rect,
    pub status: Rect,
    pub footer: Rect,
}

pub fn frame5(area: Rect) -> Frame5 {
    let footer_h = if area.width >= 120 { 1 } else { 2 };
    let [title, body, next, status, footer] = Layout::vertical([
        Constraint::Length(1),
        Constraint::Min(5),
        Constraint::Length(2),
        Constraint::Length(1),
        Constraint::Length(footer_h),
    ])
    .areas(area);
    Frame5 {
        title,
        body,
        next,
        status,
        footer,
    }
}

/// The marker and style of a row: reverse video and "▶" when selected.
pub fn row_mark(selected: bool, theme: Theme) -> (&'static str, Style) {
    if selected {
        (MARKER, theme.selected())
    } else {
        (NO_MARKER, theme.text())
    }
}

/// The "next step" banner: big, obvious, in words (two lines at most).
pub fn next_step(f: &mut Frame, area: Rect, text: &str, theme: Theme) {
    let t = Text::from(vec![Line::from(vec![
        Span::styled(" NEXT ", theme.selected()),
        Span::raw(" "),
        Span::styled(text.to_string(), theme.next()),
    ])]);
    f.render_widget(Paragraph::new(t).wrap(Wrap { trim: true }), area);
}
