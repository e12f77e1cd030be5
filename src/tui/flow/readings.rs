//! The readings: travel and count (or position/reading pairs), each value checked as typed and
//! saved when confirmed; then the verdict is worked out.

use super::super::app::{App, Effect, Level, RField};
use super::super::field::Field;
use super::super::judge::{JudgeInput, judge};
use super::super::keymap::{Action, Input};
use super::super::update::{enter_step, reach, record, refuse_read_only};
use super::{height_step, here};
use crate::traveller::{EventKind, Mark, Pair, Stamp, Step, Sweep, SweepMode};
use crate::units::Length;

// ---------------------------------------------------------------- readings

pub fn enter_readings(app: &mut App) {
    // a compound angle: the other view once the near plate's view is in
    let other = is_compound(app)
        && app
            .attempt()
            .and_then(|a| a.sweep.as_ref())
            .is_some_and(Sweep::complete);
    show_view(app, other);
}

/// Is the feature being worked a compound angle (two views to sweep)?
pub fn is_compound(app: &App) -> bool {
    app.feature().is_some_and(|f| f.compound_angles().is_some())
}

/// The letter of the view on screen (compound angles), e.g. `A`.
pub fn view_letter(app: &App) -> Option<&'static str> {
    let c = app.feature()?.compound_angles()?;
    let (near, other) = c.letters();
    Some(if app.ui.readings.other_view {
        other
    } else {
        near
    })
}

/// Show the readings of one view (the other plate's when `other`), fields filled from it.
pub fn show_view(app: &mut App, other: bool) {
    let unit = app.unit();
    app.ui.readings.other_view = other && is_compound(app);
    let sweep = current_sweep(app).cloned();
    let r = &mut app.ui.readings;
    let keep = r.other_view;
    *r = Default::default();
    r.other_view = keep;
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

/// The sweep of the view on screen, if begun.
pub fn current_sweep(app: &App) -> Option<&Sweep> {
    let a = app.attempt()?;
    if app.ui.readings.other_view {
        a.sweep_b.as_ref()
    } else {
        a.sweep.as_ref()
    }
}

/// The sweep of the view on screen (a new spaced one when none yet).
fn sweep_of(app: &App) -> Sweep {
    current_sweep(app).cloned().unwrap_or(Sweep {
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
                    Err(format!(
                        "{have} readings are in already; type {have} or more"
                    ))
                } else {
                    Ok(format!("ok: {n} readings"))
                }
            }
            _ => Err(format!(
                "'{}' is not a count from 2 to 50; type e.g. 5",
                text.trim()
            )),
        },
        RField::Reading => Length::parse(text, unit)
            .map(|l| {
                format!(
                    "ok: {}{}",
                    if l.nm() > 0 { "+" } else { "" },
                    l.show_fine(unit)
                )
            })
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
    let other = app.ui.readings.other_view;
    let view = view_letter(app).map_or(String::new(), |v| format!("view {v} "));
    let had_verdict = app.attempt().is_some_and(|a| a.judgement.is_some());
    if let Some(a) = app.attempt_mut() {
        let mut s = s;
        s.entered = Some(Mark {
            by,
            at: Stamp::now(),
        });
        if other {
            a.sweep_b = Some(s);
        } else {
            a.sweep = Some(s);
        }
        a.judgement = None;
        a.step = Step::Sweep;
    }
    if had_verdict {
        app.say(
            Level::Info,
            "the readings changed: the verdict will be worked out again",
        );
    }
    // the state moves with logged readings only, so the log and the state agree
    if let Some((k, d)) = kind {
        record(app, k, format!("{view}{d}"));
    }
    vec![Effect::Save]
}

/// Once the verdict is recorded the readings stand: taking them again is a new attempt.
fn locked_by_verdict(app: &mut App) -> bool {
    let locked = app.attempt().is_some_and(|a| a.judgement.is_some());
    if locked {
        app.say(
            Level::Warn,
            "the verdict on these readings is recorded; to take them again, start a new attempt from the verdict (n)",
        );
    }
    locked
}

pub fn readings_key(app: &mut App, input: Input) -> Vec<Effect> {
    let s = sweep_of(app);
    let fields = fields_for(s.mode);
    let focus = app.ui.readings.focus;
    let pos = fields.iter().position(|f| *f == focus).unwrap_or(0);
    let changes = matches!(
        input,
        Input::Typed(_) | Input::Act(Action::Mode | Action::Remove)
    );
    if changes && locked_by_verdict(app) {
        return Vec::new();
    }
    if input == Input::Act(Action::Forward) && app.attempt().is_some_and(|a| a.judgement.is_some())
    {
        return enter_step(app, here(app), Step::Verdict);
    }
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
    // travel and count belong to fixed spacing only; pairs carry their own positions
    let (travel, points) = match mode {
        SweepMode::Spaced => (s.travel, s.points),
        SweepMode::Pairs => (None, None),
    };
    save_sweep(
        app,
        Sweep {
            mode,
            travel,
            points,
            ..s
        },
        None,
    )
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
            if is_compound(app) && !app.ui.readings.other_view {
                return to_other_view(app);
            }
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
                        app.say(
                            Level::Warn,
                            "give the travel and the number of readings first",
                        );
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
                    let then = if is_compound(app) && !app.ui.readings.other_view {
                        "the other view's readings"
                    } else {
                        "the verdict"
                    };
                    app.say(
                        Level::Done,
                        if k as u32 == n {
                            format!("reading {k} of {n} saved; all in: press Enter for {then}")
                        } else {
                            format!("reading {k} of {n} saved")
                        },
                    );
                    save_sweep(
                        app,
                        s,
                        Some((
                            EventKind::ReadingEntered,
                            format!("reading {k}: {}", r.show_fine(unit)),
                        )),
                    )
                }
                SweepMode::Pairs => {
                    let ptext = app.ui.readings.position.text.clone();
                    let Ok(position) = Length::parse_non_negative(&ptext, unit) else {
                        app.ui.readings.focus = RField::Position;
                        app.say(Level::Warn, "type the position of this reading first");
                        return Vec::new();
                    };
                    if s.pairs.iter().any(|p| p.position == position) {
                        app.ui.readings.focus = RField::Position;
                        app.say(
                            Level::Warn,
                            format!(
                                "a reading at {} is in already; give another position, or remove the last reading (Del)",
                                position.show(unit)
                            ),
                        );
                        return Vec::new();
                    }
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
                            format!(
                                "reading {k}: {} at {}",
                                r.show_fine(unit),
                                position.show(unit)
                            ),
                        )),
                    )
                }
            }
        }
    }
}

/// A compound angle: the near plate's view is in; on to the other view's readings.
fn to_other_view(app: &mut App) -> Vec<Effect> {
    show_view(app, true);
    let (near, other) = app
        .feature()
        .and_then(|f| f.compound_angles())
        .map_or(("A", "B"), |c| c.letters());
    app.say(
        Level::Done,
        format!(
            "view {near} is in: now sweep view {other} along the other plate (Esc: back to {near})"
        ),
    );
    Vec::new()
}

fn to_verdict(app: &mut App) -> Vec<Effect> {
    if app.attempt().is_some_and(|a| a.judgement.is_some()) {
        return enter_step(app, here(app), Step::Verdict);
    }
    if refuse_read_only(app) {
        return Vec::new();
    }
    if is_compound(app)
        && !app
            .attempt()
            .and_then(|a| a.sweep_b.as_ref())
            .is_some_and(Sweep::complete)
    {
        return to_other_view(app);
    }
    let (Some(f), Some(a)) = (app.feature(), app.attempt()) else {
        return Vec::new();
    };
    let fid = a.fixture.as_ref().map(|c| c.id.clone()).unwrap_or_default();
    let sid = a
        .block_set
        .as_ref()
        .map(|c| c.id.clone())
        .unwrap_or_default();
    let (Some(fixture), Some(set)) = (app.doc.fixture(&fid), app.doc.block_set(&sid)) else {
        app.say(
            Level::Error,
            "the fixture or block set is missing from the traveller; choose them again",
        );
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
