//! `armsheet rewind`: works out a new winding for a new voltage, speed or connection, and
//! writes it as a new design file; or back-solves the flux from a no-load test.
//!
//! Part of the `cli` stage: reads the design, calls the pure [`crate::features::rewind::rewind()`] (or
//! [`crate::features::rewind::no_load_test`]), parses every new file back with armsheet's own
//! parser and checks it before writing (a file `armsheet check` would refuse is never
//! written), and writes it with [`super::output::write_new`] (or
//! [`super::output::write_atomic`] with `--force`: only a regular file, or a symbolic link to
//! one, is replaced). The report is printed only once the file is in place; a refusal is the
//! error alone, on standard error. A refused request is a [`CliError::Rewind`], worded with the
//! flags in [`super::error::rewind_message`].

use std::path::{Path, PathBuf};

use clap::Args;
use clap::builder::PossibleValue;

use super::Outcome;
use super::error::{CliError, NoOverwrite};
use super::load::load_design;
use super::output::{print_stdout, write_atomic, write_new};
use crate::base::number::fmt_toml;
use crate::checks::Checked;
use crate::design::{Design, WindingType, frame_of_design, parse_design};
use crate::features::explore::{Candidate, confirm, explore};
use crate::features::rewind::alternatives::alternatives;
use crate::features::rewind::{self, RewindPlan, RewindRequest, design_toml, no_load_test};
use crate::render::explore::candidates_text;
use crate::render::rewind_text::{Offered, Offers, no_load_header, render_no_load, render_rewind};

/// The most alternatives a refused rewind offers.
const MOST_OFFERED: usize = 3;

/// Help shown after `armsheet rewind --help`.
pub const REWIND_HELP: &str = "\
Keeps the flux per pole and the slot space. The new turns per coil come from the ratio of the
EMFs and the new connection's paths and segments, rounded to whole turns (the speed error is
reported); the conductor keeps the current density (nearest AWG and metric R20 sizes, up to 4
in hand). The flux comes from the design (flux_per_pole_mwb, or voltage and speed_rpm in
[rating]) or from a no-load test: --from-test V0 N0 (open-circuit volts at rpm).
The new file is parsed back before it is written; an existing file is kept unless --force,
which replaces only a regular file (a symbolic link to one is followed, the link kept):
never a folder, a device, a FIFO or a link to nothing.
Without -o the file is written beside the design as NAME-<V>V.toml.
When check refuses the new design, nothing is written and up to 3 requests near it whose
designs check passes are offered, each as its command line (another --type, --multiplicity
or --coils-per-slot), or none if none does.
Exit codes: 0 written, 1 check refuses the new design, 2 bad input, an impossible request or output that could not be written.";

/// `--type` takes the kinds' design-file words, from `theory`.
impl clap::ValueEnum for WindingType {
    fn value_variants<'a>() -> &'a [Self] {
        &WindingType::ALL
    }
    fn to_possible_value(&self) -> Option<PossibleValue> {
        Some(PossibleValue::new(self.as_str()))
    }
}

/// Arguments of `rewind`.
#[derive(Clone, Debug, Args)]
#[command(group(clap::ArgGroup::new("what").required(true).multiple(true).args(["voltage", "from_test"])))]
pub struct RewindArgs {
    /// The design file (TOML) of the machine as it is.
    pub design: PathBuf,
    /// New terminal voltage, V.
    #[arg(long, value_name = "V", allow_negative_numbers = true)]
    pub voltage: Option<f64>,
    /// New speed, rpm (default: the design's speed).
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub speed: Option<f64>,
    /// New connection (default: the design's).
    #[arg(long = "type", value_enum, value_name = "KIND")]
    pub kind: Option<WindingType>,
    /// New multiplicity, 1 to 6 (default: the design's).
    #[arg(long, value_name = "m")]
    pub multiplicity: Option<u32>,
    /// New coils per slot, the same slot space shared by more or fewer coils (default: the design's).
    #[arg(long, value_name = "u")]
    pub coils_per_slot: Option<u32>,
    /// Measured no-load (open-circuit) voltage and speed of the old machine: back-solves the flux.
    #[arg(long, num_args = 2, value_names = ["V0", "N0"], allow_negative_numbers = true)]
    pub from_test: Option<Vec<f64>>,
    /// Measured armature resistance, ohm, taken as at 20 C (replaces the calculated value).
    #[arg(long, value_name = "OHMS", allow_negative_numbers = true)]
    pub ra: Option<f64>,
    /// Where to write the new design.
    #[arg(short = 'o', long = "output", value_name = "NEW.toml")]
    pub output: Option<PathBuf>,
    /// Overwrite the output file if it exists (a regular file, or a link to one, only).
    #[arg(long)]
    pub force: bool,
}

/// Runs `rewind`: writes the new design, then prints the report. A refusal (an impossible
/// request, a new file that would not parse back, an output path that is taken or is not a
/// regular file, a failed write) is the error alone, on standard error: nothing is printed on
/// standard output and nothing is written.
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
        let mut said = render_no_load(&test, &name, env!("CARGO_PKG_VERSION"));
        if let Some(out) = &a.output {
            let header = no_load_header(&test, &name, &asked);
            let text = design_toml::write_design(&test.design, &header);
            if parse_back(&text, out, &name)?.has_errors() {
                said.push_str(
                    "check refuses the design with this flux: it was not written (exit 1); run armsheet check on the old design for the reasons\n",
                );
                print_stdout(&said)?;
                return Ok(Outcome::ChecksFail);
            }
            write_design_file(out, &text, a.force)?;
            said.push_str(&format!("wrote {}\n", super::error::shown(out)));
        }
        print_stdout(&said)?;
        return Ok(Outcome::Passed);
    };

    let req = RewindRequest {
        voltage,
        speed_rpm: a.speed,
        kind: a.kind,
        multiplicity: a.multiplicity,
        from_test,
        measured_r20: a.ra,
        coils_per_slot: a.coils_per_slot,
    };
    let plan = rewind::rewind_rated(d, w, checked.rating.as_ref(), &req).map_err(refuse)?;
    let out = a
        .output
        .clone()
        .unwrap_or_else(|| default_output(&a.design, voltage));
    let text = plan.design_file(&name, &asked);
    let new = parse_back(&text, &out, &name)?;
    // One verdict: a design `check` refuses is reported, never written, and the exit is 1.
    if new.has_errors() {
        // Refused: offer the nearest requests whose designs pass, each as its command line.
        let found = alternatives(d, w, checked.rating.as_ref(), &req, MOST_OFFERED);
        let offered: Vec<Offered> = found
            .passing
            .iter()
            .map(|alt| Offered {
                command: asked_line(&RewindArgs {
                    kind: alt.request.kind,
                    multiplicity: alt.request.multiplicity,
                    coils_per_slot: alt.request.coils_per_slot,
                    ..a.clone()
                }),
                alternative: alt,
            })
            .collect();
        let offers = Offers {
            tried: found.tried,
            offered,
            searched: searched(d, &plan, &req),
        };
        let said = render_rewind(
            &plan,
            &name,
            &asked,
            &new,
            Some(&offers),
            env!("CARGO_PKG_VERSION"),
        );
        print_stdout(&said)?;
        return Ok(Outcome::ChecksFail);
    }
    let said = render_rewind(&plan, &name, &asked, &new, None, env!("CARGO_PKG_VERSION"));
    write_design_file(&out, &text, a.force)?;
    let said = format!("{said}wrote {}\n", super::error::shown(&out));
    // The file is in place: a closed standard output now ends the command quietly.
    print_stdout(&said)?;
    Ok(Outcome::Passed)
}

/// Parses `text`, the new design file for `out`, with armsheet's own parser and checks it,
/// exactly as `armsheet check` would read the file; a file it would refuse (exit 2) is
/// [`CliError::RewindParseBack`], so armsheet never writes a design it rejects. `design` is the
/// old design file, as given, for the message.
fn parse_back(text: &str, out: &Path, design: &str) -> Result<Checked, CliError> {
    parse_design(text, &out.display().to_string())
        .map(crate::checks::check)
        .map_err(|diagnostic| CliError::RewindParseBack {
            design: design.to_string(),
            diagnostic: Box::new(diagnostic),
        })
}

/// Writes the new design: a new file, or with `--force` a replaced regular file (a symbolic
/// link to one is followed). Anything else at `out` is refused before anything is written.
fn write_design_file(out: &Path, text: &str, force: bool) -> Result<(), CliError> {
    if force {
        write_atomic(out, text.as_bytes())
    } else {
        write_new(out, text.as_bytes(), NoOverwrite::Rewind)
    }
}

/// `designs/hoist.toml` at 220 V → `designs/hoist-220V.toml`.
fn default_output(design: &Path, volts: f64) -> PathBuf {
    let stem = design.file_stem().map_or_else(
        || "design".to_string(),
        |s| s.to_string_lossy().into_owned(),
    );
    let v = fmt_toml(volts, 2).replace('.', "_");
    design.with_file_name(format!("{stem}-{v}V.toml"))
}

/// The request as a command line, for the header and the report.
fn asked_line(a: &RewindArgs) -> String {
    let mut s = format!("armsheet rewind {}", a.design.display());
    if let Some(v) = a.voltage {
        s.push_str(&format!(" --voltage {}", fmt_toml(v, 3)));
    }
    if let Some(n) = a.speed {
        s.push_str(&format!(" --speed {}", fmt_toml(n, 3)));
    }
    if let Some(k) = a.kind {
        s.push_str(&format!(" --type {}", k.as_str()));
    }
    if let Some(m) = a.multiplicity {
        s.push_str(&format!(" --multiplicity {m}"));
    }
    if let Some(u) = a.coils_per_slot {
        s.push_str(&format!(" --coils-per-slot {u}"));
    }
    if let Some(t) = &a.from_test {
        s.push_str(&format!(
            " --from-test {} {}",
            fmt_toml(t[0], 3),
            fmt_toml(t[1], 3)
        ));
    }
    if let Some(r) = a.ra {
        s.push_str(&format!(" --ra {}", fmt_toml(r, 6)));
    }
    // Control characters in the file name stay: the design file's header escapes them visibly
    // (`design_toml::comment_text`).
    s
}

/// The windings the old core could carry for the rating asked, from the designer's search
/// (`explore`) over its own frame (same slots and core), the nearest to the request first
/// (its kind, then the old commutator kept, then its multiplicity, then its coils per slot),
/// each traced and passed by `check` again; a line saying why there are none otherwise.
fn searched(d: &Design, plan: &RewindPlan, req: &RewindRequest) -> String {
    let rating = plan.design.rating.as_ref();
    let (Some(v), Some(i), Some(n)) = (
        rating.and_then(|r| r.voltage),
        rating.and_then(|r| r.current),
        plan.design.speed_rpm,
    ) else {
        return String::new();
    };
    let Some(frame) = frame_of_design(d, v, i, n, plan.flux_mwb) else {
        return "\nTHE DESIGNER'S SEARCH\n---------------------\n  needs the core's diameter and length ([core]); with them, \
                it lists the windings this core can carry.\n"
            .to_string();
    };
    let found = explore(&frame);
    let kind = req.kind.unwrap_or(d.winding_type);
    let m = req.multiplicity.unwrap_or(d.multiplicity);
    let u = req.coils_per_slot.unwrap_or(d.coils_per_slot);
    let mut near: Vec<&Candidate> = found.fits.iter().collect();
    near.sort_by_key(|k| {
        let st = &k.structure;
        (
            st.kind != kind,
            st.segments != d.segments,
            st.multiplicity.abs_diff(m),
            st.coils_per_slot.abs_diff(u),
        )
    });
    let passing: Vec<&Candidate> = near
        .into_iter()
        .filter(|k| confirm(&frame, k).is_ok_and(|(_, ok)| ok))
        .take(MOST_OFFERED)
        .collect();
    let mut s = format!(
        "\nTHE DESIGNER'S SEARCH\n---------------------\n  over this core ({} candidates evaluated) finds {} winding{} that fit{}",
        found.evaluated,
        found.fits.len(),
        if found.fits.len() == 1 { "" } else { "s" },
        if found.fits.len() == 1 { "s" } else { "" },
    );
    if passing.is_empty() {
        s.push_str(".\n");
        return s;
    }
    s.push_str("; the nearest to the request, each passing check and clear of every rating warning (the search's sense of fit):\n");
    s.push_str(&candidates_text(passing));
    s.push_str(
        "  to write one: armsheet new --frame FRAME.toml, fill it in, then armsheet explore FRAME.toml --write N -o DESIGN.toml\n",
    );
    s
}
