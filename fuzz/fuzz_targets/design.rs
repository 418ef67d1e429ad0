//! libFuzzer target: arbitrary bytes as a design file, through the same drive function as the
//! stable driver (`tests/it/fuzz.rs`): parse, check, text, JSON, CSV, rewind with parse-back, the
//! sheets with SVG for every input and the PDF for one in 16.
//!
//! Run with `cargo +nightly fuzz run design` from the repository root (cargo-fuzz). The
//! choices the CLI takes from its arguments come from a hash of the input, so a crash found
//! here reproduces from its input alone.
#![no_main]

// Only its generator is used here; the mutations are the stable driver's.
#[allow(dead_code)]
#[path = "../../tests/it/support/mutate.rs"]
mod mutate;

#[path = "../../tests/it/support/fuzz_drive.rs"]
mod fuzz_drive;

use fuzz_drive::{Every, drive};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    // Bytes that are not UTF-8 get the design stage's own error; the rest are driven whole.
    let _ = armsheet::design::parse_design_bytes(data, "fuzz.toml");
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    // FNV-1a of the input seeds the choices and picks the inputs that also get a PDF.
    let seed = data.iter().fold(0xcbf2_9ce4_8422_2325_u64, |h, &b| {
        (h ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3)
    });
    let mut rng = mutate::Rng::new(seed);
    let mut parsed = seed % 16;
    drive(text, &mut rng, &mut parsed, Every { sheets: 1, pdf: 16 });
});
