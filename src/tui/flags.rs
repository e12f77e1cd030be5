//! What the lead's review flags on a feature, in the order the lead reads them: the stack
//! swapped by hand, calibration out of date, accepted inside the doubt band, large
//! straightness, nonconforming (with its note), changed after sign-off. Built on the report's
//! flags, with the details a lead needs to judge them.

use crate::traveller::digest::{self, withdrawn_by};
use crate::traveller::report::{self, Flag};
use crate::traveller::{Feature, FeatureState, Role, Scope, SignOff, Traveller};
use crate::units::Unit;

/// One flag: a short tag for the list and the words for the feature page.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ReviewFlag {
    pub tag: &'static str,
    pub words: String,
}

/// The flags of a feature.
pub fn review_flags(t: &Traveller, f: &Feature) -> Vec<ReviewFlag> {
    let unit = t.job.unit;
    let mut out = Vec::new();
    let mut changed = None;
    for flag in report::flags(t, f) {
        match flag {
            Flag::SwappedByHand => out.push(ReviewFlag {
                tag: "swap",
                words: format!("stack swapped by hand: {}", swaps_text(f, unit)),
            }),
            Flag::CalibrationOutOfDate(w) => {
                let reasons: Vec<&str> = f
                    .attempts
                    .iter()
                    .flat_map(|a| a.fixture.iter().chain(a.block_set.iter()))
                    .map(|c| c.reason.as_str())
                    .filter(|r| !r.trim().is_empty())
                    .collect();
                let why = match reasons.last() {
                    Some(r) => format!("; reason given: {r}"),
                    None => String::new(),
                };
                out.push(ReviewFlag {
                    tag: "cal",
                    words: format!("calibration out of date: {w}{why}"),
                });
            }
            Flag::DoubtBand => {
                let decision = f
                    .accepted_attempt()
                    .and_then(|a| a.judgement.as_ref())
                    .and_then(|j| j.doubt_decision.as_ref());
                let words = match decision {
                    Some(d) => format!(
                        "accepted inside the doubt band: {} by {} ({})",
                        d.verdict.label(),
                        d.by,
                        d.reason
                    ),
                    None if f.state == FeatureState::Signed => {
                        "accepted inside the doubt band: signed with no decision recorded".into()
                    }
                    None => "inside the doubt band: the lead decides".into(),
                };
                out.push(ReviewFlag {
                    tag: "doubt",
                    words,
                });
            }
            Flag::LargeStraightness => {
                let s = f
                    .accepted_attempt()
                    .and_then(|a| a.judgement.as_ref())
                    .map(|j| j.fit.straightness.show_fine(unit))
                    .unwrap_or_default();
                out.push(ReviewFlag {
                    tag: "straight",
                    words: format!(
                        "large straightness: {s} along the sweep against {}; the angle may be doubtful",
                        f.tolerance
                    ),
                });
            }
            Flag::ChangedAfterSignOff(fields) => changed = Some(fields),
        }
    }
    if f.state == FeatureState::Nonconforming {
        let note = f
            .attempts
            .iter()
            .rev()
            .map(|a| a.note.trim())
            .find(|n| !n.is_empty())
            .or_else(|| {
                t.notes
                    .iter()
                    .rev()
                    .find(|n| n.feature.as_deref() == Some(f.id.as_str()))
                    .map(|n| n.text.trim())
            })
            .unwrap_or("no note");
        out.push(ReviewFlag {
            tag: "NC",
            words: format!("nonconforming: {note}"),
        });
    }
    if let Some(fields) = changed {
        out.push(ReviewFlag {
            tag: "changed",
            words: format!("changed after sign-off: {}", fields.join(", ")),
        });
    }
    out
}

fn swaps_text(f: &Feature, unit: Unit) -> String {
    let list: Vec<String> = f
        .attempts
        .iter()
        .flat_map(|a| {
            a.stack
                .iter()
                .chain(a.stack_b.iter())
                .chain(a.stack_pivot.iter())
                .flat_map(move |s| s.swaps.iter().map(move |w| (a.number, w)))
        })
        .map(|(n, w)| {
            let why = if w.reason.trim().is_empty() {
                String::new()
            } else {
                format!(", {}", w.reason.trim())
            };
            format!(
                "attempt {n} {} for {} ({}{why})",
                w.used.show(unit),
                w.planned.show(unit),
                w.by
            )
        })
        .collect();
    list.join("; ")
}

/// Is this sign-off still standing: not withdrawn by a return and nothing changed since?
pub fn standing(t: &Traveller, s: &SignOff) -> bool {
    withdrawn_by(t, s).is_none() && digest::verify(t, s).is_empty()
}

/// The lead's sign-off of a feature (by id) or of the job (None) that still stands.
pub fn lead_signoff<'a>(t: &'a Traveller, feature: Option<&str>) -> Option<&'a SignOff> {
    t.signoffs.iter().rev().find(|s| {
        s.role == Role::Lead
            && match feature {
                Some(id) => s.scope == Scope::Feature && s.feature.as_deref() == Some(id),
                None => s.scope == Scope::Job,
            }
            && standing(t, s)
    })
}
