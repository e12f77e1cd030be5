//! The stack: what height to ask the solver for (the setting's, or a failed attempt's corrected
//! one), the solver's answer put in the attempt, and the angles worked out from what is in it.
//! An attempt may hold two stacks: the two plates of a compound sine plate (`stack` near,
//! `stack_b` other), or a stack under each roll for a small angle (`stack` raised,
//! `stack_pivot` pivot); the screen lists them one after the other and the selection runs
//! through both. Wringing, swapping and confirming are in [`super::wring`].

use super::super::app::{App, Effect, RemedyUi, SolveRequest};
use super::super::rank::{geometry, out_of_date, suits};
use super::super::solve::{SmallCheck, Solution, SolveJob};
use super::{height_step, remedy};
use crate::blocks::small::Candidate;
use crate::geometry::plan;
use crate::traveller::{Attempt, Feature, FixtureSnapshot, Stack, StackBlock};
use crate::units::{Angle, Length};

// ---------------------------------------------------------------- the stacks of an attempt

/// Which stack of an attempt.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Which {
    /// `stack`: the only one, the near plate's, or the one under the raised roll.
    Main,
    /// `stack_b`: the other plate's (compound angles).
    Second,
    /// `stack_pivot`: the one under the pivot roll (small angles, two stacks).
    Pivot,
}

/// The stacks of an attempt in the order they are listed.
pub fn parts(a: &Attempt) -> Vec<(Which, &Stack)> {
    let mut v = Vec::new();
    if let Some(s) = &a.stack {
        v.push((Which::Main, s));
    }
    if let Some(s) = &a.stack_b {
        v.push((Which::Second, s));
    }
    if let Some(s) = &a.stack_pivot {
        v.push((Which::Pivot, s));
    }
    v
}

/// What a stack is, in words, when the attempt has two.
pub fn part_name(a: &Attempt, w: Which) -> &'static str {
    match w {
        Which::Main if a.stack_b.is_some() => "Near plate",
        Which::Main if a.stack_pivot.is_some() => "Under the raised roll",
        Which::Main => "Stack",
        Which::Second => "Other plate",
        Which::Pivot => "Under the pivot roll",
    }
}

/// Blocks in every stack of the attempt.
pub fn block_count(a: &Attempt) -> usize {
    parts(a).iter().map(|(_, s)| s.blocks.len()).sum()
}

/// The stack and position of the `sel`-th block counted through every stack.
pub fn locate(a: &Attempt, sel: usize) -> Option<(Which, usize)> {
    let mut left = sel;
    for (w, s) in parts(a) {
        if left < s.blocks.len() {
            return Some((w, left));
        }
        left -= s.blocks.len();
    }
    None
}

pub(super) fn stack_mut(a: &mut Attempt, w: Which) -> Option<&mut Stack> {
    match w {
        Which::Main => a.stack.as_mut(),
        Which::Second => a.stack_b.as_mut(),
        Which::Pivot => a.stack_pivot.as_mut(),
    }
}

pub(super) fn any_wrung(a: &Attempt) -> bool {
    parts(a)
        .iter()
        .any(|(_, s)| s.blocks.iter().any(|b| b.wrung))
}

// ---------------------------------------------------------------- the height asked for

/// The attempt before this one on the same fixture, when it was judged.
fn judged_before(app: &App) -> Option<&Attempt> {
    let f = app.feature()?;
    let a = f.current_attempt()?;
    let fid = &a.fixture.as_ref()?.id;
    f.attempts
        .iter()
        .rev()
        .nth(1)
        .filter(|p| p.fixture.as_ref().is_some_and(|c| &c.id == fid) && p.judgement.is_some())
}

/// The feature being worked and the fixture its attempt chose, or what is missing.
fn open_fixture(app: &App) -> Result<(&Feature, &FixtureSnapshot), String> {
    let f = app.feature().ok_or("no feature is open")?;
    let a = f.current_attempt().ok_or("no attempt is open")?;
    let fid = &a.fixture.as_ref().ok_or("choose the fixture first")?.id;
    let fx = app
        .doc
        .fixture(fid)
        .ok_or_else(|| format!("the fixture {fid} is not in the traveller"))?;
    Ok((f, fx))
}

/// The height to build with one stack: a failed attempt's corrected height when this attempt
/// follows one on the same fixture, else the setting angle's height rounded to the set's step.
pub fn target_height(app: &App) -> Result<Length, String> {
    let (f, fx) = open_fixture(app)?;
    if let Some(c) = judged_before(app)
        .and_then(|p| p.judgement.as_ref())
        .and_then(|j| j.correction.as_ref())
    {
        return Ok(c.height);
    }
    let angle = f
        .setting_angle()
        .ok_or("this feature has no angle to set")?;
    let p = plan(
        &geometry(fx),
        angle,
        height_step(app),
        fx.max_stack,
        app.unit(),
    )
    .map_err(|e| e.to_string())?;
    Ok(p.direct.height)
}

/// The shop's other fixtures that could set `angle` for this feature instead (made for its
/// kind, rated for the angle, calibration in date): the longer ones are the small-angle remedy.
pub fn candidates(app: &App, angle: Angle, current: &str) -> Vec<Candidate> {
    let kind = app.feature().map(|f| f.kind).unwrap_or_default();
    app.shop
        .fixtures
        .iter()
        .filter(|fx| fx.id != current && suits(fx.kind, kind).is_ok())
        .filter(|fx| !out_of_date(fx.due, app.today))
        .filter(|fx| fx.max_angle.is_none_or(|m| angle.deg() <= m.deg() + 1e-9))
        .map(|fx| Candidate {
            id: fx.id.clone(),
            fixture: geometry(fx),
            largest_stack: fx.max_stack,
            unit: app.unit(),
            note: None,
        })
        .collect()
}

/// What to ask the solver for this attempt.
fn job_for(app: &App, protectors: bool) -> Result<SolveJob, String> {
    let (f, fx) = open_fixture(app)?;
    let geo = geometry(fx);
    let before = judged_before(app);
    let judged = before.and_then(|p| p.judgement.as_ref());
    if let Some(c) = f.compound_angles() {
        let setting = c.setting().map_err(|e| e.to_string())?;
        if let (Some(p), Some(j)) = (before, judged) {
            let near = j.correction.as_ref().map(|c| c.height);
            let other = j
                .view_b
                .as_ref()
                .and_then(|v| v.correction.as_ref())
                .map(|c| c.height);
            if near.is_some() || other.is_some() {
                let near = near.or(p.stack.as_ref().map(|s| s.height));
                let other = other.or(p.stack_b.as_ref().map(|s| s.height));
                if let (Some(near), Some(other)) = (near, other) {
                    return Ok(SolveJob::Plates {
                        near,
                        other,
                        fixture: geo,
                        setting,
                    });
                }
            }
        }
        return Ok(SolveJob::Compound {
            fixture: geo,
            setting,
        });
    }
    if let Some(c) = judged.and_then(|j| j.correction.as_ref()) {
        if before.is_some_and(|p| p.stack_pivot.is_some()) {
            return Ok(SolveJob::Difference {
                difference: c.height,
                tallest: fx.max_stack,
            });
        }
        return Ok(SolveJob::Single {
            height: c.height,
            protectors,
            small: None,
        });
    }
    let height = target_height(app)?;
    let angle = f
        .setting_angle()
        .ok_or("this feature has no angle to set")?;
    Ok(SolveJob::Single {
        height,
        protectors,
        small: Some(SmallCheck {
            fixture: geo,
            angle,
            largest: fx.max_stack,
            candidates: candidates(app, angle, &fx.id),
        }),
    })
}

pub fn enter_stack(app: &mut App) -> Vec<Effect> {
    app.ui.stack_sel = app
        .attempt()
        .map(|a| {
            parts(a)
                .iter()
                .flat_map(|(_, s)| s.blocks.iter())
                .position(|b| !b.wrung)
                .unwrap_or(0)
        })
        .unwrap_or(0);
    let needs = app.attempt().is_some_and(|a| a.stack.is_none());
    if needs && !app.read_only && app.ui.remedies.as_ref().is_none_or(|r| !r.open) {
        let protectors = set_of(app).is_some_and(|s| s.snap.protector.is_some());
        return solve_request(app, protectors);
    }
    Vec::new()
}

pub(super) fn set_of(app: &App) -> Option<&super::super::shop_view::SetView> {
    let id = app.attempt()?.block_set.as_ref()?.id.clone();
    app.shop.set(&id)
}

pub(super) fn solve_request(app: &mut App, protectors: bool) -> Vec<Effect> {
    let (Some((feature, _)), Some(a)) = (app.flow(), app.attempt()) else {
        return Vec::new();
    };
    let attempt = a.number;
    let Some(set_id) = a.block_set.as_ref().map(|c| c.id.clone()) else {
        return Vec::new();
    };
    match job_for(app, protectors) {
        Ok(job) => {
            app.ui.solving = true;
            app.ui.solve_error = None;
            app.ui.solve_note = None;
            vec![Effect::Solve(SolveRequest {
                feature,
                attempt,
                set_id,
                job,
            })]
        }
        Err(e) => {
            app.ui.solve_error = Some(e);
            Vec::new()
        }
    }
}

/// The solver's answer arrives.
pub fn solved(
    app: &mut App,
    feature: usize,
    attempt: u32,
    result: Result<Solution, String>,
) -> Vec<Effect> {
    let here = app.flow().map(|(i, _)| i) == Some(feature)
        && app.attempt().map(|a| a.number) == Some(attempt);
    if !here {
        return Vec::new();
    }
    app.ui.solving = false;
    let (first, second, note) = match result {
        Err(e) => {
            app.ui.solve_error = Some(e);
            return Vec::new();
        }
        Ok(Solution::Remedies(small)) => {
            let fixture_id = app
                .attempt()
                .and_then(|a| a.fixture.as_ref())
                .map(|c| c.id.clone())
                .unwrap_or_default();
            let sel = remedy::default_sel(&small);
            app.ui.remedies = Some(RemedyUi {
                small,
                fixture_id,
                sel,
                open: true,
            });
            return Vec::new();
        }
        Ok(Solution::Single { blocks, note }) => (blocks, None, note),
        Ok(Solution::Two {
            first,
            second,
            note,
        }) => (first, Some(second), note),
    };
    app.ui.solve_note = note;
    match put_stacks(app, first, second) {
        Ok(()) => {
            app.ui.stack_sel = 0;
            vec![Effect::Save]
        }
        Err(e) => {
            app.ui.solve_error = Some(e);
            Vec::new()
        }
    }
}

fn new_stack(blocks: Vec<StackBlock>) -> Stack {
    let height: Length = blocks.iter().map(|b| b.size).sum();
    Stack {
        blocks,
        height,
        achieved: Angle::default(),
        swaps: Vec::new(),
        built: None,
    }
}

/// Put fresh stacks in the attempt: one, or two (the other plate's for a compound angle, else
/// the one under the pivot roll), with their angles worked out.
pub(super) fn put_stacks(
    app: &mut App,
    first: Vec<StackBlock>,
    second: Option<Vec<StackBlock>>,
) -> Result<(), String> {
    let compound = app.feature().is_some_and(|f| f.compound_angles().is_some());
    if let Some(a) = app.attempt_mut() {
        a.stack = Some(new_stack(first));
        a.stack_b = None;
        a.stack_pivot = None;
        match second {
            Some(b) if compound => a.stack_b = Some(new_stack(b)),
            Some(b) => a.stack_pivot = Some(new_stack(b)),
            None => {}
        }
    }
    refresh_angles(app)
}

/// Work the heights and angles of the attempt's stacks out again from their blocks: each
/// plate's own angle (compound), the difference of the two under the rolls, or the one stack.
pub fn refresh_angles(app: &mut App) -> Result<(), String> {
    let fid = app
        .attempt()
        .and_then(|a| a.fixture.as_ref())
        .map(|c| c.id.clone())
        .ok_or("choose the fixture first")?;
    let geo = geometry(
        app.doc
            .fixture(&fid)
            .ok_or("the fixture is not in the traveller")?,
    );
    let angle = |h: Length| geo.angle_for_height(h).map_err(|e| e.to_string());
    let Some(a) = app.attempt_mut() else {
        return Ok(());
    };
    for s in [&mut a.stack, &mut a.stack_b, &mut a.stack_pivot]
        .into_iter()
        .flatten()
    {
        s.height = s.block_total();
    }
    if let Some(s) = a.stack_b.as_mut() {
        s.achieved = angle(s.height)?;
    }
    let main = a.stack.as_ref().map(|s| s.height);
    let pivot = a.stack_pivot.as_ref().map(|s| s.height);
    let set = match (main, pivot) {
        (Some(m), Some(p)) if m > p => angle(m - p)?,
        (Some(_), Some(_)) => {
            return Err(
                "the stack under the pivot roll is as tall as the raised one; build them again"
                    .into(),
            );
        }
        (Some(m), None) => angle(m)?,
        _ => return Ok(()),
    };
    for s in [&mut a.stack, &mut a.stack_pivot].into_iter().flatten() {
        s.achieved = set;
    }
    Ok(())
}
