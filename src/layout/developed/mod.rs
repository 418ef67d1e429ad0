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
//! The strip starts a share of a slot pitch (the seam offset, ½ unless moved) before the
//! centre of the first slot shown, so slot k sits at ((k − first) + offset) slot pitches.
//! Every angle comes from the engine (slot centres, segment centres, brush centres, pole
//! axes). An element that runs past an edge is cut there and ends in a dot with one label,
//! the coil and the slot or bar its line goes to ("12→s4", "12→b13"), set off by a leader;
//! the labels of an edge keep the order of their dots and stand at least a line apart.
//!
//! ## What is shown
//! - The whole view: every coil; a line cut at one edge re-enters at the other with the same
//!   label, so both edges read alike. The seam offset and a slight lean of the back apexes
//!   are chosen so that no two lines meet an edge at one point.
//! - A printed set ([`printed_diagrams`]) draws every coil whatever the paper: the whole view
//!   where it fits and its seam can be labelled at the floor, else the diagram continued in
//!   [`Part`]s over as many sheets as it needs, from coil 1's slot on, element by element on
//!   a frog-leg. A part draws the coils whose top sides lie in its own slots, each line cut
//!   at an edge labelled with where it goes, as many slots as its edges can label; where
//!   that would draw fewer than half the slots a sheet shows (coils wider than the sheet),
//!   the parts go side by side instead, edge to edge at one scale, each also drawing the
//!   lines of the others' coils that pass, and a line meeting a match line goes on at the
//!   same height on the next sheet. `--window all` that cannot be printed is refused.
//! - A window on a screen (`draw --window`): the coils lying wholly in it, or, when the
//!   window is narrower than a coil, the coils of its first slots, as many as the gutters
//!   can label ([`Drawn`]).

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
pub use coils::{CoilDrawing, EdgeCut, Goes, SideLine, edge_label};
pub use equalizers::{EqualizerBand, EqualizerDrawing, equalizer_choice_words};
pub use view::{LEGIBLE_SEGMENTS, PartRequest, View, Window, resolve_view};

use coils::coil_drawing;
use equalizers::equalizer_band;
pub use labels::tag_text;
use labels::{EDGE_LABEL_GAP, label_spot, place_edge_labels, thin_tags};
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
    /// Which coils are drawn.
    pub drawn: Drawn,
    /// On a printed set whose diagram is continued over several sheets: this part.
    pub part: Option<Part>,
}

/// One part of a developed diagram continued over several sheets: the coils whose top sides
/// lie in its slots, of one element on a winding of several. Parts are printed in order on
/// sheets 1, 2, …, so part k is on sheet k.
#[derive(Clone, Debug, PartialEq)]
pub struct Part {
    /// The first slot whose coils the part draws.
    pub first_slot: u32,
    /// How many slots' coils it draws, from the first.
    pub slots: u32,
    /// The element drawn, on a winding of several (`lap`, `wave`).
    pub element: Option<&'static str>,
    /// Continued side by side ([`PartRequest::side_by_side`]).
    pub side_by_side: bool,
    /// x of the match line after the last slot whose coils are drawn, mm in the box; at the
    /// strip's right edge when that slot is the last shown.
    pub match_x: f64,
    /// This part's number (1-based) and the number of parts.
    pub number: usize,
    /// How many parts the diagram has.
    pub count: usize,
    /// The part that draws the coils of the slot before the first (the match line at the
    /// strip's left edge), when any.
    pub before: Option<usize>,
    /// The part that draws the coils of the slot after the last (the match line at
    /// [`Part::match_x`]), when any.
    pub after: Option<usize>,
}

impl Part {
    /// The last slot whose coils the part draws, on an armature of `total` slots.
    pub fn last_slot(&self, total: u32) -> u32 {
        (self.first_slot - 1 + self.slots - 1) % total + 1
    }
}

/// Least gutter either side of the strip, mm: the band names and the edge labels.
const GUTTER: f64 = 16.0;
/// From an edge dot to its label, mm (the leader).
pub(super) const LEADER: f64 = 4.5;
/// Room the band names ("back", "front") take at the outer side of the left gutter, mm.
const BAND_NAMES: f64 = 4.0;

/// The gutter either side of the strip that `d`'s edge labels need: the widest beside its
/// leader, and the band names.
fn gutter_needed(d: &Diagram) -> f64 {
    let widest = d
        .coils
        .iter()
        .flat_map(|c| c.cuts.iter())
        .map(|cut| text_width(&cut.label, TEXT_FLOOR, Weight::Regular))
        .fold(0.0, f64::max);
    (LEADER + widest + 0.8 + BAND_NAMES).max(GUTTER)
}

/// Lays out the developed diagram of `winding` in a box of the given size: first with the
/// least gutter, then, when its edge labels need more, once more with that gutter (a wider
/// gutter shows no more slots, so no wider label comes in).
pub fn layout_developed(design: &Design, winding: &Winding, options: &DiagramOptions) -> Diagram {
    settle(design, winding, options, None)
}

/// The diagram laid out until its gutter holds its edge labels and its header its lines: a
/// wider gutter shows no more slots, so no wider label comes in; a header of more lines
/// leaves less height, which may change what is drawn and so the header once more.
fn settle(
    design: &Design,
    winding: &Winding,
    options: &DiagramOptions,
    part: Option<(u32, PartRequest)>,
) -> Diagram {
    let mut lines = 2 + usize::from(part.is_some());
    let mut gutter = GUTTER;
    let mut d = layout_in(design, winding, options, gutter, lines, part);
    for _ in 0..3 {
        let need_gutter = gutter_needed(&d).max(gutter);
        let need_lines = nodes::header_line_count(&d).max(lines);
        if need_gutter <= gutter + 1e-9 && need_lines == lines {
            break;
        }
        (gutter, lines) = (need_gutter, need_lines);
        d = layout_in(design, winding, options, gutter, lines, part);
    }
    d
}

/// Why the whole armature cannot be printed in one view, as `--window all` asks.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum WholeRefused {
    /// The sheet holds `fit` of the `slots` slots at the floor.
    TooWide {
        /// Slots on the armature.
        slots: u32,
        /// Slots the sheet holds at the floor.
        fit: u32,
    },
    /// The whole view has `lines` lines at its seam, more than its gutters can label at the
    /// floor.
    Seam {
        /// Lines cut at the seam.
        lines: usize,
    },
}

/// The developed diagram of a printed set, as one diagram or as parts continued over
/// several sheets, so that every coil is drawn on a sheet whatever the paper: the whole
/// view when it is asked for (`Window::Whole`, refused when it cannot be printed at the
/// floor) or when it fits and is labelled at the floor (`Window::Auto` on a winding of one
/// element and up to [`LEGIBLE_SEGMENTS`]); else parts, from coil 1's slot on, each drawing
/// the coils whose top sides lie in its first slots, as many slots as its edges can label,
/// with a match line where the next part takes over; a winding of several elements is drawn
/// element by element. A window of pole pairs is drawn in parts over its own slots.
pub fn printed_diagrams(
    design: &Design,
    winding: &Winding,
    options: &DiagramOptions,
) -> Result<Vec<Diagram>, WholeRefused> {
    let options = DiagramOptions {
        floor: true,
        ..*options
    };
    let try_whole = match options.window {
        Window::Whole => true,
        Window::Auto => !winding.is_multi_element() && winding.active_coils <= LEGIBLE_SEGMENTS,
        Window::PolePairs { .. } => false,
    };
    if try_whole {
        let whole = DiagramOptions {
            window: Window::Whole,
            ..options
        };
        let d = layout_developed(design, winding, &whole);
        if d.view.whole && !d.view.crowded {
            return Ok(vec![d]);
        }
        if options.window == Window::Whole {
            return Err(if d.view.whole {
                WholeRefused::Seam {
                    lines: d.coils.iter().map(|c| c.cuts.len()).sum::<usize>() / 2,
                }
            } else {
                WholeRefused::TooWide {
                    slots: design.slots,
                    fit: d.view.slots,
                }
            });
        }
    }
    Ok(parts(design, winding, &options))
}

/// The parts of a continued diagram (see [`printed_diagrams`]), numbered and linked.
fn parts(design: &Design, winding: &Winding, options: &DiagramOptions) -> Vec<Diagram> {
    let s = design.slots;
    let (first, count, wraps) = match options.window {
        Window::PolePairs { .. } => {
            let v = resolve_view(design, winding, options.window, None);
            (v.first_slot, v.slots, v.slots >= s)
        }
        _ => (1, s, true),
    };
    let elements: Vec<Option<usize>> = if winding.is_multi_element() {
        (0..winding.elements.len()).map(Some).collect()
    } else {
        vec![None]
    };
    let mut out: Vec<Diagram> = Vec::new();
    for element in elements {
        // Each element from the slot of its first coil's top side (coil 1's, for the first).
        let holder = element.map(|e| &winding.elements[e]);
        let start_slot = match (options.window, holder) {
            (Window::PolePairs { .. }, _) => first,
            (_, Some(e)) => winding
                .connections
                .iter()
                .find(|c| e.holds(c.coil))
                .map_or(first, |c| c.top.slot),
            (_, None) => winding.connections.first().map_or(first, |c| c.top.slot),
        };
        let chain_start = out.len();
        let (mut at, mut left) = (start_slot, count);
        // Each part its own coils, their lines labelled at the edges, while that draws at
        // least half the slots a sheet shows; else (coils wider than the sheet, dense
        // edges) side by side.
        let first = PartRequest {
            tops: count,
            element,
            side_by_side: false,
        };
        let probe = settle(design, winding, options, Some((start_slot, first)));
        let owned = probe.part.as_ref().map_or(count, |p| p.slots);
        let side_by_side = 2 * owned < probe.view.slots.min(count);
        while left > 0 {
            let request = PartRequest {
                tops: left,
                element,
                side_by_side,
            };
            let d = if at == start_slot && !side_by_side {
                probe.clone()
            } else {
                settle(design, winding, options, Some((at, request)))
            };
            let taken = d.part.as_ref().map_or(left, |p| p.slots).clamp(1, left);
            at = (at - 1 + taken) % s + 1;
            left -= taken;
            out.push(d);
        }
        let n = out.len();
        for (k, d) in out.iter_mut().enumerate().skip(chain_start) {
            if let Some(p) = d.part.as_mut() {
                p.before = if k > chain_start {
                    Some(k)
                } else {
                    (wraps && n - chain_start > 1).then_some(n)
                };
                p.after = if k + 1 < n {
                    Some(k + 2)
                } else {
                    (wraps && n - chain_start > 1).then_some(chain_start + 1)
                };
            }
        }
    }
    let count = out.len();
    for (k, d) in out.iter_mut().enumerate() {
        if let Some(p) = d.part.as_mut() {
            p.number = k + 1;
            p.count = count;
        }
    }
    out
}

/// Share of the slot pitch over which a slot's coil sides are spread.
pub(crate) const SIDE_SPREAD: f64 = 0.85;

/// The least slot pitch on paper that keeps the floor, mm: neighbouring coil sides (2u a
/// slot, spread over [`SIDE_SPREAD`] of the pitch) [`SIDE_GAP`] apart, and every segment
/// number (turned, its digits' cap height across) beside the next.
fn min_slot_pitch(design: &Design, winding: &Winding) -> f64 {
    let u = f64::from(winding.sides_per_layer(design.coils_per_slot));
    let sides = SIDE_GAP * 2.0 * u / SIDE_SPREAD;
    let per_slot = f64::from(winding.active_coils) / f64::from(design.slots);
    let numbers = (TEXT_FLOOR * 0.73 + 0.5) * per_slot;
    sides.max(numbers) + 1e-6
}

/// Dots closer than this on one edge, mm, read as one dot.
const DOT_GAP: f64 = 0.9;

/// How far the back apex may lean off the coil's centre, in slot pitches, tried in order
/// when the seam alone cannot keep the dots apart: lines crossing each other on the seam
/// then cross beside it.
const APEX_LEANS: [f64; 11] = [0.0, 0.1, -0.1, 0.2, -0.2, 0.3, -0.3, 0.4, -0.4, 0.5, -0.5];

/// The most coils a whole view searches seams and leans for.
const SEARCHED_COILS: usize = 480;

/// Where the whole view's seam may fall, as the share of a slot pitch between the left edge
/// and the first slot's centre: 0.5 first, then steps either side while the slot box (0.8 of
/// the pitch) and the outermost coil side stay clear of the edge.
fn seam_offsets(u: u32, search: bool) -> Vec<f64> {
    let outermost = SIDE_SPREAD * (0.5 - 0.25 / f64::from(u));
    let lo = outermost.max(0.4) + 0.02;
    let mut out = vec![0.5];
    if search {
        for k in 1..=8 {
            let d = 0.01 * f64::from(k);
            if 0.5 - d >= lo {
                out.extend([0.5 - d, 0.5 + d]);
            }
        }
    }
    out
}

/// The least distance between two dots on one edge, mm (infinite with fewer than two).
fn least_dot_gap(coils: &[CoilDrawing]) -> f64 {
    let mut least = f64::INFINITY;
    for right in [false, true] {
        let mut ys: Vec<f64> = coils
            .iter()
            .flat_map(|c| c.cuts.iter())
            .filter(|cut| cut.right == right)
            .map(|cut| cut.at.1)
            .collect();
        ys.sort_by(f64::total_cmp);
        for w in ys.windows(2) {
            least = least.min(w[1] - w[0]);
        }
    }
    least
}

/// Which coils a diagram draws.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Drawn {
    /// The whole view: every coil, cut at the seam and re-entering.
    Every,
    /// A window: the coils lying wholly in it.
    Wholly,
    /// A window too narrow to hold a whole coil: the coils whose top sides lie in the first
    /// slots shown, up to this slot, as many as leave no more lines at an edge than its
    /// gutter can label.
    TopsThrough(u32),
}

/// The coils drawn, at the first seam offset that keeps every pair of dots on an edge
/// [`DOT_GAP`] apart (else the one that comes nearest): two lines meeting an edge at one
/// point would put two labels on one dot. A window draws the coils lying wholly in it, or
/// when none does those whose top sides lie in its first slots ([`Drawn::TopsThrough`]).
fn seam_and_coils(
    design: &Design,
    winding: &Winding,
    bands: &Bands,
    view: &View,
    geo_at: &dyn Fn(f64) -> Geo,
) -> (f64, Vec<CoilDrawing>, Drawn) {
    let whole = view.whole;
    if let Some(p) = view.part.filter(|p| p.side_by_side) {
        // Side by side: at the one seam, no line labelled (it goes on at the same height
        // across the match line).
        let geo = geo_at(0.5);
        let mut coils = draw_coils(design, winding, view, &geo, bands, false, 0.0);
        for c in &mut coils {
            c.cuts.clear();
        }
        let last = (view.first_slot - 1 + p.tops.min(view.slots) - 1) % design.slots + 1;
        return (0.5, coils, Drawn::TopsThrough(last));
    }
    if !whole && view.part.is_none() {
        let geo = geo_at(0.5);
        let mut coils = draw_coils(design, winding, view, &geo, bands, true, 0.0);
        if !coils.is_empty() {
            // An element of a frog-leg with no coil wholly in view (the wave element's end
            // leads run two pole pitches on) shows the coils of its first slots whose sides
            // both lie in view, their leads cut and labelled at the edge.
            let missing: Vec<Option<&str>> = winding
                .elements
                .iter()
                .map(|e| Some(e.kind.as_str()))
                .filter(|&k| winding.is_multi_element() && !coils.iter().any(|c| c.element == k))
                .collect();
            for kind in missing {
                let sides: Vec<CoilDrawing> =
                    draw_coils(design, winding, view, &geo, bands, false, 0.0)
                        .into_iter()
                        .filter(|c| c.element == kind && c.bottom.is_some())
                        .collect();
                coils.extend(first_slots_labelled(sides, bands, |c| c.coil).0);
            }
            coils.sort_by_key(|c| c.coil);
            return (0.5, coils, Drawn::Wholly);
        }
    }
    let mut best: Option<(f64, f64, Vec<CoilDrawing>, Drawn)> = None;
    // A view of many hundred coils is not searched: a whole one cannot be labelled at its
    // seam anyway (it falls back to a window), a window draws a few slots' coils.
    let search = winding.connections.len() <= SEARCHED_COILS || !whole;
    let sides = winding.sides_per_layer(design.coils_per_slot);
    let leans: &[f64] = if search { &APEX_LEANS } else { &[0.0] };
    'search: for &lean in leans {
        for seam in seam_offsets(sides, search) {
            let geo = geo_at(seam);
            let lean_mm = lean * geo.scale * 360.0 / f64::from(design.slots);
            let all = draw_coils(design, winding, view, &geo, bands, false, lean_mm);
            let (coils, drawn) = if whole {
                (all, Drawn::Every)
            } else {
                let (coils, last) = first_slots_labelled(all, bands, top_slot);
                (coils, Drawn::TopsThrough(last))
            };
            let gap = least_dot_gap(&coils);
            let better = best.as_ref().is_none_or(|b| gap > b.0 + 1e-9);
            if better {
                best = Some((gap, seam, coils, drawn));
            }
            if gap >= DOT_GAP {
                break 'search;
            }
        }
    }
    let (_, seam, coils, drawn) = best.expect("at least one seam offset");
    (seam, coils, drawn)
}

/// The top slot of a drawn coil (0 when its top side is out of view).
fn top_slot(c: &CoilDrawing) -> u32 {
    c.top.map_or(0, |t| t.slot)
}

/// The coils of `all` whose top sides lie in the first slots shown, taken a group at a time
/// (`group`: the top slot, or the coil for one at a time) for as long as neither edge has
/// more lines than its gutter can label nor two dots closer than the floor (at least the
/// first group), and the group of the last one taken.
fn first_slots_labelled(
    mut all: Vec<CoilDrawing>,
    bands: &Bands,
    group: fn(&CoilDrawing) -> u32,
) -> (Vec<CoilDrawing>, u32) {
    all.sort_by(|a, b| {
        let x = |c: &CoilDrawing| c.top.map_or(f64::INFINITY, |t| t.x);
        x(a).total_cmp(&x(b)).then(a.coil.cmp(&b.coil))
    });
    let capacity =
        ((bands.commutator.1 - bands.pole.0 - 2.0) / EDGE_LABEL_GAP).floor() as usize + 1;
    let mut counts = [0usize; 2];
    let mut keep = 0;
    let mut last = all.first().map_or(0, group);
    let mut i = 0;
    while i < all.len() {
        let slot = group(&all[i]);
        let size = all[i..].iter().take_while(|c| group(c) == slot).count();
        let mut more = counts;
        for c in &all[i..i + size] {
            for cut in &c.cuts {
                more[usize::from(cut.right)] += 1;
            }
        }
        if keep > 0
            && (more.iter().any(|&n| n > capacity)
                || least_dot_gap(&all[..i + size]) < nodes::CUT_DOT_FLOOR)
        {
            break;
        }
        counts = more;
        keep = i + size;
        last = slot;
        i += size;
    }
    all.truncate(keep);
    all.sort_by_key(|c| c.coil);
    (all, last)
}

/// Every coil with anything to draw in `geo` (`whole_coils`: only those with both sides in
/// view, for a window).
fn draw_coils(
    design: &Design,
    winding: &Winding,
    view: &View,
    geo: &Geo,
    bands: &Bands,
    whole_coils: bool,
    lean: f64,
) -> Vec<CoilDrawing> {
    // A frog-leg's slot holds u sides of each element a layer: the wave element's beside the
    // lap element's.
    let per_element = design.coils_per_slot;
    let u = winding.sides_per_layer(per_element);
    let slot_deg = 360.0 / f64::from(design.slots);
    let side_deg = |slot: u32, position: u32, bottom: bool| {
        let j = 2 * (position - 1) + u32::from(bottom);
        let frac = SIDE_SPREAD * ((f64::from(j) + 0.5) / f64::from(2 * u) - 0.5);
        (f64::from(slot - 1) + frac) * slot_deg
    };
    // A window draws only coils whose top side lies in it; a part, only those of its own
    // slots and element.
    let tops = view.part.map_or(view.slots, |p| p.tops.min(view.slots));
    let in_view =
        |slot: u32| view.whole || (slot + design.slots - view.first_slot) % design.slots < tops;
    let element = view.part.and_then(|p| p.element);
    // Side by side, a part also draws the pieces of the coils of slots out of its view.
    let shown = |slot: u32| (slot + design.slots - view.first_slot) % design.slots < view.slots;
    let passing = view.part.is_some_and(|p| p.side_by_side);
    // A coil reaches no further from its top side than `reach` slots (its bottom side and
    // its bars): the coils of slots further from the view have nothing in it.
    let reach = if passing {
        coil_reach(design, winding)
    } else {
        0
    };
    let near = |slot: u32| {
        let s = design.slots;
        let off = (slot + s - view.first_slot) % s;
        off < view.slots + reach || s - off <= reach
    };
    winding
        .connections
        .iter()
        .filter(|conn| {
            in_view(conn.top.slot) || (passing && !shown(conn.top.slot) && near(conn.top.slot))
        })
        .filter(|conn| element.is_none_or(|e| winding.elements[e].holds(conn.coil)))
        .filter_map(|conn| {
            let place = |position: u32| winding.place_in_slot(conn, position, per_element);
            let top_deg = side_deg(conn.top.slot, place(conn.top.position), false);
            let forward = (conn.bottom.slot + design.slots - conn.top.slot) % design.slots;
            let bottom_deg = side_deg(conn.top.slot, place(conn.bottom.position), true)
                + f64::from(forward) * slot_deg;
            coil_drawing(
                conn,
                winding,
                geo,
                bands,
                (top_deg, bottom_deg),
                whole_coils,
                lean,
            )
        })
        .collect()
}

/// The most slots, plus one, that any coil's lines reach from its top side's slot either
/// way: to its bottom side and to its two bars (each the nearer way round).
fn coil_reach(design: &Design, winding: &Winding) -> u32 {
    let slot_deg = 360.0 / f64::from(design.slots);
    let apart = |a: f64, b: f64| {
        let d = (a - b).rem_euclid(360.0);
        d.min(360.0 - d)
    };
    let most = winding
        .connections
        .iter()
        .map(|c| {
            let top = f64::from(c.top.slot - 1) * slot_deg;
            let bottom = f64::from(c.bottom.slot - 1) * slot_deg;
            [c.start_segment, c.end_segment]
                .into_iter()
                .flatten()
                .map(|s| apart(winding.segment_deg(s), top))
                .fold(apart(bottom, top), f64::max)
        })
        .fold(0.0, f64::max);
    (most / slot_deg).ceil() as u32 + 2
}

/// The developed diagram with `gutter` mm either side of the strip and `lines` header lines;
/// with `part`, the part of a continued diagram from that slot.
fn layout_in(
    design: &Design,
    winding: &Winding,
    options: &DiagramOptions,
    gutter: f64,
    lines: usize,
    part: Option<(u32, PartRequest)>,
) -> Diagram {
    let s = f64::from(design.slots);
    let c = f64::from(winding.active_coils);
    let slot_deg = 360.0 / s;
    let seg_deg = 360.0 / c;
    let strip = (gutter, options.width - gutter);
    let strip_w = strip.1 - strip.0;
    let fit = options
        .floor
        .then(|| (strip_w / min_slot_pitch(design, winding)).floor() as u32);
    let bands = bands::bands(design, winding, options.height, lines);
    let room = (bands.pole.0 + 2.0, bands.commutator.1);
    let geo_at = |view: &View, seam: f64| {
        let scale = strip_w / (f64::from(view.slots) * slot_deg);
        Geo {
            start_deg: (f64::from(view.first_slot - 1) - seam) * slot_deg,
            scale,
            turn: 360.0 * scale,
            strip,
            whole: view.whole,
            copies: view.whole || view.part.is_some_and(|p| p.side_by_side),
        }
    };
    let mut view = match part {
        Some(part) => part_view(design, winding, options.window, fit, part),
        None => resolve_view(design, winding, options.window, fit),
    };
    let (seam, mut coils, drawn) =
        seam_and_coils(design, winding, &bands, &view, &|f| geo_at(&view, f));
    let labelled = place_edge_labels(&mut coils, EDGE_LABEL_GAP, room, view.whole);
    // A whole view with more lines at its seam than the gutter can label at the floor: a
    // printed set continues the diagram over parts instead (a screen, which zooms, keeps it).
    view.crowded =
        view.whole && options.floor && (!labelled || least_dot_gap(&coils) < nodes::CUT_DOT_FLOOR);
    let geo = geo_at(&view, seam);
    let scale = geo.scale;

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
            (slot, strip.0 + (f64::from(i) + seam) * slot_pitch)
        })
        .collect();

    let poles = pole_bands(design, winding, &geo);
    let part = part.map(|(first, request)| {
        let slots = part_slots(design, winding, &view, &coils, drawn);
        Part {
            first_slot: first,
            slots,
            element: request.element.map(|e| winding.elements[e].kind.as_str()),
            side_by_side: request.side_by_side,
            match_x: (strip.0 + (f64::from(slots) - 0.5 + seam) * slot_pitch).min(strip.1),
            number: 1,
            count: 1,
            before: None,
            after: None,
        }
    });

    thin_tags(&mut coils, label_size, 0.6);
    let segments = segment_boxes(winding, &geo, segment_pitch);
    let brushes = brush_boxes(winding, &geo, segment_pitch);

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
        drawn,
        part,
    }
}

/// The view of a part from slot `first`: as many slots as the sheet holds (`fit`), at most
/// the window asked for.
fn part_view(
    design: &Design,
    winding: &Winding,
    window: Window,
    fit: Option<u32>,
    (first, request): (u32, PartRequest),
) -> View {
    let asked = resolve_view(design, winding, window, None);
    let limit = match window {
        Window::PolePairs { .. } => asked.slots,
        _ => design.slots,
    };
    View {
        whole: false,
        first_slot: first,
        slots: fit.unwrap_or(limit).min(limit).max(1),
        pole_pairs: match window {
            Window::PolePairs { .. } => asked.pole_pairs,
            _ => None,
        },
        part: Some(request),
        ..asked
    }
}

/// How many slots' coils a part drew, from its first: all it may draw when it drew every
/// coil it may, else through the top slot of the last it drew.
fn part_slots(
    design: &Design,
    winding: &Winding,
    view: &View,
    coils: &[CoilDrawing],
    drawn: Drawn,
) -> u32 {
    let Some(request) = view.part else {
        return view.slots;
    };
    let room = request.tops.min(view.slots);
    if request.side_by_side {
        return room;
    }
    let s = design.slots;
    let mine = |coil: u32| {
        request
            .element
            .is_none_or(|e| winding.elements[e].holds(coil))
    };
    let may = winding
        .connections
        .iter()
        .filter(|c| mine(c.coil) && (c.top.slot + s - view.first_slot) % s < room)
        .count();
    match drawn {
        Drawn::TopsThrough(last) if coils.len() < may && last > 0 => {
            ((last + s - view.first_slot) % s + 1).min(room)
        }
        _ => room,
    }
}

/// The pole shoes that show in the strip, each by its arc on the surface.
fn pole_bands(design: &Design, winding: &Winding, geo: &Geo) -> Vec<PoleBand> {
    let scale = geo.scale;
    let half_arc = design.pole_arc * 180.0 / f64::from(design.poles);
    winding
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
        .collect()
}

/// The segments inside the strip (a whole view: every one), each a box of 0.84 of its pitch.
fn segment_boxes(winding: &Winding, geo: &Geo, segment_pitch: f64) -> Vec<SegmentBox> {
    let seg_w = segment_pitch * 0.84;
    (1..=winding.active_coils)
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
        .collect()
}

/// The brush sets inside the strip, each at its real width (at least 1.8 mm).
fn brush_boxes(winding: &Winding, geo: &Geo, segment_pitch: f64) -> Vec<BrushBox> {
    let seg_deg = 360.0 / f64::from(winding.active_coils);
    winding
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
        .collect()
}
