//! Sheet benchmarks (divan): the in-memory work of `armsheet sheet` (parse, trace, checks,
//! every SVG sheet, connections.csv, report.json) on lap designs of about 100 and 1,000
//! segments, and the same with the PDF.
//!
//! Run: `cargo bench --bench sheet`. Goal: under 100 ms for 1,000 segments without the PDF.

use armsheet::checks::run_checks;
use armsheet::design::parse_design;
use armsheet::layout::{Paper, Window};
use armsheet::render::csv::connections_csv;
use armsheet::render::json::report_json;
use armsheet::render::pdf::sheets_pdf;
use armsheet::render::sheet::{SheetInput, render_sheets};
use armsheet::winding::trace_winding;

fn main() {
    divan::main();
}

/// A simplex lap with u = 4 and about `segments` segments; 4 poles per 100 segments.
fn design_text(segments: u32) -> String {
    let slots = segments / 4;
    let poles = (segments / 25).clamp(4, 40) & !1;
    let poles = if slots.is_multiple_of(poles / 2) {
        poles
    } else {
        4
    };
    format!(
        "[job]\nid = \"BENCH\"\ndate = \"2026-01-01\"\n[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = 4\n[winding]\ntype = \"lap\"\nturns = 1\nequalizers = 2\n"
    )
}

/// Everything `armsheet sheet` computes before it writes files; returns the bytes.
fn sheet_bytes(text: &str, pdf: bool) -> usize {
    let d = parse_design(text, "bench.toml").unwrap();
    let w = trace_winding(&d);
    let findings = run_checks(&d, &w);
    let failures = findings
        .iter()
        .filter(|f| f.is_failure())
        .map(|f| f.id.clone())
        .collect();
    let input = SheetInput {
        design: &d,
        winding: &w,
        paper: Paper::A4,
        window: Window::Auto,
        failures,
        extra_rows: Vec::new(),
        version: "bench".into(),
    };
    let sheets = render_sheets(&input);
    let mut n: usize = sheets.iter().map(String::len).sum();
    n += connections_csv(&d, &w).len();
    n += report_json(&armsheet::check(d.clone())).len();
    if pdf {
        n += sheets_pdf(&sheets).unwrap().len();
    }
    n
}

#[divan::bench(args = [100, 1_000])]
fn sheet(bencher: divan::Bencher, segments: u32) {
    let text = design_text(segments);
    bencher.bench(|| sheet_bytes(divan::black_box(&text), false));
}

#[divan::bench(args = [100, 1_000], sample_count = 10)]
fn sheet_with_pdf(bencher: divan::Bencher, segments: u32) {
    let text = design_text(segments);
    bencher.bench(|| sheet_bytes(divan::black_box(&text), true));
}
