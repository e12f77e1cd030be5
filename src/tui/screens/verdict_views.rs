//! The verdict of a compound angle: each view's residual, deviation, U and verdict side by
//! side, the plates as set, and the change to each plate's stack. The feature passes only when
//! both views pass.

use super::super::app::App;
use super::arcsec;
use crate::traveller::{Attempt, Compound, Feature, Judgement, Verdict, validate::decide};
use ratatui::style::Style;
use ratatui::text::{Line, Span};

/// The near view's own verdict (the judgement's `verdict` is over both views).
pub fn near_verdict(f: &Feature, j: &Judgement) -> Verdict {
    decide(j.rule, j.deviation, j.u, f.tolerance)
}

/// The banner: the verdict over both views, naming the views that did not pass.
pub fn banner(app: &App, f: &Feature, j: &Judgement) -> (String, Style) {
    let t = app.theme;
    let (ln, lo) = f.compound_angles().map_or(("A", "B"), Compound::letters);
    let near = near_verdict(f, j);
    let other = j.view_b.as_ref().map_or(Verdict::Pass, |v| v.verdict);
    let off: Vec<&str> = [(ln, near), (lo, other)]
        .iter()
        .filter(|(_, v)| *v == j.verdict)
        .map(|(l, _)| *l)
        .collect();
    let which = |word: &str| {
        if off.len() == 2 {
            format!("both views {word}")
        } else {
            format!("view {} {word}", off.join(""))
        }
    };
    match j.verdict {
        Verdict::Pass => ("PASS: both views inside the tolerance".into(), t.good()),
        Verdict::Fail => (format!("FAIL: {}", which("outside the tolerance")), t.bad()),
        Verdict::Doubt => (
            format!(
                "DOUBT: {}; the lead decides",
                which("inside the doubt band")
            ),
            t.warn(),
        ),
    }
}

/// The two views side by side, the plates, and the stack changes.
pub fn table(app: &App, f: &Feature, a: &Attempt, j: &Judgement, lines: &mut Vec<Line<'static>>) {
    let t = app.theme;
    let unit = app.unit();
    let Some(v) = j.view_b.as_ref() else { return };
    let c = f.compound_angles();
    let (ln, lo) = c.map_or(("A", "B"), Compound::letters);
    let near = near_verdict(f, j);
    let cell = |s: String| Span::styled(format!("{s:<16}"), t.title());
    let row = |k: &str, x: String, y: String| {
        Line::from(vec![
            Span::styled(format!("{k:<14}"), t.dim()),
            cell(x),
            cell(y),
        ])
    };
    lines.push(Line::from(vec![
        Span::styled(format!("{:<14}", ""), t.dim()),
        Span::styled(format!("{:<16}", format!("view {ln} (near)")), t.dim()),
        Span::styled(format!("{:<16}", format!("view {lo} (other)")), t.dim()),
    ]));
    lines.push(row("Residual δ", arcsec(j.residual), arcsec(v.residual)));
    lines.push(row("Deviation", arcsec(j.deviation), arcsec(v.deviation)));
    lines.push(row(
        "U (k = 2)",
        format!("{:.1}\"", j.u.arcsec()),
        format!("{:.1}\"", v.u.arcsec()),
    ));
    lines.push(row(
        "Verdict",
        near.label().to_string(),
        v.verdict.label().to_string(),
    ));
    let straight = |s: Option<&crate::traveller::Sweep>, fit: &crate::traveller::Fit| {
        let mark = if s.is_some_and(|s| s.straightness_large(&f.tolerance)) {
            " !"
        } else {
            ""
        };
        format!("{}{mark}", fit.straightness.show_fine(unit))
    };
    lines.push(row(
        "Straightness",
        straight(a.sweep.as_ref(), &j.fit),
        straight(a.sweep_b.as_ref(), &v.fit),
    ));
    lines.push(Line::styled(
        format!(
            "tolerance {} on each view · {} rule",
            f.tolerance,
            format!("{:?}", j.rule).to_lowercase()
        ),
        t.dim(),
    ));
    for (word, corr) in [
        ("near plate", &j.correction),
        ("other plate", &v.correction),
    ] {
        // a plate whose stack stays as it is needs no line
        if let Some(x) = corr.as_ref().filter(|x| x.delta.nm() != 0) {
            let dir = if x.delta.nm() >= 0 { "raise" } else { "lower" };
            lines.push(Line::from(vec![
                Span::styled(format!("{:<14}", "Stack change"), t.dim()),
                Span::styled(
                    format!(
                        "{word}: {dir} by {} to {}",
                        x.delta.abs().show(unit),
                        x.height.show(unit)
                    ),
                    t.next(),
                ),
            ]));
        }
    }
}
