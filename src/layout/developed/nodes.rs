//! The developed diagram as page-tree nodes: the looks (classes, type sizes, label
//! placement) of the geometry that the rest of `layout::developed` resolved.
//!
//! Part of the `layout` stage. Ids and data attributes come from the domain: `coil-12`
//! (`data-coil`, `data-start-seg`, `data-end-seg`), `seg-7` (`data-seg`), `brush-1`, `eq-3`.

use crate::design::Rotation;
use crate::layout::font::{Weight, text_width};
use crate::layout::style::{TEXT_FLOOR, colour_class, dash_class};
use crate::layout::tree::{Circle, Group, Line, Node, Path, PathOp, Rect, Text};
use crate::winding::Polarity;

use super::{CoilDrawing, Diagram, EqualizerBand};

/// The size at most `max` mm at which the header's two texts, with four spaces between
/// them, fill the strip.
fn header_size(head: &str, note: &str, room: f64, max: f64) -> f64 {
    let em = text_width(head, 1.0, Weight::Regular)
        + text_width(note, 1.0, Weight::Bold)
        + text_width("    ", 1.0, Weight::Regular);
    max.min(room / em)
}

/// Radius of the dot where a line meets an edge, mm.
pub const CUT_DOT_R: f64 = 0.2;
/// Least distance between two dots on one edge of a printed diagram, mm: at least 0.2 mm
/// of paper shows between them.
pub const CUT_DOT_FLOOR: f64 = 2.0 * CUT_DOT_R + 0.2;

/// Hatching of the box x0…x1 × y0…y1: lines rising at 45° to the right, `step` mm apart.
fn hatch(x0: f64, x1: f64, y0: f64, y1: f64, step: f64) -> Vec<Line> {
    let h = y1 - y0;
    let mut out = Vec::new();
    let mut t = x0 - h + step / 2.0;
    while t < x1 {
        // The line (t + s, y1 − s) for s in 0…h, kept within x0…x1.
        let s0 = (x0 - t).max(0.0);
        let s1 = (x1 - t).min(h);
        if s1 - s0 > 0.05 {
            out.push(Line::new(
                "pole-hatch",
                (t + s0, y1 - s0),
                (t + s1, y1 - s1),
            ));
        }
        t += step;
    }
    out
}

fn rect(class: &str, x: f64, y: f64, w: f64, h: f64) -> Node {
    Rect::new(class, x, y, w, h).into()
}

fn join(v: &[u32]) -> String {
    v.iter().map(u32::to_string).collect::<Vec<_>>().join(" ")
}

/// `diagram` as a `diagram` group with its top-left at (`x`, `y`).
pub fn diagram_group(d: &Diagram, x: f64, y: f64) -> Group {
    let mut g = Group::id("diagram");
    g.translate = Some((x, y));
    header(d, &mut g);
    g.push(poles_group(d));
    g.push(slots_group(d));
    g.push(coils_group(d));
    g.push(slot_numbers_group(d));
    g.push(commutator_group(d));
    // Equalizers (drawn before the brushes so the brushes sit on top of the taps).
    if let Some(eg) = equalizers_group(d) {
        g.push(eg);
    }
    g.push(brushes_group(d));
    band_names(d, &mut g);
    g
}

/// The header's first text: the way the armature surface moves. Slots are numbered
/// clockwise seen from the commutator end and rise to the right here (the surface seen from
/// outside, commutator at the bottom), so a clockwise rotor carries the surface towards
/// rising slot numbers.
fn header_head(d: &Diagram) -> String {
    let (arrow, words) = match d.rotation {
        Rotation::Clockwise => ("\u{2192}", "clockwise"),
        Rotation::CounterClockwise => ("\u{2190}", "counter-clockwise"),
    };
    format!("armature surface moves {arrow}  (rotation {words}, seen from the commutator end)")
}

/// The header's second text: what is shown, whether the pattern repeats, which coils are
/// drawn.
fn header_note(d: &Diagram) -> String {
    let v = &d.view;
    let last_of = |first: u32, n: u32| (first - 1 + n - 1) % v.total_slots + 1;
    let mut note = if v.whole {
        "whole armature shown".to_string()
    } else {
        let last = last_of(v.first_slot, v.slots);
        let pairs = v.pole_pairs.unwrap_or(1);
        match v.pole_pairs {
            Some(_) if v.part.is_some() => format!(
                "window of {} pole pair{} \u{b7} slots {}\u{2013}{} of {} shown",
                pairs,
                if pairs == 1 { "" } else { "s" },
                v.first_slot,
                last,
                v.total_slots
            ),
            Some(_) => format!(
                "window: slots {}\u{2013}{} of {} ({} pole pair{})",
                v.first_slot,
                last,
                v.total_slots,
                pairs,
                if pairs == 1 { "" } else { "s" }
            ),
            None if v.slots >= v.total_slots && v.first_slot > 1 => format!(
                "all {} slots shown, from slot {}",
                v.total_slots, v.first_slot
            ),
            None if v.slots >= v.total_slots => format!("all {} slots shown", v.total_slots),
            None => format!(
                "slots {}\u{2013}{} of {} shown",
                v.first_slot, last, v.total_slots
            ),
        }
    };
    match v.repeat_slots {
        Some(r) => note.push_str(&format!(" \u{b7} pattern repeats every {r} slots")),
        None if !v.whole => {
            note.push_str(" \u{b7} pattern does not repeat exactly: see the connection table")
        }
        None => {}
    }
    if let Some(p) = &d.part {
        let element = p
            .element
            .map(|e| format!(" of the {e} element"))
            .unwrap_or_default();
        let last = p.last_slot(v.total_slots);
        let slots = if p.slots == 1 {
            format!("slot {}", p.first_slot)
        } else {
            format!("slots {}\u{2013}{last}", p.first_slot)
        };
        let how = if p.side_by_side {
            "and the lines of others that pass; a line that meets a match line goes on at the same height on the sheet named there"
        } else {
            "cut at the edges with where each line goes"
        };
        note.push_str(&format!(
            " \u{b7} drawn here: the coils{element} whose top sides lie in {slots}, {how}"
        ));
        return note;
    }
    match d.drawn {
        super::Drawn::Every => {}
        super::Drawn::Wholly => note.push_str(" \u{b7} coils lying wholly in view are drawn"),
        super::Drawn::TopsThrough(last) if last == v.first_slot => {
            note.push_str(&format!(" \u{b7} the coils of slot {last} are drawn"))
        }
        super::Drawn::TopsThrough(last) => note.push_str(&format!(
            " \u{b7} the coils of slots {}\u{2013}{last} are drawn",
            v.first_slot
        )),
    }
    note
}

/// The header's texts as they are set: the rotation and the note on one line, at the size
/// returned, when both fit at the floor; else the rotation, then the note wrapped at the
/// floor over as many lines as it needs (never cut).
fn header_fit(d: &Diagram) -> (String, String, Option<f64>, Vec<String>) {
    let (x0, x1) = d.strip;
    let head = header_head(d);
    let note = header_note(d);
    let hs = header_size(&head, &note, x1 - x0, 2.8);
    if hs >= TEXT_FLOOR {
        (head, note, Some(hs), Vec::new())
    } else {
        let lines = crate::layout::font::wrap_text(&note, TEXT_FLOOR, Weight::Bold, x1 - x0);
        (head, note, None, lines)
    }
}

/// The lines the header of `d` takes: its texts, and on a part of a continued diagram the
/// row naming the sheets beyond its match lines.
pub(super) fn header_line_count(d: &Diagram) -> usize {
    let (_, _, one, wrapped) = header_fit(d);
    let texts = if one.is_some() { 1 } else { 1 + wrapped.len() };
    texts + usize::from(d.part.is_some())
}

/// Header: rotation and what is shown (see [`header_fit`]), then on a part its match row.
fn header(d: &Diagram, g: &mut Group) {
    let (x0, x1) = d.strip;
    let b = &d.bands;
    let (head, note, one, wrapped) = header_fit(d);
    match one {
        Some(hs) => {
            g.push(Text::new(x0, b.header[0], hs, "", head));
            g.push(Text::new(x1, b.header[0], hs, "end b", note));
        }
        None => {
            g.push(Text::new(x0, b.header[0], TEXT_FLOOR, "", head));
            for (line, &y) in wrapped.into_iter().zip(&b.header[1..]) {
                g.push(Text::new(x0, y, TEXT_FLOOR, "b", line));
            }
        }
    }
    if let Some(p) = &d.part {
        match_lines(d, p, g);
    }
}

/// A part's match lines: the strip's left edge, where the part before takes over, and the
/// line after its last slot, where the next part does; each named, on the header's last
/// line, with the sheet that carries on (part k is on sheet k).
fn match_lines(d: &Diagram, p: &super::Part, g: &mut Group) {
    let (x0, x1) = d.strip;
    let b = &d.bands;
    let y = *b.header.last().expect("the header has lines");
    let s = d.view.total_slots;
    let bottom = b.brush.1;
    let mut left_end = x0;
    if let Some(before) = p.before {
        let prev = (p.first_slot + s - 2) % s + 1;
        let text = format!("\u{2190} slot {prev} and before: sheet {before}");
        left_end = x0 + text_width(&text, TEXT_FLOOR, Weight::Bold);
        g.push(Text::new(x0, y, TEXT_FLOOR, "b", text));
        g.push(Line::new("match", (x0, y + 1.0), (x0, bottom)));
    }
    if let Some(after) = p.after {
        let next = (p.first_slot - 1 + p.slots) % s + 1;
        let text = format!("slot {next} on: sheet {after} \u{2192}");
        let w = text_width(&text, TEXT_FLOOR, Weight::Bold);
        let mx = p.match_x;
        g.push(Line::new("match", (mx, y + 1.0), (mx, bottom)));
        // Beside its line, unless that would run past the strip or into the left text.
        let start = (mx + 0.8).min(x1 - w).max(left_end + 2.0);
        g.push(Text::new(start, y, TEXT_FLOOR, "b", text));
    }
}

/// Poles: shoes in their own row and a light shade over the slots.
fn poles_group(d: &Diagram) -> Group {
    let b = &d.bands;
    let mut poles = Group::id("poles");
    for p in &d.poles {
        let (cls, shade) = if p.north {
            ("pole-n", "shade-n")
        } else {
            ("pole-s", "shade-s")
        };
        let mut pg = Group::id(format!("pole-{}", p.index)).with_data("data-pole", p.index);
        for &(a, bb) in &p.pieces {
            pg.push(rect(cls, a, b.pole.0, bb - a, b.pole.1 - b.pole.0));
            if !p.north {
                // South shoes are hatched too, so that a greyscale print tells them from
                // the north ones by more than the letter.
                for l in hatch(a, bb, b.pole.0, b.pole.1, 1.6) {
                    pg.push(l);
                }
            }
            pg.push(rect("pole-edge", a, b.pole.0, bb - a, b.pole.1 - b.pole.0));
            pg.push(rect(shade, a, b.core.0, bb - a, b.core.1 - b.core.0));
        }
        if let Some(ax) = p.axis_x {
            let label = format!("{}{}", if p.north { "N" } else { "S" }, p.index);
            pg.push(Text::new(ax, b.pole.1 - 1.4, 3.2, "mid b halo", label));
        }
        poles.push(pg);
    }
    poles
}

/// Slots: the core and a box for each slot.
fn slots_group(d: &Diagram) -> Group {
    let (x0, x1) = d.strip;
    let b = &d.bands;
    let mut slots = Group::id("slots");
    slots.push(rect("core", x0, b.core.0, x1 - x0, b.core.1 - b.core.0));
    for &(_, sx) in &d.slots {
        slots.push(rect(
            "slot",
            sx - d.slot_pitch * 0.4,
            b.core.0,
            d.slot_pitch * 0.8,
            b.core.1 - b.core.0,
        ));
    }
    slots
}

/// Coils, one group each.
fn coils_group(d: &Diagram) -> Group {
    let mut coils = Group::id("coils");
    for c in &d.coils {
        coils.push(coil_group(d, c));
    }
    coils
}

/// One coil: its back connection, its leads, its sides with their current arrows, its tag
/// and its edge cuts.
fn coil_group(d: &Diagram, c: &CoilDrawing) -> Group {
    let k = colour_class(c.path);
    let cls = if c.dummy {
        "coil dead".to_string()
    } else {
        format!("coil k{k} d{}", dash_class(c.path))
    };
    let mut cg = Group::id(format!("coil-{}", c.coil))
        .with_class(cls)
        .with_data("data-coil", c.coil);
    if let (Some(s), Some(e)) = (c.start_segment, c.end_segment) {
        cg = cg
            .with_data("data-start-seg", s)
            .with_data("data-end-seg", e);
    }
    cg = cg.with_data("data-path", c.path);
    if let Some(e) = c.element {
        cg = cg.with_data("data-element", e);
    }
    if c.dummy {
        cg = cg.with_data("data-dummy", "true");
    }
    for piece in &c.back {
        let mut p = Path::polyline("conn", piece);
        p.data.push(("data-part", "back".into()));
        cg.push(p);
    }
    coil_leads(c, &mut cg);
    coil_sides(d, c, k, &mut cg);
    coil_tag(d, c, k, &mut cg);
    coil_cuts(c, &mut cg);
    cg
}

/// A coil's start and end leads; a dummy's are stubs, a cross at each cut end.
fn coil_leads(c: &CoilDrawing, cg: &mut Group) {
    for (pieces, part) in [(&c.start_lead, "start"), (&c.end_lead, "end")] {
        for piece in pieces {
            let cls = if c.dummy { "stub" } else { "conn" };
            let mut p = Path::polyline(cls, piece);
            p.data.push(("data-part", part.into()));
            cg.push(p);
            if c.dummy
                && let Some(&(px, py)) = piece.last()
            {
                // The cut end of a dummy's lead: a cross.
                let r = 0.8;
                let mut mark = Path::polyline("mark", &[]);
                mark.ops = vec![
                    PathOp::Move(px - r, py - r),
                    PathOp::Line(px + r, py + r),
                    PathOp::Move(px - r, py + r),
                    PathOp::Line(px + r, py - r),
                ];
                cg.push(mark);
            }
        }
    }
}

/// A coil's sides in the slots, each with an arrow for the sense of its current.
fn coil_sides(d: &Diagram, c: &CoilDrawing, k: usize, cg: &mut Group) {
    let b = &d.bands;
    let arrow_h = (d.slot_pitch * 0.16).clamp(0.6, 1.4);
    let ymid = (b.core.0 + b.core.1) / 2.0 + 1.0;
    for (side, cls, sense) in [(&c.top, "side-top", 1i8), (&c.bottom, "side-bot", -1i8)] {
        let Some(s) = side else { continue };
        let mut line = Line::new(cls, (s.x, b.core.0), (s.x, b.core.1));
        line.data.push(("data-slot", s.slot.to_string()));
        line.data.push(("data-pos", s.position.to_string()));
        cg.push(line);
        // Current: +1 runs up the top side (away from the commutator) and down the bottom.
        let dir = i32::from(c.current) * i32::from(sense);
        if dir != 0 && !c.dummy {
            let (hx, hy) = (arrow_h * 0.75, arrow_h * f64::from(dir));
            cg.push(Path::triangle(
                Some(&format!("arrow-head f{k}")),
                [
                    (s.x, ymid - hy),
                    (s.x - hx, ymid + hy),
                    (s.x + hx, ymid + hy),
                ],
            ));
        }
    }
}

/// A coil's tag, unless it would reach the strip's edge: there it gives way to the edge
/// labels.
fn coil_tag(d: &Diagram, c: &CoilDrawing, k: usize, cg: &mut Group) {
    let (x0, x1) = d.strip;
    let ls = d.label_size;
    if let Some((tx, ty)) = c.tag {
        let text = super::tag_text(c);
        let cls = if c.dummy || c.path == 0 {
            "mid halo b".to_string()
        } else {
            format!("mid halo b f{k}")
        };
        let half = text_width(&text, ls, Weight::Bold) / 2.0 + 0.4;
        if tx - half >= x0 && tx + half <= x1 {
            cg.push(Text::new(tx, ty, ls, &cls, text));
        }
    }
}

/// A coil's cuts at the strip's edges: dot at the edge, a leader out into the gutter, the
/// label at the leader's end.
fn coil_cuts(c: &CoilDrawing, cg: &mut Group) {
    for cut in &c.cuts {
        let side = if cut.right { 1.0 } else { -1.0 };
        let (ex, ey) = cut.at;
        let mid = cut.label_y - 0.9;
        let leader = [
            (ex, ey),
            (ex + side * 0.9, ey),
            (ex + side * (super::LEADER - 0.9), mid),
            (ex + side * (super::LEADER - 0.3), mid),
        ];
        cg.push(Path::polyline("leader", &leader));
        cg.push(Circle::new("cutdot", ex, ey, CUT_DOT_R));
        if cut.label.is_empty() {
            continue;
        }
        let cls = if cut.right {
            "cut-label"
        } else {
            "cut-label end"
        };
        cg.push(Text::new(
            ex + side * super::LEADER,
            cut.label_y,
            TEXT_FLOOR,
            cls,
            cut.label.clone(),
        ));
    }
}

/// Slot numbers, on top of the coil sides, at the floor. Where the pitch is narrower than
/// the widest number, every k-th slot is numbered (slot 1 of the view always).
fn slot_numbers_group(d: &Diagram) -> Group {
    let b = &d.bands;
    let slot_font = TEXT_FLOOR;
    let widest = d
        .slots
        .iter()
        .map(|&(s, _)| text_width(&s.to_string(), slot_font, Weight::Bold))
        .fold(0.0, f64::max);
    let slot_step = ((widest + 0.8) / d.slot_pitch).ceil().max(1.0) as usize;
    let mut numbers = Group::id("slot-numbers");
    for &(slot, sx) in d.slots.iter().step_by(slot_step) {
        numbers.push(
            Text::new(sx, b.slot_labels, slot_font, "mid halo b", slot.to_string())
                .with_data("data-slot", slot),
        );
    }
    numbers
}

/// Commutator: a box and a number for each segment.
fn commutator_group(d: &Diagram) -> Group {
    let mut comm = Group::id("commutator");
    let (ct, cb) = d.bands.commutator;
    let seg_font = TEXT_FLOOR;
    for s in &d.segments {
        let mut sg = Group::id(format!("seg-{}", s.segment))
            .with_class("seg")
            .with_data("data-seg", s.segment);
        for &(a, bb) in &s.pieces {
            sg.push(rect("segbox", a, ct, bb - a, cb - ct));
        }
        let label = s.segment.to_string();
        // A bar cut by the strip's edge to less than its number's room keeps its box only:
        // its number would stand out over the edge.
        let shown: f64 = s.pieces.iter().map(|p| p.1 - p.0).fold(0.0, f64::max);
        let room = if d.turn_segment_labels {
            seg_font * 0.73
        } else {
            text_width(&label, seg_font, Weight::Regular)
        };
        if shown + 1e-9 < room {
            comm.push(sg);
            continue;
        }
        if d.turn_segment_labels {
            let (lx, ly) = (s.label_x + seg_font * 0.365, cb - 0.6);
            sg.push(Text::new(lx, ly, seg_font, "", label).rotated(-90.0));
        } else {
            sg.push(Text::new(
                s.label_x,
                (ct + cb) / 2.0 + seg_font * 0.36,
                seg_font,
                "mid",
                label,
            ));
        }
        comm.push(sg);
    }
    comm
}

/// Equalizers: rings drawn across the strip, or taps only with their numbers; none when
/// the winding has none.
fn equalizers_group(d: &Diagram) -> Option<Group> {
    let (x0, x1) = d.strip;
    let b = &d.bands;
    let cb = b.commutator.1;
    match &d.equalizers {
        EqualizerBand::None => None,
        EqualizerBand::Rings(rings) => {
            let mut eg = Group::id("equalizers");
            for e in rings {
                let mut rg = Group::id(format!("eq-{}", e.index))
                    .with_class("eq")
                    .with_data("data-eq", e.index)
                    .with_data("data-segs", join(&e.segments));
                rg.push(Line::new("eqline", (x0, e.y), (x1, e.y)));
                for &(_, tx) in &e.taps {
                    rg.push(Line::new("eqtap", (tx, cb), (tx, e.y)));
                    rg.push(Circle::new("eqdot", tx, e.y, 0.45));
                }
                rg.push(Text::new(
                    x0 - 0.8,
                    e.y + 0.9,
                    TEXT_FLOOR,
                    "end",
                    format!("E{}", e.index),
                ));
                eg.push(rg);
            }
            Some(eg)
        }
        EqualizerBand::Taps(taps) => {
            let mut eg = Group::id("equalizers");
            let y = b.equalizer_rows.first().copied().unwrap_or(cb + 6.0);
            eg.push(Text::new(x0 - 0.8, y + 0.9, TEXT_FLOOR, "end", "E"));
            for e in taps.iter().filter(|e| !e.taps.is_empty()) {
                let mut rg = Group::id(format!("eq-{}", e.index))
                    .with_class("eq")
                    .with_data("data-eq", e.index)
                    .with_data("data-segs", join(&e.segments));
                for &(_, tx) in &e.taps {
                    rg.push(Line::new("eqtap", (tx, cb), (tx, y)));
                    rg.push(Circle::new("eqdot", tx, y, 0.4));
                    let (lx, ly) = (tx + 0.9, y + 1.0);
                    rg.push(
                        Text::new(lx, ly, TEXT_FLOOR, "", format!("E{}", e.index)).rotated(90.0),
                    );
                }
                eg.push(rg);
            }
            Some(eg)
        }
    }
}

/// Brushes: a box for each piece of a brush set, its sign, and its name.
fn brushes_group(d: &Diagram) -> Group {
    let mut brushes = Group::id("brushes");
    let (bt, bb) = d.bands.brush;
    for br in &d.brushes {
        let (cls, sign) = match br.polarity {
            Polarity::Positive => ("brushbox brush-pos", "+"),
            Polarity::Negative => ("brushbox brush-neg", "\u{2212}"),
        };
        let mut bg = Group::id(format!("brush-{}", br.index))
            .with_class("brush")
            .with_data("data-brush", br.index)
            .with_data("data-polarity", br.polarity.sign())
            .with_data("data-segs", join(&br.under));
        for &(a, z) in &br.pieces {
            bg.push(rect(cls, a, bt, z - a, bb - bt));
        }
        let fill = if br.polarity == Polarity::Positive {
            "mid b wt"
        } else {
            "mid b"
        };
        let wide = br.pieces.iter().map(|p| p.1 - p.0).fold(0.0, f64::max) > 4.2;
        let label = if wide {
            format!("B{}{sign}", br.index)
        } else {
            sign.to_string()
        };
        bg.push(Text::new(br.label_x, bb - 1.3, 2.6, fill, label));
        if !wide {
            bg.push(Text::new(
                br.label_x,
                bb + 2.9,
                TEXT_FLOOR,
                "mid",
                format!("B{}", br.index),
            ));
        }
        brushes.push(bg);
    }
    brushes
}

/// Band names in the left gutter.
fn band_names(d: &Diagram, g: &mut Group) {
    let b = &d.bands;
    for (yy, name) in [
        ((b.back_apex + b.core.0) / 2.0, "back"),
        ((b.core.1 + b.commutator.0) / 2.0, "front"),
    ] {
        let mut t = Text::new(2.8, yy, TEXT_FLOOR, "mid", name).rotated(-90.0);
        t.fill = Some("#666");
        g.push(t);
    }
}
