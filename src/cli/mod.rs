//! `cli`: the command line. The only stage that reads or writes files, looks at the terminal or
//! the environment. Everything else is pure and is called from here.
//!
//! Exit codes: 0 all checks pass (warnings allowed), 1 an error-level check fails,
//! 2 unreadable or invalid input, or output that could not be written.
//!
//! Errors: every command returns `Result<Outcome, CliError>`; [`run_from_env`] is the one
//! place that prints a [`CliError`] and maps it to its exit code. Everything on standard output
//! goes through [`output::print_stdout`], which never panics. When standard output is closed
//! under the program (a broken pipe, EPIPE: `armsheet check … | head`), armsheet stops quietly
//! with exit 0, as standard Unix tools do; files already written are complete, since every file
//! is written before its `wrote …` line. Any other failed write to standard output (a full
//! disk, `/dev/full`) is `error: cannot write to standard output: …` with exit 2.

pub mod archive;
pub mod armature_test;
pub mod error;
pub mod explore;
pub mod identify;
mod load;
pub mod lock;
pub mod output;
pub mod rewind;
pub mod sheet;

use std::io::{IsTerminal, Write};
use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};

use crate::base::{Finding, has_errors};
use crate::render::json;
use crate::render::text::{TextOptions, render_text};

pub use error::CliError;
pub use load::load_design;
pub use output::print_stdout;

/// The starter design written by `armsheet new`.
pub const STARTER: &str = include_str!("starter.toml");

/// The starter data card written by `armsheet new --card`.
pub const STARTER_CARD: &str = include_str!("starter-card.toml");

/// The starter frame written by `armsheet new --frame`.
pub const STARTER_FRAME: &str = include_str!("starter-frame.toml");

const ABOUT: &str = "Designs, checks and prints DC armature windings (lap, wave and frog-leg, simplex and multiplex).";

const CONVENTIONS: &str = concat!(
    "\
Conventions: slots, coils and segments count from 1. Coil n lies in slot ceil(n/u), its bottom
side `span` slots on; top coil sides are odd, bottom sides even, so y_b = 2u*span + 1.
Segment 1 takes coil 1's start lead; y_c is signed, + towards rising segment numbers.
",
    error::exit_codes_help!(),
    " A closed standard output (e.g. `| head`) ends armsheet quietly with exit 0."
);

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
    /// Identify the old winding from a data card and write its design file.
    #[command(after_help = identify::IDENTIFY_HELP)]
    Identify(identify::IdentifyArgs),
    /// Search every winding that fits a frame and its rating, ranked; write the one picked.
    #[command(after_help = explore::EXPLORE_HELP)]
    Explore(explore::ExploreArgs),
    /// Expected bar-to-bar and drop-test readings from the winding solved as a network.
    #[command(after_help = armature_test::TEST_HELP)]
    Test(armature_test::TestArgs),
    /// The shop's winding archive: record jobs, find windings wound before, show a history.
    #[command(after_help = archive::ARCHIVE_HELP)]
    Archive(archive::ArchiveArgs),
}

const CHECK_HELP: &str = concat!(
    "\
The design file is TOML with the tables [job], [armature] (poles, slots, coils_per_slot,
segments, rotation, pole_arc), [winding] (type, multiplicity, direction, span, turns,
lead_offset, equalizers, dummy_coils, wave_span, wave_turns, flux_per_pole_mwb, speed_rpm)
and, for rating checks, [rating], [conductor], [core], [commutator], [limits]. Unknown keys
are errors.
Span: 7 or the shop form \"1-8\". lead_offset 0 puts a coil's two segments either side of its
centre line; + swings the leads towards rising segment numbers.
",
    error::exit_codes_help!()
);

const NEW_HELP: &str = "\
Writes a starter design with every key commented. Edit it, then run
`armsheet check FILE`. With --card, writes a starter data card for `armsheet identify`;
with --frame, a starter frame for `armsheet explore`.
The file is not overwritten if it exists.";

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
    /// Where to write the starter design (or card).
    pub path: Option<PathBuf>,
    /// Write a starter data card for `armsheet identify` instead (default card.toml).
    #[arg(long, conflicts_with = "frame")]
    pub card: bool,
    /// Write a starter frame for `armsheet explore` instead (default frame.toml).
    #[arg(long)]
    pub frame: bool,
}

/// How a command that ran to its end came out.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Outcome {
    /// Done; every error-level check passes (exit 0).
    Passed,
    /// Done, but an error-level check fails (exit 1).
    ChecksFail,
}

impl Outcome {
    /// [`Outcome::ChecksFail`] when an error-level finding fails.
    pub fn of(findings: &[Finding]) -> Self {
        if has_errors(findings) {
            Outcome::ChecksFail
        } else {
            Outcome::Passed
        }
    }

    /// The exit code: 0 or 1.
    pub fn code(self) -> u8 {
        match self {
            Outcome::Passed => 0,
            Outcome::ChecksFail => 1,
        }
    }
}

/// Parses the process arguments and runs; prints any error (the only place that does) and
/// returns the exit code.
pub fn run_from_env() -> u8 {
    match Cli::try_parse() {
        Ok(cli) => match run(cli) {
            Ok(outcome) => outcome.code(),
            Err(e) => e.report(),
        },
        // Help and version go to standard output, usage errors to standard error.
        Err(e) if e.use_stderr() => {
            // The usage error echoes what was typed: shown visibly, like every other echo.
            // If standard error is gone there is no one left to tell.
            let text = e.render().to_string();
            let shown: Vec<_> = crate::base::visible::visible_lines(&text).collect();
            let _ = writeln!(std::io::stderr(), "{}", shown.join("\n").trim_end());
            error::EXIT_BAD_INPUT
        }
        Err(e) => match e.print() {
            Ok(()) => 0,
            Err(io) => CliError::Stdout(io).report(),
        },
    }
}

/// Runs one parsed command.
pub fn run(cli: Cli) -> Result<Outcome, CliError> {
    match cli.command {
        Command::Check(a) => check(&a),
        Command::New(a) => new(&a),
        Command::Rewind(a) => rewind::rewind(&a),
        Command::Sheet(a) => sheet::sheet(&a),
        Command::Draw(a) => sheet::draw(&a),
        Command::Identify(a) => identify::identify(&a),
        Command::Test(a) => armature_test::test(&a),
        Command::Explore(a) => explore::explore(&a),
        Command::Archive(a) => archive::archive(&a),
    }
}

fn check(a: &CheckArgs) -> Result<Outcome, CliError> {
    let checked = load_design(&a.design)?;
    if a.json {
        output::write_stdout(|out| json::write_report_json(&checked, out))?;
    } else {
        print_stdout(&render_text(
            &checked,
            TextOptions {
                unicode: std::io::stdout().is_terminal(),
                version: env!("CARGO_PKG_VERSION"),
            },
        ))?;
    }
    Ok(Outcome::of(&checked.findings))
}

fn new(a: &NewArgs) -> Result<Outcome, CliError> {
    let (default, text) = if a.card {
        ("card.toml", STARTER_CARD)
    } else if a.frame {
        ("frame.toml", STARTER_FRAME)
    } else {
        ("design.toml", STARTER)
    };
    let path = a.path.clone().unwrap_or_else(|| PathBuf::from(default));
    output::write_new(&path, text.as_bytes(), error::NoOverwrite::New)?;
    print_stdout(&format!("wrote {}\n", error::shown(&path)))?;
    Ok(Outcome::Passed)
}
