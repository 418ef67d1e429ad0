//! One set, always: the folder `sheet` writes holds one whole set. An older set's file the new
//! set lacks goes (the stale `sheets.pdf`), a file that is not the set's own stays (`test -o`'s
//! four files, notes, even a file named like a sheet), runs into one folder at the same time
//! are kept apart by the folder's lock, and only marked staging folders are ever cleared.
//! (The killed-at-random cases are in kill_sheet.rs and kill_test.rs.)

use std::collections::BTreeMap;
use std::fs::{self, File};
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Output, Stdio};
use std::time::{Duration, Instant};

use crate::support::{self, files_in, names_in, scratch, text};

const BIN: &str = env!("CARGO_BIN_EXE_armsheet");
const TEST_FILES: [&str; 4] = ["readings.csv", "readings.svg", "test.json", "test.txt"];
const BUSY: &str = "is in use by another armsheet run";

/// `hoist-lap.toml` copied into `dir` as `name`, with `turns` turns per coil.
fn design_in(dir: &Path, name: &str, turns: u32) -> PathBuf {
    let text = fs::read_to_string(format!("{}/designs/hoist-lap.toml", support::ROOT)).unwrap();
    let edited = text.replace("\nturns = 4\n", &format!("\nturns = {turns}\n"));
    assert!(turns == 4 || edited != text, "the demo's turns line moved");
    let path = dir.join(name);
    fs::write(&path, edited).unwrap();
    path
}

fn run(dir: &Path, args: &[&str]) -> Output {
    support::armsheet_in(args, dir)
}

fn ok(o: &Output) {
    assert!(o.status.success(), "{}", text(&o.stderr));
}

/// The names `sheet-set.txt` lists.
fn listed(set: &Path) -> Vec<String> {
    fs::read_to_string(set.join("sheet-set.txt"))
        .unwrap()
        .lines()
        .filter(|l| !l.starts_with('#'))
        .map(str::to_string)
        .collect()
}

/// The folder's files without those of `test -o`.
fn sheet_files(set: &Path) -> BTreeMap<String, Vec<u8>> {
    let mut f = files_in(set);
    f.retain(|n, _| !TEST_FILES.contains(&n.as_str()));
    f
}

#[test]
fn the_stale_pdf_goes_with_the_set_that_wrote_it() {
    let dir = scratch("stale_pdf");
    design_in(&dir, "hoist-lap.toml", 4);
    ok(&run(&dir, &["sheet", "hoist-lap.toml", "--pdf"]));
    let set = dir.join("out/hoist-lap");
    assert!(set.join("sheets.pdf").is_file());
    assert!(listed(&set).contains(&"sheets.pdf".to_string()));
    // The design is edited (4 turns to 5) and the sheets written again without --pdf.
    design_in(&dir, "hoist-lap.toml", 5);
    let o = run(&dir, &["sheet", "hoist-lap.toml"]);
    ok(&o);
    assert!(!set.join("sheets.pdf").exists(), "the 4-turn PDF survived");
    assert!(
        text(&o.stdout).contains("removed stale out/hoist-lap/sheets.pdf"),
        "{}",
        text(&o.stdout)
    );
    // What is left is the new set exactly: its list, and report.json of the 5-turn design.
    let mut want = listed(&set);
    want.push("sheet-set.txt".into());
    want.sort();
    assert_eq!(names_in(&set), want);
    let check = run(&dir, &["check", "--json", "hoist-lap.toml"]);
    assert_eq!(
        fs::read_to_string(set.join("report.json")).unwrap(),
        text(&check.stdout)
    );
    assert_eq!(names_in(&dir.join("out")), ["hoist-lap"]);
}

#[test]
fn a_file_that_is_not_the_sets_own_stays() {
    let dir = scratch("not_own");
    design_in(&dir, "hoist-lap.toml", 4);
    ok(&run(
        &dir,
        &["sheet", "hoist-lap.toml", "--pdf", "--paper", "a3"],
    ));
    ok(&run(&dir, &["test", "hoist-lap.toml", "-o", "out"]));
    let set = dir.join("out/hoist-lap");
    // The user's own files, one of them named like a sheet of a longer set.
    fs::write(set.join("notes.txt"), "rewound 2026-03, customer's notes").unwrap();
    fs::write(set.join("sheet-40.svg"), "the user's own drawing").unwrap();
    let before = files_in(&set);
    design_in(&dir, "hoist-lap.toml", 5);
    ok(&run(&dir, &["sheet", "hoist-lap.toml"]));
    let after = files_in(&set);
    for name in TEST_FILES.iter().chain(&["notes.txt", "sheet-40.svg"]) {
        assert_eq!(after.get(*name), before.get(*name), "{name} touched");
    }
    assert!(!after.contains_key("sheets.pdf"));
    // An edited list cannot reach outside the folder.
    fs::write(dir.join("out/victim.txt"), "keep").unwrap();
    let mut list = fs::read_to_string(set.join("sheet-set.txt")).unwrap();
    list.push_str("../victim.txt\n/etc/passwd\n..\n.\n");
    fs::write(set.join("sheet-set.txt"), list).unwrap();
    ok(&run(&dir, &["sheet", "hoist-lap.toml"]));
    assert_eq!(
        fs::read_to_string(dir.join("out/victim.txt")).unwrap(),
        "keep"
    );
    assert_eq!(files_in(&set).get("notes.txt"), before.get("notes.txt"));
}

/// A folder named like a staging folder but not marked as one is the user's: a set written
/// from `.hoist-lap.pump01.new.toml` survives `sheet hoist-lap.toml`, and so do a bare folder
/// with a staging name and one marked for another target.
#[test]
fn an_unmarked_folder_named_like_staging_survives() {
    let dir = scratch("unmarked");
    design_in(&dir, "hoist-lap.toml", 4);
    design_in(&dir, ".hoist-lap.pump01.new.toml", 5);
    ok(&run(&dir, &["sheet", ".hoist-lap.pump01.new.toml"]));
    let out = dir.join("out");
    let theirs = out.join(".hoist-lap.pump01.new");
    let pump = files_in(&theirs);
    assert!(pump.contains_key("sheet-1.svg"));
    let bare = out.join(".hoist-lap.AbC123.old");
    fs::create_dir_all(bare.join("set")).unwrap();
    fs::write(bare.join("set/mine.txt"), "mine").unwrap();
    let other = out.join(".hoist-lap.xYz789.new");
    fs::create_dir_all(&other).unwrap();
    fs::write(other.join(".arm-staging"), "some-other-folder\n").unwrap();
    fs::write(other.join("notes.txt"), "not for hoist-lap").unwrap();
    ok(&run(&dir, &["sheet", "hoist-lap.toml"]));
    assert_eq!(files_in(&theirs), pump, "the user's set was touched");
    assert_eq!(
        fs::read_to_string(bare.join("set/mine.txt")).unwrap(),
        "mine"
    );
    assert!(other.join("notes.txt").is_file());
    assert!(!out.join("hoist-lap/notes.txt").exists());
}

fn spawn(dir: &Path, args: &[&str]) -> Child {
    Command::new(BIN)
        .args(args)
        .current_dir(dir)
        .stdout(Stdio::null())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap()
}

/// Two `sheet` runs (different sets) and a `test -o` started together into one folder, as a
/// parallel make does, several times over: each run either finishes (exit 0) or gives up on
/// the lock (exit 2, saying so), and afterwards the folder holds one of the two sets whole,
/// beside the test's four files, and nothing is left beside it.
#[test]
fn runs_into_one_folder_at_once_leave_whole_sets() {
    let dir = scratch("together");
    design_in(&dir, "hoist-lap.toml", 4);
    // The reference sets, each written alone.
    ok(&run(&dir, &["sheet", "hoist-lap.toml", "--pdf", "-o", "a"]));
    ok(&run(
        &dir,
        &["sheet", "hoist-lap.toml", "--paper", "a3", "-o", "b"],
    ));
    ok(&run(&dir, &["test", "hoist-lap.toml", "-o", "t"]));
    let (a, b) = (
        files_in(&dir.join("a/hoist-lap")),
        files_in(&dir.join("b/hoist-lap")),
    );
    assert_ne!(a, b);
    let tests = files_in(&dir.join("t/hoist-lap"));
    let set = dir.join("out/hoist-lap");
    let mut busy = 0;
    for i in 0..8 {
        let runs = [
            spawn(&dir, &["sheet", "hoist-lap.toml", "--pdf"]),
            spawn(&dir, &["test", "hoist-lap.toml", "-o", "out"]),
            spawn(&dir, &["sheet", "hoist-lap.toml", "--paper", "a3"]),
        ];
        let mut codes = Vec::new();
        for r in runs {
            let o = r.wait_with_output().unwrap();
            let code = o.status.code();
            if code == Some(2) {
                assert!(
                    text(&o.stderr).contains(BUSY),
                    "try {i}: {}",
                    text(&o.stderr)
                );
                busy += 1;
            } else {
                assert_eq!(code, Some(0), "try {i}: {}", text(&o.stderr));
            }
            codes.push(code);
        }
        let now = sheet_files(&set);
        assert!(
            now == a || now == b,
            "try {i} ({codes:?}): not one whole set: {:?}",
            now.keys()
        );
        if codes[1] == Some(0) {
            let all = files_in(&set);
            for f in TEST_FILES {
                assert_eq!(all.get(f), tests.get(f), "try {i}: {f}");
            }
        }
        assert_eq!(names_in(&dir.join("out")), ["hoist-lap"], "try {i}");
    }
    eprintln!("runs_into_one_folder_at_once: 8 tries of 3 runs, {busy} gave up on the lock");
}

/// The lock file of out/hoist-lap, held by this test as another run would hold it.
fn hold_lock(dir: &Path) -> File {
    use std::io::Write;
    fs::create_dir_all(dir.join("out")).unwrap();
    let mut f = File::options()
        .read(true)
        .write(true)
        .create(true)
        .truncate(false)
        .open(dir.join("out/.hoist-lap.lock"))
        .unwrap();
    f.lock().unwrap();
    f.set_len(0).unwrap();
    writeln!(f, "armsheet sheet, process 4242").unwrap();
    f
}

/// A run finding the folder locked (`sheet`, `test -o`, `draw` into its default folder) waits
/// a few seconds for it; if the other run lets go in
/// time it goes on, else it exits 2 naming the lock file and the run that holds it, and
/// writes nothing.
#[test]
fn a_locked_folder_makes_a_run_wait_then_give_up() {
    let dir = scratch("locked");
    design_in(&dir, "hoist-lap.toml", 4);
    ok(&run(&dir, &["sheet", "hoist-lap.toml"]));
    let set = dir.join("out/hoist-lap");
    let old = files_in(&set);
    design_in(&dir, "hoist-lap.toml", 5);

    let lock = hold_lock(&dir);
    let t = Instant::now();
    let (sheet, test, draw) = (
        spawn(&dir, &["sheet", "hoist-lap.toml"]),
        spawn(&dir, &["test", "hoist-lap.toml", "-o", "out"]),
        spawn(&dir, &["draw", "hoist-lap.toml"]),
    );
    for child in [sheet, test, draw] {
        let o = child.wait_with_output().unwrap();
        let err = text(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{err}");
        assert!(err.contains(BUSY), "{err}");
        assert!(err.contains("out/.hoist-lap.lock"), "{err}");
        assert!(err.contains("armsheet sheet, process 4242"), "{err}");
    }
    assert!(t.elapsed() >= Duration::from_secs(4), "{:?}", t.elapsed());
    assert_eq!(files_in(&set), old, "written while locked");

    // Let go a second into the wait: the run goes on and writes the new set.
    let child = spawn(&dir, &["sheet", "hoist-lap.toml"]);
    std::thread::sleep(Duration::from_secs(1));
    drop(lock);
    let o = child.wait_with_output().unwrap();
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert_ne!(files_in(&set), old);
    assert_eq!(
        names_in(&dir.join("out")),
        ["hoist-lap"],
        "the lock file was left"
    );
}

/// The wait the help and the README promise is the wait the lock takes.
#[test]
fn help_and_readme_give_the_lock_wait() {
    let secs = armsheet::cli::lock::LOCK_WAIT.as_secs();
    let readme = include_str!("../../README.md").replace('\n', " ");
    assert!(readme.contains(&format!("waits up to {secs} s")));
    assert!(readme.contains(&format!("for more than {secs} s")));
    for command in ["sheet", "test"] {
        let help = text(&support::armsheet(&[command, "--help"]).stdout).replace('\n', " ");
        assert!(
            help.contains(&format!("waits up to {secs} s")),
            "{command}: {help}"
        );
        assert!(help.contains("DIR/.<design-stem>.lock"), "{command}");
    }
}
