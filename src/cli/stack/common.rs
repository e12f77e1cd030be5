//! The block set and the fixture named on the command line, and the shop's other fixtures that
//! could do the same work.

use super::super::center::{parse_rolls, unit_of};
use super::super::{CliError, usage};
use super::StackArgs;
use crate::blocks::small::Candidate;
use crate::blocks::{BlockSet, Solver};
use crate::geometry::SineFixture;
use crate::shop::{Fixture, FixtureKind, SetOrigin, Shop};
use crate::units::{Angle, Length, Unit};

/// The set chosen with `--set`, its solver, and notes about it.
pub struct Chosen {
    pub set: BlockSet,
    pub origin: SetOrigin,
    pub solver: Solver,
    pub notes: Vec<String>,
}

/// What a stack command works with: the shop (read only when `--fixture` or `--set` names
/// something in it), the fixture, the set, the unit heights are shown in and the step they are
/// rounded to.
pub struct Equipment {
    pub shop: Option<Shop>,
    pub fx: FixtureChoice,
    pub chosen: Option<Chosen>,
    pub unit: Unit,
    pub step: Length,
}

pub fn equipment(args: &StackArgs) -> Result<Equipment, CliError> {
    let needs_shop = args.fixture.is_some() || args.set.is_some();
    let shop = if needs_shop {
        Some(load_shop(args)?)
    } else {
        None
    };
    let fx = fixture_of(args, shop.as_ref())?;
    let chosen = match (&args.set, &shop) {
        (Some(id), Some(shop)) => Some(choose_set(shop, id, args.protect)?),
        _ => None,
    };
    let unit = chosen.as_ref().map(|c| c.set.unit).unwrap_or(fx.unit);
    let step = step_of(chosen.as_ref(), unit);
    Ok(Equipment {
        shop,
        fx,
        chosen,
        unit,
        step,
    })
}

pub fn load_shop(args: &StackArgs) -> Result<Shop, CliError> {
    Shop::load(args.shop.as_deref()).map_err(|e| CliError::Usage(e.to_string()))
}

pub fn choose_set(shop: &Shop, id: &str, protect: bool) -> Result<Chosen, CliError> {
    let Some((set, origin)) = shop.set_or_catalogue(id) else {
        return Err(usage(format!(
            "there is no block set '{id}'; use one of: {} (`tiltbook shop` lists the shop's sets)",
            shop.set_ids().join(", ")
        )));
    };
    let mut notes = Vec::new();
    let own_file = !matches!(shop.source, crate::shop::ShopSource::BuiltIn { .. });
    if origin == SetOrigin::Catalogue && own_file {
        let own: Vec<String> = shop
            .sets_from(&set.id)
            .iter()
            .map(|s| s.id.clone())
            .collect();
        if !own.is_empty() {
            notes.push(format!(
                "{} here is the complete standard set; the shop's own set {} may lack blocks (use --set {} to build from it)",
                set.id,
                own.join(", "),
                own[0]
            ));
        }
    }
    if let Some(due) = set.calibration_due
        && due <= jiff::Zoned::now().date()
    {
        notes.push(format!(
            "set {} was due for calibration on {due}; have it calibrated, or note why it is used",
            set.id
        ));
    }
    let solver = Solver::new(&set)
        .and_then(|s| s.with_protectors(protect))
        .map_err(|e| usage(e.to_string()))?;
    Ok(Chosen {
        set,
        origin,
        solver,
        notes,
    })
}

/// The fixture the command works on: from the shop (`--fixture`) or typed (`--center`).
pub struct FixtureChoice {
    pub fixture: Option<Fixture>,
    pub sine: SineFixture,
    /// The unit of its centre distance.
    pub unit: Unit,
}

/// The fixture from `--fixture` (needs the shop) or `--center` and `--rolls`.
pub fn fixture_of(args: &StackArgs, shop: Option<&Shop>) -> Result<FixtureChoice, CliError> {
    if let (Some(id), Some(shop)) = (&args.fixture, shop) {
        let f = shop.fixture(id).cloned().ok_or_else(|| {
            usage(format!(
                "there is no fixture '{id}' in {}; use one of: {}",
                shop.source,
                shop.fixtures
                    .iter()
                    .map(|f| f.id.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            ))
        })?;
        return Ok(FixtureChoice {
            sine: f.sine(),
            unit: f.unit,
            fixture: Some(f),
        });
    }
    let Some(c) = &args.center else {
        return Err(usage(
            "give the fixture: --center LENGTH (e.g. --center 5in) or --fixture ID from the shop file",
        ));
    };
    let unit = unit_of(c);
    let center = Length::parse_positive(c, unit).map_err(|e| usage(format!("--center: {e}")))?;
    let (p, r) = match &args.rolls {
        Some(r) => parse_rolls(r)?,
        None => (Length::ZERO, Length::ZERO),
    };
    Ok(FixtureChoice {
        fixture: None,
        sine: SineFixture {
            center,
            pivot_roll: p,
            raised_roll: r,
        },
        unit,
    })
}

/// Warnings about a shop fixture for `angle`: outside its rated range, calibration due.
pub fn fixture_warnings(f: &Fixture, angle: Angle) -> Vec<String> {
    let mut w = Vec::new();
    if !f.rated_for(angle) {
        w.push(format!(
            "{} is outside the angles fixture {} is rated for ({} to {}); use another fixture",
            angle.dm(),
            f.id,
            f.angle_range.0.dm(),
            f.angle_range.1.dm()
        ));
    }
    if f.calibration_overdue(jiff::Zoned::now().date()) {
        w.push(format!(
            "fixture {} was due for calibration on {}; have it calibrated, or note why it is used",
            f.id,
            f.calibration_due.map(|d| d.to_string()).unwrap_or_default()
        ));
    }
    w
}

/// A warning when a shop fixture is not of the kind the work needs.
pub fn kind_warning(f: &Fixture, kinds: &[FixtureKind], work: &str) -> Option<String> {
    (!kinds.contains(&f.kind)).then(|| {
        format!(
            "fixture {} is a {}; {work} is usually set on a {}",
            f.id,
            f.kind,
            kinds
                .iter()
                .map(|k| k.words())
                .collect::<Vec<_>>()
                .join(" or ")
        )
    })
}

/// The shop's fixtures of `kinds` (other than `current`) rated for `angle`, as candidates for
/// the longer-fixture remedy (the remedy itself keeps only the longer ones).
pub fn candidates(
    shop: &Shop,
    kinds: &[FixtureKind],
    current: Option<&Fixture>,
    angle: Angle,
) -> Vec<Candidate> {
    let today = jiff::Zoned::now().date();
    shop.fixtures
        .iter()
        .filter(|f| kinds.contains(&f.kind))
        .filter(|f| current.is_none_or(|c| c.id != f.id))
        .filter(|f| f.rated_for(angle))
        .map(|f| Candidate {
            id: f.id.clone(),
            fixture: f.sine(),
            largest_stack: Some(f.largest_stack),
            unit: f.unit,
            note: f.calibration_overdue(today).then(|| {
                format!(
                    "its calibration was due on {}",
                    f.calibration_due.map(|d| d.to_string()).unwrap_or_default()
                )
            }),
        })
        .collect()
}

/// The step heights are rounded to: the set's resolution, or 0.0001 in / 0.001 mm.
pub fn step_of(chosen: Option<&Chosen>, unit: Unit) -> Length {
    match chosen {
        Some(c) => c.set.resolution(),
        None => Length::from_nm(match unit {
            Unit::In => Unit::In.nm() / 10_000,
            Unit::Mm => Unit::Mm.nm() / 1000,
        }),
    }
}
