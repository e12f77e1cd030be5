//! The operator's screens: terminal lifecycle and panic hook; the app model and
//! `update(&mut App, Msg) -> Vec<Effect>`; one effect runner (save, solve, lock); the keymap;
//! the theme; one module per screen; the setup drawing and the sweep chart.
//!
//! Data flows one way: a key press becomes a message, `update` changes the model and asks for
//! effects, the runner does them (feeding answers back as messages), the view draws the model.

pub mod app;
pub mod chrome;
pub mod clash;
pub mod effects;
pub mod field;
pub mod flags;
pub mod flow;
pub mod judge;
pub mod judge_views;
pub mod keymap;
pub mod rank;
pub mod screens;
pub mod shop_view;
pub mod solve;
pub mod theme;
pub mod update;
pub mod view;
pub mod widgets;

pub use app::{App, Effect, Msg, Options, Screen};
pub use effects::Runner;
pub use theme::ColorChoice;
pub use update::update;

use crossterm::event::{self, Event};
use std::io;
use std::time::{Duration, Instant};

/// When the terminal is closed (SIGHUP) or the process is asked to stop (SIGTERM), release this
/// process's locks and leave. Everything confirmed is already saved (saves are atomic), so
/// leaving at once loses nothing. It runs on a thread of its own because a closed terminal can
/// keep the main thread reading forever. Where these signals do not exist nothing is installed
/// (the lock is still released on every other way out).
fn watch_for_hangup() {
    #[cfg(unix)]
    {
        use signal_hook::consts::{SIGHUP, SIGTERM};
        // best effort: without the watcher the signal ends the process as it always did
        if let Ok(mut signals) = signal_hook::iterator::Signals::new([SIGHUP, SIGTERM]) {
            let _ = std::thread::Builder::new()
                .name("hangup".into())
                .spawn(move || {
                    if let Some(sig) = signals.forever().next() {
                        crate::store::release_all_locks();
                        if sig == SIGTERM {
                            // the terminal is still there: give it back as it was
                            ratatui::restore();
                        }
                        std::process::exit(128 + sig);
                    }
                });
        }
    }
}

/// Install the hook that releases this process's locks on a panic. Call before
/// `ratatui::try_init`, whose own hook restores the terminal first and then calls this one; the
/// traveller on disk is left as last saved (saves are atomic).
fn install_lock_hook() {
    let previous = std::panic::take_hook();
    std::panic::set_hook(Box::new(move |info| {
        crate::store::release_all_locks();
        previous(info);
    }));
}

/// Is this a terminal the screens can run in (both standard input and output)?
pub fn interactive() -> bool {
    use std::io::IsTerminal;
    io::stdin().is_terminal() && io::stdout().is_terminal()
}

/// Run the screens until the operator quits. The terminal is restored on every way out.
pub fn run(mut app: App, mut runner: Runner) -> io::Result<()> {
    install_lock_hook();
    watch_for_hangup();
    let mut terminal = ratatui::try_init()?;
    let result = event_loop(&mut terminal, &mut app, &mut runner);
    ratatui::restore();
    if !app.quit {
        // left by an error: release the lock the same way a quit does
        runner.drain(&mut app, vec![Effect::Quit]);
    }
    result
}

fn event_loop(
    terminal: &mut ratatui::DefaultTerminal,
    app: &mut App,
    runner: &mut Runner,
) -> io::Result<()> {
    let size = terminal.size()?;
    update(app, Msg::Resize(size.width, size.height));
    let mut last_tick = Instant::now();
    loop {
        terminal.draw(|f| view::draw(f, app))?;
        if app.quit {
            return Ok(());
        }
        let wait = if app.ui.settle_left.is_some() {
            Duration::from_millis(250)
        } else {
            Duration::from_secs(1)
        };
        if event::poll(wait)? {
            match event::read()? {
                Event::Key(k) => {
                    if let Some(input) = keymap::translate(&k, app.ctx(), app.typing()) {
                        let effects = update(app, Msg::Key(input));
                        runner.drain(app, effects);
                    }
                }
                Event::Resize(w, h) => {
                    update(app, Msg::Resize(w, h));
                    terminal.autoresize()?;
                }
                _ => {}
            }
        }
        let secs = last_tick.elapsed().as_secs();
        if secs >= 1 {
            last_tick += Duration::from_secs(secs);
            let effects = update(app, Msg::Tick(u32::try_from(secs).unwrap_or(u32::MAX)));
            runner.drain(app, effects);
        }
    }
}
