//! The stack solver: the fewest gauge blocks that add up exactly to a height.
//!
//! # Rules
//! - Exact integer arithmetic: heights are whole steps of the greatest common divisor of the
//!   set's usable sizes (0.0001 in for the inch set, 0.0005 mm for the metric sets).
//! - Each physical block at most once; missing and damaged blocks never.
//! - Fewest blocks first. Worn blocks only when no stack of the same number of blocks avoids
//!   them (then as few as possible), and the stack reports them.
//! - Protector blocks, when asked for, go on both ends and count in the height; the solver
//!   finds the fewest blocks for what is left between them.
//! - **Tie-break** among stacks with the same number of blocks and of worn blocks: rank the
//!   set's usable blocks largest first (blocks of equal size in the order the set lists them);
//!   the chosen stack is the first in that ranking when the stacks are compared block by block,
//!   largest block first. In words: it takes the largest block it can at every step.
//! - Several heights at once ([`Solver::solve_many`]): no block is shared; the total number of
//!   blocks is the fewest possible (then the fewest worn); among equals, the first height gets
//!   the fewest blocks it can, then the largest-first rule, then the next height.
//! - Wringing order of a result: protector at the bottom, then largest to smallest, protector
//!   on top.
//!
//! # Method
//! [`Solver::new`] builds the table of the least cost for every height the set can make (see
//! [`super::table`]; about a millisecond). A solve is then a depth-first search, largest block
//! first, that only steps into a remainder the table says can still be finished within the
//! budget. The table is exact for the whole set, so the search starts at the optimum and never
//! has to prove a longer stack; it only backs out when the table's stack for a remainder needs
//! a block already in use. Several heights raise the total budget one step at a time from the
//! sum of their single-height optima (up to [`EXTRA_BLOCKS`] more blocks), with a second bound
//! for the later stacks over the blocks still free (see `search.rs`).

pub use super::solve_error::{Nearest, SolveError};

use super::inventory::BlockSet;
use super::search::Search;
use super::table::{self, MAX_STEPS, UNREACHABLE};
use crate::units::{Length, Unit};
use serde::Serialize;
use std::sync::Arc;

/// Several heights at once: how many blocks more than the heights need one by one the search
/// tries before it reports that they cannot be built together.
pub const EXTRA_BLOCKS: u32 = 4;

/// One block in a stack.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct StackBlock {
    pub size: Length,
    /// One of the set's protector pair.
    pub protector: bool,
    /// The block is marked worn in the set.
    pub worn: bool,
    /// Its place in [`BlockSet::blocks`] (`None` for a protector).
    pub set_index: Option<usize>,
}

/// A stack, in wringing order (bottom first).
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Stack {
    /// The exact sum of the blocks.
    pub height: Length,
    pub blocks: Vec<StackBlock>,
}

impl Stack {
    /// Number of blocks, protectors included.
    pub fn block_count(&self) -> usize {
        self.blocks.len()
    }
    /// Sizes in wringing order.
    pub fn sizes(&self) -> Vec<Length> {
        self.blocks.iter().map(|b| b.size).collect()
    }
    /// Sizes of the worn blocks it uses.
    pub fn worn(&self) -> Vec<Length> {
        self.blocks
            .iter()
            .filter(|b| b.worn)
            .map(|b| b.size)
            .collect()
    }
}

#[derive(Debug, Clone, Copy)]
pub(super) struct Entry {
    pub size: usize,
    pub cost: u16,
    pub worn: bool,
    pub set_index: usize,
}

#[derive(Debug)]
pub(super) struct Prepared {
    pub set_id: String,
    pub unit: Unit,
    pub step: i64,
    /// usable blocks, largest first (equal sizes in set order)
    pub entries: Vec<Entry>,
    /// suffix[j] = sum of entries[j..] sizes
    pub suffix: Vec<usize>,
    pub table: Vec<u16>,
    pub per_block: u16,
    pub protector: Option<Length>,
    /// heights are also checked modulo this many steps (0.01 in, 0.1 mm), see `search`
    pub modulus: usize,
}

/// A solver for one block set as the shop has it. Cheap to clone.
#[derive(Debug, Clone)]
pub struct Solver {
    p: Arc<Prepared>,
    protect: bool,
}

fn gcd(a: i64, b: i64) -> i64 {
    if b == 0 { a.abs() } else { gcd(b, a % b) }
}

impl Solver {
    /// Prepare a solver for `set`: builds the table of fewest blocks for every height.
    pub fn new(set: &BlockSet) -> Result<Solver, SolveError> {
        let usable: Vec<(usize, &super::inventory::Block)> = set
            .blocks
            .iter()
            .enumerate()
            .filter(|(_, b)| b.condition.usable() && b.size.nm() > 0)
            .collect();
        if usable.is_empty() {
            return Err(SolveError::NoUsableBlocks {
                set: set.id.clone(),
            });
        }
        let mut step = usable.iter().fold(0, |g, (_, b)| gcd(g, b.size.nm()));
        if let Some(p) = set.protectors {
            step = gcd(step, p.size.nm());
        }
        let step = step.max(1);
        let total: u128 = usable
            .iter()
            .map(|(_, b)| (b.size.nm() / step) as u128)
            .sum();
        if total > MAX_STEPS as u128 {
            return Err(SolveError::TooFine {
                set: set.id.clone(),
                steps: total,
            });
        }
        let worn = usable
            .iter()
            .filter(|(_, b)| b.condition == super::inventory::Condition::Worn)
            .count();
        let per_block = worn + 1;
        if (usable.len() as u64) * (per_block as u64 + 1) >= UNREACHABLE as u64 {
            return Err(SolveError::TooManyBlocks {
                set: set.id.clone(),
                blocks: usable.len(),
            });
        }
        let per_block = per_block as u16;
        let mut entries: Vec<Entry> = usable
            .iter()
            .map(|(i, b)| {
                let worn = b.condition == super::inventory::Condition::Worn;
                Entry {
                    size: (b.size.nm() / step) as usize,
                    cost: per_block + u16::from(worn),
                    worn,
                    set_index: *i,
                }
            })
            .collect();
        // largest first; equal sizes in set order (the tie-break's ranking)
        entries.sort_by(|a, b| b.size.cmp(&a.size).then(a.set_index.cmp(&b.set_index)));
        let mut suffix = vec![0usize; entries.len() + 1];
        for j in (0..entries.len()).rev() {
            suffix[j] = suffix[j + 1] + entries[j].size;
        }
        let pairs: Vec<(usize, u16)> = entries.iter().map(|e| (e.size, e.cost)).collect();
        let table = table::build(&pairs, total as usize);
        // 0.01 in or 0.1 mm (or the coarsest decimal of the unit the step divides, at most 256 steps)
        let modulus = (1..=4)
            .map(|d| set.unit.nm() / 10_i64.pow(d))
            .filter(|size| size % step == 0 && size / step <= 256)
            .map(|size| (size / step) as usize)
            .max()
            .unwrap_or(1);
        Ok(Solver {
            p: Arc::new(Prepared {
                set_id: set.id.clone(),
                unit: set.unit,
                step,
                entries,
                suffix,
                table,
                per_block,
                protector: set.protectors.map(|p| p.size),
                modulus,
            }),
            protect: false,
        })
    }

    /// The same solver with protector blocks on (or off) for every stack it builds.
    pub fn with_protectors(&self, on: bool) -> Result<Solver, SolveError> {
        if on && self.p.protector.is_none() {
            return Err(SolveError::NoProtectors {
                set: self.p.set_id.clone(),
            });
        }
        Ok(Solver {
            p: Arc::clone(&self.p),
            protect: on,
        })
    }

    /// Are protectors on?
    pub fn protected(&self) -> bool {
        self.protect
    }

    /// The id of the set this solver was built for.
    pub fn set_id(&self) -> &str {
        &self.p.set_id
    }

    /// The unit the set's blocks are marked in.
    pub fn unit(&self) -> Unit {
        self.p.unit
    }

    /// The common step of the set's sizes (every buildable height is a whole number of steps).
    pub fn step(&self) -> Length {
        Length::from_nm(self.p.step)
    }

    /// Bytes the table takes.
    pub fn table_bytes(&self) -> usize {
        self.p.table.len() * std::mem::size_of::<u16>()
    }

    fn ends(&self) -> i64 {
        match (self.protect, self.p.protector) {
            (true, Some(p)) => 2 * p.nm(),
            _ => 0,
        }
    }

    /// The fewest blocks (protectors included) that make `height`, if it can be made.
    pub fn fewest(&self, height: Length) -> Option<usize> {
        let inner = height.nm().saturating_sub(self.ends());
        if height.nm() <= 0 || inner < 0 || inner % self.p.step != 0 {
            return None;
        }
        let c = *self.p.table.get((inner / self.p.step) as usize)?;
        if c == UNREACHABLE || (inner == 0 && !self.protect) {
            return None;
        }
        Some((c / self.p.per_block) as usize + if self.protect { 2 } else { 0 })
    }

    /// The fewest blocks for every whole step from one step up to the set's total (protectors
    /// left out): `counts[i]` is for a height of `i + 1` steps; `None` where it cannot be made.
    pub fn fewest_counts(&self) -> Vec<Option<u8>> {
        let k = self.p.per_block;
        self.p.table[1..]
            .iter()
            .map(|&c| (c != UNREACHABLE).then(|| (c / k).min(255) as u8))
            .collect()
    }

    /// The tallest stack (every usable block, plus protectors when on).
    pub fn total(&self) -> Length {
        Length::from_nm((self.p.table.len() as i64 - 1) * self.p.step + self.ends())
    }

    /// The stack for one height.
    pub fn solve(&self, height: Length) -> Result<Stack, SolveError> {
        if height.nm() <= 0 {
            return Err(SolveError::NotPositive {
                height,
                unit: self.p.unit,
            });
        }
        let mut v = self.solve_many(&[height])?;
        v.pop().ok_or(SolveError::NotPositive {
            height,
            unit: self.p.unit,
        })
    }

    /// Stacks for several heights at once from this one set, no block shared (a zero height
    /// gives an empty stack). See the module notes for the rules.
    pub fn solve_many(&self, heights: &[Length]) -> Result<Vec<Stack>, SolveError> {
        let unit = self.p.unit;
        let nonzero = heights.iter().filter(|h| h.nm() != 0).count();
        if self.protect && nonzero > 1 {
            return Err(SolveError::OnePairOnly { stacks: nonzero });
        }
        let mut targets = Vec::with_capacity(heights.len());
        let mut bounds = Vec::with_capacity(heights.len());
        for &h in heights {
            if h.nm() == 0 {
                targets.push(0usize);
                bounds.push(0u16);
                continue;
            }
            let t = self.index_of(h)?;
            targets.push(t);
            bounds.push(self.p.table[t]);
        }
        let need: usize = targets.iter().sum();
        if need > self.p.table.len() - 1 {
            return Err(SolveError::NotDisjoint {
                heights: heights.to_vec(),
                unit,
            });
        }
        let least: u32 = bounds.iter().map(|&b| b as u32).sum();
        let all: u32 = self.p.entries.iter().map(|e| e.cost as u32).sum();
        let most = all.min(least + EXTRA_BLOCKS * self.p.per_block as u32);
        let mut s = Search::new(&self.p, &targets, &bounds);
        for budget in least..=most {
            match s.stacks_from(0, budget) {
                Ok(true) => return Ok(self.assemble(heights, &s.path, &s.ends)),
                // not at the least cost: first see whether two heights need the same block
                Ok(false) if budget == least && s.shared_necessary_block() => {
                    return Err(SolveError::NotDisjoint {
                        heights: heights.to_vec(),
                        unit,
                    });
                }
                Ok(false) => {}
                Err(()) => {
                    return Err(SolveError::SearchLimit {
                        heights: heights.to_vec(),
                        unit,
                    });
                }
            }
        }
        Err(SolveError::NotDisjoint {
            heights: heights.to_vec(),
            unit,
        })
    }

    /// The table index of a height's inner part (between protectors), or why it cannot be built.
    fn index_of(&self, h: Length) -> Result<usize, SolveError> {
        let unit = self.p.unit;
        if h.nm() <= 0 {
            return Err(SolveError::NotPositive { height: h, unit });
        }
        let step = self.p.step;
        let ends = self.ends();
        let inner = h.nm().saturating_sub(ends);
        let max = (self.p.table.len() - 1) as i64;
        let nearest = || self.nearest(h);
        let smallest_inner = if self.protect {
            0
        } else {
            self.p.entries.last().map(|e| e.size as i64).unwrap_or(0) * step
        };
        if inner < smallest_inner {
            return Err(SolveError::BelowSmallest {
                height: h,
                smallest: Length::from_nm(smallest_inner + ends),
                nearest: nearest(),
                unit,
            });
        }
        if inner > max * step {
            return Err(SolveError::AboveTotal {
                height: h,
                total: Length::from_nm(max * step + ends),
                nearest: nearest(),
                unit,
            });
        }
        if inner % step != 0 {
            return Err(SolveError::OffStep {
                height: h,
                step: Length::from_nm(step),
                nearest: nearest(),
                unit,
            });
        }
        let i = (inner / step) as usize;
        if self.p.table[i] == UNREACHABLE {
            return Err(SolveError::Gap {
                height: h,
                nearest: nearest(),
                unit,
            });
        }
        Ok(i)
    }

    /// The buildable heights nearest to `h` below and above (not `h` itself).
    pub fn nearest(&self, h: Length) -> Nearest {
        let step = self.p.step;
        let ends = self.ends();
        let inner = h.nm().saturating_sub(ends);
        let max = (self.p.table.len() - 1) as i64;
        let lowest = if self.protect { 0 } else { 1 };
        let ok = |i: i64| self.p.table[i as usize] != UNREACHABLE;
        let to_len = |i: i64| Length::from_nm(i * step + ends);
        // below: the largest index i with i*step < inner
        let mut i = inner.saturating_sub(1).div_euclid(step).min(max);
        let mut below = None;
        while i >= lowest {
            if ok(i) {
                below = Some(to_len(i));
                break;
            }
            i -= 1;
        }
        // above: the smallest index i with i*step > inner
        let mut i = inner.div_euclid(step).saturating_add(1);
        i = i.max(lowest);
        let mut above = None;
        while i <= max {
            if ok(i) {
                above = Some(to_len(i));
                break;
            }
            i += 1;
        }
        Nearest { below, above }
    }

    fn assemble(&self, heights: &[Length], path: &[usize], ends: &[usize]) -> Vec<Stack> {
        let mut out = Vec::with_capacity(heights.len());
        let mut start = 0;
        for (k, &h) in heights.iter().enumerate() {
            let end = ends.get(k).copied().unwrap_or(start);
            let mut inner: Vec<usize> = path[start..end].to_vec();
            inner.sort_unstable(); // entry order is largest first
            let mut blocks: Vec<StackBlock> = inner
                .iter()
                .map(|&j| {
                    let e = self.p.entries[j];
                    StackBlock {
                        size: Length::from_nm(e.size as i64 * self.p.step),
                        protector: false,
                        worn: e.worn,
                        set_index: Some(e.set_index),
                    }
                })
                .collect();
            if self.protect
                && h.nm() != 0
                && let Some(p) = self.p.protector
            {
                let pb = StackBlock {
                    size: p,
                    protector: true,
                    worn: false,
                    set_index: None,
                };
                blocks.insert(0, pb);
                blocks.push(pb);
            }
            out.push(Stack { height: h, blocks });
            start = end;
        }
        out
    }
}
