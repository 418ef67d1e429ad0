//! Rating benchmarks (divan): what the rating stage adds to `check` on the largest demo
//! (12 poles, 1,056 segments, with [rating], [conductor], [core], [commutator], [limits]).
//!
//! `check_*_with_rating` runs the pipeline as `armsheet check` does after reading the file;
//! `check_*_without_rating` runs it on the same design with the rating inputs removed, so the
//! rating stage returns at once. The difference is the rating module's cost. `rate_only` and
//! `rewind_only` time the pure functions alone.
//!
//! Run: `cargo bench --bench rating`.

use armsheet::design::{Design, parse_design};
use armsheet::features::rewind::{RewindRequest, rewind};
use armsheet::rating::rate;
use armsheet::render::json::report_json;
use armsheet::render::text::{TextOptions, render_text};
use armsheet::winding::trace_winding;

fn main() {
    divan::main();
}

const NAME: &str = "designs/mill-lap-12p.toml";

fn text() -> String {
    std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/designs/mill-lap-12p.toml"
    ))
    .unwrap()
}

fn strip(mut d: Design) -> Design {
    d.rating = None;
    d.conductor = None;
    d.core = None;
    d.commutator = None;
    d
}

fn check_text(d: &Design) -> String {
    render_text(&armsheet::check(d.clone()), TextOptions::default())
}

fn check_json(d: &Design) -> String {
    report_json(&armsheet::check(d.clone()))
}

#[divan::bench]
fn check_text_with_rating(bencher: divan::Bencher) {
    let t = text();
    bencher.bench(|| check_text(&parse_design(divan::black_box(&t), NAME).unwrap()));
}

#[divan::bench]
fn check_text_without_rating(bencher: divan::Bencher) {
    let t = text();
    bencher.bench(|| check_text(&strip(parse_design(divan::black_box(&t), NAME).unwrap())));
}

#[divan::bench]
fn check_json_with_rating(bencher: divan::Bencher) {
    let t = text();
    bencher.bench(|| check_json(&parse_design(divan::black_box(&t), NAME).unwrap()));
}

#[divan::bench]
fn check_json_without_rating(bencher: divan::Bencher) {
    let t = text();
    bencher.bench(|| check_json(&strip(parse_design(divan::black_box(&t), NAME).unwrap())));
}

#[divan::bench]
fn rate_only(bencher: divan::Bencher) {
    let d = parse_design(&text(), NAME).unwrap();
    let w = trace_winding(&d);
    bencher.bench(|| rate(divan::black_box(&d), &w));
}

#[divan::bench]
fn rewind_only(bencher: divan::Bencher) {
    let d = parse_design(&text(), NAME).unwrap();
    let w = trace_winding(&d);
    let req = RewindRequest {
        voltage: 600.0,
        ..RewindRequest::default()
    };
    bencher.bench(|| rewind(divan::black_box(&d), &w, &req).unwrap());
}

#[divan::bench]
fn rating_findings_only(bencher: divan::Bencher) {
    let d = parse_design(&text(), NAME).unwrap();
    let r = rate(&d, &trace_winding(&d)).unwrap();
    bencher.bench(|| armsheet::rating::findings_of(divan::black_box(&r)));
}

#[divan::bench]
fn rating_text_section_only(bencher: divan::Bencher) {
    let d = parse_design(&text(), NAME).unwrap();
    let w = trace_winding(&d);
    let r = rate(&d, &w);
    bencher.bench(|| {
        let mut s = String::new();
        armsheet::render::rating_text::rating_section(&mut s, divan::black_box(&d), r.as_ref());
        s
    });
}

#[divan::bench]
fn rating_json_value_only(bencher: divan::Bencher) {
    let d = parse_design(&text(), NAME).unwrap();
    let w = trace_winding(&d);
    let r = rate(&d, &w);
    let r = r.unwrap();
    bencher.bench(|| {
        let mut out = Vec::new();
        armsheet::render::rating_json::write_rating_json(divan::black_box(&r), &mut out).unwrap();
        out
    });
}
