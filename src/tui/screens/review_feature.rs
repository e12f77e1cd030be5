//! One feature under review: its flags, who signed it and any return, then every attempt in
//! order (fixture, set, stack as built, settle, readings, fit, verdict, the uncertainty budget
//! line by line, the note); the chart of the chosen attempt's readings beside it.

use super::super::app::App;
use super::super::chrome::frame5;
use super::super::flags::{review_flags, standing};
use super::super::theme::Theme;
use super::super::view::{boxed, nominal_within};
use super::super::widgets::sweep_chart;
use super::review::review_state;
use super::review_attempt::attempt_section;
use crate::traveller::digest::withdrawn_by;
use crate::traveller::{Feature, FeatureKind, Role, Scope, Traveller};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::Style;
use ratatui::text::{Line, Span};
use ratatui::widgets::Paragraph;
use unicode_width::UnicodeWidthStr;

/// Width of the label column of the page.
const LABEL: usize = 10;

/// The text of a feature page, wrapped to the width it is drawn at.
pub struct Page {
    pub lines: Vec<Line<'static>>,
    /// The first line of each attempt's section.
    pub starts: Vec<usize>,
    /// Text rows shown at once.
    pub height: u16,
}

impl Page {
    /// The furthest the text scrolls (its last line at the bottom).
    pub fn max_scroll(&self) -> u16 {
        u16::try_from(self.lines.len().saturating_sub(self.height as usize)).unwrap_or(u16::MAX)
    }
    /// The line attempt `i` (index) is shown from: the first attempt with the flags and
    /// sign-offs above it, the others from their own heading.
    pub fn start_of(&self, i: usize) -> u16 {
        if i == 0 {
            return 0;
        }
        self.starts
            .get(i)
            .map_or(0, |s| u16::try_from(*s).unwrap_or(u16::MAX))
    }
}

/// Header (2 rows), the text box and the chart box, from the screen body.
fn areas(body: Rect) -> (Rect, Rect, Rect) {
    let [head, rest] = Layout::vertical([Constraint::Length(2), Constraint::Min(3)]).areas(body);
    let text_w = if body.width >= 120 {
        body.width * 3 / 5
    } else {
        46.min(body.width)
    };
    let [text, chart] =
        Layout::horizontal([Constraint::Length(text_w), Constraint::Min(10)]).areas(rest);
    (head, text, chart)
}

/// The page of feature `index` as drawn at the app's terminal size.
pub fn page(app: &App, index: usize) -> Page {
    let (w, h) = app.size;
    page_in(app, index, frame5(Rect::new(0, 0, w, h)).body)
}

/// The page of feature `index` as drawn in the screen body `body`.
fn page_in(app: &App, index: usize, body: Rect) -> Page {
    let (_, text, _) = areas(body);
    let width = text.width.saturating_sub(2) as usize;
    let height = text.height.saturating_sub(2);
    let mut b = Builder {
        lines: Vec::new(),
        width: width.max(LABEL + 8),
        theme: app.theme,
    };
    let mut starts = Vec::new();
    if let Some(f) = app.doc.features.get(index) {
        head_section(&mut b, &app.doc, f);
        for (k, a) in f.attempts.iter().enumerate() {
            starts.push(b.lines.len());
            attempt_section(&mut b, &app.doc, f, a, k == app.ui.review.attempt);
        }
    }
    Page {
        lines: b.lines,
        starts,
        height,
    }
}

pub(super) struct Builder {
    pub(super) lines: Vec<Line<'static>>,
    pub(super) width: usize,
    pub(super) theme: Theme,
}

impl Builder {
    /// A labelled row, wrapped under its text.
    pub(super) fn row(&mut self, label: &str, text: &str, style: Style) {
        let room = self.width.saturating_sub(LABEL).max(8);
        for (k, part) in wrap(text, room).into_iter().enumerate() {
            let l = if k == 0 { label } else { "" };
            self.lines.push(Line::from(vec![
                Span::styled(format!("{l:<LABEL$}"), self.theme.dim()),
                Span::styled(part, style),
            ]));
        }
    }
    pub(super) fn text(&mut self, label: &str, text: &str) {
        let s = self.theme.text();
        self.row(label, text, s);
    }
    pub(super) fn heading(&mut self, text: &str, selected: bool) {
        let style = if selected {
            self.theme.selected()
        } else {
            self.theme.title()
        };
        let mut t = format!("── {text} ");
        let fill = self.width.saturating_sub(t.width());
        t.push_str(&"─".repeat(fill));
        self.lines.push(Line::styled(t, style));
    }
}

/// Words wrapped to `width` columns (a word longer than the width is cut).
pub fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut out = Vec::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        let need = if line.is_empty() {
            word.width()
        } else {
            line.width() + 1 + word.width()
        };
        if need > width && !line.is_empty() {
            out.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() || out.is_empty() {
        out.push(line);
    }
    out
}

fn head_section(b: &mut Builder, t: &Traveller, f: &Feature) {
    let flags = review_flags(t, f);
    if flags.is_empty() {
        b.text("Flags", "none");
    }
    for (k, x) in flags.iter().enumerate() {
        let warn = b.theme.warn();
        b.row(
            if k == 0 { "Flags" } else { "" },
            &format!("! {}", x.words),
            warn,
        );
    }
    let mut any = false;
    for s in t
        .signoffs
        .iter()
        .filter(|s| s.scope == Scope::Job || s.feature.as_deref() == Some(f.id.as_str()))
    {
        let role = match s.role {
            Role::Operator => "operator",
            Role::Lead => "lead",
        };
        let what = if s.scope == Scope::Job {
            ", the job"
        } else {
            ""
        };
        let stands = match withdrawn_by(t, s) {
            Some(r) => format!("withdrawn: sent back by {} {}", r.by, r.at.short()),
            None if standing(t, s) => "stands".into(),
            None => "changed since".into(),
        };
        let label = if any { "" } else { "Signed" };
        b.text(
            label,
            &format!(
                "{role} {} {}{what} · digest {}… · {stands}",
                s.by,
                s.at.short(),
                s.digest.chars().take(8).collect::<String>()
            ),
        );
        any = true;
    }
    if !any {
        b.text("Signed", "not yet");
    }
    for r in t
        .returns
        .iter()
        .filter(|r| r.feature.is_none() || r.feature.as_deref() == Some(f.id.as_str()))
    {
        let warn = b.theme.warn();
        b.row(
            "Returned",
            &format!("by {} {}: {}", r.by, r.at.short(), r.comment),
            warn,
        );
    }
    if !f.description.is_empty() {
        b.text("About", &f.description);
    }
    match f.kind {
        FeatureKind::Compound => {
            if let Some(c) = &f.compound
                && let Ok(set) = c.setting()
            {
                let (ln, lo) = c.letters();
                b.text(
                    "Angle",
                    &format!(
                        "compound {}; near plate (view {ln}) set to {}, other plate to {} for view {lo}; passes only when both views pass",
                        c.words(),
                        set.near.dms(0),
                        set.other.dms(1)
                    ),
                );
            }
        }
        FeatureKind::Taper => {
            if let Some(tp) = &f.taper
                && let Ok(h) = tp.half_angle()
            {
                b.text(
                    "Angle",
                    &format!(
                        "taper {}: half angle {} (the setting), included {}",
                        tp.given(),
                        h.dms(1),
                        crate::units::Angle::from_deg(2.0 * h.deg()).dms(1)
                    ),
                );
            }
        }
        FeatureKind::Plain => {}
    }
}

pub fn draw(f: &mut Frame, area: Rect, app: &App, index: usize) {
    let t = app.theme;
    let Some(feat) = app.doc.features.get(index) else {
        return;
    };
    let (head, text, chart) = areas(area);
    let mut tabs: Vec<Span> = vec![Span::styled("Attempts: ", t.dim())];
    for (k, a) in feat.attempts.iter().enumerate() {
        let v = a
            .judgement
            .as_ref()
            .map_or("·", |j| j.final_verdict().label());
        let label = format!(
            "{}{} {v}",
            if k == app.ui.review.attempt {
                "▶"
            } else {
                " "
            },
            a.number
        );
        let style = if k == app.ui.review.attempt {
            t.selected()
        } else {
            t.text()
        };
        tabs.push(Span::styled(label, style));
        tabs.push(Span::raw("  "));
    }
    if feat.attempts.is_empty() {
        tabs.push(Span::raw("none yet"));
    }
    let flags = review_flags(&app.doc, feat).len();
    let name = format!("{} {}", feat.id, feat.name);
    let rest = format!(
        "  tol {}  {}  {} flag{}",
        feat.tolerance,
        review_state(app, feat),
        flags,
        if flags == 1 { "" } else { "s" }
    );
    let room =
        (head.width as usize).saturating_sub(name.chars().count() + rest.chars().count() + 2);
    f.render_widget(
        Paragraph::new(vec![
            Line::from(vec![
                Span::styled(name, t.title()),
                Span::raw(format!("  {}{rest}", nominal_within(feat, room))),
            ]),
            Line::from(tabs),
        ]),
        head,
    );
    let pg = page_in(app, index, area);
    let scroll = app.ui.review.scroll.min(pg.max_scroll());
    let more = if pg.lines.len() > pg.height as usize {
        format!(
            " (lines {}–{} of {})",
            scroll + 1,
            (scroll as usize + pg.height as usize).min(pg.lines.len()),
            pg.lines.len()
        )
    } else {
        String::new()
    };
    f.render_widget(
        Paragraph::new(pg.lines)
            .scroll((scroll, 0))
            .block(boxed(&format!("Record{more}"), t)),
        text,
    );
    let a = feat.attempts.get(app.ui.review.attempt);
    let title = match a {
        Some(a) => format!("Readings, attempt {}", a.number),
        None => "Readings".into(),
    };
    match (a.and_then(|a| a.sweep_b.as_ref()), feat.compound_angles()) {
        // a compound angle: each view's readings, one chart over the other
        (Some(second), Some(c)) => {
            let (ln, lo) = c.letters();
            let [top, bottom] =
                Layout::vertical([Constraint::Percentage(50), Constraint::Percentage(50)])
                    .areas(chart);
            sweep_chart::draw(
                f,
                top,
                a.and_then(|a| a.sweep.as_ref()),
                app.unit(),
                boxed(&format!("{title}, view {ln}"), t),
                t,
            );
            sweep_chart::draw(
                f,
                bottom,
                Some(second),
                app.unit(),
                boxed(&format!("{title}, view {lo}"), t),
                t,
            );
        }
        _ => sweep_chart::draw(
            f,
            chart,
            a.and_then(|a| a.sweep.as_ref()),
            app.unit(),
            boxed(&title, t),
            t,
        ),
    }
}

/// The next action on the feature page, in words.
pub fn next(app: &App, index: usize) -> String {
    let id = app
        .doc
        .features
        .get(index)
        .map_or(String::new(), |f| f.id.clone());
    format!("←→ other attempts, ↑↓ scroll; s signs {id} as lead, r sends it back; Esc the list")
}
