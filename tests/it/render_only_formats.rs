//! The renderers only format, every file in `src/render/`: they take what was computed (a
//! `Checked`, a feature's result, a page tree) and never call the engine, the rating, the
//! checks or a feature's compute function, never measure, fit, wrap or place anything (that is
//! `layout`), nor read the environment. The page-tree walkers (SVG and PDF) read no design and
//! no winding either. Read as Rust with `syn`: calls in code and in macro arguments, outside
//! unit tests. A tidy test in the manner of an architecture invariant: a rule kept in a test
//! holds.

use crate::support::source::{SRC, calls, crate_paths, rust_files};

/// Calls that compute: the engine, the rating, the checks and the features' entry points.
const COMPUTE: [&str; 18] = [
    "trace_winding",
    "rate",
    "rate_with",
    "run_checks",
    "findings_of",
    "check",
    "is_symmetric",
    "connect",
    "path_classes",
    "armature_test",
    "expected",
    "locate",
    "identify",
    "rewind",
    "rewind_rated",
    "layout_developed",
    "sheet_pages",
    "draw_page",
];

/// Calls that measure, fit, wrap or place (the layout's work), and the environment.
const MEASURE_OR_ENV: [&str; 10] = [
    "text_width",
    "wrap_text",
    "fit_size",
    "cut_to_width",
    "ink_extent",
    "paginate",
    "paginate_rows",
    "readings_plot_page",
    "env!",
    "option_env!",
];

/// The writers that only walk a page tree: they read no design and no winding.
const PAGE_WALKERS: [&str; 3] = ["svg.rs", "svg_writer.rs", "pdf.rs"];

/// What the render file `rel` (under `src/render/`) with the text `text` does that a
/// renderer may not.
fn render_breaches(rel: &str, text: &str) -> Vec<String> {
    let mut bad = Vec::new();
    let path = format!("render/{rel}");
    for c in calls(&path, text) {
        if COMPUTE.contains(&c.name.as_str()) || MEASURE_OR_ENV.contains(&c.name.as_str()) {
            bad.push(format!("src/{path}:{}: calls `{}`", c.line, c.name));
        }
    }
    if PAGE_WALKERS.contains(&rel) {
        for p in crate_paths(&path, text) {
            if matches!(
                p.path.first().map(String::as_str),
                Some("design" | "winding")
            ) {
                bad.push(format!(
                    "src/{path}:{}: a page-tree walker names `crate::{}`",
                    p.line,
                    p.path.join("::")
                ));
            }
        }
    }
    // `std::env` in code before the unit tests (`crate_paths` follows only crate paths).
    let code = text.split("#[cfg(test)]").next().unwrap_or_default();
    for (n, line) in code.lines().enumerate() {
        if line
            .split("//")
            .next()
            .unwrap_or_default()
            .contains("std::env")
        {
            bad.push(format!("src/{path}:{}: reads `std::env`", n + 1));
        }
    }
    bad
}

#[test]
fn renderers_never_compute_measure_or_place() {
    let files = rust_files(&format!("{SRC}/render"));
    assert!(files.len() >= 13, "src/render/ holds {} files", files.len());
    let mut bad = Vec::new();
    for (rel, text) in &files {
        // Unit tests may build their input through the pipeline: a file of its own
        // (`tests.rs`) or a `#[cfg(test)]` module, which `calls` leaves out.
        if rel.ends_with("tests.rs") {
            continue;
        }
        bad.extend(render_breaches(rel, text));
    }
    assert!(
        bad.is_empty(),
        "renderers that compute:\n{}",
        bad.join("\n")
    );
}

#[test]
fn the_render_guard_sees_a_planted_violation() {
    for (file, planted) in [
        ("text.rs", "fn f(d: &Design) { let w = trace_winding(d); }"),
        (
            "rating_text.rs",
            "fn f(d: &D) { let r = crate::rating::rate(d, w); }",
        ),
        (
            "identify.rs",
            "fn f(c: &Card) -> String { format!(\"{:?}\", identify(c)) }",
        ),
        (
            "rewind_text.rs",
            "fn f() { let p = rewind_rated(&d, &w, &r); }",
        ),
        (
            "armature_test.rs",
            "fn f() { let t = armature_test::expected(&d, &w); }",
        ),
        ("svg.rs", "fn f(t: &Text) -> f64 { t.text_width(12.0) }"),
        (
            "json.rs",
            "fn f() -> String { std::env::var(\"X\").unwrap() }",
        ),
        ("pdf.rs", "use crate::winding::Winding;"),
        (
            "csv.rs",
            "impl X {\n    fn f(&self) {\n        let c = check(\n            d,\n        );\n    }\n}",
        ),
    ] {
        let bad = render_breaches(file, planted);
        assert!(!bad.is_empty(), "not caught in {file}: {planted}");
    }
    // Reading a computed value, a field named like an entry point, and a unit test are fine.
    for fine in [
        "fn f(t: &ArmatureTest) -> f64 { t.expected_ohm + t.readings[0].expected.unwrap() }",
        "#[cfg(test)]\nmod tests {\n    fn f() { let c = crate::check(d); }\n}",
        "// trace_winding(d) is called once, by checks::check\nfn f() {}",
    ] {
        assert!(
            render_breaches("text.rs", fine).is_empty(),
            "caught: {fine}"
        );
    }
}
