//! Printable winding sheets: sheet 1 is the developed diagram with the title block, the
//! winding-data block, the legend, the numbering convention and the caution box; the sheets
//! after it carry the connection table (with the winding sequence) and the equalizer table.
//!
//! Part of the `render` stage. Pages are landscape, sized in millimetres with a matching
//! viewBox so that they print at true scale. Every text from the design is escaped by the
//! writer. The date printed is the design's `[job] date`; the clock is never read.

use crate::design::Design;
use crate::layout::developed::{DiagramOptions, Window, layout_developed};
use crate::layout::sheet::{
    DiagramSheet, PageFrame, Rect, TABLE_FONT, TABLE_HEADER, TABLE_ROW, TablePage, diagram_sheet,
    page_frame, paginate,
};
use crate::layout::{Paper, text_width, wrap_text};
use crate::winding::{EqualizerPlan, Winding};

use super::report::CAUTIONS;
use super::sheet_data::{sequence_labels, winding_data_rows};
use super::svg::{
    DUMMY_GREY, PATH_COLOURS, PATH_DASHES, SHORTED_GREY, colour_class, dash_class, style_sheet,
    write_diagram,
};
use super::svg_writer::{SvgWriter, Val, num};

/// Everything the sheets need.
#[derive(Clone, Debug)]
pub struct SheetInput<'a> {
    /// The resolved design.
    pub design: &'a Design,
    /// The traced winding.
    pub winding: &'a Winding,
    /// Paper size (`--paper`, default A4).
    pub paper: Paper,
    /// Diagram window (`--window`, default automatic).
    pub window: Window,
    /// Messages of the failed error-level checks; when any, every sheet carries the
    /// "NOT FOR WINDING" band.
    pub failures: Vec<String>,
    /// Extra (label, value) rows appended to the winding-data block, e.g. a rating summary.
    pub extra_rows: Vec<(String, String)>,
    /// The tool version printed in the title block (the CLI passes `CARGO_PKG_VERSION`).
    pub version: String,
}

/// One column of a table.
struct Column {
    head: [&'static str; 2],
    width: f64,
}

/// The connection-table columns; the position columns only when u > 1.
fn connection_columns(u: u32) -> Vec<Column> {
    // (heading, width in mm, shown only when u > 1)
    const COLUMNS: [([&str; 2], f64, bool); 10] = [
        (["coil", ""], 13.0, false),
        (["top", "slot"], 12.0, false),
        (["top", "pos"], 9.0, true),
        (["bottom", "slot"], 14.0, false),
        (["bot.", "pos"], 9.0, true),
        (["start", "seg"], 12.0, false),
        (["end", "seg"], 12.0, false),
        (["seq", ""], 15.0, false),
        (["path", ""], 11.0, false),
        (["dummy", ""], 15.0, false),
    ];
    COLUMNS
        .iter()
        .filter(|(_, _, positions)| u > 1 || !positions)
        .map(|&(head, width, _)| Column { head, width })
        .collect()
}

/// The equalizer-table columns: the list column is as wide as p numbers need, up to `max` mm.
fn equalizer_columns(pole_pairs: u32, max: f64) -> Vec<Column> {
    let list = (f64::from(pole_pairs) * 7.0 * 0.6 * TABLE_FONT).clamp(50.0, max - 13.0);
    vec![
        Column {
            head: ["ring", ""],
            width: 13.0,
        },
        Column {
            head: ["segments joined", ""],
            width: list,
        },
    ]
}

/// What a page shows.
enum PageKind {
    Diagram,
    Connections(TablePage),
    Equalizers(TablePage),
}

/// Renders every sheet, in order; `result[0]` is sheet 1.
pub fn render_sheets(input: &SheetInput<'_>) -> Vec<String> {
    let failing = !input.failures.is_empty();
    let frame = page_frame(input.paper, failing);
    let table_area = table_area(&frame);
    let u = input.design.coils_per_slot;
    let conn_w: f64 = connection_columns(u).iter().map(|c| c.width).sum();
    let eq_w: f64 = equalizer_columns(input.design.pole_pairs(), table_area.w)
        .iter()
        .map(|c| c.width)
        .sum();
    let mut pages = vec![PageKind::Diagram];
    for p in paginate(input.winding.connections.len(), conn_w, &table_area) {
        pages.push(PageKind::Connections(p));
    }
    let groups = match &input.winding.equalizers {
        EqualizerPlan::Possible(e) => e.groups.len(),
        _ => 0,
    };
    if groups > 0 {
        for p in paginate(groups, eq_w, &table_area) {
            pages.push(PageKind::Equalizers(p));
        }
    }
    let total = pages.len();
    let seq = sequence_labels(input.winding);
    pages
        .iter()
        .enumerate()
        .map(|(i, kind)| {
            let mut w = begin_page(&frame);
            match kind {
                PageKind::Diagram => diagram_page(&mut w, input, &frame),
                PageKind::Connections(p) => connection_page(&mut w, input, &frame, p, &seq),
                PageKind::Equalizers(p) => equalizer_page(&mut w, input, &frame, p, groups),
            }
            if !matches!(kind, PageKind::Diagram) {
                caution_box(&mut w, &caution_rect(&frame), 2.3);
            }
            title_block(&mut w, input, &frame, i + 1, total);
            if let Some(band) = &frame.band {
                failure_band(&mut w, band, &input.failures);
            }
            w.close("svg");
            w.finish()
        })
        .collect()
}

fn table_area(frame: &PageFrame) -> Rect {
    let c = &frame.content;
    Rect {
        x: c.x + 2.0,
        y: c.y + 11.0,
        w: c.w - 4.0,
        h: c.h - 13.0,
    }
}

fn caution_rect(frame: &PageFrame) -> Rect {
    let t = &frame.title_block;
    Rect {
        x: frame.frame.x + 2.0,
        y: t.y + 2.0,
        w: t.x - frame.frame.x - 6.0,
        h: t.h - 4.0,
    }
}

fn begin_page(frame: &PageFrame) -> SvgWriter {
    let mut w = SvgWriter::new();
    w.raw("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    w.open(
        "svg",
        &[
            ("xmlns", "http://www.w3.org/2000/svg".into()),
            ("width", format!("{}mm", num(frame.width)).into()),
            ("height", format!("{}mm", num(frame.height)).into()),
            (
                "viewBox",
                format!("0 0 {} {}", num(frame.width), num(frame.height)).into(),
            ),
            ("data-paper", frame.paper.as_str().into()),
        ],
    );
    w.text_elem("style", &[], &style_sheet());
    w.empty(
        "rect",
        &[
            ("x", 0.0.into()),
            ("y", 0.0.into()),
            ("width", frame.width.into()),
            ("height", frame.height.into()),
            ("fill", "#fff".into()),
        ],
    );
    let f = &frame.frame;
    rect(&mut w, f, "frame");
    w
}

fn rect(w: &mut SvgWriter, r: &Rect, class: &str) {
    w.empty(
        "rect",
        &[
            ("class", class.into()),
            ("x", r.x.into()),
            ("y", r.y.into()),
            ("width", r.w.into()),
            ("height", r.h.into()),
        ],
    );
}

fn hline(w: &mut SvgWriter, x0: f64, x1: f64, y: f64, class: &str) {
    w.empty(
        "line",
        &[
            ("class", class.into()),
            ("x1", x0.into()),
            ("y1", y.into()),
            ("x2", x1.into()),
            ("y2", y.into()),
        ],
    );
}

fn vline(w: &mut SvgWriter, x: f64, y0: f64, y1: f64, class: &str) {
    w.empty(
        "line",
        &[
            ("class", class.into()),
            ("x1", x.into()),
            ("y1", y0.into()),
            ("x2", x.into()),
            ("y2", y1.into()),
        ],
    );
}

fn text(w: &mut SvgWriter, x: f64, y: f64, size: f64, class: &str, s: &str) {
    let mut attrs: Vec<(&str, Val<'_>)> =
        vec![("x", x.into()), ("y", y.into()), ("font-size", size.into())];
    if !class.is_empty() {
        attrs.push(("class", class.into()));
    }
    w.text_elem("text", &attrs, s);
}

/// The size, at most `size` and at least 80 % of it, at which `s` fits `width` mm.
fn fit_size(s: &str, size: f64, width: f64) -> f64 {
    let w = text_width(s, size);
    if w <= width {
        size
    } else {
        (size * width / w).max(size * 0.8)
    }
}

/// Writes `s` shrunk (down to 80 %) and then cut to fit `width`.
fn text_fit(w: &mut SvgWriter, x: f64, y: f64, size: f64, width: f64, class: &str, s: &str) {
    // Bold runs about a tenth wider than the estimate for regular type.
    let room = if class.split(' ').any(|c| c == "b") {
        width / 1.12
    } else {
        width
    };
    let sz = fit_size(s, size, room);
    text(w, x, y, sz, class, &fit(s, sz, room));
}

/// Cuts `s` to fit `width` mm at `size`, with an ellipsis.
fn fit(s: &str, size: f64, width: f64) -> String {
    if text_width(s, size) <= width {
        return s.to_string();
    }
    let keep = ((width / (size * 0.6)).floor() as usize).saturating_sub(1);
    let mut out: String = s.chars().take(keep).collect();
    out.push('\u{2026}');
    out
}

fn failure_band(w: &mut SvgWriter, band: &Rect, failures: &[String]) {
    w.open("g", &[("id", "not-for-winding".into())]);
    rect(w, band, "band");
    let lead = "NOT FOR WINDING: design fails checks";
    text(w, band.x + 3.0, band.y + 6.3, 4.4, "band-text", lead);
    let x = band.x + 6.0 + text_width(lead, 4.4) * 1.05;
    let detail = failures.join("; ");
    let detail = fit(&detail, 2.4, band.right() - x - 3.0);
    text(w, x, band.y + 5.9, 2.4, "band-text", &detail);
    w.close("g");
}

fn title_block(
    w: &mut SvgWriter,
    input: &SheetInput<'_>,
    frame: &PageFrame,
    n: usize,
    total: usize,
) {
    let t = &frame.title_block;
    let d = input.design;
    w.open("g", &[("id", "title-block".into())]);
    w.empty(
        "rect",
        &[
            ("x", t.x.into()),
            ("y", t.y.into()),
            ("width", t.w.into()),
            ("height", t.h.into()),
            ("fill", "#fff".into()),
            ("class", "frame".into()),
        ],
    );
    let split = t.x + t.w - 34.0;
    vline(w, split, t.y, t.bottom(), "rule");
    let rows = [9.0, 6.0, 6.0, 6.0];
    let mut y = t.y;
    let none = "\u{2014}";
    let left: [(&str, String, f64, &str); 4] = [
        (
            "job",
            d.job.id.clone().unwrap_or_else(|| none.into()),
            4.2,
            "b",
        ),
        (
            "title",
            d.job.title.clone().unwrap_or_else(|| none.into()),
            2.8,
            "",
        ),
        (
            "customer",
            d.job.customer.clone().unwrap_or_else(|| none.into()),
            2.8,
            "",
        ),
        ("design file", d.file_name.clone(), 2.6, ""),
    ];
    let right: [(&str, String, f64, &str); 4] = [
        ("sheet", format!("{n} of {total}"), 4.2, "b"),
        (
            "date",
            d.job.date.clone().unwrap_or_else(|| none.into()),
            2.8,
            "",
        ),
        ("paper", format!("{} 1:1, mm", input.paper.label()), 2.8, ""),
        ("tool", format!("armsheet {}", input.version), 2.6, ""),
    ];
    for (i, h) in rows.iter().enumerate() {
        if i > 0 {
            hline(w, t.x, t.right(), y, "rule");
        }
        let base = y + h - 1.5;
        let (cap, val, size, cls) = &left[i];
        text(w, t.x + 1.5, y + 2.3, 1.8, "", cap);
        text_fit(w, t.x + 17.0, base, *size, split - t.x - 18.5, cls, val);
        let (cap, val, size, cls) = &right[i];
        text(w, split + 1.5, y + 2.3, 1.8, "", cap);
        text_fit(
            w,
            split + 10.0,
            base,
            *size,
            t.right() - split - 11.0,
            cls,
            val,
        );
        y += h;
    }
    w.close("g");
}

fn caution_box(w: &mut SvgWriter, r: &Rect, size: f64) {
    w.open("g", &[("id", "caution".into())]);
    rect(w, r, "caution");
    text(w, r.x + 2.0, r.y + 3.9, 2.9, "b", "CAUTION");
    let line_h = size * 1.3;
    let mut y = r.y + 3.9 + line_h + 0.3;
    for c in CAUTIONS {
        for (i, line) in wrap_text(c, size, r.w - 8.0).into_iter().enumerate() {
            if y > r.bottom() - 0.8 {
                break;
            }
            if i == 0 {
                text(w, r.x + 2.0, y, size, "", "\u{25b8}");
            }
            text(w, r.x + 5.0, y, size, "", &line);
            y += line_h;
        }
    }
    w.close("g");
}

fn diagram_page(w: &mut SvgWriter, input: &SheetInput<'_>, frame: &PageFrame) {
    let s: DiagramSheet = diagram_sheet(frame);
    let diagram = layout_developed(
        input.design,
        input.winding,
        &DiagramOptions {
            width: s.diagram.w,
            height: s.diagram.h,
            window: input.window,
        },
    );
    write_diagram(w, &diagram, s.diagram.x, s.diagram.y);
    hline(w, frame.frame.x, frame.frame.right(), s.data.y, "rule");
    data_block(w, input, &s.data);
    vline(w, s.legend.x, s.legend.y, s.legend.bottom(), "rule");
    legend_block(w, input, &s.legend, diagram.view.whole);
    vline(w, s.notes.x, s.notes.y, frame.frame.bottom(), "rule");
    notes_block(w, &s.notes);
}

fn data_block(w: &mut SvgWriter, input: &SheetInput<'_>, r: &Rect) {
    w.open("g", &[("id", "winding-data".into())]);
    text(w, r.x + 2.0, r.y + 5.0, 3.2, "b", "Winding data");
    let mut rows = winding_data_rows(input.design, input.winding);
    rows.extend(input.extra_rows.iter().cloned());
    // The numbering convention sits at the foot of the block.
    let size = 2.1;
    let u = input.design.coils_per_slot;
    let conv = format!(
        "Numbering: slots, coils and segments count from 1, seen from the commutator end. Coil n lies top-layer in slot \u{2308}n/{u}\u{2309} at position ((n\u{2212}1) mod {u})+1 and bottom-layer {} slots on. Start lead from the top side, end lead from the bottom side; coil 1's start lead goes to segment 1.",
        input.winding.pitches.span
    );
    let lines = wrap_text(&conv, size, r.w - 4.0);
    let conv_top = r.bottom() - 1.2 - lines.len() as f64 * size * 1.3;
    w.open("g", &[("id", "numbering".into())]);
    for (i, line) in lines.iter().enumerate() {
        text(
            w,
            r.x + 2.0,
            conv_top + (i as f64 + 1.0) * size * 1.3 - 0.4,
            size,
            "",
            line,
        );
    }
    w.close("g");
    let top = r.y + 9.4;
    let per_col = rows.len().div_ceil(2).max(1);
    let line_h = ((conv_top - 1.5 - top) / per_col as f64).min(3.6);
    let (ks, vs) = ((line_h * 0.66).min(2.3), (line_h * 0.74).min(2.6));
    let col_w = (r.w - 4.0) / 2.0;
    let label_w = 22.0;
    for (i, (k, v)) in rows.iter().enumerate() {
        let (col, row) = (i / per_col, i % per_col);
        let x = r.x + 2.0 + col as f64 * col_w;
        let y = top + (row as f64 + 0.7) * line_h;
        w.open(
            "g",
            &[("class", "datum".into()), ("data-key", k.as_str().into())],
        );
        text_fit(w, x, y, ks, label_w - 0.8, "", k);
        text_fit(w, x + label_w, y, vs, col_w - label_w - 1.5, "b", v);
        w.close("g");
    }
    w.close("g");
}

fn legend_block(w: &mut SvgWriter, input: &SheetInput<'_>, r: &Rect, whole: bool) {
    w.open("g", &[("id", "legend".into())]);
    text(w, r.x + 2.0, r.y + 5.0, 3.2, "b", "Legend");
    let x0 = r.x + 3.0;
    let xs = x0 + 11.0;
    let size = 2.3;
    let line_h = 3.55;
    let room = r.right() - xs - 1.5;
    let text = |w: &mut SvgWriter, x: f64, y: f64, size: f64, class: &str, s: &str| {
        text_fit(w, x, y, size, room - (x - xs), class, s)
    };
    let mut y = r.y + 9.6;
    let sample = |w: &mut SvgWriter, y: f64, stroke: &str, class: &str, dash: &str| {
        let mut a: Vec<(&str, Val<'_>)> = vec![
            ("class", class.into()),
            ("x1", x0.into()),
            ("y1", (y - 0.8).into()),
            ("x2", (x0 + 8.5).into()),
            ("y2", (y - 0.8).into()),
            ("stroke", stroke.into()),
        ];
        if !dash.is_empty() {
            a.push(("stroke-dasharray", dash.into()));
        }
        w.empty("line", &a);
    };
    sample(w, y, "#111", "side-top", "");
    text(w, xs, y, size, "", "top-layer coil side (start lead)");
    y += line_h;
    sample(w, y, "#111", "side-bot", "");
    text(w, xs, y, size, "", "bottom-layer coil side (end lead)");
    y += line_h;
    let (ax, ay) = (x0 + 4.2, y - 0.9);
    w.empty(
        "path",
        &[
            (
                "d",
                format!(
                    "M{} {}L{} {}L{} {}Z",
                    num(ax),
                    num(ay - 1.1),
                    num(ax - 0.9),
                    num(ay + 1.0),
                    num(ax + 0.9),
                    num(ay + 1.0)
                )
                .into(),
            ),
            ("fill", "#111".into()),
        ],
    );
    text(w, xs, y, size, "", "current at the drawn instant");
    y += line_h;
    let a = input.winding.paths.len();
    let shown = a.min(4);
    for p in input.winding.paths.iter().take(shown) {
        let k = colour_class(p.index);
        let dash = PATH_DASHES[dash_class(p.index) - 1];
        sample(
            w,
            y,
            PATH_COLOURS[k - 1],
            "conn",
            if dash == "none" { "" } else { dash },
        );
        text(
            w,
            x0 + 9.6,
            y,
            size,
            &format!("b f{k}"),
            &p.index.to_string(),
        );
        text(
            w,
            xs + 1.5,
            y,
            size,
            "",
            &format!(
                "path {}: brush {} to brush {}, {} coil{}",
                p.index,
                p.from_brush,
                p.to_brush,
                p.coils.len(),
                if p.coils.len() == 1 { "" } else { "s" }
            ),
        );
        y += line_h;
    }
    if a > shown {
        text(
            w,
            xs,
            y,
            size,
            "",
            &format!(
                "paths {}\u{2013}{}: colours and dashes repeat;",
                shown + 1,
                a
            ),
        );
        y += line_h;
        text(
            w,
            xs,
            y,
            size,
            "",
            "the number at each back end names the path",
        );
        y += line_h;
    }
    sample(w, y, SHORTED_GREY, "conn", "");
    text(
        w,
        xs,
        y,
        size,
        "",
        "grey, tag sc: shorted by a brush now (no current)",
    );
    y += line_h;
    if !input.winding.dummy_coils.is_empty() {
        sample(w, y, DUMMY_GREY, "conn", "0.4 0.6");
        text(
            w,
            xs,
            y,
            size,
            "",
            "dummy coil: dead, ends cut and taped (\u{d7})",
        );
        y += line_h;
    }
    w.empty(
        "rect",
        &[
            ("class", "brushbox brush-pos".into()),
            ("x", x0.into()),
            ("y", (y - 2.6).into()),
            ("width", 3.6.into()),
            ("height", 2.6.into()),
        ],
    );
    w.empty(
        "rect",
        &[
            ("class", "brushbox brush-neg".into()),
            ("x", (x0 + 4.8).into()),
            ("y", (y - 2.6).into()),
            ("width", 3.6.into()),
            ("height", 2.6.into()),
        ],
    );
    text(
        w,
        xs,
        y,
        size,
        "",
        "brush: filled positive (+), open negative (\u{2212})",
    );
    y += line_h;
    w.empty(
        "circle",
        &[
            ("class", "cutdot".into()),
            ("cx", (x0 + 7.5).into()),
            ("cy", (y - 0.8).into()),
            ("r", 0.4.into()),
        ],
    );
    hline(w, x0, x0 + 7.5, y - 0.8, "rule");
    let cut = if whole {
        "edge: goes on at the other edge, same number"
    } else {
        "edge: leaves the window; label names its end"
    };
    text(w, xs, y, size, "", cut);
    y += line_h;
    if matches!(&input.winding.equalizers, EqualizerPlan::Possible(e) if !e.groups.is_empty()) {
        hline(w, x0, x0 + 8.5, y - 0.8, "eqline");
        w.empty(
            "circle",
            &[
                ("class", "eqdot".into()),
                ("cx", (x0 + 4.2).into()),
                ("cy", (y - 0.8).into()),
                ("r", 0.45.into()),
            ],
        );
        text(
            w,
            xs,
            y,
            size,
            "",
            "equalizer ring E n and its taps (see table)",
        );
    }
    w.close("g");
}

fn notes_block(w: &mut SvgWriter, r: &Rect) {
    let caution = Rect {
        x: r.x + 1.5,
        y: r.y + 1.5,
        w: r.w - 3.0,
        h: r.h - 3.0,
    };
    caution_box(w, &caution, 2.2);
}

fn table_head(w: &mut SvgWriter, cols: &[Column], x: f64, y: f64) -> f64 {
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
        text(w, hx, y + 3.6, TABLE_FONT * 0.86, cls, c.head[0]);
        if !c.head[1].is_empty() {
            text(w, hx, y + 7.3, TABLE_FONT * 0.86, cls, c.head[1]);
        }
        cx += c.width;
    }
    hline(w, x, x + total, y + TABLE_HEADER - 0.3, "rule");
    total
}

fn connection_page(
    w: &mut SvgWriter,
    input: &SheetInput<'_>,
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
    text(
        w,
        c.x + 2.0,
        c.y + 6.5,
        4.2,
        "b",
        &format!(
            "Connection table: coils {first}\u{2013}{last} of {}",
            conns.len()
        ),
    );
    let hint = "start lead from the top-layer side, end lead from the bottom-layer side \u{b7} seq = order in the winding trace";
    text(w, c.right() - 2.0, c.y + 6.5, 2.4, "end", hint);
    let cols = connection_columns(input.design.coils_per_slot);
    let u = input.design.coils_per_slot;
    w.open(
        "g",
        &[
            ("id", format!("table-{}", page.rows.start + 1).into()),
            ("class", "connection-table".into()),
        ],
    );
    for (gx, rows) in &page.groups {
        let total = table_head(w, &cols, *gx, page.top);
        for (i, r) in rows.clone().enumerate() {
            let conn = &conns[r];
            let y = page.top + TABLE_HEADER + (i as f64 + 1.0) * TABLE_ROW - 1.4;
            if i % 2 == 1 {
                w.empty(
                    "rect",
                    &[
                        ("x", (*gx).into()),
                        ("y", (y - TABLE_ROW + 1.4).into()),
                        ("width", total.into()),
                        ("height", TABLE_ROW.into()),
                        ("fill", "#f1f1f1".into()),
                    ],
                );
            }
            let seg = |s: Option<u32>| s.map_or_else(|| "\u{2014}".to_string(), |s| s.to_string());
            let path = input.winding.coil_path[(conn.coil - 1) as usize];
            let mut cells = vec![conn.coil.to_string(), conn.top.slot.to_string()];
            if u > 1 {
                cells.push(conn.top.position.to_string());
            }
            cells.push(conn.bottom.slot.to_string());
            if u > 1 {
                cells.push(conn.bottom.position.to_string());
            }
            cells.push(seg(conn.start_segment));
            cells.push(seg(conn.end_segment));
            cells.push(seq[(conn.coil - 1) as usize].clone());
            cells.push(if conn.dummy || path == 0 {
                "\u{2013}".into()
            } else {
                path.to_string()
            });
            cells.push(if conn.dummy {
                "DEAD".into()
            } else {
                String::new()
            });
            let mut attrs: Vec<(&str, Val<'_>)> =
                vec![("class", "row".into()), ("data-coil", conn.coil.into())];
            if let (Some(s), Some(e)) = (conn.start_segment, conn.end_segment) {
                attrs.push(("data-start-seg", s.into()));
                attrs.push(("data-end-seg", e.into()));
            }
            w.open("g", &attrs);
            let mut cx = *gx;
            for (j, (col, cell)) in cols.iter().zip(&cells).enumerate() {
                let cls = if j == 0 || col.head[0] == "dummy" {
                    "b end"
                } else {
                    "end"
                };
                if !cell.is_empty() {
                    text(w, cx + col.width - 1.5, y, TABLE_FONT, cls, cell);
                }
                cx += col.width;
            }
            w.close("g");
        }
    }
    w.close("g");
}

fn equalizer_page(
    w: &mut SvgWriter,
    input: &SheetInput<'_>,
    frame: &PageFrame,
    page: &TablePage,
    total: usize,
) {
    let EqualizerPlan::Possible(e) = &input.winding.equalizers else {
        return;
    };
    let c = &frame.content;
    text(
        w,
        c.x + 2.0,
        c.y + 6.5,
        4.2,
        "b",
        &format!(
            "Equalizer table: rings {}\u{2013}{} of {total}",
            page.rows.start + 1,
            page.rows.end
        ),
    );
    let hint = format!(
        "each ring joins {} segments {} apart (two pole pitches, 2C/P)",
        input.design.pole_pairs(),
        e.pitch
    );
    text(w, c.right() - 2.0, c.y + 6.5, 2.4, "end", &hint);
    let cols = equalizer_columns(input.design.pole_pairs(), table_area(frame).w);
    w.open(
        "g",
        &[
            ("id", format!("eq-table-{}", page.rows.start + 1).into()),
            ("class", "equalizer-table".into()),
        ],
    );
    for (gx, rows) in &page.groups {
        table_head(w, &cols, *gx, page.top);
        for (i, r) in rows.clone().enumerate() {
            let segs = &e.groups[r];
            let y = page.top + TABLE_HEADER + (i as f64 + 1.0) * TABLE_ROW - 1.4;
            let joined = segs
                .iter()
                .map(u32::to_string)
                .collect::<Vec<_>>()
                .join(" \u{b7} ");
            w.open(
                "g",
                &[("class", "row".into()), ("data-eq", (r as u32 + 1).into())],
            );
            text(
                w,
                gx + cols[0].width - 1.5,
                y,
                TABLE_FONT,
                "b end",
                &format!("E{}", r + 1),
            );
            text(
                w,
                gx + cols[0].width + 3.0,
                y,
                TABLE_FONT,
                "",
                &fit(&joined, TABLE_FONT, cols[1].width - 4.0),
            );
            w.close("g");
        }
    }
    w.close("g");
}
