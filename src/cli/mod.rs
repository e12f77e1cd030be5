//! The command line: one file per subcommand, each returning an exit code or a [`CliError`].

use clap::{Parser, Subcommand};
use std::io::Write;
use std::process::ExitCode;
use thiserror::Error;

pub mod center;
pub mod check;
pub mod demo;
pub mod new;
pub mod open;
pub mod report;
pub mod shop;
pub mod stack;
pub mod sweep;

/// A failure the binary prints on stderr, with the exit code it leads to.
#[derive(Debug, Error)]
pub enum CliError {
    /// Bad input: what was wrong and what to type instead (exit 2).
    #[error("{0}")]
    Usage(String),
    /// A file could not be read or written (exit 2).
    #[error("{0}")]
    Io(String),
    /// The request was understood but cannot be met, e.g. a height no set can build (exit 1).
    #[error("{0}")]
    Unmet(String),
}

impl CliError {
    /// The process exit code for this failure.
    pub fn code(&self) -> u8 {
        match self {
            CliError::Usage(_) | CliError::Io(_) => 2,
            CliError::Unmet(_) => 1,
        }
    }
}

/// Anything that displays becomes a usage error (bad input from the person typing).
pub fn usage<E: std::fmt::Display>(e: E) -> CliError {
    CliError::Usage(e.to_string())
}

/// Write to the output; a closed pipe is not an error worth a message.
pub fn emit(out: &mut dyn Write, text: &str) -> Result<(), CliError> {
    match out.write_all(text.as_bytes()) {
        Ok(()) => Ok(()),
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Ok(()),
        Err(e) => Err(CliError::Io(format!("cannot write the output: {e}"))),
    }
}

#[derive(Debug, Parser)]
#[command(
    name = "tiltbook",
    version,
    about = "Sine-fixture setups and the job traveller: gauge-block stacks, indicator sweeps, verdicts",
    long_about = "tiltbook works out gauge-block stacks for sine bars, plates, vises and centres, \
fits dial-test-indicator sweeps, and keeps the job traveller.\n\n\
Angles: 30, 30.25, 30°15'20\", 30d15m20s, 30:15:20 or \"30 15 20\".\n\
Lengths: 5in, 5\", 127mm; a bare number is in inches unless the command says otherwise.\n\n\
Safety: clamp the work against the fixture's stop, never cut on an unsecured stack, wear eye \
protection. The shop's own rules and local codes come first."
)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// The gauge-block stack for an angle on a sine fixture (or a plain height)
    Stack(stack::StackArgs),
    /// Fit dial-test-indicator readings: residual angle, straightness, stack correction
    Sweep(sweep::SweepArgs),
    /// Centre distance of a sine fixture from a measurement over or between the rolls
    Center(center::CenterArgs),
    /// List the shop's fixtures and block sets, or write a starting shop file
    Shop(shop::ShopArgs),
    /// Start a plan file: the job's details filled in, the features to add by hand
    New(new::NewArgs),
    /// Check traveller and plan files: every problem as file:line:col: message
    Check(check::CheckArgs),
    /// A report of a traveller: text, Markdown or standalone HTML
    Report(report::ReportArgs),
    /// Work on a traveller in the full-screen operator screens
    Open(open::OpenArgs),
    /// Write the built-in demo job (an invented part) to a new file and open it
    Demo(demo::DemoArgs),
}

/// Run the parsed command, writing results to `out`.
pub fn run(cli: Cli, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    match cli.command {
        Command::Stack(a) => stack::run(&a, out),
        Command::Sweep(a) => sweep::run(&a, out),
        Command::Center(a) => center::run(&a, out),
        Command::Shop(a) => shop::run(&a, out),
        Command::New(a) => new::run(&a, out),
        Command::Check(a) => check::run(&a, out),
        Command::Report(a) => report::run(&a, out),
        Command::Open(a) => open::run(&a, out),
        Command::Demo(a) => demo::run(&a, out),
    }
}
