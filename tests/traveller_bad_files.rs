//! Every broken file in tests/data/travellers-bad/ gives exactly the problems its `# expect:`
//! lines name, at the line and column they name; and `tiltbook check FILE` exits 1 printing them.

use std::path::Path;
use tiltbook::traveller::check_text;

/// `LINE:COL: start of message`, or just the start of a message when no position is given.
fn matches(expect: &str, got: &str) -> bool {
    let has_pos = expect
        .split(':')
        .take(2)
        .all(|p| !p.is_empty() && p.bytes().all(|b| b.is_ascii_digit()));
    if has_pos {
        got.starts_with(expect)
    } else {
        got.contains(expect)
    }
}

/// The broken files, in name order.
fn bad_files() -> Vec<std::path::PathBuf> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/travellers-bad");
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "yaml"))
        .collect();
    files.sort();
    files
}

#[test]
fn each_bad_file_reports_what_it_expects() {
    let files = bad_files();
    assert!(files.len() >= 25, "only {} bad files", files.len());
    let mut failures = Vec::new();
    for f in &files {
        let text = std::fs::read_to_string(f).unwrap();
        let expects: Vec<&str> = text
            .lines()
            .filter_map(|l| l.strip_prefix("# expect: "))
            .collect();
        assert!(!expects.is_empty(), "{} has no # expect: line", f.display());
        let got: Vec<String> = check_text(&text).iter().map(|p| p.to_string()).collect();
        let ok =
            got.len() == expects.len() && expects.iter().all(|e| got.iter().any(|g| matches(e, g)));
        if !ok {
            failures.push(format!(
                "{}\n  expected: {expects:#?}\n  got:      {got:#?}",
                f.file_name().unwrap().to_string_lossy()
            ));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn check_exits_1_on_each_bad_file_with_its_message() {
    let files = bad_files();
    for f in &files {
        let text = std::fs::read_to_string(f).unwrap();
        let out = std::process::Command::new(env!("CARGO_BIN_EXE_tiltbook"))
            .arg("check")
            .arg(f)
            .output()
            .unwrap();
        let so = String::from_utf8_lossy(&out.stdout);
        assert_eq!(out.status.code(), Some(1), "{}: {so}", f.display());
        let name = format!("{}:", f.display());
        for e in text.lines().filter_map(|l| l.strip_prefix("# expect: ")) {
            let found = so
                .lines()
                .filter_map(|l| l.strip_prefix(&name))
                .any(|got| matches(e, got));
            assert!(found, "{}: expected {e:?} in\n{so}", f.display());
        }
    }
}

#[test]
fn binary_garbage_is_refused_with_a_message() {
    // bytes that are not UTF-8 (0xFF never occurs in UTF-8, RFC 3629 §1)
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("garbage.yaml");
    std::fs::write(&p, [0x00, 0xff, 0xfe, 0x1b, b'[', 0x9c, 0x00, 0x80]).unwrap();
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_tiltbook"))
        .arg("check")
        .arg(&p)
        .output()
        .unwrap();
    let so = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(1), "{so}");
    assert!(
        so.contains("garbage.yaml:1:1: the file is not UTF-8 text; save it as UTF-8"),
        "{so}"
    );
}

#[test]
fn every_message_says_what_to_do() {
    // each problem names a fix: "add", "give", "remove", "set", "did you mean", "record"…
    let hints = [
        "add",
        "give",
        "remove",
        "set ",
        "did you mean",
        "record",
        "correct",
        "recompute",
        "check",
        "open it",
        "write",
        "list",
        "raise",
        "sign",
        "must",
        "see docs",
        "allowed",
        "use ",
        "type",
        "finish",
        "restore",
    ];
    for p in bad_files() {
        for prob in check_text(&std::fs::read_to_string(&p).unwrap()) {
            let m = prob.message.to_lowercase();
            assert!(
                hints.iter().any(|h| m.contains(h)),
                "{}: message gives no next step: {}",
                p.display(),
                prob.message
            );
        }
    }
}
