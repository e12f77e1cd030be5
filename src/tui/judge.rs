//! The verdict of an attempt from what was built and read: the fit, residual, deviation, the
//! uncertainty budget, the decision and (on a fail) the stack change. A compound angle is judged
//! in each view (see [`super::judge_views`]); the attempt passes only when both views pass. A
//! narrow door to the computation modules.

use super::judge_views::{judge_other_view, plate_corrections};
use super::rank::{geometry, grade_of};
use super::shop_view::ShopSettings;
use crate::geometry::SineFixture;
use crate::sweep::{self, SweepFit};
use crate::traveller::{
    Attempt, BlockSetSnapshot, BudgetLine, Correction, DecisionRule, Feature, Fit, FixtureSnapshot,
    Judgement, Stamp, Sweep, Verdict,
};
use crate::uncertainty::{self, Contribution, DEFAULT_JOINT_NM, Rule, Setup};
use crate::units::{Angle, Length};

/// The sweep of the model as the fitting code takes it.
pub fn to_sweep(s: &Sweep) -> Result<sweep::Sweep, String> {
    s.to_fit_input()
}

/// The fitted line of the readings so far, when there are two or more.
pub fn fit_so_far(s: &Sweep) -> Option<SweepFit> {
    s.fitted()
}

/// What the verdict needs besides the attempt.
pub struct JudgeInput<'a> {
    pub feature: &'a Feature,
    pub attempt: &'a Attempt,
    pub fixture: &'a FixtureSnapshot,
    pub set: &'a BlockSetSnapshot,
    /// The set's resolution (the step the corrected stack is rounded to).
    pub step: Length,
    pub settings: &'a ShopSettings,
}

impl JudgeInput<'_> {
    /// The decision rule as the uncertainty module names it.
    pub fn rule(&self) -> Rule {
        match self.settings.rule {
            DecisionRule::Simple => Rule::Simple,
            DecisionRule::Guarded => Rule::Guarded,
        }
    }
}

/// What sets an angle: the blocks of the stacks (graded) and the fixture's centre distance.
pub fn setting_contributions(blocks: Vec<Length>, i: &JudgeInput) -> Vec<Contribution> {
    let mut c = Vec::new();
    if let Some(grade) = grade_of(i.set)
        && !blocks.is_empty()
    {
        c.push(Contribution::Stack {
            blocks,
            grade,
            per_joint_nm: DEFAULT_JOINT_NM,
        });
    }
    if let Some(u) = i.fixture.centre_u {
        c.push(Contribution::CenterCalibration { u });
    }
    c
}

/// What the indicator adds: its resolution, and its repeatability (or the scatter of the
/// readings about the line when the shop has no figure).
pub fn indicator_contributions(
    w: &sweep::Sweep,
    sw: &Sweep,
    fit: &SweepFit,
    settings: &ShopSettings,
) -> Vec<Contribution> {
    let sxx = w.sxx_nm2();
    let resolution = sw.resolution.unwrap_or(settings.indicator_resolution);
    let mut c = vec![Contribution::IndicatorResolution {
        resolution,
        sxx_nm2: sxx,
    }];
    match (settings.indicator_repeatability, fit.angle_sd) {
        (Some(u_r), _) => c.push(Contribution::IndicatorRepeatability { u_r, sxx_nm2: sxx }),
        (None, Some(sd)) => c.push(Contribution::SweepScatter { angle_sd: sd }),
        (None, None) => {}
    }
    c
}

/// The lines of a budget for `contributions` at `angle` on `geo`, each times `scale`.
pub fn budget_lines(
    geo: &SineFixture,
    angle: Angle,
    contributions: &[Contribution],
    scale: f64,
    note: &str,
) -> Result<Vec<BudgetLine>, String> {
    if contributions.is_empty() {
        return Ok(Vec::new());
    }
    let b = uncertainty::budget(
        &Setup {
            fixture: *geo,
            angle,
        },
        contributions,
    )
    .map_err(|e| e.to_string())?;
    Ok(b.lines
        .iter()
        .map(|l| BudgetLine {
            source: l.source.clone(),
            u: Angle::from_arcsec(l.arcsec * scale),
            note: note.to_string(),
        })
        .collect())
}

/// U = k·√Σu² of a budget's lines.
pub fn expanded(lines: &[BudgetLine]) -> Angle {
    let uc = lines
        .iter()
        .map(|l| l.u.arcsec().powi(2))
        .sum::<f64>()
        .sqrt();
    Angle::from_arcsec(uncertainty::COVERAGE_K * uc)
}

/// The fitted line as the record keeps it.
pub fn fit_record(fit: &SweepFit) -> Fit {
    Fit {
        slope: fit.slope,
        intercept: fit.intercept,
        straightness: fit.straightness,
    }
}

/// Work out the judgement of an attempt, signed by `by` at `at`.
pub fn judge(i: &JudgeInput, by: &str, at: Stamp) -> Result<Judgement, String> {
    let nominal = i
        .feature
        .setting_angle()
        .ok_or("the feature has no angle to set; the plan file must give its nominal")?;
    let stack = i
        .attempt
        .stack
        .as_ref()
        .ok_or("no stack is recorded for this attempt; build the stack first")?;
    let sw = i
        .attempt
        .sweep
        .as_ref()
        .ok_or("no readings yet; enter at least two readings")?;
    let w = to_sweep(sw)?;
    let fit = w.fit().map_err(|e| e.to_string())?;
    let geo = geometry(i.fixture);
    let residual = fit.residual;
    let deviation = (stack.achieved - nominal) - residual;
    // the blocks that set the angle: both stacks when there is one under each roll
    let blocks: Vec<Length> = stack
        .blocks
        .iter()
        .chain(i.attempt.stack_pivot.iter().flat_map(|p| p.blocks.iter()))
        .map(|b| b.size)
        .collect();
    let mut contributions = setting_contributions(blocks, i);
    contributions.extend(indicator_contributions(&w, sw, &fit, i.settings));
    let budget = budget_lines(&geo, stack.achieved, &contributions, 1.0, "")?;
    let u = expanded(&budget);
    let rule = i.rule();
    let own: Verdict = uncertainty::decide(deviation, &i.feature.tolerance, u, rule)
        .verdict
        .into();
    let view_b = match i.feature.compound_angles() {
        Some(c) => Some(judge_other_view(i, c)?),
        None => None,
    };
    let verdict = view_b
        .as_ref()
        .map_or(own, |v| Verdict::worse(own, v.verdict));
    let mut view_b = view_b;
    let correction = if verdict == Verdict::Pass {
        None
    } else if let Some(v) = view_b.as_mut() {
        let (near, other) = plate_corrections(i, residual, v.residual)?;
        v.correction = Some(other);
        Some(near)
    } else {
        // the height that sets the angle: the difference when there are two stacks
        let height = i.attempt.setting_height().unwrap_or(stack.height);
        sweep::correction(&geo, height, residual, i.step)
            .ok()
            .map(|c| Correction {
                delta: c.delta_height,
                height: c.new_height,
            })
    };
    Ok(Judgement {
        fit: fit_record(&fit),
        residual,
        deviation,
        u,
        budget,
        rule: i.settings.rule,
        verdict,
        correction,
        doubt_decision: None,
        by: by.to_string(),
        at,
        view_b,
    })
}

/// Is the straightness along the sweep large against the tolerance? The sweep's one rule, so
/// the operator is warned of what the lead will see flagged.
pub fn straightness_doubtful(s: &Sweep, f: &Feature) -> bool {
    s.straightness_large(&f.tolerance)
}
