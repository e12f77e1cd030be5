//! The shop as the screens need it: fixtures (as traveller snapshots), block sets with the
//! blocks the solver may use, and the shop's settings. A narrow adapter, so the screens do not
//! depend on how the shop file is written.

use crate::blocks::{BlockSet, Condition};
use crate::shop::{Fixture, FixtureKind as ShopKind, Shop};
use crate::traveller::{BlockSetSnapshot, FixtureKind, FixtureSnapshot};
use crate::units::Length;
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
            missing: [
                set.sizes_in(Condition::Missing),
                set.sizes_in(Condition::Damaged),
            ]
            .concat(),
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

/// Settings the shop makes for everyone (from the shop file's `settings:`).
pub use crate::shop::Settings as ShopSettings;

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

impl ShopView {
    /// The screens' view of a shop loaded from its file (or the built-in demo shop).
    pub fn from_shop(shop: &Shop) -> ShopView {
        let fixtures = shop.fixtures.iter().map(snapshot).collect();
        let sets = shop
            .block_sets
            .iter()
            .map(|s| {
                let mut words: Vec<String> = Vec::new();
                if let Some(c) = s
                    .catalogue
                    .as_deref()
                    .and_then(crate::blocks::catalogue::set)
                {
                    words.push(c.name.to_string());
                }
                if let Some(m) = &s.material {
                    words.push(m.clone());
                }
                SetView::new(s.clone(), &words.join(", "), None)
            })
            .collect();
        ShopView {
            fixtures,
            sets,
            settings: shop.settings.clone(),
        }
    }
}

/// The traveller's record of a shop fixture.
pub fn snapshot(f: &Fixture) -> FixtureSnapshot {
    let kind = match f.kind {
        ShopKind::SineBar => FixtureKind::SineBar,
        ShopKind::SinePlate => FixtureKind::SinePlate,
        ShopKind::SineVise => FixtureKind::SineVise,
        ShopKind::SineCentres => FixtureKind::SineCentres,
        ShopKind::CompoundSinePlate => FixtureKind::CompoundPlate,
    };
    FixtureSnapshot {
        id: f.id.clone(),
        kind,
        description: match &f.note {
            Some(n) => format!("{}; {n}", f.kind.words()),
            None => f.kind.words().to_string(),
        },
        centre: f.center,
        nominal_centre: None,
        roll_pivot: f.pivot_roll,
        roll_stack: f.raised_roll,
        calibrated: Some(f.calibrated),
        due: f.calibration_due,
        centre_u: Some(f.center_uncertainty),
        max_stack: Some(f.largest_stack),
        max_angle: Some(f.angle_range.1),
    }
}
