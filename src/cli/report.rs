//! `tiltbook report FILE`: the traveller as a report for a lead or the part's file, in text,
//! Markdown or one standalone HTML page.

use super::{CliError, emit, usage};
use crate::traveller::{report, schema};
use clap::Args;
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    after_help = "Examples:\n  tiltbook report job.yaml\n  tiltbook report job.yaml --format html --output job.html\n  tiltbook report job.yaml --output job.md   (format taken from the name)"
)]
pub struct ReportArgs {
    /// The traveller file
    #[arg(value_name = "FILE")]
    pub file: PathBuf,
    /// text, markdown or html (default: from --output's name, else text)
    #[arg(long, value_name = "FORMAT")]
    pub format: Option<String>,
    /// Write the report to this file instead of the screen
    #[arg(long, short, value_name = "PATH")]
    pub output: Option<PathBuf>,
}

pub fn run(args: &ReportArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let format: report::Format = match (&args.format, &args.output) {
        (Some(f), _) => f.parse().map_err(|e| usage(format!("--format: {e}")))?,
        (None, Some(p)) => p
            .extension()
            .and_then(|e| e.to_str())
            .and_then(|e| e.parse().ok())
            .unwrap_or_default(),
        (None, None) => report::Format::Text,
    };
    let name = args.file.display().to_string();
    let bytes = crate::store::read_capped(&args.file)
        .map_err(|e| CliError::Io(format!("cannot read {name}: {e}; check the path")))?;
    let text = String::from_utf8(bytes).map_err(|_| {
        CliError::Io(format!(
            "cannot read {name}: the file is not UTF-8 text; save it as UTF-8"
        ))
    })?;
    let loaded = schema::parse(&text).map_err(|e| {
        let p = e.pos();
        usage(format!(
            "{name}:{}:{}: {}\n(run `tiltbook check {name}` to list every problem)",
            p.line,
            p.col,
            e.message()
        ))
    })?;
    let body = report::render(&loaded.traveller, format);
    match &args.output {
        Some(path) => std::fs::write(path, body).map_err(|e| {
            CliError::Io(format!(
                "cannot write {}: {e}; check the folder exists and you may write there",
                path.display()
            ))
        })?,
        None => emit(out, &body)?,
    }
    Ok(ExitCode::SUCCESS)
}
