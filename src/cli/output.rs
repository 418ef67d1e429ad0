//! Writing output: standard output through one helper, single files through a temporary file
//! and a rename, and a whole folder of files (a sheet set) staged beside the target and swapped
//! into place, so an error never leaves a mixed set.
//!
//! What may be replaced, for every command that writes (`new`, `rewind`, `draw`, `sheet`,
//! `test`): an output path must be absent, a regular file (a folder for a sheet set), or a
//! symbolic link to an existing one, which is followed: the file or folder it leads to is replaced and the link
//! kept. A folder where a file goes, a file where a folder goes, a device (`/dev/null`), a
//! FIFO, a socket, a link to nothing or to any of these is [`CliError::WrongKind`] (exit 2),
//! found before anything is written. Temporary files and folders have random names and are
//! created exclusively (`O_EXCL`), so nothing planted at a name is opened or followed.
//!
//! A sheet set knows its own files by the list [`SET_LIST`] written with it; staging folders
//! are marked ([`STAGING_MARKER`]) so that only they are cleared after a killed run; `sheet`
//! and `test -o` hold the output folder's lock ([`super::lock`]) while they write.
//!
//! Part of the `cli` stage, the only stage that touches the file system or the terminal.

use std::collections::BTreeSet;
use std::ffi::{OsStr, OsString};
use std::fs;
use std::io::{self, Write};
use std::path::{Path, PathBuf};

use tempfile::{Builder, NamedTempFile};

use super::error::{CliError, NoOverwrite};
use super::lock::lock_folder;

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
///
/// Its name is `.<name>.` followed by random letters and `.tmp`, and it is created with
/// `O_CREAT | O_EXCL` (tempfile's `create_new`), so nothing planted at a name armsheet might
/// use (a symbolic link, a FIFO, someone else's file) is opened or followed: a name that is
/// taken is skipped for another random one.
fn staged_file(path: &Path, bytes: &[u8]) -> io::Result<NamedTempFile> {
    let prefix = temp_prefix(path);
    let mut tmp = builder(&prefix, ".tmp", false)
        .tempfile_in(parent_of(path))
        .map_err(without_temp_path)?;
    tmp.write_all(bytes)?;
    tmp.as_file().sync_all()?;
    Ok(tmp)
}

/// The folder an output goes into, when it is not there to take it: the first folder of the
/// path that does not exist, or a part of the path that is something other than a folder (a
/// regular file where a folder should be). `None` when `folder` is a folder (or cannot be
/// looked at, which the write then reports).
fn missing_folder(folder: &Path) -> Option<(PathBuf, Option<EntryKind>)> {
    match fs::metadata(folder) {
        Ok(m) if m.is_dir() => return None,
        Ok(m) => return Some((folder.to_path_buf(), Some(EntryKind::of(m.file_type())))),
        Err(_) => {}
    }
    // From the top down: the first part of the path that is missing or not a folder.
    let mut parts: Vec<&Path> = folder
        .ancestors()
        .filter(|p| !p.as_os_str().is_empty())
        .collect();
    parts.reverse();
    for part in parts {
        match fs::metadata(part) {
            Ok(m) if m.is_dir() => {}
            Ok(m) => return Some((part.to_path_buf(), Some(EntryKind::of(m.file_type())))),
            Err(e) if e.kind() == io::ErrorKind::NotFound => {
                return Some((part.to_path_buf(), None));
            }
            Err(_) => return None,
        }
    }
    None
}

/// Refuses a single file whose folder is missing or is not a folder, naming the path as the
/// user gave it ([`CliError::NoFolder`]); armsheet does not make the folders of a file given
/// with `-o`.
fn folder_is_there(path: &Path) -> Result<(), CliError> {
    match missing_folder(parent_of(path)) {
        None => Ok(()),
        Some((blocked, found)) => Err(CliError::NoFolder {
            path: path.to_path_buf(),
            want: EntryKind::File,
            blocked,
            found,
        }),
    }
}

/// Makes the folder `dir` and the folders above it (`create_dir_all`) for `output`, a file or
/// folder (`want`) to be written in or at `dir`; when that fails because a part of the path is
/// a file (or something else that is not a folder), says so, naming that part
/// ([`CliError::NoFolder`]); any other failure is [`CliError::CreateDir`].
pub fn make_folders(dir: &Path, output: &Path, want: EntryKind) -> Result<(), CliError> {
    fs::create_dir_all(dir).map_err(|source| match missing_folder(dir) {
        Some((blocked, found @ Some(_))) => CliError::NoFolder {
            path: output.to_path_buf(),
            want,
            blocked,
            found,
        },
        _ => CliError::CreateDir {
            path: if want == EntryKind::Folder {
                output
            } else {
                dir
            }
            .to_path_buf(),
            source,
        },
    })
}

/// An error from making a temporary file, without the temporary file's path that `tempfile`
/// adds to it (the user never named that path): the system's own error, or its kind.
fn without_temp_path(e: io::Error) -> io::Error {
    if e.raw_os_error().is_some() {
        return e;
    }
    let inner = e
        .get_ref()
        .and_then(|i| std::error::Error::source(i))
        .and_then(|s| s.downcast_ref::<io::Error>());
    match inner {
        Some(i) => match i.raw_os_error() {
            Some(code) => io::Error::from_raw_os_error(code),
            None => io::Error::from(i.kind()),
        },
        None => e,
    }
}

/// What is found at a path, a symbolic link aside.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum EntryKind {
    /// A regular file.
    File,
    /// A folder (directory).
    Folder,
    /// A character device (`/dev/null`, a terminal).
    CharDevice,
    /// A block device (a disk).
    BlockDevice,
    /// A FIFO (named pipe).
    Fifo,
    /// A Unix socket.
    Socket,
    /// Anything else the system has.
    Other,
}

impl EntryKind {
    pub(crate) fn of(t: fs::FileType) -> Self {
        #[cfg(unix)]
        {
            use std::os::unix::fs::FileTypeExt;
            if t.is_char_device() {
                return EntryKind::CharDevice;
            }
            if t.is_block_device() {
                return EntryKind::BlockDevice;
            }
            if t.is_fifo() {
                return EntryKind::Fifo;
            }
            if t.is_socket() {
                return EntryKind::Socket;
            }
        }
        if t.is_file() {
            EntryKind::File
        } else if t.is_dir() {
            EntryKind::Folder
        } else {
            EntryKind::Other
        }
    }

    /// The noun, to follow "a": "regular file", "FIFO (named pipe)".
    pub fn noun(self) -> &'static str {
        match self {
            EntryKind::File => "regular file",
            EntryKind::Folder => "folder",
            EntryKind::CharDevice => "character device",
            EntryKind::BlockDevice => "block device",
            EntryKind::Fifo => "FIFO (named pipe)",
            EntryKind::Socket => "socket",
            EntryKind::Other => "special file",
        }
    }
}

/// An output path armsheet will not write to, and why; nothing has been written.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct WrongKind {
    /// What was to be written: [`EntryKind::File`] or [`EntryKind::Folder`] (a sheet set).
    pub want: EntryKind,
    /// Where the symbolic link at the path points, as the link says, when it is one.
    pub link: Option<PathBuf>,
    /// What is there, after the link; `None` for a link to nothing.
    pub found: Option<EntryKind>,
}

/// Where an output of kind `want` ([`EntryKind::File`] or [`EntryKind::Folder`]) for `path`
/// goes, and whether something is there already: `(the path to write at, exists)`.
///
/// The rules, the same for every command that writes (`new`, `rewind`, `draw`, `sheet`):
/// - nothing at `path`: it is created there;
/// - an entry of the kind wanted: it is replaced (when the command replaces at all);
/// - a symbolic link to an entry of the kind wanted: the link is followed, the entry it leads
///   to is replaced and the link kept;
/// - anything else (a folder where a file goes, a file where a folder goes, a device, a FIFO,
///   a socket, a link to nothing or to any of these): [`CliError::WrongKind`], before anything
///   is written.
fn resolve(path: &Path, want: EntryKind) -> Result<(PathBuf, bool), CliError> {
    let fail = |e: io::Error| match want {
        EntryKind::Folder => CliError::CreateDir {
            path: path.to_path_buf(),
            source: e,
        },
        _ => CliError::write(path, e),
    };
    let wrong = |link, found| CliError::WrongKind {
        path: path.to_path_buf(),
        why: WrongKind { want, link, found },
    };
    let meta = match fs::symlink_metadata(path) {
        Ok(m) => m,
        Err(e) if e.kind() == io::ErrorKind::NotFound => return Ok((path.to_path_buf(), false)),
        Err(e) => return Err(fail(e)),
    };
    if !meta.file_type().is_symlink() {
        let kind = EntryKind::of(meta.file_type());
        return if kind == want {
            Ok((path.to_path_buf(), true))
        } else {
            Err(wrong(None, Some(kind)))
        };
    }
    let link = fs::read_link(path).map_err(fail)?;
    match fs::metadata(path) {
        Ok(m) if EntryKind::of(m.file_type()) == want => {
            Ok((fs::canonicalize(path).map_err(fail)?, true))
        }
        Ok(m) => Err(wrong(Some(link), Some(EntryKind::of(m.file_type())))),
        Err(e) if e.kind() == io::ErrorKind::NotFound => Err(wrong(Some(link), None)),
        Err(e) => Err(fail(e)),
    }
}

/// Refuses, just before the rename, anything that appeared at `real` since [`resolve`] looked
/// and is not a regular file (a narrow window, but it costs one `lstat`).
fn still_a_file_or_absent(user: &Path, real: &Path) -> Result<(), CliError> {
    match fs::symlink_metadata(real) {
        Ok(m) if m.file_type().is_file() => Ok(()),
        Ok(m) => Err(CliError::WrongKind {
            path: user.to_path_buf(),
            why: WrongKind {
                want: EntryKind::File,
                link: None,
                found: Some(EntryKind::of(m.file_type())),
            },
        }),
        Err(e) if e.kind() == io::ErrorKind::NotFound => Ok(()),
        Err(e) => Err(CliError::write(user, e)),
    }
}

/// Writes `bytes` to `path` (replacing a regular file there) through a temporary file in the
/// same folder, then renames it into place, so a reader never sees a half-written file and an
/// error leaves the old file intact. `path` must be absent, a regular file or a symbolic link
/// to one (then the file it leads to is replaced and the link kept); anything else is
/// [`CliError::WrongKind`] and nothing is written (see `resolve`).
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), CliError> {
    folder_is_there(path)?;
    let (real, _) = resolve(path, EntryKind::File)?;
    let tmp = staged_file(&real, bytes).map_err(|e| CliError::write(path, e))?;
    still_a_file_or_absent(path, &real)?;
    tmp.persist(&real)
        .map(drop)
        .map_err(|e| CliError::write(path, e.error))
}

/// Creates a new file that must not exist yet (for `new`, and `rewind` without `--force`),
/// through the same temporary file. An existing regular file (or a link to one) is
/// [`CliError::Exists`], refused `by` the command; so is a file that appears while this one is
/// being written. Anything else at `path` is [`CliError::WrongKind`], as for [`write_atomic`].
pub fn write_new(path: &Path, bytes: &[u8], by: NoOverwrite) -> Result<(), CliError> {
    let exists = || CliError::Exists {
        path: path.to_path_buf(),
        by,
    };
    folder_is_there(path)?;
    if resolve(path, EntryKind::File)?.1 {
        return Err(exists());
    }
    staged_file(path, bytes)
        .map_err(|e| CliError::write(path, e))?
        .persist_noclobber(path)
        .map(drop)
        .map_err(|e| {
            if e.error.kind() == io::ErrorKind::AlreadyExists {
                exists()
            } else {
                CliError::write(path, e.error)
            }
        })
}

/// Writes `files` (names inside the folder, bytes) into the folder `dir`, each on its own with
/// [`write_atomic`] (a temporary file beside it, then a rename), creating the folder if it is
/// missing. Nothing else in `dir` is moved, read or removed, so the files of another command
/// written there (a `sheet` set) stay as they are; a run killed part way leaves each of its
/// files whole, old or new, and at most a temporary `.<name>.XXXXXX.tmp` beside it, which the
/// next run removes. The folder's lock is held throughout (see [`lock_folder`]), for the
/// command `who`, so a `sheet` run into the same folder waits. `dir` must be absent, a folder
/// or a symbolic link to one (see `resolve`); anything else is [`CliError::WrongKind`] and
/// nothing is written.
pub fn write_own_files(dir: &Path, files: &[(String, Vec<u8>)], who: &str) -> Result<(), CliError> {
    make_folders(parent_of(dir), dir, EntryKind::Folder)?;
    let (real, _) = resolve(dir, EntryKind::Folder)?;
    // A folder the user may write in, beside which nothing may be made (a read-only parent),
    // is written unlocked, as before there were locks: no `sheet` run can write there either.
    let _lock = match lock_folder(&real, dir, who) {
        Err(CliError::Write { source, .. })
            if matches!(
                source.kind(),
                io::ErrorKind::PermissionDenied | io::ErrorKind::ReadOnlyFilesystem
            ) && real.is_dir() =>
        {
            None
        }
        other => Some(other?),
    };
    // Looked at again under the lock: another run may have made or replaced it meanwhile.
    let (real, exists) = resolve(dir, EntryKind::Folder)?;
    if exists {
        // Every file's place first, so a wrong one refuses before any is written.
        for (name, _) in files {
            resolve(&dir.join(name), EntryKind::File)?;
        }
    } else {
        make_folders(&real, dir, EntryKind::Folder)?;
    }
    for (name, bytes) in files {
        let path = dir.join(name);
        clear_own_temporaries(&real, &temp_prefix(&path));
        write_atomic(&path, bytes)?;
    }
    Ok(())
}

/// Removes the temporary files a killed run left for one of its own files in `dir`: regular
/// files named `prefix` (`.<name>.`), six random letters or digits and `.tmp`, as
/// [`staged_file`] makes them. Nothing else is touched; a file that cannot be removed stays.
fn clear_own_temporaries(dir: &Path, prefix: &str) {
    let Ok(entries) = fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let name = entry.file_name();
        let ours = name
            .to_str()
            .and_then(|n| n.strip_prefix(prefix))
            .and_then(|r| r.strip_suffix(".tmp"))
            .is_some_and(|r| r.len() == 6 && r.chars().all(|c| c.is_ascii_alphanumeric()));
        if ours && entry.file_type().is_ok_and(|t| t.is_file()) {
            let _ = fs::remove_file(entry.path());
        }
    }
}

/// The list of a set's own files, written into the set folder with the set by
/// [`replace_folder`]: a comment header, then one file name a line. The next run takes the
/// files it lists (and only those) for the old set's.
pub const SET_LIST: &str = "sheet-set.txt";

/// The marker file written first into every staging (`.new`) and aside (`.old`) folder,
/// holding the name of the folder it stages for. Only a folder holding it, naming the run's
/// own target, is ever cleared as a killed run's leftover (or an empty folder, see
/// `unfinished_for`); a folder of the user's that merely has such a name is never touched. (A short name: a path too long for the system then fails at
/// the set's files as it always did, with the file named.)
pub const STAGING_MARKER: &str = ".arm-staging";

/// The marker's text for staging beside `target`: its file name and a newline.
fn marker_text(target: &Path) -> Vec<u8> {
    let mut v = target
        .file_name()
        .unwrap_or(OsStr::new("out"))
        .as_encoded_bytes()
        .to_vec();
    v.push(b'\n');
    v
}

/// True when `folder` holds the staging marker for `target` (a regular file, as
/// [`marker_text`] writes it).
fn marked_for(folder: &Path, target: &Path) -> bool {
    let path = folder.join(STAGING_MARKER);
    fs::symlink_metadata(&path).is_ok_and(|m| m.is_file() && m.len() <= 4096)
        && fs::read(&path).is_ok_and(|b| b == marker_text(target))
}

/// True when `folder` holds nothing but the start of the staging marker for `target` (or
/// nothing at all): what a run killed the instant after it made the folder leaves. Such a
/// folder holds nothing of anyone's and is cleared with the marked ones.
fn unfinished_for(folder: &Path, target: &Path) -> bool {
    let Ok(entries) = fs::read_dir(folder) else {
        return false;
    };
    let mut n = 0;
    for entry in entries {
        let Ok(entry) = entry else { return false };
        n += 1;
        let path = entry.path();
        let start = entry.file_name() == STAGING_MARKER
            && entry.file_type().is_ok_and(|t| t.is_file())
            && fs::read(&path).is_ok_and(|b| marker_text(target).starts_with(&b));
        if n > 1 || !start {
            return false;
        }
    }
    true
}

/// The text of [`SET_LIST`] for `files`.
fn set_list(files: &[(String, Vec<u8>)]) -> String {
    let mut s = String::from(
        "# armsheet sheet set: the files below were written together, as one set, by `armsheet sheet`.\n\
         # The next `sheet` run into this folder replaces them and removes those it does not write\n\
         # again; every file not listed here (notes, `armsheet test -o` files) is kept.\n",
    );
    for (name, _) in files {
        s.push_str(name);
        s.push('\n');
    }
    s
}

/// The file names [`SET_LIST`] in `dir` lists; `None` when there is no list (a folder written
/// by an armsheet before lists, or not a set). Lines that are not a plain file name (empty,
/// a comment, a path, `.`, `..`, the marker) are skipped, so an edited list can never reach
/// outside the folder.
pub(crate) fn read_set_list(dir: &Path) -> Option<BTreeSet<OsString>> {
    let path = dir.join(SET_LIST);
    let meta = fs::symlink_metadata(&path).ok()?;
    if !meta.is_file() || meta.len() > 1 << 20 {
        return None;
    }
    let text = fs::read_to_string(&path).ok()?;
    Some(
        text.lines()
            .map(|l| l.trim_end_matches('\r'))
            .filter(|l| {
                !l.is_empty()
                    && !l.starts_with('#')
                    && !l.contains(['/', '\\', '\0'])
                    && !matches!(*l, "." | ".." | STAGING_MARKER)
            })
            .map(OsString::from)
            .collect(),
    )
}

/// Replaces the folder `target` with one holding exactly `files` (names inside the folder,
/// bytes) and their list [`SET_LIST`], whole or not at all, under the folder's lock (taken
/// for the command `who`, see [`lock_folder`]).
///
/// The files are written into a temporary folder `.<name>.XXXXXX.new` beside `target`, marked
/// first with [`STAGING_MARKER`] and then the list. Entries of the old folder that are not in
/// the new set are carried over (a `draw` diagram, `test -o` files, the user's own notes; a
/// regular file as a second hard link, so it never leaves the old folder, see `Carried`),
/// except the old set's own files: those its [`SET_LIST`] names, or where the old folder has
/// no list (written before lists) those `legacy_stale` names; they go with the old set, so the
/// folder holds one set (a `sheets.pdf` the new set does not have goes). Then the two folders
/// are exchanged in one step (Linux `renameat2` with `RENAME_EXCHANGE`) and the staging
/// folder, now holding the old set, is removed; where the system cannot exchange, the old
/// folder is renamed aside (`.<name>.XXXXXX.old/set`, the aside folder marked too), the new
/// one renamed into place and the old one removed. An error at any point undoes what was done:
/// the old folder stays as it was and no temporary folder is left.
///
/// A killed run cannot clean up, so it may leave its staging or aside folder behind; the target
/// still holds one whole set (see `recover_stale`), and the next run into the same folder
/// first puts back what such a folder holds that belongs to the user and removes it. Two runs
/// into the same folder at the same time are kept apart by the lock: the second waits, then
/// gives up with [`CliError::Busy`].
/// Returns the stale entries removed, as paths in `target`, sorted.
pub fn replace_folder(
    target: &Path,
    files: &[(String, Vec<u8>)],
    legacy_stale: impl Fn(&OsStr) -> bool,
    who: &str,
) -> Result<Vec<PathBuf>, CliError> {
    let create_err = |source| CliError::CreateDir {
        path: target.to_path_buf(),
        source,
    };
    make_folders(parent_of(target), target, EntryKind::Folder)?;
    // A folder reached through a symbolic link is replaced where it really is, so the link
    // keeps pointing at the set; anything but a folder or nothing is refused (see `resolve`).
    let (real, _) = resolve(target, EntryKind::Folder)?;
    let _lock = lock_folder(&real, target, who)?;
    // Looked at again under the lock: another run may have made or replaced it meanwhile.
    let (real, _) = resolve(target, EntryKind::Folder)?;
    let (user_target, target) = (target, real.as_path());
    let parent = parent_of(target);
    let prefix = temp_prefix(target);
    let list = set_list(files);
    let mut all: Vec<(&str, &[u8])> = vec![(SET_LIST, list.as_bytes())];
    all.extend(files.iter().map(|(n, b)| (n.as_str(), b.as_slice())));
    let ours: BTreeSet<&OsStr> = all.iter().map(|(n, _)| OsStr::new(*n)).collect();
    let is_set = |name: &OsStr| ours.contains(name) || legacy_stale(name);
    recover_stale(target, &prefix, is_set).map_err(create_err)?;
    // A set a killed run had moved aside may be back in place now.
    let old_exists = fs::symlink_metadata(target).is_ok_and(|m| m.is_dir());
    let marker = marker_text(target);
    let stage = builder(&prefix, ".new", true)
        .tempdir_in(parent)
        .map_err(create_err)?;
    write_file(&stage.path().join(STAGING_MARKER), &marker)
        .map_err(|e| CliError::write(user_target.join(STAGING_MARKER), e))?;
    for (name, bytes) in &all {
        write_file(&stage.path().join(name), bytes)
            .map_err(|e| CliError::write(user_target.join(name), e))?;
    }
    let unmark_new = || {
        let _ = fs::remove_file(target.join(STAGING_MARKER));
    };
    if !old_exists {
        fs::rename(stage.path(), target).map_err(|e| CliError::write(target, e))?;
        let _ = stage.keep();
        unmark_new();
        return Ok(Vec::new());
    }

    // Carry the old folder's other entries over into the new one.
    let old_list = read_set_list(target);
    let mut carried = Carried {
        from: target,
        to: stage.path(),
        moved: Vec::new(),
    };
    let mut stale = Vec::new();
    for entry in fs::read_dir(target).map_err(|e| CliError::write(target, e))? {
        let entry = entry.map_err(|e| CliError::write(target, e))?;
        let name = entry.file_name();
        // A marker left in the set by a run killed just after its swap goes with the old set.
        if ours.contains(name.as_os_str()) || name == STAGING_MARKER {
            continue;
        }
        let old_sets = match &old_list {
            Some(l) => l.contains(&name),
            None => legacy_stale(&name),
        };
        if old_sets && entry.file_type().is_ok_and(|t| t.is_file()) {
            stale.push(user_target.join(&name));
            continue;
        }
        carried.carry(name)?;
    }

    // The old folder is marked too before the swap, so that if the run is killed once the old
    // set lies in the staging folder's place, the next run still knows that folder for its own.
    let old_marker = target.join(STAGING_MARKER);
    let unmark_old = || {
        let _ = fs::remove_file(&old_marker);
    };
    let _ = fs::remove_file(&old_marker);
    write_file(&old_marker, &marker).map_err(|e| carried.undo(CliError::write(target, e)))?;

    // The swap: one exchange where the system has it; the old set then goes with the stage.
    match exchange(stage.path(), target) {
        Ok(true) => {
            unmark_new();
            let _ = stage.close();
            stale.sort();
            return Ok(stale);
        }
        Ok(false) => {}
        Err(e) => {
            unmark_old();
            return Err(carried.undo(CliError::write(target, e)));
        }
    }
    if let Err(e) = swap_aside(target, stage.path(), &prefix, &marker) {
        unmark_old();
        return Err(carried.undo(e));
    }
    let _ = stage.keep();
    unmark_new();
    stale.sort();
    Ok(stale)
}

/// The swap where the system cannot exchange two folders in one step: the old folder `target`
/// is renamed aside into a marked folder `.<name>.XXXXXX.old/set`, the staged one `stage`
/// renamed into place and the aside folder removed. On an error the old folder is put back
/// (or, if even that fails, left in the marked aside folder for the next run to put back).
fn swap_aside(target: &Path, stage: &Path, prefix: &str, marker: &[u8]) -> Result<(), CliError> {
    let create_err = |source| CliError::CreateDir {
        path: target.to_path_buf(),
        source,
    };
    let aside = builder(prefix, ".old", true)
        .tempdir_in(parent_of(target))
        .map_err(create_err)?;
    write_file(&aside.path().join(STAGING_MARKER), marker).map_err(create_err)?;
    let old = aside.path().join("set");
    fs::rename(target, &old).map_err(|e| CliError::write(target, e))?;
    if let Err(e) = fs::rename(stage, target) {
        if fs::rename(&old, target).is_err() {
            // Never delete the only copy of the old set: leave it where it is (marked, so the
            // next run puts it back).
            let _ = aside.keep();
        }
        return Err(CliError::write(target, e));
    }
    // The old set goes; if it cannot be removed it is at least out of the way.
    let _ = aside.close();
    Ok(())
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
/// `<prefix>XXXXXX.new` (six random characters, as this module makes them) that hold the
/// [`STAGING_MARKER`] naming `target`, or nothing but the start of it. A folder with such a name but no marker (the user's,
/// a set written from a design named `.hoist-lap.pump01.new.toml`, another target's staging)
/// is left alone. Runs under the folder's lock, so no live staging folder is ever taken.
///
/// An `.old` folder was the old set moved aside for the two-rename swap; if the kill came
/// before the new set was in place, `target` is missing and the old set goes back. A `.new`
/// folder was a staging folder: killed while it was being filled it holds part of a new set
/// and possibly entries carried from `target` (the user's); killed after the exchange it holds
/// the old set. Entries that are neither `is_set` names nor listed in the folder's own
/// [`SET_LIST`], and that `target` lacks, go back into `target`; the rest goes with the folder.
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
        let path = entry.path();
        if entry.file_type()?.is_dir()
            && (marked_for(&path, target) || unfinished_for(&path, target))
        {
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
                // Marked before the swap that was cut short.
                let _ = fs::remove_file(target.join(STAGING_MARKER));
            }
        } else if target.is_dir() {
            let listed = read_set_list(&folder).unwrap_or_default();
            for entry in fs::read_dir(&folder)? {
                let name = entry?.file_name();
                let back = target.join(&name);
                let set_file = is_set(&name)
                    || listed.contains(&name)
                    || name == SET_LIST
                    || name == STAGING_MARKER;
                if !set_file && fs::symlink_metadata(&back).is_err() {
                    fs::rename(folder.join(&name), back)?;
                }
            }
        }
        fs::remove_dir_all(&folder)?;
    }
    Ok(())
}

/// Entries carried from the old folder into the staged one, so they can be moved back.
///
/// A regular file is carried as a second hard link, so it stays in the old folder too: a run
/// killed before its swap leaves every such file (`test -o`'s, the user's notes) where it was.
/// Anything else (a sub-folder, a link), or a file the system will not link, is moved.
struct Carried<'a> {
    from: &'a Path,
    to: &'a Path,
    /// The names moved (not linked), to be moved back on an error.
    moved: Vec<OsString>,
}

impl Carried<'_> {
    /// Links or moves `name` over; on failure moves back what was moved.
    fn carry(&mut self, name: OsString) -> Result<(), CliError> {
        let from = self.from.join(&name);
        let to = self.to.join(&name);
        if fs::symlink_metadata(&from).is_ok_and(|m| m.file_type().is_file())
            && fs::hard_link(&from, &to).is_ok()
        {
            return Ok(());
        }
        match fs::rename(&from, to) {
            Ok(()) => {
                self.moved.push(name);
                Ok(())
            }
            Err(e) => Err(self.undo(CliError::write(from, e))),
        }
    }

    /// Moves everything moved back (as far as the system lets it) and returns `err`; the
    /// linked files never left.
    fn undo(&mut self, err: CliError) -> CliError {
        for name in self.moved.drain(..).rev() {
            let _ = fs::rename(self.to.join(&name), self.from.join(&name));
        }
        err
    }
}

/// Writes a new file in the freshly made staging folder; `create_new` (`O_EXCL`) so nothing put
/// there meanwhile is opened or followed.
fn write_file(path: &Path, bytes: &[u8]) -> io::Result<()> {
    let mut f = fs::OpenOptions::new()
        .write(true)
        .create_new(true)
        .open(path)?;
    f.write_all(bytes)?;
    f.sync_all()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn temporary_names_are_random_and_beside_the_target() {
        let dir = tempfile::tempdir().unwrap();
        let target = dir.path().join("x.toml");
        let a = staged_file(&target, b"a").unwrap();
        let b = staged_file(&target, b"b").unwrap();
        let name = |t: &NamedTempFile| t.path().file_name().unwrap().to_string_lossy().into_owned();
        let (na, nb) = (name(&a), name(&b));
        assert_ne!(na, nb);
        for n in [&na, &nb] {
            let random = n
                .strip_prefix(".x.toml.")
                .and_then(|r| r.strip_suffix(".tmp"))
                .unwrap_or_else(|| panic!("{n}"));
            assert!(
                random.len() >= 6 && random.chars().all(|c| c.is_ascii_alphanumeric()),
                "{n}"
            );
        }
        assert_eq!(a.path().parent(), Some(dir.path()));
    }
}
