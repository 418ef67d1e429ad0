//! `armsheet test -o` killed at random moments in a folder that also holds a sheet set: the
//! sheet set and the user's file are never touched, each of the test's four files is whole
//! (the old run's bytes or the new run's), and nothing else appears in the folder but the
//! temporary `.<file>.XXXXXX.tmp` of one of its own files, which the next run removes.
//!
//! The kill test is `#[ignore]`d (it runs the CLI a couple of hundred times):
//! `cargo test --release --test it kill_test -- --ignored --nocapture`. Old and new differ by
//! the drop-test current (10 A against 20 A), on the 1,056-bar mill demo (a run long enough
//! to be killed part way). `ARMSHEET_KILL_RUNS` sets the number of kills (default 160).
//! `the_next_test_run_clears_its_own_temporaries` runs by default.

use crate::support;

use std::collections::BTreeMap;
use std::fs;
use std::path::Path;
use std::process::{Command, Stdio};
use std::time::Instant;

use crate::support::mutate::Rng;

const BIN: &str = env!("CARGO_BIN_EXE_armsheet");
const OWN: [&str; 4] = ["readings.csv", "readings.svg", "test.json", "test.txt"];

fn read_all(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    support::files_in(dir)
}

/// A temporary file of one of the test's own files.
fn is_own_temporary(name: &str) -> bool {
    OWN.iter().any(|f| {
        name.strip_prefix(&format!(".{f}."))
            .and_then(|r| r.strip_suffix(".tmp"))
            .is_some_and(|r| r.len() == 6)
    })
}

fn test_command(design: &str, out: &Path, amps: &str) -> Command {
    let mut c = Command::new(BIN);
    c.args(["test", design, "--current", amps, "-o"])
        .arg(out)
        .current_dir(support::ROOT)
        .stdout(Stdio::null())
        .stderr(Stdio::null());
    c
}

#[test]
#[ignore = "runs the CLI a couple of hundred times; cargo test --release --test it kill_test -- --ignored"]
fn a_killed_test_run_leaves_whole_files_and_the_sheet_set_alone() {
    let root = support::scratch("kill");
    let design = support::demo_path("mill-lap-12p");
    let (old_dir, new_dir, out) = (root.join("old"), root.join("new"), root.join("out"));
    let folder = out.join("mill-lap-12p");
    assert!(
        test_command(&design, &old_dir, "10")
            .status()
            .unwrap()
            .success()
    );
    assert!(
        test_command(&design, &new_dir, "20")
            .status()
            .unwrap()
            .success()
    );
    let old = read_all(&old_dir.join("mill-lap-12p"));
    let new = read_all(&new_dir.join("mill-lap-12p"));
    assert_ne!(old["test.txt"], new["test.txt"]);
    let sheet = support::armsheet(&["sheet", &design, "-o", out.to_str().unwrap()]);
    assert!(sheet.status.success(), "{}", support::text(&sheet.stderr));
    fs::write(folder.join("notes.txt"), "the customer's notes").unwrap();
    let others = read_all(&folder);
    let reset = || {
        for (n, b) in &old {
            fs::write(folder.join(n), b).unwrap();
        }
    };
    reset();
    let t = Instant::now();
    assert!(
        test_command(&design, &out, "20")
            .status()
            .unwrap()
            .success()
    );
    let run_time = t.elapsed();
    let runs: u32 = std::env::var("ARMSHEET_KILL_RUNS")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(160);
    let mut rng = Rng::new(0x6b69_6c74);
    let (mut mixed_old_new, mut litter_seen) = (0u32, 0u32);
    for i in 0..runs {
        reset();
        let delay = run_time.mul_f64(1.2 * (rng.next() % 10_000) as f64 / 10_000.0);
        let mut child = test_command(&design, &out, "20").spawn().unwrap();
        std::thread::sleep(delay);
        let _ = child.kill();
        let _ = child.wait();
        let now = read_all(&folder);
        for (n, b) in &others {
            if !OWN.contains(&n.as_str()) {
                assert_eq!(now.get(n), Some(b), "run {i}: {n} touched");
            }
        }
        for f in OWN {
            let b = now.get(f).unwrap_or_else(|| panic!("run {i}: {f} gone"));
            assert!(
                b == &old[f] || b == &new[f],
                "run {i} (killed after {delay:?}): {f} is neither the old nor the new file"
            );
        }
        let extra: Vec<&String> = now
            .keys()
            .filter(|n| !others.contains_key(*n) && !OWN.contains(&n.as_str()))
            .collect();
        assert!(
            extra.iter().all(|n| is_own_temporary(n)),
            "run {i}: {extra:?}"
        );
        litter_seen += u32::from(!extra.is_empty());
        mixed_old_new += u32::from(
            OWN.iter().any(|f| now[*f] == old[*f]) && OWN.iter().any(|f| now[*f] != old[*f]),
        );
        // A killed run may leave the folder's lock file (unlocked); the next run takes it over.
        let mut beside = support::names_in(&out);
        beside.retain(|n| n != ".mill-lap-12p.lock");
        assert_eq!(beside, ["mill-lap-12p"], "run {i}");
    }
    // A whole run clears its own temporaries and leaves the new files beside the sheet set.
    assert!(
        test_command(&design, &out, "20")
            .status()
            .unwrap()
            .success()
    );
    let now = read_all(&folder);
    for (n, b) in &others {
        assert_eq!(&now[n], b, "{n}");
    }
    for f in OWN {
        assert_eq!(now[f], new[f], "{f}");
    }
    assert_eq!(now.len(), others.len() + OWN.len());
    assert_eq!(
        support::names_in(&out),
        ["mill-lap-12p"],
        "the lock file was left"
    );
    eprintln!(
        "kill_test: {runs} runs, uninterrupted {run_time:?}; {mixed_old_new} left some files old and some new (each whole), {litter_seen} left a temporary file; the sheet set never touched"
    );
}

#[test]
fn the_next_test_run_clears_its_own_temporaries() {
    let out = support::scratch("temps");
    let folder = out.join("hoist-lap");
    fs::create_dir_all(&folder).unwrap();
    // What a killed run leaves, and names that are not its own.
    for n in [
        ".test.txt.AbC123.tmp",
        ".readings.svg.xYz789.tmp",
        ".sheet-1.svg.AbC123.tmp",
        ".test.txt.toolong1.tmp",
        "notes.txt",
    ] {
        fs::write(folder.join(n), "left").unwrap();
    }
    let o = support::armsheet(&[
        "test",
        "designs/hoist-lap.toml",
        "-o",
        out.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", support::text(&o.stderr));
    let mut want: Vec<&str> = vec![
        ".sheet-1.svg.AbC123.tmp",
        ".test.txt.toolong1.tmp",
        "notes.txt",
    ];
    want.extend(OWN);
    want.sort();
    assert_eq!(support::names_in(&folder), want);
}

/// The files of a set folder less the staging marker a run killed just after its swap leaves.
fn without_marker(mut f: BTreeMap<String, Vec<u8>>) -> BTreeMap<String, Vec<u8>> {
    f.remove(".arm-staging");
    f
}

/// `sheet` and `test -o` started together into one folder (a parallel make) and both killed at
/// random moments (delays from a fixed seed, 0 to 1.5 times a whole run): each of the test's
/// four files is whole, old or new; the sheet set is the old one or the new one, whole; the
/// user's notes are untouched; beside the folder lie at most marked staging folders and the
/// lock file, and a whole run afterwards clears them.
#[test]
fn sheet_and_test_killed_together_leave_whole_files() {
    let root = support::scratch("together");
    let design = format!("{}/designs/hoist-lap.toml", support::ROOT);
    let (old_dir, new_dir, out) = (root.join("old"), root.join("new"), root.join("out"));
    let folder = out.join("hoist-lap");
    let sheet = |o: &Path, extra: &[&str]| {
        let mut c = Command::new(BIN);
        c.args(["sheet", &design, "-o"])
            .arg(o)
            .args(extra)
            .stdout(Stdio::null())
            .stderr(Stdio::null());
        c
    };
    for (o, amps, extra) in [(&old_dir, "10", &["--pdf"][..]), (&new_dir, "20", &[][..])] {
        assert!(sheet(o, extra).status().unwrap().success());
        assert!(test_command(&design, o, amps).status().unwrap().success());
    }
    let old = read_all(&old_dir.join("hoist-lap"));
    let new = read_all(&new_dir.join("hoist-lap"));
    let split = |all: &BTreeMap<String, Vec<u8>>| {
        let (mut own, mut set) = (BTreeMap::new(), BTreeMap::new());
        for (n, b) in all {
            if OWN.contains(&n.as_str()) {
                own.insert(n.clone(), b.clone());
            } else {
                set.insert(n.clone(), b.clone());
            }
        }
        (own, set)
    };
    let ((old_own, old_set), (new_own, new_set)) = (split(&old), split(&new));
    assert!(old_own != new_own && old_set != new_set);
    let reset = || {
        let _ = fs::remove_dir_all(&folder);
        fs::create_dir_all(&folder).unwrap();
        for (n, b) in &old {
            fs::write(folder.join(n), b).unwrap();
        }
        fs::write(folder.join("notes.txt"), "the customer's notes").unwrap();
    };
    reset();
    let t = Instant::now();
    assert!(sheet(&out, &[]).status().unwrap().success());
    assert!(
        test_command(&design, &out, "20")
            .status()
            .unwrap()
            .success()
    );
    let run_time = t.elapsed() / 2;
    let mut rng = Rng::new(0x746f_6765);
    for i in 0..16 {
        reset();
        let delay = run_time.mul_f64(1.5 * (rng.next() % 10_000) as f64 / 10_000.0);
        let mut s = sheet(&out, &[]).spawn().unwrap();
        let mut t = test_command(&design, &out, "20").spawn().unwrap();
        std::thread::sleep(delay);
        let _ = s.kill();
        let _ = t.kill();
        let _ = (s.wait(), t.wait());
        let (own, set) = split(&without_marker(read_all(&folder)));
        for f in OWN {
            let b = own.get(f).unwrap_or_else(|| panic!("run {i}: {f} gone"));
            assert!(
                b == &old_own[f] || b == &new_own[f],
                "run {i}: {f} is not whole"
            );
        }
        let mut set = set;
        assert_eq!(
            set.remove("notes.txt").as_deref(),
            Some(&b"the customer's notes"[..]),
            "run {i}"
        );
        // Temporaries of the test's own files may be left; the next run clears them.
        set.retain(|n, _| !is_own_temporary(n));
        assert!(
            set == old_set || set == new_set,
            "run {i} (killed after {delay:?}): a mixed set {:?}",
            set.keys()
        );
        for n in support::names_in(&out) {
            let ok = n == "hoist-lap"
                || n == ".hoist-lap.lock"
                || (n.starts_with(".hoist-lap.") && (n.ends_with(".new") || n.ends_with(".old")));
            assert!(ok, "run {i}: {n} beside the folder");
        }
    }
    assert!(sheet(&out, &[]).status().unwrap().success());
    assert!(
        test_command(&design, &out, "20")
            .status()
            .unwrap()
            .success()
    );
    let (own, mut set) = split(&read_all(&folder));
    assert!(set.remove("notes.txt").is_some());
    assert_eq!((own, set), (new_own, new_set));
    assert_eq!(support::names_in(&out), ["hoist-lap"]);
}
