//! Two stacks at once from one set: a stack under each roll of a sine fixture, whose difference
//! is the height an angle needs (the small-angle remedy), and the search behind it.
//!
//! # Why two stacks
//! A sine fixture set on two stacks tilts by the *difference* of their heights: with the pivot
//! roll on a stack of P and the raised roll on a stack of R, sin θ = (R − P − (d_p − d_r)/2)/C,
//! so R − P plays the part of the single stack H = C·sin θ + (d_p − d_r)/2. A height below the
//! smallest stack a set makes (or in one of its gaps) is then reachable as a difference of two
//! taller stacks (DOMAIN.md, "Small angles").
//!
//! # The search
//! 1. The intended difference D is a whole number of the set's steps (every buildable height
//!    is). The candidates are the grid heights around the exact height, in order of the angle
//!    error they give; the first for which a pair can be built wins, so the result has the
//!    smallest angle error the set allows near the exact height.
//! 2. For one D, every pivot height P on the grid is a candidate with R = P + D. The solver's
//!    table gives the fewest blocks for each alone; their sum is a lower bound for the pair.
//!    Candidates are tried in order of that bound, lowest P first, with
//!    [`Solver::solve_many`], which builds both at once without sharing a block. The best pair
//!    has the fewest blocks in all, then the fewest worn blocks, then the lowest stacks (a low
//!    stack stands steadier). The search stops when no untried candidate can beat the best.
//! 3. A set has one pair of protector blocks, so two stacks are built without them; the result
//!    says so ([`TwoStack::protectors_left_off`]).

use super::solver::{SolveError, Solver, Stack};
use crate::geometry::{GeometryError, SineFixture};
use crate::units::{Angle, Length};
use std::fmt;

/// After this many two-height solves that run out of search steps, a search gives up on the
/// height (each such solve takes the solver's whole step allowance).
pub const SLOW_SOLVES: usize = 3;

/// How far the searches look; the defaults suit the standard sets.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct PairLimits {
    /// The tallest stack the fixture takes (neither stack may be taller).
    pub tallest: Option<Length>,
    /// How many grid heights near the exact height are tried as the intended difference.
    pub differences: usize,
    /// How many two-height solves one intended difference may take.
    pub solves: usize,
}

impl Default for PairLimits {
    fn default() -> Self {
        PairLimits {
            tallest: None,
            differences: 12,
            solves: 300,
        }
    }
}

/// Why two stacks could not be found.
#[derive(Debug, Clone, PartialEq)]
pub enum PairError {
    /// The angle is outside what a sine fixture sets, or the fixture's geometry is wrong.
    Geometry(GeometryError),
    /// The height rounds to nothing: the fixture rests flat, no stack is needed.
    NothingToBuild,
    /// The set itself cannot be used (no usable blocks, too fine a step).
    Set(SolveError),
    /// No pair near the height could be built from the set without sharing a block.
    NotFound {
        /// The height (or heights) looked for, in words.
        wanted: String,
    },
}

impl fmt::Display for PairError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            PairError::Geometry(e) => write!(f, "{e}"),
            PairError::NothingToBuild => f.write_str(
                "the height rounds to zero: the fixture rests on the surface plate and needs no stack",
            ),
            PairError::Set(e) => write!(f, "{e}"),
            PairError::NotFound { wanted } => write!(
                f,
                "no two stacks for {wanted} could be built from the set without sharing a block; use a longer fixture or a second set"
            ),
        }
    }
}

impl std::error::Error for PairError {}

impl From<GeometryError> for PairError {
    fn from(e: GeometryError) -> Self {
        PairError::Geometry(e)
    }
}

/// A stack under each roll of one fixture.
#[derive(Debug, Clone, PartialEq)]
pub struct TwoStack {
    /// Under the raised roll (the taller stack).
    pub raised: Stack,
    /// Under the pivot roll (the lower stack).
    pub pivot: Stack,
    /// The intended difference, raised − pivot, exactly (a whole number of the set's steps).
    pub height: Length,
    /// The exact height for the angle (nearest nanometre).
    pub ideal_height: Length,
    /// The angle the fixture is meant to be set to.
    pub setting: Angle,
    /// The angle the difference gives.
    pub achieved: Angle,
    /// achieved − setting.
    pub error: Angle,
    /// Protectors were asked for but left off: a set has one pair, and there are two stacks.
    pub protectors_left_off: bool,
}

impl TwoStack {
    /// Blocks in both stacks together.
    pub fn block_count(&self) -> usize {
        self.raised.block_count() + self.pivot.block_count()
    }
    /// Worn blocks in both stacks together.
    pub fn worn_count(&self) -> usize {
        self.raised.worn().len() + self.pivot.worn().len()
    }
}

/// The solver to use for several stacks at once: protectors off (one pair per set), and
/// whether they had to be left off.
pub(super) fn without_protectors(solver: &Solver) -> Result<(Solver, bool), PairError> {
    let left_off = solver.protected();
    let s = solver.with_protectors(false).map_err(PairError::Set)?;
    Ok((s, left_off))
}

/// The two-stack remedy for `angle` on `fixture` with the default limits: a stack under each
/// roll from the one set, no block shared, their difference the height on the set's grid with
/// the smallest angle error.
pub fn two_stack(
    solver: &Solver,
    fixture: &SineFixture,
    angle: Angle,
) -> Result<TwoStack, PairError> {
    two_stack_within(solver, fixture, angle, &PairLimits::default())
}

/// [`two_stack`] with chosen limits (e.g. the fixture's tallest stack).
pub fn two_stack_within(
    solver: &Solver,
    fixture: &SineFixture,
    angle: Angle,
    limits: &PairLimits,
) -> Result<TwoStack, PairError> {
    let (solver, left_off) = without_protectors(solver)?;
    let ideal_nm = fixture.ideal_height_nm(angle)?;
    let ideal_height = fixture.ideal_height(angle)?;
    let step = solver.step().nm();
    // the grid heights near the exact one, in order of the angle error they give
    let centre = (ideal_nm / step as f64).round() as i64;
    if centre < 1 {
        return Err(PairError::NothingToBuild);
    }
    let reach = limits.differences.max(1) as i64;
    let mut options: Vec<(f64, i64, Angle)> = (centre - reach..=centre + reach)
        .filter(|&k| k >= 1)
        .filter_map(|k| {
            let a = fixture.angle_for_height(Length::from_nm(k * step)).ok()?;
            Some(((a - angle).arcsec().abs(), k, a))
        })
        .collect();
    if options.is_empty() {
        return Err(PairError::NothingToBuild);
    }
    options.sort_by(|x, y| x.0.total_cmp(&y.0).then(x.1.cmp(&y.1)));
    options.truncate(limits.differences.max(1));
    let counts = solver.fewest_counts();
    let tallest = limits.tallest.map(|t| t.nm() / step);
    for (_, k, achieved) in options {
        if let Some((raised, pivot)) = pair_for(&solver, &counts, k, tallest, limits.solves) {
            let height = Length::from_nm(k * step);
            return Ok(TwoStack {
                raised,
                pivot,
                height,
                ideal_height,
                setting: angle,
                achieved,
                error: achieved - angle,
                protectors_left_off: left_off,
            });
        }
    }
    Err(PairError::NotFound {
        wanted: format!("a difference near {}", ideal_height.show(solver.unit())),
    })
}

/// Two stacks from the set whose difference is exactly `difference` (raised, pivot), no block
/// shared, with the fewest blocks (then fewest worn, then the lowest stacks). `None` when the
/// difference is not on the set's grid or no pair is found within the limits.
pub fn pair_for_difference(
    solver: &Solver,
    difference: Length,
    limits: &PairLimits,
) -> Result<Option<(Stack, Stack)>, PairError> {
    let (solver, _) = without_protectors(solver)?;
    let step = solver.step().nm();
    if difference.nm() <= 0 || difference.nm() % step != 0 {
        return Ok(None);
    }
    let counts = solver.fewest_counts();
    let tallest = limits.tallest.map(|t| t.nm() / step);
    Ok(pair_for(
        &solver,
        &counts,
        difference.nm() / step,
        tallest,
        limits.solves,
    ))
}

/// The best pair for a difference of `d` steps. `counts[i]` is the fewest blocks for `i + 1`
/// steps (see [`Solver::fewest_counts`]).
fn pair_for(
    solver: &Solver,
    counts: &[Option<u8>],
    d: i64,
    tallest: Option<i64>,
    solves: usize,
) -> Option<(Stack, Stack)> {
    let n = counts.len() as i64;
    let top = tallest.map_or(n, |t| t.min(n));
    if d < 1 || d >= top {
        return None;
    }
    let step = solver.step().nm();
    let bound = |p: i64| -> Option<u32> {
        let a = counts.get((p - 1) as usize).copied().flatten()?;
        let b = counts.get((p + d - 1) as usize).copied().flatten()?;
        Some(a as u32 + b as u32)
    };
    // the lowest bound over all pivot heights, then bucket by bucket
    let pivots = 1..=(top - d);
    let least = pivots.clone().filter_map(bound).min()?;
    let mut best: Option<((usize, usize, i64), Stack, Stack)> = None;
    let mut tries = 0usize;
    let mut slow = 0usize;
    let most = least + super::solver::EXTRA_BLOCKS;
    for lb in least..=most {
        // a bound above the best count cannot beat it (an equal one may, on worn blocks)
        if best.as_ref().is_some_and(|(k, _, _)| (k.0 as u32) < lb) {
            break;
        }
        for p in pivots.clone() {
            if bound(p) != Some(lb) {
                continue;
            }
            if tries >= solves {
                return best.map(|(_, r, q)| (r, q));
            }
            tries += 1;
            let heights = [Length::from_nm((p + d) * step), Length::from_nm(p * step)];
            let mut v = match solver.solve_many(&heights) {
                Ok(v) => v,
                // a search that runs out of steps is slow; a few of them end this difference
                Err(SolveError::SearchLimit { .. }) => {
                    slow += 1;
                    if slow >= SLOW_SOLVES {
                        return best.map(|(_, r, q)| (r, q));
                    }
                    continue;
                }
                Err(_) => continue,
            };
            let (Some(pivot), Some(raised)) = (v.pop(), v.pop()) else {
                continue;
            };
            let blocks = raised.block_count() + pivot.block_count();
            let worn = raised.worn().len() + pivot.worn().len();
            let key = (blocks, worn, p);
            if best.as_ref().is_none_or(|(k, _, _)| key < *k) {
                best = Some((key, raised, pivot));
            }
            // lowest pivot first within a bucket: nothing later in it beats a perfect pair
            if blocks as u32 == lb && worn == 0 {
                break;
            }
        }
    }
    best.map(|(_, r, q)| (r, q))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::blocks::BlockSet;
    use std::collections::HashSet;

    fn inch81() -> Solver {
        Solver::new(&BlockSet::from_catalogue("inch-81").unwrap()).unwrap()
    }

    #[test]
    fn half_a_degree_on_five_inches() {
        // 5 in · sin 0.5° = 0.043633 in (stack-heights.csv gives the same to 8 places for 5 in
        // bars at other angles; this one is checked in tests/setups_pair.rs): below the 0.050 in
        // block, so two stacks whose difference is 0.0436 in
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let t = two_stack(&inch81(), &fx, Angle::from_deg(0.5)).unwrap();
        assert_eq!(t.height, Length::inches(0.0436));
        assert_eq!(t.raised.height - t.pivot.height, t.height);
        let mut seen = HashSet::new();
        for b in t.raised.blocks.iter().chain(&t.pivot.blocks) {
            assert!(seen.insert(b.set_index), "shared block {b:?}");
        }
        assert!(t.error.arcsec().abs() < 2.07, "{}", t.error.arcsec());
    }

    #[test]
    fn protectors_are_left_off_and_said_so() {
        let mut set = BlockSet::from_catalogue("inch-81").unwrap();
        set.protectors = Some(crate::blocks::Protectors {
            size: Length::inches(0.05),
        });
        let s = Solver::new(&set).unwrap().with_protectors(true).unwrap();
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let t = two_stack(&s, &fx, Angle::from_deg(0.25)).unwrap();
        assert!(t.protectors_left_off);
        assert!(t.raised.blocks.iter().all(|b| !b.protector));
    }

    #[test]
    fn zero_needs_nothing() {
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let e = two_stack(&inch81(), &fx, Angle::from_deg(0.0));
        assert_eq!(e, Err(PairError::NothingToBuild));
    }
}
