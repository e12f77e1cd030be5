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
//! a block already in use.

use super::inventory::BlockSet;
use super::table::{self, MAX_STEPS, UNREACHABLE};
use crate::units::{Length, Unit};
use serde::Serialize;
use std::fmt;
use std::sync::Arc;

/// The most search steps one request may take before it gives up (never reached by a single
/// height; a guard for many heights from a thin set).
const NODE_LIMIT: u64 = 5_000_000;

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
                "{} can each be built, but not all at once from one set without sharing a block; use a second set for one stack",
                list(heights, *unit)
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

#[derive(Debug, Clone, Copy)]
struct Entry {
    size: usize,
    cost: u16,
    worn: bool,
    set_index: usize,
}

#[derive(Debug)]
struct Prepared {
    set_id: String,
    unit: Unit,
    step: i64,
    entries: Vec<Entry>,
    /// suffix[j] = sum of entries[j..] sizes
    suffix: Vec<usize>,
    table: Vec<u16>,
    per_block: u16,
    protector: Option<Length>,
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
        let total: u128 = usable.iter().map(|(_, b)| (b.size.nm() / step) as u128).sum();
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
        let inner = height.nm() - self.ends();
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
        let most: u32 = self.p.entries.iter().map(|e| e.cost as u32).sum();
        let mut s = Search {
            p: &self.p,
            targets: &targets,
            bounds: &bounds,
            used: vec![false; self.p.entries.len()],
            path: Vec::new(),
            ends: Vec::new(),
            nodes: 0,
        };
        for budget in least..=most {
            match s.stacks_from(0, budget) {
                Ok(true) => return Ok(self.assemble(heights, &s.path, &s.ends)),
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
        let inner = h.nm() - ends;
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
        let inner = h.nm() - ends;
        let max = (self.p.table.len() - 1) as i64;
        let lowest = if self.protect { 0 } else { 1 };
        let ok = |i: i64| self.p.table[i as usize] != UNREACHABLE;
        let to_len = |i: i64| Length::from_nm(i * step + ends);
        // below: the largest index i with i*step < inner
        let mut i = (inner - 1).div_euclid(step).min(max);
        let mut below = None;
        while i >= lowest {
            if ok(i) {
                below = Some(to_len(i));
                break;
            }
            i -= 1;
        }
        // above: the smallest index i with i*step > inner
        let mut i = inner.div_euclid(step) + 1;
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

struct Search<'a> {
    p: &'a Prepared,
    targets: &'a [usize],
    bounds: &'a [u16],
    used: Vec<bool>,
    /// chosen entries, stack after stack
    path: Vec<usize>,
    /// where each finished stack ends in `path`
    ends: Vec<usize>,
    nodes: u64,
}

impl Search<'_> {
    /// Build stacks k.. within `budget` in total. Err(()) when the node limit is reached.
    fn stacks_from(&mut self, k: usize, budget: u32) -> Result<bool, ()> {
        if k == self.targets.len() {
            return Ok(true);
        }
        let rest: u32 = self.bounds[k + 1..].iter().map(|&b| b as u32).sum();
        let first = self.bounds[k] as u32;
        if budget < first + rest {
            return Ok(false);
        }
        for cost in first..=budget - rest {
            let Ok(c) = u16::try_from(cost) else {
                break;
            };
            if self.one(k, self.targets[k], c, 0, budget - cost)? {
                return Ok(true);
            }
        }
        Ok(false)
    }

    /// Extend stack k: `r` steps left to make at exactly `cost`, from entries `from..`.
    fn one(&mut self, k: usize, r: usize, cost: u16, from: usize, rest: u32) -> Result<bool, ()> {
        if r == 0 {
            if cost != 0 {
                return Ok(false);
            }
            self.ends.push(self.path.len());
            if self.stacks_from(k + 1, rest)? {
                return Ok(true);
            }
            self.ends.pop();
            return Ok(false);
        }
        self.nodes += 1;
        if self.nodes > NODE_LIMIT {
            return Err(());
        }
        let entries = &self.p.entries;
        let first = entries.partition_point(|e| e.size > r).max(from);
        let mut tried: Option<(usize, bool)> = None;
        for j in first..entries.len() {
            if self.p.suffix[j] < r {
                break;
            }
            if self.used[j] {
                continue;
            }
            let e = entries[j];
            if e.cost > cost || tried == Some((e.size, e.worn)) {
                continue;
            }
            let left = cost - e.cost;
            let need = self.p.table[r - e.size];
            if need == UNREACHABLE || need > left {
                continue;
            }
            tried = Some((e.size, e.worn));
            self.used[j] = true;
            self.path.push(j);
            if self.one(k, r - e.size, left, j + 1, rest)? {
                return Ok(true);
            }
            self.path.pop();
            self.used[j] = false;
        }
        Ok(false)
    }
}
