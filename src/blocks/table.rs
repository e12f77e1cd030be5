//! The table of fewest blocks for every height a set can make.
//!
//! Heights are counted in steps of the greatest common divisor of the usable block sizes (for
//! the standard sets: 0.0001 in, or 0.0005 mm), so every height is an integer index. The table
//! holds, for each index, the least *cost* of a stack of exactly that height where each block
//! costs `per_block`, plus one more when it is worn; `per_block` is larger than the number of
//! worn blocks, so the cost orders stacks by their number of blocks first and by their number
//! of worn blocks second. It is the classic 0/1 subset-sum recurrence, one pass per block:
//! `cost[h] = min(cost[h], cost[h − size] + block_cost)`, run downwards so that each block is
//! used at most once.
//!
//! Memory: two bytes per step (0.53 MB for the 81-piece inch set, 2.9 MB for the 88-piece and
//! 3.7 MB for the 112-piece metric sets). Time: each block's pass touches only the heights
//! reachable so far (blocks are taken smallest first), in chunks the compiler vectorises.

/// Marks a height no stack reaches.
pub const UNREACHABLE: u16 = u16::MAX;

/// The largest table tiltbook builds (steps): 400 in at 0.0001 in, or 2 m at 0.0005 mm.
pub const MAX_STEPS: usize = 4_000_000;

/// Build the least-cost table for blocks given as (size in steps, cost), up to `total` steps
/// (the sum of all sizes). Entry 0 is 0 (the empty stack).
pub fn build(blocks: &[(usize, u16)], total: usize) -> Vec<u16> {
    let mut order: Vec<(usize, u16)> = blocks.to_vec();
    order.sort_unstable();
    let mut t = vec![UNREACHABLE; total + 1];
    t[0] = 0;
    let mut reach = 0usize;
    for (w, c) in order {
        if w == 0 {
            continue;
        }
        let new_reach = (reach + w).min(total);
        // update h in [w, new_reach], top down, in chunks no longer than w so that a chunk
        // reads only entries below it, which this block's pass has not yet changed
        let mut hi = new_reach + 1;
        while hi > w {
            let lo = hi.saturating_sub(w).max(w);
            let len = hi - lo;
            let (below, above) = t.split_at_mut(lo);
            let src = &below[lo - w..lo - w + len];
            let dst = &mut above[..len];
            for (d, s) in dst.iter_mut().zip(src) {
                *d = (*d).min(s.saturating_add(c));
            }
            hi = lo;
        }
        reach = new_reach;
    }
    t
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_sets_by_hand() {
        // blocks 1, 2, 2, 5 (cost 1 each): sums 0..=10
        let t = build(&[(1, 1), (2, 1), (2, 1), (5, 1)], 10);
        let want = [0, 1, 1, 2, 2, 1, 2, 2, 3, 3, 4];
        assert_eq!(t, want.map(|v| v as u16).to_vec());
        // one block of 3: 1, 2 and 4.. unreachable
        let t = build(&[(3, 1)], 3);
        assert_eq!(t, vec![0, UNREACHABLE, UNREACHABLE, 1]);
    }

    #[test]
    fn worn_blocks_cost_more() {
        // per_block 2, a worn 3 (cost 3) and good 1 + 2 (cost 2 each): 3 by one worn block (3)
        // beats two good ones (4); 3 costs 3
        let t = build(&[(3, 3), (1, 2), (2, 2)], 6);
        assert_eq!(t[3], 3);
        assert_eq!(t[6], 7);
    }
}
