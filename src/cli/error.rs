//! [`CliError`]: everything that can stop a command, and the one place that reports it.
//!
//! Part of the `cli` stage. Commands return `Result<Outcome, CliError>`; only
//! [`super::run_from_env`] prints an error (through [`CliError::report`]) and turns it into an
//! exit code. A closed standard output (broken pipe) is not reported and exits 0, as standard
//! Unix tools do when the reader has seen enough (`armsheet check … | head`).

use std::fmt;
use std::io::{self, Write};
use std::path::PathBuf;

use super::output::{EntryKind, WrongKind};
use crate::base::number::{fmt_fixed, fmt_toml};
use crate::base::visible::visible;
use crate::design::Diagnostics;
use crate::features::rewind::RewindError;
use crate::features::rewind::{
    FluxSource, MAX_CURRENT_A, MAX_FLUX_MWB, MAX_SPEED_RPM, MAX_VOLTAGE,
};

/// The exit code of bad input, or of output that could not be written.
pub const EXIT_BAD_INPUT: u8 = 2;

/// The exit codes of the commands that check a design (`check`, `sheet`, `test`), as their
/// help words them: written once here, after the README's table of exit codes. A macro, so
/// that the help texts, which clap takes as constants, can be put together with `concat!`.
macro_rules! exit_codes_help {
    () => {
        "Exit codes: 0 passes, 1 an error-level check fails, 2 bad input or output that could not be
written."
    };
}
pub(crate) use exit_codes_help;

/// The command that refuses to replace an existing file.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum NoOverwrite {
    /// `armsheet new`: never overwrites.
    New,
    /// `armsheet rewind` without `--force`.
    Rewind,
    /// `armsheet identify` without `--force`.
    Identify,
    /// `armsheet explore --write` without `--force`.
    Explore,
}

/// Why a command stopped.
#[derive(Debug)]
pub enum CliError {
    /// The design file cannot be read.
    Read {
        /// The design file.
        path: PathBuf,
        /// What the system said.
        source: io::Error,
    },
    /// The data card cannot be read (`armsheet identify`).
    ReadCard {
        /// The card.
        path: PathBuf,
        /// What the system said.
        source: io::Error,
    },
    /// The frame file cannot be read (`armsheet explore`).
    ReadFrame {
        /// The frame.
        path: PathBuf,
        /// What the system said.
        source: io::Error,
    },
    /// `armsheet explore --write N` names no candidate, or the pick does not pass `check` or
    /// parse back (nothing is written).
    Explore {
        /// The frame, as given.
        frame: String,
        /// Why.
        message: String,
    },
    /// The design file does not parse or validate; each diagnostic names file, line and key,
    /// and all of them are printed (boxed: errors travel through every `?`).
    Design(Box<Diagnostics>),
    /// An output folder cannot be made.
    CreateDir {
        /// The folder.
        path: PathBuf,
        /// What the system said.
        source: io::Error,
    },
    /// The folder an output goes into is missing (a single file: armsheet does not make the
    /// folders of a path given with `-o`), or a part of its path is not a folder (a regular
    /// file where a folder should be); nothing was written.
    NoFolder {
        /// The output, as given.
        path: PathBuf,
        /// What was to be written there: [`EntryKind::File`], or [`EntryKind::Folder`].
        want: EntryKind,
        /// The part of the path that is missing or is not a folder.
        blocked: PathBuf,
        /// What that part is; `None` when it does not exist.
        found: Option<EntryKind>,
    },
    /// An output file cannot be written.
    Write {
        /// The file.
        path: PathBuf,
        /// What the system said.
        source: io::Error,
    },
    /// Standard output cannot be written (a broken pipe is quiet and exits 0).
    Stdout(io::Error),
    /// The output path names something armsheet does not write over (a folder, a device, a
    /// FIFO, a link to nothing...); nothing was written.
    WrongKind {
        /// The path, as given.
        path: PathBuf,
        /// What is there, and what was to be written.
        why: WrongKind,
    },
    /// Another armsheet run holds the output folder's lock and did not let go within the wait;
    /// nothing was written.
    Busy {
        /// The output folder, as given.
        folder: PathBuf,
        /// The lock file beside it.
        lock: PathBuf,
        /// The run holding it, as it named itself in the lock file.
        holder: Option<String>,
        /// How long this run waited.
        waited: std::time::Duration,
    },
    /// The output file exists and the command does not overwrite it.
    Exists {
        /// The file.
        path: PathBuf,
        /// Which command refused.
        by: NoOverwrite,
    },
    /// The rewind asked for cannot be worked out.
    Rewind {
        /// The design file, as given.
        design: String,
        /// Why.
        error: RewindError,
    },
    /// The rewound design does not parse back with armsheet's own parser (nothing is written).
    RewindParseBack {
        /// The design file, as given.
        design: String,
        /// The parser's diagnostics on the new file.
        diagnostic: Box<Diagnostics>,
    },
    /// `armsheet identify --pick N` names no candidate, or the identified design does not
    /// parse back (nothing is written).
    Identify {
        /// The card, as given.
        card: String,
        /// Why.
        message: String,
    },
    /// The measured-readings file cannot be read.
    ReadingsRead {
        /// The file.
        path: PathBuf,
        /// What the system said.
        source: io::Error,
    },
    /// The measured-readings file has a problem, located.
    Readings {
        /// The file.
        path: PathBuf,
        /// What and where.
        error: crate::features::armature_test::ReadingsError,
    },
    /// `--window all` asked for a whole view the paper cannot print at the floor.
    WholeRefused {
        /// The design file, as given.
        design: String,
        /// The paper asked for.
        paper: String,
        /// Why.
        why: crate::layout::WholeRefused,
    },
    /// A diagram window option out of range for the design (nothing was written).
    Window {
        /// The design file, as given.
        design: String,
        /// What is out of range.
        why: WindowOutOfRange,
    },
    /// The shop archive cannot be used, or refuses what was asked (nothing was written).
    Archive {
        /// The archive, as given (or the file the message is about).
        archive: PathBuf,
        /// Why, in words; may span lines (hints start with `  = hint:`).
        message: String,
    },
    /// A file or folder given to an archive command refuses (a design without the fields a
    /// job needs, a card not of the design, a folder that is not a sheet set); nothing was
    /// written. Named as what it is, not as the archive.
    ArchiveInput {
        /// What the path is.
        about: ArchiveInput,
        /// The path, as given.
        path: PathBuf,
        /// Why, in words; may span lines (hints start with `  = hint:`).
        message: String,
    },
    /// The PDF cannot be made from the sheets.
    Pdf {
        /// The design file, as given.
        design: String,
        /// What the PDF writer said.
        message: String,
    },
}

/// What a path given to an archive command is, as its error names it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ArchiveInput {
    /// The design file (`archive add DESIGN`).
    Design,
    /// The data card (`--card`).
    Card,
    /// The sheet set folder (`--sheets`).
    SheetSet,
}

impl ArchiveInput {
    /// The words that name it before its path: "design file", "data card", "sheet set".
    pub fn words(self) -> &'static str {
        match self {
            ArchiveInput::Design => "design file",
            ArchiveInput::Card => "data card",
            ArchiveInput::SheetSet => "sheet set",
        }
    }
}

/// A diagram window option the design cannot take.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WindowOutOfRange {
    /// `--window-start` beyond the last slot.
    Start {
        /// The slot asked for.
        start: u32,
        /// The armature's slots.
        slots: u32,
    },
    /// `--window` of more pole pairs than the machine has.
    Pairs {
        /// The pole pairs asked for.
        pairs: u32,
        /// The machine's pole pairs.
        pole_pairs: u32,
    },
}

/// Why the whole armature cannot be drawn in one view on `paper`.
fn whole_refused_reason(why: &crate::layout::WholeRefused, paper: &str) -> String {
    match why {
        crate::layout::WholeRefused::TooWide { slots, fit } => format!(
            "its {slots} slots need a wider sheet: {paper} holds {fit} at the legibility floor"
        ),
        crate::layout::WholeRefused::Seam { lines } => format!(
            "{lines} lines cross its seam, more than the margins of {paper} can label at the legibility floor"
        ),
    }
}

impl fmt::Display for WindowOutOfRange {
    /// The option, why it is out of range, and the hint with the valid range.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            WindowOutOfRange::Start { start, slots } => write!(
                f,
                "--window-start {start}: the armature has {slots} slots; nothing was written\n  = hint: a first slot from 1 to {slots} (1..={slots})"
            ),
            WindowOutOfRange::Pairs { pairs, pole_pairs } => write!(
                f,
                "--window {pairs}: the machine has {} ({} poles); nothing was written\n  = hint: `--window all` for the whole armature, or at most {pole_pairs}",
                crate::base::number::counted(pole_pairs, "pole pair", "pole pairs"),
                2 * pole_pairs
            ),
        }
    }
}

impl CliError {
    /// A write to `path` that failed.
    pub fn write(path: impl Into<PathBuf>, source: io::Error) -> Self {
        CliError::Write {
            path: path.into(),
            source,
        }
    }

    /// True for a closed standard output: the reader is gone, nothing is said.
    pub fn is_broken_pipe(&self) -> bool {
        matches!(self, CliError::Stdout(e) if e.kind() == io::ErrorKind::BrokenPipe)
    }

    /// The exit code: 0 for a broken pipe, else 2 ([`EXIT_BAD_INPUT`]).
    pub fn exit_code(&self) -> u8 {
        if self.is_broken_pipe() {
            0
        } else {
            EXIT_BAD_INPUT
        }
    }

    /// Prints the error to standard error (nothing for a broken pipe) and returns the exit
    /// code. The one place where a command's error reaches the terminal.
    pub fn report(&self) -> u8 {
        if !self.is_broken_pipe() {
            // If standard error is gone too there is no one left to tell.
            let _ = write!(io::stderr().lock(), "{self}");
        }
        self.exit_code()
    }
}

impl fmt::Display for CliError {
    /// The whole message, ending in a newline.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CliError::Read { path, source } => {
                let name = shown(path);
                writeln!(
                    f,
                    "error: cannot read design file {name}: {source}\n  = hint: check the path; `armsheet new {name}` writes a starter design"
                )
            }
            CliError::ReadCard { path, source } => {
                let name = shown(path);
                writeln!(
                    f,
                    "error: cannot read data card {name}: {source}\n  = hint: check the path; `armsheet new --card {name}` writes a starter card"
                )
            }
            // The diagnostic ends in its own newline.
            CliError::Design(d) => write!(f, "{d}"),
            CliError::CreateDir { path, source } => writeln!(
                f,
                "error: cannot create the output folder {}: {source}\n  = hint: {}",
                shown(path),
                if is_disk_full(source) {
                    "no space left on the device: free some space, or give a folder on another device with -o DIR"
                } else {
                    "give another folder with -o DIR"
                }
            ),
            CliError::Write { path, source } => writeln!(
                f,
                "error: cannot write {}: {source}\n  = hint: {}",
                shown(path),
                if is_disk_full(source) {
                    "no space left on the device: free some space, or write to another device"
                } else {
                    "check that the folder is writable"
                }
            ),
            CliError::WrongKind { path, why } => wrong_kind(f, path, why),
            CliError::NoFolder {
                path,
                want,
                blocked,
                found,
            } => no_folder(f, path, *want, blocked, *found),
            CliError::Busy {
                folder,
                lock,
                holder,
                waited,
            } => writeln!(
                f,
                "error: the output folder {} is in use by another armsheet run ({}), which holds the lock {}; waited {} s, nothing written\n  = hint: run again when it has finished (make -j: let one target write a folder at a time), or give another folder with -o DIR",
                shown(folder),
                holder.as_deref().unwrap_or("it did not say which"),
                shown(lock),
                waited.as_secs()
            ),
            CliError::Stdout(e) => writeln!(f, "error: cannot write to standard output: {e}"),
            CliError::ReadingsRead { path, source } => writeln!(
                f,
                "error: cannot read readings file {}: {source}\n  = hint: check the path",
                shown(path)
            ),
            CliError::Readings { path, error } => readings(f, path, error),
            CliError::Exists { path, by } => exists(f, path, *by),
            CliError::ReadFrame { path, source } => {
                let name = shown(path);
                writeln!(
                    f,
                    "error: cannot read frame {name}: {source}\n  = hint: check the path; `armsheet new --frame {name}` writes a starter frame"
                )
            }
            CliError::Explore { frame, message } => {
                writeln!(f, "error: {}: {}", visible(frame), visible(message))
            }
            CliError::Identify { card, message } => {
                writeln!(f, "error: {}: {}", visible(card), visible(message))
            }
            CliError::Rewind { design, error } => {
                writeln!(
                    f,
                    "error: {}: cannot rewind: {}",
                    visible(design),
                    rewind_message(error)
                )
            }
            CliError::RewindParseBack { design, diagnostic } => writeln!(
                f,
                "error: {}: cannot rewind: the new design does not parse back, so nothing was written:\n{diagnostic}",
                visible(design)
            ),
            CliError::WholeRefused { design, paper, why } => {
                let reason = whole_refused_reason(why, paper);
                writeln!(
                    f,
                    "error: {}: --window all: the whole armature cannot be drawn in one view on {paper}: {reason}; nothing was written\n  = hint: leave --window out (the diagram then continues over as many sheets as it needs, every coil drawn), or try a larger --paper",
                    visible(design)
                )
            }
            CliError::Window { design, why } => {
                writeln!(f, "error: {}: {why}", visible(design))
            }
            CliError::Archive { archive, message } => about(f, "archive", archive, message),
            CliError::ArchiveInput {
                about: what,
                path,
                message,
            } => about(f, what.words(), path, message),
            CliError::Pdf { design, message } => writeln!(
                f,
                "error: {}: the PDF cannot be made: {}",
                visible(design),
                visible(message)
            ),
        }
    }
}

/// Something other than a file (or a folder for a set) stands where armsheet would write.
fn wrong_kind(f: &mut fmt::Formatter<'_>, path: &std::path::Path, why: &WrongKind) -> fmt::Result {
    let (what, hint) = match why.want {
        EntryKind::Folder => (
            "cannot create the output folder",
            "give another folder with -o DIR",
        ),
        _ => ("cannot write", "give another path"),
    };
    let want = why.want.noun();
    let path = shown(path);
    match (&why.link, why.found) {
        (None, found) => writeln!(
            f,
            "error: {what} {path}: it is a {}, not a {want}; armsheet writes only where there is nothing or a {want} (or a symbolic link to one)\n  = hint: {hint}",
            found.map_or("", EntryKind::noun)
        ),
        (Some(to), None) => writeln!(
            f,
            "error: {what} {path}: it is a symbolic link to {}, which does not exist; armsheet follows a link only to an existing {want}\n  = hint: {hint}",
            shown(to)
        ),
        (Some(to), Some(found)) => writeln!(
            f,
            "error: {what} {path}: it is a symbolic link to {}, a {}, not a {want}; armsheet follows a link only to an existing {want}\n  = hint: {hint}",
            shown(to),
            found.noun()
        ),
    }
}

/// An archive command's refusal about `path`, named as `what` ("archive", "sheet set"...); the
/// message may span lines.
fn about(
    f: &mut fmt::Formatter<'_>,
    what: &str,
    path: &std::path::Path,
    message: &str,
) -> fmt::Result {
    let lines: Vec<_> = crate::base::visible::visible_lines(message).collect();
    writeln!(f, "error: {what} {}: {}", shown(path), lines.join("\n"))
}

/// A problem in a readings file, located, with its own hint or the file format's.
fn readings(
    f: &mut fmt::Formatter<'_>,
    path: &std::path::Path,
    error: &crate::features::armature_test::ReadingsError,
) -> fmt::Result {
    use crate::base::visible::clip;
    let hint = match &error.hint {
        Some(h) => visible(&clip(h, 200)).into_owned(),
        None => "the header is `from_bar,to_bar,reading` (or `millivolts` for the drop test); a reading is a number, `open` or `OL`".to_string(),
    };
    writeln!(
        f,
        "error: {}:{}:{}: {}\n  = hint: {hint}",
        shown(path),
        error.line,
        error.column,
        visible(&clip(&error.message, 200)),
    )
}

/// The folder of an output is missing, or a part of its path is not a folder.
fn no_folder(
    f: &mut fmt::Formatter<'_>,
    path: &std::path::Path,
    want: EntryKind,
    blocked: &std::path::Path,
    found: Option<EntryKind>,
) -> fmt::Result {
    let what = match want {
        EntryKind::Folder => "cannot create the output folder",
        _ => "cannot write",
    };
    let (shown_path, shown_blocked) = (shown(path), shown(blocked));
    match found {
        Some(kind) => {
            let noun = kind.noun();
            let give = match want {
                EntryKind::Folder => "give a folder with -o DIR",
                _ => "give a path in a folder",
            };
            writeln!(
                f,
                "error: {what} {shown_path}: {shown_blocked} is a {noun}, not a folder; nothing was written\n  = hint: {give}, or remove or rename the {noun} {shown_blocked}"
            )
        }
        None => {
            let folder = path
                .parent()
                .filter(|p| !p.as_os_str().is_empty())
                .unwrap_or(blocked);
            let folder = shown(folder);
            writeln!(
                f,
                "error: {what} {shown_path}: the folder {folder} does not exist; nothing was written\n  = hint: create the folder first (mkdir -p {folder}), or give a path in a folder that exists"
            )
        }
    }
}

/// A file armsheet will not overwrite, with the command that refuses and the way round it.
fn exists(f: &mut fmt::Formatter<'_>, path: &std::path::Path, by: NoOverwrite) -> fmt::Result {
    let path = shown(path);
    match by {
        NoOverwrite::New => writeln!(
            f,
            "error: {path} already exists; armsheet new never overwrites a file\n  = hint: give another path, e.g. `armsheet new job-42.toml`"
        ),
        NoOverwrite::Rewind => writeln!(
            f,
            "error: {path} already exists; armsheet rewind does not overwrite a file\n  = hint: give another path with -o, or add --force to replace it"
        ),
        NoOverwrite::Identify => writeln!(
            f,
            "error: {path} already exists; armsheet identify does not overwrite a file\n  = hint: give another path with -o, or add --force to replace it"
        ),
        NoOverwrite::Explore => writeln!(
            f,
            "error: {path} already exists; armsheet explore does not overwrite a file\n  = hint: give another path with -o, or add --force to replace it"
        ),
    }
}

impl std::error::Error for CliError {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        match self {
            CliError::Read { source, .. }
            | CliError::ReadCard { source, .. }
            | CliError::ReadFrame { source, .. }
            | CliError::CreateDir { source, .. }
            | CliError::Write { source, .. }
            | CliError::Stdout(source) => Some(source),
            _ => None,
        }
    }
}

impl From<Diagnostics> for CliError {
    fn from(d: Diagnostics) -> Self {
        CliError::Design(Box::new(d))
    }
}

/// True for a write that failed because the device is full (`ENOSPC`, os error 28).
fn is_disk_full(e: &io::Error) -> bool {
    e.kind() == io::ErrorKind::StorageFull || e.raw_os_error() == Some(28)
}

/// A path as shown on the terminal (in errors and in the `wrote …` lines): made [`visible`],
/// so a file name cannot carry escapes to the terminal.
pub(super) fn shown(path: &std::path::Path) -> String {
    visible(&path.display().to_string()).into_owned()
}

/// A refused rewind in the command line's words: each message names the flag to change.
pub fn rewind_message(e: &RewindError) -> String {
    match e {
        RewindError::TestNotPositive { volts, rpm } => format!(
            "--from-test needs a positive no-load voltage and speed, found {} V at {} rpm\n  = hint: the open-circuit volts, then the rpm, both above 0, e.g. --from-test 105 1150",
            fmt_fixed(*volts, 3),
            fmt_fixed(*rpm, 3)
        ),
        RewindError::VoltageOutOfRange { volts } => format!(
            "--voltage must be a positive number of volts up to {MAX_VOLTAGE}, found {volts}\n  = hint: the new terminal voltage, above 0 and at most {MAX_VOLTAGE} V, e.g. --voltage 220"
        ),
        RewindError::SpeedOutOfRange { rpm } => format!(
            "--speed must be a positive number of rpm up to {MAX_SPEED_RPM}, found {rpm}\n  = hint: the new speed, above 0 and at most {MAX_SPEED_RPM} rpm, e.g. --speed 1150; leave it out to keep the design's"
        ),
        RewindError::CoilsPerSlotOutOfRange { coils_per_slot, max } => format!(
            "--coils-per-slot must be 1 to {max} on this armature's slots, found {coils_per_slot}\n  = hint: a whole number from 1 to {max}"
        ),
        RewindError::ResistanceNotPositive { ohms } => {
            format!(
                "--ra must be a positive resistance in ohms, found {ohms}\n  = hint: the armature resistance measured between the brush arms, above 0 ohms, e.g. --ra 0.12"
            )
        }
        RewindError::FluxUnknown => "the flux per pole is unknown: give [rating] flux_per_pole_mwb, or [rating] voltage with speed_rpm, or measure the old machine with --from-test V0 N0".to_string(),
        RewindError::FluxOutOfRange { flux_mwb, source } => {
            let flux = if flux_mwb.is_finite() {
                format!("a flux per pole of {} mWb", fmt_toml(*flux_mwb, 4))
            } else {
                "no finite flux per pole".to_string()
            };
            let range = format!("a design file holds above 0 and at most {MAX_FLUX_MWB} mWb");
            match source {
                FluxSource::Test(v, n) => format!(
                    "--from-test {} V at {} rpm gives {flux}; {range}: check the readings (open-circuit volts first, then rpm)",
                    fmt_toml(*v, 3),
                    fmt_toml(*n, 3)
                ),
                FluxSource::Rating => format!(
                    "[rating] voltage and speed_rpm give {flux}; {range}: check them, or give flux_per_pole_mwb or --from-test V0 N0"
                ),
                FluxSource::Design => format!(
                    "the design gives {flux}; {range}: check flux_per_pole_mwb"
                ),
            }
        }
        RewindError::WorkedSpeedOutOfRange { rpm } => format!(
            "the old machine's speed works out to {} rpm from its EMF and the flux; a design file holds above 0 and at most {MAX_SPEED_RPM} rpm: give --speed N",
            fmt_toml(*rpm, 3)
        ),
        RewindError::CurrentOutOfRange { amps } => format!(
            "the new armature current works out to {} A (the rated current scaled by the old/new conductors per path); a design file holds above 0 and at most {MAX_CURRENT_A} A: check [rating] current, or ask for another --voltage",
            fmt_toml(*amps, 4)
        ),
        RewindError::SpeedUnknown => "no speed to rewind for: give --speed N, or [rating] speed_rpm or voltage in the design".to_string(),
        RewindError::Connect(e) => format!("cannot connect the coils as asked: {e}"),
        RewindError::Design(e) => format!("the new design would not be a valid design: {e}"),
        RewindError::DropExceedsEmf => "the resistive drop at this speed is larger than the EMF per conductor: no winding gives this voltage".to_string(),
        RewindError::BelowBrushDrop {
            volts,
            brush_drop_v,
        } => format!(
            "{} V is not enough to cover the brush drop of {} V: no winding gives it",
            fmt_fixed(*volts, 1),
            fmt_fixed(*brush_drop_v, 1)
        ),
        RewindError::TurnsRoundToZero {
            exact_turns,
            scheme: connection,
        } => {
            let fewer_paths = connection
                .kind
                .kind()
                .fewer_paths_remedy(connection.multiplicity);
            format!(
                "the turns per coil round to zero ({} exact on {}): the voltage is too low for this many coils; use {fewer_paths}a lower speed, a higher voltage, or an armature with fewer coils",
                fmt_fixed(*exact_turns, 3),
                connection.label(),
            )
        }
        RewindError::TooManyTurns { turns, max } => format!(
            "{} turns per coil is beyond any real coil (at most {max})",
            fmt_fixed(*turns, 0)
        ),
        RewindError::NoSpeedAtWholeTurns => {
            "with whole turns the drops take the whole voltage: no speed results".to_string()
        }
        RewindError::StripTooThin {
            width_mm,
            height_mm,
        } => format!(
            "a {} mm wide strip would need a height of {} mm, less than twice its corner radius: use round wire or a narrower strip",
            fmt_fixed(*width_mm, 2),
            fmt_fixed(*height_mm, 2)
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn limits_print_as_before() {
        // The limits are f64 constants; they print as whole numbers, as the messages always did.
        let v = rewind_message(&RewindError::VoltageOutOfRange { volts: -5.0 });
        assert_eq!(
            v,
            "--voltage must be a positive number of volts up to 100000, found -5\n  = hint: the new terminal voltage, above 0 and at most 100000 V, e.g. --voltage 220"
        );
        let n = rewind_message(&RewindError::SpeedOutOfRange { rpm: 0.0 });
        assert!(
            n.starts_with(
                "--speed must be a positive number of rpm up to 200000, found 0\n  = hint: "
            ),
            "{n}"
        );
    }

    #[test]
    fn a_full_disk_says_so_other_write_errors_keep_their_hint() {
        for e in [
            io::Error::from_raw_os_error(28),
            io::Error::from(io::ErrorKind::StorageFull),
        ] {
            let w = CliError::write("out/x.toml", e).to_string();
            assert!(w.starts_with("error: cannot write out/x.toml: "), "{w}");
            assert!(
                w.ends_with(
                    "\n  = hint: no space left on the device: free some space, or write to another device\n"
                ),
                "{w}"
            );
        }
        let full = CliError::CreateDir {
            path: "out".into(),
            source: io::Error::from_raw_os_error(28),
        };
        assert!(full.to_string().ends_with(
            "\n  = hint: no space left on the device: free some space, or give a folder on another device with -o DIR\n"
        ));
        let denied = CliError::write("x.toml", io::Error::from(io::ErrorKind::PermissionDenied));
        assert!(
            denied
                .to_string()
                .ends_with("\n  = hint: check that the folder is writable\n")
        );
    }

    #[test]
    fn a_broken_pipe_is_quiet_and_exits_0_other_stdout_errors_exit_2() {
        let pipe = CliError::Stdout(io::Error::from(io::ErrorKind::BrokenPipe));
        assert!(pipe.is_broken_pipe());
        assert_eq!(pipe.exit_code(), 0);
        let full = CliError::Stdout(io::Error::from(io::ErrorKind::StorageFull));
        assert!(!full.is_broken_pipe());
        assert_eq!(full.exit_code(), EXIT_BAD_INPUT);
        assert!(
            full.to_string()
                .starts_with("error: cannot write to standard output: ")
        );
    }
}
