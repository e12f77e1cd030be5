//! What the shop file describes: sine fixtures (block sets are [`crate::blocks::BlockSet`]).

use crate::geometry::SineFixture;
use crate::traveller::DecisionRule;
use crate::units::{Angle, Length, NM_PER_INCH, Unit};
use jiff::civil::Date;
use serde::{Deserialize, Serialize};
use std::fmt;

/// The kinds of sine fixture.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum FixtureKind {
    #[serde(rename = "sine bar")]
    SineBar,
    #[serde(rename = "sine plate")]
    SinePlate,
    #[serde(rename = "sine vise")]
    SineVise,
    #[serde(rename = "sine centres", alias = "sine centers")]
    SineCentres,
    #[serde(rename = "compound sine plate")]
    CompoundSinePlate,
}

impl FixtureKind {
    /// The words used in the shop file and on screen.
    pub fn words(self) -> &'static str {
        match self {
            FixtureKind::SineBar => "sine bar",
            FixtureKind::SinePlate => "sine plate",
            FixtureKind::SineVise => "sine vise",
            FixtureKind::SineCentres => "sine centres",
            FixtureKind::CompoundSinePlate => "compound sine plate",
        }
    }
}

impl fmt::Display for FixtureKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.words())
    }
}

/// One sine fixture as calibrated.
#[derive(Debug, Clone, PartialEq)]
pub struct Fixture {
    pub id: String,
    pub kind: FixtureKind,
    /// The unit its centre distance is written in (heights for it are shown in this unit).
    pub unit: Unit,
    /// Centre distance as calibrated.
    pub center: Length,
    /// Diameter of the roll on the plate.
    pub pivot_roll: Length,
    /// Diameter of the roll on the stack.
    pub raised_roll: Length,
    pub calibrated: Date,
    pub calibration_due: Option<Date>,
    /// Standard uncertainty (k = 1) of the centre distance.
    pub center_uncertainty: Length,
    /// The tallest stack it takes.
    pub largest_stack: Length,
    /// The angles it is rated for, smallest and largest.
    pub angle_range: (Angle, Angle),
    pub note: Option<String>,
}

impl Fixture {
    /// Its geometry, for the computations in [`crate::geometry`].
    pub fn sine(&self) -> SineFixture {
        SineFixture {
            center: self.center,
            pivot_roll: self.pivot_roll,
            raised_roll: self.raised_roll,
        }
    }

    /// Is `angle` inside the rated range?
    pub fn rated_for(&self, angle: Angle) -> bool {
        angle.deg() >= self.angle_range.0.deg() - 1e-9
            && angle.deg() <= self.angle_range.1.deg() + 1e-9
    }

    /// Is the calibration past its due date on `today`? (Usable through the due date itself,
    /// as the screens and the traveller's checks count it.)
    pub fn calibration_overdue(&self, today: Date) -> bool {
        self.calibration_due.is_some_and(|d| d < today)
    }

    /// A one-line description: id, kind, centre distance.
    pub fn describe(&self) -> String {
        format!(
            "{} ({}, centre distance {} {})",
            self.id,
            self.kind,
            self.center.exact_number(self.unit, self.unit.places()),
            self.unit
        )
    }
}

/// What the shop decides for everyone: the `settings:` section of the shop file (every key
/// optional).
#[derive(Debug, Clone, PartialEq)]
pub struct Settings {
    /// How a verdict is reached: simple, or guarded by the expanded uncertainty.
    pub rule: DecisionRule,
    /// How long a stack is left to settle to room temperature.
    pub settle_minutes: u32,
    /// The operator at this terminal, when the shop file names one.
    pub operator: Option<String>,
    /// The shop's own rules shown with the cautions.
    pub rules: Vec<String>,
    /// One division of the indicator.
    pub indicator_resolution: Length,
    /// One reading's standard deviation, when the shop has measured it.
    pub indicator_repeatability: Option<Length>,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            rule: DecisionRule::Simple,
            // letting handled blocks settle: common practice (no source); the figure is ours
            settle_minutes: 5,
            operator: None,
            rules: Vec::new(),
            // a 0.0001 in dial test indicator: common practice (no source)
            indicator_resolution: Length::from_nm(NM_PER_INCH / 10_000),
            indicator_repeatability: None,
        }
    }
}
