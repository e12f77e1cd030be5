//! A shop's own block set: the physical blocks it has (each with its condition), its grade,
//! calibration due date and protector pair.

use super::catalogue::{self, Grade};
use crate::units::{Length, NM_PER_INCH, NM_PER_MM, Unit};
use jiff::civil::Date;
use serde::Serialize;
use std::fmt;
use thiserror::Error;

/// The state of one physical block.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Default)]
#[serde(rename_all = "lowercase")]
pub enum Condition {
    /// In the box and fit to wring.
    #[default]
    Good,
    /// Usable, but used only when no stack of the same number of blocks avoids it.
    Worn,
    /// In the box but must not be wrung (burr, rust, a nick): never used.
    Damaged,
    /// Not in the box: never used.
    Missing,
}

impl Condition {
    /// May the solver put this block in a stack?
    pub fn usable(self) -> bool {
        matches!(self, Condition::Good | Condition::Worn)
    }
}

impl fmt::Display for Condition {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Condition::Good => "good",
            Condition::Worn => "worn",
            Condition::Damaged => "damaged",
            Condition::Missing => "missing",
        })
    }
}

/// One physical block of a set.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct Block {
    pub size: Length,
    pub condition: Condition,
}

/// A pair of protector (wear) blocks, wrung to both ends of a stack and counted in its height.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct Protectors {
    /// The size of each of the two blocks.
    pub size: Length,
}

/// What is wrong with a set's description.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum InventoryError {
    #[error(
        "'{0}' is not a standard set tiltbook knows; use inch-81, metric-88 or metric-112, or list the sizes"
    )]
    UnknownCatalogue(String),
    #[error(
        "{size} is listed as {what} more times than the set has blocks of that size to mark (it has {have}, each marked at most once as missing, damaged or worn); check the size"
    )]
    NotInSet {
        what: Condition,
        size: String,
        have: usize,
    },
    #[error("a block size must be more than zero, not {0}")]
    NotPositive(String),
    #[error("the set has no blocks; list at least one size")]
    Empty,
}

/// A block set as a shop has it.
#[derive(Debug, Clone, PartialEq)]
pub struct BlockSet {
    /// The shop's id for the set (or the catalogue id for a complete standard set).
    pub id: String,
    /// The standard set it was built from, if any.
    pub catalogue: Option<String>,
    /// The unit the blocks are marked in.
    pub unit: Unit,
    /// Every physical block, in the order listed (catalogue order for a standard set).
    pub blocks: Vec<Block>,
    /// The protector pair, if the set has one.
    pub protectors: Option<Protectors>,
    pub grade: Option<Grade>,
    pub calibration_due: Option<Date>,
    /// What the blocks are made of, in words (steel, chrome carbide, tungsten carbide, ceramic).
    pub material: Option<String>,
    /// Free text.
    pub note: Option<String>,
}

impl BlockSet {
    /// A complete, unmarked standard set; its id is the catalogue id.
    pub fn from_catalogue(id: &str) -> Result<BlockSet, InventoryError> {
        let c = catalogue::set(id).ok_or_else(|| InventoryError::UnknownCatalogue(id.into()))?;
        let mut s = BlockSet::from_sizes(c.id, c.unit, &c.sizes)?;
        s.catalogue = Some(c.id.to_string());
        Ok(s)
    }

    /// A set of the given sizes, `count` blocks of each, all good.
    pub fn from_sizes(
        id: &str,
        unit: Unit,
        sizes: &[(Length, u32)],
    ) -> Result<BlockSet, InventoryError> {
        let mut blocks = Vec::new();
        for &(size, n) in sizes {
            if size.nm() <= 0 {
                return Err(InventoryError::NotPositive(size.show(unit)));
            }
            for _ in 0..n {
                blocks.push(Block {
                    size,
                    condition: Condition::Good,
                });
            }
        }
        if blocks.is_empty() {
            return Err(InventoryError::Empty);
        }
        Ok(BlockSet {
            id: id.to_string(),
            catalogue: None,
            unit,
            blocks,
            protectors: None,
            grade: None,
            calibration_due: None,
            material: None,
            note: None,
        })
    }

    /// Mark one more block of `size` with `condition` (the first good one of that size).
    pub fn mark(&mut self, size: Length, condition: Condition) -> Result<(), InventoryError> {
        self.mark_all(&[size], condition)
    }

    /// Mark one block per entry of `sizes` (a size listed twice marks two blocks).
    pub fn mark_all(
        &mut self,
        sizes: &[Length],
        condition: Condition,
    ) -> Result<(), InventoryError> {
        for &size in sizes {
            let slot = self
                .blocks
                .iter_mut()
                .find(|b| b.size == size && b.condition == Condition::Good);
            match slot {
                Some(b) => b.condition = condition,
                None => {
                    return Err(InventoryError::NotInSet {
                        what: condition,
                        size: self.show(size),
                        have: self.blocks.iter().filter(|b| b.size == size).count(),
                    });
                }
            }
        }
        Ok(())
    }

    /// Sizes of the blocks in `condition`, in set order.
    pub fn sizes_in(&self, condition: Condition) -> Vec<Length> {
        self.blocks
            .iter()
            .filter(|b| b.condition == condition)
            .map(|b| b.size)
            .collect()
    }

    /// How many blocks the solver may use.
    pub fn usable_count(&self) -> usize {
        self.blocks.iter().filter(|b| b.condition.usable()).count()
    }

    /// The sum of every usable block (the tallest stack the set can make, protectors aside).
    pub fn usable_total(&self) -> Length {
        self.blocks
            .iter()
            .filter(|b| b.condition.usable())
            .map(|b| b.size)
            .sum()
    }

    /// The step heights are rounded to for this set: 0.0001 in for an inch set; for a metric set
    /// 0.0005 mm when a usable block needs it (the 1.0005 mm block), else 0.001 mm.
    pub fn resolution(&self) -> Length {
        match self.unit {
            Unit::In => Length::from_nm(NM_PER_INCH / 10_000),
            Unit::Mm => {
                let fine = self
                    .blocks
                    .iter()
                    .any(|b| b.condition.usable() && b.size.nm() % (NM_PER_MM / 1000) != 0);
                Length::from_nm(if fine {
                    NM_PER_MM / 2000
                } else {
                    NM_PER_MM / 1000
                })
            }
        }
    }

    /// Decimal places that show every size and height of this set exactly at its resolution.
    pub fn places(&self) -> usize {
        match self.unit {
            Unit::In => 4,
            Unit::Mm if self.resolution().nm() < NM_PER_MM / 1000 => 4,
            Unit::Mm => 3,
        }
    }

    /// A length as this set's sizes are written: its unit, at least the usual places, exact.
    pub fn show(&self, l: Length) -> String {
        format!("{} {}", self.number(l), self.unit.symbol())
    }

    /// The number alone, exact, with at least the unit's usual places (`0.1008`, `1.0005`).
    pub fn number(&self, l: Length) -> String {
        l.exact_number(self.unit, self.unit.places())
    }

    /// A one-line description: id, standard set, block count.
    pub fn describe(&self) -> String {
        let from = match &self.catalogue {
            Some(c) if *c != self.id => format!(" ({c})"),
            _ => String::new(),
        };
        format!("{}{from}, {} blocks", self.id, self.blocks.len())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn marking_finds_the_block_or_says_why_not() {
        let mut s = BlockSet::from_catalogue("inch-81").unwrap();
        let b = Length::from_scaled(1008, Unit::In, 4).unwrap();
        assert!(s.mark(b, Condition::Missing).is_ok());
        assert_eq!(s.sizes_in(Condition::Missing), vec![b]);
        assert_eq!(s.usable_count(), 80);
        // there was only one 0.1008 in block
        let e = s.mark(b, Condition::Worn).unwrap_err().to_string();
        assert!(e.contains("0.1008 in"), "{e}");
        assert_eq!(s.show(b), "0.1008 in");
    }

    #[test]
    fn resolution_follows_the_fine_block() {
        // standards.md / DOMAIN.md: 0.0005 mm with a 1.0005 block, else 0.001 mm
        let mut s = BlockSet::from_catalogue("metric-88").unwrap();
        assert_eq!(s.resolution().nm(), 500);
        assert_eq!(s.show(Length::from_nm(1_000_500)), "1.0005 mm");
        assert_eq!(s.show(Length::from_nm(58_345_000)), "58.345 mm");
        s.mark(Length::from_nm(1_000_500), Condition::Missing)
            .unwrap();
        assert_eq!(s.resolution().nm(), 1000);
        let i = BlockSet::from_catalogue("inch-81").unwrap();
        assert_eq!(i.resolution().nm(), 2540);
    }
}
