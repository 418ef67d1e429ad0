//! The fuzz driver: structured mutations of the demo designs driven through the library calls
//! the CLI makes — parse, check, text and JSON reports, the CSV, and a rewind whose new file is
//! parsed back — on the stable toolchain, from a fixed seed, with the test profile's overflow
//! checks on. A panic anywhere fails the test and prints the input that caused it.
//!
//! `cargo test --test fuzz` runs the bounded CI count (`ARMSHEET_FUZZ_N`, default 20,000);
//! `ARMSHEET_FUZZ_N=1000000 ARMSHEET_FUZZ_SEED=7 cargo test --release --test fuzz` runs a long
//! one.

mod support;

use std::panic::{AssertUnwindSafe, catch_unwind};

use armsheet::check;
use armsheet::design::{WindingType, parse_design};
use armsheet::rating::{RewindRequest, rewind_rated};
use armsheet::render::csv::connections_csv;
use armsheet::render::json::report_json;
use armsheet::render::text::{TextOptions, render_text};
use support::mutate::{Rng, mutate};

fn env_u64(key: &str, default: u64) -> u64 {
    std::env::var(key)
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(default)
}

/// One input through the pipeline; returns whether it parsed.
fn drive(text: &str, rng: &mut Rng) -> bool {
    let Ok(design) = parse_design(text, "fuzz.toml") else {
        return false;
    };
    let checked = check(design);
    let opts = TextOptions {
        unicode: rng.below(2) == 0,
        version: "fuzz",
    };
    let _ = render_text(&checked, opts);
    let _ = report_json(&checked);
    let _ = connections_csv(&checked.design, &checked.winding);
    let volts = *rng.pick(&[0.5, 12.0, 110.0, 230.0, 460.0, 1e5, 1e-9, f64::NAN]);
    let req = RewindRequest {
        voltage: volts,
        speed_rpm: *rng.pick(&[None, Some(900.0), Some(1e-6), Some(1e7)]),
        kind: *rng.pick(&[None, Some(WindingType::Lap), Some(WindingType::Wave)]),
        multiplicity: *rng.pick(&[None, Some(1), Some(2), Some(0), Some(7)]),
        from_test: *rng.pick(&[None, Some((200.0, 1000.0)), Some((1e308, 1e-308))]),
        measured_r20: *rng.pick(&[None, Some(0.5), Some(-1.0)]),
    };
    let (d, w) = (&checked.design, &checked.winding);
    if let Ok(plan) = rewind_rated(d, w, checked.rating.as_ref(), &req) {
        let new = plan.design_file("fuzz.toml", "fuzz");
        if let Ok(back) = parse_design(&new, "new.toml") {
            let _ = report_json(&check(back));
        }
    }
    true
}

#[test]
fn mutated_designs_never_panic() {
    let n = env_u64("ARMSHEET_FUZZ_N", 20_000);
    let seed = env_u64("ARMSHEET_FUZZ_SEED", 1);
    // The small demos most of the time; the 1,056-bar one now and then.
    let small: Vec<String> = support::DEMOS[..4]
        .iter()
        .map(|d| support::demo(d))
        .collect();
    let large = support::demo(support::DEMOS[4]);
    let mut rng = Rng::new(seed);
    let mut parsed = 0u64;
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
        let outcome = catch_unwind(AssertUnwindSafe(|| drive(&text, &mut inner)));
        std::panic::set_hook(quiet);
        match outcome {
            Ok(ok) => parsed += u64::from(ok),
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
    eprintln!("fuzz: {n} inputs from seed {seed}, {parsed} parsed, none panicked");
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
