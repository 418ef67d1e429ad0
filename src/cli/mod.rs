//! `cli`: the command line. The only stage that reads or writes files, looks at the terminal or
//! the environment. Everything else is pure and is called from here.
//!
//! Exit codes: 0 all checks pass (warnings allowed), 1 an error-level check fails,
//! 2 unreadable or invalid input (or output that could not be written).

mod load;
pub mod output;
pub mod rewind;
pub mod sheet;

use std::io::{IsTerminal, Write};
use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};

use crate::base::has_errors;
use crate::render::json;
use crate::render::text::{TextOptions, render_text};

pub use load::load_design;

/// The starter design written by `armsheet new`.
pub const STARTER: &str = include_str!("starter.toml");

const ABOUT: &str =
    "Designs, checks and prints DC armature windings (lap and wave, simplex and multiplex).";

const CONVENTIONS: &str = "\
Conventions: slots, coils and segments count from 1. Coil n lies in slot ceil(n/u), its bottom
side `span` slots on; top coil sides are odd, bottom sides even, so y_b = 2u*span + 1.
Segment 1 takes coil 1's start lead; y_c is signed, + towards rising segment numbers.
Exit codes: 0 passes, 1 an error-level check fails, 2 bad input.";

/// armsheet's command line.
#[derive(Debug, Parser)]
#[command(name = "armsheet", version, about = ABOUT, after_help = CONVENTIONS)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The commands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Check a design: pitches, paths, brushes, constants, rule checks, connection table.
    #[command(after_help = CHECK_HELP)]
    Check(CheckArgs),
    /// Write a commented starter design file (never overwrites).
    #[command(after_help = NEW_HELP)]
    New(NewArgs),
    /// Work out a rewind for a new voltage, speed or connection, or the flux from a no-load test.
    #[command(after_help = rewind::REWIND_HELP)]
    Rewind(rewind::RewindArgs),
    /// Write the printable winding sheets (SVG, optional PDF), connections.csv and report.json.
    #[command(after_help = sheet::SHEET_HELP)]
    Sheet(sheet::SheetArgs),
    /// Write the developed winding diagram alone, sized for a screen.
    Draw(sheet::DrawArgs),
}

const CHECK_HELP: &str = "\
The design file is TOML with the tables [job], [armature] (poles, slots, coils_per_slot,
segments, rotation, pole_arc), [winding] (type, multiplicity, direction, span, turns,
lead_offset, equalizers, flux_per_pole_mwb, speed_rpm) and, for rating checks, [rating],
[conductor], [core], [commutator], [limits]. Unknown keys are errors.
Span: 7 or the shop form \"1-8\". lead_offset 0 puts a coil's two segments either side of its
centre line; + swings the leads towards rising segment numbers.
Exit codes: 0 passes, 1 an error-level check fails, 2 bad input.";

const NEW_HELP: &str = "\
Writes a starter design with every key commented. Edit it, then run
`armsheet check FILE`. The file is not overwritten if it exists.";

/// Arguments of `check`.
#[derive(Debug, Args)]
pub struct CheckArgs {
    /// The design file (TOML).
    pub design: PathBuf,
    /// Print one JSON object instead of the text report.
    #[arg(long)]
    pub json: bool,
}

/// Arguments of `new`.
#[derive(Debug, Args)]
pub struct NewArgs {
    /// Where to write the starter design.
    #[arg(default_value = "design.toml")]
    pub path: PathBuf,
}

/// Parses the process arguments and runs; returns the exit code.
pub fn run_from_env() -> u8 {
    match Cli::try_parse() {
        Ok(cli) => run(cli),
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            code
        }
    }
}

/// Runs one parsed command; returns the exit code.
pub fn run(cli: Cli) -> u8 {
    match cli.command {
        Command::Check(a) => check(&a),
        Command::New(a) => new(&a),
        Command::Rewind(a) => rewind::rewind(&a),
        Command::Sheet(a) => sheet::sheet(&a),
        Command::Draw(a) => sheet::draw(&a),
    }
}

fn check(a: &CheckArgs) -> u8 {
    let checked = match load_design(&a.design) {
        Ok(c) => c,
        Err(code) => return code,
    };
    let written = if a.json {
        let mut out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
        json::write_report_json(&checked, &mut out).and_then(|()| out.flush())
    } else {
        print_stdout(&render_text(
            &checked,
            TextOptions {
                unicode: std::io::stdout().is_terminal(),
                version: env!("CARGO_PKG_VERSION"),
            },
        ))
    };
    if written.is_err() {
        return 2;
    }
    u8::from(has_errors(&checked.findings))
}

fn new(a: &NewArgs) -> u8 {
    match output::write_new(&a.path, STARTER.as_bytes()) {
        Ok(()) => {
            println!("wrote {}", a.path.display());
            0
        }
        Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => {
            eprintln!(
                "error: {} already exists; armsheet new never overwrites a file\n  = hint: give another path, e.g. `armsheet new job-42.toml`",
                a.path.display()
            );
            2
        }
        Err(e) => {
            eprintln!("error: cannot write {}: {e}", a.path.display());
            2
        }
    }
}

/// Writes to stdout; a closed pipe is not an error worth a panic.
pub fn print_stdout(s: &str) -> std::io::Result<()> {
    let mut out = std::io::stdout().lock();
    out.write_all(s.as_bytes())?;
    out.flush()
}
