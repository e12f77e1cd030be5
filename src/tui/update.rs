//! `update(&mut App, Msg) -> Vec<Effect>`: every change to the model, with no terminal. Keys
//! become actions through the keymap; each screen's handler lives beside its step (`flow_*`).

use super::app::{App, Effect, Level, Msg, Prompt, PromptKind, Screen, prev_step};
use super::chrome::{MIN_H, MIN_W};
use super::field::Field;
use super::flow::{choose, readings, review, settle, shift, stack, verdict, wring};
use super::keymap::{Action, Input};
use crate::traveller::{EventKind, FeatureState, Stamp, Step};

pub use super::flow::shift::wants_handover;

/// Apply one message; return the work the effect runner must do.
pub fn update(app: &mut App, msg: Msg) -> Vec<Effect> {
    match msg {
        Msg::Resize(w, h) => {
            app.size = (w, h);
            review::resized(app);
            Vec::new()
        }
        Msg::Tick(secs) => settle::tick(app, secs),
        Msg::Solved {
            feature,
            attempt,
            result,
        } => stack::solved(app, feature, attempt, result),
        Msg::Saved => {
            app.unsaved = false;
            Vec::new()
        }
        Msg::SaveFailed(e) => {
            app.unsaved = true;
            app.say(
                Level::Error,
                format!("NOT SAVED: {e}. Your last entry is on screen only; fix the cause and confirm again"),
            );
            Vec::new()
        }
        Msg::Key(input) => key(app, input),
    }
}

fn key(app: &mut App, input: Input) -> Vec<Effect> {
    let (w, h) = app.size;
    if w < MIN_W || h < MIN_H {
        // nothing is done blind on a screen too small to show it
        return match input {
            Input::Act(Action::Quit) => quit_now(app),
            _ => Vec::new(),
        };
    }
    if app.help {
        if let Input::Act(Action::Back | Action::Help | Action::Forward) = input {
            app.help = false;
        } else if input == Input::Act(Action::Quit) {
            return quit(app);
        }
        return Vec::new();
    }
    if let Input::Act(Action::Forward | Action::Back) = input {
        // a new step: the last message has been seen
        app.status = None;
    }
    match input {
        Input::Act(Action::Quit) => return quit(app),
        Input::Act(Action::Help) => {
            app.help = true;
            return Vec::new();
        }
        _ => {}
    }
    if app.prompt.is_some() {
        return prompt_key(app, input);
    }
    match app.screen {
        Screen::Overview => overview_key(app, input),
        Screen::Name => name_key(app, input),
        Screen::Flow { feature, step } => flow_key(app, feature, step, input),
        Screen::Notice => shift::notice_key(app, input),
        Screen::Review => review::review_key(app, input),
        Screen::ReviewFeature { feature } => review::feature_key(app, feature, input),
    }
}

/// The one way out: everything confirmed is already saved. With work unfinished the operator
/// is first asked for a note for the next shift; asked again (or Esc), it leaves.
pub fn quit(app: &mut App) -> Vec<Effect> {
    if shift::wants_handover(app) {
        shift::ask_handover(app);
        return Vec::new();
    }
    quit_now(app)
}

/// Leave now: release the lock and stop.
pub fn quit_now(app: &mut App) -> Vec<Effect> {
    app.prompt = None;
    app.quit = true;
    vec![Effect::Quit]
}

fn overview_key(app: &mut App, input: Input) -> Vec<Effect> {
    let n = app.doc.features.len();
    match input {
        Input::Act(Action::Up) => app.ui.overview_sel = app.ui.overview_sel.saturating_sub(1),
        Input::Act(Action::Down) => {
            app.ui.overview_sel = (app.ui.overview_sel + 1).min(n.saturating_sub(1))
        }
        Input::Act(Action::PageUp) => app.ui.overview_sel = 0,
        Input::Act(Action::PageDown) => app.ui.overview_sel = n.saturating_sub(1),
        Input::Act(Action::Forward) => return open_feature(app, app.ui.overview_sel),
        Input::Act(Action::Review) => review::enter_review(app, app.ui.overview_sel),
        _ => {}
    }
    Vec::new()
}

fn name_key(app: &mut App, input: Input) -> Vec<Effect> {
    match input {
        Input::Typed(c) => app.ui.name.push(c),
        Input::Erase => app.ui.name.pop(),
        Input::Act(Action::Forward) => {
            if app.ui.name.is_blank() {
                app.say(
                    Level::Warn,
                    "type your name or initials, e.g. JQ, then press Enter",
                );
                return Vec::new();
            }
            app.operator = app.ui.name.trimmed().to_string();
            let verb = if app.review_mode {
                "reviewing"
            } else {
                "working"
            };
            app.say(Level::Info, format!("{verb} as {}", app.operator));
            let mut effects = if app.notice_unmarked {
                shift::mark_read(app)
            } else {
                Vec::new()
            };
            let next = app.after_name;
            app.screen = Screen::Overview;
            match next {
                Screen::Flow { feature, .. } => effects.extend(open_feature(app, feature)),
                Screen::Review => review::enter_review(app, app.ui.overview_sel),
                _ => {}
            }
            return effects;
        }
        Input::Act(Action::Back) => app.say(
            Level::Warn,
            "a name is needed to record who did the work; type it, or q to quit",
        ),
        _ => {}
    }
    Vec::new()
}

/// Open a feature's flow at the step where its work stopped (starting attempt 1 if need be).
pub fn open_feature(app: &mut App, index: usize) -> Vec<Effect> {
    let Some(f) = app.doc.features.get(index) else {
        return Vec::new();
    };
    if f.is_finished() {
        app.say(
            Level::Info,
            format!(
                "{} is {}; a change after sign-off goes through the lead's review",
                f.id,
                f.state.label()
            ),
        );
        return Vec::new();
    }
    if app.operator.is_empty() && !app.read_only {
        app.after_name = Screen::Flow {
            feature: index,
            step: Step::Fixture,
        };
        app.screen = Screen::Name;
        return Vec::new();
    }
    let mut effects = Vec::new();
    let step = match f.current_attempt() {
        Some(a) => a.step,
        None if app.read_only => {
            app.say(
                Level::Info,
                format!("{} has not been started (opened read-only)", f.id),
            );
            return Vec::new();
        }
        None => {
            let by = app.operator.clone();
            let id = f.id.clone();
            let at = Stamp::now();
            if let Some(f) = app.doc.features.get_mut(index) {
                f.start_attempt(&by, at);
            }
            app.doc
                .log_at(at, &by, EventKind::AttemptStarted, Some(&id), Some(1), "");
            effects.push(Effect::Save);
            Step::Fixture
        }
    };
    app.ui = super::app::Ui {
        name: app.ui.name.clone(),
        sign: Field::new(40),
        overview_sel: index,
        ..Default::default()
    };
    let returned = app
        .doc
        .features
        .get(index)
        .is_some_and(|f| f.state == FeatureState::Returned);
    let step = match step {
        // sent back by the lead: the verdict, from where a new attempt or a new signature goes
        Step::Verdict | Step::Sign | Step::Done if returned => Step::Verdict,
        Step::Done => Step::Sign,
        s => s,
    };
    effects.extend(enter_step(app, index, step));
    effects
}

/// Show `step` of feature `index`, preparing what the screen needs.
pub fn enter_step(app: &mut App, index: usize, step: Step) -> Vec<Effect> {
    app.screen = Screen::Flow {
        feature: index,
        step,
    };
    match step {
        Step::Fixture => {
            choose::enter_fixture(app);
            Vec::new()
        }
        Step::BlockSet => {
            choose::enter_set(app);
            Vec::new()
        }
        Step::Stack => stack::enter_stack(app),
        Step::Settle => {
            settle::enter_settle(app);
            Vec::new()
        }
        Step::Sweep => {
            readings::enter_readings(app);
            Vec::new()
        }
        Step::Verdict => {
            app.ui.verdict_sel = 0;
            Vec::new()
        }
        _ => Vec::new(),
    }
}

fn flow_key(app: &mut App, feature: usize, step: Step, input: Input) -> Vec<Effect> {
    if input == Input::Act(Action::Back) && step == Step::Sweep && app.ui.readings.other_view {
        // a compound angle: back from the other view's readings to the near plate's
        readings::show_view(app, false);
        return Vec::new();
    }
    if input == Input::Act(Action::Back) {
        app.ui.settle_left = if step == Step::Settle {
            None
        } else {
            app.ui.settle_left
        };
        return match prev_step(step) {
            Some(p) => enter_step(app, feature, p),
            None => {
                app.screen = Screen::Overview;
                app.ui.overview_sel = feature;
                Vec::new()
            }
        };
    }
    match step {
        Step::Fixture => choose::fixture_key(app, input),
        Step::BlockSet => choose::set_key(app, input),
        Step::Stack => wring::stack_key(app, input),
        Step::Safety => settle::safety_key(app, input),
        Step::Settle => settle::settle_key(app, input),
        Step::Sweep => readings::readings_key(app, input),
        Step::Verdict => verdict::verdict_key(app, input),
        Step::Sign | Step::Done => verdict::sign_key(app, input),
    }
}

fn prompt_key(app: &mut App, input: Input) -> Vec<Effect> {
    let Some(p) = app.prompt.as_mut() else {
        return Vec::new();
    };
    match input {
        Input::Typed(c) => {
            if let Some(f) = p.field.as_mut() {
                f.push(c);
                p.error = None;
            }
            Vec::new()
        }
        Input::Erase => {
            if let Some(f) = p.field.as_mut() {
                f.pop();
            }
            Vec::new()
        }
        Input::Act(Action::Back) if p.kind == PromptKind::Handover => quit_now(app),
        Input::Act(Action::Back) => {
            app.prompt = None;
            app.say(Level::Info, "cancelled; nothing was changed");
            Vec::new()
        }
        Input::Act(Action::Forward) => {
            let Some(p) = app.prompt.take() else {
                return Vec::new();
            };
            let text = p.field.as_ref().map(|f| f.trimmed().to_string());
            let res = match &p.kind {
                PromptKind::FixtureReason(i) => {
                    choose::answer_fixture_reason(app, *i, text.unwrap_or_default())
                }
                PromptKind::SetReason(i) => {
                    choose::answer_set_reason(app, *i, text.unwrap_or_default())
                }
                PromptKind::Swap(i) => wring::answer_swap(app, *i, text.unwrap_or_default()),
                PromptKind::Redo(r) => Ok(choose::answer_redo(app, *r, p.carry.clone())),
                PromptKind::Nonconforming => {
                    verdict::answer_nonconforming(app, text.unwrap_or_default())
                }
                PromptKind::CarryReason => {
                    verdict::answer_carry_reason(app, text.unwrap_or_default())
                }
                PromptKind::Handover => Ok(shift::answer_handover(app, text.unwrap_or_default())),
                PromptKind::LeadSign(target) => review::answer_sign(app, *target),
                PromptKind::Return(target) => {
                    review::answer_return(app, *target, text.unwrap_or_default())
                }
            };
            match res {
                Ok(effects) => effects,
                Err(message) => {
                    app.prompt = Some(Prompt {
                        error: Some(message),
                        ..p
                    });
                    Vec::new()
                }
            }
        }
        _ => Vec::new(),
    }
}

/// Refuse a change when the file was opened read-only (true when refused).
pub fn refuse_read_only(app: &mut App) -> bool {
    if app.read_only {
        app.say(
            Level::Warn,
            "opened read-only: nothing can be changed; open it without --read-only to work on it",
        );
    }
    app.read_only
}

/// Log an event for the feature being worked and move its state as the event says.
pub fn record(app: &mut App, kind: EventKind, detail: impl Into<String>) {
    let Some((i, _)) = app.flow() else { return };
    let by = app.operator.clone();
    let Some(f) = app.doc.features.get_mut(i) else {
        return;
    };
    let id = f.id.clone();
    let attempt = f.current_attempt().map(|a| a.number);
    app.worked = true;
    if let Some(s) = FeatureState::after_event(kind)
        && f.state != FeatureState::Nonconforming
    {
        f.state = s;
    }
    app.doc.log(&by, kind, Some(&id), attempt, detail);
}

/// Move the attempt's furthest step forward to at least `step`.
pub fn reach(app: &mut App, step: Step) {
    if let Some(a) = app.attempt_mut()
        && a.step < step
    {
        a.step = step;
    }
}

/// Where a freshly opened job lands: the step where work stopped on the first unfinished
/// feature that was started, else the overview (after the name, when it is not known).
pub fn land(app: &mut App) -> Vec<Effect> {
    if app.review_mode {
        if app.operator.is_empty() && !app.read_only {
            app.after_name = Screen::Review;
            app.screen = Screen::Name;
        } else {
            review::enter_review(app, 0);
        }
        return Vec::new();
    }
    // a finished job: old notes do not stand in the operator's way (the lead's review lists
    // them); a return reopens a feature, so it is never hidden by this
    let finished = app.doc.features.iter().all(|f| f.is_finished());
    if !app.notice_seen && !finished && !shift::notice_items(app).is_empty() {
        app.screen = Screen::Notice;
        return Vec::new();
    }
    if finished && !shift::unread(app).is_empty() {
        app.say(
            Level::Info,
            "every feature is finished; the handover notes not yet read are kept for the lead's review",
        );
    }
    let started = app
        .doc
        .features
        .iter()
        .position(|f| !f.is_finished() && !f.attempts.is_empty());
    let next = app.doc.features.iter().position(|f| !f.is_finished());
    app.ui.overview_sel = started.or(next).unwrap_or(0);
    match started {
        Some(i) if app.operator.is_empty() && !app.read_only => {
            app.after_name = Screen::Flow {
                feature: i,
                step: Step::Fixture,
            };
            app.screen = Screen::Name;
            Vec::new()
        }
        Some(i) => open_feature(app, i),
        None if app.operator.is_empty() && !app.read_only => {
            app.after_name = Screen::Overview;
            app.screen = Screen::Name;
            Vec::new()
        }
        None => {
            app.screen = Screen::Overview;
            Vec::new()
        }
    }
}
