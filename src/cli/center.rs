//! `tiltbook center`: the centre distance of a sine fixture from a measurement over both rolls
//! (C = M − (d₁ + d₂)/2) or between them (C = M + (d₁ + d₂)/2).

use super::{CliError, emit, usage};
use crate::geometry::{center_from_inside, center_from_over};
use crate::units::{Length, Unit};
use clap::Args;
use std::io::Write;
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    after_help = "Examples:\n  tiltbook center --over 5.625in --rolls 0.625in,0.625in\n  tiltbook center --inside 4.375in --rolls 0.625in,0.625in"
)]
pub struct CenterArgs {
    /// Measured over the outsides of both rolls, e.g. 5.625in
    #[arg(
        long,
        value_name = "LENGTH",
        conflicts_with = "inside",
        required_unless_present = "inside"
    )]
    pub over: Option<String>,
    /// Measured between the insides of the rolls, e.g. 4.375in
    #[arg(long, value_name = "LENGTH")]
    pub inside: Option<String>,
    /// The two roll diameters, pivot first, e.g. 0.625in,0.625in (one value: both the same)
    #[arg(long, value_name = "D1,D2", allow_hyphen_values = true)]
    pub rolls: String,
    /// Print JSON instead of text
    #[arg(long)]
    pub json: bool,
}

/// Parse `D1,D2` (or one diameter for both rolls); the first one's unit is the default for the second.
pub fn parse_rolls(text: &str) -> Result<(Length, Length), CliError> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let (a, b) = match parts.as_slice() {
        [a] => (*a, *a),
        [a, b] => (*a, *b),
        _ => {
            return Err(CliError::Usage(format!(
                "--rolls '{text}' should be two diameters separated by a comma, e.g. --rolls 0.625in,0.625in"
            )));
        }
    };
    let d1 = Length::parse_positive(a, Unit::In).map_err(|e| usage(format!("--rolls: {e}")))?;
    let d2 = Length::parse_positive(b, unit_of(a)).map_err(|e| usage(format!("--rolls: {e}")))?;
    Ok((d1, d2))
}

/// The unit a typed length names, inches when it names none.
pub fn unit_of(text: &str) -> Unit {
    if text.trim().to_ascii_lowercase().ends_with("mm") {
        Unit::Mm
    } else {
        Unit::In
    }
}

pub fn run(args: &CenterArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let (d1, d2) = parse_rolls(&args.rolls)?;
    let (text, how) = match (&args.over, &args.inside) {
        (Some(o), _) => (o.as_str(), "over"),
        (None, Some(i)) => (i.as_str(), "inside"),
        (None, None) => {
            return Err(usage(
                "give --over LENGTH or --inside LENGTH, e.g. --over 5.625in",
            ));
        }
    };
    let unit = unit_of(text);
    let m = Length::parse_positive(text, unit).map_err(|e| usage(format!("--{how}: {e}")))?;
    let c = if how == "over" {
        center_from_over(m, d1, d2)
    } else {
        center_from_inside(m, d1, d2)
    }
    .map_err(|e| usage(format!("{e}; check the measurement and the roll diameters")))?;
    if args.json {
        let v = serde_json::json!({
            "center": c.exact_number(unit, unit.places()),
            "unit": unit.symbol(),
            "measured": m.exact_number(unit, unit.places()),
            "measured_how": how,
            "rolls": [d1.exact_number(unit, unit.places()), d2.exact_number(unit, unit.places())],
        });
        emit(out, &format!("{v:#}\n"))?;
    } else {
        let sign = if how == "over" { "−" } else { "+" };
        emit(
            out,
            &format!(
                "centre distance  {}\n  = {} {how} the rolls {sign} ({} + {})/2\n",
                c.show(unit),
                m.show(unit),
                d1.show(unit),
                d2.show(unit)
            ),
        )?;
    }
    Ok(ExitCode::SUCCESS)
}
