//! `armsheet sheet` and `armsheet draw` end to end: the files, one line per file, exit codes,
//! and no output at all for bad input.

use std::path::{Path, PathBuf};
use std::process::Command;

const BIN: &str = env!("CARGO_BIN_EXE_armsheet");
const FIXTURES: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/fixtures");

fn scratch(name: &str) -> PathBuf {
    let dir =
        std::env::temp_dir().join(format!("armsheet-sheet-cli-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn run(args: &[&str], cwd: &Path) -> (i32, String, String) {
    let out = Command::new(BIN)
        .args(args)
        .current_dir(cwd)
        .output()
        .unwrap();
    (
        out.status.code().unwrap(),
        String::from_utf8(out.stdout).unwrap(),
        String::from_utf8(out.stderr).unwrap(),
    )
}

#[test]
fn sheet_writes_every_file_and_says_so() {
    let dir = scratch("ok");
    let design = format!("{FIXTURES}/sheet_lap.toml");
    let (code, out, err) = run(
        &["sheet", &design, "-o", "o", "--pdf", "--paper", "a3"],
        &dir,
    );
    assert_eq!(code, 0, "{err}");
    let names = [
        "sheet-1.svg",
        "sheet-2.svg",
        "sheet-3.svg",
        "sheet-4.svg",
        "sheet-5.svg",
        "sheet-6.svg",
        "connections.csv",
        "job.csv",
        "report.json",
        "sheets.pdf",
        "sheet-set.txt",
    ];
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines.len(), names.len(), "{out}");
    for (line, name) in lines.iter().zip(names) {
        assert_eq!(*line, format!("wrote o/sheet_lap/{name}"));
        assert!(dir.join("o/sheet_lap").join(name).is_file());
    }
    let svg = std::fs::read_to_string(dir.join("o/sheet_lap/sheet-1.svg")).unwrap();
    assert!(svg.contains("width=\"420mm\" height=\"297mm\" viewBox=\"0 0 420 297\""));
    assert!(svg.contains(&format!("armsheet {}", env!("CARGO_PKG_VERSION"))));
    assert!(
        svg.contains(">2026-03-14</text>"),
        "the design's date, never the clock"
    );
    // report.json is exactly the `check --json` object.
    let (code, json, _) = run(&["check", "--json", &design], &dir);
    assert_eq!(code, 0);
    assert_eq!(
        std::fs::read_to_string(dir.join("o/sheet_lap/report.json")).unwrap(),
        json
    );
    // Same input, same bytes.
    let first: Vec<Vec<u8>> = names
        .iter()
        .map(|n| std::fs::read(dir.join("o/sheet_lap").join(n)).unwrap())
        .collect();
    assert_eq!(
        run(
            &["sheet", &design, "-o", "o", "--pdf", "--paper", "a3"],
            &dir
        )
        .0,
        0
    );
    for (n, bytes) in names.iter().zip(first) {
        assert_eq!(
            std::fs::read(dir.join("o/sheet_lap").join(n)).unwrap(),
            bytes,
            "{n}"
        );
    }
    // No temporary files are left behind.
    let left: Vec<_> = std::fs::read_dir(dir.join("o/sheet_lap"))
        .unwrap()
        .filter_map(Result::ok)
        .filter(|e| e.file_name().to_string_lossy().ends_with(".tmp"))
        .collect();
    assert!(left.is_empty());
}

#[test]
fn a_failing_design_still_draws_and_exits_1() {
    let dir = scratch("fail");
    let (code, out, _) = run(
        &[
            "sheet",
            &format!("{FIXTURES}/sheet_hostile.toml"),
            "-o",
            ".",
        ],
        &dir,
    );
    assert_eq!(code, 1);
    assert!(out.contains("wrote ./sheet_hostile/sheet-1.svg"));
    let svg = std::fs::read_to_string(dir.join("sheet_hostile/sheet-1.svg")).unwrap();
    assert!(svg.contains("NOT FOR WINDING: design fails checks"));
    let job = std::fs::read_to_string(dir.join("sheet_hostile/job.csv")).unwrap();
    assert!(job.lines().nth(1).unwrap().starts_with("\"'=HYPERLINK("));
    let csv = std::fs::read_to_string(dir.join("sheet_hostile/connections.csv")).unwrap();
    assert!(
        !csv.contains("HYPERLINK"),
        "the job is not repeated on the rows"
    );
}

#[test]
fn bad_input_writes_nothing_and_exits_2() {
    let dir = scratch("bad");
    std::fs::write(
        dir.join("broken.toml"),
        "[armature]\npoles = 5\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 2\n",
    )
    .unwrap();
    let (code, out, err) = run(&["sheet", "broken.toml", "-o", "o"], &dir);
    assert_eq!(code, 2);
    assert!(out.is_empty());
    assert!(err.contains("broken.toml"), "{err}");
    assert!(!dir.join("o").exists());
    let (code, _, err) = run(&["sheet", "missing.toml"], &dir);
    assert_eq!(code, 2);
    assert!(err.contains("missing.toml"));
    let (code, _, err) = run(&["sheet", "broken.toml", "--paper", "b5"], &dir);
    assert_eq!(code, 2);
    assert!(err.contains("b5"), "{err}");
    let (code, _, _) = run(&["sheet", "broken.toml", "--window", "0"], &dir);
    assert_eq!(code, 2);
}

#[test]
fn draw_writes_the_diagram_alone() {
    let dir = scratch("draw");
    let (code, out, err) = run(
        &[
            "draw",
            &format!("{FIXTURES}/sheet_wave_dummy.toml"),
            "-o",
            "d.svg",
        ],
        &dir,
    );
    // The fixture's dummy coil leaves its two paths unbalanced over a whole slot pitch, but a
    // simplex wave passes the textbook symmetry rule, which decides: a warning, exit 0.
    assert_eq!(code, 0, "{err}");
    assert_eq!(out.trim(), "wrote d.svg");
    let svg = std::fs::read_to_string(dir.join("d.svg")).unwrap();
    assert!(svg.contains("<g id=\"diagram\""));
    assert!(!svg.contains("title-block") && !svg.contains("mm\""));
    let (code, out, _) = run(
        &[
            "draw",
            &format!("{FIXTURES}/sheet_lap.toml"),
            "--window",
            "all",
        ],
        &dir,
    );
    assert_eq!(code, 0);
    assert_eq!(out.trim(), "wrote out/sheet_lap/diagram.svg");
}

#[test]
fn fewer_sheets_than_last_time_removes_the_stale_ones() {
    let dir = scratch("stale");
    std::fs::create_dir_all(dir.join("o/sheet_lap")).unwrap();
    std::fs::write(dir.join("o/sheet_lap/sheet-9.svg"), "old").unwrap();
    std::fs::write(dir.join("o/sheet_lap/notes.txt"), "mine").unwrap();
    let (code, out, _) = run(
        &["sheet", &format!("{FIXTURES}/sheet_lap.toml"), "-o", "o"],
        &dir,
    );
    assert_eq!(code, 0);
    assert!(out.contains("removed stale o/sheet_lap/sheet-9.svg"));
    assert!(!dir.join("o/sheet_lap/sheet-9.svg").exists());
    assert!(dir.join("o/sheet_lap/notes.txt").exists());
}

#[test]
fn window_options_beyond_the_armature_are_refused_and_nothing_is_written() {
    let dir = scratch("window-range");
    let hoist = concat!(env!("CARGO_MANIFEST_DIR"), "/designs/hoist-lap.toml");
    // The hoist demo: 36 slots, 4 poles (2 pole pairs).
    for (args, says, hint) in [
        (
            &["--window", "1", "--window-start", "37"][..],
            "--window-start 37: the armature has 36 slots; nothing was written",
            "= hint: a first slot from 1 to 36 (1..=36)",
        ),
        (
            &["--window-start", "37"][..],
            "--window-start 37: the armature has 36 slots",
            "(1..=36)",
        ),
        (
            &["--window", "3"][..],
            "--window 3: the machine has 2 pole pairs (4 poles); nothing was written",
            "= hint: `--window all` for the whole armature, or at most 2",
        ),
    ] {
        for (cmd, out_arg) in [("sheet", "o"), ("draw", "d.svg")] {
            let mut a = vec![cmd, hoist, "-o", out_arg];
            a.extend_from_slice(args);
            let (code, out, err) = run(&a, &dir);
            assert_eq!(code, 2, "{a:?}: {err}");
            assert!(out.is_empty(), "{a:?}: {out}");
            assert!(
                err.starts_with(&format!("error: {hoist}: {says}")),
                "{a:?}: {err}"
            );
            assert!(err.contains(hint), "{a:?}: {err}");
            assert!(!dir.join(out_arg).exists(), "{a:?} wrote {out_arg}");
        }
    }
    // The edges of the ranges are taken.
    for args in [
        &["--window", "2", "--window-start", "36"][..],
        &["--window", "1", "--window-start", "1"][..],
    ] {
        let mut a = vec!["draw", hoist, "-o", "edge.svg"];
        a.extend_from_slice(args);
        let (code, _, err) = run(&a, &dir);
        assert_eq!(code, 0, "{a:?}: {err}");
    }
}
