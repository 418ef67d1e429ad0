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

// What a user trial found: each bad input a located error (what, where, what was expected, a
// hint), exit 2, nothing written; and the test report's words.

/// Runs armsheet in the repository root; (exit code, stdout, stderr).
fn run(args: &[&str]) -> (Option<i32>, String, String) {
    let o = crate::support::armsheet(args);
    (
        o.status.code(),
        crate::support::text(&o.stdout),
        crate::support::text(&o.stderr),
    )
}

#[test]
fn sheet_into_a_regular_file_says_it_is_a_file_not_a_folder() {
    let dir = scratch("trial-afile");
    let afile = dir.join("afile");
    std::fs::write(&afile, "mine").unwrap();
    let a = afile.display().to_string();
    for args in [
        vec!["sheet", "designs/hoist-lap.toml", "-o", &a],
        vec!["test", "designs/hoist-lap.toml", "-o", &a],
    ] {
        let (code, out, err) = run(&args);
        assert_eq!(code, Some(2), "{err}");
        assert_eq!(out, "");
        assert!(
            err.contains(&format!("{a} is a regular file, not a folder")),
            "{err}"
        );
        assert!(!err.contains("File exists"), "{err}");
        assert!(
            err.contains("= hint: give a folder with -o DIR, or remove or rename the regular file"),
            "{err}"
        );
    }
    let svg = afile.join("x.svg").display().to_string();
    let (code, _, err) = run(&["draw", "designs/hoist-lap.toml", "-o", &svg]);
    assert_eq!(code, Some(2), "{err}");
    assert!(
        err.starts_with(&format!(
            "error: cannot write {svg}: {a} is a regular file, not a folder"
        )),
        "{err}"
    );
    assert_eq!(std::fs::read_to_string(&afile).unwrap(), "mine");
    assert_eq!(names_in(&dir), ["afile"], "nothing else written");
}

#[test]
fn a_single_file_into_a_missing_folder_names_the_folder_not_the_temporary_file() {
    let dir = scratch("trial-nodir");
    let new = dir.join("nodir").join("new.toml").display().to_string();
    let folder = dir.join("nodir").display().to_string();
    let cases = [
        vec![
            "rewind",
            "designs/hoist-lap.toml",
            "--voltage",
            "220",
            "--coils-per-slot",
            "2",
            "-o",
            &new,
        ],
        vec!["identify", "designs/cards/sawmill-card.toml", "-o", &new],
    ];
    for args in cases {
        let (code, out, err) = run(&args);
        assert_eq!(code, Some(2), "{args:?}: {err}");
        assert_eq!(out, "");
        assert_eq!(
            err,
            format!(
                "error: cannot write {new}: the folder {folder} does not exist; nothing was written\n  = hint: create the folder first (mkdir -p {folder}), or give a path in a folder that exists\n"
            ),
            "{args:?}"
        );
        assert!(!err.contains(".tmp"), "{err}");
    }
    // The same through archive export -o, the one writer of single files.
    let db = dir.join("a.sqlite").display().to_string();
    let (code, _, err) = run(&["archive", "add", "designs/hoist-lap.toml", "--archive", &db]);
    assert_eq!(code, Some(0), "{err}");
    let csv = dir.join("nodir").join("x.csv").display().to_string();
    let (code, _, err) = run(&["archive", "export", "-o", &csv, "--archive", &db]);
    assert_eq!(code, Some(2), "{err}");
    assert!(
        err.contains(&format!("the folder {folder} does not exist")),
        "{err}"
    );
    assert!(!dir.join("nodir").exists(), "nothing written");
}

#[test]
fn rewind_refuses_a_negative_or_zero_number_in_its_range_check_with_a_hint() {
    for (args, what) in [
        (
            &["--voltage", "-5"][..],
            "--voltage must be a positive number of volts up to 100000, found -5\n  = hint: the new terminal voltage, above 0 and at most 100000 V",
        ),
        (
            &["--voltage", "0"][..],
            "--voltage must be a positive number of volts up to 100000, found 0\n  = hint: ",
        ),
        (
            &["--voltage", "220", "--speed", "-1150"][..],
            "--speed must be a positive number of rpm up to 200000, found -1150\n  = hint: the new speed, above 0",
        ),
        (
            &["--voltage", "220", "--speed", "0"][..],
            "--speed must be a positive number of rpm up to 200000, found 0\n  = hint: ",
        ),
        (
            &["--voltage", "220", "--ra", "-0.1"][..],
            "--ra must be a positive resistance in ohms, found -0.1\n  = hint: ",
        ),
        (
            &["--from-test", "-105", "1150"][..],
            "--from-test needs a positive no-load voltage and speed, found -105.000 V at 1150.000 rpm\n  = hint: ",
        ),
    ] {
        let mut all = vec!["rewind", "designs/hoist-lap.toml"];
        all.extend_from_slice(args);
        let (code, out, err) = run(&all);
        assert_eq!(code, Some(2), "{args:?}: {err}");
        assert_eq!(out, "");
        assert!(
            err.starts_with("error: designs/hoist-lap.toml: cannot rewind: ") && err.contains(what),
            "{args:?}: {err}"
        );
        assert!(!err.contains("unexpected argument"), "{err}");
    }
}

#[test]
fn archive_add_names_a_bad_sheets_folder_as_the_sheet_set_not_the_archive() {
    let dir = scratch("trial-sheets");
    let db = dir.join("a.sqlite").display().to_string();
    let empty = dir.join("empty");
    std::fs::create_dir(&empty).unwrap();
    let afile = dir.join("afile");
    std::fs::write(&afile, "x").unwrap();
    for (folder, why) in [
        (dir.join("nodir"), "there is no such folder"),
        (afile.clone(), "it is a regular file, not a folder"),
        (
            empty.clone(),
            "not a sheet set: there is no sheet-set.txt in it",
        ),
    ] {
        let f = folder.display().to_string();
        let (code, _, err) = run(&[
            "archive",
            "add",
            "designs/hoist-lap.toml",
            "--sheets",
            &f,
            "--archive",
            &db,
        ]);
        assert_eq!(code, Some(2), "{err}");
        assert!(
            err.starts_with(&format!(
                "error: sheet set {f}: {why}; nothing was written\n  = hint: "
            )),
            "{err}"
        );
    }
    assert!(!dir.join("a.sqlite").exists(), "no archive made");
}

/// The readings file `test -o` writes for the hoist (header `from_bar,to_bar,expected,measured`,
/// the measured column empty), and its rows as (from, to, expected).
fn hoist_readings(dir: &Path) -> (PathBuf, Vec<(String, String, f64)>) {
    let out = dir.display().to_string();
    let (code, _, err) = run(&["test", "designs/hoist-lap.toml", "-o", &out]);
    assert_eq!(code, Some(0), "{err}");
    let path = dir.join("hoist-lap").join("readings.csv");
    let text = std::fs::read_to_string(&path).unwrap();
    let rows = text
        .lines()
        .skip(1)
        .map(|l| {
            let f: Vec<&str> = l.split(',').collect();
            (f[0].to_string(), f[1].to_string(), f[2].parse().unwrap())
        })
        .collect();
    (path, rows)
}

#[test]
fn an_unfilled_readings_file_is_told_to_fill_in_its_measured_column() {
    let dir = scratch("trial-unfilled");
    let (path, rows) = hoist_readings(&dir);
    let p = path.display().to_string();
    let (code, out, err) = run(&["test", "designs/hoist-lap.toml", "--readings", &p]);
    assert_eq!(code, Some(2), "{err}");
    assert_eq!(out, "");
    assert_eq!(
        err,
        format!(
            "error: {p}:{}:1: 0 readings in the `measured` column: the locator needs at least 3\n  = hint: fill in the `measured` column with the meter's reading for each pair ({} rows left empty); a pair not read may stay empty\n",
            rows.len() + 1,
            rows.len()
        )
    );
}

#[test]
fn readings_all_zero_say_nothing_of_a_fitted_scale() {
    let dir = scratch("trial-zero");
    let (_, rows) = hoist_readings(&dir);
    let mut csv = String::from("from_bar,to_bar,reading\n");
    for (a, b, _) in &rows {
        csv.push_str(&format!("{a},{b},0\n"));
    }
    let zero = dir.join("zero.csv");
    std::fs::write(&zero, csv).unwrap();
    let (code, out, err) = run(&[
        "test",
        "designs/hoist-lap.toml",
        "--readings",
        &zero.display().to_string(),
    ]);
    assert_eq!(code, Some(1), "{err}");
    assert!(out.contains("every reading is zero"), "{out}");
    assert!(
        out.contains("  readings as given: the file's own unit\n"),
        "{out}"
    );
    assert!(!out.contains("fitted scale"), "{out}");
    // No single fault is ranked for a shorted commutator: no empty list heading either.
    assert!(!out.contains("most likely faults"), "{out}");
}

#[test]
fn the_verdict_names_a_raised_pair_as_one_pair_and_its_bars_to_inspect() {
    let dir = scratch("trial-pair");
    let (_, rows) = hoist_readings(&dir);
    let mut csv = String::from("from_bar,to_bar,reading\n");
    for (a, b, e) in &rows {
        let v = if a == "10" { e * 1.5 } else { *e };
        csv.push_str(&format!("{a},{b},{v}\n"));
    }
    let raised = dir.join("raised.csv");
    std::fs::write(&raised, csv).unwrap();
    let (code, out, err) = run(&[
        "test",
        "designs/hoist-lap.toml",
        "--readings",
        &raised.display().to_string(),
    ]);
    assert_eq!(code, Some(1), "{err}");
    assert!(
        out.contains("VERDICT: NOT HEALTHY (exit 1): readings outside tolerance at the pair 10-11 (bars 10, 11 to inspect)\n"),
        "{out}"
    );
    assert!(
        out.contains(&format!(
            "  {} readings compared, 0 pairs not read;",
            rows.len()
        )),
        "{out}"
    );
    assert!(
        out.contains("winding: simplex lap, 36 bars, 4 poles, 1 closed winding\n"),
        "{out}"
    );
}

#[test]
fn counts_take_the_singular_for_one_only() {
    use armsheet::base::number::{counted, plural};
    assert_eq!(counted(1u32, "coil", "coils"), "1 coil");
    assert_eq!(counted(2usize, "coil", "coils"), "2 coils");
    assert_eq!(counted(0u64, "dummy coil", "dummy coils"), "0 dummy coils");
    assert_eq!(plural(1u32, "pair", "pairs"), "pair");
    assert_eq!(plural(11u32, "pair", "pairs"), "pairs");
}
