//! What a lead should look at twice: a stack swapped by hand, calibration out of date, a
//! verdict inside the doubt band, a sweep not straight against the tolerance (the sweep's own
//! rule, [`crate::sweep::SweepFit::straightness_doubtful`]), signed values changed since.

use super::super::digest::{self, Change};
use super::super::model::*;
use crate::units::Length;

/// Something about a feature worth a second look.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Flag {
    /// A stack block was changed by hand from the solver's choice.
    SwappedByHand,
    /// The fixture or block set was past its calibration due date when used.
    CalibrationOutOfDate(String),
    /// The verdict is inside the doubt band.
    DoubtBand,
    /// The surface is not straight against the tolerance.
    LargeStraightness,
    /// Signed values changed after the sign-off (field names).
    ChangedAfterSignOff(Vec<String>),
}

impl Flag {
    /// Plain words for the flag.
    pub fn describe(&self) -> String {
        match self {
            Flag::SwappedByHand => "stack swapped by hand".into(),
            Flag::CalibrationOutOfDate(w) => format!("calibration out of date: {w}"),
            Flag::DoubtBand => "inside the doubt band".into(),
            Flag::LargeStraightness => "large straightness against the tolerance".into(),
            Flag::ChangedAfterSignOff(f) => format!("changed after sign-off: {}", f.join(", ")),
        }
    }
}

/// The flags of one feature.
pub fn flags(t: &Traveller, f: &Feature) -> Vec<Flag> {
    let mut out = Vec::new();
    if f.attempts.iter().any(|a| {
        a.stack
            .iter()
            .chain(a.stack_b.iter())
            .chain(a.stack_pivot.iter())
            .any(Stack::swapped_by_hand)
    }) {
        out.push(Flag::SwappedByHand);
    }
    let mut late: Vec<String> = Vec::new();
    for a in &f.attempts {
        if let Some(c) = &a.fixture
            && let Some(due) = t.fixture(&c.id).and_then(|x| x.due)
            && c.at.date() > due
        {
            late.push(format!("fixture {} (due {due})", c.id));
        }
        if let Some(c) = &a.block_set
            && let Some(due) = t.block_set(&c.id).and_then(|x| x.due)
            && c.at.date() > due
        {
            late.push(format!("block set {} (due {due})", c.id));
        }
    }
    late.dedup();
    if !late.is_empty() {
        out.push(Flag::CalibrationOutOfDate(late.join(", ")));
    }
    if let Some(a) = f.accepted_attempt()
        && let Some(j) = &a.judgement
    {
        if j.verdict == Verdict::Doubt {
            out.push(Flag::DoubtBand);
        }
        // the sweep's one rule, on each view's readings
        if [a.sweep.as_ref(), a.sweep_b.as_ref()]
            .into_iter()
            .flatten()
            .any(|s| s.straightness_large(&f.tolerance))
        {
            out.push(Flag::LargeStraightness);
        }
    }
    let changed = changed_fields(t, f);
    if !changed.is_empty() {
        out.push(Flag::ChangedAfterSignOff(changed));
    }
    out
}

/// The fields of `f` changed since any sign-off covering it.
pub fn changed_fields(t: &Traveller, f: &Feature) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for s in t
        .signoffs
        .iter()
        .filter(|s| digest::withdrawn_by(t, s).is_none())
    {
        let prefix = match s.scope {
            Scope::Feature if s.feature.as_deref() == Some(f.id.as_str()) => String::new(),
            Scope::Job => format!("{}.", f.id),
            _ => continue,
        };
        for c in digest::verify(t, s) {
            let name = match c {
                Change::Field(n) | Change::Added(n) => n,
                Change::DigestEdited | Change::Unnamed => "sign-off record".into(),
                Change::FeatureGone(_) => continue,
            };
            let name = if prefix.is_empty() {
                name
            } else if let Some(n) = name.strip_prefix(&prefix) {
                n.to_string()
            } else if name == "sign-off record" {
                name
            } else {
                continue;
            };
            if !out.contains(&name) {
                out.push(name);
            }
        }
    }
    out
}

/// The length of a sweep's travel (spaced: as given; pairs: first to last position).
pub fn sweep_travel(s: &Sweep) -> Option<Length> {
    match s.mode {
        SweepMode::Spaced => s.travel,
        SweepMode::Pairs => {
            let min = s.pairs.iter().map(|p| p.position).min()?;
            let max = s.pairs.iter().map(|p| p.position).max()?;
            Some(max - min)
        }
    }
}
