//! The one drive function of the fuzz harness: a design file's text through the library calls
//! the CLI makes — parse, check, text and JSON reports, the CSV, a rewind whose new file is
//! parsed back and, for a share of the inputs, the armature test (its reports, and the fault
//! locator on readings made from the expected ones, spoilt at random) and the sheet layout
//! with its SVG and PDF writers.
//!
//! Shared by the stable driver (`tests/it/fuzz.rs`) and the cargo-fuzz target
//! (`fuzz/fuzz_targets/design.rs`, which includes this file and `mutate.rs` by path), so both
//! exercise exactly the same calls. `super::mutate` is the generator in either crate.
#![allow(dead_code)]

use armsheet::check;
use armsheet::checks::Checked;
use armsheet::design::{WindingType, parse_design};
use armsheet::features::armature_test::{
    ArmatureTest, TestOptions, armature_test, expected, readings_text,
};
use armsheet::features::rewind::{RewindRequest, rewind_rated};
use armsheet::layout::readings_plot::readings_plot_page;
use armsheet::layout::{Paper, SheetOptions, Window, sheet_pages};
use armsheet::render::armature_test::{readings_csv, render_test_text, test_json_string};
use armsheet::render::csv::{connections_csv, job_csv};
use armsheet::render::json::report_json;
use armsheet::render::pdf::sheets_pdf;
use armsheet::render::svg::page_svg;
use armsheet::render::text::{TextOptions, render_text};

use super::mutate::Rng;

/// How often the slower stages run: the sheets (layout and SVG) for every `sheets`-th parsed
/// input and the PDF for every `pdf`-th (0: never).
#[derive(Clone, Copy, Debug)]
pub struct Every {
    /// Lay out and write SVG sheets for every this many parsed inputs.
    pub sheets: u64,
    /// Also write the PDF for every this many parsed inputs.
    pub pdf: u64,
}

/// The most coil positions of an input driven through the sheets and the armature test.
pub const MAX_SHEET_COILS: usize = 1200;

/// What one input reached.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Reached {
    /// It parsed.
    pub parsed: bool,
    /// Its sheets were laid out and written as SVG.
    pub sheets: bool,
    /// Its sheets were written as PDF.
    pub pdf: bool,
}

/// Drives `text` through the pipeline. `parsed` counts the parsed inputs so far (this one
/// included once it parses) and chooses, with `every`, whether the sheets and the PDF run.
/// Choices the CLI would take from its arguments (text style, rewind request, paper, window)
/// come from `rng`. Any panic is the caller's to catch.
pub fn drive(text: &str, rng: &mut Rng, parsed: &mut u64, every: Every) -> Reached {
    let Ok(design) = parse_design(text, "fuzz.toml") else {
        return Reached::default();
    };
    *parsed += 1;
    let checked = check(design);
    let opts = TextOptions {
        unicode: rng.below(2) == 0,
        version: "fuzz",
    };
    let _ = render_text(&checked, opts);
    let _ = report_json(&checked);
    let _ = connections_csv(&checked.winding);
    let _ = job_csv(&checked.design);
    let volts = *rng.pick(&[0.5, 12.0, 110.0, 230.0, 460.0, 1e5, 1e-9, f64::NAN]);
    let req = RewindRequest {
        voltage: volts,
        speed_rpm: *rng.pick(&[None, Some(900.0), Some(1e-6), Some(1e7)]),
        kind: *rng.pick(&[
            None,
            Some(WindingType::Lap),
            Some(WindingType::Wave),
            Some(WindingType::FrogLeg),
        ]),
        multiplicity: *rng.pick(&[None, Some(1), Some(2), Some(0), Some(7)]),
        from_test: *rng.pick(&[None, Some((200.0, 1000.0)), Some((1e308, 1e-308))]),
        measured_r20: *rng.pick(&[None, Some(0.5), Some(-1.0)]),
        coils_per_slot: *rng.pick(&[None, None, Some(0), Some(1), Some(2), Some(u32::MAX)]),
    };
    let (d, w) = (&checked.design, &checked.winding);
    if let Ok(plan) = rewind_rated(d, w, checked.rating.as_ref(), &req) {
        let new = plan.design_file("fuzz.toml", "fuzz");
        if let Ok(back) = parse_design(&new, "new.toml") {
            let _ = report_json(&check(back));
        }
    }
    let mut reached = Reached {
        parsed: true,
        ..Reached::default()
    };
    let due = |n: u64| n > 0 && parsed.is_multiple_of(n);
    // The sheets carry the armature test, whose network solves grow as the square of the bars
    // in an unoptimised build: armatures above the largest demo's size are left to the
    // engine and the reports (a mutation can make one of 12,000 bars).
    let sheet_sized = checked.winding.connections.len() <= MAX_SHEET_COILS;
    if sheet_sized && (due(every.sheets) || due(every.pdf)) {
        let options = SheetOptions {
            paper: *rng.pick(&[Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid]),
            window: match rng.below(8) {
                0 => Window::Whole,
                1 => Window::PolePairs {
                    pairs: 1 + rng.below(3) as u32,
                    first_slot: *rng.pick(&[1, 2, 7, 97, 4000, u32::MAX]),
                },
                _ => Window::Auto,
            },
            version: "fuzz".to_string(),
        };
        let test = expected(&checked.design, &checked.winding, &TestOptions::default());
        drive_armature_test(&checked, &test, rng);
        // A whole view the paper cannot print is refused (a typed result the CLI reports).
        let Ok(pages) = sheet_pages(&checked, &test, &options) else {
            reached.sheets = true;
            return reached;
        };
        for page in &pages {
            let _ = page_svg(page);
        }
        reached.sheets = true;
        if due(every.pdf) {
            // A writer error is a typed result the CLI reports; only a panic is a finding.
            let _ = sheets_pdf(&pages);
            reached.pdf = true;
        }
    }
    reached
}

/// `armsheet test` on `checked`: the reports of the expected readings `test`, then the
/// readings CSV filled in from them, some readings spoilt (open, scaled, garbled, beyond any
/// meter: 2e9, 1e-300, a 300-digit number, `-0`, NaN, inf), written in a dialect drawn at
/// random (LF, CRLF, a byte-order mark, every field quoted, trailing blank lines, a byte that
/// is not UTF-8), taken as bytes through `readings_text` as the CLI does, read through the
/// locator under options the CLI takes, and its reports and plot.
pub fn drive_armature_test(checked: &Checked, test: &ArmatureTest, rng: &mut Rng) {
    let failures = checked.failures();
    let _ = render_test_text(test, "fuzz", &failures);
    let _ = test_json_string(test, &failures);
    let _ = page_svg(&readings_plot_page(test, "fuzz", &failures));
    let mut rows: Vec<[String; 3]> = vec![["from_bar", "to_bar", "reading"].map(String::from)];
    for line in readings_csv(test).lines().skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let expected = f.get(2).and_then(|v| v.parse::<f64>().ok()).unwrap_or(1.0);
        let measured = match rng.below(40) {
            0 => "open".to_string(),
            1 => format!("{}", expected * *rng.pick(&[0.0, 0.5, 2.0, -1.0, 1e300])),
            2 => "1.2.3".to_string(),
            3 => String::new(),
            4 => rng
                .pick(&["2e9", "1e-300", "-0", "NaN", "inf", "-inf", "1e999"])
                .to_string(),
            5 => "9".repeat(300),
            _ => format!("{expected}"),
        };
        let cell = |k: usize| f.get(k).copied().unwrap_or("").to_string();
        rows.push([cell(0), cell(1), measured]);
    }
    let dialect = rng.below(6);
    let eol = if dialect == 1 { "\r\n" } else { "\n" };
    let mut filled: Vec<u8> = Vec::new();
    if dialect == 2 {
        filled.extend_from_slice(b"\xef\xbb\xbf");
    }
    for row in &rows {
        let line = if dialect == 3 {
            row.iter()
                .map(|c| format!("\"{}\"", c.replace('"', "\"\"")))
                .collect::<Vec<_>>()
                .join(",")
        } else {
            row.join(",")
        };
        filled.extend_from_slice(line.as_bytes());
        filled.extend_from_slice(eol.as_bytes());
        if rng.below(200) == 0 {
            filled.extend_from_slice(eol.as_bytes());
        }
    }
    if dialect == 4 {
        filled.extend_from_slice(b"\n\r\n\n");
    }
    if dialect == 5 && !filled.is_empty() {
        let at = rng.below(filled.len());
        filled[at] = *rng.pick(&[0xff, 0xb5, 0xc3, 0x80]);
    }
    // The locator's ranking grows with the bars; the large demo's is left to its benchmark.
    if test.bars > 200 {
        return;
    }
    let options = TestOptions {
        current_a: *rng.pick(&[0.01, 10.0, 1000.0]),
        temperature_c: *rng.pick(&[-50.0, 20.0, 250.0]),
        tolerance: *rng.pick(&[1e-11, 0.02, 0.5, 1.0]),
    };
    let Ok(text) = readings_text(&filled) else {
        return;
    };
    if let Ok(t) = armature_test(&checked.design, &checked.winding, &options, Some(text)) {
        let _ = render_test_text(&t, "fuzz", &failures);
        let _ = test_json_string(&t, &failures);
        let _ = page_svg(&readings_plot_page(&t, "fuzz", &failures));
    }
}
