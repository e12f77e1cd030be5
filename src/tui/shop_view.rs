//! The shop as the screens need it: fixtures (as traveller snapshots), block sets with the
//! blocks the solver may use, and the shop's settings. A narrow adapter, so the screens do not
//! depend on how the shop file is written.

use crate::traveller::{BlockSetSnapshot, DecisionRule, FixtureKind, FixtureSnapshot};
use crate::blocks::{BlockSet, Condition, Grade, Protectors};
use crate::units::{Length, NM_PER_INCH, NM_PER_MM, Unit};
use jiff::civil::Date;

/// One block set: what the traveller records when it is chosen, and the shop's set itself.
#[derive(Debug, Clone, PartialEq)]
pub struct SetView {
    pub snap: BlockSetSnapshot,
    pub set: BlockSet,
}

impl SetView {
    /// A set as the shop has it, with its snapshot for the traveller.
    pub fn new(set: BlockSet, description: &str, calibrated: Option<Date>) -> SetView {
        let snap = BlockSetSnapshot {
            id: set.id.clone(),
            description: description.to_string(),
            unit: set.unit,
            grade: set.grade.map(|g| g.to_string()).unwrap_or_default(),
            calibrated,
            due: set.calibration_due,
            missing: [set.sizes_in(Condition::Missing), set.sizes_in(Condition::Damaged)].concat(),
            worn: set.sizes_in(Condition::Worn),
            protector: set.protectors.map(|p| p.size),
        };
        SetView { snap, set }
    }
    /// Blocks not in the box or not fit to wring.
    pub fn missing(&self) -> &[Length] {
        &self.snap.missing
    }
    /// Blocks that are worn (used only when no stack of the same count avoids them).
    pub fn worn(&self) -> &[Length] {
        &self.snap.worn
    }
    /// The step heights are rounded to.
    pub fn resolution(&self) -> Length {
        self.set.resolution()
    }
    /// Physical blocks in the set (protectors aside).
    pub fn count(&self) -> usize {
        self.set.blocks.len()
    }
    /// Does the set have `times` usable blocks of `size`?
    pub fn has(&self, size: Length, times: usize) -> bool {
        self.set
            .blocks
            .iter()
            .filter(|b| b.size == size && b.condition.usable())
            .count()
            >= times
    }
}

/// Settings the shop makes for everyone.
#[derive(Debug, Clone, PartialEq)]
pub struct ShopSettings {
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

impl Default for ShopSettings {
    fn default() -> Self {
        ShopSettings {
            rule: DecisionRule::Simple,
            // letting handled blocks settle: common practice (no source); the figure is ours
            settle_minutes: 5,
            operator: None,
            rules: Vec::new(),
            indicator_resolution: Length::from_nm(NM_PER_INCH / 10_000),
            indicator_repeatability: None,
        }
    }
}

/// Everything the screens know about the shop.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ShopView {
    pub fixtures: Vec<FixtureSnapshot>,
    pub sets: Vec<SetView>,
    pub settings: ShopSettings,
}

impl ShopView {
    /// The set with this id.
    pub fn set(&self, id: &str) -> Option<&SetView> {
        self.sets.iter().find(|s| s.snap.id == id)
    }
    /// The fixture with this id.
    pub fn fixture(&self, id: &str) -> Option<&FixtureSnapshot> {
        self.fixtures.iter().find(|f| f.id == id)
    }
}

/// The invented shop of the demo: two sine bars and a sine plate, one inch set with a block
/// missing and one worn, a pair of protector blocks. No real shop or maker.
pub fn demo_shop(today: Date) -> ShopView {
    let inch = |v: f64| Length::inches(v);
    let month = jiff::Span::new().months(6);
    let due_ok = today.checked_add(month).ok();
    let due_past = today.checked_sub(jiff::Span::new().days(12)).ok();
    let bar5 = FixtureSnapshot {
        id: "SB-5".into(),
        kind: FixtureKind::SineBar,
        description: "5 in sine bar".into(),
        centre: Length::from_nm(5 * NM_PER_INCH + 30), // calibrated 5.0000012 in
        nominal_centre: Some(inch(5.0)),
        roll_pivot: inch(0.75),
        roll_stack: inch(0.75),
        calibrated: today.checked_sub(jiff::Span::new().months(5)).ok(),
        due: due_ok,
        centre_u: Some(Length::from_nm(25)),
        max_stack: Some(inch(4.6)),
        max_angle: Some(crate::units::Angle::from_deg(60.0)),
    };
    let plate10 = FixtureSnapshot {
        id: "SP-10".into(),
        kind: FixtureKind::SinePlate,
        description: "10 in sine plate".into(),
        centre: Length::from_nm(10 * NM_PER_INCH - 50),
        nominal_centre: Some(inch(10.0)),
        roll_pivot: inch(1.0),
        roll_stack: inch(1.0),
        calibrated: today.checked_sub(jiff::Span::new().months(13)).ok(),
        due: due_past,
        centre_u: Some(Length::from_nm(40)),
        max_stack: Some(inch(7.5)),
        max_angle: Some(crate::units::Angle::from_deg(60.0)),
    };
    let bar100 = FixtureSnapshot {
        id: "SB-100".into(),
        kind: FixtureKind::SineBar,
        description: "100 mm sine bar".into(),
        centre: Length::from_nm(100 * NM_PER_MM),
        nominal_centre: Some(Length::from_nm(100 * NM_PER_MM)),
        roll_pivot: Length::from_nm(20 * NM_PER_MM),
        roll_stack: Length::from_nm(20 * NM_PER_MM),
        calibrated: None,
        due: due_ok,
        centre_u: Some(Length::from_nm(30)),
        max_stack: Some(Length::from_nm(90 * NM_PER_MM)),
        max_angle: None,
    };
    let mut set = BlockSet::from_catalogue("inch-81").unwrap_or_else(|_| {
        BlockSet::from_sizes("inch-81", Unit::In, &[(inch(1.0), 1)]).unwrap_or_else(|_| empty_set())
    });
    set.id = "GB-81".into();
    // one block gone from the box, one worn: the demo shows both
    let _ = set.mark(tenths(1007), Condition::Missing);
    let _ = set.mark(tenths(1300), Condition::Worn);
    set.protectors = Some(Protectors { size: inch(0.05) });
    set.grade = Some(Grade::Asme0);
    set.calibration_due = due_ok;
    set.material = Some("steel".into());
    let set = SetView::new(
        set,
        "81-piece inch set, steel",
        today.checked_sub(jiff::Span::new().months(3)).ok(),
    );
    ShopView {
        fixtures: vec![bar5, plate10, bar100],
        sets: vec![set],
        settings: ShopSettings {
            rules: vec![
                "Cell rule: the stack is built on the granite plate, never on the machine table."
                    .into(),
            ],
            ..ShopSettings::default()
        },
    }
}

fn tenths(v: i64) -> Length {
    Length::from_nm(NM_PER_INCH / 10_000 * v)
}

fn empty_set() -> BlockSet {
    BlockSet {
        id: "GB-81".into(),
        catalogue: None,
        unit: Unit::In,
        blocks: Vec::new(),
        protectors: None,
        grade: None,
        calibration_due: None,
        material: None,
        note: None,
    }
}
