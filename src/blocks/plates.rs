//! The two stacks of a compound sine plate, built at once from one set without sharing a block,
//! and what the plate then really sets.
//!
//! The near (upper) plate is set to the view slope A, the other (lower) plate to
//! l = atan(tan B · cos A) ([`crate::geometry::compound()`]). Read the other way, plates at u and
//! l level a plane whose view slopes are A = u and B = atan(tan l / cos u): that is how the
//! angles the rounded stacks really give are turned back into the plane they level. The
//! plane's error is the angle between the plane levelled and the plane wanted (between their
//! normals (−tan A, −tan B, 1)); it does not depend on the direction of the error.
//!
//! # The search
//! Each plate's height is rounded to the set's grid. When the two rounded heights cannot be
//! built at once (one is in a gap, or both need the same block), nearby grid heights of each
//! (a few steps either way, and the next few buildable heights either way) are paired and tried in order
//! of the plane error they give; the first pair [`Solver::solve_many`] builds wins.

use super::pair::{PairError, SLOW_SOLVES, without_protectors};
use super::solver::{SolveError, Solver, Stack};
use crate::geometry::{CompoundSetting, SineFixture, true_slope};
use crate::units::{Angle, Length};

/// How many grid steps either side of each rounded height the search tries (and how many
/// buildable heights either way past a gap).
pub const NEARBY_STEPS: i64 = 3;

/// How many height pairs the search hands to the solver at most.
pub const MOST_PAIRS: usize = 60;

/// The stacks for a compound sine plate and what they give.
#[derive(Debug, Clone, PartialEq)]
pub struct CompoundStacks {
    pub setting: CompoundSetting,
    /// Under the near (upper) plate: sets the view slope A.
    pub near: Stack,
    /// Under the other (lower) plate: sets atan(tan B · cos A).
    pub other: Stack,
    /// The exact heights (nearest nanometre), near then other.
    pub ideal_heights: (Length, Length),
    /// The angles the two stacks give, near then other.
    pub achieved: (Angle, Angle),
    /// The view slopes of the plane the plates level, A then B.
    pub views_achieved: (Angle, Angle),
    /// The steepest slope of the plane the plates level.
    pub true_slope_achieved: Angle,
    /// The angle between the plane levelled and the plane wanted.
    pub plane_error: Angle,
    /// Protectors were asked for but left off: a set has one pair, and there are two stacks.
    pub protectors_left_off: bool,
}

impl CompoundStacks {
    /// Blocks in both stacks together.
    pub fn block_count(&self) -> usize {
        self.near.block_count() + self.other.block_count()
    }
    /// The error of each plate's setting, near then other.
    pub fn setting_errors(&self) -> (Angle, Angle) {
        (
            self.achieved.0 - self.setting.near,
            self.achieved.1 - self.setting.other,
        )
    }
    /// achieved true slope − wanted true slope.
    pub fn true_slope_error(&self) -> Angle {
        self.true_slope_achieved - self.setting.true_slope
    }
}

/// The view slopes (A, B) of the plane that plates set to `near` (upper) and `other` (lower)
/// level: A = near, B = atan(tan other / cos near).
pub fn views_for_plates(near: Angle, other: Angle) -> (Angle, Angle) {
    let b = (other.rad().tan() / near.rad().cos()).atan();
    (near, Angle::from_rad(b))
}

/// The angle between the planes with view slopes `a` and `b` (each a pair A, B).
pub fn angle_between_planes(a: (Angle, Angle), b: (Angle, Angle)) -> Angle {
    let n = |v: (Angle, Angle)| [-v.0.rad().tan(), -v.1.rad().tan(), 1.0];
    let (p, q) = (n(a), n(b));
    let dot = p[0] * q[0] + p[1] * q[1] + p[2] * q[2];
    let cross = [
        p[1] * q[2] - p[2] * q[1],
        p[2] * q[0] - p[0] * q[2],
        p[0] * q[1] - p[1] * q[0],
    ];
    let c = cross[0].hypot(cross[1]).hypot(cross[2]);
    Angle::from_rad(c.atan2(dot))
}

/// Grid heights to try for one plate: the rounded height, its neighbours, and the nearest
/// buildable heights; only those the set can make (zero stands for "no stack").
fn nearby(solver: &Solver, ideal: Length) -> Vec<Length> {
    let step = solver.step();
    let rounded = ideal.round_to(step);
    let mut v: Vec<Length> = (-NEARBY_STEPS..=NEARBY_STEPS)
        .map(|k| Length::from_nm(rounded.nm() + k * step.nm()))
        .filter(|h| h.nm() >= 0)
        .collect();
    // and the next few heights the set makes either way (past a gap)
    let (mut below, mut above) = (Some(rounded), Some(rounded));
    for _ in 0..NEARBY_STEPS {
        below = below.and_then(|h| solver.nearest(h).below);
        above = above.and_then(|h| solver.nearest(h).above);
        v.extend(below.into_iter().chain(above));
    }
    v.sort();
    v.dedup();
    v.retain(|&h| h.nm() == 0 || solver.fewest(h).is_some());
    if rounded.nm() != 0 {
        v.retain(|h| h.nm() != 0);
    }
    v
}

/// The two stacks for `setting` on a compound plate whose near (upper) plate is `near_plate`
/// and other (lower) plate `other_plate`, from one set with no block shared.
pub fn compound_stacks(
    solver: &Solver,
    near_plate: &SineFixture,
    other_plate: &SineFixture,
    setting: &CompoundSetting,
) -> Result<CompoundStacks, PairError> {
    let (solver, left_off) = without_protectors(solver)?;
    let (near_ideal, other_ideal) = setting.heights(near_plate, other_plate)?;
    let wanted = (setting.view_near, setting.view_other);
    let mut pairs: Vec<(f64, Length, Length, Angle, Angle)> = Vec::new();
    for &hn in &nearby(&solver, near_ideal) {
        let Ok(an) = near_plate.angle_for_height(hn) else {
            continue;
        };
        for &ho in &nearby(&solver, other_ideal) {
            let Ok(ao) = other_plate.angle_for_height(ho) else {
                continue;
            };
            let e = angle_between_planes(views_for_plates(an, ao), wanted);
            pairs.push((e.arcsec(), hn, ho, an, ao));
        }
    }
    pairs.sort_by(|x, y| x.0.total_cmp(&y.0).then(x.1.cmp(&y.1)).then(x.2.cmp(&y.2)));
    let mut slow = 0usize;
    for &(e, hn, ho, an, ao) in pairs.iter().take(MOST_PAIRS) {
        let mut v = match solver.solve_many(&[hn, ho]) {
            Ok(v) => v,
            Err(SolveError::SearchLimit { .. }) => {
                slow += 1;
                if slow >= SLOW_SOLVES {
                    break;
                }
                continue;
            }
            Err(_) => continue,
        };
        let (Some(other), Some(near)) = (v.pop(), v.pop()) else {
            continue;
        };
        let views = views_for_plates(an, ao);
        return Ok(CompoundStacks {
            setting: *setting,
            near,
            other,
            ideal_heights: (near_ideal, other_ideal),
            achieved: (an, ao),
            views_achieved: views,
            true_slope_achieved: true_slope(views.0, views.1),
            plane_error: Angle::from_arcsec(e),
            protectors_left_off: left_off,
        });
    }
    let u = solver.unit();
    Err(PairError::NotFound {
        wanted: format!(
            "the plates ({} and {})",
            near_ideal.show(u),
            other_ideal.show(u)
        ),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::blocks::BlockSet;
    use crate::geometry::compound;

    #[test]
    fn plates_back_to_views() {
        // compound.csv row 30,20: lower plate 17.495240757° levels B = 20° with A = 30°
        let (a, b) = views_for_plates(Angle::from_deg(30.0), Angle::from_deg(17.495240757));
        assert!((a.deg() - 30.0).abs() < 1e-12);
        assert!((b.deg() - 20.0).abs() < 1e-8, "{}", b.deg());
    }

    #[test]
    fn plane_error_of_a_pure_tilt() {
        // tilting one view by 10" about one axis (the other view flat) tilts the plane by 10"
        let e = angle_between_planes(
            (Angle::from_deg(0.0), Angle::from_deg(20.0)),
            (
                Angle::from_deg(0.0),
                Angle::from_arcsec(20.0 * 3600.0 + 10.0),
            ),
        );
        assert!((e.arcsec() - 10.0).abs() < 1e-6, "{}", e.arcsec());
    }

    #[test]
    fn thirty_and_twenty_on_five_inches() {
        let s = Solver::new(&BlockSet::from_catalogue("inch-81").unwrap()).unwrap();
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let c = compound(Angle::from_deg(30.0), Angle::from_deg(20.0)).unwrap();
        let r = compound_stacks(&s, &fx, &fx, &c).unwrap();
        // compound.csv: stacks 2.5 and 1.50313289 in → 2.5000 and 1.5031 on the 0.0001 in grid
        assert_eq!(r.near.height, Length::inches(2.5));
        assert_eq!(r.other.height, Length::inches(1.5031));
    }
}
