//! Checks on the numbers of an attempt: the stack, the sweep, and the judgement that must
//! follow from them.

use super::{ANGLE_SLACK_ARCSEC, Out, angle_in_range};
use crate::traveller::model::*;
use crate::units::{Angle, Length};

/// A stack's blocks, height and achieved angle on `fx`; `under` is the height of a stack under
/// the pivot roll, when the angle comes from the difference of two.
pub(super) fn stack(
    s: &Stack,
    fx: Option<&FixtureSnapshot>,
    under: Option<Length>,
    p: &str,
    out: &mut Out,
) {
    if s.blocks.is_empty() {
        out.at(
            &format!("{p}.blocks"),
            "the stack has no blocks; list them in wringing order under `blocks:`",
        );
    }
    for (i, b) in s.blocks.iter().enumerate() {
        if b.size.nm() <= 0 {
            out.at(
                &format!("{p}.blocks[{i}].size"),
                "a block size must be more than zero, e.g. `size: 0.1005 in`",
            );
        }
    }
    let total = s.block_total();
    if !s.blocks.is_empty() && total != s.height {
        out.at(
            &format!("{p}.height"),
            format!(
                "height {} is not the sum of the blocks ({}); correct the height or the blocks",
                show(s.height),
                show(total)
            ),
        );
    }
    angle_in_range(
        out,
        &format!("{p}.achieved"),
        s.achieved,
        "the achieved angle",
    );
    if let Some(fx) = fx
        && fx.centre.nm() > 0
    {
        let corr = (fx.roll_pivot.nm() - fx.roll_stack.nm()) as f64 / 2.0;
        let lift = under.map_or(0, |l| l.nm());
        let ratio = ((s.height.nm() - lift) as f64 - corr) / fx.centre.nm() as f64;
        if (0.0..=1.0).contains(&ratio) {
            let want = Angle::from_rad(ratio.asin());
            let what = match under {
                Some(u) => format!(
                    "the difference {} of the two stacks",
                    show(Length::from_nm(s.height.nm() - u.nm()))
                ),
                None => format!("the stack {}", show(s.height)),
            };
            if (want.arcsec() - s.achieved.arcsec()).abs() > ANGLE_SLACK_ARCSEC {
                out.at(&format!("{p}.achieved"), format!("achieved angle {} does not match {what} on fixture {} (that gives {}); recompute it from what was built", s.achieved.dms(2), fx.id, want.dms(2)));
            }
        } else {
            out.at(&format!("{p}.height"), format!("a stack of {} cannot be set on fixture {} (centre {}); check the stack and the fixture", show(s.height), fx.id, show(fx.centre)));
        }
    }
    for (i, w) in s.swaps.iter().enumerate() {
        if w.planned == w.used {
            out.at(
                &format!("{p}.swaps[{i}]"),
                "a swap with the same planned and used block changes nothing; remove it",
            );
        }
    }
}

fn show(l: Length) -> String {
    let s = serde_json::to_value(l)
        .ok()
        .and_then(|v| v.as_str().map(str::to_string));
    s.unwrap_or_default()
}

pub(super) fn sweep(s: &Sweep, p: &str, out: &mut Out) {
    match s.mode {
        SweepMode::Spaced => {
            if !s.pairs.is_empty() {
                out.at(&format!("{p}.pairs"), "position/reading pairs are given but the mode is spaced; set `mode: pairs` or list the readings under `readings:`");
            }
            // a sweep being set up (no readings yet) may still lack its travel or count
            let started = !s.readings.is_empty();
            match s.travel {
                None if !started => {}
                None => out.at(
                    p,
                    "a spaced sweep needs its travel, e.g. `travel: 4.0000 in`",
                ),
                Some(t) if t.nm() <= 0 => out.at(
                    &format!("{p}.travel"),
                    "the travel must be more than zero, e.g. `travel: 4.0000 in`",
                ),
                _ => {}
            }
            match s.points {
                None if !started => {}
                None => out.at(p, "a spaced sweep needs the number of readings, e.g. `points: 5`"),
                Some(n) if n < 2 => out.at(&format!("{p}.points"), "a sweep needs at least 2 readings, e.g. `points: 5`"),
                Some(n) if s.readings.len() > n as usize => out.at(&format!("{p}.readings"), format!("{} readings are entered but the sweep has {n} points; raise `points:` or remove readings", s.readings.len())),
                _ => {}
            }
        }
        SweepMode::Pairs => {
            if !s.readings.is_empty() {
                out.at(&format!("{p}.readings"), "plain readings are given but the mode is pairs; give each as `{ position: …, reading: … }` under `pairs:`, or set `mode: spaced`");
            }
            if s.travel.is_some() || s.points.is_some() {
                out.at(
                    p,
                    "travel and points belong to a spaced sweep; remove them or set `mode: spaced`",
                );
            }
            for (i, a) in s.pairs.iter().enumerate() {
                if s.pairs[..i].iter().any(|b| b.position == a.position) {
                    out.at(
                        &format!("{p}.pairs[{i}].position"),
                        format!(
                            "position {} is given twice; each reading needs its own position",
                            show(a.position)
                        ),
                    );
                }
                if a.position.nm() < 0 {
                    out.at(
                        &format!("{p}.pairs[{i}].position"),
                        "positions are measured from the pivot end and cannot be negative",
                    );
                }
            }
        }
    }
}

/// The verdict a rule gives for a deviation, U and tolerance (the decision of
/// [`crate::uncertainty::decide`], in the traveller's words).
pub fn decide(rule: DecisionRule, dev: Angle, u: Angle, tol: crate::units::Tolerance) -> Verdict {
    crate::uncertainty::decide(dev, &tol, u, rule.into())
        .verdict
        .into()
}

/// Does `verdict` follow from the stored numbers? Stored angles are rounded to 0.001", so a
/// deviation that sits on a limit is given that much room either way.
/// With a compound angle's other view (`other`: its own verdict), the verdict is the worse of
/// the two views'.
fn verdict_follows(
    j: &Judgement,
    tol: crate::units::Tolerance,
    other: Option<Verdict>,
) -> Option<Verdict> {
    follows(j.rule, j.deviation, j.u, tol, j.verdict, other)
}

fn follows(
    rule: DecisionRule,
    dev: Angle,
    u: Angle,
    tol: crate::units::Tolerance,
    verdict: Verdict,
    other: Option<Verdict>,
) -> Option<Verdict> {
    let room = Angle::from_arcsec(0.001);
    let at = |d: Angle| {
        let v = decide(rule, d, u, tol);
        other.map_or(v, |o| v.worse(o))
    };
    let want = at(dev);
    let ok = [dev - room, dev, dev + room]
        .into_iter()
        .any(|d| at(d) == verdict);
    if ok { None } else { Some(want) }
}

pub(super) fn judgement(f: &Feature, a: &Attempt, j: &Judgement, p: &str, out: &mut Out) {
    match &a.sweep {
        Some(s) if s.complete() => {}
        _ => out.at(p, "there is a verdict but the sweep is not complete; finish the readings or remove the verdict"),
    }
    let slack = ANGLE_SLACK_ARCSEC;
    if j.fit.slope.is_finite() {
        let want = Angle::from_rad(j.fit.slope.atan());
        if (want.arcsec() - j.residual.arcsec()).abs() > slack {
            out.at(
                &format!("{p}.residual"),
                format!(
                    "residual {} is not atan(slope) = {}; recompute it",
                    j.residual.arcsec_signed(2),
                    want.arcsec_signed(2)
                ),
            );
        }
    } else {
        out.at(
            &format!("{p}.fit.slope"),
            "the slope is not a number; re-fit the readings",
        );
    }
    if let (Some(s), Some(nom)) = (&a.stack, f.setting_angle()) {
        let want = (s.achieved - nom) - j.residual;
        if (want.arcsec() - j.deviation.arcsec()).abs() > slack {
            out.at(
                &format!("{p}.deviation"),
                format!(
                    "deviation {} is not (achieved − nominal) − residual = {}; recompute it",
                    j.deviation.arcsec_signed(2),
                    want.arcsec_signed(2)
                ),
            );
        }
    }
    if j.u.arcsec() < 0.0 || !j.u.arcsec().is_finite() {
        out.at(&format!("{p}.U"), "U must be zero or more");
    }
    budget_sum(&j.budget, j.u, p, out);
    if let Some(v) = &j.view_b {
        other_view(f, a, v, j.rule, &format!("{p}.view_b"), out);
    }
    let other = j.view_b.as_ref().map(|v| v.verdict);
    if let Some(want) = verdict_follows(j, f.tolerance, other) {
        out.at(&format!("{p}.verdict"), format!("verdict {} does not follow from deviation {}, U {:.1}\" and tolerance {} under the {} rule (that gives {}); correct it", j.verdict.label(), j.deviation.arcsec_signed(1), j.u.arcsec(), f.tolerance, step_rule(j.rule), want.label()));
    }
    if let Some(d) = &j.doubt_decision
        && j.verdict != Verdict::Doubt
    {
        out.at(
            &format!("{p}.doubt_decision"),
            format!(
                "a lead's decision is recorded but the verdict is {}, not DOUBT; remove it",
                d.verdict.label()
            ),
        );
    }
}

fn step_rule(r: DecisionRule) -> &'static str {
    match r {
        DecisionRule::Simple => "simple",
        DecisionRule::Guarded => "guarded",
    }
}

/// U must be 2 × the budget's lines combined.
fn budget_sum(budget: &[BudgetLine], u: Angle, p: &str, out: &mut Out) {
    if budget.is_empty() {
        return;
    }
    let slack = ANGLE_SLACK_ARCSEC;
    let uc = budget
        .iter()
        .map(|b| b.u.arcsec().powi(2))
        .sum::<f64>()
        .sqrt();
    if (2.0 * uc - u.arcsec()).abs() > 2.0 * slack + 0.001 * u.arcsec() {
        out.at(
            &format!("{p}.U"),
            format!(
                "U {:.2}\" is not 2 × the budget's combined {:.2}\"; recompute it",
                u.arcsec(),
                uc
            ),
        );
    }
}

/// A compound angle's other view: its own sweep, its residual, its deviation against the view
/// slope the two plates level, U, and its own verdict.
fn other_view(
    f: &Feature,
    a: &Attempt,
    v: &ViewJudgement,
    rule: DecisionRule,
    p: &str,
    out: &mut Out,
) {
    let Some(c) = f.compound_angles() else {
        out.at(
            p,
            "a second view's verdict is only for compound angles; remove `view_b:` or set `kind: compound`",
        );
        return;
    };
    match &a.sweep_b {
        Some(s) if s.complete() => {}
        _ => out.at(p, "the other view has a verdict but its sweep (`sweep_b:`) is not complete; finish its readings or remove the verdict"),
    }
    let slack = ANGLE_SLACK_ARCSEC;
    let want = Angle::from_rad(v.fit.slope.atan());
    if !v.fit.slope.is_finite() || (want.arcsec() - v.residual.arcsec()).abs() > slack {
        out.at(
            &format!("{p}.residual"),
            format!(
                "residual {} is not atan(slope) = {}; recompute it",
                v.residual.arcsec_signed(2),
                want.arcsec_signed(2)
            ),
        );
    }
    if let (Some(n), Some(o)) = (&a.stack, &a.stack_b) {
        let (_, levelled) = Compound::views_levelled(n.achieved, o.achieved);
        let want = (levelled - c.views().1) - v.residual;
        if (want.arcsec() - v.deviation.arcsec()).abs() > slack {
            out.at(
                &format!("{p}.deviation"),
                format!(
                    "deviation {} is not (the view the plates level − its nominal) − residual = {}; recompute it",
                    v.deviation.arcsec_signed(2),
                    want.arcsec_signed(2)
                ),
            );
        }
    } else {
        out.at(p, "the other view is judged but the attempt lacks a plate's stack (`stack:` and `stack_b:`)");
    }
    if v.u.arcsec() < 0.0 || !v.u.arcsec().is_finite() {
        out.at(&format!("{p}.U"), "U must be zero or more");
    }
    budget_sum(&v.budget, v.u, p, out);
    if let Some(want) = follows(rule, v.deviation, v.u, f.tolerance, v.verdict, None) {
        out.at(&format!("{p}.verdict"), format!("the other view's verdict {} does not follow from its deviation {}, U {:.1}\" and tolerance {} (that gives {}); correct it", v.verdict.label(), v.deviation.arcsec_signed(1), v.u.arcsec(), f.tolerance, want.label()));
    }
}
