//! `tiltbook stack` (being built).

use super::CliError;
use clap::Args;
use std::io::Write;
use std::process::ExitCode;

#[derive(Debug, Args)]
pub struct StackArgs {}

pub fn run(_args: &StackArgs, _out: &mut dyn Write) -> Result<ExitCode, CliError> {
    Err(CliError::Usage("this command is not ready yet".into()))
}
