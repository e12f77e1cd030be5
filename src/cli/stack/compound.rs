//! `tiltbook stack --compound A,B`: the two stacks of a compound sine plate. The upper plate
//! (nearer the part) is set to A exactly, the lower plate to atan(tan B · cos A); both stacks
//! come from one set with no block in both.

use super::super::{CliError, emit, usage};
use super::StackArgs;
use super::common::{Equipment, equipment, fixture_warnings, kind_warning};
use super::show::{
    CAUTION, closing, num, round_deg, round2, row, secs, set_words, stack_json, stack_text,
    worn_note,
};
use crate::blocks::plates::{angle_between_planes, compound_stacks, views_for_plates};
use crate::blocks::{SolveError, Stack};
use crate::geometry::{STEEP_FROM_DEG, compound, true_slope};
use crate::shop::FixtureKind;
use crate::units::{Angle, Length};
use serde_json::{Value, json};
use std::io::Write;
use std::process::ExitCode;

/// The role words of the two stacks.
const NEAR_ROLE: &str = "under the upper plate (nearer the part)";
const OTHER_ROLE: &str = "under the lower plate";

/// Parse `A,B` (two view slopes, the near plate's first).
fn views(text: &str) -> Result<(Angle, Angle), CliError> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let [a, b] = parts.as_slice() else {
        return Err(usage(format!(
            "--compound '{text}' should be two view slopes separated by a comma, the upper (near) plate's first, e.g. --compound 30,20 or --compound 47d14m,38d10m"
        )));
    };
    let a = Angle::parse(a).map_err(|e| usage(format!("--compound: {e}")))?;
    let b = Angle::parse(b).map_err(|e| usage(format!("--compound: {e}")))?;
    Ok((a, b))
}

/// One plate: the angle it is set to, the exact and the built height, what it gives.
struct Plate {
    setting: Angle,
    ideal: Length,
    height: Length,
    achieved: Angle,
    stack: Option<Stack>,
}

pub fn run(args: &StackArgs, text: &str, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let (a, b) = views(text)?;
    let setting = compound(a, b).map_err(|e| usage(format!("--compound: {e}")))?;
    let Equipment {
        shop: _,
        fx,
        chosen,
        unit,
        step,
    } = equipment(args)?;
    let sine = fx.sine;
    let (near_ideal, other_ideal) = setting.heights(&sine, &sine).map_err(usage)?;
    let mut warnings = Vec::new();
    for (word, angle) in [("upper", setting.near), ("lower", setting.other)] {
        if angle.deg() >= STEEP_FROM_DEG {
            warnings.push(format!(
                "steep angle on the {word} plate ({}): each step of stack error costs more than at a low angle; check the stack twice",
                angle.dm()
            ));
        }
    }
    if let Some(f) = &fx.fixture {
        warnings.extend(kind_warning(
            f,
            &[FixtureKind::CompoundSinePlate],
            "a compound angle",
        ));
        let mut seen = Vec::new();
        for angle in [setting.near, setting.other] {
            for w in fixture_warnings(f, angle) {
                if !seen.contains(&w) {
                    seen.push(w);
                }
            }
        }
        warnings.extend(seen);
    }
    let (near, other, plane_error, views_achieved, left_off) = match &chosen {
        Some(c) => {
            warnings.extend(c.notes.iter().cloned());
            let cs = compound_stacks(&c.solver, &sine, &sine, &setting).map_err(|e| {
                let why = [near_ideal, other_ideal]
                    .iter()
                    .filter_map(|h| c.solver.solve(h.round_to(step)).err())
                    .map(|e: SolveError| e.to_string())
                    .collect::<Vec<_>>();
                CliError::Unmet(format!(
                    "cannot build the compound setup from set {}: {e}{}",
                    c.set.id,
                    if why.is_empty() {
                        String::new()
                    } else {
                        format!(" ({})", why.join("; "))
                    }
                ))
            })?;
            let plate = |s: Angle, ideal: Length, st: &Stack, ach: Angle| Plate {
                setting: s,
                ideal,
                height: st.height,
                achieved: ach,
                stack: Some(st.clone()),
            };
            (
                plate(setting.near, near_ideal, &cs.near, cs.achieved.0),
                plate(setting.other, other_ideal, &cs.other, cs.achieved.1),
                cs.plane_error,
                cs.views_achieved,
                cs.protectors_left_off,
            )
        }
        None => {
            let plate = |s: Angle, ideal: Length| -> Result<Plate, CliError> {
                let height = ideal.round_to(step);
                Ok(Plate {
                    setting: s,
                    ideal,
                    height,
                    achieved: sine.angle_for_height(height).map_err(usage)?,
                    stack: None,
                })
            };
            let n = plate(setting.near, near_ideal)?;
            let o = plate(setting.other, other_ideal)?;
            let v = views_for_plates(n.achieved, o.achieved);
            let e = angle_between_planes(v, (a, b));
            (n, o, e, v, false)
        }
    };
    if let Some(f) = &fx.fixture {
        for (word, p) in [("upper", &near), ("lower", &other)] {
            if p.height > f.largest_stack {
                warnings.push(format!(
                    "the {word} plate's stack {} is taller than this fixture takes ({})",
                    p.height.show(unit),
                    f.largest_stack.show(unit)
                ));
            }
        }
    }
    if let Some(c) = &chosen {
        for (word, p) in [("upper", &near), ("lower", &other)] {
            let rounded = p.ideal.round_to(step);
            if p.height == rounded {
                continue;
            }
            let why = match c.solver.solve(rounded) {
                Err(e) => e.reason(),
                Ok(_) => "the set cannot make it together with the other plate's stack".into(),
            };
            warnings.push(format!(
                "the {word} plate's stack is {}, not the rounded {}: {why}; that plate is off by {} (a longer compound plate, or a set with other blocks, does better)",
                p.height.show(unit),
                rounded.show(unit),
                secs(p.achieved - p.setting)
            ));
        }
    }
    if left_off {
        warnings.push(
            "protector blocks are left off: a set has one pair, and two stacks are wrung".into(),
        );
    }
    let stacks: Vec<&Stack> = [&near.stack, &other.stack].into_iter().flatten().collect();
    warnings.extend(worn_note(&stacks, unit));
    let achieved_slope = true_slope(views_achieved.0, views_achieved.1);
    let slope_error = achieved_slope - setting.true_slope;
    if args.json {
        let plate_json = |role: &str, p: &Plate| {
            let mut v = stack_json(role, p.height, p.stack.as_ref(), Some(p.setting), unit);
            v["ideal_height"] = json!(p.ideal.exact_number(unit, unit.places()));
            v["achieved_deg"] = json!(round_deg(p.achieved));
            v["error_arcsec"] = json!(round2((p.achieved - p.setting).arcsec()));
            v
        };
        let total = chosen
            .as_ref()
            .map(|_| stacks.iter().map(|s| s.block_count()).sum::<usize>());
        let v = json!({
            "angle_deg": round_deg(setting.true_slope),
            "ideal_height": Value::Null,
            "height": Value::Null,
            "unit": unit.symbol(),
            "achieved_deg": round_deg(achieved_slope),
            "error_arcsec": round2(slope_error.arcsec()),
            "sensitivity_arcsec_per_step": Value::Null,
            "step": num(step, unit),
            "warnings": warnings,
            "blocks": Value::Null,
            "block_count": total,
            "set": chosen.as_ref().map(|c| c.set.id.clone()),
            "protect": false,
            "worn_blocks": chosen.as_ref().map(|_| stacks.iter().flat_map(|s| s.worn()).map(|w| num(w, unit)).collect::<Vec<_>>()),
            "fixture": fx.fixture.as_ref().map(|f| f.id.clone()),
            "center": num(sine.center, unit),
            "stacks": [plate_json(NEAR_ROLE, &near), plate_json(OTHER_ROLE, &other)],
            "complement": Value::Null,
            "setup": "compound",
            "small_angle": Value::Null,
            "taper": Value::Null,
            "half_angle_deg": Value::Null,
            "included_angle_deg": Value::Null,
            "true_slope_deg": round_deg(setting.true_slope),
            "view_angles_deg": [round_deg(a), round_deg(b)],
            "views_achieved_deg": [round_deg(views_achieved.0), round_deg(views_achieved.1)],
            "plane_error_arcsec": round2(plane_error.arcsec()),
            "caution": CAUTION,
        });
        emit(out, &format!("{v:#}\n"))?;
        return Ok(ExitCode::SUCCESS);
    }
    let u = unit;
    let on = match &fx.fixture {
        Some(f) => format!("fixture {}", f.describe()),
        None => format!(
            "a compound sine plate, centre distance {} {u} (both plates)",
            num(sine.center, u)
        ),
    };
    let mut t = format!("Compound angle on {on}\n");
    t.push_str(&row(
        "view slopes",
        format!(
            "A {} (upper plate, nearer the part), B {}",
            a.dms(0),
            b.dms(0)
        ),
    ));
    t.push_str(&row("true slope", setting.true_slope));
    for (word, p) in [("upper plate", &near), ("lower plate", &other)] {
        t.push_str(&row(
            word,
            format!(
                "set {}: ideal {} {u}, stack {} {u}, gives {}, error {}",
                p.setting,
                p.ideal.number(u, u.places() + 2),
                num(p.height, u),
                p.achieved.dms(1),
                secs(p.achieved - p.setting)
            ),
        ));
    }
    t.push_str(&row(
        "plane levelled",
        format!(
            "true slope {} (error {}), {:.2}\" off the wanted plane",
            achieved_slope.dms(1),
            secs(slope_error),
            plane_error.arcsec()
        ),
    ));
    if let Some(c) = &chosen {
        t.push_str(&format!(
            "\nTwo stacks from {}; no block is in both:\n",
            set_words(c)
        ));
        for (role, p) in [(NEAR_ROLE, &near), (OTHER_ROLE, &other)] {
            if let Some(s) = &p.stack {
                if s.blocks.is_empty() {
                    t.push_str(&format!(
                        "No stack {role}: that plate stays down ({}).\n",
                        p.setting.dms(0)
                    ));
                } else {
                    t.push_str(&stack_text(
                        s,
                        u,
                        &format!(
                            "Stack {role}, sets {}; wring bottom to top:",
                            p.setting.dms(0)
                        ),
                    ));
                }
            }
        }
        t.push_str("Set the lower plate first, then the upper plate on it; clamp the work to the upper plate's stop.\n");
    }
    t.push_str(&closing(&warnings));
    emit(out, &t)?;
    Ok(ExitCode::SUCCESS)
}
