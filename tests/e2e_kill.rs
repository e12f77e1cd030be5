//! The real binary in tmux, killed: operator KM opens a temp copy of the sample plan, gets to
//! F1's readings, confirms two of five, and is killed with SIGKILL while typing the third.
//! Everything confirmed must be in the YAML and back on screen when the job is reopened; the
//! lock the killed process left is taken over after a yes, and the takeover is logged.
//! Skipped (with a message) without tmux, or without `kill` (not Unix).

use std::path::Path;
use std::process::Command;
use tiltbook::traveller::{self, EventKind, Step};
use tiltbook::units::Length;

fn have(program: &str, arg: &str) -> bool {
    Command::new(program)
        .arg(arg)
        .output()
        .is_ok_and(|o| o.status.success())
}

mod e2e_support;
use e2e_support::{Session, quote};

/// `tiltbook open FILE --as KM ARGS…` in a fresh terminal, the data folder and the shop file
/// given by the environment as the shop floor sets them.
fn open(tag: &str, dir: &Path, file: &Path, args: &str) -> Session {
    Session::start(
        &format!("kill-{tag}"),
        &format!(
            "env NO_COLOR=1 TILTBOOK_DATA_DIR={} TILTBOOK_SHOP={} {} open {} --as KM {args}; sleep 0.3",
            quote(&dir.join("data")),
            quote(&dir.join("shop.yaml")),
            quote(Path::new(env!("CARGO_BIN_EXE_tiltbook"))),
            quote(file)
        ),
        80,
        24,
    )
}

#[test]
fn readings_confirmed_before_a_kill_are_there_on_reopening() {
    if !have("tmux", "-V") {
        println!(
            "skipped: tmux is not installed (Debian package tmux); the kill end-to-end test did not run"
        );
        return;
    }
    if !cfg!(unix) || !have("kill", "-l") {
        println!("skipped: no `kill` command here; the kill end-to-end test did not run");
        return;
    }
    let dir = tempfile::tempdir().expect("a temporary folder");
    let file = dir.path().join("J-2417.yaml");
    let plan = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml");
    std::fs::copy(plan, &file).expect("the plan copies");
    std::fs::write(dir.path().join("shop.yaml"), tiltbook::shop::TEMPLATE)
        .expect("shop file written");

    // --- KM: F1 to its readings, two of five confirmed, the third half typed
    let a = open("a", dir.path(), &file, "");
    a.expect("press Enter to start F1");
    a.keys(&["Enter"]);
    a.expect("choose the fixture");
    a.keys(&["Enter"]);
    a.expect("choose the block set");
    a.keys(&["Enter"]);
    a.expect("wring block 1");
    for _ in 0..10 {
        if a.screen().contains("every block is wrung") {
            break;
        }
        a.keys(&["Space"]);
    }
    a.expect("every block is wrung");
    a.keys(&["Enter"]);
    a.expect("clamp the work");
    a.keys(&["Enter"]);
    a.expect("s skips the wait");
    a.keys(&["s"]);
    a.keys(&["Enter"]);
    a.expect("type the travel");
    for t in ["4", "5", "0", "+0.0001"] {
        a.text(t);
        a.keys(&["Enter"]);
    }
    a.expect("Readings 2 of 5");
    a.text("+0.00");
    a.expect("+0.00");

    // --- killed mid-entry: no chance to save, release the lock or restore the terminal
    let lock = tiltbook::store::lock_path(&file);
    let holder = tiltbook::store::read_lock(&lock).expect("the running app holds the lock");
    let pid = holder.pid.to_string();
    let killed = Command::new("kill")
        .args(["-KILL", &pid])
        .status()
        .expect("kill runs");
    assert!(killed.success(), "kill -KILL {pid}");
    a.wait_end();
    assert!(lock.exists(), "a killed process leaves its lock behind");

    // --- the YAML holds both confirmed readings and nothing of the half-typed one
    let text = std::fs::read_to_string(&file).expect("the job reads");
    let loaded = traveller::parse(&text).expect("the job after the kill is a traveller");
    let problems = traveller::validate(&loaded.traveller, &loaded.locator);
    assert!(problems.is_empty(), "{problems:#?}\n{text}");
    let t = loaded.traveller;
    let f1 = &t.features[0];
    let last = f1.attempts.last().expect("F1 was started");
    assert_eq!(last.step, Step::Sweep, "F1 stopped at its readings");
    let sweep = last.sweep.as_ref().expect("the readings were saved");
    assert_eq!(sweep.travel, Some(Length::inches(4.0)));
    assert_eq!(sweep.points, Some(5));
    assert_eq!(
        sweep.readings,
        vec![Length::ZERO, Length::inches(0.0001)],
        "both confirmed readings, and not the one being typed"
    );

    // --- reopened: the stale lock is named, a yes takes it over, the readings are back
    let b = open("b", dir.path(), &file, "");
    b.expect("[y/N]");
    b.text("y");
    b.keys(&["Enter"]);
    b.expect("Readings 2 of 5");
    b.expect("F1");
    let screen = b.screen();
    assert!(
        screen.contains("+0.0001"),
        "the second reading is on screen:\n{screen}"
    );
    b.keys(&["C-c"]); // the reading field has the focus: q would be typed
    b.expect("Note for the next shift");
    b.keys(&["Escape"]);
    b.wait_end();
    assert!(!lock.exists(), "the lock goes on quitting");
    let t = traveller::parse(&std::fs::read_to_string(&file).expect("the job reads"))
        .expect("a traveller")
        .traveller;
    assert!(
        t.events
            .iter()
            .any(|e| e.kind == EventKind::LockTakenOver && e.by == "KM"),
        "the takeover is in the log"
    );
    let sweep = t.features[0].attempts.last().and_then(|a| a.sweep.as_ref());
    assert_eq!(
        sweep.map(|s| s.readings.len()),
        Some(2),
        "reopening lost nothing and added nothing"
    );
}

#[test]
fn a_lock_left_by_a_killed_process_is_taken_over_with_the_option() {
    if !have("tmux", "-V") {
        println!(
            "skipped: tmux is not installed (Debian package tmux); the kill end-to-end test did not run"
        );
        return;
    }
    if !cfg!(unix) || !have("kill", "-l") {
        println!("skipped: no `kill` command here; the kill end-to-end test did not run");
        return;
    }
    let dir = tempfile::tempdir().expect("a temporary folder");
    let file = dir.path().join("J-2417.yaml");
    let plan = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml");
    std::fs::copy(plan, &file).expect("the plan copies");
    std::fs::write(dir.path().join("shop.yaml"), tiltbook::shop::TEMPLATE)
        .expect("shop file written");
    let a = open("c", dir.path(), &file, "");
    a.expect("press Enter to start F1");
    a.keys(&["Enter"]);
    a.expect("choose the fixture");
    let lock = tiltbook::store::lock_path(&file);
    let holder = tiltbook::store::read_lock(&lock).expect("the running app holds the lock");
    let killed = Command::new("kill")
        .args(["-KILL", &holder.pid.to_string()])
        .status()
        .expect("kill runs");
    assert!(killed.success());
    a.wait_end();
    assert!(lock.exists(), "a killed process leaves its lock behind");
    let b = open("d", dir.path(), &file, "--take-over");
    b.expect("choose the fixture");
    assert!(!b.screen().contains("[y/N]"), "the option asks nothing");
    b.keys(&["q"]); // nothing was confirmed in this session: it quits without asking a note
    b.wait_end();
    assert!(!lock.exists(), "the lock goes on quitting");
    let t = traveller::parse(&std::fs::read_to_string(&file).expect("the job reads"))
        .expect("a traveller")
        .traveller;
    assert_eq!(
        t.events
            .iter()
            .filter(|e| e.kind == EventKind::LockTakenOver)
            .count(),
        1,
        "the takeover is in the log once"
    );
}
