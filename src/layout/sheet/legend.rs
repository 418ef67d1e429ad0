//! The legend of sheet 1: a sample and a line of words for every look the diagram uses.
//!
//! Part of the `layout` stage (the sheets).

use crate::layout::developed::nodes::CUT_DOT_R;
use crate::layout::style::{
    DUMMY_DASH, DUMMY_GREY, INK, PATH_COLOURS, PATH_DASHES, SHORTED_GREY, TEXT_FLOOR, colour_class,
    dash_class,
};
use crate::layout::tree::{self, Circle, Group, Line, Path, Text};
use crate::winding::EqualizerPlan;

use super::{Input, Rect, hline};
use crate::layout::font::wrap_text;
use crate::layout::style::text_face;

/// The legend in `r`; `edge` is `None` when no line of the diagram meets an edge, else
/// whether the diagram shows the whole armature (lines re-enter) or a window (lines leave).
pub(super) fn legend_block(input: &Input<'_>, r: &Rect, edge: Option<bool>) -> Group {
    let mut g = Group::id("legend");
    g.push(Text::new(r.x + 2.0, r.y + 5.0, 3.2, "b", "Legend"));
    let x0 = r.x + 3.0;
    let xs = x0 + 11.0;
    let size = TEXT_FLOOR;
    let line_h = 3.3;
    let room = r.right() - xs - 1.5;
    // Words wrap at the floor rather than being cut; each call returns the height it took.
    let text = |g: &mut Group, x: f64, y: f64, class: &str, s: &str| -> f64 {
        let (weight, _) = text_face(class);
        let lines = wrap_text(s, size, weight, room - (x - xs));
        for (i, line) in lines.iter().enumerate() {
            g.push(Text::new(
                x,
                y + i as f64 * line_h,
                size,
                class,
                line.clone(),
            ));
        }
        lines.len().max(1) as f64 * line_h
    };
    let mut y = r.y + 9.6;
    let sample =
        |g: &mut Group, y: f64, stroke: &'static str, class: &str, dash: &'static [f64]| {
            let mut line = Line::new(class, (x0, y - 0.8), (x0 + 8.5, y - 0.8));
            line.stroke = Some(stroke);
            line.dash = (!dash.is_empty()).then_some(dash);
            g.push(line);
        };
    sample(&mut g, y, INK, "side-top", &[]);
    y += text(&mut g, xs, y, "", "top-layer coil side (start lead)");
    sample(&mut g, y, INK, "side-bot", &[]);
    y += text(&mut g, xs, y, "", "bottom-layer coil side (end lead)");
    let (ax, ay) = (x0 + 4.2, y - 0.9);
    let mut arrow = Path::triangle(
        None,
        [(ax, ay - 1.1), (ax - 0.9, ay + 1.0), (ax + 0.9, ay + 1.0)],
    );
    arrow.fill = Some(INK);
    g.push(arrow);
    y += text(&mut g, xs, y, "", "current at the drawn instant");
    let a = input.winding.paths.len();
    if a <= 4 {
        for p in &input.winding.paths {
            let k = colour_class(p.index);
            let dash = PATH_DASHES[dash_class(p.index) - 1];
            sample(&mut g, y, PATH_COLOURS[k - 1], "conn", dash);
            y += text(
                &mut g,
                xs + 1.5,
                y,
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
    } else {
        // Every path's own colour and dash, in a grid of samples each named by its number.
        let cell = 17.0;
        let across = (((r.right() - x0 - 1.0) / cell).floor() as usize).max(1);
        for (i, p) in input.winding.paths.iter().enumerate() {
            let (col, row) = (i % across, i / across);
            let (cx, cy) = (x0 + col as f64 * cell, y + row as f64 * line_h);
            let k = colour_class(p.index);
            let dash = PATH_DASHES[dash_class(p.index) - 1];
            let mut line = Line::new("conn", (cx, cy - 0.8), (cx + 8.5, cy - 0.8));
            line.stroke = Some(PATH_COLOURS[k - 1]);
            line.dash = (!dash.is_empty()).then_some(dash);
            g.push(line);
            g.push(Text::new(
                cx + 9.6,
                cy,
                size,
                &format!("b f{k}"),
                p.index.to_string(),
            ));
        }
        y += a.div_ceil(across) as f64 * line_h;
        y += text(
            &mut g,
            x0,
            y,
            "",
            "paths as above; the number at each back end names the path",
        );
    }
    sample(&mut g, y, SHORTED_GREY, "conn", &[]);
    y += text(
        &mut g,
        xs,
        y,
        "",
        "grey, tag sc: shorted by a brush now (no current)",
    );
    if input.winding.is_multi_element() {
        // A frog-leg's two elements: the back-end shapes the diagram draws.
        let (b, t) = (y - 0.1, y - 2.1);
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
            g.push(line);
        }
        y += text(
            &mut g,
            xs,
            y,
            "",
            "back ends: lap coils pointed, wave square",
        );
    }
    if !input.winding.dummy_coils.is_empty() {
        sample(&mut g, y, DUMMY_GREY, "conn", DUMMY_DASH);
        y += text(
            &mut g,
            xs,
            y,
            "",
            "dummy coil: dead, ends cut and taped (\u{d7})",
        );
    }
    g.push(tree::Rect::new("brushbox brush-pos", x0, y - 2.6, 3.6, 2.6));
    g.push(tree::Rect::new(
        "brushbox brush-neg",
        x0 + 4.8,
        y - 2.6,
        3.6,
        2.6,
    ));
    y += text(
        &mut g,
        xs,
        y,
        "",
        "brush: filled positive (+), open negative (\u{2212})",
    );
    if let Some(whole) = edge {
        g.push(Circle::new("cutdot", x0 + 7.5, y - 0.8, CUT_DOT_R));
        g.push(hline(x0, x0 + 7.5, y - 0.8, "rule"));
        let cut = if whole {
            "edge: the line goes on at the other edge; its label, coil\u{2192}s slot or b bar, is the same at both"
        } else {
            "edge: the line leaves the window; its label names the coil\u{2192}s slot or b bar it goes to"
        };
        y += text(&mut g, xs, y, "", cut);
    }
    if matches!(&input.winding.equalizers, EqualizerPlan::Possible(e) if !e.groups.is_empty()) {
        g.push(hline(x0, x0 + 8.5, y - 0.8, "eqline"));
        g.push(Circle::new("eqdot", x0 + 4.2, y - 0.8, 0.45));
        text(
            &mut g,
            xs,
            y,
            "",
            "equalizer ring E n and its taps (see table)",
        );
    }
    g
}
