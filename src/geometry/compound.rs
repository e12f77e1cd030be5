//! Compound angles on a compound sine plate: a plane with slope A in one view (front) and B in
//! the view at right angles (side). The plate whose hinge is nearer the part is set to A
//! exactly; the other plate to atan(tan B · cos A). The plane's true (steepest) slope is
//! atan(√(tan²A + tan²B)). Both stacks are needed at once, so they must not share a block.

use super::{GeometryError, SineFixture};
use crate::units::{Angle, Length};

/// The two plate settings that level a plane given by its two view slopes.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CompoundSetting {
    /// Slope in the view the near plate works in (A).
    pub view_near: Angle,
    /// Slope in the other view (B).
    pub view_other: Angle,
    /// The near plate (hinge nearer the part): A.
    pub near: Angle,
    /// The other plate: atan(tan B · cos A).
    pub other: Angle,
    /// The steepest slope of the plane: atan(√(tan²A + tan²B)).
    pub true_slope: Angle,
}

/// The plane's true slope from its two view slopes.
pub fn true_slope(a: Angle, b: Angle) -> Angle {
    Angle::from_rad(a.rad().tan().hypot(b.rad().tan()).atan())
}

/// The settings for view slopes `a` (the near plate's view) and `b` (the other view).
pub fn compound(a: Angle, b: Angle) -> Result<CompoundSetting, GeometryError> {
    SineFixture::check_angle(a)?;
    SineFixture::check_angle(b)?;
    let other = Angle::from_rad((b.rad().tan() * a.rad().cos()).atan());
    Ok(CompoundSetting {
        view_near: a,
        view_other: b,
        near: a,
        other,
        true_slope: true_slope(a, b),
    })
}

impl CompoundSetting {
    /// The two stack heights (near plate, other plate), to the nearest nanometre.
    pub fn heights(
        &self,
        near_plate: &SineFixture,
        other_plate: &SineFixture,
    ) -> Result<(Length, Length), GeometryError> {
        Ok((
            near_plate.ideal_height(self.near)?,
            other_plate.ideal_height(self.other)?,
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn equal_small_views() {
        // compound.csv row 10,10 (mpmath rotation-matrix solution): lower 9.8510761166°,
        // true slope 14.0019421655°
        let c = compound(Angle::from_deg(10.0), Angle::from_deg(10.0));
        assert!(c.is_ok_and(|c| (c.other.deg() - 9.8510761166).abs() < 1e-9
            && (c.true_slope.deg() - 14.0019421655).abs() < 1e-9));
    }

    #[test]
    fn refuses_ninety() {
        assert!(compound(Angle::from_deg(90.0), Angle::from_deg(10.0)).is_err());
        assert!(compound(Angle::from_deg(10.0), Angle::from_deg(-1.0)).is_err());
    }
}
