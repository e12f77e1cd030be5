//! The second shift: on opening, handover notes and return comments come before anything else;
//! on quitting with work unfinished, the operator is asked for a note for the next shift.

use super::super::app::{App, Effect, Level, Prompt, PromptKind, Screen};
use super::super::field::Field;
use super::super::keymap::{Action, Input};
use super::super::update::{land, quit_now};
use crate::traveller::{FeatureState, Handover, Return, Step};

/// Something left for the person opening the job.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NoticeItem {
    /// A handover note (index into the job's handovers) this person has not read.
    Handover(usize),
    /// A lead's return (index into the job's returns) still open: its feature is returned.
    Return(usize),
}

/// Handover notes not read by `who` and not written by them; with no name yet, the notes
/// nobody has read. Newest first.
pub fn unread(app: &App) -> Vec<usize> {
    let who = app.operator.as_str();
    let mut out: Vec<usize> = app
        .doc
        .handovers
        .iter()
        .enumerate()
        .filter(|(_, h)| {
            if who.is_empty() {
                h.read_by.is_empty()
            } else {
                h.by != who && !h.read_by.iter().any(|m| m.by == who)
            }
        })
        .map(|(i, _)| i)
        .collect();
    out.reverse();
    out
}

/// The returns still open: for each returned feature, the latest return covering it.
pub fn open_returns(app: &App) -> Vec<usize> {
    let t = &app.doc;
    let mut out: Vec<usize> = t
        .features
        .iter()
        .filter(|f| f.state == FeatureState::Returned)
        .filter_map(|f| {
            t.returns
                .iter()
                .rposition(|r| r.feature.is_none() || r.feature.as_deref() == Some(f.id.as_str()))
        })
        .collect();
    out.sort_unstable();
    out.dedup();
    out
}

/// What the notice screen shows: return comments first (they say what to redo), then notes.
pub fn notice_items(app: &App) -> Vec<NoticeItem> {
    open_returns(app)
        .into_iter()
        .map(NoticeItem::Return)
        .chain(unread(app).into_iter().map(NoticeItem::Handover))
        .collect()
}

/// The return behind a notice item, if it is one.
pub fn item_return(app: &App, item: NoticeItem) -> Option<&Return> {
    match item {
        NoticeItem::Return(i) => app.doc.returns.get(i),
        NoticeItem::Handover(_) => None,
    }
}

/// The handover note behind a notice item, if it is one.
pub fn item_handover(app: &App, item: NoticeItem) -> Option<&Handover> {
    match item {
        NoticeItem::Handover(i) => app.doc.handovers.get(i),
        NoticeItem::Return(_) => None,
    }
}

/// Mark the handover notes read by the operator (logged), when that can be saved.
pub fn mark_read(app: &mut App) -> Vec<Effect> {
    app.notice_unmarked = false;
    if app.read_only
        || app.operator.is_empty()
        || app.doc.unread_handovers(&app.operator).is_empty()
    {
        return Vec::new();
    }
    let who = app.operator.clone();
    app.doc.mark_handovers_read(&who);
    vec![Effect::Save]
}

pub fn notice_key(app: &mut App, input: Input) -> Vec<Effect> {
    if input != Input::Act(Action::Forward) {
        return Vec::new();
    }
    app.notice_seen = true;
    let had_notes = !unread(app).is_empty();
    let mut effects = if app.operator.is_empty() {
        app.notice_unmarked = had_notes && !app.read_only;
        Vec::new()
    } else {
        mark_read(app)
    };
    effects.extend(land(app));
    effects
}

/// Is a feature's work under way: an attempt with its fixture chosen and not yet finished?
pub fn mid_feature(app: &App) -> bool {
    app.doc.features.iter().any(|f| {
        !f.is_finished()
            && f.state != FeatureState::Returned
            && f.current_attempt()
                .is_some_and(|a| a.fixture.is_some() && a.step != Step::Done)
    })
}

/// Is the operator asked for a note on quitting? Opened for work, name known, work unfinished,
/// and something to hand over: an entry confirmed in this session or a feature under way.
pub fn wants_handover(app: &App) -> bool {
    !app.read_only
        && !app.review_mode
        && !app.operator.is_empty()
        && app.screen != Screen::Name
        && app
            .prompt
            .as_ref()
            .is_none_or(|p| p.kind != PromptKind::Handover)
        && app.doc.features.iter().any(|f| !f.is_finished())
        && (app.worked || mid_feature(app))
}

/// Ask for the note for the next shift (over whatever was on screen).
pub fn ask_handover(app: &mut App) {
    app.help = false;
    app.prompt = Some(Prompt {
        kind: PromptKind::Handover,
        title: "Note for the next shift".into(),
        hint: "Work is not finished. Leave a note for whoever opens the job next (optional): \
               where you stopped, what to watch for. Enter saves it and quits; Esc or an empty \
               note quits without one."
            .into(),
        field: Some(Field::new(300)),
        error: None,
        carry: String::new(),
    });
}

/// The note typed (empty: none); then quit.
pub fn answer_handover(app: &mut App, text: String) -> Vec<Effect> {
    if text.trim().is_empty() {
        return quit_now(app);
    }
    let by = app.operator.clone();
    app.doc.add_handover(&by, text.trim());
    app.say(Level::Done, "note left for the next shift");
    let mut e = vec![Effect::Save];
    e.extend(quit_now(app));
    e
}
