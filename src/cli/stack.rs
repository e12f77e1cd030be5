//! `tiltbook stack`: the stack height for an angle on a sine fixture, rounded to what a block
//! set can make, and (with `--set`) the blocks themselves in wringing order; or the stack for a
//! plain height (`--height`).

use super::center::{parse_rolls, unit_of};
use super::{CliError, emit, usage};
use crate::blocks::{BlockSet, SolveError, Solver, Stack};
use crate::geometry::{SetupAdvice, SetupPlan, SineFixture, plan};
use crate::shop::{Fixture, SetOrigin, Shop};
use crate::units::{Angle, Length, Unit};
use clap::Args;
use serde_json::{Value, json};
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

/// The caution printed with every setup.
pub const CAUTION: &str = "Caution: clamp the work against the fixture's stop, never cut on an unsecured stack, and wear eye protection; the shop's own rules and local codes come first.";

#[derive(Debug, Args)]
#[command(after_help = "Examples:\n  \
tiltbook stack 30 --center 5in\n  \
tiltbook stack 34d25m --center 5in --set inch-81\n  \
tiltbook stack 12.5 --fixture SB100-203 --set BX88-B --protect\n  \
tiltbook stack --height 1.6428in --set inch-81 --json\n\n\
--set takes a set id from the shop file (`tiltbook shop` lists them) or a complete standard set: \
inch-81, metric-88, metric-112.")]
pub struct StackArgs {
    /// The angle to set, from the surface plate: 30, 30.25, 30d15m, 30°15'20"
    #[arg(allow_negative_numbers = true)]
    pub angle: Option<String>,
    /// Build a stack for this height instead of an angle (needs --set), e.g. 1.6428in
    #[arg(long, value_name = "LENGTH", conflicts_with_all = ["angle", "center", "fixture", "rolls"])]
    pub height: Option<String>,
    /// Centre distance of the fixture, e.g. 5in or 100mm
    #[arg(long, value_name = "LENGTH", conflicts_with = "fixture")]
    pub center: Option<String>,
    /// Roll diameters, pivot first, e.g. 0.75in,0.7498in (with --center; default: equal rolls)
    #[arg(long, value_name = "PIVOT,RAISED", requires = "center")]
    pub rolls: Option<String>,
    /// A fixture from the shop file, by id (`tiltbook shop` lists them)
    #[arg(long, value_name = "ID")]
    pub fixture: Option<String>,
    /// Build the stack from this block set (a shop set id, or inch-81, metric-88, metric-112)
    #[arg(long, value_name = "ID")]
    pub set: Option<String>,
    /// Put the set's protector blocks on both ends of the stack (they count in the height)
    #[arg(long, requires = "set")]
    pub protect: bool,
    /// The shop file to use instead of the usual one
    #[arg(long, value_name = "FILE")]
    pub shop: Option<PathBuf>,
    /// Print JSON instead of text
    #[arg(long)]
    pub json: bool,
}

/// The set chosen with `--set`, its solver, and notes about it.
struct Chosen {
    set: BlockSet,
    origin: SetOrigin,
    solver: Solver,
    notes: Vec<String>,
}

fn load_shop(args: &StackArgs) -> Result<Shop, CliError> {
    Shop::load(args.shop.as_deref()).map_err(|e| CliError::Usage(e.to_string()))
}

fn choose_set(shop: &Shop, id: &str, protect: bool) -> Result<Chosen, CliError> {
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

fn num(l: Length, unit: Unit) -> String {
    l.exact_number(unit, unit.places())
}

fn round2(v: f64) -> f64 {
    (v * 100.0).round() / 100.0
}

fn round_deg(a: Angle) -> f64 {
    (a.deg() * 1e9).round() / 1e9
}

fn blocks_json(stack: &Stack, unit: Unit) -> Vec<String> {
    stack.sizes().iter().map(|b| num(*b, unit)).collect()
}

/// The text listing of a stack, bottom to top.
fn stack_text(stack: &Stack, chosen: &Chosen) -> String {
    let unit = chosen.set.unit;
    let from = match chosen.origin {
        SetOrigin::Shop => format!("set {}", chosen.set.describe()),
        SetOrigin::Catalogue => format!("set {} (complete standard set)", chosen.set.id),
    };
    let mut t = format!("Stack from {from}, wring bottom to top:\n");
    let n = stack.blocks.len();
    for (i, b) in stack.blocks.iter().enumerate() {
        let mut tags = Vec::new();
        if i == 0 {
            tags.push("bottom");
        }
        if i + 1 == n && n > 1 {
            tags.push("top");
        }
        if b.protector {
            tags.push("protector");
        }
        if b.worn {
            tags.push("worn");
        }
        let tags = if tags.is_empty() {
            String::new()
        } else {
            format!("   ({})", tags.join(", "))
        };
        t.push_str(&format!(
            "  {:>2}. {:>10} {}{tags}\n",
            i + 1,
            num(b.size, unit),
            unit
        ));
    }
    t.push_str(&format!(
        "  total {} {unit}, {} block{}\n",
        num(stack.height, unit),
        n,
        if n == 1 { "" } else { "s" }
    ));
    t
}

fn worn_note(stack: &Stack, unit: Unit) -> Option<String> {
    let worn = stack.worn();
    (!worn.is_empty()).then(|| {
        format!(
            "the stack uses worn block(s) {}: no stack of {} blocks avoids them; check them before wringing",
            worn.iter()
                .map(|w| format!("{} {unit}", num(*w, unit)))
                .collect::<Vec<_>>()
                .join(", "),
            stack.block_count()
        )
    })
}

/// The exit-1 message for a height the set cannot make; with an angle, what each nearest gives.
fn unmet(e: &SolveError, set: &BlockSet, angle: Option<(Angle, &SineFixture)>) -> CliError {
    let unit = set.unit;
    let mut m = format!("cannot build the stack from set {}: {}", set.id, e.reason());
    if let Some(n) = e.nearest() {
        let mut lines = Vec::new();
        for (word, l) in [("below", n.below), ("above", n.above)] {
            let Some(l) = l else { continue };
            let mut line = format!("\n  nearest buildable {word}: {} {unit}", num(l, unit));
            if let Some((nominal, fx)) = angle
                && let Ok(a) = fx.angle_for_height(l)
            {
                line.push_str(&format!(
                    " (gives {}, error {:+.2}\")",
                    a.dms(1),
                    (a - nominal).arcsec()
                ));
            }
            lines.push(line);
        }
        if lines.is_empty() {
            m.push_str("\n  no buildable height is near it");
        }
        for l in lines {
            m.push_str(&l);
        }
    }
    if matches!(e, SolveError::BelowSmallest { .. }) && angle.is_some() {
        m.push_str("\n  for a small angle: put a stack under each roll so that their difference is the height, or use a longer fixture");
    }
    CliError::Unmet(m)
}

pub fn run(args: &StackArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    if let Some(h) = &args.height {
        return run_height(args, h, out);
    }
    let Some(angle_text) = &args.angle else {
        return Err(usage(
            "give an angle, e.g. `tiltbook stack 30 --center 5in`, or a height with a set, e.g. `tiltbook stack --height 1.6428in --set inch-81`",
        ));
    };
    let angle = Angle::parse(angle_text).map_err(usage)?;
    SineFixture::check_angle(angle).map_err(usage)?;
    let needs_shop = args.fixture.is_some() || args.set.is_some();
    let shop = if needs_shop {
        Some(load_shop(args)?)
    } else {
        None
    };
    let fixture: Option<Fixture> = match (&args.fixture, &shop) {
        (Some(id), Some(shop)) => Some(shop.fixture(id).cloned().ok_or_else(|| {
            usage(format!(
                "there is no fixture '{id}' in {}; use one of: {}",
                shop.source,
                shop.fixtures
                    .iter()
                    .map(|f| f.id.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            ))
        })?),
        _ => None,
    };
    let (sine, fixture_unit) = match (&fixture, &args.center) {
        (Some(f), _) => (f.sine(), f.unit),
        (None, Some(c)) => {
            let unit = unit_of(c);
            let center =
                Length::parse_positive(c, unit).map_err(|e| usage(format!("--center: {e}")))?;
            let (p, r) = match &args.rolls {
                Some(r) => parse_rolls(r)?,
                None => (Length::ZERO, Length::ZERO),
            };
            (
                SineFixture {
                    center,
                    pivot_roll: p,
                    raised_roll: r,
                },
                unit,
            )
        }
        (None, None) => {
            return Err(usage(
                "give the fixture: --center LENGTH (e.g. --center 5in) or --fixture ID from the shop file",
            ));
        }
    };
    let chosen = match (&args.set, &shop) {
        (Some(id), Some(shop)) => Some(choose_set(shop, id, args.protect)?),
        _ => None,
    };
    let unit = chosen.as_ref().map(|c| c.set.unit).unwrap_or(fixture_unit);
    let step = match &chosen {
        Some(c) => c.set.resolution(),
        None => Length::from_nm(match unit {
            Unit::In => Unit::In.nm() / 10_000,
            Unit::Mm => Unit::Mm.nm() / 1000,
        }),
    };
    let largest = fixture.as_ref().map(|f| f.largest_stack);
    let advice = plan(&sine, angle, step, largest, unit).map_err(usage)?;
    let mut warnings = advice.warnings.clone();
    if let Some(f) = &fixture {
        if !f.rated_for(angle) {
            warnings.push(format!(
                "{} is outside the angles fixture {} is rated for ({} to {}); use another fixture",
                angle.dm(),
                f.id,
                f.angle_range.0.dm(),
                f.angle_range.1.dm()
            ));
        }
        if f.calibration_overdue(jiff::Zoned::now().date()) {
            warnings.push(format!(
                "fixture {} was due for calibration on {}; have it calibrated, or note why it is used",
                f.id,
                f.calibration_due.map(|d| d.to_string()).unwrap_or_default()
            ));
        }
    }
    let mut stack = None;
    let mut complement_stack = None;
    if let Some(c) = &chosen {
        warnings.extend(c.notes.iter().cloned());
        let s = c
            .solver
            .solve(advice.direct.height)
            .map_err(|e| unmet(&e, &c.set, Some((angle, &sine))))?;
        if let Some(w) = worn_note(&s, unit) {
            warnings.push(w);
        }
        stack = Some(s);
        if let Some(comp) = &advice.complement {
            complement_stack = c.solver.solve(comp.height).ok();
        }
    }
    let ctx = Ctx {
        advice: &advice,
        unit,
        sine: &sine,
        fixture: fixture.as_ref(),
        chosen: chosen.as_ref(),
        stack: stack.as_ref(),
        complement_stack: complement_stack.as_ref(),
        warnings: &warnings,
    };
    if args.json {
        emit(out, &format!("{:#}\n", ctx.json()))?;
    } else {
        emit(out, &ctx.text())?;
    }
    Ok(ExitCode::SUCCESS)
}

struct Ctx<'a> {
    advice: &'a SetupAdvice,
    unit: Unit,
    sine: &'a SineFixture,
    fixture: Option<&'a Fixture>,
    chosen: Option<&'a Chosen>,
    stack: Option<&'a Stack>,
    complement_stack: Option<&'a Stack>,
    warnings: &'a [String],
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

    fn json(&self) -> Value {
        let u = self.unit;
        let d = &self.advice.direct;
        let blocks = self.stack.map(|s| blocks_json(s, u));
        json!({
            "angle_deg": round_deg(self.advice.nominal),
            "ideal_height": d.ideal_height.exact_number(u, u.places()),
            "height": num(d.height, u),
            "unit": u.symbol(),
            "achieved_deg": round_deg(d.achieved),
            "error_arcsec": round2(d.error.arcsec()),
            "sensitivity_arcsec_per_step": round2(d.sensitivity.arcsec()),
            "step": num(self.step(), u),
            "warnings": self.warnings,
            "blocks": blocks,
            "block_count": self.stack.map(|s| s.block_count()),
            "set": self.chosen.map(|c| c.set.id.clone()),
            "protect": self.chosen.is_some_and(|c| c.solver.protected()),
            "worn_blocks": self.stack.map(|s| s.worn().iter().map(|w| num(*w, u)).collect::<Vec<_>>()),
            "fixture": self.fixture.map(|f| f.id.clone()),
            "center": num(self.sine.center, u),
            "stacks": [{
                "role": "under the raised roll",
                "height": num(d.height, u),
                "blocks": blocks,
                "block_count": self.stack.map(|s| s.block_count()),
                "setting_deg": round_deg(d.setting),
            }],
            "complement": self.advice.complement.as_ref().map(|c| self.plan_json(c, self.complement_stack)),
            "caution": CAUTION,
        })
    }

    fn step(&self) -> Length {
        match self.chosen {
            Some(c) => c.set.resolution(),
            None => Length::from_nm(match self.unit {
                Unit::In => Unit::In.nm() / 10_000,
                Unit::Mm => Unit::Mm.nm() / 1000,
            }),
        }
    }

    fn text(&self) -> String {
        let u = self.unit;
        let a = self.advice;
        let d = &a.direct;
        let on = match self.fixture {
            Some(f) => format!("fixture {}", f.describe()),
            None => format!("a centre distance of {} {u}", num(self.sine.center, u)),
        };
        let mut t = format!("Sine setup for {} on {on}\n", a.nominal);
        let step = format!("{} {u}", num(self.step(), u));
        let row = |label: &str, v: String| format!("  {label:<16}{v}\n");
        t.push_str(&row(
            "ideal height",
            format!("{} {u}", d.ideal_height.number(u, u.places() + 2)),
        ));
        t.push_str(&row("stack height", format!("{} {u}", num(d.height, u))));
        t.push_str(&row("achieved angle", d.achieved.to_string()));
        t.push_str(&row("error", format!("{:+.2}\"", d.error.arcsec())));
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
            t.push_str(&pair(
                "error",
                format!("{:+.2}\"", d.error.arcsec()),
                format!("{:+.2}\"", c.error.arcsec()),
            ));
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
            t.push_str(&stack_text(s, c));
        }
        for w in self.warnings {
            t.push_str(&format!("warning: {w}\n"));
        }
        t.push('\n');
        t.push_str(CAUTION);
        t.push('\n');
        t
    }
}

fn run_height(args: &StackArgs, text: &str, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let Some(id) = &args.set else {
        return Err(usage(format!(
            "--height needs a set to build from: add --set ID, e.g. `tiltbook stack --height {text} --set inch-81`"
        )));
    };
    let shop = load_shop(args)?;
    let chosen = choose_set(&shop, id, args.protect)?;
    let unit = chosen.set.unit;
    let height = Length::parse_positive(text, unit).map_err(|e| usage(format!("--height: {e}")))?;
    let stack = chosen
        .solver
        .solve(height)
        .map_err(|e| unmet(&e, &chosen.set, None))?;
    let mut warnings = chosen.notes.clone();
    if let Some(w) = worn_note(&stack, unit) {
        warnings.push(w);
    }
    if args.json {
        let blocks = blocks_json(&stack, unit);
        let v = json!({
            "angle_deg": Value::Null,
            "ideal_height": num(height, unit),
            "height": num(stack.height, unit),
            "unit": unit.symbol(),
            "achieved_deg": Value::Null,
            "error_arcsec": Value::Null,
            "sensitivity_arcsec_per_step": Value::Null,
            "step": num(chosen.set.resolution(), unit),
            "warnings": warnings,
            "blocks": blocks,
            "block_count": stack.block_count(),
            "set": chosen.set.id,
            "protect": chosen.solver.protected(),
            "worn_blocks": stack.worn().iter().map(|w| num(*w, unit)).collect::<Vec<_>>(),
            "fixture": Value::Null,
            "center": Value::Null,
            "stacks": [{
                "role": "stack for the given height",
                "height": num(stack.height, unit),
                "blocks": blocks,
                "block_count": stack.block_count(),
                "setting_deg": Value::Null,
            }],
            "complement": Value::Null,
            "caution": CAUTION,
        });
        emit(out, &format!("{v:#}\n"))?;
    } else {
        let mut t = format!("Stack height {} {unit}\n", num(height, unit));
        t.push_str(&stack_text(&stack, &chosen));
        for w in &warnings {
            t.push_str(&format!("warning: {w}\n"));
        }
        t.push('\n');
        t.push_str(CAUTION);
        t.push('\n');
        emit(out, &t)?;
    }
    Ok(ExitCode::SUCCESS)
}
