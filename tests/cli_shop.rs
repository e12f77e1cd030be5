//! `tiltbook shop`: listing, --init, where the file is read from, and broken shop files.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// Run the binary with a private home and configuration folder, no TILTBOOK_SHOP unless given.
fn run(home: &Path, env_shop: Option<&Path>, args: &[&str]) -> Output {
    let mut c = Command::new(env!("CARGO_BIN_EXE_tiltbook"));
    c.args(args)
        .env("HOME", home)
        .env("XDG_CONFIG_HOME", home.join(".config"))
        .env("APPDATA", home.join("AppData"))
        .env_remove("TILTBOOK_SHOP");
    if let Some(p) = env_shop {
        c.env("TILTBOOK_SHOP", p);
    }
    c.output().expect("the tiltbook binary runs")
}

fn text(b: &[u8]) -> String {
    String::from_utf8_lossy(b).into_owned()
}

fn data(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/data")
        .join(rel)
}

fn config_file(home: &Path) -> PathBuf {
    home.join(".config").join("tiltbook").join("shop.yaml")
}

#[test]
fn lists_the_built_in_demo_shop_when_there_is_no_file() {
    let home = tempfile::tempdir().unwrap();
    let o = run(home.path(), None, &["shop"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let out = text(&o.stdout);
    assert!(out.contains("built-in demo shop"), "{out}");
    for id in [
        "SB5-117",
        "SP10-042",
        "SB100-203",
        "SB200-088",
        "SC5-310",
        "CSP5-014",
        "BX81-A",
        "BX88-B",
    ] {
        assert!(out.contains(id), "{id} missing from:\n{out}");
    }
    assert!(out.contains("missing 0.1007 in"), "{out}");
    assert!(out.contains("--init"), "{out}");
}

#[test]
fn json_listing_has_stable_keys() {
    let home = tempfile::tempdir().unwrap();
    let o = run(home.path(), None, &["shop", "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["source"], "built-in");
    assert!(v["path"].is_null());
    let f = &v["fixtures"][0];
    for k in [
        "id",
        "kind",
        "unit",
        "center",
        "pivot_roll",
        "raised_roll",
        "calibrated",
        "calibration_due",
        "calibration_overdue",
        "center_uncertainty",
        "largest_stack",
        "angle_range_deg",
        "note",
    ] {
        assert!(f.get(k).is_some(), "fixture key {k} missing: {f}");
    }
    assert_eq!(f["center"], "5.00002");
    let s = &v["block_sets"][0];
    for k in [
        "id",
        "catalogue",
        "unit",
        "grade",
        "calibration_due",
        "resolution",
        "block_count",
        "usable_count",
        "missing",
        "damaged",
        "worn",
        "protectors",
    ] {
        assert!(s.get(k).is_some(), "set key {k} missing: {s}");
    }
    assert_eq!(s["block_count"], 81);
    assert_eq!(s["usable_count"], 80);
    assert_eq!(s["missing"][0], "0.1007");
}

#[test]
fn init_writes_an_editable_file_once() {
    let home = tempfile::tempdir().unwrap();
    let o = run(home.path(), None, &["shop", "--init"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let cfg = config_file(home.path());
    let written = std::fs::read_to_string(&cfg).unwrap();
    assert!(written.starts_with("# tiltbook shop file"), "{written}");
    assert!(written.contains("# kind:"), "the file explains its keys");
    // now it is read from the configuration folder
    let o = run(home.path(), None, &["shop"]);
    assert!(text(&o.stdout).contains(&cfg.display().to_string()));
    // a second --init refuses, says where the file is and how to edit it
    let o = run(home.path(), None, &["shop", "--init"]);
    assert_eq!(o.status.code(), Some(2));
    let e = text(&o.stderr);
    assert!(e.contains(&cfg.display().to_string()), "{e}");
    assert!(
        e.contains("already exists") && e.contains("text editor"),
        "{e}"
    );
    assert_eq!(std::fs::read_to_string(&cfg).unwrap(), written);
}

#[test]
fn init_with_a_path_and_precedence_of_option_over_env() {
    let home = tempfile::tempdir().unwrap();
    let mine = home.path().join("cell").join("mine.yaml");
    let m = mine.to_str().unwrap();
    let o = run(home.path(), None, &["shop", "--init", "--shop", m]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    assert!(mine.exists());
    assert!(!config_file(home.path()).exists());
    // TILTBOOK_SHOP names a file: it is used
    let test_shop = data("blocks/shop-missing-0.1008.yaml");
    let o = run(home.path(), Some(&test_shop), &["shop"]);
    let out = text(&o.stdout);
    assert!(
        out.contains("TS-81") && out.contains("TILTBOOK_SHOP"),
        "{out}"
    );
    // --shop wins over TILTBOOK_SHOP
    let o = run(home.path(), Some(&test_shop), &["shop", "--shop", m]);
    let out = text(&o.stdout);
    assert!(out.contains("BX81-A") && !out.contains("TS-81"), "{out}");
    // a named file that is not there: exit 2, saying how to make one
    let gone = home.path().join("gone.yaml");
    let o = run(
        home.path(),
        None,
        &["shop", "--shop", gone.to_str().unwrap()],
    );
    assert_eq!(o.status.code(), Some(2));
    let e = text(&o.stderr);
    assert!(e.contains("no shop file") && e.contains("--init"), "{e}");
}

#[test]
fn broken_shop_files_say_where_and_what_to_write() {
    // each file's first line: `# expect: LINE:COLUMN: fragment of the message`
    let home = tempfile::tempdir().unwrap();
    let dir = data("blocks-bad-shops");
    let mut n = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().and_then(|e| e.to_str()) != Some("yaml") {
            continue;
        }
        n += 1;
        let body = std::fs::read_to_string(&path).unwrap();
        let expect = body
            .lines()
            .next()
            .and_then(|l| l.strip_prefix("# expect: "))
            .unwrap_or_else(|| panic!("{} has no `# expect:` line", path.display()));
        let o = run(
            home.path(),
            None,
            &["shop", "--shop", path.to_str().unwrap()],
        );
        assert_eq!(o.status.code(), Some(2), "{}", path.display());
        let e = text(&o.stderr);
        let want = format!("{}:{expect}", path.display());
        assert!(
            e.contains(&want),
            "{}: wanted {want:?}\ngot {e}",
            path.display()
        );
    }
    assert!(n >= 8, "only {n} broken files found");
}

#[test]
fn stack_refuses_a_broken_shop_with_the_same_message() {
    let home = tempfile::tempdir().unwrap();
    let bad = data("blocks-bad-shops/no-unit.yaml");
    let o = run(
        home.path(),
        Some(&bad),
        &["stack", "30", "--center", "5in", "--set", "inch-81"],
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o.stderr).contains("5:13: "), "{}", text(&o.stderr));
}
