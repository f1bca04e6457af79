//! The one place that reads user files (scenarios, chain files, map parts): only regular files, never more than
//! a stated size, UTF-8 text. A device such as `/dev/zero`, a named pipe (FIFO) or a folder is refused before it
//! is read, and the file is opened non-blocking on unix, so a pipe put in its place cannot hang the program.

use crate::error::{Error, Result};
use std::io::Read;
use std::path::Path;

/// Size limit of scenario and chain files (and map part metadata): 16 MiB.
pub const MAX_TEXT_FILE: u64 = 16 << 20;

/// Read `path` as UTF-8 text of at most `max` bytes; `what` names the kind of file in messages (e.g.
/// "scenario file"). Errors: a missing or unreadable file, or one that is not a regular file, is an I/O error
/// (exit 4); a file that is too large or not UTF-8 is bad input (exit 2); each with a hint.
pub fn read_text(path: &Path, what: &str, max: u64) -> Result<String> {
    let shown = crate::text::one_line(&path.display().to_string()).into_owned();
    let meta =
        std::fs::metadata(path).map_err(|e| Error::io(path, &e).with_hint(format!("check the path of the {what}")))?;
    check_meta(&meta, &shown, what, max)?;
    let mut o = std::fs::OpenOptions::new();
    o.read(true);
    #[cfg(unix)]
    {
        use std::os::unix::fs::OpenOptionsExt;
        o.custom_flags(libc::O_NONBLOCK);
    }
    let f = o.open(path).map_err(|e| Error::io(path, &e))?;
    // The file may have been replaced between the two looks: check what was actually opened.
    check_meta(&f.metadata().map_err(|e| Error::io(path, &e))?, &shown, what, max)?;
    let mut bytes = Vec::new();
    f.take(max + 1).read_to_end(&mut bytes).map_err(|e| Error::io(path, &e))?;
    if bytes.len() as u64 > max {
        return Err(too_large(&shown, what, max));
    }
    decode(bytes, &shown, what)
}

fn check_meta(meta: &std::fs::Metadata, shown: &str, what: &str, max: u64) -> Result<()> {
    if !meta.is_file() {
        let kind = if meta.is_dir() { "a folder" } else { "not a regular file (a device, pipe or socket)" };
        return Err(Error::io_msg(format!("{shown}: is {kind}; a {what} must be a regular file"))
            .with_hint(format!("give the path of a {what} saved on disk")));
    }
    if meta.len() > max {
        return Err(too_large(shown, what, max));
    }
    Ok(())
}

fn too_large(shown: &str, what: &str, max: u64) -> Error {
    Error::input(format!("{shown}: larger than {} MiB, the limit for a {what}", max >> 20))
        .with_hint(format!("check that this is the {what} you meant"))
}

/// UTF-8 text from `bytes` (a UTF-8 byte-order mark is dropped); UTF-16 and other encodings are refused with
/// the place of the first bad byte.
fn decode(mut bytes: Vec<u8>, shown: &str, what: &str) -> Result<String> {
    let hint = "save the file as UTF-8 (plain text)";
    if bytes.starts_with(&[0xFF, 0xFE]) || bytes.starts_with(&[0xFE, 0xFF]) {
        return Err(Error::input(format!(
            "{shown}: the {what} is UTF-16 text (it starts with a UTF-16 byte-order mark)"
        ))
        .with_hint(hint));
    }
    if bytes.starts_with(&[0xEF, 0xBB, 0xBF]) {
        bytes.drain(..3);
    }
    if let Some(k) = bytes.iter().position(|&b| b == 0) {
        let good = &bytes[..k];
        let line = good.iter().filter(|&&b| b == b'\n').count() + 1;
        let col = good.iter().rev().take_while(|&&b| b != b'\n').count() + 1;
        return Err(Error::input(format!(
            "{shown}:{line}:{col}: the {what} contains NUL bytes (it looks like UTF-16 or a binary file)"
        ))
        .with_hint(hint));
    }
    String::from_utf8(bytes).map_err(|e| {
        let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        let line = good.iter().filter(|&&b| b == b'\n').count() + 1;
        let col = good.iter().rev().take_while(|&&b| b != b'\n').count() + 1;
        Error::input(format!("{shown}:{line}:{col}: the {what} is not UTF-8 text")).with_hint(hint)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn utf16_and_bad_bytes_are_input_errors_with_a_place() {
        let e = decode(vec![0xFF, 0xFE, b'n', 0], "f.toml", "scenario file").unwrap_err();
        assert_eq!(e.kind, crate::error::ErrorKind::Input);
        assert!(e.message.contains("UTF-16") && e.hint.unwrap().contains("UTF-8"));
        let e = decode(b"name = 1\nab\xC3(".to_vec(), "f.toml", "scenario file").unwrap_err();
        assert!(e.message.starts_with("f.toml:2:3:"), "{}", e.message);
        assert_eq!(decode(b"\xEF\xBB\xBFx = 1".to_vec(), "f", "w").unwrap(), "x = 1");
        assert!(decode(b"n\0a\0".to_vec(), "f", "w").unwrap_err().message.starts_with("f:1:2: the w contains NUL"));
    }

    #[cfg(unix)]
    #[test]
    fn devices_folders_and_large_files_are_refused() {
        let e = read_text(Path::new("/dev/zero"), "scenario file", MAX_TEXT_FILE).unwrap_err();
        assert_eq!(e.kind, crate::error::ErrorKind::Io);
        assert!(e.message.contains("not a regular file"), "{}", e.message);
        let d = tempfile::tempdir().unwrap();
        assert!(read_text(d.path(), "scenario file", MAX_TEXT_FILE).unwrap_err().message.contains("a folder"));
        let big = d.path().join("big.toml");
        std::fs::write(&big, vec![b' '; 2048]).unwrap();
        let e = read_text(&big, "scenario file", 1024).unwrap_err();
        assert!(e.message.contains("larger than"), "{}", e.message);
        assert_eq!(read_text(&big, "scenario file", 4096).unwrap().len(), 2048);
    }
}
