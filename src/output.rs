//! The one place that writes bytes out: files (temporary name + rename, so an interrupted run never leaves
//! half a file) and stdout (a closed pipe, as in `junctura ... | head`, ends the program quietly).
//!
//! Safety of the temporary files: each is created exclusively (`create_new`, and `O_NOFOLLOW` on unix) under a
//! fresh name `.NAME.tmp-PID-UNIQUE` in the target folder, so a symbolic or hard link planted in the output
//! folder is never opened or truncated. A final target that is itself a symbolic link is refused (we never write
//! through a link, and do not silently replace one either). A hard-linked target is replaced by the rename: the
//! other name keeps its old content. A temporary file whose rename fails is removed. Temporary files left by a
//! killed run (our own pattern, and only when the process id in the name is no longer alive) are removed the
//! first time this process writes into that folder.

use crate::error::{Error, Result};
use std::io::Write;
use std::path::{Path, PathBuf};

/// How many fresh temporary names are tried before giving up (each collision means a file appeared there).
const TEMP_ATTEMPTS: u32 = 16;

fn split_target(path: &Path) -> (PathBuf, String) {
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or_else(|| Path::new("."));
    let name = path.file_name().map(|n| n.to_string_lossy().to_string()).unwrap_or_else(|| "out".into());
    (dir.to_path_buf(), name)
}

/// A temporary name that no other run and no earlier call of this run uses: pid, time and a counter.
fn temp_name(name: &str) -> String {
    use std::sync::atomic::{AtomicU64, Ordering};
    static COUNTER: AtomicU64 = AtomicU64::new(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    let t = std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_nanos()).unwrap_or(0);
    let mix = (t as u64) ^ n.wrapping_mul(0x9E37_79B9_7F4A_7C15);
    format!(".{name}.tmp-{}-{mix:016x}", std::process::id())
}

/// The process id in one of our temporary names (`.NAME.tmp-PID` or `.NAME.tmp-PID-HEX`), if it is one.
fn temp_pid(file_name: &str) -> Option<u32> {
    if !file_name.starts_with('.') {
        return None;
    }
    let (_, tail) = file_name.rsplit_once(".tmp-")?;
    let (pid, rest) = match tail.split_once('-') {
        Some((p, r)) => (p, Some(r)),
        None => (tail, None),
    };
    if pid.is_empty() || !pid.bytes().all(|b| b.is_ascii_digit()) {
        return None;
    }
    if let Some(r) = rest {
        if r.is_empty() || !r.bytes().all(|b| b.is_ascii_hexdigit()) {
            return None;
        }
    }
    pid.parse().ok()
}

#[cfg(unix)]
fn pid_alive(pid: u32) -> bool {
    let Ok(pid) = libc::pid_t::try_from(pid) else { return true };
    if pid <= 0 {
        return true;
    }
    // SAFETY: kill with signal 0 only checks for the process; it sends nothing.
    let r = unsafe { libc::kill(pid, 0) };
    r == 0 || std::io::Error::last_os_error().raw_os_error() != Some(libc::ESRCH)
}

#[cfg(not(unix))]
fn pid_alive(_pid: u32) -> bool {
    true
}

/// Remove the temporary files of dead runs from `dir` (once per folder per process). Only regular files or links
/// named with our own pattern whose process id is not alive are touched; links are removed, never followed.
pub fn clean_stale_temps(dir: &Path) {
    static DONE: std::sync::Mutex<Vec<PathBuf>> = std::sync::Mutex::new(Vec::new());
    let key = dir.canonicalize().unwrap_or_else(|_| dir.to_path_buf());
    if let Ok(mut done) = DONE.lock() {
        if done.contains(&key) {
            return;
        }
        done.push(key);
    }
    let Ok(entries) = std::fs::read_dir(dir) else { return };
    let me = std::process::id();
    for e in entries.flatten() {
        let name = e.file_name().to_string_lossy().to_string();
        let Some(pid) = temp_pid(&name) else { continue };
        if pid == me || pid_alive(pid) {
            continue;
        }
        let Ok(ft) = e.file_type() else { continue };
        if ft.is_file() || ft.is_symlink() {
            let _ = std::fs::remove_file(e.path());
        }
    }
}

/// Refuse a target that is a symbolic link (or not a regular file), so no write ever goes through a link.
fn check_target(path: &Path) -> Result<()> {
    match std::fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => {
            Err(Error::io_msg(format!("{}: is a symbolic link; junctura does not write through links", path.display()))
                .with_hint("remove the link or choose another output folder"))
        }
        Ok(m) if m.is_dir() => Err(Error::io_msg(format!("{}: is a folder, not a file", path.display()))
            .with_hint("remove it or choose another output folder")),
        Ok(m) if !m.is_file() => {
            Err(Error::io_msg(format!("{}: exists and is not a regular file (device, pipe or socket)", path.display()))
                .with_hint("remove it or choose another output folder"))
        }
        _ => Ok(()),
    }
}

/// Create a fresh temporary file for `path` exclusively (never opening an existing file or following a link);
/// it is registered for removal on interrupt before it exists.
fn create_temp(path: &Path) -> Result<(PathBuf, std::fs::File)> {
    check_target(path)?;
    let (dir, name) = split_target(path);
    clean_stale_temps(&dir);
    let mut last = None;
    for _ in 0..TEMP_ATTEMPTS {
        let tmp = dir.join(temp_name(&name));
        let mut o = std::fs::OpenOptions::new();
        o.write(true).create_new(true);
        #[cfg(unix)]
        {
            use std::os::unix::fs::OpenOptionsExt;
            o.custom_flags(libc::O_NOFOLLOW).mode(0o666);
        }
        // Register before creating, so an interrupt between the two cannot leave an unregistered file.
        register_temp(&tmp);
        match o.open(&tmp) {
            Ok(f) => return Ok((tmp, f)),
            Err(e) => {
                unregister_temp(&tmp);
                if e.kind() != std::io::ErrorKind::AlreadyExists {
                    return Err(Error::io(path, &e).with_hint("check that the output folder exists and is writable"));
                }
                last = Some(e);
            }
        }
    }
    let e = last.unwrap_or_else(|| std::io::Error::other("no free temporary name"));
    Err(Error::io(path, &e).with_hint("files keep appearing under our temporary names in the output folder"))
}

/// Is `field` a spelling of a non-finite number (`NaN`, `inf`, `-inf`, `+inf`, `infinity`, any case)?
fn non_finite_field(field: &str) -> bool {
    let f = field.trim().trim_start_matches(['+', '-']);
    f.eq_ignore_ascii_case("nan") || f.eq_ignore_ascii_case("inf") || f.eq_ignore_ascii_case("infinity")
}

/// The last guard before CSV data leaves the program: no field of a data row may be a non-finite number
/// (README "Outputs": a quantity that does not exist is an empty field). Fed whole or partial text in order;
/// `#` lines and the header (the first other line) are not checked.
#[derive(Debug, Default)]
pub struct CsvGuard {
    header: Option<Vec<String>>,
    carry: String,
    rows: usize,
}

impl CsvGuard {
    /// Check the next piece of CSV text; `what` names the file or stream in the error.
    pub fn feed(&mut self, text: &str, what: &str) -> Result<()> {
        self.carry.push_str(text);
        let Some(end) = self.carry.rfind('\n') else { return Ok(()) };
        let done: String = self.carry.drain(..=end).collect();
        for line in done.lines() {
            self.line(line, what)?;
        }
        Ok(())
    }

    /// Check what is left (a last line without a line break).
    pub fn finish(&mut self, what: &str) -> Result<()> {
        let rest = std::mem::take(&mut self.carry);
        if rest.is_empty() {
            Ok(())
        } else {
            self.line(&rest, what)
        }
    }

    fn line(&mut self, line: &str, what: &str) -> Result<()> {
        if line.starts_with('#') || line.is_empty() {
            return Ok(());
        }
        let Some(header) = &self.header else {
            self.header = Some(line.split(',').map(String::from).collect());
            return Ok(());
        };
        self.rows += 1;
        if let Some((k, f)) = line.split(',').enumerate().find(|(_, f)| non_finite_field(f)) {
            let col = header.get(k).map(String::as_str).unwrap_or("?");
            return Err(Error::numerical(format!(
                "{what}: data row {} would hold the non-finite number {f} in column '{col}'; nothing was written",
                self.rows
            ))
            .with_hint("the request overflows floating point (values near 1e308) or lies where the formulas fail"));
        }
        Ok(())
    }
}

fn is_csv(path: &Path) -> bool {
    path.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv"))
}

/// Check a whole CSV text with [`CsvGuard`].
pub fn guard_csv(text: &str, what: &str) -> Result<()> {
    let mut g = CsvGuard::default();
    g.feed(text, what)?;
    g.finish(what)
}

/// Print CSV data to stdout after [`guard_csv`]: a non-finite number is an error (code 3), not a row.
pub fn print_csv(text: &str) -> Result<()> {
    guard_csv(text, "stdout")?;
    print_stdout(text);
    Ok(())
}

/// Write `bytes` to `path` atomically: write a fresh exclusive temporary file in the same folder, sync, rename.
/// CSV files (`.csv`) pass [`CsvGuard`] first.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<()> {
    if is_csv(path) {
        guard_csv(&String::from_utf8_lossy(bytes), &path.display().to_string())?;
    }
    let (tmp, mut f) = create_temp(path)?;
    let result = (|| -> std::io::Result<()> {
        f.write_all(bytes)?;
        f.sync_all()?;
        drop(f);
        std::fs::rename(&tmp, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    unregister_temp(&tmp);
    result.map_err(|e| Error::io(path, &e).with_hint("check that the output folder exists and is writable"))
}

/// Create an output folder (and parents); errors name the folder.
pub fn ensure_dir(dir: &Path) -> Result<()> {
    std::fs::create_dir_all(dir).map_err(|e| {
        Error::io(dir, &e)
            .with_hint_phrase(crate::phrase!["choose a folder you can write to with ", crate::RequestField::Out])
    })
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
    let _ = writeln!(std::io::stderr(), "warning: {}", crate::text::terminal(text));
}

/// A file being written under a temporary name in its final folder; `finish` renames it into place. Dropped
/// unfinished (an error, or a panic unwinding), the temporary file is removed, so the final name never holds
/// half a file.
pub struct AtomicFile {
    path: PathBuf,
    tmp: PathBuf,
    file: Option<std::io::BufWriter<std::fs::File>>,
    guard: Option<CsvGuard>,
}

impl AtomicFile {
    /// Start writing `path`.
    pub fn create(path: &Path) -> Result<AtomicFile> {
        let (tmp, f) = create_temp(path)?;
        let guard = is_csv(path).then(CsvGuard::default);
        Ok(AtomicFile { path: path.to_path_buf(), tmp, file: Some(std::io::BufWriter::new(f)), guard })
    }

    /// Append bytes (a CSV file checks them with [`CsvGuard`]; on error the file is left unfinished, so it is
    /// removed when dropped).
    pub fn write(&mut self, bytes: &[u8]) -> Result<()> {
        if let Some(g) = self.guard.as_mut() {
            g.feed(&String::from_utf8_lossy(bytes), &self.path.display().to_string())?;
        }
        match self.file.as_mut() {
            Some(f) => f.write_all(bytes).map_err(|e| Error::io(&self.path, &e)),
            None => Ok(()),
        }
    }

    /// Flush, sync and rename into place.
    pub fn finish(mut self) -> Result<()> {
        if let Some(g) = self.guard.as_mut() {
            g.finish(&self.path.display().to_string())?;
        }
        if let Some(f) = self.file.take() {
            let result = f
                .into_inner()
                .map_err(|e| std::io::Error::new(e.error().kind(), e.error().to_string()))
                .and_then(|f| f.sync_all())
                .and_then(|_| std::fs::rename(&self.tmp, &self.path));
            if result.is_err() {
                let _ = std::fs::remove_file(&self.tmp);
            }
            crate::output::unregister_temp(&self.tmp);
            result.map_err(|e| Error::io(&self.path, &e))?;
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

    #[test]
    fn temp_names_are_fresh_and_recognised() {
        let a = temp_name("map.csv");
        let b = temp_name("map.csv");
        assert_ne!(a, b);
        assert_eq!(temp_pid(&a), Some(std::process::id()));
        assert_eq!(temp_pid(".map.csv.tmp-123"), Some(123));
        assert_eq!(temp_pid("map.csv.tmp-123"), None);
        assert_eq!(temp_pid(".map.csv.tmp-12x"), None);
        assert_eq!(temp_pid(".notes.tmp-1-zz"), None);
    }

    #[cfg(unix)]
    #[test]
    fn symlinked_target_is_refused_and_victim_untouched() {
        let dir = tempfile::tempdir().unwrap();
        let victim = dir.path().join("victim.txt");
        std::fs::write(&victim, "keep").unwrap();
        let p = dir.path().join("a.csv");
        std::os::unix::fs::symlink(&victim, &p).unwrap();
        let e = write_atomic(&p, b"evil").unwrap_err();
        assert!(e.message.contains("symbolic link"), "{e}");
        assert!(AtomicFile::create(&p).is_err());
        assert_eq!(std::fs::read_to_string(&victim).unwrap(), "keep");
    }

    #[cfg(unix)]
    #[test]
    fn failed_rename_removes_its_temp_file() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("a.csv");
        let mut f = AtomicFile::create(&p).unwrap();
        f.write(b"data").unwrap();
        // The target turns into a non-empty folder before the rename: the rename must fail.
        std::fs::create_dir(&p).unwrap();
        std::fs::write(p.join("inner"), "x").unwrap();
        assert!(f.finish().is_err());
        let names: Vec<String> =
            std::fs::read_dir(dir.path()).unwrap().map(|e| e.unwrap().file_name().to_string_lossy().into()).collect();
        assert_eq!(names, vec!["a.csv".to_string()]);
    }

    #[cfg(unix)]
    #[test]
    fn stale_temps_of_dead_runs_are_removed_live_ones_kept() {
        let dir = tempfile::tempdir().unwrap();
        // A child that has exited (and been reaped) has a pid that is no longer alive.
        let mut child = std::process::Command::new("true").spawn().unwrap();
        let dead = child.id();
        child.wait().unwrap();
        let stale = dir.path().join(format!(".map.csv.tmp-{dead}-00ff"));
        let live = dir.path().join(format!(".map.csv.tmp-{}-00aa", std::process::id()));
        let other = dir.path().join(format!("notes.tmp-{dead}"));
        for p in [&stale, &live, &other] {
            std::fs::write(p, "x").unwrap();
        }
        write_atomic(&dir.path().join("map.csv"), b"x").unwrap();
        assert!(!stale.exists());
        assert!(live.exists());
        assert!(other.exists());
    }

    #[test]
    fn csv_guard_refuses_non_finite_fields_and_writes_nothing() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("a.csv");
        let text = "# inf in a comment is fine\nx,energy\n1.0,2.0\n3.0,NaN\n";
        let e = write_atomic(&p, text.as_bytes()).unwrap_err();
        assert_eq!(e.kind, crate::error::ErrorKind::Numerical);
        assert!(e.message.contains("data row 2") && e.message.contains("'energy'"), "{e}");
        assert!(!p.exists());
        for bad in ["-inf", "+Infinity", " inf"] {
            assert!(guard_csv(&format!("x\n{bad}\n"), "t").is_err(), "{bad}");
        }
        assert!(guard_csv("x,y\n1,\ninfo,nanometre\n", "t").is_ok());
        // Streamed in pieces that split a row.
        let mut f = AtomicFile::create(&p).unwrap();
        f.write(b"x,y\n1,2\n3,n").unwrap();
        assert!(f.write(b"an\n").is_err());
        drop(f);
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
    }
}
