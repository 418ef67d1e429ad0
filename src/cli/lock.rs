//! The lock on an output folder: one armsheet run at a time writes into `DIR/<stem>/`.
//!
//! `sheet` (a whole set, staged beside the folder and swapped in) and `test -o` (its own four
//! files) take an exclusive advisory lock on the lock file `DIR/.<stem>.lock` beside the folder
//! before they look at the folder or clear what a killed run left there, and hold it until they
//! are done. A second run into the same folder waits up to [`LOCK_WAIT`] for the first, then
//! gives up with [`CliError::Busy`] (exit 2), naming the lock file and the run that holds it
//! (the holder writes its command and process id into the lock file). The holder removes the
//! lock file as it finishes, so a finished run leaves nothing beside the folder; a killed run
//! leaves it behind, unlocked (the system drops the lock of a dead process), and the next run
//! takes it over. A waiter that locked a file the holder had just removed sees that the name
//! no longer leads to its file and tries again, so two runs never both hold the folder.
//!
//! The lock is advisory: it keeps armsheet runs apart, not other programs.
//!
//! Part of the `cli` stage.

use std::fs::{self, File, OpenOptions, TryLockError};
use std::io::{self, Write};
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use super::error::CliError;
use super::output::{EntryKind, WrongKind};

/// How long a run waits for another run into the same folder before it gives up.
pub const LOCK_WAIT: Duration = Duration::from_secs(5);

/// How often a waiting run tries the lock again.
const POLL: Duration = Duration::from_millis(50);

/// A held lock on an output folder; released (and its file removed) when dropped.
#[derive(Debug)]
pub struct FolderLock {
    file: File,
    path: PathBuf,
}

impl Drop for FolderLock {
    fn drop(&mut self) {
        // Still held: the name leads to this file (checked when it was taken, and only a
        // holder removes it), so removing it cannot take another run's lock away.
        let _ = fs::remove_file(&self.path);
        let _ = self.file.unlock();
    }
}

/// The lock file of the folder `folder` (the real folder, links followed): `.<name>.lock`
/// beside it.
pub fn lock_path(folder: &Path) -> PathBuf {
    let name = folder
        .file_name()
        .map_or_else(|| "out".into(), |n| n.to_string_lossy().into_owned());
    let parent = folder
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    parent.join(format!(".{name}.lock"))
}

/// Takes the lock of `folder` (its parent must exist) for the command `who` (`sheet`,
/// `test -o`), waiting up to [`LOCK_WAIT`] for another run; `shown_as` is the folder as the
/// user gave it, for the messages.
pub fn lock_folder(folder: &Path, shown_as: &Path, who: &str) -> Result<FolderLock, CliError> {
    let path = lock_path(folder);
    let fail = |e: io::Error| CliError::write(&path, e);
    let start = Instant::now();
    loop {
        let file = open_lock_file(&path)?;
        match file.try_lock() {
            Ok(()) => {
                if same_file(&file, &path).map_err(fail)? {
                    let mut lock = FolderLock { file, path };
                    say_who(&mut lock.file, who).map_err(|e| CliError::write(&lock.path, e))?;
                    return Ok(lock);
                }
                // Removed by its holder between our open and our lock: try the new one.
                let _ = file.unlock();
                continue;
            }
            Err(TryLockError::WouldBlock) => {}
            Err(TryLockError::Error(e)) => return Err(fail(e)),
        }
        if start.elapsed() >= LOCK_WAIT {
            return Err(CliError::Busy {
                folder: shown_as.to_path_buf(),
                lock: path.clone(),
                holder: holder(&path),
                waited: LOCK_WAIT,
            });
        }
        std::thread::sleep(POLL);
    }
}

/// Opens the lock file, creating it when absent (`O_EXCL`, so a link planted at the name is
/// never followed to create a file elsewhere). Anything there but a regular file is refused.
fn open_lock_file(path: &Path) -> Result<File, CliError> {
    loop {
        match OpenOptions::new()
            .read(true)
            .write(true)
            .create_new(true)
            .open(path)
        {
            Ok(f) => return Ok(f),
            Err(e) if e.kind() == io::ErrorKind::AlreadyExists => {}
            Err(e) => return Err(CliError::write(path, e)),
        }
        match fs::symlink_metadata(path) {
            Ok(m) if m.file_type().is_file() => {}
            Ok(m) => {
                return Err(CliError::WrongKind {
                    path: path.to_path_buf(),
                    why: WrongKind {
                        want: EntryKind::File,
                        link: fs::read_link(path).ok(),
                        found: Some(EntryKind::of(m.file_type())),
                    },
                });
            }
            // Removed meanwhile: create it again.
            Err(e) if e.kind() == io::ErrorKind::NotFound => continue,
            Err(e) => return Err(CliError::write(path, e)),
        }
        match OpenOptions::new().read(true).write(true).open(path) {
            Ok(f) => return Ok(f),
            Err(e) if e.kind() == io::ErrorKind::NotFound => {}
            Err(e) => return Err(CliError::write(path, e)),
        }
    }
}

/// True when `path` (not followed) is the very file `file` is open on.
#[cfg(unix)]
fn same_file(file: &File, path: &Path) -> io::Result<bool> {
    use std::os::unix::fs::MetadataExt;
    let open = file.metadata()?;
    match fs::symlink_metadata(path) {
        Ok(m) => Ok(m.file_type().is_file() && m.dev() == open.dev() && m.ino() == open.ino()),
        Err(e) if e.kind() == io::ErrorKind::NotFound => Ok(false),
        Err(e) => Err(e),
    }
}

/// Without inode numbers, the name is taken to lead to the file opened.
#[cfg(not(unix))]
fn same_file(_: &File, path: &Path) -> io::Result<bool> {
    Ok(fs::symlink_metadata(path).is_ok_and(|m| m.file_type().is_file()))
}

/// Writes the holder's command and process id into the lock file, for a waiting run to name.
fn say_who(file: &mut File, who: &str) -> io::Result<()> {
    file.set_len(0)?;
    writeln!(file, "armsheet {who}, process {}", std::process::id())
}

/// The run holding the lock, as it wrote itself into the lock file (first line, shown safely,
/// at most 120 characters); `None` when it cannot be read.
fn holder(path: &Path) -> Option<String> {
    let text = fs::read(path).ok()?;
    let text = String::from_utf8_lossy(&text[..text.len().min(4096)]).into_owned();
    let line = text.lines().next()?.trim();
    (!line.is_empty())
        .then(|| crate::base::visible::visible(&crate::base::visible::clip(line, 120)).into_owned())
}
