//! The setup: the cautions confirmed, then the settle wait (or its recorded skip).

use super::super::app::{App, Effect, Level, Screen};
use super::super::keymap::{Action, Input};
use super::super::update::{enter_step, reach, record, refuse_read_only};
use super::here;
use crate::traveller::{EventKind, Mark, Settle, Stamp, Step};

// ---------------------------------------------------------------- safety

pub fn safety_key(app: &mut App, input: Input) -> Vec<Effect> {
    if input != Input::Act(Action::Forward) {
        return Vec::new();
    }
    let done = app.attempt().is_some_and(|a| a.safety.is_some());
    if !done {
        if refuse_read_only(app) {
            return Vec::new();
        }
        let by = app.operator.clone();
        if let Some(a) = app.attempt_mut() {
            a.safety = Some(Mark {
                by,
                at: Stamp::now(),
            });
        }
        reach(app, Step::Settle);
        record(
            app,
            EventKind::SafetyConfirmed,
            "cautions read, work clamped",
        );
        let mut e = vec![Effect::Save];
        e.extend(enter_step(app, here(app), Step::Settle));
        return e;
    }
    enter_step(app, here(app), Step::Settle)
}

// ---------------------------------------------------------------- settle

pub fn enter_settle(app: &mut App) {
    let recorded = app.attempt().is_some_and(|a| a.settle.is_some());
    if !recorded && !app.read_only && app.ui.settle_left.is_none() {
        app.ui.settle_left = Some(app.shop.settings.settle_minutes.saturating_mul(60));
    }
}

fn settle_record(app: &mut App, done: bool) -> Vec<Effect> {
    let minutes = app.shop.settings.settle_minutes;
    let by = app.operator.clone();
    if let Some(a) = app.attempt_mut() {
        a.settle = Some(Settle {
            done,
            minutes: Some(minutes),
            reason: if done {
                String::new()
            } else {
                "skipped by the operator".into()
            },
            by,
            at: Stamp::now(),
        });
    }
    app.ui.settle_left = None;
    reach(app, Step::Sweep);
    if done {
        record(app, EventKind::Settled, format!("{minutes} min"));
        app.say(Level::Done, "settled: go on to the readings (Enter)");
    } else {
        record(app, EventKind::SettleSkipped, "skipped by the operator");
        app.say(
            Level::Warn,
            "settle wait skipped (recorded); go on to the readings (Enter)",
        );
    }
    vec![Effect::Save]
}

/// Seconds passed: count the settle wait down and record it when it runs out.
pub fn tick(app: &mut App, secs: u32) -> Vec<Effect> {
    let on_settle = matches!(
        app.screen,
        Screen::Flow {
            step: Step::Settle,
            ..
        }
    );
    let Some(left) = app.ui.settle_left else {
        return Vec::new();
    };
    if !on_settle {
        return Vec::new();
    }
    let left = left.saturating_sub(secs);
    app.ui.settle_left = Some(left);
    if left == 0 {
        return settle_record(app, true);
    }
    Vec::new()
}

pub fn settle_key(app: &mut App, input: Input) -> Vec<Effect> {
    let recorded = app.attempt().is_some_and(|a| a.settle.is_some());
    match input {
        Input::Act(Action::Skip) if !recorded => {
            if refuse_read_only(app) {
                return Vec::new();
            }
            settle_record(app, false)
        }
        Input::Act(Action::Forward) if recorded => enter_step(app, here(app), Step::Sweep),
        Input::Act(Action::Forward) => {
            let left = app.ui.settle_left.unwrap_or(0);
            app.say(
                Level::Info,
                format!(
                    "still settling: {}:{:02} left; wait, or press s to skip the wait",
                    left / 60,
                    left % 60
                ),
            );
            Vec::new()
        }
        _ => Vec::new(),
    }
}
