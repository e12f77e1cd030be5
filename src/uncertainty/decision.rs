//! The decision: pass, fail, or inside the doubt band, under a simple or a guarded rule.

use crate::units::{Angle, Tolerance};
use serde::{Deserialize, Serialize};
use std::fmt;
use std::str::FromStr;

/// How a measured deviation is judged against the tolerance (a shop setting).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Rule {
    /// Pass when the deviation is inside the tolerance; U is shown but not used.
    #[default]
    Simple,
    /// ISO 14253-1: pass only when the deviation is inside the tolerance reduced by U at each
    /// limit, fail only when it is outside the tolerance widened by U; between is doubt.
    Guarded,
}

impl FromStr for Rule {
    type Err = String;
    fn from_str(s: &str) -> Result<Self, String> {
        match s.trim().to_ascii_lowercase().as_str() {
            "simple" => Ok(Rule::Simple),
            "guarded" => Ok(Rule::Guarded),
            other => Err(format!(
                "'{other}' is not a decision rule; use simple or guarded"
            )),
        }
    }
}

impl fmt::Display for Rule {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Rule::Simple => "simple",
            Rule::Guarded => "guarded (ISO 14253-1)",
        })
    }
}

/// The outcome.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Verdict {
    Pass,
    Fail,
    /// Inside the doubt band: the lead must decide.
    Doubt,
}

impl Verdict {
    /// The word printed beside the result (never colour alone).
    pub fn words(self) -> &'static str {
        match self {
            Verdict::Pass => "pass",
            Verdict::Fail => "fail",
            Verdict::Doubt => "inside the doubt band (the lead decides)",
        }
    }
}

impl fmt::Display for Verdict {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.words())
    }
}

/// A decision and what it was made from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Decision {
    pub verdict: Verdict,
    pub rule: Rule,
    /// Measured deviation from nominal (signed).
    pub deviation: Angle,
    pub tolerance: Tolerance,
    /// Expanded uncertainty U (k = 2).
    pub expanded: Angle,
    /// The tolerance limit on the side the deviation falls.
    pub limit: Angle,
}

/// Judge `deviation` against `tolerance` with expanded uncertainty `expanded` under `rule`.
///
/// Simple: pass when −minus ≤ deviation ≤ plus. Guarded: pass when −minus + U ≤ deviation ≤
/// plus − U; fail when deviation > plus + U or deviation < −(minus + U); otherwise doubt. For a
/// deviation on one side this is |dev| + U ≤ limit to pass and |dev| − U > limit to fail; the
/// far limit matters only when the tolerance is narrower than 2U, or one-sided.
pub fn decide(deviation: Angle, tolerance: &Tolerance, expanded: Angle, rule: Rule) -> Decision {
    let d = deviation.deg();
    let u = expanded.deg().abs();
    let plus = tolerance.plus.deg().abs();
    let minus = tolerance.minus.deg().abs();
    // a hair of slack so a deviation printed equal to the limit is read as equal
    let eps = 1e-12;
    let verdict = match rule {
        Rule::Simple => {
            if tolerance.contains(deviation) {
                Verdict::Pass
            } else {
                Verdict::Fail
            }
        }
        Rule::Guarded => {
            if d - eps > plus + u || -d - eps > minus + u {
                Verdict::Fail
            } else if d + u <= plus + eps && -d + u <= minus + eps {
                Verdict::Pass
            } else {
                Verdict::Doubt
            }
        }
    };
    Decision {
        verdict,
        rule,
        deviation,
        tolerance: *tolerance,
        expanded: Angle::from_deg(u),
        limit: tolerance.limit_for(deviation),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn min(m: f64) -> Angle {
        Angle::from_deg(m / 60.0)
    }

    #[test]
    fn simple_rule_ignores_u() {
        // ISO 14253-1 allows a simple (shared-risk) rule by agreement; U still shown
        let t = Tolerance::symmetric(min(5.0));
        assert_eq!(
            decide(min(4.9), &t, min(1.0), Rule::Simple).verdict,
            Verdict::Pass
        );
        assert_eq!(
            decide(min(-5.0), &t, min(1.0), Rule::Simple).verdict,
            Verdict::Pass
        );
        assert_eq!(
            decide(min(5.1), &t, min(1.0), Rule::Simple).verdict,
            Verdict::Fail
        );
    }

    #[test]
    fn guarded_rule_has_a_doubt_band() {
        // ISO 14253-1 conformance/non-conformance zones: pass |d|+U ≤ T, fail |d|−U > T
        let t = Tolerance::symmetric(min(5.0));
        let u = min(1.0);
        assert_eq!(
            decide(min(4.0), &t, u, Rule::Guarded).verdict,
            Verdict::Pass
        );
        assert_eq!(
            decide(min(-4.0), &t, u, Rule::Guarded).verdict,
            Verdict::Pass
        );
        assert_eq!(
            decide(min(4.5), &t, u, Rule::Guarded).verdict,
            Verdict::Doubt
        );
        assert_eq!(
            decide(min(5.5), &t, u, Rule::Guarded).verdict,
            Verdict::Doubt
        );
        assert_eq!(
            decide(min(6.0), &t, u, Rule::Guarded).verdict,
            Verdict::Doubt
        );
        assert_eq!(
            decide(min(6.1), &t, u, Rule::Guarded).verdict,
            Verdict::Fail
        );
        assert_eq!(
            decide(min(-6.1), &t, u, Rule::Guarded).verdict,
            Verdict::Fail
        );
    }

    #[test]
    fn asymmetric_tolerance_uses_each_side() {
        let t = Tolerance {
            plus: min(2.0),
            minus: min(0.0),
        };
        let u = Angle::from_arcsec(10.0);
        assert_eq!(decide(min(1.0), &t, u, Rule::Simple).verdict, Verdict::Pass);
        assert_eq!(
            decide(min(-0.1), &t, u, Rule::Simple).verdict,
            Verdict::Fail
        );
        // 1' is 50" inside the plus limit but only 60" above the zero minus limit: pass
        assert_eq!(
            decide(min(1.0), &t, u, Rule::Guarded).verdict,
            Verdict::Pass
        );
        // 5" above zero: within U of the minus limit, so doubt
        let d = decide(Angle::from_arcsec(5.0), &t, u, Rule::Guarded);
        assert_eq!(d.verdict, Verdict::Doubt);
        assert_eq!(
            decide(Angle::from_arcsec(-11.0), &t, u, Rule::Guarded).verdict,
            Verdict::Fail
        );
        assert_eq!(decide(min(1.0), &t, u, Rule::Guarded).limit, min(2.0));
    }
}
