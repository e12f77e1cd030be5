//! Drawing: from the model only. Picks the screen, draws the shared frame (title, step bar,
//! next step, status, footer) and any prompt or help on top.

use super::app::{App, Level, PromptKind, STEPS, Screen, step_name};
use super::chrome;
use super::keymap::Action;
use super::screens;
use super::theme::Theme;
use crate::traveller::{Feature, FeatureKind, Step};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::Style;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Wrap};

/// Draw the whole screen.
pub fn draw(f: &mut Frame, app: &App) {
    let theme = app.theme;
    if !chrome::big_enough(f.area()) {
        chrome::too_small(f, theme);
        return;
    }
    let fr = chrome::frame5(f.area());
    match app.screen {
        Screen::Overview => screens::overview::draw(f, fr.body, app),
        Screen::Name => screens::overview::draw_name(f, fr.body, app),
        Screen::Notice => screens::notice::draw(f, fr.body, app),
        Screen::Review => screens::review::draw(f, fr.body, app),
        Screen::ReviewFeature { feature } => {
            screens::review_feature::draw(f, fr.body, app, feature)
        }
        Screen::Flow { step, .. } => {
            let body = flow_header(f, fr.body, app, step);
            match step {
                Step::Fixture => screens::choose::draw_fixtures(f, body, app),
                Step::BlockSet => screens::choose::draw_sets(f, body, app),
                Step::Stack => screens::stack::draw(f, body, app),
                Step::Safety => screens::setup::draw_safety(f, body, app),
                Step::Settle => screens::setup::draw_settle(f, body, app),
                Step::Sweep => screens::readings::draw(f, body, app),
                Step::Verdict => screens::verdict::draw(f, body, app),
                Step::Sign | Step::Done => screens::verdict::draw_sign(f, body, app),
            }
        }
    }
    title(f, fr.title, app);
    // the next step and the status share three lines: a one-line next step leaves the status
    // two, so a longer message is not cut
    let next = next_words(app);
    let whole = Rect {
        height: fr.next.height + fr.status.height,
        ..fr.next
    };
    let next_h = u16::try_from(
        super::screens::review_feature::wrap(&format!(" NEXT  {next}"), usize::from(whole.width))
            .len(),
    )
    .unwrap_or(2)
    .clamp(1, fr.next.height.max(1));
    let [next_area, status_area] =
        Layout::vertical([Constraint::Length(next_h), Constraint::Min(0)]).areas(whole);
    chrome::next_step(f, next_area, &next, theme);
    status(f, status_area, app);
    let hide = hidden_keys(app);
    chrome::footer(f, fr.footer, app.ctx(), app.typing(), &hide, theme);
    if let Some(p) = &app.prompt {
        screens::prompt::draw(f, p, theme);
    }
    if app.help {
        chrome::help_overlay(f, app.screen_ctx(), theme);
    }
}

/// Footer entries that do nothing right now.
fn hidden_keys(app: &App) -> Vec<Action> {
    let mut hide = Vec::new();
    // signing and sending back are the lead's, with the job opened for review
    if matches!(app.screen, Screen::Review | Screen::ReviewFeature { .. })
        && (app.read_only || !app.review_mode)
    {
        hide.extend([
            Action::SignFeature,
            Action::SignJob,
            Action::ReturnFeature,
            Action::ReturnJob,
        ]);
    }
    if app.screen == Screen::Review && app.review_mode && app.prompt.is_none() {
        // opened for review: there is no operator's overview to go back to
        hide.push(Action::Back);
    }
    if let Screen::Flow { step, .. } = app.screen {
        let v = app
            .attempt()
            .and_then(|a| a.judgement.as_ref())
            .map(|j| j.verdict);
        let list = super::flow::verdict::choices(v);
        if step == Step::Verdict {
            if !list.contains(&super::flow::verdict::After::NewAttempt) {
                hide.push(Action::NewAttempt);
            }
            if !list.contains(&super::flow::verdict::After::Nonconforming) {
                hide.push(Action::Nonconforming);
            }
        }
        if step == Step::Settle && app.attempt().is_some_and(|a| a.settle.is_some()) {
            hide.push(Action::Skip);
        }
        if step == Step::Stack && app.ui.remedies.is_none() {
            hide.push(Action::Remedies);
        }
        if step == Step::Stack
            && app
                .attempt()
                .is_some_and(|a| a.stack_b.is_some() || a.stack_pivot.is_some())
        {
            // two stacks from one set: its one pair of protectors stays off
            hide.push(Action::Protectors);
        }
    }
    hide
}

fn title(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let job = &app.doc.job;
    let role = if app.review_mode { "lead" } else { "operator" };
    let who = if app.operator.is_empty() {
        format!("{role}: ?")
    } else {
        format!("{role}: {}", app.operator)
    };
    let mut spans = vec![
        Span::styled(" tiltbook ", t.selected()),
        Span::raw(" "),
        Span::styled(format!("Job {}", job.id), t.title()),
        Span::raw(format!(" · {}", job.part)),
    ];
    if matches!(app.screen, Screen::Review | Screen::ReviewFeature { .. }) {
        spans.push(Span::styled("  REVIEW", t.title()));
    }
    if app.read_only {
        spans.push(Span::styled("  READ-ONLY", t.warn()));
    }
    if app.unsaved {
        spans.push(Span::styled("  NOT SAVED", t.bad()));
    }
    let left: usize = spans.iter().map(|s| s.width()).sum();
    let pad = (area.width as usize).saturating_sub(left + who.chars().count() + 1);
    spans.push(Span::raw(" ".repeat(pad)));
    spans.push(Span::styled(who, t.title()));
    f.render_widget(Paragraph::new(Line::from(spans)), area);
}

fn status(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let Some(s) = &app.status else { return };
    let (tag, style): (&str, Style) = match s.level {
        Level::Info => ("", t.text()),
        Level::Done => ("✓ ", t.good()),
        Level::Warn => ("! ", t.warn()),
        Level::Error => ("✗ ", t.bad()),
    };
    f.render_widget(
        Paragraph::new(Line::from(vec![
            Span::styled(tag, style),
            Span::styled(s.text.clone(), style),
        ]))
        .wrap(Wrap { trim: true }),
        area,
    );
}

/// The feature line and the step bar; returns what is left for the screen.
fn flow_header(f: &mut Frame, area: Rect, app: &App, step: Step) -> Rect {
    let t = app.theme;
    let Some(feat) = app.feature() else {
        return area;
    };
    let attempt = app.attempt().map_or(1, |a| a.number);
    let reached = app.attempt().map_or(Step::Fixture, |a| a.step);
    let name = format!("{} {}", feat.id, feat.name);
    let rest = format!("  tol {}  attempt {attempt}", feat.tolerance);
    let room =
        (area.width as usize).saturating_sub(name.chars().count() + rest.chars().count() + 2);
    let head = Line::from(vec![
        Span::styled(name, t.title()),
        Span::raw(format!("  {}{rest}", nominal_within(feat, room))),
    ]);
    let mut bar: Vec<Span> = Vec::new();
    for (i, s) in STEPS.iter().enumerate() {
        if i > 0 {
            bar.push(Span::raw("  "));
        }
        let name = step_name(*s);
        if *s == step {
            bar.push(Span::styled(format!("▶{name}"), t.selected()));
        } else if *s < reached {
            bar.push(Span::styled(format!("✓{name}"), t.text()));
        } else {
            bar.push(Span::styled(format!(" {name}"), t.dim()));
        }
    }
    // one line each, cut at the edge rather than wrapped over the step bar
    let rows = Rect::new(area.x, area.y, area.width, 2.min(area.height));
    f.render_widget(Paragraph::new(vec![head, Line::from(bar)]), rows);
    Rect::new(
        area.x,
        area.y + rows.height,
        area.width,
        area.height.saturating_sub(rows.height),
    )
}

/// The nominal as shown: the setting angle; a taper's half (the setting) and included angles;
/// a compound angle's two views and its true slope.
pub fn nominal_text(f: &Feature) -> String {
    if f.kind != FeatureKind::Plain {
        return f.angle_words();
    }
    match (f.nominal, f.setting_angle()) {
        (Some(n), Some(s)) if (n.deg() - s.deg()).abs() > 1e-9 => {
            format!("{} (set {})", n.dms(0), s.dms(0))
        }
        (_, Some(s)) => s.dms(0),
        (Some(n), None) => n.dms(0),
        (None, None) => "no angle".into(),
    }
}

/// The nominal in at most `room` columns: the whole of it, or its first part when that is too
/// long (a compound angle's views without the true slope, a taper's half angle).
pub fn nominal_within(f: &Feature, room: usize) -> String {
    let full = nominal_text(f);
    if full.chars().count() <= room {
        full
    } else {
        nominal_parts(f).0
    }
}

/// The nominal in two parts, for a narrow column: the second part (a compound angle's true
/// slope, a taper's included angle) goes on a line of its own.
pub fn nominal_parts(f: &Feature) -> (String, Option<String>) {
    match f.kind {
        FeatureKind::Compound => match &f.compound {
            Some(c) => (
                format!(
                    "A {} / B {}",
                    crate::traveller::kinds::short(c.a),
                    crate::traveller::kinds::short(c.b)
                ),
                Some(format!("(true slope {})", c.true_slope().dm())),
            ),
            None => (nominal_text(f), None),
        },
        FeatureKind::Taper => match f.taper.as_ref().map(|t| t.half_angle()) {
            Some(Ok(h)) => (
                format!("half {}", h.dms(0)),
                Some(format!(
                    "incl {}",
                    crate::units::Angle::from_deg(2.0 * h.deg()).dms(0)
                )),
            ),
            _ => (nominal_text(f), None),
        },
        FeatureKind::Plain => (nominal_text(f), None),
    }
}

/// The next action, in words, for the screen shown.
pub fn next_words(app: &App) -> String {
    if let Some(p) = &app.prompt {
        if p.kind == PromptKind::Handover {
            return "type a note for the next shift and press Enter, or Esc to quit without one"
                .into();
        }
        return match p.field {
            Some(_) => "type the answer and press Enter; Esc cancels".into(),
            None => "Enter to go ahead, Esc to keep things as they are".into(),
        };
    }
    if app.help {
        return "Esc closes the help".into();
    }
    match app.screen {
        Screen::Name => "type your name or initials and press Enter".into(),
        Screen::Overview => screens::overview::next_for_job(app),
        Screen::Notice => "read what was left for you, then press Enter to go on".into(),
        Screen::Review => screens::review::next(app),
        Screen::ReviewFeature { feature } => screens::review_feature::next(app, feature),
        Screen::Flow { step, .. } => {
            if app.read_only {
                return "looking only (read-only): Esc goes back, q quits".into();
            }
            match step {
                Step::Fixture => "choose the fixture (↑↓), then press Enter".into(),
                Step::BlockSet => "choose the block set (↑↓), then press Enter".into(),
                Step::Stack => screens::stack::next(app),
                Step::Safety => "clamp the work, read the cautions, then press Enter".into(),
                Step::Settle => screens::setup::next(app),
                Step::Sweep => screens::readings::next(app),
                Step::Verdict => screens::verdict::next(app),
                Step::Sign | Step::Done => {
                    "type your name or initials and press Enter to sign".into()
                }
            }
        }
    }
}

/// A bordered block with a title.
pub fn boxed(title: &str, theme: Theme) -> Block<'static> {
    Block::default()
        .borders(Borders::ALL)
        .title(Span::styled(format!(" {title} "), theme.title()))
}

/// Clear an area and draw a paragraph in a titled box.
pub fn panel(f: &mut Frame, area: Rect, title: &str, lines: Vec<Line<'static>>, theme: Theme) {
    f.render_widget(Clear, area);
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed(title, theme)),
        area,
    );
}
