//! Rating benchmarks (divan): what the rating stage adds to `check` on the largest demo
//! (12 poles, 1,056 segments, with [rating], [conductor], [core], [commutator], [limits]).
//!
//! `check_*_with_rating` runs the pipeline as `armsheet check` does after reading the file;
//! `check_*_without_rating` runs it on the same design with the rating inputs removed, so the
//! rating stage returns at once. The difference is the rating module's cost. `rate_only` and
//! `rewind_only` time the pure functions alone; `reactance_voltage_1000` times the reactance
//! voltage as the search calls it.
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

/// The reactance voltage alone, as the search calls it once a candidate: 1,000 calls on inputs
/// that differ in their turns, so nothing is hoisted.
#[divan::bench]
fn reactance_voltage_1000(bencher: divan::Bencher) {
    use armsheet::rating::reactance::{ReactanceInputs, average_reactance_voltage};
    let base = ReactanceInputs {
        turns_per_coil: 1.0,
        coils_per_slot: 3.0,
        core_length_mm: 160.0,
        overhang_mm: 165.0,
        slot_permeance: 4.0 / 3.0,
        tooth_tip_permeance: 0.5,
        overhang_permeance: 0.6,
        path_current_a: 21.25,
        brush_width_segments: 1.5,
        segment_pitch_mm: 13.09,
        mica_mm: 0.8,
        multiplicity: 1.0,
        commutator_speed_m_s: 9.03,
    };
    bencher.bench(|| {
        let mut sum = 0.0;
        for t in 1..=1000u32 {
            let x = ReactanceInputs {
                turns_per_coil: f64::from(t),
                ..divan::black_box(base)
            };
            sum += average_reactance_voltage(&x).unwrap_or(0.0);
        }
        sum
    });
}
