//! Choosing the fixture (ranked for the angle, a reason for an out-of-date one) and the block
//! set; changing either after later work asks first and clears that work.

use super::super::app::{App, Effect, Level, Prompt, PromptKind, Redo};
use super::super::field::Field;
use super::super::keymap::{Action, Input};
use super::super::rank::{LikelySet, RankFor, likely_set, list_sets, rank_fixtures, set_grade};
use super::super::update::{enter_step, record, refuse_read_only};
use super::{height_step, here, move_sel, setting};
use crate::blocks::Solver;
use crate::traveller::{Choice, EventKind, FeatureState, Stamp, Step};

// ---------------------------------------------------------------- fixture

pub fn enter_fixture(app: &mut App) {
    let Some(angle) = setting(app) else {
        app.ui.fixtures.clear();
        app.say(
            Level::Error,
            "this feature has no angle to set; the plan file must give its nominal",
        );
        return;
    };
    let step = height_step(app);
    let kind = app.feature().map(|f| f.kind).unwrap_or_default();
    let chosen = chosen_id(app, false);
    // the set used last on this job
    let used = app
        .doc
        .features
        .iter()
        .flat_map(|f| f.attempts.iter())
        .filter_map(|a| a.block_set.as_ref())
        .max_by_key(|c| c.at)
        .map(|c| c.id.clone());
    let likely = likely_set(
        &app.shop,
        chosen.as_deref(),
        used.as_deref(),
        app.unit(),
        app.today,
    );
    let grade = likely.and_then(set_grade);
    app.ui.rank_set = likely.map(|s| (s.snap.id.clone(), s.snap.grade.clone(), grade.is_some()));
    let solver = likely.and_then(|s| Solver::new(&s.set).ok().map(|v| (s.snap.id.clone(), v)));
    app.ui.fixtures = rank_fixtures(
        &app.shop,
        &RankFor {
            kind,
            setting: angle,
            step,
            unit: app.unit(),
            today: app.today,
            grade,
        },
        solver.as_ref().map(|(id, solver)| LikelySet { id, solver }),
    );
    let chosen = app
        .attempt()
        .and_then(|a| a.fixture.as_ref())
        .map(|c| c.id.clone());
    app.ui.fixture_sel = chosen
        .and_then(|id| {
            app.ui
                .fixtures
                .iter()
                .position(|o| app.shop.fixtures[o.index].id == id)
        })
        .unwrap_or(0);
}

pub fn fixture_key(app: &mut App, input: Input) -> Vec<Effect> {
    if input == Input::Act(Action::Forward) {
        let Some(o) = app.ui.fixtures.get(app.ui.fixture_sel).cloned() else {
            return Vec::new();
        };
        return choose_fixture(app, o.index, String::new());
    }
    move_sel(&mut app.ui.fixture_sel, app.ui.fixtures.len(), input);
    Vec::new()
}

fn chosen_id(app: &App, fixture: bool) -> Option<String> {
    let a = app.attempt()?;
    let c = if fixture { &a.fixture } else { &a.block_set };
    c.as_ref().map(|c| c.id.clone())
}

/// Work after the stack that a change of fixture or set would clear.
fn later_work(app: &App) -> bool {
    app.attempt().is_some_and(|a| {
        [&a.stack, &a.stack_b, &a.stack_pivot]
            .into_iter()
            .flatten()
            .any(|s| s.blocks.iter().any(|b| b.wrung))
            || a.sweep.is_some()
            || a.sweep_b.is_some()
    })
}

fn choose_fixture(app: &mut App, index: usize, reason: String) -> Vec<Effect> {
    let Some(f) = app.shop.fixtures.get(index).cloned() else {
        return Vec::new();
    };
    if chosen_id(app, true).as_deref() == Some(f.id.as_str()) {
        return enter_step(app, here(app), Step::BlockSet);
    }
    if refuse_read_only(app) {
        return Vec::new();
    }
    let Some(o) = app.ui.fixtures.iter().find(|o| o.index == index).cloned() else {
        return Vec::new();
    };
    if !o.reachable {
        app.say(
            Level::Warn,
            format!(
                "{} cannot be used here: {}; choose another",
                f.id,
                o.why_not.unwrap_or_default()
            ),
        );
        return Vec::new();
    }
    if o.out_of_date && reason.is_empty() {
        app.prompt = Some(Prompt {
            kind: PromptKind::FixtureReason(index),
            title: format!("{}: calibration out of date", f.id),
            hint: "type why it is used anyway (e.g. lead approved, recheck booked), then Enter; Esc to choose another"
                .into(),
            field: Some(Field::new(120)),
            error: None,
            carry: String::new(),
        });
        return Vec::new();
    }
    if chosen_id(app, true).is_some() && later_work(app) {
        ask_redo(app, Redo::Fixture { index }, reason, &f.id);
        return Vec::new();
    }
    apply_fixture(app, index, reason)
}

fn ask_redo(app: &mut App, redo: Redo, reason: String, id: &str) {
    app.prompt = Some(Prompt {
        kind: PromptKind::Redo(redo),
        title: format!("Change to {id}?"),
        hint: "this clears the stack and readings of this attempt (they stay in the event log). Enter: change  Esc: keep"
            .into(),
        field: None,
        error: None,
        carry: reason,
    });
}

pub fn answer_redo(app: &mut App, redo: Redo, reason: String) -> Vec<Effect> {
    match redo {
        Redo::Fixture { index } => apply_fixture(app, index, reason),
        Redo::Set { index } => apply_set(app, index, reason),
    }
}

pub fn answer_fixture_reason(
    app: &mut App,
    index: usize,
    reason: String,
) -> Result<Vec<Effect>, String> {
    if reason.chars().count() < 3 {
        return Err("a reason is needed (a few words), e.g. lead approved, recheck booked".into());
    }
    Ok(choose_fixture(app, index, reason))
}

/// Clear the stack and everything after it (a changed fixture or set).
fn clear_from_stack(app: &mut App) {
    if let Some(a) = app.attempt_mut() {
        a.stack = None;
        a.stack_b = None;
        a.stack_pivot = None;
        a.safety = None;
        a.settle = None;
        a.sweep = None;
        a.sweep_b = None;
        a.judgement = None;
    }
    app.ui.solve_error = None;
    app.ui.solve_note = None;
    // the remedies were worked out for the fixture and set that are changing
    app.ui.remedies = None;
}

fn apply_fixture(app: &mut App, index: usize, reason: String) -> Vec<Effect> {
    let Some(snap) = app.shop.fixtures.get(index).cloned() else {
        return Vec::new();
    };
    let by = app.operator.clone();
    let id = snap.id.clone();
    app.doc.put_fixture(snap);
    clear_from_stack(app);
    if let Some(a) = app.attempt_mut() {
        a.fixture = Some(Choice {
            id: id.clone(),
            reason: reason.clone(),
            by,
            at: Stamp::now(),
        });
        a.step = Step::BlockSet;
    }
    let detail = if reason.is_empty() {
        id.clone()
    } else {
        format!("{id} (calibration out of date: {reason})")
    };
    record(app, EventKind::FixtureChosen, detail);
    app.say(Level::Done, format!("fixture {id} recorded"));
    let mut e = vec![Effect::Save];
    e.extend(enter_step(app, here(app), Step::BlockSet));
    e
}

// ---------------------------------------------------------------- block set

pub fn enter_set(app: &mut App) {
    app.ui.sets = list_sets(&app.shop, app.today);
    let chosen = chosen_id(app, false);
    app.ui.set_sel = chosen
        .and_then(|id| {
            app.ui
                .sets
                .iter()
                .position(|o| app.shop.sets[o.index].snap.id == id)
        })
        .unwrap_or(0);
}

pub fn set_key(app: &mut App, input: Input) -> Vec<Effect> {
    if input == Input::Act(Action::Forward) {
        let Some(o) = app.ui.sets.get(app.ui.set_sel).cloned() else {
            app.say(
                Level::Warn,
                "the shop has no block sets; add one to the shop file",
            );
            return Vec::new();
        };
        return choose_set(app, o.index, String::new());
    }
    move_sel(&mut app.ui.set_sel, app.ui.sets.len(), input);
    Vec::new()
}

fn choose_set(app: &mut App, index: usize, reason: String) -> Vec<Effect> {
    let Some(s) = app.shop.sets.get(index).cloned() else {
        return Vec::new();
    };
    // the set already chosen goes straight on, unless a change of fixture came after it: then
    // it is chosen again like any other (a reason asked if it is now out of date), so the
    // record shows the set chosen for this fixture before a stack is built on it
    let reconfirm = app
        .feature()
        .is_some_and(|f| f.state == FeatureState::FixtureChosen);
    if chosen_id(app, false).as_deref() == Some(s.snap.id.as_str()) && (app.read_only || !reconfirm)
    {
        return enter_step(app, here(app), Step::Stack);
    }
    if refuse_read_only(app) {
        return Vec::new();
    }
    let stale = app
        .ui
        .sets
        .iter()
        .any(|o| o.index == index && o.out_of_date);
    if stale && reason.is_empty() {
        app.prompt = Some(Prompt {
            kind: PromptKind::SetReason(index),
            title: format!("{}: calibration out of date", s.snap.id),
            hint: "type why it is used anyway, then Enter; Esc to choose another".into(),
            field: Some(Field::new(120)),
            error: None,
            carry: String::new(),
        });
        return Vec::new();
    }
    if chosen_id(app, false).is_some() && later_work(app) {
        ask_redo(app, Redo::Set { index }, reason, &s.snap.id);
        return Vec::new();
    }
    apply_set(app, index, reason)
}

pub fn answer_set_reason(
    app: &mut App,
    index: usize,
    reason: String,
) -> Result<Vec<Effect>, String> {
    if reason.chars().count() < 3 {
        return Err("a reason is needed (a few words), e.g. lead approved".into());
    }
    Ok(choose_set(app, index, reason))
}

fn apply_set(app: &mut App, index: usize, reason: String) -> Vec<Effect> {
    let Some(set) = app.shop.sets.get(index).cloned() else {
        return Vec::new();
    };
    let by = app.operator.clone();
    let id = set.snap.id.clone();
    app.doc.put_block_set(set.snap);
    clear_from_stack(app);
    if let Some(a) = app.attempt_mut() {
        a.block_set = Some(Choice {
            id: id.clone(),
            reason: reason.clone(),
            by,
            at: Stamp::now(),
        });
        a.step = Step::Stack;
    }
    let detail = if reason.is_empty() {
        id.clone()
    } else {
        format!("{id} (calibration out of date: {reason})")
    };
    record(app, EventKind::SetChosen, detail);
    app.say(Level::Done, format!("block set {id} recorded"));
    let mut e = vec![Effect::Save];
    e.extend(enter_step(app, here(app), Step::Stack));
    e
}
