//! Sign-off digests: a change after signing is found and named, down to the field.

use std::path::Path;
use tiltbook::traveller::digest::{self, Change};
use tiltbook::traveller::*;
use tiltbook::units::{Angle, Length, Tolerance, Unit};

fn finished_text() -> String {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml");
    std::fs::read_to_string(p).unwrap()
}

/// Source: Python 3 hashlib.sha256 over the UTF-8 bytes
/// `tiltbook-signoff-v1\ntolerance\n"±0°05'"` (the canonical form documented in
/// docs/traveller-format.md), computed outside the project.
#[test]
fn field_digest_is_sha256_of_the_documented_canonical_form() {
    let tol = Tolerance::symmetric(Angle::from_deg(5.0 / 60.0));
    let v = serde_json::to_value(tol).unwrap();
    assert_eq!(v.to_string(), "\"±0°05'\"");
    assert_eq!(
        digest::field_digest("tolerance", &v),
        "30d556473a251747a27f11c3ffc53dd7c509306d9b1aa98f2508b3f4d40a2bb0"
    );
}

#[test]
fn the_finished_sample_is_unchanged_since_signing() {
    let t = parse(&finished_text()).unwrap().traveller;
    // seven operator sign-offs (one a feature, F4 after the lead decided its doubt) and the
    // lead's job sign-off
    assert_eq!(t.signoffs.len(), 8);
    for s in &t.signoffs {
        assert_eq!(digest::verify(&t, s), Vec::<Change>::new(), "{}", s.by);
    }
}

#[test]
fn a_changed_tolerance_is_named_with_its_line() {
    let text = finished_text();
    // F3's tolerance is the third `±0°02'` in the file (F2, F3 share it; F2 comes first)
    let f3 = text.find("- id: F3").unwrap();
    let at = f3 + text[f3..].find("tolerance: ±0°02'").unwrap();
    let tampered = format!(
        "{}tolerance: ±0°03'{}",
        &text[..at],
        &text[at + "tolerance: ±0°02'".len()..]
    );
    let line = tampered[..at].matches('\n').count() + 1;
    let problems = check_text(&tampered);
    let msgs: Vec<String> = problems.iter().map(|p| p.to_string()).collect();
    // the operator's feature sign-off and the lead's job sign-off both see it
    let hits: Vec<&String> = msgs
        .iter()
        .filter(|m| m.contains("F3: tolerance changed after sign-off"))
        .collect();
    assert_eq!(hits.len(), 2, "{msgs:#?}");
    assert!(
        hits.iter().all(|m| m.starts_with(&format!("{line}:"))),
        "{msgs:#?}"
    );
    assert!(
        msgs.iter().any(|m| m.contains("signed by TJ (operator)")),
        "{msgs:#?}"
    );
    assert!(
        msgs.iter().any(|m| m.contains("signed by LV (lead)")),
        "{msgs:#?}"
    );
}

#[test]
fn changed_readings_are_named() {
    let mut t = parse(&finished_text()).unwrap().traveller;
    let f1 = t.feature_mut("F1").unwrap();
    let sw = f1.attempts[0].sweep.as_mut().unwrap();
    sw.readings[2] = Length::parse("0.0002in", Unit::In).unwrap();
    let s = t
        .signoffs
        .iter()
        .find(|s| s.feature.as_deref() == Some("F1"))
        .unwrap();
    assert_eq!(
        digest::verify(&t, s),
        vec![Change::Field("readings".into())]
    );
    let job = t.signoffs.iter().find(|s| s.scope == Scope::Job).unwrap();
    assert_eq!(
        digest::verify(&t, job),
        vec![Change::Field("F1.readings".into())]
    );
}

#[test]
fn an_edited_digest_is_caught() {
    let text = finished_text();
    let t = parse(&text).unwrap().traveller;
    let d = &t.signoffs[0].digest;
    let forged = format!("{}{}", &d[..63], if d.ends_with('0') { '1' } else { '0' });
    let problems = check_text(&text.replacen(d.as_str(), &forged, 1));
    assert!(
        problems
            .iter()
            .any(|p| p.message.contains("the sign-off record was edited")),
        "{problems:#?}"
    );
}

#[test]
fn an_added_feature_is_seen_by_the_job_sign_off() {
    let mut t = parse(&finished_text()).unwrap().traveller;
    t.features.push(Feature::plain(
        "F8",
        "extra",
        Angle::from_deg(10.0),
        Tolerance::symmetric(Angle::from_deg(0.1)),
    ));
    let job = t.signoffs.iter().find(|s| s.scope == Scope::Job).unwrap();
    let changes = digest::verify(&t, job);
    assert!(
        changes.contains(&Change::Field("features".into())),
        "{changes:?}"
    );
    assert!(
        changes.contains(&Change::Added("F8.tolerance".into())),
        "{changes:?}"
    );
}

#[test]
fn signing_records_digests_state_and_an_event() {
    let plan = std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml"),
    )
    .unwrap();
    let mut t = parse(&plan).unwrap().traveller;
    let at = Stamp::parse("2025-03-04T10:00:00+01:00").unwrap();
    assert!(
        t.sign(" ", Role::Operator, Scope::Feature, Some("F1"), at)
            .is_err()
    );
    assert!(
        t.sign("KM", Role::Operator, Scope::Feature, Some("F9"), at)
            .is_err()
    );
    let s = t
        .sign("KM", Role::Lead, Scope::Job, None, at)
        .unwrap()
        .clone();
    assert_eq!(s.digest, digest::combined(&s.fields));
    assert_eq!(s.digest.len(), 64);
    assert_eq!(t.events.last().unwrap().kind, EventKind::Signed);
    assert!(digest::verify(&t, &s).is_empty());
    t.feature_mut("F2").unwrap().name = "renamed".into();
    assert_eq!(
        digest::verify(&t, &s),
        vec![Change::Field("F2.name".into())]
    );
}
