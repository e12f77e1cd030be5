//! The verdict (residual, deviation, U, pass / fail / doubt in words; on fail the stack change
//! and what to do) and the sign-off.

use super::super::app::App;
use super::super::chrome::row_mark;
use super::super::flow::verdict::{After, choices};
use super::super::view::boxed;
use super::{arcsec, as_minutes};
use crate::traveller::{FeatureState, Verdict};
use ratatui::Frame;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::Style;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};

/// The verdict in words, with its style.
pub fn verdict_words(v: Verdict, app: &App) -> (&'static str, Style) {
    let t = app.theme;
    match v {
        Verdict::Pass => ("PASS: inside the tolerance", t.good()),
        Verdict::Fail => ("FAIL: outside the tolerance", t.bad()),
        Verdict::Doubt => ("DOUBT: inside the doubt band, the lead decides", t.warn()),
    }
}

pub fn draw(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let (Some(feat), Some(a)) = (app.feature(), app.attempt()) else {
        return;
    };
    let Some(j) = a.judgement.as_ref() else {
        f.render_widget(
            Paragraph::new("no verdict yet: go back to the readings (Esc)")
                .block(boxed("Verdict", t)),
            area,
        );
        return;
    };
    let wide = area.width >= 120;
    let (main, side) = if wide {
        let [a, b] = Layout::horizontal([Constraint::Min(60), Constraint::Length(56)]).areas(area);
        (a, Some(b))
    } else {
        (area, None)
    };
    let (words, style) = match j.view_b.as_ref() {
        Some(_) => super::verdict_views::banner(app, feat, j),
        None => {
            let (w, st) = verdict_words(j.verdict, app);
            (w.to_string(), st)
        }
    };
    let mut lines = vec![Line::styled(
        format!("  {words}  "),
        style.add_modifier(ratatui::style::Modifier::REVERSED),
    )];
    if j.view_b.is_some() {
        super::verdict_views::table(app, feat, a, j, &mut lines);
    } else {
        one_view(app, feat, a, j, &mut lines);
    }
    if feat.state == FeatureState::Nonconforming {
        lines.push(Line::styled(
            format!("Recorded nonconforming: {}", a.note),
            t.bad(),
        ));
    }
    if feat.state == FeatureState::Returned
        && let Some(r) = app
            .doc
            .returns
            .iter()
            .rev()
            .find(|r| r.feature.is_none() || r.feature.as_deref() == Some(feat.id.as_str()))
    {
        lines.push(Line::styled(
            format!("Sent back by {}: {}", r.by, r.comment),
            t.warn(),
        ));
    }
    lines.push(Line::raw(""));
    for (i, c) in choices(Some(j.verdict)).iter().enumerate() {
        let (mark, st) = row_mark(i == app.ui.verdict_sel, t);
        let key = match c {
            After::Sign => "Enter",
            After::NewAttempt => "n",
            After::Nonconforming => "x",
        };
        lines.push(Line::from(vec![
            Span::styled(format!("{mark}{}", c.words()), st),
            Span::styled(format!("  ({key})"), t.dim()),
        ]));
    }
    let mut budget: Vec<Line> = Vec::new();
    let letters = feat.compound_angles().map(|c| c.letters());
    if let Some((ln, _)) = letters {
        budget.push(Line::styled(format!("View {ln}"), t.dim()));
    }
    budget.extend(
        j.budget
            .iter()
            .map(|l| Line::raw(format!("{:>6.2}\"  {}", l.u.arcsec(), l.source))),
    );
    budget.push(Line::styled(
        format!("U = 2·u_c = {:.2}\"", j.u.arcsec()),
        t.title(),
    ));
    if let (Some(v), Some((_, lo))) = (j.view_b.as_ref(), letters) {
        budget.push(Line::styled(format!("View {lo}"), t.dim()));
        budget.extend(
            v.budget
                .iter()
                .map(|l| Line::raw(format!("{:>6.2}\"  {}", l.u.arcsec(), l.source))),
        );
        budget.push(Line::styled(
            format!("U = 2·u_c = {:.2}\"", v.u.arcsec()),
            t.title(),
        ));
    }
    match side {
        Some(side) => {
            f.render_widget(
                Paragraph::new(budget)
                    .wrap(Wrap { trim: false })
                    .block(boxed("Uncertainty budget (standard, in angle)", t)),
                side,
            );
        }
        None => {
            // below the choices, when the screen has the rows
            let room = main.height.saturating_sub(2) as usize;
            if lines.len() + 1 + budget.len() <= room {
                lines.push(Line::styled(
                    "Uncertainty budget (standard, in angle)",
                    t.dim(),
                ));
                lines.extend(budget);
            }
        }
    }
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed(&format!("Verdict, attempt {}", a.number), t)),
        main,
    );
}

/// The figures of a verdict on one view: residual, deviation, U, straightness, stack change.
fn one_view(
    app: &App,
    feat: &crate::traveller::Feature,
    a: &crate::traveller::Attempt,
    j: &crate::traveller::Judgement,
    lines: &mut Vec<Line<'static>>,
) {
    let t = app.theme;
    let unit = app.unit();
    let rise = if j.residual.arcsec().abs() < 0.05 {
        "is level along the sweep"
    } else if j.residual.deg() > 0.0 {
        "rises toward the raised end"
    } else {
        "rises toward the pivot end"
    };
    let achieved = a
        .stack
        .as_ref()
        .map(|s| s.achieved.dms(1))
        .unwrap_or_default();
    let row = |k: &str, v: String, rest: String| {
        Line::from(vec![
            Span::styled(format!("{k:<14}"), t.dim()),
            Span::styled(format!("{v:<12}"), t.title()),
            Span::raw(rest),
        ])
    };
    lines.push(row(
        "Residual δ",
        arcsec(j.residual),
        format!("{}the surface {rise}", as_minutes(j.residual)),
    ));
    lines.push(row(
        "Deviation",
        arcsec(j.deviation),
        format!(
            "{}set {achieved}, tolerance {}",
            as_minutes(j.deviation),
            feat.tolerance
        ),
    ));
    if feat.kind == crate::traveller::FeatureKind::Taper {
        lines.push(row(
            "",
            String::new(),
            format!(
                "of the half angle; on the included angle {}",
                arcsec(crate::units::Angle::from_deg(2.0 * j.deviation.deg()))
            ),
        ));
    }
    lines.push(row(
        "U (k = 2)",
        format!("{:.1}\"", j.u.arcsec()),
        format!("decision rule: {:?}", j.rule).to_lowercase(),
    ));
    let straight = j.fit.straightness.show_fine(unit);
    let doubtful = a
        .sweep
        .as_ref()
        .is_some_and(|s| super::super::judge::straightness_doubtful(s, feat));
    lines.push(row(
        "Straightness",
        straight,
        if doubtful {
            "! large against the tolerance: clean the surface, check for a curve".into()
        } else {
            "along the sweep".into()
        },
    ));
    if let Some(c) = &j.correction {
        let dir = if c.delta.nm() >= 0 { "raise" } else { "lower" };
        let what = if a.stack_pivot.is_some() {
            "the difference of the two stacks"
        } else {
            "the stack"
        };
        lines.push(Line::from(vec![
            Span::styled(format!("{:<14}", "Stack change"), t.dim()),
            Span::styled(
                format!(
                    "{dir} {what} by {} to {}",
                    c.delta.abs().show(unit),
                    c.height.show(unit)
                ),
                t.next(),
            ),
        ]));
    }
}

pub fn next(app: &App) -> String {
    let v = app
        .attempt()
        .and_then(|a| a.judgement.as_ref())
        .map(|j| j.verdict);
    match v {
        Some(Verdict::Pass) => "PASS: press Enter to sign the feature".into(),
        Some(Verdict::Fail) => {
            "FAIL: n for a new attempt with the corrected stack, or x to record it nonconforming"
                .into()
        }
        Some(Verdict::Doubt) => {
            "DOUBT: Enter signs (the lead decides), n tries again, x records nonconforming".into()
        }
        None => "press Esc to go back to the readings".into(),
    }
}

pub fn draw_sign(f: &mut Frame, area: Rect, app: &App) {
    let t = app.theme;
    let (Some(feat), Some(a)) = (app.feature(), app.attempt()) else {
        return;
    };
    let unit = app.unit();
    let mut lines = vec![Line::styled(
        format!("Sign {} {}", feat.id, feat.name),
        t.title(),
    )];
    if let Some(j) = &a.judgement {
        let (w, st) = match j.view_b.as_ref() {
            Some(_) => super::verdict_views::banner(app, feat, j),
            None => {
                let (w, st) = verdict_words(j.verdict, app);
                (w.to_string(), st)
            }
        };
        lines.push(Line::styled(w, st));
        match (j.view_b.as_ref(), feat.compound_angles()) {
            (Some(v), Some(c)) => {
                let (ln, lo) = c.letters();
                lines.push(Line::raw(format!(
                    "view {ln}: deviation {}  U {:.1}\"   view {lo}: deviation {}  U {:.1}\"   tolerance {}",
                    arcsec(j.deviation),
                    j.u.arcsec(),
                    arcsec(v.deviation),
                    v.u.arcsec(),
                    feat.tolerance
                )));
            }
            _ => lines.push(Line::raw(format!(
                "deviation {} {} U {:.1}\"  tolerance {}",
                arcsec(j.deviation),
                as_minutes(j.deviation).trim_end_matches(" · "),
                j.u.arcsec(),
                feat.tolerance
            ))),
        }
    }
    if let Some(s) = &a.stack {
        let stacks = match (&a.stack_b, &a.stack_pivot) {
            (Some(o), _) => format!(
                "plates {} and {} ({} blocks)",
                s.height.show(unit),
                o.height.show(unit),
                s.blocks.len() + o.blocks.len()
            ),
            (None, Some(p)) => format!(
                "stacks {} over {} ({} blocks)",
                s.height.show(unit),
                p.height.show(unit),
                s.blocks.len() + p.blocks.len()
            ),
            _ => format!("stack {} ({} blocks)", s.height.show(unit), s.blocks.len()),
        };
        lines.push(Line::raw(format!(
            "fixture {}  set {}  {stacks}  attempt {}",
            a.fixture.as_ref().map_or("?", |c| c.id.as_str()),
            a.block_set.as_ref().map_or("?", |c| c.id.as_str()),
            a.number
        )));
    }
    if feat.state == FeatureState::Nonconforming {
        lines.push(Line::styled(format!("nonconforming: {}", a.note), t.bad()));
    }
    lines.push(Line::raw(""));
    lines.push(Line::raw(
        "Your signature says the entries above are what was done and read.",
    ));
    lines.push(Line::from(vec![
        Span::styled("Name or initials: ", t.title()),
        Span::styled(format!("{}▏", app.ui.sign.text), t.field()),
    ]));
    f.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(boxed("Sign the feature", t)),
        area,
    );
}
