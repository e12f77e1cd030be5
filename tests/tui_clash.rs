//! Two people at one job, through the real binary (no terminal needed: the lock is taken
//! before the screens start). The second is told who holds it, where and since when, and how
//! to open read-only; a lock left by a process that has ended is taken over only when asked,
//! and the takeover is logged.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use tiltbook::store::{LockInfo, Store, host_name, lock_path};
use tiltbook::traveller::{self, EventKind, Stamp};

fn tiltbook(args: &[&str]) -> (i32, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .args(args)
        .env("TILTBOOK_SHOP", "")
        .stdin(Stdio::null())
        .output()
        .expect("the binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// A copy of the plan in a temporary folder (sample-jobs/ is never written).
fn job(dir: &Path) -> PathBuf {
    let path = dir.join("J-2417.yaml");
    std::fs::write(&path, tiltbook::cli::demo::DEMO_PLAN).unwrap();
    path
}

/// A process id no process has: above the largest Linux allows (2^22).
const GONE: u32 = 4_194_305;

#[test]
fn the_second_opener_is_told_who_where_since_and_how_to_look() {
    let dir = tempfile::tempdir().unwrap();
    let path = job(dir.path());
    let file = path.to_str().unwrap();
    let (held, _) = Store::open(&path, "KM").unwrap();
    let since = held.lock_info().unwrap().since.short();
    let (code, err) = tiltbook(&["open", file, "--as", "TJ"]);
    assert_eq!(code, 1, "{err}");
    let one_line = err.split_whitespace().collect::<Vec<_>>().join(" ");
    for want in [
        format!("is open by KM on {}", host_name()),
        format!("since {since}"),
        format!("open read-only with: tiltbook open {file} --read-only"),
    ] {
        assert!(one_line.contains(&want), "{want:?} in: {err}");
    }
    // --take-over does not take a lock whose holder is still working
    let (code, err) = tiltbook(&["open", file, "--as", "TJ", "--take-over"]);
    assert_eq!(code, 1, "{err}");
    assert!(err.contains("process has ended"), "{err}");
    assert_eq!(
        traveller::parse(&std::fs::read_to_string(&path).unwrap())
            .unwrap()
            .traveller
            .events
            .len(),
        0,
        "nothing was written"
    );
    // read-only goes past the lock (and stops here only because this is not a terminal)
    let (code, err) = tiltbook(&["open", file, "--read-only"]);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("needs a terminal") && !err.contains("is open by"),
        "{err}"
    );
    // the lock is still KM's
    drop(held);
    assert!(!lock_path(&path).exists());
}

#[test]
fn a_lock_whose_process_ended_is_taken_over_only_when_asked_and_logged() {
    let dir = tempfile::tempdir().unwrap();
    let path = job(dir.path());
    let file = path.to_str().unwrap();
    let left = LockInfo {
        who: "KM".into(),
        host: host_name(),
        pid: GONE,
        since: Stamp::parse("2025-03-04T08:16:00-05:00").unwrap(),
    };
    std::fs::write(lock_path(&path), serde_yaml::to_string(&left).unwrap()).unwrap();
    // not asked, and no terminal to ask on: say how
    let (code, err) = tiltbook(&["open", file, "--as", "TJ"]);
    assert_eq!(code, 1, "{err}");
    let one_line = err.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(one_line.contains("was left open by KM"), "{err}");
    assert!(
        one_line.contains(&format!(
            "take it over with: tiltbook open {file} --take-over"
        )),
        "{err}"
    );
    assert!(lock_path(&path).exists(), "left as it was");
    // asked: taken over and logged (then no terminal, so it stops and lets go)
    let (code, err) = tiltbook(&["open", file, "--as", "TJ", "--take-over"]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("needs a terminal"), "{err}");
    assert!(!lock_path(&path).exists(), "released again on the way out");
    let t = traveller::parse(&std::fs::read_to_string(&path).unwrap())
        .unwrap()
        .traveller;
    let ev = t.events.last().expect("the takeover is an event");
    assert_eq!((ev.kind, ev.by.as_str()), (EventKind::LockTakenOver, "TJ"));
    assert!(ev.detail.contains("KM"), "{}", ev.detail);
    assert!(traveller::check_text(&std::fs::read_to_string(&path).unwrap()).is_empty());
}

#[test]
fn take_over_and_read_only_do_not_go_together() {
    let (code, err) = tiltbook(&["open", "x.yaml", "--read-only", "--take-over"]);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("--take-over") && err.contains("--read-only"),
        "{err}"
    );
}
