//! Building the stack (or both stacks): each block ticked as it is wrung, a block swapped for
//! the one really used (the angle follows what was built, and a block in either stack is not
//! free for the other), the protectors on or off, and the confirmation once every block is on.

use super::super::app::{App, Effect, Level, Prompt, PromptKind};
use super::super::field::Field;
use super::super::keymap::{Action, Input};
use super::super::update::{enter_step, reach, record, refuse_read_only};
use super::stack::{
    any_wrung, block_count, locate, part_name, parts, refresh_angles, set_of, solve_request,
    stack_mut,
};
use super::{move_sel, remedy};
use crate::traveller::{Attempt, EventKind, Mark, Stack, Stamp, Step, Swap};
use crate::units::Length;

/// May the stack still be changed? Not once the stack has settled or readings were taken on it.
pub(super) fn stack_changeable(app: &mut App) -> bool {
    if refuse_read_only(app) {
        return false;
    }
    let later = app
        .attempt()
        .is_some_and(|a| a.settle.is_some() || a.sweep.is_some() || a.sweep_b.is_some());
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
        for s in [&mut a.stack, &mut a.stack_b, &mut a.stack_pivot]
            .into_iter()
            .flatten()
        {
            s.built = None;
        }
        a.safety = None;
        a.step = Step::Stack;
    }
}

pub fn stack_key(app: &mut App, input: Input) -> Vec<Effect> {
    if app.ui.remedies.as_ref().is_some_and(|r| r.open) {
        return remedy::remedy_key(app, input);
    }
    let n = app.attempt().map_or(0, block_count);
    match input {
        Input::Act(Action::Forward) => confirm_stack(app),
        Input::Act(Action::Tick) if n > 0 => tick(app, n),
        Input::Act(Action::Swap) if n > 0 => {
            if !stack_changeable(app) {
                return Vec::new();
            }
            let sel = app.ui.stack_sel.min(n - 1);
            let (planned, whose) = app
                .attempt()
                .and_then(|a| {
                    let (w, i) = locate(a, sel)?;
                    let s = parts(a).into_iter().find(|(x, _)| *x == w)?.1;
                    let whose = if parts(a).len() > 1 {
                        format!(" ({})", part_name(a, w).to_lowercase())
                    } else {
                        String::new()
                    };
                    Some((s.blocks.get(i)?.size.show(app.unit()), whose))
                })
                .unwrap_or_default();
            app.prompt = Some(Prompt {
                kind: PromptKind::Swap(sel),
                title: format!("Swap the {planned} block{whose}"),
                hint: "type the size really wrung in its place, e.g. 0.1350, then Enter".into(),
                field: Some(Field::new(20)),
                error: None,
                carry: String::new(),
            });
            Vec::new()
        }
        Input::Act(Action::Protectors) => protectors(app),
        Input::Act(Action::Remedies) => remedy::reopen(app),
        _ => {
            let mut sel = app.ui.stack_sel;
            move_sel(&mut sel, n, input);
            app.ui.stack_sel = sel;
            Vec::new()
        }
    }
}

fn tick(app: &mut App, n: usize) -> Vec<Effect> {
    if !stack_changeable(app) {
        return Vec::new();
    }
    let sel = app.ui.stack_sel.min(n - 1);
    let unit = app.unit();
    let Some((w, i)) = app.attempt().and_then(|a| locate(a, sel)) else {
        return Vec::new();
    };
    let whose = app
        .attempt()
        .filter(|a| parts(a).len() > 1)
        .map(|a| format!("{}: ", part_name(a, w).to_lowercase()))
        .unwrap_or_default();
    let mut detail = String::new();
    if let Some(b) = app
        .attempt_mut()
        .and_then(|a| stack_mut(a, w))
        .and_then(|s| s.blocks.get_mut(i))
    {
        b.wrung = !b.wrung;
        detail = format!(
            "{whose}{} {}",
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

fn protectors(app: &mut App) -> Vec<Effect> {
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
    if app.attempt().is_some_and(|a| parts(a).len() > 1) {
        app.say(
            Level::Info,
            "two stacks from one set: the protector blocks stay off (a set has one pair)",
        );
        return Vec::new();
    }
    if app.attempt().is_some_and(any_wrung) {
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

fn built_words(app: &App, a: &Attempt) -> String {
    let unit = app.unit();
    let h = |s: &Stack| s.height.show(unit);
    match (&a.stack, &a.stack_b, &a.stack_pivot) {
        (Some(n), Some(o), _) => format!(
            "near plate {} gives {}, other plate {} gives {}",
            h(n),
            n.achieved.dms(1),
            h(o),
            o.achieved.dms(1)
        ),
        (Some(r), None, Some(p)) => format!(
            "two stacks: raised {}, pivot {}, difference {} gives {}",
            h(r),
            h(p),
            (r.height - p.height).show(unit),
            r.achieved.dms(1)
        ),
        (Some(s), _, _) => format!("stack {} gives {}", h(s), s.achieved.dms(1)),
        _ => String::new(),
    }
}

fn confirm_stack(app: &mut App) -> Vec<Effect> {
    let Some((feature, _)) = app.flow() else {
        return Vec::new();
    };
    let Some(a) = app.attempt().cloned().filter(|a| a.stack.is_some()) else {
        app.say(
            Level::Warn,
            "there is no stack yet; choose another block set or fixture (Esc) if it cannot be made",
        );
        return Vec::new();
    };
    if parts(&a).iter().all(|(_, s)| s.built.is_some()) {
        return enter_step(app, feature, Step::Safety);
    }
    if refuse_read_only(app) {
        return Vec::new();
    }
    let left: usize = parts(&a)
        .iter()
        .map(|(_, s)| s.blocks.iter().filter(|b| !b.wrung).count())
        .sum();
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
    let at = Stamp::now();
    if let Some(a) = app.attempt_mut() {
        for s in [&mut a.stack, &mut a.stack_b, &mut a.stack_pivot]
            .into_iter()
            .flatten()
        {
            s.built = Some(Mark { by: by.clone(), at });
        }
    }
    reach(app, Step::Safety);
    let words = built_words(app, &a);
    record(app, EventKind::StackBuilt, words);
    let mut e = vec![Effect::Save];
    e.extend(enter_step(app, feature, Step::Safety));
    e
}

pub fn answer_swap(app: &mut App, pos: usize, text: String) -> Result<Vec<Effect>, String> {
    let set = set_of(app).cloned().ok_or("choose the block set first")?;
    let unit = set.snap.unit;
    let used = Length::parse_positive(&text, unit).map_err(|e| e.to_string())?;
    let a = app
        .attempt()
        .cloned()
        .ok_or("there is no stack to change")?;
    let (w, i) = locate(&a, pos).ok_or("no such block in the stack")?;
    let planned = parts(&a)
        .into_iter()
        .find(|(x, _)| *x == w)
        .and_then(|(_, s)| s.blocks.get(i))
        .ok_or("no such block in the stack")?
        .size;
    if used == planned {
        return Err(format!(
            "that is the size already listed ({}); type the size really wrung",
            used.show(unit)
        ));
    }
    // both stacks come from the one set: a block in either is not free
    let others = parts(&a)
        .iter()
        .flat_map(|(x, s)| s.blocks.iter().enumerate().map(move |(k, b)| (*x, k, b)))
        .filter(|(x, k, b)| (*x, *k) != (w, i) && !b.protector && b.size == used)
        .count();
    if !set.has(used, others + 1) {
        return Err(format!(
            "the set {} has no {} block free (missing, damaged or already in the stack); type a size it has",
            set.snap.id,
            used.show(unit)
        ));
    }
    let by = app.operator.clone();
    if let Some(s) = app.attempt_mut().and_then(|a| stack_mut(a, w)) {
        if let Some(b) = s.blocks.get_mut(i) {
            b.size = used;
            b.wrung = true;
        }
        s.swaps.push(Swap {
            planned,
            used,
            reason: String::new(),
            by,
            at: Stamp::now(),
        });
    }
    if let Err(e) = refresh_angles(app) {
        // put the planned block back: what was typed cannot be set on this fixture
        if let Some(s) = app.attempt_mut().and_then(|a| stack_mut(a, w)) {
            if let Some(b) = s.blocks.get_mut(i) {
                b.size = planned;
            }
            s.swaps.pop();
        }
        let _ = refresh_angles(app);
        return Err(e);
    }
    unbuild(app);
    let Some(now) = app.attempt().cloned() else {
        return Ok(Vec::new());
    };
    let whose = if parts(&now).len() > 1 {
        format!("{}: ", part_name(&now, w).to_lowercase())
    } else {
        String::new()
    };
    let words = built_words(app, &now);
    record(
        app,
        EventKind::BlockSwapped,
        format!(
            "{whose}{} in place of {}: {words}",
            used.show(unit),
            planned.show(unit),
        ),
    );
    // a size far from the planned one (a slip of the finger, the wrong block from the box)
    // is recorded as typed, but not let pass quietly
    let outside = app
        .feature()
        .filter(|f| f.kind != crate::traveller::FeatureKind::Compound)
        .and_then(|f| {
            let want = f.setting_angle()?;
            let got = now.stack.as_ref()?.achieved;
            let dev = crate::units::Angle::from_deg(got.deg() - want.deg());
            (!f.tolerance.contains(dev)).then_some((got, dev, f.tolerance))
        });
    match outside {
        Some((got, dev, tol)) => app.say(
            Level::Warn,
            format!(
                "swap recorded, but the stack now sets {} ({} from the setting), outside the tolerance {tol}: check the block wrung, or swap again (s)",
                got.dms(1),
                dev.arcsec_signed(1)
            ),
        ),
        None => app.say(
            Level::Done,
            format!("swap recorded: the angle is now worked out from what was built ({words})"),
        ),
    }
    Ok(vec![Effect::Save])
}
