//! `tiltbook demo`: write the built-in sample plan (an invented job) to a new file in the user
//! data folder, say where, and open it.

use super::open::{self, OpenArgs};
use super::{CliError, emit};
use crate::store::write_atomic;
use clap::Args;
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

/// The sample plan: an invented job with seven angled features.
pub const DEMO_PLAN: &str = include_str!("../../sample-jobs/ds-204-plan.yaml");

/// The environment variable that moves the data folder (for tests and portable installs).
pub const DATA_DIR_VAR: &str = "TILTBOOK_DATA_DIR";

#[derive(Debug, Args)]
#[command(
    after_help = "The demo job is written to tiltbook's data folder (TILTBOOK_DATA_DIR moves it) and opened; open it again later with `tiltbook open FILE`."
)]
pub struct DemoArgs {
    /// Your name or initials, recorded beside every entry (asked once when not given)
    #[arg(long = "as", value_name = "NAME")]
    pub as_name: Option<String>,
    /// Colour: auto (none when NO_COLOR is set), always or never
    #[arg(long, value_name = "WHEN", default_value = "auto", value_parser = ["auto", "always", "never"])]
    pub color: String,
    /// The shop file (the built-in demo shop when none is found)
    #[arg(long, value_name = "FILE")]
    pub shop: Option<PathBuf>,
}

/// The folder demo jobs are written to.
pub fn data_dir() -> Result<PathBuf, CliError> {
    if let Some(d) = std::env::var_os(DATA_DIR_VAR).filter(|d| !d.is_empty()) {
        return Ok(PathBuf::from(d));
    }
    directories::ProjectDirs::from("", "", "tiltbook")
        .map(|d| d.data_dir().to_path_buf())
        .ok_or_else(|| {
            CliError::Io(format!(
                "this system has no data folder for tiltbook; set {DATA_DIR_VAR} to a folder to write the demo job in"
            ))
        })
}

/// A file name not yet taken in `dir`: `demo-J-2417-20261201-2242.yaml`, then `-2`, `-3`…
fn fresh_name(dir: &std::path::Path) -> PathBuf {
    let stamp = jiff::Zoned::now().strftime("%Y%m%d-%H%M%S").to_string();
    let base = format!("demo-J-2417-{stamp}");
    let mut p = dir.join(format!("{base}.yaml"));
    let mut n = 2;
    while p.exists() {
        p = dir.join(format!("{base}-{n}.yaml"));
        n += 1;
    }
    p
}

pub fn run(args: &DemoArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let dir = data_dir()?;
    std::fs::create_dir_all(&dir).map_err(|e| {
        CliError::Io(format!(
            "cannot make the folder {}: {e}; set {DATA_DIR_VAR} to a folder you may write",
            dir.display()
        ))
    })?;
    let path = fresh_name(&dir);
    write_atomic(&path, DEMO_PLAN.as_bytes()).map_err(|e| {
        CliError::Io(format!(
            "cannot write {}: {e}; set {DATA_DIR_VAR} to a folder you may write",
            path.display()
        ))
    })?;
    emit(
        out,
        &format!(
            "wrote the demo job (an invented part) to {}\nopen it again any time with: tiltbook open {}\n",
            path.display(),
            path.display()
        ),
    )?;
    let _ = out.flush();
    open::run(
        &OpenArgs {
            file: path,
            as_name: args.as_name.clone(),
            read_only: false,
            review: false,
            take_over: false,
            color: args.color.clone(),
            shop: args.shop.clone(),
        },
        out,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_demo_plan_is_a_clean_traveller() {
        assert!(crate::traveller::check_text(DEMO_PLAN).is_empty());
    }
}
