//! Where the shelf lives, and how it is changed without ever being torn.
//!
//! Every change takes an advisory lock on a sidecar file (`<shelf>.lock`, `File::lock`), reads the
//! shelf, writes the new text to a temporary file in the same directory, flushes and syncs it, renames
//! it over the shelf (atomic on POSIX file systems) and syncs the directory. A crash or a kill at any
//! moment leaves the old shelf or the new one; two processes adding at once wait for each other.

use crate::error::{Error, Result};
use crate::shelf::{parse_shelf, shelf_text, Entry, Shelf};
use std::fs::{self, File, OpenOptions};
use std::io::{Read, Write};
use std::path::{Path, PathBuf};

/// Largest shelf file read, bytes.
pub const MAX_SHELF_BYTES: u64 = 1 << 30;

/// The shelf file: `--shelf`, else `IRONWIND_SHELF`, else `shelf.csv` in the platform's data
/// folder as the `directories` crate finds it: `$XDG_DATA_HOME/ironwind` (or
/// `~/.local/share/ironwind`) on Linux and the BSDs, `~/Library/Application Support/ironwind` on
/// macOS, `%APPDATA%\ironwind\data` on Windows. Without `HOME` the home folder comes from the
/// account database.
pub fn locate(flag: Option<&Path>) -> Result<PathBuf> {
    if let Some(p) = flag {
        return Ok(p.to_path_buf());
    }
    if let Some(p) = std::env::var_os("IRONWIND_SHELF").filter(|v| !v.is_empty()) {
        return Ok(PathBuf::from(p));
    }
    let dirs = directories::ProjectDirs::from("", "", "ironwind").ok_or_else(|| {
        Error::Failed(
            "no data folder found for the shelf: set IRONWIND_SHELF or pass --shelf FILE".into(),
        )
    })?;
    Ok(dirs.data_dir().join("shelf.csv"))
}

/// Where a file really is: a symbolic link's target (so a write goes through the link, never
/// replacing it), refusing anything but a regular file (a FIFO would block, a device or a directory
/// is not a shelf or a card). A missing file is fine: it will be created.
pub fn regular_target(path: &Path) -> Result<PathBuf> {
    let name = path.display().to_string();
    let target = match fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => fs::canonicalize(path).map_err(|e| {
            Error::bad_input(
                &name,
                format!("a link to nothing usable ({e}); give the file itself"),
            )
        })?,
        _ => path.to_path_buf(),
    };
    match fs::metadata(&target) {
        Ok(m) if !m.is_file() => Err(Error::bad_input(
            &name,
            "is not a regular file (a directory, a pipe or a device); give a file",
        )),
        _ => Ok(target),
    }
}

/// Reads the shelf row by row, handing each to `each` (a missing file has none). The ids are known
/// to rise (a streamed listing's first pass checked them), so no id can be used twice.
pub fn stream(path: &Path, each: impl FnMut(crate::shelf::Row)) -> Result<()> {
    let path = &regular_target(path)?;
    let name = path.display().to_string();
    let f = match File::open(path) {
        Ok(f) => f,
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => return Ok(()),
        Err(e) => return Err(Error::io(&name, "cannot read the shelf", &e)),
    };
    crate::shelf::read_rows_with(&name, std::io::BufReader::new(f), false, each)
}

/// A quick first pass over the shelf's rows, unchecked (see `shelf::scan_cells`).
pub fn scan(path: &Path, each: impl FnMut(Option<u64>, &csv::StringRecord)) -> Result<()> {
    let path = &regular_target(path)?;
    let name = path.display().to_string();
    match File::open(path) {
        Ok(f) => {
            crate::shelf::scan_cells(std::io::BufReader::new(f), each);
            Ok(())
        }
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(()),
        Err(e) => Err(Error::io(&name, "cannot read the shelf", &e)),
    }
}

/// Reads the shelf; a missing file is an empty shelf.
pub fn read(path: &Path) -> Result<Shelf> {
    let path = &regular_target(path)?;
    let name = path.display().to_string();
    let mut f = match File::open(path) {
        Ok(f) => f,
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => return Ok(Shelf::default()),
        Err(e) => return Err(Error::io(&name, "cannot read the shelf", &e)),
    };
    if f.metadata().map(|m| m.is_dir()).unwrap_or(false) {
        return Err(Error::bad_input(
            &name,
            "is a directory; the shelf is a CSV file",
        ));
    }
    let mut bytes = Vec::new();
    (&mut f)
        .take(MAX_SHELF_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| Error::io(&name, "cannot read the shelf", &e))?;
    if bytes.len() as u64 > MAX_SHELF_BYTES {
        return Err(Error::bad_input(
            &name,
            "larger than 1 GiB; not a shelf file",
        ));
    }
    let text = String::from_utf8(bytes).map_err(|e| {
        let line = e.as_bytes()[..e.utf8_error().valid_up_to()]
            .iter()
            .filter(|&&b| b == b'\n')
            .count()
            + 1;
        Error::bad_input(&name, format!("line {line}: not UTF-8 text"))
    })?;
    parse_shelf(&name, &text)
}

fn lock_path(path: &Path) -> PathBuf {
    let mut s = path.as_os_str().to_owned();
    s.push(".lock");
    PathBuf::from(s)
}

fn dir_of(path: &Path) -> PathBuf {
    match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

/// Changes the shelf under the lock: `change` gets the shelf as read and returns the new entries
/// (or an error, and nothing is written) plus a value for the caller.
pub fn update<T>(path: &Path, change: impl FnOnce(&Shelf) -> Result<(Vec<Entry>, T)>) -> Result<T> {
    let target = regular_target(path)?;
    let path = target.as_path();
    let name = path.display().to_string();
    let dir = dir_of(path);
    if !dir.exists() {
        fs::create_dir_all(&dir).map_err(|e| {
            Error::io(
                dir.display().to_string(),
                "cannot create the shelf's directory",
                &e,
            )
        })?;
    }
    let lock = OpenOptions::new()
        .create(true)
        .truncate(false)
        .write(true)
        .open(lock_path(path))
        .map_err(|e| {
            Error::io(
                &name,
                "cannot lock the shelf (is its directory writable?)",
                &e,
            )
        })?;
    lock.lock()
        .map_err(|e| Error::io(&name, "cannot lock the shelf", &e))?;
    let shelf = read(path)?;
    let (entries, value) = change(&shelf)?;
    let text = shelf_text(&entries);
    write_atomic(path, text.as_bytes())?;
    let _ = lock.unlock();
    Ok(value)
}

/// Writes an output file (a card, a chart) whole: through a link to its target, never onto a
/// non-regular file, via a temporary file renamed over it, keeping the old file's mode. A failure
/// leaves the old file as it was.
pub fn write_whole(path: &Path, bytes: &[u8]) -> Result<()> {
    let target = regular_target(path)?;
    write_file(&target, bytes, false)
        .map_err(|e| Error::io(path.display().to_string(), "cannot write", &e))
}

/// Writes a file whole: temporary file in the same directory, flush, sync, rename, sync directory.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<()> {
    let name = path.display().to_string();
    write_file(path, bytes, true).map_err(|e| Error::io(&name, "cannot write the shelf", &e))
}

fn write_file(path: &Path, bytes: &[u8], clean: bool) -> std::io::Result<()> {
    let dir = dir_of(path);
    let base = path
        .file_name()
        .map(|f| f.to_string_lossy().into_owned())
        .unwrap_or_else(|| "shelf".into());
    let nanos = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.subsec_nanos())
        .unwrap_or(0);
    let tmp = dir.join(format!(".{base}.tmp-{}-{nanos}", std::process::id()));
    let mode = fs::metadata(path).ok().map(|m| m.permissions());
    let result = (|| -> std::io::Result<()> {
        let mut f = OpenOptions::new().create_new(true).write(true).open(&tmp)?;
        f.write_all(bytes)?;
        f.flush()?;
        f.sync_all()?;
        drop(f);
        if let Some(m) = mode {
            fs::set_permissions(&tmp, m)?;
        }
        fs::rename(&tmp, path)?;
        if let Ok(d) = File::open(&dir) {
            let _ = d.sync_all();
        }
        Ok(())
    })();
    if let Err(e) = result {
        let _ = fs::remove_file(&tmp);
        return Err(e);
    }
    if !clean {
        return Ok(());
    }
    // Temporary files left by a process killed mid-write (we hold the lock: none is in use).
    if let Ok(rd) = fs::read_dir(&dir) {
        let prefix = format!(".{base}.tmp-");
        for e in rd.flatten() {
            let n = e.file_name().to_string_lossy().into_owned();
            if n.starts_with(&prefix) && e.path() != tmp {
                let _ = fs::remove_file(e.path());
            }
        }
    }
    Ok(())
}
