//! The title block (job, title, customer, design file; sheet, date, paper, tool) and the
//! "not for winding" band of a design that fails its checks.
//!
//! Part of the `layout` stage (the sheets).

use crate::checks::NOT_FOR_WINDING;
use crate::layout::font::{Weight, cut_to_width, text_width, wrap_text};
use crate::layout::style::TEXT_FLOOR;
use crate::layout::tree::{self, Group, Text};

use super::{Input, PageFrame, Rect, hline, rect, text_fit, vline};

/// The band across the top of every sheet of a design that fails an error-level check (and
/// of `draw`'s page and the readings plot): [`NOT_FOR_WINDING`], then the failed checks.
pub(crate) fn failure_band(band: &Rect, failures: &[String]) -> Group {
    let mut g = Group::id("not-for-winding");
    g.push(rect("band", band));
    let lead = NOT_FOR_WINDING;
    g.push(Text::new(
        band.x + 3.0,
        band.y + 6.3,
        4.4,
        "band-text",
        lead,
    ));
    let x = band.x + 6.0 + text_width(lead, 4.4, Weight::Bold);
    let detail = failures.join("; ");
    let detail = cut_to_width(&detail, TEXT_FLOOR, Weight::Bold, band.right() - x - 3.0);
    g.push(Text::new(x, band.y + 5.9, TEXT_FLOOR, "band-text", detail));
    g
}

/// The title block, bottom right, of sheet `n` of `total`.
pub(super) fn title_block(input: &Input<'_>, frame: &PageFrame, n: usize, total: usize) -> Group {
    let t = &frame.title_block;
    let d = input.design;
    let mut g = Group::id("title-block");
    let mut back = tree::Rect::new("frame", t.x, t.y, t.w, t.h);
    back.fill = Some("#fff");
    g.push(back);
    let split = t.x + t.w - 42.0;
    g.push(vline(split, t.y, t.bottom(), "rule"));
    let rows = [10.0, 7.0, 7.0, 7.0];
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
        (
            "paper",
            format!("{} 1:1, mm", input.options.paper.label()),
            2.8,
            "",
        ),
        (
            "tool",
            format!("armsheet {}", input.options.version),
            2.6,
            "",
        ),
    ];
    for (i, h) in rows.iter().enumerate() {
        if i > 0 {
            g.push(hline(t.x, t.right(), y, "rule"));
        }
        // Captions stand left of their values, on the same baseline.
        let base = y + h - 2.0;
        let (cap, val, size, cls) = &left[i];
        g.push(Text::new(t.x + 1.5, base, TEXT_FLOOR, "", *cap));
        let (vx, room) = (t.x + 17.5, split - t.x - 19.0);
        if i == 1 && text_width(val, TEXT_FLOOR, Weight::Regular) > room {
            // A long title wraps to two lines at the floor rather than being cut.
            let lines = wrap_text(val, TEXT_FLOOR, Weight::Regular, room);
            for (k, line) in lines.iter().take(2).enumerate() {
                let last = k == 1 || lines.len() == 1;
                let rest = if last {
                    lines[k..].join(" ")
                } else {
                    line.clone()
                };
                g.push(Text::new(
                    vx,
                    y + 3.0 + k as f64 * 3.0,
                    TEXT_FLOOR,
                    "",
                    cut_to_width(&rest, TEXT_FLOOR, Weight::Regular, room),
                ));
            }
        } else {
            g.push(text_fit(vx, base, *size, room, cls, val));
        }
        let (cap, val, size, cls) = &right[i];
        g.push(Text::new(split + 1.5, base, TEXT_FLOOR, "", *cap));
        g.push(text_fit(
            split + 10.5,
            base,
            *size,
            t.right() - split - 12.0,
            cls,
            val,
        ));
        y += h;
    }
    g
}
