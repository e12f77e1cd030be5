//! Small angles: when the single stack for an angle cannot be built well from a set, the
//! remedies side by side and the one tiltbook chooses.
//!
//! # When a remedy is offered (the threshold)
//! The single stack is rounded to the set's resolution, so at best it is off by half a step of
//! height: an angle error of at most half the sensitivity, step/(2·C·cos θ). The direct stack
//! is called **poor** when the best single stack the set can build on this fixture misses the
//! angle by more than that, i.e. when the rounded height itself cannot be built: it is below the
//! smallest stack the set makes, in one of the set's gaps, or needs a block that is missing.
//! (A height taller than the whole set, or one that rounds to zero, is not a small-angle matter.)
//!
//! # The remedies
//! - **two stacks** on the same fixture, one under each roll, whose difference is the height
//!   ([`super::pair::two_stack_within`]);
//! - **a longer fixture** from the shop: the single stack on each suitable fixture whose centre
//!   distance is at least [`LONGER_FACTOR`] times this one's (the same angle then needs a
//!   taller stack, often one the set makes);
//! - the **nearest single stack** on this fixture, for comparison.
//!
//! # The choice
//! The smallest angle error wins. Errors within [`SAME_ERROR_ARCSEC`] of each other count as
//! equal; then the fewer blocks win (less to wring and to check), and at equal blocks the
//! order above (staying on the same fixture first).

use super::pair::{PairError, PairLimits, TwoStack, two_stack_within};
use super::solver::{SolveError, Solver, Stack};
use crate::geometry::SineFixture;
use crate::units::{Angle, Length, Unit};

/// Errors closer than this count as the same when choosing (arc-seconds).
pub const SAME_ERROR_ARCSEC: f64 = 0.05;

/// A fixture counts as longer when its centre distance is at least this many times the
/// fixture's in use (a fixture of the same nominal size is no remedy). Common practice (no
/// source): the next size up is 10 in for a 5 in bar, 200 mm for a 100 mm one.
pub const LONGER_FACTOR: f64 = 1.1;

/// A fixture from the shop that might set the angle instead.
#[derive(Debug, Clone, PartialEq)]
pub struct Candidate {
    /// The shop's id for it.
    pub id: String,
    pub fixture: SineFixture,
    /// The tallest stack it takes.
    pub largest_stack: Option<Length>,
    /// The unit its centre distance is written in (for showing it).
    pub unit: Unit,
    /// Something to say about it (its calibration is due, it is not rated for the angle…).
    pub note: Option<String>,
}

/// One single stack on one fixture and what it gives.
#[derive(Debug, Clone, PartialEq)]
pub struct Single {
    pub stack: Stack,
    /// The exact height for the angle on this fixture (nearest nanometre).
    pub ideal_height: Length,
    pub achieved: Angle,
    /// achieved − nominal.
    pub error: Angle,
    /// True when the stack is not the rounded height but the nearest the set builds.
    pub nearest_only: bool,
}

/// A single stack on a longer fixture, or why there is none.
#[derive(Debug, Clone, PartialEq)]
pub struct Longer {
    pub candidate: Candidate,
    pub result: Result<Single, String>,
}

/// Which remedy is chosen.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Remedy {
    /// Two stacks on the same fixture.
    TwoStacks,
    /// One stack on the longer fixture at this index of [`SmallAngle::longer`].
    Longer(usize),
    /// The nearest single stack on the same fixture.
    Nearest,
}

/// The remedies for a small angle, side by side, and the choice.
#[derive(Debug, Clone, PartialEq)]
pub struct SmallAngle {
    /// Why the direct stack is poor, in words.
    pub reason: String,
    /// Half the sensitivity step at this angle: the error a buildable rounded stack stays within.
    pub half_step: Angle,
    /// The nearest single stack on this fixture, if the set makes any.
    pub nearest: Option<Single>,
    pub two_stacks: Result<TwoStack, PairError>,
    pub longer: Vec<Longer>,
    pub chosen: Remedy,
    /// Why, in words.
    pub why: String,
}

impl SmallAngle {
    /// The error of the chosen remedy.
    pub fn chosen_error(&self) -> Option<Angle> {
        match self.chosen {
            Remedy::TwoStacks => self.two_stacks.as_ref().ok().map(|t| t.error),
            Remedy::Longer(i) => self
                .longer
                .get(i)
                .and_then(|l| l.result.as_ref().ok())
                .map(|s| s.error),
            Remedy::Nearest => self.nearest.as_ref().map(|s| s.error),
        }
    }
}

/// The best single stack for `angle` on `fixture`: the rounded height if the set builds it,
/// else the nearer (in angle) of the nearest buildable heights.
pub fn best_single(
    solver: &Solver,
    fixture: &SineFixture,
    angle: Angle,
    largest: Option<Length>,
) -> Result<Single, String> {
    let ideal = fixture.ideal_height(angle).map_err(|e| e.to_string())?;
    let rounded = ideal.round_to(solver.step());
    let fits = |h: Length| largest.is_none_or(|m| h <= m);
    let mut heights = Vec::new();
    let direct = solver.fewest(rounded).is_some() && fits(rounded);
    if direct {
        heights.push(rounded);
    } else {
        let n = solver.nearest(rounded);
        heights.extend(n.below.into_iter().chain(n.above).filter(|&h| fits(h)));
    }
    let mut best: Option<Single> = None;
    for h in heights {
        let Ok(achieved) = fixture.angle_for_height(h) else {
            continue;
        };
        let Ok(stack) = solver.solve(h) else { continue };
        let error = achieved - angle;
        if best
            .as_ref()
            .is_none_or(|b| error.arcsec().abs() < b.error.arcsec().abs())
        {
            best = Some(Single {
                stack,
                ideal_height: ideal,
                achieved,
                error,
                nearest_only: !direct,
            });
        }
    }
    best.ok_or_else(|| {
        let u = solver.unit();
        match largest {
            Some(m) if !fits(rounded) => format!(
                "the stack {} is taller than the fixture takes ({})",
                rounded.show(u),
                m.show(u)
            ),
            _ => format!("the set makes no stack near {}", rounded.show(u)),
        }
    })
}

/// Why the direct stack for `angle` on `fixture` is poor, or `None` when the set builds the
/// rounded height (see the module notes for the threshold). A stack taller than the whole set,
/// or no stack at all (0°), is not a small-angle matter: `None` as well.
pub fn direct_is_poor(solver: &Solver, fixture: &SineFixture, angle: Angle) -> Option<String> {
    let ideal = fixture.ideal_height(angle).ok()?;
    let step = solver.step();
    let rounded = ideal.round_to(step);
    match solver.solve(rounded) {
        Ok(_) => None,
        Err(SolveError::AboveTotal { .. } | SolveError::NotPositive { .. }) => None,
        Err(e) => Some(poor_reason(
            &e,
            Angle::from_deg(fixture.sensitivity(angle, step).deg() / 2.0),
        )),
    }
}

/// Why a direct stack is poor, in words: the solver's reason and half the sensitivity step.
pub fn poor_reason(e: &SolveError, half_step: Angle) -> String {
    format!(
        "the single stack cannot be built: {}; any stack the set builds is off by more than half a step of height ({:.2}\")",
        e.reason(),
        half_step.arcsec()
    )
}

/// The small-angle remedies for `angle` on `fixture` with the set behind `solver`, or `None`
/// when the direct stack is good (see the module notes). `largest` is the tallest stack the
/// fixture takes; `candidates` are the shop's other fixtures that suit the work (only longer ones,
/// [`LONGER_FACTOR`], are tried).
pub fn small_angle(
    solver: &Solver,
    fixture: &SineFixture,
    angle: Angle,
    largest: Option<Length>,
    candidates: &[Candidate],
) -> Option<SmallAngle> {
    let reason = direct_is_poor(solver, fixture, angle)?;
    Some(remedies(
        solver, fixture, angle, largest, candidates, reason,
    ))
}

/// Every remedy for `angle` on `fixture`, whether or not the direct stack is poor (`reason`
/// says why they are wanted), with the best chosen.
pub fn remedies(
    solver: &Solver,
    fixture: &SineFixture,
    angle: Angle,
    largest: Option<Length>,
    candidates: &[Candidate],
    reason: String,
) -> SmallAngle {
    let half_step = Angle::from_deg(fixture.sensitivity(angle, solver.step()).deg() / 2.0);
    let nearest = best_single(solver, fixture, angle, largest).ok();
    let limits = PairLimits {
        tallest: largest,
        ..PairLimits::default()
    };
    let two_stacks = two_stack_within(solver, fixture, angle, &limits);
    let mut longer: Vec<Longer> = candidates
        .iter()
        .filter(|c| c.fixture.center.nm() as f64 >= fixture.center.nm() as f64 * LONGER_FACTOR)
        .map(|c| Longer {
            candidate: c.clone(),
            result: best_single(solver, &c.fixture, angle, c.largest_stack),
        })
        .collect();
    longer.sort_by(|a, b| {
        let e = |l: &Longer| {
            l.result
                .as_ref()
                .map_or(f64::INFINITY, |s| s.error.arcsec().abs())
        };
        e(a).total_cmp(&e(b))
            .then(a.candidate.fixture.center.cmp(&b.candidate.fixture.center))
    });
    let (chosen, why) = choose(&nearest, &two_stacks, &longer);
    SmallAngle {
        reason,
        half_step,
        nearest,
        two_stacks,
        longer,
        chosen,
        why,
    }
}

fn choose(
    nearest: &Option<Single>,
    two: &Result<TwoStack, PairError>,
    longer: &[Longer],
) -> (Remedy, String) {
    // (remedy, |error| in arc-seconds, blocks, words)
    let mut options: Vec<(Remedy, f64, usize, String)> = Vec::new();
    if let Ok(t) = two {
        options.push((
            Remedy::TwoStacks,
            t.error.arcsec().abs(),
            t.block_count(),
            "two stacks on this fixture".into(),
        ));
    }
    if let Some((i, l, s)) = longer
        .iter()
        .enumerate()
        .find_map(|(i, l)| l.result.as_ref().ok().map(|s| (i, l, s)))
    {
        options.push((
            Remedy::Longer(i),
            s.error.arcsec().abs(),
            s.stack.block_count(),
            format!("one stack on the longer fixture {}", l.candidate.id),
        ));
    }
    if let Some(s) = nearest {
        options.push((
            Remedy::Nearest,
            s.error.arcsec().abs(),
            s.stack.block_count(),
            "the nearest single stack on this fixture".into(),
        ));
    }
    let Some(first) = options.first().cloned() else {
        return (
            Remedy::Nearest,
            "nothing the set builds comes near this angle; use another set or fixture".into(),
        );
    };
    let mut best = first;
    for o in options.iter().skip(1) {
        let better =
            o.1 < best.1 - SAME_ERROR_ARCSEC || (o.1 <= best.1 + SAME_ERROR_ARCSEC && o.2 < best.2);
        if better {
            best = o.clone();
        }
    }
    let others: Vec<String> = options
        .iter()
        .filter(|o| o.0 != best.0)
        .map(|o| format!("{:.2}\" for {}", o.1, o.3))
        .collect();
    let mut why = format!("{}: ", best.3);
    let smallest = options
        .iter()
        .all(|o| o.0 == best.0 || o.1 >= best.1 - 1e-9);
    if smallest {
        why.push_str(&format!("the smallest angle error ({:.2}\"", best.1));
    } else {
        why.push_str(&format!(
            "as good an angle error ({:.2}\") with fewer blocks ({}",
            best.1, best.2
        ));
    }
    if others.is_empty() {
        why.push_str("; no other remedy could be built)");
    } else {
        why.push_str(&format!(" against {})", others.join(", ")));
    }
    (best.0, why)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::blocks::BlockSet;

    fn inch81() -> Solver {
        Solver::new(&BlockSet::from_catalogue("inch-81").unwrap()).unwrap()
    }

    #[test]
    fn thirty_degrees_needs_no_remedy() {
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        assert!(small_angle(&inch81(), &fx, Angle::from_deg(30.0), None, &[]).is_none());
    }

    #[test]
    fn half_a_degree_takes_two_stacks_over_a_ten_inch_bar() {
        // 10 in · sin 0.5° = 0.0873 in: in the gap between 0.050 and 0.1001 in of the 81 set
        // (standards.md series), so the longer bar only offers a nearest stack
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let ten = Candidate {
            id: "TEN".into(),
            fixture: SineFixture::equal_rolls(Length::inches(10.0)),
            largest_stack: None,
            unit: Unit::In,
            note: None,
        };
        let s = small_angle(&inch81(), &fx, Angle::from_deg(0.5), None, &[ten]).unwrap();
        assert_eq!(s.chosen, Remedy::TwoStacks, "{}", s.why);
        assert!(s.why.contains("smallest angle error"), "{}", s.why);
        let l = s.longer[0].result.as_ref().unwrap();
        assert!(l.nearest_only);
    }

    #[test]
    fn a_longer_bar_wins_when_its_error_is_smaller() {
        // the angle whose stack on a 12 in bar is the single 0.131 in block: on 5 in it needs
        // 0.0545833 in (a gap of the 81 set between 0.050 and 0.1001 in), so two stacks whose
        // difference is 0.0546 in, off by 0.0000167 in (0.69"); the 12 in bar is exact
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let twelve = Candidate {
            id: "TWELVE".into(),
            fixture: SineFixture::equal_rolls(Length::inches(12.0)),
            largest_stack: None,
            unit: Unit::In,
            note: None,
        };
        let angle = Angle::from_rad((0.131f64 / 12.0).asin());
        let s = small_angle(&inch81(), &fx, angle, None, &[twelve]).unwrap();
        assert_eq!(s.chosen, Remedy::Longer(0), "{}", s.why);
        assert!(
            s.why
                .starts_with("one stack on the longer fixture TWELVE: the smallest"),
            "{}",
            s.why
        );
        let two = s.two_stacks.as_ref().unwrap();
        assert_eq!(two.height, Length::inches(0.0546));
        assert!(
            (two.error.arcsec() - 0.69).abs() < 0.01,
            "{}",
            two.error.arcsec()
        );
    }

    fn single(err: f64, blocks: usize) -> Single {
        let b = crate::blocks::StackBlock {
            size: Length::inches(0.1),
            protector: false,
            worn: false,
            set_index: None,
        };
        Single {
            stack: Stack {
                height: Length::inches(0.1 * blocks as f64),
                blocks: vec![b; blocks],
            },
            ideal_height: Length::ZERO,
            achieved: Angle::from_arcsec(err),
            error: Angle::from_arcsec(err),
            nearest_only: false,
        }
    }

    #[test]
    fn fewer_blocks_break_a_tie() {
        let two = Err(PairError::NothingToBuild);
        let longer = vec![Longer {
            candidate: Candidate {
                id: "L".into(),
                fixture: SineFixture::equal_rolls(Length::inches(10.0)),
                largest_stack: None,
                unit: Unit::In,
                note: None,
            },
            result: Ok(single(1.00, 3)),
        }];
        // 0.98" in one block against 1.00" in three: as good, fewer blocks
        let (r, why) = choose(&Some(single(-0.98, 1)), &two, &longer);
        assert_eq!(r, Remedy::Nearest);
        assert!(why.contains("the smallest angle error (0.98\""), "{why}");
        let (r, why) = choose(&Some(single(1.02, 1)), &two, &longer);
        assert_eq!(r, Remedy::Nearest);
        assert!(why.contains("fewer blocks (1"), "{why}");
        // a clear difference in error beats the count
        let (r, _) = choose(&Some(single(1.2, 1)), &two, &longer);
        assert_eq!(r, Remedy::Longer(0));
    }
}
