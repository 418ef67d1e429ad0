//! The CLI's error path end to end: a closed standard output ends quietly with exit 0, a full
//! one is an error naming standard output (exit 2), and `sheet` writes its whole set or leaves
//! the previous one exactly as it was, with no temporary folder left behind.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

use crate::support::{ROOT, files_in, names_in, scratch};

const BIN: &str = env!("CARGO_BIN_EXE_armsheet");

/// Runs armsheet with its standard output a pipe whose read end is closed before armsheet
/// writes; returns the exit code and standard error.
fn run_with_stdout_closed(args: &[&str]) -> (Option<i32>, String) {
    let mut child = Command::new(BIN)
        .current_dir(ROOT)
        .args(args)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let out = child.wait_with_output().unwrap();
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn a_closed_stdout_ends_check_quietly_with_exit_0() {
    // The mill's text report (about 68 kB) is more than a pipe holds, so the write must meet
    // the closed pipe whatever the timing.
    let (code, err) = run_with_stdout_closed(&["check", "designs/mill-lap-12p.toml"]);
    assert_eq!(code, Some(0), "{err}");
    assert_eq!(err, "");
}

#[test]
fn a_closed_stdout_after_sheet_leaves_the_whole_set_and_exits_0() {
    let dir = scratch("sheet-pipe");
    let out = dir.display().to_string();
    let (code, err) =
        run_with_stdout_closed(&["sheet", "tests/fixtures/sheet_lap.toml", "-o", &out]);
    assert_eq!(code, Some(0), "{err}");
    assert_eq!(err, "");
    // The same files, byte for byte, as a run with a reader.
    let again = scratch("sheet-pipe-again");
    let o = Command::new(BIN)
        .current_dir(ROOT)
        .args(["sheet", "tests/fixtures/sheet_lap.toml", "-o"])
        .arg(&again)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(0));
    assert_eq!(
        files_in(&dir.join("sheet_lap")),
        files_in(&again.join("sheet_lap"))
    );
    assert_eq!(names_in(&dir), ["sheet_lap"], "no temporary folder is left");
    let _ = std::fs::remove_dir_all(&dir);
    let _ = std::fs::remove_dir_all(&again);
}

#[cfg(target_os = "linux")]
#[test]
fn a_full_stdout_is_an_error_naming_standard_output_with_exit_2() {
    for args in [
        &["check", "designs/hoist-lap.toml"][..],
        &["check", "--json", "designs/hoist-lap.toml"][..],
        &["--help"][..],
    ] {
        let full = std::fs::OpenOptions::new()
            .write(true)
            .open("/dev/full")
            .unwrap();
        let o = Command::new(BIN)
            .current_dir(ROOT)
            .args(args)
            .stdout(full)
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{args:?}: {err}");
        assert!(
            err.starts_with("error: cannot write to standard output: "),
            "{args:?}: {err}"
        );
        assert_eq!(err.lines().count(), 1, "{err}");
    }
}

/// The folder `base/NNNN/ddd…/ddd…` whose absolute path is exactly `len` bytes long.
fn folder_of_length(base: &Path, len: usize) -> PathBuf {
    let mut p = base.join(len.to_string());
    let mut have = p.as_os_str().len();
    assert!(have + 2 <= len);
    while have < len {
        // Each component stays well under the 255-byte name limit; never leave 1 byte over
        // (a component needs its '/' and at least one character).
        let mut take = (len - have - 1).min(200);
        if len - have - 1 - take == 1 {
            take -= 1;
        }
        p.push("d".repeat(take));
        have = p.as_os_str().len();
    }
    assert_eq!(p.as_os_str().len(), len);
    p
}

/// A failure in the middle of writing the set must leave the previous set intact.
///
/// The failure is made by path length, which binds root as well as anyone (permission bits do
/// not): the system refuses a path of 4096 bytes or more (`PATH_MAX` on Linux). With the output
/// folder DIR deep enough, the old set in `DIR/sheet_lap/` fits but the staged files in the
/// longer temporary folder beside it do not, the longer names (`connections.csv`) first. The
/// run sweeps DIR's length across that edge, so it fails at every step of the write (the first
/// file, a later file) and, below the edge, succeeds; whichever happens, the folder holds either
/// the whole old set or the whole new one, and nothing else.
#[cfg(target_os = "linux")]
#[test]
fn a_failure_midway_through_sheet_keeps_the_old_set_byte_for_byte() {
    let base = scratch("midway");
    // The new set, for comparison, from a run in a short folder.
    let reference = base.join("reference");
    let o = Command::new(BIN)
        .current_dir(ROOT)
        .args(["sheet", "tests/fixtures/sheet_lap.toml", "-o"])
        .arg(&reference)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(0));
    let new_set = files_in(&reference.join("sheet_lap"));
    // The old set: the same names with other bytes, a stale sheet, and a file of the user's.
    let mut old_set: BTreeMap<String, Vec<u8>> = new_set
        .keys()
        .map(|n| (n.clone(), format!("old {n}\n").into_bytes()))
        .collect();
    old_set.insert("sheet-9.svg".into(), b"old stale sheet\n".to_vec());
    // The old set's list names its own files (the stale sheet too), not the user's notes.
    let list: String = old_set
        .keys()
        .filter(|n| *n != "sheet-set.txt")
        .map(|n| format!("{n}\n"))
        .collect();
    old_set.insert(
        "sheet-set.txt".into(),
        format!("# the old set\n{list}").into_bytes(),
    );
    old_set.insert("notes.txt".into(), b"the winder's notes\n".to_vec());

    let (mut failed_midway, mut failed_first, mut succeeded) = (0, 0, 0);
    for len in 4035..4075 {
        let dir = folder_of_length(&base, len);
        let set = dir.join("sheet_lap");
        if std::fs::create_dir_all(&set).is_err() {
            continue;
        }
        let made = old_set
            .iter()
            .all(|(n, b)| std::fs::write(set.join(n), b).is_ok());
        if !made {
            // The old set itself does not fit at this depth: past the edge.
            let _ = std::fs::remove_dir_all(&dir);
            continue;
        }
        let o = Command::new(BIN)
            .current_dir(ROOT)
            .args(["sheet", "tests/fixtures/sheet_lap.toml", "-o"])
            .arg(&dir)
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&o.stderr).into_owned();
        assert_eq!(names_in(&dir), ["sheet_lap"], "{len}: litter left: {err}");
        match o.status.code() {
            Some(0) => {
                succeeded += 1;
                let mut want = new_set.clone();
                want.insert("notes.txt".into(), old_set["notes.txt"].clone());
                assert_eq!(files_in(&set), want, "{len}: not the whole new set");
            }
            Some(2) => {
                assert!(o.stdout.is_empty(), "{len}: said it wrote files");
                assert!(err.starts_with("error: cannot write "), "{len}: {err}");
                assert!(files_in(&set) == old_set, "{len}: the old set changed");
                // The staging marker is the first file written.
                if err.contains("/sheet_lap/.arm-staging:") {
                    failed_first += 1;
                } else {
                    failed_midway += 1;
                }
            }
            other => panic!("{len}: exit {other:?}: {err}"),
        }
        let _ = std::fs::remove_dir_all(base.join(len.to_string()));
    }
    assert!(succeeded > 0, "no depth let the new set through");
    assert!(failed_first > 0, "no depth failed at the first file");
    assert!(failed_midway > 0, "no depth failed after the first file");
    let _ = std::fs::remove_dir_all(&base);
}

#[test]
fn a_file_in_the_way_of_the_set_folder_is_exit_2_and_left_alone() {
    let dir = scratch("in-the-way");
    std::fs::write(dir.join("sheet_lap"), "not a folder").unwrap();
    let o = Command::new(BIN)
        .current_dir(ROOT)
        .args(["sheet", "tests/fixtures/sheet_lap.toml", "-o"])
        .arg(&dir)
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(2), "{err}");
    assert!(
        err.starts_with(&format!(
            "error: cannot create the output folder {}: ",
            dir.join("sheet_lap").display()
        )),
        "{err}"
    );
    assert_eq!(
        std::fs::read_to_string(dir.join("sheet_lap")).unwrap(),
        "not a folder"
    );
    assert_eq!(names_in(&dir), ["sheet_lap"]);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_closed_stdout_does_not_stop_rewind_from_writing_the_new_design() {
    let dir = scratch("rewind-pipe");
    let out = dir.join("hoist-115.toml");
    let (code, err) = run_with_stdout_closed(&[
        "rewind",
        "designs/hoist-lap.toml",
        "--voltage",
        "115",
        "-o",
        &out.display().to_string(),
    ]);
    assert_eq!(code, Some(0), "{err}");
    assert_eq!(err, "");
    let written = std::fs::read_to_string(&out).unwrap();
    assert!(written.starts_with("# armsheet rewind of "), "{written}");
    assert_eq!(
        names_in(&dir),
        ["hoist-115.toml"],
        "no temporary file is left"
    );
    let _ = std::fs::remove_dir_all(&dir);
}
