//! Fault test: a process saving the traveller in a loop is killed (SIGKILL) at random moments,
//! 500 times. After each kill the traveller must read and hold exactly one whole saved version
//! (the one before or a later one), never a mix; `NAME.bak` likewise.
//!
//! The saving process is this test binary run again with `SAVE_LOOP_ENV` set, running the
//! ignored test `child_save_loop`.

#[cfg(unix)]
mod unix {
    use std::fs;
    use std::io::{BufRead, BufReader};
    use std::path::{Path, PathBuf};
    use std::process::{Command, Stdio};
    use std::time::{Duration, Instant};
    use tiltbook::store::{Store, backup_path, load, lock_path, render};
    use tiltbook::traveller::{Traveller, parse};

    const SAVE_LOOP_ENV: &str = "TILTBOOK_TEST_SAVE_LOOP";
    const READY: &str = "save-loop: saving";
    const KILLS: usize = 500;

    fn sample(name: &str) -> Traveller {
        let p = Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("sample-jobs")
            .join(name);
        parse(&fs::read_to_string(p).unwrap()).unwrap().traveller
    }

    /// Version `n` of the job (the seven-feature plan): odd versions keep two features, even ones
    /// all seven, so a file mixing two versions could not match either.
    fn version(base: &Traveller, n: u64) -> Traveller {
        let mut t = base.clone();
        t.job.notes = format!("save {n}");
        if n % 2 == 1 {
            t.features.truncate(2);
        }
        t
    }

    fn version_of(t: &Traveller) -> u64 {
        t.job
            .notes
            .strip_prefix("save ")
            .and_then(|n| n.parse().ok())
            .unwrap_or_else(|| panic!("not a saved version: {:?}", t.job.notes))
    }

    /// The file holds exactly version n's text, for some n; returns n.
    fn whole_version(base: &Traveller, path: &Path) -> u64 {
        let loaded = load(path).unwrap_or_else(|e| panic!("{} does not read: {e}", path.display()));
        let n = version_of(&loaded.traveller);
        let expected = render(&version(base, n)).unwrap();
        let on_disk = fs::read_to_string(path).unwrap();
        assert!(
            on_disk == expected,
            "{} is not whole version {n}",
            path.display()
        );
        n
    }

    /// Run in the child: open the job, then save versions n+1, n+2, … until killed.
    #[test]
    #[ignore = "run by store_kill as the process that is killed"]
    fn child_save_loop() {
        let Ok(path) = std::env::var(SAVE_LOOP_ENV) else {
            return;
        };
        let path = PathBuf::from(path);
        let base = sample("ds-204-plan.yaml");
        let (mut store, loaded) = Store::open(&path, "KM").unwrap();
        let mut n = version_of(&loaded.traveller);
        println!("{READY}");
        loop {
            n += 1;
            store.save_confirmed(&version(&base, n)).unwrap();
        }
    }

    /// A small xorshift: random enough for kill times, no dependency.
    struct Rng(u64);
    impl Rng {
        fn below(&mut self, n: u64) -> u64 {
            self.0 ^= self.0 << 13;
            self.0 ^= self.0 >> 7;
            self.0 ^= self.0 << 17;
            self.0 % n
        }
    }

    #[test]
    fn killed_while_saving_the_file_is_always_whole() {
        let base = sample("ds-204-plan.yaml");
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("j.yaml");
        Store::create(&path, &version(&base, 0), "KM").unwrap();
        let seed = std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map_or(1, |d| d.as_nanos() as u64)
            | 1;
        eprintln!("kill-time seed {seed}");
        let mut rng = Rng(seed);
        let exe = std::env::current_exe().unwrap();
        let started = Instant::now();
        let mut last = 0;
        let mut advanced = 0;
        for round in 0..KILLS {
            // the killed process leaves its lock: the next one takes the job as after a crash
            let _ = fs::remove_file(lock_path(&path));
            let mut child = Command::new(&exe)
                .args([
                    "--exact",
                    "unix::child_save_loop",
                    "--ignored",
                    "--nocapture",
                ])
                .args(["--test-threads", "1"])
                .env(SAVE_LOOP_ENV, &path)
                .stdout(Stdio::piped())
                .stderr(Stdio::null())
                .spawn()
                .unwrap();
            let mut lines = BufReader::new(child.stdout.take().unwrap()).lines();
            let ready = lines.any(|l| l.is_ok_and(|l| l.ends_with(READY)));
            assert!(ready, "round {round}: the saving process did not start");
            std::thread::sleep(Duration::from_micros(rng.below(20_000)));
            child.kill().unwrap();
            let status = child.wait().unwrap();
            assert!(
                status.code().is_none(),
                "round {round}: not killed: {status}"
            );
            let now = whole_version(&base, &path);
            assert!(now >= last, "round {round}: went back from {last} to {now}");
            if now > last {
                advanced += 1;
                // the backup is a whole version, not after the job (it equals the job when a
                // kill fell between setting the old file aside and renaming the new one over)
                let bak = whole_version(&base, &backup_path(&path));
                assert!(
                    bak <= now,
                    "round {round}: backup {bak} after the job's {now}"
                );
            }
            last = now;
        }
        // the kills must have landed while saves were under way, not all before the first
        assert!(
            advanced > KILLS / 10,
            "only {advanced} of {KILLS} rounds saved anything"
        );
        // the only files besides the job, its backup and the lock are temporary files a kill
        // interrupted (hidden, ending .tmp); none of them is taken for the job
        for e in fs::read_dir(dir.path()).unwrap() {
            let name = e.unwrap().file_name().to_string_lossy().into_owned();
            assert!(
                ["j.yaml", "j.yaml.bak", "j.yaml.lock"].contains(&name.as_str())
                    || (name.starts_with('.') && name.ends_with(".tmp")),
                "unexpected file {name}"
            );
        }
        // the next opener (holding the lock, so no save of this job is under way) clears them
        let _ = fs::remove_file(lock_path(&path));
        let (store, _) = Store::open(&path, "KM").unwrap();
        let mut left: Vec<String> = fs::read_dir(dir.path())
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        left.sort();
        assert_eq!(left, ["j.yaml", "j.yaml.bak", "j.yaml.lock"]);
        store.close();
        eprintln!(
            "{KILLS} kills in {:.1} s; last version {last}; {advanced} rounds saved",
            started.elapsed().as_secs_f64()
        );
    }
}

#[cfg(not(unix))]
#[test]
fn killed_while_saving_the_file_is_always_whole() {
    eprintln!("skipped: the kill test sends SIGKILL and runs on Unix only");
}
