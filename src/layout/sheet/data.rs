//! The winding-data block of sheet 1: the design's rows (and the rating's) in two columns,
//! with the numbering convention at its foot.
//!
//! Part of the `layout` stage (the sheets).

use crate::layout::font::{Weight, wrap_text};
use crate::layout::tree::{Group, Text};

use super::rows::winding_data_rows;
use super::{Input, Rect, text_fit};

/// The data block in `r`.
pub(super) fn data_block(input: &Input<'_>, r: &Rect) -> Group {
    let mut g = Group::id("winding-data");
    g.push(Text::new(r.x + 2.0, r.y + 5.0, 3.2, "b", "Winding data"));
    let mut rows = winding_data_rows(input.design, input.winding);
    rows.extend(input.extra_rows.iter().cloned());
    // The numbering convention sits at the foot of the block.
    let size = 2.1;
    let u = input.design.coils_per_slot;
    let conv = format!(
        "Numbering: slots, coils and segments count from 1, seen from the commutator end. Coil n lies top-layer in slot \u{2308}n/{u}\u{2309} at position ((n\u{2212}1) mod {u})+1 and bottom-layer {} slots on. Start lead from the top side, end lead from the bottom side; coil 1's start lead goes to segment 1.",
        input.winding.pitches.span
    );
    let lines = wrap_text(&conv, size, Weight::Regular, r.w - 4.0);
    let conv_top = r.bottom() - 1.2 - lines.len() as f64 * size * 1.3;
    let mut numbering = Group::id("numbering");
    for (i, line) in lines.into_iter().enumerate() {
        numbering.push(Text::new(
            r.x + 2.0,
            conv_top + (i as f64 + 1.0) * size * 1.3 - 0.4,
            size,
            "",
            line,
        ));
    }
    g.push(numbering);
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
        let mut datum = Group::class("datum").with_data("data-key", k);
        datum.push(text_fit(x, y, ks, label_w - 0.8, "", k));
        datum.push(text_fit(x + label_w, y, vs, col_w - label_w - 1.5, "b", v));
        g.push(datum);
    }
    g
}
