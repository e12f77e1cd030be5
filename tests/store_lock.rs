//! The lock beside a traveller: a second opener is refused with the holder named, read-only
//! opening always works, a stale lock can be taken over (and that is logged).

use std::fs;
use std::path::{Path, PathBuf};
use tiltbook::store::*;
use tiltbook::traveller::*;

fn new_job(dir: &Path) -> PathBuf {
    let plan = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs/ds-204-plan.yaml");
    let path = dir.join("j.yaml");
    fs::copy(plan, &path).unwrap();
    path
}

fn write_lock(path: &Path, info: &LockInfo) {
    fs::write(lock_path(path), serde_yaml::to_string(info).unwrap()).unwrap();
}

/// A process id no process has: above the largest Linux allows (2^22).
const GONE: u32 = 4_194_305;

#[test]
fn a_second_opener_is_refused_with_the_holder_named() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    let (first, _) = Store::open(&path, "KM").unwrap();
    let e = Store::open(&path, "TJ").unwrap_err();
    match &e {
        StoreError::Locked { holder, stale, .. } => {
            assert_eq!(holder.who, "KM");
            assert_eq!(holder.pid, std::process::id());
            assert_eq!(holder.host, host_name());
            assert!(!stale);
        }
        other => panic!("expected Locked, got {other:?}"),
    }
    let m = e.to_string();
    assert!(
        m.contains("is open by KM on") && m.contains("open it read-only"),
        "{m}"
    );
    // read-only opening always works
    let (ro, loaded) = Store::open_read_only(&path).unwrap();
    assert!(ro.is_read_only() && ro.lock_info().is_none());
    assert_eq!(loaded.traveller.job.id, "J-2417");
    // the lock goes with the first store
    drop(first);
    assert!(!lock_path(&path).exists());
    let (second, _) = Store::open(&path, "TJ").unwrap();
    assert_eq!(second.lock_info().unwrap().who, "TJ");
}

#[test]
fn the_lock_file_holds_who_where_which_process_and_since() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    let (s, _) = Store::open(&path, "KM").unwrap();
    let text = fs::read_to_string(lock_path(&path)).unwrap();
    for k in ["who: KM", "host:", "pid:", "since:"] {
        assert!(text.contains(k), "{k} missing in {text}");
    }
    assert_eq!(read_lock(&lock_path(&path)).as_ref(), s.lock_info());
}

#[test]
fn a_stale_lock_can_be_taken_over_and_it_is_logged() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    let gone = LockInfo {
        who: "KM".into(),
        host: host_name(),
        pid: GONE,
        since: Stamp::parse("2025-03-04T07:05:00-05:00").unwrap(),
    };
    write_lock(&path, &gone);
    if process_alive(GONE) != Some(false) {
        eprintln!("skipped: this system cannot tell whether a process is running");
        return;
    }
    let holder = match Store::open(&path, "TJ").unwrap_err() {
        StoreError::Locked {
            holder,
            stale: true,
            ..
        } => holder,
        other => panic!("expected a stale lock, got {other:?}"),
    };
    assert_eq!(holder, gone);
    let (store, loaded) = Store::take_over(&path, "TJ", &holder).unwrap();
    assert_eq!(store.lock_info().unwrap().who, "TJ");
    let e = loaded.traveller.events.last().unwrap();
    assert_eq!(e.kind, EventKind::LockTakenOver);
    assert_eq!(e.by, "TJ");
    assert!(e.detail.contains("KM"), "{}", e.detail);
    // saved at once
    let on_disk = load(&path).unwrap().traveller;
    assert_eq!(
        on_disk.events.last().unwrap().kind,
        EventKind::LockTakenOver
    );
}

#[test]
fn a_live_or_foreign_lock_cannot_be_taken_over() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    let (_first, _) = Store::open(&path, "KM").unwrap();
    let live = read_lock(&lock_path(&path)).unwrap();
    assert!(matches!(
        Store::take_over(&path, "TJ", &live),
        Err(StoreError::Locked { stale: false, .. })
    ));
    let dir2 = tempfile::tempdir().unwrap();
    let path2 = new_job(dir2.path());
    let foreign = LockInfo {
        who: "KM".into(),
        host: "another-computer".into(),
        pid: GONE,
        since: Stamp::now(),
    };
    write_lock(&path2, &foreign);
    assert_eq!(foreign.liveness(), Liveness::Unknown);
    assert!(matches!(
        Store::open(&path2, "TJ"),
        Err(StoreError::Locked { stale: false, .. })
    ));
    assert!(Store::take_over(&path2, "TJ", &foreign).is_err());
    assert_eq!(read_lock(&lock_path(&path2)), Some(foreign));
}

#[test]
fn an_unreadable_lock_is_reported_not_removed() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    fs::write(lock_path(&path), "").unwrap();
    let e = Store::open(&path, "TJ").unwrap_err();
    assert!(matches!(e, StoreError::LockUnreadable { .. }), "{e:?}");
    assert!(e.to_string().contains("delete that file"), "{e}");
    assert!(lock_path(&path).exists());
}

#[test]
fn saving_after_losing_the_lock_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    let (mut s, loaded) = Store::open(&path, "KM").unwrap();
    let other = LockInfo {
        who: "TJ".into(),
        host: host_name(),
        pid: 1,
        since: Stamp::now(),
    };
    write_lock(&path, &other);
    let e = s.save_confirmed(&loaded.traveller).unwrap_err();
    assert!(matches!(e, StoreError::LockLost { .. }), "{e:?}");
    // and dropping the store leaves the other holder's lock alone
    drop(s);
    assert_eq!(read_lock(&lock_path(&path)), Some(other));
}

#[test]
fn release_all_locks_clears_this_process_locks() {
    let dir = tempfile::tempdir().unwrap();
    let path = new_job(dir.path());
    let (s, _) = Store::open(&path, "KM").unwrap();
    assert!(lock_path(&path).exists());
    release_all_locks();
    assert!(!lock_path(&path).exists());
    release_all_locks(); // twice is harmless
    drop(s);
}
