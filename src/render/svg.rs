//! SVG of the developed winding diagram, from the geometry `layout::developed` resolved.
//!
//! Part of the `render` stage. The renderer decides only looks: colours, line patterns, type.
//! Paths are told apart three ways so that a greyscale print still separates them: a
//! colour-blind-safe colour (the Okabe–Ito palette [src: Okabe & Ito, *Color Universal
//! Design*, 2002/2008]), a dash pattern on the end connections, and the path number written
//! at every coil's back end. Ids and data attributes come from the domain: `coil-12`
//! (`data-coil`, `data-start-seg`, `data-end-seg`), `seg-7` (`data-seg`), `brush-1`, `eq-3`.

use crate::design::{Design, Rotation};
use crate::layout::developed::{Diagram, DiagramOptions, EqualizerBand, Window, layout_developed};
use crate::winding::{Polarity, Winding};

use super::svg_writer::{SvgWriter, Val, num, polyline_d};

/// Path colours (Okabe–Ito, without yellow and black, which print poorly or clash with the
/// drawing's black); path k takes `PATH_COLOURS[(k − 1) % 6]`.
pub const PATH_COLOURS: [&str; 6] = [
    "#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9",
];

/// Dash patterns of the end connections, mm; path k takes `PATH_DASHES[(k − 1) % 4]`.
pub const PATH_DASHES: [&str; 4] = ["none", "2.4 0.9", "0.7 0.7", "2.4 0.7 0.7 0.7"];

/// Grey of coils under commutation (shorted by a brush at the drawn instant).
pub const SHORTED_GREY: &str = "#505050";
/// Grey of dummy coils.
pub const DUMMY_GREY: &str = "#9a9a9a";

/// The shared style sheet (diagram and sheets).
pub fn style_sheet() -> String {
    let mut css = String::from(
        "text{font-family:'DejaVu Sans',Verdana,sans-serif;fill:#111;stroke:none}\
.halo{paint-order:stroke;stroke:#fff;stroke-width:0.55;stroke-linejoin:round}\
.side-top,.side-bot,.conn,.stub{fill:none;stroke-linecap:round;stroke-linejoin:round}\
.side-top{stroke-width:0.5}.side-bot{stroke-width:0.5;stroke-dasharray:1.1 0.7}\
.conn{stroke-width:0.3}.stub{stroke-width:0.3}\
.k0{stroke:#505050}.dead{stroke:#9a9a9a}.dead .conn,.dead .stub{stroke-dasharray:0.4 0.6}\
.pole-n{fill:#f2dcd3}.pole-s{fill:#d8e4ef}.shade-n{fill:#f9efeb}.shade-s{fill:#edf3f8}\
.pole-edge{fill:none;stroke:#555;stroke-width:0.2}\
.core{fill:none;stroke:#777;stroke-width:0.2}.slot{fill:none;stroke:#c4c4c4;stroke-width:0.15}\
.segbox{fill:#f4efe2;stroke:#3a3a3a;stroke-width:0.2}\
.brushbox{stroke:#111;stroke-width:0.3}.brush-pos{fill:#111}.brush-neg{fill:#fff}\
.eqline{fill:none;stroke:#6b4b2a;stroke-width:0.35}.eqtap{fill:none;stroke:#6b4b2a;stroke-width:0.2}.eqdot{fill:#6b4b2a}\
.cutdot{fill:#111;stroke:none}.arrow-head{stroke:none}.mark{fill:none;stroke:#111;stroke-width:0.3}\
.frame{fill:none;stroke:#111;stroke-width:0.5}.rule{fill:none;stroke:#111;stroke-width:0.25}\
.thin{fill:none;stroke:#999;stroke-width:0.15}\
.band{fill:#111}.band-text{fill:#fff;font-weight:bold}\
.caution{fill:#fff8e6;stroke:#111;stroke-width:0.35}\
.wt{fill:#fff}.cut-label{fill:#222}.b{font-weight:bold}.end{text-anchor:end}.mid{text-anchor:middle}\
",
    );
    for (i, c) in PATH_COLOURS.iter().enumerate() {
        css.push_str(&format!(".k{n}{{stroke:{c}}}.f{n}{{fill:{c}}}", n = i + 1));
    }
    for (i, d) in PATH_DASHES.iter().enumerate() {
        css.push_str(&format!(".d{} .conn{{stroke-dasharray:{d}}}", i + 1));
    }
    css
}

/// The colour class number (1…6) of path `path` (1-based); 0 for no path.
pub fn colour_class(path: u32) -> usize {
    if path == 0 {
        0
    } else {
        (path as usize - 1) % PATH_COLOURS.len() + 1
    }
}

/// The dash class number (1…4) of path `path` (1-based).
pub fn dash_class(path: u32) -> usize {
    if path == 0 {
        1
    } else {
        (path as usize - 1) % PATH_DASHES.len() + 1
    }
}

/// `armsheet draw`: the developed diagram alone, with no page frame, sized for a screen.
pub fn render_draw(design: &Design, winding: &Winding, window: Window) -> String {
    let shown = crate::layout::developed::resolve_view(design, winding, window);
    let per_slot = if shown.slots > 0 {
        f64::from(winding.active_coils) / f64::from(design.slots)
    } else {
        1.0
    };
    // About 4 mm a segment, never narrower than a landscape page.
    let width = (f64::from(shown.slots) * per_slot * 4.0 + 22.0).clamp(280.0, 1200.0);
    let height = 150.0_f64.max(width * 0.42).min(240.0);
    let diagram = layout_developed(
        design,
        winding,
        &DiagramOptions {
            width,
            height: height - 8.0,
            window,
        },
    );
    let mut w = SvgWriter::new();
    w.raw("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    w.open(
        "svg",
        &[
            ("xmlns", "http://www.w3.org/2000/svg".into()),
            ("width", format!("{}px", num(width * 4.0)).into()),
            ("height", format!("{}px", num(height * 4.0)).into()),
            (
                "viewBox",
                format!("0 0 {} {}", num(width), num(height)).into(),
            ),
        ],
    );
    w.text_elem("style", &[], &style_sheet());
    w.empty(
        "rect",
        &[
            ("x", 0.0.into()),
            ("y", 0.0.into()),
            ("width", width.into()),
            ("height", height.into()),
            ("fill", "#fff".into()),
        ],
    );
    let title = [design.job.id.as_deref(), design.job.title.as_deref()]
        .into_iter()
        .flatten()
        .collect::<Vec<_>>()
        .join(" · ");
    let title = if title.is_empty() {
        design.file_name.clone()
    } else {
        title
    };
    w.text_elem(
        "text",
        &[
            ("x", 11.0.into()),
            ("y", 5.5.into()),
            ("class", "b".into()),
            ("font-size", 3.2.into()),
        ],
        &title,
    );
    write_diagram(&mut w, &diagram, 0.0, 8.0);
    w.close("svg");
    w.finish()
}

/// Writes `diagram` as a `<g id="diagram">` with its top-left at (`x`, `y`).
pub fn write_diagram(w: &mut SvgWriter, d: &Diagram, x: f64, y: f64) {
    w.open(
        "g",
        &[
            ("id", "diagram".into()),
            (
                "transform",
                format!("translate({} {})", num(x), num(y)).into(),
            ),
        ],
    );
    let (x0, x1) = d.strip;
    let b = &d.bands;
    let ls = d.label_size;

    // Header: rotation and what is shown. Slots are numbered clockwise seen from the
    // commutator end and rise to the right here (the surface seen from outside, commutator
    // at the bottom), so a clockwise rotor carries the surface towards rising slot numbers.
    let (arrow, words) = match d.rotation {
        Rotation::Clockwise => ("\u{2192}", "clockwise"),
        Rotation::CounterClockwise => ("\u{2190}", "counter-clockwise"),
    };
    let head =
        format!("armature surface moves {arrow}  (rotation {words}, seen from the commutator end)");
    let v = &d.view;
    let mut note = if v.whole {
        "whole armature shown".to_string()
    } else {
        let last = (v.first_slot - 1 + v.slots - 1) % v.total_slots + 1;
        let pairs = v.pole_pairs.unwrap_or(1);
        format!(
            "window: slots {}\u{2013}{} of {} ({} pole pair{})",
            v.first_slot,
            last,
            v.total_slots,
            pairs,
            if pairs == 1 { "" } else { "s" }
        )
    };
    match v.repeat_slots {
        Some(r) => note.push_str(&format!(" \u{b7} pattern repeats every {r} slots")),
        None if !v.whole => {
            note.push_str(" \u{b7} pattern does not repeat exactly: see the connection table")
        }
        None => {}
    }
    if !v.whole {
        note.push_str(" \u{b7} coils whose top side is in view are drawn");
    }
    let chars = (head.chars().count() + note.chars().count() + 4) as f64;
    let hs = (2.6_f64).min((x1 - x0) / (chars * 0.6));
    w.text_elem(
        "text",
        &[
            ("x", x0.into()),
            ("y", b.header.into()),
            ("font-size", hs.into()),
        ],
        &head,
    );
    w.text_elem(
        "text",
        &[
            ("x", x1.into()),
            ("y", b.header.into()),
            ("font-size", hs.into()),
            ("class", "end b".into()),
        ],
        &note,
    );

    // Poles: shoes in their own row and a light shade over the slots.
    w.open("g", &[("id", "poles".into())]);
    for p in &d.poles {
        let (cls, shade) = if p.north {
            ("pole-n", "shade-n")
        } else {
            ("pole-s", "shade-s")
        };
        w.open(
            "g",
            &[
                ("id", format!("pole-{}", p.index).into()),
                ("data-pole", p.index.into()),
            ],
        );
        for &(a, bb) in &p.pieces {
            rect(w, a, b.pole.0, bb - a, b.pole.1 - b.pole.0, cls);
            rect(w, a, b.pole.0, bb - a, b.pole.1 - b.pole.0, "pole-edge");
            rect(w, a, b.core.0, bb - a, b.core.1 - b.core.0, shade);
        }
        if let Some(ax) = p.axis_x {
            let label = format!("{}{}", if p.north { "N" } else { "S" }, p.index);
            w.text_elem(
                "text",
                &[
                    ("x", ax.into()),
                    ("y", (b.pole.1 - 1.4).into()),
                    ("font-size", 3.2.into()),
                    ("class", "mid b".into()),
                ],
                &label,
            );
        }
        w.close("g");
    }
    w.close("g");

    // Slots and their numbers.
    w.open("g", &[("id", "slots".into())]);
    rect(w, x0, b.core.0, x1 - x0, b.core.1 - b.core.0, "core");
    let slot_font = (d.slot_pitch * 0.62 / 0.6 / 2.0).clamp(1.5, 2.4);
    let slot_font = if d.slot_pitch < 3.0 * slot_font * 0.6 {
        (d.slot_pitch / (3.0 * 0.6)).max(1.3)
    } else {
        slot_font
    };
    for &(_, sx) in &d.slots {
        rect(
            w,
            sx - d.slot_pitch * 0.4,
            b.core.0,
            d.slot_pitch * 0.8,
            b.core.1 - b.core.0,
            "slot",
        );
    }
    w.close("g");

    // Coils.
    w.open("g", &[("id", "coils".into())]);
    let arrow_h = (d.slot_pitch * 0.16).clamp(0.6, 1.4);
    let ymid = (b.core.0 + b.core.1) / 2.0 + 1.0;
    for c in &d.coils {
        let k = colour_class(c.path);
        let cls = if c.dummy {
            "coil dead".to_string()
        } else {
            format!("coil k{k} d{}", dash_class(c.path))
        };
        let mut attrs: Vec<(&str, Val<'_>)> = vec![
            ("id", format!("coil-{}", c.coil).into()),
            ("class", cls.into()),
            ("data-coil", c.coil.into()),
        ];
        if let (Some(s), Some(e)) = (c.start_segment, c.end_segment) {
            attrs.push(("data-start-seg", s.into()));
            attrs.push(("data-end-seg", e.into()));
        }
        attrs.push(("data-path", c.path.into()));
        if c.dummy {
            attrs.push(("data-dummy", "true".into()));
        }
        w.open("g", &attrs);
        for piece in &c.back {
            w.empty(
                "path",
                &[
                    ("class", "conn".into()),
                    ("data-part", "back".into()),
                    ("d", polyline_d(piece).into()),
                ],
            );
        }
        for (pieces, part) in [(&c.start_lead, "start"), (&c.end_lead, "end")] {
            for piece in pieces {
                let cls = if c.dummy { "stub" } else { "conn" };
                w.empty(
                    "path",
                    &[
                        ("class", cls.into()),
                        ("data-part", part.into()),
                        ("d", polyline_d(piece).into()),
                    ],
                );
                if c.dummy
                    && let Some(&(px, py)) = piece.last()
                {
                    let r = 0.8;
                    w.empty(
                        "path",
                        &[
                            ("class", "mark".into()),
                            (
                                "d",
                                format!(
                                    "M{} {}L{} {}M{} {}L{} {}",
                                    num(px - r),
                                    num(py - r),
                                    num(px + r),
                                    num(py + r),
                                    num(px - r),
                                    num(py + r),
                                    num(px + r),
                                    num(py - r)
                                )
                                .into(),
                            ),
                        ],
                    );
                }
            }
        }
        for (side, cls, sense) in [(&c.top, "side-top", 1i8), (&c.bottom, "side-bot", -1i8)] {
            let Some(s) = side else { continue };
            w.empty(
                "line",
                &[
                    ("class", cls.into()),
                    ("data-slot", s.slot.into()),
                    ("data-pos", s.position.into()),
                    ("x1", s.x.into()),
                    ("y1", b.core.0.into()),
                    ("x2", s.x.into()),
                    ("y2", b.core.1.into()),
                ],
            );
            // Current: +1 runs up the top side (away from the commutator) and down the bottom.
            let dir = i32::from(c.current) * i32::from(sense);
            if dir != 0 && !c.dummy {
                let (hx, hy) = (arrow_h * 0.75, arrow_h * f64::from(dir));
                let d = format!(
                    "M{} {}L{} {}L{} {}Z",
                    num(s.x),
                    num(ymid - hy),
                    num(s.x - hx),
                    num(ymid + hy),
                    num(s.x + hx),
                    num(ymid + hy)
                );
                w.empty(
                    "path",
                    &[
                        ("class", format!("arrow-head f{k}").into()),
                        ("d", d.into()),
                    ],
                );
            }
        }
        if let Some((tx, ty)) = c.tag {
            let (text, cls) = if c.dummy {
                ("dead".to_string(), "mid halo".to_string())
            } else if c.path == 0 {
                ("sc".to_string(), "mid halo".to_string())
            } else {
                (c.path.to_string(), format!("mid halo b f{k}"))
            };
            if !text.is_empty() {
                w.text_elem(
                    "text",
                    &[
                        ("x", tx.into()),
                        ("y", ty.into()),
                        ("font-size", ls.into()),
                        ("class", cls.into()),
                    ],
                    &text,
                );
            }
        }
        for cut in &c.cuts {
            w.empty(
                "circle",
                &[
                    ("class", "cutdot".into()),
                    ("cx", cut.at.0.into()),
                    ("cy", cut.at.1.into()),
                    ("r", 0.35.into()),
                ],
            );
            if cut.label.is_empty() {
                continue;
            }
            let (tx, cls) = if cut.right {
                (cut.at.0 + 0.8, "cut-label")
            } else {
                (cut.at.0 - 0.8, "cut-label end")
            };
            w.text_elem(
                "text",
                &[
                    ("x", tx.into()),
                    ("y", cut.label_y.into()),
                    ("font-size", 1.8.into()),
                    ("class", cls.into()),
                ],
                &cut.label,
            );
        }
        w.close("g");
    }
    w.close("g");

    // Slot numbers, on top of the coil sides.
    w.open("g", &[("id", "slot-numbers".into())]);
    for &(slot, sx) in &d.slots {
        w.text_elem(
            "text",
            &[
                ("x", sx.into()),
                ("y", b.slot_labels.into()),
                ("font-size", slot_font.into()),
                ("class", "mid halo b".into()),
                ("data-slot", slot.into()),
            ],
            &slot.to_string(),
        );
    }
    w.close("g");

    // Commutator.
    w.open("g", &[("id", "commutator".into())]);
    let (ct, cb) = b.commutator;
    let seg_font = if d.turn_segment_labels {
        (d.segment_pitch * 1.2).clamp(1.2, 2.2)
    } else {
        2.2_f64.min(ls + 0.3)
    };
    for s in &d.segments {
        w.open(
            "g",
            &[
                ("id", format!("seg-{}", s.segment).into()),
                ("class", "seg".into()),
                ("data-seg", s.segment.into()),
            ],
        );
        for &(a, bb) in &s.pieces {
            rect(w, a, ct, bb - a, cb - ct, "segbox");
        }
        let label = s.segment.to_string();
        if d.turn_segment_labels {
            let (lx, ly) = (s.label_x + seg_font * 0.36, cb - 0.6);
            w.text_elem(
                "text",
                &[
                    ("x", lx.into()),
                    ("y", ly.into()),
                    ("font-size", seg_font.into()),
                    (
                        "transform",
                        format!("rotate(-90 {} {})", num(lx), num(ly)).into(),
                    ),
                ],
                &label,
            );
        } else {
            w.text_elem(
                "text",
                &[
                    ("x", s.label_x.into()),
                    ("y", ((ct + cb) / 2.0 + seg_font * 0.36).into()),
                    ("font-size", seg_font.into()),
                    ("class", "mid".into()),
                ],
                &label,
            );
        }
        w.close("g");
    }
    w.close("g");

    // Equalizers (drawn before the brushes so the brushes sit on top of the taps).
    match &d.equalizers {
        EqualizerBand::None => {}
        EqualizerBand::Rings(rings) => {
            w.open("g", &[("id", "equalizers".into())]);
            for e in rings {
                w.open(
                    "g",
                    &[
                        ("id", format!("eq-{}", e.index).into()),
                        ("class", "eq".into()),
                        ("data-eq", e.index.into()),
                        ("data-segs", join(&e.segments).into()),
                    ],
                );
                w.empty(
                    "line",
                    &[
                        ("class", "eqline".into()),
                        ("x1", x0.into()),
                        ("y1", e.y.into()),
                        ("x2", x1.into()),
                        ("y2", e.y.into()),
                    ],
                );
                for &(_, tx) in &e.taps {
                    w.empty(
                        "line",
                        &[
                            ("class", "eqtap".into()),
                            ("x1", tx.into()),
                            ("y1", cb.into()),
                            ("x2", tx.into()),
                            ("y2", e.y.into()),
                        ],
                    );
                    w.empty(
                        "circle",
                        &[
                            ("class", "eqdot".into()),
                            ("cx", tx.into()),
                            ("cy", e.y.into()),
                            ("r", 0.45.into()),
                        ],
                    );
                }
                w.text_elem(
                    "text",
                    &[
                        ("x", (x0 - 0.8).into()),
                        ("y", (e.y + 0.6).into()),
                        ("font-size", 1.8.into()),
                        ("class", "end".into()),
                    ],
                    &format!("E{}", e.index),
                );
                w.close("g");
            }
            w.close("g");
        }
        EqualizerBand::Taps(taps) => {
            w.open("g", &[("id", "equalizers".into())]);
            let y = b.equalizer_rows.first().copied().unwrap_or(cb + 6.0);
            w.text_elem(
                "text",
                &[
                    ("x", (x0 - 0.8).into()),
                    ("y", (y + 0.6).into()),
                    ("font-size", 1.8.into()),
                    ("class", "end".into()),
                ],
                "E",
            );
            for e in taps.iter().filter(|e| !e.taps.is_empty()) {
                w.open(
                    "g",
                    &[
                        ("id", format!("eq-{}", e.index).into()),
                        ("class", "eq".into()),
                        ("data-eq", e.index.into()),
                        ("data-segs", join(&e.segments).into()),
                    ],
                );
                for &(_, tx) in &e.taps {
                    w.empty(
                        "line",
                        &[
                            ("class", "eqtap".into()),
                            ("x1", tx.into()),
                            ("y1", cb.into()),
                            ("x2", tx.into()),
                            ("y2", y.into()),
                        ],
                    );
                    w.empty(
                        "circle",
                        &[
                            ("class", "eqdot".into()),
                            ("cx", tx.into()),
                            ("cy", y.into()),
                            ("r", 0.4.into()),
                        ],
                    );
                    let (lx, ly) = (tx + 0.6, y + 1.0);
                    w.text_elem(
                        "text",
                        &[
                            ("x", lx.into()),
                            ("y", ly.into()),
                            ("font-size", 1.7.into()),
                            (
                                "transform",
                                format!("rotate(90 {} {})", num(lx), num(ly)).into(),
                            ),
                        ],
                        &format!("E{}", e.index),
                    );
                }
                w.close("g");
            }
            w.close("g");
        }
    }

    // Brushes.
    w.open("g", &[("id", "brushes".into())]);
    let (bt, bb) = b.brush;
    for br in &d.brushes {
        let (cls, sign) = match br.polarity {
            Polarity::Positive => ("brushbox brush-pos", "+"),
            Polarity::Negative => ("brushbox brush-neg", "\u{2212}"),
        };
        w.open(
            "g",
            &[
                ("id", format!("brush-{}", br.index).into()),
                ("class", "brush".into()),
                ("data-brush", br.index.into()),
                ("data-polarity", br.polarity.sign().into()),
                ("data-segs", join(&br.under).into()),
            ],
        );
        for &(a, z) in &br.pieces {
            rect(w, a, bt, z - a, bb - bt, cls);
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
        w.text_elem(
            "text",
            &[
                ("x", br.label_x.into()),
                ("y", (bb - 1.3).into()),
                ("font-size", 2.6.into()),
                ("class", fill.into()),
            ],
            &label,
        );
        if !wide {
            w.text_elem(
                "text",
                &[
                    ("x", br.label_x.into()),
                    ("y", (bb + 2.6).into()),
                    ("font-size", 1.9.into()),
                    ("class", "mid".into()),
                ],
                &format!("B{}", br.index),
            );
        }
        w.close("g");
    }
    w.close("g");

    // Band names in the left gutter.
    for (yy, name) in [
        ((b.back_apex + b.core.0) / 2.0, "back"),
        ((b.core.1 + b.commutator.0) / 2.0, "front"),
    ] {
        let (lx, ly) = (x0 - 5.5, yy);
        w.text_elem(
            "text",
            &[
                ("x", lx.into()),
                ("y", ly.into()),
                ("font-size", 2.0.into()),
                ("class", "mid".into()),
                ("fill", "#666".into()),
                (
                    "transform",
                    format!("rotate(-90 {} {})", num(lx), num(ly)).into(),
                ),
            ],
            name,
        );
    }
    w.close("g");
}

fn rect(w: &mut SvgWriter, x: f64, y: f64, wd: f64, h: f64, class: &str) {
    w.empty(
        "rect",
        &[
            ("class", class.into()),
            ("x", x.into()),
            ("y", y.into()),
            ("width", wd.into()),
            ("height", h.into()),
        ],
    );
}

fn join(v: &[u32]) -> String {
    v.iter().map(u32::to_string).collect::<Vec<_>>().join(" ")
}
