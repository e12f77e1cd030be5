//! The shop's fixtures ranked for one angle: can it be set, the error the set's rounding leaves,
//! an estimate of U, warnings, and whether its calibration is out of date.

use super::shop_view::{SetView, ShopView};
use crate::blocks::Solver;
use crate::geometry::{SineFixture, plan};
use crate::traveller::{BlockSetSnapshot, FeatureKind, FixtureKind, FixtureSnapshot};
use crate::uncertainty::{Contribution, DEFAULT_JOINT_NM, Grade, Setup, budget};
use crate::units::{Angle, Length, Unit};
use jiff::civil::Date;

/// The geometry of a fixture snapshot.
pub fn geometry(f: &FixtureSnapshot) -> SineFixture {
    SineFixture {
        center: f.centre,
        pivot_roll: f.roll_pivot,
        raised_roll: f.roll_stack,
    }
}

/// Is a calibration due date past?
pub fn out_of_date(due: Option<Date>, today: Date) -> bool {
    due.is_some_and(|d| d < today)
}

/// One fixture as offered for an angle.
#[derive(Debug, Clone, PartialEq)]
pub struct FixtureOption {
    /// Index into the shop's fixtures.
    pub index: usize,
    pub reachable: bool,
    /// Why it cannot be used for this angle.
    pub why_not: Option<String>,
    /// The stack height, rounded to the step.
    pub height: Option<Length>,
    /// Achieved − setting, from rounding the stack.
    pub error: Option<Angle>,
    /// Expanded uncertainty estimate from the centre distance and a stack of the likely set's
    /// grade.
    pub u: Option<Angle>,
    pub warnings: Vec<String>,
    pub out_of_date: bool,
    /// Made for this kind of feature (sine centres for tapers, a compound plate for compound
    /// angles, a bar, plate or vise for a plain angle).
    pub suitable: bool,
    /// The likely block set makes the stack height in one stack (true when not known).
    pub buildable: bool,
}

/// The block set a ranking checks heights against: its id and its solver.
#[derive(Clone, Copy)]
pub struct LikelySet<'a> {
    pub id: &'a str,
    pub solver: &'a Solver,
}

/// Is a fixture of `fixture` kind made for a feature of `feature` kind? And if not, why.
pub fn suits(fixture: FixtureKind, feature: FeatureKind) -> Result<(), &'static str> {
    use FixtureKind as K;
    match (feature, fixture) {
        (FeatureKind::Taper, K::SineCentres) => Ok(()),
        (FeatureKind::Taper, _) => Err("a taper is set on sine centres"),
        (FeatureKind::Compound, K::CompoundPlate) => Ok(()),
        (FeatureKind::Compound, _) => Err("a compound angle needs a compound sine plate"),
        (FeatureKind::Plain, K::SineCentres) => {
            Err("sine centres are made for work between centres")
        }
        (FeatureKind::Plain, _) => Ok(()),
    }
}

/// What a fixture is ranked for: the feature's kind and setting angle, the step heights are
/// rounded to, the job's unit, today, and the tolerance class of the set likely to be used
/// (its blocks' grade enters the estimate of U; none leaves the stack out of it).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RankFor {
    pub kind: FeatureKind,
    pub setting: Angle,
    pub step: Length,
    pub unit: Unit,
    pub today: Date,
    pub grade: Option<Grade>,
}

/// Rank the shop's fixtures for `r.setting` on a feature of `r.kind`, heights rounded to
/// `r.step`: reachable first, then made for the kind, then buildable in one stack from the
/// likely set `set` (when given), then in date, then the smallest |error| + U.
pub fn rank_fixtures(
    shop: &ShopView,
    r: &RankFor,
    set: Option<LikelySet<'_>>,
) -> Vec<FixtureOption> {
    let mut v: Vec<FixtureOption> = shop
        .fixtures
        .iter()
        .enumerate()
        .map(|(index, f)| offer(index, f, r, set))
        .collect();
    let score = |o: &FixtureOption| {
        o.error.map_or(f64::MAX, |e| e.arcsec().abs()) + o.u.map_or(0.0, |u| u.arcsec())
    };
    v.sort_by(|a, b| {
        (!a.reachable, !a.suitable, !a.buildable, a.out_of_date)
            .cmp(&(!b.reachable, !b.suitable, !b.buildable, b.out_of_date))
            .then(score(a).total_cmp(&score(b)))
    });
    v
}

fn offer(
    index: usize,
    f: &FixtureSnapshot,
    r: &RankFor,
    set: Option<LikelySet<'_>>,
) -> FixtureOption {
    let (kind, setting, step, unit, today) = (r.kind, r.setting, r.step, r.unit, r.today);
    let geo = geometry(f);
    let stale = out_of_date(f.due, today);
    let mut o = FixtureOption {
        index,
        reachable: false,
        why_not: None,
        height: None,
        error: None,
        u: None,
        warnings: Vec::new(),
        out_of_date: stale,
        suitable: true,
        buildable: true,
    };
    if let Err(why) = suits(f.kind, kind) {
        o.suitable = false;
        o.warnings.push(why.to_string());
    }
    if stale && let Some(d) = f.due {
        o.warnings
            .push(format!("calibration was due {d}: using it needs a reason"));
    }
    if let Some(max) = f.max_angle
        && setting.deg() > max.deg() + 1e-9
    {
        o.why_not = Some(format!("rated only to {}", max.dm()));
        return o;
    }
    match plan(&geo, setting, step, f.max_stack, unit) {
        Err(e) => o.why_not = Some(e.to_string()),
        Ok(adv) => {
            let too_tall = f.max_stack.is_some_and(|m| adv.direct.height > m);
            if too_tall {
                o.why_not = Some(format!(
                    "needs a {} stack; it takes {} at most",
                    adv.direct.height.show(unit),
                    f.max_stack.unwrap_or_default().show(unit)
                ));
            } else {
                o.reachable = true;
            }
            // a compound setting's stacks are worked out on the stack screen
            if kind != FeatureKind::Compound
                && let Some(set) = set
                && set.solver.fewest(adv.direct.height).is_none()
            {
                o.buildable = false;
                o.warnings.push(format!(
                    "set {} has no single stack of {}; the stack screen offers other ways",
                    set.id,
                    adv.direct.height.show(unit)
                ));
            }
            o.height = Some(adv.direct.height);
            o.error = Some(adv.direct.error);
            o.u = estimate_u(&geo, setting, f.centre_u, adv.direct.height, r.grade);
            for w in adv.warnings {
                if !w.contains("taller than this fixture") {
                    o.warnings.push(w);
                }
            }
        }
    }
    o
}

fn estimate_u(
    geo: &SineFixture,
    setting: Angle,
    centre_u: Option<Length>,
    h: Length,
    grade: Option<Grade>,
) -> Option<Angle> {
    // the stack as one block of its height: its grade's limit for that length
    let mut c: Vec<Contribution> = grade
        .map(|grade| Contribution::Stack {
            blocks: vec![h],
            grade,
            per_joint_nm: DEFAULT_JOINT_NM,
        })
        .into_iter()
        .collect();
    if let Some(u) = centre_u {
        c.push(Contribution::CenterCalibration { u });
    }
    budget(
        &Setup {
            fixture: *geo,
            angle: setting,
        },
        &c,
    )
    .ok()
    .map(|b| b.expanded)
}

/// One block set as offered.
#[derive(Debug, Clone, PartialEq)]
pub struct SetOption {
    pub index: usize,
    pub out_of_date: bool,
}

/// The shop's sets in their order, with their calibration state.
pub fn list_sets(shop: &ShopView, today: Date) -> Vec<SetOption> {
    shop.sets
        .iter()
        .enumerate()
        .map(|(index, s)| SetOption {
            index,
            out_of_date: out_of_date(s.snap.due, today),
        })
        .collect()
}

/// A short list of block sizes: `0.1007, 0.1300 in`.
pub fn sizes_text(sizes: &[Length], unit: Unit) -> String {
    if sizes.is_empty() {
        return "none".into();
    }
    let v: Vec<String> = sizes
        .iter()
        .map(|s| s.number(unit, unit.places()))
        .collect();
    format!("{} {}", v.join(", "), unit.symbol())
}

/// The tolerance class of a set snapshot's grade as the budget knows it (none when it cannot
/// be read, or for a grade whose limits tiltbook does not carry).
pub fn grade_of(snap: &BlockSetSnapshot) -> Option<Grade> {
    if let Ok(g) = snap.grade.parse::<crate::blocks::Grade>() {
        return g.tolerance_class();
    }
    let g = snap.grade.trim();
    let g = g
        .strip_prefix("ISO ")
        .or_else(|| g.strip_prefix("ASME "))
        .unwrap_or(g);
    g.parse::<Grade>().ok()
}

/// The set a fixture is likely to be used with: the set this attempt chose, else the one used
/// last on this job, else the first in-date set in the job's unit (the first set at all when
/// none is).
pub fn likely_set<'a>(
    shop: &'a ShopView,
    chosen: Option<&str>,
    used: Option<&str>,
    unit: Unit,
    today: Date,
) -> Option<&'a SetView> {
    chosen
        .and_then(|id| shop.set(id))
        .or_else(|| used.and_then(|id| shop.set(id)))
        .or_else(|| {
            shop.sets
                .iter()
                .find(|s| s.snap.unit == unit && !out_of_date(s.snap.due, today))
        })
        .or(shop.sets.first())
}

/// The tolerance class of a set's grade (none for a grade whose limits tiltbook does not carry).
pub fn set_grade(set: &SetView) -> Option<Grade> {
    set.set.grade.and_then(|g| g.tolerance_class())
}

/// The set of a snapshot id in the shop, for the solver.
pub fn set_for<'a>(shop: &'a ShopView, id: &str) -> Option<&'a SetView> {
    shop.set(id)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tui::shop_view::ShopView;
    fn demo_shop(_: Date) -> ShopView {
        ShopView::from_shop(&crate::shop::Shop::built_in())
    }

    fn id(shop: &ShopView, o: &FixtureOption) -> String {
        shop.fixtures[o.index].id.clone()
    }

    fn plain(deg: f64, today: Date) -> RankFor {
        RankFor {
            kind: FeatureKind::Plain,
            setting: Angle::from_deg(deg),
            step: Length::inches(0.0001),
            unit: Unit::In,
            today,
            grade: Some(Grade::Zero),
        }
    }

    #[test]
    fn out_of_date_fixtures_go_after_the_ones_in_date() {
        // the demo shop's SB5-117 is due 2027-03-16: out of date on 2027-03-20
        let today = jiff::civil::date(2027, 3, 20);
        let shop = demo_shop(today);
        let r = rank_fixtures(&shop, &plain(30.0, today), None);
        assert_eq!(r.len(), shop.fixtures.len());
        assert!(r[0].reachable && !r[0].out_of_date);
        let bar = r.iter().position(|o| id(&shop, o) == "SB5-117").unwrap();
        assert!(r[bar].out_of_date && r[bar].reachable);
        assert!(r[bar].warnings.iter().any(|w| w.contains("needs a reason")));
        let first_stale = r.iter().position(|o| o.out_of_date).unwrap();
        assert!(
            r[..first_stale]
                .iter()
                .all(|o| o.reachable && !o.out_of_date)
        );
    }

    #[test]
    fn the_estimate_follows_the_likely_sets_grade() {
        // the demo shop's inch set BX81-A is ASME AS-1, tolerance class 1 (ASME B89.1.9 / ISO
        // 3650 grade table in standards.md): its limits are wider than grade 0's, so U grows
        let today = jiff::civil::date(2026, 12, 1);
        let shop = demo_shop(today);
        let set = likely_set(&shop, None, None, Unit::In, today).unwrap();
        assert_eq!(set.snap.id, "BX81-A");
        assert_eq!(set_grade(set), Some(Grade::One));
        let zero = rank_fixtures(&shop, &plain(30.0, today), None);
        let one = rank_fixtures(
            &shop,
            &RankFor {
                grade: Some(Grade::One),
                ..plain(30.0, today)
            },
            None,
        );
        let u = |r: &[FixtureOption]| {
            r.iter()
                .find(|o| id(&shop, o) == "SB5-117")
                .and_then(|o| o.u)
                .unwrap()
                .arcsec()
        };
        assert!(u(&one) > u(&zero), "{} {}", u(&one), u(&zero));
        // and a set chosen already wins over the likely one
        let metric = likely_set(&shop, Some("BX88-B"), Some("BX81-A"), Unit::In, today).unwrap();
        assert_eq!(metric.snap.id, "BX88-B");
    }

    #[test]
    fn an_angle_above_the_rating_is_not_reachable() {
        let today = jiff::civil::date(2026, 12, 1);
        let shop = demo_shop(today);
        let r = rank_fixtures(&shop, &plain(70.0, today), None);
        let bar = r.iter().find(|o| id(&shop, o) == "SB5-117").unwrap();
        assert!(!bar.reachable);
        assert!(bar.why_not.as_deref().unwrap_or("").contains("rated only"));
    }

    #[test]
    fn rounding_error_is_small_at_thirty_degrees_on_five_inches() {
        // H = 5.00002 in · sin 30° = 2.50001 in rounds to 2.5000 in; the angle error is
        // −0.00001/(5·cos 30°) rad ≈ −0.48" (DOMAIN: dθ = dH/(C cos θ))
        let today = jiff::civil::date(2026, 12, 1);
        let shop = demo_shop(today);
        let r = rank_fixtures(&shop, &plain(30.0, today), None);
        let bar = r.iter().find(|o| id(&shop, o) == "SB5-117").unwrap();
        assert_eq!(bar.height, Some(Length::inches(2.5)));
        let e = bar.error.unwrap().arcsec();
        let expect = -(0.00001f64 / (5.00002 * 30f64.to_radians().cos())).to_degrees() * 3600.0;
        assert!((e - expect).abs() < 0.01, "{e} vs {expect}");
    }

    #[test]
    fn a_fixture_whose_height_the_set_cannot_make_goes_after_those_it_can() {
        // 1°10': sin = 0.0203610 (from memory; the heights below are the code's own, rounded to
        // 0.0001 in). On the 5 in bar SB5-117 that is 0.1018 in, which the 81-piece set cannot
        // make in one stack: a last digit of 8 takes the 0.1008 block, leaving 0.0010 in, which
        // no block makes. On the 10 in plate SP10-042 it is 0.2036 in = 0.1006 + 0.103.
        // (Series of the 81-piece set: 0.1001-0.1009, 0.101-0.149, 0.050-0.950, 1-4 in; from
        // memory.)
        let today = jiff::civil::date(2026, 12, 1);
        let shop = demo_shop(today);
        let set = likely_set(&shop, None, None, Unit::In, today).unwrap();
        let solver = Solver::new(&set.set).unwrap();
        let likely = LikelySet {
            id: &set.snap.id,
            solver: &solver,
        };
        let r = rank_fixtures(&shop, &plain(1.0 + 10.0 / 60.0, today), Some(likely));
        let at = |name: &str| r.iter().position(|o| id(&shop, o) == name).unwrap();
        let (bar, plate) = (&r[at("SB5-117")], &r[at("SP10-042")]);
        assert_eq!(bar.height, Some(Length::inches(0.1018)));
        assert_eq!(plate.height, Some(Length::inches(0.2036)));
        assert!(bar.reachable && !bar.buildable, "{bar:?}");
        assert!(plate.reachable && plate.buildable, "{plate:?}");
        assert!(at("SP10-042") < at("SB5-117"), "{r:#?}");
        assert!(
            bar.warnings
                .iter()
                .any(|w| w.contains("no single stack of 0.1018 in") && w.contains("BX81-A")),
            "{:?}",
            bar.warnings
        );
        // without a set to check against, nothing is marked
        let plain_rank = rank_fixtures(&shop, &plain(1.0 + 10.0 / 60.0, today), None);
        assert!(plain_rank.iter().all(|o| o.buildable));
    }
}
