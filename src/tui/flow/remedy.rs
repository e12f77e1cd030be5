//! Small angles on the stack screen: when the single stack cannot be built well, the remedies
//! side by side (two stacks on this fixture, one under each roll; one stack on a longer
//! fixture; the nearest single stack here), the best chosen by default with the reason. The
//! operator's choice becomes the attempt's stack (or stacks); a longer fixture becomes the
//! attempt's fixture, with the reason recorded.

use super::super::app::{App, Effect, Level};
use super::super::keymap::{Action, Input};
use super::super::solve::blocks_of;
use super::super::update::{record, refuse_read_only};
use super::move_sel;
use super::stack::{parts, put_stacks};
use super::wring::stack_changeable;
use crate::blocks::small::{Remedy, SmallAngle};
use crate::traveller::{Choice, EventKind, Stamp, Step};

/// One remedy that can be built.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Pick {
    /// A stack under each roll of this fixture.
    Two,
    /// One stack on the longer fixture at this index of [`SmallAngle::longer`].
    Longer(usize),
    /// The nearest single stack the set builds on this fixture.
    Nearest,
}

/// The remedies that can be built, in the order shown.
pub fn options(s: &SmallAngle) -> Vec<Pick> {
    let mut v = Vec::new();
    if s.two_stacks.is_ok() {
        v.push(Pick::Two);
    }
    for (i, l) in s.longer.iter().enumerate() {
        if l.result.is_ok() {
            v.push(Pick::Longer(i));
        }
    }
    if s.nearest.is_some() {
        v.push(Pick::Nearest);
    }
    v
}

/// The option chosen by the remedies' own rule (the smallest angle error, then fewer blocks).
pub fn default_sel(s: &SmallAngle) -> usize {
    let want = match s.chosen {
        Remedy::TwoStacks => Pick::Two,
        Remedy::Longer(i) => Pick::Longer(i),
        Remedy::Nearest => Pick::Nearest,
    };
    options(s).iter().position(|p| *p == want).unwrap_or(0)
}

/// Keys while the choice is on screen: ↑↓ choose, Enter uses the one under the cursor.
pub fn remedy_key(app: &mut App, input: Input) -> Vec<Effect> {
    let Some(r) = app.ui.remedies.as_ref() else {
        return Vec::new();
    };
    let list = options(&r.small);
    match input {
        Input::Act(Action::Forward) => match list.get(r.sel).copied() {
            Some(p) => apply(app, p),
            None => {
                app.say(
                    Level::Warn,
                    "no remedy can be built from this set; choose another set or fixture (Esc)",
                );
                Vec::new()
            }
        },
        _ => {
            let mut sel = r.sel;
            move_sel(&mut sel, list.len(), input);
            if let Some(r) = app.ui.remedies.as_mut() {
                r.sel = sel;
            }
            Vec::new()
        }
    }
}

/// Show the choice again (r), before any block is wrung.
pub fn reopen(app: &mut App) -> Vec<Effect> {
    if app.ui.remedies.is_none() {
        app.say(
            Level::Info,
            "the single stack is good here: there are no small-angle remedies to choose from",
        );
        return Vec::new();
    }
    if !stack_changeable(app) {
        return Vec::new();
    }
    let wrung = app.attempt().is_some_and(|a| {
        parts(a)
            .iter()
            .any(|(_, s)| s.blocks.iter().any(|b| b.wrung))
    });
    if wrung {
        app.say(
            Level::Warn,
            "blocks are already wrung; take them off (Space) before choosing another remedy",
        );
        return Vec::new();
    }
    if let Some(r) = app.ui.remedies.as_mut() {
        r.open = true;
    }
    Vec::new()
}

/// Make `pick` the attempt's setup.
fn apply(app: &mut App, pick: Pick) -> Vec<Effect> {
    if refuse_read_only(app) {
        return Vec::new();
    }
    let Some(r) = app.ui.remedies.clone() else {
        return Vec::new();
    };
    let s = &r.small;
    let (fixture, first, second, words, error) = match pick {
        Pick::Two => {
            let Ok(t) = s.two_stacks.as_ref() else {
                return Vec::new();
            };
            (
                r.fixture_id.clone(),
                blocks_of(&t.raised),
                Some(blocks_of(&t.pivot)),
                format!("two stacks on {}", r.fixture_id),
                t.error,
            )
        }
        Pick::Longer(i) => {
            let Some((l, one)) = s
                .longer
                .get(i)
                .and_then(|l| l.result.as_ref().ok().map(|x| (l, x)))
            else {
                return Vec::new();
            };
            (
                l.candidate.id.clone(),
                blocks_of(&one.stack),
                None,
                format!("one stack on the longer fixture {}", l.candidate.id),
                one.error,
            )
        }
        Pick::Nearest => {
            let Some(one) = s.nearest.as_ref() else {
                return Vec::new();
            };
            (
                r.fixture_id.clone(),
                blocks_of(&one.stack),
                None,
                format!("the nearest single stack on {}", r.fixture_id),
                one.error,
            )
        }
    };
    let mut effects = Vec::new();
    let current = app
        .attempt()
        .and_then(|a| a.fixture.as_ref())
        .map(|c| c.id.clone());
    if current.as_deref() != Some(fixture.as_str()) {
        let Some(snap) = app.shop.fixture(&fixture).cloned() else {
            app.say(
                Level::Error,
                format!("the fixture {fixture} is not in the shop file"),
            );
            return Vec::new();
        };
        let by = app.operator.clone();
        let set = app
            .attempt()
            .and_then(|a| a.block_set.as_ref())
            .map_or("?".to_string(), |c| c.id.clone());
        app.doc.put_fixture(snap);
        let reason = format!("small angle: {words} (the remedy chosen on the stack screen)");
        if let Some(a) = app.attempt_mut() {
            a.fixture = Some(Choice {
                id: fixture.clone(),
                reason: reason.clone(),
                by,
                at: Stamp::now(),
            });
            a.step = Step::Stack;
        }
        record(
            app,
            EventKind::FixtureChosen,
            format!("{fixture} ({reason})"),
        );
        // the set stands: the log says so, and the state follows
        record(app, EventKind::SetChosen, format!("{set} kept"));
    }
    if let Err(e) = put_stacks(app, first, second) {
        app.ui.solve_error = Some(e);
        return effects;
    }
    app.ui.solve_error = None;
    app.ui.stack_sel = 0;
    if let Some(r) = app.ui.remedies.as_mut() {
        r.open = false;
    }
    let left_off =
        matches!(pick, Pick::Two) && s.two_stacks.as_ref().is_ok_and(|t| t.protectors_left_off);
    app.ui.solve_note =
        left_off.then(|| "two stacks from one set: the protector blocks are left off".to_string());
    app.say(
        Level::Done,
        format!(
            "{words} (angle error {:+.2}\"); r shows the remedies again",
            error.arcsec()
        ),
    );
    effects.push(Effect::Save);
    effects
}
