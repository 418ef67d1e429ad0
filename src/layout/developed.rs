//! The developed winding diagram as plain geometry: the armature surface unrolled left to right.
//!
//! Part of the `layout` stage: [`Design`] + [`Winding`] in, [`Diagram`] out, in millimetres
//! with the origin at the top-left of the diagram box. No SVG here; `render::svg` draws it.
//!
//! ## Bands, top to bottom
//! header (rotation, window note) · pole shoes · back end connections · slots with coil sides ·
//! front end connections and leads · commutator segments · brushes · equalizer rings.
//!
//! ## Horizontal placement
//! The strip starts half a slot pitch before the centre of the first slot shown, so slot k sits
//! at ((k − first) + ½) slot pitches. Every angle comes from the engine (slot centres, segment
//! centres, brush centres, pole axes). An element that runs past an edge is cut there: in the
//! whole view its remainder re-enters at the other edge and both cuts carry the coil number;
//! in a window the cut carries the slot or segment number it leads to.

use crate::design::{Design, EqualizerChoice, Rotation};
use crate::winding::{Connection, EqualizerPlan, Polarity, Winding};

/// Above this many segments the diagram shows a window of whole pole pairs by default.
pub const LEGIBLE_SEGMENTS: u32 = 120;

/// Largest number of equalizer rings drawn as separate full-width lines; above it the band
/// shows one labelled tap per equalized segment instead.
pub const MAX_RING_ROWS: usize = 8;

/// A point in mm.
pub type Point = (f64, f64);

/// Which part of the armature to draw (`--window`).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Window {
    /// The whole armature up to [`LEGIBLE_SEGMENTS`], else the most whole pole pairs that stay
    /// within it (at least one).
    #[default]
    Auto,
    /// The whole armature, however dense.
    Whole,
    /// `pairs` whole pole pairs starting at slot `first_slot` (1-based).
    PolePairs {
        /// Pole pairs shown (≥ 1).
        pairs: u32,
        /// First slot at the left edge.
        first_slot: u32,
    },
}

/// Size and window of a diagram.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct DiagramOptions {
    /// Box width, mm.
    pub width: f64,
    /// Box height, mm.
    pub height: f64,
    /// Which part of the armature to show.
    pub window: Window,
}

/// What part of the armature is shown.
#[derive(Clone, Debug, PartialEq)]
pub struct View {
    /// True when all S slots are shown and edge cuts wrap round.
    pub whole: bool,
    /// First slot shown (1-based).
    pub first_slot: u32,
    /// Number of slots shown.
    pub slots: u32,
    /// Slots on the armature (S).
    pub total_slots: u32,
    /// Pole pairs shown, for a window.
    pub pole_pairs: Option<u32>,
    /// Slots after which the pattern repeats (S/p) when that is whole and the segments
    /// (C/p) are whole too.
    pub repeat_slots: Option<u32>,
}

/// The vertical bands, as y values in mm.
#[derive(Clone, Debug, PartialEq)]
pub struct Bands {
    /// Baseline of the header text.
    pub header: f64,
    /// Pole-shoe row top and bottom.
    pub pole: (f64, f64),
    /// Apex of the back end connections.
    pub back_apex: f64,
    /// Top and bottom of the slot (core) band.
    pub core: (f64, f64),
    /// Baseline of the slot numbers.
    pub slot_labels: f64,
    /// Where the leads turn straight down into their segment.
    pub riser: f64,
    /// Top and bottom of the commutator row.
    pub commutator: (f64, f64),
    /// Top and bottom of the brush row.
    pub brush: (f64, f64),
    /// One y per equalizer row (empty when there are none).
    pub equalizer_rows: Vec<f64>,
}

/// A line that reaches an edge of the strip.
#[derive(Clone, Debug, PartialEq)]
pub struct EdgeCut {
    /// Where the line meets the edge.
    pub at: Point,
    /// True at the right edge.
    pub right: bool,
    /// The label: the coil number in the whole view, else what lies beyond ("slot 23", "seg 45");
    /// empty when there was no room for it beside its neighbours (the dot is still drawn).
    pub label: String,
    /// Baseline of the label, moved off its neighbours where needed.
    pub label_y: f64,
}

/// A vertical coil side.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SideLine {
    /// x, mm.
    pub x: f64,
    /// Slot, 1…S.
    pub slot: u32,
    /// Position in the layer, 1…u.
    pub position: u32,
}

/// Everything drawn for one coil position.
#[derive(Clone, Debug, PartialEq)]
pub struct CoilDrawing {
    /// Coil position, 1…N.
    pub coil: u32,
    /// Wound but not connected.
    pub dummy: bool,
    /// Parallel path (1-based), 0 when shorted or dummy.
    pub path: u32,
    /// Current sense at the drawn instant: +1 up the top side, −1 down it, 0 none.
    pub current: i8,
    /// Segment of the start lead.
    pub start_segment: Option<u32>,
    /// Segment of the end lead.
    pub end_segment: Option<u32>,
    /// Top-layer side, when inside the strip.
    pub top: Option<SideLine>,
    /// Bottom-layer side, when inside the strip.
    pub bottom: Option<SideLine>,
    /// Back end connection pieces.
    pub back: Vec<Vec<Point>>,
    /// Start lead pieces (top side to start segment; a short cut stub for a dummy).
    pub start_lead: Vec<Vec<Point>>,
    /// End lead pieces (bottom side to end segment; a short cut stub for a dummy).
    pub end_lead: Vec<Vec<Point>>,
    /// Where this coil's lines meet an edge.
    pub cuts: Vec<EdgeCut>,
    /// Where the path tag goes (above the back apex), when the apex is inside.
    pub tag: Option<Point>,
}

/// A commutator segment box.
#[derive(Clone, Debug, PartialEq)]
pub struct SegmentBox {
    /// Segment number, 1…C.
    pub segment: u32,
    /// Visible pieces (x0, x1); two when it straddles the seam of the whole view.
    pub pieces: Vec<(f64, f64)>,
    /// Centre of the label.
    pub label_x: f64,
}

/// A brush set on the commutator.
#[derive(Clone, Debug, PartialEq)]
pub struct BrushBox {
    /// 1…P.
    pub index: u32,
    /// Polarity.
    pub polarity: Polarity,
    /// Visible pieces (x0, x1).
    pub pieces: Vec<(f64, f64)>,
    /// Centre of the label.
    pub label_x: f64,
    /// Segments under the brush centre.
    pub under: Vec<u32>,
}

/// A pole shoe.
#[derive(Clone, Debug, PartialEq)]
pub struct PoleBand {
    /// 1…P; odd poles are north.
    pub index: u32,
    /// North or south.
    pub north: bool,
    /// Visible pieces (x0, x1) of the pole arc.
    pub pieces: Vec<(f64, f64)>,
    /// Axis x, when inside.
    pub axis_x: Option<f64>,
}

/// One equalizer as drawn.
#[derive(Clone, Debug, PartialEq)]
pub struct EqualizerDrawing {
    /// 1-based index in the design's list of groups.
    pub index: u32,
    /// All segments it joins.
    pub segments: Vec<u32>,
    /// Row y (ring mode) or the tap end (tap mode).
    pub y: f64,
    /// Taps inside the strip: (segment, x).
    pub taps: Vec<(u32, f64)>,
}

/// How the equalizers are shown.
#[derive(Clone, Debug, PartialEq)]
pub enum EqualizerBand {
    /// No equalizers fitted.
    None,
    /// One full-width line per ring.
    Rings(Vec<EqualizerDrawing>),
    /// Too many rings for lines: a labelled tap per equalized segment in view.
    Taps(Vec<EqualizerDrawing>),
}

/// The laid-out developed diagram.
#[derive(Clone, Debug, PartialEq)]
pub struct Diagram {
    /// Box width, mm.
    pub width: f64,
    /// Box height, mm.
    pub height: f64,
    /// Left and right x of the strip (inside the label gutters).
    pub strip: (f64, f64),
    /// What is shown.
    pub view: View,
    /// Bands.
    pub bands: Bands,
    /// Slot pitch on paper, mm.
    pub slot_pitch: f64,
    /// Segment pitch on paper, mm.
    pub segment_pitch: f64,
    /// Slot centres inside the strip: (slot, x).
    pub slots: Vec<(u32, f64)>,
    /// Pole shoes.
    pub poles: Vec<PoleBand>,
    /// Coils with anything inside the strip, in coil order.
    pub coils: Vec<CoilDrawing>,
    /// Segments inside the strip, in segment order.
    pub segments: Vec<SegmentBox>,
    /// Brush sets inside the strip.
    pub brushes: Vec<BrushBox>,
    /// Equalizers.
    pub equalizers: EqualizerBand,
    /// Sense of rotation.
    pub rotation: Rotation,
    /// Whether segment numbers should be written upright (false) or turned (true) to fit.
    pub turn_segment_labels: bool,
    /// Font size for labels inside the diagram, mm.
    pub label_size: f64,
}

/// Gutter either side of the strip for edge labels, mm.
const GUTTER: f64 = 11.0;

/// Resolves the window into a [`View`].
pub fn resolve_view(design: &Design, winding: &Winding, window: Window) -> View {
    let s = design.slots;
    let p = design.pole_pairs();
    let c = winding.active_coils;
    let repeat_slots = (p > 1 && s.is_multiple_of(p) && c.is_multiple_of(p)).then_some(s / p);
    let whole = View {
        whole: true,
        first_slot: 1,
        slots: s,
        total_slots: s,
        pole_pairs: None,
        repeat_slots,
    };
    let (pairs, first) = match window {
        Window::Whole => return whole,
        Window::Auto => {
            if c <= LEGIBLE_SEGMENTS {
                return whole;
            }
            let per_pair = f64::from(c) / f64::from(p);
            (
                (f64::from(LEGIBLE_SEGMENTS) / per_pair).floor().max(1.0) as u32,
                1,
            )
        }
        Window::PolePairs { pairs, first_slot } => (pairs.max(1), first_slot.clamp(1, s)),
    };
    if pairs >= p {
        return whole;
    }
    let slots = ((f64::from(pairs) * f64::from(s) / f64::from(p)).round() as u32).clamp(1, s);
    View {
        whole: false,
        first_slot: first,
        slots,
        total_slots: s,
        pole_pairs: Some(pairs),
        repeat_slots,
    }
}

/// Lays out the developed diagram of `winding` in a box of the given size.
pub fn layout_developed(design: &Design, winding: &Winding, options: &DiagramOptions) -> Diagram {
    let view = resolve_view(design, winding, options.window);
    let s = f64::from(design.slots);
    let c = f64::from(winding.active_coils);
    let slot_deg = 360.0 / s;
    let seg_deg = 360.0 / c;
    let strip = (GUTTER, options.width - GUTTER);
    let strip_w = strip.1 - strip.0;
    let start_deg = f64::from(view.first_slot - 1) * slot_deg - slot_deg / 2.0;
    let scale = strip_w / (f64::from(view.slots) * slot_deg);
    let turn = 360.0 * scale;
    let geo = Geo {
        start_deg,
        scale,
        turn,
        strip,
        whole: view.whole,
    };

    let bands = bands(design, winding, options.height);
    let slot_pitch = slot_deg * scale;
    let segment_pitch = seg_deg * scale;
    let label_size = if segment_pitch >= 2.4 && slot_pitch >= 2.4 {
        2.2
    } else {
        1.9
    };
    let turn_segment_labels = segment_pitch < label_size * 0.62 * 2.0 + 0.6;

    let slots = (0..view.slots)
        .map(|i| {
            let slot = (view.first_slot - 1 + i) % design.slots + 1;
            (slot, strip.0 + (f64::from(i) + 0.5) * slot_pitch)
        })
        .collect();

    let half_arc = design.pole_arc * 180.0 / f64::from(design.poles);
    let poles = winding
        .pole_axes_deg
        .iter()
        .enumerate()
        .filter_map(|(k, &axis)| {
            let x = geo.x(axis);
            let pieces = geo.interval(x - half_arc * scale, x + half_arc * scale);
            (!pieces.is_empty()).then(|| PoleBand {
                index: k as u32 + 1,
                north: k % 2 == 0,
                pieces,
                axis_x: geo.inside(x).then_some(x),
            })
        })
        .collect();

    let u = design.coils_per_slot;
    let side_deg = |slot: u32, position: u32, bottom: bool| {
        let j = 2 * (position - 1) + u32::from(bottom);
        let frac = 0.7 * ((f64::from(j) + 0.5) / f64::from(2 * u) - 0.5);
        (f64::from(slot - 1) + frac) * slot_deg
    };
    let mut coils: Vec<CoilDrawing> = winding
        .connections
        .iter()
        .filter_map(|conn| {
            let top_deg = side_deg(conn.top.slot, conn.top.position, false);
            let forward = (conn.bottom.slot + design.slots - conn.top.slot) % design.slots;
            let bottom_deg =
                side_deg(conn.top.slot, conn.bottom.position, true) + f64::from(forward) * slot_deg;
            coil_drawing(conn, winding, &geo, &bands, top_deg, bottom_deg)
        })
        .collect();

    space_edge_labels(&mut coils, EDGE_LABEL_GAP);
    thin_tags(&mut coils, label_size * 1.1);
    let seg_w = segment_pitch * 0.84;
    let segments = (1..=winding.active_coils)
        .filter_map(|seg| {
            let x = geo.x(winding.segment_deg(seg));
            if !geo.whole && !geo.inside(x) {
                return None;
            }
            let pieces = geo.interval(x - seg_w / 2.0, x + seg_w / 2.0);
            Some(SegmentBox {
                segment: seg,
                label_x: label_spot(&pieces, x),
                pieces,
            })
        })
        .collect();

    let m = f64::from(design.multiplicity);
    let brushes = winding
        .brushes
        .iter()
        .filter_map(|b| {
            let deg = winding.segment1_deg + (b.centre_segment - 1.0) * seg_deg;
            let x = geo.x(deg);
            let half = (m * segment_pitch * 0.5).max(0.9);
            let pieces = geo.interval(x - half, x + half);
            (!pieces.is_empty()).then(|| BrushBox {
                index: b.index,
                polarity: b.polarity,
                label_x: label_spot(&pieces, x),
                pieces,
                under: b.under.clone(),
            })
        })
        .collect();

    let equalizers = equalizer_band(winding, &geo, &bands);

    Diagram {
        width: options.width,
        height: options.height,
        strip,
        view,
        bands,
        slot_pitch,
        segment_pitch,
        slots,
        poles,
        coils,
        segments,
        brushes,
        equalizers,
        rotation: design.rotation,
        turn_segment_labels,
        label_size,
    }
}

/// The number of equalizer rows the band needs.
fn equalizer_rows(winding: &Winding) -> usize {
    match &winding.equalizers {
        EqualizerPlan::Possible(e) if !e.groups.is_empty() => {
            if e.groups.len() <= MAX_RING_ROWS {
                e.groups.len()
            } else {
                2
            }
        }
        _ => 0,
    }
}

fn bands(design: &Design, winding: &Winding, height: f64) -> Bands {
    let _ = design;
    let rows = equalizer_rows(winding);
    let eq_pitch = 2.4;
    let eq_height = if rows == 0 {
        0.0
    } else {
        3.0 + rows as f64 * eq_pitch
    };
    let header = 4.0;
    let pole = (6.0, 11.5);
    let commutator_h = 7.0;
    let brush_h = 5.5;
    let fixed = pole.1 + 2.0 + commutator_h + brush_h + 1.0 + eq_height + 1.0;
    let free = (height - fixed).max(30.0);
    let back_h = free * 0.26;
    let core_h = free * 0.26;
    let front_h = free - back_h - core_h;
    let back_apex = pole.1 + 2.0;
    let core = (back_apex + back_h, back_apex + back_h + core_h);
    let commutator = (core.1 + front_h, core.1 + front_h + commutator_h);
    let brush = (commutator.1 + 0.6, commutator.1 + 0.6 + brush_h);
    let eq0 = brush.1 + 3.0;
    Bands {
        header,
        pole,
        back_apex,
        core,
        slot_labels: core.0 + 3.0,
        riser: commutator.0 - (front_h * 0.12).clamp(1.5, 4.0),
        commutator,
        brush,
        equalizer_rows: (0..rows).map(|i| eq0 + i as f64 * eq_pitch).collect(),
    }
}

/// Mapping from rotor angle to strip x, with cutting at the edges.
struct Geo {
    start_deg: f64,
    scale: f64,
    turn: f64,
    strip: (f64, f64),
    whole: bool,
}

impl Geo {
    /// x of `deg` in [strip.0, strip.0 + turn).
    fn x(&self, deg: f64) -> f64 {
        self.strip.0 + (deg - self.start_deg).rem_euclid(360.0) * self.scale
    }

    fn inside(&self, x: f64) -> bool {
        x >= self.strip.0 - 1e-9 && x < self.strip.1 - 1e-9
    }

    /// The visible pieces of the interval [a, b] (any copy round the turn).
    fn interval(&self, a: f64, b: f64) -> Vec<(f64, f64)> {
        let mut out = Vec::new();
        for k in -1..=1 {
            let shift = f64::from(k) * self.turn;
            let lo = (a + shift).max(self.strip.0);
            let hi = (b + shift).min(self.strip.1);
            if hi - lo > 1e-6 {
                out.push((lo, hi));
            }
        }
        out.sort_by(|p, q| p.0.total_cmp(&q.0));
        out
    }

    /// The visible pieces of a polyline (any copy round the turn), each with a flag for a cut
    /// at its start and at its end.
    fn polyline(&self, pts: &[Point]) -> Vec<(Vec<Point>, bool, bool)> {
        let mut out = Vec::new();
        // A window draws each coil once, from the copy whose top side is in view.
        let shifts = if self.whole { -1..=1 } else { 0..=0 };
        for k in shifts {
            let shift = f64::from(k) * self.turn;
            let moved: Vec<Point> = pts.iter().map(|&(x, y)| (x + shift, y)).collect();
            clip_polyline(&moved, self.strip.0, self.strip.1, &mut out);
        }
        out
    }
}

/// Appends the parts of `pts` inside x0 ≤ x ≤ x1 to `out`, flagging cut ends.
fn clip_polyline(pts: &[Point], x0: f64, x1: f64, out: &mut Vec<(Vec<Point>, bool, bool)>) {
    let inside = |p: Point| p.0 >= x0 - 1e-9 && p.0 <= x1 + 1e-9;
    let mut cur: Vec<Point> = Vec::new();
    let mut cut_start = false;
    if let Some(&p) = pts.first()
        && inside(p)
    {
        cur.push(p);
    }
    for w in pts.windows(2) {
        let (a, b) = (w[0], w[1]);
        let (ia, ib) = (inside(a), inside(b));
        // Points where the segment a→b crosses the edges, in order along it.
        let mut hits: Vec<(f64, Point)> = Vec::new();
        if (b.0 - a.0).abs() > 1e-12 {
            for edge in [x0, x1] {
                let t = (edge - a.0) / (b.0 - a.0);
                if t > 1e-9 && t < 1.0 - 1e-9 {
                    hits.push((t, (edge, a.1 + t * (b.1 - a.1))));
                }
            }
        }
        hits.sort_by(|p, q| p.0.total_cmp(&q.0));
        let mut now_inside = ia;
        for (_, h) in hits {
            if now_inside {
                cur.push(h);
                out.push((std::mem::take(&mut cur), cut_start, true));
                now_inside = false;
            } else {
                cur = vec![h];
                cut_start = true;
                now_inside = true;
            }
        }
        if ib && now_inside {
            cur.push(b);
        } else if ib && !now_inside {
            cur = vec![b];
            cut_start = true;
        }
    }
    if cur.len() >= 2 {
        out.push((cur, cut_start, false));
    }
}

/// Least distance between two edge labels' baselines, mm (labels are 1.8 mm type).
const EDGE_LABEL_GAP: f64 = 2.0;

/// Moves edge labels apart along each edge, by at most one gap; a label that still collides
/// is left out (its dot stays, and the connection table holds the coil).
fn space_edge_labels(coils: &mut [CoilDrawing], gap: f64) {
    for right in [false, true] {
        let mut refs: Vec<(f64, usize, usize)> = Vec::new();
        for (i, c) in coils.iter().enumerate() {
            for (j, cut) in c.cuts.iter().enumerate() {
                if cut.right == right {
                    refs.push((cut.label_y, i, j));
                }
            }
        }
        refs.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)).then(a.2.cmp(&b.2)));
        let mut last = f64::NEG_INFINITY;
        for (y, i, j) in refs {
            let cut = &mut coils[i].cuts[j];
            let want = y.max(last + gap);
            if want - y <= gap {
                cut.label_y = want;
                last = want;
            } else {
                cut.label.clear();
            }
        }
    }
}

/// Drops path tags that would overlap a tag already placed to their left (coils of one slot
/// share an apex); the colour and dash pattern still name the path.
fn thin_tags(coils: &mut [CoilDrawing], gap: f64) {
    let mut order: Vec<(f64, usize)> = coils
        .iter()
        .enumerate()
        .filter_map(|(i, c)| c.tag.map(|t| (t.0, i)))
        .collect();
    order.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    let mut last = f64::NEG_INFINITY;
    for (x, i) in order {
        if x - last < gap {
            coils[i].tag = None;
        } else {
            last = x;
        }
    }
}

/// Where to centre a label on a possibly split box.
fn label_spot(pieces: &[(f64, f64)], x: f64) -> f64 {
    if pieces.iter().any(|&(a, b)| x >= a && x <= b) {
        return x;
    }
    pieces
        .iter()
        .max_by(|p, q| (p.1 - p.0).total_cmp(&(q.1 - q.0)))
        .map_or(x, |&(a, b)| (a + b) / 2.0)
}

/// What the far end of a cut line is, for the window labels.
struct Ends {
    origin: String,
    destination: String,
}

fn coil_drawing(
    conn: &Connection,
    winding: &Winding,
    geo: &Geo,
    bands: &Bands,
    top_deg: f64,
    bottom_deg: f64,
) -> Option<CoilDrawing> {
    let coil = conn.coil;
    let xt = geo.x(top_deg);
    let xb = xt + (bottom_deg - top_deg) * geo.scale;
    let mut d = CoilDrawing {
        coil,
        dummy: conn.dummy,
        path: winding.coil_path[(coil - 1) as usize],
        current: winding.coil_current[(coil - 1) as usize],
        start_segment: conn.start_segment,
        end_segment: conn.end_segment,
        top: None,
        bottom: None,
        back: Vec::new(),
        start_lead: Vec::new(),
        end_lead: Vec::new(),
        cuts: Vec::new(),
        tag: None,
    };
    for x in [xt, xt - geo.turn] {
        if geo.inside(x) {
            d.top = Some(SideLine {
                x,
                slot: conn.top.slot,
                position: conn.top.position,
            });
        }
    }
    let bottoms = if geo.whole {
        vec![xb, xb - geo.turn]
    } else {
        vec![xb]
    };
    for x in bottoms {
        if geo.inside(x) {
            d.bottom = Some(SideLine {
                x,
                slot: conn.bottom.slot,
                position: conn.bottom.position,
            });
        }
    }
    let (ct, cb) = bands.core;
    let xm = (xt + xb) / 2.0;
    d.tag = [xm, xm - geo.turn, xm + geo.turn]
        .into_iter()
        .find(|&x| geo.inside(x))
        .map(|x| (x, bands.back_apex - 0.6));
    let coil_label = coil.to_string();
    let top_slot = format!("slot {}", conn.top.slot);
    let bottom_slot = format!("slot {}", conn.bottom.slot);

    let back = [(xt, ct), (xm, bands.back_apex), (xb, ct)];
    let ends = Ends {
        origin: top_slot.clone(),
        destination: bottom_slot.clone(),
    };
    d.back = add_pieces(geo, &back, &ends, &coil_label, &mut d.cuts);

    let lead = |x_side: f64, seg: Option<u32>| -> Vec<Point> {
        match seg {
            Some(s) => {
                let xs = geo.x(winding.segment_deg(s));
                let dx = (xs - x_side).rem_euclid(geo.turn);
                let dx = if dx > geo.turn / 2.0 {
                    dx - geo.turn
                } else {
                    dx
                };
                vec![
                    (x_side, cb),
                    (x_side + dx, bands.riser),
                    (x_side + dx, bands.commutator.0),
                ]
            }
            None => vec![(x_side, cb), (x_side, cb + 3.0)],
        }
    };
    let seg_name = |s: Option<u32>| s.map_or_else(|| "cut".to_string(), |s| format!("seg {s}"));
    let start = lead(xt, conn.start_segment);
    let ends = Ends {
        origin: top_slot,
        destination: seg_name(conn.start_segment),
    };
    d.start_lead = add_pieces(geo, &start, &ends, &coil_label, &mut d.cuts);
    let end = lead(xb, conn.end_segment);
    let ends = Ends {
        origin: bottom_slot,
        destination: seg_name(conn.end_segment),
    };
    d.end_lead = add_pieces(geo, &end, &ends, &coil_label, &mut d.cuts);

    // A window shows the coils whose top side lies in it, each whole or cut at an edge.
    let anything = if geo.whole {
        d.top.is_some()
            || d.bottom.is_some()
            || !d.back.is_empty()
            || !d.start_lead.is_empty()
            || !d.end_lead.is_empty()
    } else {
        d.top.is_some()
    };
    anything.then_some(d)
}

fn add_pieces(
    geo: &Geo,
    pts: &[Point],
    ends: &Ends,
    coil_label: &str,
    cuts: &mut Vec<EdgeCut>,
) -> Vec<Vec<Point>> {
    let mut out = Vec::new();
    for (piece, cut_start, cut_end) in geo.polyline(pts) {
        let label = |far: &str| {
            if geo.whole {
                coil_label.to_string()
            } else {
                far.to_string()
            }
        };
        if cut_start {
            let at = piece[0];
            cuts.push(EdgeCut {
                at,
                right: at.0 > (geo.strip.0 + geo.strip.1) / 2.0,
                label: label(&ends.origin),
                label_y: at.1 + 0.65,
            });
        }
        if cut_end {
            let at = piece[piece.len() - 1];
            cuts.push(EdgeCut {
                at,
                right: at.0 > (geo.strip.0 + geo.strip.1) / 2.0,
                label: label(&ends.destination),
                label_y: at.1 + 0.65,
            });
        }
        out.push(piece);
    }
    out
}

fn equalizer_band(winding: &Winding, geo: &Geo, bands: &Bands) -> EqualizerBand {
    let EqualizerPlan::Possible(e) = &winding.equalizers else {
        return EqualizerBand::None;
    };
    if e.groups.is_empty() {
        return EqualizerBand::None;
    }
    let rings = e.groups.len() <= MAX_RING_ROWS;
    let drawings = e
        .groups
        .iter()
        .enumerate()
        .map(|(i, g)| {
            let taps = g
                .iter()
                .filter_map(|&s| {
                    let x = geo.x(winding.segment_deg(s));
                    geo.inside(x).then_some((s, x))
                })
                .collect();
            let y = if rings {
                bands.equalizer_rows[i]
            } else {
                bands.equalizer_rows[0]
            };
            EqualizerDrawing {
                index: i as u32 + 1,
                segments: g.clone(),
                y,
                taps,
            }
        })
        .collect();
    if rings {
        EqualizerBand::Rings(drawings)
    } else {
        EqualizerBand::Taps(drawings)
    }
}

/// How many equalizers the design asked for, in words, for the diagram header.
pub fn equalizer_choice_words(choice: EqualizerChoice) -> String {
    match choice {
        EqualizerChoice::None => "none".into(),
        EqualizerChoice::Full => "all possible".into(),
        EqualizerChoice::EveryNth(k) => format!("every {k}th possible"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clipping_splits_at_both_edges() {
        let mut out = Vec::new();
        clip_polyline(&[(5.0, 0.0), (15.0, 10.0)], 0.0, 10.0, &mut out);
        assert_eq!(out.len(), 1);
        assert_eq!(out[0].0, vec![(5.0, 0.0), (10.0, 5.0)]);
        assert!(!out[0].1 && out[0].2);

        let mut out = Vec::new();
        clip_polyline(&[(-5.0, 0.0), (5.0, 0.0), (15.0, 0.0)], 0.0, 10.0, &mut out);
        assert_eq!(out.len(), 1);
        assert_eq!(out[0].0, vec![(0.0, 0.0), (5.0, 0.0), (10.0, 0.0)]);
        assert!(out[0].1 && out[0].2);

        let mut out = Vec::new();
        clip_polyline(&[(12.0, 0.0), (20.0, 0.0)], 0.0, 10.0, &mut out);
        assert!(out.is_empty());
    }
}
