//! Winding the coils onto the commutator: each element's coils connected to the segments with
//! its commutator pitch, the dummy coils left out, front pitches set and closed windings traced.
//!
//! Part of the `winding` stage (see the conventions in the module doc of [`super`]).

use super::{ClosedWinding, Connection, SlotPlace, WindingElement, front, trace};
use crate::design::{Design, DesignElement};
use crate::theory::pitch;

/// Every element wound and traced on its own: its coils follow the previous element's.
pub(crate) struct Wound {
    /// Per element, its pitches, reentrancy and path counts (paths filled in when cut).
    pub elements: Vec<WindingElement>,
    /// Every coil position of every element, in coil order.
    pub connections: Vec<Connection>,
    /// The closed windings of every element.
    pub closed_windings: Vec<ClosedWinding>,
}

/// Winds each element of `d` (the first takes the `dummy_coils`) and traces its closed windings.
pub(crate) fn wind_elements(d: &Design, dummy_coils: &[u32]) -> Wound {
    let n = d.coil_positions();
    let p = d.pole_pairs();
    let c = d.segments;
    let mut out = Wound {
        elements: Vec::new(),
        connections: Vec::new(),
        closed_windings: Vec::new(),
    };
    let specs = d.elements();
    let yc_of = |e: &DesignElement| {
        e.spec
            .kind
            .kind()
            .commutator_pitch(c, e.spec.multiplicity, p, e.spec.direction)
    };
    for (k, e) in specs.iter().enumerate() {
        let yc = yc_of(e);
        let pitches = pitch::pitches(e.spec.kind, e.span, d.coils_per_slot, yc);
        let shift = element_start_shift(d, &specs[0], yc_of(&specs[0]), e, yc, c);
        let dummies: &[u32] = if k == 0 { dummy_coils } else { &[] };
        let first = k as u32 * n + 1;
        let mut conns = connect(d, e, first, c, yc, shift, dummies);
        front::set_front_pitches(&mut conns, c, e.spec.kind.kind(), pitches.back, yc);
        let cycles = trace::trace_closed_windings(&conns, c);
        out.elements.push(WindingElement {
            kind: e.spec.kind,
            multiplicity: e.spec.multiplicity,
            direction: e.spec.direction,
            pitches,
            turns: e.turns,
            first_coil: first,
            coils: n,
            start_shift: shift as u32,
            reentrancy: cycles.len() as u32,
            reentrancy_formula: pitch::reentrancy(c, yc),
            paths: 0,
            paths_formula: e
                .spec
                .kind
                .kind()
                .parallel_paths(e.spec.multiplicity, d.poles),
            path_classes: super::PathClasses::default(),
        });
        out.connections.extend(conns);
        out.closed_windings.extend(cycles);
    }
    out
}

/// Spreads `count` dummy coils evenly: positions ⌊k·N/d⌋ for k = 1…d (the last is coil N).
/// The placement a design gets when it does not name its dummy coils.
pub fn place_dummies(n: u32, count: u32) -> Vec<u32> {
    (1..=count)
        .map(|k| (u64::from(k) * u64::from(n) / u64::from(count)) as u32)
        .collect()
}

/// Bars from segment 1 to the start lead of element `e`'s first coil, so that it is
/// commutated under the same brushes as the first element `e0`, on the same neutral and with
/// the same polarity: a coil is commutated with the brush at the midpoint of its bars, and the
/// u coils of a slot share a centre line, so the element's midpoints sit where the first
/// element's do, moved by half the span difference. In half bars,
/// 2·shift = (y_c0 − y_c) + (y_s − y_s0)·u, taken modulo the whole commutator (2C half bars),
/// not modulo two pole pitches: each coil's leads then sit symmetrically about its own centre
/// line, as on a plain wave winding and as a rewinder records them (placed two pole pitches
/// away, they are equivalent only when the slots per pole pair are whole); rounded down to a
/// whole bar [derived]. For a frog-leg winding the lap coil in one slot and the wave coil one
/// pole pitch on then join, in series, bars two pole pitches apart with opposite EMFs
/// (docs/domain.md, "Frog-leg windings").
fn element_start_shift(
    d: &Design,
    e0: &DesignElement,
    yc0: i64,
    e: &DesignElement,
    yc: i64,
    c: u32,
) -> i64 {
    let u = i64::from(d.coils_per_slot);
    let halves = (yc0 - yc) + (i64::from(e.span) - i64::from(e0.span)) * u;
    halves.rem_euclid(2 * i64::from(c)).div_euclid(2)
}

/// Connects element `e`'s coils (coil numbers `first`…, one per coil position) to the
/// segments: the i-th active coil starts on segment i + 1 + `shift` and ends y_c on.
fn connect(
    d: &Design,
    e: &DesignElement,
    first: u32,
    c: u32,
    yc: i64,
    shift: i64,
    dummies: &[u32],
) -> Vec<Connection> {
    let u = d.coils_per_slot;
    let n = d.coil_positions();
    let offset = first - 1;
    let mut next_active = 0i64;
    (1..=n)
        .map(|coil| {
            let slot = (coil - 1) / u + 1;
            let position = (coil - 1) % u + 1;
            let bottom_slot = (slot - 1 + e.span) % d.slots + 1;
            let bottom_side = 2 * ((coil - 1 + u * e.span) % n + 1 + offset);
            let dummy = dummies.binary_search(&coil).is_ok();
            let (start, end) = if dummy {
                (None, None)
            } else {
                let i = next_active + shift;
                next_active += 1;
                (
                    Some(i.rem_euclid(i64::from(c)) as u32 + 1),
                    Some((i + yc).rem_euclid(i64::from(c)) as u32 + 1),
                )
            };
            Connection {
                coil: coil + offset,
                top: SlotPlace {
                    slot,
                    position,
                    side: 2 * (coil + offset) - 1,
                },
                bottom: SlotPlace {
                    slot: bottom_slot,
                    position,
                    side: bottom_side,
                },
                start_segment: start,
                end_segment: end,
                front_pitch: None,
                dummy,
                element: e.spec.kind,
            }
        })
        .collect()
}
