//! Saving a file so that a crash or a full disk never leaves a half-written traveller: write a
//! temporary file in the same folder, flush it to disk, keep the old file as `NAME.bak`, rename
//! the new one over, and flush the folder (on Unix; elsewhere the rename is the last step).

use std::fs::{self, File};
use std::io::{self, Write};
use std::path::{Path, PathBuf};

/// `NAME.bak` beside `path`.
pub fn backup_path(path: &Path) -> PathBuf {
    sibling(path, ".bak")
}

/// `path` with `suffix` added to its file name.
pub(crate) fn sibling(path: &Path, suffix: &str) -> PathBuf {
    let mut name = path
        .file_name()
        .map(|n| n.to_os_string())
        .unwrap_or_default();
    name.push(suffix);
    path.with_file_name(name)
}

pub(crate) fn folder_of(path: &Path) -> PathBuf {
    match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

/// Make the folder's entries (a rename, a new file) durable. Unix only; a no-op elsewhere.
pub fn sync_folder(dir: &Path) -> io::Result<()> {
    #[cfg(unix)]
    {
        File::open(dir)?.sync_all()
    }
    #[cfg(not(unix))]
    {
        let _ = dir;
        Ok(())
    }
}

/// Random characters in a temporary file's name: `.NAME.` + these + `.tmp`.
const RAND: usize = 6;

/// The temporary files of a save of the traveller named NAME: `.NAME.XXXXXX.tmp`, from the
/// prefix `.NAME.`.
fn temp_named(prefix: &str) -> tempfile::Builder<'_, 'static> {
    let mut b = tempfile::Builder::new();
    b.prefix(prefix).rand_bytes(RAND).suffix(".tmp");
    b
}

/// Is `file` one of the temporary files a save of the traveller named `name` makes?
fn is_leftover(file: &str, name: &str) -> bool {
    file.strip_prefix(&format!(".{name}."))
        .and_then(|r| r.strip_suffix(".tmp"))
        .is_some_and(|r| r.len() == RAND && r.bytes().all(|b| b.is_ascii_alphanumeric()))
}

/// Remove the temporary files a save of `path` left behind when it was stopped (a killed
/// process, a power cut); they never hold the only copy of anything. Call it only while holding
/// the traveller's lock, so no save of it is under way. Returns how many were removed.
pub fn remove_leftovers(path: &Path) -> usize {
    let Some(name) = path.file_name().and_then(|n| n.to_str()) else {
        return 0;
    };
    let Ok(entries) = fs::read_dir(folder_of(path)) else {
        return 0;
    };
    entries
        .flatten()
        .filter(|e| e.file_name().to_str().is_some_and(|f| is_leftover(f, name)))
        .filter(|e| e.file_type().is_ok_and(|t| t.is_file()))
        .filter(|e| fs::remove_file(e.path()).is_ok())
        .count()
}

/// Write `bytes` to `path` atomically, keeping the previous file (if any) as `NAME.bak`.
///
/// On any error the file at `path` is left as it was and the temporary file is removed.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> io::Result<()> {
    let dir = folder_of(path);
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "traveller".into());
    let prefix = format!(".{name}.");
    let mut tmp = temp_named(&prefix).tempfile_in(&dir)?;
    tmp.write_all(bytes)?;
    tmp.flush()?;
    tmp.as_file().sync_all()?;
    if path.is_dir() {
        return Err(io::Error::other(format!(
            "{} is a folder, not a file",
            path.display()
        )));
    }
    if path.exists() {
        copy_durably(path, &backup_path(path), &dir, &prefix)?;
    }
    tmp.persist(path).map_err(|e| e.error)?;
    sync_folder(&dir)
}

/// Make `to` a whole copy of `from`: a second name for the same file where the file system
/// allows it (the old version was made durable when it was saved), else a copy through a
/// temporary file. Either way `to` is replaced in one rename, so it is always whole.
fn copy_durably(from: &Path, to: &Path, dir: &Path, prefix: &str) -> io::Result<()> {
    let link = temp_named(prefix).make_in(dir, |p| fs::hard_link(from, p));
    if let Ok(link) = link {
        return link.persist(to).map(|_| ()).map_err(|e| e.error);
    }
    let old = fs::read(from)?;
    let mut tmp = temp_named(prefix).tempfile_in(dir)?;
    tmp.write_all(&old)?;
    tmp.as_file().sync_all()?;
    tmp.persist(to).map_err(|e| e.error)?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn writes_and_keeps_a_backup() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("job.yaml");
        write_atomic(&p, b"one").unwrap();
        assert!(!backup_path(&p).exists());
        write_atomic(&p, b"two").unwrap();
        assert_eq!(fs::read(&p).unwrap(), b"two");
        assert_eq!(fs::read(backup_path(&p)).unwrap(), b"one");
        // no temporary files left behind
        let names: Vec<_> = fs::read_dir(dir.path())
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        assert_eq!(names.len(), 2, "{names:?}");
    }

    #[test]
    fn a_failed_write_leaves_nothing_behind() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("job.yaml");
        fs::create_dir(&p).unwrap();
        assert!(write_atomic(&p, b"x").is_err());
        assert_eq!(fs::read_dir(dir.path()).unwrap().count(), 1);
    }

    #[test]
    fn leftovers_of_this_traveller_are_removed_and_nothing_else() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("job.yaml");
        write_atomic(&p, b"one").unwrap();
        write_atomic(&p, b"two").unwrap();
        let keep = [
            "job.yaml",
            "job.yaml.bak",
            "other.yaml",
            ".other.yaml.a1B2c3.tmp", // another traveller's save
            ".job.yaml.x.a1B2c3.tmp", // a traveller named job.yaml.x
            ".job.yaml.a1B2c.tmp",    // not our pattern
            "notes.tmp",
        ];
        let gone = [".job.yaml.a1B2c3.tmp", ".job.yaml.ZZZZZZ.tmp"];
        for n in keep
            .iter()
            .chain(&gone)
            .filter(|n| !n.starts_with("job.yaml"))
        {
            fs::write(dir.path().join(n), b"x").unwrap();
        }
        assert_eq!(remove_leftovers(&p), 2);
        let mut names: Vec<_> = fs::read_dir(dir.path())
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        names.sort();
        let mut want: Vec<_> = keep.iter().map(|s| s.to_string()).collect();
        want.sort();
        assert_eq!(names, want);
        assert_eq!(fs::read(&p).unwrap(), b"two");
    }
}
