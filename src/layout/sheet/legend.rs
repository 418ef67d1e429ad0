//! The legend of sheet 1: a sample and a line of words for every look the diagram uses.
//!
//! Part of the `layout` stage (the sheets).

use crate::layout::developed::nodes::CUT_DOT_R;
use crate::layout::style::{
    DUMMY_DASH, DUMMY_GREY, INK, LOOK_CYCLE, PATH_COLOURS, PATH_DASHES, SHORTED_DASH, SHORTED_GREY,
    TEXT_FLOOR, colour_class, dash_class,
};
use crate::layout::tree::{self, Circle, Group, Line, Path, Text};
use crate::winding::EqualizerPlan;

use super::{Input, Rect, hline};
use crate::layout::font::wrap_text;
use crate::layout::style::text_face;

/// A legend being written: its group, the column of samples (`x0`) and of words (`xs`),
/// the room for the words, mm, and the baseline of the next line.
struct Legend {
    g: Group,
    x0: f64,
    xs: f64,
    room: f64,
    y: f64,
}

/// Type size of the legend's words, mm.
const SIZE: f64 = TEXT_FLOOR;
/// Line height of the legend's words, mm.
const LINE_H: f64 = 3.3;

impl Legend {
    /// `s` at `x` on the current line in `class`, moving down by the height it took. Words
    /// wrap at the floor rather than being cut.
    fn text(&mut self, x: f64, class: &str, s: &str) {
        let (weight, _) = text_face(class);
        let lines = wrap_text(s, SIZE, weight, self.room - (x - self.xs));
        for (i, line) in lines.iter().enumerate() {
            self.g.push(Text::new(
                x,
                self.y + i as f64 * LINE_H,
                SIZE,
                class,
                line.clone(),
            ));
        }
        self.y += lines.len().max(1) as f64 * LINE_H;
    }

    /// A sample line on the current line.
    fn sample(&mut self, stroke: &'static str, class: &str, dash: &'static [f64]) {
        let (x0, y) = (self.x0, self.y);
        let mut line = Line::new(class, (x0, y - 0.8), (x0 + 8.5, y - 0.8));
        line.stroke = Some(stroke);
        line.dash = (!dash.is_empty()).then_some(dash);
        self.g.push(line);
    }
}

/// The legend in `r`; `edge` is `None` when no line of the diagram meets an edge, else
/// whether the diagram shows the whole armature (lines re-enter) or a window (lines leave).
pub(super) fn legend_block(input: &Input<'_>, r: &Rect, edge: Option<bool>) -> Group {
    let mut g = Group::id("legend");
    g.push(Text::new(r.x + 2.0, r.y + 5.0, 3.2, "b", "Legend"));
    let x0 = r.x + 3.0;
    let xs = x0 + 11.0;
    let mut l = Legend {
        g,
        x0,
        xs,
        room: r.right() - xs - 1.5,
        y: r.y + 9.6,
    };
    sides_and_current(&mut l);
    if input.winding.paths.len() <= 4 {
        paths_listed(&mut l, input);
    } else {
        paths_grid(&mut l, input, r);
    }
    l.sample(SHORTED_GREY, "conn", SHORTED_DASH);
    l.text(
        xs,
        "",
        "grey, dashed in pairs, tag sc: shorted by a brush now (no current)",
    );
    if input.winding.is_multi_element() {
        back_end_shapes(&mut l);
    }
    if !input.winding.dummy_coils.is_empty() {
        l.sample(DUMMY_GREY, "conn", DUMMY_DASH);
        l.text(xs, "", "dummy coil: dead, ends cut and taped (\u{d7})");
    }
    let y = l.y;
    l.g.push(tree::Rect::new("brushbox brush-pos", x0, y - 2.6, 3.6, 2.6));
    l.g.push(tree::Rect::new(
        "brushbox brush-neg",
        x0 + 4.8,
        y - 2.6,
        3.6,
        2.6,
    ));
    l.text(
        xs,
        "",
        "brush: filled positive (+), open negative (\u{2212})",
    );
    if let Some(whole) = edge {
        let y = l.y;
        l.g.push(Circle::new("cutdot", x0 + 7.5, y - 0.8, CUT_DOT_R));
        l.g.push(hline(x0, x0 + 7.5, y - 0.8, "rule"));
        let cut = if whole {
            "edge: the line goes on at the other edge; its label, coil\u{2192}s slot or b bar, is the same at both"
        } else {
            "edge: the line leaves the window; its label names the coil\u{2192}s slot or b bar it goes to"
        };
        l.text(xs, "", cut);
    }
    if matches!(&input.winding.equalizers, EqualizerPlan::Possible(e) if !e.groups.is_empty()) {
        let y = l.y;
        l.g.push(hline(x0, x0 + 8.5, y - 0.8, "eqline"));
        l.g.push(Circle::new("eqdot", x0 + 4.2, y - 0.8, 0.45));
        l.text(xs, "", "equalizer ring E n and its taps (see table)");
    }
    l.g
}

/// The two layers of coil side and the current arrow.
fn sides_and_current(l: &mut Legend) {
    let xs = l.xs;
    l.sample(INK, "side-top", &[]);
    l.text(xs, "", "thick: top-layer coil side (start lead)");
    l.sample(INK, "side-bot", &[]);
    l.text(xs, "", "thin: bottom-layer coil side (end lead)");
    let (ax, ay) = (l.x0 + 4.2, l.y - 0.9);
    let mut arrow = Path::triangle(
        None,
        [(ax, ay - 1.1), (ax - 0.9, ay + 1.0), (ax + 0.9, ay + 1.0)],
    );
    arrow.fill = Some(INK);
    l.g.push(arrow);
    l.text(xs, "", "current at the drawn instant");
}

/// Up to four paths: a line each, naming its brushes and its coils.
fn paths_listed(l: &mut Legend, input: &Input<'_>) {
    for p in &input.winding.paths {
        let k = colour_class(p.index);
        let dash = PATH_DASHES[dash_class(p.index) - 1];
        l.sample(PATH_COLOURS[k - 1], "conn", dash);
        l.text(
            l.xs + 1.5,
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
    }
}

/// More paths: every path's own colour and dash, in a grid of samples each named by its
/// number.
fn paths_grid(l: &mut Legend, input: &Input<'_>, r: &Rect) {
    let x0 = l.x0;
    let cell = 17.0;
    let across = (((r.right() - x0 - 1.0) / cell).floor() as usize).max(1);
    // Past one cycle of looks a path looks as one listed: the list stops there.
    let listed = input.winding.paths.len().min(LOOK_CYCLE);
    for (i, p) in input.winding.paths.iter().take(listed).enumerate() {
        let (col, row) = (i % across, i / across);
        let (cx, cy) = (x0 + col as f64 * cell, l.y + row as f64 * LINE_H);
        let k = colour_class(p.index);
        let dash = PATH_DASHES[dash_class(p.index) - 1];
        let mut line = Line::new("conn", (cx, cy - 0.8), (cx + 8.5, cy - 0.8));
        line.stroke = Some(PATH_COLOURS[k - 1]);
        line.dash = (!dash.is_empty()).then_some(dash);
        l.g.push(line);
        l.g.push(Text::new(
            cx + 9.6,
            cy,
            SIZE,
            &format!("b f{k}"),
            p.index.to_string(),
        ));
    }
    l.y += listed.div_ceil(across) as f64 * LINE_H;
    let words = if input.winding.paths.len() > LOOK_CYCLE {
        format!(
            "path k as path k \u{2212} {LOOK_CYCLE} (the looks repeat); the number at each back end names the path"
        )
    } else {
        "paths as above; the number at each back end names the path".to_string()
    };
    l.text(x0, "", &words);
}

/// A frog-leg's two elements: the back-end shapes the diagram draws.
fn back_end_shapes(l: &mut Legend) {
    let x0 = l.x0;
    let (b, t) = (l.y - 0.1, l.y - 2.1);
    let lap = [(x0, b), (x0 + 2.0, t), (x0 + 4.0, b)];
    let wave = [
        (x0 + 4.8, b),
        (x0 + 5.6, t + 0.8),
        (x0 + 7.7, t + 0.8),
        (x0 + 8.5, b),
    ];
    for piece in lap.windows(2).chain(wave.windows(2)) {
        let mut line = Line::new("conn", piece[0], piece[1]);
        line.stroke = Some(INK);
        l.g.push(line);
    }
    let xs = l.xs;
    l.text(xs, "", "back ends: lap coils pointed, wave square");
}
