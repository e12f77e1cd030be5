//! The record around the features: notes, handovers, returns, sign-offs and the event log.

use super::{Mark, Stamp};
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;

/// A note on the job or one feature.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Note {
    pub text: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub feature: Option<String>,
    pub by: String,
    pub at: Stamp,
}

/// A note left for the next shift.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Handover {
    pub text: String,
    pub by: String,
    pub at: Stamp,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub read_by: Vec<Mark>,
}

/// A feature (or the job) sent back by a lead, with the comment.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Return {
    /// The feature sent back; none for the whole job.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub feature: Option<String>,
    pub comment: String,
    pub by: String,
    pub at: Stamp,
}

/// Who signs.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Role {
    Operator,
    Lead,
}

/// What a sign-off covers.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Scope {
    /// One feature (named by `feature`).
    Feature,
    /// The whole job, every feature.
    Job,
}

/// A signature with a digest over what it signs.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SignOff {
    pub by: String,
    pub role: Role,
    pub at: Stamp,
    pub scope: Scope,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub feature: Option<String>,
    /// SHA-256 (hex) over the canonical form of everything signed.
    pub digest: String,
    /// SHA-256 (hex) of each signed field, so a later change can be named.
    #[serde(default, skip_serializing_if = "BTreeMap::is_empty")]
    pub fields: BTreeMap<String, String>,
}

/// What happened, in the event log.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum EventKind {
    Opened,
    Upgraded,
    AttemptStarted,
    FixtureChosen,
    SetChosen,
    StackBuilt,
    BlockWrung,
    BlockSwapped,
    SafetyConfirmed,
    Settled,
    SettleSkipped,
    ReadingEntered,
    ReadingRemoved,
    AttemptJudged,
    DoubtDecided,
    Nonconforming,
    Note,
    Handover,
    HandoverRead,
    Signed,
    Returned,
    LockTakenOver,
    Closed,
}

/// One entry of the append-only event log.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Event {
    pub at: Stamp,
    pub by: String,
    pub kind: EventKind,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub feature: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub attempt: Option<u32>,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub detail: String,
}
