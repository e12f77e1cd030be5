//! The lock beside a traveller (`NAME.lock`): who has the job open, on which computer, which
//! process, since when. Created exclusively, so a second opener is refused with the holder
//! named. A lock left by a process that is gone (same computer) can be taken over.

use super::atomic::{folder_of, sibling, sync_folder};
use crate::traveller::Stamp;
use serde::{Deserialize, Serialize};
use std::fs::{self, OpenOptions};
use std::io::{self, Write};
use std::path::{Path, PathBuf};
use std::sync::Mutex;

/// Who holds a lock.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct LockInfo {
    pub who: String,
    pub host: String,
    pub pid: u32,
    pub since: Stamp,
}

impl std::fmt::Display for LockInfo {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{} on {} (process {}) since {}",
            self.who,
            self.host,
            self.pid,
            self.since.short()
        )
    }
}

/// Whether a lock's holder is still there.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Liveness {
    /// Same computer, and its process is gone: the lock can be taken over (after confirmation).
    Stale,
    /// The holder's process is running.
    Live,
    /// Another computer, or a system where this cannot be checked: treated as held.
    Unknown,
}

impl LockInfo {
    /// A lock for this process, now.
    pub fn for_me(who: &str) -> Self {
        LockInfo {
            who: who.to_string(),
            host: host_name(),
            pid: std::process::id(),
            since: Stamp::now(),
        }
    }
    /// Is the holder still there?
    pub fn liveness(&self) -> Liveness {
        if self.host != host_name() {
            return Liveness::Unknown;
        }
        process_alive(self.pid).map_or(Liveness::Unknown, |alive| {
            if alive {
                Liveness::Live
            } else {
                Liveness::Stale
            }
        })
    }
}

/// Is process `pid` running? `None` when this cannot be told on this system.
pub fn process_alive(pid: u32) -> Option<bool> {
    if pid == std::process::id() {
        return Some(true);
    }
    let proc_root = Path::new("/proc");
    if cfg!(target_os = "linux") && proc_root.join("self").exists() {
        return Some(proc_root.join(pid.to_string()).exists());
    }
    None
}

/// This computer's name (best effort).
pub fn host_name() -> String {
    let from_file = |p: &str| {
        fs::read_to_string(p)
            .ok()
            .map(|s| s.trim().to_string())
            .filter(|s| !s.is_empty())
    };
    from_file("/proc/sys/kernel/hostname")
        .or_else(|| from_file("/etc/hostname"))
        .or_else(|| std::env::var("HOSTNAME").ok().filter(|s| !s.is_empty()))
        .or_else(|| std::env::var("COMPUTERNAME").ok().filter(|s| !s.is_empty()))
        .unwrap_or_else(|| "unknown-computer".into())
}

/// `NAME.lock` beside the traveller.
pub fn lock_path(traveller: &Path) -> PathBuf {
    sibling(traveller, ".lock")
}

/// What stood in the way of taking a lock.
#[derive(Debug)]
pub enum LockFailure {
    /// Someone holds it (`None` when the lock file cannot be read).
    Held(Option<LockInfo>, Liveness),
    Io(io::Error),
}

/// Locks held by this process, so a panic hook can release them.
static HELD: Mutex<Vec<(PathBuf, LockInfo)>> = Mutex::new(Vec::new());

fn held() -> std::sync::MutexGuard<'static, Vec<(PathBuf, LockInfo)>> {
    HELD.lock().unwrap_or_else(|e| e.into_inner())
}

/// A held lock; removed when dropped.
#[derive(Debug)]
pub struct Lock {
    path: PathBuf,
    info: LockInfo,
}

impl Lock {
    /// Take the lock for `traveller`, failing if someone holds it.
    pub fn acquire(traveller: &Path, who: &str) -> Result<Lock, LockFailure> {
        let path = lock_path(traveller);
        let info = LockInfo::for_me(who);
        let text =
            serde_yaml::to_string(&info).map_err(|e| LockFailure::Io(io::Error::other(e)))?;
        match OpenOptions::new().write(true).create_new(true).open(&path) {
            Ok(mut f) => {
                let written = f.write_all(text.as_bytes()).and_then(|_| f.sync_all());
                if let Err(e) = written {
                    let _ = fs::remove_file(&path);
                    return Err(LockFailure::Io(e));
                }
                let _ = sync_folder(&folder_of(&path));
                held().push((path.clone(), info.clone()));
                Ok(Lock { path, info })
            }
            Err(e) if e.kind() == io::ErrorKind::AlreadyExists => {
                let holder = read_lock(&path);
                let live = holder
                    .as_ref()
                    .map_or(Liveness::Unknown, LockInfo::liveness);
                Err(LockFailure::Held(holder, live))
            }
            Err(e) => Err(LockFailure::Io(e)),
        }
    }

    /// Take over a stale lock whose holder is `expected` (as shown to and confirmed by the
    /// person). Refused when the lock changed meanwhile or its holder is not confirmed gone.
    pub fn take_over(
        traveller: &Path,
        who: &str,
        expected: &LockInfo,
    ) -> Result<Lock, LockFailure> {
        let path = lock_path(traveller);
        let now = read_lock(&path);
        match &now {
            Some(h) if h == expected && h.liveness() == Liveness::Stale => {}
            Some(h) => return Err(LockFailure::Held(Some(h.clone()), h.liveness())),
            None if !path.exists() => return Lock::acquire(traveller, who),
            None => return Err(LockFailure::Held(None, Liveness::Unknown)),
        }
        fs::remove_file(&path).map_err(LockFailure::Io)?;
        Lock::acquire(traveller, who)
    }

    /// Who holds this lock (this process).
    pub fn info(&self) -> &LockInfo {
        &self.info
    }
    /// The lock file.
    pub fn path(&self) -> &Path {
        &self.path
    }
    /// Is the lock file still ours (not taken over by someone else)?
    pub fn still_mine(&self) -> bool {
        read_lock(&self.path).as_ref() == Some(&self.info)
    }
}

impl Drop for Lock {
    fn drop(&mut self) {
        release(&self.path, &self.info);
        held().retain(|(p, _)| p != &self.path);
    }
}

fn release(path: &Path, info: &LockInfo) {
    if read_lock(path).as_ref() == Some(info) {
        let _ = fs::remove_file(path);
    }
}

/// Who holds the lock at `path`, if it can be read.
pub fn read_lock(path: &Path) -> Option<LockInfo> {
    let text = fs::read_to_string(path).ok()?;
    serde_yaml::from_str(&text).ok()
}

/// Remove every lock this process holds. For a panic hook: a crash must not leave the job
/// looking open. Safe to call more than once.
pub fn release_all_locks() {
    // try_lock: a panic raised while this thread holds the list must not hang the hook
    let mut list = match HELD.try_lock() {
        Ok(g) => g,
        Err(std::sync::TryLockError::Poisoned(e)) => e.into_inner(),
        Err(std::sync::TryLockError::WouldBlock) => return,
    };
    for (p, info) in list.iter() {
        release(p, info);
    }
    list.clear();
}
