//! `armsheet sheet` killed at random moments: the set folder always holds one whole set, the
//! old one or the new one, never a mix; a killed run may leave its staging folder beside it,
//! and the next run clears that.
//!
//! The kill test is `#[ignore]`d (it runs the CLI a few hundred times):
//! `cargo test --release --test it kill_sheet -- --ignored --nocapture`. It makes an old set of
//! the 1,056-bar mill demo on A3 and a new one on A4 (their sheets differ), measures how long
//! an uninterrupted run takes, then `ARMSHEET_KILL_RUNS` times (default 240) restores the old
//! set, starts the A4 run and kills it (SIGKILL, `Child::kill`) after a delay drawn from a
//! fixed seed across 0 to 1.2 times that run time. After each kill the folder must be byte for
//! byte the old set or the new set, and nothing but `.mill-lap-12p.XXXXXX.new` or `.old`
//! folders may lie beside it; a last uninterrupted run must leave nothing beside it.

use crate::support;

use std::collections::BTreeMap;
use std::fs;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use crate::support::mutate::Rng;

const BIN: &str = env!("CARGO_BIN_EXE_armsheet");
const STEM: &str = "mill-lap-12p";
/// The marker armsheet writes first into its staging and aside folders.
const MARKER: &str = ".arm-staging";

/// The files of a folder, by name, with their bytes (sub-folders are not expected), less the
/// staging marker a run killed just after its swap leaves in the set (the next run drops it).
fn read_set(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    fs::read_dir(dir)
        .unwrap()
        .filter(|e| e.as_ref().unwrap().file_name() != MARKER)
        .map(|e| {
            let e = e.unwrap();
            assert!(e.file_type().unwrap().is_file(), "{:?}", e.path());
            (
                e.file_name().into_string().unwrap(),
                fs::read(e.path()).unwrap(),
            )
        })
        .collect()
}

/// Replaces `dir` with exactly `set`.
fn write_set(dir: &Path, set: &BTreeMap<String, Vec<u8>>) {
    let _ = fs::remove_dir_all(dir);
    fs::create_dir_all(dir).unwrap();
    for (name, bytes) in set {
        fs::write(dir.join(name), bytes).unwrap();
    }
}

/// What lies in `out` besides the set folder.
fn litter(out: &Path) -> Vec<String> {
    let mut v: Vec<String> = fs::read_dir(out)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .filter(|n| n != STEM)
        .collect();
    v.sort();
    v
}

/// A staging (`.new`) or aside (`.old`) folder name of the set folder, or its lock file (left,
/// unlocked, by a killed run).
fn is_staging(name: &str) -> bool {
    name == format!(".{STEM}.lock")
        || name
            .strip_prefix(&format!(".{STEM}."))
            .and_then(|r| r.strip_suffix(".new").or_else(|| r.strip_suffix(".old")))
            .is_some_and(|r| r.len() == 6)
}

fn sheet_command(out: &Path, paper: &str) -> Command {
    let mut c = Command::new(BIN);
    c.args([
        "sheet",
        &support::demo_path(STEM),
        "--pdf",
        "--paper",
        paper,
        "-o",
    ])
    .arg(out)
    .current_dir(support::ROOT)
    .stdout(Stdio::null())
    .stderr(Stdio::null());
    c
}

fn run_whole(out: &Path, paper: &str) {
    let status = sheet_command(out, paper).status().unwrap();
    assert!(status.success(), "sheet --paper {paper}: {status}");
}

/// How one killed run ended.
#[derive(Debug, Default)]
struct Tally {
    /// Killed before it had made its staging folder: old set, nothing new beside it.
    before: u32,
    /// Killed while staging: old set, its staging folder left beside it.
    during: u32,
    /// Killed after the swap, before or while it removed the old set: new set.
    after: u32,
    /// Finished before the kill: new set.
    finished: u32,
}

#[test]
#[ignore = "runs the CLI a few hundred times; cargo test --release --test it kill_sheet -- --ignored"]
fn a_killed_sheet_run_leaves_the_old_set_or_the_new_one() {
    let root = support::scratch("kill_sheet");
    let (old_dir, new_dir, out) = (root.join("old"), root.join("new"), root.join("out"));
    run_whole(&old_dir, "a3");
    run_whole(&new_dir, "a4");
    let old = read_set(&old_dir.join(STEM));
    let new = read_set(&new_dir.join(STEM));
    assert_ne!(old, new, "the A3 and A4 sets must differ");
    assert!(old.contains_key("sheets.pdf") && new.contains_key("sheets.pdf"));

    // The run time of an uninterrupted A4 run over the old set (the median of three).
    let target = out.join(STEM);
    let mut times: Vec<Duration> = (0..3)
        .map(|_| {
            write_set(&target, &old);
            let t = Instant::now();
            run_whole(&out, "a4");
            t.elapsed()
        })
        .collect();
    times.sort();
    let run_time = times[1];
    assert_eq!(read_set(&target), new);
    assert!(litter(&out).is_empty(), "{:?}", litter(&out));

    let runs: u32 = std::env::var("ARMSHEET_KILL_RUNS")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(240);
    let mut rng = Rng::new(0x6b69_6c6c);
    let mut tally = Tally::default();
    let mut most_litter = 0;
    for i in 0..runs {
        write_set(&target, &old);
        let litter_before = litter(&out);
        let delay = run_time.mul_f64(1.2 * (rng.next() % 10_000) as f64 / 10_000.0);
        let mut child = sheet_command(&out, "a4").spawn().unwrap();
        std::thread::sleep(delay);
        let finished = child.try_wait().unwrap().is_some();
        let _ = child.kill();
        let status = child.wait().unwrap();
        let now = read_set(&target);
        let left = litter(&out);
        assert!(
            left.iter().all(|n| is_staging(n)),
            "run {i}: litter beside the set: {left:?}"
        );
        most_litter = most_litter.max(left.len());
        let made_staging = left
            .iter()
            .any(|n| !litter_before.contains(n) && !n.ends_with(".lock"));
        if now == new {
            if finished {
                assert!(status.success(), "run {i}: {status}");
                tally.finished += 1;
            } else {
                tally.after += 1;
            }
        } else if now == old {
            assert!(!finished, "run {i} finished but left the old set");
            if made_staging {
                tally.during += 1;
            } else {
                tally.before += 1;
            }
        } else {
            let mixed: Vec<&String> = now
                .keys()
                .filter(|k| old.get(*k) != now.get(*k) && new.get(*k) != now.get(*k))
                .collect();
            panic!(
                "run {i} (killed after {delay:?}) left a mixed set: {:?}; odd files {mixed:?}",
                now.keys().collect::<Vec<_>>()
            );
        }
    }
    // An uninterrupted run clears whatever killed runs left.
    write_set(&target, &old);
    run_whole(&out, "a4");
    assert_eq!(read_set(&target), new);
    assert!(litter(&out).is_empty(), "{:?}", litter(&out));
    eprintln!(
        "kill_sheet: {runs} runs, uninterrupted run {run_time:?}, delays 0 to 1.2x; \
         killed before staging {}, while staging {}, after the swap {}, finished first {}; \
         every folder was the old or the new set; at most {most_litter} staging folder(s) \
         beside it, none after a whole run",
        tally.before, tally.during, tally.after, tally.finished
    );
    assert_eq!(
        tally.before + tally.during + tally.after + tally.finished,
        runs
    );
}

/// What a killed run leaves beside the set: a staging folder with a partial new set and an
/// entry carried from the set folder (the user's notes), and an aside folder holding the old
/// set from the two-rename swap. The next run puts the notes back and removes both.
#[test]
fn the_next_run_clears_what_a_killed_run_left() {
    let root = support::scratch("kill_sheet_leftovers");
    let design = format!("{}/tests/fixtures/sheet_lap.toml", support::ROOT);
    let out = root.join("o");
    let set = out.join("sheet_lap");
    let run = || {
        let o = support::armsheet_in(&["sheet", &design, "-o", "o"], &root);
        assert!(o.status.success(), "{}", support::text(&o.stderr));
    };
    run();
    let whole = read_set(&set);
    // Killed while staging: part of a new set and the user's notes, carried out of the set.
    let stage = out.join(".sheet_lap.AbC123.new");
    fs::create_dir_all(&stage).unwrap();
    fs::write(stage.join(MARKER), "sheet_lap\n").unwrap();
    fs::write(stage.join("sheet-1.svg"), "half").unwrap();
    fs::write(stage.join("notes.txt"), "the user's").unwrap();
    // Killed after a two-rename swap had moved the old set aside and put the new one in place.
    let aside = out.join(".sheet_lap.xyZ789.old");
    fs::create_dir_all(aside.join("set")).unwrap();
    fs::write(aside.join(MARKER), "sheet_lap\n").unwrap();
    fs::write(aside.join("set/sheet-1.svg"), "old").unwrap();
    // Not ours: other names, and our names without our marker, are left alone.
    let other = [
        out.join(".sheet_lap.toolong1.new"),
        out.join(".other.AbC123.new"),
        out.join(".sheet_lap.QqQ111.new"),
        out.join(".sheet_lap.RrR222.old"),
    ];
    for o in &other {
        fs::create_dir_all(o).unwrap();
    }
    for o in &other {
        fs::write(o.join("mine.txt"), "the user's").unwrap();
    }
    fs::write(other[3].join(MARKER), "other\n").unwrap();
    run();
    assert!(!stage.exists() && !aside.exists());
    assert!(other.iter().all(|o| o.is_dir()));
    assert!(!set.join(MARKER).exists());
    let mut now = read_set(&set);
    assert_eq!(now.remove("notes.txt").as_deref(), Some(&b"the user's"[..]));
    assert_eq!(now, whole);
}

/// Killed between the two renames of the fallback swap, the set folder is missing and the old
/// set is in the aside folder: the next run puts it back before it stages the new set, so
/// entries carried from it survive.
#[test]
fn a_set_moved_aside_comes_back() {
    let root = support::scratch("kill_sheet_aside");
    let design = format!("{}/tests/fixtures/sheet_lap.toml", support::ROOT);
    let out = root.join("o");
    let aside: PathBuf = out.join(".sheet_lap.Q1w2E3.old");
    fs::create_dir_all(aside.join("set")).unwrap();
    fs::write(aside.join(MARKER), "sheet_lap\n").unwrap();
    fs::write(aside.join("set").join(MARKER), "sheet_lap\n").unwrap();
    fs::write(aside.join("set/notes.txt"), "keep").unwrap();
    fs::write(aside.join("set/sheet-9.svg"), "stale").unwrap();
    let o = support::armsheet_in(&["sheet", &design, "-o", "o"], &root);
    assert!(o.status.success(), "{}", support::text(&o.stderr));
    assert!(!aside.exists());
    let set = out.join("sheet_lap");
    assert_eq!(fs::read_to_string(set.join("notes.txt")).unwrap(), "keep");
    assert!(!set.join("sheet-9.svg").exists(), "stale sheets go");
    assert!(!set.join(MARKER).exists());
    assert!(litter_of(&out).is_empty(), "{:?}", litter_of(&out));
}

fn litter_of(out: &Path) -> Vec<String> {
    fs::read_dir(out)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .filter(|n| n != "sheet_lap")
        .collect()
}
