//! Tidy tests: the invariants of the house, checked mechanically over `src/`.
//!
//! - Every import points down the pipeline: a module in stage k uses only stages 0…k
//!   ([`armsheet::STAGES`] is the one list; DEVELOPERS.md shows the same order). The sources
//!   are read as Rust (`support::source`): whole `use` items and every `crate::` path.
//! - No feature (`src/features/NAME/`) imports another.
//! - No production file includes anything from `tests/`.
//! - Every source file opens with its `//!` paragraph.
//! - Only `cli` touches files, the clock, the terminal or the environment.

use armsheet::STAGES;

use crate::support::source::{self, CratePath, SRC, crate_paths, rust_files};

fn all_sources() -> Vec<(String, String)> {
    rust_files(SRC)
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

/// The feature a file belongs to: `rewind` for `features/rewind/…`.
fn feature_of(rel: &str) -> Option<&str> {
    let rest = rel.strip_prefix("features/")?;
    let (feature, _) = rest.split_once('/')?;
    Some(feature)
}

/// What is wrong with the imports of the file `rel` (under `src/`) with the text `text`:
/// a path into a later stage (a glob of the crate root counts as every stage), and from
/// inside a feature a path into another feature.
fn import_breaches(rel: &str, text: &str) -> Vec<String> {
    let Some(own) = stage_of(rel) else {
        return Vec::new();
    };
    let mut bad = Vec::new();
    for CratePath { line, path } in crate_paths(rel, text) {
        let Some(first) = path.first() else { continue };
        let stage = if first == "*" {
            Some(STAGES.len() - 1)
        } else {
            STAGES.iter().position(|s| s == first)
        };
        if let Some(k) = stage.filter(|&k| k > own) {
            bad.push(format!(
                "src/{rel}:{line}: stage `{}` uses the later stage `{}` (`crate::{}`)",
                STAGES[own],
                STAGES[k],
                path.join("::")
            ));
        }
        if let (Some(mine), ["features", other, ..]) = (
            feature_of(rel),
            path.iter()
                .map(String::as_str)
                .collect::<Vec<_>>()
                .as_slice(),
        ) && mine != *other
        {
            bad.push(format!(
                "src/{rel}:{line}: the feature `{mine}` uses the feature `{other}` (`crate::{}`)",
                path.join("::")
            ));
        }
    }
    bad
}

/// Imports point down the pipeline, read as Rust: every leaf of every `use` tree, multi-line
/// groups included, and every `crate::`/`super::` path in code and in macro calls; and no
/// feature imports another (a feature reads a `Checked`, never another feature's result).
#[test]
fn every_import_points_down_the_pipeline_and_no_feature_uses_another() {
    let mut bad = Vec::new();
    for (rel, text) in all_sources() {
        bad.extend(import_breaches(&rel, &text));
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
/// armature test is solved once by the command that prints it (`test`, `sheet` for the
/// test sheets, and `archive add` for the verdict it records), never by a layout or a renderer.
#[test]
fn the_engine_rating_and_checks_are_entered_in_one_place() {
    const ENTRIES: [(&str, &[&str]); 6] = [
        ("trace_winding(", &["checks/mod.rs", "winding/mod.rs"]),
        ("rate(", &["checks/mod.rs", "rating/mod.rs"]),
        ("rate_with(", &["rating/mod.rs", "features/rewind/mod.rs"]),
        ("run_checks(", &["checks/mod.rs"]),
        (
            "armature_test(",
            &[
                "features/armature_test/mod.rs",
                "cli/armature_test.rs",
                "cli/archive/mod.rs",
            ],
        ),
        (
            "expected(",
            &["features/armature_test/mod.rs", "cli/sheet.rs"],
        ),
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
fn the_import_guard_sees_a_planted_violation() {
    // A grouped import over several lines in the engine, naming two later stages.
    let planted = "//! x\nuse crate::{\n    cli::x,\n    render::y,\n};\n";
    assert_eq!(
        import_breaches("winding/brushes.rs", planted),
        [
            "src/winding/brushes.rs:3: stage `winding` uses the later stage `cli` (`crate::cli::x`)",
            "src/winding/brushes.rs:4: stage `winding` uses the later stage `render` (`crate::render::y`)",
        ]
    );
    // A nested group, a path in code, a path reached through `super`, a path inside a macro,
    // and a glob of the crate root.
    for (planted, breaches) in [
        ("use crate::{design::Design, layout::{Page, tree}};", 2),
        ("fn f() { crate::layout::sheet_pages(); }", 1),
        ("fn f() -> Option<crate::render::Text> { None }", 1),
        ("use super::super::super::render::svg;", 1),
        ("fn f() { let _ = format!(\"{}\", crate::cli::NAME); }", 1),
        ("use crate::*;", 1),
    ] {
        assert_eq!(
            import_breaches("winding/trace/deep.rs", planted).len(),
            breaches,
            "not caught: {planted}"
        );
    }
    // The same paths where they point down, and comments, are not breaches.
    for fine in [
        "use crate::{\n    design::Design,\n    theory::WindingType,\n};",
        "// use crate::cli::x;\n/// See [`crate::render`].\nfn f() {}",
        "use super::brushes;",
        "fn f() { let _ = format!(\"crate::cli\"); }",
    ] {
        assert!(
            import_breaches("winding/trace/deep.rs", fine).is_empty(),
            "caught: {fine}"
        );
    }
    assert_eq!(
        stage_of("winding/mod.rs"),
        STAGES.iter().position(|s| *s == "winding")
    );
    assert_eq!(stage_of("lib.rs"), None);
}

#[test]
fn the_feature_guard_sees_a_planted_violation() {
    // One feature naming another, grouped over lines, through `super`, and in code.
    for planted in [
        "use crate::features::{\n    identify::identify,\n};",
        "use super::super::identify::identify;",
        "fn f() { crate::features::armature_test::expected(); }",
    ] {
        let bad = import_breaches("features/rewind/design_toml.rs", planted);
        assert_eq!(bad.len(), 1, "not caught: {planted}");
        assert!(
            bad[0].contains("the feature `rewind` uses the feature"),
            "{bad:?}"
        );
    }
    // Its own room, the stages below, and the feature stage's root are fine.
    for fine in [
        "use crate::features::rewind::design_toml;",
        "use super::RewindRequest;",
        "use crate::checks::Checked;",
    ] {
        assert!(
            import_breaches("features/rewind/design_toml.rs", fine).is_empty(),
            "caught: {fine}"
        );
    }
    assert!(
        import_breaches(
            "features/mod.rs",
            "pub use crate::features::rewind::rewind;"
        )
        .is_empty()
    );
}

/// The most lines a function may take, from its `fn` line to its closing brace.
const MAX_FN_LINES: usize = 120;

/// Every function in `src/` longer than [`MAX_FN_LINES`], as `src/file:line: name (n lines)`.
fn long_functions(files: &[(String, String)]) -> Vec<String> {
    files
        .iter()
        .flat_map(|(rel, text)| {
            source::fn_lengths(rel, text)
                .into_iter()
                .filter(|f| f.lines > MAX_FN_LINES)
                .map(move |f| format!("src/{rel}:{}: {} ({} lines)", f.line, f.name, f.lines))
        })
        .collect()
}

/// Short functions: none in `src/` over 120 lines; a long one is split along its own comments.
#[test]
fn no_function_is_over_120_lines() {
    let long = long_functions(&source::rust_files(source::SRC));
    assert!(
        long.is_empty(),
        "functions over {MAX_FN_LINES} lines:\n{}",
        long.join("\n")
    );
}

#[test]
fn the_length_guard_sees_a_long_method_and_passes_a_short_one() {
    let body = "    let x = 1;\n".repeat(MAX_FN_LINES);
    let long = format!("//! doc\nstruct S;\nimpl S {{\n    fn long(&self) {{\n{body}    }}\n}}\n");
    let short = "//! doc\nfn short() {\n    let x = 1;\n}\n".to_string();
    let files = vec![
        ("planted/long.rs".to_string(), long),
        ("planted/short.rs".to_string(), short),
    ];
    assert_eq!(
        long_functions(&files),
        vec![format!(
            "src/planted/long.rs:4: long ({} lines)",
            MAX_FN_LINES + 2
        )]
    );
}
