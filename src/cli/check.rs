//! `tiltbook check FILE…`: read traveller, plan and shop files and list every problem as
//! `file:line:col: message`. Exit 0 when all are clean, 1 when a problem was found, 2 when a
//! file cannot be read.

use super::{CliError, emit};
use crate::traveller::{schema, validate};
use clap::Args;
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    after_help = "Examples:\n  tiltbook check sample-jobs/ds-204-plan.yaml\n  tiltbook check jobs/*.yaml\n\nExit status: 0 all clean, 1 problems found, 2 a file could not be read."
)]
pub struct CheckArgs {
    /// Traveller, plan or shop files to check
    #[arg(required = true, value_name = "FILE")]
    pub files: Vec<PathBuf>,
}

pub fn run(args: &CheckArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let mut found = false;
    let mut unreadable: Vec<String> = Vec::new();
    for path in &args.files {
        let name = path.display().to_string();
        let text = match crate::store::read_capped(path) {
            Ok(bytes) => match String::from_utf8(bytes) {
                Ok(t) => t,
                Err(_) => {
                    emit(
                        out,
                        &format!("{name}:1:1: the file is not UTF-8 text; save it as UTF-8\n"),
                    )?;
                    found = true;
                    continue;
                }
            },
            Err(e) => {
                unreadable.push(format!("cannot read {name}: {e}; check the path"));
                continue;
            }
        };
        if looks_like_shop_file(&text) {
            let source = crate::shop::ShopSource::Option(path.clone());
            match crate::shop::Shop::parse(&text, &name, source) {
                Ok(_) => emit(out, &format!("{name}: ok (shop file)\n"))?,
                Err(e) => {
                    emit(out, &format!("{e}\n"))?;
                    found = true;
                }
            }
            continue;
        }
        let problems = match schema::parse(&text) {
            Err(e) => {
                let p = e.pos();
                vec![format!("{name}:{}:{}: {}", p.line, p.col, e.message())]
            }
            Ok(l) => {
                let list = validate(&l.traveller, &l.locator);
                if list.is_empty() {
                    let note = match l.upgraded_from {
                        Some(v) => format!(
                            " (written in schema {v}; it is read as schema {} and saved that way)",
                            crate::traveller::SCHEMA_VERSION
                        ),
                        None => String::new(),
                    };
                    emit(out, &format!("{name}: ok{note}\n"))?;
                }
                list.iter().map(|p| format!("{name}:{p}")).collect()
            }
        };
        for p in &problems {
            emit(out, &format!("{p}\n"))?;
        }
        found |= !problems.is_empty();
    }
    if !unreadable.is_empty() {
        out.flush().ok();
        return Err(CliError::Io(unreadable.join("\ntiltbook: ")));
    }
    Ok(if found {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    })
}

/// A shop file (fixtures and block sets) rather than a traveller: it has a top-level
/// `fixtures:` or `block_sets:` key and neither `job:` nor `features:`.
fn looks_like_shop_file(text: &str) -> bool {
    let top = |key: &str| text.lines().any(|l| l.starts_with(key));
    (top("fixtures:") || top("block_sets:")) && !top("job:") && !top("features:")
}
