//! `tiltbook open FILE`: work on a traveller (or a plan) in the full-screen operator screens.
//! The file and the shop file are read and checked first, so problems print as plain text.

use super::{CliError, emit};
use crate::shop::Shop;
use crate::store::{self, Store};
use crate::traveller::validate;
use crate::tui::{self, App, ColorChoice, Options, Runner, shop_view::ShopView};
use clap::Args;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    after_help = "Examples:\n  tiltbook open jobs/J-2417.yaml --as JQ\n  tiltbook open jobs/J-2417.yaml --read-only\n\nKeys: arrows, Enter (go on), Esc (back), Tab; ? shows every key. Everything confirmed is saved at once; quitting loses nothing.\n\nSafety: clamp the work against the fixture's stop, never cut on an unsecured stack, wear eye protection. The shop's own rules and local codes come first."
)]
pub struct OpenArgs {
    /// The traveller or plan file to work on
    #[arg(value_name = "FILE")]
    pub file: PathBuf,
    /// Your name or initials, recorded beside every entry (asked once when not given)
    #[arg(long = "as", value_name = "NAME")]
    pub as_name: Option<String>,
    /// Look only: no lock is taken and nothing is saved
    #[arg(long)]
    pub read_only: bool,
    /// Colour: auto (none when NO_COLOR is set), always or never
    #[arg(long, value_name = "WHEN", default_value = "auto", value_parser = ["auto", "always", "never"])]
    pub color: String,
    /// The shop file with the fixtures and block sets (see `tiltbook shop` for where it looks)
    #[arg(long, value_name = "FILE")]
    pub shop: Option<PathBuf>,
}

/// The name given, trimmed; none when blank.
fn given_name(n: Option<&str>) -> Option<String> {
    n.map(str::trim)
        .filter(|s| !s.is_empty())
        .map(str::to_string)
}

/// Who the lock names while the name is not known yet.
fn lock_name(operator: Option<&str>) -> String {
    operator
        .map(str::to_string)
        .or_else(|| std::env::var("USER").ok())
        .or_else(|| std::env::var("USERNAME").ok())
        .filter(|s| !s.trim().is_empty())
        .unwrap_or_else(|| "operator".to_string())
}

/// Read and check the traveller and the shop; nothing is locked yet.
fn preflight(path: &Path, shop: Option<&Path>) -> Result<ShopView, CliError> {
    let loaded = store::load(path).map_err(|e| CliError::Io(e.to_string()))?;
    let problems = validate(&loaded.traveller, &loaded.locator);
    if !problems.is_empty() {
        let list: Vec<String> = problems
            .iter()
            .map(|p| format!("{}:{p}", path.display()))
            .collect();
        return Err(CliError::Unmet(format!(
            "{}\n{} problem{} in {}; fix {} (see `tiltbook check`), then open it again",
            list.join("\n"),
            list.len(),
            if list.len() == 1 { "" } else { "s" },
            path.display(),
            if list.len() == 1 { "it" } else { "them" }
        )));
    }
    let shop = Shop::load(shop).map_err(|e| CliError::Io(e.to_string()))?;
    Ok(ShopView::from_shop(&shop))
}

pub fn run(args: &OpenArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let color = ColorChoice::parse(&args.color).map_err(CliError::Usage)?;
    let shop = preflight(&args.file, args.shop.as_deref())?;
    if !tui::interactive() {
        return Err(CliError::Usage(format!(
            "tiltbook open needs a terminal (standard input and output are not one); run it in a terminal window, or use `tiltbook check {}` or `tiltbook report {}` from a script",
            args.file.display(),
            args.file.display()
        )));
    }
    let operator = given_name(args.as_name.as_deref()).or(shop.settings.operator.clone());
    let (store, loaded) = if args.read_only {
        Store::open_read_only(&args.file)
    } else {
        Store::open(&args.file, &lock_name(operator.as_deref()))
    }
    .map_err(|e| CliError::Io(e.to_string()))?;
    let no_color = std::env::var("NO_COLOR").ok();
    let opts = Options {
        read_only: args.read_only,
        color: color.use_color(no_color.as_deref()),
        operator,
        file_label: args.file.display().to_string(),
        today: jiff::Zoned::now().date(),
    };
    let mut app = App::new(loaded.traveller, shop.clone(), opts);
    let mut runner = Runner::new(Some(store), shop);
    let first = tui::update::land(&mut app);
    runner.drain(&mut app, first);
    tui::run(app, runner).map_err(|e| {
        CliError::Io(format!(
            "the terminal failed ({e}); everything confirmed before this was saved"
        ))
    })?;
    emit(
        out,
        &format!(
            "{}: everything confirmed is saved; open it again to go on\n",
            args.file.display()
        ),
    )?;
    Ok(ExitCode::SUCCESS)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn blank_names_are_not_names() {
        assert_eq!(given_name(Some("  ")), None);
        assert_eq!(given_name(Some(" JQ ")), Some("JQ".into()));
        assert_eq!(lock_name(Some("JQ")), "JQ");
    }
}
