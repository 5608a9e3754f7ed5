//! Atomic file writes: every file zsum writes (`-o` outputs, figures, the
//! report's files) goes through [`write_atomic_bytes`], so a reader, or a
//! run that is interrupted or fails, never sees a partial file.

use crate::error::{Error, ErrorKind, Result};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// How many temporary names one write tries before giving up (a name can
/// be taken by a file left behind by an interrupted run).
const TEMP_ATTEMPTS: usize = 16;

/// Creates `path` new (never following an existing file), with the mode
/// of `like` where given (Unix), else the default.
fn create_with(path: &Path, like: Option<&std::fs::Permissions>) -> std::io::Result<std::fs::File> {
    let mut o = std::fs::OpenOptions::new();
    o.write(true).create_new(true);
    #[cfg(unix)]
    if let Some(p) = like {
        use std::os::unix::fs::{OpenOptionsExt, PermissionsExt};
        o.mode(p.mode() & 0o7777);
    }
    #[cfg(not(unix))]
    let _ = like;
    o.open(path)
}

fn io_err(e: std::io::Error, what: &str, p: &Path) -> Error {
    Error::new(
        ErrorKind::Io,
        format!("cannot {what} {:?}: {e}", p.display().to_string()),
    )
}

/// Creates a new temporary file in `dir` for a write to `name`, named
/// `.NAME.zsum-tmp-PID-N`, unique within this process and never an
/// existing file.
fn create_temp(
    dir: &Path,
    name: &str,
    like: Option<&std::fs::Permissions>,
) -> std::io::Result<(PathBuf, std::fs::File)> {
    static NEXT: AtomicU64 = AtomicU64::new(0);
    let numbers = std::iter::repeat_with(|| NEXT.fetch_add(1, Ordering::Relaxed));
    create_temp_numbered(dir, name, like, numbers.take(TEMP_ATTEMPTS))
}

/// Creates the first of the temporary files numbered by `numbers` that
/// does not exist yet.
fn create_temp_numbered(
    dir: &Path,
    name: &str,
    like: Option<&std::fs::Permissions>,
    numbers: impl Iterator<Item = u64>,
) -> std::io::Result<(PathBuf, std::fs::File)> {
    let mut last = None;
    for n in numbers {
        let tmp = dir.join(format!(".{name}.zsum-tmp-{}-{n}", std::process::id()));
        match create_with(&tmp, like) {
            Ok(f) => return Ok((tmp, f)),
            Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => last = Some(e),
            Err(e) => return Err(e),
        }
    }
    Err(last.unwrap_or_else(|| std::io::Error::other("no temporary name to try")))
}

/// Writes `contents` to `path` all at once: to a temporary file beside it,
/// flushed to disk (fsync), then renamed over it, so a failure or an
/// interruption never leaves a partial file; the folder is synced after the
/// rename where the system allows it. A symbolic link is followed to its
/// target (the link stays); something that is not a regular file (a
/// device, a FIFO) is written through, never replaced, and a failed write
/// (e.g. a full device) is an error. A regular file that is replaced keeps
/// its permission bits, from the moment the new contents exist.
///
/// ```
/// let dir = tempfile::tempdir()?;
/// let path = dir.path().join("pixels.bin");
/// zsum::export::write_atomic_bytes(&path, &[0x89, b'P', b'N', b'G'])?;
/// assert_eq!(std::fs::read(&path)?, [0x89, b'P', b'N', b'G']);
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
///
/// # Errors
/// [`ErrorKind::Io`] naming the path if it is a folder, names no file, or
/// cannot be written; the file at `path` is then as it was.
pub fn write_atomic_bytes(path: &Path, contents: &[u8]) -> Result<()> {
    let resolved;
    let path = match std::fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => {
            resolved =
                std::fs::canonicalize(path).map_err(|e| io_err(e, "follow the link", path))?;
            resolved.as_path()
        }
        _ => path,
    };
    if let Ok(m) = std::fs::metadata(path) {
        if m.is_dir() {
            return Err(Error::new(
                ErrorKind::Io,
                format!(
                    "output path {:?} is a directory; give a file name",
                    path.display().to_string()
                ),
            ));
        }
        if !m.is_file() {
            let mut f = std::fs::OpenOptions::new()
                .write(true)
                .open(path)
                .map_err(|e| io_err(e, "open", path))?;
            return f
                .write_all(contents)
                .and_then(|_| f.flush())
                .map_err(|e| io_err(e, "write", path));
        }
    }
    let dir = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name = path
        .file_name()
        .ok_or_else(|| {
            Error::new(
                ErrorKind::Io,
                format!(
                    "output path {:?} does not name a file",
                    path.display().to_string()
                ),
            )
        })?
        .to_string_lossy()
        .to_string();
    // A replaced file keeps its permission bits: the new file is created
    // with them, so a private (600) file is never readable by others, not
    // even for a moment.
    let old = std::fs::metadata(path).ok().map(|m| m.permissions());
    let (tmp, mut file) =
        create_temp(&dir, &name, old.as_ref()).map_err(|e| io_err(e, "write", path))?;
    let written = file.write_all(contents).and_then(|_| {
        file.sync_all()?;
        if let Some(p) = &old {
            std::fs::set_permissions(&tmp, p.clone())?;
        }
        Ok(())
    });
    drop(file);
    if let Err(e) = written {
        let _ = std::fs::remove_file(&tmp);
        return Err(io_err(e, "write", path));
    }
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        io_err(e, "write", path)
    })?;
    sync_dir(&dir);
    Ok(())
}

/// [`write_atomic_bytes`] for text.
///
/// # Errors
/// As [`write_atomic_bytes`].
pub fn write_atomic(path: &Path, contents: &str) -> Result<()> {
    write_atomic_bytes(path, contents.as_bytes())
}

/// Flushes a folder's entries (the rename) to disk, where the system lets
/// a folder be opened and synced; the file itself is already synced, so a
/// failure here is not an error.
fn sync_dir(dir: &Path) {
    #[cfg(unix)]
    if let Ok(d) = std::fs::File::open(dir) {
        let _ = d.sync_all();
    }
    #[cfg(not(unix))]
    let _ = dir;
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_temporary_name_left_behind_is_skipped() {
        let dir = tempfile::tempdir().unwrap();
        let stale = |n: u64| {
            dir.path()
                .join(format!(".out.txt.zsum-tmp-{}-{n}", std::process::id()))
        };
        std::fs::write(stale(0), "stale").unwrap();
        std::fs::write(stale(1), "stale").unwrap();
        let (tmp, _f) = create_temp_numbered(dir.path(), "out.txt", None, 0..5).unwrap();
        assert_eq!(tmp, stale(2));
        assert_eq!(std::fs::read_to_string(stale(0)).unwrap(), "stale");
        // With every name taken, the error says so and nothing is created.
        let e = create_temp_numbered(dir.path(), "out.txt", None, 0..2).unwrap_err();
        assert_eq!(e.kind(), std::io::ErrorKind::AlreadyExists);
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 3);
    }
}
