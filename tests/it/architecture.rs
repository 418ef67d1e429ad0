//! Tidy tests: the invariants of the house, checked mechanically over `src/`.
//!
//! - Every import points down the pipeline: a module in stage k uses only stages 0…k
//!   ([`armsheet::STAGES`] is the one list; DEVELOPERS.md shows the same order).
//! - No production file includes anything from `tests/`.
//! - Every source file opens with its `//!` paragraph.
//! - Only `cli` touches files, the clock, the terminal or the environment.

use std::path::{Path, PathBuf};

use armsheet::STAGES;

const SRC: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/src");

fn sources(dir: &Path, out: &mut Vec<PathBuf>) {
    let mut entries: Vec<_> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .collect();
    entries.sort();
    for p in entries {
        if p.is_dir() {
            sources(&p, out);
        } else if p.extension().is_some_and(|e| e == "rs") {
            out.push(p);
        }
    }
}

fn all_sources() -> Vec<(String, String)> {
    let mut files = Vec::new();
    sources(Path::new(SRC), &mut files);
    files
        .into_iter()
        .map(|p| {
            let rel = p
                .strip_prefix(SRC)
                .unwrap()
                .to_string_lossy()
                .replace('\\', "/");
            (rel, std::fs::read_to_string(&p).unwrap())
        })
        .collect()
}

/// The stage a file belongs to: its first folder under `src/`, or `None` for the crate root.
fn stage_of(rel: &str) -> Option<usize> {
    let first = rel.split('/').next().unwrap().trim_end_matches(".rs");
    STAGES.iter().position(|s| *s == first)
}

/// The code of a line without its `//` comment (string contents are kept; good enough here).
fn code(line: &str) -> &str {
    match line.find("//") {
        Some(i) if !line[..i].contains('"') => &line[..i],
        _ => line,
    }
}

/// Every crate-level module named after `crate::` on a line: `crate::a::b`, `crate::{a, b::c}`.
fn crate_refs(line: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut rest = line;
    while let Some(i) = rest.find("crate::") {
        rest = &rest[i + "crate::".len()..];
        if let Some(group) = rest.strip_prefix('{') {
            let end = group.find('}').unwrap_or(group.len());
            for part in group[..end].split(',') {
                let name: String = part
                    .trim()
                    .chars()
                    .take_while(|c| c.is_alphanumeric() || *c == '_')
                    .collect();
                if !name.is_empty() {
                    out.push(name);
                }
            }
        } else {
            let name: String = rest
                .chars()
                .take_while(|c| c.is_alphanumeric() || *c == '_')
                .collect();
            out.push(name);
        }
    }
    out
}

#[test]
fn every_import_points_down_the_pipeline() {
    let mut bad = Vec::new();
    for (rel, text) in all_sources() {
        let Some(own) = stage_of(&rel) else { continue };
        for (n, line) in text.lines().enumerate() {
            for name in crate_refs(code(line)) {
                match STAGES.iter().position(|s| *s == name) {
                    Some(k) if k > own => bad.push(format!(
                        "src/{rel}:{}: stage `{}` uses the later stage `{name}`",
                        n + 1,
                        STAGES[own]
                    )),
                    _ => {}
                }
            }
        }
    }
    assert!(
        bad.is_empty(),
        "imports against the pipeline:\n{}",
        bad.join("\n")
    );
}

#[test]
fn the_crate_root_declares_exactly_the_stages() {
    let lib = std::fs::read_to_string(format!("{SRC}/lib.rs")).unwrap();
    let mut mods: Vec<&str> = lib
        .lines()
        .filter_map(|l| l.strip_prefix("pub mod "))
        .map(|l| l.trim_end_matches(';'))
        .collect();
    mods.sort_unstable();
    let mut stages = STAGES.to_vec();
    stages.sort_unstable();
    assert_eq!(
        mods, stages,
        "src/lib.rs modules and armsheet::STAGES differ"
    );
    for (rel, _) in all_sources() {
        if rel != "lib.rs" && rel != "main.rs" {
            assert!(stage_of(&rel).is_some(), "src/{rel} is in no stage");
        }
    }
}

#[test]
fn developers_guide_shows_the_stage_order() {
    let guide =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/DEVELOPERS.md")).unwrap();
    let line = STAGES.join(" → ");
    assert!(
        guide.contains(&line),
        "DEVELOPERS.md must show the stage order as `{line}`"
    );
}

#[test]
fn no_production_file_reads_test_files() {
    for (rel, text) in all_sources() {
        for (n, line) in text.lines().enumerate() {
            let c = code(line);
            let includes = c.contains("include_bytes!")
                || c.contains("include_str!")
                || c.contains("include!");
            assert!(
                !(includes && c.contains("tests/")),
                "src/{rel}:{}: production code includes a file from tests/",
                n + 1
            );
        }
    }
}

#[test]
fn every_module_opens_with_its_doc_paragraph() {
    for (rel, text) in all_sources() {
        assert!(
            text.trim_start().starts_with("//!"),
            "src/{rel} lacks its opening `//!` paragraph"
        );
    }
}

#[test]
fn only_the_cli_touches_files_clock_terminal_or_environment() {
    const FORBIDDEN: [&str; 9] = [
        "std::fs",
        "std::env",
        "std::time::SystemTime",
        "std::time::Instant",
        "std::io::stdout",
        "std::io::stderr",
        "println!",
        "eprintln!",
        "env::var",
    ];
    let cli = STAGES.iter().position(|s| *s == "cli").unwrap();
    for (rel, text) in all_sources() {
        let Some(stage) = stage_of(&rel) else {
            continue;
        };
        if stage == cli {
            continue;
        }
        let mut in_tests = false;
        for (n, line) in text.lines().enumerate() {
            if line.contains("#[cfg(test)]") {
                in_tests = true;
            }
            if in_tests {
                continue;
            }
            let c = code(line);
            for f in FORBIDDEN {
                assert!(
                    !c.contains(f),
                    "src/{rel}:{}: `{f}` outside the cli stage",
                    n + 1
                );
            }
        }
    }
}

/// Compute once: the engine, the rating and the rule families are entered only from
/// `checks::check`, so a command that renders a `Checked` never runs them again. The one other
/// caller is the rewind, which re-rates the old winding with a measured resistance. The
/// armature test is solved once by the command that prints it (`test`, and `sheet` for the
/// test sheets), never by a layout or a renderer.
#[test]
fn the_engine_rating_and_checks_are_entered_in_one_place() {
    const ENTRIES: [(&str, &[&str]); 6] = [
        ("trace_winding(", &["checks/mod.rs", "winding/mod.rs"]),
        ("rate(", &["checks/mod.rs", "rating/mod.rs"]),
        ("rate_with(", &["rating/mod.rs", "features/rewind/mod.rs"]),
        ("run_checks(", &["checks/mod.rs"]),
        ("armature_test(", &["features/armature_test/mod.rs", "cli/armature_test.rs"]),
        ("expected(", &["features/armature_test/mod.rs", "cli/sheet.rs"]),
    ];
    for (rel, text) in all_sources() {
        // A unit-test file (`mod tests;` under `#[cfg(test)]`) may drive the stages freely.
        let mut in_tests = rel.ends_with("/tests.rs");
        for (n, line) in text.lines().enumerate() {
            if line.contains("#[cfg(test)]") {
                in_tests = true;
            }
            let c = code(line);
            if in_tests || c.trim_start().starts_with("///") {
                continue;
            }
            for (entry, allowed) in ENTRIES {
                let called = c
                    .match_indices(entry)
                    .any(|(i, _)| !c[..i].ends_with(|ch: char| ch.is_alphanumeric() || ch == '_'));
                assert!(
                    !called || allowed.contains(&rel.as_str()),
                    "src/{rel}:{}: `{entry}…)` called outside {allowed:?}",
                    n + 1
                );
            }
        }
    }
}

#[test]
fn the_checker_sees_a_violation() {
    // The scanner itself: an upward import is found, a comment is not, grouped paths count.
    assert_eq!(crate_refs("use crate::render::number;"), ["render"]);
    assert_eq!(
        crate_refs("use crate::{design::Design, winding};"),
        ["design", "winding"]
    );
    assert!(crate_refs(code("let x = 1; // see crate::cli")).is_empty());
    assert_eq!(stage_of("winding/mod.rs"), Some(3));
    assert_eq!(stage_of("lib.rs"), None);
}
