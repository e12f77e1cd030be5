//! `tiltbook sweep`: fit dial-test-indicator readings taken along a surface on a sine fixture;
//! print the residual angle, which way the surface rises, the straightness, and (with the
//! fixture and the angle) the stack change that levels the surface.

use super::{CliError, emit, usage};
use crate::geometry::SineFixture;
use crate::sweep::{Correction, Sweep, SweepFit, correction, default_step};
use crate::units::{Angle, Length, Unit};
use clap::{ArgAction, Args};
use std::io::Write;
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    after_help = "Readings: plus means the surface is higher there (plunger pushed in). \
Positions run from the pivot end toward the raised end. A bare number is in inches unless \
--unit mm is given. A negative reading written with its unit (-0.0005in) goes after --, e.g. \
tiltbook sweep --travel 5in -- -0.0005in 0.0005in; bare negative numbers need nothing.\n\n\
Examples:\n  tiltbook sweep --travel 5in 0 0.0015\n  tiltbook sweep --travel 4in -0.0005 0 0.0005 --json\n  \
tiltbook sweep --at 0=0 --at 2.5=0.0007 --at 5=0.0015\n  \
tiltbook sweep --travel 5in 0 -0.0008 --center 5in --angle 30\n\n\
Safety: clamp the work against the fixture's stop, never cut on an unsecured stack, wear eye \
protection. The shop's own rules and local codes come first."
)]
pub struct SweepArgs {
    /// Distance from the first reading to the last; the readings are evenly spaced over it
    #[arg(long, value_name = "LENGTH", conflicts_with = "at")]
    pub travel: Option<String>,
    /// The readings in order from the pivot end, e.g. 0 0.0015 (negative allowed: -0.0005)
    #[arg(value_name = "READING", allow_negative_numbers = true)]
    pub readings: Vec<String>,
    /// A reading at a position, POS=READING, e.g. 2.5=0.0007 (repeat, or give several)
    #[arg(
        long,
        value_name = "POS=READING",
        num_args = 1..,
        action = ArgAction::Append,
        allow_negative_numbers = true
    )]
    pub at: Vec<String>,
    /// Unit of bare numbers and of the output: in or mm (default in)
    #[arg(long, value_name = "in|mm")]
    pub unit: Option<String>,
    /// Centre distance of the fixture, for the stack correction, e.g. 5in
    #[arg(long, value_name = "LENGTH")]
    pub center: Option<String>,
    /// Angle the fixture is set to (the stack in place is the one for it), e.g. 30 or 30d15m
    #[arg(
        long,
        value_name = "ANGLE",
        requires = "center",
        conflicts_with = "stack"
    )]
    pub angle: Option<String>,
    /// The stack in place, when it is not the one --angle gives, e.g. 2.5000in
    #[arg(long, value_name = "LENGTH", requires = "center")]
    pub stack: Option<String>,
    /// The two roll diameters, pivot first, e.g. 0.7500in,0.7480in (default: equal rolls)
    #[arg(long, value_name = "D1,D2", requires = "center")]
    pub rolls: Option<String>,
    /// Stack resolution the new height is rounded to (default 0.0001in or 0.001mm)
    #[arg(long, value_name = "LENGTH", requires = "center")]
    pub step: Option<String>,
    /// Print JSON instead of text
    #[arg(long)]
    pub json: bool,
}

/// The unit a typed length names, if it names one.
fn typed_unit(text: &str) -> Option<Unit> {
    let t = text.trim().to_ascii_lowercase();
    if t.ends_with("mm") {
        Some(Unit::Mm)
    } else if t.ends_with("in") || t.ends_with("inch") || t.ends_with('"') {
        Some(Unit::In)
    } else {
        None
    }
}

fn length(text: &str, unit: Unit, what: &str) -> Result<Length, CliError> {
    Length::parse(text, unit).map_err(|e| usage(format!("{what}: {e}")))
}

/// The sweep as typed, the unit to show, and whether any bare number was read in `default`.
fn read_sweep(args: &SweepArgs, default: Unit) -> Result<(Sweep, Unit, bool), CliError> {
    let mut bare = false;
    let mut shown = None;
    let mut note = |t: &str| match typed_unit(t) {
        Some(u) => {
            shown.get_or_insert(u);
        }
        None => bare = true,
    };
    let sweep = if !args.at.is_empty() {
        if !args.readings.is_empty() {
            return Err(usage(format!(
                "readings '{}' were given beside --at; give each reading with its position, e.g. --at 0=0 --at 5=0.0015, or use --travel",
                args.readings.join(" ")
            )));
        }
        let mut pairs = Vec::new();
        for item in args.at.iter().flat_map(|a| a.split(',')) {
            let Some((p, r)) = item.split_once('=') else {
                return Err(usage(format!(
                    "--at '{item}' should be a position and a reading joined by =, e.g. --at 2.5in=0.0007"
                )));
            };
            note(p);
            note(r);
            let pos = length(p, default, &format!("--at '{item}', position"))?;
            let reading = length(r, default, &format!("--at '{item}', reading"))?;
            pairs.push((pos, reading));
        }
        Sweep::at(pairs)
    } else {
        let Some(travel) = &args.travel else {
            return Err(usage(
                "give the travel and the readings, e.g. --travel 5in 0 0.0015, or each reading with its position, e.g. --at 0=0 --at 5=0.0015",
            ));
        };
        note(travel);
        let travel = Length::parse_non_negative(travel, default)
            .map_err(|e| usage(format!("--travel: {e}")))?;
        let mut readings = Vec::new();
        for (i, r) in args.readings.iter().enumerate() {
            note(r);
            readings.push(length(r, default, &format!("reading {} ('{r}')", i + 1))?);
        }
        Sweep::even(travel, readings)
    }
    .map_err(usage)?;
    Ok((sweep, shown.unwrap_or(default), bare))
}

fn read_fixture(args: &SweepArgs, center: &str, default: Unit) -> Result<SineFixture, CliError> {
    let center =
        Length::parse_positive(center, default).map_err(|e| usage(format!("--center: {e}")))?;
    let (pivot_roll, raised_roll) = match &args.rolls {
        None => (Length::ZERO, Length::ZERO),
        Some(text) => {
            let parts: Vec<&str> = text.split(',').map(str::trim).collect();
            let (a, b) = match parts.as_slice() {
                [a] => (*a, *a),
                [a, b] => (*a, *b),
                _ => {
                    return Err(usage(format!(
                        "--rolls '{text}' should be two diameters separated by a comma, e.g. --rolls 0.7500in,0.7480in"
                    )));
                }
            };
            let d = |t: &str| {
                Length::parse_positive(t, default).map_err(|e| usage(format!("--rolls: {e}")))
            };
            (d(a)?, d(b)?)
        }
    };
    Ok(SineFixture {
        center,
        pivot_roll,
        raised_roll,
    })
}

/// The correction asked for by --center with --angle or --stack, if any.
fn read_correction(
    args: &SweepArgs,
    fit: &SweepFit,
    default: Unit,
    unit: Unit,
) -> Result<Option<Correction>, CliError> {
    let Some(center) = &args.center else {
        return Ok(None);
    };
    let fixture = read_fixture(args, center, default)?;
    let step = match &args.step {
        Some(s) => Length::parse_positive(s, default).map_err(|e| usage(format!("--step: {e}")))?,
        None => default_step(unit),
    };
    let height = match (&args.angle, &args.stack) {
        (Some(a), _) => {
            let angle = Angle::parse(a).map_err(|e| usage(format!("--angle: {e}")))?;
            SineFixture::check_angle(angle).map_err(|e| usage(format!("--angle: {e}")))?;
            fixture
                .ideal_height(angle)
                .map_err(|e| usage(format!("--angle: {e}")))?
                .round_to(step)
        }
        (None, Some(s)) => {
            Length::parse_positive(s, default).map_err(|e| usage(format!("--stack: {e}")))?
        }
        (None, None) => {
            return Err(usage(
                "--center needs the angle the fixture is set to, e.g. --center 5in --angle 30, or the stack in place, e.g. --stack 2.5000in",
            ));
        }
    };
    correction(&fixture, height, fit.residual, step)
        .map(Some)
        .map_err(|e| CliError::Unmet(format!("no correction: {e}")))
}

pub fn run(args: &SweepArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let default = match &args.unit {
        Some(u) => u
            .parse::<Unit>()
            .map_err(|e| usage(format!("--unit: {e}")))?,
        None => Unit::In,
    };
    let (sweep, unit, bare) = read_sweep(args, default)?;
    let unit = if args.unit.is_some() { default } else { unit };
    if bare && args.unit.is_none() && unit == Unit::Mm {
        eprintln!(
            "tiltbook: note: numbers without a unit were read in inches; add --unit mm if they are millimetres"
        );
    }
    let fit = sweep.fit().map_err(usage)?;
    let corr = read_correction(args, &fit, default, unit)?;
    let text = if args.json {
        format!("{:#}\n", json(&fit, corr.as_ref(), unit))
    } else {
        text(&fit, corr.as_ref(), unit)
    };
    emit(out, &text)?;
    Ok(ExitCode::SUCCESS)
}

/// The JSON document: see the README section "sweep --json".
pub fn json(fit: &SweepFit, corr: Option<&Correction>, unit: Unit) -> serde_json::Value {
    let p = unit.places();
    let fine = unit.fine_places();
    serde_json::json!({
        "readings": fit.readings,
        "unit": unit.symbol(),
        "travel": fit.travel.number(unit, p),
        "slope": fit.slope,
        "residual_arcsec": fit.residual.arcsec(),
        "residual_dms": fit.residual.dms(0),
        "rises": fit.rise().key(),
        "straightness": fit.straightness.number(unit, fine),
        "residual_sd_arcsec": fit.angle_sd.map(|a| a.arcsec()),
        "correction": corr.map(|c| serde_json::json!({
            "height": c.height.number(unit, p),
            "setting_deg": c.setting.deg(),
            "delta_height": c.delta_height.number(unit, p),
            "new_height": c.new_height.number(unit, p),
            "achieved_deg": c.achieved.deg(),
            "step": c.step.exact_number(unit, 0),
        })),
    })
}

/// The text a machinist reads.
pub fn text(fit: &SweepFit, corr: Option<&Correction>, unit: Unit) -> String {
    let mut s = format!(
        "sweep: {} readings over {}\n",
        fit.readings,
        fit.travel.show(unit)
    );
    s.push_str(&format!(
        "residual      {} ({}): {}\n",
        fit.residual.arcsec_signed(1),
        fit.residual.dms(0),
        fit.rise().words()
    ));
    s.push_str(&format!(
        "slope         {:+.6} {u} per {u}\n",
        fit.slope,
        u = unit.symbol()
    ));
    if let Some(sd) = fit.angle_sd {
        s.push_str(&format!(
            "scatter       ±{:.1}\" on the residual (one standard deviation, from the readings about the line)\n",
            sd.arcsec()
        ));
    }
    let straight = if fit.readings == 2 {
        " (two readings always lie on a line; take three or more to see the form)".to_string()
    } else {
        format!(
            " about the fitted line ({:.1}\" over the travel)",
            fit.straightness_angle().arcsec()
        )
    };
    s.push_str(&format!(
        "straightness  {}{straight}\n",
        fit.straightness.show_fine(unit)
    ));
    if let Some(c) = corr {
        s.push_str(&format!("correction    {}\n", c.words(unit)));
        s.push_str(&format!(
            "              the stack {} sets {}; {} sets {} ({} from now)\n",
            c.height.show(unit),
            c.setting.dms(0),
            c.new_height.show(unit),
            c.achieved.dms(0),
            (c.achieved - c.setting).arcsec_signed(1)
        ));
        s.push_str(
            "Clamp the work against the fixture's stop, never cut on an unsecured stack, wear eye protection; the shop's rules come first. Sweep again after the change.\n",
        );
    }
    s
}
