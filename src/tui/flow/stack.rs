//! The stack: solved for the height, ticked block by block as it is wrung, a block swapped for
//! the one really used (the angle follows what was built), protectors on or off.

use super::super::app::{App, Effect, Level, Prompt, PromptKind, SolveRequest};
use super::super::field::Field;
use super::super::keymap::{Action, Input};
use super::super::rank::geometry;
use super::super::update::{enter_step, reach, record, refuse_read_only};
use super::{height_step, move_sel};
use crate::geometry::plan;
use crate::traveller::{EventKind, Mark, Stack, StackBlock, Stamp, Step, Swap};
use crate::units::{Angle, Length};

// ---------------------------------------------------------------- stack

/// The height to build: a failed attempt's corrected height when this attempt follows one on
/// the same fixture, else the setting angle's height rounded to the set's step.
pub fn target_height(app: &App) -> Result<Length, String> {
    let f = app.feature().ok_or("no feature is open")?;
    let a = f.current_attempt().ok_or("no attempt is open")?;
    let fid = a
        .fixture
        .as_ref()
        .ok_or("choose the fixture first")?
        .id
        .clone();
    let fx = app
        .doc
        .fixture(&fid)
        .ok_or_else(|| format!("the fixture {fid} is not in the traveller"))?;
    if let Some(prev) = f.attempts.iter().rev().nth(1)
        && prev.fixture.as_ref().is_some_and(|c| c.id == fid)
        && let Some(c) = prev.judgement.as_ref().and_then(|j| j.correction.as_ref())
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

pub fn enter_stack(app: &mut App) -> Vec<Effect> {
    app.ui.stack_sel = app
        .attempt()
        .and_then(|a| a.stack.as_ref())
        .and_then(|s| s.blocks.iter().position(|b| !b.wrung))
        .unwrap_or(0);
    let needs = app.attempt().is_some_and(|a| a.stack.is_none());
    if needs && !app.read_only {
        let protectors = set_of(app).is_some_and(|s| s.snap.protector.is_some());
        return solve_request(app, protectors);
    }
    Vec::new()
}

fn set_of(app: &App) -> Option<&super::super::shop_view::SetView> {
    let id = app.attempt()?.block_set.as_ref()?.id.clone();
    app.shop.set(&id)
}

fn solve_request(app: &mut App, protectors: bool) -> Vec<Effect> {
    let (Some((feature, _)), Some(a)) = (app.flow(), app.attempt()) else {
        return Vec::new();
    };
    let attempt = a.number;
    let Some(set_id) = a.block_set.as_ref().map(|c| c.id.clone()) else {
        return Vec::new();
    };
    match target_height(app) {
        Ok(height) => {
            app.ui.solving = true;
            app.ui.solve_error = None;
            vec![Effect::Solve(SolveRequest {
                feature,
                attempt,
                set_id,
                height,
                protectors,
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
    result: Result<Vec<StackBlock>, String>,
) -> Vec<Effect> {
    let here = app.flow().map(|(i, _)| i) == Some(feature)
        && app.attempt().map(|a| a.number) == Some(attempt);
    if !here {
        return Vec::new();
    }
    app.ui.solving = false;
    let blocks = match result {
        Ok(b) => b,
        Err(e) => {
            app.ui.solve_error = Some(e);
            return Vec::new();
        }
    };
    match built_stack(app, blocks) {
        Ok(stack) => {
            if let Some(a) = app.attempt_mut() {
                a.stack = Some(stack);
            }
            app.ui.stack_sel = 0;
            vec![Effect::Save]
        }
        Err(e) => {
            app.ui.solve_error = Some(e);
            Vec::new()
        }
    }
}

fn built_stack(app: &App, blocks: Vec<StackBlock>) -> Result<Stack, String> {
    let height: Length = blocks.iter().map(|b| b.size).sum();
    let achieved = achieved_for(app, height)?;
    Ok(Stack {
        blocks,
        height,
        achieved,
        swaps: Vec::new(),
        built: None,
    })
}

fn achieved_for(app: &App, height: Length) -> Result<Angle, String> {
    let fid = app
        .attempt()
        .and_then(|a| a.fixture.as_ref())
        .map(|c| c.id.clone())
        .ok_or("choose the fixture first")?;
    let fx = app
        .doc
        .fixture(&fid)
        .ok_or("the fixture is not in the traveller")?;
    geometry(fx)
        .angle_for_height(height)
        .map_err(|e| e.to_string())
}

/// May the stack still be changed? Not once the stack has settled or readings were taken on it.
fn stack_changeable(app: &mut App) -> bool {
    if refuse_read_only(app) {
        return false;
    }
    let later = app
        .attempt()
        .is_some_and(|a| a.settle.is_some() || a.sweep.is_some());
    if later {
        app.say(
            Level::Warn,
            "the stack has settled or readings were taken on it; to change it, finish the readings and start a new attempt from the verdict",
        );
        return false;
    }
    true
}

/// A change to a built stack un-confirms it (and the safety check that followed).
fn unbuild(app: &mut App) {
    if let Some(a) = app.attempt_mut() {
        if let Some(s) = a.stack.as_mut() {
            s.built = None;
        }
        a.safety = None;
        a.step = Step::Stack;
    }
}

pub fn stack_key(app: &mut App, input: Input) -> Vec<Effect> {
    let n = app
        .attempt()
        .and_then(|a| a.stack.as_ref())
        .map_or(0, |s| s.blocks.len());
    match input {
        Input::Act(Action::Forward) => confirm_stack(app),
        Input::Act(Action::Tick) if n > 0 => {
            if !stack_changeable(app) {
                return Vec::new();
            }
            let sel = app.ui.stack_sel.min(n - 1);
            let unit = app.unit();
            let mut detail = String::new();
            if let Some(b) = app
                .attempt_mut()
                .and_then(|a| a.stack.as_mut())
                .and_then(|s| s.blocks.get_mut(sel))
            {
                b.wrung = !b.wrung;
                detail = format!(
                    "{} {}",
                    b.size.show(unit),
                    if b.wrung { "wrung" } else { "taken off again" }
                );
                if b.wrung {
                    app.ui.stack_sel = (sel + 1).min(n - 1);
                }
            }
            unbuild(app);
            record(app, EventKind::BlockWrung, detail);
            vec![Effect::Save]
        }
        Input::Act(Action::Swap) if n > 0 => {
            if !stack_changeable(app) {
                return Vec::new();
            }
            let sel = app.ui.stack_sel.min(n - 1);
            let planned = app
                .attempt()
                .and_then(|a| a.stack.as_ref())
                .and_then(|s| s.blocks.get(sel))
                .map(|b| b.size.show(app.unit()))
                .unwrap_or_default();
            app.prompt = Some(Prompt {
                kind: PromptKind::Swap(sel),
                title: format!("Swap the {planned} block"),
                hint: "type the size really wrung in its place, e.g. 0.1350, then Enter".into(),
                field: Some(Field::new(20)),
                error: None,
                carry: String::new(),
            });
            Vec::new()
        }
        Input::Act(Action::Protectors) => {
            if !stack_changeable(app) {
                return Vec::new();
            }
            let Some(set) = set_of(app).cloned() else {
                return Vec::new();
            };
            if set.snap.protector.is_none() {
                app.say(
                    Level::Info,
                    format!("the set {} has no protector blocks", set.snap.id),
                );
                return Vec::new();
            }
            let any_wrung = app
                .attempt()
                .and_then(|a| a.stack.as_ref())
                .is_some_and(|s| s.blocks.iter().any(|b| b.wrung));
            if any_wrung {
                app.say(
                    Level::Warn,
                    "blocks are already wrung; take them off (Space) before changing the protectors",
                );
                return Vec::new();
            }
            let on = app
                .attempt()
                .and_then(|a| a.stack.as_ref())
                .is_some_and(|s| s.blocks.iter().any(|b| b.protector));
            if let Some(a) = app.attempt_mut() {
                a.stack = None;
            }
            solve_request(app, !on)
        }
        _ => {
            let mut sel = app.ui.stack_sel;
            move_sel(&mut sel, n, input);
            app.ui.stack_sel = sel;
            Vec::new()
        }
    }
}

fn confirm_stack(app: &mut App) -> Vec<Effect> {
    let Some((feature, _)) = app.flow() else {
        return Vec::new();
    };
    let Some(stack) = app.attempt().and_then(|a| a.stack.clone()) else {
        app.say(
            Level::Warn,
            "there is no stack yet; choose another block set or fixture (Esc) if it cannot be made",
        );
        return Vec::new();
    };
    if stack.built.is_some() {
        return enter_step(app, feature, Step::Safety);
    }
    if refuse_read_only(app) {
        return Vec::new();
    }
    let left = stack.blocks.iter().filter(|b| !b.wrung).count();
    if left > 0 {
        app.say(
            Level::Warn,
            format!(
                "{left} block{} not ticked yet: wring each block and press Space as it goes on",
                if left == 1 { " is" } else { "s are" }
            ),
        );
        return Vec::new();
    }
    let by = app.operator.clone();
    let unit = app.unit();
    if let Some(s) = app.attempt_mut().and_then(|a| a.stack.as_mut()) {
        s.built = Some(Mark {
            by,
            at: Stamp::now(),
        });
    }
    reach(app, Step::Safety);
    record(
        app,
        EventKind::StackBuilt,
        format!(
            "{} gives {}",
            stack.height.show(unit),
            stack.achieved.dms(1)
        ),
    );
    let mut e = vec![Effect::Save];
    e.extend(enter_step(app, feature, Step::Safety));
    e
}

pub fn answer_swap(app: &mut App, pos: usize, text: String) -> Result<Vec<Effect>, String> {
    let set = set_of(app).cloned().ok_or("choose the block set first")?;
    let unit = set.snap.unit;
    let used = Length::parse_positive(&text, unit).map_err(|e| e.to_string())?;
    let stack = app
        .attempt()
        .and_then(|a| a.stack.clone())
        .ok_or("there is no stack to change")?;
    let planned = stack
        .blocks
        .get(pos)
        .ok_or("no such block in the stack")?
        .size;
    if used == planned {
        return Err(format!(
            "that is the size already listed ({}); type the size really wrung",
            used.show(unit)
        ));
    }
    let others = stack
        .blocks
        .iter()
        .enumerate()
        .filter(|(i, b)| *i != pos && !b.protector && b.size == used)
        .count();
    if !set.has(used, others + 1) {
        return Err(format!(
            "the set {} has no {} block free (missing, damaged or already in the stack); type a size it has",
            set.snap.id,
            used.show(unit)
        ));
    }
    let mut blocks = stack.blocks.clone();
    blocks[pos].size = used;
    blocks[pos].wrung = true;
    let height: Length = blocks.iter().map(|b| b.size).sum();
    let achieved = achieved_for(app, height)?;
    let by = app.operator.clone();
    if let Some(s) = app.attempt_mut().and_then(|a| a.stack.as_mut()) {
        s.blocks = blocks;
        s.height = height;
        s.achieved = achieved;
        s.swaps.push(Swap {
            planned,
            used,
            reason: String::new(),
            by,
            at: Stamp::now(),
        });
    }
    unbuild(app);
    record(
        app,
        EventKind::BlockSwapped,
        format!(
            "{} in place of {}: stack {} gives {}",
            used.show(unit),
            planned.show(unit),
            height.show(unit),
            achieved.dms(1)
        ),
    );
    app.say(
        Level::Done,
        format!(
            "swap recorded: the angle is now worked out from {}",
            height.show(unit)
        ),
    );
    Ok(vec![Effect::Save])
}
