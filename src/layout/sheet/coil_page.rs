//! The coil-making sheet: one coil of each element drawn in plan (to a stated scale, or
//! marked schematic when even 1:10 does not fit), the former settings, the wire per coil and
//! to order, and the slot insulation schedule; and the wire-to-order line the winding order
//! repeats.
//!
//! Part of the `layout` stage (the sheets): it prints the coil making the rating computed
//! (`rating::coil`), and computes nothing of it. The plan view: the coil sides run up the
//! page (the axial direction), the span across it; the core's ends are drawn as dashed lines,
//! the end turns' legs run from the knuckles (the straight part's ends) to the noses.

use crate::base::Units;
use crate::base::number::fmt_fixed;
use crate::layout::font::{Weight, text_width, wrap_text};
use crate::layout::style::TEXT_FLOOR;
use crate::layout::tree::{Group, Line, Node, Path, Text};
use crate::rating::coil::{CoilMaking, CoilShape};
use crate::rating::conductor::describe;

use super::table::page_heading;
use super::{Input, PageFrame, Rect};

/// The scales a coil may be drawn at, largest first (1:n).
const SCALES: [f64; 8] = [1.0, 2.0, 2.5, 5.0, 10.0, 20.0, 25.0, 50.0];
/// Text size of the page's rows, mm.
const ROW_TEXT: f64 = 3.0;
/// Row pitch, mm.
const ROW: f64 = 4.4;

/// The wire to order in one line: length with scrap, conductor, masses and reels.
pub(super) fn wire_to_order_words(input: &Input<'_>) -> Option<String> {
    let k = input.rating?.coil_making.as_ref()?;
    let wire = input
        .design
        .conductor
        .as_ref()
        .map(|c| describe(&c.shape, input.design.units))
        .unwrap_or_default();
    let reels = k
        .reels
        .map(|n| format!(", {n} reel{}", if n == 1 { "" } else { "s" }))
        .unwrap_or_default();
    let u = input.design.units;
    Some(format!(
        "Wire to order: {} of {wire} ({} % scrap included), {} bare copper, {} enamelled{reels}",
        u.wire_length(k.wire_m_total, 1),
        fmt_fixed(k.scrap_percent, 0),
        u.mass(k.mass_kg_bare, 2),
        u.mass(k.mass_kg_insulated, 2)
    ))
}

/// The coil-making sheet of `input` (which has a coil making: see [`super::sheet_pages`]).
pub(super) fn coil_page(out: &mut Vec<Node>, input: &Input<'_>, frame: &PageFrame) {
    let Some(k) = input.rating.and_then(|r| r.coil_making.as_ref()) else {
        return;
    };
    let c = &frame.content;
    out.push(page_heading(
        c,
        "Coil making: the coil for the former, the wire to order, the slot insulation",
    ));
    let area = Rect {
        x: c.x + 2.0,
        y: c.y + 11.0,
        w: c.w - 4.0,
        h: frame.title_block.y - c.y - 13.0,
    };
    let draw_w = (area.w * 0.45).min(130.0);
    let per = draw_w / k.shapes.len() as f64;
    let mut g = Group::id("coil-making");
    for (i, s) in k.shapes.iter().enumerate() {
        let name = input
            .winding
            .is_multi_element()
            .then(|| input.winding.elements[i].kind.as_str());
        let r = Rect {
            x: area.x + i as f64 * per,
            y: area.y,
            w: per - 4.0,
            h: area.h,
        };
        coil_plan(
            &mut g,
            s,
            name,
            &r,
            (
                input.design.core.as_ref().map(|c| c.extension()),
                input.design.units,
            ),
        );
    }
    let tx = area.x + draw_w + 6.0;
    let rows_rect = Rect {
        x: tx,
        y: area.y,
        w: area.right() - tx,
        h: area.h,
    };
    figures(&mut g, input, k, &rows_rect);
    out.push(g.into());
}

/// One coil in plan in `r`, at the largest scale that fits, with its dimensions.
fn coil_plan(
    g: &mut Group,
    s: &CoilShape,
    name: Option<&str>,
    r: &Rect,
    (extension, u): (Option<f64>, Units),
) {
    let e = extension.unwrap_or(0.0);
    let core = s.straight_mm - 2.0 * e;
    let tall = s.straight_mm + 2.0 * (s.nose_reach_mm - e);
    let wide = s.span_arc_mm;
    let words = [
        format!("straight {}", u.length(s.straight_mm, 0)),
        format!("span arc {}", u.length(s.span_arc_mm, 0)),
        format!("nose {}", u.length(s.nose_reach_mm, 0)),
        format!("core {}", u.length(core, 0)),
    ];
    let width = |t: &str| text_width(t, TEXT_FLOOR, Weight::Regular);
    // The dimensions stand left (straight) and right (nose, core) of the drawing.
    let left_w = width(&words[0]) + 2.5;
    let right_w = width(&words[2]).max(width(&words[3])) + 2.5;
    let room_h = r.h - 26.0;
    let room_w = r.w - left_w - right_w;
    let scale = SCALES
        .iter()
        .copied()
        .find(|n| tall / n <= room_h && wide / n <= room_w);
    let (n, schematic) = match scale {
        Some(n) => (n, false),
        None => ((tall / room_h).max(wide / room_w), true),
    };
    let title = match (name, schematic) {
        (Some(e), false) => format!("{e} coil, scale 1:{}", fmt_scale(n)),
        (None, false) => format!("coil, scale 1:{}", fmt_scale(n)),
        (Some(e), true) => format!("{e} coil, schematic (not to scale)"),
        (None, true) => "coil, schematic (not to scale)".to_string(),
    };
    g.push(Text::new(r.x, r.y + 4.0, ROW_TEXT, "b", title));
    let (w, h) = (wide / n, tall / n);
    let x0 = r.x + left_w + (room_w - w) / 2.0;
    let y0 = r.y + 12.0 + (room_h - h) / 2.0;
    let nose = (s.nose_reach_mm - e) / n;
    let (x1, xm) = (x0 + w, x0 + w / 2.0);
    let (k_top, k_bot) = (y0 + nose, y0 + h - nose);
    let outline = [
        (x0, k_top),
        (xm, y0),
        (x1, k_top),
        (x1, k_bot),
        (xm, y0 + h),
        (x0, k_bot),
        (x0, k_top),
    ];
    g.push(Path::polyline("coil-outline", &outline));
    // The core's ends, across the coil sides.
    let core_off = (e / n).max(0.0);
    for y in [k_top + core_off, k_bot - core_off] {
        g.push(Line::new("core-end", (x0 - 4.0, y), (x1 + 4.0, y)));
    }
    let [straight, arc, nose_words, core_words] = words;
    g.push(Text::new(
        x0 - 1.5,
        (k_top + k_bot) / 2.0,
        TEXT_FLOOR,
        "end",
        straight,
    ));
    g.push(Text::new(xm, y0 + h + 5.0, TEXT_FLOOR, "mid", arc));
    g.push(Text::new(
        x1 + 1.5,
        (y0 + k_top) / 2.0 + 1.0,
        TEXT_FLOOR,
        "",
        nose_words,
    ));
    g.push(Text::new(
        x1 + 1.5,
        k_top + core_off + 3.5,
        TEXT_FLOOR,
        "",
        core_words,
    ));
}

/// A scale's denominator as printed: 1, 2, 2.5, 5, … (more decimals when schematic).
fn fmt_scale(n: f64) -> String {
    crate::base::number::fmt_trimmed(n, 1)
}

/// The figures beside the drawing: per element the former settings and the wire, then the
/// wire to order, then the slot insulation schedule.
fn figures(g: &mut Group, input: &Input<'_>, k: &CoilMaking, r: &Rect) {
    let u = input.design.units;
    let mut rows: Vec<(String, String)> = Vec::new();
    let multi = input.winding.is_multi_element();
    for (i, s) in k.shapes.iter().enumerate() {
        let head = if multi {
            format!("{} element", input.winding.elements[i].kind.as_str())
        } else {
            "Coil".to_string()
        };
        rows.push((head, String::new()));
        rows.extend(shape_rows(s, u));
    }
    rows.push(("Wire to order".to_string(), String::new()));
    if let Some(eq) = k.equalizer_wire_m {
        rows.push(("equalizers, same wire".into(), u.wire_length(eq, 1)));
    }
    rows.push((
        "total with scrap".into(),
        format!(
            "{} ({} % scrap)",
            u.wire_length(k.wire_m_total, 1),
            fmt_fixed(k.scrap_percent, 0)
        ),
    ));
    rows.push(("bare copper".into(), u.mass(k.mass_kg_bare, 2)));
    rows.push((
        "enamelled".into(),
        format!(
            "{} (build {}, grade {})",
            u.mass(k.mass_kg_insulated, 2),
            u.length(k.build_mm, 3),
            k.grade
        ),
    ));
    if let Some(n) = k.reels {
        rows.push(("reels".into(), n.to_string()));
    }
    if let Some(core) = input.design.core.as_ref() {
        rows.push(("Slot insulation".to_string(), String::new()));
        rows.push(("liner".into(), u.length(core.liner(), 2)));
        rows.push(("separator".into(), u.length(core.separator(), 2)));
        rows.push(("wedge".into(), u.length(core.wedge(), 2)));
    }
    if let Some(sec) = k.section {
        rows.push((
            "coil side (strip)".into(),
            format!(
                "{} \u{d7} {}",
                u.number(sec.width_mm, 2),
                u.length(sec.height_mm, 2)
            ),
        ));
    }
    if let Some(f) = k.slot_fill {
        rows.push((
            "slot fill".into(),
            format!(
                "{} % ({} of {} mm\u{b2}, {} sides)",
                fmt_fixed(f.percent, 1),
                fmt_fixed(f.conductors_mm2, 1),
                fmt_fixed(f.room_mm2, 1),
                f.sides
            ),
        ));
    }
    let label_w = rows
        .iter()
        .filter(|(_, v)| !v.is_empty())
        .map(|(l, _)| text_width(l, ROW_TEXT, Weight::Regular))
        .fold(0.0, f64::max)
        + 3.0;
    let mut y = r.y + 4.0;
    for (l, v) in rows {
        if v.is_empty() {
            y += 1.0;
            g.push(Text::new(r.x, y, ROW_TEXT, "b", l));
        } else {
            g.push(Text::new(r.x + 2.0, y, ROW_TEXT, "", l));
            for (j, line) in wrap_text(&v, ROW_TEXT, Weight::Bold, r.w - label_w - 2.0)
                .into_iter()
                .enumerate()
            {
                g.push(Text::new(
                    r.x + 2.0 + label_w,
                    y + j as f64 * ROW,
                    ROW_TEXT,
                    "b",
                    line,
                ));
                if j > 0 {
                    y += ROW;
                }
            }
        }
        y += ROW;
    }
    if !k.leads_counted {
        for line in wrap_text(
            "Leads not counted: give [core] riser_distance_mm for their wire.",
            TEXT_FLOOR,
            Weight::Regular,
            r.w,
        ) {
            g.push(Text::new(r.x, y, TEXT_FLOOR, "", line));
            y += TEXT_FLOOR * 1.3;
        }
    }
}

/// The former settings and the wire of one coil shape.
fn shape_rows(s: &CoilShape, u: Units) -> Vec<(String, String)> {
    let mm = |x: f64| u.length(x, 1);
    let mut rows: Vec<(String, String)> = vec![
        (
            "coils, span, turns".into(),
            format!(
                "{} coils, {} slots, {} turn{}",
                s.coils,
                s.span,
                s.turns,
                if s.turns == 1 { "" } else { "s" }
            ),
        ),
        ("straight, knuckle to knuckle".into(), mm(s.straight_mm)),
        ("end-turn leg".into(), mm(s.end_leg_mm)),
        ("nose past the core".into(), mm(s.nose_reach_mm)),
        ("nose drop between layers".into(), mm(s.nose_drop_mm)),
        ("loop on the former".into(), mm(s.loop_length_mm)),
        ("mean turn".into(), mm(s.mean_turn_mm)),
        ("leads to the risers".into(), mm(s.leads_mm)),
    ];
    if (s.wire_turn_mm - s.mean_turn_mm).abs() >= 0.05 {
        // The wire is reckoned on the turn measured on the old coil ([conductor]
        // mean_turn_mm), as the resistance is.
        rows.push((
            "wire reckoned on".into(),
            format!(
                "{} a turn ([conductor] mean_turn{})",
                mm(s.wire_turn_mm),
                u.key_suffix()
            ),
        ));
    }
    rows.push(("wire a coil".into(), u.wire_length(s.wire_m_per_coil, 2)));
    rows
}
