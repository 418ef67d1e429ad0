//! The simulated balance of the paths: the rotor turned through one whole period and the
//! spread between the path EMFs measured at each step.
//!
//! Part of the `winding` stage; the symmetry checks read its [`PathBalance`].

use super::geometry::{Geometry, SAMPLES_PER_SEGMENT};
use super::paths::{self, BrushSpot};
use super::{ClosedWinding, PathBalance};
use crate::design::Design;
use crate::theory::pitch;

/// Mean spread between path EMFs, in coil EMFs, above which the paths count as unbalanced.
pub const BALANCE_TOLERANCE: f64 = 0.5;

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
pub(crate) fn simulate_balance(
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

/// The balance of a winding whose paths are proven congruent by rigid rotations: no spread at
/// any of the [`simulate_balance`] steps.
pub(crate) fn unsimulated(d: &Design) -> PathBalance {
    let period = balance_period_segments(d.coils_per_slot, d.multiplicity);
    PathBalance {
        samples: (SAMPLES_PER_SEGMENT * i64::from(period)) as u32,
        mean_spread_coils: 0.0,
        peak_spread_coils: 0.0,
        balanced: true,
    }
}
