//! `armsheet sheet` (printable winding sheets, CSV, JSON, PDF) and `armsheet draw` (the
//! developed diagram alone, for a screen).
//!
//! Part of the `cli` stage: it reads the design, runs the pure pipeline, renders every file in
//! memory and only then writes them. `sheet` stages the whole set in a temporary folder beside
//! `DIR/<stem>` and swaps it into place ([`replace_folder`]); `draw` writes its one file through
//! a temporary file and a rename. An error writes nothing new and leaves the earlier files
//! intact; the `wrote …` lines come once everything is in place. Exit codes are `check`'s.

use std::ffi::OsStr;
use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use clap::Args;

use super::Outcome;
use super::error::{CliError, WindowOutOfRange, shown};
use super::load::load_design;
use super::output::{SET_LIST, print_stdout, replace_folder, write_atomic};
use crate::base::visible::visible;
use crate::checks::{Checked, refusal_line};
use crate::design::Design;
use crate::features::armature_test::{TestOptions, expected};
use crate::layout::{Paper, SheetOptions, Window, draw_page, sheet_pages};
use crate::render::json::report_json;
use crate::render::{csv, pdf, svg};

/// How much of a large armature the diagram shows (`--window`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum WindowArg {
    /// `auto`: the whole armature up to 120 segments, else whole pole pairs within 120.
    Auto,
    /// `all`: the whole armature.
    All,
    /// A number of whole pole pairs.
    Pairs(u32),
}

fn parse_window(s: &str) -> Result<WindowArg, String> {
    match s {
        "auto" => Ok(WindowArg::Auto),
        "all" => Ok(WindowArg::All),
        _ => match s.parse::<u32>() {
            Ok(n) if n >= 1 => Ok(WindowArg::Pairs(n)),
            _ => Err(format!(
                "expected `auto`, `all` or a number of pole pairs (1, 2, …), found \"{s}\""
            )),
        },
    }
}

fn parse_paper(s: &str) -> Result<Paper, String> {
    s.parse()
}

/// Options shared by `sheet` and `draw` for the diagram window.
#[derive(Debug, Args)]
pub struct WindowArgs {
    /// Diagram window: `auto` (every coil, continued over as many sheets as the paper
    /// needs), `all` (the whole armature in one view, refused where the paper cannot hold it
    /// legibly), or a number of whole pole pairs to show (at most the machine's).
    #[arg(long, default_value = "auto", value_parser = parse_window, value_name = "auto|all|PAIRS")]
    pub window: WindowArg,
    /// First slot at the left edge of a window (1 to the armature's slots).
    #[arg(long, default_value_t = 1, value_name = "SLOT", value_parser = clap::value_parser!(u32).range(1..))]
    pub window_start: u32,
}

impl WindowArgs {
    /// The window on `design` (read from `file`): refused, before anything is written, when
    /// the first slot lies beyond the last slot or the pole pairs exceed the machine's.
    fn window(&self, design: &Design, file: &Path) -> Result<Window, CliError> {
        let refuse = |why| CliError::Window {
            design: file.display().to_string(),
            why,
        };
        if self.window_start > design.slots {
            return Err(refuse(WindowOutOfRange::Start {
                start: self.window_start,
                slots: design.slots,
            }));
        }
        if let WindowArg::Pairs(pairs) = self.window
            && pairs > design.pole_pairs()
        {
            return Err(refuse(WindowOutOfRange::Pairs {
                pairs,
                pole_pairs: design.pole_pairs(),
            }));
        }
        Ok(match self.window {
            WindowArg::Auto if self.window_start == 1 => Window::Auto,
            WindowArg::Auto => Window::PolePairs {
                pairs: 1,
                first_slot: self.window_start,
            },
            WindowArg::All => Window::Whole,
            WindowArg::Pairs(pairs) => Window::PolePairs {
                pairs,
                first_slot: self.window_start,
            },
        })
    }
}

/// Arguments of `sheet`.
#[derive(Debug, Args)]
pub struct SheetArgs {
    /// The design file (TOML).
    pub design: PathBuf,
    /// Output folder; files go to DIR/<design-stem>/.
    // The text is the `--help` line, kept as typed; not HTML.
    #[allow(rustdoc::invalid_html_tags)]
    #[arg(short = 'o', long = "out", default_value = "out", value_name = "DIR")]
    pub out: PathBuf,
    /// Paper size (landscape).
    #[arg(long, default_value = "a4", value_parser = parse_paper, value_name = "a4|a3|letter|tabloid")]
    pub paper: Paper,
    /// Also write sheets.pdf with every sheet, one page each.
    #[arg(long)]
    pub pdf: bool,
    /// The diagram window.
    #[command(flatten)]
    pub window: WindowArgs,
}

/// Arguments of `draw`.
#[derive(Debug, Args)]
pub struct DrawArgs {
    /// The design file (TOML).
    pub design: PathBuf,
    /// The SVG to write (default out/<design-stem>/diagram.svg).
    // The text is the `--help` line, kept as typed; not HTML.
    #[allow(rustdoc::invalid_html_tags)]
    #[arg(short = 'o', long = "out", value_name = "FILE.svg")]
    pub out: Option<PathBuf>,
    /// The diagram window.
    #[command(flatten)]
    pub window: WindowArgs,
}

pub(crate) const SHEET_HELP: &str = concat!(
    "\
Writes into DIR/<design-stem>/: sheet-1.svg (developed diagram, title block, winding data,
legend, caution), sheet-2.svg … (the commutator end view, the coil-making sheet when the
design has the rating's coil making, the winding order with check-off
boxes, the connection table with the winding sequence, the equalizer table, the test and
sign-off sheets with the expected bar-to-bar readings of `armsheet test` and boxes for the
measured ones and, when sheet 1 cannot hold it all, the winding data in full; each page's
root <svg> names itself in data-page), connections.csv (one record per coil position), job.csv (the job they
belong to, once), report.json (the `check --json` object), with --pdf sheets.pdf, and
sheet-set.txt (the list of the set's own files). The README's \"Output files\" gives each format.
Sheets are sized in mm and print at true scale. A design that fails a check is still drawn,
under a NOT FOR WINDING band naming the failed checks, said again after the `wrote` lines
(exit 1); `draw` marks its page and says it the same way.
The set is written whole or not at all: it is made in a temporary folder beside DIR/<design-stem>
and then swapped into place. A file of the older set that the new one lacks (sheets.pdf of an
earlier --pdf run) goes; every file the older set's list does not name (`test -o` files, notes)
is kept. One run at a time writes a folder: a second run (`sheet` or `test -o`) waits up to
5 s for the lock DIR/.<design-stem>.lock, then exits 2 naming the run that holds it.
",
    super::error::exit_codes_help!()
);

pub(crate) fn stem(path: &Path) -> String {
    path.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .filter(|s| !s.is_empty())
        .unwrap_or_else(|| "design".into())
}

/// Runs `armsheet sheet`.
pub fn sheet(a: &SheetArgs) -> Result<Outcome, CliError> {
    let checked = load_design(&a.design)?;
    // The expected readings of the test sheets, computed once (as `armsheet test` does with
    // its default options).
    let test = expected(&checked.design, &checked.winding, &TestOptions::default());
    let pages = sheet_pages(
        &checked,
        &test,
        &SheetOptions {
            paper: a.paper,
            window: a.window.window(&checked.design, &a.design)?,
            version: env!("CARGO_PKG_VERSION").to_string(),
        },
    )
    .map_err(|why| CliError::WholeRefused {
        design: a.design.display().to_string(),
        paper: a.paper.as_str().to_string(),
        why,
    })?;
    let sheets: Vec<String> = pages.iter().map(svg::page_svg).collect();
    let dir = a.out.join(stem(&a.design));
    let mut files: Vec<(String, Vec<u8>)> = Vec::new();
    if a.pdf {
        match pdf::sheets_pdf(&pages) {
            Ok(bytes) => files.push(("sheets.pdf".to_string(), bytes)),
            Err(e) => {
                return Err(CliError::Pdf {
                    design: a.design.display().to_string(),
                    message: e.to_string(),
                });
            }
        }
    }
    let count = sheets.len();
    let mut all: Vec<(String, Vec<u8>)> = sheets
        .into_iter()
        .enumerate()
        .map(|(i, s)| (format!("sheet-{}.svg", i + 1), s.into_bytes()))
        .collect();
    all.push((
        "connections.csv".to_string(),
        csv::connections_csv(&checked.winding).into_bytes(),
    ));
    all.push((
        "job.csv".to_string(),
        csv::job_csv(&checked.design).into_bytes(),
    ));
    all.push((
        "report.json".to_string(),
        report_json(&checked).into_bytes(),
    ));
    all.append(&mut files);
    let removed = replace_folder(
        &dir,
        &all,
        |name| is_stale_sheet(name, count) || name == "sheets.pdf",
        "sheet",
    )?;
    let mut said = String::new();
    for name in all.iter().map(|(n, _)| n.as_str()).chain([SET_LIST]) {
        let _ = writeln!(said, "wrote {}", shown(&dir.join(name)));
    }
    for p in removed {
        let _ = writeln!(said, "removed stale {}", shown(&p));
    }
    refused_line(&mut said, &checked);
    print_stdout(&said)?;
    Ok(Outcome::of(&checked.findings))
}

/// `sheet-K.svg` with K above this run's `count`: left by an earlier run with more sheets, so
/// it goes with the old set and the folder holds one set. Only asked of a folder written by an
/// armsheet before set lists (no `sheet-set.txt`); otherwise the list names the old set.
fn is_stale_sheet(name: &OsStr, count: usize) -> bool {
    name.to_str()
        .and_then(|n| n.strip_prefix("sheet-"))
        .and_then(|n| n.strip_suffix(".svg"))
        .and_then(|n| n.parse::<usize>().ok())
        .is_some_and(|k| k > count)
}

/// Runs `armsheet draw`.
pub fn draw(a: &DrawArgs) -> Result<Outcome, CliError> {
    let checked = load_design(&a.design)?;
    let svg = svg::page_svg(&draw_page(
        &checked,
        a.window.window(&checked.design, &a.design)?,
    ));
    let path = a.out.clone().unwrap_or_else(|| {
        PathBuf::from("out")
            .join(stem(&a.design))
            .join("diagram.svg")
    });
    if let Some(dir) = path.parent().filter(|p| !p.as_os_str().is_empty()) {
        super::output::make_folders(dir, &path, super::output::EntryKind::File)?;
    }
    // Into the design's own output folder, under that folder's lock, as `sheet` and `test -o`
    // write there (a path given with -o is the user's own).
    let _lock = match (&a.out, path.parent()) {
        (None, Some(dir)) => {
            let real = dir.canonicalize().map_err(|e| CliError::write(dir, e))?;
            Some(super::lock::lock_folder(&real, dir, "draw")?)
        }
        _ => None,
    };
    write_atomic(&path, svg.as_bytes())?;
    let mut said = format!("wrote {}\n", shown(&path));
    refused_line(&mut said, &checked);
    print_stdout(&said)?;
    Ok(Outcome::of(&checked.findings))
}

/// After the `wrote` lines of a design `check` refuses: the line its pages carry, so the exit 1
/// is never silent.
fn refused_line(said: &mut String, checked: &Checked) {
    if let Some(line) = refusal_line(&checked.failures()) {
        let _ = writeln!(said, "{}", visible(&line));
    }
}
