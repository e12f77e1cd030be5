//! One attempt on the lead's feature page: fixture, set, the stack (or both stacks) as built,
//! settle, the readings of each view, the fit, the verdict (each view's for a compound angle,
//! and the one over both), the uncertainty budget line by line, the note.

use super::arcsec;
use super::review_feature::Builder;
use crate::traveller::{
    Attempt, Feature, FeatureKind, Fit, Judgement, Stack, Sweep, SweepMode, Traveller, Verdict,
    validate::decide,
};
use crate::units::{Angle, Length, Unit};

fn nums(blocks: impl Iterator<Item = Length>, unit: Unit) -> String {
    blocks
        .map(|l| l.number(unit, unit.places()))
        .collect::<Vec<_>>()
        .join(" + ")
}

fn stack_rows(b: &mut Builder, label: &str, what: &str, s: &Stack, unit: Unit) {
    let protectors = s.blocks.iter().filter(|x| x.protector).count();
    let prot = if protectors > 0 {
        format!(" ({protectors} protector blocks)")
    } else {
        String::new()
    };
    b.text(
        label,
        &format!(
            "{what}{} = {}{prot}",
            nums(s.blocks.iter().map(|x| x.size), unit),
            s.height.show(unit)
        ),
    );
    let built = s
        .built
        .as_ref()
        .map_or("not confirmed built".to_string(), |m| {
            format!("built {} {}", m.by, m.at.short())
        });
    b.text("", &format!("achieved {}, {built}", s.achieved.dms(1)));
    for w in &s.swaps {
        let why = if w.reason.is_empty() {
            String::new()
        } else {
            format!(": {}", w.reason)
        };
        let warn = b.theme.warn();
        b.row(
            "",
            &format!(
                "swapped by hand {} for {}{why} ({} {})",
                w.used.show(unit),
                w.planned.show(unit),
                w.by,
                w.at.short()
            ),
            warn,
        );
    }
}

pub(super) fn attempt_section(
    b: &mut Builder,
    t: &Traveller,
    f: &Feature,
    a: &Attempt,
    selected: bool,
) {
    let unit = t.job.unit;
    let verdict = a
        .judgement
        .as_ref()
        .map_or("no verdict", |j| j.final_verdict().label());
    let marker = if selected { "▶ " } else { "" };
    b.heading(
        &format!(
            "{marker}Attempt {} of {} · {verdict}",
            a.number,
            f.attempts.len()
        ),
        selected,
    );
    if let Some(m) = &a.started {
        b.text("Started", &format!("{} {}", m.by, m.at.short()));
    }
    match &a.fixture {
        Some(c) => {
            let snap = t.fixture(&c.id).map_or(String::new(), |x| {
                let due = x.due.map_or(String::new(), |d| format!(", due {d}"));
                format!(", C {}{due}", x.centre.show_fine(unit))
            });
            b.text("Fixture", &format!("{}{snap} ({})", c.id, c.by));
            if !c.reason.is_empty() {
                let warn = b.theme.warn();
                b.row("", &format!("reason: {}", c.reason), warn);
            }
        }
        None => b.text("Fixture", "not chosen"),
    }
    if let Some(c) = &a.block_set {
        let snap = t.block_set(&c.id).map_or(String::new(), |x| {
            let due = x.due.map_or(String::new(), |d| format!(", due {d}"));
            format!(", grade {}{due}", x.grade)
        });
        b.text("Set", &format!("{}{snap} ({})", c.id, c.by));
        if !c.reason.is_empty() {
            let warn = b.theme.warn();
            b.row("", &format!("reason: {}", c.reason), warn);
        }
    }
    match (&a.stack, &a.stack_b, &a.stack_pivot) {
        (Some(n), Some(o), _) => {
            let (ln, lo) = f.compound_angles().map_or(("A", "B"), |c| c.letters());
            stack_rows(b, "Near", &format!("plate for view {ln}: "), n, unit);
            stack_rows(b, "Other", &format!("plate for view {lo}: "), o, unit);
        }
        (Some(r), None, Some(p)) => {
            stack_rows(b, "Raised", "under the raised roll: ", r, unit);
            stack_rows(b, "Pivot", "under the pivot roll: ", p, unit);
            b.text(
                "",
                &format!(
                    "two stacks: the difference {} sets the fixture",
                    (r.height - p.height).show(unit)
                ),
            );
        }
        (Some(s), _, _) => stack_rows(b, "Stack", "", s, unit),
        _ => {}
    }
    if let Some(m) = &a.safety {
        b.text(
            "Safety",
            &format!("cautions confirmed, {} {}", m.by, m.at.short()),
        );
    }
    if let Some(s) = &a.settle {
        let what = if s.done {
            format!("{} min", s.minutes.unwrap_or(0))
        } else if s.reason.is_empty() {
            "wait skipped".into()
        } else {
            format!("wait skipped: {}", s.reason)
        };
        b.text("Settle", &format!("{what}, {} {}", s.by, s.at.short()));
    }
    let letters = f.compound_angles().map(|c| c.letters());
    let view = |k: usize| match letters {
        Some((ln, lo)) => format!("view {}: ", if k == 0 { ln } else { lo }),
        None => String::new(),
    };
    let mut first = true;
    for (k, s) in [a.sweep.as_ref(), a.sweep_b.as_ref()]
        .into_iter()
        .enumerate()
    {
        if let Some(s) = s {
            readings_rows(b, if first { "Readings" } else { "" }, &view(k), s, unit);
            first = false;
        }
    }
    if let Some(j) = &a.judgement {
        judgement_rows(b, f, j, &view(0), &view(1), unit);
    }
    if !a.note.trim().is_empty() {
        let warn = b.theme.warn();
        b.row("Note", a.note.trim(), warn);
    }
}

fn readings_rows(b: &mut Builder, label: &str, view: &str, s: &Sweep, unit: Unit) {
    let by = s.entered.as_ref().map_or(String::new(), |m| {
        format!(", last by {} {}", m.by, m.at.short())
    });
    let sign = |l: Length| {
        format!(
            "{}{}",
            if l.nm() > 0 { "+" } else { "" },
            l.number(unit, unit.fine_places())
        )
    };
    match s.mode {
        SweepMode::Spaced => {
            let n = s.readings.len();
            let plan = s.points.map_or("?".to_string(), |p| p.to_string());
            let over = s.travel.map_or("?".to_string(), |x| x.show(unit));
            b.text(label, &format!("{view}{n} of {plan} over {over}{by}"));
            let vals: Vec<String> = s.readings.iter().map(|r| sign(*r)).collect();
            b.text("", &vals.join("  "));
        }
        SweepMode::Pairs => {
            b.text(label, &format!("{view}{} pairs{by}", s.pairs.len()));
            let vals: Vec<String> = s
                .pairs
                .iter()
                .map(|p| {
                    format!(
                        "{}: {}",
                        p.position.number(unit, unit.places()),
                        sign(p.reading)
                    )
                })
                .collect();
            b.text("", &vals.join("  "));
        }
    }
}

fn verdict_style(b: &Builder, v: Verdict) -> ratatui::style::Style {
    match v {
        Verdict::Pass => b.theme.good(),
        Verdict::Fail => b.theme.bad(),
        Verdict::Doubt => b.theme.warn(),
    }
}

fn fit_words(view: &str, residual: Angle, fit: &Fit, unit: Unit) -> String {
    format!(
        "{view}residual {}, straightness {}",
        arcsec(residual),
        fit.straightness.show_fine(unit)
    )
}

fn judgement_rows(
    b: &mut Builder,
    f: &Feature,
    j: &Judgement,
    view_a: &str,
    view_b: &str,
    unit: Unit,
) {
    let rule = format!("{:?}", j.rule).to_lowercase();
    b.text("Fit", &fit_words(view_a, j.residual, &j.fit, unit));
    if let Some(v) = &j.view_b {
        b.text("", &fit_words(view_b, v.residual, &v.fit, unit));
    }
    let style = verdict_style(b, j.verdict);
    match &j.view_b {
        Some(v) => {
            b.row(
                "Verdict",
                &format!(
                    "{} over both views ({rule} rule) · tol {} on each · {} {}",
                    j.verdict.label(),
                    f.tolerance,
                    j.by,
                    j.at.short()
                ),
                style,
            );
            let near = decide(j.rule, j.deviation, j.u, f.tolerance);
            for (w, verdict, dev, u) in [
                (view_a, near, j.deviation, j.u),
                (view_b, v.verdict, v.deviation, v.u),
            ] {
                let st = verdict_style(b, verdict);
                b.row(
                    "",
                    &format!(
                        "{w}{} · deviation {} · U {:.1}\"",
                        verdict.label(),
                        arcsec(dev),
                        u.arcsec()
                    ),
                    st,
                );
            }
        }
        None => {
            b.row(
                "Verdict",
                &format!(
                    "{} · deviation {} · U {:.1}\" ({rule} rule) · tol {} · {} {}",
                    j.verdict.label(),
                    arcsec(j.deviation),
                    j.u.arcsec(),
                    f.tolerance,
                    j.by,
                    j.at.short()
                ),
                style,
            );
            if f.kind == FeatureKind::Taper {
                b.text(
                    "",
                    &format!(
                        "deviation of the half angle; on the included angle {}",
                        arcsec(Angle::from_deg(2.0 * j.deviation.deg()))
                    ),
                );
            }
        }
    }
    if let Some(d) = &j.doubt_decision {
        b.text(
            "Decided",
            &format!(
                "{}: {} ({} {})",
                d.verdict.label(),
                d.reason,
                d.by,
                d.at.short()
            ),
        );
    }
    let compound = j.view_b.is_some();
    let changes = [
        (if compound { "near plate: " } else { "" }, &j.correction),
        (
            "other plate: ",
            &j.view_b.as_ref().and_then(|v| v.correction.clone()),
        ),
    ];
    let mut first = true;
    for (what, c) in changes {
        if let Some(c) = c {
            let dir = if c.delta.nm() >= 0 { "raise" } else { "lower" };
            b.text(
                if first { "Change" } else { "" },
                &format!(
                    "{what}{dir} the stack by {} to {}",
                    c.delta.abs().show_fine(unit),
                    c.height.show(unit)
                ),
            );
            first = false;
        }
    }
    let wide = b.width >= 70;
    let mut label = "Budget";
    let views = [(view_a, &j.budget, j.u)]
        .into_iter()
        .chain(j.view_b.as_ref().map(|v| (view_b, &v.budget, v.u)));
    for (w, lines, u) in views {
        if !w.is_empty() {
            b.text(label, w.trim_end_matches(": "));
            label = "";
        }
        for l in lines.iter() {
            let note = if wide && !l.note.is_empty() {
                format!(" ({})", l.note)
            } else {
                String::new()
            };
            b.text(
                label,
                &format!("{:>6.2}\"  {}{note}", l.u.arcsec(), l.source),
            );
            label = "";
        }
        let title = b.theme.title();
        b.row(label, &format!("U = 2·u_c = {:.2}\"", u.arcsec()), title);
        label = "";
    }
}
