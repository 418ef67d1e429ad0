//! Engine benchmarks (divan): trace_winding on lap designs of about 100, 1,000 and 10,000
//! segments, to show the cost grows linearly; and `check --json` end to end on the largest demo
//! and on the 1,152-bar lap of `benches/lap-1152.toml` (the whole-process timing design).
//!
//! Run: `cargo bench --bench engine`.

use armsheet::checks::run_checks;
use armsheet::design::{Design, parse_design};
use armsheet::render::json::report_json;
use armsheet::winding::trace_winding;

fn main() {
    divan::main();
}

/// A 4-pole-per-100-segments lap design with `segments` coils (u = 4).
fn lap_design(segments: u32) -> Design {
    let slots = segments / 4;
    let poles = (segments / 88).clamp(4, 96) & !1;
    let text = format!(
        "[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = 4\n\n[winding]\ntype = \"lap\"\nturns = 1\nequalizers = 3\n"
    );
    parse_design(&text, "bench.toml").unwrap()
}

#[divan::bench(args = [100, 1_000, 10_000])]
fn engine(bencher: divan::Bencher, segments: u32) {
    let d = lap_design(segments);
    bencher.bench(|| trace_winding(divan::black_box(&d)));
}

#[divan::bench(args = [100, 1_000, 10_000])]
fn engine_and_checks(bencher: divan::Bencher, segments: u32) {
    let d = lap_design(segments);
    bencher.bench(|| {
        let w = trace_winding(divan::black_box(&d));
        run_checks(&d, &w, None)
    });
}

/// Parse, trace, check and render JSON for the largest demo (12 poles, 1,056 segments),
/// as `armsheet check --json` does after reading the file.
#[divan::bench]
fn check_json_largest_demo(bencher: divan::Bencher) {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/designs/mill-lap-12p.toml");
    let text = std::fs::read_to_string(path).unwrap();
    bencher.bench(|| {
        let d = parse_design(divan::black_box(&text), "designs/mill-lap-12p.toml").unwrap();
        report_json(&armsheet::check(d))
    });
}

/// Parse, trace, check and write JSON to a sink for the 1,152-bar lap (24 poles, 288 slots,
/// u = 4, span 11, 2 turns), the design the whole-process `check --json` timing uses.
#[divan::bench]
fn check_json_1152_bars(bencher: divan::Bencher) {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/benches/lap-1152.toml");
    let text = std::fs::read_to_string(path).unwrap();
    bencher.bench(|| {
        let d = parse_design(divan::black_box(&text), "benches/lap-1152.toml").unwrap();
        armsheet::render::json::write_report_json(&armsheet::check(d), std::io::sink()).unwrap()
    });
}
