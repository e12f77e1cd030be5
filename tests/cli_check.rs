//! `tiltbook check`: exit codes and the `file:line:col: message` lines.

use std::path::{Path, PathBuf};
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_tiltbook"))
}
fn root(p: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(p)
}

#[test]
fn clean_files_print_ok_and_exit_0() {
    let out = bin()
        .arg("check")
        .arg(root("sample-jobs/ds-204-plan.yaml"))
        .arg(root("sample-jobs/ds-204-finished.yaml"))
        .output()
        .unwrap();
    let so = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(0), "{so}");
    assert_eq!(
        so.lines().filter(|l| l.ends_with(": ok")).count(),
        2,
        "{so}"
    );
}

#[test]
fn problems_are_listed_with_file_line_and_column_and_exit_1() {
    let bad = root("tests/data/travellers-bad/unknown-key.yaml");
    let good = root("sample-jobs/ds-204-plan.yaml");
    let out = bin().arg("check").arg(&good).arg(&bad).output().unwrap();
    let so = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(1), "{so}");
    let want = format!(
        "{}:9:5: features[0]: unknown key `nomnal`; did you mean `nominal`?",
        bad.display()
    );
    assert!(so.lines().any(|l| l.starts_with(&want)), "{so}");
    assert!(so.contains(&format!("{}: ok", good.display())), "{so}");
}

#[test]
fn every_problem_in_a_file_is_listed() {
    let bad = root("tests/data/travellers-bad/readings-mode.yaml");
    let out = bin().arg("check").arg(&bad).output().unwrap();
    let so = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(1));
    assert_eq!(so.lines().count(), 3, "{so}");
}

#[test]
fn an_unreadable_file_exits_2_after_checking_the_rest() {
    let missing = root("tests/data/travellers-bad/no-such-file.yaml");
    let bad = root("tests/data/travellers-bad/zero-tolerance.yaml");
    let out = bin().arg("check").arg(&missing).arg(&bad).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let se = String::from_utf8_lossy(&out.stderr);
    assert!(
        se.contains("cannot read") && se.contains("no-such-file.yaml"),
        "{se}"
    );
    let so = String::from_utf8_lossy(&out.stdout);
    assert!(so.contains("the tolerance is zero"), "{so}");
}

#[test]
fn no_file_is_a_usage_error() {
    let out = bin().arg("check").output().unwrap();
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn every_sample_file_is_clean_including_the_shop_file() {
    // `tiltbook check sample-jobs/*.yaml` must exit 0: the shop file is checked as a shop file.
    let mut files: Vec<PathBuf> = std::fs::read_dir(root("sample-jobs"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "yaml"))
        .collect();
    files.sort();
    let out = bin().arg("check").args(&files).output().unwrap();
    let so = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(0), "{so}");
    assert!(so.contains("demo-shop.yaml: ok (shop file)"), "{so}");
    assert_eq!(so.lines().count(), files.len(), "{so}");
}

#[test]
fn a_broken_shop_file_is_reported_with_line_and_column() {
    let bad = root("tests/data/blocks-bad-shops/unknown-key.yaml");
    let out = bin().arg("check").arg(&bad).output().unwrap();
    let so = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(1), "{so}");
    assert!(so.starts_with(&format!("{}:8:5: ", bad.display())), "{so}");
    assert!(so.contains("unknown field `colour`"), "{so}");
}
