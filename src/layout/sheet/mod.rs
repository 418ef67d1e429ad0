//! Printable winding sheets as page trees: sheet 1 is the developed diagram with the title
//! block, the winding-data block, the legend, the numbering convention and the caution box;
//! the sheets after it carry, in order, the commutator end view, the coil making (when the
//! rating has one: `coil_page`), the winding order with
//! check-off boxes, the connection table (with the winding sequence), the equalizer table, the
//! test and sign-off sheets and, when sheet 1 cannot hold it, the winding data in full.
//!
//! Part of the `layout` stage: [`Checked`] and the armature test in, one [`Page`] a sheet out.
//! [`frame`] holds the page geometry and pagination; [`title`] the title block and the failure
//! band; [`data`] the winding-data block; [`legend`] the legend; [`caution`] the caution box;
//! [`table`] the tables; [`ring`] the end view; [`order`] the winding order; [`test_sheet`] the
//! test and sign-off sheets. Pages are landscape and sized in millimetres. The date printed is the design's
//! `[job] date`; the clock is never read.

pub mod caution;
pub mod coil_page;
pub mod data;
pub mod frame;
pub mod legend;
pub mod order;
pub mod ring;
pub mod rows;
pub mod table;
pub mod test_sheet;
pub mod title;

pub use frame::*;

use crate::checks::Checked;
use crate::design::Design;
use crate::features::armature_test::ArmatureTest;
use crate::rating::RatingReport;
use crate::winding::{EqualizerPlan, Winding};

use super::developed::{
    Diagram, DiagramOptions, Part, WholeRefused, Window, nodes::diagram_group, printed_diagrams,
};
use super::font::{Weight, cut_to_width, fit_size, wrap_text};
use super::paper::Paper;
use super::style::{TEXT_FLOOR, text_face};
use super::tree::{self, Line, Node, Page, PageKind, PageUnit, Text};

/// How the sheets are laid out.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetOptions {
    /// Paper size (`--paper`, default A4).
    pub paper: Paper,
    /// Diagram window (`--window`, default automatic).
    pub window: Window,
    /// The tool version printed in the title block (the CLI passes `CARGO_PKG_VERSION`).
    pub version: String,
}

/// What the blocks are filled from.
struct Input<'a> {
    design: &'a Design,
    winding: &'a Winding,
    /// The rating, when the design has rating inputs.
    rating: Option<&'a RatingReport>,
    /// The expected armature-test readings, computed once by the caller.
    test: &'a ArmatureTest,
    options: &'a SheetOptions,
    /// Failed error-level checks, `id: message`; when any, every sheet carries the band.
    failures: Vec<String>,
    /// The winding-data rows after the design's own (the rating summary).
    extra_rows: Vec<(String, String)>,
    /// The winding order's columns, measured once over every step (`order::columns`).
    order_columns: std::cell::OnceCell<Vec<order::Column>>,
    /// The winding order's lifted tops, found once (`order::Lift`).
    order_lift: std::cell::OnceCell<order::Lift>,
}

/// What one sheet shows.
enum Content {
    /// A developed diagram: the whole, or a part of one continued over several sheets
    /// (sheet k carries part k); sheet 1 carries the blocks.
    Diagram(usize),
    WindingData,
    Connections(TablePage),
    Equalizers(TablePage),
    WindingOrder(TablePage),
    CommutatorEnd,
    CoilMaking,
    /// A test sheet; the first carries the test and sign-off blocks.
    Tests(TablePage, bool),
}

/// Lays out every sheet of `checked`, in order; `result[0]` is sheet 1. `test` is the
/// design's expected armature test (`features::armature_test::expected` with the default options),
/// which the test sheets print. The developed diagram takes as many sheets as it needs to
/// draw every coil at the floor (see [`printed_diagrams`]); a whole view asked for
/// (`Window::Whole`) that cannot be printed at the floor is refused, with why.
pub fn sheet_pages(
    checked: &Checked,
    test: &ArmatureTest,
    options: &SheetOptions,
) -> Result<Vec<Page>, WholeRefused> {
    let input = Input {
        design: &checked.design,
        winding: &checked.winding,
        rating: checked.rating.as_ref(),
        test,
        options,
        failures: checked.failures(),
        extra_rows: checked.rating.as_ref().map_or_else(Vec::new, |r| {
            rows::rating_sheet_rows(r, checked.design.units)
        }),
        order_columns: std::cell::OnceCell::new(),
        order_lift: std::cell::OnceCell::new(),
    };
    let frame = page_frame(options.paper, !input.failures.is_empty());
    let area = diagram_sheet(&frame).diagram;
    let diagrams = printed_diagrams(
        input.design,
        input.winding,
        &DiagramOptions {
            width: area.w,
            height: area.h,
            window: options.window,
            floor: true,
        },
    )?;
    let contents = sheet_contents(&input, &frame, diagrams.len());
    // The winding data in full closes the set when sheet 1 cannot hold it; sheet 1 names
    // the sheet it is on.
    let data_on_own_sheet = matches!(contents.last(), Some(Content::WindingData));
    let groups = equalizer_groups(&input);
    let data_sheet = contents.len();
    let total = contents.len();
    let seq = rows::sequence_labels(input.winding);
    let pages = contents
        .iter()
        .enumerate()
        .map(|(i, content)| {
            let mut page = begin_page(&frame);
            let (kind, title) = match content {
                Content::Diagram(k) => {
                    let more = data_on_own_sheet.then_some(data_sheet);
                    diagram_sheet_blocks(&mut page.children, &input, &frame, &diagrams[*k], more);
                    (PageKind::Diagram, "developed winding diagram")
                }
                Content::CommutatorEnd => {
                    ring::ring_page(&mut page.children, &input, &frame);
                    (PageKind::CommutatorEnd, "commutator end view")
                }
                Content::CoilMaking => {
                    coil_page::coil_page(&mut page.children, &input, &frame);
                    (PageKind::CoilMaking, "coil making")
                }
                Content::WindingOrder(p) => {
                    order::order_page(&mut page.children, &input, &frame, p);
                    (PageKind::WindingOrder, "winding order")
                }
                Content::WindingData => {
                    page.children
                        .push(data::data_page(&input, &table::table_area(&frame)).into());
                    (PageKind::WindingData, "winding data")
                }
                Content::Connections(p) => {
                    table::connection_page(&mut page.children, &input, &frame, p, &seq);
                    (PageKind::Connections, "connection table")
                }
                Content::Equalizers(p) => {
                    table::equalizer_page(&mut page.children, &input, &frame, p, groups);
                    (PageKind::Equalizers, "equalizer table")
                }
                Content::Tests(p, first) => {
                    test_sheet::tests_page(&mut page.children, &input, &frame, p, *first);
                    (PageKind::Tests, "tests and sign-off")
                }
            };
            if !matches!(content, Content::Diagram(_)) {
                page.children
                    .push(caution::caution_box(&table::caution_rect(&frame), TEXT_FLOOR).into());
            }
            page.children
                .push(title::title_block(&input, &frame, i + 1, total).into());
            if let Some(band) = &frame.band {
                page.children
                    .push(title::failure_band(band, &input.failures).into());
            }
            page.kind = kind;
            page.data.push(("data-page", kind.data_page().to_string()));
            page.title = match diagrams.get(i).and_then(|d| d.part.as_ref()) {
                Some(p) => format!(
                    "sheet {} of {total}: {title}, part {} of {}",
                    i + 1,
                    p.number,
                    p.count
                ),
                None => format!("sheet {} of {total}: {title}", i + 1),
            };
            page.document = super::screen::job_title(input.design);
            page
        })
        .collect();
    Ok(pages)
}

/// The number of equalizer groups the equalizer table lists (none when the winding takes
/// no equalizers).
fn equalizer_groups(input: &Input<'_>) -> usize {
    match &input.winding.equalizers {
        EqualizerPlan::Possible(e) => e.groups.len(),
        _ => 0,
    }
}

/// What each sheet holds, in order: the diagram, the commutator end view, the winding
/// order, the connection and equalizer tables, the tests, and the winding data in full
/// when sheet 1 cannot hold it.
fn sheet_contents(input: &Input<'_>, frame: &PageFrame, diagrams: usize) -> Vec<Content> {
    let area = table::table_area(frame);
    let mut contents: Vec<Content> = (0..diagrams.max(1)).map(Content::Diagram).collect();
    let sheet1 = diagram_sheet(frame);
    let data_on_own_sheet = data::rows_held(input, &sheet1.data) < data::data_rows(input).len();
    contents.push(Content::CommutatorEnd);
    // The coils are made before any slot is filled: their sheet comes before the order.
    if input.rating.is_some_and(|r| r.coil_making.is_some()) {
        contents.push(Content::CoilMaking);
    }
    let drop = order::first_page_drop(input, &area);
    let order_first = Rect {
        y: area.y + drop,
        h: area.h - drop,
        ..area
    };
    for p in paginate_rows(
        input.winding.connections.len(),
        order::order_width(input),
        &order_first,
        &area,
        order::ORDER_ROW,
    ) {
        contents.push(Content::WindingOrder(p));
    }
    let conn_w = table::connection_width(input);
    for p in paginate(input.winding.connections.len(), conn_w, &area) {
        contents.push(Content::Connections(p));
    }
    let groups = equalizer_groups(input);
    if groups > 0 {
        let eq_w = table::equalizer_width(input.design.pole_pairs(), area.w);
        for p in paginate(groups, eq_w, &area) {
            contents.push(Content::Equalizers(p));
        }
    }
    let (tests_first, tests_rest) = test_sheet::readings_areas(frame);
    for (k, p) in paginate_rows(
        test_sheet::reading_count(input),
        test_sheet::readings_width(),
        &tests_first,
        &tests_rest,
        TABLE_ROW,
    )
    .into_iter()
    .enumerate()
    {
        contents.push(Content::Tests(p, k == 0));
    }
    // The winding data in full closes the set; sheet 1 names the sheet it is on.
    if data_on_own_sheet {
        contents.push(Content::WindingData);
    }
    contents
}

/// An empty sheet: white paper and the drawing frame.
fn begin_page(frame: &PageFrame) -> Page {
    let f = &frame.frame;
    Page {
        kind: PageKind::Diagram,
        title: String::new(),
        document: String::new(),
        width_mm: frame.width,
        height_mm: frame.height,
        unit: PageUnit::Millimetres,
        data: vec![("data-paper", frame.paper.as_str().to_string())],
        children: vec![
            tree::Rect::filled("#fff", 0.0, 0.0, frame.width, frame.height).into(),
            rect("frame", f),
        ],
    }
}

/// A diagram sheet: the diagram above; below, on sheet 1 the winding-data block, on a
/// continuation sheet what it continues; then the legend and the caution box.
fn diagram_sheet_blocks(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    frame: &PageFrame,
    diagram: &Diagram,
    data_more_on: Option<usize>,
) {
    let s = diagram_sheet(frame);
    out.push(diagram_group(diagram, s.diagram.x, s.diagram.y).into());
    out.push(hline(frame.frame.x, frame.frame.right(), s.data.y, "rule"));
    match diagram.part.as_ref().filter(|p| p.number > 1) {
        Some(p) => {
            let last = p.last_slot(input.design.slots);
            out.push(part_block(p, last, &s.data, data_more_on).into());
        }
        None => out.push(data::data_block(input, &s.data, data_more_on).0.into()),
    }
    out.push(vline(s.legend.x, s.legend.y, s.legend.bottom(), "rule"));
    let cut = diagram.coils.iter().any(|c| !c.cuts.is_empty());
    let edge = cut.then_some(diagram.view.whole);
    out.push(legend::legend_block(input, &s.legend, edge).into());
    out.push(vline(s.notes.x, s.notes.y, frame.frame.bottom(), "rule"));
    let caution = Rect {
        x: s.notes.x + 1.5,
        y: s.notes.y + 1.5,
        w: s.notes.w - 3.0,
        h: s.notes.h - 3.0,
    };
    out.push(caution::caution_box(&caution, TEXT_FLOOR).into());
}

/// The block of a continuation sheet, where sheet 1 has its winding data: which part of the
/// diagram this is, where the others are, how its match lines and cut lines read.
fn part_block(p: &Part, last: u32, r: &Rect, data_more_on: Option<usize>) -> tree::Group {
    let mut g = tree::Group::id("continuation");
    g.push(Text::new(
        r.x + 2.0,
        r.y + 5.0,
        3.2,
        "b",
        format!("Developed diagram, part {} of {}", p.number, p.count),
    ));
    let element = p
        .element
        .map(|e| format!(" of the {e} element"))
        .unwrap_or_default();
    let mut words = vec![format!(
        "This sheet draws the coils{element} whose top sides lie in slots {}\u{2013}{}, with their leads to the bars.",
        p.first_slot, last
    )];
    if let Some(b) = p.before {
        words.push(format!(
            "The coils of the slots before are on sheet {b}, behind the match line at the left edge."
        ));
    }
    if let Some(a) = p.after {
        words.push(format!(
            "The coils of the slots after are on sheet {a}, beyond the match line (long dash, dot)."
        ));
    }
    words.push(if p.side_by_side {
        "The sheets of the diagram meet edge to edge at one scale: a line that meets a match line goes on at the same height on the sheet named above it. The lines of coils drawn on other sheets that pass through this one are drawn too.".to_string()
    } else {
        "A line cut at an edge ends in a dot labelled with its coil and where it goes: 12\u{2192}s26 runs to slot 26, 12\u{2192}b45 to bar 45.".to_string()
    });
    words.push(match data_more_on {
        Some(n) => format!("The winding data is on sheet 1, and in full on sheet {n}."),
        None => "The winding data is on sheet 1.".to_string(),
    });
    let line = TEXT_FLOOR * 1.35;
    let mut y = r.y + 10.0;
    for para in words {
        for l in wrap_text(&para, TEXT_FLOOR, Weight::Regular, r.w - 4.0) {
            g.push(Text::new(r.x + 2.0, y, TEXT_FLOOR, "", l));
            y += line;
        }
        y += 0.6;
    }
    g
}

fn rect(class: &str, r: &Rect) -> Node {
    tree::Rect::new(class, r.x, r.y, r.w, r.h).into()
}

fn hline(x0: f64, x1: f64, y: f64, class: &str) -> Node {
    Line::new(class, (x0, y), (x1, y)).into()
}

fn vline(x: f64, y0: f64, y1: f64, class: &str) -> Node {
    Line::new(class, (x, y0), (x, y1)).into()
}

/// `s` at (x, y), shrunk (down to 80 %, never below the floor) and then cut to fit `width`
/// mm in its face.
fn text_fit(x: f64, y: f64, size: f64, width: f64, class: &str, s: &str) -> Text {
    let (weight, _) = text_face(class);
    let sz = fit_size(s, size, weight, width).max(TEXT_FLOOR.min(size));
    Text::new(x, y, sz, class, cut_to_width(s, sz, weight, width))
}
