//! `tiltbook stack --height LENGTH --set ID`: the fewest-block stack for a plain height.

use super::super::{CliError, emit, usage};
use super::StackArgs;
use super::common::{choose_set, load_shop};
use super::show::{
    CAUTION, blocks_json, closing, num, single_heading, stack_json, stack_text, unmet, worn_note,
};
use crate::units::Length;
use serde_json::{Value, json};
use std::io::Write;
use std::process::ExitCode;

pub fn run(args: &StackArgs, text: &str, out: &mut dyn Write) -> Result<ExitCode, CliError> {
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
    if let Some(w) = worn_note(&[&stack], unit) {
        warnings.push(w);
    }
    if args.json {
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
            "blocks": blocks_json(&stack, unit),
            "block_count": stack.block_count(),
            "set": chosen.set.id,
            "protect": chosen.solver.protected(),
            "worn_blocks": stack.worn().iter().map(|w| num(*w, unit)).collect::<Vec<_>>(),
            "fixture": Value::Null,
            "center": Value::Null,
            "stacks": [stack_json("stack for the given height", stack.height, Some(&stack), None, unit)],
            "complement": Value::Null,
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
        emit(out, &format!("{v:#}\n"))?;
    } else {
        let mut t = format!("Stack height {} {unit}\n", num(height, unit));
        t.push_str(&stack_text(&stack, unit, &single_heading(&chosen)));
        t.push_str(&closing(&warnings));
        emit(out, &t)?;
    }
    Ok(ExitCode::SUCCESS)
}
