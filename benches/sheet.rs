//! Sheet benchmarks (divan): the in-memory work of `armsheet sheet` (parse, check, lay out
//! every page, write every SVG sheet, connections.csv, report.json) on lap designs of about
//! 100 and 1,000 segments and on the 12-pole mill demo, each with and without the PDF.
//!
//! Run: `cargo bench --bench sheet`. Goals: under 100 ms for 1,000 segments without the PDF;
//! the PDF at most doubling the time of the SVG sheets (`sheet --pdf` within 3× of `sheet`).

use armsheet::design::parse_design;
use armsheet::features::armature_test::{TestOptions, expected};
use armsheet::layout::{Paper, SheetOptions, Window, sheet_pages};
use armsheet::render::csv::connections_csv;
use armsheet::render::json::report_json;
use armsheet::render::pdf::sheets_pdf;
use armsheet::render::svg::page_svg;

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

/// The mill demo (12 poles, 1,056 segments, equalizers, a rating).
const MILL: &str = include_str!("../designs/mill-lap-12p.toml");

/// Everything `armsheet sheet` computes before it writes files; returns the bytes.
fn sheet_bytes(text: &str, pdf: bool) -> usize {
    let d = parse_design(text, "bench.toml").unwrap();
    let checked = armsheet::check(d);
    let options = SheetOptions {
        paper: Paper::A4,
        window: Window::Auto,
        version: "bench".into(),
    };
    let pages = sheet_pages(
        &checked,
        &expected(&checked.design, &checked.winding, &TestOptions::default()),
        &options,
    )
    .expect("the automatic window is always printed");
    let mut n: usize = pages.iter().map(|p| page_svg(p).len()).sum();
    n += connections_csv(&checked.winding).len();
    n += report_json(&checked).len();
    if pdf {
        n += sheets_pdf(&pages).unwrap().len();
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

#[divan::bench(sample_count = 10)]
fn mill_sheet(bencher: divan::Bencher) {
    bencher.bench(|| sheet_bytes(divan::black_box(MILL), false));
}

#[divan::bench(sample_count = 10)]
fn mill_sheet_with_pdf(bencher: divan::Bencher) {
    bencher.bench(|| sheet_bytes(divan::black_box(MILL), true));
}

/// The PDF writer alone, on the mill demo's laid-out pages.
#[divan::bench(sample_count = 10)]
fn mill_pdf_only(bencher: divan::Bencher) {
    let checked = armsheet::check(parse_design(MILL, "mill.toml").unwrap());
    let options = SheetOptions {
        paper: Paper::A4,
        window: Window::Auto,
        version: "bench".into(),
    };
    let pages = sheet_pages(
        &checked,
        &expected(&checked.design, &checked.winding, &TestOptions::default()),
        &options,
    )
    .expect("the automatic window is always printed");
    bencher.bench(|| sheets_pdf(divan::black_box(&pages)).unwrap().len());
}
