//! `check` on the records of the kinds of feature: a compound angle's second view (its sweep,
//! residual, deviation against the slope the plates level, U and verdict, and the verdict over
//! both views), and a small angle's stack under the pivot roll (the angle from the difference).
//! Each case changes one number of the finished sample and must be caught; the untouched
//! record must be clean.

use tiltbook::traveller::{
    FeatureState, Stack, StackBlock, Traveller, Verdict, check_text, parse, to_yaml,
};
use tiltbook::units::{Angle, Length};

/// The finished sample with its sign-offs and log taken away (so a change is not also a change
/// after sign-off) and every feature judged.
fn judged_sample() -> Traveller {
    let path =
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml");
    let text = std::fs::read_to_string(path).expect("the sample reads");
    let mut t = parse(&text).expect("the sample parses").traveller;
    t.signoffs.clear();
    t.events.clear();
    t.returns.clear();
    for f in &mut t.features {
        f.state = FeatureState::Judged;
    }
    t
}

fn problems(t: &Traveller) -> Vec<String> {
    check_text(&to_yaml(t).expect("renders"))
        .iter()
        .map(|p| format!("{} {}", p.path, p.message))
        .collect()
}

fn one(t: &Traveller, path: &str, words: &str) {
    let p = problems(t);
    assert!(
        p.len() == 1 && p[0].starts_with(path) && p[0].contains(words),
        "expected one problem at {path} saying {words:?}, got {p:#?}"
    );
}

#[test]
fn the_untouched_record_is_clean() {
    assert_eq!(problems(&judged_sample()), Vec::<String>::new());
}

#[test]
fn the_other_views_numbers_must_follow() {
    let p = "features[3].attempts[0].judgement.view_b";
    let mut t = judged_sample();
    let v = t.features[3].attempts[0]
        .judgement
        .as_mut()
        .unwrap()
        .view_b
        .as_mut()
        .unwrap();
    v.verdict = Verdict::Fail;
    // caught on the view, and the attempt's DOUBT no longer follows from a FAIL in view B
    let got = problems(&t);
    assert_eq!(got.len(), 2, "{got:#?}");
    assert!(
        got.iter()
            .any(|x| x.starts_with(&format!("{p}.verdict")) && x.contains("(that gives PASS)")),
        "{got:#?}"
    );
    assert!(
        got.iter().any(
            |x| x.starts_with("features[3].attempts[0].judgement.verdict")
                && x.contains("(that gives FAIL)")
        ),
        "{got:#?}"
    );

    let mut t = judged_sample();
    let v = t.features[3].attempts[0]
        .judgement
        .as_mut()
        .unwrap()
        .view_b
        .as_mut()
        .unwrap();
    v.deviation = v.deviation + Angle::from_arcsec(10.0);
    one(&t, &format!("{p}.deviation"), "the view the plates level");

    let mut t = judged_sample();
    let v = t.features[3].attempts[0]
        .judgement
        .as_mut()
        .unwrap()
        .view_b
        .as_mut()
        .unwrap();
    v.residual = v.residual + Angle::from_arcsec(1.0);
    v.deviation = v.deviation - Angle::from_arcsec(1.0);
    one(&t, &format!("{p}.residual"), "atan(slope)");
}

#[test]
fn the_verdict_is_the_worse_of_the_two_views() {
    // view A is in the doubt band and view B passes: the attempt's verdict is DOUBT
    let mut t = judged_sample();
    let j = t.features[3].attempts[0].judgement.as_mut().unwrap();
    j.verdict = Verdict::Pass;
    j.doubt_decision = None;
    one(
        &t,
        "features[3].attempts[0].judgement.verdict",
        "that gives DOUBT",
    );
}

#[test]
fn a_second_sweep_or_view_belongs_to_a_compound_angle_only() {
    let mut t = judged_sample();
    let s = t.features[0].attempts[0].sweep.clone();
    t.features[0].attempts[0].sweep_b = s;
    one(
        &t,
        "features[0].attempts[0].sweep_b",
        "only for compound angles",
    );
}

fn stack_of(sizes: &[f64]) -> Stack {
    let blocks: Vec<StackBlock> = sizes
        .iter()
        .map(|s| StackBlock {
            size: Length::inches(*s),
            protector: false,
            wrung: true,
        })
        .collect();
    Stack {
        height: blocks.iter().map(|b| b.size).sum(),
        blocks,
        achieved: Angle::default(),
        swaps: Vec::new(),
        built: None,
    }
}

#[test]
fn two_stacks_under_the_rolls_set_the_angle_of_their_difference() {
    // F1 on the 5.00002 in bar SB5-117 set on 2.65 in over 0.15 in (no size in both): the difference
    // 2.5 in gives asin(2.5/5.00002) (DOMAIN: a stack under each roll, equal rolls)
    let mut t = judged_sample();
    let a = &mut t.features[0].attempts[0];
    let mut raised = stack_of(&[2.0, 0.5, 0.1, 0.05]);
    let mut pivot = stack_of(&[0.15]);
    let want = Angle::from_rad((2.5f64 / 5.00002).asin());
    raised.achieved = want;
    pivot.achieved = want;
    raised.built = a.stack.as_ref().unwrap().built.clone();
    a.stack = Some(raised);
    a.stack_pivot = Some(pivot);
    // the judgement stands on the same angle as before (2.5 in on its own)
    assert_eq!(problems(&t), Vec::<String>::new());
    // the raised stack alone would be 2.65 in: an angle from it is caught
    let a = &mut t.features[0].attempts[0];
    let alone = Angle::from_rad((2.65f64 / 5.00002).asin());
    a.stack.as_mut().unwrap().achieved = alone;
    let p = problems(&t);
    assert!(
        p.iter()
            .any(|x| x.contains("does not match the difference 2.5 in")),
        "{p:#?}"
    );
    // and a pivot stack on a compound angle is refused
    let mut t = judged_sample();
    t.features[3].attempts[0].stack_pivot = Some(stack_of(&[0.1]));
    let p = problems(&t);
    assert!(p.iter().any(|x| x.contains("`stack_b:`")), "{p:#?}");
}

#[test]
fn an_older_compound_record_with_one_view_still_checks() {
    // written before the second view was swept: no `sweep_b`, no `view_b`
    let mut t = judged_sample();
    let a = &mut t.features[3].attempts[0];
    a.sweep_b = None;
    let j = a.judgement.as_mut().unwrap();
    j.view_b = None;
    assert_eq!(problems(&t), Vec::<String>::new());
}
