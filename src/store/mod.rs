//! Reading and writing traveller files: atomic save with a backup (`NAME.bak`), and the lock
//! (`NAME.lock`) that keeps two people from working the same job at once.
//!
//! ```no_run
//! use tiltbook::store::Store;
//! # fn main() -> Result<(), tiltbook::store::StoreError> {
//! let (mut store, loaded) = Store::open("job.yaml".as_ref(), "JQ")?;
//! let mut job = loaded.traveller;
//! job.log("JQ", tiltbook::traveller::EventKind::Opened, None, None, "");
//! store.save_confirmed(&job)?; // every confirmed entry is saved at once
//! # Ok(()) }
//! ```

mod atomic;
mod lock;
mod read;

pub use atomic::{backup_path, sync_folder, write_atomic};
pub use lock::{
    Liveness, Lock, LockInfo, host_name, lock_path, process_alive, read_lock, release_all_locks,
};
pub use read::read_capped;

use crate::traveller::{EventKind, LoadError, Loaded, Traveller, schema};
use lock::LockFailure;
use std::io;
use std::path::{Path, PathBuf};
use thiserror::Error;

/// What went wrong reading, locking or saving a traveller.
#[derive(Debug, Error)]
pub enum StoreError {
    #[error("cannot read {}: {source}; check the path and that you may read it", path.display())]
    Read { path: PathBuf, source: io::Error },
    #[error("{}:{error}", path.display())]
    Load { path: PathBuf, error: LoadError },
    #[error(
        "{} is open by {holder}; ask them to close it, or open it read-only{}",
        path.display(),
        if *stale { " (their process has ended: the lock can be taken over)" } else { "" }
    )]
    Locked {
        path: PathBuf,
        holder: LockInfo,
        /// Same computer and the holder's process is gone: [`Store::take_over`] may be offered.
        stale: bool,
    },
    #[error(
        "{} has a lock file that cannot be read ({}); if nobody has the job open, delete that file and open it again",
        path.display(),
        lock_path(path).display()
    )]
    LockUnreadable { path: PathBuf },
    #[error("cannot take the lock for {}: {source}", path.display())]
    LockIo { path: PathBuf, source: io::Error },
    #[error(
        "the lock on {} was taken over by {holder}; your work is still on screen: save it under another name",
        path.display()
    )]
    LockLost { path: PathBuf, holder: String },
    #[error("{} was opened read-only; open it for work to save changes", path.display())]
    ReadOnly { path: PathBuf },
    #[error("{} already exists; choose another name or open it", path.display())]
    Exists { path: PathBuf },
    #[error(
        "the job could not be written whole ({0}); nothing was saved, the job on screen is unchanged"
    )]
    Serialize(String),
    #[error(
        "cannot save {}: {source}; nothing was changed on disk and the job on screen is kept: free space or fix permissions, then save again",
        path.display()
    )]
    Write { path: PathBuf, source: io::Error },
}

/// An open traveller file: its path, and the lock when opened for work.
#[derive(Debug)]
pub struct Store {
    path: PathBuf,
    lock: Option<Lock>,
}

/// Read and parse a traveller without locking it. A file over [`schema::MAX_BYTES`] is refused
/// before it is read.
pub fn load(path: &Path) -> Result<Loaded, StoreError> {
    let bytes = read_capped(path).map_err(|source| StoreError::Read {
        path: path.to_path_buf(),
        source,
    })?;
    let text = String::from_utf8(bytes).map_err(|_| StoreError::Read {
        path: path.to_path_buf(),
        source: io::Error::new(
            io::ErrorKind::InvalidData,
            "the file is not UTF-8 text; save it as UTF-8",
        ),
    })?;
    schema::parse(&text).map_err(|error| StoreError::Load {
        path: path.to_path_buf(),
        error,
    })
}

/// The first number in `t` that is not finite (it would be written as something else).
fn non_finite(t: &Traveller) -> Option<String> {
    use crate::units::Angle;
    let bad = |a: Angle| !a.deg().is_finite();
    for f in &t.features {
        if f.nominal.is_some_and(bad) {
            return Some(format!("{}: nominal", f.id));
        }
        for a in &f.attempts {
            let at = format!("{} attempt {}", f.id, a.number);
            if a.stack
                .iter()
                .chain(a.stack_b.iter())
                .any(|s| bad(s.achieved))
            {
                return Some(format!("{at}: achieved angle"));
            }
            if let Some(j) = &a.judgement {
                let angles = [j.residual, j.deviation, j.u];
                if !j.fit.slope.is_finite()
                    || angles.into_iter().any(bad)
                    || j.budget.iter().any(|b| bad(b.u))
                {
                    return Some(format!("{at}: fit, residual, deviation or U"));
                }
            }
        }
    }
    None
}

/// The YAML a traveller would be saved as, checked to hold only real numbers (and, in debug
/// builds, to read back).
pub fn render(t: &Traveller) -> Result<String, StoreError> {
    if let Some(what) = non_finite(t) {
        return Err(StoreError::Serialize(format!(
            "{what} is not a number; re-enter it"
        )));
    }
    let text = schema::to_yaml(t).map_err(|e| StoreError::Serialize(e.to_string()))?;
    // Debug builds (every test, the monkey test's hundred thousand keys) read each save back;
    // release builds rely on that and on the round-trip tests, and save in a fraction of the time.
    #[cfg(debug_assertions)]
    if let Err(e) = schema::parse(&text) {
        return Err(StoreError::Serialize(format!(
            "it would not read back: {e}"
        )));
    }
    Ok(text)
}

fn lock_error(path: &Path, f: LockFailure) -> StoreError {
    match f {
        LockFailure::Held(Some(holder), live) => StoreError::Locked {
            path: path.to_path_buf(),
            holder,
            stale: live == Liveness::Stale,
        },
        LockFailure::Held(None, _) => StoreError::LockUnreadable {
            path: path.to_path_buf(),
        },
        LockFailure::Io(source) => StoreError::LockIo {
            path: path.to_path_buf(),
            source,
        },
    }
}

impl Store {
    /// Open a traveller for work: take its lock, then read it. Refused with the holder named
    /// when someone else has it open.
    pub fn open(path: &Path, who: &str) -> Result<(Store, Loaded), StoreError> {
        let lock = Lock::acquire(path, who).map_err(|f| lock_error(path, f))?;
        atomic::remove_leftovers(path);
        let loaded = load(path)?;
        Ok((
            Store {
                path: path.to_path_buf(),
                lock: Some(lock),
            },
            loaded,
        ))
    }

    /// Open a traveller to look at: no lock is taken or needed, saving is refused.
    pub fn open_read_only(path: &Path) -> Result<(Store, Loaded), StoreError> {
        let loaded = load(path)?;
        Ok((
            Store {
                path: path.to_path_buf(),
                lock: None,
            },
            loaded,
        ))
    }

    /// Take over a stale lock (after the person confirmed, having seen `holder`), read the job,
    /// log the takeover as an event and save it at once.
    pub fn take_over(
        path: &Path,
        who: &str,
        holder: &LockInfo,
    ) -> Result<(Store, Loaded), StoreError> {
        let lock = Lock::take_over(path, who, holder).map_err(|f| lock_error(path, f))?;
        atomic::remove_leftovers(path);
        let mut loaded = load(path)?;
        let mut store = Store {
            path: path.to_path_buf(),
            lock: Some(lock),
        };
        loaded.traveller.log(
            who,
            EventKind::LockTakenOver,
            None,
            None,
            format!("lock left by {holder} taken over"),
        );
        store.save_confirmed(&loaded.traveller)?;
        Ok((store, loaded))
    }

    /// Write a new traveller (e.g. from a plan) to `path`, which must not exist, and hold its
    /// lock.
    pub fn create(path: &Path, t: &Traveller, who: &str) -> Result<Store, StoreError> {
        if path.exists() {
            return Err(StoreError::Exists {
                path: path.to_path_buf(),
            });
        }
        let lock = Lock::acquire(path, who).map_err(|f| lock_error(path, f))?;
        let mut store = Store {
            path: path.to_path_buf(),
            lock: Some(lock),
        };
        store.save_confirmed(t)?;
        Ok(store)
    }

    /// Save after a confirmed entry: the whole job is rendered first (nothing is written if it
    /// cannot be), then written atomically with the previous file kept as `NAME.bak`. On error
    /// the file on disk is as it was, and the caller still has the job.
    pub fn save_confirmed(&mut self, t: &Traveller) -> Result<(), StoreError> {
        let Some(lock) = &self.lock else {
            return Err(StoreError::ReadOnly {
                path: self.path.clone(),
            });
        };
        if !lock.still_mine() {
            let holder = read_lock(lock.path())
                .map_or_else(|| "someone else".to_string(), |h| h.to_string());
            return Err(StoreError::LockLost {
                path: self.path.clone(),
                holder,
            });
        }
        let text = render(t)?;
        write_atomic(&self.path, text.as_bytes()).map_err(|source| StoreError::Write {
            path: self.path.clone(),
            source,
        })
    }

    /// The traveller file.
    pub fn path(&self) -> &Path {
        &self.path
    }
    /// Opened to look at only?
    pub fn is_read_only(&self) -> bool {
        self.lock.is_none()
    }
    /// The lock held, when opened for work.
    pub fn lock_info(&self) -> Option<&LockInfo> {
        self.lock.as_ref().map(Lock::info)
    }
    /// Close: release the lock (also done when the store is dropped).
    pub fn close(self) {}
}
