//! The corpus of broken design files in tests/broken/: each `NAME.toml` must make
//! `armsheet check` exit 2, print nothing on stdout, and print exactly `NAME.stderr` on stderr.
//! Set ARMSHEET_BLESS=1 to rewrite the expected files after a deliberate change of wording.

use std::path::Path;
use std::process::Command;

#[test]
fn every_broken_file_gets_its_expected_message() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/broken");
    let bless = std::env::var_os("ARMSHEET_BLESS").is_some();
    let mut names: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    names.sort();
    assert!(names.len() >= 20, "the corpus has {} files", names.len());
    let mut failures = Vec::new();
    for path in names {
        let rel = format!(
            "tests/broken/{}",
            path.file_name().unwrap().to_string_lossy()
        );
        let out = Command::new(env!("CARGO_BIN_EXE_armsheet"))
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .args(["check", &rel])
            .output()
            .unwrap();
        let stderr = String::from_utf8_lossy(&out.stderr).into_owned();
        let expected_path = path.with_extension("stderr");
        if bless {
            std::fs::write(&expected_path, &stderr).unwrap();
        }
        let expected = std::fs::read_to_string(&expected_path).unwrap_or_default();
        if out.status.code() != Some(2) {
            failures.push(format!("{rel}: exit {:?}, expected 2", out.status.code()));
        }
        if !out.stdout.is_empty() {
            failures.push(format!("{rel}: wrote to stdout"));
        }
        if stderr != expected {
            failures.push(format!(
                "{rel}: stderr differs\n--- expected\n{expected}--- got\n{stderr}"
            ));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
