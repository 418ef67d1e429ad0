//! The commutator end view: the ring as the rewinder sees it from the commutator end, with
//! the bars and slots numbered round it, slot 1's coil group thrown to its bars, the cord
//! through slot 1's centre drawn across the bars with the bar in line with it shaded and
//! named, the brushes at their real width with polarity, the pole axes, the rotation, the
//! lead swing and the commutator throw in shop words.
//!
//! Part of the `layout` stage (the sheets). Angles come from the traced winding (slot k's
//! centre at (k − 1)·360/S, segment centres from `Winding::segment_deg`, brush centres and
//! pole axes as traced, the in-line bar from `LeadSwing::in_line`); 0° is drawn at twelve
//! o'clock and angles grow clockwise, as the slots are numbered seen from the commutator end.
//!
//! Counting the bars: a line at every mica, a short tick at every 5th bar and a long one at
//! every 10th, bar 1 marked and numbered in bold, and numbers at the finest step of
//! `BAR_STEPS` whose numbers all fit (tested in `tests/it/end_view.rs`). Every text of the
//! ring goes through one `Placer`, so none overlaps another: slot numbers in one row,
//! brush names in up to three (the sign alone where no name fits, said in the words).

use crate::design::Rotation;
use crate::layout::font::{Weight, ink_extent, text_width, wrap_text};
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

/// The bar-numbering steps tried, finest first: every bar, then every 2nd, 5th, 10th …
/// (a numbered bar at every multiple of the step, and bar 1).
const BAR_STEPS: [u32; 12] = [1, 2, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000];

/// Paper left clear between two texts of the ring, mm.
const TEXT_GAP: f64 = 0.5;

/// An ink box: left, top, right, bottom, mm.
type Bbox = (f64, f64, f64, f64);

/// The texts placed round the ring so far: each new one goes where it overlaps none of them
/// and stays inside the ring's room.
#[derive(Clone)]
struct Placer {
    /// The ring's centre.
    centre: (f64, f64),
    room: Bbox,
    boxes: Vec<Bbox>,
}

impl Placer {
    fn fits(&self, b: Bbox) -> bool {
        let r = self.room;
        b.0 >= r.0
            && b.1 >= r.1
            && b.2 <= r.2
            && b.3 <= r.3
            && self.boxes.iter().all(|o| {
                b.0 >= o.2 + TEXT_GAP
                    || o.0 >= b.2 + TEXT_GAP
                    || b.1 >= o.3 + TEXT_GAP
                    || o.1 >= b.3 + TEXT_GAP
            })
    }

    /// Places `content` (centred, class `class`) on the ray at `deg`, its ink box clear of
    /// the circle `r_edge` by `clear` mm on the side away from it (`outward`: beyond it,
    /// else inside it), in the first of `rows` rows, stepping a box's depth each row, where it
    /// fits; `None` where no row does.
    fn radial(
        &mut self,
        (r_edge, outward): (f64, bool),
        deg: f64,
        clear: f64,
        rows: u32,
        (class, weight): (&str, Weight),
        content: &str,
    ) -> Option<Text> {
        let w = text_width(content, TEXT_FLOOR, weight);
        let (up, down) = ink_extent(content, TEXT_FLOOR, weight);
        let (hw, hh) = (w / 2.0, (up + down) / 2.0);
        let a = deg.to_radians();
        // Half the box's depth along the ray.
        let depth = hw * a.sin().abs() + hh * a.cos().abs();
        for row in 0..rows {
            let off = clear + depth + f64::from(row) * (2.0 * depth + TEXT_GAP + 0.3);
            let r = if outward { r_edge + off } else { r_edge - off };
            if r < depth + 2.0 {
                return None;
            }
            let p = at(self.centre, r, deg);
            let b = (p.0 - hw, p.1 - hh, p.0 + hw, p.1 + hh);
            if self.fits(b) {
                self.boxes.push(b);
                let baseline = p.1 - hh + up;
                return Some(Text::new(p.0, baseline, TEXT_FLOOR, class, content));
            }
        }
        None
    }
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

impl Ring {
    /// Inner radius of the bars (the risers' ring).
    fn r_inner(&self) -> f64 {
        self.r_bar - 5.0
    }
}

/// How the ring's bars and brushes were numbered, for the words beside it.
struct Numbered {
    /// A number at every multiple of this (and on bar 1).
    bar_step: u32,
    /// Brushes written with their sign alone, for want of room.
    sign_only: usize,
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
        r_bar: true_dc.map_or(r_max * 0.78, |dc| dc / 2.0),
        r_slot: r_max - 2.0,
        seg_deg: 360.0 / f64::from(input.winding.active_coils),
        slot_deg: 360.0 / f64::from(d.slots),
    };
    // Every text of the ring keeps clear of every other, inside the room left of the words.
    let mut placer = Placer {
        centre: ring.centre,
        room: (
            c.x + 1.0,
            c.y + 9.0,
            c.right() - words_w - 2.0,
            frame.title_block.y - 1.0,
        ),
        boxes: Vec::new(),
    };
    let mut g = Group::id("commutator-end");
    ring_inline_bar(&mut g, input, &ring);
    let bar_step = ring_bars(&mut g, input, &ring, &mut placer);
    ring_slots(&mut g, input, &ring, &mut placer);
    // Pole axes.
    for &axis in &input.winding.pole_axes_deg {
        g.push(Line::new(
            "pole-edge",
            at(ring.centre, ring.r_bar - 5.0, axis),
            at(ring.centre, ring.r_slot - 3.5, axis),
        ));
    }
    ring_slot1_leads(&mut g, input, &ring);
    ring_cord(&mut g, input, &ring, &mut placer);
    let sign_only = ring_brushes(&mut g, input, &ring, &mut placer);
    out.push(g.into());
    ring_words(
        out,
        input,
        (c.right() - words_w, c.y + 16.0),
        words_w,
        true_dc,
        &Numbered {
            bar_step,
            sign_only,
        },
    );
}

/// The bar or bars in line with slot 1's centre line (two when it falls on a mica), as the
/// trace found them.
fn in_line_bars(input: &Input<'_>) -> Vec<u32> {
    let (bar, right) = input.winding.lead_swing.in_line(input.winding.active_coils);
    std::iter::once(bar).chain(right).collect()
}

/// The in-line bar (or the two beside the in-line mica) shaded on the bar ring, under the
/// ticks.
fn ring_inline_bar(g: &mut Group, input: &Input<'_>, ring: &Ring) {
    let w = input.winding;
    for s in in_line_bars(input) {
        let mid = w.segment_deg(s);
        let half = ring.seg_deg / 2.0;
        let n = 4;
        let mut ops = Vec::new();
        for i in 0..=n {
            let a = mid - half + 2.0 * half * f64::from(i) / f64::from(n);
            let p = at(ring.centre, ring.r_bar, a);
            ops.push(if i == 0 {
                PathOp::Move(p.0, p.1)
            } else {
                PathOp::Line(p.0, p.1)
            });
        }
        for i in (0..=n).rev() {
            let a = mid - half + 2.0 * half * f64::from(i) / f64::from(n);
            let p = at(ring.centre, ring.r_inner(), a);
            ops.push(PathOp::Line(p.0, p.1));
        }
        ops.push(PathOp::Close);
        let mut p = Path::polyline("inline-bar", &[]);
        p.ops = ops;
        p.data.push(("data-seg", s.to_string()));
        g.push(p);
    }
}

/// The cord through the centre of slot 1 (0°), from the slot circle in across the bars,
/// labelled with the bar (or mica) it lies on.
fn ring_cord(g: &mut Group, input: &Input<'_>, ring: &Ring, placer: &mut Placer) {
    let bars = in_line_bars(input);
    let ids: Vec<String> = bars.iter().map(u32::to_string).collect();
    let mut cord = Line::new(
        "cord",
        at(ring.centre, ring.r_slot, 0.0),
        at(ring.centre, ring.r_inner(), 0.0),
    );
    cord.data.push(("data-inline", ids.join(" ")));
    g.push(cord);
    let words = match bars[..] {
        [b] => format!("in line: bar {b}"),
        _ => format!("in line: mica {}|{}", bars[0], bars[1]),
    };
    // Beside the cord, halfway between the bars and the slots, on whichever side has room.
    let width = text_width(&words, TEXT_FLOOR, Weight::Regular);
    let (up, down) = ink_extent(&words, TEXT_FLOOR, Weight::Regular);
    // Between the brushes' backs and the slot ticks.
    let mid = at(
        ring.centre,
        (ring.r_bar + 3.4 + ring.r_slot - 3.0) / 2.0,
        0.0,
    );
    for dy in [0.0, -4.0, 4.0, -8.0, 8.0] {
        for side in [-1.0, 1.0] {
            let x0 = if side < 0.0 {
                mid.0 - 1.2 - width
            } else {
                mid.0 + 1.2
            };
            let base = mid.1 + dy + (up - down) / 2.0;
            let b = (x0, base - up, x0 + width, base + down);
            if placer.fits(b) {
                placer.boxes.push(b);
                g.push(
                    Text::new(x0, base, TEXT_FLOOR, "halo", words.clone())
                        .with_data("data-part", "cord"),
                );
                return;
            }
        }
    }
}

/// Bars: the ring, a tick at every mica, a short tick inward at every 5th bar and a long
/// one at every 10th, bar 1 marked, and numbers at the finest step of `BAR_STEPS` whose
/// numbers all fit in two rows (bar 1 always numbered, in bold). Returns the step.
fn ring_bars(g: &mut Group, input: &Input<'_>, ring: &Ring, placer: &mut Placer) -> u32 {
    let w = input.winding;
    let bars = w.active_coils;
    let (centre, r_bar, seg_deg) = (ring.centre, ring.r_bar, ring.seg_deg);
    let r_in = ring.r_inner();
    g.push(Circle::new("core", centre.0, centre.1, r_bar));
    g.push(Circle::new("core", centre.0, centre.1, r_in));
    for s in 1..=bars {
        let mica = w.segment_deg(s) + seg_deg / 2.0;
        g.push(Line::new(
            "thin",
            at(centre, r_in, mica),
            at(centre, r_bar, mica),
        ));
    }
    let mut ticks = Group::id("bar-ticks");
    for s in (1..=bars).filter(|s| s % 5 == 0) {
        let (len, cls) = if s % 10 == 0 {
            (3.0, "rule")
        } else {
            (1.8, "leader")
        };
        let a = w.segment_deg(s);
        ticks.push(bar_tick(
            cls,
            at(centre, r_in, a),
            at(centre, r_in - len, a),
            s,
        ));
    }
    // Bar 1: a heavy tick through the bar and a dot inside the ring.
    let a1 = w.segment_deg(1);
    ticks.push(bar_tick(
        "mark",
        at(centre, r_bar, a1),
        at(centre, r_in - 3.0, a1),
        1,
    ));
    let dot = at(centre, r_in - 3.0, a1);
    ticks.push(Circle::new("bar1-dot", dot.0, dot.1, 0.7));
    g.push(ticks);
    // Bar 1 first; the in-line bar is named beside the cord.
    let must = [1];
    let edge = (r_in - 3.0, false);
    let face = |s: u32| {
        if s == 1 {
            ("mid b", Weight::Bold)
        } else {
            ("mid", Weight::Regular)
        }
    };
    for &step in BAR_STEPS.iter().filter(|&&k| k < bars.max(2)) {
        let mut trial = placer.clone();
        let mut numbers = Group::id("bar-numbers").with_data("data-step", step);
        let wanted = must.iter().copied().chain(
            (step..=bars)
                .step_by(step as usize)
                .filter(|s| !must.contains(s)),
        );
        let mut all = true;
        for s in wanted {
            match trial.radial(edge, w.segment_deg(s), 0.8, 2, face(s), &s.to_string()) {
                Some(t) => numbers.push(t.with_data("data-seg", s)),
                None => {
                    all = false;
                    break;
                }
            }
        }
        if all {
            *placer = trial;
            g.push(numbers);
            return step;
        }
    }
    // No step fits: bar 1 alone.
    let mut numbers = Group::id("bar-numbers").with_data("data-step", bars);
    if let Some(t) = placer.radial(edge, a1, 0.8, 3, face(1), "1") {
        numbers.push(t.with_data("data-seg", 1));
    }
    g.push(numbers);
    bars
}

/// A tick of bar `s`.
fn bar_tick(class: &str, from: (f64, f64), to: (f64, f64), s: u32) -> Line {
    let mut l = Line::new(class, from, to);
    l.data.push(("data-seg", s.to_string()));
    l
}

/// Slots round the core, numbered where they fit (slot 1 first).
fn ring_slots(g: &mut Group, input: &Input<'_>, ring: &Ring, placer: &mut Placer) {
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
        let a = f64::from(k - 1) * slot_deg;
        if let Some(t) = placer.radial(
            (r_slot, true),
            a,
            0.8,
            1,
            ("mid b", Weight::Bold),
            &k.to_string(),
        ) {
            slot_numbers.push(t.with_data("data-slot", k));
        }
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

/// Brushes at their real width: arcs on the bars' face, named outside the slot ring (B1
/// first; a brush whose name finds no room in three rows is written with its sign alone).
/// Returns how many were.
fn ring_brushes(g: &mut Group, input: &Input<'_>, ring: &Ring, placer: &mut Placer) -> usize {
    let w = input.winding;
    let mut sign_only = 0;
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
        // Beyond the slot numbers.
        let edge = (ring.r_slot + 6.0, true);
        let face = ("mid b", Weight::Bold);
        let name = format!("B{}{sign}", b.index);
        if let Some(t) = placer.radial(edge, centre_deg, 0.6, 3, face, &name) {
            bg.push(t);
        } else if let Some(t) = placer.radial(edge, centre_deg, 0.6, 3, face, sign) {
            sign_only += 1;
            bg.push(t);
        }
        g.push(bg);
    }
    sign_only
}

/// The words beside the ring, from (`x`, `y`) in a column `words_w` mm wide: lead swing,
/// throw, slot 1's group, rotation, brushes, scale, and for a frog-leg its second throw.
fn ring_words(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    (x, mut y): (f64, f64),
    words_w: f64,
    true_dc: Option<f64>,
    numbered: &Numbered,
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
            "Lead swing: the cord through the centre of slot 1 (the dash-dot line) lies on {in_line} (shaded); bar 1 (coil 1's start lead, the heavy tick and dot) is {} from it.",
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
        bar_words(numbered.bar_step, bars),
        format!("Rotation {rot} {sense} seen from this end."),
        format!(
            "Brushes at their real width ({} bars), filled +, open \u{2212}, named B1, B2 \u{2026} in turn round the ring{}; the thin radial lines are the pole axes.",
            crate::base::number::fmt_fixed(w.brushes.first().map_or(0.0, |b| b.width_segments), 2),
            if numbered.sign_only > 0 {
                "; where a name has no room its sign alone is written: count on from the nearest name"
            } else {
                ""
            }
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

/// How the bars are numbered, for the words beside the ring.
fn bar_words(step: u32, bars: u32) -> String {
    let numbers = match step {
        1 => "every bar numbered".to_string(),
        2 => "every other bar and bar 1 numbered".to_string(),
        s if s >= bars => "bar 1 numbered (no room for more)".to_string(),
        s => format!("every {s}th bar and bar 1 numbered"),
    };
    let ticks = if bars >= 5 {
        "; inside the ring a short tick at every 5th bar and a long one at every 10th"
    } else {
        ""
    };
    format!("Bars: a line at every mica, {numbers}{ticks}.")
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
