//! The commutator end view: the ring as the rewinder sees it from the commutator end, with
//! the bars and slots numbered round it, slot 1's coil group thrown to its bars, the brushes
//! at their real width with polarity, the pole axes, the rotation, the lead swing and the
//! commutator throw in shop words.
//!
//! Part of the `layout` stage (the sheets). Angles come from the traced winding (slot k's
//! centre at (k − 1)·360/S, segment centres from `Winding::segment_deg`, brush centres and
//! pole axes as traced); 0° is drawn at twelve o'clock and angles grow clockwise, as the
//! slots are numbered seen from the commutator end.

use crate::design::Rotation;
use crate::layout::font::{Weight, text_width, wrap_text};
use crate::layout::style::TEXT_FLOOR;
use crate::layout::tree::{Circle, Group, Line, Node, Path, PathOp, Text};
use crate::theory::words::half_bars_words;
use crate::winding::Polarity;

use super::rows::signed;
use super::table::page_heading;
use super::{Input, PageFrame};

/// A point `r` mm from the centre at `deg` (clockwise from twelve o'clock).
fn at(c: (f64, f64), r: f64, deg: f64) -> (f64, f64) {
    let a = deg.to_radians();
    (c.0 + r * a.sin(), c.1 - r * a.cos())
}

/// Every `k`-th of `n` items gets a number so that numbers `width` mm wide stand `pitch`
/// mm apart with room; at least 1.
fn label_step(n: u32, width: f64, pitch: f64) -> u32 {
    (((width + 1.2) / pitch).ceil() as u32).clamp(1, n.max(1))
}

/// The ring's geometry on the page: its centre and radii, mm, and the angle of one bar and
/// of one slot, degrees.
struct Ring {
    centre: (f64, f64),
    /// Outer radius of the bars.
    r_bar: f64,
    /// Radius of the slot circle.
    r_slot: f64,
    seg_deg: f64,
    slot_deg: f64,
}

/// The commutator end view on the content area of `frame`.
pub(super) fn ring_page(out: &mut Vec<Node>, input: &Input<'_>, frame: &PageFrame) {
    let d = input.design;
    let c = &frame.content;
    out.push(page_heading(
        c,
        "Commutator end view: the armature seen from the commutator end",
    ));
    // The ring on the left, the words on the right.
    let words_w = (c.w * 0.38).min(130.0);
    let room_w = c.w - words_w - 6.0;
    let room_h = frame.title_block.y - c.y - 12.0;
    let r_max = (room_w.min(room_h) / 2.0 - 15.0).max(20.0);
    let true_dc = d
        .commutator
        .as_ref()
        .and_then(|k| k.diameter_mm)
        .filter(|dc| dc / 2.0 + 9.0 <= r_max);
    let ring = Ring {
        centre: (c.x + 4.0 + room_w / 2.0, c.y + 10.0 + room_h / 2.0),
        r_bar: true_dc.map_or(r_max * 0.62, |dc| dc / 2.0),
        r_slot: r_max - 2.0,
        seg_deg: 360.0 / f64::from(input.winding.active_coils),
        slot_deg: 360.0 / f64::from(d.slots),
    };
    let mut g = Group::id("commutator-end");
    ring_bars(&mut g, input, &ring);
    ring_slots(&mut g, input, &ring);
    // Pole axes.
    for &axis in &input.winding.pole_axes_deg {
        g.push(Line::new(
            "pole-edge",
            at(ring.centre, ring.r_bar - 5.0, axis),
            at(ring.centre, ring.r_slot - 3.5, axis),
        ));
    }
    ring_slot1_leads(&mut g, input, &ring);
    ring_brushes(&mut g, input, &ring);
    out.push(g.into());
    ring_words(
        out,
        input,
        (c.right() - words_w, c.y + 16.0),
        words_w,
        true_dc,
    );
}

/// Bars: the ring, a tick at every mica, numbers where they fit.
fn ring_bars(g: &mut Group, input: &Input<'_>, ring: &Ring) {
    let w = input.winding;
    let bars = w.active_coils;
    let (centre, r_bar, seg_deg) = (ring.centre, ring.r_bar, ring.seg_deg);
    g.push(Circle::new("core", centre.0, centre.1, r_bar));
    g.push(Circle::new("core", centre.0, centre.1, r_bar - 5.0));
    for s in 1..=bars {
        let mica = w.segment_deg(s) + seg_deg / 2.0;
        g.push(Line::new(
            "thin",
            at(centre, r_bar - 5.0, mica),
            at(centre, r_bar, mica),
        ));
    }
    let widest = text_width(&bars.to_string(), TEXT_FLOOR, Weight::Regular);
    let pitch = (r_bar - 9.0) * seg_deg.to_radians();
    let step = label_step(bars, widest, pitch);
    let mut bar_numbers = Group::id("bar-numbers");
    // The last number keeps a whole step clear of number 1 round the ring.
    for s in (1..=bars)
        .step_by(step as usize)
        .filter(|&s| s == 1 || bars - s + 1 >= step)
    {
        let (x, y) = at(centre, r_bar - 9.0, w.segment_deg(s));
        bar_numbers.push(
            Text::new(x, y + TEXT_FLOOR * 0.36, TEXT_FLOOR, "mid", s.to_string())
                .with_data("data-seg", s),
        );
    }
    g.push(bar_numbers);
}

/// Slots round the core, numbered where they fit.
fn ring_slots(g: &mut Group, input: &Input<'_>, ring: &Ring) {
    let s_count = input.design.slots;
    let (centre, r_slot, slot_deg) = (ring.centre, ring.r_slot, ring.slot_deg);
    g.push(Circle::new("core", centre.0, centre.1, r_slot));
    for k in 1..=s_count {
        let a = f64::from(k - 1) * slot_deg;
        g.push(Line::new(
            "slot",
            at(centre, r_slot - 3.0, a),
            at(centre, r_slot, a),
        ));
    }
    let widest = text_width(&s_count.to_string(), TEXT_FLOOR, Weight::Bold);
    let pitch = (r_slot + 4.5) * slot_deg.to_radians();
    let step = label_step(s_count, widest, pitch);
    let mut slot_numbers = Group::id("ring-slot-numbers");
    for k in (1..=s_count)
        .step_by(step as usize)
        .filter(|&k| k == 1 || s_count - k + 1 >= step)
    {
        let (x, y) = at(centre, r_slot + 4.5, f64::from(k - 1) * slot_deg);
        slot_numbers.push(
            Text::new(x, y + TEXT_FLOOR * 0.36, TEXT_FLOOR, "mid b", k.to_string())
                .with_data("data-slot", k),
        );
    }
    g.push(slot_numbers);
}

/// The coils of slot 1's coil group (those whose top side lies in slot 1).
fn slot1_group<'a>(input: &Input<'a>) -> Vec<&'a crate::winding::Connection> {
    input
        .winding
        .connections
        .iter()
        .filter(|k| k.top.slot == 1)
        .collect()
}

/// Slot 1's coil group: from the slot to the start bar, from the bottom side's slot to the
/// end bar.
fn ring_slot1_leads(g: &mut Group, input: &Input<'_>, ring: &Ring) {
    let w = input.winding;
    let (centre, r_slot, r_bar) = (ring.centre, ring.r_slot, ring.r_bar);
    for conn in &slot1_group(input) {
        let k = crate::layout::style::colour_class(w.coil_path[(conn.coil - 1) as usize]).max(1);
        let top = f64::from(conn.top.slot - 1) * ring.slot_deg;
        let bottom = f64::from(conn.bottom.slot - 1) * ring.slot_deg;
        if let Some(sb) = conn.start_segment {
            g.push(lead(centre, r_slot - 3.0, top, r_bar, w.segment_deg(sb), k));
        }
        if let Some(eb) = conn.end_segment {
            g.push(lead(
                centre,
                r_slot - 3.0,
                bottom,
                r_bar,
                w.segment_deg(eb),
                k,
            ));
        }
    }
}

/// Brushes at their real width: arcs on the bars' face, named outside the slot ring.
fn ring_brushes(g: &mut Group, input: &Input<'_>, ring: &Ring) {
    let w = input.winding;
    let (centre, r_bar, seg_deg) = (ring.centre, ring.r_bar, ring.seg_deg);
    for b in &w.brushes {
        let centre_deg = w.segment1_deg + (b.centre_segment - 1.0) * seg_deg;
        let half = b.width_segments * seg_deg / 2.0;
        let (r0, r1) = (r_bar + 0.6, r_bar + 3.4);
        let n = 8;
        let mut ops = Vec::new();
        for i in 0..=n {
            let a = centre_deg - half + 2.0 * half * f64::from(i) / f64::from(n);
            let p = at(centre, r1, a);
            ops.push(if i == 0 {
                PathOp::Move(p.0, p.1)
            } else {
                PathOp::Line(p.0, p.1)
            });
        }
        for i in (0..=n).rev() {
            let a = centre_deg - half + 2.0 * half * f64::from(i) / f64::from(n);
            let p = at(centre, r0, a);
            ops.push(PathOp::Line(p.0, p.1));
        }
        ops.push(PathOp::Close);
        let cls = match b.polarity {
            Polarity::Positive => "brushbox brush-pos",
            Polarity::Negative => "brushbox brush-neg",
        };
        let mut p = Path::polyline(cls, &[]);
        p.ops = ops;
        let mut bg = Group::id(format!("ring-brush-{}", b.index))
            .with_data("data-brush", b.index)
            .with_data("data-polarity", b.polarity.sign());
        bg.push(p);
        let sign = match b.polarity {
            Polarity::Positive => "+",
            Polarity::Negative => "\u{2212}",
        };
        let (x, y) = at(centre, ring.r_slot + 12.5, centre_deg);
        bg.push(Text::new(
            x,
            y + TEXT_FLOOR * 0.36,
            TEXT_FLOOR,
            "mid b",
            format!("B{}{sign}", b.index),
        ));
        g.push(bg);
    }
}

/// The words beside the ring, from (`x`, `y`) in a column `words_w` mm wide: lead swing,
/// throw, slot 1's group, rotation, brushes, scale, and for a frog-leg its second throw.
fn ring_words(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    (x, mut y): (f64, f64),
    words_w: f64,
    true_dc: Option<f64>,
) {
    let d = input.design;
    let w = input.winding;
    let bars = w.active_coils;
    let group = slot1_group(input);
    let (in_bar, right) = w.lead_swing.in_line(bars);
    let in_line = match right {
        None => format!("bar {in_bar}"),
        Some(r) => format!("the mica between bars {in_bar} and {r}"),
    };
    let throw = super::rows::coil1_throw(w);
    let (rot, sense) = match d.rotation {
        Rotation::Clockwise => ("clockwise", "\u{21bb}"),
        Rotation::CounterClockwise => ("counter-clockwise", "\u{21ba}"),
    };
    let scale = match true_dc {
        Some(dc) => format!(
            "Bar ring at true scale (commutator \u{d8}{} mm); slots and brushes schematic.",
            crate::base::number::fmt_fixed(dc, 0)
        ),
        None => "Schematic, not to scale.".to_string(),
    };
    let lines = [
        format!(
            "Lead swing: a cord through the centre of slot 1 lies on {in_line}; bar 1 (coil 1's start lead) is {} from it.",
            half_bars_words(w.lead_swing.swing_half_bars(bars))
        ),
        format!(
            "Commutator throw {throw} (y_c = {}): coil 1's leads go to bars {throw}.",
            signed(w.pitches.commutator)
        ),
        format!(
            "Slot 1's coil group ({} coil{}) is drawn with its leads thrown to their bars.",
            group.len(),
            if group.len() == 1 { "" } else { "s" }
        ),
        format!("Rotation {rot} {sense} seen from this end."),
        format!(
            "Brushes at their real width ({} bars), filled +, open \u{2212}; the thin radial lines are the pole axes.",
            crate::base::number::fmt_fixed(w.brushes.first().map_or(0.0, |b| b.width_segments), 2)
        ),
        scale,
    ];
    // A frog-leg: four leads on every bar, and the wave element's throw beside the lap's.
    let frog_leg = w.elements.get(1).map(|e| {
        let k = &w.connections[(e.first_coil - 1) as usize];
        format!(
            "Every bar takes four leads: a start and an end lead of each element. The {} coils' throw is {}\u{2013}{} (y_c = {}); slot 1's group holds the coils of both.",
            e.kind.as_str(),
            k.start_segment.unwrap_or(0),
            k.end_segment.unwrap_or(0),
            signed(e.pitches.commutator)
        )
    });
    for l in lines.into_iter().chain(frog_leg) {
        for part in wrap_text(&l, 3.0, Weight::Regular, words_w - 4.0) {
            out.push(Text::new(x, y, 3.0, "", part).into());
            y += 3.9;
        }
        y += 1.6;
    }
}

/// One lead of slot 1's coil group, from the slot ring in to its bar.
fn lead(c: (f64, f64), r_slot: f64, slot_deg: f64, r_bar: f64, bar_deg: f64, k: usize) -> Node {
    let a = at(c, r_slot, slot_deg);
    let b = at(c, r_bar, bar_deg);
    let mut p = Path::polyline(&format!("conn k{k}"), &[a, b]);
    p.data.push(("data-part", "lead".into()));
    let mut g = Group::class("coil");
    g.push(p);
    g.push(Circle::new("cutdot", b.0, b.1, 0.6));
    g.into()
}
