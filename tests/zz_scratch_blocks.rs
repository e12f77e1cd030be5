use tiltbook::blocks::*;
use tiltbook::units::*;
use std::time::Instant;

#[test]
fn scratch() {
    let s = BlockSet::from_catalogue("inch-81").unwrap();
    let solver = Solver::new(&s).unwrap();
    let m88 = BlockSet::from_catalogue("metric-88").unwrap();
    let ms = Solver::new(&m88).unwrap();
    for (sv, h) in [(&solver, 25963i64*2540), (&ms, 195_615_000), (&solver, 2540*10000)] {
        for _ in 0..3 { let t = Instant::now(); let r = sv.solve(Length::from_nm(h)); println!("{:?} {:?}", t.elapsed(), r.map(|s| s.block_count())); }
    }
    // worst over all heights, measured 3 times each, take min
    for (sv, lo, hi, st) in [(&solver, 2540*1000, 2540*120000, 2540), (&ms, 1_000_000, 300_000_000, 500)] {
        let mut worst = (0u128, 0); let mut h = lo;
        while h <= hi { let mut best = u128::MAX; for _ in 0..3 { let t = Instant::now(); let _ = sv.solve(Length::from_nm(h)); best = best.min(t.elapsed().as_nanos()); } if best > worst.0 { worst = (best, h);} h += st; }
        println!("worst {:?}", worst);
    }
}
