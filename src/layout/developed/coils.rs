//! The coils of the developed diagram: sides, back end connections, leads and edge cuts.
//!
//! Part of the `layout` stage (the developed diagram). Every line cut at an edge carries one
//! label naming its coil and the slot or bar it goes to ([`edge_label`]); in the whole view
//! the line re-enters at the other edge and both cuts carry the same label.

use crate::winding::{Connection, Winding};

use super::Point;
use super::bands::Bands;
use super::view::Geo;

/// A line that reaches an edge of the strip.
#[derive(Clone, Debug, PartialEq)]
pub struct EdgeCut {
    /// Where the line meets the edge.
    pub at: Point,
    /// True at the right edge.
    pub right: bool,
    /// The label, [`edge_label`]: the coil and the slot or bar its line goes to ("32→s4",
    /// "32→b33"); empty when there was no room for it beside its neighbours (the dot is still
    /// drawn).
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
    /// The coil's element (`"lap"`, `"wave"`) on a winding of several elements (frog-leg);
    /// `None` on a lap or wave winding.
    pub element: Option<&'static str>,
}

/// What the far end of a line is: the slot of a back connection's bottom side, the bar of a
/// lead, nothing for a dummy's cut lead.
#[derive(Clone, Copy, Debug)]
pub enum Goes {
    /// The slot of a back connection's bottom side.
    Slot(u32),
    /// The bar of a lead.
    Bar(u32),
    /// A dummy coil's cut lead.
    Cut,
}

/// The label of a line cut at an edge: its coil, an arrow and where the line goes ("s" a
/// slot, "b" a bar); the same at both edges of the whole view.
pub fn edge_label(coil: u32, goes: Goes) -> String {
    match goes {
        Goes::Slot(s) => format!("{coil}\u{2192}s{s}"),
        Goes::Bar(b) => format!("{coil}\u{2192}b{b}"),
        Goes::Cut => format!("{coil} dead"),
    }
}

pub(super) fn coil_drawing(
    conn: &Connection,
    winding: &Winding,
    geo: &Geo,
    bands: &Bands,
    (top_deg, bottom_deg): (f64, f64),
    whole_coils: bool,
    lean: f64,
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
        element: winding.is_multi_element().then(|| conn.element.as_str()),
    };
    place_sides(&mut d, conn, geo, (xt, xb));
    place_back(&mut d, conn, winding, geo, bands, (xt, xb), lean);
    place_leads(&mut d, conn, winding, geo, bands, (xt, xb));

    // A window shows the coils lying wholly in it (both sides and both leads in view, no line
    // cut; `whole_coils`), or else those whose top side lies in it, each whole or cut at an
    // edge.
    let anything = if geo.copies {
        d.top.is_some()
            || d.bottom.is_some()
            || !d.back.is_empty()
            || !d.start_lead.is_empty()
            || !d.end_lead.is_empty()
    } else {
        d.top.is_some() && (!whole_coils || (d.bottom.is_some() && d.cuts.is_empty()))
    };
    anything.then_some(d)
}

/// The coil's top and bottom sides, where they lie inside the strip (a whole view also
/// looks one turn back for the bottom side).
fn place_sides(d: &mut CoilDrawing, conn: &Connection, geo: &Geo, (xt, xb): (f64, f64)) {
    for x in [xt, xt - geo.turn] {
        if geo.inside(x) {
            d.top = Some(SideLine {
                x,
                slot: conn.top.slot,
                position: conn.top.position,
            });
        }
    }
    let bottoms = if geo.copies {
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
}

/// The coil's back connection and the spot for its path tag.
fn place_back(
    d: &mut CoilDrawing,
    conn: &Connection,
    winding: &Winding,
    geo: &Geo,
    bands: &Bands,
    (xt, xb): (f64, f64),
    lean: f64,
) {
    let (ct, _) = bands.core;
    let coil = conn.coil;
    // The back apex, leant off the coil's centre by `lean` mm (the same for every coil).
    let xm = (xt + xb) / 2.0 + lean;
    // A frog-leg's wave coils are told from its lap coils by the back end: square-shouldered
    // and lower, where the lap coils' come to a point at the apex.
    let wave = winding.is_multi_element() && conn.element != winding.elements[0].kind;
    let apex = if wave {
        bands.back_apex + (ct - bands.back_apex) * 0.4
    } else {
        bands.back_apex
    };
    d.tag = [xm, xm - geo.turn, xm + geo.turn]
        .into_iter()
        .find(|&x| geo.inside(x))
        .map(|x| (x, apex - 0.6));
    let shoulder = (xb - xt) * 0.2;
    let back = if wave {
        vec![
            (xt, ct),
            (xt + shoulder + lean, apex),
            (xb - shoulder + lean, apex),
            (xb, ct),
        ]
    } else {
        vec![(xt, ct), (xm, apex), (xb, ct)]
    };
    d.back = add_pieces(
        geo,
        &back,
        &edge_label(coil, Goes::Slot(conn.bottom.slot)),
        &mut d.cuts,
    );
}

/// The coil's start and end leads, from its sides down to their bars (a dummy's: a short
/// cut stub).
fn place_leads(
    d: &mut CoilDrawing,
    conn: &Connection,
    winding: &Winding,
    geo: &Geo,
    bands: &Bands,
    (xt, xb): (f64, f64),
) {
    let cb = bands.core.1;
    let coil = conn.coil;
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
    let goes = |s: Option<u32>| s.map_or(Goes::Cut, Goes::Bar);
    let start = lead(xt, conn.start_segment);
    let label = edge_label(coil, goes(conn.start_segment));
    d.start_lead = add_pieces(geo, &start, &label, &mut d.cuts);
    let end = lead(xb, conn.end_segment);
    let label = edge_label(coil, goes(conn.end_segment));
    d.end_lead = add_pieces(geo, &end, &label, &mut d.cuts);
}

pub(super) fn add_pieces(
    geo: &Geo,
    pts: &[Point],
    label: &str,
    cuts: &mut Vec<EdgeCut>,
) -> Vec<Vec<Point>> {
    let mut out = Vec::new();
    for (piece, cut_start, cut_end) in geo.polyline(pts) {
        if cut_start {
            let at = piece[0];
            cuts.push(EdgeCut {
                at,
                right: at.0 > (geo.strip.0 + geo.strip.1) / 2.0,
                label: label.to_string(),
                label_y: at.1 + 0.65,
            });
        }
        if cut_end {
            let at = piece[piece.len() - 1];
            cuts.push(EdgeCut {
                at,
                right: at.0 > (geo.strip.0 + geo.strip.1) / 2.0,
                label: label.to_string(),
                label_y: at.1 + 0.65,
            });
        }
        out.push(piece);
    }
    out
}
