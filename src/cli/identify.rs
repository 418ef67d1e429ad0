//! `armsheet identify`: reads a data card, finds every winding that fits it, and writes the
//! one that does (or the one picked) as a design file.
//!
//! Part of the `cli` stage: reads the card, calls the pure
//! [`crate::features::identify::identify`], words the result with [`crate::render::identify`],
//! parses the design file back with armsheet's own parser before writing it, and writes it
//! with [`super::output::write_new`] (or [`super::output::write_atomic`] with `--force`).

use std::path::PathBuf;

use clap::Args;

use super::Outcome;
use super::error::{CliError, NoOverwrite, shown};
use super::output::{print_stdout, write_atomic, write_new, write_stdout};
use crate::design::{parse_card_bytes, parse_design};
use crate::features::identify::identify as find;
use crate::features::rewind::design_toml::write_design;
use crate::render::identify::{
    design_header, render_identify, render_refused, write_identify_json,
};

/// Help for `identify`.
pub const IDENTIFY_HELP: &str = "\
The card is TOML: [job] as in a design file, and [observed] with poles, slots, bars,
coil_span (\"1-8\"), lead_throw (\"1-14\"), turns, and optionally lead_swing (bars from
slot 1's centre line to bar 1, + towards rising slots, halves allowed; without it symmetric
leads are assumed: set the brushes by a neutral test), coils_per_slot,
diameter_mm or awg, strands, brush_sets, dead_coils, equalizer_taps, rotation.
`armsheet new --card card.toml` writes a commented starter card.
One winding fits: it is printed, and written with -o. Several fit: they are listed, the
most usual first (simplex, no dummy coil the card does not list), with what tells them
apart; nothing is written unless --pick N chooses one. An unusual fit (multiplex, or one
check refuses) comes with the bar or throw readings one off that give a usual winding; when
there is one, nothing is written until --pick 1 confirms. None fits: the conflicting
observation and the nearest consistent readings are printed (exit 1). A fit check refuses
is never written (exit 1).
An existing file is kept unless --force.
Exit codes: 0 identified, 1 no winding fits or check refuses it, 2 bad card or output that could not be written.";

/// Arguments of `identify`.
#[derive(Debug, Args)]
pub struct IdentifyArgs {
    /// The data card (TOML).
    pub card: PathBuf,
    /// Print one JSON object instead of the text.
    #[arg(long)]
    pub json: bool,
    /// Write the identified design here.
    #[arg(short = 'o', long = "output", value_name = "DESIGN.toml")]
    pub output: Option<PathBuf>,
    /// Replace an existing output file.
    #[arg(long)]
    pub force: bool,
    /// Choose candidate N (from 1) when several fit.
    #[arg(long, value_name = "N")]
    pub pick: Option<usize>,
}

/// Runs `armsheet identify`.
pub fn identify(a: &IdentifyArgs) -> Result<Outcome, CliError> {
    let bytes = std::fs::read(&a.card).map_err(|source| CliError::ReadCard {
        path: a.card.clone(),
        source,
    })?;
    let name = a.card.display().to_string();
    let card = parse_card_bytes(&bytes, &name)?;
    let found = find(&card);
    let refuse = |message: String| CliError::Identify {
        card: name.clone(),
        message,
    };
    let chosen = match (a.pick, found.candidates.len()) {
        // Nothing fits: there is nothing to pick, and the report says why.
        (Some(_), 0) => None,
        (Some(n), len) if n == 0 || n > len => {
            return Err(refuse(format!(
                "--pick {n}: there {} {}; pick 1 to {len}",
                if len == 1 { "is" } else { "are" },
                crate::base::number::counted(len, "candidate", "candidates")
            )));
        }
        (Some(n), _) => Some(&found.candidates[n - 1]),
        (None, 1) => Some(&found.candidates[0]),
        _ => None,
    };
    // One verdict: a winding `check` refuses is said to be refused and never written.
    let refused = chosen.filter(|k| k.checked.has_errors());
    // An unusual fit with a more usual one a reading away is held back until picked.
    let held = a.pick.is_none() && found.doubtful();
    let mut wrote = None;
    if let (Some(k), Some(out), None, false) = (chosen, &a.output, refused, held) {
        let header = design_header(&card, k, env!("CARGO_PKG_VERSION"));
        let file = write_design(&k.checked.design, &header);
        let back = parse_design(&file, &out.display().to_string()).map_err(|d| {
            refuse(format!(
                "the identified design does not parse back, so nothing was written:\n{d}"
            ))
        })?;
        if crate::checks::check(back).winding.connections != k.checked.winding.connections {
            return Err(refuse(
                "the identified design does not read back to the same winding, so nothing was written".into(),
            ));
        }
        if a.force {
            write_atomic(out, file.as_bytes())?;
        } else {
            write_new(out, file.as_bytes(), NoOverwrite::Identify)?;
        }
        wrote = Some(out);
    }
    if a.json {
        write_stdout(|w| write_identify_json(&card, &found, w))?;
    } else {
        let mut said = render_identify(&card, &found);
        if let (Some(n), Some(_)) = (a.pick, chosen) {
            said.push_str(&format!("picked candidate {n}\n"));
        }
        if let Some(k) = refused {
            said.push_str(&render_refused(&k.checked));
        }
        if let Some(out) = wrote {
            said.push_str(&format!("wrote {}\n", shown(out)));
        }
        print_stdout(&said)?;
    }
    Ok(if found.candidates.is_empty() || refused.is_some() {
        Outcome::ChecksFail
    } else {
        Outcome::Passed
    })
}
