//! The stacks of the sample jobs as the stack screen offers them: the block solver run on the
//! demo shop's set BX81-A for each feature's setting (the height on the set's 0.0001 in grid).

use super::equipment;
use tiltbook::traveller::*;
use tiltbook::tui::rank::geometry;
use tiltbook::tui::solve::{self, SmallCheck, Solution, SolveJob};
use tiltbook::units::Unit;

/// The stack the stack screen offers for feature `f` on fixture `fx` from the sample set: the
/// height of the setting on the set's 0.0001 in grid, protectors on its ends when the set has
/// them (left off, with the solver's note, when they cannot be used).
pub fn planned(t: &Traveller, f: &str, fx: &str) -> (Vec<StackBlock>, Option<String>) {
    let set = equipment::set();
    let fxs = t.fixture(fx).unwrap();
    let angle = t.feature(f).unwrap().setting_angle().unwrap();
    let p = tiltbook::geometry::plan(
        &geometry(fxs),
        angle,
        set.resolution(),
        fxs.max_stack,
        Unit::In,
    )
    .unwrap();
    let job = SolveJob::Single {
        height: p.direct.height,
        protectors: set.snap.protector.is_some(),
        // the small-angle check runs as on the screen; whether the direct stack is poor does
        // not depend on the other fixtures offered, so none are
        small: Some(SmallCheck {
            fixture: geometry(fxs),
            angle,
            largest: fxs.max_stack,
            candidates: Vec::new(),
        }),
    };
    match solve::run(&set, &job).unwrap() {
        Solution::Single { blocks, note } => (blocks, note),
        other => panic!("{f}: one stack expected (the direct stack not poor), got {other:?}"),
    }
}

/// The two plates' stacks the stack screen offers for compound feature `f` on plate `fx`.
pub fn planned_plates(t: &Traveller, f: &str, fx: &str) -> (Vec<StackBlock>, Vec<StackBlock>) {
    let setting = t
        .feature(f)
        .unwrap()
        .compound_angles()
        .unwrap()
        .setting()
        .unwrap();
    let job = SolveJob::Compound {
        fixture: geometry(t.fixture(fx).unwrap()),
        setting,
    };
    match solve::run(&equipment::set(), &job).unwrap() {
        Solution::Two { first, second, .. } => (first, second),
        other => panic!("{f}: two stacks expected, got {other:?}"),
    }
}

/// The blocks of a stack, bottom first, as the handover note names them.
pub fn named(blocks: &[StackBlock]) -> String {
    blocks
        .iter()
        .map(|b| {
            let n = b.size.exact_number(Unit::In, 4);
            if b.protector {
                format!("{n} protector")
            } else {
                n
            }
        })
        .collect::<Vec<_>>()
        .join(" + ")
}
