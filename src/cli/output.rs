//! Writing output: standard output through one helper, single files through a temporary file
//! and a rename, and a whole folder of files (a sheet set) staged beside the target and swapped
//! into place, so an error never leaves a mixed set.
//!
//! Part of the `cli` stage, the only stage that touches the file system or the terminal.

use std::collections::BTreeSet;
use std::ffi::{OsStr, OsString};
use std::fs;
use std::io::{self, Write};
use std::path::{Path, PathBuf};

use tempfile::{Builder, NamedTempFile};

use super::error::CliError;

/// Writes `s` to standard output and flushes it. Every line the CLI prints goes through here;
/// a failed write is returned, never a panic (a broken pipe then ends the program quietly).
pub fn print_stdout(s: &str) -> Result<(), CliError> {
    let mut out = io::stdout().lock();
    out.write_all(s.as_bytes())
        .and_then(|()| out.flush())
        .map_err(CliError::Stdout)
}

/// Writes to standard output through a 64 KiB buffer with `write`, for large reports.
pub fn write_stdout(
    write: impl FnOnce(&mut io::BufWriter<io::StdoutLock<'static>>) -> io::Result<()>,
) -> Result<(), CliError> {
    let mut out = io::BufWriter::with_capacity(1 << 16, io::stdout().lock());
    write(&mut out)
        .and_then(|()| out.flush())
        .map_err(CliError::Stdout)
}

/// The folder a path's file goes into (`.` for a bare file name).
fn parent_of(path: &Path) -> &Path {
    path.parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."))
}

/// `.<name>.` for temporary names beside `path`, cut so the temporary name stays within the
/// 255-byte limit of common file systems.
fn temp_prefix(path: &Path) -> String {
    let name = path
        .file_name()
        .map_or_else(|| "out".into(), |n| n.to_string_lossy().into_owned());
    let mut cut = name.len().min(200);
    while !name.is_char_boundary(cut) {
        cut -= 1;
    }
    format!(".{}.", &name[..cut])
}

/// A builder for temporary files and folders that get the usual permissions (as from
/// `File::create` and `create_dir`, less the umask) rather than tempfile's owner-only ones,
/// since they become the output.
fn builder<'a>(prefix: &'a str, suffix: &'a str, folder: bool) -> Builder<'a, 'a> {
    let mut b = Builder::new();
    b.prefix(prefix).suffix(suffix);
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        b.permissions(fs::Permissions::from_mode(if folder {
            0o777
        } else {
            0o666
        }));
    }
    #[cfg(not(unix))]
    let _ = folder;
    b
}

/// A temporary file beside `path`, holding `bytes`, synced.
fn staged_file(path: &Path, bytes: &[u8]) -> io::Result<NamedTempFile> {
    let prefix = temp_prefix(path);
    let mut tmp = builder(&prefix, ".tmp", false).tempfile_in(parent_of(path))?;
    tmp.write_all(bytes)?;
    tmp.as_file().sync_all()?;
    Ok(tmp)
}

/// Writes `bytes` to `path` through a temporary file in the same folder, then renames it into
/// place, so a reader never sees a half-written file and an error leaves the old file intact.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> io::Result<()> {
    staged_file(path, bytes)?
        .persist(path)
        .map(drop)
        .map_err(|e| e.error)
}

/// Creates a new file that must not exist yet (for `new` and `rewind` without `--force`),
/// through the same temporary file; fails with `AlreadyExists` otherwise, also when the file
/// appears while it is being written.
pub fn write_new(path: &Path, bytes: &[u8]) -> io::Result<()> {
    if path.exists() {
        return Err(io::Error::new(
            io::ErrorKind::AlreadyExists,
            format!("{} already exists", path.display()),
        ));
    }
    staged_file(path, bytes)?
        .persist_noclobber(path)
        .map(drop)
        .map_err(|e| e.error)
}

/// Replaces the folder `target` with one holding exactly `files` (names inside the folder,
/// bytes), whole or not at all.
///
/// The files are written into a temporary folder `.<name>.XXXXXX.new` beside `target`. Entries
/// of the old folder that are not in the new set are carried over (a `draw` diagram, the user's
/// own notes), except those `is_stale` names, which go with the old set. Then the two folders
/// are exchanged in one step (Linux `renameat2` with `RENAME_EXCHANGE`) and the staging folder,
/// now holding the old set, is removed; where the system cannot exchange, the old folder is
/// renamed aside (`.<name>.XXXXXX.old/set`), the new one renamed into place and the old one
/// removed. An error at any point undoes what was done: the old folder stays as it was and no
/// temporary folder is left.
///
/// A killed run cannot clean up, so it may leave its staging or aside folder behind; the target
/// still holds one whole set (see [`recover_stale`]), and the next run into the same folder
/// first puts back what such a folder holds that belongs to the user and removes it. Two runs
/// into the same folder at the same time are not supported.
/// Returns the stale entries removed, as paths in `target`, sorted.
pub fn replace_folder(
    target: &Path,
    files: &[(String, Vec<u8>)],
    is_stale: impl Fn(&OsStr) -> bool,
) -> Result<Vec<PathBuf>, CliError> {
    let create_err = |source| CliError::CreateDir {
        path: target.to_path_buf(),
        source,
    };
    fs::create_dir_all(parent_of(target)).map_err(create_err)?;
    // A folder reached through a symbolic link is replaced where it really is, so the link
    // keeps pointing at the set.
    let real: PathBuf = match fs::symlink_metadata(target) {
        Ok(m) if m.file_type().is_symlink() => fs::canonicalize(target).map_err(create_err)?,
        _ => target.to_path_buf(),
    };
    let (user_target, target) = (target, real.as_path());
    let parent = parent_of(target);
    let prefix = temp_prefix(target);
    let is_set = |name: &OsStr| files.iter().any(|(n, _)| OsStr::new(n) == name) || is_stale(name);
    recover_stale(target, &prefix, is_set).map_err(create_err)?;
    let old_exists = match fs::symlink_metadata(target) {
        Ok(m) if m.is_dir() => true,
        Ok(_) => {
            return Err(create_err(io::Error::new(
                io::ErrorKind::AlreadyExists,
                "a file that is not a folder has that name",
            )));
        }
        Err(e) if e.kind() == io::ErrorKind::NotFound => false,
        Err(e) => return Err(create_err(e)),
    };
    let stage = builder(&prefix, ".new", true)
        .tempdir_in(parent)
        .map_err(create_err)?;
    for (name, bytes) in files {
        write_file(&stage.path().join(name), bytes)
            .map_err(|e| CliError::write(user_target.join(name), e))?;
    }
    if !old_exists {
        fs::rename(stage.path(), target).map_err(|e| CliError::write(target, e))?;
        let _ = stage.keep();
        return Ok(Vec::new());
    }

    // Carry the old folder's other entries over into the new one.
    let ours: BTreeSet<&OsStr> = files.iter().map(|(n, _)| OsStr::new(n.as_str())).collect();
    let mut carried = Carried {
        from: target,
        to: stage.path(),
        names: Vec::new(),
    };
    let mut stale = Vec::new();
    for entry in fs::read_dir(target).map_err(|e| CliError::write(target, e))? {
        let name = entry.map_err(|e| CliError::write(target, e))?.file_name();
        if ours.contains(name.as_os_str()) {
            continue;
        }
        if is_stale(&name) {
            stale.push(user_target.join(&name));
            continue;
        }
        carried.carry(name)?;
    }

    // The swap: one exchange where the system has it; the old set then goes with the stage.
    match exchange(stage.path(), target) {
        Ok(true) => {
            let _ = stage.close();
            stale.sort();
            return Ok(stale);
        }
        Ok(false) => {}
        Err(e) => return Err(carried.undo(CliError::write(target, e))),
    }
    let aside = builder(&prefix, ".old", true)
        .tempdir_in(parent)
        .map_err(|e| carried.undo(create_err(e)))?;
    let old = aside.path().join("set");
    fs::rename(target, &old).map_err(|e| carried.undo(CliError::write(target, e)))?;
    if let Err(e) = fs::rename(stage.path(), target) {
        if fs::rename(&old, target).is_err() {
            // Never delete the only copy of the old set: leave it where it is.
            let _ = aside.keep();
        }
        return Err(carried.undo(CliError::write(target, e)));
    }
    let _ = stage.keep();
    // The old set goes; if it cannot be removed it is at least out of the way.
    let _ = aside.close();
    stale.sort();
    Ok(stale)
}

/// Swaps the folders `a` and `b` in one step (`renameat2` with `RENAME_EXCHANGE`), so that no
/// moment has `b` missing or mixed; `Ok(false)` when the file system cannot.
#[cfg(target_os = "linux")]
fn exchange(a: &Path, b: &Path) -> io::Result<bool> {
    use rustix::fs::{CWD, RenameFlags, renameat_with};
    use rustix::io::Errno;
    match renameat_with(CWD, a, CWD, b, RenameFlags::EXCHANGE) {
        Ok(()) => Ok(true),
        Err(Errno::INVAL | Errno::NOSYS | Errno::NOTSUP) => Ok(false),
        Err(e) => Err(e.into()),
    }
}

/// No one-step exchange here: the caller renames aside and into place.
#[cfg(not(target_os = "linux"))]
fn exchange(_: &Path, _: &Path) -> io::Result<bool> {
    Ok(false)
}

/// Clears what killed runs left beside `target`: folders named `<prefix>XXXXXX.old` or
/// `<prefix>XXXXXX.new` (six random characters, as this module makes them).
///
/// An `.old` folder was the old set moved aside for the two-rename swap; if the kill came
/// before the new set was in place, `target` is missing and the old set goes back. A `.new`
/// folder was a staging folder: killed while it was being filled it holds part of a new set
/// and possibly entries carried from `target` (the user's); killed after the exchange it holds
/// the old set. Entries that are not `is_set` names and that `target` lacks go back into
/// `target`; the rest goes with the folder.
fn recover_stale(target: &Path, prefix: &str, is_set: impl Fn(&OsStr) -> bool) -> io::Result<()> {
    let parent = parent_of(target);
    let mut found: Vec<(bool, PathBuf)> = Vec::new();
    for entry in fs::read_dir(parent)? {
        let entry = entry?;
        let name = entry.file_name();
        let Some(rest) = name.to_str().and_then(|n| n.strip_prefix(prefix)) else {
            continue;
        };
        let old = match (rest.strip_suffix(".old"), rest.strip_suffix(".new")) {
            (Some(r), _) if r.len() == 6 => true,
            (_, Some(r)) if r.len() == 6 => false,
            _ => continue,
        };
        if entry.file_type()?.is_dir() {
            found.push((old, entry.path()));
        }
    }
    // The aside folders first: they may hold the only whole set.
    found.sort_by_key(|(old, p)| (!old, p.clone()));
    for (old, folder) in found {
        if old {
            let set = folder.join("set");
            if fs::symlink_metadata(target).is_err() && set.is_dir() {
                fs::rename(&set, target)?;
            }
        } else if target.is_dir() {
            for entry in fs::read_dir(&folder)? {
                let name = entry?.file_name();
                let back = target.join(&name);
                if !is_set(&name) && fs::symlink_metadata(&back).is_err() {
                    fs::rename(folder.join(&name), back)?;
                }
            }
        }
        fs::remove_dir_all(&folder)?;
    }
    Ok(())
}

/// Entries moved from the old folder into the staged one, so they can be moved back.
struct Carried<'a> {
    from: &'a Path,
    to: &'a Path,
    names: Vec<OsString>,
}

impl Carried<'_> {
    /// Moves `name` over; on failure moves back what was moved.
    fn carry(&mut self, name: OsString) -> Result<(), CliError> {
        let from = self.from.join(&name);
        match fs::rename(&from, self.to.join(&name)) {
            Ok(()) => {
                self.names.push(name);
                Ok(())
            }
            Err(e) => Err(self.undo(CliError::write(from, e))),
        }
    }

    /// Moves everything back (as far as the system lets it) and returns `err`.
    fn undo(&mut self, err: CliError) -> CliError {
        for name in self.names.drain(..).rev() {
            let _ = fs::rename(self.to.join(&name), self.from.join(&name));
        }
        err
    }
}

fn write_file(path: &Path, bytes: &[u8]) -> io::Result<()> {
    let mut f = fs::File::create(path)?;
    f.write_all(bytes)?;
    f.sync_all()
}
