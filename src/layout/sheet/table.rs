//! The tables of the sheets after the first: the connection table (with the winding
//! sequence) and the equalizer table, in column groups side by side, paginated.
//!
//! Part of the `layout` stage (the sheets).

use crate::layout::font::{Weight, cut_to_width};
use crate::layout::style::TEXT_FLOOR;
use crate::layout::tree::{self, Group, Node, Text};
use crate::winding::EqualizerPlan;

use super::order::BOX as CHECK_BOX;
use super::{Input, PageFrame, Rect, TABLE_FONT, TABLE_HEADER, TABLE_ROW, TablePage, hline};

/// Font size of a page heading after sheet 1, mm.
pub(super) const HEADING_SIZE: f64 = 4.2;

/// The heading of a page after sheet 1: bold, at the top left of the content area `c`.
pub(super) fn page_heading(c: &Rect, text: impl Into<String>) -> Node {
    Text::new(c.x + 2.0, c.y + 6.5, HEADING_SIZE, "b", text).into()
}

/// One column of a table.
struct Column {
    head: [&'static str; 2],
    width: f64,
}

/// Which optional columns of the connection table a winding shows.
#[derive(Clone, Copy)]
struct Shown {
    /// The position columns: only when a slot layer holds more than one side (u > 1, or a
    /// frog-leg's two elements).
    positions: bool,
    /// The front-pitch column: only when some connection's front pitch is not the nominal one
    /// (dummy coils stepped over). It costs a column group a page with u > 1 on Letter, A3 and
    /// tabloid, so a winding whose every row would read the nominal value (printed in the
    /// winding-data block) leaves it out.
    front_pitch: bool,
    /// The element column: only on a winding of several elements (frog-leg).
    elements: bool,
    /// The dummy column: only when the winding has dummy coils (every other row would be
    /// blank, and the column costs a frog-leg's table its second group a page).
    dummies: bool,
}

impl Shown {
    fn of(input: &Input<'_>) -> Shown {
        let w = input.winding;
        Shown {
            positions: w.sides_per_layer(input.design.coils_per_slot) > 1,
            front_pitch: w
                .connections
                .iter()
                .any(|c| c.front_pitch.is_some_and(|y| y != w.pitches.front)),
            elements: w.is_multi_element(),
            dummies: !w.dummy_coils.is_empty(),
        }
    }
}

/// When a connection-table column is shown.
#[derive(Clone, Copy)]
enum When {
    Always,
    Elements,
    Positions,
    FrontPitch,
    Dummies,
}

/// The connection-table columns the winding shows.
fn connection_columns(shown: Shown) -> Vec<Column> {
    // (heading, width in mm, when shown). The front-pitch column is 10 mm: its heading is
    // 8.6 mm at the heading size, and up to four digits fit (8.9 mm at the table font).
    const COLUMNS: [([&str; 2], f64, When); 12] = [
        (["coil", ""], 13.0, When::Always),
        (["elem.", ""], 12.0, When::Elements),
        (["top", "slot"], 12.0, When::Always),
        (["top", "pos"], 9.0, When::Positions),
        (["bottom", "slot"], 14.0, When::Always),
        (["bot.", "pos"], 9.0, When::Positions),
        (["start", "seg"], 12.0, When::Always),
        (["end", "seg"], 12.0, When::Always),
        (["front", "pitch"], 10.0, When::FrontPitch),
        (["seq", ""], 15.0, When::Always),
        (["path", ""], 11.0, When::Always),
        (["dummy", ""], 15.0, When::Dummies),
    ];
    COLUMNS
        .iter()
        .filter(|(_, _, when)| match when {
            When::Always => true,
            When::Elements => shown.elements,
            When::Positions => shown.positions,
            When::FrontPitch => shown.front_pitch,
            When::Dummies => shown.dummies,
        })
        .map(|&(head, width, _)| Column { head, width })
        .collect()
}

/// Width of the connection table, mm.
pub(super) fn connection_width(input: &Input<'_>) -> f64 {
    connection_columns(Shown::of(input))
        .iter()
        .map(|c| c.width)
        .sum()
}

/// The equalizer-table columns: the list column is as wide as p numbers need (about 7
/// digit widths each, a digit about 0.6 em), up to `max` mm.
fn equalizer_columns(pole_pairs: u32, max: f64) -> Vec<Column> {
    let checks = EQ_CHECKS.len() as f64 * EQ_CHECK_W;
    let list = (f64::from(pole_pairs) * 7.0 * 0.6 * TABLE_FONT).clamp(50.0, max - 13.0 - checks);
    let mut cols = vec![
        Column {
            head: ["ring", ""],
            width: 13.0,
        },
        Column {
            head: ["segments joined", ""],
            width: list,
        },
    ];
    cols.extend(EQ_CHECKS.iter().map(|&head| Column {
        head,
        width: EQ_CHECK_W,
    }));
    cols
}

/// The check-off columns of the equalizer table: the ring fitted, its taps soldered.
const EQ_CHECKS: [[&str; 2]; 2] = [["fitted", ""], ["sol-", "dered"]];
/// Width of a check-off column of the equalizer table, mm.
const EQ_CHECK_W: f64 = 16.0;

/// Width of the equalizer table, mm.
pub(super) fn equalizer_width(pole_pairs: u32, max: f64) -> f64 {
    equalizer_columns(pole_pairs, max)
        .iter()
        .map(|c| c.width)
        .sum()
}

/// Where the tables go on a page.
pub(super) fn table_area(frame: &PageFrame) -> Rect {
    let c = &frame.content;
    Rect {
        x: c.x + 2.0,
        y: c.y + 11.0,
        w: c.w - 4.0,
        h: c.h - 13.0,
    }
}

/// The caution box of the table pages, left of the title block.
pub(super) fn caution_rect(frame: &PageFrame) -> Rect {
    let t = &frame.title_block;
    Rect {
        x: frame.frame.x + 2.0,
        y: t.y + 2.0,
        w: t.x - frame.frame.x - 6.0,
        h: t.h - 4.0,
    }
}

fn table_head(g: &mut Group, cols: &[Column], x: f64, y: f64) -> f64 {
    let total: f64 = cols.iter().map(|c| c.width).sum();
    let mut cx = x;
    for (i, c) in cols.iter().enumerate() {
        // Numbers are right-aligned under their heads; the equalizer list (a second column
        // wider than any number) reads from the left.
        let left = i > 0 && c.width > 40.0;
        let (hx, cls) = if left {
            (cx + 3.0, "b")
        } else {
            (cx + c.width - 1.5, "b end")
        };
        g.push(Text::new(hx, y + 3.6, TABLE_FONT * 0.86, cls, c.head[0]));
        if !c.head[1].is_empty() {
            g.push(Text::new(hx, y + 7.3, TABLE_FONT * 0.86, cls, c.head[1]));
        }
        cx += c.width;
    }
    g.push(hline(x, x + total, y + TABLE_HEADER - 0.3, "rule"));
    total
}

/// A page of the connection table.
pub(super) fn connection_page(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    frame: &PageFrame,
    page: &TablePage,
    seq: &[String],
) {
    let conns = &input.winding.connections;
    let c = &frame.content;
    let first = conns.get(page.rows.start).map_or(0, |r| r.coil);
    let last = conns
        .get(page.rows.end.saturating_sub(1))
        .map_or(0, |r| r.coil);
    out.push(page_heading(
        c,
        format!(
            "Connection table: coils {first}\u{2013}{last} of {}",
            conns.len()
        ),
    ));
    let hint = "start lead from the top-layer side, end lead from the bottom-layer side \u{b7} seq = order in the winding trace";
    out.push(Text::new(c.right() - 2.0, c.y + 6.5, TEXT_FLOOR, "end", hint).into());
    let shown = Shown::of(input);
    let cols = connection_columns(shown);
    let mut g = Group::id(format!("table-{}", page.rows.start + 1)).with_class("connection-table");
    for (gx, rows) in &page.groups {
        let total = table_head(&mut g, &cols, *gx, page.top);
        for (i, r) in rows.clone().enumerate() {
            let conn = &conns[r];
            let y = page.top + TABLE_HEADER + (i as f64 + 1.0) * TABLE_ROW - 1.4;
            if i % 2 == 1 {
                g.push(tree::Rect::filled(
                    "#f1f1f1",
                    *gx,
                    y - TABLE_ROW + 1.4,
                    total,
                    TABLE_ROW,
                ));
            }
            let seg = |s: Option<u32>| s.map_or_else(|| "\u{2014}".to_string(), |s| s.to_string());
            let path = input.winding.coil_path[(conn.coil - 1) as usize];
            let mut cells = vec![conn.coil.to_string()];
            if shown.elements {
                cells.push(conn.element.as_str().to_string());
            }
            // Places counted across the whole slot, as the winding order gives them.
            let u = input.design.coils_per_slot;
            let place = |pos: u32| input.winding.place_in_slot(conn, pos, u).to_string();
            cells.push(conn.top.slot.to_string());
            if shown.positions {
                cells.push(place(conn.top.position));
            }
            cells.push(conn.bottom.slot.to_string());
            if shown.positions {
                cells.push(place(conn.bottom.position));
            }
            cells.push(seg(conn.start_segment));
            cells.push(seg(conn.end_segment));
            if shown.front_pitch {
                cells.push(
                    conn.front_pitch
                        .map_or_else(|| "\u{2014}".to_string(), |y| y.to_string()),
                );
            }
            cells.push(seq[(conn.coil - 1) as usize].clone());
            cells.push(if conn.dummy || path == 0 {
                "\u{2013}".into()
            } else {
                path.to_string()
            });
            if shown.dummies {
                cells.push(if conn.dummy {
                    "DEAD".into()
                } else {
                    String::new()
                });
            }
            let mut row = Group::class("row").with_data("data-coil", conn.coil);
            if let (Some(s), Some(e)) = (conn.start_segment, conn.end_segment) {
                row = row
                    .with_data("data-start-seg", s)
                    .with_data("data-end-seg", e);
            }
            if let Some(y) = conn.front_pitch.filter(|_| shown.front_pitch) {
                row = row.with_data("data-front-pitch", y);
            }
            let mut cx = *gx;
            for (j, (col, cell)) in cols.iter().zip(cells).enumerate() {
                let cls = if j == 0 || col.head[0] == "dummy" {
                    "b end"
                } else {
                    "end"
                };
                if !cell.is_empty() {
                    row.push(Text::new(cx + col.width - 1.5, y, TABLE_FONT, cls, cell));
                }
                cx += col.width;
            }
            g.push(row);
        }
    }
    out.push(g.into());
}

/// A page of the equalizer table (`total` rings in all).
pub(super) fn equalizer_page(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    frame: &PageFrame,
    page: &TablePage,
    total: usize,
) {
    let EqualizerPlan::Possible(e) = &input.winding.equalizers else {
        return;
    };
    let c = &frame.content;
    out.push(page_heading(
        c,
        format!(
            "Equalizer table: rings {}\u{2013}{} of {total}",
            page.rows.start + 1,
            page.rows.end
        ),
    ));
    let hint = format!(
        "each ring joins {} segments {} apart (two pole pitches, 2C/P)",
        input.design.pole_pairs(),
        e.pitch
    );
    out.push(Text::new(c.right() - 2.0, c.y + 6.5, TEXT_FLOOR, "end", hint).into());
    let cols = equalizer_columns(input.design.pole_pairs(), table_area(frame).w);
    let mut g =
        Group::id(format!("eq-table-{}", page.rows.start + 1)).with_class("equalizer-table");
    for (gx, rows) in &page.groups {
        table_head(&mut g, &cols, *gx, page.top);
        for (i, r) in rows.clone().enumerate() {
            let segs = &e.groups[r];
            let y = page.top + TABLE_HEADER + (i as f64 + 1.0) * TABLE_ROW - 1.4;
            let joined = segs
                .iter()
                .map(u32::to_string)
                .collect::<Vec<_>>()
                .join(" \u{b7} ");
            let mut row = Group::class("row").with_data("data-eq", r + 1);
            row.push(Text::new(
                gx + cols[0].width - 1.5,
                y,
                TABLE_FONT,
                "b end",
                format!("E{}", r + 1),
            ));
            row.push(Text::new(
                gx + cols[0].width + 3.0,
                y,
                TABLE_FONT,
                "",
                cut_to_width(&joined, TABLE_FONT, Weight::Regular, cols[1].width - 4.0),
            ));
            // A box to tick in each check-off column.
            let (bw, bh) = CHECK_BOX;
            let mut cx = gx + cols[0].width + cols[1].width;
            for c in &cols[2..] {
                row.push(tree::Rect::new(
                    "checkbox",
                    cx + (c.width - bw) / 2.0,
                    y + 1.4 - (TABLE_ROW + bh) / 2.0,
                    bw,
                    bh,
                ));
                cx += c.width;
            }
            g.push(row);
        }
    }
    out.push(g.into());
}
