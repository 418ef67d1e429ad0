//! The shop cautions and the caution box that carries them on every sheet.
//!
//! Part of the `layout` stage (the sheets). The cautions themselves are written once, in
//! [`crate::base::caution`]; the text reports print the same list.

use crate::base::caution::CAUTIONS;
use crate::layout::font::{Weight, wrap_text};
use crate::layout::style::TEXT_FLOOR;
use crate::layout::tree::{Group, Text};

use super::{Rect, rect};

/// The caution box in `r`: every caution, whole, wrapped at `size` mm (down to the floor and
/// with tighter leading when the box is short, then in two columns): a caution is never cut.
pub(super) fn caution_box(r: &Rect, size: f64) -> Group {
    let mut g = Group::id("caution");
    g.push(rect("caution", r));
    g.push(Text::new(r.x + 2.0, r.y + 3.9, 2.9, "b", "CAUTION"));
    let top = r.y + 3.9 + 0.3;
    let room = r.bottom() - 0.8 - top;
    let layouts = [
        (size, 1.3, 1),
        (TEXT_FLOOR.min(size), 1.3, 1),
        (TEXT_FLOOR.min(size), 1.15, 1),
        (TEXT_FLOOR.min(size), 1.15, 2),
    ];
    let fits = |&(z, lead, cols): &(f64, f64, usize)| {
        let width = (r.w - 4.0) / cols as f64 - 4.0;
        column_lines(z, width, cols)
            .iter()
            .all(|col| col.len() as f64 * z * lead <= room)
    };
    let &(z, lead, cols) = layouts.iter().find(|l| fits(l)).unwrap_or(&layouts[3]);
    let col_w = (r.w - 4.0) / cols as f64;
    for (k, col) in column_lines(z, col_w - 4.0, cols).into_iter().enumerate() {
        let x = r.x + 2.0 + k as f64 * col_w;
        let mut y = top + z * lead;
        for (first, line) in col {
            if first {
                g.push(Text::new(x, y, z, "", "\u{25b8}"));
            }
            g.push(Text::new(x + 3.0, y, z, "", line));
            y += z * lead;
        }
    }
    g
}

/// The cautions' lines at `size` in `width` mm, in `cols` columns (the cautions shared out in
/// order), each line marked when it opens a caution.
fn column_lines(size: f64, width: f64, cols: usize) -> Vec<Vec<(bool, String)>> {
    let per = CAUTIONS.len().div_ceil(cols);
    CAUTIONS
        .chunks(per)
        .map(|chunk| {
            chunk
                .iter()
                .flat_map(|c| {
                    wrap_text(c, size, Weight::Regular, width)
                        .into_iter()
                        .enumerate()
                        .map(|(i, l)| (i == 0, l))
                })
                .collect()
        })
        .collect()
}
