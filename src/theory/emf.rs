//! EMF and torque constants: K = P·Z/(2π·a), E = K·Φ·ω = P·Z·Φ·N/(60·a), T = K·Φ·I_a.
//!
//! Part of the `theory` stage: pure arithmetic, used by the engine's constants and the rating
//! [src: any DC machine text, e.g. Chapman, *Electric Machinery Fundamentals*, DC machine
//! chapters].

use std::f64::consts::PI;

/// Machine constant K = P·Z/(2π·a); K·Φ is both V per rad/s and N·m per A. Zero when a = 0.
pub fn machine_constant(poles: u32, z: u64, paths: u32) -> f64 {
    if paths == 0 {
        return 0.0;
    }
    f64::from(poles) * z as f64 / (2.0 * PI * f64::from(paths))
}

/// E = P·Z·Φ·N/(60·a), V, with Φ in Wb and N in rpm.
pub fn emf_v(poles: u32, z: u64, paths: u32, flux_wb: f64, speed_rpm: f64) -> f64 {
    f64::from(poles) * z as f64 * flux_wb * speed_rpm / (60.0 * f64::from(paths))
}

/// The flux per pole that gives `emf` at `speed_rpm`, Wb: Φ = 60·a·E/(P·Z·N).
pub fn flux_for(poles: u32, z: u64, paths: u32, emf: f64, speed_rpm: f64) -> f64 {
    60.0 * f64::from(paths) * emf / (f64::from(poles) * z as f64 * speed_rpm)
}

/// The speed at which `flux_wb` gives `emf`, rpm: N = 60·a·E/(P·Z·Φ).
pub fn speed_for(poles: u32, z: u64, paths: u32, emf: f64, flux_wb: f64) -> f64 {
    60.0 * f64::from(paths) * emf / (f64::from(poles) * z as f64 * flux_wb)
}

/// rad/s per rpm: ω = 2π·N/60.
pub const RAD_S_PER_RPM: f64 = 2.0 * PI / 60.0;

/// K·Φ (V per rad/s) as volts per 1000 rpm.
pub fn v_per_1000_rpm(k_phi: f64) -> f64 {
    k_phi * 1000.0 * RAD_S_PER_RPM
}

/// The share of a pole's flux a coil of span `span_pole_pitches` (its sides' distance in pole
/// pitches, reduced to 0…2) links at most, under a flat-topped field over `pole_arc` of each
/// pole pitch: centred on a pole axis it takes in min(y, ψ) of its own pole's arc and, once
/// y > 2 − ψ, reaches y − (2 − ψ) into the two neighbours' arcs of the other polarity, so
/// k = (min(y, ψ) − max(0, y − 2 + ψ))/ψ, 0 to 1 [derived; docs/domain.md, "Coil span limits"].
/// A commutated coil's mean EMF is proportional to the flux it links at most, so E = k·K·Φ·ω.
pub fn flux_linkage(span_pole_pitches: f64, pole_arc: f64) -> f64 {
    let y = span_pole_pitches.rem_euclid(2.0);
    let psi = pole_arc.clamp(1e-9, 1.0);
    ((y.min(psi) - (y - 2.0 + psi).max(0.0)) / psi).clamp(0.0, 1.0)
}
