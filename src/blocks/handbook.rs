//! The hand method for building a stack, kept as a baseline to measure the solver against
//! (tests and benchmarks); tiltbook itself never uses it for a setup.
//!
//! The method, as machinists are taught it (common practice, no source): clear the last
//! decimal digit of the height first, with the block that leaves the remainder on the coarsest
//! grid of the sets' series (inch: 0.0001, 0.001, 0.050, 1, 10 in; metric: 0.0005, 0.001,
//! 0.01, 0.5, 1, 10, 100 mm; so a remainder of 0.190 in is cleared to 0.050 in by the 0.140 in
//! block, 23.8 mm to 22.5 mm by the 1.3 mm block, and 20.5 mm to 20 mm by the 0.5 mm block);
//! repeat on the remainder; when only whole inches (or millimetres) are left, take the
//! largest whole block that fits, and repeat. It gives up when no unused block moves the
//! remainder to a coarser grid, or no whole block fits what is left.

use super::inventory::BlockSet;
use crate::units::{Length, Unit};

/// The coarsest series grid `v` is on (in units of 0.0001 of the set's unit); `i64::MAX`
/// for zero.
fn grid(v: i64, unit: Unit) -> i64 {
    if v == 0 {
        return i64::MAX;
    }
    let grids: &[i64] = match unit {
        Unit::In => &[100_000, 10_000, 500, 10, 1],
        Unit::Mm => &[1_000_000, 100_000, 10_000, 5_000, 100, 10, 5],
    };
    grids.iter().copied().find(|g| v % g == 0).unwrap_or(0)
}

/// The stack the hand method builds for `height` from the usable blocks of `set`, in the order
/// it picks them, or `None` where the method finds no answer.
pub fn solve(set: &BlockSet, height: Length) -> Option<Vec<Length>> {
    // work in 0.0001 of the set's unit
    let unit = set.unit.nm() / 10_000;
    if height.nm() <= 0 || height.nm() % unit != 0 {
        return None;
    }
    let whole = 10_000;
    let blocks: Vec<(usize, i64)> = set
        .blocks
        .iter()
        .enumerate()
        .filter(|(_, b)| b.condition.usable() && b.size.nm() % unit == 0)
        .map(|(i, b)| (i, b.size.nm() / unit))
        .collect();
    let mut used = vec![false; blocks.len()];
    let mut r = height.nm() / unit;
    let mut out = Vec::new();
    while r > 0 {
        let mut best: Option<(usize, i64, i64)> = None; // (position, grid left, size)
        for (k, &(_, b)) in blocks.iter().enumerate() {
            if used[k] || b > r {
                continue;
            }
            let z = grid(r - b, set.unit);
            let fits = if r % whole == 0 {
                b % whole == 0
            } else {
                z > grid(r, set.unit)
            };
            if !fits {
                continue;
            }
            // whole part: largest block; fraction: coarsest grid left, then largest
            let key = if r % whole == 0 { 0 } else { z };
            let better = match best {
                None => true,
                Some((_, bz, bb)) => key > bz || (key == bz && b > bb),
            };
            if better {
                best = Some((k, key, b));
            }
        }
        let (k, _, b) = best?;
        used[k] = true;
        r -= b;
        out.push(Length::from_nm(b * unit));
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::blocks::inventory::Condition;

    fn inch(v: i64) -> Length {
        Length::from_scaled(v, Unit::In, 4).unwrap()
    }

    #[test]
    fn the_usual_worked_stack() {
        // 1.6428 in = 0.1008 + 0.142 + 0.400 + 1: common practice (no source)
        let s = BlockSet::from_catalogue("inch-81").unwrap();
        let got = solve(&s, inch(16428)).unwrap();
        assert_eq!(got, vec![inch(1008), inch(1420), inch(4000), inch(10000)]);
        // above 10.95 in the whole blocks 1+2+3+4 run out
        assert!(solve(&s, inch(115_000)).is_none());
        // 0.2906 in = 0.1006 + 0.140 + 0.050: the 0.140 clears 0.190 to 0.050
        let got = solve(&s, inch(2906)).unwrap();
        assert_eq!(got, vec![inch(1006), inch(1400), inch(500)]);
    }

    #[test]
    fn gives_up_without_the_block_that_clears_the_digit() {
        let mut s = BlockSet::from_catalogue("inch-81").unwrap();
        s.mark(inch(1008), Condition::Missing).unwrap();
        assert!(solve(&s, inch(16428)).is_none());
    }
}
