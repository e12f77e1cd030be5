//! After the verdict: sign, a new attempt with the corrected stack, or record the feature
//! nonconforming with a note; then the sign-off, and the next feature opens.

use super::super::app::{App, Effect, Level, Prompt, PromptKind, Screen};
use super::super::field::Field;
use super::super::keymap::{Action, Input};
use super::super::update::{enter_step, open_feature, reach, record, refuse_read_only};
use super::here;
use crate::traveller::{Choice, EventKind, FeatureState, Role, Scope, Stamp, Step, Verdict};
use jiff::civil::Date;

// ---------------------------------------------------------------- verdict

/// What the operator may do after the verdict.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum After {
    Sign,
    NewAttempt,
    Nonconforming,
}

impl After {
    pub fn words(self) -> &'static str {
        match self {
            After::Sign => "Sign the feature",
            After::NewAttempt => {
                "New attempt (stack built again, corrected when there is a change)"
            }
            After::Nonconforming => "Record as nonconforming, with a note",
        }
    }
}

/// The choices after this verdict, first the usual one.
pub fn choices(v: Option<Verdict>) -> &'static [After] {
    match v {
        Some(Verdict::Pass) => &[After::Sign, After::NewAttempt],
        Some(Verdict::Doubt) => &[After::Sign, After::NewAttempt, After::Nonconforming],
        Some(Verdict::Fail) => &[After::NewAttempt, After::Nonconforming],
        None => &[],
    }
}

pub fn verdict_key(app: &mut App, input: Input) -> Vec<Effect> {
    let v = app
        .attempt()
        .and_then(|a| a.judgement.as_ref())
        .map(|j| j.verdict);
    let list = choices(v);
    let pick = match input {
        Input::Act(Action::Up | Action::Left) => {
            app.ui.verdict_sel = app.ui.verdict_sel.saturating_sub(1);
            None
        }
        Input::Act(Action::Down | Action::Right) => {
            app.ui.verdict_sel = (app.ui.verdict_sel + 1).min(list.len().saturating_sub(1));
            None
        }
        Input::Act(Action::Forward) => list.get(app.ui.verdict_sel).copied(),
        Input::Act(Action::NewAttempt) if list.contains(&After::NewAttempt) => {
            Some(After::NewAttempt)
        }
        Input::Act(Action::Nonconforming) if list.contains(&After::Nonconforming) => {
            Some(After::Nonconforming)
        }
        _ => None,
    };
    let Some(pick) = pick else {
        return Vec::new();
    };
    let nonconforming = app
        .feature()
        .is_some_and(|f| f.state == FeatureState::Nonconforming);
    match pick {
        After::Sign => {
            reach(app, Step::Sign);
            enter_step(app, here(app), Step::Sign)
        }
        _ if nonconforming => {
            app.say(
                Level::Info,
                "recorded as nonconforming already: sign the feature",
            );
            reach(app, Step::Sign);
            enter_step(app, here(app), Step::Sign)
        }
        After::NewAttempt => new_attempt(app),
        After::Nonconforming => {
            if refuse_read_only(app) {
                return Vec::new();
            }
            app.prompt = Some(Prompt {
                kind: PromptKind::Nonconforming,
                title: "Record as nonconforming".into(),
                hint: "type a note: what is wrong and what is done with the part, then Enter"
                    .into(),
                field: Some(Field::new(200)),
                error: None,
                carry: String::new(),
            });
            Vec::new()
        }
    }
}

/// The due date of a fixture (`fixture`) or block set choice carried into a new attempt, when
/// it is past on `today` and no reason was recorded for it.
fn overdue_without_reason(app: &App, c: &Choice, fixture: bool, today: Date) -> Option<Date> {
    let due = if fixture {
        app.doc.fixture(&c.id)?.due?
    } else {
        app.doc.block_set(&c.id)?.due?
    };
    (today > due && c.reason.trim().is_empty()).then_some(due)
}

/// The fixture and block set of the last attempt that would need a reason in a new one.
fn overdue_carried(app: &App, today: Date) -> Vec<String> {
    let Some(a) = app.attempt() else {
        return Vec::new();
    };
    [
        ("fixture", &a.fixture, true),
        ("block set", &a.block_set, false),
    ]
    .into_iter()
    .filter_map(|(what, c, fixture)| {
        let c = c.as_ref()?;
        let due = overdue_without_reason(app, c, fixture, today)?;
        Some(format!("{what} {} (due {due})", c.id))
    })
    .collect()
}

fn new_attempt(app: &mut App) -> Vec<Effect> {
    if refuse_read_only(app) {
        return Vec::new();
    }
    let overdue = overdue_carried(app, Stamp::now().date());
    if overdue.is_empty() {
        return start_attempt(app, String::new());
    }
    app.prompt = Some(Prompt {
        kind: PromptKind::CarryReason,
        title: format!("Calibration now out of date: {}", overdue.join(", ")),
        hint: "type why it is used for the new attempt anyway (e.g. lead approved, recheck booked), then Enter. Esc: stay here; to use another, start the attempt and go back to the fixture or block set"
            .into(),
        field: Some(Field::new(120)),
        error: None,
        carry: String::new(),
    });
    Vec::new()
}

/// The answer to "why is the out-of-date fixture or set used again": start the attempt.
pub fn answer_carry_reason(app: &mut App, reason: String) -> Result<Vec<Effect>, String> {
    if reason.chars().count() < 3 {
        return Err("a reason is needed (a few words), e.g. lead approved, recheck booked".into());
    }
    Ok(start_attempt(app, reason))
}

/// Start a new attempt with the last one's fixture and set; `reason` goes with any of them now
/// out of date.
fn start_attempt(app: &mut App, reason: String) -> Vec<Effect> {
    let Some((i, _)) = app.flow() else {
        return Vec::new();
    };
    let by = app.operator.clone();
    let at = Stamp::now();
    let prev = app.attempt().cloned().unwrap_or_default();
    let needs = |c: &Option<Choice>, fixture: bool| {
        c.as_ref()
            .is_some_and(|c| overdue_without_reason(app, c, fixture, at.date()).is_some())
    };
    let (fixture_needs, set_needs) = (needs(&prev.fixture, true), needs(&prev.block_set, false));
    let Some(f) = app.doc.features.get_mut(i) else {
        return Vec::new();
    };
    if let Some(a) = f.current_attempt_mut() {
        a.step = Step::Done;
    }
    let carry = |c: Option<Choice>, needs_reason: bool| {
        c.map(|c| Choice {
            by: by.clone(),
            at,
            reason: if needs_reason {
                reason.clone()
            } else {
                c.reason
            },
            ..c
        })
    };
    let a = f.start_attempt(&by, at);
    a.fixture = carry(prev.fixture.clone(), fixture_needs);
    a.block_set = carry(prev.block_set.clone(), set_needs);
    a.step = Step::Stack;
    let number = a.number;
    let id = f.id.clone();
    let carried = format!(
        "{} and {} carried over from attempt {}",
        prev.fixture.as_ref().map_or("?", |c| c.id.as_str()),
        prev.block_set.as_ref().map_or("?", |c| c.id.as_str()),
        prev.number
    );
    let unit = app.doc.job.unit;
    let correction = match prev.judgement.as_ref() {
        Some(j) => match (
            &j.correction,
            j.view_b.as_ref().and_then(|v| v.correction.as_ref()),
        ) {
            (Some(n), Some(o)) => format!(
                "corrected stacks: near plate {}, other plate {}",
                n.height.show(unit),
                o.height.show(unit)
            ),
            (Some(c), None) if prev.stack_pivot.is_some() => format!(
                "corrected difference of the two stacks {}",
                c.height.show(unit)
            ),
            (Some(c), None) => format!("corrected stack {}", c.height.show(unit)),
            _ => String::new(),
        },
        None => String::new(),
    };
    app.doc.log_at(
        at,
        &by,
        EventKind::AttemptStarted,
        Some(&id),
        Some(number),
        correction,
    );
    // the fixture and set stand for the new attempt too: the log says so, and the state follows
    record(app, EventKind::SetChosen, carried);
    app.say(
        Level::Done,
        format!("attempt {number} started: build the stack"),
    );
    let mut e = vec![Effect::Save];
    e.extend(enter_step(app, i, Step::Stack));
    e
}

pub fn answer_nonconforming(app: &mut App, note: String) -> Result<Vec<Effect>, String> {
    if note.chars().count() < 3 {
        return Err("a note is needed: what is wrong and what is done with the part".into());
    }
    if let Some(a) = app.attempt_mut() {
        a.note = note.clone();
        a.step = Step::Sign;
    }
    record(app, EventKind::Nonconforming, note);
    if let Some((i, _)) = app.flow()
        && let Some(f) = app.doc.features.get_mut(i)
    {
        f.state = FeatureState::Nonconforming;
    }
    let mut e = vec![Effect::Save];
    e.extend(enter_step(app, here(app), Step::Sign));
    Ok(e)
}

// ---------------------------------------------------------------- sign

pub fn sign_key(app: &mut App, input: Input) -> Vec<Effect> {
    match input {
        Input::Typed(c) => {
            app.ui.sign.push(c);
            Vec::new()
        }
        Input::Erase => {
            app.ui.sign.pop();
            Vec::new()
        }
        Input::Act(Action::Forward) => sign(app),
        _ => Vec::new(),
    }
}

fn sign(app: &mut App) -> Vec<Effect> {
    if refuse_read_only(app) {
        return Vec::new();
    }
    if app.ui.sign.is_blank() {
        app.say(
            Level::Warn,
            "type your name or initials to sign, then Enter",
        );
        return Vec::new();
    }
    let Some((i, _)) = app.flow() else {
        return Vec::new();
    };
    let by = app.ui.sign.trimmed().to_string();
    let id = app
        .doc
        .features
        .get(i)
        .map(|f| f.id.clone())
        .unwrap_or_default();
    if let Err(e) = app
        .doc
        .sign(&by, Role::Operator, Scope::Feature, Some(&id), Stamp::now())
    {
        app.say(Level::Error, e.to_string());
        return Vec::new();
    }
    if let Some(a) = app.attempt_mut() {
        a.step = Step::Done;
    }
    app.worked = true;
    app.ui.sign.clear();
    let mut e = vec![Effect::Save];
    let (done, total) = app.doc.progress();
    let next = app.doc.features.iter().position(|f| !f.is_finished());
    match next {
        Some(n) => {
            let next_id = app.doc.features[n].id.clone();
            e.extend(open_feature(app, n));
            app.say(
                Level::Done,
                format!("{id} signed by {by} ({done} of {total} done); now {next_id}"),
            );
        }
        None => {
            app.screen = Screen::Overview;
            app.say(
                Level::Done,
                format!("{id} signed by {by}: all {total} features are finished; the traveller goes to the lead"),
            );
        }
    }
    e
}
