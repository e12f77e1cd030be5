//! Checks across the record: states against content and the event log, events in time order,
//! references to features, and signed values unchanged since their sign-off.

use super::Out;
use crate::traveller::digest::{self, Change};
use crate::traveller::model::*;

/// A feature's state must be backed by what its last attempt holds.
pub(super) fn state_matches_content(t: &Traveller, f: &Feature, p: &str, out: &mut Out) {
    use FeatureState::*;
    let a = f.current_attempt();
    let need = |what: &str, has: bool, out: &mut Out| {
        if !has {
            out.at(&format!("{p}.state"), format!("feature {} is `{}` but its last attempt has no {what}; set `state:` to where work really is", f.id, f.state.label()));
        }
    };
    let rank = match f.state {
        Planned | Returned => 0,
        FixtureChosen => 1,
        SetChosen => 2,
        StackBuilt => 3,
        Settled => 4,
        Sweeping => 5,
        Judged | Nonconforming | Signed => 6,
    };
    if rank >= 1 {
        need("fixture", a.is_some_and(|a| a.fixture.is_some()), out);
    }
    if rank >= 2 {
        need("block set", a.is_some_and(|a| a.block_set.is_some()), out);
    }
    if rank >= 3 {
        need("stack", a.is_some_and(|a| a.stack.is_some()), out);
    }
    if rank >= 4 {
        need("settle record", a.is_some_and(|a| a.settle.is_some()), out);
    }
    if rank >= 5 {
        need("sweep", a.is_some_and(|a| a.sweep.is_some()), out);
    }
    if rank >= 6 {
        need("verdict", a.is_some_and(|a| a.judgement.is_some()), out);
    }
    if f.state == Planned && f.attempts.iter().any(|a| a.fixture.is_some()) {
        out.at(&format!("{p}.state"), format!("feature {} is `planned` but work has been recorded on it; set `state:` to where work really is", f.id));
    }
    if f.state == Signed
        && !t
            .signoffs
            .iter()
            .any(|s| s.scope == Scope::Job || s.feature.as_deref() == Some(f.id.as_str()))
    {
        out.at(&format!("{p}.state"), format!("feature {} is `signed` but there is no sign-off for it; sign it or set the state back", f.id));
    }
    if f.state == Nonconforming
        && !t
            .notes
            .iter()
            .any(|n| n.feature.as_deref() == Some(f.id.as_str()))
        && a.is_none_or(|a| a.note.trim().is_empty())
    {
        out.at(&format!("{p}.state"), format!("feature {} is recorded nonconforming without a note; add a note saying what was found", f.id));
    }
}

/// Events in time order with known features; states in the log follow each other; notes and
/// returns name real features; sign-offs still match.
pub(super) fn log_and_signoffs(t: &Traveller, out: &mut Out) {
    let index = |id: &str| t.features.iter().position(|f| f.id == id);
    let ids = t
        .features
        .iter()
        .map(|f| f.id.as_str())
        .collect::<Vec<_>>()
        .join(", ");
    let mut last: Option<&Stamp> = None;
    let mut states: Vec<Option<FeatureState>> = vec![None; t.features.len()];
    for (i, e) in t.events.iter().enumerate() {
        let p = format!("events[{i}]");
        if let Some(prev) = last
            && e.at < *prev
        {
            out.at(&format!("{p}.at"), format!("this event ({}) is earlier than the one before it ({}); the log is append-only and in time order, so entries must not be moved or back-dated", e.at, prev));
        }
        last = Some(&e.at);
        let Some(fid) = &e.feature else { continue };
        let Some(fi) = index(fid) else {
            out.at(&format!("{p}.feature"), format!("event names feature `{fid}`, which is not in this job; correct the id (features here: {ids})"));
            continue;
        };
        if let Some(n) = e.attempt
            && !t.features[fi].attempts.iter().any(|a| a.number == n)
        {
            out.at(&format!("{p}.attempt"), format!("event names attempt {n} of {fid}, which has no such attempt; correct the attempt number"));
        }
        if let Some(next) = FeatureState::after_event(e.kind) {
            // a lead's sign-off after an operator's keeps the state signed
            let prev = states[fi].unwrap_or(FeatureState::Planned);
            let ok = next.can_follow(prev)
                || (e.kind == EventKind::Signed && prev == FeatureState::Nonconforming);
            if !ok {
                out.at(&format!("{p}.kind"), format!("feature {fid} cannot go from `{}` to `{}`; the log is out of step with the work: check for a missing or edited entry", prev.label(), next.label()));
            }
            states[fi] = Some(
                if prev == FeatureState::Nonconforming && next == FeatureState::Signed {
                    prev
                } else {
                    next
                },
            );
        }
    }
    for (fi, st) in states.iter().enumerate() {
        let f = &t.features[fi];
        if let Some(st) = st
            && *st != f.state
        {
            out.at(&format!("features[{fi}].state"), format!("feature {} is `{}` but its last logged step is `{}`; the state and the event log disagree", f.id, f.state.label(), st.label()));
        }
    }
    for (i, n) in t.notes.iter().enumerate() {
        if let Some(fid) = &n.feature
            && index(fid).is_none()
        {
            out.at(&format!("notes[{i}].feature"), format!("note names feature `{fid}`, which is not in this job; correct the id (features here: {ids})"));
        }
    }
    for (i, r) in t.returns.iter().enumerate() {
        if let Some(fid) = &r.feature
            && index(fid).is_none()
        {
            out.at(&format!("returns[{i}].feature"), format!("return names feature `{fid}`, which is not in this job; correct the id (features here: {ids})"));
        }
        if r.comment.trim().is_empty() {
            out.at(
                &format!("returns[{i}].comment"),
                "a return needs the lead's comment saying what to do",
            );
        }
    }
    for (i, s) in t.signoffs.iter().enumerate() {
        signoff(t, s, &format!("signoffs[{i}]"), out);
    }
}

/// Where a signed field lives in the file, for pointing at it.
fn field_path(t: &Traveller, feature: &str, field: &str) -> String {
    let Some(fi) = t.features.iter().position(|f| f.id == feature) else {
        return "features".into();
    };
    let f = &t.features[fi];
    let p = format!("features[{fi}]");
    let k = f
        .attempts
        .iter()
        .rposition(|a| a.judgement.is_some())
        .unwrap_or(f.attempts.len().saturating_sub(1));
    let a = format!("{p}.attempts[{k}]");
    match field {
        "name" | "nominal" | "tolerance" | "work" | "attempts" => format!("{p}.{field}"),
        "kind" => format!("{p}.kind"),
        "attempt" => a,
        "fixture" | "block_set" | "stack" | "settle" | "stack_pivot" => format!("{a}.{field}"),
        "readings" => format!("{a}.sweep"),
        "readings_b" => format!("{a}.sweep_b"),
        "view_b" => format!("{a}.judgement.view_b"),
        "fit" | "residual" | "deviation" | "U" | "verdict" => format!("{a}.judgement.{field}"),
        _ => p,
    }
}

fn signoff(t: &Traveller, s: &SignOff, p: &str, out: &mut Out) {
    let who = format!("signed by {} ({}) on {}", s.by, role(s.role), s.at.short());
    if s.scope == Scope::Feature && s.feature.is_none() {
        out.at(
            &format!("{p}.scope"),
            "a feature sign-off must name its feature, e.g. `feature: F1`",
        );
        return;
    }
    if s.scope == Scope::Job && s.feature.is_some() {
        out.at(
            &format!("{p}.feature"),
            "a job sign-off covers every feature; remove `feature:` or set `scope: feature`",
        );
    }
    if digest::withdrawn_by(t, s).is_some() {
        // sent back by a lead after signing: the work is redone and signed again
        return;
    }
    for c in digest::verify(t, s) {
        match c {
            Change::FeatureGone(id) => out.at(&format!("{p}.feature"), format!("sign-off names feature `{id}`, which is not in this job; the feature was removed or renamed after signing: restore it")),
            Change::DigestEdited => out.at(&format!("{p}.digest"), format!("the sign-off digest does not match its field digests ({who}); the sign-off record was edited after signing")),
            Change::Unnamed => out.at(&format!("{p}.digest"), format!("changed after sign-off ({who}); this sign-off has no per-field digests, so the field cannot be named")),
            Change::Field(name) | Change::Added(name) => {
                let (fid, field) = match (s.scope, name.split_once('.')) {
                    (Scope::Feature, _) => (s.feature.clone().unwrap_or_default(), name.clone()),
                    (Scope::Job, Some((f, k))) => (f.to_string(), k.to_string()),
                    (Scope::Job, None) => (String::new(), name.clone()),
                };
                let path = if fid.is_empty() {
                    name.clone()
                } else {
                    field_path(t, &fid, &field)
                };
                let what = if fid.is_empty() {
                    format!("{field} changed after sign-off")
                } else {
                    format!("{fid}: {field} changed after sign-off")
                };
                out.at(&path, format!("{what} ({who}); review it and sign again, or restore the signed value"));
            }
        }
    }
}

fn role(r: Role) -> &'static str {
    match r {
        Role::Operator => "operator",
        Role::Lead => "lead",
    }
}
