//! The developed winding diagram as plain geometry: the armature surface unrolled left to right.
//!
//! Part of the `layout` stage: [`Design`] + [`Winding`] in, [`Diagram`] out, in millimetres
//! with the origin at the top-left of the diagram box. `view` picks what is shown and maps
//! angles to the strip, `bands` stacks the bands, `coils` draws the coils and their edge
//! cuts, `labels` spaces the labels, `equalizers` the equalizer band; [`nodes`] turns the
//! geometry into page-tree nodes (classes, type sizes), which `render` only writes.
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

mod bands;
mod coils;
mod equalizers;
mod labels;
pub mod nodes;
mod view;

use crate::design::{Design, Rotation};
use crate::winding::{Polarity, Winding};

use super::font::{Weight, text_width};
use super::style::{SIDE_GAP, TEXT_FLOOR};

pub use bands::{Bands, MAX_RING_ROWS};
pub use coils::{CoilDrawing, EdgeCut, SideLine};
pub use equalizers::{EqualizerBand, EqualizerDrawing, equalizer_choice_words};
pub use view::{LEGIBLE_SEGMENTS, View, Window, resolve_view};

use coils::coil_drawing;
use equalizers::equalizer_band;
pub use labels::tag_text;
use labels::{EDGE_LABEL_GAP, label_spot, space_edge_labels, thin_tags};
use view::Geo;

/// A point in mm.
pub type Point = (f64, f64);

/// Size and window of a diagram.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct DiagramOptions {
    /// Box width, mm.
    pub width: f64,
    /// Box height, mm.
    pub height: f64,
    /// Which part of the armature to show.
    pub window: Window,
    /// Hold the legibility floor (a printed sheet): show no more slots than leave
    /// [`SIDE_GAP`] between neighbouring coil sides and room for the numbers.
    pub floor: bool,
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
const GUTTER: f64 = 16.0;

/// Share of the slot pitch over which a slot's coil sides are spread.
pub(crate) const SIDE_SPREAD: f64 = 0.85;

/// The least slot pitch on paper that keeps the floor, mm: neighbouring coil sides (2u a
/// slot, spread over [`SIDE_SPREAD`] of the pitch) [`SIDE_GAP`] apart, and every segment
/// number (turned, its digits' cap height across) beside the next.
fn min_slot_pitch(design: &Design, winding: &Winding) -> f64 {
    let u = f64::from(design.coils_per_slot * winding.elements.len() as u32);
    let sides = SIDE_GAP * 2.0 * u / SIDE_SPREAD;
    let per_slot = f64::from(winding.active_coils) / f64::from(design.slots);
    let numbers = (TEXT_FLOOR * 0.73 + 0.5) * per_slot;
    sides.max(numbers) + 1e-6
}

/// Lays out the developed diagram of `winding` in a box of the given size.
pub fn layout_developed(design: &Design, winding: &Winding, options: &DiagramOptions) -> Diagram {
    let s = f64::from(design.slots);
    let c = f64::from(winding.active_coils);
    let slot_deg = 360.0 / s;
    let seg_deg = 360.0 / c;
    let strip = (GUTTER, options.width - GUTTER);
    let strip_w = strip.1 - strip.0;
    let fit = options
        .floor
        .then(|| (strip_w / min_slot_pitch(design, winding)).floor() as u32);
    let view = resolve_view(design, winding, options.window, fit);
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

    let bands = bands::bands(design, winding, options.height);
    let slot_pitch = slot_deg * scale;
    let segment_pitch = seg_deg * scale;
    let label_size = TEXT_FLOOR;
    // Segment numbers stand upright where the widest fits its box with room to spare.
    let widest_segment = text_width(
        &winding.active_coils.to_string(),
        label_size,
        Weight::Regular,
    );
    let turn_segment_labels = segment_pitch < widest_segment + 0.8;

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

    // A frog-leg's slot holds u sides of each element a layer: the wave element's beside the
    // lap element's.
    let per_element = design.coils_per_slot;
    let u = per_element * winding.elements.len() as u32;
    let element_index = |coil: u32| {
        winding
            .elements
            .iter()
            .position(|e| e.holds(coil))
            .unwrap_or(0) as u32
    };
    let side_deg = |slot: u32, position: u32, bottom: bool| {
        let j = 2 * (position - 1) + u32::from(bottom);
        let frac = SIDE_SPREAD * ((f64::from(j) + 0.5) / f64::from(2 * u) - 0.5);
        (f64::from(slot - 1) + frac) * slot_deg
    };
    let mut coils: Vec<CoilDrawing> = winding
        .connections
        .iter()
        .filter_map(|conn| {
            let shift = per_element * element_index(conn.coil);
            let top_deg = side_deg(conn.top.slot, conn.top.position + shift, false);
            let forward = (conn.bottom.slot + design.slots - conn.top.slot) % design.slots;
            let bottom_deg = side_deg(conn.top.slot, conn.bottom.position + shift, true)
                + f64::from(forward) * slot_deg;
            coil_drawing(conn, winding, &geo, &bands, top_deg, bottom_deg)
        })
        .collect();

    space_edge_labels(&mut coils, EDGE_LABEL_GAP);
    thin_tags(&mut coils, label_size, 0.6);
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

    let brushes = winding
        .brushes
        .iter()
        .filter_map(|b| {
            let deg = winding.segment1_deg + (b.centre_segment - 1.0) * seg_deg;
            let x = geo.x(deg);
            let half = (b.width_segments * segment_pitch * 0.5).max(0.9);
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
