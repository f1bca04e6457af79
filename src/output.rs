//! The one place that writes bytes out: files (temporary name + rename, so an interrupted run never leaves
//! half a file) and stdout (a closed pipe, as in `junctura ... | head`, ends the program quietly).

use crate::error::{Error, Result};
use std::io::Write;
use std::path::Path;

/// Write `bytes` to `path` atomically: write `path.tmp-<pid>` in the same folder, flush, then rename.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<()> {
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or_else(|| Path::new("."));
    let name = path.file_name().map(|n| n.to_string_lossy().to_string()).unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(".{name}.tmp-{}", std::process::id()));
    register_temp(&tmp);
    let result = (|| -> std::io::Result<()> {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    unregister_temp(&tmp);
    result.map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        Error::io(path, &e).with_hint("check that the output folder exists and is writable")
    })
}

/// Create an output folder (and parents); errors name the folder.
pub fn ensure_dir(dir: &Path) -> Result<()> {
    std::fs::create_dir_all(dir)
        .map_err(|e| Error::io(dir, &e).with_hint("choose a folder you can write to with --out"))
}

/// Print to stdout; on a closed pipe exit quietly with status 0.
pub fn print_stdout(text: &str) {
    let mut out = std::io::stdout().lock();
    let r = out.write_all(text.as_bytes()).and_then(|_| {
        if !text.ends_with('\n') {
            out.write_all(b"\n")?;
        }
        out.flush()
    });
    if let Err(e) = r {
        if e.kind() == std::io::ErrorKind::BrokenPipe {
            std::process::exit(0);
        }
        eprintln!("error: writing to stdout: {e}");
        std::process::exit(4);
    }
}

/// A warning line on stderr.
pub fn warn(text: &str) {
    let _ = writeln!(std::io::stderr(), "warning: {text}");
}

/// A file being written under a temporary name in its final folder; `finish` renames it into place. Dropped
/// unfinished (an error, or a panic unwinding), the temporary file is removed, so the final name never holds
/// half a file.
pub struct AtomicFile {
    path: std::path::PathBuf,
    tmp: std::path::PathBuf,
    file: Option<std::io::BufWriter<std::fs::File>>,
}

impl AtomicFile {
    /// Start writing `path`.
    pub fn create(path: &Path) -> Result<AtomicFile> {
        let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or_else(|| Path::new("."));
        let name = path.file_name().map(|n| n.to_string_lossy().to_string()).unwrap_or_else(|| "out".into());
        let tmp = dir.join(format!(".{name}.tmp-{}", std::process::id()));
        // Register before creating, so an interrupt between the two cannot leave an unregistered file.
        crate::output::register_temp(&tmp);
        let f = std::fs::File::create(&tmp).map_err(|e| {
            crate::output::unregister_temp(&tmp);
            Error::io(path, &e).with_hint("check that the output folder exists and is writable")
        })?;
        Ok(AtomicFile { path: path.to_path_buf(), tmp, file: Some(std::io::BufWriter::new(f)) })
    }

    /// Append bytes.
    pub fn write(&mut self, bytes: &[u8]) -> Result<()> {
        match self.file.as_mut() {
            Some(f) => f.write_all(bytes).map_err(|e| Error::io(&self.path, &e)),
            None => Ok(()),
        }
    }

    /// Flush, sync and rename into place.
    pub fn finish(mut self) -> Result<()> {
        if let Some(f) = self.file.take() {
            let f = f.into_inner().map_err(|e| Error::io(&self.path, e.error()))?;
            f.sync_all().map_err(|e| Error::io(&self.path, &e))?;
            std::fs::rename(&self.tmp, &self.path).map_err(|e| Error::io(&self.path, &e))?;
            crate::output::unregister_temp(&self.tmp);
        }
        Ok(())
    }
}

impl Drop for AtomicFile {
    fn drop(&mut self) {
        if self.file.take().is_some() {
            let _ = std::fs::remove_file(&self.tmp);
            crate::output::unregister_temp(&self.tmp);
        }
    }
}

static TEMPS: std::sync::Mutex<Vec<std::path::PathBuf>> = std::sync::Mutex::new(Vec::new());

/// Remember a temporary file so that an interrupt (Ctrl-C, SIGTERM) can remove it.
pub fn register_temp(p: &Path) {
    if let Ok(mut v) = TEMPS.lock() {
        v.push(p.to_path_buf());
    }
}

/// Forget a temporary file (it was renamed or removed).
pub fn unregister_temp(p: &Path) {
    if let Ok(mut v) = TEMPS.lock() {
        v.retain(|q| q != p);
    }
}

/// Remove every registered temporary file (called from the interrupt handler).
pub fn remove_temps() {
    if let Ok(v) = TEMPS.lock() {
        for p in v.iter() {
            let _ = std::fs::remove_file(p);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn atomic_write_replaces_and_leaves_no_temp() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("a.csv");
        write_atomic(&p, b"one").unwrap();
        write_atomic(&p, b"two").unwrap();
        assert_eq!(std::fs::read_to_string(&p).unwrap(), "two");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    }

    #[test]
    fn unwritable_folder_is_an_io_error() {
        let e = write_atomic(Path::new("/nonexistent-folder/x.csv"), b"x").unwrap_err();
        assert_eq!(e.kind, crate::error::ErrorKind::Io);
        assert!(e.message.contains("/nonexistent-folder/x.csv"));
    }
}
