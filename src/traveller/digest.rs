//! Sign-off digests: SHA-256 over a canonical form of what a sign-off covers, kept per field so
//! a later change can be named ("F2: tolerance changed after sign-off").
//!
//! Canonical form of a field: the tag `tiltbook-signoff-v1`, the field name and the field's
//! value as compact JSON (struct fields in schema order, lengths and angles in their written
//! form), each on its own line. The sign-off digest is SHA-256 over the sorted lines
//! `name=field-digest`.

use super::model::*;
use serde::Serialize;
use serde_json::{Value, json};
use sha2::{Digest, Sha256};
use std::collections::BTreeMap;
use thiserror::Error;

const TAG: &str = "tiltbook-signoff-v1";

fn hex(bytes: &[u8]) -> String {
    bytes.iter().map(|b| format!("{b:02x}")).collect()
}

fn jv<T: Serialize>(v: &T) -> Value {
    serde_json::to_value(v).unwrap_or(Value::Null)
}

/// The fields a feature sign-off covers, each with its canonical value.
pub fn feature_fields(t: &Traveller, f: &Feature) -> Vec<(String, Value)> {
    let a = f.accepted_attempt();
    let fixture = a
        .and_then(|a| a.fixture.as_ref())
        .map(|c| json!({"id": c.id, "reason": c.reason, "snapshot": jv(&t.fixture(&c.id))}));
    let set = a
        .and_then(|a| a.block_set.as_ref())
        .map(|c| json!({"id": c.id, "reason": c.reason, "snapshot": jv(&t.block_set(&c.id))}));
    let j = a.and_then(|a| a.judgement.as_ref());
    let mut fields = vec![
        ("name".into(), json!(f.name)),
        (
            "kind".into(),
            json!({"kind": jv(&f.kind), "taper": jv(&f.taper), "compound": jv(&f.compound)}),
        ),
        ("nominal".into(), jv(&f.nominal)),
        ("tolerance".into(), jv(&f.tolerance)),
        ("work".into(), jv(&f.work)),
        ("attempts".into(), json!(f.attempts.len())),
        ("attempt".into(), jv(&a.map(|a| a.number))),
        ("fixture".into(), jv(&fixture)),
        ("block_set".into(), jv(&set)),
        (
            "stack".into(),
            json!([
                jv(&a.and_then(|a| a.stack.as_ref())),
                jv(&a.and_then(|a| a.stack_b.as_ref()))
            ]),
        ),
        ("settle".into(), jv(&a.and_then(|a| a.settle.as_ref()))),
        ("readings".into(), jv(&a.and_then(|a| a.sweep.as_ref()))),
        ("fit".into(), jv(&j.map(|j| &j.fit))),
        ("residual".into(), jv(&j.map(|j| j.residual))),
        ("deviation".into(), jv(&j.map(|j| j.deviation))),
        (
            "U".into(),
            jv(&j.map(|j| json!({"U": jv(&j.u), "budget": jv(&j.budget), "rule": jv(&j.rule)}))),
        ),
        (
            "verdict".into(),
            jv(&j.map(|j| json!({"verdict": jv(&j.verdict), "doubt": jv(&j.doubt_decision)}))),
        ),
    ];
    // what only some attempts hold is signed only when there: older sign-offs stay whole
    if let Some(p) = a.and_then(|a| a.stack_pivot.as_ref()) {
        fields.push(("stack_pivot".into(), jv(p)));
    }
    if let Some(s) = a.and_then(|a| a.sweep_b.as_ref()) {
        fields.push(("readings_b".into(), jv(s)));
    }
    if let Some(v) = j.and_then(|j| j.view_b.as_ref()) {
        fields.push(("view_b".into(), jv(v)));
    }
    fields
}

/// The fields a job sign-off covers: the job header, the list of features, and every feature's
/// fields (named `F1.tolerance`).
pub fn job_fields(t: &Traveller) -> Vec<(String, Value)> {
    let mut out = vec![
        ("job".into(), jv(&t.job)),
        (
            "features".into(),
            json!(t.features.iter().map(|f| f.id.clone()).collect::<Vec<_>>()),
        ),
    ];
    for f in &t.features {
        for (k, v) in feature_fields(t, f) {
            out.push((format!("{}.{k}", f.id), v));
        }
    }
    out
}

/// SHA-256 of one field's canonical form.
pub fn field_digest(name: &str, value: &Value) -> String {
    let mut h = Sha256::new();
    h.update(TAG.as_bytes());
    h.update(b"\n");
    h.update(name.as_bytes());
    h.update(b"\n");
    h.update(value.to_string().as_bytes());
    hex(&h.finalize())
}

/// SHA-256 over the sorted `name=digest` lines.
pub fn combined(fields: &BTreeMap<String, String>) -> String {
    let mut h = Sha256::new();
    h.update(TAG.as_bytes());
    h.update(b"\n");
    for (k, v) in fields {
        h.update(format!("{k}={v}\n").as_bytes());
    }
    hex(&h.finalize())
}

/// Per-field digests for what a sign-off with this scope covers now.
pub fn digests_for(
    t: &Traveller,
    scope: Scope,
    feature: Option<&str>,
) -> Result<BTreeMap<String, String>, SignError> {
    let fields = match scope {
        Scope::Job => job_fields(t),
        Scope::Feature => {
            let id = feature.ok_or(SignError::NoFeature)?;
            let f = t
                .feature(id)
                .ok_or_else(|| SignError::UnknownFeature(id.to_string()))?;
            feature_fields(t, f)
        }
    };
    Ok(fields
        .iter()
        .map(|(k, v)| (k.clone(), field_digest(k, v)))
        .collect())
}

/// Why a sign-off could not be made.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum SignError {
    #[error("a feature sign-off needs the feature's id, e.g. F1")]
    NoFeature,
    #[error("there is no feature '{0}' in this job; check the id")]
    UnknownFeature(String),
    #[error("the name or initials of the person signing are missing; type them, e.g. JQ")]
    NoName,
}

impl Traveller {
    /// Sign a feature (`Scope::Feature` with its id) or the whole job, at `at`; records the
    /// digests, sets a signed feature's state and logs the event.
    pub fn sign(
        &mut self,
        by: &str,
        role: Role,
        scope: Scope,
        feature: Option<&str>,
        at: Stamp,
    ) -> Result<&SignOff, SignError> {
        if by.trim().is_empty() {
            return Err(SignError::NoName);
        }
        let fields = digests_for(self, scope, feature)?;
        let digest = combined(&fields);
        if scope == Scope::Feature
            && let Some(f) = feature.and_then(|id| self.feature_mut(id))
            && f.state != FeatureState::Nonconforming
        {
            f.state = FeatureState::Signed;
        }
        let detail = match role {
            Role::Operator => "operator sign-off",
            Role::Lead => "lead sign-off",
        };
        self.log_at(at, by, EventKind::Signed, feature, None, detail);
        self.signoffs.push(SignOff {
            by: by.trim().to_string(),
            role,
            at,
            scope,
            feature: feature.map(str::to_string),
            digest,
            fields,
        });
        let last = self.signoffs.len() - 1;
        Ok(&self.signoffs[last])
    }
}

/// What changed since a sign-off.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Change {
    /// A signed field now has a different value (`field` as named in the sign-off, e.g.
    /// `tolerance` or `F2.tolerance`).
    Field(String),
    /// A field that is covered now was not there when signed (e.g. a feature added).
    Added(String),
    /// The stored digest does not match the stored field digests: the sign-off was edited.
    DigestEdited,
    /// Without per-field digests only the whole can be compared, and it differs.
    Unnamed,
    /// The feature the sign-off names is gone.
    FeatureGone(String),
}

/// The return that withdrew a sign-off: a later return of its feature or of the whole job (any
/// later return, for a job sign-off). Work done after a return is signed again; the withdrawn
/// sign-off stays in the record but is no longer compared with the traveller.
pub fn withdrawn_by<'a>(t: &'a Traveller, s: &SignOff) -> Option<&'a Return> {
    t.returns.iter().rev().find(|r| {
        let covers = match s.scope {
            Scope::Job => true,
            Scope::Feature => r.feature.is_none() || r.feature == s.feature,
        };
        covers && returned_after(t, r, s)
    })
}

/// Did return `r` come after sign-off `s`? Times are whole seconds: within the same second the
/// event log's order decides.
fn returned_after(t: &Traveller, r: &Return, s: &SignOff) -> bool {
    if r.at.timestamp() != s.at.timestamp() {
        return r.at.timestamp() > s.at.timestamp();
    }
    let signed = t.events.iter().position(|e| {
        e.kind == EventKind::Signed && e.at == s.at && e.by.trim() == s.by && e.feature == s.feature
    });
    let returned = t.events.iter().rposition(|e| {
        e.kind == EventKind::Returned
            && e.at == r.at
            && e.by == r.by
            && (r.feature.is_none() || e.feature == r.feature)
    });
    match (signed, returned) {
        (Some(a), Some(b)) => b > a,
        _ => true,
    }
}

/// Compare a sign-off with the traveller as it is now.
pub fn verify(t: &Traveller, s: &SignOff) -> Vec<Change> {
    let now = match digests_for(t, s.scope, s.feature.as_deref()) {
        Ok(n) => n,
        Err(_) => return vec![Change::FeatureGone(s.feature.clone().unwrap_or_default())],
    };
    if s.fields.is_empty() {
        return if combined(&now) == s.digest {
            Vec::new()
        } else {
            vec![Change::Unnamed]
        };
    }
    let mut out = Vec::new();
    if combined(&s.fields) != s.digest {
        out.push(Change::DigestEdited);
    }
    for (k, v) in &s.fields {
        if now.get(k) != Some(v) {
            out.push(Change::Field(k.clone()));
        }
    }
    for k in now.keys() {
        if !s.fields.contains_key(k) {
            out.push(Change::Added(k.clone()));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::{Angle, Tolerance};

    fn signed_job() -> Traveller {
        let tol = Tolerance::symmetric(Angle::from_deg(5.0 / 60.0));
        let mut t = Traveller::plan(
            Job::default(),
            vec![Feature::plain("F1", "flank", Angle::from_deg(30.0), tol)],
        );
        t.features[0].state = FeatureState::Judged;
        t
    }

    #[test]
    fn a_return_after_signing_withdraws_the_sign_off_and_a_later_one_stands() {
        let at = Stamp::parse("2025-03-04T08:00:00Z").unwrap();
        let mut t = signed_job();
        t.sign("KM", Role::Operator, Scope::Feature, Some("F1"), at)
            .unwrap();
        assert!(withdrawn_by(&t, &t.signoffs[0]).is_none());
        // same second: the log's order says the return came after
        t.add_return_at(at, "LV", Some("F1"), "sweep again");
        assert_eq!(t.features[0].state, FeatureState::Returned);
        assert!(withdrawn_by(&t, &t.signoffs[0]).is_some());
        t.features[0].name = "flank, reworked".into();
        assert!(!verify(&t, &t.signoffs[0]).is_empty(), "it did change");
        let later = Stamp::parse("2025-03-04T09:00:00Z").unwrap();
        t.sign("KM", Role::Operator, Scope::Feature, Some("F1"), later)
            .unwrap();
        assert!(withdrawn_by(&t, &t.signoffs[1]).is_none());
        assert!(verify(&t, &t.signoffs[1]).is_empty());
    }

    #[test]
    fn a_job_return_sends_back_finished_features_each_with_an_event() {
        let at = Stamp::parse("2025-03-04T08:00:00Z").unwrap();
        let mut t = signed_job();
        let tol = Tolerance::symmetric(Angle::from_deg(5.0 / 60.0));
        t.features
            .push(Feature::plain("F2", "gib", Angle::from_deg(5.0), tol));
        t.sign("KM", Role::Operator, Scope::Feature, Some("F1"), at)
            .unwrap();
        t.add_return_at(at, "LV", None, "redo the job sheet");
        assert_eq!(t.features[0].state, FeatureState::Returned);
        assert_eq!(
            t.features[1].state,
            FeatureState::Planned,
            "unfinished: untouched"
        );
        let returned: Vec<_> = t
            .events
            .iter()
            .filter(|e| e.kind == EventKind::Returned)
            .map(|e| e.feature.clone())
            .collect();
        assert_eq!(returned, vec![Some("F1".to_string())]);
        assert!(withdrawn_by(&t, &t.signoffs[0]).is_some());
    }
}
