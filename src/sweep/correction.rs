//! The stack change that levels a swept surface: ΔH = C·(sin(θ − δ) − sin θ) ≈ −C·cos θ·δ.

use super::SweepError;
use crate::geometry::SineFixture;
use crate::units::{Angle, Length, Unit};

/// The usual stack resolution in `unit`: 0.0001 in or 0.001 mm.
pub fn default_step(unit: Unit) -> Length {
    match unit {
        Unit::In => Length::from_nm(crate::units::NM_PER_INCH / 10_000),
        Unit::Mm => Length::from_nm(crate::units::NM_PER_MM / 1_000),
    }
}

/// A change of stack worked out from a sweep.
#[derive(Debug, Clone, PartialEq)]
pub struct Correction {
    /// The stack in place when the sweep was taken.
    pub height: Length,
    /// The angle that stack gives, θ.
    pub setting: Angle,
    /// The residual angle δ from the sweep.
    pub residual: Angle,
    /// C·(sin(θ − δ) − sin θ) before rounding, in nanometres.
    pub exact_delta_nm: f64,
    /// The stack resolution the new height is rounded to.
    pub step: Length,
    /// The new stack, rounded to `step`.
    pub new_height: Length,
    /// new_height − height: plus means raise the stack.
    pub delta_height: Length,
    /// The angle the new stack gives.
    pub achieved: Angle,
}

impl Correction {
    /// What to do, in words: "raise the stack by 0.0008 in to 2.5008 in".
    pub fn words(&self, unit: Unit) -> String {
        let by = self.delta_height.abs().show(unit);
        let to = self.new_height.show(unit);
        match self.delta_height.nm().signum() {
            1 => format!("raise the stack by {by} to {to}"),
            -1 => format!("lower the stack by {by} to {to}"),
            _ => format!(
                "leave the stack at {to}: the change is less than half of {}",
                self.step.show(unit)
            ),
        }
    }
}

/// The correction for a sweep taken with a stack of `height` in place: the new height is
/// height + C·(sin(θ − δ) − sin θ), θ the angle `height` gives, rounded to `step`.
pub fn correction(
    fixture: &SineFixture,
    height: Length,
    residual: Angle,
    step: Length,
) -> Result<Correction, SweepError> {
    let setting = fixture.angle_for_height(height)?;
    let target = setting - residual;
    if SineFixture::check_angle(target).is_err() {
        return Err(SweepError::CorrectionOutOfRange(format!(
            "{} (the setting {} less the residual {})",
            target.dms(0),
            setting.dms(0),
            residual.arcsec_signed(1)
        )));
    }
    let c = fixture.center.nm() as f64;
    // sin(θ − δ) − sin θ = 2·cos(θ − δ/2)·sin(−δ/2): no cancellation for small δ
    let half = residual.rad() / 2.0;
    let exact_delta_nm = c * 2.0 * (setting.rad() - half).cos() * (-half).sin();
    let exact_new = Length::from_nm((height.nm() as f64 + exact_delta_nm).round() as i64);
    let new_height = exact_new.round_to(step);
    let achieved = fixture.angle_for_height(new_height)?;
    Ok(Correction {
        height,
        setting,
        residual,
        exact_delta_nm,
        step,
        new_height,
        delta_height: new_height - height,
        achieved,
    })
}

/// The correction when the stack in place is the one for `angle`, rounded to `step`.
pub fn correction_for_angle(
    fixture: &SineFixture,
    angle: Angle,
    residual: Angle,
    step: Length,
) -> Result<Correction, SweepError> {
    let height = fixture.ideal_height(angle)?.round_to(step);
    correction(fixture, height, residual, step)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn five() -> SineFixture {
        SineFixture::equal_rolls(Length::inches(5.0))
    }

    #[test]
    fn a_falling_surface_means_raise_the_stack() {
        // δ = −0.0008/(5·cos 30°) rad: the stack must rise by 0.0008 in (first-order
        // ΔH ≈ −C·cos θ·δ, DOMAIN formula)
        let delta = Angle::from_rad(-(0.0008 / (5.0 * 30f64.to_radians().cos())));
        let c = correction_for_angle(
            &five(),
            Angle::from_deg(30.0),
            delta,
            default_step(Unit::In),
        );
        let words = c.map(|c| c.words(Unit::In));
        assert_eq!(
            words,
            Ok("raise the stack by 0.0008 in to 2.5008 in".to_string())
        );
    }

    #[test]
    fn a_rising_surface_means_lower_the_stack() {
        let c = correction_for_angle(
            &five(),
            Angle::from_deg(30.0),
            Angle::from_rad(0.0003f64.atan()),
            default_step(Unit::In),
        );
        let c = c.ok();
        assert!(c.as_ref().is_some_and(|c| c.delta_height.nm() < 0));
        // ΔH = 5·(sin(30° − atan(0.0003)) − sin 30°) = −0.00129915054721… in
        // (recomputed with mpmath 1.3.0 at 30 digits for this test)
        assert!(
            c.as_ref().is_some_and(
                |c| (c.exact_delta_nm / 25_400_000.0 + 0.001_299_150_547).abs() < 1e-12
            ),
            "{c:?}"
        );
        assert_eq!(
            c.map(|c| c.words(Unit::In)),
            Some("lower the stack by 0.0013 in to 2.4987 in".to_string())
        );
    }

    #[test]
    fn refuses_a_correction_below_zero() {
        let c = correction_for_angle(
            &five(),
            Angle::from_deg(0.0),
            Angle::from_arcsec(60.0),
            default_step(Unit::In),
        );
        assert!(matches!(c, Err(SweepError::CorrectionOutOfRange(_))));
    }
}
