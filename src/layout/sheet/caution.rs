//! The shop cautions and the caution box that carries them on every sheet.
//!
//! Part of the `layout` stage (the sheets). The cautions themselves are written once, in
//! [`crate::base::caution`]; the text reports print the same list.

use crate::base::caution::CAUTIONS;
use crate::layout::font::{Weight, wrap_text};
use crate::layout::tree::{Group, Text};

use super::{Rect, rect};

/// The caution box in `r`, the cautions wrapped at `size` mm and cut at the box's foot.
pub(super) fn caution_box(r: &Rect, size: f64) -> Group {
    let mut g = Group::id("caution");
    g.push(rect("caution", r));
    g.push(Text::new(r.x + 2.0, r.y + 3.9, 2.9, "b", "CAUTION"));
    let line_h = size * 1.3;
    let mut y = r.y + 3.9 + line_h + 0.3;
    for c in CAUTIONS {
        for (i, line) in wrap_text(c, size, Weight::Regular, r.w - 8.0)
            .into_iter()
            .enumerate()
        {
            if y > r.bottom() - 0.8 {
                break;
            }
            if i == 0 {
                g.push(Text::new(r.x + 2.0, y, size, "", "\u{25b8}"));
            }
            g.push(Text::new(r.x + 5.0, y, size, "", line));
            y += line_h;
        }
    }
    g
}
