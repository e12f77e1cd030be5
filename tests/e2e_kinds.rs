//! The real binary in tmux on the demo plan: the taper F2 on sine centres and the compound F4
//! on the compound sine plate (both plates, both views) worked by keys alone to their
//! sign-offs; then `tiltbook check` is clean on the saved file and the lead's `--review`
//! shows both features. Skipped (with a message) without tmux.

use std::path::{Path, PathBuf};
use std::process::Command;
use tiltbook::traveller::{self, FeatureState, Verdict};
use tiltbook::units::Length;

mod e2e_support;
use e2e_support::{Session, quote, tmux_available};

/// The flow steps this test repeats for both features.
trait Steps {
    fn to_readings(&self);
    fn readings(&self, values: &[&str]);
    fn sign(&self, id: &str);
}

impl Steps for Session {
    /// The cautions confirmed and the wait skipped: on to the readings.
    fn to_readings(&self) {
        self.expect("clamp the work");
        self.keys(&["Enter"]);
        self.expect("s skips the wait");
        self.keys(&["s"]);
        self.expect("press Enter for the readings");
        self.keys(&["Enter"]);
    }

    /// Travel 4 in, then the count and each value, Enter after each.
    fn readings(&self, values: &[&str]) {
        self.expect("type the travel");
        self.text("4");
        self.keys(&["Enter"]);
        self.text(&values.len().to_string());
        self.keys(&["Enter"]);
        for v in values {
            self.text(v);
            self.keys(&["Enter"]);
        }
    }

    /// Sign as JQ on the sign screen.
    fn sign(&self, id: &str) {
        self.expect("Name or initials");
        self.text("JQ");
        self.keys(&["Enter"]);
        self.expect(&format!("{id} signed by JQ"));
    }
}

fn bin() -> String {
    quote(Path::new(env!("CARGO_BIN_EXE_tiltbook")))
}

/// The one job file the demo wrote in `data`.
fn saved_job(data: &Path) -> PathBuf {
    std::fs::read_dir(data)
        .expect("the data folder exists")
        .filter_map(Result::ok)
        .map(|e| e.path())
        .find(|p| p.extension().is_some_and(|e| e == "yaml"))
        .expect("the demo job was written")
}

#[test]
fn the_taper_and_the_compound_angle_of_the_demo_to_sign_off_then_check_and_review() {
    if !tmux_available() {
        println!(
            "skipped: tmux is not installed (Debian package tmux); the end-to-end test of the taper and compound features did not run"
        );
        return;
    }
    let dir = tempfile::tempdir().expect("a temporary folder");
    let shop = dir.path().join("shop.yaml");
    std::fs::write(&shop, tiltbook::shop::TEMPLATE).expect("shop file written");
    let data = dir.path().join("data");
    let s = Session::start(
        "kinds",
        &format!(
            "env TILTBOOK_DATA_DIR={} NO_COLOR=1 {} demo --as JQ --shop {}; sleep 0.3",
            quote(&data),
            bin(),
            quote(&shop)
        ),
        80,
        24,
    );
    s.expect("press Enter to start F1");

    // F2, the taper: sine centres first, the half angle is set, the included angle shown
    s.keys(&["Down"]);
    s.keys(&["Enter"]);
    s.expect("half 1°25'56\" · incl 2°51'51\"");
    s.expect("▶ SC5-310");
    s.keys(&["Enter"]);
    s.expect("choose the block set");
    s.keys(&["Enter"]);
    s.expect("the half angle 1°25'56\" is the");
    s.wring_all();
    s.to_readings();
    s.readings(&["0", "0.0001", "0"]);
    s.expect("all readings in: press Enter for the verdict");
    s.keys(&["Enter"]);
    s.expect("PASS");
    s.expect("on the included angle");
    s.keys(&["Enter"]);
    s.sign("F2");

    // F4, the compound angle: back to the overview, down to F4
    s.keys(&["Escape"]);
    s.expect("press Enter to go on with F1");
    for _ in 0..3 {
        s.keys(&["Down"]);
    }
    s.expect("press Enter to start F4");
    s.keys(&["Enter"]);
    s.expect("▶ CSP5-014");
    s.keys(&["Enter"]);
    s.expect("choose the block set");
    s.keys(&["Enter"]);
    s.expect("Near plate (A) at 30°00'00\"");
    s.expect("Other plate (B) at 17°29'41\""); // asin(1.5031/5)
    s.wring_all();
    s.to_readings();
    s.expect("Readings of view A (near plate)");
    s.readings(&["0", "0.0001", "0"]);
    s.expect("press Enter for the other view's readings");
    s.keys(&["Enter"]);
    s.expect("Readings of view B (other plate)");
    // back to view A and on again: nothing is lost
    s.keys(&["Escape"]);
    s.expect("Readings 3 of 3, view A");
    s.keys(&["Enter"]);
    s.expect("Readings of view B (other plate)");
    s.readings(&["0", "0", "0.0001"]);
    s.expect("all readings in: press Enter for the verdict");
    s.keys(&["Enter"]);
    s.expect("PASS: both views inside the tolerance");
    s.expect("view B (other)");
    s.keys(&["Enter"]);
    s.sign("F4");
    s.keys(&["C-c"]);
    s.expect("Note for the next shift");
    s.keys(&["Escape"]);
    s.wait_end();

    let job = saved_job(&data);
    let out = Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .arg("check")
        .arg(&job)
        .output()
        .expect("check runs");
    assert!(
        out.status.success(),
        "check finds problems:\n{}{}",
        String::from_utf8_lossy(&out.stdout),
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(&job).expect("the job reads");
    let t = traveller::parse(&text).expect("a traveller").traveller;
    let f2 = t.feature("F2").unwrap();
    assert_eq!(f2.state, FeatureState::Signed);
    let a = f2.accepted_attempt().unwrap();
    assert_eq!(a.stack.as_ref().unwrap().height, Length::inches(0.125));
    let f4 = t.feature("F4").unwrap();
    assert_eq!(f4.state, FeatureState::Signed);
    let a = f4.accepted_attempt().unwrap();
    assert_eq!(a.stack.as_ref().unwrap().height, Length::inches(2.5));
    // compound.csv: the other plate's 1.50313289 in on the 0.0001 in grid
    assert_eq!(a.stack_b.as_ref().unwrap().height, Length::inches(1.5031));
    assert_eq!(a.sweep_b.as_ref().unwrap().readings.len(), 3);
    let j = a.judgement.as_ref().unwrap();
    assert_eq!(j.verdict, Verdict::Pass);
    assert_eq!(j.view_b.as_ref().unwrap().verdict, Verdict::Pass);

    // the lead's review shows both
    let l = Session::start(
        "kinds",
        &format!(
            "env NO_COLOR=1 {} open {} --review --as LV --shop {}; sleep 0.3",
            bin(),
            quote(&job),
            quote(&shop)
        ),
        80,
        24,
    );
    l.expect("Review of J-2417");
    l.keys(&["Down"]);
    l.keys(&["Enter"]);
    l.expect("F2 pin seat taper");
    // tapers.csv: 1:20 → half 1.4320961842° = 1°25'55.5", included 2.8641923683° = 2°51'51.1"
    l.expect("half angle 1°25'55.5\"");
    l.expect("included 2°51'51.1\"");
    l.keys(&["Escape"]);
    l.keys(&["Down", "Down"]);
    l.keys(&["Enter"]);
    l.expect("F4 relief face");
    l.expect("Readings, attempt 1, view A");
    l.expect("view B");
    for _ in 0..30 {
        if l.screen().contains("PASS over both views") {
            break;
        }
        l.keys(&["Down"]);
    }
    l.expect("PASS over both views");
    l.keys(&["q"]);
    l.wait_end();
}
