//! The second half of a feature's flow: safety, settling, readings, the verdict and the sign-off.

use super::app::{App, Effect, Level, Prompt, PromptKind, RField, Screen};
use super::field::Field;
use super::flow_build::height_step;
use super::judge::{JudgeInput, judge};
use super::keymap::{Action, Input};
use super::update::{enter_step, open_feature, record, reach, refuse_read_only};
use crate::traveller::{
    Choice, EventKind, FeatureState, Mark, Pair, Role, Scope, Settle, Stamp, Step, Sweep,
    SweepMode, Verdict,
};
use crate::units::Length;

fn here(app: &App) -> usize {
    app.flow().map_or(0, |(i, _)| i)
}

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
        record(app, EventKind::SafetyConfirmed, "cautions read, work clamped");
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
        app.say(Level::Warn, "settle wait skipped (recorded); go on to the readings (Enter)");
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

// ---------------------------------------------------------------- readings

pub fn enter_readings(app: &mut App) {
    let unit = app.unit();
    let sweep = app.attempt().and_then(|a| a.sweep.clone());
    let r = &mut app.ui.readings;
    *r = Default::default();
    r.travel = Field::new(16);
    r.points = Field::new(3);
    r.position = Field::new(16);
    r.reading = Field::new(16);
    match sweep {
        Some(s) => {
            if let Some(t) = s.travel {
                r.travel = Field::with(&t.number(unit, unit.places()), 16);
            }
            if let Some(n) = s.points {
                r.points = Field::with(&n.to_string(), 3);
            }
            r.focus = match s.mode {
                SweepMode::Pairs => RField::Position,
                SweepMode::Spaced if s.travel.is_none() => RField::Travel,
                SweepMode::Spaced if s.points.is_none() => RField::Points,
                SweepMode::Spaced => RField::Reading,
            };
        }
        None => r.focus = RField::Travel,
    }
}

/// The sweep of the attempt (a new spaced one when none yet).
fn sweep_of(app: &App) -> Sweep {
    app.attempt()
        .and_then(|a| a.sweep.clone())
        .unwrap_or(Sweep {
            mode: SweepMode::Spaced,
            travel: None,
            points: None,
            readings: Vec::new(),
            pairs: Vec::new(),
            resolution: Some(app.shop.settings.indicator_resolution),
            entered: None,
        })
}

/// Readings entered so far.
pub fn count(s: &Sweep) -> usize {
    match s.mode {
        SweepMode::Spaced => s.readings.len(),
        SweepMode::Pairs => s.pairs.len(),
    }
}

/// What a field's text reads as, or why not (shown beside the field as it is typed).
pub fn check_field(app: &App, which: RField, text: &str) -> Result<String, String> {
    let unit = app.unit();
    if text.trim().is_empty() {
        return Err(match which {
            RField::Travel => format!("distance first to last reading, e.g. 4{}", unit.symbol()),
            RField::Points => "how many readings, 2 to 50, e.g. 5".into(),
            RField::Position => format!("from the pivot end, e.g. 1.5{}", unit.symbol()),
            RField::Reading => "plus = surface higher, e.g. +0.0002 or -0.0001".into(),
        });
    }
    match which {
        RField::Travel | RField::Position => {
            let l = if which == RField::Travel {
                Length::parse_positive(text, unit)
            } else {
                Length::parse_non_negative(text, unit)
            };
            l.map(|l| format!("ok: {}", l.show(unit)))
                .map_err(|e| e.to_string())
        }
        RField::Points => match text.trim().parse::<u32>() {
            Ok(n) if (2..=50).contains(&n) => {
                let have = count(&sweep_of(app)) as u32;
                if n < have {
                    Err(format!("{have} readings are in already; type {have} or more"))
                } else {
                    Ok(format!("ok: {n} readings"))
                }
            }
            _ => Err(format!("'{}' is not a count from 2 to 50; type e.g. 5", text.trim())),
        },
        RField::Reading => Length::parse(text, unit)
            .map(|l| format!("ok: {}{}", if l.nm() > 0 { "+" } else { "" }, l.show_fine(unit)))
            .map_err(|e| e.to_string()),
    }
}

fn field_mut(app: &mut App, which: RField) -> &mut Field {
    let r = &mut app.ui.readings;
    match which {
        RField::Travel => &mut r.travel,
        RField::Points => &mut r.points,
        RField::Position => &mut r.position,
        RField::Reading => &mut r.reading,
    }
}

/// The fields of the readings screen, in Tab order, for the sweep's mode.
pub fn fields_for(mode: SweepMode) -> &'static [RField] {
    match mode {
        SweepMode::Spaced => &[RField::Travel, RField::Points, RField::Reading],
        SweepMode::Pairs => &[RField::Position, RField::Reading],
    }
}

fn save_sweep(app: &mut App, s: Sweep, kind: Option<(EventKind, String)>) -> Vec<Effect> {
    let by = app.operator.clone();
    let had_verdict = app.attempt().is_some_and(|a| a.judgement.is_some());
    if let Some(a) = app.attempt_mut() {
        let mut s = s;
        s.entered = Some(Mark {
            by,
            at: Stamp::now(),
        });
        a.sweep = Some(s);
        a.judgement = None;
        a.step = Step::Sweep;
    }
    if had_verdict {
        app.say(Level::Info, "the readings changed: the verdict will be worked out again");
    }
    if let Some((k, d)) = kind {
        record(app, k, d);
    } else if let Some((i, _)) = app.flow()
        && let Some(f) = app.doc.features.get_mut(i)
        && f.state < FeatureState::Sweeping
    {
        f.state = FeatureState::Sweeping;
    }
    vec![Effect::Save]
}

pub fn readings_key(app: &mut App, input: Input) -> Vec<Effect> {
    let s = sweep_of(app);
    let fields = fields_for(s.mode);
    let focus = app.ui.readings.focus;
    let pos = fields.iter().position(|f| *f == focus).unwrap_or(0);
    match input {
        Input::Typed(c) => {
            if !app.read_only {
                field_mut(app, focus).push(c);
            }
            Vec::new()
        }
        Input::Erase => {
            field_mut(app, focus).pop();
            Vec::new()
        }
        Input::Act(Action::NextField | Action::Down) => {
            app.ui.readings.focus = fields[(pos + 1) % fields.len()];
            Vec::new()
        }
        Input::Act(Action::PrevField | Action::Up) => {
            app.ui.readings.focus = fields[(pos + fields.len() - 1) % fields.len()];
            Vec::new()
        }
        Input::Act(Action::Mode) => switch_mode(app, s),
        Input::Act(Action::Remove) => remove_last(app, s),
        Input::Act(Action::Forward) => readings_enter(app, s, focus),
        _ => Vec::new(),
    }
}

fn switch_mode(app: &mut App, s: Sweep) -> Vec<Effect> {
    if refuse_read_only(app) {
        return Vec::new();
    }
    if count(&s) > 0 {
        app.say(
            Level::Warn,
            "readings are in already; remove them (Del) before switching between spacing and pairs",
        );
        return Vec::new();
    }
    let mode = match s.mode {
        SweepMode::Spaced => SweepMode::Pairs,
        SweepMode::Pairs => SweepMode::Spaced,
    };
    app.ui.readings.focus = fields_for(mode)[0];
    app.say(
        Level::Info,
        match mode {
            SweepMode::Spaced => "fixed spacing: give the travel and the number of readings",
            SweepMode::Pairs => "pairs: give each reading's position from the pivot end",
        },
    );
    save_sweep(app, Sweep { mode, ..s }, None)
}

fn remove_last(app: &mut App, mut s: Sweep) -> Vec<Effect> {
    if refuse_read_only(app) {
        return Vec::new();
    }
    let unit = app.unit();
    let gone = match s.mode {
        SweepMode::Spaced => s.readings.pop().map(|r| r.show_fine(unit)),
        SweepMode::Pairs => s
            .pairs
            .pop()
            .map(|p| format!("{} at {}", p.reading.show_fine(unit), p.position.show(unit))),
    };
    match gone {
        None => {
            app.say(Level::Info, "no readings to remove");
            Vec::new()
        }
        Some(g) => {
            app.say(Level::Done, format!("removed the last reading ({g})"));
            save_sweep(app, s, Some((EventKind::ReadingRemoved, g)))
        }
    }
}

fn readings_enter(app: &mut App, mut s: Sweep, focus: RField) -> Vec<Effect> {
    let unit = app.unit();
    let text = field_mut(app, focus).text.clone();
    let blank = text.trim().is_empty();
    if blank && (focus == RField::Reading || focus == RField::Position) {
        let other_blank = app.ui.readings.position.is_blank() && app.ui.readings.reading.is_blank();
        if s.complete() && (s.mode == SweepMode::Spaced || other_blank) {
            return to_verdict(app);
        }
        if let Some(a) = app.attempt()
            && a.judgement.is_some()
        {
            return enter_step(app, here(app), Step::Verdict);
        }
    }
    if app.read_only {
        refuse_read_only(app);
        return Vec::new();
    }
    if let Err(e) = check_field(app, focus, &text) {
        app.say(Level::Warn, e);
        return Vec::new();
    }
    match focus {
        RField::Travel => {
            s.travel = Length::parse_positive(&text, unit).ok();
            app.ui.readings.focus = RField::Points;
            save_sweep(app, s, None)
        }
        RField::Points => {
            s.points = text.trim().parse::<u32>().ok();
            app.ui.readings.focus = RField::Reading;
            save_sweep(app, s, None)
        }
        RField::Position => {
            app.ui.readings.focus = RField::Reading;
            Vec::new()
        }
        RField::Reading => {
            let Ok(r) = Length::parse(&text, unit) else {
                return Vec::new();
            };
            match s.mode {
                SweepMode::Spaced => {
                    let (Some(_), Some(n)) = (s.travel, s.points) else {
                        app.ui.readings.focus = if s.travel.is_none() {
                            RField::Travel
                        } else {
                            RField::Points
                        };
                        app.say(Level::Warn, "give the travel and the number of readings first");
                        return Vec::new();
                    };
                    if s.readings.len() >= n as usize {
                        app.say(
                            Level::Warn,
                            format!("all {n} readings are in; press Enter on the empty field for the verdict, or Del to remove the last"),
                        );
                        return Vec::new();
                    }
                    s.readings.push(r);
                    let k = s.readings.len();
                    app.ui.readings.reading.clear();
                    app.say(
                        Level::Done,
                        if k as u32 == n {
                            format!("reading {k} of {n} saved; all in: press Enter for the verdict")
                        } else {
                            format!("reading {k} of {n} saved")
                        },
                    );
                    save_sweep(
                        app,
                        s,
                        Some((EventKind::ReadingEntered, format!("reading {k}: {}", r.show_fine(unit)))),
                    )
                }
                SweepMode::Pairs => {
                    let ptext = app.ui.readings.position.text.clone();
                    let Ok(position) = Length::parse_non_negative(&ptext, unit) else {
                        app.ui.readings.focus = RField::Position;
                        app.say(Level::Warn, "type the position of this reading first");
                        return Vec::new();
                    };
                    s.pairs.push(Pair {
                        position,
                        reading: r,
                    });
                    let k = s.pairs.len();
                    app.ui.readings.reading.clear();
                    app.ui.readings.position.clear();
                    app.ui.readings.focus = RField::Position;
                    app.say(Level::Done, format!("reading {k} saved; Enter on the empty field for the verdict once 2 or more are in"));
                    save_sweep(
                        app,
                        s,
                        Some((
                            EventKind::ReadingEntered,
                            format!("reading {k}: {} at {}", r.show_fine(unit), position.show(unit)),
                        )),
                    )
                }
            }
        }
    }
}

fn to_verdict(app: &mut App) -> Vec<Effect> {
    if app.attempt().is_some_and(|a| a.judgement.is_some()) {
        return enter_step(app, here(app), Step::Verdict);
    }
    if refuse_read_only(app) {
        return Vec::new();
    }
    let (Some(f), Some(a)) = (app.feature(), app.attempt()) else {
        return Vec::new();
    };
    let fid = a.fixture.as_ref().map(|c| c.id.clone()).unwrap_or_default();
    let sid = a.block_set.as_ref().map(|c| c.id.clone()).unwrap_or_default();
    let (Some(fixture), Some(set)) = (app.doc.fixture(&fid), app.doc.block_set(&sid)) else {
        app.say(Level::Error, "the fixture or block set is missing from the traveller; choose them again");
        return Vec::new();
    };
    let input = JudgeInput {
        feature: f,
        attempt: a,
        fixture,
        set,
        step: height_step(app),
        settings: &app.shop.settings,
    };
    let by = app.operator.clone();
    match judge(&input, &by, Stamp::now()) {
        Err(e) => {
            app.say(Level::Error, e);
            Vec::new()
        }
        Ok(j) => {
            let detail = format!(
                "{}: deviation {}, U {}",
                j.verdict.label(),
                j.deviation.arcsec_signed(1),
                j.u.arcsec_signed(1)
            );
            if let Some(a) = app.attempt_mut() {
                a.judgement = Some(j);
            }
            reach(app, Step::Verdict);
            record(app, EventKind::AttemptJudged, detail);
            let mut e = vec![Effect::Save];
            e.extend(enter_step(app, here(app), Step::Verdict));
            e
        }
    }
}

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
            After::NewAttempt => "New attempt with the corrected stack",
            After::Nonconforming => "Record as nonconforming, with a note",
        }
    }
}

/// The choices after this verdict, first the usual one.
pub fn choices(v: Option<Verdict>) -> &'static [After] {
    match v {
        Some(Verdict::Pass) => &[After::Sign],
        Some(Verdict::Doubt) => &[After::Sign, After::NewAttempt, After::Nonconforming],
        Some(Verdict::Fail) => &[After::NewAttempt, After::Nonconforming],
        None => &[],
    }
}

pub fn verdict_key(app: &mut App, input: Input) -> Vec<Effect> {
    let v = app.attempt().and_then(|a| a.judgement.as_ref()).map(|j| j.verdict);
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
        Input::Act(Action::NewAttempt) if list.contains(&After::NewAttempt) => Some(After::NewAttempt),
        Input::Act(Action::Nonconforming) if list.contains(&After::Nonconforming) => {
            Some(After::Nonconforming)
        }
        _ => None,
    };
    let Some(pick) = pick else {
        return Vec::new();
    };
    let nonconforming = app.feature().is_some_and(|f| f.state == FeatureState::Nonconforming);
    match pick {
        After::Sign => {
            reach(app, Step::Sign);
            enter_step(app, here(app), Step::Sign)
        }
        _ if nonconforming => {
            app.say(Level::Info, "recorded as nonconforming already: sign the feature");
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
                hint: "type a note: what is wrong and what is done with the part, then Enter".into(),
                field: Some(Field::new(200)),
                error: None,
                carry: String::new(),
            });
            Vec::new()
        }
    }
}

fn new_attempt(app: &mut App) -> Vec<Effect> {
    if refuse_read_only(app) {
        return Vec::new();
    }
    let Some((i, _)) = app.flow() else {
        return Vec::new();
    };
    let by = app.operator.clone();
    let at = Stamp::now();
    let Some(f) = app.doc.features.get_mut(i) else {
        return Vec::new();
    };
    let prev = f.current_attempt().cloned().unwrap_or_default();
    if let Some(a) = f.current_attempt_mut() {
        a.step = Step::Done;
    }
    let carry = |c: Option<Choice>| {
        c.map(|c| Choice {
            by: by.clone(),
            at,
            ..c
        })
    };
    let a = f.start_attempt(&by, at);
    a.fixture = carry(prev.fixture);
    a.block_set = carry(prev.block_set);
    a.step = Step::Stack;
    let number = a.number;
    f.state = FeatureState::SetChosen;
    let id = f.id.clone();
    let correction = prev
        .judgement
        .and_then(|j| j.correction)
        .map(|c| format!("corrected stack {}", c.height.show(app.doc.job.unit)))
        .unwrap_or_default();
    app.doc
        .log_at(at, &by, EventKind::AttemptStarted, Some(&id), Some(number), correction);
    app.say(Level::Done, format!("attempt {number} started: build the corrected stack"));
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
        app.say(Level::Warn, "type your name or initials to sign, then Enter");
        return Vec::new();
    }
    let Some((i, _)) = app.flow() else {
        return Vec::new();
    };
    let by = app.ui.sign.trimmed().to_string();
    let id = app.doc.features.get(i).map(|f| f.id.clone()).unwrap_or_default();
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
