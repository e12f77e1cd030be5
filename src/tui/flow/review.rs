//! The lead's review: moving through the features (all, or only the flagged ones), a feature's
//! attempts, and the lead's own actions: sign a feature or the job (after a confirm step), or
//! send either back with a comment. Nothing else can be changed from here.

use super::super::app::{App, Effect, Level, Prompt, PromptKind, Screen};
use super::super::field::Field;
use super::super::flags::{lead_signoff, review_flags};
use super::super::keymap::{Action, Input};
use super::super::screens::overview::state_text;
use super::super::screens::review_feature::page;
use super::super::update::refuse_read_only;
use crate::traveller::{Feature, FeatureState, Role, Scope, Stamp, Traveller};

/// The features the list shows (indices), all or only the flagged ones.
pub fn visible(app: &App) -> Vec<usize> {
    app.doc
        .features
        .iter()
        .enumerate()
        .filter(|(_, f)| !app.ui.review.flagged_only || !review_flags(&app.doc, f).is_empty())
        .map(|(i, _)| i)
        .collect()
}

/// Show the review list with feature `sel` selected (or the first shown).
pub fn enter_review(app: &mut App, sel: usize) {
    app.screen = Screen::Review;
    app.ui.review.sel = sel;
    fix_selection(app);
}

/// Keep the selection on a feature the list shows.
fn fix_selection(app: &mut App) {
    let vis = visible(app);
    if !vis.contains(&app.ui.review.sel)
        && let Some(first) = vis
            .iter()
            .copied()
            .find(|i| *i > app.ui.review.sel)
            .or(vis.last().copied())
    {
        app.ui.review.sel = first;
    }
}

pub fn review_key(app: &mut App, input: Input) -> Vec<Effect> {
    let vis = visible(app);
    let pos = vis.iter().position(|i| *i == app.ui.review.sel);
    match input {
        Input::Act(Action::Up) => {
            if let Some(p) = pos {
                app.ui.review.sel = vis[p.saturating_sub(1)];
            }
        }
        Input::Act(Action::Down) => {
            if let Some(p) = pos {
                app.ui.review.sel = vis[(p + 1).min(vis.len() - 1)];
            }
        }
        Input::Act(Action::PageUp) => {
            if let Some(first) = vis.first() {
                app.ui.review.sel = *first;
            }
        }
        Input::Act(Action::PageDown) => {
            if let Some(last) = vis.last() {
                app.ui.review.sel = *last;
            }
        }
        Input::Act(Action::Filter) => {
            app.ui.review.flagged_only = !app.ui.review.flagged_only;
            fix_selection(app);
            let n = visible(app).len();
            let text = if app.ui.review.flagged_only {
                format!("showing the flagged features only ({n}); f shows all")
            } else {
                format!("showing all {n} features")
            };
            app.say(Level::Info, text);
        }
        Input::Act(Action::Forward) if pos.is_some() => {
            let feature = app.ui.review.sel;
            app.ui.review.attempt = 0;
            app.ui.review.scroll = 0;
            app.screen = Screen::ReviewFeature { feature };
        }
        Input::Act(Action::Back) => {
            if app.review_mode {
                app.say(
                    Level::Info,
                    "opened for review: q quits (everything signed or returned is saved)",
                );
            } else {
                app.ui.overview_sel = app.ui.review.sel;
                app.screen = Screen::Overview;
            }
        }
        Input::Act(a @ (Action::SignJob | Action::ReturnJob)) => {
            return lead_action(app, app.ui.review.sel, a);
        }
        Input::Act(a) if pos.is_some() => return lead_action(app, app.ui.review.sel, a),
        _ => {}
    }
    Vec::new()
}

pub fn feature_key(app: &mut App, feature: usize, input: Input) -> Vec<Effect> {
    let n = app
        .doc
        .features
        .get(feature)
        .map_or(0, |f| f.attempts.len());
    let pg = page(app, feature);
    let max = pg.max_scroll();
    let r = &mut app.ui.review;
    match input {
        Input::Act(Action::Left) => {
            r.attempt = r.attempt.saturating_sub(1);
            r.scroll = pg.start_of(r.attempt).min(max);
        }
        Input::Act(Action::Right) => {
            r.attempt = (r.attempt + 1).min(n.saturating_sub(1));
            r.scroll = pg.start_of(r.attempt).min(max);
        }
        Input::Act(Action::Up) => r.scroll = r.scroll.saturating_sub(1),
        Input::Act(Action::Down) => r.scroll = (r.scroll + 1).min(max),
        Input::Act(Action::PageUp) => r.scroll = r.scroll.saturating_sub(pg.height),
        Input::Act(Action::PageDown) => r.scroll = (r.scroll + pg.height).min(max),
        Input::Act(Action::Back) => {
            app.ui.review.sel = feature;
            app.screen = Screen::Review;
        }
        Input::Act(a) => return lead_action(app, feature, a),
        _ => {}
    }
    Vec::new()
}

/// The page is wrapped anew at another size: keep the chosen attempt in view.
pub fn resized(app: &mut App) {
    if let Screen::ReviewFeature { feature } = app.screen {
        let pg = page(app, feature);
        app.ui.review.scroll = pg.start_of(app.ui.review.attempt).min(pg.max_scroll());
    }
}

/// Where a feature stands, for a refusal: "at readings", "returned"…
fn standing_words(f: &Feature) -> String {
    state_text(f)
}

/// A feature the lead may sign or send back: the operator finished it.
fn finished(f: &Feature) -> bool {
    matches!(f.state, FeatureState::Signed | FeatureState::Nonconforming)
}

fn lead_action(app: &mut App, feature: usize, action: Action) -> Vec<Effect> {
    let target = match action {
        Action::SignFeature | Action::ReturnFeature => Some(feature),
        Action::SignJob | Action::ReturnJob => None,
        _ => return Vec::new(),
    };
    if refuse_read_only(app) {
        return Vec::new();
    }
    if !app.review_mode {
        app.say(
            Level::Warn,
            "signing as lead and sending back are for the lead: quit, then open the job with `tiltbook open FILE --review --as NAME`",
        );
        return Vec::new();
    }
    let sign = matches!(action, Action::SignFeature | Action::SignJob);
    let refused = if sign {
        can_sign(app, target)
    } else {
        can_return(app, target)
    };
    if let Err(why) = refused {
        app.say(Level::Warn, why);
        return Vec::new();
    }
    let job = app.doc.job.id.clone();
    let what = match target.and_then(|i| app.doc.features.get(i)) {
        Some(f) => format!("{} {}", f.id, f.name),
        None => format!("the whole job {job}"),
    };
    let who = app.operator.clone();
    app.prompt = Some(if sign {
        Prompt {
            kind: PromptKind::LeadSign(target),
            title: format!("Sign {what} as lead"),
            hint: format!(
                "{who} signs {what} as lead, now. A SHA-256 digest of what is signed (each \
                 feature's attempt, stack, readings, budget and verdict) is stored with the \
                 name and time; any later change shows as changed after sign-off."
            ),
            field: None,
            error: None,
            carry: String::new(),
        }
    } else {
        // say which signatures the return takes back, before it is sent
        let mut withdrawn: Vec<String> = Vec::new();
        if let Some(f) = target.and_then(|i| app.doc.features.get(i))
            && let Some(s) = lead_signoff(&app.doc, Some(&f.id))
        {
            withdrawn.push(format!("{}'s sign-off of {}", s.by, f.id));
        }
        if let Some(s) = lead_signoff(&app.doc, None) {
            withdrawn.push(format!("{}'s sign-off of the whole job", s.by));
        }
        let takes_back = if withdrawn.is_empty() {
            String::new()
        } else {
            format!(
                " This withdraws {}; it is signed again after the rework.",
                withdrawn.join(" and ")
            )
        };
        Prompt {
            kind: PromptKind::Return(target),
            title: format!("Return {what} to the operator"),
            hint: format!(
                "Type what to check or redo; the operator sees it first on opening the job.{takes_back} \
                 Enter sends it back, Esc cancels."
            ),
            field: Some(Field::new(300)),
            error: None,
            carry: String::new(),
        }
    });
    Vec::new()
}

/// The features `who` signed as operator: a lead's signature is a second person's check.
fn signed_as_operator(t: &Traveller, who: &str) -> Vec<String> {
    let who = who.trim();
    t.signoffs
        .iter()
        .filter(|s| s.role == Role::Operator && s.by.trim().eq_ignore_ascii_case(who))
        .filter_map(|s| s.feature.clone())
        .collect()
}

/// Can the lead sign this feature (or the job)? The refusal says why and what to do.
fn can_sign(app: &App, target: Option<usize>) -> Result<(), String> {
    let t = &app.doc;
    let own = signed_as_operator(t, &app.operator);
    match target.and_then(|i| t.features.get(i)) {
        Some(f) if own.contains(&f.id) => Err(format!(
            "{} signed {} as its operator; the lead's signature is a second person's check: another lead signs it",
            app.operator, f.id
        )),
        None if !own.is_empty() => Err(format!(
            "{} signed {} as operator; the lead's signature on the job is a second person's check: another lead signs it",
            app.operator,
            own.join(", ")
        )),
        Some(f) => {
            if f.state == FeatureState::Returned {
                return Err(format!(
                    "{} was sent back and is not signed again by the operator yet; sign it once it is",
                    f.id
                ));
            }
            if !finished(f) {
                return Err(format!(
                    "{} is not finished ({}); the operator signs it first",
                    f.id,
                    standing_words(f)
                ));
            }
            if let Some(s) = lead_signoff(t, Some(&f.id)) {
                return Err(format!(
                    "{} is already signed by {} (lead) on {}, and nothing changed since",
                    f.id,
                    s.by,
                    s.at.short()
                ));
            }
            Ok(())
        }
        None => {
            let open: Vec<String> = t
                .features
                .iter()
                .filter(|f| !finished(f))
                .map(|f| format!("{} ({})", f.id, standing_words(f)))
                .collect();
            if !open.is_empty() {
                return Err(format!(
                    "the job is signed once every feature is signed or recorded nonconforming; not yet: {}",
                    open.join(", ")
                ));
            }
            if let Some(s) = lead_signoff(t, None) {
                return Err(format!(
                    "the job is already signed by {} (lead) on {}, and nothing changed since",
                    s.by,
                    s.at.short()
                ));
            }
            Ok(())
        }
    }
}

/// Can the lead send this feature (or the job) back?
fn can_return(app: &App, target: Option<usize>) -> Result<(), String> {
    let t = &app.doc;
    match target.and_then(|i| t.features.get(i)) {
        Some(f) if f.state == FeatureState::Returned => Err(format!(
            "{} is already sent back; the operator has not worked it again yet",
            f.id
        )),
        Some(f) if !finished(f) => Err(format!(
            "{} is not finished ({}); only signed or nonconforming features are sent back",
            f.id,
            standing_words(f)
        )),
        Some(_) => Ok(()),
        None if t.features.iter().any(finished) => Ok(()),
        None => Err("no feature is finished yet, so there is nothing to send back".into()),
    }
}

/// The lead confirmed the signature.
pub fn answer_sign(app: &mut App, target: Option<usize>) -> Result<Vec<Effect>, String> {
    can_sign(app, target)?;
    let by = app.operator.clone();
    let (scope, id) = match target.and_then(|i| app.doc.features.get(i)) {
        Some(f) => (Scope::Feature, Some(f.id.clone())),
        None => (Scope::Job, None),
    };
    let digest = app
        .doc
        .sign(&by, Role::Lead, scope, id.as_deref(), Stamp::now())
        .map(|s| s.digest.chars().take(12).collect::<String>())
        .map_err(|e| e.to_string())?;
    let what = id.unwrap_or_else(|| format!("job {}", app.doc.job.id));
    app.say(
        Level::Done,
        format!("{what} signed by {by} as lead (digest {digest}…)"),
    );
    Ok(vec![Effect::Save])
}

/// The lead's comment sending a feature (or the job) back.
pub fn answer_return(
    app: &mut App,
    target: Option<usize>,
    text: String,
) -> Result<Vec<Effect>, String> {
    if text.trim().chars().count() < 3 {
        return Err("a comment is needed: say what to check or redo, e.g. sweep again after cleaning the face".into());
    }
    can_return(app, target)?;
    let by = app.operator.clone();
    let id = target
        .and_then(|i| app.doc.features.get(i))
        .map(|f| f.id.clone());
    app.doc.add_return(&by, id.as_deref(), text.trim());
    let what = id.unwrap_or_else(|| "the job".into());
    app.say(
        Level::Done,
        format!("{what} sent back to the operator; they see the comment first on opening"),
    );
    fix_selection(app);
    Ok(vec![Effect::Save])
}
