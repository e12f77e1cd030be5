//! One angle on a sine fixture, or a taper's half angle on sine centres: the single stack, or
//! for a small angle the remedies side by side ([`super::remedy`]).

use super::super::{CliError, emit, usage};
use super::common::{
    Chosen, Equipment, FixtureChoice, candidates, equipment, fixture_warnings, kind_warning,
};
use super::remedy;
use super::show::{
    CAUTION, blocks_json, closing, num, round_deg, round2, row, secs, single_heading, stack_json,
    stack_text, unmet, worn_note,
};
use super::{RemedyChoice, StackArgs};
use crate::blocks::small::{SmallAngle, poor_reason, remedies};
use crate::blocks::{SolveError, Stack};
use crate::geometry::{SetupAdvice, SetupPlan, SineFixture, Taper, plan};
use crate::shop::FixtureKind;
use crate::units::{Angle, Length, Unit};
use serde_json::{Value, json};
use std::io::Write;
use std::process::ExitCode;

/// The fixtures a plain angle is set on.
pub const ANGLE_KINDS: [FixtureKind; 3] = [
    FixtureKind::SineBar,
    FixtureKind::SinePlate,
    FixtureKind::SineVise,
];

/// The fixtures a taper is set on.
pub const TAPER_KINDS: [FixtureKind; 1] = [FixtureKind::SineCentres];

/// What was asked: an angle, or a taper (whose half angle is the setting).
pub struct Asked {
    pub setting: Angle,
    pub taper: Option<(String, Taper)>,
}

fn asked(args: &StackArgs) -> Result<Asked, CliError> {
    if let Some(t) = &args.taper {
        let taper = Taper::parse(t).map_err(|e| usage(format!("--taper: {e}")))?;
        return Ok(Asked {
            setting: taper.setting(),
            taper: Some((t.trim().to_string(), taper)),
        });
    }
    let Some(angle_text) = &args.angle else {
        return Err(usage(
            "give an angle, e.g. `tiltbook stack 30 --center 5in`, a taper, e.g. `tiltbook stack --taper 1:20 --center 100mm`, a compound angle, e.g. `tiltbook stack --compound 30,20 --center 5in`, or a height with a set, e.g. `tiltbook stack --height 1.6428in --set inch-81`",
        ));
    };
    Ok(Asked {
        setting: Angle::parse(angle_text).map_err(usage)?,
        taper: None,
    })
}

/// Everything the report shows.
pub struct Ctx<'a> {
    pub asked: &'a Asked,
    pub advice: &'a SetupAdvice,
    pub unit: Unit,
    pub step: Length,
    pub fx: &'a FixtureChoice,
    pub chosen: Option<&'a Chosen>,
    pub stack: Option<&'a Stack>,
    pub complement_stack: Option<&'a Stack>,
    pub small: Option<&'a SmallAngle>,
    pub warnings: &'a [String],
}

pub fn run(args: &StackArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let asked = asked(args)?;
    let angle = asked.setting;
    SineFixture::check_angle(angle).map_err(usage)?;
    let Equipment {
        shop,
        fx,
        chosen,
        unit,
        step,
    } = equipment(args)?;
    let largest = fx.fixture.as_ref().map(|f| f.largest_stack);
    let advice = plan(&fx.sine, angle, step, largest, unit).map_err(usage)?;
    let kinds: &[FixtureKind] = if asked.taper.is_some() {
        &TAPER_KINDS
    } else {
        &ANGLE_KINDS
    };
    let mut warnings = advice.warnings.clone();
    if let Some(f) = &fx.fixture {
        warnings.extend(fixture_warnings(f, angle));
        if asked.taper.is_some() {
            warnings.extend(kind_warning(f, kinds, "a taper"));
        }
    }
    let mut stack = None;
    let mut complement_stack = None;
    let mut small = None;
    if let (Some(c), Some(shop)) = (&chosen, &shop) {
        warnings.extend(c.notes.iter().cloned());
        let direct = c.solver.solve(advice.direct.height);
        let wanted = match (&direct, args.remedy) {
            (Ok(_), RemedyChoice::Best | RemedyChoice::Single) => None,
            (Ok(_), r) => Some(format!(
                "asked for with --remedy {}",
                remedy::choice_words(r)
            )),
            (
                Err(
                    e @ (SolveError::BelowSmallest { .. }
                    | SolveError::Gap { .. }
                    | SolveError::OffStep { .. }),
                ),
                _,
            ) => Some(poor_reason(
                e,
                Angle::from_deg(advice.direct.sensitivity.deg() / 2.0),
            )),
            (Err(SolveError::NotPositive { .. }), _) => {
                return Err(CliError::Unmet(format!(
                    "at {} the stack height rounds to zero on this fixture: it rests flat on the surface plate with no stack, {} from the angle; no stack is built",
                    angle.dms(1),
                    secs(advice.direct.error)
                )));
            }
            (Err(e), _) => return Err(unmet(e, &c.set, Some((angle, &fx.sine)))),
        };
        match wanted {
            None => {
                let s = direct.map_err(|e| unmet(&e, &c.set, Some((angle, &fx.sine))))?;
                if let Some(w) = worn_note(&[&s], unit) {
                    warnings.push(w);
                }
                stack = Some(s);
                if let Some(comp) = &advice.complement {
                    complement_stack = c.solver.solve(comp.height).ok();
                }
            }
            Some(reason) => {
                let cands = candidates(shop, kinds, fx.fixture.as_ref(), angle);
                let mut sa = remedies(&c.solver, &fx.sine, angle, largest, &cands, reason);
                remedy::pick(&mut sa, args.remedy, unit)?;
                if let (Some(f), crate::blocks::small::Remedy::TwoStacks) = (&fx.fixture, sa.chosen)
                    && f.kind != FixtureKind::SineBar
                {
                    warnings.push(format!(
                        "two stacks need both rolls free to stand on a stack: fixture {} is a {}; if its pivot is a hinge, use --remedy longer",
                        f.id, f.kind
                    ));
                }
                warnings.extend(remedy::warnings(&sa, unit));
                small = Some(sa);
            }
        }
    }
    let ctx = Ctx {
        asked: &asked,
        advice: &advice,
        unit,
        step,
        fx: &fx,
        chosen: chosen.as_ref(),
        stack: stack.as_ref(),
        complement_stack: complement_stack.as_ref(),
        small: small.as_ref(),
        warnings: &warnings,
    };
    if args.json {
        emit(out, &format!("{:#}\n", ctx.json()))?;
    } else {
        emit(out, &ctx.text())?;
    }
    Ok(ExitCode::SUCCESS)
}

impl Ctx<'_> {
    fn plan_json(&self, p: &SetupPlan, stack: Option<&Stack>) -> Value {
        let u = self.unit;
        json!({
            "setting_deg": round_deg(p.setting),
            "ideal_height": p.ideal_height.exact_number(u, u.places()),
            "height": num(p.height, u),
            "achieved_deg": round_deg(p.achieved),
            "error_arcsec": round2(p.error.arcsec()),
            "sensitivity_arcsec_per_step": round2(p.sensitivity.arcsec()),
            "blocks": stack.map(|s| blocks_json(s, u)),
            "block_count": stack.map(|s| s.block_count()),
        })
    }

    /// The role of the single stack, in words.
    pub fn raised_role(&self) -> &'static str {
        if self.asked.taper.is_some() {
            "under the raised roll of the sine centres"
        } else {
            "under the raised roll"
        }
    }

    fn json(&self) -> Value {
        let u = self.unit;
        let d = &self.advice.direct;
        let blocks = self.stack.map(|s| blocks_json(s, u));
        let mut v = json!({
            "angle_deg": round_deg(self.advice.nominal),
            "ideal_height": d.ideal_height.exact_number(u, u.places()),
            "height": num(d.height, u),
            "unit": u.symbol(),
            "achieved_deg": round_deg(d.achieved),
            "error_arcsec": round2(d.error.arcsec()),
            "sensitivity_arcsec_per_step": round2(d.sensitivity.arcsec()),
            "step": num(self.step, u),
            "warnings": self.warnings,
            "blocks": blocks,
            "block_count": self.stack.map(|s| s.block_count()),
            "set": self.chosen.map(|c| c.set.id.clone()),
            "protect": self.chosen.is_some_and(|c| c.solver.protected()),
            "worn_blocks": self.stack.map(|s| s.worn().iter().map(|w| num(*w, u)).collect::<Vec<_>>()),
            "fixture": self.fx.fixture.as_ref().map(|f| f.id.clone()),
            "center": num(self.fx.sine.center, u),
            "stacks": [stack_json(self.raised_role(), d.height, self.stack, Some(d.setting), u)],
            "complement": self.advice.complement.as_ref().map(|c| self.plan_json(c, self.complement_stack)),
            "setup": "one stack",
            "small_angle": Value::Null,
            "taper": Value::Null,
            "half_angle_deg": Value::Null,
            "included_angle_deg": Value::Null,
            "true_slope_deg": Value::Null,
            "view_angles_deg": Value::Null,
            "plane_error_arcsec": Value::Null,
            "caution": CAUTION,
        });
        if let Some((text, t)) = &self.asked.taper {
            v["taper"] = json!({
                "spec": text,
                "half_angle_deg": round_deg(t.setting()),
                "included_angle_deg": round_deg(t.included()),
            });
            v["half_angle_deg"] = json!(round_deg(t.setting()));
            v["included_angle_deg"] = json!(round_deg(t.included()));
        }
        if let Some(sa) = self.small {
            remedy::fill_json(&mut v, sa, self);
        }
        v
    }

    /// The first lines: what is set, on what.
    pub fn header(&self) -> String {
        let u = self.unit;
        let a = self.advice;
        let mut t = String::new();
        if let Some((text, taper)) = &self.asked.taper {
            t.push_str(&format!(
                "Taper {text} on sine centres: set the half angle {}; included angle {}\n",
                taper.setting(),
                taper.included()
            ));
        }
        let on = match &self.fx.fixture {
            Some(f) => format!("fixture {}", f.describe()),
            None => format!("a centre distance of {} {u}", num(self.fx.sine.center, u)),
        };
        t.push_str(&format!("Sine setup for {} on {on}\n", a.nominal));
        t
    }

    fn text(&self) -> String {
        if let Some(sa) = self.small {
            return remedy::text(sa, self);
        }
        let u = self.unit;
        let a = self.advice;
        let d = &a.direct;
        let mut t = self.header();
        let step = format!("{} {u}", num(self.step, u));
        t.push_str(&row(
            "ideal height",
            format!("{} {u}", d.ideal_height.number(u, u.places() + 2)),
        ));
        t.push_str(&row("stack height", format!("{} {u}", num(d.height, u))));
        t.push_str(&row("achieved angle", d.achieved));
        t.push_str(&row("error", secs(d.error)));
        t.push_str(&row(
            "sensitivity",
            format!("{:.2}\" per {step} of stack", d.sensitivity.arcsec()),
        ));
        if let Some(c) = &a.complement {
            t.push_str(&format!(
                "\nSteep angle: the complement setup (set {}, turn the work on an angle plate), side by side:\n",
                c.setting.dms(0)
            ));
            let (x, y) = (
                format!("direct {}", d.setting.dm()),
                format!("complement {}", c.setting.dm()),
            );
            t.push_str(&format!("  {:<16}{x:<22}{y}\n", ""));
            let pair = |label: &str, x: String, y: String| format!("  {label:<16}{x:<22}{y}\n");
            t.push_str(&pair(
                "stack height",
                format!("{} {u}", num(d.height, u)),
                format!("{} {u}", num(c.height, u)),
            ));
            t.push_str(&pair("error", secs(d.error), secs(c.error)));
            t.push_str(&pair(
                "per step",
                format!("{:.2}\"", d.sensitivity.arcsec()),
                format!("{:.2}\"", c.sensitivity.arcsec()),
            ));
            if self.chosen.is_some() {
                let count = |s: Option<&Stack>| {
                    s.map(|s| s.block_count().to_string())
                        .unwrap_or_else(|| "cannot build".into())
                };
                t.push_str(&pair(
                    "blocks",
                    count(self.stack),
                    count(self.complement_stack),
                ));
            }
        }
        if let (Some(s), Some(c)) = (self.stack, self.chosen) {
            t.push('\n');
            let heading = if self.asked.taper.is_some() {
                format!(
                    "Stack under the raised roll of the sine centres, from {}, wring bottom to top:",
                    super::show::set_words(c)
                )
            } else {
                single_heading(c)
            };
            t.push_str(&stack_text(s, u, &heading));
        }
        t.push_str(&closing(self.warnings));
        t
    }
}
