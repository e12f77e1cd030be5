//! `update()` with no terminal, for the lead's review: the list and its flagged filter, a
//! feature's attempts, signing (with a confirm step) and returning (with a comment), what is
//! refused, read-only review, and a value changed by hand after sign-off.

mod tui_support;

use tiltbook::traveller::digest::withdrawn_by;
use tiltbook::traveller::{self, EventKind, FeatureState, Role, Scope, Step, Traveller};
use tiltbook::tui::app::{Effect, Msg, PromptKind, Screen};
use tiltbook::tui::flags::{lead_signoff, review_flags};
use tiltbook::tui::flow::review::visible;
use tiltbook::tui::keymap::{Action, Input};
use tiltbook::tui::update::update;
use tui_support::*;

/// The finished sample without its lead sign-off: every feature signed by the operator only.
fn finished_for_review() -> Traveller {
    let mut t = sample("ds-204-finished.yaml");
    let lead: Vec<usize> = t
        .signoffs
        .iter()
        .enumerate()
        .filter(|(_, s)| s.role == Role::Lead)
        .map(|(i, _)| i)
        .collect();
    for i in lead.into_iter().rev() {
        t.signoffs.remove(i);
    }
    t
}

fn index_of(app: &tiltbook::tui::App, id: &str) -> usize {
    app.doc.features.iter().position(|f| f.id == id).unwrap()
}

fn prompt_kind(app: &tiltbook::tui::App) -> Option<PromptKind> {
    app.prompt.as_ref().map(|p| p.kind.clone())
}

#[test]
fn review_opens_on_the_list_and_asks_the_name_first_when_unknown() {
    let (app, _) = review_app(finished_for_review(), Some("LV"), false);
    assert_eq!(app.screen, Screen::Review);
    let (mut app, mut r) = review_app(finished_for_review(), None, false);
    assert_eq!(app.screen, Screen::Name);
    typ(&mut app, &mut r, "LV");
    enter(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Review);
    assert_eq!(app.operator, "LV");
    // looking only: no name is needed
    let (app, _) = review_app(finished_for_review(), None, true);
    assert_eq!(app.screen, Screen::Review);
}

#[test]
fn the_flags_of_the_finished_sample_are_the_ones_its_header_describes() {
    // sample-jobs/ds-204-finished.yaml says: F3 had a block swapped by hand, F4 fell in the
    // doubt band, F5 had a block swapped by hand (and its sweep is not straight); F2 (one block,
    // protectors left off), F6 and F7 have nothing to flag: every item was in calibration
    let t = finished_for_review();
    let tags = |id: &str| -> Vec<&'static str> {
        review_flags(&t, t.feature(id).unwrap())
            .iter()
            .map(|f| f.tag)
            .collect()
    };
    assert_eq!(tags("F1"), Vec::<&str>::new());
    assert_eq!(tags("F2"), Vec::<&str>::new());
    assert_eq!(tags("F3"), vec!["swap"]);
    assert_eq!(tags("F4"), vec!["doubt"]);
    assert_eq!(tags("F5"), vec!["swap", "straight"]);
    assert_eq!(tags("F6"), Vec::<&str>::new());
    assert_eq!(tags("F7"), Vec::<&str>::new());
    let f4 = review_flags(&t, t.feature("F4").unwrap());
    assert!(
        f4[0].words.starts_with("accepted inside the doubt band"),
        "{f4:?}"
    );
}

#[test]
fn centres_used_past_their_due_date_with_a_reason_are_flagged_with_it() {
    // the finished sample with the centres due on 1 November 2026, before F2 was set on them,
    // and the reason the operator would have had to give for choosing them
    let mut t = finished_for_review();
    let fx = t.fixtures.iter_mut().find(|f| f.id == "SC5-310").unwrap();
    fx.due = Some("2026-11-01".parse().unwrap());
    let a = &mut t.feature_mut("F2").unwrap().attempts[0];
    if let Some(c) = a.fixture.as_mut() {
        c.reason = "only centres free; recheck booked".into();
    }
    let f2 = review_flags(&t, t.feature("F2").unwrap());
    let tags: Vec<&str> = f2.iter().map(|f| f.tag).collect();
    // the record F2 was signed on has changed, and that is flagged too
    assert_eq!(tags, vec!["cal", "changed"], "{f2:?}");
    assert!(f2[0].words.contains("SC5-310"), "{f2:?}");
    assert!(
        f2[0]
            .words
            .contains("reason given: only centres free; recheck booked"),
        "{f2:?}"
    );
}

#[test]
fn the_filter_shows_only_flagged_features_and_the_selection_follows() {
    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    assert_eq!(visible(&app).len(), 7);
    act(&mut app, &mut r, Action::Filter);
    let ids: Vec<String> = visible(&app)
        .iter()
        .map(|i| app.doc.features[*i].id.clone())
        .collect();
    assert_eq!(ids, ["F3", "F4", "F5"]);
    assert_eq!(
        app.doc.features[app.ui.review.sel].id, "F3",
        "moved onto a flagged feature (F1 and F2 have no flag)"
    );
    act(&mut app, &mut r, Action::Up);
    assert_eq!(
        app.doc.features[app.ui.review.sel].id, "F3",
        "F1 and F2 are not shown"
    );
    act(&mut app, &mut r, Action::Down);
    assert_eq!(app.doc.features[app.ui.review.sel].id, "F4");
    act(&mut app, &mut r, Action::Down);
    act(&mut app, &mut r, Action::Down);
    assert_eq!(
        app.doc.features[app.ui.review.sel].id, "F5",
        "the last flagged one (F6 and F7 have no flag)"
    );
    act(&mut app, &mut r, Action::Filter);
    assert_eq!(visible(&app).len(), 7);
    assert_eq!(
        app.doc.features[app.ui.review.sel].id, "F5",
        "kept when all are shown"
    );
    assert_eq!(r.saves, 0, "moving and filtering change nothing");
}

#[test]
fn a_feature_page_shows_its_attempts_in_order() {
    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    act(&mut app, &mut r, Action::Down);
    act(&mut app, &mut r, Action::Down); // F3, failed then passed
    enter(&mut app, &mut r);
    let f3 = index_of(&app, "F3");
    assert_eq!(app.screen, Screen::ReviewFeature { feature: f3 });
    assert_eq!(app.ui.review.attempt, 0, "the first attempt first");
    act(&mut app, &mut r, Action::Right);
    assert_eq!(app.ui.review.attempt, 1);
    act(&mut app, &mut r, Action::Right);
    assert_eq!(app.ui.review.attempt, 1, "there are two");
    act(&mut app, &mut r, Action::Left);
    assert_eq!(app.ui.review.attempt, 0);
    act(&mut app, &mut r, Action::PageDown);
    assert!(app.ui.review.scroll > 0, "a long page scrolls at 80×24");
    esc(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Review);
    assert_eq!(app.ui.review.sel, f3);
    // --review has no operator's overview behind it: Esc stays
    esc(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Review);
    assert_eq!(r.saves, 0);
}

#[test]
fn the_lead_signs_a_feature_after_confirming_and_not_twice() {
    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    let before = app.doc.signoffs.len();
    act(&mut app, &mut r, Action::SignFeature);
    assert_eq!(prompt_kind(&app), Some(PromptKind::LeadSign(Some(0))));
    esc(&mut app, &mut r);
    assert_eq!(app.doc.signoffs.len(), before, "Esc signs nothing");
    act(&mut app, &mut r, Action::SignFeature);
    let effects = update(&mut app, Msg::Key(Input::Act(Action::Forward)));
    assert_eq!(effects, vec![Effect::Save]);
    let s = app.doc.signoffs.last().unwrap();
    assert_eq!(
        (s.by.as_str(), s.role, s.scope),
        ("LV", Role::Lead, Scope::Feature)
    );
    assert_eq!(s.feature.as_deref(), Some("F1"));
    assert_eq!(s.digest.len(), 64, "SHA-256 in hex");
    assert!(
        !s.fields.is_empty(),
        "a digest per field names later changes"
    );
    assert!(lead_signoff(&app.doc, Some("F1")).is_some());
    let ev = app.doc.events.last().unwrap();
    assert_eq!((ev.kind, ev.by.as_str()), (EventKind::Signed, "LV"));
    assert_eq!(ev.detail, "lead sign-off");
    act(&mut app, &mut r, Action::SignFeature);
    assert!(app.prompt.is_none(), "already signed and unchanged");
    assert!(app.status.as_ref().unwrap().text.contains("already signed"));
    assert_reopens(&app);
}

#[test]
fn the_job_is_signed_only_when_every_feature_is_finished() {
    let (mut seed, mut r) = app();
    to_readings(&mut seed, &mut r);
    let (mut app, mut r) = review_app(seed.doc.clone(), Some("LV"), false);
    act(&mut app, &mut r, Action::SignJob);
    assert!(app.prompt.is_none());
    let said = &app.status.as_ref().unwrap().text;
    assert!(
        said.contains("F1 (at readings)") && said.contains("F5 (planned)"),
        "{said}"
    );
    act(&mut app, &mut r, Action::SignFeature);
    assert!(
        app.prompt.is_none(),
        "F1 is not finished: the operator signs first"
    );
    act(&mut app, &mut r, Action::ReturnFeature);
    assert!(app.prompt.is_none(), "nothing finished to send back");
    assert_eq!(r.saves, 0);

    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    act(&mut app, &mut r, Action::SignJob);
    assert_eq!(prompt_kind(&app), Some(PromptKind::LeadSign(None)));
    enter(&mut app, &mut r);
    let s = app.doc.signoffs.last().unwrap();
    assert_eq!(
        (s.role, s.scope, s.feature.clone()),
        (Role::Lead, Scope::Job, None)
    );
    assert!(
        s.fields.contains_key("F3.readings"),
        "every feature is covered"
    );
    assert_eq!(r.saves, 1);
    assert_reopens(&app);
}

#[test]
fn a_return_needs_a_comment_and_the_operator_sees_it_first() {
    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    act(&mut app, &mut r, Action::Filter);
    act(&mut app, &mut r, Action::PageDown); // F5, swapped block and a bumpy sweep
    assert_eq!(app.doc.features[app.ui.review.sel].id, "F5");
    act(&mut app, &mut r, Action::ReturnFeature);
    assert_eq!(prompt_kind(&app), Some(PromptKind::Return(Some(4))));
    enter(&mut app, &mut r);
    assert!(
        app.prompt.as_ref().unwrap().error.is_some(),
        "an empty comment is refused"
    );
    typ(
        &mut app,
        &mut r,
        "clean the face and sweep again; check the 0.149",
    );
    enter(&mut app, &mut r);
    assert!(app.prompt.is_none());
    assert_eq!(r.saves, 1);
    let f5 = app.doc.feature("F5").unwrap();
    assert_eq!(f5.state, FeatureState::Returned);
    let ret = app.doc.returns.last().unwrap();
    assert_eq!(
        (ret.by.as_str(), ret.feature.as_deref()),
        ("LV", Some("F5"))
    );
    let ev = app.doc.events.last().unwrap();
    assert_eq!(
        (ev.kind, ev.feature.as_deref()),
        (EventKind::Returned, Some("F5"))
    );
    // the operator's sign-off is withdrawn, not broken: the file stays clean
    let op = app
        .doc
        .signoffs
        .iter()
        .find(|s| s.feature.as_deref() == Some("F5"))
        .unwrap();
    assert!(withdrawn_by(&app.doc, op).is_some());
    assert_reopens(&app);

    // operator A opens the job: the comment comes before anything else
    let (mut op_app, mut r) = app_with(app.doc.clone(), Some("KA"), false);
    assert_eq!(op_app.screen, Screen::Notice);
    enter(&mut op_app, &mut r);
    assert_eq!(
        op_app.flow(),
        Some((4, Step::Verdict)),
        "the returned feature opens on its verdict"
    );
    // signing it again makes it signed, and the record is clean
    enter(&mut op_app, &mut r);
    assert_eq!(step(&op_app), Some(Step::Sign));
    typ(&mut op_app, &mut r, "KA");
    enter(&mut op_app, &mut r);
    assert_eq!(
        op_app.doc.feature("F5").unwrap().state,
        FeatureState::Signed
    );
    assert_reopens(&op_app);
    // the next time nothing is open: no notice
    let (again, _) = app_with(op_app.doc.clone(), Some("KA"), false);
    assert_ne!(again.screen, Screen::Notice);
}

#[test]
fn returning_the_whole_job_sends_back_every_finished_feature() {
    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    act(&mut app, &mut r, Action::ReturnJob);
    assert_eq!(prompt_kind(&app), Some(PromptKind::Return(None)));
    typ(&mut app, &mut r, "use the calibrated centres and redo");
    enter(&mut app, &mut r);
    assert!(
        app.doc
            .features
            .iter()
            .all(|f| f.state == FeatureState::Returned)
    );
    assert_eq!(
        events(&app, EventKind::Returned),
        7,
        "one event per feature"
    );
    assert_eq!(app.doc.returns.last().unwrap().feature, None);
    assert_reopens(&app);
}

#[test]
fn review_read_only_changes_nothing() {
    let doc = finished_for_review();
    let (mut app, mut r) = review_app(doc.clone(), None, true);
    for a in [
        Action::SignFeature,
        Action::SignJob,
        Action::ReturnFeature,
        Action::ReturnJob,
    ] {
        act(&mut app, &mut r, a);
        assert!(app.prompt.is_none(), "{a:?} asks nothing when read-only");
    }
    enter(&mut app, &mut r);
    act(&mut app, &mut r, Action::SignFeature);
    assert!(app.prompt.is_none());
    assert_eq!(r.saves, 0);
    assert_eq!(app.doc, doc);
}

#[test]
fn the_overview_leads_into_review_and_back() {
    let (mut app, mut r) = app_with(finished_for_review(), Some("LV"), false);
    // LV has not read the first shift's note, but every feature is finished: the note does not
    // stand in the way; it is kept for the review
    assert_eq!(app.screen, Screen::Overview);
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("kept for the lead's review")),
        "{:?}",
        app.status
    );
    assert!(
        !app.doc.unread_handovers("LV").is_empty(),
        "nothing marked read"
    );
    act(&mut app, &mut r, Action::Review);
    assert_eq!(app.screen, Screen::Review);
    esc(&mut app, &mut r);
    assert_eq!(app.screen, Screen::Overview);
}

#[test]
fn a_signed_value_edited_by_hand_shows_as_changed_after_sign_off() {
    let sample_text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml"),
    )
    .unwrap();
    // F1's tolerance, ±0°05', edited to ±0°06' by hand (the first tolerance line is F1's)
    let edited = sample_text.replacen("tolerance: ±0°05'", "tolerance: ±0°06'", 1);
    assert_ne!(edited, sample_text);
    let problems = traveller::check_text(&edited);
    assert!(
        problems
            .iter()
            .any(|p| p.message.contains("F1: tolerance changed after sign-off")),
        "{problems:#?}"
    );
    let t = traveller::parse(&edited).unwrap().traveller;
    let (mut app, mut r) = review_app(t, Some("LV"), true);
    let f1 = review_flags(&app.doc, &app.doc.features[0]);
    assert_eq!(f1.last().map(|f| f.tag), Some("changed"));
    assert_eq!(
        f1.last().unwrap().words,
        "changed after sign-off: tolerance"
    );
    act(&mut app, &mut r, Action::Filter);
    assert_eq!(visible(&app).first(), Some(&0), "F1 is now flagged");
}

#[test]
fn only_a_second_person_with_the_job_opened_for_review_signs_as_lead() {
    // the operator's own screens: the review list is there to look, not to sign
    let (mut app, mut r) = app_with(finished_for_review(), Some("TJ"), false);
    act(&mut app, &mut r, Action::Review);
    assert_eq!(app.screen, Screen::Review);
    let before = app.doc.signoffs.len();
    act(&mut app, &mut r, Action::SignFeature);
    assert!(app.prompt.is_none(), "no confirm step offered");
    assert!(
        app.status
            .as_ref()
            .is_some_and(|s| s.text.contains("--review")),
        "{:?}",
        app.status
    );
    act(&mut app, &mut r, Action::ReturnFeature);
    assert!(app.prompt.is_none());
    assert_eq!(app.doc.signoffs.len(), before);

    // opened for review by TJ, who signed F3 as its operator (common practice (no source):
    // the lead's signature is an independent check)
    let t = finished_for_review();
    assert!(
        t.signoffs.iter().any(|s| s.role == Role::Operator
            && s.by == "TJ"
            && s.feature.as_deref() == Some("F3"))
    );
    let (mut app, mut r) = review_app(t, Some("TJ"), false);
    app.ui.review.sel = index_of(&app, "F3");
    act(&mut app, &mut r, Action::SignFeature);
    assert!(app.prompt.is_none());
    let said = app
        .status
        .as_ref()
        .map(|s| s.text.clone())
        .unwrap_or_default();
    assert!(said.contains("TJ signed F3 as its operator"), "{said}");
    act(&mut app, &mut r, Action::SignJob);
    assert!(app.prompt.is_none(), "nor the job");
    // another lead may
    let (mut app, mut r) = review_app(finished_for_review(), Some("LV"), false);
    app.ui.review.sel = index_of(&app, "F3");
    act(&mut app, &mut r, Action::SignFeature);
    assert_eq!(
        prompt_kind(&app),
        Some(PromptKind::LeadSign(Some(index_of(&app, "F3"))))
    );
}

#[test]
fn a_job_the_lead_signed_says_so_on_the_overview() {
    let (app, _r) = app_with(sample("ds-204-finished.yaml"), Some("TJ"), true);
    let next = tiltbook::tui::screens::overview::next_for_job(&app);
    assert!(
        next.contains("signed by LV (lead)") && next.contains("nothing is left to do"),
        "{next}"
    );
    let (app, _r) = app_with(finished_for_review(), Some("TJ"), true);
    let next = tiltbook::tui::screens::overview::next_for_job(&app);
    assert!(next.contains("goes to the lead for review"), "{next}");
}

#[test]
fn a_return_says_which_signatures_it_takes_back() {
    let t = sample("ds-204-finished.yaml");
    let (mut app, mut r) = review_app(t, Some("LV"), false);
    app.ui.review.sel = index_of(&app, "F3");
    act(&mut app, &mut r, Action::ReturnFeature);
    let hint = app
        .prompt
        .as_ref()
        .map(|p| p.hint.clone())
        .unwrap_or_default();
    assert!(
        hint.contains("withdraws") && hint.contains("LV's sign-off of the whole job"),
        "{hint}"
    );
}
