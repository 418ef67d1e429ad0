//! `winding`: the pure engine. A resolved [`Design`] in, a traced [`Winding`] out.
//!
//! Second stage of the pipeline. No I/O, no clock. The engine lays out the coils, connects
//! them to segments with the commutator pitch, traces the graph (segments are nodes, coils are
//! edges), places the brushes and cuts the trace into parallel paths. Textbook formulas
//! (a = m·P or 2m, reentrancy gcd(C, |y_c|)) are kept beside the traced values as a check.
//!
//! ## Conventions
//! - Coil n has its top side in slot ⌈n/u⌉ at position ((n−1) mod u)+1; its bottom side is
//!   y_s slots on, same position. Top coil sides are odd (2n−1), bottom sides even.
//! - The active coils, in position order, start at segments 1, 2, … C; coil i's end lead is on
//!   segment i + y_c (mod C). Dummy coils are spread evenly and left unconnected.
//! - A winding of several elements (frog-leg: lap, then wave) numbers each element's coils
//!   after the previous element's: coil N·k + j lies in coil j's slot and position, with
//!   element k's span; element k's i-th active coil starts on segment i + 1 + shift_k, the
//!   shift that puts it on the first element's neutral (`element_start_shift`). Each element
//!   is traced on its own; brushes, paths, shorted coils and balance use all of them.
//! - Each active coil's front pitch is read off the connections ([`Connection::front_pitch`]):
//!   the nominal y_f, plus 2 for each dummy coil the step to the next coil passes on a wave.
//! - Reference position: the centre line of coil 1 lies on the axis of pole 1 (a north pole).
//! - `lead_offset` = 0 is the symmetric position for a slot's coil group: the brush sits on
//!   the pole axis and commutates the coils while their centre lines cross the pole axis, on
//!   average over the group. A coil is commutated when the brush is at the midpoint of its two
//!   bars (y_c/2 on from its start bar); the u coils of a slot share one centre line but start
//!   on u consecutive bars, and dummy coils skip bars, so the brush sits
//!   y_c/2 + mean(i − θ_i/δ) bars on from segment 1, with i the active coil's bar index from 0,
//!   θ_i its slot's angle from slot 1 and δ = 360/C (see `brushes::neutral_shift_units`). For
//!   u = 1 without dummies the mean is 0; for u coils a slot it is (u − 1)/2 bars.
//!   A positive offset (half bars allowed) swings every lead that many segments towards rising
//!   segment numbers; the brushes follow, so they sit on the pole axes shifted by
//!   lead_offset·360/C degrees and stay on electrical neutral.

mod balance;
mod brushes;
mod connect;
mod constants;
mod equalizers;
mod front;
mod geometry;
mod model;
mod paths;
mod symmetry;
mod trace;

#[cfg(test)]
mod tests;

pub use crate::theory::pitch::Pitches;
pub use balance::{BALANCE_TOLERANCE, balance_period_segments};
pub use connect::place_dummies;
pub use model::*;
use symmetry::path_classes_of;
pub use symmetry::{Congruence, PathClasses, rotation_segment_shift};

use crate::design::Design;
use geometry::Geometry;

/// Winds and traces `design`. The design stage has resolved and validated the segment count,
/// so every `Design` can be wound.
pub fn trace_winding(design: &Design) -> Winding {
    let d = design;
    let c = d.segments;
    let kind = d.winding_type.kind();
    let dummy_coils = d
        .dummy_coils
        .clone()
        .unwrap_or_else(|| place_dummies(d.coil_positions(), d.coil_positions() - c));
    let connect::Wound {
        mut elements,
        connections,
        closed_windings,
    } = connect::wind_elements(d, &dummy_coils);
    let pitches = elements[0].pitches;
    let geo = Geometry::new(d, c);
    let placed = brushes::place(d, &geo, &connections, &closed_windings, pitches.commutator);
    let all = connections.len();
    let cut = paths::cut(
        d.mode,
        &placed.runs,
        &placed.spots,
        placed.sign0,
        &mut elements,
        all,
    );
    let equalizers = equalizers::plan_equalizers(d, c, &connections);
    let conductors = elements
        .iter()
        .map(|e| 2 * u64::from(c) * u64::from(e.turns))
        .sum();
    let linkage = constants::flux_linkage_of(d, &connections[0]);
    let constants = constants::machine_constants(d, conductors, cut.paths.len() as u32, linkage);
    let (segment1_deg, lead_swing) = brushes::lead_swing(d, &geo, placed.neutral);
    let mut w = Winding {
        coils: d.coil_positions(),
        active_coils: c,
        dummy_coils,
        segments_derived: d.segments_derived,
        conductors,
        pitches,
        reentrancy_formula: elements.iter().map(|e| e.reentrancy_formula).sum(),
        elements,
        connections,
        closed_windings,
        brushes: placed.brushes,
        brush_sets_minimum: kind.fewest_brush_sets(d.poles),
        brush_width: placed.width,
        paths: cut.paths,
        shorted_coils: cut.shorted,
        coil_current: cut.coil_current,
        coil_path: cut.coil_path,
        coil_emf: placed.coil_emf,
        paths_formula: kind.parallel_paths(d.multiplicity, d.poles),
        equalizers,
        balance: balance::unsimulated(d),
        pole_axes_deg: (0..d.poles)
            .map(|k| geo.degrees(geo.pole1 + i64::from(k) * geo.pole_pitch))
            .collect(),
        segment1_deg,
        lead_swing,
        constants,
    };
    // The paths sorted into classes carried onto one another: an engine fact, read by the
    // symmetry checks.
    let classes: Vec<PathClasses> = w
        .elements
        .iter()
        .map(|e| path_classes_of(d, &w, e))
        .collect();
    // Rigid rotations that carry every path of a one-element winding onto every other leave
    // no spread at any rotor position (the exact test's theorem, checked against an
    // independent simulation in tests/it/exact_symmetry.rs): the simulation is then skipped.
    let proven =
        w.elements.len() == 1 && classes[0].congruence(w.paths.len()) == Congruence::Proven;
    for (e, k) in w.elements.iter_mut().zip(classes) {
        e.path_classes = k;
    }
    if !proven {
        w.balance =
            balance::simulate_balance(d, &geo, &w.closed_windings, &placed.spots, c, all as u32);
    }
    w
}
