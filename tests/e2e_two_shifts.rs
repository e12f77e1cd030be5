//! The real binary in tmux, as several people: operator KA does half a job and quits with a
//! note; KB opens it, reads the note, carries on at the same step and finishes; the lead LV
//! reviews, sees a flagged feature and sends it back; KA reopens, sees the comment first and
//! redoes it; LV signs the job. The YAML then holds every step with who and when, and
//! `tiltbook check` is clean; a signed value edited by hand shows as changed after sign-off.
//! And two processes at once: the second is told who holds the job and can look read-only.
//! Skipped (with a message) without tmux.

use std::path::{Path, PathBuf};
use std::process::Command;
use tiltbook::traveller::digest::withdrawn_by;
use tiltbook::traveller::{self, EventKind, FeatureState, Role, Scope};

mod e2e_support;
use e2e_support::{Session, quote, tmux_available};

/// A two-feature plan of the invented job (F1 and F3 of sample-jobs/ds-204-plan.yaml).
const PLAN: &str = "schema: 1
job:
  id: J-2417
  part: DS-204 dovetail slide
  unit: in
features:
  - id: F1
    name: dovetail flank, fixed side
    nominal: 30
    tolerance: \"±0°05'\"
  - id: F3
    name: end chamfer
    nominal: 15d30m
    tolerance: \"±0°02'\"
";

struct Job {
    _dir: tempfile::TempDir,
    file: PathBuf,
    shop: PathBuf,
}

fn job() -> Job {
    let dir = tempfile::tempdir().expect("a temporary folder");
    let file = dir.path().join("J-2417.yaml");
    std::fs::write(&file, PLAN).expect("plan written");
    let shop = dir.path().join("shop.yaml");
    std::fs::write(&shop, tiltbook::shop::TEMPLATE).expect("shop file written");
    Job {
        _dir: dir,
        file,
        shop,
    }
}

/// `tiltbook open FILE ARGS…` in a fresh terminal.
fn open(j: &Job, args: &str) -> Session {
    Session::start(
        "shifts",
        &format!(
            "env NO_COLOR=1 {} open {} --shop {} {args}; sleep 0.3",
            quote(Path::new(env!("CARGO_BIN_EXE_tiltbook"))),
            quote(&j.file),
            quote(&j.shop)
        ),
        80,
        24,
    )
}

fn check(j: &Job) -> (i32, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .args(["check", j.file.to_str().unwrap()])
        .output()
        .expect("check runs");
    let mut all = String::from_utf8_lossy(&out.stdout).into_owned();
    all.push_str(&String::from_utf8_lossy(&out.stderr));
    (out.status.code().unwrap_or(-1), all)
}

/// Readings: travel 4 in, then the count and each value, Enter after each.
fn readings(s: &Session, values: &[&str]) {
    s.expect("type the travel");
    s.text("4");
    s.keys(&["Enter"]);
    s.text(&values.len().to_string());
    s.keys(&["Enter"]);
    for v in values {
        s.text(v);
        s.keys(&["Enter"]);
    }
}

#[test]
fn two_shifts_a_review_a_return_and_the_sign_off() {
    if !tmux_available() {
        println!(
            "skipped: tmux is not installed (Debian package tmux); the two-shift end-to-end test did not run"
        );
        return;
    }
    let j = job();

    // --- operator KA: F1 from fixture to sign-off, F3 to its first reading, then quits
    let a = open(&j, "--as KA");
    a.expect("press Enter to start F1");
    a.keys(&["Enter"]);
    a.expect("choose the fixture");
    a.keys(&["Enter"]);
    a.expect("choose the block set");
    a.keys(&["Enter"]);
    a.wring_all();
    a.expect("clamp the work");
    a.keys(&["Enter"]);
    a.expect("s skips the wait");
    a.keys(&["s"]);
    a.keys(&["Enter"]);
    readings(&a, &["0", "+0.0001", "0"]);
    a.expect("all readings in");
    a.keys(&["Enter"]);
    a.expect("PASS");
    a.keys(&["Enter"]);
    a.expect("Name or initials");
    a.text("KA");
    a.keys(&["Enter"]);
    a.expect("F1 signed by KA");
    a.expect("choose the fixture"); // F3 opens next
    a.keys(&["Enter"]);
    a.expect("choose the block set");
    a.keys(&["Enter"]);
    a.wring_all();
    a.expect("clamp the work");
    a.keys(&["Enter"]);
    a.expect("s skips the wait");
    a.keys(&["s"]);
    a.keys(&["Enter"]);
    a.expect("type the travel");
    for t in ["4", "3", "0"] {
        a.text(t);
        a.keys(&["Enter"]);
    }
    a.expect("Readings 1 of 3");
    a.keys(&["C-c"]);
    a.expect("Note for the next shift");
    a.text("F3 on the bar, stack wrung, 1 of 3 readings in");
    a.keys(&["Enter"]);
    a.wait_end();
    assert!(
        !tiltbook::store::lock_path(&j.file).exists(),
        "the lock goes on quitting"
    );

    // --- operator KB: the note first, then F3's readings where KA stopped; finishes
    let b = open(&j, "--as KB");
    b.expect("Handover note from KA");
    b.expect("F3 on the bar, stack wrung, 1 of 3 readings in");
    b.keys(&["Enter"]);
    b.expect("Readings 1 of 3");
    b.expect("F3 end chamfer");
    b.text("+0.0010"); // a bump in the middle: the sweep is not straight
    b.keys(&["Enter"]);
    b.text("0");
    b.keys(&["Enter"]);
    b.expect("all readings in");
    b.keys(&["Enter"]);
    b.expect("PASS");
    b.keys(&["Enter"]);
    b.expect("Name or initials");
    b.text("KB");
    b.keys(&["Enter"]);
    b.expect("all 2 features are finished");
    b.keys(&["q"]); // finished: no note is asked
    b.wait_end();

    // --- the lead: F3 is flagged; it goes back with a comment
    let l = open(&j, "--review --as LV");
    l.expect("Review of J-2417");
    l.keys(&["f"]);
    l.expect("showing flagged only");
    l.expect("straight");
    l.expect("F3 end chamfer: flags");
    l.keys(&["r"]);
    l.expect("Return F3 end chamfer to the operator");
    l.text("sweep again after cleaning the face");
    l.keys(&["Enter"]);
    l.expect("F3 sent back");
    l.keys(&["q"]);
    l.wait_end();

    // --- KA again: the comment before anything else, then F3 is redone
    let a = open(&j, "--as KA");
    a.expect("Sent back by LV");
    a.expect("sweep again after cleaning the face");
    a.keys(&["Enter"]);
    a.expect("Verdict, attempt 1");
    a.keys(&["n"]);
    a.wring_all();
    a.expect("clamp the work");
    a.keys(&["Enter"]);
    a.expect("s skips the wait");
    a.keys(&["s"]);
    a.keys(&["Enter"]);
    readings(&a, &["0", "0", "0"]);
    a.expect("all readings in");
    a.keys(&["Enter"]);
    a.expect("PASS");
    a.keys(&["Enter"]);
    a.expect("Name or initials");
    a.text("KA");
    a.keys(&["Enter"]);
    a.expect("all 2 features are finished");
    a.keys(&["q"]);
    a.wait_end();

    // --- the lead signs the job, after a confirm step
    let l = open(&j, "--review --as LV");
    l.expect("Review of J-2417");
    l.expect("Job sign-off: not signed by a lead yet");
    l.keys(&["S"]);
    l.expect("Sign the whole job J-2417 as lead");
    l.keys(&["Enter"]);
    l.expect("signed by LV as lead");
    l.keys(&["q"]);
    l.wait_end();

    // --- the record
    let text = std::fs::read_to_string(&j.file).expect("the job reads");
    let t = traveller::parse(&text).expect("a traveller").traveller;
    let (code, out) = check(&j);
    assert_eq!(code, 0, "tiltbook check is clean:\n{out}\n{text}");
    assert!(t.features.iter().all(|f| f.state == FeatureState::Signed));
    let f3 = t.feature("F3").unwrap();
    assert_eq!(f3.attempts.len(), 2, "the return led to a second attempt");
    assert_eq!(f3.attempts[0].started.as_ref().unwrap().by, "KA");
    assert_eq!(f3.attempts[0].sweep.as_ref().unwrap().readings.len(), 3);
    assert_eq!(f3.attempts[1].started.as_ref().unwrap().by, "KA");
    let h = &t.handovers[0];
    assert_eq!((h.by.as_str(), h.read_by[0].by.as_str()), ("KA", "KB"));
    let r = &t.returns[0];
    assert_eq!((r.by.as_str(), r.feature.as_deref()), ("LV", Some("F3")));
    let who: Vec<(String, Role, Option<String>)> = t
        .signoffs
        .iter()
        .map(|s| (s.by.clone(), s.role, s.feature.clone()))
        .collect();
    assert_eq!(
        who,
        [
            ("KA".into(), Role::Operator, Some("F1".into())),
            ("KB".into(), Role::Operator, Some("F3".into())),
            ("KA".into(), Role::Operator, Some("F3".into())),
            ("LV".into(), Role::Lead, None),
        ]
    );
    assert!(
        withdrawn_by(&t, &t.signoffs[1]).is_some(),
        "KB's was sent back"
    );
    assert_eq!(t.signoffs[3].scope, Scope::Job);
    // every step, with who and when, in time order
    assert!(t.events.iter().all(|e| !e.by.trim().is_empty()));
    assert!(t.events.windows(2).all(|w| w[0].at <= w[1].at));
    let readings_by: Vec<&str> = t
        .events
        .iter()
        .filter(|e| e.kind == EventKind::ReadingEntered && e.feature.as_deref() == Some("F3"))
        .map(|e| e.by.as_str())
        .collect();
    assert_eq!(readings_by, ["KA", "KB", "KB", "KA", "KA", "KA"]);
    for (kind, by) in [
        (EventKind::Handover, "KA"),
        (EventKind::HandoverRead, "KB"),
        (EventKind::Returned, "LV"),
    ] {
        assert!(
            t.events.iter().any(|e| e.kind == kind && e.by == by),
            "{kind:?} by {by} is logged"
        );
    }
    assert_eq!(
        t.events.last().map(|e| (e.kind, e.by.as_str())),
        Some((EventKind::Signed, "LV"))
    );
    assert!(!tiltbook::store::lock_path(&j.file).exists());

    // --- a signed value edited by hand: check and review both say so
    let edited = text.replacen("tolerance: ±0°05'", "tolerance: ±0°06'", 1);
    assert_ne!(edited, text, "F1's tolerance is in the file as written");
    std::fs::write(&j.file, edited).unwrap();
    let (code, out) = check(&j);
    assert_eq!(code, 1, "{out}");
    assert!(
        out.contains("F1: tolerance changed after sign-off"),
        "{out}"
    );
    let l = open(&j, "--review --read-only");
    l.expect("Review of J-2417");
    l.expect("changed");
    l.expect("changed after sign-off: tolerance");
    l.keys(&["q"]);
    l.wait_end();
}

#[test]
fn a_second_process_is_told_who_holds_the_job_and_can_look_read_only() {
    if !tmux_available() {
        println!(
            "skipped: tmux is not installed (Debian package tmux); the two-process end-to-end test did not run"
        );
        return;
    }
    let j = job();
    let a = open(&j, "--as KA");
    a.expect("press Enter to start F1");
    let host = tiltbook::store::host_name();
    let b = open(&j, "--as KB; sleep 20");
    b.expect(&format!("open by KA on {host}"));
    b.expect("open read-only with:");
    b.expect("--read-only");
    let c = open(&j, "--read-only");
    c.expect("READ-ONLY");
    c.expect("F1");
    c.keys(&["q"]);
    c.wait_end();
    // the first quits: nothing was confirmed and no feature is under way, so no note is asked
    a.keys(&["q"]);
    a.wait_end();
    assert!(!tiltbook::store::lock_path(&j.file).exists());
}
