//! The traveller as plain data: what is written to and read from the YAML file.
//!
//! A hand-written plan file is the same format with the results left out, so nearly every field
//! has a default and is skipped when empty. Lengths are written with their unit (`"2.5000 in"`),
//! angles as degrees-minutes-seconds (`"30°15'00\""`, and `30`, `30d15m` are read too),
//! tolerances as `"±0°05'"`, times with their UTC offset (`2025-03-04T14:05:09-05:00`).

pub use super::stamp::Stamp;
use crate::units::{Angle, Length, Tolerance, Unit};
use jiff::civil::Date;
pub use records::*;
use serde::{Deserialize, Serialize};

mod judgement;
mod records;
pub use judgement::*;

/// The schema version this build writes (and the newest it reads).
pub const SCHEMA_VERSION: u32 = 1;

fn is_default<T: Default + PartialEq>(v: &T) -> bool {
    *v == T::default()
}
fn is_false(b: &bool) -> bool {
    !*b
}

/// One traveller file: the job, the equipment it used, the features and everything done to them.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Traveller {
    /// Schema version of the file; see `docs/traveller-format.md`.
    pub schema: u32,
    pub job: Job,
    /// Snapshots of the fixtures used, as they were when chosen.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub fixtures: Vec<FixtureSnapshot>,
    /// Snapshots of the gauge-block sets used, as they were when chosen.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub block_sets: Vec<BlockSetSnapshot>,
    pub features: Vec<Feature>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub notes: Vec<Note>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub handovers: Vec<Handover>,
    /// Features (or the job) sent back by a lead.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub returns: Vec<Return>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub signoffs: Vec<SignOff>,
    /// Append-only record of every confirmed action.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub events: Vec<Event>,
}

/// The job: which part, to which drawing, how many.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Job {
    pub id: String,
    pub part: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub drawing: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub revision: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub material: String,
    #[serde(default = "one")]
    pub quantity: u32,
    /// Unit heights and readings are shown in.
    #[serde(default)]
    pub unit: Unit,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub notes: String,
}
fn one() -> u32 {
    1
}

/// The kind of sine fixture.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum FixtureKind {
    #[default]
    SineBar,
    SinePlate,
    SineVise,
    SineCentres,
    CompoundPlate,
}

/// A fixture as it was when chosen for this job.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FixtureSnapshot {
    pub id: String,
    #[serde(default)]
    pub kind: FixtureKind,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub description: String,
    /// Calibrated centre distance C (what the geometry uses).
    pub centre: Length,
    /// Nominal centre distance (5 in, 100 mm…), for display.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nominal_centre: Option<Length>,
    /// Diameter of the roll on the plate (pivot end).
    pub roll_pivot: Length,
    /// Diameter of the roll on the stack (raised end).
    pub roll_stack: Length,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub calibrated: Option<Date>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub due: Option<Date>,
    /// Standard uncertainty of the calibrated centre distance.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub centre_u: Option<Length>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub max_stack: Option<Length>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub max_angle: Option<Angle>,
}

/// A gauge-block set as it was when chosen for this job.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BlockSetSnapshot {
    pub id: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub description: String,
    #[serde(default)]
    pub unit: Unit,
    /// Grade (tolerance class), e.g. `"0"`, `"AS-1"`, `"K"`.
    pub grade: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub calibrated: Option<Date>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub due: Option<Date>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub missing: Vec<Length>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub worn: Vec<Length>,
    /// Size of each protector (wear) block, when the set has a pair.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub protector: Option<Length>,
}

/// What kind of angle a feature is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum FeatureKind {
    /// One angle from the surface plate.
    #[default]
    Plain,
    /// A taper on sine centres; see [`Taper`].
    Taper,
    /// A compound angle on a compound sine plate; see [`Compound`].
    Compound,
}

/// How a taper is given on the drawing. Exactly one field is set.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Taper {
    /// Diameter change per length as `1:k`, e.g. `"1:20"`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub ratio: Option<String>,
    /// Diameter change over one foot (12 in), e.g. `"0.6250 in"`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub per_foot: Option<Length>,
    /// Included angle (twice the half angle).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub included: Option<Angle>,
    /// Half angle (the setting angle on sine centres).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub half: Option<Angle>,
}

/// Which plate of a compound sine plate is nearer the part.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum NearPlate {
    #[default]
    A,
    B,
}

/// A compound angle: slope A in the front view, B in the side view.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Compound {
    pub a: Angle,
    pub b: Angle,
    /// The plate nearer the part is set to its own view angle exactly.
    #[serde(default)]
    pub near: NearPlate,
}

/// What the feature's check is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum WorkKind {
    /// Set the fixture so the part can be machined, and check the setup.
    #[default]
    SetupCheck,
    /// Inspect a finished surface.
    Inspection,
}

/// Where a feature is in its flow.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Default, Serialize, Deserialize,
)]
#[serde(rename_all = "snake_case")]
pub enum FeatureState {
    #[default]
    Planned,
    FixtureChosen,
    SetChosen,
    StackBuilt,
    Settled,
    Sweeping,
    Judged,
    Nonconforming,
    Signed,
    Returned,
}

/// One angled feature of the part, with every attempt at it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Feature {
    pub id: String,
    pub name: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub description: String,
    #[serde(default, skip_serializing_if = "is_default")]
    pub kind: FeatureKind,
    /// The angle to set (plain). For a taper the half angle is used when this is left out;
    /// for a compound angle it is the true slope, for display.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nominal: Option<Angle>,
    pub tolerance: Tolerance,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub taper: Option<Taper>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub compound: Option<Compound>,
    #[serde(default)]
    pub work: WorkKind,
    #[serde(default)]
    pub state: FeatureState,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub attempts: Vec<Attempt>,
}

/// The step of an attempt where work stopped; a reopened job lands here.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Step {
    #[default]
    Fixture,
    BlockSet,
    Stack,
    Safety,
    Settle,
    Sweep,
    Verdict,
    Sign,
    Done,
}

/// Who did something and when.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Mark {
    pub by: String,
    pub at: Stamp,
}

/// A chosen fixture or block set (by id into the snapshots).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Choice {
    pub id: String,
    /// Why, when the choice needs one (calibration out of date).
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub reason: String,
    pub by: String,
    pub at: Stamp,
}

/// One block in a stack, in wringing order.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StackBlock {
    pub size: Length,
    #[serde(default, skip_serializing_if = "is_false")]
    pub protector: bool,
    /// Ticked by the operator as the block is wrung on.
    #[serde(default, skip_serializing_if = "is_false")]
    pub wrung: bool,
}

/// A block the operator changed by hand from the one the solver asked for.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Swap {
    pub planned: Length,
    pub used: Length,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub reason: String,
    pub by: String,
    pub at: Stamp,
}

/// A gauge-block stack under the raised roll.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Stack {
    /// Blocks in wringing order (protectors included).
    pub blocks: Vec<StackBlock>,
    /// Total height of the blocks as built.
    pub height: Length,
    /// Angle the fixture makes with this stack.
    pub achieved: Angle,
    /// Blocks changed by hand; the height and angle above are from what was really built.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub swaps: Vec<Swap>,
    /// When the stack was confirmed built.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub built: Option<Mark>,
}

impl Stack {
    /// Was any block swapped by hand?
    pub fn swapped_by_hand(&self) -> bool {
        !self.swaps.is_empty()
    }
    /// Sum of the block sizes.
    pub fn block_total(&self) -> Length {
        self.blocks.iter().map(|b| b.size).sum()
    }
}

/// Letting the stack and fixture come to room temperature.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Settle {
    /// `true` when the wait was done, `false` when skipped.
    pub done: bool,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub minutes: Option<u32>,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub reason: String,
    pub by: String,
    pub at: Stamp,
}

/// How indicator readings are positioned along the travel.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum SweepMode {
    /// `points` readings at equal spacing over `travel` (first at 0, last at `travel`).
    #[default]
    Spaced,
    /// Each reading with its own position.
    Pairs,
}

/// A reading at a measured position (mode `pairs`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pair {
    /// Distance from the pivot end toward the raised end.
    pub position: Length,
    /// Plus means the surface is higher (plunger pushed in).
    pub reading: Length,
}

/// The indicator sweep of one attempt; readings may be partial while work is under way.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Sweep {
    #[serde(default)]
    pub mode: SweepMode,
    /// Spaced mode: distance from the first reading to the last.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub travel: Option<Length>,
    /// Spaced mode: how many readings are planned.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub points: Option<u32>,
    /// Spaced mode: the readings entered so far, in order.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub readings: Vec<Length>,
    /// Pairs mode: position and reading.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub pairs: Vec<Pair>,
    /// Indicator resolution (one division).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub resolution: Option<Length>,
    /// Who entered the last reading, and when.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub entered: Option<Mark>,
}

impl Sweep {
    /// Positions and readings entered so far (spaced readings placed on their spacing).
    pub fn points_xy(&self) -> Vec<(Length, Length)> {
        match self.mode {
            SweepMode::Pairs => self.pairs.iter().map(|p| (p.position, p.reading)).collect(),
            SweepMode::Spaced => {
                let (Some(travel), Some(n)) = (self.travel, self.points) else {
                    return Vec::new();
                };
                let gaps = i64::from(n.max(2) - 1);
                self.readings
                    .iter()
                    .enumerate()
                    .map(|(i, r)| (Length::from_nm(travel.nm() * i as i64 / gaps), *r))
                    .collect()
            }
        }
    }
    /// Are all planned readings in?
    pub fn complete(&self) -> bool {
        match self.mode {
            SweepMode::Pairs => self.pairs.len() >= 2,
            SweepMode::Spaced => self
                .points
                .is_some_and(|n| n >= 2 && self.readings.len() == n as usize),
        }
    }
}

/// One try at a feature: fixture, set, stack, settle, sweep, verdict.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Attempt {
    pub number: u32,
    /// Where work on this attempt stopped.
    #[serde(default)]
    pub step: Step,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub started: Option<Mark>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub fixture: Option<Choice>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub block_set: Option<Choice>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stack: Option<Stack>,
    /// Compound angles: the other plate's stack (the plate not nearer the part), from the same
    /// set as `stack` with no block shared. `stack` is then the near plate's.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stack_b: Option<Stack>,
    /// Small angles, two stacks on one fixture: the stack under the pivot roll. `stack` is then
    /// the one under the raised roll, and the fixture's angle comes from their difference
    /// (both record that angle as `achieved`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stack_pivot: Option<Stack>,
    /// The safety and care cautions were shown and confirmed.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub safety: Option<Mark>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub settle: Option<Settle>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sweep: Option<Sweep>,
    /// Compound angles: the sweep along the other plate's view (`sweep` is along the near
    /// plate's).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sweep_b: Option<Sweep>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub judgement: Option<Judgement>,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub note: String,
}
