//! The solver's block counts against an exhaustive search, for every height up to 1.0000 in
//! (81-piece set) and 10.000 mm (88-piece set), with the complete sets and with blocks removed.
//!
//! The reference keeps, for each k, the set of every height some k distinct blocks add up to
//! (each block in or out of every subset: all 2^n subsets are covered, layer by layer), so the
//! least k holding a height is the fewest blocks for it. It shares no code with the solver.
//! A second, literal check enumerates every combination of fewer blocks for sample heights.
//!
//! `cargo test` runs a sample; `cargo test --release -- --ignored` runs every height, with each
//! block of each set removed in turn.
//!
//! Set compositions: standards.md (inch 81 common practice; metric 88 from memory).

use std::collections::HashSet;
use tiltbook::blocks::{BlockSet, Condition, Solver, handbook};
use tiltbook::units::Length;

/// Fewest distinct blocks (sizes in steps) that make each height 0..=limit, by layers of
/// subset sums. `None` where no subset makes it.
fn exhaustive(sizes: &[usize], limit: usize) -> Vec<Option<usize>> {
    let words = limit / 64 + 1;
    let mut layers: Vec<Vec<u64>> = vec![vec![0; words]];
    layers[0][0] = 1;
    for &w in sizes.iter().filter(|&&w| w <= limit) {
        layers.push(vec![0; words]);
        for k in (0..layers.len() - 1).rev() {
            let (lo, hi) = layers.split_at_mut(k + 1);
            let src = &lo[k];
            let dst = &mut hi[0];
            // dst |= src << w, cut at `limit`
            let (ws, bs) = (w / 64, w % 64);
            for i in (ws..words).rev() {
                let mut v = src[i - ws] << bs;
                if bs > 0 && i > ws {
                    v |= src[i - ws - 1] >> (64 - bs);
                }
                dst[i] |= v;
            }
        }
        while layers.last().is_some_and(|l| l.iter().all(|&x| x == 0)) {
            layers.pop();
        }
    }
    (0..=limit)
        .map(|h| (0..layers.len()).find(|&k| layers[k][h / 64] >> (h % 64) & 1 == 1))
        .collect()
}

/// Does some combination of exactly `k` of `sizes[from..]` (sorted largest first) add to `r`?
fn combination_exists(sizes: &[usize], r: usize, k: usize, from: usize) -> bool {
    if k == 0 {
        return r == 0;
    }
    for j in from..sizes.len() {
        if sizes[j] <= r && combination_exists(sizes, r - sizes[j], k - 1, j + 1) {
            return true;
        }
    }
    false
}

struct Case {
    set: BlockSet,
    step: i64,
}

impl Case {
    fn new(id: &str, step_nm: i64) -> Case {
        Case {
            set: BlockSet::from_catalogue(id).unwrap(),
            step: step_nm,
        }
    }
    fn usable_steps(&self) -> Vec<usize> {
        let mut v: Vec<usize> = self
            .set
            .blocks
            .iter()
            .filter(|b| b.condition.usable())
            .map(|b| (b.size.nm() / self.step) as usize)
            .collect();
        v.sort_unstable_by(|a, b| b.cmp(a));
        v
    }
    fn without(&self, index: usize) -> Case {
        let mut set = self.set.clone();
        set.blocks[index].condition = Condition::Missing;
        Case {
            set,
            step: self.step,
        }
    }
}

/// Check every `stride`-th height from 1 to `limit` steps; returns the heights checked.
fn check(case: &Case, limit: usize, stride: usize) -> usize {
    let reference = exhaustive(&case.usable_steps(), limit);
    let solver = Solver::new(&case.set).unwrap();
    let mut n = 0;
    for h in (1..=limit).step_by(stride) {
        let height = Length::from_nm(h as i64 * case.step);
        let want = reference[h];
        assert_eq!(solver.fewest(height), want, "fewest at {height:?}");
        match (solver.solve(height), want) {
            (Ok(s), Some(k)) => {
                assert_eq!(s.block_count(), k, "count at {height:?}");
                assert_eq!(s.sizes().into_iter().sum::<Length>(), height);
                let mut seen = HashSet::new();
                for b in &s.blocks {
                    let i = b.set_index.unwrap();
                    assert!(seen.insert(i), "block {i} twice at {height:?}");
                    assert!(case.set.blocks[i].condition.usable());
                }
            }
            (Err(_), None) => {}
            (got, want) => panic!("at {height:?}: solver {got:?}, exhaustive {want:?}"),
        }
        n += 1;
    }
    n
}

const INCH_STEP: i64 = 2_540; // 0.0001 in
const MM_STEP: i64 = 500; // 0.0005 mm
const INCH_LIMIT: usize = 10_000; // 1.0000 in
const MM_LIMIT: usize = 20_000; // 10.000 mm

fn index_of(set: &BlockSet, size: &str) -> usize {
    let l = Length::parse(size, set.unit).unwrap();
    set.blocks.iter().position(|b| b.size == l).unwrap()
}

#[test]
fn exhaustive_reference_on_a_hand_checked_set() {
    // blocks 1, 2, 2, 5: 3 = 1+2, 4 = 2+2, 8 = 1+2+5, 10 = all four
    let r = exhaustive(&[5, 2, 2, 1], 11);
    assert_eq!(r[3], Some(2));
    assert_eq!(r[4], Some(2));
    assert_eq!(r[8], Some(3));
    assert_eq!(r[10], Some(4));
    assert_eq!(r[11], None);
}

#[test]
fn sample_heights_match_the_exhaustive_search() {
    let inch = Case::new("inch-81", INCH_STEP);
    let metric = Case::new("metric-88", MM_STEP);
    assert!(check(&inch, INCH_LIMIT, 7) > 1000);
    assert!(check(&metric, MM_LIMIT, 13) > 1000);
    // with one block removed: the one the hand method needs for a last digit of 8
    check(&inch.without(index_of(&inch.set, "0.1008")), INCH_LIMIT, 7);
    check(
        &metric.without(index_of(&metric.set, "1.005")),
        MM_LIMIT,
        13,
    );
}

#[test]
fn no_shorter_stack_by_literal_enumeration() {
    // for sample heights, every combination of one block fewer is tried and none adds up
    for (case, limit) in [
        (Case::new("inch-81", INCH_STEP), INCH_LIMIT),
        (Case::new("metric-88", MM_STEP), MM_LIMIT),
    ] {
        let solver = Solver::new(&case.set).unwrap();
        let sizes = case.usable_steps();
        let mut checked = 0;
        for h in (1..=limit).step_by(997) {
            let height = Length::from_nm(h as i64 * case.step);
            if let Ok(s) = solver.solve(height) {
                let k = s.block_count();
                assert!(combination_exists(&sizes, h, k, 0));
                assert!(!combination_exists(&sizes, h, k - 1, 0), "{height:?}");
                checked += 1;
            }
        }
        assert!(checked >= 8);
    }
}

#[test]
fn never_more_blocks_than_the_hand_method_sample() {
    never_more_than_hand("inch-81", 1_000, 120_000, 37, INCH_STEP);
    never_more_than_hand("metric-88", 2_000, 600_000, 101, MM_STEP);
}

fn never_more_than_hand(id: &str, lo: usize, hi: usize, stride: usize, step: i64) {
    let set = BlockSet::from_catalogue(id).unwrap();
    let solver = Solver::new(&set).unwrap();
    let mut compared = 0;
    for h in (lo..=hi).step_by(stride) {
        let height = Length::from_nm(h as i64 * step);
        if let Some(hand) = handbook::solve(&set, height) {
            assert_eq!(hand.iter().copied().sum::<Length>(), height);
            let s = solver.solve(height).unwrap();
            assert!(
                s.block_count() <= hand.len(),
                "{height:?}: {hand:?} vs {s:?}"
            );
            compared += 1;
        }
    }
    assert!(compared > 100);
}

#[test]
#[ignore = "every height and every removed block: run with cargo test --release -- --ignored"]
fn every_height_with_each_block_removed() {
    for (id, step, limit) in [
        ("inch-81", INCH_STEP, INCH_LIMIT),
        ("metric-88", MM_STEP, MM_LIMIT),
    ] {
        let full = Case::new(id, step);
        assert_eq!(check(&full, limit, 1), limit);
        for i in 0..full.set.blocks.len() {
            check(&full.without(i), limit, 1);
        }
    }
}

#[test]
#[ignore = "every height 0.1–12 in and 1–300 mm: run with cargo test --release -- --ignored"]
fn never_more_blocks_than_the_hand_method_everywhere() {
    never_more_than_hand("inch-81", 1_000, 120_000, 1, INCH_STEP);
    never_more_than_hand("metric-88", 2_000, 600_000, 1, MM_STEP);
}
