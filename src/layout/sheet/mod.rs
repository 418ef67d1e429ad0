//! Printable winding sheets as page trees: sheet 1 is the developed diagram with the title
//! block, the winding-data block, the legend, the numbering convention and the caution box;
//! the sheets after it carry, in order, the commutator end view, the winding order with
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

use super::developed::{DiagramOptions, Window, layout_developed, nodes::diagram_group};
use super::font::{cut_to_width, fit_size};
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
}

/// What one sheet shows.
enum Content {
    Diagram,
    WindingData,
    Connections(TablePage),
    Equalizers(TablePage),
    WindingOrder(TablePage),
    CommutatorEnd,
    /// A test sheet; the first carries the test and sign-off blocks.
    Tests(TablePage, bool),
}

/// Lays out every sheet of `checked`, in order; `result[0]` is sheet 1. `test` is the
/// design's expected armature test (`features::armature_test::expected` with the default options),
/// which the test sheets print.
pub fn sheet_pages(checked: &Checked, test: &ArmatureTest, options: &SheetOptions) -> Vec<Page> {
    let input = Input {
        design: &checked.design,
        winding: &checked.winding,
        rating: checked.rating.as_ref(),
        test,
        options,
        failures: checked
            .findings
            .iter()
            .filter(|f| f.is_failure())
            .map(|f| format!("{}: {}", f.id, f.message))
            .collect(),
        extra_rows: checked
            .rating
            .as_ref()
            .map_or_else(Vec::new, rows::rating_sheet_rows),
    };
    let frame = page_frame(options.paper, !input.failures.is_empty());
    let contents = sheet_contents(&input, &frame);
    // The winding data in full closes the set when sheet 1 cannot hold it; sheet 1 names
    // the sheet it is on.
    let data_on_own_sheet = matches!(contents.last(), Some(Content::WindingData));
    let groups = equalizer_groups(&input);
    let data_sheet = contents.len();
    let total = contents.len();
    let seq = rows::sequence_labels(input.winding);
    contents
        .iter()
        .enumerate()
        .map(|(i, content)| {
            let mut page = begin_page(&frame);
            let (kind, title) = match content {
                Content::Diagram => {
                    let more = data_on_own_sheet.then_some(data_sheet);
                    diagram_sheet_blocks(&mut page.children, &input, &frame, more);
                    (PageKind::Diagram, "developed winding diagram")
                }
                Content::CommutatorEnd => {
                    ring::ring_page(&mut page.children, &input, &frame);
                    (PageKind::CommutatorEnd, "commutator end view")
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
            if !matches!(content, Content::Diagram) {
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
            page.title = format!("sheet {} of {total}: {title}", i + 1);
            page.document = super::screen::job_title(input.design);
            page
        })
        .collect()
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
fn sheet_contents(input: &Input<'_>, frame: &PageFrame) -> Vec<Content> {
    let area = table::table_area(frame);
    let mut contents = vec![Content::Diagram];
    let sheet1 = diagram_sheet(frame);
    let data_on_own_sheet = data::rows_held(input, &sheet1.data) < data::data_rows(input).len();
    contents.push(Content::CommutatorEnd);
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

/// Sheet 1: the diagram above, the data block, the legend and the caution box below.
fn diagram_sheet_blocks(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    frame: &PageFrame,
    data_more_on: Option<usize>,
) {
    let s = diagram_sheet(frame);
    let diagram = layout_developed(
        input.design,
        input.winding,
        &DiagramOptions {
            width: s.diagram.w,
            height: s.diagram.h,
            window: input.options.window,
            floor: true,
        },
    );
    out.push(diagram_group(&diagram, s.diagram.x, s.diagram.y).into());
    out.push(hline(frame.frame.x, frame.frame.right(), s.data.y, "rule"));
    out.push(data::data_block(input, &s.data, data_more_on).0.into());
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
