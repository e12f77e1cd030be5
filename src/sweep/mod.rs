//! Dial-test-indicator sweeps: readings along a surface set on a sine fixture, the least-squares
//! line r = a + m·x through them, the residual angle δ = atan(m), the straightness about the
//! line, and the stack correction ΔH = C·(sin(θ − δ) − sin θ) that levels the surface.
//!
//! Positions run from the pivot end toward the raised end; a plus reading means the surface is
//! higher there (plunger pushed in). Positions and readings are exact [`Length`]s; the fit itself
//! is made in floating point nanometres by [`fit::fit_line`].

pub mod fit;

mod correction;

pub use correction::{Correction, correction, correction_for_angle, default_step};
pub use fit::{FitError, LineFit, OriginFit, fit_line, fit_through_origin};

use crate::geometry::GeometryError;
use crate::units::{Angle, Length, Tolerance, Unit};
use thiserror::Error;

/// Straightness is large against the tolerance when, as an angle over the travel, it passes
/// this share of the tightest tolerance side. Common practice (no source).
pub const STRAIGHTNESS_SHARE: f64 = 0.25;

/// What is wrong with a sweep as given.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum SweepError {
    #[error(transparent)]
    Fit(#[from] FitError),
    #[error(
        "the travel is zero, so the readings have no length to rise over; give the distance between the first and last reading, e.g. --travel 5in"
    )]
    ZeroTravel,
    #[error(
        "the travel {0} is negative; give the distance from the first reading to the last as a positive length, e.g. --travel 5in"
    )]
    NegativeTravel(String),
    #[error(
        "levelling this surface needs the fixture at {0}, outside 0° to 90°; check the sign of the readings (plus: the surface is higher), or turn the work end for end and sweep again"
    )]
    CorrectionOutOfRange(String),
    #[error(transparent)]
    Geometry(#[from] GeometryError),
}

/// Where the readings were taken.
#[derive(Debug, Clone, PartialEq)]
pub enum Positions {
    /// Evenly spaced: the first reading at 0, the last at `travel`.
    Even { travel: Length },
    /// One position for each reading, from the pivot end.
    At(Vec<Length>),
}

/// Readings along a surface, with where each was taken.
#[derive(Debug, Clone, PartialEq)]
pub struct Sweep {
    positions: Positions,
    readings: Vec<Length>,
}

/// Which way the swept surface runs.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rise {
    /// Higher toward the raised end (δ > 0): the setup is steeper than the surface needs.
    TowardRaisedEnd,
    /// Higher toward the pivot end (δ < 0).
    TowardPivotEnd,
    /// Level to within 0.05″.
    Level,
}

impl Rise {
    /// In words, for the operator.
    pub fn words(self) -> &'static str {
        match self {
            Rise::TowardRaisedEnd => "the surface rises toward the raised end",
            Rise::TowardPivotEnd => "the surface rises toward the pivot end",
            Rise::Level => "the surface is level along the sweep",
        }
    }
    /// A short key for files and JSON: `raised_end`, `pivot_end` or `level`.
    pub fn key(self) -> &'static str {
        match self {
            Rise::TowardRaisedEnd => "raised_end",
            Rise::TowardPivotEnd => "pivot_end",
            Rise::Level => "level",
        }
    }
}

/// What a sweep says about the surface.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepFit {
    /// Number of readings.
    pub readings: usize,
    /// From the first position to the last (largest − smallest).
    pub travel: Length,
    /// Rise per unit length (dimensionless).
    pub slope: f64,
    /// δ = atan(slope), signed: plus when the surface rises toward the raised end.
    pub residual: Angle,
    /// The fitted reading at position zero.
    pub intercept: Length,
    /// max − min of the readings about the fitted line.
    pub straightness: Length,
    /// Each reading less the line there, in the order given (nearest nanometre).
    pub residuals: Vec<Length>,
    /// Standard deviation of δ from the scatter about the line (three readings or more).
    pub angle_sd: Option<Angle>,
    /// The line in nanometres, with its statistics.
    pub line: LineFit,
}

impl SweepFit {
    /// Which way the surface rises, in words or as a key.
    pub fn rise(&self) -> Rise {
        if self.residual.arcsec().abs() < 0.05 {
            Rise::Level
        } else if self.slope > 0.0 {
            Rise::TowardRaisedEnd
        } else {
            Rise::TowardPivotEnd
        }
    }
    /// The straightness as an angle over the travel: atan(straightness / travel).
    pub fn straightness_angle(&self) -> Angle {
        if self.travel.nm() <= 0 {
            return Angle::from_deg(0.0);
        }
        Angle::from_rad((self.straightness.nm() as f64 / self.travel.nm() as f64).atan())
    }
    /// True when the straightness over the travel is more than [`STRAIGHTNESS_SHARE`] of the
    /// tightest side of `tolerance`: a curved or dirty surface makes the residual angle
    /// doubtful. The one rule for this flag: the screens, the review and the reports use it.
    pub fn straightness_doubtful(&self, tolerance: &Tolerance) -> bool {
        self.straightness_angle().deg() > STRAIGHTNESS_SHARE * tolerance.tightest().deg()
    }
    /// The fitted line's reading at `position`.
    pub fn line_at(&self, position: Length) -> Length {
        Length::from_nm(self.line.at(position.nm() as f64).round() as i64)
    }
}

/// The angle of a feature that should sit level on the setup: the fixture's achieved angle less
/// the residual, θ_achieved − δ.
pub fn feature_angle(achieved: Angle, residual: Angle) -> Angle {
    achieved - residual
}

/// The feature's deviation from nominal: (θ_achieved − θ_nominal) − δ.
pub fn deviation(achieved: Angle, nominal: Angle, residual: Angle) -> Angle {
    (achieved - nominal) - residual
}

impl Sweep {
    /// Readings evenly spaced over `travel`: the first at 0, the last at `travel`.
    pub fn even(travel: Length, readings: Vec<Length>) -> Result<Self, SweepError> {
        if readings.len() < 2 {
            return Err(FitError::TooFew(readings.len()).into());
        }
        if travel.nm() == 0 {
            return Err(SweepError::ZeroTravel);
        }
        if travel.nm() < 0 {
            return Err(SweepError::NegativeTravel(travel.show(Unit::In)));
        }
        Ok(Sweep {
            positions: Positions::Even { travel },
            readings,
        })
    }

    /// Readings at the positions given, as (position, reading) pairs.
    pub fn at(pairs: Vec<(Length, Length)>) -> Result<Self, SweepError> {
        if pairs.len() < 2 {
            return Err(FitError::TooFew(pairs.len()).into());
        }
        let first = pairs[0].0;
        if pairs.iter().all(|p| p.0 == first) {
            return Err(FitError::OnePosition.into());
        }
        let (positions, readings) = pairs.into_iter().unzip();
        Ok(Sweep {
            positions: Positions::At(positions),
            readings,
        })
    }

    /// The readings, in the order given.
    pub fn readings(&self) -> &[Length] {
        &self.readings
    }

    /// How the positions were given.
    pub fn layout(&self) -> &Positions {
        &self.positions
    }

    /// The positions in nanometres (exact for pairs; i·travel/(n − 1) for even spacing).
    pub fn positions_nm(&self) -> Vec<f64> {
        match &self.positions {
            Positions::Even { travel } => {
                let last = (self.readings.len() - 1).max(1) as f64;
                (0..self.readings.len())
                    .map(|i| travel.nm() as f64 * i as f64 / last)
                    .collect()
            }
            Positions::At(p) => p.iter().map(|l| l.nm() as f64).collect(),
        }
    }

    /// The positions, to the nearest nanometre.
    pub fn positions(&self) -> Vec<Length> {
        self.positions_nm()
            .into_iter()
            .map(|v| Length::from_nm(v.round() as i64))
            .collect()
    }

    /// Largest position less smallest.
    pub fn travel(&self) -> Length {
        match &self.positions {
            Positions::Even { travel } => *travel,
            Positions::At(p) => {
                let max = p.iter().max().copied().unwrap_or_default();
                let min = p.iter().min().copied().unwrap_or_default();
                max - min
            }
        }
    }

    /// Σ(x − x̄)² of the positions in nm², which turns a reading's standard uncertainty into
    /// the slope's: u(m) = u(r)/√Sxx (two readings over a travel L: √2·u(r)/L).
    pub fn sxx_nm2(&self) -> f64 {
        let x = self.positions_nm();
        let n = x.len().max(1) as f64;
        let m = x.iter().sum::<f64>() / n;
        x.iter().map(|v| (v - m) * (v - m)).sum()
    }

    /// Fit the line and work out the residual angle and the straightness.
    pub fn fit(&self) -> Result<SweepFit, SweepError> {
        let x = self.positions_nm();
        let y: Vec<f64> = self.readings.iter().map(|r| r.nm() as f64).collect();
        let line = fit_line(&x, &y)?;
        let nm = |v: f64| Length::from_nm(v.round() as i64);
        Ok(SweepFit {
            readings: self.readings.len(),
            travel: self.travel(),
            slope: line.slope,
            residual: Angle::from_rad(line.slope.atan()),
            intercept: nm(line.intercept),
            straightness: nm(line.straightness()),
            residuals: line.residuals.iter().map(|r| nm(*r)).collect(),
            angle_sd: line
                .slope_sd
                .map(|s| Angle::from_rad(s / (1.0 + line.slope * line.slope))),
            line,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn inch(v: &str) -> Length {
        Length::parse(v, Unit::In).unwrap_or_default()
    }

    #[test]
    fn one_and_a_half_tenths_over_five_inches() {
        // indicator-slope.csv row 0.0015,5,in → 61.87944" (mpmath); common practice (no source):
        // about one arc-minute
        let s = Sweep::even(inch("5"), vec![inch("0"), inch("0.0015")]);
        let f = s.and_then(|s| s.fit());
        let f = f.as_ref().ok();
        assert!(f.is_some_and(|f| (f.residual.arcsec() - 61.87944).abs() < 5e-6));
        assert_eq!(f.map(|f| f.rise()), Some(Rise::TowardRaisedEnd));
    }

    #[test]
    fn even_and_paired_positions_agree() {
        let r = vec![inch("-0.0005"), inch("0"), inch("0.0005")];
        let even = Sweep::even(inch("4"), r.clone()).and_then(|s| s.fit());
        let pairs = vec![(inch("0"), r[0]), (inch("2"), r[1]), (inch("4"), r[2])];
        let at = Sweep::at(pairs).and_then(|s| s.fit());
        assert_eq!(
            even.map(|f| f.residual.arcsec().to_bits()),
            at.map(|f| f.residual.arcsec().to_bits())
        );
    }

    #[test]
    fn straightness_is_the_spread_about_the_line() {
        // a bowed surface: 0, +0.0004, 0 over 4 in; line is flat at 0.000267
        let s = Sweep::even(inch("4"), vec![inch("0"), inch("0.0004"), inch("0")]);
        let f = s.and_then(|s| s.fit());
        assert_eq!(
            f.as_ref().map(|f| f.straightness.show_fine(Unit::In)),
            Ok("0.00040 in".to_string())
        );
        assert_eq!(f.map(|f| f.rise()), Ok(Rise::Level));
    }

    #[test]
    fn deviation_takes_off_the_residual() {
        // DOMAIN.md: deviation = (θ_achieved − θ_nominal) − δ
        let d = deviation(
            Angle::from_deg(30.0) + Angle::from_arcsec(3.0),
            Angle::from_deg(30.0),
            Angle::from_arcsec(61.0),
        );
        assert!((d.arcsec() + 58.0).abs() < 1e-9);
        let f = feature_angle(Angle::from_deg(30.0), Angle::from_arcsec(36.0));
        assert!((f.deg() - 29.99).abs() < 1e-12);
    }

    #[test]
    fn refuses_short_zero_and_single_position_sweeps() {
        let one = Sweep::even(inch("5"), vec![inch("0")]).err();
        assert_eq!(one, Some(SweepError::Fit(FitError::TooFew(1))));
        let zero = Sweep::even(inch("0"), vec![inch("0"), inch("0.001")]).err();
        assert_eq!(zero, Some(SweepError::ZeroTravel));
        let same = Sweep::at(vec![(inch("1"), inch("0")), (inch("1"), inch("0.001"))]).err();
        assert_eq!(same, Some(SweepError::Fit(FitError::OnePosition)));
        for e in [one, zero, same].into_iter().flatten() {
            assert!(e.to_string().contains("e.g."), "{e}");
        }
    }
}
