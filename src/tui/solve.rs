//! The stacks for an attempt from the blocks a set has: a narrow door to the block solver,
//! giving the traveller's stack blocks in wringing order, or a message with what to do. One
//! stack for a height (after the small-angle check, which offers the remedies side by side when
//! the direct stack is poor), two stacks whose difference is a height (one under each roll), or
//! the two plates of a compound sine plate from one set with no block shared.

use super::shop_view::SetView;
use crate::blocks::plates::compound_stacks;
use crate::blocks::small::{Candidate, SmallAngle, small_angle};
use crate::blocks::{SolveError, Solver, Stack};
use crate::geometry::{CompoundSetting, SineFixture};
use crate::traveller::StackBlock;
use crate::units::{Angle, Length};

/// What the solver is asked for.
#[derive(Debug, Clone, PartialEq)]
pub enum SolveJob {
    /// One stack for `height`, protectors on its ends when asked (left off, with a note, when
    /// they cannot be used). With `small` the height is the setting's own: the small-angle check
    /// runs first.
    Single {
        height: Length,
        protectors: bool,
        small: Option<SmallCheck>,
    },
    /// Two stacks on one fixture, under the raised and the pivot roll, whose difference is
    /// `difference` (an attempt after a correction of a two-stack attempt).
    Difference {
        difference: Length,
        tallest: Option<Length>,
    },
    /// The two plates of a compound sine plate for `setting`.
    Compound {
        fixture: SineFixture,
        setting: CompoundSetting,
    },
    /// The two plates at given heights (an attempt after a correction); when they cannot be
    /// built together, the plates for `setting` as a fresh solve.
    Plates {
        near: Length,
        other: Length,
        fixture: SineFixture,
        setting: CompoundSetting,
    },
}

/// What the small-angle check needs: the fixture, the angle, the tallest stack it takes and
/// the shop's other fixtures that suit the work.
#[derive(Debug, Clone, PartialEq)]
pub struct SmallCheck {
    pub fixture: SineFixture,
    pub angle: Angle,
    pub largest: Option<Length>,
    pub candidates: Vec<Candidate>,
}

/// The solver's answer.
#[derive(Debug, Clone, PartialEq)]
pub enum Solution {
    /// One stack, bottom first, and something to tell the operator (protectors left off).
    Single {
        blocks: Vec<StackBlock>,
        note: Option<String>,
    },
    /// Two stacks at once: under the raised then the pivot roll, or the near then the other
    /// plate.
    Two {
        first: Vec<StackBlock>,
        second: Vec<StackBlock>,
        note: Option<String>,
    },
    /// The direct stack is poor: the small-angle remedies side by side, one chosen.
    Remedies(Box<SmallAngle>),
}

/// The traveller's blocks for a solver's stack, none ticked yet.
pub fn blocks_of(s: &Stack) -> Vec<StackBlock> {
    s.blocks
        .iter()
        .map(|b| StackBlock {
            size: b.size,
            protector: b.protector,
            wrung: false,
        })
        .collect()
}

/// Answer `job` from `set`.
pub fn run(set: &SetView, job: &SolveJob) -> Result<Solution, String> {
    let plain = Solver::new(&set.set).map_err(|e| e.to_string())?;
    match job {
        SolveJob::Single {
            height,
            protectors,
            small,
        } => single(&plain, *height, *protectors, small.as_ref()),
        SolveJob::Difference {
            difference,
            tallest,
        } => {
            let limits = crate::blocks::pair::PairLimits {
                tallest: *tallest,
                ..Default::default()
            };
            match crate::blocks::pair::pair_for_difference(&plain, *difference, &limits) {
                Ok(Some((raised, pivot))) => Ok(Solution::Two {
                    first: blocks_of(&raised),
                    second: blocks_of(&pivot),
                    note: None,
                }),
                Ok(None) => Err(format!(
                    "no two stacks with a difference of {} could be built from the set without sharing a block; choose another set or fixture (Esc)",
                    difference.show(plain.unit())
                )),
                Err(e) => Err(e.to_string()),
            }
        }
        SolveJob::Compound { fixture, setting } => plates(&plain, fixture, setting, None),
        SolveJob::Plates {
            near,
            other,
            fixture,
            setting,
        } => match plain.solve_many(&[*near, *other]) {
            Ok(v) if v.len() == 2 => Ok(Solution::Two {
                first: blocks_of(&v[0]),
                second: blocks_of(&v[1]),
                note: None,
            }),
            _ => plates(
                &plain,
                fixture,
                setting,
                Some(format!(
                    "the corrected heights {} and {} cannot be built together from the set; these are the nearest the set builds",
                    near.show(plain.unit()),
                    other.show(plain.unit())
                )),
            ),
        },
    }
}

fn plates(
    plain: &Solver,
    fixture: &SineFixture,
    setting: &CompoundSetting,
    note: Option<String>,
) -> Result<Solution, String> {
    let r = compound_stacks(plain, fixture, fixture, setting).map_err(|e| {
        format!("{e}; choose another set (Esc), or a fixture that takes taller stacks")
    })?;
    Ok(Solution::Two {
        first: blocks_of(&r.near),
        second: blocks_of(&r.other),
        note,
    })
}

fn single(
    plain: &Solver,
    height: Length,
    protectors: bool,
    small: Option<&SmallCheck>,
) -> Result<Solution, String> {
    let mut note = None;
    if protectors {
        let with = plain.with_protectors(true).map_err(|e| e.to_string())?;
        match with.solve(height) {
            Ok(s) => {
                return Ok(Solution::Single {
                    blocks: blocks_of(&s),
                    note: None,
                });
            }
            Err(_) => {
                note = Some(format!(
                    "the protector blocks are left off: with them the set cannot build {}",
                    height.show(plain.unit())
                ))
            }
        }
    }
    if let Some(c) = small
        && let Some(s) = small_angle(plain, &c.fixture, c.angle, c.largest, &c.candidates)
    {
        return Ok(Solution::Remedies(Box::new(s)));
    }
    match plain.solve(height) {
        Ok(s) => Ok(Solution::Single {
            blocks: blocks_of(&s),
            note,
        }),
        Err(e) => {
            let mut msg = e.to_string();
            if matches!(e, SolveError::BelowSmallest { .. }) {
                msg.push_str(
                    ". Small angle: put a stack under each roll whose difference is the height, or use a longer fixture",
                );
            }
            Err(msg)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tui::shop_view::ShopView;

    fn demo() -> ShopView {
        ShopView::from_shop(&crate::shop::Shop::built_in())
    }

    fn total(b: &[StackBlock]) -> Length {
        b.iter().map(|b| b.size).sum()
    }

    #[test]
    fn two_and_a_half_inches_from_the_demo_set() {
        let shop = demo();
        let set = &shop.sets[0];
        let job = |protectors| SolveJob::Single {
            height: Length::inches(2.5),
            protectors,
            small: None,
        };
        let Ok(Solution::Single { blocks, note }) = run(set, &job(false)) else {
            panic!("a single stack")
        };
        assert_eq!(total(&blocks), Length::inches(2.5));
        // 2 + 0.5: two blocks is the fewest (81-piece set, standards.md composition)
        assert_eq!(blocks.len(), 2);
        assert_eq!(note, None);
        let Ok(Solution::Single { blocks, .. }) = run(set, &job(true)) else {
            panic!("a single stack")
        };
        assert!(blocks[0].protector && blocks[blocks.len() - 1].protector);
        assert_eq!(total(&blocks), Length::inches(2.5));
    }

    #[test]
    fn protectors_too_tall_for_the_stack_are_left_off_with_a_note() {
        // 0.125 in: the two 0.050 in protectors leave 0.025 in, below the set's smallest block
        let shop = demo();
        let r = run(
            &shop.sets[0],
            &SolveJob::Single {
                height: Length::inches(0.125),
                protectors: true,
                small: None,
            },
        );
        let Ok(Solution::Single { blocks, note }) = r else {
            panic!("{r:?}")
        };
        assert_eq!(total(&blocks), Length::inches(0.125));
        assert!(blocks.iter().all(|b| !b.protector));
        assert!(note.is_some_and(|n| n.contains("left off")));
    }

    #[test]
    fn too_low_says_what_to_do() {
        let shop = demo();
        let e = run(
            &shop.sets[0],
            &SolveJob::Single {
                height: Length::inches(0.02),
                protectors: false,
                small: None,
            },
        )
        .unwrap_err();
        assert!(e.contains("stack under each roll"), "{e}");
    }

    #[test]
    fn a_small_angle_offers_the_remedies() {
        // 5 in · sin 0.5° = 0.0436 in: below the 0.050 in block (standards.md 81-piece series)
        let shop = demo();
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let r = run(
            &shop.sets[0],
            &SolveJob::Single {
                height: Length::inches(0.0436),
                protectors: false,
                small: Some(SmallCheck {
                    fixture: fx,
                    angle: Angle::from_deg(0.5),
                    largest: None,
                    candidates: Vec::new(),
                }),
            },
        );
        let Ok(Solution::Remedies(s)) = r else {
            panic!("{r:?}")
        };
        let two = s.two_stacks.as_ref().expect("two stacks");
        assert_eq!(two.raised.height - two.pivot.height, Length::inches(0.0436));
    }

    #[test]
    fn compound_plates_share_no_block() {
        // compound.csv: 30°/20° on 5 in plates → 2.5000 and 1.5031 in on the 0.0001 in grid
        let shop = demo();
        let fx = SineFixture::equal_rolls(Length::inches(5.0));
        let setting = crate::geometry::compound(Angle::from_deg(30.0), Angle::from_deg(20.0))
            .expect("a setting");
        let r = run(
            &shop.sets[0],
            &SolveJob::Compound {
                fixture: fx,
                setting,
            },
        );
        let Ok(Solution::Two { first, second, .. }) = r else {
            panic!("{r:?}")
        };
        assert_eq!(total(&first), Length::inches(2.5));
        assert_eq!(total(&second), Length::inches(1.5031));
    }
}
