//! `tiltbook open` and `tiltbook demo` before the screens start: files are read and checked
//! first (problems print as plain text), and without a terminal they say so and stop.

use std::process::{Command, Stdio};

fn tiltbook(args: &[&str], data: &std::path::Path) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .args(args)
        .env("TILTBOOK_DATA_DIR", data)
        .env("TILTBOOK_SHOP", "")
        .stdin(Stdio::null())
        .output()
        .expect("the binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn without_a_terminal_open_says_so_and_exits_2() {
    let dir = tempfile::tempdir().unwrap();
    let plan = dir.path().join("plan.yaml");
    std::fs::write(&plan, tiltbook::cli::demo::DEMO_PLAN).unwrap();
    let (code, _, err) = tiltbook(&["open", plan.to_str().unwrap(), "--as", "JQ"], dir.path());
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("needs a terminal"), "{err}");
    assert!(
        !plan.with_extension("yaml.lock").exists(),
        "no lock is left behind"
    );
}

#[test]
fn a_broken_file_prints_where_and_why_before_any_screen() {
    let dir = tempfile::tempdir().unwrap();
    let bad = dir.path().join("bad.yaml");
    std::fs::write(
        &bad,
        "schema: 1\njob:\n  id: J-1\n  part: x\n  colour: red\nfeatures: []\n",
    )
    .unwrap();
    let (code, _, err) = tiltbook(&["open", bad.to_str().unwrap()], dir.path());
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("bad.yaml:5:"), "file:line:col first: {err}");
    assert!(err.contains("colour"), "{err}");
    let (code, _, err) = tiltbook(&["open", "no/such/file.yaml"], dir.path());
    assert_eq!(code, 2);
    assert!(err.contains("cannot read"), "{err}");
}

#[test]
fn a_file_with_problems_is_refused_with_each_problem() {
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("dup.yaml");
    let text = tiltbook::cli::demo::DEMO_PLAN.replace("id: F2", "id: F1");
    std::fs::write(&f, text).unwrap();
    let (code, _, err) = tiltbook(&["open", f.to_str().unwrap()], dir.path());
    assert_eq!(code, 1, "{err}");
    assert!(
        err.contains("dup.yaml:") && err.contains("tiltbook check"),
        "{err}"
    );
}

#[test]
fn a_bad_colour_word_is_a_usage_error() {
    let dir = tempfile::tempdir().unwrap();
    let (code, _, err) = tiltbook(&["open", "x.yaml", "--color", "sometimes"], dir.path());
    assert_eq!(code, 2);
    assert!(err.contains("always") && err.contains("never"), "{err}");
}

#[test]
fn demo_writes_the_plan_in_the_data_folder_and_says_where() {
    let dir = tempfile::tempdir().unwrap();
    let data = dir.path().join("d");
    let (code, out, err) = tiltbook(&["demo", "--as", "JQ"], &data);
    // no terminal here: the job is written, then opening it stops with exit 2
    assert_eq!(code, 2, "{err}");
    let files: Vec<_> = std::fs::read_dir(&data)
        .unwrap()
        .filter_map(Result::ok)
        .collect();
    assert_eq!(files.len(), 1, "{files:?}");
    let path = files[0].path();
    assert!(out.contains(&path.display().to_string()), "{out}");
    let text = std::fs::read_to_string(&path).unwrap();
    assert_eq!(text, tiltbook::cli::demo::DEMO_PLAN);
    // a second demo never overwrites the first
    let _ = tiltbook(&["demo"], &data);
    assert_eq!(std::fs::read_dir(&data).unwrap().count(), 2);
}

#[test]
fn a_value_changed_after_sign_off_does_not_stop_the_job_opening() {
    // the record is whole: the review flags the change for the lead (`check` still lists it)
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("changed.yaml");
    let finished = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml"),
    )
    .unwrap();
    std::fs::write(
        &f,
        finished.replacen("tolerance: ±0°05'", "tolerance: ±0°06'", 1),
    )
    .unwrap();
    let (code, _, err) = tiltbook(
        &["open", f.to_str().unwrap(), "--review", "--read-only"],
        dir.path(),
    );
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("needs a terminal") && !err.contains("problem"),
        "{err}"
    );
    let (code, out, err) = tiltbook(&["check", f.to_str().unwrap()], dir.path());
    assert_eq!(code, 1, "{out}{err}");
    assert!(
        format!("{out}{err}").contains("changed after sign-off"),
        "{out}{err}"
    );
}
