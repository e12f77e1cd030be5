//! `tiltbook stack`: the stack height for an angle on a sine fixture, rounded to what a block
//! set can make, and (with `--set`) the blocks themselves in wringing order; or the stack for a
//! plain height (`--height`); a taper on sine centres (`--taper`); the two stacks of a compound
//! sine plate (`--compound`). For a small angle the set cannot build directly, the remedies
//! (two stacks, a longer fixture) side by side, the best chosen.
//!
//! - `common`: the set and fixture named on the command line;
//! - `show`: text and JSON pieces shared by every form;
//! - `angle`: one angle (or a taper's half angle), with the small-angle remedies (`remedy`);
//! - `compound`: the compound sine plate; `height`: a plain height.

mod angle;
mod common;
mod compound;
mod height;
mod remedy;
mod show;

pub use show::CAUTION;

use super::CliError;
use clap::{Args, ValueEnum};
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

/// Which small-angle remedy to use (`--remedy`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum RemedyChoice {
    /// The one with the smallest angle error (fewer blocks when the errors are as good)
    Best,
    /// A stack under each roll, their difference the height
    TwoStacks,
    /// One stack on a fixture from the shop with a longer centre distance
    Longer,
    /// One stack on this fixture, the nearest height the set builds
    Single,
}

#[derive(Debug, Args)]
#[command(after_help = "Examples:\n  \
tiltbook stack 30 --center 5in\n  \
tiltbook stack 34d25m --center 5in --set inch-81\n  \
tiltbook stack 12.5 --fixture SB100-203 --set BX88-B --protect\n  \
tiltbook stack --height 1.6428in --set inch-81 --json\n  \
tiltbook stack --taper 1:20 --center 100mm --set metric-88\n  \
tiltbook stack --taper 0.75in/ft --fixture SC5-310 --set inch-81\n  \
tiltbook stack --compound 30,20 --center 5in --set inch-81\n  \
tiltbook stack 0d30m --center 5in --set inch-81\n\n\
--set takes a set id from the shop file (`tiltbook shop` lists them) or a complete standard set: \
inch-81, metric-88, metric-112.\n\n\
Small angles: when the set cannot build the single stack to within half a step of height (below \
its smallest stack, in a gap, or a block missing), tiltbook shows the remedies side by side: a \
stack under each roll whose difference is the height, one stack on a longer fixture from the \
shop, and the nearest single stack; it picks the smallest angle error (--remedy to pick another).")]
pub struct StackArgs {
    /// The angle to set, from the surface plate: 30, 30.25, 30d15m, 30°15'20"
    #[arg(allow_negative_numbers = true)]
    pub angle: Option<String>,
    /// Build a stack for this height instead of an angle (needs --set), e.g. 1.6428in
    #[arg(long, value_name = "LENGTH", conflicts_with_all = ["angle", "center", "fixture", "rolls", "taper", "compound"])]
    pub height: Option<String>,
    /// A taper to set on sine centres (the half angle): 1:20, 0.75in/ft, "included 3°34'", "half 1°47'"
    #[arg(long, value_name = "TAPER", conflicts_with_all = ["angle", "compound"])]
    pub taper: Option<String>,
    /// A compound angle on a compound sine plate: the two view slopes, the near plate's first, e.g. 30,20
    #[arg(long, value_name = "A,B", conflicts_with = "angle")]
    pub compound: Option<String>,
    /// Centre distance of the fixture, e.g. 5in or 100mm
    #[arg(long, value_name = "LENGTH", conflicts_with = "fixture")]
    pub center: Option<String>,
    /// Roll diameters, pivot first, e.g. 0.75in,0.7498in (with --center; default: equal rolls)
    #[arg(long, value_name = "PIVOT,RAISED", requires = "center")]
    pub rolls: Option<String>,
    /// A fixture from the shop file, by id (`tiltbook shop` lists them)
    #[arg(long, value_name = "ID")]
    pub fixture: Option<String>,
    /// Build the stack from this block set (a shop set id, or inch-81, metric-88, metric-112)
    #[arg(long, value_name = "ID")]
    pub set: Option<String>,
    /// Put the set's protector blocks on both ends of the stack (they count in the height)
    #[arg(long, requires = "set")]
    pub protect: bool,
    /// For a small angle the set cannot build directly: which remedy to use
    #[arg(long, value_enum, value_name = "CHOICE", default_value_t = RemedyChoice::Best, requires = "set")]
    pub remedy: RemedyChoice,
    /// The shop file to use instead of the usual one
    #[arg(long, value_name = "FILE")]
    pub shop: Option<PathBuf>,
    /// Print JSON instead of text
    #[arg(long)]
    pub json: bool,
}

pub fn run(args: &StackArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    if let Some(h) = &args.height {
        return height::run(args, h, out);
    }
    if let Some(c) = &args.compound {
        return compound::run(args, c, out);
    }
    angle::run(args, out)
}
