//! Safe output end to end: what `--force` (and every other write) may replace, temporary names
//! that cannot be hijacked, a rewind that never writes a file armsheet itself would refuse, a
//! design file name that cannot inject TOML, and a refusal that prints nothing on standard
//! output.
//!
//! The rules under test (`src/cli/output.rs`): an output path must be absent, a regular file,
//! or a symbolic link to an existing regular file (followed: the file it leads to is replaced,
//! the link kept); for a sheet set the same with "folder" for "regular file". Anything else (a
//! folder, a device, a FIFO, a link to nothing or to any of these) is exit 2 with nothing
//! written.
#![cfg(unix)]

use crate::support;

use std::fs;
use std::os::unix::fs::{FileTypeExt, symlink};
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::time::{Duration, Instant};

use crate::support::{ROOT, scratch, text};
use armsheet::cli::error::NoOverwrite;
use armsheet::cli::output::{replace_folder, write_atomic, write_new};
use armsheet::design::parse_design;
use armsheet::features::rewind::design_toml::write_design;
use armsheet::features::rewind::{
    MAX_CURRENT_A, MAX_FLUX_MWB, MAX_SPEED_RPM, MAX_VOLTAGE, RewindRequest, no_load_test,
    rewind_rated,
};

/// Runs armsheet in `cwd`, killed after 30 s: a write that opened a FIFO would block forever,
/// and must fail the test rather than hang it.
fn run_in(args: &[&str], cwd: &Path) -> Output {
    let mut child = Command::new(env!("CARGO_BIN_EXE_armsheet"))
        .args(args)
        .current_dir(cwd)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let start = Instant::now();
    while child.try_wait().unwrap().is_none() {
        if start.elapsed() > Duration::from_secs(30) {
            let _ = child.kill();
            panic!("armsheet {args:?} did not finish: it opened something it should not have");
        }
        std::thread::sleep(Duration::from_millis(20));
    }
    child.wait_with_output().unwrap()
}

fn hoist() -> String {
    format!("{ROOT}/designs/hoist-lap.toml")
}

/// `rewind hoist-lap --voltage 220 -o OUT [--force]` in `cwd`.
fn rewind_to(cwd: &Path, out: &str, force: bool) -> Output {
    let h = hoist();
    let mut args = vec!["rewind", h.as_str(), "--voltage", "115", "-o", out];
    if force {
        args.push("--force");
    }
    run_in(&args, cwd)
}

/// Sorted names in `dir`.
fn names(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

fn mkfifo(path: &Path) {
    let ok = Command::new("mkfifo").arg(path).status().unwrap().success();
    assert!(ok, "mkfifo {}", path.display());
}

fn is_fifo(path: &Path) -> bool {
    fs::symlink_metadata(path).unwrap().file_type().is_fifo()
}

/// Exit 2, nothing on standard output, and standard error exactly `stderr`.
#[track_caller]
fn refused(o: &Output, stderr: &str) {
    assert_eq!(o.status.code(), Some(2), "{}", text(&o.stderr));
    assert_eq!(text(&o.stdout), "", "a refusal prints nothing on stdout");
    assert_eq!(text(&o.stderr), stderr);
}

#[test]
fn force_follows_a_link_to_a_regular_file_and_keeps_the_link() {
    let dir = scratch("safety-link-file");
    fs::write(dir.join("real.toml"), "old\n").unwrap();
    symlink("real.toml", dir.join("link.toml")).unwrap();
    let o = rewind_to(&dir, "link.toml", true);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    assert!(text(&o.stdout).ends_with("wrote link.toml\n"));
    assert_eq!(
        fs::read_link(dir.join("link.toml")).unwrap(),
        Path::new("real.toml")
    );
    let written = fs::read_to_string(dir.join("real.toml")).unwrap();
    assert!(written.starts_with("# armsheet rewind of "), "{written}");
    assert_eq!(
        names(&dir),
        ["link.toml", "real.toml"],
        "no temporary file left"
    );
    // Without --force the link's file is an existing file: kept.
    let o = rewind_to(&dir, "link.toml", false);
    assert_eq!(o.status.code(), Some(2));
    assert!(o.stdout.is_empty());
    assert!(text(&o.stderr).starts_with("error: link.toml already exists; "));
    assert_eq!(fs::read_to_string(dir.join("real.toml")).unwrap(), written);
}

#[test]
fn a_dangling_link_is_refused_and_nothing_is_created_through_it() {
    let dir = scratch("safety-dangling");
    symlink("made-by-armsheet.toml", dir.join("dang.toml")).unwrap();
    let msg = "error: cannot write dang.toml: it is a symbolic link to made-by-armsheet.toml, which does not exist; armsheet follows a link only to an existing regular file\n  = hint: give another path\n";
    for force in [true, false] {
        refused(&rewind_to(&dir, "dang.toml", force), msg);
    }
    refused(&run_in(&["new", "dang.toml"], &dir), msg);
    let h = hoist();
    refused(&run_in(&["draw", &h, "-o", "dang.toml"], &dir), msg);
    assert_eq!(names(&dir), ["dang.toml"]);
    assert!(
        fs::symlink_metadata(dir.join("dang.toml"))
            .unwrap()
            .file_type()
            .is_symlink()
    );
}

#[test]
fn a_folder_is_not_replaced_by_a_file() {
    let dir = scratch("safety-folder");
    fs::create_dir(dir.join("full")).unwrap();
    fs::write(dir.join("full/keep.txt"), "mine").unwrap();
    let msg = "error: cannot write full: it is a folder, not a regular file; armsheet writes only where there is nothing or a regular file (or a symbolic link to one)\n  = hint: give another path\n";
    refused(&rewind_to(&dir, "full", true), msg);
    let h = hoist();
    refused(&run_in(&["draw", &h, "-o", "full"], &dir), msg);
    refused(&run_in(&["new", "full"], &dir), msg);
    assert!(dir.join("full").is_dir());
    assert_eq!(names(&dir.join("full")), ["keep.txt"]);
    assert_eq!(names(&dir), ["full"]);
}

#[test]
fn a_fifo_is_never_opened_or_replaced() {
    let dir = scratch("safety-fifo");
    mkfifo(&dir.join("pipe"));
    symlink("pipe", dir.join("to-pipe")).unwrap();
    let msg = "error: cannot write pipe: it is a FIFO (named pipe), not a regular file; armsheet writes only where there is nothing or a regular file (or a symbolic link to one)\n  = hint: give another path\n";
    refused(&rewind_to(&dir, "pipe", true), msg);
    refused(&rewind_to(&dir, "pipe", false), msg);
    let h = hoist();
    refused(&run_in(&["draw", &h, "-o", "pipe"], &dir), msg);
    refused(&run_in(&["new", "pipe"], &dir), msg);
    refused(
        &rewind_to(&dir, "to-pipe", true),
        "error: cannot write to-pipe: it is a symbolic link to pipe, a FIFO (named pipe), not a regular file; armsheet follows a link only to an existing regular file\n  = hint: give another path\n",
    );
    assert!(is_fifo(&dir.join("pipe")));
    assert_eq!(names(&dir), ["pipe", "to-pipe"]);
}

#[test]
fn dev_null_is_refused_before_anything_is_written() {
    let null = Path::new("/dev/null");
    let is_char = |p: &Path| {
        fs::symlink_metadata(p)
            .unwrap()
            .file_type()
            .is_char_device()
    };
    assert!(
        is_char(null),
        "this test needs /dev/null to be a character device"
    );
    let dev_before = names(Path::new("/dev"));
    let dir = scratch("safety-dev-null");
    refused(
        &rewind_to(&dir, "/dev/null", true),
        "error: cannot write /dev/null: it is a character device, not a regular file; armsheet writes only where there is nothing or a regular file (or a symbolic link to one)\n  = hint: give another path\n",
    );
    symlink("/dev/null", dir.join("null-link")).unwrap();
    refused(
        &rewind_to(&dir, "null-link", true),
        "error: cannot write null-link: it is a symbolic link to /dev/null, a character device, not a regular file; armsheet follows a link only to an existing regular file\n  = hint: give another path\n",
    );
    assert!(is_char(null), "/dev/null was replaced");
    // The refusal came before the temporary file: none was made beside /dev/null.
    let stray: Vec<String> = names(Path::new("/dev"))
        .into_iter()
        .filter(|n| n.starts_with(".null.") && !dev_before.contains(n))
        .collect();
    assert!(stray.is_empty(), "temporary files in /dev: {stray:?}");
    assert_eq!(names(&dir), ["null-link"]);

    // A copy of a device node (as the issue found it: `-o dir/full --force`), where the system
    // lets this test make one (root, outside a restricted container); else /dev/null above is
    // the case.
    let full = dir.join("full");
    let made = Command::new("mknod")
        .arg(&full)
        .args(["c", "1", "7"])
        .stderr(Stdio::null())
        .status()
        .is_ok_and(|s| s.success());
    if made {
        refused(
            &rewind_to(&dir, "full", true),
            "error: cannot write full: it is a character device, not a regular file; armsheet writes only where there is nothing or a regular file (or a symbolic link to one)\n  = hint: give another path\n",
        );
        assert!(is_char(&full), "the device node was replaced");
        assert_eq!(names(&dir), ["full", "null-link"]);
        fs::remove_file(&full).unwrap();
    }
}

#[test]
fn the_sheet_set_folder_follows_the_same_rules() {
    let dir = scratch("safety-sheet");
    let h = hoist();
    let sheet = |out: &str| run_in(&["sheet", &h, "-o", out], &dir);
    // A FIFO where the set folder goes.
    fs::create_dir(dir.join("a")).unwrap();
    mkfifo(&dir.join("a/hoist-lap"));
    refused(
        &sheet("a"),
        "error: cannot create the output folder a/hoist-lap: it is a FIFO (named pipe), not a folder; armsheet writes only where there is nothing or a folder (or a symbolic link to one)\n  = hint: give another folder with -o DIR\n",
    );
    assert!(is_fifo(&dir.join("a/hoist-lap")));
    assert_eq!(
        names(&dir.join("a")),
        ["hoist-lap"],
        "no staging folder left"
    );
    // A link to nothing, and a link to a regular file.
    fs::create_dir(dir.join("b")).unwrap();
    symlink("nowhere", dir.join("b/hoist-lap")).unwrap();
    refused(
        &sheet("b"),
        "error: cannot create the output folder b/hoist-lap: it is a symbolic link to nowhere, which does not exist; armsheet follows a link only to an existing folder\n  = hint: give another folder with -o DIR\n",
    );
    assert!(!dir.join("b/nowhere").exists());
    fs::write(dir.join("notes.txt"), "mine").unwrap();
    fs::create_dir(dir.join("c")).unwrap();
    symlink("../notes.txt", dir.join("c/hoist-lap")).unwrap();
    refused(
        &sheet("c"),
        "error: cannot create the output folder c/hoist-lap: it is a symbolic link to ../notes.txt, a regular file, not a folder; armsheet follows a link only to an existing folder\n  = hint: give another folder with -o DIR\n",
    );
    assert_eq!(fs::read_to_string(dir.join("notes.txt")).unwrap(), "mine");
    // A link to a folder is followed: the set lands in the folder, the link stays.
    fs::create_dir_all(dir.join("real-set")).unwrap();
    fs::create_dir(dir.join("d")).unwrap();
    symlink("../real-set", dir.join("d/hoist-lap")).unwrap();
    let o = sheet("d");
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    assert!(dir.join("real-set/sheet-1.svg").is_file());
    assert!(
        fs::symlink_metadata(dir.join("d/hoist-lap"))
            .unwrap()
            .file_type()
            .is_symlink()
    );
}

/// Names a writer of `target` could be expected to use for its temporary file or folder, the
/// old `.NAME.PID.tmp` among them (this process's id: the writes below run in it).
fn predictable_names(target: &str) -> Vec<String> {
    let pid = std::process::id();
    let mut v = vec![
        format!(".{target}.{pid}.tmp"),
        format!(".{target}.tmp"),
        format!("{target}.tmp"),
        format!(".{target}.{pid}"),
        format!("{target}.{pid}"),
        format!("{target}~"),
        format!(".{target}.swp"),
        format!("{target}.new"),
        format!("{target}.old"),
        format!(".{target}..tmp"),
    ];
    for s in ["new", "old"] {
        v.push(format!(".{target}.{pid}.{s}"));
        v.push(format!(".{target}..{s}"));
        v.push(format!(".{target}.{s}"));
    }
    v
}

#[test]
fn planted_links_at_predictable_temporary_names_are_not_followed() {
    let dir = scratch("safety-planted");
    let victim = dir.join("victim.txt");
    fs::write(&victim, "untouched").unwrap();
    let victim_dir = dir.join("victim-folder");
    fs::create_dir(&victim_dir).unwrap();
    let mut planted: Vec<PathBuf> = Vec::new();
    for target in ["out.toml", "new.toml", "set"] {
        for name in predictable_names(target) {
            let p = dir.join(name);
            let to = if target == "set" {
                &victim_dir
            } else {
                &victim
            };
            symlink(to, &p).unwrap();
            planted.push(p);
        }
    }
    // The three writers, run in this process so the old pattern's process id is known.
    write_atomic(&dir.join("out.toml"), b"replaced = 1\n").unwrap();
    write_atomic(&dir.join("out.toml"), b"replaced = 2\n").unwrap();
    write_new(&dir.join("new.toml"), b"new = 1\n", NoOverwrite::New).unwrap();
    let files = vec![("a.txt".to_string(), b"a".to_vec())];
    replace_folder(&dir.join("set"), &files, |_| false, "sheet").unwrap();
    replace_folder(&dir.join("set"), &files, |_| false, "sheet").unwrap();

    assert_eq!(fs::read_to_string(&victim).unwrap(), "untouched");
    assert!(names(&victim_dir).is_empty(), "{:?}", names(&victim_dir));
    for p in &planted {
        let m = fs::symlink_metadata(p).unwrap();
        assert!(m.file_type().is_symlink(), "{} was replaced", p.display());
    }
    assert_eq!(
        fs::read_to_string(dir.join("out.toml")).unwrap(),
        "replaced = 2\n"
    );
    assert_eq!(
        fs::read_to_string(dir.join("new.toml")).unwrap(),
        "new = 1\n"
    );
    assert_eq!(names(&dir.join("set")), ["a.txt", "sheet-set.txt"]);
    // Nothing else appeared: every temporary file and folder went.
    let mut want: Vec<String> = planted
        .iter()
        .map(|p| p.file_name().unwrap().to_string_lossy().into_owned())
        .collect();
    want.extend(["new.toml", "out.toml", "set", "victim-folder", "victim.txt"].map(String::from));
    want.sort();
    assert_eq!(names(&dir), want);
}

#[test]
fn a_from_test_flux_no_design_file_holds_is_refused_and_nothing_written() {
    let dir = scratch("safety-from-test");
    let h = hoist();
    for (v0, n0, words) in [
        ("1000", "0.5", "gives a flux per pole of 416666.6667 mWb"),
        ("1e308", "1e-308", "gives no finite flux per pole"),
    ] {
        let msg = format!(
            "error: {h}: cannot rewind: --from-test {v0} V at {n0} rpm {words}; a design file holds above 0 and at most 100000 mWb: check the readings (open-circuit volts first, then rpm)\n",
        );
        for extra in [&[][..], &["--voltage", "220"][..]] {
            let mut args = vec!["rewind", h.as_str(), "--from-test", v0, n0, "-o", "ft.toml"];
            args.extend_from_slice(extra);
            refused(&run_in(&args, &dir), &msg);
            assert!(!dir.join("ft.toml").exists());
        }
        // Also without -o: the report would print a flux no design can take.
        refused(&run_in(&["rewind", &h, "--from-test", v0, n0], &dir), &msg);
    }
    assert!(names(&dir).is_empty(), "{:?}", names(&dir));
    // A sound test is recorded, and the file checks.
    let o = run_in(
        &["rewind", &h, "--from-test", "100", "1150", "-o", "ft.toml"],
        &dir,
    );
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let c = run_in(&["check", "ft.toml"], &dir);
    assert_ne!(c.status.code(), Some(2), "{}", text(&c.stderr));
}

#[test]
fn a_file_name_cannot_inject_toml_into_the_header() {
    let dir = scratch("safety-inject");
    let evil = "evil\n[limits]\nsegment_volts_avg_max = 999\n#.toml";
    fs::copy(hoist(), dir.join(evil)).unwrap();
    for (out, args) in [
        ("v.toml", &["--voltage", "115"][..]),
        ("t.toml", &["--from-test", "100", "1150"][..]),
    ] {
        let mut all = vec!["rewind", evil];
        all.extend_from_slice(args);
        all.extend_from_slice(&["-o", out]);
        let o = run_in(&all, &dir);
        assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
        let written = fs::read_to_string(dir.join(out)).unwrap();
        assert!(
            !written
                .lines()
                .any(|l| l.trim_start().starts_with("[limits]")),
            "{written}"
        );
        let escaped = "evil\\n[limits]\\nsegment_volts_avg_max = 999\\n#.toml";
        assert!(written.contains(escaped), "{written}");
        for line in written.lines().take_while(|l| !l.is_empty()) {
            assert!(
                line.starts_with("# "),
                "a header line is not a comment: {line:?}"
            );
        }
        let d = parse_design(&written, out).unwrap_or_else(|e| panic!("{e}"));
        assert!(d.limits.overrides().next().is_none(), "{written}");
    }
}

#[test]
fn a_refused_rewind_prints_nothing_on_stdout() {
    let dir = scratch("safety-quiet");
    fs::write(dir.join("taken.toml"), "mine\n").unwrap();
    let o = rewind_to(&dir, "taken.toml", false);
    assert_eq!(o.status.code(), Some(2));
    assert_eq!(text(&o.stdout), "");
    assert!(text(&o.stderr).starts_with("error: taken.toml already exists; armsheet rewind"));
    assert_eq!(
        fs::read_to_string(dir.join("taken.toml")).unwrap(),
        "mine\n"
    );
    // A folder that does not exist: the write fails, and the report is not shown either.
    let o = rewind_to(&dir, "no-such-folder/x.toml", true);
    assert_eq!(o.status.code(), Some(2));
    assert_eq!(text(&o.stdout), "");
    assert!(text(&o.stderr).starts_with("error: cannot write no-such-folder/x.toml: "));
}

const TINY_CURRENT: &str = "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 5\n[rating]\nvoltage = 100\nspeed_rpm = 1000\ncurrent = 5e-324\n";

#[test]
fn a_tiny_current_never_becomes_nan_or_zero_in_the_new_file() {
    let dir = scratch("safety-tiny");
    fs::write(dir.join("tiny.toml"), TINY_CURRENT).unwrap();
    // Fewer conductors: the current grows, stays a number and the file parses back.
    let o = run_in(
        &["rewind", "tiny.toml", "--voltage", "50", "-o", "50.toml"],
        &dir,
    );
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let written = fs::read_to_string(dir.join("50.toml")).unwrap();
    assert!(!written.to_lowercase().contains("nan"), "{written}");
    let d = parse_design(&written, "50.toml").unwrap_or_else(|e| panic!("{e}"));
    let i = d.rating.unwrap().current.unwrap();
    assert!(i > 0.0 && i.is_finite(), "{i}");
    // More conductors: the current underflows to 0, which no design holds: refused.
    refused(
        &run_in(
            &["rewind", "tiny.toml", "--voltage", "220", "-o", "220.toml"],
            &dir,
        ),
        "error: tiny.toml: cannot rewind: the new armature current works out to 0 A (the rated current scaled by the old/new conductors per path); a design file holds above 0 and at most 100000 A: check [rating] current, or ask for another --voltage\n",
    );
    assert!(!dir.join("220.toml").exists());
}

/// The rewind's range limits are the design file's: the largest value parses, the next one up
/// does not (so the limits written once in the rewind and once in the parser cannot drift).
#[test]
fn the_rewind_limits_are_the_design_files_limits() {
    let base =
        "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 5\n[rating]\n";
    for (key, max) in [
        ("flux_per_pole_mwb", MAX_FLUX_MWB),
        ("current", MAX_CURRENT_A),
        ("speed_rpm", MAX_SPEED_RPM),
        ("voltage", MAX_VOLTAGE),
    ] {
        let at = format!("{base}{key} = {max:?}\n");
        assert!(parse_design(&at, "t.toml").is_ok(), "{key} = {max} refused");
        let above = format!("{base}{key} = {:?}\n", max.next_up());
        assert!(
            parse_design(&above, "t.toml").is_err(),
            "{key} above {max} accepted"
        );
    }
}

/// Whatever the rewind and the no-load test accept, the file they would write parses back:
/// every demo against hostile readings, voltages, speeds and resistances.
#[test]
fn every_rewind_the_library_accepts_parses_back() {
    let tests = [
        (1000.0, 0.5),
        (1e308, 1e-308),
        (1e-308, 1e308),
        (5e-324, 1.0),
        (1e-3, 1e5),
        (200.0, 1500.0),
    ];
    let mut texts: Vec<String> = support::DEMOS.iter().map(|d| support::demo(d)).collect();
    texts.push(TINY_CURRENT.to_string());
    let mut written = 0;
    for t in &texts {
        let checked = armsheet::check(parse_design(t, "d.toml").unwrap());
        let (d, w) = (&checked.design, &checked.winding);
        for &(v0, n0) in &tests {
            for ra in [None, Some(1e-300), Some(1e300)] {
                if let Ok(test) = no_load_test(d, w, v0, n0, ra) {
                    let file = write_design(&test.design, &["header".to_string()]);
                    parse_design(&file, "n.toml")
                        .unwrap_or_else(|e| panic!("no-load {v0} {n0}: {e}\n{file}"));
                    written += 1;
                }
            }
        }
        for voltage in [1e-300, 0.5, 50.0, 220.0, 1e5] {
            for speed_rpm in [None, Some(1e-300), Some(1.0), Some(2e5)] {
                for from_test in [None, Some(tests[0]), Some(tests[4]), Some(tests[5])] {
                    let req = RewindRequest {
                        voltage,
                        speed_rpm,
                        from_test,
                        ..RewindRequest::default()
                    };
                    if let Ok(plan) = rewind_rated(d, w, checked.rating.as_ref(), &req) {
                        let file = plan.design_file("d.toml", "asked");
                        parse_design(&file, "r.toml")
                            .unwrap_or_else(|e| panic!("{req:?}: {e}\n{file}"));
                        written += 1;
                    }
                }
            }
        }
    }
    assert!(written > 50, "only {written} rewinds were worked out");
}
