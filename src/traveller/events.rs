//! Helpers on the model: finding things, the setting angle of a feature, the flow of states,
//! and appending to the event log for every confirmed action.

use super::model::*;
use crate::units::Angle;

impl Traveller {
    /// A new traveller for `job` with `features` and nothing done yet.
    pub fn plan(job: Job, features: Vec<Feature>) -> Self {
        Traveller {
            schema: SCHEMA_VERSION,
            job,
            fixtures: Vec::new(),
            block_sets: Vec::new(),
            features,
            notes: Vec::new(),
            handovers: Vec::new(),
            returns: Vec::new(),
            signoffs: Vec::new(),
            events: Vec::new(),
        }
    }
    /// The feature with this id.
    pub fn feature(&self, id: &str) -> Option<&Feature> {
        self.features.iter().find(|f| f.id == id)
    }
    /// The feature with this id, to change it.
    pub fn feature_mut(&mut self, id: &str) -> Option<&mut Feature> {
        self.features.iter_mut().find(|f| f.id == id)
    }
    /// The snapshot of the fixture with this id.
    pub fn fixture(&self, id: &str) -> Option<&FixtureSnapshot> {
        self.fixtures.iter().find(|f| f.id == id)
    }
    /// The snapshot of the block set with this id.
    pub fn block_set(&self, id: &str) -> Option<&BlockSetSnapshot> {
        self.block_sets.iter().find(|s| s.id == id)
    }
    /// Add or replace a fixture snapshot (by id).
    pub fn put_fixture(&mut self, snap: FixtureSnapshot) {
        match self.fixtures.iter_mut().find(|f| f.id == snap.id) {
            Some(f) => *f = snap,
            None => self.fixtures.push(snap),
        }
    }
    /// Add or replace a block-set snapshot (by id).
    pub fn put_block_set(&mut self, snap: BlockSetSnapshot) {
        match self.block_sets.iter_mut().find(|s| s.id == snap.id) {
            Some(s) => *s = snap,
            None => self.block_sets.push(snap),
        }
    }
    /// Features finished (signed or recorded nonconforming) and the total.
    pub fn progress(&self) -> (usize, usize) {
        let done = self.features.iter().filter(|f| f.is_finished()).count();
        (done, self.features.len())
    }
    /// The first feature not yet finished: where a reopened job lands.
    pub fn next_feature(&self) -> Option<&Feature> {
        self.features.iter().find(|f| !f.is_finished())
    }
    /// Handover notes `who` has not marked read.
    pub fn unread_handovers(&self, who: &str) -> Vec<&Handover> {
        self.handovers
            .iter()
            .filter(|h| !h.read_by.iter().any(|m| m.by == who))
            .collect()
    }

    /// Append an event stamped now. The log is append-only and in time order: should the clock
    /// have gone back since the last event, the last event's time is used.
    pub fn log(
        &mut self,
        by: &str,
        kind: EventKind,
        feature: Option<&str>,
        attempt: Option<u32>,
        detail: impl Into<String>,
    ) -> &Event {
        self.log_at(Stamp::now(), by, kind, feature, attempt, detail)
    }

    /// Append an event with a given time (kept in order as [`Traveller::log`] does).
    pub fn log_at(
        &mut self,
        at: Stamp,
        by: &str,
        kind: EventKind,
        feature: Option<&str>,
        attempt: Option<u32>,
        detail: impl Into<String>,
    ) -> &Event {
        let at = match self.events.last() {
            Some(last) if last.at > at => last.at,
            _ => at,
        };
        let idx = self.events.len();
        self.events.push(Event {
            at,
            by: by.to_string(),
            kind,
            feature: feature.map(str::to_string),
            attempt,
            detail: detail.into(),
        });
        &self.events[idx]
    }

    /// Add a note (and its event).
    pub fn add_note(&mut self, by: &str, feature: Option<&str>, text: &str) {
        let at = Stamp::now();
        self.notes.push(Note {
            text: text.to_string(),
            feature: feature.map(str::to_string),
            by: by.to_string(),
            at,
        });
        self.log_at(at, by, EventKind::Note, feature, None, text);
    }

    /// Leave a handover note for the next shift (and its event).
    pub fn add_handover(&mut self, by: &str, text: &str) {
        let at = Stamp::now();
        self.handovers.push(Handover {
            text: text.to_string(),
            by: by.to_string(),
            at,
            read_by: Vec::new(),
        });
        self.log_at(at, by, EventKind::Handover, None, None, text);
    }

    /// Mark every handover note read by `who` (and log it once).
    pub fn mark_handovers_read(&mut self, who: &str) {
        let at = Stamp::now();
        let mut any = false;
        for h in &mut self.handovers {
            if !h.read_by.iter().any(|m| m.by == who) {
                h.read_by.push(Mark {
                    by: who.to_string(),
                    at,
                });
                any = true;
            }
        }
        if any {
            self.log_at(at, who, EventKind::HandoverRead, None, None, "");
        }
    }

    /// Send a feature (or the whole job) back with a comment; the feature becomes `returned`.
    /// Sending the whole job back returns every finished feature (signed or nonconforming);
    /// each returned feature gets its own event, so the log and the states agree.
    pub fn add_return(&mut self, by: &str, feature: Option<&str>, comment: &str) {
        self.add_return_at(Stamp::now(), by, feature, comment);
    }

    /// [`Traveller::add_return`] at a given time.
    pub fn add_return_at(&mut self, at: Stamp, by: &str, feature: Option<&str>, comment: &str) {
        self.returns.push(Return {
            feature: feature.map(str::to_string),
            comment: comment.to_string(),
            by: by.to_string(),
            at,
        });
        let ids: Vec<String> = match feature {
            Some(id) => vec![id.to_string()],
            None => self
                .features
                .iter()
                .filter(|f| f.is_finished())
                .map(|f| f.id.clone())
                .collect(),
        };
        for f in self.features.iter_mut().filter(|f| ids.contains(&f.id)) {
            f.state = FeatureState::Returned;
        }
        if ids.is_empty() {
            self.log_at(at, by, EventKind::Returned, None, None, comment);
        }
        for id in &ids {
            self.log_at(at, by, EventKind::Returned, Some(id), None, comment);
        }
    }
}

impl Feature {
    /// A plain feature to plan by hand in code.
    pub fn plain(id: &str, name: &str, nominal: Angle, tolerance: crate::units::Tolerance) -> Self {
        Feature {
            id: id.to_string(),
            name: name.to_string(),
            description: String::new(),
            kind: FeatureKind::Plain,
            nominal: Some(nominal),
            tolerance,
            taper: None,
            compound: None,
            work: WorkKind::SetupCheck,
            state: FeatureState::Planned,
            attempts: Vec::new(),
        }
    }

    /// The angle the fixture is set to: the nominal; a taper's half angle; for a compound angle
    /// the near plate's own view angle (see [`Compound::plate_angles`] for both plates).
    pub fn setting_angle(&self) -> Option<Angle> {
        match self.kind {
            FeatureKind::Plain => self.nominal,
            FeatureKind::Taper => self
                .taper
                .as_ref()
                .and_then(|t| t.half_angle().ok())
                .or(self.nominal),
            FeatureKind::Compound => self.compound.as_ref().map(|c| c.plate_angles().0),
        }
    }
    /// The attempt being worked on (the last one).
    pub fn current_attempt(&self) -> Option<&Attempt> {
        self.attempts.last()
    }
    /// The attempt being worked on, to change it.
    pub fn current_attempt_mut(&mut self) -> Option<&mut Attempt> {
        self.attempts.last_mut()
    }
    /// Start a new attempt numbered after the last one.
    pub fn start_attempt(&mut self, by: &str, at: Stamp) -> &mut Attempt {
        let number = self.attempts.last().map_or(1, |a| a.number + 1);
        self.attempts.push(Attempt {
            number,
            started: Some(Mark {
                by: by.to_string(),
                at,
            }),
            ..Attempt::default()
        });
        let last = self.attempts.len() - 1;
        &mut self.attempts[last]
    }
    /// The attempt a sign-off stands on: the last judged one.
    pub fn accepted_attempt(&self) -> Option<&Attempt> {
        self.attempts.iter().rev().find(|a| a.judgement.is_some())
    }
    /// Signed or recorded nonconforming.
    pub fn is_finished(&self) -> bool {
        matches!(
            self.state,
            FeatureState::Signed | FeatureState::Nonconforming
        )
    }
}

impl FeatureState {
    /// Can a feature go from `prev` to `self`?
    pub fn can_follow(self, prev: FeatureState) -> bool {
        use FeatureState::*;
        if self == prev {
            return true;
        }
        match prev {
            Planned => matches!(self, FixtureChosen),
            FixtureChosen => matches!(self, SetChosen),
            SetChosen => matches!(self, StackBuilt | FixtureChosen),
            StackBuilt => matches!(self, Settled | Sweeping | FixtureChosen | SetChosen),
            Settled => matches!(self, Sweeping | StackBuilt | FixtureChosen | SetChosen),
            Sweeping => matches!(self, Judged | StackBuilt | FixtureChosen | SetChosen),
            Judged => matches!(
                self,
                Signed | Nonconforming | FixtureChosen | SetChosen | StackBuilt
            ),
            Nonconforming => matches!(self, Signed | Returned),
            Signed => matches!(self, Returned),
            Returned => !matches!(self, Planned),
        }
    }
    /// The state an event moves a feature to, if it moves it.
    pub fn after_event(kind: EventKind) -> Option<FeatureState> {
        use FeatureState::*;
        Some(match kind {
            EventKind::FixtureChosen => FixtureChosen,
            EventKind::SetChosen => SetChosen,
            EventKind::StackBuilt | EventKind::BlockSwapped => StackBuilt,
            EventKind::Settled | EventKind::SettleSkipped => Settled,
            EventKind::ReadingEntered | EventKind::ReadingRemoved => Sweeping,
            EventKind::AttemptJudged | EventKind::DoubtDecided => Judged,
            EventKind::Nonconforming => Nonconforming,
            EventKind::Signed => Signed,
            EventKind::Returned => Returned,
            _ => return None,
        })
    }
    /// Plain words for screens and reports.
    pub fn label(self) -> &'static str {
        use FeatureState::*;
        match self {
            Planned => "planned",
            FixtureChosen => "fixture chosen",
            SetChosen => "block set chosen",
            StackBuilt => "stack built",
            Settled => "settled",
            Sweeping => "sweeping",
            Judged => "judged",
            Nonconforming => "nonconforming",
            Signed => "signed",
            Returned => "returned",
        }
    }
}

impl Verdict {
    /// The word printed for the verdict.
    pub fn label(self) -> &'static str {
        match self {
            Verdict::Pass => "PASS",
            Verdict::Fail => "FAIL",
            Verdict::Doubt => "DOUBT",
        }
    }
}

impl From<crate::uncertainty::Verdict> for Verdict {
    fn from(v: crate::uncertainty::Verdict) -> Self {
        match v {
            crate::uncertainty::Verdict::Pass => Verdict::Pass,
            crate::uncertainty::Verdict::Fail => Verdict::Fail,
            crate::uncertainty::Verdict::Doubt => Verdict::Doubt,
        }
    }
}

impl From<DecisionRule> for crate::uncertainty::Rule {
    fn from(r: DecisionRule) -> Self {
        match r {
            DecisionRule::Simple => crate::uncertainty::Rule::Simple,
            DecisionRule::Guarded => crate::uncertainty::Rule::Guarded,
        }
    }
}

impl From<crate::uncertainty::Rule> for DecisionRule {
    fn from(r: crate::uncertainty::Rule) -> Self {
        match r {
            crate::uncertainty::Rule::Simple => DecisionRule::Simple,
            crate::uncertainty::Rule::Guarded => DecisionRule::Guarded,
        }
    }
}

impl Judgement {
    /// The verdict that stands: the lead's decision on a doubt, else the computed one.
    pub fn final_verdict(&self) -> Verdict {
        self.doubt_decision
            .as_ref()
            .map_or(self.verdict, |d| d.verdict)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn states_follow_the_flow() {
        use FeatureState::*;
        assert!(FixtureChosen.can_follow(Planned));
        assert!(!Signed.can_follow(Planned));
        assert!(!Judged.can_follow(SetChosen));
        assert!(StackBuilt.can_follow(Judged));
        assert!(Returned.can_follow(Signed));
    }

    #[test]
    fn log_keeps_time_order() {
        let mut t = Traveller::plan(Job::default(), Vec::new());
        let later = Stamp::parse("2999-01-01T00:00:00Z").unwrap();
        t.log_at(later, "AB", EventKind::Opened, None, None, "");
        t.log("AB", EventKind::Note, None, None, "x");
        assert!(t.events[1].at >= t.events[0].at);
    }
}
