//! The standard sets, the worked example of a national measurement institute, and the rules of
//! the solver that are easy to state (wringing order, protectors, worn blocks, tie-break).

use std::collections::BTreeMap;
use tiltbook::blocks::{BlockSet, Condition, Protectors, SolveError, Solver, catalogue, handbook};
use tiltbook::units::{Length, Unit};

fn len(s: &str, unit: Unit) -> Length {
    Length::parse(s, unit).unwrap()
}
fn inch(s: &str) -> Length {
    len(s, Unit::In)
}
fn mm(s: &str) -> Length {
    len(s, Unit::Mm)
}

/// Sizes and counts per set from tests/data/blocks/set-compositions.csv (copied from
/// standards.md: inch 81 common practice; metric 88 and 112 from memory).
fn compositions() -> BTreeMap<String, BTreeMap<Length, u32>> {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/blocks/set-compositions.csv"
    );
    let text = std::fs::read_to_string(path).unwrap();
    let mut out: BTreeMap<String, BTreeMap<Length, u32>> = BTreeMap::new();
    for line in text.lines().filter(|l| !l.starts_with('#')).skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let unit: Unit = f[1].parse().unwrap();
        let (first, last, step) = (len(f[2], unit), len(f[3], unit), len(f[4], unit));
        let count: u32 = f[5].parse().unwrap();
        let sizes = out.entry(f[0].to_string()).or_default();
        let mut x = first;
        let mut n = 0;
        while x <= last {
            *sizes.entry(x).or_default() += 1;
            n += 1;
            if step.nm() == 0 {
                break;
            }
            x = x + step;
        }
        assert_eq!(n, count, "series {line} does not have {count} blocks");
    }
    out
}

#[test]
fn set_compositions_match_the_reference_table() {
    let want = compositions();
    assert_eq!(want.len(), 3);
    for (id, sizes) in &want {
        let c = catalogue::set(id).unwrap();
        let mut got: BTreeMap<Length, u32> = BTreeMap::new();
        for (l, n) in &c.sizes {
            *got.entry(*l).or_default() += n;
        }
        assert_eq!(&got, sizes, "set {id}");
        let total: u32 = sizes.values().sum();
        assert_eq!(c.count(), total);
    }
    // the names carry their block counts
    assert_eq!(catalogue::set("inch-81").unwrap().count(), 81);
    assert_eq!(catalogue::set("metric-88").unwrap().count(), 88);
    assert_eq!(catalogue::set("metric-112").unwrap().count(), 112);
    // the metric compositions are from memory: the catalogue says so
    assert!(
        catalogue::set("metric-88")
            .unwrap()
            .source
            .contains("from memory")
    );
    assert!(
        catalogue::set("metric-112")
            .unwrap()
            .source
            .contains("from memory")
    );
    assert!(catalogue::set("inch-82").is_none());
}

#[test]
fn protector_pairs_are_the_usual_sizes() {
    // common practice (no source): 0.050 in, 1 mm, 2 mm
    let sizes: Vec<Length> = catalogue::protector_pairs().iter().map(|p| p.1).collect();
    assert_eq!(sizes, vec![inch("0.050"), mm("1"), mm("2")]);
}

#[test]
fn npl_worked_example_58_345_mm_from_the_112_piece_set() {
    // NPL gauge-block FAQ (standards.md, worked examples): 58.345 mm from the 112-piece set,
    // 5 blocks by the FAQ's own route, and a 4-block stack (1.005 + 1.34 + 6 + 50) exists
    let set = BlockSet::from_catalogue("metric-112").unwrap();
    let s = Solver::new(&set).unwrap().solve(mm("58.345")).unwrap();
    assert_eq!(s.sizes().into_iter().sum::<Length>(), mm("58.345"));
    assert!(s.block_count() <= 5);
    assert_eq!(s.block_count(), 4);
    assert_eq!(s.sizes(), vec![mm("50"), mm("6"), mm("1.34"), mm("1.005")]);
}

#[test]
fn wringing_order_and_protectors() {
    let mut set = BlockSet::from_catalogue("inch-81").unwrap();
    set.protectors = Some(Protectors {
        size: inch("0.050"),
    });
    let solver = Solver::new(&set).unwrap().with_protectors(true).unwrap();
    let s = solver.solve(inch("1.7428")).unwrap();
    // protectors at both ends and counted in the height: 0.05 + (1 + 0.4 + 0.142 + 0.1008) + 0.05
    assert_eq!(s.sizes().into_iter().sum::<Length>(), inch("1.7428"));
    assert!(s.blocks[0].protector && s.blocks[s.blocks.len() - 1].protector);
    let inner: Vec<Length> = s.blocks[1..s.blocks.len() - 1]
        .iter()
        .map(|b| b.size)
        .collect();
    assert!(
        inner.windows(2).all(|w| w[0] >= w[1]),
        "largest at the bottom: {inner:?}"
    );
    assert_eq!(s.block_count(), 6);
    // two protectors alone make 0.100 in
    assert_eq!(solver.solve(inch("0.1")).unwrap().block_count(), 2);
    // a set without protectors refuses
    let plain = BlockSet::from_catalogue("inch-81").unwrap();
    assert!(matches!(
        Solver::new(&plain).unwrap().with_protectors(true),
        Err(SolveError::NoProtectors { .. })
    ));
}

#[test]
fn worn_blocks_only_when_nothing_else_reaches_the_count() {
    let mut set = BlockSet::from_catalogue("inch-81").unwrap();
    // 2.5 in = 2 + 0.5 (2 blocks); with the 0.500 worn, no other 2-block stack exists
    set.mark(inch("0.5"), Condition::Worn).unwrap();
    let s = Solver::new(&set).unwrap().solve(inch("2.5")).unwrap();
    assert_eq!(s.block_count(), 2);
    assert_eq!(s.worn(), vec![inch("0.5")]);
    // 1.3 in = 1 + 0.3 by the tie-break; with the 1 in worn, 0.95 + 0.35 has as few blocks
    set.mark(inch("1"), Condition::Worn).unwrap();
    let s = Solver::new(&set).unwrap().solve(inch("1.3")).unwrap();
    assert_eq!(s.sizes(), vec![inch("0.95"), inch("0.35")]);
    assert!(s.worn().is_empty());
    // but a worn block is still better than one block more: 1 in alone
    let s = Solver::new(&set).unwrap().solve(inch("1")).unwrap();
    assert_eq!(s.sizes(), vec![inch("1")]);
    assert_eq!(s.worn(), vec![inch("1")]);
}

#[test]
fn missing_and_damaged_blocks_are_never_used() {
    let mut set = BlockSet::from_catalogue("inch-81").unwrap();
    set.mark(inch("2"), Condition::Missing).unwrap();
    set.mark(inch("0.5"), Condition::Damaged).unwrap();
    let s = Solver::new(&set).unwrap().solve(inch("2.5")).unwrap();
    assert!(!s.sizes().contains(&inch("2")) && !s.sizes().contains(&inch("0.5")));
    assert_eq!(s.sizes().into_iter().sum::<Length>(), inch("2.5"));
}

#[test]
fn tie_break_takes_the_largest_block_first() {
    // 0.3 in: one block (0.300). 1.3 in: 1 + 0.3 (2 blocks); the rule prefers 1 + 0.3 to
    // 0.95 + 0.35 and to 0.9 + 0.4 etc., since 1 is the largest first block of any 2-block stack
    let set = BlockSet::from_catalogue("inch-81").unwrap();
    let solver = Solver::new(&set).unwrap();
    assert_eq!(
        solver.solve(inch("1.3")).unwrap().sizes(),
        vec![inch("1"), inch("0.3")]
    );
    // the same height twice gives the same stack
    assert_eq!(
        solver.solve(inch("3.7777")).unwrap(),
        solver.solve(inch("3.7777")).unwrap()
    );
}

#[test]
fn several_heights_share_no_block() {
    let set = BlockSet::from_catalogue("inch-81").unwrap();
    let solver = Solver::new(&set).unwrap();
    // both want the 2 in and the 0.5 in blocks alone; together they cannot both have them
    let v = solver.solve_many(&[inch("2.5"), inch("2.5")]).unwrap();
    assert_eq!(v.len(), 2);
    let mut seen = std::collections::HashSet::new();
    for s in &v {
        assert_eq!(s.sizes().into_iter().sum::<Length>(), inch("2.5"));
        for b in &s.blocks {
            assert!(seen.insert(b.set_index), "block shared: {:?}", b);
        }
    }
    assert_eq!(v[0].block_count(), 2);
    // 0.1001 needs the single 0.1001 block: twice is impossible
    assert!(matches!(
        solver.solve_many(&[inch("0.1001"), inch("0.1001")]),
        Err(SolveError::NotDisjoint { .. })
    ));
    // a zero height is an empty stack (a setup with one roll on the plate)
    let v = solver.solve_many(&[inch("0"), inch("1.3")]).unwrap();
    assert!(v[0].blocks.is_empty() && v[1].block_count() == 2);
}

#[test]
fn errors_name_the_reason_and_the_nearest_heights() {
    let set = BlockSet::from_catalogue("inch-81").unwrap();
    let solver = Solver::new(&set).unwrap();
    let e = solver.solve(inch("0.1011")).unwrap_err();
    assert!(matches!(e, SolveError::Gap { .. }), "{e}");
    let n = e.nearest().unwrap();
    assert_eq!(
        (n.below, n.above),
        (Some(inch("0.101")), Some(inch("0.102")))
    );
    let e = solver.solve(inch("0.04")).unwrap_err();
    assert!(matches!(e, SolveError::BelowSmallest { .. }), "{e}");
    assert_eq!(e.nearest().unwrap().above, Some(inch("0.05")));
    let e = solver.solve(inch("27")).unwrap_err();
    assert!(matches!(e, SolveError::AboveTotal { .. }), "{e}");
    assert_eq!(e.nearest().unwrap().below, Some(inch("26.5295")));
    let e = solver.solve(inch("1.00005")).unwrap_err();
    assert!(matches!(e, SolveError::OffStep { .. }), "{e}");
    assert_eq!(e.nearest().unwrap().below, Some(inch("1")));
    assert!(matches!(
        solver.solve(inch("0")),
        Err(SolveError::NotPositive { .. })
    ));
}

#[test]
fn the_hand_method_baseline_on_its_textbook_cases() {
    // common practice (no source): clear the last digit first
    let set = BlockSet::from_catalogue("metric-112").unwrap();
    let got = handbook::solve(&set, mm("58.345")).unwrap();
    // picked in this order: clear 0.005, clear 0.34, then whole millimetres largest first
    assert_eq!(got, vec![mm("1.005"), mm("1.34"), mm("50"), mm("6")]);
    let inch81 = BlockSet::from_catalogue("inch-81").unwrap();
    assert_eq!(handbook::solve(&inch81, inch("11.5")), None);
    let solver = Solver::new(&inch81).unwrap();
    assert_eq!(solver.solve(inch("11.5")).unwrap().block_count(), 6);
}
