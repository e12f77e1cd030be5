//! A sweep of the record as the fitting code takes it, the fitted line, and the one rule for a
//! straightness large against the tolerance ([`crate::sweep::SweepFit::straightness_doubtful`]),
//! so the screens, the review and the reports flag the same sweeps.

use super::model::{Sweep, SweepMode};
use crate::sweep::{self, SweepFit};
use crate::units::Tolerance;

impl Sweep {
    /// The readings with their positions, as the fit takes them.
    pub fn to_fit_input(&self) -> Result<sweep::Sweep, String> {
        let r = match self.mode {
            SweepMode::Spaced => {
                let travel = self
                    .travel
                    .ok_or("the travel is not given yet; type it in the travel field")?;
                sweep::Sweep::even(travel, self.readings.clone())
            }
            SweepMode::Pairs => {
                sweep::Sweep::at(self.pairs.iter().map(|p| (p.position, p.reading)).collect())
            }
        };
        r.map_err(|e| e.to_string())
    }

    /// The fitted line of the readings so far, when there are two or more.
    pub fn fitted(&self) -> Option<SweepFit> {
        self.to_fit_input().ok().and_then(|w| w.fit().ok())
    }

    /// Is the straightness along this sweep large against `tolerance`?
    pub fn straightness_large(&self, tolerance: &Tolerance) -> bool {
        self.fitted()
            .is_some_and(|f| f.straightness_doubtful(tolerance))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::{Angle, Length};

    #[test]
    fn a_quarter_of_the_tolerance_is_the_limit() {
        // a bump of 0.0010 in in the middle of 4 in: straightness 0.0010 in about the line,
        // atan(0.001/4) = 51.6" (direct computation); a quarter of ±2' is 30", of ±4' is 60"
        let s = Sweep {
            mode: SweepMode::Spaced,
            travel: Some(Length::inches(4.0)),
            points: Some(3),
            readings: vec![Length::ZERO, Length::inches(0.001), Length::ZERO],
            pairs: Vec::new(),
            resolution: None,
            entered: None,
        };
        let tol = |m: f64| Tolerance::symmetric(Angle::from_deg(m / 60.0));
        assert!(s.straightness_large(&tol(2.0)));
        assert!(!s.straightness_large(&tol(4.0)));
    }
}
