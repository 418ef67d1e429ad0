//! The armature test is bounded at the largest size armsheet accepts: the largest equalized
//! lap (96 poles, 3,840 slots of 5 coils, 19,200 bars, full equalizers) with its own readings
//! and one reading halved runs the expected readings and the fault locator within 256 MB of
//! resident memory, read from the child's own resource usage (wait4).
//!
//! A test binary of its own, not a module of `tests/it`: Linux carries the spawning
//! process's peak resident set into the child's (`ru_maxrss` is kept across exec), so the
//! child must be spawned from a small process, not from one running many tests at once.

use std::path::PathBuf;
use std::process::Command;

/// An empty folder for this test's files.
fn scratch(name: &str) -> PathBuf {
    let dir = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join(format!("memory-{name}"));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Runs armsheet with `args`; returns its exit code and its peak resident set, bytes.
fn peak(args: &[&str]) -> (i32, u64) {
    let child = Command::new(env!("CARGO_BIN_EXE_armsheet"))
        .args(args)
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .unwrap();
    let pid = child.id() as libc::pid_t;
    let mut status = 0;
    // SAFETY: `rusage` is plain data that wait4 fills; the pid is our own child, not yet
    // waited for (std's handle is dropped without waiting).
    let mut usage: libc::rusage = unsafe { std::mem::zeroed() };
    let got = unsafe { libc::wait4(pid, &mut status, 0, &mut usage) };
    assert_eq!(got, pid);
    drop(child);
    // Linux gives ru_maxrss in kilobytes.
    (libc::WEXITSTATUS(status), usage.ru_maxrss as u64 * 1024)
}

#[test]
fn the_largest_equalized_lap_is_located_within_256_mb() {
    let dir = scratch("memory");
    let design = dir.join("lap-19200.toml");
    std::fs::write(
        &design,
        "[armature]\npoles = 96\nslots = 3840\ncoils_per_slot = 5\n\n[winding]\ntype = \"lap\"\nspan = 40\nturns = 1\nequalizers = \"full\"\n",
    )
    .unwrap();
    let d = design.to_str().unwrap();
    let out = dir.join("out");
    let (code, _) = peak(&["test", d, "-o", out.to_str().unwrap()]);
    assert_eq!(code, 0);
    let table = std::fs::read_to_string(out.join("lap-19200").join("readings.csv")).unwrap();
    let mut csv = String::from("from_bar,to_bar,reading\n");
    for (i, line) in table.lines().skip(1).enumerate() {
        let f: Vec<&str> = line.split(',').collect();
        let v: f64 = f[2].parse().unwrap();
        let v = if i == 4321 { v / 2.0 } else { v };
        csv.push_str(&format!("{},{},{v}\n", f[0], f[1]));
    }
    let readings = dir.join("r.csv");
    std::fs::write(&readings, csv).unwrap();
    let (code, bytes) = peak(&["test", d, "--readings", readings.to_str().unwrap()]);
    assert!(code == 0 || code == 1, "exit {code}");
    assert!(bytes < 256 << 20, "peak resident {} MB", bytes >> 20);
}
