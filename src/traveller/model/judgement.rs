//! The verdict of an attempt: the fitted line, the uncertainty budget, the decision, the
//! suggested stack change and the lead's word on a doubt; for a compound angle, the second
//! view judged on its own.

use super::Stamp;
use crate::units::{Angle, Length};
use serde::{Deserialize, Serialize};

/// The fitted line r = intercept + slope·x.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Fit {
    /// Rise per unit of travel (dimensionless).
    pub slope: f64,
    pub intercept: Length,
    /// Max − min of the readings less the line.
    pub straightness: Length,
}

/// One line of the uncertainty budget (a standard uncertainty, in angle).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BudgetLine {
    pub source: String,
    pub u: Angle,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub note: String,
}

/// How a verdict is reached.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum DecisionRule {
    /// Pass when |deviation| ≤ tolerance.
    #[default]
    Simple,
    /// Pass when |deviation| + U ≤ tolerance; fail when |deviation| − U > tolerance.
    Guarded,
}

/// The outcome of an attempt.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    Pass,
    Fail,
    /// Inside the doubt band: the lead decides.
    Doubt,
}

/// The suggested change to the stack after a failed attempt.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Correction {
    /// Change in stack height (ΔH = C·(sin(θ − δ) − sin θ)).
    pub delta: Length,
    /// New height to build.
    pub height: Length,
}

/// The lead's decision on a verdict inside the doubt band.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DoubtDecision {
    pub verdict: Verdict,
    pub reason: String,
    pub by: String,
    pub at: Stamp,
}

/// Residual, deviation, uncertainty and verdict of an attempt.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Judgement {
    pub fit: Fit,
    /// atan(slope), positive when the surface rises toward the raised end.
    pub residual: Angle,
    /// (achieved − nominal) − residual.
    pub deviation: Angle,
    /// Expanded uncertainty (k = 2).
    #[serde(rename = "U")]
    pub u: Angle,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub budget: Vec<BudgetLine>,
    #[serde(default)]
    pub rule: DecisionRule,
    pub verdict: Verdict,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub correction: Option<Correction>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub doubt_decision: Option<DoubtDecision>,
    pub by: String,
    pub at: Stamp,
    /// Compound angles: the other plate's view (B when the near plate is A), swept and judged
    /// on its own. The numbers above are then the near plate's view, and `verdict` (with the
    /// correction and any lead's decision) is the attempt's over both views: a pass only when
    /// both views pass, else the worse of the two.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub view_b: Option<ViewJudgement>,
}

/// One view of a compound angle judged on its own (see [`Judgement::view_b`]).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ViewJudgement {
    pub fit: Fit,
    /// atan(slope) of this view's sweep.
    pub residual: Angle,
    /// (view slope the plates level − the view's nominal) − residual.
    pub deviation: Angle,
    /// Expanded uncertainty (k = 2) of this view's slope.
    #[serde(rename = "U")]
    pub u: Angle,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub budget: Vec<BudgetLine>,
    /// This view's own verdict.
    pub verdict: Verdict,
    /// The change to the other plate's stack (`stack_b`) that levels this view.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub correction: Option<Correction>,
}
