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
//!   θ_i its slot's angle from slot 1 and δ = 360/C (see `neutral_shift_units`). For
//!   u = 1 without dummies the mean is 0; for u coils a slot it is (u − 1)/2 bars.
//!   A positive offset (half bars allowed) swings every lead that many segments towards rising
//!   segment numbers; the brushes follow, so they sit on the pole axes shifted by
//!   lead_offset·360/C degrees and stay on electrical neutral.

mod front;
mod geometry;
mod model;
mod paths;
mod symmetry;
mod trace;

#[cfg(test)]
mod tests;

pub use crate::theory::pitch::Pitches;
pub use model::*;
pub use symmetry::rotation_segment_shift;

use crate::design::{BrushWidth, Design, EqualizerChoice, Mode};
use crate::theory::{emf, pitch};
use geometry::{Geometry, SAMPLES_PER_SEGMENT};
use paths::BrushSpot;

/// Mean spread between path EMFs, in coil EMFs, above which the paths count as unbalanced.
pub const BALANCE_TOLERANCE: f64 = 0.5;

/// Winds and traces `design`. The design stage has resolved and validated the segment count,
/// so every `Design` can be wound.
pub fn trace_winding(design: &Design) -> Winding {
    let d = design;
    let n = d.coil_positions();
    let m = d.multiplicity;
    let p = d.pole_pairs();
    let c = d.segments;
    let kind = d.winding_type.kind();
    let dummy_coils = d
        .dummy_coils
        .clone()
        .unwrap_or_else(|| place_dummies(n, n - c));
    // Each element is wound and traced on its own: its coils follow the previous element's.
    let mut connections = Vec::new();
    let mut closed_windings = Vec::new();
    let mut elements = Vec::new();
    let specs = d.elements();
    let yc_of = |e: &crate::design::DesignElement| {
        pitch::commutator_pitch(e.spec.kind, e.spec.direction, c, e.spec.multiplicity, p)
    };
    for (k, e) in specs.iter().enumerate() {
        let yc = yc_of(e);
        let pitches = pitch::pitches(e.spec.kind, e.span, d.coils_per_slot, yc);
        let shift = element_start_shift(d, &specs[0], yc_of(&specs[0]), e, yc, c);
        let dummies: &[u32] = if k == 0 { &dummy_coils } else { &[] };
        let first = k as u32 * n + 1;
        let mut conns = connect(d, e, first, c, yc, shift, dummies);
        front::set_front_pitches(&mut conns, c, e.spec.kind.kind(), pitches.back, yc);
        let cycles = trace::trace_closed_windings(&conns, c);
        elements.push(WindingElement {
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
        });
        connections.extend(conns);
        closed_windings.extend(cycles);
    }
    let pitches = elements[0].pitches;
    let yc = pitches.commutator;
    let geo = Geometry::new(d, c);

    // Brushes, one per pole at adjacent poles (`brush_sets` of them, default P), at the
    // reference position, on neutral for the slot's coil group.
    let units = geo.per_segment_units;
    let neutral = yc * units / 2 + neutral_shift_units(d, &connections[..n as usize], c, units);
    let spots: Vec<BrushSpot> = (0..d.brush_sets() as usize)
        .map(|k| BrushSpot {
            pole: k,
            centre: neutral + k as i64 * 16 * i64::from(c),
        })
        .collect();
    let emf0: Vec<i64> = (1..=connections.len() as u32)
        .map(|coil| geo.coil_emf(coil, 0))
        .collect();
    let width = brush_width(d, c, units);
    let mark = paths::contacts_units(&spots, c, width.units, units, 0);
    let runs = paths::runs(&closed_windings, &mark, &emf0);
    let sign0 = paths::first_brush_sign(&runs, &spots);
    let brushes = spots
        .iter()
        .map(|s| make_brush(d, s, sign0, c, units, &mark, width.width.segments))
        .collect::<Vec<_>>();

    let current_sign = match d.mode {
        Mode::Generator => 1,
        Mode::Motor => -1,
    };
    let mut path_list = Vec::new();
    let mut shorted = Vec::new();
    let all = connections.len();
    let mut coil_current = vec![0i8; all];
    let mut coil_path = vec![0u32; all];
    for r in &runs {
        if paths::is_path(r, &spots) {
            let to_positive = (if spots[r.to].pole.is_multiple_of(2) {
                sign0
            } else {
                -sign0
            }) > 0;
            let current = if to_positive {
                current_sign
            } else {
                -current_sign
            } as i8;
            let index = path_list.len() as u32 + 1;
            if let Some(e) = elements.iter_mut().find(|e| e.holds(r.coils[0])) {
                e.paths += 1;
            }
            for &coil in &r.coils {
                coil_current[(coil - 1) as usize] = current;
                coil_path[(coil - 1) as usize] = index;
            }
            path_list.push(ParallelPath {
                index,
                from_brush: r.from as u32 + 1,
                to_brush: r.to as u32 + 1,
                coils: r.coils.clone(),
                current,
                emf_units: if to_positive { r.emf } else { -r.emf },
            });
        } else {
            shorted.extend_from_slice(&r.coils);
        }
    }
    shorted.sort_unstable();

    let equalizers = plan_equalizers(d, c, &connections);
    let balance = simulate_balance(d, &geo, &closed_windings, &spots, c, all as u32);
    let paths_formula = kind.parallel_paths(m, d.poles);
    let reentrancy_formula = elements.iter().map(|e| e.reentrancy_formula).sum();
    let conductors = elements
        .iter()
        .map(|e| 2 * u64::from(c) * u64::from(e.turns))
        .sum();
    let a = path_list.len() as u32;
    let constants = machine_constants(d, conductors, a);
    // Segment 1's centre in ticks: the brush centre (`neutral` units on from segment 1) sits
    // on pole 1's axis, shifted by the lead offset; one unit is N ticks.
    let tick_n = i64::from(n);
    let segment1 = geo.pole1 - neutral * tick_n + i64::from(d.lead_offset.0) * units / 2 * tick_n;
    let segment1_deg = geo.degrees(segment1).rem_euclid(360.0);
    let per_bar = units * tick_n;
    let in_line = (-segment1).rem_euclid(geo.turn);
    let lead_swing = LeadSwing {
        in_line_segment: in_line as f64 / per_bar as f64 + 1.0,
        in_line_half_bars: ((2 * in_line + per_bar / 2).div_euclid(per_bar))
            .rem_euclid(2 * i64::from(c)) as u32,
        from_pole_axis_bars: d.lead_offset.bars(),
        from_pole_axis_deg: d.lead_offset.bars() * 360.0 / f64::from(c),
    };

    Winding {
        coils: n,
        active_coils: c,
        dummy_coils,
        segments_derived: d.segments_derived,
        conductors,
        pitches,
        elements,
        connections,
        closed_windings,
        brushes,
        brush_sets_minimum: kind.fewest_brush_sets(d.poles),
        brush_width: width.width,
        paths: path_list,
        shorted_coils: shorted,
        coil_current,
        coil_path,
        coil_emf: emf0,
        paths_formula,
        reentrancy_formula,
        equalizers,
        balance,
        pole_axes_deg: (0..d.poles)
            .map(|k| geo.degrees(geo.pole1 + i64::from(k) * geo.pole_pitch))
            .collect(),
        segment1_deg,
        lead_swing,
        constants,
    }
}

/// The brush's shift from a coil's lead midpoint that centres the commutation zone of a
/// slot's coil group on the pole axis, in units of 1/`units` of a segment pitch, rounded to
/// the nearest unit.
///
/// Active coil i (0-based, in position order) starts on segment i + 1 and is commutated when
/// the brush is at i + y_c/2; its centre line is then θ_i/δ bars from the brush line, θ_i
/// being its slot's angle from slot 1's and δ the bar pitch. Placing the brush at
/// y_c/2 + mean(i − θ_i/δ) makes the mean offset zero. θ_i/δ = slot_i·C/S, so the shift is
/// Σ(i·S − slot_i·C)/(C·S) bars [derived; DOMAIN.md "Brush neutral with several coils per
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
/// 2·shift = (y_c0 − y_c) + (y_s − y_s0)·u, taken modulo two pole pitches C/p (the field and
/// the brushes repeat every pole pair) and rounded down to a whole bar [derived]. For a
/// frog-leg winding the lap coil in one slot and the wave coil one pole pitch on then join, in
/// series, bars two pole pitches apart with opposite EMFs (DOMAIN.md "Frog-leg windings").
fn element_start_shift(
    d: &Design,
    e0: &crate::design::DesignElement,
    yc0: i64,
    e: &crate::design::DesignElement,
    yc: i64,
    c: u32,
) -> i64 {
    let u = i64::from(d.coils_per_slot);
    let halves = (yc0 - yc) + (i64::from(e.span) - i64::from(e0.span)) * u;
    let pair = 2 * i64::from(c) / i64::from(d.pole_pairs().max(1));
    halves.rem_euclid(pair.max(1)).div_euclid(2)
}

/// Connects element `e`'s coils (coil numbers `first`…, one per coil position) to the
/// segments: the i-th active coil starts on segment i + 1 + `shift` and ends y_c on.
fn connect(
    d: &Design,
    e: &crate::design::DesignElement,
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

/// Segment pitches the balance simulation turns the rotor through: lcm(u, m), one slot pitch
/// (u bars) at least and a whole number of brush widths (m bars). With u > 1 the u coils of a
/// slot share one centre line, so the pattern of coils under the poles repeats only after a
/// slot pitch; m bars alone miss part of it \[derived\].
pub fn balance_period_segments(coils_per_slot: u32, multiplicity: u32) -> u32 {
    let (u, m) = (
        u64::from(coils_per_slot.max(1)),
        u64::from(multiplicity.max(1)),
    );
    (u / pitch::gcd(u, m) * m) as u32
}

/// Turns the rotor through one whole period, [`balance_period_segments`] segment pitches in 8
/// steps each, and measures, at each step, how far apart the path EMFs are (max − min, in coil
/// EMFs: one coil fully under the poles is 2 conductor units). All P brush sets are fitted, as
/// a shop would.
fn simulate_balance(
    d: &Design,
    geo: &Geometry,
    cycles: &[ClosedWinding],
    spots: &[BrushSpot],
    c: u32,
    n: u32,
) -> PathBalance {
    let period = balance_period_segments(d.coils_per_slot, d.multiplicity);
    let steps = SAMPLES_PER_SEGMENT * i64::from(period);
    let step_units = geo.per_segment_units / SAMPLES_PER_SEGMENT;
    let u = d.coils_per_slot;
    let mut emf = vec![0i64; n as usize];
    let (mut total, mut peak) = (0i64, 0i64);
    for k in 0..steps {
        // The u coils of a slot share their sides' places, so one EMF serves the slot.
        for (slot, group) in emf.chunks_mut(u as usize).enumerate() {
            let e = geo.coil_emf(slot as u32 * u + 1, k * geo.sample_step);
            group.fill(e);
        }
        let mark = paths::contacts(
            spots,
            c,
            d.multiplicity,
            geo.per_segment_units,
            k * step_units,
        );
        let sizes = paths::run_emfs(cycles, &mark, &emf)
            .into_iter()
            .filter(|&(from, to, _)| spots[from].pole % 2 != spots[to].pole % 2)
            .map(|(_, _, e)| e.abs());
        let (lo, hi) = sizes.fold((i64::MAX, 0), |(lo, hi), e| (lo.min(e), hi.max(e)));
        let spread = if lo == i64::MAX { 0 } else { hi - lo };
        total += spread;
        peak = peak.max(spread);
    }
    let mean = total as f64 / steps as f64 / 2.0;
    PathBalance {
        samples: steps as u32,
        mean_spread_coils: mean,
        peak_spread_coils: peak as f64 / 2.0,
        balanced: mean <= BALANCE_TOLERANCE,
    }
}

/// Type-A equalizers: points two pole pitches (2C/P segments) apart, p points each.
///
/// The joined points are at one potential when the rotation by one pole pair (S/p slots) maps
/// the winding onto itself and carries each joined segment onto the next: the field and the
/// brushes repeat every pole pair, so the rotated winding is the same network under the same
/// field, and segment s stands where segment s + 2C/P stood [derived]. A multiply re-entrant
/// lap qualifies too: the rotation may carry one closed winding onto another.
fn plan_equalizers(d: &Design, c: u32, connections: &[Connection]) -> EqualizerPlan {
    if !d.winding_type.kind().takes_equalizers() {
        return EqualizerPlan::NotNeeded;
    }
    let p = d.pole_pairs();
    if p < 2 {
        return EqualizerPlan::Impossible(
            "a 2-pole lap winding has a single pole pair: there are no points two pole pitches apart to join".into(),
        );
    }
    if !c.is_multiple_of(p) {
        return EqualizerPlan::Impossible(format!(
            "the equalizer pitch 2C/P = {}/{} is not a whole number of segments",
            2 * c,
            d.poles
        ));
    }
    if !d.slots.is_multiple_of(p) {
        return EqualizerPlan::Impossible(format!(
            "slots per pole pair S/p = {}/{p} is not whole, so points two pole pitches apart are not at one potential",
            d.slots
        ));
    }
    let pitch = c / p;
    let pair_slots = d.slots / p;
    match rotation_segment_shift(connections, d.coils_per_slot, c, pair_slots) {
        Some(j) if j == pitch => {}
        Some(j) => {
            return EqualizerPlan::Impossible(format!(
                "turning the armature one pole pair ({pair_slots} slots) carries each segment {j} segments on, not the equalizer pitch {pitch}, so points {pitch} segments apart are not at one potential"
            ));
        }
        None => {
            return EqualizerPlan::Impossible(format!(
                "turning the armature one pole pair ({pair_slots} slots) does not map the winding onto itself (a connection or a dummy coil does not repeat), so points two pole pitches apart are not at one potential"
            ));
        }
    }
    let step = match d.equalizers {
        EqualizerChoice::None => 0,
        EqualizerChoice::Full => 1,
        EqualizerChoice::EveryNth(k) => k,
    };
    let groups = if step == 0 {
        Vec::new()
    } else {
        (1..=pitch)
            .step_by(step as usize)
            .map(|s| (0..p).map(|j| s + j * pitch).collect())
            .collect()
    };
    EqualizerPlan::Possible(Equalizers {
        pitch,
        possible: pitch,
        groups,
    })
}

/// K = P·Z/(2π·a); with Φ, K·Φ (V per rad/s = N·m per A); with a speed, E = K·Φ·ω.
/// [src: Chapman, *Electric Machinery Fundamentals*, DC machine chapters; E = PZΦN/(60a).]
fn machine_constants(d: &Design, z: u64, a: u32) -> Constants {
    let k = emf::machine_constant(d.poles, z, a);
    let kphi = d.flux_per_pole_mwb.map(|f| k * f / 1000.0);
    Constants {
        machine_constant: k,
        emf_constant_v_per_rad_s: kphi,
        emf_v_per_1000_rpm: kphi.map(emf::v_per_1000_rpm),
        torque_constant_nm_per_a: kphi,
        emf_v: kphi
            .zip(d.speed_rpm)
            .map(|(x, n)| x * n * emf::RAD_S_PER_RPM),
    }
}
