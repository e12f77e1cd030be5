//! The one keymap: every key the screens answer to, what it means where, and the words the
//! footer and the help overlay show. Arrows, Enter, Esc and Tab always work; letters are
//! shortcuts and stand aside while a text field is being typed into.

use crossterm::event::{KeyCode, KeyEvent, KeyEventKind, KeyModifiers};

/// Where the operator is, for choosing bindings and their labels.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Ctx {
    Overview,
    Name,
    Fixture,
    BlockSet,
    Stack,
    /// The stack screen while the small-angle remedies are offered.
    Remedy,
    Safety,
    Settle,
    Readings,
    Verdict,
    Sign,
    /// A one-line text prompt over a screen (reason, note, swapped block).
    Prompt,
    /// The note for the next shift, asked on quitting.
    Handover,
    /// Handover notes and return comments shown on opening.
    Notice,
    /// The lead's review: the list of features.
    Review,
    /// The lead's review: one feature's attempts.
    ReviewFeature,
    Help,
}

/// What a key means.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Action {
    Up,
    Down,
    Left,
    Right,
    PageUp,
    PageDown,
    /// Enter: confirm, go forward.
    Forward,
    /// Esc: go back one step (or close an overlay).
    Back,
    NextField,
    PrevField,
    Help,
    Quit,
    /// Mark the selected block as wrung (or un-mark it).
    Tick,
    /// Replace the selected block with the one really used.
    Swap,
    /// Put the set's protector blocks on the ends of the stack, or take them off.
    Protectors,
    /// Small angles: show the remedies side by side again.
    Remedies,
    /// Skip the settle timer.
    Skip,
    /// Remove the last reading.
    Remove,
    /// Switch between fixed spacing and position/reading pairs.
    Mode,
    /// After a fail: a new attempt with the corrected stack.
    NewAttempt,
    /// After a fail: record the feature as nonconforming, with a note.
    Nonconforming,
    /// From the overview: the review of every feature.
    Review,
    /// Review: show only the flagged features (again for all).
    Filter,
    /// Review: the lead signs the selected feature.
    SignFeature,
    /// Review: the lead signs the whole job.
    SignJob,
    /// Review: send the selected feature back with a comment.
    ReturnFeature,
    /// Review: send the whole job back with a comment.
    ReturnJob,
}

/// A key as the keymap names it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Key {
    Code(KeyCode),
    Ctrl(char),
}

/// One line of the keymap.
#[derive(Debug, Clone, Copy)]
pub struct Binding {
    pub keys: &'static [Key],
    pub action: Action,
    /// Short words for the footer ("use fixture").
    pub label: &'static str,
    /// A sentence for the help overlay.
    pub help: &'static str,
    /// The screens it applies to; empty means everywhere.
    pub ctx: &'static [Ctx],
    /// Shown in the footer (the help lists every binding).
    pub footer: bool,
}

const fn b(
    keys: &'static [Key],
    action: Action,
    label: &'static str,
    help: &'static str,
    ctx: &'static [Ctx],
    footer: bool,
) -> Binding {
    Binding {
        keys,
        action,
        label,
        help,
        ctx,
        footer,
    }
}

use Ctx as C;
const ENTER: Key = Key::Code(KeyCode::Enter);
const ESC: Key = Key::Code(KeyCode::Esc);
const fn ch(c: char) -> Key {
    Key::Code(KeyCode::Char(c))
}
const LISTS: &[Ctx] = &[
    C::Overview,
    C::Review,
    C::Fixture,
    C::BlockSet,
    C::Stack,
    C::Remedy,
    C::Verdict,
    C::Help,
];

/// The keymap, first match wins (one binding a line).
#[rustfmt::skip]
pub const KEYMAP: &[Binding] = &[
    // Enter: its words depend on the screen.
    b(&[ENTER], Action::Forward, "open feature", "Work on the selected feature", &[C::Overview], true),
    b(&[ENTER], Action::Forward, "go on", "Keep this name and go on", &[C::Name], true),
    b(&[ENTER], Action::Forward, "use fixture", "Use the selected fixture (an out-of-date one asks for a reason)", &[C::Fixture], true),
    b(&[ENTER], Action::Forward, "use set", "Use the selected block set", &[C::BlockSet], true),
    b(&[ENTER], Action::Forward, "stack built", "Go on once every block is ticked as wrung", &[C::Stack], true),
    b(&[ENTER], Action::Forward, "use this", "Use the selected remedy: its stacks (or the longer fixture) become this attempt's", &[C::Remedy], true),
    b(&[ENTER], Action::Forward, "all done", "The cautions are read and the work is clamped: confirm and let the stack settle", &[C::Safety], true),
    b(&[ENTER], Action::Forward, "to readings", "The stack has settled (or the wait was skipped): go to the readings", &[C::Settle], true),
    b(&[ENTER], Action::Forward, "add / verdict", "Add the reading typed; with the field empty and enough readings, see the verdict", &[C::Readings], true),
    b(&[ENTER], Action::Forward, "do this", "Do the selected choice", &[C::Verdict], true),
    b(&[ENTER], Action::Forward, "sign", "Sign the feature with the name typed", &[C::Sign], true),
    b(&[ENTER], Action::Forward, "confirm", "Confirm what was typed", &[C::Prompt], true),
    b(&[ENTER], Action::Forward, "leave note, quit", "Save the note for the next shift and quit (an empty note quits without one)", &[C::Handover], true),
    b(&[ENTER], Action::Forward, "go on", "These have been read: go on to the work", &[C::Notice], true),
    b(&[ENTER, Key::Code(KeyCode::Right)], Action::Forward, "attempts", "Show the selected feature: every attempt, the stack, readings, chart and budget", &[C::Review], true),
    b(&[ENTER], Action::Back, "close", "Close the help", &[C::Help], false),
    // Esc: back.
    b(&[ESC], Action::Back, "back", "Go back one step; every step can be seen again until the feature is signed", &[C::Fixture, C::BlockSet, C::Stack, C::Remedy, C::Safety, C::Settle, C::Readings, C::Verdict, C::Sign], true),
    b(&[ESC], Action::Back, "cancel", "Cancel and go back", &[C::Prompt, C::Name], true),
    b(&[ESC], Action::Back, "quit, no note", "Quit without a note", &[C::Handover], true),
    b(&[ESC], Action::Back, "overview", "Back to the job overview", &[C::Review], true),
    b(&[ESC], Action::Back, "list", "Back to the list of features", &[C::ReviewFeature], true),
    b(&[ESC, ch('?'), Key::Code(KeyCode::F(1))], Action::Back, "close", "Close the help", &[C::Help], true),
    // Moving.
    b(&[Key::Code(KeyCode::Up), ch('k')], Action::Up, "select", "Move the selection up", LISTS, true),
    b(&[Key::Code(KeyCode::Down), ch('j')], Action::Down, "select", "Move the selection down", LISTS, false),
    b(&[Key::Code(KeyCode::Up)], Action::Up, "", "Go to the field above", &[C::Readings], false),
    b(&[Key::Code(KeyCode::Down)], Action::Down, "", "Go to the field below", &[C::Readings], false),
    b(&[Key::Code(KeyCode::PageUp)], Action::PageUp, "", "Page up", LISTS, false),
    b(&[Key::Code(KeyCode::PageDown)], Action::PageDown, "", "Page down", LISTS, false),
    b(&[Key::Code(KeyCode::Left)], Action::Left, "", "Previous choice", &[C::Verdict], false),
    b(&[Key::Code(KeyCode::Right)], Action::Right, "", "Next choice", &[C::Verdict], false),
    b(&[Key::Code(KeyCode::Left)], Action::Left, "attempt", "Show the previous attempt (→ the next)", &[C::ReviewFeature], true),
    b(&[Key::Code(KeyCode::Right)], Action::Right, "", "Show the next attempt", &[C::ReviewFeature], false),
    b(&[Key::Code(KeyCode::Up), ch('k')], Action::Up, "scroll", "Scroll the attempt up or down (↑ and ↓)", &[C::ReviewFeature], true),
    b(&[Key::Code(KeyCode::Down), ch('j')], Action::Down, "", "Scroll the attempt down", &[C::ReviewFeature], false),
    b(&[Key::Code(KeyCode::PageUp)], Action::PageUp, "", "Scroll a page up", &[C::ReviewFeature], false),
    b(&[Key::Code(KeyCode::PageDown)], Action::PageDown, "", "Scroll a page down", &[C::ReviewFeature], false),
    b(&[Key::Code(KeyCode::Tab)], Action::NextField, "next field", "Go to the next field", &[C::Readings], true),
    b(&[Key::Code(KeyCode::Tab)], Action::Down, "", "Next in the list", LISTS, false),
    b(&[Key::Code(KeyCode::BackTab)], Action::Up, "", "Previous in the list", LISTS, false),
    b(&[Key::Code(KeyCode::BackTab)], Action::PrevField, "", "Go to the previous field", &[C::Readings], false),
    // Screen shortcuts.
    b(&[Key::Code(KeyCode::Char(' ')), ch('w')], Action::Tick, "wrung", "Tick the selected block as wrung (again to undo)", &[C::Stack], true),
    b(&[ch('s')], Action::Swap, "swap block", "Replace the selected block with the one really used; the angle is worked out from what was built", &[C::Stack], true),
    b(&[ch('p')], Action::Protectors, "protectors", "Use the set's protector blocks on the ends of the stack, or leave them off (before any block is wrung)", &[C::Stack], true),
    b(&[ch('r')], Action::Remedies, "remedies", "Small angle: show the remedies side by side again", &[C::Stack], true),
    b(&[ch('s')], Action::Skip, "skip wait", "Skip the settle timer (the skip is recorded)", &[C::Settle], true),
    b(&[Key::Code(KeyCode::Delete), Key::Ctrl('d')], Action::Remove, "remove last", "Remove the last reading", &[C::Readings], true),
    b(&[Key::Code(KeyCode::F(2))], Action::Mode, "spacing/pairs", "Switch between fixed spacing over a travel and position/reading pairs (before the first reading)", &[C::Readings], true),
    b(&[ch('n')], Action::NewAttempt, "new attempt", "After a fail: a new attempt with the corrected stack", &[C::Verdict], true),
    b(&[ch('x')], Action::Nonconforming, "nonconforming", "After a fail: record the feature as nonconforming, with a note", &[C::Verdict], true),
    b(&[ch('v')], Action::Review, "review", "Review every feature: attempts, readings, budget and flags; the lead signs or returns from there", &[C::Overview], true),
    b(&[ch('f')], Action::Filter, "flagged only", "Show only the flagged features (again shows all)", &[C::Review], true),
    b(&[ch('s')], Action::SignFeature, "sign feature", "Sign the selected feature as lead (asks to confirm)", &[C::Review, C::ReviewFeature], true),
    b(&[ch('S')], Action::SignJob, "sign job", "Sign the whole job as lead (asks to confirm; every feature must be finished)", &[C::Review, C::ReviewFeature], true),
    b(&[ch('r')], Action::ReturnFeature, "return", "Send the selected feature back to the operator with a comment", &[C::Review, C::ReviewFeature], true),
    b(&[ch('R')], Action::ReturnJob, "return job", "Send the whole job (every finished feature) back with a comment", &[C::Review, C::ReviewFeature], true),
    // Everywhere.
    b(&[ch('?'), Key::Code(KeyCode::F(1))], Action::Help, "help", "Show every key for this screen", &[], true),
    b(&[ch('q'), Key::Ctrl('c'), Key::Ctrl('q')], Action::Quit, "quit", "Quit; everything confirmed is already saved, and reopening returns to this step", &[], true),
];

fn applies(bd: &Binding, ctx: Ctx) -> bool {
    bd.ctx.is_empty() || bd.ctx.contains(&ctx)
}

fn matches(k: Key, ev: &KeyEvent) -> bool {
    let ctrl = ev.modifiers.contains(KeyModifiers::CONTROL);
    match k {
        Key::Ctrl(c) => ctrl && ev.code == KeyCode::Char(c),
        Key::Code(code) => !ctrl && ev.code == code,
    }
}

/// What a key press means. `typing` is true while a text field has the focus: then printable
/// characters belong to the field (`Typed`) and letter shortcuts stand aside.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Input {
    Act(Action),
    Typed(char),
    Erase,
}

/// Translate a key event; only presses count (repeats and releases are ignored).
pub fn translate(ev: &KeyEvent, ctx: Ctx, typing: bool) -> Option<Input> {
    if ev.kind != KeyEventKind::Press {
        return None;
    }
    let ctrl = ev.modifiers.contains(KeyModifiers::CONTROL);
    if typing && !ctrl {
        match ev.code {
            KeyCode::Char(c) => return Some(Input::Typed(c)),
            KeyCode::Backspace => return Some(Input::Erase),
            _ => {}
        }
    }
    KEYMAP
        .iter()
        .filter(|bd| applies(bd, ctx))
        .find(|bd| bd.keys.iter().any(|k| matches(*k, ev)))
        .map(|bd| Input::Act(bd.action))
}

/// The name of a key as printed.
pub fn key_name(k: Key) -> String {
    match k {
        Key::Ctrl(c) => format!("Ctrl-{}", c.to_ascii_uppercase()),
        Key::Code(code) => match code {
            KeyCode::Enter => "Enter".into(),
            KeyCode::Esc => "Esc".into(),
            KeyCode::Tab => "Tab".into(),
            KeyCode::BackTab => "Shift-Tab".into(),
            KeyCode::Up => "↑".into(),
            KeyCode::Down => "↓".into(),
            KeyCode::Left => "←".into(),
            KeyCode::Right => "→".into(),
            KeyCode::PageUp => "PgUp".into(),
            KeyCode::PageDown => "PgDn".into(),
            KeyCode::Delete => "Del".into(),
            KeyCode::Backspace => "Backspace".into(),
            KeyCode::F(n) => format!("F{n}"),
            KeyCode::Char(' ') => "Space".into(),
            KeyCode::Char(c) => c.to_string(),
            _ => "?".into(),
        },
    }
}

/// The keys of a binding as printed in the footer: the first one (arrows as ↑↓), plus the
/// first letter shortcut when the first key is not a letter and shortcuts are live.
fn footer_keys(bd: &Binding, typing: bool) -> String {
    if bd.action == Action::Up {
        return "↑↓".into();
    }
    if bd.action == Action::Left {
        return "←→".into();
    }
    let usable: Vec<Key> = bd
        .keys
        .iter()
        .copied()
        .filter(|k| !(typing && matches!(k, Key::Code(KeyCode::Char(_)))))
        .collect();
    usable.first().map(|k| key_name(*k)).unwrap_or_default()
}

/// The footer entries for a screen: (keys, label), in keymap order, each action once.
pub fn footer(ctx: Ctx, typing: bool, hide: &[Action]) -> Vec<(String, &'static str)> {
    let mut seen: Vec<Action> = Vec::new();
    let mut out = Vec::new();
    for bd in KEYMAP.iter().filter(|bd| applies(bd, ctx) && bd.footer) {
        if seen.contains(&bd.action) || hide.contains(&bd.action) {
            continue;
        }
        let keys = footer_keys(bd, typing);
        if keys.is_empty() {
            continue;
        }
        seen.push(bd.action);
        out.push((keys, bd.label));
    }
    out
}

/// The help lines for a screen: (all keys, sentence), each action once.
pub fn help(ctx: Ctx) -> Vec<(String, &'static str)> {
    let mut seen: Vec<Action> = Vec::new();
    let mut out = Vec::new();
    for bd in KEYMAP.iter().filter(|bd| applies(bd, ctx)) {
        if seen.contains(&bd.action) {
            continue;
        }
        seen.push(bd.action);
        let keys: Vec<String> = bd.keys.iter().map(|k| key_name(*k)).collect();
        out.push((keys.join(" / "), bd.help));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crossterm::event::KeyEventState;

    fn press(code: KeyCode) -> KeyEvent {
        KeyEvent::new(code, KeyModifiers::NONE)
    }

    #[test]
    fn only_presses_count() {
        let mut ev = press(KeyCode::Enter);
        ev.kind = KeyEventKind::Release;
        assert_eq!(translate(&ev, Ctx::Fixture, false), None);
        ev.kind = KeyEventKind::Repeat;
        assert_eq!(translate(&ev, Ctx::Fixture, false), None);
        ev.kind = KeyEventKind::Press;
        ev.state = KeyEventState::NONE;
        assert_eq!(
            translate(&ev, Ctx::Fixture, false),
            Some(Input::Act(Action::Forward))
        );
    }

    #[test]
    fn letters_are_typed_while_a_field_has_the_focus() {
        let q = press(KeyCode::Char('q'));
        assert_eq!(translate(&q, Ctx::Sign, true), Some(Input::Typed('q')));
        assert_eq!(
            translate(&q, Ctx::Sign, false),
            Some(Input::Act(Action::Quit))
        );
        let ctrl_c = KeyEvent::new(KeyCode::Char('c'), KeyModifiers::CONTROL);
        assert_eq!(
            translate(&ctrl_c, Ctx::Sign, true),
            Some(Input::Act(Action::Quit))
        );
        // arrows and Esc still work while typing
        assert_eq!(
            translate(&press(KeyCode::Esc), Ctx::Readings, true),
            Some(Input::Act(Action::Back))
        );
    }

    #[test]
    fn the_same_letter_means_what_the_screen_says() {
        let s = press(KeyCode::Char('s'));
        assert_eq!(
            translate(&s, Ctx::Stack, false),
            Some(Input::Act(Action::Swap))
        );
        assert_eq!(
            translate(&s, Ctx::Settle, false),
            Some(Input::Act(Action::Skip))
        );
        assert_eq!(translate(&s, Ctx::Overview, false), None);
    }

    #[test]
    fn footer_and_help_come_from_the_keymap() {
        let f = footer(Ctx::Fixture, false, &[]);
        assert!(f.contains(&("Enter".to_string(), "use fixture")), "{f:?}");
        assert!(f.contains(&("↑↓".to_string(), "select")), "{f:?}");
        assert!(f.contains(&("q".to_string(), "quit")), "{f:?}");
        // while typing, quit is shown with its control key
        let f = footer(Ctx::Sign, true, &[]);
        assert!(f.contains(&("Ctrl-C".to_string(), "quit")), "{f:?}");
        let h = help(Ctx::Stack);
        assert!(h.iter().any(|(k, _)| k == "Space / w"), "{h:?}");
        // every binding that is in a footer has a label
        assert!(KEYMAP.iter().all(|b| !b.footer || !b.label.is_empty()));
    }
}
