//! `tiltbook new FILE --part TEXT`: start a plan file by hand, with the layout explained in
//! comments and one example feature to copy. It never writes over a file.

use super::{CliError, emit, usage};
use crate::units::Unit;
use clap::Args;
use std::fs::OpenOptions;
use std::io::{ErrorKind, Write};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    about = "Start a plan file: the job's details filled in, the features to add by hand",
    after_help = "Examples:\n  tiltbook new j-2417.yaml --part \"DS-204 dovetail slide\"\n  tiltbook new j-2417.yaml --part \"DS-204 dovetail slide\" --drawing DS-204 --units mm\n\n\
The job id is taken from the file name (change it in the file). Then add the part's angled \
features, check the file with `tiltbook check FILE` and open it with `tiltbook open FILE`."
)]
pub struct NewArgs {
    /// The plan file to write (it must not exist yet)
    pub file: PathBuf,
    /// The part, as the operator knows it, e.g. "DS-204 dovetail slide"
    #[arg(long)]
    pub part: String,
    /// The drawing number
    #[arg(long)]
    pub drawing: Option<String>,
    /// The unit heights and readings are shown in: in or mm
    #[arg(long, default_value = "in", value_parser = parse_unit)]
    pub units: Unit,
}

fn parse_unit(s: &str) -> Result<Unit, String> {
    match s.trim().to_ascii_lowercase().as_str() {
        "in" | "inch" | "inches" | "\"" => Ok(Unit::In),
        "mm" | "millimetre" | "millimetres" | "millimeter" | "millimeters" => Ok(Unit::Mm),
        other => Err(format!("'{other}' is not a unit for a job; use in or mm")),
    }
}

/// A one-line text as a YAML value, quoted when it needs to be; `fix` says what to type instead
/// when it is empty or not on one line.
fn scalar(what: &str, text: &str, fix: &str) -> Result<String, CliError> {
    let text = text.trim();
    if text.is_empty() {
        return Err(usage(format!("the {what} is empty; {fix}")));
    }
    if text
        .chars()
        .any(|c| c.is_control() || matches!(c, '\u{2028}' | '\u{2029}'))
    {
        return Err(usage(format!(
            "the {what} has a line break or another control character; {fix}"
        )));
    }
    let y = serde_yaml::to_string(text).map_err(|e| usage(format!("the {what}: {e}")))?;
    Ok(y.trim_end().to_string())
}

/// The job id a file name suggests: `j-2417.yaml` gives `j-2417`.
fn job_id(file: &Path) -> String {
    file.file_stem()
        .map(|s| s.to_string_lossy().trim().to_string())
        .filter(|s| !s.is_empty())
        .unwrap_or_else(|| "J-1".into())
}

/// The text of a new plan.
pub fn skeleton(
    id: &str,
    part: &str,
    drawing: Option<&str>,
    unit: Unit,
) -> Result<String, CliError> {
    let id = scalar(
        "job id taken from the file name",
        id,
        "name the file after the job, e.g. j-2417.yaml",
    )?;
    let part_v = scalar(
        "part",
        part,
        "give it on one line in quotes, e.g. --part \"DS-204 dovetail slide\"",
    )?;
    let drawing = match drawing {
        Some(d) => format!(
            "  drawing: {}\n",
            scalar("drawing", d, "give it on one line, e.g. --drawing DS-204")?
        ),
        None => "  # drawing: DS-204\n".into(),
    };
    let (unit_word, example_len) = match unit {
        Unit::In => ("in", "inches (in)"),
        Unit::Mm => ("mm", "millimetres (mm)"),
    };
    Ok(format!(
        "# Plan for {part}. A plan is a traveller with no results yet: tiltbook fills in the rest
# as the work is done. Add the part's angled features below, then:
#   tiltbook check FILE   lists every problem with its line and column
#   tiltbook open FILE    opens the operator's screens
# Angles: 30, 30.25, 30°15'20\", 30d15m20s or 30:15:20. Tolerances: \"±0°05'\" or \"+0°02'/-0°00'\".
# The whole layout: docs/traveller-format.md.
schema: 1
job:
  id: {id}                # the job or work-order number
  part: {part_v}
{drawing}  # revision: C
  # material: 1045 steel, 28-32 HRC
  quantity: 1
  unit: {unit_word}                # heights and readings in {example_len}
  # notes: anything the operator should know before starting

# The angled features, one entry each. Replace `features: []` with a list like this one
# (remove the # signs and change the values):
#
# features:
#   - id: F1                        # short, unique in this job
#     name: dovetail flank          # what the operator sees
#     nominal: 30                   # the angle from the surface plate, under 90°
#     tolerance: \"±0°05'\"
#     work: setup_check             # setup_check (set up to machine) or inspection
#
# A taper on sine centres takes, instead of nominal:  kind: taper   taper: {{ ratio: \"1:20\" }}
# A compound angle takes:  kind: compound   compound: {{ a: 30, b: 20, near: a }}
features: []
",
        part = part.trim(),
    ))
}

pub fn run(args: &NewArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let text = skeleton(
        &job_id(&args.file),
        &args.part,
        args.drawing.as_deref(),
        args.units,
    )?;
    let name = args.file.display().to_string();
    let mut f = match OpenOptions::new()
        .write(true)
        .create_new(true)
        .open(&args.file)
    {
        Ok(f) => f,
        Err(e) if e.kind() == ErrorKind::AlreadyExists => {
            return Err(CliError::Io(format!(
                "{name} exists already and is left as it is; give a new file name, or open it with `tiltbook open {name}`"
            )));
        }
        Err(e) => {
            return Err(CliError::Io(format!(
                "cannot create {name}: {e}; check the folder exists and you may write there"
            )));
        }
    };
    if let Err(e) = f.write_all(text.as_bytes()).and_then(|()| f.sync_all()) {
        // a part-written plan would only stand in the way of the next try
        drop(f);
        let _ = std::fs::remove_file(&args.file);
        return Err(CliError::Io(format!(
            "cannot write {name}: {e}; nothing was left behind: free some space or choose another folder, then run the same command again"
        )));
    }
    emit(
        out,
        &format!(
            "Wrote the plan {name} for {}.\nNext: add the part's angled features to it (the commented example shows how), then `tiltbook check {name}`, then `tiltbook open {name}`.\n",
            args.part.trim()
        ),
    )?;
    Ok(ExitCode::SUCCESS)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn units_are_read_in_either_spelling() {
        assert_eq!(parse_unit("MM"), Ok(Unit::Mm));
        assert_eq!(parse_unit("in"), Ok(Unit::In));
        assert!(parse_unit("ft").unwrap_err().contains("use in or mm"));
    }

    #[test]
    fn awkward_part_names_are_quoted() {
        let t = skeleton("J-1", "bracket: left # 2", Some("yes"), Unit::In).unwrap();
        let loaded = crate::traveller::parse(&t).unwrap().traveller;
        assert_eq!(loaded.job.part, "bracket: left # 2");
        assert_eq!(loaded.job.drawing, "yes");
        assert!(skeleton("J-1", "two\nlines", None, Unit::In).is_err());
        assert!(skeleton("J-1", "two\u{2028}lines", None, Unit::In).is_err());
        let e = skeleton(" ", "part", None, Unit::In)
            .unwrap_err()
            .to_string();
        assert!(e.contains("name the file after the job"), "{e}");
        assert!(skeleton("J-1", "  ", None, Unit::In).is_err());
    }
}
