//! `tiltbook open FILE`: work on a traveller (or a plan) in the full-screen operator screens.
//! The file and the shop file are read and checked first, so problems print as plain text.

use super::{CliError, emit};
use crate::shop::Shop;
use crate::store::{self, Liveness, LockInfo, Store, StoreError};
use crate::traveller::Loaded;
use crate::traveller::{Problem, validate};
use crate::tui::clash::{is_yes, locked_message, take_over_question, wrap_message};
use crate::tui::{self, App, ColorChoice, Options, Runner, shop_view::ShopView};
use clap::Args;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

#[derive(Debug, Args)]
#[command(
    after_help = "Examples:\n  tiltbook open jobs/J-2417.yaml --as JQ\n  tiltbook open jobs/J-2417.yaml --read-only\n  tiltbook open jobs/J-2417.yaml --review --as LV\n\nOpening shows any handover note or lead's comment first, then the step where work stopped. Quitting with work unfinished asks for a note for the next shift (Esc skips it).\n\nKeys: arrows, Enter (go on), Esc (back), Tab; ? shows every key. Everything confirmed is saved at once; quitting loses nothing.\n\nSafety: clamp the work against the fixture's stop, never cut on an unsecured stack, wear eye protection. The shop's own rules and local codes come first."
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
    /// The lead's review: every feature's attempts, readings, budget and flags; sign or return
    #[arg(long)]
    pub review: bool,
    /// Take over a lock left by a process that has ended on this computer (recorded in the log)
    #[arg(long, conflicts_with = "read_only")]
    pub take_over: bool,
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

/// A problem that is a signed value changed since its sign-off (or an edited sign-off): the
/// record is whole, so it opens, and the review flags it for the lead.
fn changed_after_signoff(p: &Problem) -> bool {
    p.message.contains("changed after sign-off")
        || p.message.contains("the sign-off record was edited")
}

/// Read and check the traveller and the shop; nothing is locked yet. Returns the shop and how
/// many signed values changed after sign-off.
fn preflight(path: &Path, shop: Option<&Path>) -> Result<(ShopView, usize), CliError> {
    let loaded = store::load(path).map_err(|e| CliError::Io(e.to_string()))?;
    let (changed, problems): (Vec<Problem>, Vec<Problem>) =
        validate(&loaded.traveller, &loaded.locator)
            .into_iter()
            .partition(changed_after_signoff);
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
    Ok((ShopView::from_shop(&shop), changed.len()))
}

fn not_a_terminal(file: &Path) -> CliError {
    CliError::Usage(format!(
        "tiltbook open needs a terminal (standard input and output are not one); run it in a terminal window, or use `tiltbook check {}` or `tiltbook report {}` from a script",
        file.display(),
        file.display()
    ))
}

/// The width plain messages are wrapped to: the terminal's, else 80.
fn message_width() -> usize {
    crossterm::terminal::size()
        .map(|(w, _)| usize::from(w))
        .unwrap_or(80)
        .saturating_sub(1)
}

/// A message as `main` prints it (after `tiltbook: `), wrapped to the terminal.
fn wrapped(text: &str) -> String {
    let all = wrap_message(&format!("tiltbook: {text}"), message_width());
    all.strip_prefix("tiltbook: ").unwrap_or(&all).to_string()
}

/// Open the job for work (taking its lock), or read-only. When someone else holds it, say who,
/// where and since when, and what can be done; a lock whose process has ended is taken over
/// after a yes (or with `--take-over`).
fn open_store(args: &OpenArgs, who: &str) -> Result<(Store, Loaded), CliError> {
    let file = args.file.display().to_string();
    if args.read_only {
        return Store::open_read_only(&args.file).map_err(|e| CliError::Io(e.to_string()));
    }
    let holder: LockInfo = match Store::open(&args.file, who) {
        Ok(opened) => return Ok(opened),
        Err(StoreError::Locked { holder, .. }) => holder,
        Err(e) => return Err(CliError::Io(e.to_string())),
    };
    let live = holder.liveness();
    let message = locked_message(&file, &holder, live, args.review);
    if live != Liveness::Stale {
        let refused = if args.take_over {
            format!(
                "{message}\n(--take-over is only for a lock whose process has ended on this computer)"
            )
        } else {
            message
        };
        return Err(CliError::Unmet(wrapped(&refused)));
    }
    if !args.take_over {
        if !tui::interactive() {
            return Err(CliError::Unmet(wrapped(&message)));
        }
        eprintln!(
            "{}",
            wrap_message(&format!("tiltbook: {message}"), message_width())
        );
        eprint!("{}", take_over_question(&holder));
        let mut answer = String::new();
        if std::io::stdin().read_line(&mut answer).is_err() || !is_yes(&answer) {
            return Err(CliError::Unmet(format!(
                "{file} was left as it was; nothing was changed"
            )));
        }
    }
    Store::take_over(&args.file, who, &holder).map_err(|e| CliError::Io(e.to_string()))
}

pub fn run(args: &OpenArgs, out: &mut dyn Write) -> Result<ExitCode, CliError> {
    let color = ColorChoice::parse(&args.color).map_err(CliError::Usage)?;
    let (shop, changed) = preflight(&args.file, args.shop.as_deref())?;
    let operator = given_name(args.as_name.as_deref()).or(shop.settings.operator.clone());
    let (store, loaded) = open_store(args, &lock_name(operator.as_deref()))?;
    if !tui::interactive() {
        drop(store); // the lock goes with it
        return Err(not_a_terminal(&args.file));
    }
    let no_color = std::env::var("NO_COLOR").ok();
    let opts = Options {
        read_only: args.read_only,
        color: color.use_color(no_color.as_deref()),
        operator,
        file_label: args.file.display().to_string(),
        today: jiff::Zoned::now().date(),
        review: args.review,
    };
    let mut app = App::new(loaded.traveller, shop.clone(), opts);
    let mut runner = Runner::new(Some(store), shop);
    let first = tui::update::land(&mut app);
    if changed > 0 {
        app.say(
            tui::app::Level::Warn,
            format!(
                "{changed} signed value{} changed after sign-off: the review flags {}; `tiltbook check` lists {}",
                if changed == 1 { "" } else { "s" },
                if changed == 1 { "it" } else { "them" },
                if changed == 1 { "it" } else { "them" },
            ),
        );
    }
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
