//! Least-squares straight lines in floating point: y = a + m·x, and y = m·x through the origin.
//!
//! The line fit centres x and y on their means before forming the sums of squares, so readings a
//! long way from zero (or positions far from the origin) lose no digits to cancellation.

use thiserror::Error;

/// Why a line cannot be fitted to the points given.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum FitError {
    #[error(
        "a sweep needs at least two readings, {0} given; type one reading at each end of the travel, e.g. --travel 5in 0 0.0015"
    )]
    TooFew(usize),
    #[error(
        "{positions} positions but {readings} readings; give one reading for each position, e.g. --at 0=0 --at 5=0.0015"
    )]
    Mismatch { positions: usize, readings: usize },
    #[error(
        "every reading was taken at the same position, so no slope can be found; spread the readings along the surface, e.g. --at 0=0 --at 5=0.0015"
    )]
    OnePosition,
    #[error(
        "every position is at zero, so a line through the origin has no slope; measure the positions from the pivot end"
    )]
    AllAtOrigin,
    #[error("a position or reading is not a finite number; check what was typed")]
    NotFinite,
}

/// A fitted line y = a + m·x with the usual statistics.
#[derive(Debug, Clone, PartialEq)]
pub struct LineFit {
    /// Number of points.
    pub n: usize,
    /// Intercept a (y at x = 0).
    pub intercept: f64,
    /// Slope m.
    pub slope: f64,
    /// Mean of x (the fit is made about this point).
    pub mean_x: f64,
    /// Mean of y.
    pub mean_y: f64,
    /// Σ(x − x̄)².
    pub sxx: f64,
    /// Residual sum of squares Σ(y − a − m·x)².
    pub ss_residual: f64,
    /// Regression sum of squares m²·Sxx.
    pub ss_regression: f64,
    /// Residual standard deviation √(SSres/(n − 2)); `None` with two points (no degrees left).
    pub residual_sd: Option<f64>,
    /// Standard deviation of the slope s/√Sxx; `None` with two points.
    pub slope_sd: Option<f64>,
    /// Standard deviation of the intercept s·√(1/n + x̄²/Sxx); `None` with two points.
    pub intercept_sd: Option<f64>,
    /// R² = SSreg/(SSreg + SSres) (centred); 1 when every y is equal and the line is exact.
    pub r_squared: f64,
    /// y − (a + m·x) for each point, in the order given.
    pub residuals: Vec<f64>,
}

impl LineFit {
    /// max − min of the residuals: the straightness about the fitted line.
    pub fn straightness(&self) -> f64 {
        spread(&self.residuals)
    }
    /// The line's value at `x`.
    pub fn at(&self, x: f64) -> f64 {
        self.mean_y + self.slope * (x - self.mean_x)
    }
}

/// A fitted line y = m·x through the origin.
#[derive(Debug, Clone, PartialEq)]
pub struct OriginFit {
    /// Number of points.
    pub n: usize,
    /// Slope m = Σxy/Σx².
    pub slope: f64,
    /// Residual sum of squares.
    pub ss_residual: f64,
    /// Regression sum of squares m²·Σx².
    pub ss_regression: f64,
    /// Residual standard deviation √(SSres/(n − 1)); `None` with one point.
    pub residual_sd: Option<f64>,
    /// Standard deviation of the slope s/√Σx²; `None` with one point.
    pub slope_sd: Option<f64>,
    /// The uncentred R² = 1 − SSres/Σy² (the usual one for a model without intercept).
    pub r_squared: f64,
    /// y − m·x for each point.
    pub residuals: Vec<f64>,
}

fn check(x: &[f64], y: &[f64], least: usize) -> Result<(), FitError> {
    if x.len() != y.len() {
        return Err(FitError::Mismatch {
            positions: x.len(),
            readings: y.len(),
        });
    }
    if x.len() < least {
        return Err(FitError::TooFew(x.len()));
    }
    if x.iter().chain(y).any(|v| !v.is_finite()) {
        return Err(FitError::NotFinite);
    }
    Ok(())
}

/// Mean by a two-pass sum (the second pass corrects the first's rounding).
fn mean(v: &[f64]) -> f64 {
    let n = v.len() as f64;
    let m = v.iter().sum::<f64>() / n;
    m + v.iter().map(|x| x - m).sum::<f64>() / n
}

/// max − min of a list (0 for an empty one).
pub fn spread(v: &[f64]) -> f64 {
    let max = v.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let min = v.iter().copied().fold(f64::INFINITY, f64::min);
    if v.is_empty() { 0.0 } else { max - min }
}

/// Fit y = a + m·x by least squares, x centred on its mean first.
pub fn fit_line(x: &[f64], y: &[f64]) -> Result<LineFit, FitError> {
    check(x, y, 2)?;
    let n = x.len();
    let mx = mean(x);
    let my = mean(y);
    let (mut sxx, mut sxy) = (0.0, 0.0);
    for (xi, yi) in x.iter().zip(y) {
        let dx = xi - mx;
        sxx += dx * dx;
        sxy += dx * (yi - my);
    }
    // every x equal (to within the rounding of the mean): no slope
    let scale = x.iter().fold(0.0f64, |a, v| a.max(v.abs()));
    if sxx <= (scale * f64::EPSILON).powi(2) * n as f64 * 16.0 {
        return Err(FitError::OnePosition);
    }
    let slope = sxy / sxx;
    let intercept = my - slope * mx;
    let residuals: Vec<f64> = x
        .iter()
        .zip(y)
        .map(|(xi, yi)| (yi - my) - slope * (xi - mx))
        .collect();
    let ss_residual: f64 = residuals.iter().map(|r| r * r).sum();
    let ss_regression = slope * slope * sxx;
    let dof = n - 2;
    let residual_sd = (dof > 0).then(|| (ss_residual / dof as f64).sqrt());
    let slope_sd = residual_sd.map(|s| s / sxx.sqrt());
    let intercept_sd = residual_sd.map(|s| s * (1.0 / n as f64 + mx * mx / sxx).sqrt());
    let total = ss_regression + ss_residual;
    let r_squared = if total > 0.0 {
        ss_regression / total
    } else {
        1.0
    };
    Ok(LineFit {
        n,
        intercept,
        slope,
        mean_x: mx,
        mean_y: my,
        sxx,
        ss_residual,
        ss_regression,
        residual_sd,
        slope_sd,
        intercept_sd,
        r_squared,
        residuals,
    })
}

/// Fit y = m·x through the origin by least squares.
pub fn fit_through_origin(x: &[f64], y: &[f64]) -> Result<OriginFit, FitError> {
    check(x, y, 1)?;
    let n = x.len();
    let sxx: f64 = x.iter().map(|v| v * v).sum();
    if sxx == 0.0 {
        return Err(FitError::AllAtOrigin);
    }
    let sxy: f64 = x.iter().zip(y).map(|(a, b)| a * b).sum();
    let syy: f64 = y.iter().map(|v| v * v).sum();
    let slope = sxy / sxx;
    let residuals: Vec<f64> = x.iter().zip(y).map(|(a, b)| b - slope * a).collect();
    let ss_residual: f64 = residuals.iter().map(|r| r * r).sum();
    let ss_regression = slope * slope * sxx;
    let dof = n - 1;
    let residual_sd = (dof > 0).then(|| (ss_residual / dof as f64).sqrt());
    let slope_sd = residual_sd.map(|s| s / sxx.sqrt());
    let r_squared = if syy > 0.0 {
        1.0 - ss_residual / syy
    } else {
        1.0
    };
    Ok(OriginFit {
        n,
        slope,
        ss_residual,
        ss_regression,
        residual_sd,
        slope_sd,
        r_squared,
        residuals,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn two_points_give_the_chord() {
        let f = fit_line(&[0.0, 5.0], &[0.0, 0.0015]).map(|f| f.slope);
        assert_eq!(f.map(|m| (m - 0.0003).abs() < 1e-18), Ok(true));
    }

    #[test]
    fn refuses_what_cannot_be_fitted() {
        assert_eq!(fit_line(&[1.0], &[1.0]).err(), Some(FitError::TooFew(1)));
        assert_eq!(
            fit_line(&[2.0, 2.0, 2.0], &[1.0, 2.0, 3.0]).err(),
            Some(FitError::OnePosition)
        );
        assert_eq!(
            fit_line(&[0.0, 1.0], &[1.0]).err(),
            Some(FitError::Mismatch {
                positions: 2,
                readings: 1
            })
        );
        assert_eq!(
            fit_line(&[0.0, f64::NAN], &[1.0, 1.0]).err(),
            Some(FitError::NotFinite)
        );
        assert_eq!(
            fit_through_origin(&[0.0, 0.0], &[1.0, 2.0]).err(),
            Some(FitError::AllAtOrigin)
        );
    }

    #[test]
    fn exact_line_has_no_residual() {
        let x = [0.0, 1.0, 2.0, 3.0];
        let y = [1.0, 3.0, 5.0, 7.0];
        let f = fit_line(&x, &y);
        assert!(f.as_ref().is_ok_and(|f| (f.slope - 2.0).abs() < 1e-15
            && (f.intercept - 1.0).abs() < 1e-15
            && f.straightness() < 1e-15));
    }
}
