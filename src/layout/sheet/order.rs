//! The winding-order sheets: the coils in the order a shop lays them, slot by slot, with
//! empty boxes to tick as each coil goes in, is connected and is soldered.
//!
//! Part of the `layout` stage (the sheets). The first `span` slots' top sides are left
//! lifted until the last coils' bottom sides are in (common practice), and the leads are
//! connected bar by bar once every coil is in.

use crate::base::number::fmt_fixed;
use crate::design::ConductorShape;
use crate::layout::font::{Weight, text_width, wrap_text};
use crate::layout::style::{BODY_TEXT, TEXT_FLOOR};
use crate::layout::tree::{self, Group, Node, Text};

use super::table::page_heading;
use super::{Input, PageFrame, Rect, TABLE_HEADER, TablePage, hline};

/// The columns: heading lines and width, mm. The last four are left empty for the shop.
const COLUMNS: [([&str; 2], f64); 11] = [
    (["step", ""], 13.0),
    (["coil", ""], 13.0),
    (["top", "slot/pos"], 19.0),
    (["bottom", "slot/pos"], 19.0),
    (["start", "bar"], 14.0),
    (["end", "bar"], 14.0),
    (["turns and wire", ""], 74.0),
    (["in", ""], 11.0),
    (["con-", "nected"], 15.0),
    (["sol-", "dered"], 15.0),
    (["initials", ""], 20.0),
];
/// How many columns carry text; the rest are check-off boxes and the initials.
const TEXT_COLUMNS: usize = 7;
/// Row pitch, mm: the body text (3.5 mm) with 0.7 mm between rows, so that an A4 sheet
/// holds at least 30 steps below its words.
pub(super) const ORDER_ROW: f64 = 4.2;
/// A check-off box, mm: 5 wide and 3.4 high, inside its row with a margin above and below
/// (the equalizer table's too).
pub(super) const BOX: (f64, f64) = (5.0, 3.4);
/// Room a text cell leaves beside its text, mm.
const CELL_PAD: f64 = 3.5;

/// The columns for `input`: on a winding of several elements (frog-leg) an element column
/// after the coil, taken from the turns-and-wire column so the table keeps its width. A text
/// column too narrow for its widest cell is widened to hold it whole.
fn columns(input: &Input<'_>) -> Vec<([&'static str; 2], f64)> {
    let multi = input.winding.is_multi_element();
    let mut c = COLUMNS.to_vec();
    if multi {
        c[6].1 -= 12.0;
        c.insert(2, (["elem.", ""], 12.0));
    }
    let order = Order::cells_only(input);
    let text_columns = TEXT_COLUMNS + usize::from(multi);
    for r in 0..input.winding.connections.len() {
        for (j, cell) in order.cells(r).iter().enumerate().take(text_columns) {
            let weight = if j == 1 {
                Weight::Bold
            } else {
                Weight::Regular
            };
            let need = text_width(cell, BODY_TEXT, weight) + CELL_PAD;
            if need > c[j].1 {
                c[j].1 = need.ceil();
            }
        }
    }
    c
}

/// Width of the winding-order table of `input`, mm.
pub(super) fn order_width(input: &Input<'_>) -> f64 {
    columns(input).iter().map(|c| c.1).sum()
}

/// The turns and the wire of one coil of `turns` turns in shop words ("4 turns, 2 in hand,
/// Ø1.60").
fn turns_and_wire(input: &Input<'_>, turns: u32) -> String {
    let mut s = format!("{turns} turn{}", if turns == 1 { "" } else { "s" });
    if let Some(c) = &input.design.conductor {
        let (wire, strands) = match c.shape {
            ConductorShape::Round {
                diameter_mm,
                strands,
                ..
            } => (format!("\u{d8}{}", fmt_fixed(diameter_mm, 2)), strands),
            ConductorShape::Rectangular {
                width_mm,
                height_mm,
                strands,
                ..
            } => (
                format!(
                    "{}\u{d7}{}",
                    fmt_fixed(width_mm, 2),
                    fmt_fixed(height_mm, 2)
                ),
                strands,
            ),
        };
        s.push_str(&format!(", {strands} in hand, {wire}"));
    }
    s
}

/// Coils whose top sides are left lifted: those in the first `span` slots.
fn lifted(input: &Input<'_>) -> usize {
    (input.winding.pitches.span as usize * input.design.coils_per_slot as usize)
        .min(input.winding.connections.len())
}

/// The winding-order words at the head of the first page.
fn order_words(input: &Input<'_>) -> String {
    let span = input.winding.pitches.span;
    format!(
        "Lay the coils slot by slot in step order. Leave the top sides of the coils in slots 1\u{2013}{span} (steps 1\u{2013}{}) lifted until the bottom sides of the last coils are in, then drop them in (common practice). When every coil is in, connect the leads bar by bar from bar 1, ticking each box as it is done.",
        lifted(input)
    )
}

/// Where the table starts on the first page, below the words, mm from the area's top.
pub(super) fn first_page_drop(input: &Input<'_>, area: &Rect) -> f64 {
    let lines = wrap_text(
        &order_words(input),
        TEXT_FLOOR,
        Weight::Regular,
        area.w - 4.0,
    );
    lines.len() as f64 * TEXT_FLOOR * 1.3 + 1.5
}

/// A page of the winding order.
pub(super) fn order_page(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    frame: &PageFrame,
    page: &TablePage,
) {
    let conns = &input.winding.connections;
    let c = &frame.content;
    out.push(page_heading(
        c,
        format!(
            "Winding order: steps {}\u{2013}{} of {}",
            page.rows.start + 1,
            page.rows.end,
            conns.len()
        ),
    ));
    if page.rows.start == 0 {
        first_page_words(out, input, frame);
    }
    let order = Order::new(input);
    let mut g = Group::id(format!("order-{}", page.rows.start + 1)).with_class("winding-order");
    for (gx, rows) in &page.groups {
        let total: f64 = order.cols.iter().map(|c| c.1).sum();
        order_heads(&mut g, &order.cols, *gx, page);
        for (i, r) in rows.clone().enumerate() {
            let y = page.top + TABLE_HEADER + (i as f64 + 1.0) * page.row - 1.4;
            g.push(order.row(r, *gx, y, page));
            g.push(hline(*gx, *gx + total, y + 1.4, "thin"));
        }
    }
    out.push(g.into());
}

/// The words above the table on the first page.
fn first_page_words(out: &mut Vec<Node>, input: &Input<'_>, frame: &PageFrame) {
    let area = super::table::table_area(frame);
    let lines = wrap_text(
        &order_words(input),
        TEXT_FLOOR,
        Weight::Regular,
        area.w - 4.0,
    );
    for (i, l) in lines.into_iter().enumerate() {
        out.push(
            Text::new(
                area.x,
                area.y + (i as f64 + 0.8) * TEXT_FLOOR * 1.3,
                TEXT_FLOOR,
                "",
                l,
            )
            .into(),
        );
    }
}

/// The column heads of one group of rows at `gx`, and the rule below them.
fn order_heads(g: &mut Group, cols: &[([&'static str; 2], f64)], gx: f64, page: &TablePage) {
    let mut cx = gx;
    for &(head, width) in cols {
        let hx = cx + width - 1.5;
        g.push(Text::new(hx, page.top + 3.6, 3.0, "b end", head[0]));
        if !head[1].is_empty() {
            g.push(Text::new(hx, page.top + 7.3, 3.0, "b end", head[1]));
        }
        cx += width;
    }
    g.push(hline(
        gx,
        gx + cols.iter().map(|c| c.1).sum::<f64>(),
        page.top + TABLE_HEADER - 0.3,
        "rule",
    ));
}

/// What every row of the winding order reads: the wire of each element, how many steps
/// are lifted, and the columns.
struct Order<'a> {
    input: &'a Input<'a>,
    wires: Vec<String>,
    lift: usize,
    multi: bool,
    cols: Vec<([&'static str; 2], f64)>,
    text_columns: usize,
}

impl<'a> Order<'a> {
    fn new(input: &'a Input<'a>) -> Order<'a> {
        Order {
            cols: columns(input),
            ..Order::cells_only(input)
        }
    }

    /// What the cells are read from, with the columns left unmeasured.
    fn cells_only(input: &'a Input<'a>) -> Order<'a> {
        let multi = input.winding.is_multi_element();
        Order {
            input,
            wires: input
                .winding
                .elements
                .iter()
                .map(|e| turns_and_wire(input, e.turns))
                .collect(),
            lift: lifted(input),
            multi,
            cols: Vec::new(),
            text_columns: TEXT_COLUMNS + usize::from(multi),
        }
    }

    /// The text cells of step `r` (0-based).
    fn cells(&self, r: usize) -> Vec<String> {
        let input = self.input;
        let conn = &input.winding.connections[r];
        let u = input.design.coils_per_slot;
        let place = |slot: u32, pos: u32| {
            if u == 1 {
                slot.to_string()
            } else {
                format!("{slot}/{pos}")
            }
        };
        let bar = |s: Option<u32>| s.map_or_else(|| "cut".to_string(), |s| s.to_string());
        let element = input
            .winding
            .elements
            .iter()
            .position(|e| e.holds(conn.coil))
            .unwrap_or(0);
        let wire = &self.wires[element];
        let note = if conn.dummy {
            "dummy: ends cut and taped".to_string()
        } else if r < self.lift {
            format!("{wire}; top lifted")
        } else {
            wire.clone()
        };
        let mut cells = vec![
            (r + 1).to_string(),
            conn.coil.to_string(),
            place(conn.top.slot, conn.top.position),
            place(conn.bottom.slot, conn.bottom.position),
            bar(conn.start_segment),
            bar(conn.end_segment),
            note,
        ];
        if self.multi {
            cells.insert(2, conn.element.as_str().to_string());
        }
        cells
    }

    /// Step `r` (0-based) as a row at `gx`, baseline `y`: its text cells, then a box to
    /// tick for each check column.
    fn row(&self, r: usize, gx: f64, y: f64, page: &TablePage) -> Group {
        let conn = &self.input.winding.connections[r];
        let cells = self.cells(r);
        let text_columns = self.text_columns;
        let mut row = Group::class("order-row")
            .with_data("data-step", r + 1)
            .with_data("data-coil", conn.coil);
        let mut cx = gx;
        for (j, (head, width)) in self.cols.iter().enumerate() {
            if j < text_columns {
                let (x, cls) = if j == text_columns - 1 {
                    (cx + 2.0, "")
                } else {
                    (cx + width - 1.5, if j == 1 { "b end" } else { "end" })
                };
                // The columns are measured to hold every cell whole.
                row.push(Text::new(x, y, BODY_TEXT, cls, cells[j].clone()));
            } else {
                // A box to tick, or a wider one to initial.
                let (bw, bh) = BOX;
                let bw = if head[0] == "initials" {
                    width - 3.0
                } else {
                    bw
                };
                row.push(tree::Rect::new(
                    "checkbox",
                    cx + (width - bw) / 2.0,
                    y + 1.4 - (page.row + bh) / 2.0,
                    bw,
                    bh,
                ));
            }
            cx += width;
        }
        row
    }
}
