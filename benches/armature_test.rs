//! Armature-test benchmarks (divan): the expected readings of a 10,000-bar lap with an
//! equalizer on every bar; the expected readings of the largest designs armsheet accepts
//! (`benches/frog-leg-19000.toml`, `benches/lap-20000-equalized.toml`,
//! `benches/wave-18998.toml`) beside `check --json` of the same design, the yardstick of
//! issue 19 (all expected readings within 20 times it); and the fault locator ranking every
//! single-fault hypothesis on the largest demo (12 poles, 1,056 bars) against readings with
//! one open coil.
//!
//! Run: `cargo bench --bench armature_test`.

use armsheet::check;
use armsheet::design::parse_design;
use armsheet::features::armature_test::{Network, TestOptions, armature_test, expected};
use armsheet::winding::EqualizerPlan;

fn main() {
    divan::main();
}

const BIG_LAP: &str = "[armature]\npoles = 10\nslots = 2500\ncoils_per_slot = 4\n\n[winding]\ntype = \"lap\"\nspan = 250\nturns = 1\nlead_offset = 0\nequalizers = \"full\"\n";

#[divan::bench(sample_count = 10)]
fn expected_readings_10000_bar_lap_full_equalizers(b: divan::Bencher) {
    let c = check(parse_design(BIG_LAP, "big.toml").unwrap());
    assert_eq!(c.winding.active_coils, 10_000);
    b.bench(|| expected(&c.design, &c.winding, &TestOptions::default()));
}

/// The largest accepted designs, by file stem under `benches/`.
const LARGEST: [&str; 3] = ["frog-leg-19000", "lap-20000-equalized", "wave-18998"];

fn bench_design(name: &str) -> (String, String) {
    let path = format!("{}/benches/{name}.toml", env!("CARGO_MANIFEST_DIR"));
    (std::fs::read_to_string(&path).unwrap(), path)
}

/// Every expected reading (neighbouring and within-winding pairs, pattern, drop test and a
/// frog-leg's element pattern) of a checked design, as `armsheet test` computes them.
#[divan::bench(args = LARGEST, sample_count = 10)]
fn expected_readings_largest(b: divan::Bencher, name: &str) {
    let (text, path) = bench_design(name);
    let c = check(parse_design(&text, &path).unwrap());
    b.bench(|| expected(&c.design, &c.winding, &TestOptions::default()));
}

/// Parse, trace, check and write JSON to a sink, as `armsheet check --json` does after reading
/// the file: the yardstick for [`expected_readings_largest`] on the same design.
#[divan::bench(args = LARGEST, sample_count = 10)]
fn check_json_largest(b: divan::Bencher, name: &str) {
    let (text, path) = bench_design(name);
    b.bench(|| {
        let d = parse_design(divan::black_box(&text), &path).unwrap();
        armsheet::render::json::write_report_json(&check(d), std::io::sink()).unwrap()
    });
}

fn mill_readings() -> (armsheet::Checked, String) {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/designs/mill-lap-12p.toml"
    ))
    .unwrap();
    let c = check(parse_design(&text, "mill-lap-12p.toml").unwrap());
    let net = Network::of_winding(&c.winding);
    let ties = match &c.winding.equalizers {
        EqualizerPlan::Possible(e) => e.groups.clone(),
        _ => Vec::new(),
    };
    let mut coils = net.coils.clone();
    coils.remove(400);
    let faulty = Network::new(net.bars, coils, &ties);
    let pairs: Vec<(u32, u32)> = (1..=net.bars).map(|j| (j, j % net.bars + 1)).collect();
    let mut csv = String::from("from_bar,to_bar,reading\n");
    for ((a, b), v) in pairs.iter().zip(faulty.effective(&pairs)) {
        csv.push_str(&format!("{a},{b},{}\n", v.unwrap()));
    }
    (c, csv)
}

#[divan::bench(sample_count = 10)]
fn rank_every_single_fault_1056_bar_mill(b: divan::Bencher) {
    let (c, csv) = mill_readings();
    b.bench(|| armature_test(&c.design, &c.winding, &TestOptions::default(), Some(&csv)).unwrap());
}
