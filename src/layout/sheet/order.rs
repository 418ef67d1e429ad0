//! The winding-order sheets: the coils in the order a shop lays them, slot by slot, with
//! empty boxes to tick as each coil goes in, is connected and is soldered.
//!
//! Part of the `layout` stage (the sheets). The first `span` slots' top sides are left
//! lifted until the last coils' bottom sides are in (common practice), and the leads are
//! connected bar by bar once every coil is in. A frog-leg's two elements are wound one after
//! the other, the lap element first (common practice, from memory), each with its own lifted
//! tops; the wave element's sides lie beside the lap element's in each layer of the slot, as
//! the engine lays them (the developed diagram draws them so), and the order gives each side's
//! place counted across the whole slot.

use std::collections::BTreeMap;

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
/// Row pitch, mm: the body text (3.5 mm, a capital of 2.55 mm) a row, its ink (2.8 mm above
/// the baseline at most, 0.7 mm below) clear of the next row's, and the rows told apart by
/// shading every other one instead of rules, so that an A4 sheet holds at least 36 steps
/// below its words (39 on the sheets after the first).
pub(super) const ORDER_ROW: f64 = 3.5;
/// How far a row's baseline sits above the row's bottom edge, mm: the descent of the body
/// text (0.24 em at most in DejaVu Sans, 0.7 mm) and a little.
const ORDER_BASELINE: f64 = 0.72;
/// A check-off box, mm: 5 wide and 3.4 high, inside its row with a margin above and below
/// (the equalizer table's).
pub(super) const BOX: (f64, f64) = (5.0, 3.4);
/// Height of a winding-order check-off box, mm: inside its 3.5 mm row with 0.35 mm above and
/// below.
const ORDER_BOX_H: f64 = 2.8;
/// Room a text cell leaves beside its text, mm.
const CELL_PAD: f64 = 3.5;

/// The columns for `input`: on a winding of several elements (frog-leg) an element column
/// after the coil, taken from the turns-and-wire column so the table keeps its width. A text
/// column too narrow for its widest cell is widened to hold it whole.
fn columns(input: &Input<'_>) -> Vec<Column> {
    input
        .order_columns
        .get_or_init(|| measured_columns(input))
        .clone()
}

/// A column of the winding order: its heading (two lines) and its width, mm.
pub(super) type Column = ([&'static str; 2], f64);

/// The columns, measured over every step (see [`columns`]).
fn measured_columns(input: &Input<'_>) -> Vec<Column> {
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

/// The coils whose top sides wait lifted, and when they go down, read off the traced
/// winding in step order: a coil's top side waits when a coil of its own element laid later
/// puts its bottom side into the same slot, under it (derived). The steps are the
/// connections in order: element by element, each slot by slot.
pub(super) struct Lift {
    /// Per step (0-based): the top side waits lifted.
    lifted: Vec<bool>,
    /// Per element, in winding order.
    elements: Vec<ElementLift>,
}

/// One element's lifted tops.
struct ElementLift {
    /// "lap" or "wave".
    name: &'static str,
    /// The element's steps, 0-based.
    steps: std::ops::Range<usize>,
    /// First and last step (0-based) whose top waits, and the slots they lie in.
    lifted: Option<((usize, usize), (u32, u32))>,
    /// The step (0-based) after which every lifted top of the element can go down.
    drop_after: Option<usize>,
}

impl Lift {
    fn of(input: &Input<'_>) -> Lift {
        let w = input.winding;
        let conns = &w.connections;
        let element = |coil: u32| w.elements.iter().position(|e| e.holds(coil)).unwrap_or(0);
        // The last step putting a bottom side into each slot, element by element.
        let mut last_bottom: BTreeMap<(usize, u32), usize> = BTreeMap::new();
        for (r, c) in conns.iter().enumerate() {
            last_bottom.insert((element(c.coil), c.bottom.slot), r);
        }
        let under = |r: usize| {
            let c = &conns[r];
            last_bottom
                .get(&(element(c.coil), c.top.slot))
                .copied()
                .filter(|&l| l > r)
        };
        let lifted: Vec<bool> = (0..conns.len()).map(|r| under(r).is_some()).collect();
        let elements = w
            .elements
            .iter()
            .enumerate()
            .map(|(k, e)| {
                let steps = conns
                    .iter()
                    .position(|c| element(c.coil) == k)
                    .map_or(0..0, |a| a..a + e.coils as usize);
                let waiting: Vec<usize> = steps.clone().filter(|&r| lifted[r]).collect();
                let slots = waiting.iter().map(|&r| conns[r].top.slot);
                ElementLift {
                    name: e.kind.as_str(),
                    lifted: waiting.first().zip(waiting.last()).map(|(&a, &b)| {
                        (
                            (a, b),
                            (slots.clone().min().unwrap_or(1), slots.max().unwrap_or(1)),
                        )
                    }),
                    drop_after: waiting.iter().filter_map(|&r| under(r)).max(),
                    steps,
                }
            })
            .collect();
        Lift { lifted, elements }
    }
}

/// "1–8", or "5" for one.
fn range<T: std::fmt::Display + PartialEq>(a: T, b: T) -> String {
    if a == b {
        a.to_string()
    } else {
        format!("{a}\u{2013}{b}")
    }
}

/// The winding-order words at the head of the first page.
fn order_words(input: &Input<'_>) -> String {
    let lift = Lift::of(input);
    let w = input.winding;
    let u = input.design.coils_per_slot;
    let waits = |e: &ElementLift| match (e.lifted, e.drop_after) {
        (Some(((a, b), (s, t))), Some(d)) => format!(
            "leave the top sides of steps {} (slots {}) lifted until the bottom sides under them are in (step {}), then drop them in",
            range(a + 1, b + 1),
            range(s, t),
            d + 1
        ),
        _ => "no top side waits".to_string(),
    };
    let close = "When every coil is in, connect the leads bar by bar from bar 1, ticking each box as it is done.";
    if !w.is_multi_element() {
        let e = &lift.elements[0];
        return format!(
            "Lay the coils slot by slot in step order. {} (common practice). {close}",
            capitalised(&waits(e))
        );
    }
    // A frog-leg: the elements one after the other, each slot by slot (common practice, from
    // memory); each layer of a slot holds u sides of each element, side by side.
    let places: Vec<String> = lift
        .elements
        .iter()
        .enumerate()
        .map(|(k, e)| {
            let first = k as u32 * u + 1;
            format!(
                "the {} element's at position{} {}",
                e.name,
                if u == 1 { "" } else { "s" },
                range(first, first + u - 1)
            )
        })
        .collect();
    let mut s = format!(
        "Frog-leg: the {} elements are separate coils in the same slots. Each layer of a slot holds {} sides, {} (positions counted across the slot, as in the slot/pos columns). ",
        lift.elements
            .iter()
            .map(|e| e.name)
            .collect::<Vec<_>>()
            .join(" and "),
        w.sides_per_layer(u),
        places.join(", beside them ")
    );
    for (k, e) in lift.elements.iter().enumerate() {
        let steps = range(e.steps.start + 1, e.steps.end);
        if k == 0 {
            s.push_str(&format!(
                "Wind the {} element first, steps {steps}, slot by slot: {}. ",
                e.name,
                waits(e)
            ));
        } else {
            s.push_str(&format!(
                "Then the {} element beside it, steps {steps}, slot by slot: {}. ",
                e.name,
                waits(e)
            ));
        }
    }
    s.push_str(close);
    s
}

/// `s` with its first letter a capital.
fn capitalised(s: &str) -> String {
    let mut c = s.chars();
    c.next()
        .map_or_else(String::new, |f| f.to_uppercase().chain(c).collect())
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
        wire_line(out, input, c);
    }
    let order = Order::new(input);
    let mut g = Group::id(format!("order-{}", page.rows.start + 1)).with_class("winding-order");
    for (gx, rows) in &page.groups {
        let total: f64 = order.cols.iter().map(|c| c.1).sum();
        order_heads(&mut g, &order.cols, order.text_columns, *gx, page);
        for (i, r) in rows.clone().enumerate() {
            let row_top = page.top + TABLE_HEADER + i as f64 * page.row;
            // Every other row shaded: the rows are told apart without rules through the ink.
            if i % 2 == 1 {
                g.push(tree::Rect::filled("#f1f1f1", *gx, row_top, total, page.row));
            }
            g.push(order.row(r, *gx, row_top, page));
        }
        if !rows.is_empty() {
            let bottom = page.top + TABLE_HEADER + rows.len() as f64 * page.row;
            g.push(hline(*gx, *gx + total, bottom, "thin"));
        }
    }
    out.push(g.into());
}

/// The wire to order, right on the heading's line of the first page, at the floor or above
/// (it stands on the coil-making sheet in full when the line has no room beside the heading).
fn wire_line(out: &mut Vec<Node>, input: &Input<'_>, c: &Rect) {
    let Some(words) = super::coil_page::wire_to_order_words(input) else {
        return;
    };
    let heading = text_width(
        "Winding order: steps 0000\u{2013}0000 of 0000",
        super::table::HEADING_SIZE,
        Weight::Bold,
    );
    let room = c.w - 4.0 - heading - 8.0;
    let Some(size) = [3.0, TEXT_FLOOR]
        .into_iter()
        .find(|&z| text_width(&words, z, Weight::Regular) <= room)
    else {
        return;
    };
    out.push(Text::new(c.right() - 2.0, c.y + 6.5, size, "end", words).into());
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
/// Heads stand over their cells: right-aligned, but the last text column's (read from the
/// left) from the left.
fn order_heads(
    g: &mut Group,
    cols: &[([&'static str; 2], f64)],
    text_columns: usize,
    gx: f64,
    page: &TablePage,
) {
    let mut cx = gx;
    for (j, &(head, width)) in cols.iter().enumerate() {
        let (hx, cls) = if j + 1 == text_columns {
            (cx + 2.0, "b")
        } else {
            (cx + width - 1.5, "b end")
        };
        g.push(Text::new(hx, page.top + 3.6, 3.0, cls, head[0]));
        if !head[1].is_empty() {
            g.push(Text::new(hx, page.top + 7.3, 3.0, cls, head[1]));
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
    lift: &'a Lift,
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
            lift: input.order_lift.get_or_init(|| Lift::of(input)),
            multi,
            cols: Vec::new(),
            text_columns: TEXT_COLUMNS + usize::from(multi),
        }
    }

    /// The text cells of step `r` (0-based).
    fn cells(&self, r: usize) -> Vec<String> {
        let input = self.input;
        let conn = &input.winding.connections[r];
        let w = input.winding;
        let u = input.design.coils_per_slot;
        let across = w.sides_per_layer(u);
        // Each side's place counted across the whole slot (a frog-leg's wave sides follow
        // the lap element's).
        let place = |slot: u32, pos: u32| {
            if across == 1 {
                slot.to_string()
            } else {
                format!("{slot}/{}", w.place_in_slot(conn, pos, u))
            }
        };
        let bar = |s: Option<u32>| s.map_or_else(|| "cut".to_string(), |s| s.to_string());
        let element = w
            .elements
            .iter()
            .position(|e| e.holds(conn.coil))
            .unwrap_or(0);
        let mut note = if conn.dummy {
            "dummy: ends cut and taped".to_string()
        } else {
            self.wires[element].clone()
        };
        if self.lift.lifted[r] {
            note.push_str("; top lifted");
        }
        if self.lift.elements.iter().any(|e| e.drop_after == Some(r)) {
            note.push_str("; drop lifted tops");
        }
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

    /// Step `r` (0-based) as a row at `gx` whose top edge is at `row_top`: its text cells,
    /// then a box to tick for each check column.
    fn row(&self, r: usize, gx: f64, row_top: f64, page: &TablePage) -> Group {
        let y = row_top + page.row - ORDER_BASELINE;
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
                let (bw, bh) = (BOX.0, ORDER_BOX_H);
                let bw = if head[0] == "initials" {
                    width - 3.0
                } else {
                    bw
                };
                row.push(tree::Rect::new(
                    "checkbox",
                    cx + (width - bw) / 2.0,
                    row_top + (page.row - bh) / 2.0,
                    bw,
                    bh,
                ));
            }
            cx += width;
        }
        row
    }
}
