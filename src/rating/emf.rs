//! Brush drop, induced EMF, the flux or speed that goes with it, and the machine constants.
//!
//! Part of the `rating` stage: pure arithmetic. E = P·Z·Φ·N/(60·a) [src: any DC machine text,
//! e.g. Chapman, *Electric Machinery Fundamentals*, DC machine chapters].

use crate::design::{BrushGrade, Mode};

/// Conventional brush contact drop for the whole machine (both polarities), V: 2.0 for carbon
/// or electrographite (1.0 per brush), 0.6 for metal-graphite (0.3 per brush).
///
/// [src: IEC 60034-2-1 conventional values, from memory.]
pub fn brush_drop_v(grade: BrushGrade) -> f64 {
    match grade {
        BrushGrade::Carbon => 2.0,
        BrushGrade::MetalGraphite => 0.6,
    }
}

/// Source line for the brush drop.
pub const BRUSH_DROP_SOURCE: &str = "IEC 60034-2-1 conventional brush drop [standard, from memory]";

/// Induced EMF from the terminal voltage, V. Motor: E = V − I·R_a − V_b. Generator:
/// E = V + I·R_a + V_b.
pub fn induced_emf(mode: Mode, volts: f64, ir_drop: f64, brush_drop: f64) -> f64 {
    match mode {
        Mode::Motor => volts - ir_drop - brush_drop,
        Mode::Generator => volts + ir_drop + brush_drop,
    }
}

pub use crate::theory::emf::{emf_v, flux_for, machine_constant, speed_for, v_per_1000_rpm};

/// Where the EMF came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum EmfBasis {
    /// From `[rating] voltage` with the resistive and brush drops.
    Terminal,
    /// From the flux and the speed (no voltage given).
    FluxAndSpeed,
}

/// The induced EMF and what follows from it.
#[derive(Clone, Debug, PartialEq)]
pub struct Emf {
    /// Motor or generator.
    pub mode: Mode,
    /// How E was found.
    pub basis: EmfBasis,
    /// Terminal voltage, V, when given.
    pub terminal_v: Option<f64>,
    /// I·R_a at the reference temperature, V (0 when unknown).
    pub ir_drop_v: f64,
    /// Whether I·R_a could be worked out (current and resistance known).
    pub ir_known: bool,
    /// Brush contact drop, V (0 without a current).
    pub brush_drop_v: f64,
    /// Brush grade used for the drop.
    pub brush_grade: BrushGrade,
    /// E, V.
    pub emf_v: f64,
    /// Φ needed at the rated speed, mWb (when a speed is given).
    pub flux_needed_mwb: Option<f64>,
    /// Speed at the given flux, rpm (when a flux is given).
    pub speed_at_flux_rpm: Option<f64>,
    /// K·Φ, V·s/rad = N·m/A, at the given flux or else the flux needed.
    pub k_phi: Option<f64>,
    /// K·Φ in V per 1000 rpm.
    pub v_per_1000_rpm: Option<f64>,
    /// Rated torque K·Φ·I, N·m (when a current is given).
    pub torque_nm: Option<f64>,
    /// The speed the other quantities assume: rated, or else the speed at the given flux.
    pub speed_rpm: Option<f64>,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn flux_and_speed_invert_emf() {
        let e = emf_v(4, 500, 2, 0.02, 1500.0);
        assert!((flux_for(4, 500, 2, e, 1500.0) - 0.02).abs() < 1e-15);
        assert!((speed_for(4, 500, 2, e, 0.02) - 1500.0).abs() < 1e-9);
    }

    #[test]
    fn drops_take_the_mode_sign() {
        assert_eq!(induced_emf(Mode::Motor, 230.0, 10.0, 2.0), 218.0);
        assert_eq!(induced_emf(Mode::Generator, 230.0, 10.0, 2.0), 242.0);
    }
}
