//! Tidy test: the winding kind lives in one place. Outside `src/theory/` no code names a kind
//! (`WindingType::Lap`, `WindingType::Wave`, `WindingType::FrogLeg`); it asks the kind a
//! question (`design.winding_type.kind().uses_every_coil()` and the like), so a new kind is
//! added in `src/theory/kind.rs` alone. Comments (`//`, `///`, `//!`) may name the kinds.
//!
//! Self-contained: it walks `src/` itself and shares nothing with the other tidy tests.

use std::path::{Path, PathBuf};

/// The kind names no code outside `src/theory/` may write.
const KIND_NAMES: [&str; 3] = [
    "WindingType::Lap",
    "WindingType::Wave",
    "WindingType::FrogLeg",
];

/// Imports that would bring the kinds in under their bare names (`use WindingType::*`).
const KIND_IMPORTS: [&str; 2] = ["WindingType::*", "WindingType::{"];

/// The one folder that may name the kinds, relative to `src/`.
const THEORY: &str = "theory";

/// Every `.rs` file under `dir`, sorted.
fn rust_files(dir: &Path) -> Vec<PathBuf> {
    let mut out = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for entry in std::fs::read_dir(&d).unwrap() {
            let path = entry.unwrap().path();
            if path.is_dir() {
                stack.push(path);
            } else if path.extension().is_some_and(|x| x == "rs") {
                out.push(path);
            }
        }
    }
    out.sort();
    out
}

/// The code of one line: the line up to a `//` comment that is not inside a string literal.
/// A line that is all comment (`//`, `///`, `//!`) has no code.
fn code_of(line: &str) -> &str {
    let mut in_string = false;
    let mut escaped = false;
    let bytes = line.as_bytes();
    for (i, &b) in bytes.iter().enumerate() {
        if in_string {
            match b {
                _ if escaped => escaped = false,
                b'\\' => escaped = true,
                b'"' => in_string = false,
                _ => {}
            }
        } else if b == b'"' {
            in_string = true;
        } else if b == b'/' && bytes.get(i + 1) == Some(&b'/') {
            return &line[..i];
        }
    }
    line
}

/// The violations in one file's text: `file:line: name` for every kind named in code.
fn violations(file: &str, text: &str) -> Vec<String> {
    let mut out = Vec::new();
    for (n, line) in text.lines().enumerate() {
        let code = code_of(line);
        for name in KIND_NAMES {
            if let Some(at) = code.find(name) {
                // `WindingType::Lap` must not be the start of a longer name.
                let after = code[at + name.len()..].chars().next();
                if !after.is_some_and(|c| c.is_alphanumeric() || c == '_') {
                    out.push(format!("{file}:{}: {name}", n + 1));
                }
            }
        }
        for import in KIND_IMPORTS {
            if code.contains(import) {
                out.push(format!("{file}:{}: {import}", n + 1));
            }
        }
    }
    out
}

/// Every violation under `src/`, outside `src/theory/`.
fn violations_in(src: &Path) -> Vec<String> {
    let theory = src.join(THEORY);
    rust_files(src)
        .into_iter()
        .filter(|p| !p.starts_with(&theory))
        .flat_map(|p| {
            let text = std::fs::read_to_string(&p).unwrap();
            let rel = p.strip_prefix(src).unwrap().display().to_string();
            violations(&format!("src/{rel}"), &text)
        })
        .collect()
}

#[test]
fn no_kind_is_named_outside_theory() {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let files = rust_files(&src);
    assert!(files.len() > 50, "only {} files under src/", files.len());
    let found = violations_in(&src);
    assert!(
        found.is_empty(),
        "a winding kind named outside src/theory/ (ask the kind a question instead, a method \
         of theory::WindingKind):\n{}",
        found.join("\n")
    );
}

#[test]
fn the_checker_reports_a_planted_kind_name() {
    let planted = "\
//! A module doc may say WindingType::Lap.
use crate::theory::WindingType;
/// So may a doc comment: WindingType::Wave.
fn f(t: WindingType) -> bool {
    // and a comment: WindingType::FrogLeg
    let s = \"a // in a string\"; let bad = t == WindingType::Wave;
    matches!(t, WindingType::FrogLeg) || bad // WindingType::Lap in a trailing comment
}
const NOT_A_KIND: &str = \"WindingType::Lapwing\";
use crate::theory::WindingType::*;
";
    assert_eq!(
        violations("src/planted.rs", planted),
        vec![
            "src/planted.rs:6: WindingType::Wave".to_string(),
            "src/planted.rs:7: WindingType::FrogLeg".to_string(),
            "src/planted.rs:10: WindingType::*".to_string(),
        ]
    );
    // And the walk finds a planted file in a folder that is not theory, but not in theory.
    let dir = std::env::temp_dir().join(format!("armsheet-kind-tidy-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(dir.join("theory")).unwrap();
    std::fs::create_dir_all(dir.join("checks")).unwrap();
    std::fs::write(dir.join("theory/kind.rs"), "let k = WindingType::Lap;\n").unwrap();
    std::fs::write(dir.join("checks/mod.rs"), "let k = WindingType::Lap;\n").unwrap();
    let found = violations_in(&dir);
    std::fs::remove_dir_all(&dir).unwrap();
    assert_eq!(
        found,
        vec!["src/checks/mod.rs:1: WindingType::Lap".to_string()]
    );
}
