//! Why a height, or a group of heights, cannot be built from a set, with the nearest heights
//! that can.

use super::table::MAX_STEPS;
use crate::units::{Length, Unit};
use std::fmt;

/// The buildable heights nearest to one that cannot be built.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct Nearest {
    pub below: Option<Length>,
    pub above: Option<Length>,
}

/// Why a height (or a group of heights) cannot be built.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum SolveError {
    /// Zero or negative.
    NotPositive { height: Length, unit: Unit },
    /// Lower than the smallest stack the set makes.
    BelowSmallest {
        height: Length,
        smallest: Length,
        nearest: Nearest,
        unit: Unit,
    },
    /// Taller than every usable block together.
    AboveTotal {
        height: Length,
        total: Length,
        nearest: Nearest,
        unit: Unit,
    },
    /// Finer than the set's sizes go.
    OffStep {
        height: Length,
        step: Length,
        nearest: Nearest,
        unit: Unit,
    },
    /// Within the set's range, but no combination adds up to it.
    Gap {
        height: Length,
        nearest: Nearest,
        unit: Unit,
    },
    /// Protectors asked for, but the set has none.
    NoProtectors { set: String },
    /// Protectors asked for on more than one stack; a set has one pair.
    OnePairOnly { stacks: usize },
    /// Each height can be built alone, but not all at once without sharing a block.
    NotDisjoint { heights: Vec<Length>, unit: Unit },
    /// The search for several heights took too long to decide.
    SearchLimit { heights: Vec<Length>, unit: Unit },
    /// Nothing usable in the set.
    NoUsableBlocks { set: String },
    /// The sizes have so fine a common step that the table would be too large.
    TooFine { set: String, steps: u128 },
    /// Too many blocks (or worn blocks) for the table's cost counter.
    TooManyBlocks { set: String, blocks: usize },
}

fn show(l: Length, unit: Unit) -> String {
    format!("{} {}", l.exact_number(unit, unit.places()), unit.symbol())
}

fn list(hs: &[Length], unit: Unit) -> String {
    hs.iter()
        .map(|h| show(*h, unit))
        .collect::<Vec<_>>()
        .join(", ")
}

impl SolveError {
    /// The nearest buildable heights, when the error is about one height the set cannot make.
    pub fn nearest(&self) -> Option<Nearest> {
        match self {
            SolveError::BelowSmallest { nearest, .. }
            | SolveError::AboveTotal { nearest, .. }
            | SolveError::OffStep { nearest, .. }
            | SolveError::Gap { nearest, .. } => Some(*nearest),
            _ => None,
        }
    }
    /// The height the error is about, when it is about one height.
    pub fn height(&self) -> Option<Length> {
        match self {
            SolveError::NotPositive { height, .. }
            | SolveError::BelowSmallest { height, .. }
            | SolveError::AboveTotal { height, .. }
            | SolveError::OffStep { height, .. }
            | SolveError::Gap { height, .. } => Some(*height),
            _ => None,
        }
    }
    /// The reason alone, without the nearest heights.
    pub fn reason(&self) -> String {
        match self {
            SolveError::NotPositive { height, unit } => format!(
                "{} is not a stack height: a stack must be taller than zero",
                show(*height, *unit)
            ),
            SolveError::BelowSmallest {
                height,
                smallest,
                unit,
                ..
            } => format!(
                "{} is below the smallest stack this set makes ({})",
                show(*height, *unit),
                show(*smallest, *unit)
            ),
            SolveError::AboveTotal {
                height,
                total,
                unit,
                ..
            } => format!(
                "{} is more than all the set's usable blocks together ({})",
                show(*height, *unit),
                show(*total, *unit)
            ),
            SolveError::OffStep {
                height, step, unit, ..
            } => format!(
                "{} is finer than the set's sizes go (every stack is a whole number of {} steps)",
                height.exact_number(*unit, 0) + " " + unit.symbol(),
                show(*step, *unit)
            ),
            SolveError::Gap { height, unit, .. } => format!(
                "{} falls between heights the set can make: no combination of its usable blocks adds up to it",
                show(*height, *unit)
            ),
            SolveError::NoProtectors { set } => format!(
                "set {set} has no protector blocks; leave out --protect, or add `protectors: 0.050in` (or 1mm, 2mm) to the set in the shop file"
            ),
            SolveError::OnePairOnly { stacks } => format!(
                "{stacks} stacks each need a pair of protector blocks, but a set has one pair; protect one stack only or none"
            ),
            SolveError::NotDisjoint { heights, unit } => format!(
                "{} can each be built, but not all at once from one set without sharing a block (tiltbook looks for up to {} blocks more than they need one by one); build one stack from a second set",
                list(heights, *unit),
                super::solver::EXTRA_BLOCKS
            ),
            SolveError::SearchLimit { heights, unit } => format!(
                "the search for {} at once from one set took too long to decide; build them from two sets",
                list(heights, *unit)
            ),
            SolveError::NoUsableBlocks { set } => format!(
                "set {set} has no usable blocks (all missing or damaged); check the set in the shop file"
            ),
            SolveError::TooFine { set, steps } => format!(
                "set {set}: its sizes have so fine a common step that tiltbook would need {steps} steps (it handles up to {MAX_STEPS}); check the sizes for a typing mistake"
            ),
            SolveError::TooManyBlocks { set, blocks } => format!(
                "set {set} has {blocks} usable blocks (or too many worn ones) for the solver; split it into two sets"
            ),
        }
    }
}

impl fmt::Display for SolveError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.reason())?;
        if let (Some(n), Some(unit)) = (self.nearest(), self.unit()) {
            let below = n.below.map(|l| show(l, unit));
            let above = n.above.map(|l| show(l, unit));
            match (below, above) {
                (Some(b), Some(a)) => write!(f, "; nearest buildable: {b} below, {a} above")?,
                (Some(b), None) => write!(f, "; nearest buildable: {b} below")?,
                (None, Some(a)) => write!(f, "; nearest buildable: {a} above")?,
                (None, None) => {}
            }
        }
        Ok(())
    }
}

impl std::error::Error for SolveError {}

impl SolveError {
    fn unit(&self) -> Option<Unit> {
        match self {
            SolveError::NotPositive { unit, .. }
            | SolveError::BelowSmallest { unit, .. }
            | SolveError::AboveTotal { unit, .. }
            | SolveError::OffStep { unit, .. }
            | SolveError::Gap { unit, .. }
            | SolveError::NotDisjoint { unit, .. }
            | SolveError::SearchLimit { unit, .. } => Some(*unit),
            _ => None,
        }
    }
}
