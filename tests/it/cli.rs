//! The binary end to end: exit codes, `new`, `check --json`, help.

use crate::support::{armsheet, scratch};

#[test]
fn demos_pass_and_an_unsymmetric_lap_fails_with_exit_1() {
    for demo in [
        "hoist-lap",
        "press-duplex-lap",
        "pump-wave",
        "conveyor-wave-dummy",
        "mill-lap-12p",
        "mill-frog-leg",
    ] {
        let out = armsheet(&["check", &format!("designs/{demo}.toml")]);
        assert_eq!(
            out.status.code(),
            Some(0),
            "{demo}: {}",
            String::from_utf8_lossy(&out.stdout)
        );
    }
    let out = armsheet(&["check", "tests/fixtures/unsymmetric-lap.toml"]);
    assert_eq!(out.status.code(), Some(1));
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(
        text.contains(
            "[FAIL] symmetry.slots-per-path-pair: slots per pair of paths S/(a/2) = 25/2 = 12.50"
        ),
        "{text}"
    );
    assert!(
        text.is_ascii() || !text.contains('✓'),
        "marks are ASCII when not a terminal"
    );
}

#[test]
fn check_json_has_the_fixed_keys() {
    let out = armsheet(&["check", "designs/conveyor-wave-dummy.toml", "--json"]);
    assert_eq!(out.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    for key in [
        "poles",
        "slots",
        "coils_per_slot",
        "segments",
        "coils",
        "active_coils",
        "dummy_coils",
        "conductors",
        "turns",
        "winding",
        "span",
        "back_pitch",
        "front_pitch",
        "commutator_pitch",
        "parallel_paths",
        "reentrancy",
        "brush_sets",
        "machine_constant",
        "symmetric",
        "checks",
        "connections",
        "equalizers",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    assert_eq!(v["segments"], 119);
    assert_eq!(v["dummy_coils"], 1);
    assert_eq!(v["commutator_pitch"], 40);
    assert_eq!(v["winding"]["type"], "wave");
    assert_eq!(v["connections"].as_array().unwrap().len(), 120);
    assert_eq!(v["connections"][119]["dummy"], true);
    assert_eq!(
        v["connections"][119]["start_segment"],
        serde_json::Value::Null
    );
    assert_eq!(v["equalizers"], serde_json::Value::Null);
    let first = &v["checks"][0];
    for key in ["id", "severity", "passed", "message", "source"] {
        assert!(first.get(key).is_some(), "check lacks {key}");
    }
}

#[test]
fn new_writes_a_starter_that_checks_clean_and_never_overwrites() {
    let dir = scratch("new");
    let path = dir.join("job.toml");
    let p = path.to_str().unwrap();
    let out = armsheet(&["new", p]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let written = std::fs::read_to_string(&path).unwrap();
    assert_eq!(written, armsheet::cli::STARTER);
    let out = armsheet(&["check", p]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );

    std::fs::write(&path, "# my own notes\n").unwrap();
    let out = armsheet(&["new", p]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("already exists"));
    assert_eq!(std::fs::read_to_string(&path).unwrap(), "# my own notes\n");
    let leftovers: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok())
        .collect();
    assert_eq!(leftovers.len(), 1, "no temporary file is left behind");
}

#[test]
fn a_missing_file_is_exit_2_with_a_hint() {
    let out = armsheet(&["check", "designs/no-such-design.toml"]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.starts_with("error: cannot read design file designs/no-such-design.toml"),
        "{err}"
    );
    assert!(out.stdout.is_empty());
}

#[test]
fn help_explains_keys_and_conventions() {
    let out = armsheet(&["check", "--help"]);
    assert_eq!(out.status.code(), Some(0));
    let text = String::from_utf8_lossy(&out.stdout);
    for word in ["coils_per_slot", "lead_offset", "\"1-8\"", "Exit codes"] {
        assert!(text.contains(word), "help lacks {word}:\n{text}");
    }
    let out = armsheet(&["frobnicate"]);
    assert_eq!(out.status.code(), Some(2));
}

/// Every help names the three connections where it names two: no `--help` says "lap and
/// wave" (or "lap or wave") without frog-leg beside it.
#[test]
fn no_help_leaves_out_the_frog_leg() {
    for command in [
        "", "check", "new", "rewind", "sheet", "draw", "identify", "test",
    ] {
        let args: Vec<&str> = [command, "--help"]
            .into_iter()
            .filter(|a| !a.is_empty())
            .collect();
        let out = armsheet(&args);
        assert_eq!(out.status.code(), Some(0), "{command}");
        let help = String::from_utf8(out.stdout).unwrap().replace('\n', " ");
        for two in ["lap and wave", "lap or wave", "lap, wave)"] {
            assert!(
                !help.to_lowercase().contains(two),
                "`armsheet {command} --help` says \"{two}\": {help}"
            );
        }
    }
    let top = armsheet(&["--help"]);
    assert!(String::from_utf8_lossy(&top.stdout).contains("lap, wave and frog-leg"));
}

/// The README tells a new user how to get the `armsheet` command its tables use, and its
/// quick start shows the PDF.
#[test]
fn the_readme_says_how_to_get_the_command() {
    let readme = include_str!("../../README.md");
    assert!(readme.contains("cargo install --path ."));
    assert!(readme.contains("target/release/armsheet"));
    let quick = &readme[..readme.find("## Commands").unwrap()];
    assert!(
        quick.contains("sheet designs/hoist-lap.toml --pdf"),
        "{quick}"
    );
    assert!(readme.contains("## Output files"));
}
