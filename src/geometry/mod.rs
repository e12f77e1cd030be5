//! Sine-fixture geometry: the stack for an angle, the angle for a stack, the roll-diameter
//! correction, the centre distance from a measurement over or between the rolls, the
//! sensitivity of the angle to the stack, and steep-angle advice.
//!
//! H = C·sin θ + (d_p − d_r)/2, with d_p the roll on the plate (pivot) and d_r the roll on the
//! stack (raised).

pub mod compound;
pub mod taper;

pub use compound::{CompoundSetting, compound, true_slope};
pub use taper::{Taper, TaperError, TaperSpec};

use crate::units::{Angle, Length, Unit};
use thiserror::Error;

/// The angle from which a setup is called steep (common practice, no source).
pub const STEEP_FROM_DEG: f64 = 45.0;

/// What is wrong with a requested setup.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum GeometryError {
    #[error(
        "{0} is 90° or more: a sine fixture cannot be set there; set the complement (90° − θ) and turn the work on an angle plate, or use an angle plate alone"
    )]
    TooSteep(String),
    #[error(
        "{0} is below 0°: give the angle from the surface plate as a positive number, e.g. 15 or 15d30m"
    )]
    Negative(String),
    #[error(
        "the stack {height} is more than the centre distance allows for any angle (largest {largest}); check the stack and the centre distance"
    )]
    StackTooTall { height: String, largest: String },
    #[error(
        "the stack {height} is lower than the roll correction needs ({least}); check the roll diameters"
    )]
    StackTooShort { height: String, least: String },
    #[error("the centre distance must be more than zero; measured {0}")]
    NoCentre(String),
}

/// The calibrated geometry of a sine fixture.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SineFixture {
    /// Centre distance between the rolls, as calibrated.
    pub center: Length,
    /// Diameter of the roll resting on the plate (the pivot).
    pub pivot_roll: Length,
    /// Diameter of the roll resting on the stack (the raised end).
    pub raised_roll: Length,
}

impl SineFixture {
    /// A fixture with equal rolls (no roll correction).
    pub fn equal_rolls(center: Length) -> Self {
        SineFixture {
            center,
            pivot_roll: Length::ZERO,
            raised_roll: Length::ZERO,
        }
    }
    /// The roll correction (d_p − d_r)/2, in nanometres as floating point.
    pub fn roll_correction_nm(&self) -> f64 {
        (self.pivot_roll.nm() - self.raised_roll.nm()) as f64 / 2.0
    }

    /// Refuse angles outside 0° ≤ θ < 90°.
    pub fn check_angle(angle: Angle) -> Result<(), GeometryError> {
        if !angle.deg().is_finite() || angle.deg() >= 90.0 {
            return Err(GeometryError::TooSteep(angle.dms(0)));
        }
        if angle.deg() < 0.0 {
            return Err(GeometryError::Negative(angle.dms(0)));
        }
        Ok(())
    }

    /// The exact stack height for `angle`, in nanometres (floating point, not rounded).
    pub fn ideal_height_nm(&self, angle: Angle) -> Result<f64, GeometryError> {
        Self::check_angle(angle)?;
        if self.center.nm() <= 0 {
            return Err(GeometryError::NoCentre(self.center.show(Unit::In)));
        }
        Ok(self.center.nm() as f64 * angle.rad().sin() + self.roll_correction_nm())
    }

    /// The stack height for `angle`, to the nearest nanometre.
    pub fn ideal_height(&self, angle: Angle) -> Result<Length, GeometryError> {
        Ok(Length::from_nm(self.ideal_height_nm(angle)?.round() as i64))
    }

    /// The angle a stack of `height` gives.
    pub fn angle_for_height(&self, height: Length) -> Result<Angle, GeometryError> {
        if self.center.nm() <= 0 {
            return Err(GeometryError::NoCentre(self.center.show(Unit::In)));
        }
        let ratio = (height.nm() as f64 - self.roll_correction_nm()) / self.center.nm() as f64;
        if ratio > 1.0 {
            return Err(GeometryError::StackTooTall {
                height: height.show(Unit::In),
                largest: Length::from_nm(self.center.nm() + self.roll_correction_nm() as i64)
                    .show(Unit::In),
            });
        }
        if ratio < 0.0 {
            return Err(GeometryError::StackTooShort {
                height: height.show(Unit::In),
                least: Length::from_nm(self.roll_correction_nm() as i64).show(Unit::In),
            });
        }
        Ok(Angle::from_rad(ratio.asin()))
    }

    /// How far the angle moves for one `step` of stack height at `angle`: step/(C·cos θ).
    pub fn sensitivity(&self, angle: Angle, step: Length) -> Angle {
        let c = self.center.nm() as f64 * angle.rad().cos();
        Angle::from_rad(step.nm() as f64 / c)
    }
}

/// Centre distance from a measurement over both rolls: C = M − (d₁ + d₂)/2.
pub fn center_from_over(over: Length, d1: Length, d2: Length) -> Result<Length, GeometryError> {
    let twice = 2 * over.nm() - d1.nm() - d2.nm();
    let c = Length::from_nm(twice / 2);
    if c.nm() <= 0 {
        return Err(GeometryError::NoCentre(c.show(Unit::In)));
    }
    Ok(c)
}

/// Centre distance from a measurement between the rolls: C = M_in + (d₁ + d₂)/2.
pub fn center_from_inside(inside: Length, d1: Length, d2: Length) -> Result<Length, GeometryError> {
    let c = Length::from_nm((2 * inside.nm() + d1.nm() + d2.nm()) / 2);
    if c.nm() <= 0 {
        return Err(GeometryError::NoCentre(c.show(Unit::In)));
    }
    Ok(c)
}

/// One way of setting an angle: the stack rounded to `step` and what it gives.
#[derive(Debug, Clone, PartialEq)]
pub struct SetupPlan {
    /// The angle the fixture is set to (the nominal, or its complement).
    pub setting: Angle,
    /// The exact height for that setting (nearest nanometre).
    pub ideal_height: Length,
    /// The height rounded to the set's resolution.
    pub height: Length,
    /// The angle that rounded height gives.
    pub achieved: Angle,
    /// achieved − setting.
    pub error: Angle,
    /// Angle per one step of height at this setting.
    pub sensitivity: Angle,
}

/// The plan for an angle: direct setting, warnings, and (when steep) the complement side by side.
#[derive(Debug, Clone, PartialEq)]
pub struct SetupAdvice {
    pub nominal: Angle,
    pub direct: SetupPlan,
    /// Set 90° − θ and turn the work on an angle plate; offered from 45°.
    pub complement: Option<SetupPlan>,
    pub warnings: Vec<String>,
}

/// Plan `angle` on `fixture` with the stack rounded to `step`; warn from 45°; refuse ≥ 90°.
/// `largest_stack`, when given, is the tallest stack the fixture takes.
pub fn plan(
    fixture: &SineFixture,
    angle: Angle,
    step: Length,
    largest_stack: Option<Length>,
    unit: Unit,
) -> Result<SetupAdvice, GeometryError> {
    let one = |setting: Angle| -> Result<SetupPlan, GeometryError> {
        let ideal_height = fixture.ideal_height(setting)?;
        let height = ideal_height.round_to(step);
        let achieved = fixture.angle_for_height(height)?;
        Ok(SetupPlan {
            setting,
            ideal_height,
            height,
            achieved,
            error: achieved - setting,
            sensitivity: fixture.sensitivity(setting, step),
        })
    };
    let direct = one(angle)?;
    let mut warnings = Vec::new();
    let mut complement = None;
    if angle.deg() >= STEEP_FROM_DEG {
        let c = one(Angle::from_deg(90.0) - angle)?;
        warnings.push(format!(
            "steep angle ({}): each {} of stack error moves the angle {:.2}\" here against {:.2}\" at the complement {}; consider setting the complement and turning the work on an angle plate",
            angle.dm(),
            step.show(unit),
            direct.sensitivity.arcsec(),
            c.sensitivity.arcsec(),
            c.setting.dms(0),
        ));
        complement = Some(c);
    }
    if let Some(max) = largest_stack
        && direct.height > max
    {
        warnings.push(format!(
            "the stack {} is taller than this fixture takes ({}); use a longer fixture or the complement setup",
            direct.height.show(unit),
            max.show(unit)
        ));
    }
    Ok(SetupAdvice {
        nominal: angle,
        direct,
        complement,
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn five_in() -> SineFixture {
        SineFixture::equal_rolls(Length::inches(5.0))
    }

    #[test]
    fn thirty_degrees_on_five_inches_is_two_and_a_half() {
        // sin 30° = 1/2 exactly: common practice (no source)
        let h = five_in()
            .ideal_height(Angle::from_deg(30.0))
            .unwrap_or_default();
        assert_eq!(h.show(Unit::In), "2.5000 in");
    }

    #[test]
    fn refuses_ninety_and_negative() {
        assert!(matches!(
            five_in().ideal_height(Angle::from_deg(90.0)),
            Err(GeometryError::TooSteep(_))
        ));
        assert!(matches!(
            five_in().ideal_height(Angle::from_deg(-1.0)),
            Err(GeometryError::Negative(_))
        ));
    }

    #[test]
    fn roll_correction_adds_half_the_difference() {
        let f = SineFixture {
            center: Length::inches(5.0),
            pivot_roll: Length::inches(0.7500),
            raised_roll: Length::inches(0.7480),
        };
        let h = f.ideal_height(Angle::from_deg(30.0)).unwrap_or_default();
        assert_eq!(h.show_fine(Unit::In), "2.50100 in");
        let back = f.angle_for_height(h).unwrap_or_default();
        assert!((back.deg() - 30.0).abs() < 1e-9);
    }

    #[test]
    fn centre_from_over_and_inside() {
        let c = center_from_over(
            Length::inches(5.625),
            Length::inches(0.625),
            Length::inches(0.625),
        );
        assert_eq!(c.map(|c| c.show(Unit::In)), Ok("5.0000 in".to_string()));
        let c = center_from_inside(
            Length::inches(4.375),
            Length::inches(0.625),
            Length::inches(0.625),
        );
        assert_eq!(c.map(|c| c.show(Unit::In)), Ok("5.0000 in".to_string()));
    }

    #[test]
    fn steep_angles_get_the_complement() {
        let step = Length::inches(0.0001);
        let a = plan(&five_in(), Angle::from_deg(60.0), step, None, Unit::In);
        let a = a.ok();
        assert!(
            a.as_ref()
                .is_some_and(|a| a.complement.is_some() && !a.warnings.is_empty())
        );
        let a = plan(&five_in(), Angle::from_deg(30.0), step, None, Unit::In).ok();
        assert!(a.is_some_and(|a| a.complement.is_none() && a.warnings.is_empty()));
    }
}
