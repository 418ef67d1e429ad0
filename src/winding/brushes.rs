//! The brushes: where they sit (on neutral for a slot's coil group, moved by the lead
//! offset), how wide they are, which segments they touch, their polarity, and the lead swing
//! that follows from them.
//!
//! Part of the `winding` stage (see the conventions in the module doc of [`super`]).

use super::geometry::Geometry;
use super::paths::{self, BrushSpot, Run};
use super::{BrushSet, BrushWidthUsed, ClosedWinding, Connection, LeadSwing, Polarity};
use crate::design::{BrushWidth, Design};

/// The brushes placed at the reference position and the runs of coils they cut.
pub(crate) struct Placed {
    /// Brush centres, one per brush set.
    pub spots: Vec<BrushSpot>,
    /// Brush 1's centre, in position units from segment 1.
    pub neutral: i64,
    /// The width the trace uses.
    pub width: BrushWidthUsed,
    /// Per coil, its EMF at the reference position (conductor units).
    pub coil_emf: Vec<i64>,
    /// The closed windings cut at the touched segments.
    pub runs: Vec<Run>,
    /// The polarity sign of brush 1.
    pub sign0: i64,
    /// The brush sets as reported.
    pub brushes: Vec<BrushSet>,
}

/// Places one brush per pole at adjacent poles (`brush_sets` of them, default P), at the
/// reference position, on neutral for the slot's coil group, and cuts the closed windings.
pub(crate) fn place(
    d: &Design,
    geo: &Geometry,
    connections: &[Connection],
    closed_windings: &[ClosedWinding],
    yc: i64,
) -> Placed {
    let c = d.segments;
    let n = d.coil_positions();
    let units = geo.per_segment_units;
    let neutral = yc * units / 2 + neutral_shift_units(d, &connections[..n as usize], c, units);
    let spots: Vec<BrushSpot> = (0..d.brush_sets() as usize)
        .map(|k| BrushSpot {
            pole: k,
            centre: neutral + k as i64 * 16 * i64::from(c),
        })
        .collect();
    let coil_emf: Vec<i64> = (1..=connections.len() as u32)
        .map(|coil| geo.coil_emf(coil, 0))
        .collect();
    let width = brush_width(d, c, units);
    let mark = paths::contacts_units(&spots, c, width.units, units, 0);
    let runs = paths::runs(closed_windings, &mark, &coil_emf);
    let sign0 = paths::first_brush_sign(&runs, &spots);
    let brushes = spots
        .iter()
        .map(|s| make_brush(d, s, sign0, c, units, &mark, width.width.segments))
        .collect();
    Placed {
        spots,
        neutral,
        width: width.width,
        coil_emf,
        runs,
        sign0,
        brushes,
    }
}

/// Segment 1's angle and the lead swing: brush 1's centre (`neutral` units on from segment 1)
/// sits on pole 1's axis, shifted by the lead offset; one unit is N ticks.
pub(crate) fn lead_swing(d: &Design, geo: &Geometry, neutral: i64) -> (f64, LeadSwing) {
    let c = d.segments;
    let units = geo.per_segment_units;
    let tick_n = i64::from(d.coil_positions());
    let segment1 = geo.pole1 - neutral * tick_n + i64::from(d.lead_offset.0) * units / 2 * tick_n;
    let segment1_deg = geo.degrees(segment1).rem_euclid(360.0);
    let per_bar = units * tick_n;
    let in_line = (-segment1).rem_euclid(geo.turn);
    let swing = LeadSwing {
        in_line_segment: in_line as f64 / per_bar as f64 + 1.0,
        in_line_half_bars: ((2 * in_line + per_bar / 2).div_euclid(per_bar))
            .rem_euclid(2 * i64::from(c)) as u32,
        from_pole_axis_bars: d.lead_offset.bars(),
        from_pole_axis_deg: d.lead_offset.bars() * 360.0 / f64::from(c),
    };
    (segment1_deg, swing)
}

/// The brush's shift from a coil's lead midpoint that centres the commutation zone of a
/// slot's coil group on the pole axis, in units of 1/`units` of a segment pitch, rounded to
/// the nearest unit.
///
/// Active coil i (0-based, in position order) starts on segment i + 1 and is commutated when
/// the brush is at i + y_c/2; its centre line is then θ_i/δ bars from the brush line, θ_i
/// being its slot's angle from slot 1's and δ the bar pitch. Placing the brush at
/// y_c/2 + mean(i − θ_i/δ) makes the mean offset zero. θ_i/δ = slot_i·C/S, so the shift is
/// Σ(i·S − slot_i·C)/(C·S) bars [derived; docs/domain.md, "Brush neutral with several coils per
/// slot"].
pub(crate) fn neutral_shift_units(
    d: &Design,
    connections: &[Connection],
    c: u32,
    units: i64,
) -> i64 {
    let (s, ci) = (i128::from(d.slots), i128::from(c));
    let sum: i128 = connections
        .iter()
        .filter_map(|k| k.start_segment.map(|st| (k.top.slot, st)))
        .map(|(slot, st)| i128::from(st - 1) * s - i128::from(slot - 1) * ci)
        .sum();
    let (num, den) = (sum * i128::from(units), ci * s);
    // Round to nearest (halves away from −∞).
    ((2 * num + den).div_euclid(2 * den)) as i64
}

fn make_brush(
    d: &Design,
    s: &BrushSpot,
    sign0: i64,
    c: u32,
    units: i64,
    mark: &[i32],
    width_segments: f64,
) -> BrushSet {
    let ci = i64::from(c);
    let centre = s.centre.rem_euclid(units * ci);
    let under = if centre % units == 0 {
        vec![(centre / units) as u32 + 1]
    } else {
        let lo = centre / units;
        vec![lo as u32 + 1, ((lo + 1) % ci) as u32 + 1]
    };
    let sign = if s.pole.is_multiple_of(2) {
        sign0
    } else {
        -sign0
    };
    BrushSet {
        index: s.pole as u32 + 1,
        polarity: if sign > 0 {
            Polarity::Positive
        } else {
            Polarity::Negative
        },
        angle_deg: (s.pole as f64 * 360.0 / f64::from(d.poles)
            + d.lead_offset.bars() * 360.0 / f64::from(c))
        .rem_euclid(360.0),
        centre_segment: centre as f64 / units as f64 + 1.0,
        under,
        contacts: mark
            .iter()
            .enumerate()
            .filter(|(_, b)| **b == s.pole as i32)
            .map(|(x, _)| x as u32 + 1)
            .collect(),
        width_segments,
    }
}

/// The brush width the trace uses, and the same in position units.
struct TraceWidth {
    width: BrushWidthUsed,
    units: i64,
}

/// The brush width from `[commutator]`: `brush_width_segments`, or `brush_width_mm` over the
/// segment pitch π·D_c/C; m segment pitches when neither is given (or the diameter is missing
/// for a width in mm). Rounded down to the engine's 1/(16·P) of a segment pitch.
fn brush_width(d: &Design, c: u32, units: i64) -> TraceWidth {
    let com = d.commutator.as_ref();
    let given = com.and_then(|k| match k.brush_width {
        Some(BrushWidth::Segments(x)) => Some(x),
        Some(BrushWidth::Millimetres(mm)) => k
            .diameter_mm
            .map(|dia| mm * f64::from(c) / (std::f64::consts::PI * dia)),
        None => None,
    });
    let segments = given.unwrap_or(f64::from(d.multiplicity));
    TraceWidth {
        width: BrushWidthUsed {
            segments,
            given: given.is_some(),
        },
        // Rounded down, so a brush the design stage let through (β + 1 ≤ C/P) never reaches
        // the next pole's brush.
        units: (segments * units as f64 + 1e-6).floor() as i64,
    }
}
