//! The verdict of an attempt from what was built and read: the fit, residual, deviation, the
//! uncertainty budget, the decision and (on a fail) the stack change. A narrow door to the
//! computation modules.

use super::rank::{geometry, grade_of};
use super::shop_view::ShopSettings;
use crate::sweep::{self, SweepFit};
use crate::traveller::{
    Attempt, BlockSetSnapshot, BudgetLine, Correction, DecisionRule, Feature, Fit, FixtureSnapshot,
    Judgement, Stamp, Sweep, SweepMode, Verdict,
};
use crate::uncertainty::{self, Contribution, DEFAULT_JOINT_NM, Rule, Setup};
use crate::units::{Angle, Length};

/// The sweep of the model as the fitting code takes it.
pub fn to_sweep(s: &Sweep) -> Result<sweep::Sweep, String> {
    let r = match s.mode {
        SweepMode::Spaced => {
            let travel = s
                .travel
                .ok_or("the travel is not given yet; type it in the travel field")?;
            sweep::Sweep::even(travel, s.readings.clone())
        }
        SweepMode::Pairs => {
            sweep::Sweep::at(s.pairs.iter().map(|p| (p.position, p.reading)).collect())
        }
    };
    r.map_err(|e| e.to_string())
}

/// The fitted line of the readings so far, when there are two or more.
pub fn fit_so_far(s: &Sweep) -> Option<SweepFit> {
    to_sweep(s).ok().and_then(|w| w.fit().ok())
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

    let mut contributions = Vec::new();
    if let Some(grade) = grade_of(i.set) {
        contributions.push(Contribution::Stack {
            blocks: stack.blocks.iter().map(|b| b.size).collect(),
            grade,
            per_joint_nm: DEFAULT_JOINT_NM,
        });
    }
    if let Some(u) = i.fixture.centre_u {
        contributions.push(Contribution::CenterCalibration { u });
    }
    let sxx = w.sxx_nm2();
    let resolution = sw.resolution.unwrap_or(i.settings.indicator_resolution);
    contributions.push(Contribution::IndicatorResolution {
        resolution,
        sxx_nm2: sxx,
    });
    match (i.settings.indicator_repeatability, fit.angle_sd) {
        (Some(u_r), _) => {
            contributions.push(Contribution::IndicatorRepeatability { u_r, sxx_nm2: sxx })
        }
        (None, Some(sd)) => contributions.push(Contribution::SweepScatter { angle_sd: sd }),
        (None, None) => {}
    }
    let b = uncertainty::budget(
        &Setup {
            fixture: geo,
            angle: stack.achieved,
        },
        &contributions,
    )
    .map_err(|e| e.to_string())?;
    let rule = match i.settings.rule {
        DecisionRule::Simple => Rule::Simple,
        DecisionRule::Guarded => Rule::Guarded,
    };
    let d = uncertainty::decide(deviation, &i.feature.tolerance, b.expanded, rule);
    let verdict = match d.verdict {
        uncertainty::Verdict::Pass => Verdict::Pass,
        uncertainty::Verdict::Fail => Verdict::Fail,
        uncertainty::Verdict::Doubt => Verdict::Doubt,
    };
    let correction = if verdict == Verdict::Pass {
        None
    } else {
        sweep::correction(&geo, stack.height, residual, i.step)
            .ok()
            .map(|c| Correction {
                delta: c.delta_height,
                height: c.new_height,
            })
    };
    Ok(Judgement {
        fit: Fit {
            slope: fit.slope,
            intercept: fit.intercept,
            straightness: fit.straightness,
        },
        residual,
        deviation,
        u: b.expanded,
        budget: b
            .lines
            .iter()
            .map(|l| BudgetLine {
                source: l.source.clone(),
                u: Angle::from_arcsec(l.arcsec),
                note: String::new(),
            })
            .collect(),
        rule: i.settings.rule,
        verdict,
        correction,
        doubt_decision: None,
        by: by.to_string(),
        at,
    })
}

/// Is the straightness along the sweep large against the tolerance? The same rule as the
/// review's flag (`report::STRAIGHTNESS_SHARE` of the tightest side), so the operator is warned
/// of what the lead will see flagged.
pub fn straightness_doubtful(s: &Sweep, f: &Feature) -> bool {
    fit_so_far(s).is_some_and(|fit| {
        fit.straightness_angle().arcsec()
            > crate::traveller::report::STRAIGHTNESS_SHARE * f.tolerance.tightest().arcsec()
    })
}
