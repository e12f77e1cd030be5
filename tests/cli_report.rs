//! `tiltbook report`: formats, output files, and errors.

use std::path::{Path, PathBuf};
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_tiltbook"))
}
fn finished() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml")
}

#[test]
fn text_is_the_default() {
    let out = bin().arg("report").arg(finished()).output().unwrap();
    assert_eq!(out.status.code(), Some(0));
    let so = String::from_utf8_lossy(&out.stdout);
    assert!(
        so.starts_with("Traveller J-2417 — DS-204 dovetail slide\n====="),
        "{so}"
    );
    assert!(so.contains("Progress:  7 of 7 features finished"), "{so}");
}

#[test]
fn markdown_on_request() {
    let out = bin()
        .args(["report", "--format", "markdown"])
        .arg(finished())
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
    let so = String::from_utf8_lossy(&out.stdout);
    assert!(so.starts_with("# Traveller J-2417"), "{so}");
    assert!(so.contains("| F3 | end chamfer |"), "{so}");
}

#[test]
fn html_to_a_file_by_its_name() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("j.html");
    let out = bin()
        .arg("report")
        .arg(finished())
        .arg("--output")
        .arg(&out_path)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
    assert!(out.stdout.is_empty());
    let html = std::fs::read_to_string(&out_path).unwrap();
    assert!(html.starts_with("<!DOCTYPE html>"), "{html}");
    assert!(html.trim_end().ends_with("</html>"));
}

#[test]
fn a_bad_format_is_a_usage_error_with_the_choices() {
    let out = bin()
        .args(["report", "--format", "pdf"])
        .arg(finished())
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let se = String::from_utf8_lossy(&out.stderr);
    assert!(
        se.contains("'pdf' is not a report format; use text, markdown or html"),
        "{se}"
    );
}

#[test]
fn a_broken_or_missing_file_exits_2() {
    let bad =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/travellers-bad/unknown-key.yaml");
    let out = bin().arg("report").arg(&bad).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let se = String::from_utf8_lossy(&out.stderr);
    assert!(
        se.contains(":9:5:") && se.contains("tiltbook check"),
        "{se}"
    );
    let out = bin().arg("report").arg("no-such.yaml").output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("cannot read no-such.yaml"));
}

#[test]
fn a_file_over_the_size_limit_is_refused_before_it_is_read() {
    // 16 MiB is tiltbook's own limit for a traveller (docs/traveller-format.md); a sparse file
    // one byte over it holds no data, so nothing is read if the size is checked first
    let dir = tempfile::tempdir().unwrap();
    let big = dir.path().join("huge.yaml");
    let f = std::fs::File::create(&big).unwrap();
    f.set_len(tiltbook::traveller::schema::MAX_BYTES + 1)
        .unwrap();
    let out = bin().arg("report").arg(&big).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let se = String::from_utf8_lossy(&out.stderr);
    assert!(
        se.contains("more than the 16.8 MB") && se.contains("huge.yaml"),
        "{se}"
    );
}
