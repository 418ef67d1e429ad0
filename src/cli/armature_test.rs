//! `armsheet test`: the expected bar-to-bar and drop-test readings of a design.
//!
//! Part of the `cli` stage: it reads the design, checks it once, computes the armature test
//! once ([`armature_test`]) and renders that one result; with `-o DIR` it writes the report,
//! the JSON, the readings CSV and the plot into `DIR/<design-stem>/`, each file through a
//! temporary file and a rename, touching nothing else in the folder (a sheet set written there
//! by `sheet` stays as it is), under the folder's lock ([`super::lock`]). Exit codes are `check`'s, and 1 when measured readings are not
//! healthy.

use std::fmt::Write as _;
use std::path::PathBuf;

use clap::Args;

use super::Outcome;
use super::error::{CliError, shown};
use super::load::load_design;
use super::output::{print_stdout, write_own_files, write_stdout};
use super::sheet::stem;
use crate::features::armature_test::locator::DEFAULT_TOLERANCE;
use crate::features::armature_test::{
    DEFAULT_CURRENT_A, DEFAULT_TEMPERATURE_C, TestOptions, armature_test, readings_text,
};
use crate::layout::readings_plot::readings_plot_page;
use crate::render::armature_test::{
    readings_csv, render_test_text, test_json_string, write_test_json,
};
use crate::render::svg::page_svg;

/// Arguments of `test`.
#[derive(Debug, Args)]
pub struct TestArgs {
    /// The design file (TOML).
    pub design: PathBuf,
    /// Print one JSON object instead of the text report.
    #[arg(long)]
    pub json: bool,
    /// Drop-test current, A.
    #[arg(long, default_value_t = DEFAULT_CURRENT_A, value_name = "AMPS", value_parser = current, allow_negative_numbers = true)]
    pub current: f64,
    /// Winding temperature for the coil resistance, °C.
    #[arg(long, default_value_t = DEFAULT_TEMPERATURE_C, value_name = "C", value_parser = temperature, allow_negative_numbers = true)]
    pub temperature: f64,
    /// Measured readings (CSV: from_bar,to_bar,reading, or from_bar,to_bar,millivolts for the
    /// drop test; `open` or `OL` for an open circuit):
    /// compare them with the expected ones and rank the faults that explain them.
    #[arg(long, value_name = "FILE.csv")]
    pub readings: Option<PathBuf>,
    /// Healthy tolerance of the locator, % of each expected reading.
    #[arg(long, default_value_t = 100.0 * DEFAULT_TOLERANCE, value_name = "PCT", value_parser = tolerance, allow_negative_numbers = true)]
    pub tolerance: f64,
    /// Write test.txt, test.json, readings.csv and the plot readings.svg into
    /// DIR/<design-stem>/ instead.
    // The text is the `--help` line, kept as typed; not HTML.
    #[allow(rustdoc::invalid_html_tags)]
    #[arg(short = 'o', long = "out", value_name = "DIR")]
    pub out: Option<PathBuf>,
}

/// The drop test's current range, A: from a hand-held tester's 10 mA to the 1000 A of the
/// largest drop-test sets [from memory: the ranges of shop drop-test and low-resistance test
/// sets].
pub const CURRENT_RANGE_A: (f64, f64) = (0.01, 1000.0);

/// The winding temperatures taken, °C: from a cold store to above class H's 180 °C hot-spot
/// limit [derived from IEC 60085 thermal classes].
pub const TEMPERATURE_RANGE_C: (f64, f64) = (-50.0, 250.0);

/// `s` as a number within `lo..=hi` (`-0` is 0), else the message naming `what` and the range;
/// at most 24 characters of `s` are echoed.
fn within(s: &str, lo: f64, hi: f64, what: &str) -> Result<f64, String> {
    match s.trim().parse::<f64>() {
        Ok(x) if (lo..=hi).contains(&x) => Ok(x + 0.0),
        _ => Err(format!(
            "expected {what} from {lo} to {hi}, found \"{}\"",
            s.chars().take(24).collect::<String>()
        )),
    }
}

fn current(s: &str) -> Result<f64, String> {
    let (lo, hi) = CURRENT_RANGE_A;
    within(s, lo, hi, "a drop-test current in A")
}

fn temperature(s: &str) -> Result<f64, String> {
    let (lo, hi) = TEMPERATURE_RANGE_C;
    within(s, lo, hi, "a winding temperature in C")
}

/// A tolerance in %: above 0 and at most 100.
fn tolerance(s: &str) -> Result<f64, String> {
    match s.trim().parse::<f64>() {
        Ok(x) if x > 0.0 && x <= 100.0 => Ok(x),
        _ => Err(format!(
            "expected a tolerance in % above 0 and at most 100, found \"{}\"",
            s.chars().take(24).collect::<String>()
        )),
    }
}

pub(crate) const TEST_HELP: &str = concat!(
    "\
Solves the traced winding as a resistor network (each active coil one resistor between its
bars, dummy coils left out, equalizers ideal) and gives the expected reading between every
pair of neighbouring bars, the bars m apart within one winding for multiplex windings, and
the millivolts of the drop test. With [conductor] and a mean turn the readings are in ohms
(IEC 60028 copper at --temperature); without, in units of one coil's resistance.
readings.csv has an empty `measured` column for the shop to fill in; give it back with
--readings (header from_bar,to_bar,reading, or the CSV's own measured column, or
from_bar,to_bar,millivolts for the drop test at the feed bars and current listed; `open` or `OL`
for an open circuit; any consistent unit) and the locator ranks the single faults that
explain the readings (open coil, shorted coil, high-resistance joint of one lead, riser
joint at a bar, bar cut off, shorted bars, crossed leads). readings.svg plots the readings round the commutator.
With --readings the exit is 1 when the readings are not healthy (outside --tolerance of the
healthy pattern), so a shop script can tell; 0 when they are healthy and the design's checks
pass; 1 when check refuses the design, whatever the readings: every output (the report, the
JSON's not_for_winding, the plot) says so first, with the failed checks; 2 for a readings file or an option that cannot be taken (located, nothing written).
--current is taken from 0.01 to 1000 A, --temperature from -50 to 250 C, --tolerance above 0
and at most 100 %; a reading from 1e-9 to 1e9 in the file's unit, or 0.
-o DIR writes its four files one by one into DIR/<design-stem>/ and touches nothing else there
(a sheet set stays); it holds the folder's lock DIR/.<design-stem>.lock as `sheet` does, so a
second run into the folder waits up to 5 s, then exits 2 naming the run that holds it.
",
    super::error::exit_codes_help!()
);

/// Runs `test`.
pub fn test(a: &TestArgs) -> Result<Outcome, CliError> {
    let checked = load_design(&a.design)?;
    let options = TestOptions {
        current_a: a.current,
        temperature_c: a.temperature,
        tolerance: a.tolerance / 100.0,
    };
    let located = |error| CliError::Readings {
        path: a.readings.clone().unwrap_or_default(),
        error,
    };
    let bytes = match &a.readings {
        Some(p) => Some(std::fs::read(p).map_err(|source| CliError::ReadingsRead {
            path: p.clone(),
            source,
        })?),
        None => None,
    };
    let text = bytes
        .as_deref()
        .map(readings_text)
        .transpose()
        .map_err(located)?;
    let t = armature_test(&checked.design, &checked.winding, &options, text).map_err(located)?;
    let name = shown(&a.design);
    // A design `check` refuses is said to be refused in every output, whatever the readings.
    let failures = checked.failures();
    match &a.out {
        Some(out) => {
            let dir = out.join(stem(&a.design));
            let files = vec![
                (
                    "test.txt".to_string(),
                    render_test_text(&t, &name, &failures).into_bytes(),
                ),
                (
                    "test.json".to_string(),
                    test_json_string(&t, &failures).into_bytes(),
                ),
                ("readings.csv".to_string(), readings_csv(&t).into_bytes()),
                (
                    "readings.svg".to_string(),
                    page_svg(&readings_plot_page(&t, &name, &failures)).into_bytes(),
                ),
            ];
            write_own_files(&dir, &files, "test -o")?;
            let mut said = String::new();
            for (n, _) in &files {
                let _ = writeln!(said, "wrote {}", shown(&dir.join(n)));
            }
            print_stdout(&said)?;
        }
        None if a.json => write_stdout(|o| write_test_json(&t, &failures, o))?,
        None => print_stdout(&render_test_text(&t, &name, &failures))?,
    }
    let unhealthy = t.location.as_ref().is_some_and(|l| !l.healthy);
    Ok(if unhealthy {
        Outcome::ChecksFail
    } else {
        Outcome::of(&checked.findings)
    })
}
