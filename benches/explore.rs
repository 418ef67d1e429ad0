//! The designer's search (divan): candidates evaluated per second.
//!
//! `search_hoist_frame` runs the whole search on the demo frame (structures traced once,
//! candidates rated without tracing), counting the candidates it evaluates;
//! `rate_candidates` rates turns × conductor × strands on one traced structure over every
//! core (rayon), the search's inner loop alone. Target: at least 1,000,000 candidates a
//! second on 2 cores.
//!
//! Run: `cargo bench --bench explore`.

use armsheet::design::{Direction, Frame, WindingType, parse_frame};
use armsheet::features::explore::{Structure, conductors, explore, trace_structure};
use divan::counter::ItemsCount;
use rayon::prelude::*;

fn main() {
    divan::main();
}

fn frame() -> Frame {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/designs/frames/hoist-frame.toml"
    ))
    .unwrap();
    parse_frame(&text, "hoist-frame.toml").unwrap()
}

#[divan::bench(sample_count = 20)]
fn search_hoist_frame(bencher: divan::Bencher) {
    let f = frame();
    let n = explore(&f).evaluated;
    bencher
        .counter(ItemsCount::new(n as usize))
        .bench(|| explore(divan::black_box(&f)));
}

/// Turns 1 to this on every conductor of the frame.
const TURNS: u32 = 400;

#[divan::bench(sample_count = 20)]
fn rate_candidates(bencher: divan::Bencher) {
    let f = frame();
    let st = Structure {
        slots: 36,
        kind: WindingType::Lap,
        multiplicity: 1,
        direction: Direction::Progressive,
        coils_per_slot: 1,
        segments: 36,
        span: 8,
    };
    let conds: Vec<(armsheet::design::ConductorShape, f64)> = conductors(&f)
        .into_iter()
        .map(|c| (c, armsheet::rating::conductor::conductor_area_mm2(&c)))
        .collect();
    let t = trace_structure(&f, &st, conds[0].0).unwrap_or_else(|_| panic!("traced"));
    bencher
        .counter(ItemsCount::new(conds.len() * TURNS as usize))
        .bench(|| {
            conds
                .par_iter()
                .map(|&(_, area)| {
                    (1..=TURNS)
                        .map(|turns| u64::from(t.evaluate(turns, area).mask))
                        .sum::<u64>()
                })
                .sum::<u64>()
        });
}
