//! `armsheet explore`: reads a frame, searches every winding that fits it, prints the ranked
//! fits (text, `--json`, `--csv FILE`), and writes one with `--write N -o DESIGN.toml`.
//!
//! Part of the `cli` stage: reads the frame, calls the pure
//! [`crate::features::explore::explore`], words the result with [`crate::render::explore`].
//! A pick is traced and checked again ([`crate::features::explore::confirm`]), written with
//! the design writer, parsed back with armsheet's own parser and checked once more before
//! the file is written: a pick `check` refuses is never written.

use std::path::PathBuf;

use clap::Args;

use super::Outcome;
use super::error::{CliError, NoOverwrite, shown};
use super::output::{print_stdout, write_atomic, write_new, write_stdout};
use crate::design::{parse_design, parse_frame_bytes};
use crate::features::explore::{confirm, explore as search, pick_header};
use crate::features::rewind::design_toml::write_design;
use crate::render::explore::{explore_csv, render_explore, write_explore_json};

/// Help for `explore`.
pub const EXPLORE_HELP: &str = "\
The frame is TOML: [armature] poles and slots (one count or a list), [rating] voltage,
current, speed_rpm and flux_per_pole_mwb (mode, thermal_class), [core] diameter_mm and
length_mm, [commutator] and [limits] as in a design file, and [search] to narrow the space
(kinds, multiplicity_max, coils_per_slot_from/to, segments or bar_pitch_min_mm/max_mm,
dummy_coils_max, span_slack, conductor = \"r20\" | \"awg\" | \"rectangular\" with
strip_widths_mm/strip_heights_mm, strands_max, slot_area_mm2, fill_max, speed_tolerance,
mean_turn_mm). `armsheet new --frame frame.toml` writes a commented starter frame.
A candidate fits when check finds no error, every rating limit passes (the reactance
voltage of the coil under commutation among them, when [commutator] gives the brush width
and diameter), the whole turns give the rated speed within the tolerance at the frame's flux,
and the slot fill is within fill_max. The fits are ranked: the Pareto front over reactance
voltage, copper loss, peak segment voltage and slot fill first, then by copper loss, peak
segment voltage and fill.
--write N -o DESIGN.toml writes fit N (from 1) as a design file that passes check.
--plot FILE.svg draws the fits, reactance voltage against copper loss, the front filled.
Exit codes: 0 something fits, 1 nothing fits (the limit that cut the last candidates is
named) or the pick fails check, 2 bad frame or output that could not be written.";

/// Arguments of `explore`.
#[derive(Debug, Args)]
pub struct ExploreArgs {
    /// The frame file (TOML).
    pub frame: PathBuf,
    /// Print one JSON object instead of the text.
    #[arg(long)]
    pub json: bool,
    /// Write every fit, ranked, as CSV to this file.
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// How many fits to list.
    #[arg(long, value_name = "N", default_value_t = 10)]
    pub top: usize,
    /// Write fit N (from 1) as a design file (with -o).
    #[arg(long, value_name = "N", requires = "output")]
    pub write: Option<usize>,
    /// Where --write writes the design.
    #[arg(
        short = 'o',
        long = "output",
        value_name = "DESIGN.toml",
        requires = "write"
    )]
    pub output: Option<PathBuf>,
    /// Replace an existing output file.
    #[arg(long)]
    pub force: bool,
    /// Draw the fits (reactance voltage against copper loss, a marker a kind, the front
    /// filled) to this SVG.
    #[arg(long, value_name = "FILE.svg")]
    pub plot: Option<PathBuf>,
}

/// Runs `armsheet explore`.
pub fn explore(a: &ExploreArgs) -> Result<Outcome, CliError> {
    let bytes = std::fs::read(&a.frame).map_err(|source| CliError::ReadFrame {
        path: a.frame.clone(),
        source,
    })?;
    let name = a.frame.display().to_string();
    let frame = parse_frame_bytes(&bytes, &name)?;
    let found = search(&frame);
    let refuse = |message: String| CliError::Explore {
        frame: name.clone(),
        message,
    };
    let mut wrote = None;
    if let (Some(n), Some(out)) = (a.write, &a.output) {
        let len = found.fits.len();
        if n == 0 || n > len {
            return Err(refuse(format!(
                "--write {n}: there {} {}; write 1 to {len}",
                if len == 1 { "is" } else { "are" },
                crate::base::number::counted(len, "fit", "fits")
            )));
        }
        let k = &found.fits[n - 1];
        let (checked, ok) =
            confirm(&frame, k).map_err(|e| refuse(format!("fit {n} cannot be built: {e}")))?;
        if !ok {
            return Err(refuse(format!(
                "fit {n} does not pass check when traced, so nothing was written"
            )));
        }
        let header = pick_header(&frame, k, n, env!("CARGO_PKG_VERSION"));
        let file = write_design(&checked.design, &header);
        let back = parse_design(&file, &out.display().to_string()).map_err(|d| {
            refuse(format!(
                "the picked design does not parse back, so nothing was written:\n{d}"
            ))
        })?;
        let again = crate::checks::check(back);
        if again.has_errors() || again.winding.connections != checked.winding.connections {
            return Err(refuse(
                "the picked design does not read back to the same winding that passes check, so nothing was written".into(),
            ));
        }
        if a.force {
            write_atomic(out, file.as_bytes())?;
        } else {
            write_new(out, file.as_bytes(), NoOverwrite::Explore)?;
        }
        wrote = Some(out);
    }
    if let Some(path) = &a.plot {
        let title = format!("Search of {}: the fits", shown(&a.frame));
        let page = crate::layout::front_plot::search_front_page(&found, &title);
        write_atomic(path, crate::render::svg::page_svg(&page).as_bytes())?;
    }
    if let Some(path) = &a.csv {
        write_atomic(path, explore_csv(&found).as_bytes())?;
    }
    if a.json {
        write_stdout(|w| write_explore_json(&frame, &found, a.top, w))?;
    } else {
        let mut said = render_explore(&frame, &found, a.top);
        for path in [&a.csv, &a.plot].into_iter().flatten() {
            said.push_str(&format!("wrote {}\n", shown(path)));
        }
        if let Some(out) = wrote {
            said.push_str(&format!("wrote {}\n", shown(out)));
        }
        print_stdout(&said)?;
    }
    Ok(if found.fits.is_empty() {
        Outcome::ChecksFail
    } else {
        Outcome::Passed
    })
}
