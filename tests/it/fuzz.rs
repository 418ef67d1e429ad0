//! The fuzz driver: structured mutations of the demo designs driven through the library calls
//! the CLI makes — parse, check, text and JSON reports, the CSVs, a rewind whose new file is
//! parsed back, and for every 20th parsed input the sheet layout with its SVG (every 200th also
//! the PDF) — on the stable toolchain, from a fixed seed, with the test profile's overflow
//! checks on. A panic anywhere fails the test and prints the input that caused it. The calls
//! are `support::fuzz_drive::drive`, shared with the cargo-fuzz target in `fuzz/`.
//!
//! `cargo test` runs 2,000 inputs; with `ARMSHEET_SLOW_TESTS=1` (set by `.ci/run`) it runs
//! the CI count, 20,000. `ARMSHEET_FUZZ_N` sets the count outright:
//! `ARMSHEET_FUZZ_N=1000000 ARMSHEET_FUZZ_SEED=7 cargo test --release --test it fuzz` runs a
//! long one.

use crate::support;

use std::panic::{AssertUnwindSafe, catch_unwind};

use crate::support::fuzz_drive::{Every, drive};
use crate::support::mutate::{Rng, mutate};

fn env_u64(key: &str, default: u64) -> u64 {
    std::env::var(key)
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(default)
}

/// The sheets (layout and SVG) for every 20th parsed input, the PDF for every 200th
/// (`ARMSHEET_FUZZ_SHEETS`, `ARMSHEET_FUZZ_PDF`; 0 never).
fn every() -> Every {
    Every {
        sheets: env_u64("ARMSHEET_FUZZ_SHEETS", 20),
        pdf: env_u64("ARMSHEET_FUZZ_PDF", 200),
    }
}

/// The inputs of a run: `ARMSHEET_FUZZ_N`, else 20,000 with `ARMSHEET_SLOW_TESTS` set (CI),
/// else 2,000.
fn inputs() -> u64 {
    let slow = std::env::var_os("ARMSHEET_SLOW_TESTS").is_some_and(|v| !v.is_empty() && v != "0");
    env_u64("ARMSHEET_FUZZ_N", if slow { 20_000 } else { 2_000 })
}

#[test]
fn mutated_designs_never_panic() {
    let n = inputs();
    let seed = env_u64("ARMSHEET_FUZZ_SEED", 1);
    // The small demos (the frog-leg one among them) most of the time; the 1,056-bar one now
    // and then.
    let large_name = "mill-lap-12p";
    let small: Vec<String> = support::DEMOS
        .iter()
        .filter(|&&d| d != large_name)
        .map(|d| support::demo(d))
        .collect();
    let large = support::demo(large_name);
    let every = every();
    let mut rng = Rng::new(seed);
    let (mut parsed, mut sheets, mut pdfs) = (0u64, 0u64, 0u64);
    for i in 0..n {
        let base = if i % 64 == 63 {
            &large
        } else {
            &small[rng.below(small.len())]
        };
        let text = mutate(base, &mut rng);
        let mut inner = Rng::new(rng.next());
        let quiet = std::panic::take_hook();
        std::panic::set_hook(Box::new(|_| {}));
        let outcome = catch_unwind(AssertUnwindSafe(|| {
            drive(&text, &mut inner, &mut parsed, every)
        }));
        std::panic::set_hook(quiet);
        match outcome {
            Ok(r) => {
                sheets += u64::from(r.sheets);
                pdfs += u64::from(r.pdf);
            }
            Err(e) => {
                let why = e
                    .downcast_ref::<String>()
                    .cloned()
                    .or_else(|| e.downcast_ref::<&str>().map(|s| s.to_string()))
                    .unwrap_or_default();
                panic!("input {i} (seed {seed}) panicked: {why}\n---\n{text}---");
            }
        }
    }
    // The mutations must leave a good share of designs valid, or the driver tests only the parser.
    assert!(
        parsed * 10 >= n,
        "only {parsed} of {n} mutated designs parsed"
    );
    assert!(
        every.sheets == 0 || parsed < every.sheets || sheets >= 1,
        "no input reached the sheets"
    );
    eprintln!(
        "fuzz: {n} inputs from seed {seed}, {parsed} parsed, {sheets} laid out as SVG sheets, {pdfs} as PDF, none panicked"
    );
}

#[test]
fn the_mutator_is_deterministic_and_mutates() {
    let base = support::demo("hoist-lap");
    let a: Vec<String> = {
        let mut r = Rng::new(9);
        (0..50).map(|_| mutate(&base, &mut r)).collect()
    };
    let b: Vec<String> = {
        let mut r = Rng::new(9);
        (0..50).map(|_| mutate(&base, &mut r)).collect()
    };
    assert_eq!(a, b);
    assert!(a.iter().filter(|t| **t != base).count() > 40);
}

#[test]
fn readings_in_every_dialect_never_panic() {
    // The armature test's half of the driver on every small demo, 60 readings files each:
    // every dialect (LF, CRLF, byte-order mark, quoted, trailing blank lines, not UTF-8) and
    // the numbers beyond any meter come up, and nothing panics.
    use crate::support::fuzz_drive::drive_armature_test;
    use armsheet::features::armature_test::{TestOptions, expected};
    let mut rng = Rng::new(11);
    for name in support::DEMOS.iter().filter(|&&d| d != "mill-lap-12p") {
        let checked = armsheet::check(support::design(&support::demo(name)));
        let test = expected(&checked.design, &checked.winding, &TestOptions::default());
        for _ in 0..60 {
            drive_armature_test(&checked, &test, &mut rng);
        }
    }
}
