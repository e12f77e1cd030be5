//! `tiltbook shop` (being built).

use super::CliError;
use clap::Args;
use std::io::Write;
use std::process::ExitCode;

#[derive(Debug, Args)]
pub struct ShopArgs {}

pub fn run(_args: &ShopArgs, _out: &mut dyn Write) -> Result<ExitCode, CliError> {
    Err(CliError::Usage("this command is not ready yet".into()))
}
