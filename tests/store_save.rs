//! Safe saving: round trip, the backup, and failed saves that lose nothing.

use std::fs;
use std::path::{Path, PathBuf};
use tiltbook::store::{Store, StoreError, backup_path, load};
use tiltbook::traveller::*;

fn finished() -> Traveller {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-finished.yaml");
    parse(&fs::read_to_string(p).unwrap()).unwrap().traveller
}

fn plan() -> Traveller {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml");
    parse(&fs::read_to_string(p).unwrap()).unwrap().traveller
}

fn files_in(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

#[test]
fn save_and_load_round_trip_with_a_backup() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j-2417.yaml");
    let t = finished();
    let mut store = Store::create(&path, &plan(), "KM").unwrap();
    assert!(!backup_path(&path).exists());
    store.save_confirmed(&t).unwrap();
    assert_eq!(load(&path).unwrap().traveller, t);
    // the plan is kept beside it as NAME.bak
    let bak = load(&backup_path(&path)).unwrap().traveller;
    assert_eq!(bak, plan());
    assert_eq!(
        files_in(dir.path()),
        vec!["j-2417.yaml", "j-2417.yaml.bak", "j-2417.yaml.lock"]
    );
    drop(store);
    assert_eq!(files_in(dir.path()), vec!["j-2417.yaml", "j-2417.yaml.bak"]);
}

#[test]
fn create_refuses_an_existing_file() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j.yaml");
    fs::write(&path, "x").unwrap();
    assert!(matches!(
        Store::create(&path, &plan(), "KM"),
        Err(StoreError::Exists { .. })
    ));
    assert_eq!(fs::read(&path).unwrap(), b"x");
}

/// A save that cannot complete: the target's backup name is taken by a folder, so the old file
/// cannot be set aside. The save must fail, the old file must be untouched, and nothing else
/// may be left behind.
#[test]
fn a_failed_save_keeps_the_old_file_and_the_job() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j.yaml");
    let mut store = Store::create(&path, &plan(), "KM").unwrap();
    let before = fs::read(&path).unwrap();
    let bak: PathBuf = backup_path(&path);
    fs::create_dir(&bak).unwrap();
    fs::write(bak.join("keep"), "x").unwrap();
    let job = finished();
    let copy = job.clone();
    let e = store.save_confirmed(&job).unwrap_err();
    assert!(matches!(e, StoreError::Write { .. }), "{e:?}");
    let m = e.to_string();
    assert!(
        m.contains("nothing was changed on disk") && m.contains("job on screen is kept"),
        "{m}"
    );
    assert_eq!(fs::read(&path).unwrap(), before, "old file changed");
    assert_eq!(job, copy, "in-memory job changed");
    assert_eq!(
        files_in(dir.path()),
        vec!["j.yaml", "j.yaml.bak", "j.yaml.lock"]
    );
    // once the obstacle is gone the same job saves
    fs::remove_dir_all(&bak).unwrap();
    store.save_confirmed(&job).unwrap();
    assert_eq!(load(&path).unwrap().traveller, job);
}

/// A traveller path that is a folder cannot be written over.
#[test]
fn saving_over_a_folder_fails_cleanly() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j.yaml");
    let mut store = Store::create(&path, &plan(), "KM").unwrap();
    fs::remove_file(&path).unwrap();
    fs::create_dir(&path).unwrap();
    assert!(matches!(
        store.save_confirmed(&finished()),
        Err(StoreError::Write { .. })
    ));
    assert!(path.is_dir());
    assert_eq!(files_in(dir.path()), vec!["j.yaml", "j.yaml.lock"]);
}

/// A read-only folder: only meaningful when not running as root (root writes anyway).
#[cfg(unix)]
#[test]
fn a_read_only_folder_keeps_the_old_file() {
    use std::os::unix::fs::PermissionsExt;
    let dir = tempfile::tempdir().unwrap();
    let sub = dir.path().join("jobs");
    fs::create_dir(&sub).unwrap();
    let path = sub.join("j.yaml");
    let mut store = Store::create(&path, &plan(), "KM").unwrap();
    let before = fs::read(&path).unwrap();
    fs::set_permissions(&sub, fs::Permissions::from_mode(0o555)).unwrap();
    let probe = sub.join(".probe");
    if fs::write(&probe, "x").is_ok() {
        let _ = fs::remove_file(&probe);
        fs::set_permissions(&sub, fs::Permissions::from_mode(0o755)).unwrap();
        eprintln!("skipped: running with rights that write into a read-only folder (root?)");
        return;
    }
    let job = finished();
    let r = store.save_confirmed(&job);
    fs::set_permissions(&sub, fs::Permissions::from_mode(0o755)).unwrap();
    assert!(matches!(r, Err(StoreError::Write { .. })), "{r:?}");
    assert_eq!(fs::read(&path).unwrap(), before);
}

#[test]
fn a_job_that_cannot_be_written_whole_is_never_written() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j.yaml");
    let mut store = Store::create(&path, &plan(), "KM").unwrap();
    let before = fs::read(&path).unwrap();
    let mut bad = finished();
    bad.features[0].attempts[0]
        .judgement
        .as_mut()
        .unwrap()
        .fit
        .slope = f64::NAN;
    let e = store.save_confirmed(&bad).unwrap_err();
    assert!(matches!(e, StoreError::Serialize(_)), "{e:?}");
    assert!(e.to_string().contains("F1 attempt 1"), "{e}");
    assert_eq!(fs::read(&path).unwrap(), before);
    assert!(!backup_path(&path).exists());
}

#[test]
fn a_read_only_store_refuses_to_save() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j.yaml");
    drop(Store::create(&path, &plan(), "KM").unwrap());
    let (mut ro, loaded) = Store::open_read_only(&path).unwrap();
    assert!(ro.is_read_only());
    let e = ro.save_confirmed(&loaded.traveller).unwrap_err();
    assert!(e.to_string().contains("read-only"), "{e}");
}

#[test]
fn a_broken_file_names_its_line() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("j.yaml");
    fs::write(
        &path,
        "schema: 1\njob:\n  id: J\n  part: P\nfeatures:\n  - id: F1\n    nomnal: 3\n",
    )
    .unwrap();
    let e = Store::open(&path, "KM").unwrap_err();
    let m = e.to_string();
    assert!(m.starts_with(&format!("{}:7:5:", path.display())), "{m}");
    // a failed open leaves no lock behind
    assert!(!tiltbook::store::lock_path(&path).exists());
}
