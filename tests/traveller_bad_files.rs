//! Every broken file in tests/data/travellers-bad/ gives exactly the problems its `# expect:`
//! lines name, at the line and column they name.

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

#[test]
fn each_bad_file_reports_what_it_expects() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/travellers-bad");
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "yaml"))
        .collect();
    files.sort();
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
fn every_message_says_what_to_do() {
    // each problem names a fix: "add", "give", "remove", "set", "did you mean", "record"…
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/travellers-bad");
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
    for e in std::fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        if p.extension().is_none_or(|e| e != "yaml") {
            continue;
        }
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
