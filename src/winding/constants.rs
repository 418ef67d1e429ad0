//! The machine constants of the traced winding: K = P·Z/(2π·a) with the traced paths, and
//! with a flux and speed K·Φ, the EMF and torque constants.
//!
//! Part of the `winding` stage: computed once here; the rating and the reports read them.

use super::{Connection, Constants};
use crate::design::Design;
use crate::theory::emf;

/// K = P·Z/(2π·a); with Φ, K·Φ (V per rad/s = N·m per A); with a speed, E = K·Φ·ω.
/// [src: Chapman, *Electric Machinery Fundamentals*, DC machine chapters; E = PZΦN/(60a).]
/// The flux is the share the traced coils link (`linkage`, see [`flux_linkage_of`]): a coil
/// whose span falls short of the pole arc, or reaches into the next poles, links less.
pub(crate) fn machine_constants(d: &Design, z: u64, a: u32, linkage: f64) -> Constants {
    let k = emf::machine_constant(d.poles, z, a);
    let kphi = d.flux_per_pole_mwb.map(|f| k * linkage * f / 1000.0);
    Constants {
        machine_constant: k,
        flux_linkage: linkage,
        emf_constant_v_per_rad_s: kphi,
        emf_v_per_1000_rpm: kphi.map(emf::v_per_1000_rpm),
        torque_constant_nm_per_a: kphi,
        emf_v: kphi
            .zip(d.speed_rpm)
            .map(|(x, n)| x * n * emf::RAD_S_PER_RPM),
    }
}

/// The share of the pole flux the first element's coil 1 links at most, read off its traced
/// slots: the angle between its sides in pole pitches, under the design's pole arc.
pub(crate) fn flux_linkage_of(d: &Design, first: &Connection) -> f64 {
    let slots = (first.bottom.slot + d.slots - first.top.slot) % d.slots;
    let pole_pitches = f64::from(slots) * f64::from(d.poles) / f64::from(d.slots);
    emf::flux_linkage(pole_pitches, d.pole_arc)
}
