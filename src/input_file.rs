//! Reading a user's text file with a bound on its size, so that `/dev/zero`, a directory or a
//! huge file gives a one-line error instead of exhausting memory.

use std::io::Read;
use std::path::Path;

/// Largest text file read whole (bytes): 64 MiB, far above any structure, curve, candidates or
/// data table a laboratory produces (a 1000-atom CIF is about 60 kB).
pub const MAX_TEXT_BYTES: u64 = 64 << 20;

/// The whole file as UTF-8 text; an error (with a message fit to follow "cannot read PATH: ")
/// for a directory, a file beyond [`MAX_TEXT_BYTES`], a read failure or text that is not UTF-8.
pub fn read_text(path: &Path) -> std::io::Result<String> {
    let invalid = |msg: String| std::io::Error::new(std::io::ErrorKind::InvalidData, msg);
    if path.is_dir() {
        return Err(invalid("it is a directory, not a file".into()));
    }
    let file = std::fs::File::open(path)?;
    let mut bytes = Vec::new();
    file.take(MAX_TEXT_BYTES + 1).read_to_end(&mut bytes)?;
    if bytes.len() as u64 > MAX_TEXT_BYTES {
        return Err(invalid(format!(
            "it is larger than {} MiB, the limit for an input file",
            MAX_TEXT_BYTES >> 20
        )));
    }
    String::from_utf8(bytes).map_err(|e| {
        invalid(format!(
            "it is not UTF-8 text (first bad byte at offset {})",
            e.utf8_error().valid_up_to()
        ))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn directories_and_endless_files_are_refused() {
        let dir = std::env::temp_dir();
        assert!(read_text(&dir)
            .unwrap_err()
            .to_string()
            .contains("directory"));
        let zero = Path::new("/dev/zero");
        if zero.exists() {
            let e = read_text(zero).unwrap_err().to_string();
            assert!(e.contains("64 MiB"), "{e}");
        }
    }
}
