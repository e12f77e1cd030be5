//! Properties of the two-stack and compound-plate searches (proptest), on the standard sets
//! with random missing, damaged and worn blocks: the two stacks never share a physical block,
//! each sums exactly to its height, and the difference of a small-angle pair is exactly the
//! intended height. Set compositions: standards.md (inch 81 common practice; metric 88/112 from
//! memory). Angles are recomputed here in f64 (θ = asin(H/C)), independently of tiltbook.
//! The bound on a small angle is half the sensitivity step, 0.0001 in/(2·C·cos θ), which at 0°
//! on 5 in is half of sensitivity.csv's 4.125296" (mpmath, tests/data/sine-tables).

use proptest::prelude::*;
use std::collections::HashSet;
use tiltbook::blocks::pair::{PairError, TwoStack, two_stack};
use tiltbook::blocks::plates::compound_stacks;
use tiltbook::blocks::{BlockSet, Condition, Solver, Stack};
use tiltbook::geometry::{SineFixture, compound};
use tiltbook::units::{Angle, Length};

const IDS: [&str; 3] = ["inch-81", "metric-88", "metric-112"];

fn inventory(which: usize, marks: &[(usize, u8)]) -> BlockSet {
    let mut set = BlockSet::from_catalogue(IDS[which]).unwrap();
    let n = set.blocks.len();
    for &(i, m) in marks {
        set.blocks[i % n].condition = match m {
            0 => Condition::Missing,
            1 => Condition::Damaged,
            _ => Condition::Worn,
        };
    }
    set
}

fn centre(k: usize) -> Length {
    [
        Length::inches(5.0),
        Length::inches(10.0),
        Length::mm(100.0),
        Length::mm(200.0),
    ][k % 4]
}

/// Each stack sums to its height, uses only usable blocks of the set, and no physical block is
/// in two stacks.
fn disjoint_and_exact(set: &BlockSet, stacks: &[&Stack]) -> Result<(), TestCaseError> {
    let mut seen = HashSet::new();
    for s in stacks {
        prop_assert_eq!(s.sizes().into_iter().sum::<Length>(), s.height);
        for b in &s.blocks {
            let i = b.set_index.expect("no protectors here");
            prop_assert!(seen.insert(i), "block {} ({:?}) used twice", i, b.size);
            prop_assert!(set.blocks[i].condition.usable());
            prop_assert_eq!(set.blocks[i].size, b.size);
        }
    }
    Ok(())
}

fn check_pair(
    set: &BlockSet,
    solver: &Solver,
    fx: &SineFixture,
    angle: Angle,
    t: &TwoStack,
) -> Result<(), TestCaseError> {
    disjoint_and_exact(set, &[&t.raised, &t.pivot])?;
    // the difference is exactly the intended height, on the set's grid
    prop_assert_eq!(t.raised.height - t.pivot.height, t.height);
    prop_assert_eq!(t.height.nm() % solver.step().nm(), 0);
    prop_assert!(t.pivot.height.nm() > 0);
    // the angle it gives, recomputed
    let theta = (t.height.nm() as f64 / fx.center.nm() as f64)
        .asin()
        .to_degrees();
    prop_assert!((t.achieved.deg() - theta).abs() < 1e-9);
    prop_assert!((t.error.deg() - (theta - angle.deg())).abs() < 1e-9);
    Ok(())
}

fn half_step_arcsec(step_nm: i64, c_nm: i64, deg: f64) -> f64 {
    (step_nm as f64 / (2.0 * c_nm as f64 * deg.to_radians().cos())).to_degrees() * 3600.0
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]

    #[test]
    fn two_stacks_share_no_block_and_differ_by_the_height(
        which in 0usize..3,
        marks in prop::collection::vec((0usize..120, 0u8..3), 0..12),
        k in 0usize..4,
        milli in 1u32..2_000,
    ) {
        let set = inventory(which, &marks);
        let solver = Solver::new(&set).unwrap();
        let fx = SineFixture::equal_rolls(centre(k));
        let angle = Angle::from_deg(milli as f64 / 1000.0);
        match two_stack(&solver, &fx, angle) {
            Ok(t) => {
                check_pair(&set, &solver, &fx, angle, &t)?;
                if marks.is_empty() {
                    // a complete set reaches the grid height nearest the exact one
                    let bound = half_step_arcsec(solver.step().nm(), fx.center.nm(), angle.deg());
                    prop_assert!(t.error.arcsec().abs() <= bound + 1e-6,
                        "{}: {}\" > {}\"", angle.deg(), t.error.arcsec(), bound);
                }
            }
            // a height that rounds to nothing, or a thinned set with no pair: said, not hidden
            Err(PairError::NothingToBuild) => prop_assert!(
                fx.ideal_height_nm(angle).unwrap() < solver.step().nm() as f64 / 2.0 + 1.0),
            Err(PairError::NotFound { .. }) => prop_assert!(!marks.is_empty()),
            Err(e) => prop_assert!(false, "{e}"),
        }
    }

    #[test]
    fn compound_stacks_share_no_block(
        which in 0usize..3,
        marks in prop::collection::vec((0usize..120, 0u8..3), 0..12),
        k in 0usize..4,
        a in 5u32..600,
        b in 5u32..600,
    ) {
        let set = inventory(which, &marks);
        let solver = Solver::new(&set).unwrap();
        let fx = SineFixture::equal_rolls(centre(k));
        let c = compound(Angle::from_deg(a as f64 / 10.0), Angle::from_deg(b as f64 / 10.0)).unwrap();
        if let Ok(r) = compound_stacks(&solver, &fx, &fx, &c) {
            disjoint_and_exact(&set, &[&r.near, &r.other])?;
            for (s, want) in [(&r.near, r.achieved.0), (&r.other, r.achieved.1)] {
                let theta = (s.height.nm() as f64 / fx.center.nm() as f64).asin().to_degrees();
                prop_assert!((want.deg() - theta).abs() < 1e-9);
            }
        } else {
            // the complete sets build every pair of plate heights from 0.5° up on these plates
            prop_assert!(!marks.is_empty());
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn small_angles_on_five_inches_within_half_a_step(arcsec in 1u32..2_050) {
        // below 0.050 in on a 5 in bar (0.573°): two stacks from the 81 set, error at most
        // 0.0001 in/(2·5 in·cos θ)
        let set = BlockSet::from_catalogue("inch-81").unwrap();
        let solver = Solver::new(&set).unwrap();
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let angle = Angle::from_arcsec(arcsec as f64);
        match two_stack(&solver, &fx, angle) {
            Ok(t) => {
                check_pair(&set, &solver, &fx, angle, &t)?;
                let bound = (0.0001 / (2.0 * 5.0 * angle.rad().cos())).to_degrees() * 3600.0;
                prop_assert!(t.error.arcsec().abs() <= bound, "{}\" > {}\"", t.error.arcsec(), bound);
            }
            // under half a step of height the fixture rests flat: the error is the angle itself
            Err(PairError::NothingToBuild) => prop_assert!(arcsec as f64 <= 4.125296 / 2.0 + 1e-3),
            Err(e) => prop_assert!(false, "{e}"),
        }
    }
}

#[test]
fn half_a_degree_on_five_inches() {
    // the must-show: 0°30′ on 5 in with the 81 set, error ≤ 0.0001 in/(2·5 in·cos θ)
    let set = BlockSet::from_catalogue("inch-81").unwrap();
    let solver = Solver::new(&set).unwrap();
    let fx = SineFixture::equal_rolls(Length::inches(5.0));
    let angle = Angle::parse("0°30'").unwrap();
    let t = two_stack(&solver, &fx, angle).unwrap();
    let bound = (0.0001f64 / (2.0 * 5.0 * 0.5f64.to_radians().cos())).to_degrees() * 3600.0;
    // sensitivity.csv, 5 in at 0°: 4.125296" per 0.0001 in; the bound is about half of it
    assert!((bound - 4.125296 / 2.0).abs() < 0.001, "{bound}");
    assert!(t.error.arcsec().abs() <= bound, "{}", t.error.arcsec());
    assert_eq!(t.height, Length::inches(0.0436));
    assert_eq!(t.raised.height - t.pivot.height, Length::inches(0.0436));
}
