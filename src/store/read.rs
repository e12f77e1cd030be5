//! Reading a traveller file with a size cap, so a huge or endless file (a wrong path, a device)
//! is refused before it fills memory.

use crate::traveller::schema::{MAX_BYTES, too_large};
use std::fs::File;
use std::io::{self, Read};
use std::path::Path;

/// The bytes of `path`, refused with an `InvalidData` error naming the size and the limit when
/// the file is over [`MAX_BYTES`]. The size is checked before reading, and reading stops at the
/// limit even if the file grows meanwhile.
pub fn read_capped(path: &Path) -> io::Result<Vec<u8>> {
    let file = File::open(path)?;
    let len = file.metadata()?.len();
    if len > MAX_BYTES {
        return Err(io::Error::new(io::ErrorKind::InvalidData, too_large(len)));
    }
    let mut bytes = Vec::with_capacity(usize::try_from(len).unwrap_or(0));
    file.take(MAX_BYTES + 1).read_to_end(&mut bytes)?;
    if bytes.len() as u64 > MAX_BYTES {
        return Err(io::Error::new(
            io::ErrorKind::InvalidData,
            too_large(bytes.len() as u64),
        ));
    }
    Ok(bytes)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn refuses_a_file_over_the_limit_before_reading_it() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("big.yaml");
        let f = File::create(&p).unwrap();
        f.set_len(MAX_BYTES + 1).unwrap(); // sparse: no data written
        let e = read_capped(&p).unwrap_err();
        assert_eq!(e.kind(), io::ErrorKind::InvalidData);
        let m = e.to_string();
        assert!(m.contains(&format!("{} bytes", MAX_BYTES + 1)), "{m}");
        assert!(m.contains("16.8 MB"), "{m}");
        f.set_len(MAX_BYTES).unwrap();
        assert_eq!(read_capped(&p).unwrap().len() as u64, MAX_BYTES);
    }
}
