//! The winding-data block of sheet 1 (the bench rows, then as many more as it holds, in two
//! columns at the compact size, with the job notes and the numbering convention at its foot), and the winding-data sheet that
//! carries every row when sheet 1 cannot.
//!
//! Part of the `layout` stage (the sheets).

use crate::layout::font::{Weight, cut_to_width, text_width, wrap_text};
use crate::layout::style::{BODY_TEXT, COMPACT_TEXT, TEXT_FLOOR};
use crate::layout::tree::{Group, Text};

use super::rows::{bench_rows, winding_data_rows};
use super::{Input, Rect};

/// Row pitch of the data rows, mm.
const DATA_ROW: f64 = 4.6;
/// Gap between a row's label and its value, mm.
const LABEL_GAP: f64 = 2.0;

/// Every data row: the design's, then the rating's.
pub(super) fn data_rows(input: &Input<'_>) -> Vec<(String, String)> {
    let mut rows = winding_data_rows(input.design, input.winding);
    rows.extend(input.extra_rows.iter().cloned());
    rows
}

/// The numbering convention in words natural for the design's own u, with where the
/// commutator end is.
fn numbering_words(input: &Input<'_>) -> String {
    let u = input.design.coils_per_slot;
    let span = input.winding.pitches.span;
    let place = if u == 1 {
        "Coil n lies top-layer in slot n".to_string()
    } else {
        format!(
            "Coil n lies top-layer in slot \u{2308}n/{u}\u{2309} at position ((n\u{2212}1) mod {u})+1"
        )
    };
    format!(
        "Numbering: slots, coils and segments count from 1, seen from the commutator end (front = commutator end, back = the far end). {place} and bottom-layer {span} slots on. Start lead from the top side, end lead from the bottom side; coil 1's start lead goes to segment 1."
    )
}

/// The foot notes of the block: the job notes, then the numbering convention, as lines.
fn foot_lines(input: &Input<'_>, width: f64) -> Vec<String> {
    let mut lines = Vec::new();
    if let Some(notes) = input
        .design
        .job
        .notes
        .as_deref()
        .filter(|n| !n.trim().is_empty())
    {
        lines.extend(wrap_text(
            &format!("Job notes: {notes}"),
            TEXT_FLOOR,
            Weight::Regular,
            width,
        ));
    }
    lines.extend(wrap_text(
        &numbering_words(input),
        TEXT_FLOOR,
        Weight::Regular,
        width,
    ));
    lines
}

/// The widest label of `rows` at the body size, mm.
fn label_width(rows: &[(String, String)]) -> f64 {
    rows.iter()
        .map(|(k, _)| text_width(k, BODY_TEXT, Weight::Regular))
        .fold(0.0, f64::max)
}

/// Rows `rows` in columns of `per_col` from (x, top), each column `col_w` wide.
fn push_rows(
    g: &mut Group,
    rows: &[(String, String)],
    x: f64,
    top: f64,
    per_col: usize,
    col_w: f64,
) {
    let label_w = label_width(rows);
    for (i, (k, v)) in rows.iter().enumerate() {
        let (col, row) = (i / per_col, i % per_col);
        let cx = x + col as f64 * col_w;
        let y = top + (row as f64 + 1.0) * DATA_ROW - 1.0;
        let mut datum = Group::class("datum").with_data("data-key", k);
        datum.push(Text::new(cx, y, BODY_TEXT, "", k.clone()));
        let room = col_w - label_w - LABEL_GAP - 2.0;
        datum.push(Text::new(
            cx + label_w + LABEL_GAP,
            y,
            BODY_TEXT,
            "b",
            cut_to_width(v, BODY_TEXT, Weight::Bold, room),
        ));
        g.push(datum);
    }
}

/// The sizes the block of sheet 1 tries, largest first: the compact size, then the floor.
const BLOCK_SIZES: [f64; 2] = [COMPACT_TEXT, TEXT_FLOOR];
/// The share of a column a label may take with its value beside it; a longer label has
/// its value on the lines below.
const LABEL_CAP: f64 = 0.5;
/// Gap between the block's two columns, mm.
const COLUMN_GAP: f64 = 3.0;

/// One row of the block placed: its label, its value's lines, and its column and top line.
struct Placed {
    key: String,
    lines: Vec<String>,
    col: usize,
    line: usize,
}

/// Flows `rows` down two columns of `lines` lines each, at `size`, each column `col_w` wide;
/// a value too long for its room wraps onto the next lines (it is never cut). Returns the
/// rows placed (a prefix of `rows`) and each column's label width.
fn flow(rows: &[(String, String)], size: f64, col_w: f64, lines: usize) -> (Vec<Placed>, [f64; 2]) {
    let mut placed = Vec::new();
    let mut widths = [0.0; 2];
    let mut start = 0;
    for (col, width) in widths.iter_mut().enumerate() {
        // The longest run of rows from `start` whose values, wrapped beside the run's widest
        // label, take no more than the column's lines.
        let mut best: Option<(f64, Vec<Vec<String>>)> = None;
        for end in start + 1..=rows.len() {
            let run = &rows[start..end];
            // Labels wider than `cap` put their value on the lines below them.
            let cap = col_w * LABEL_CAP;
            let lw = run
                .iter()
                .map(|(k, _)| text_width(k, size, Weight::Regular))
                .filter(|w| *w <= cap)
                .fold(0.0, f64::max);
            let room = col_w - lw - LABEL_GAP * size / BODY_TEXT;
            let wrapped: Vec<Vec<String>> = run
                .iter()
                .map(|(k, v)| {
                    let mut ls = wrap_text(v, size, Weight::Bold, room);
                    if text_width(k, size, Weight::Regular) > cap {
                        ls.insert(0, String::new());
                    }
                    ls
                })
                .collect();
            let whole = wrapped
                .iter()
                .flatten()
                .all(|l| text_width(l, size, Weight::Bold) <= room);
            let taken: usize = wrapped.iter().map(Vec::len).sum();
            if !whole || taken > lines {
                break;
            }
            best = Some((lw, wrapped));
        }
        let Some((lw, wrapped)) = best else {
            break;
        };
        *width = lw;
        let mut line = 0;
        for (i, ls) in wrapped.into_iter().enumerate() {
            let n = ls.len();
            placed.push(Placed {
                key: rows[start + i].0.clone(),
                lines: ls,
                col,
                line,
            });
            line += n;
        }
        start = placed.len();
    }
    (placed, widths)
}

/// The data block in `r`, and how many rows it holds (the rest go to the winding-data sheet).
/// The bench rows come first, in two columns at the compact size (at the floor when they
/// would not fit so), then as many of the rest as the block still holds.
pub(super) fn data_block(input: &Input<'_>, r: &Rect, more_on: Option<usize>) -> (Group, usize) {
    let mut g = Group::id("winding-data");
    g.push(Text::new(r.x + 2.0, r.y + 5.0, 3.2, "b", "Winding data"));
    let rows = data_rows(input);
    let bench = bench_rows(input.design, input.winding).len();
    let foot = foot_lines(input, r.w - 4.0);
    let line = TEXT_FLOOR * 1.3;
    let foot_top = r.bottom() - 1.2 - foot.len() as f64 * line;
    let mut notes = Group::id("numbering");
    for (i, l) in foot.into_iter().enumerate() {
        notes.push(Text::new(
            r.x + 2.0,
            foot_top + (i as f64 + 1.0) * line - 0.4,
            TEXT_FLOOR,
            "",
            l,
        ));
    }
    g.push(notes);
    let top = r.y + 6.8;
    let col_w = (r.w - 4.0 - COLUMN_GAP) / 2.0;
    // The line that names the winding-data sheet, when rows are left over, sits above the foot.
    let more_h = line;
    let mut choice = None;
    for size in BLOCK_SIZES {
        let pitch = size * 1.2;
        let all = ((foot_top - 0.8 - top) / pitch).floor().max(0.0) as usize;
        let (placed, widths) = flow(&rows, size, col_w, all);
        let (placed, widths) = if placed.len() < rows.len() {
            let fewer = ((foot_top - 0.8 - more_h - top) / pitch).floor().max(0.0) as usize;
            flow(&rows, size, col_w, fewer)
        } else {
            (placed, widths)
        };
        let done = placed.len() >= bench;
        choice = Some((size, pitch, placed, widths));
        if done {
            break;
        }
    }
    let Some((size, pitch, placed, widths)) = choice else {
        return (g, 0);
    };
    let shown = placed.len();
    for p in placed {
        let cx = r.x + 2.0 + p.col as f64 * (col_w + COLUMN_GAP);
        let vx = cx + widths[p.col] + LABEL_GAP * size / BODY_TEXT;
        let y = top + (p.line as f64 + 1.0) * pitch - 0.6;
        let mut datum = Group::class("bench").with_data("data-key", &p.key);
        datum.push(Text::new(cx, y, size, "", p.key.clone()));
        // A first line left empty: the value stands below its long label.
        for (i, l) in p.lines.into_iter().enumerate() {
            if !l.is_empty() {
                datum.push(Text::new(vx, y + i as f64 * pitch, size, "b", l));
            }
        }
        g.push(datum);
    }
    if shown < rows.len()
        && let Some(sheet) = more_on
    {
        g.push(Text::new(
            r.x + 2.0,
            foot_top - 0.8 - 0.4,
            TEXT_FLOOR,
            "",
            format!(
                "{} more rows on sheet {sheet} (winding data)",
                rows.len() - shown
            ),
        ));
    }
    (g, shown)
}

/// How many rows the data block of sheet 1 holds in `r`.
pub(super) fn rows_held(input: &Input<'_>, r: &Rect) -> usize {
    data_block(input, r, None).1
}

/// The winding-data sheet: every row, in as many columns as the area takes.
pub(super) fn data_page(input: &Input<'_>, area: &Rect) -> Group {
    let mut g = Group::id("winding-data");
    g.push(Text::new(
        area.x + 2.0,
        area.y + 6.5,
        4.2,
        "b",
        "Winding data",
    ));
    let rows = data_rows(input);
    let top = area.y + 9.0;
    let per_col = (((area.bottom() - top) / DATA_ROW).floor().max(1.0)) as usize;
    let cols = rows.len().div_ceil(per_col).max(1);
    let per_col = rows.len().div_ceil(cols).max(1);
    push_rows(
        &mut g,
        &rows,
        area.x + 2.0,
        top,
        per_col,
        (area.w - 4.0) / cols as f64,
    );
    g
}
