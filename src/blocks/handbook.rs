//! The hand method for building a stack, kept as a baseline to measure the solver against
//! (tests and benchmarks); tiltbook itself never uses it for a setup.
//!
//! The method, as machinists are taught it (common practice, no source): clear the last
//! decimal digit of the height first, with the block that leaves the remainder ending in the
//! most zeros; repeat on the remainder; when only whole inches (or millimetres) are left, take
//! the largest whole block that fits, and repeat. It gives up when no unused block clears the
//! last digit, or no whole block fits what is left.

use super::inventory::BlockSet;
use crate::units::Length;

/// Trailing decimal zeros of `v` (in units of 0.0001 of the set's unit); `u32::MAX` for zero.
fn zeros(v: i64) -> u32 {
    if v == 0 {
        return u32::MAX;
    }
    let mut n = 0;
    let mut v = v;
    while v % 10 == 0 {
        v /= 10;
        n += 1;
    }
    n
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
        let mut best: Option<(usize, u32, i64)> = None; // (position, zeros left, size)
        for (k, &(_, b)) in blocks.iter().enumerate() {
            if used[k] || b > r {
                continue;
            }
            let z = zeros(r - b);
            let fits = if r % whole == 0 {
                b % whole == 0
            } else {
                z > zeros(r)
            };
            if !fits {
                continue;
            }
            // whole part: largest block; fraction: most zeros left, then largest
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
    use crate::units::Unit;

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
    }

    #[test]
    fn gives_up_without_the_block_that_clears_the_digit() {
        let mut s = BlockSet::from_catalogue("inch-81").unwrap();
        s.mark(inch(1008), Condition::Missing).unwrap();
        assert!(solve(&s, inch(16428)).is_none());
    }
}
