//! The machine constants of the traced winding: K = P·Z/(2π·a) with the traced paths, and
//! with a flux and speed K·Φ, the EMF and torque constants.
//!
//! Part of the `winding` stage: computed once here; the rating and the reports read them.

use super::Constants;
use crate::design::Design;
use crate::theory::emf;

/// K = P·Z/(2π·a); with Φ, K·Φ (V per rad/s = N·m per A); with a speed, E = K·Φ·ω.
/// [src: Chapman, *Electric Machinery Fundamentals*, DC machine chapters; E = PZΦN/(60a).]
pub(crate) fn machine_constants(d: &Design, z: u64, a: u32) -> Constants {
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
