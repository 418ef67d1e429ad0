//! `armsheet rewind`: works out a new winding for a new voltage, speed or connection, and
//! writes it as a new design file; or back-solves the flux from a no-load test.
//!
//! Part of the `cli` stage: reads the design, calls the pure [`crate::rating::rewind()`],
//! parses the new file back with armsheet's own parser before writing, and writes it with
//! [`super::output::write_new`] (or [`super::output::write_atomic`] with `--force`). A refused
//! request is a [`CliError::Rewind`], worded with the flags in [`super::error::rewind_message`].

use std::path::{Path, PathBuf};

use clap::{Args, ValueEnum};

use super::Outcome;
use super::error::{CliError, NoOverwrite};
use super::load::load_design;
use super::output::{print_stdout, write_atomic, write_new};
use crate::design::{WindingType, parse_design};
use crate::rating::{self, RewindRequest, design_toml, rewind::no_load_test};
use crate::render::rewind_text::{no_load_header, render_no_load, render_rewind};

/// Help shown after `armsheet rewind --help`.
pub const REWIND_HELP: &str = "\
Keeps the flux per pole and the slot space. The new turns per coil come from the ratio of the
EMFs and the new connection's paths and segments, rounded to whole turns (the speed error is
reported); the conductor keeps the current density (nearest AWG and metric R20 sizes, up to 4
in hand). The flux comes from the design (flux_per_pole_mwb, or voltage and speed_rpm in
[rating]) or from a no-load test: --from-test V0 N0 (open-circuit volts at rpm).
The new file is parsed back before it is written; an existing file is kept unless --force.
Without -o the file is written beside the design as NAME-<V>V.toml.
Exit codes: 0 written, 2 bad input, an impossible request or output that could not be written.";

/// `--type`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum TypeArg {
    /// Lap: a = m·P.
    Lap,
    /// Wave: a = 2m.
    Wave,
}

/// Arguments of `rewind`.
#[derive(Debug, Args)]
#[command(group(clap::ArgGroup::new("what").required(true).multiple(true).args(["voltage", "from_test"])))]
pub struct RewindArgs {
    /// The design file (TOML) of the machine as it is.
    pub design: PathBuf,
    /// New terminal voltage, V.
    #[arg(long, value_name = "V")]
    pub voltage: Option<f64>,
    /// New speed, rpm (default: the design's speed).
    #[arg(long, value_name = "N")]
    pub speed: Option<f64>,
    /// New connection (default: the design's).
    #[arg(long = "type", value_enum, value_name = "lap|wave")]
    pub kind: Option<TypeArg>,
    /// New multiplicity, 1 to 6 (default: the design's).
    #[arg(long, value_name = "m")]
    pub multiplicity: Option<u32>,
    /// Measured no-load (open-circuit) voltage and speed of the old machine: back-solves the flux.
    #[arg(long, num_args = 2, value_names = ["V0", "N0"])]
    pub from_test: Option<Vec<f64>>,
    /// Measured armature resistance, ohm, taken as at 20 C (replaces the calculated value).
    #[arg(long, value_name = "OHMS")]
    pub ra: Option<f64>,
    /// Where to write the new design.
    #[arg(short = 'o', long = "output", value_name = "NEW.toml")]
    pub output: Option<PathBuf>,
    /// Overwrite the output file if it exists.
    #[arg(long)]
    pub force: bool,
}

/// Runs `rewind`: prints the report, writes the new design.
pub fn rewind(a: &RewindArgs) -> Result<Outcome, CliError> {
    let checked = load_design(&a.design)?;
    let (d, w) = (&checked.design, &checked.winding);
    let name = a.design.display().to_string();
    let asked = asked_line(a);
    let refuse = |error| CliError::Rewind {
        design: name.clone(),
        error,
    };
    let from_test = a.from_test.as_ref().map(|v| (v[0], v[1]));

    let Some(voltage) = a.voltage else {
        // --from-test alone: report the flux, and record it if asked to.
        let (v0, n0) = from_test.unwrap_or((0.0, 0.0));
        let test = no_load_test(d, w, v0, n0, a.ra).map_err(refuse)?;
        let s = render_no_load(&test, &name, env!("CARGO_PKG_VERSION"));
        let shown = print_stdout(&s);
        return match &a.output {
            None => shown.map(|()| Outcome::Passed),
            Some(out) => {
                let header = no_load_header(&test, &name, &asked);
                let text = design_toml::write_design(&test.design, &header);
                write_checked(out, &text, a.force, shown)
            }
        };
    };

    let req = RewindRequest {
        voltage,
        speed_rpm: a.speed,
        kind: a.kind.map(|k| match k {
            TypeArg::Lap => WindingType::Lap,
            TypeArg::Wave => WindingType::Wave,
        }),
        multiplicity: a.multiplicity,
        from_test,
        measured_r20: a.ra,
    };
    let plan = rating::rewind_rated(d, w, checked.rating.as_ref(), &req).map_err(refuse)?;
    let out = a
        .output
        .clone()
        .unwrap_or_else(|| default_output(&a.design, voltage));
    let text = plan.design_file(&name, &asked);
    // Parse the new file back with armsheet's own parser before anything is written.
    let out_name = out.display().to_string();
    let back = parse_design(&text, &out_name).map_err(|diagnostic| CliError::RewindParseBack {
        design: name.clone(),
        diagnostic: Box::new(diagnostic),
    })?;
    let new = crate::checks::check(back);
    let report = render_rewind(
        &plan,
        &name,
        &asked,
        new.rating.as_ref(),
        env!("CARGO_PKG_VERSION"),
    );
    let shown = print_stdout(&report);
    write_checked(&out, &text, a.force, shown)
}

/// Writes the new design (replacing an existing file only with `--force`) and says so.
/// `shown` is how printing the report went: a closed standard output does not stop the file
/// from being written (an error writing the file is reported first).
fn write_checked(
    out: &Path,
    text: &str,
    force: bool,
    shown: Result<(), CliError>,
) -> Result<Outcome, CliError> {
    let result = if force {
        write_atomic(out, text.as_bytes())
    } else {
        write_new(out, text.as_bytes())
    };
    result.map_err(|e| {
        if e.kind() == std::io::ErrorKind::AlreadyExists {
            CliError::Exists {
                path: out.to_path_buf(),
                by: NoOverwrite::Rewind,
            }
        } else {
            CliError::write(out, e)
        }
    })?;
    shown?;
    print_stdout(&format!("wrote {}\n", out.display()))?;
    Ok(Outcome::Passed)
}

/// `designs/hoist.toml` at 220 V → `designs/hoist-220V.toml`.
fn default_output(design: &Path, volts: f64) -> PathBuf {
    let stem = design.file_stem().map_or_else(
        || "design".to_string(),
        |s| s.to_string_lossy().into_owned(),
    );
    let v = design_toml::num(volts, 2).replace('.', "_");
    design.with_file_name(format!("{stem}-{v}V.toml"))
}

/// The request as a command line, for the header and the report.
fn asked_line(a: &RewindArgs) -> String {
    let mut s = format!("armsheet rewind {}", a.design.display());
    if let Some(v) = a.voltage {
        s.push_str(&format!(" --voltage {}", design_toml::num(v, 3)));
    }
    if let Some(n) = a.speed {
        s.push_str(&format!(" --speed {}", design_toml::num(n, 3)));
    }
    if let Some(k) = a.kind {
        s.push_str(match k {
            TypeArg::Lap => " --type lap",
            TypeArg::Wave => " --type wave",
        });
    }
    if let Some(m) = a.multiplicity {
        s.push_str(&format!(" --multiplicity {m}"));
    }
    if let Some(t) = &a.from_test {
        s.push_str(&format!(
            " --from-test {} {}",
            design_toml::num(t[0], 3),
            design_toml::num(t[1], 3)
        ));
    }
    if let Some(r) = a.ra {
        s.push_str(&format!(" --ra {}", design_toml::num(r, 6)));
    }
    s.replace(['\n', '\r'], " ")
}
