//! Saving into a read-only folder fails cleanly with the job intact, also when the tests run as
//! root (root writes into read-only folders, so the save is then made by this test binary run
//! again as the unprivileged user 65534 from a copy in a temporary folder).

#[cfg(unix)]
mod unix {
    use std::fs;
    use std::os::unix::fs::{MetadataExt, PermissionsExt};
    use std::os::unix::process::CommandExt;
    use std::path::{Path, PathBuf};
    use std::process::Command;
    use tiltbook::store::{Store, StoreError};
    use tiltbook::traveller::{Traveller, parse};

    const WORK_ENV: &str = "TILTBOOK_TEST_READ_ONLY_DIR";
    const NOBODY: u32 = 65534;

    fn job(dir: &Path, name: &str) -> Traveller {
        parse(&fs::read_to_string(dir.join(name)).unwrap())
            .unwrap()
            .traveller
    }

    /// In `work` (holding plan.yaml and finished.yaml): create a job in work/jobs, make the
    /// folder read-only, try to save. Panics (with what went wrong) unless the save is refused
    /// and both the file and the job are as they were.
    fn save_into_read_only_folder(work: &Path) {
        let sub = work.join("jobs");
        let path = sub.join("j.yaml");
        let mut store = Store::create(&path, &job(work, "plan.yaml"), "KM").unwrap();
        let before = fs::read(&path).unwrap();
        fs::set_permissions(&sub, fs::Permissions::from_mode(0o555)).unwrap();
        let probe = fs::write(sub.join(".probe"), "x");
        let job_now = job(work, "finished.yaml");
        let copy = job_now.clone();
        let r = store.save_confirmed(&job_now);
        fs::set_permissions(&sub, fs::Permissions::from_mode(0o755)).unwrap();
        assert!(probe.is_err(), "the folder was writable after chmod 555");
        let e = r.unwrap_err();
        assert!(matches!(e, StoreError::Write { .. }), "{e:?}");
        let m = e.to_string();
        assert!(
            m.contains("nothing was changed on disk") && m.contains("Permission denied"),
            "{m}"
        );
        assert_eq!(fs::read(&path).unwrap(), before, "old file changed");
        assert_eq!(job_now, copy, "in-memory job changed");
        // once the folder is writable again the same job saves
        store.save_confirmed(&job_now).unwrap();
    }

    #[test]
    #[ignore = "run by a_read_only_folder_keeps_the_job_even_for_root as user 65534"]
    fn child_read_only_save() {
        let Ok(work) = std::env::var(WORK_ENV) else {
            return;
        };
        save_into_read_only_folder(Path::new(&work));
    }

    #[test]
    fn a_read_only_folder_keeps_the_job_even_for_root() {
        let dir = tempfile::tempdir().unwrap();
        let work = dir.path().to_path_buf();
        let samples = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-jobs");
        fs::copy(samples.join("ds-204-plan.yaml"), work.join("plan.yaml")).unwrap();
        fs::copy(
            samples.join("ds-204-finished.yaml"),
            work.join("finished.yaml"),
        )
        .unwrap();
        let sub = work.join("jobs");
        fs::create_dir(&sub).unwrap();
        let root = fs::metadata(&sub).unwrap().uid() == 0;
        if !root {
            save_into_read_only_folder(&work);
            return;
        }
        // as root: hand the folder to user 65534 and run the save as that user, from a copy of
        // this binary it can reach
        fs::set_permissions(&work, fs::Permissions::from_mode(0o755)).unwrap();
        std::os::unix::fs::chown(&sub, Some(NOBODY), Some(NOBODY)).unwrap();
        let exe: PathBuf = work.join("test-binary");
        fs::copy(std::env::current_exe().unwrap(), &exe).unwrap();
        let out = Command::new(&exe)
            .uid(NOBODY)
            .gid(NOBODY)
            .args(["--exact", "unix::child_read_only_save", "--ignored"])
            .args(["--test-threads", "1"])
            .env(WORK_ENV, &work)
            .current_dir(&work)
            .output()
            .unwrap();
        let text = String::from_utf8_lossy(&out.stdout).into_owned()
            + &String::from_utf8_lossy(&out.stderr);
        assert!(
            out.status.success(),
            "the save as user {NOBODY} failed:\n{text}"
        );
        assert!(text.contains("1 passed"), "the child ran no test:\n{text}");
    }
}

#[cfg(not(unix))]
#[test]
fn a_read_only_folder_keeps_the_job_even_for_root() {
    eprintln!("skipped: read-only folders are tested with Unix permissions only");
}
