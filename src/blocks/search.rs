//! The depth-first search behind [`super::Solver`]: largest block first, stepping only into a
//! remainder that can still be finished within the budget.
//!
//! Two lower bounds on the cost of finishing a remainder `r` prune it:
//! - the table of the whole set (exact when nothing is in use, so a single height is found
//!   without backing out of a wrong branch more than the set's gaps force);
//! - for the second and later stacks of [`super::Solver::solve_many`], a small table of the
//!   least cost of reaching each remainder *modulo* `modulus` steps (0.01 in for an inch set,
//!   0.1 mm for a metric set) using only blocks still free. It is rebuilt at the start of each
//!   stack in microseconds (only blocks with a non-zero remainder count, about 60) and sees at
//!   once that a last digit needs a block the earlier stack took.

use super::solver::Prepared;
use super::table::UNREACHABLE;

/// The most search steps one request may take before it gives up (a guard for several
/// heights from a thin set; a single height never comes near it).
pub(super) const NODE_LIMIT: u64 = 1_000_000;

pub(super) struct Search<'a> {
    pub p: &'a Prepared,
    pub targets: &'a [usize],
    pub bounds: &'a [u16],
    pub used: Vec<bool>,
    /// chosen entries, stack after stack
    pub path: Vec<usize>,
    /// where each finished stack ends in `path`
    pub ends: Vec<usize>,
    pub nodes: u64,
    /// the residue table in force for each stack
    pub res: Vec<Vec<u16>>,
}

impl<'a> Search<'a> {
    pub fn new(p: &'a Prepared, targets: &'a [usize], bounds: &'a [u16]) -> Self {
        Search {
            p,
            targets,
            bounds,
            used: vec![false; p.entries.len()],
            path: Vec::new(),
            ends: Vec::new(),
            nodes: 0,
            res: vec![Vec::new(); targets.len()],
        }
    }

    /// Least cost of reaching each residue modulo `modulus` with the free blocks (`skip` left
    /// out as well). Blocks whose size is a whole number of `modulus` steps cannot help.
    pub fn residues(&self, skip: Option<usize>) -> Vec<u16> {
        let m = self.p.modulus.max(1);
        let mut res = vec![UNREACHABLE; m];
        res[0] = 0;
        let mut next = res.clone();
        for (j, e) in self.p.entries.iter().enumerate() {
            let w = e.size % m;
            if w == 0 || self.used[j] || skip == Some(j) {
                continue;
            }
            next.copy_from_slice(&res);
            for (r, &c) in res.iter().enumerate() {
                if c != UNREACHABLE {
                    let t = if r + w >= m { r + w - m } else { r + w };
                    next[t] = next[t].min(c.saturating_add(e.cost));
                }
            }
            std::mem::swap(&mut res, &mut next);
        }
        res
    }

    /// True when one block is needed by two of the heights (no stack of either avoids it, as
    /// far as the last digits tell): they cannot be built together.
    pub fn shared_necessary_block(&self) -> bool {
        let m = self.p.modulus;
        let live: Vec<usize> = self.targets.iter().copied().filter(|&t| t > 0).collect();
        if m <= 1 || live.len() < 2 {
            return false;
        }
        for (j, e) in self.p.entries.iter().enumerate() {
            if e.size % m == 0 {
                continue;
            }
            let res = self.residues(Some(j));
            let needing = live.iter().filter(|&&t| res[t % m] == UNREACHABLE).count();
            if needing >= 2 {
                return true;
            }
        }
        false
    }

    /// Build stacks k.. within `budget` in total. Err(()) when the node limit is reached.
    pub fn stacks_from(&mut self, k: usize, budget: u32) -> Result<bool, ()> {
        if k == self.targets.len() {
            return Ok(true);
        }
        let m = self.p.modulus.max(1);
        // with nothing in use the whole-set table already implies the residue bound
        let res = if self.used.iter().any(|&u| u) {
            self.residues(None)
        } else {
            vec![0; m]
        };
        let target = self.targets[k];
        let rest: u32 = self.bounds[k + 1..].iter().map(|&b| b as u32).sum();
        let first = (self.bounds[k] as u32).max(res[target % m] as u32);
        self.res[k] = res;
        if first == UNREACHABLE as u32 || budget < first + rest {
            return Ok(false);
        }
        for cost in first..=budget - rest {
            let Ok(c) = u16::try_from(cost) else {
                break;
            };
            if self.one(k, target, c, 0, budget - cost)? {
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
        let p: &Prepared = self.p;
        let m = p.modulus.max(1);
        let first = p.entries.partition_point(|e| e.size > r).max(from);
        let mut tried: Option<(usize, bool)> = None;
        for (j, &e) in p.entries.iter().enumerate().skip(first) {
            if p.suffix[j] < r {
                break;
            }
            if self.used[j] || e.cost > cost || tried == Some((e.size, e.worn)) {
                continue;
            }
            let left = cost - e.cost;
            let rem = r - e.size;
            let need = p.table[rem].max(self.res[k][rem % m]);
            if need == UNREACHABLE || need > left {
                continue;
            }
            // an equal block after this one would lead to the same stacks
            tried = Some((e.size, e.worn));
            self.used[j] = true;
            self.path.push(j);
            if self.one(k, rem, left, j + 1, rest)? {
                return Ok(true);
            }
            self.path.pop();
            self.used[j] = false;
        }
        Ok(false)
    }
}
