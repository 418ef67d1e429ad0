//! Armature resistance at 20 °C and at the thermal class's reference temperature.
//!
//! Part of the `rating` stage: pure arithmetic.

use crate::design::ThermalClass;

/// Resistivity of annealed copper at 20 °C, Ω·mm²/m: 1/58 = 0.017241.
///
/// [src: IEC 60028, International standard of resistance for copper (IACS): 1/58 Ω·mm²/m,
/// i.e. 17.241 Ω per km for 1 mm² at 20 °C.]
pub const COPPER_RHO_20: f64 = 1.0 / 58.0;

/// Temperature coefficient of annealed copper at 20 °C, per K.
///
/// [src: IEC 60028: α20 = 0.00393 /K.]
pub const COPPER_ALPHA_20: f64 = 0.00393;

/// The inferred zero-resistance temperature of annealed copper, °C.
///
/// [src: IEC 60228 / IEEE 118 practice for copper: R_T = R_20·(234.5 + T)/(234.5 + 20).]
pub const COPPER_T0: f64 = 234.5;

/// Resistance of `length_m` of copper with cross-section `area_mm2` at 20 °C, Ω.
pub fn copper_resistance_20(length_m: f64, area_mm2: f64) -> f64 {
    COPPER_RHO_20 * length_m / area_mm2
}

/// Corrects a copper resistance from `from_c` to `to_c` °C: R·(234.5 + to)/(234.5 + from).
pub fn correct_temperature(r: f64, from_c: f64, to_c: f64) -> f64 {
    r * (COPPER_T0 + to_c) / (COPPER_T0 + from_c)
}

/// Reference temperature for losses by thermal class, °C: 105 (A) 75, 120 (E) 90, 130 (B) 95,
/// 155 (F) 115, 180 (H) 135.
///
/// [src: IEC 60034-1, reference temperatures for losses, from memory.]
pub fn reference_temperature_c(class: ThermalClass) -> f64 {
    match class {
        ThermalClass::A => 75.0,
        ThermalClass::E => 90.0,
        ThermalClass::B => 95.0,
        ThermalClass::F => 115.0,
        ThermalClass::H => 135.0,
    }
}

/// Source line for the reference temperatures.
pub const REFERENCE_TEMPERATURE_SOURCE: &str =
    "IEC 60034-1, reference temperatures by thermal class [standard, from memory]";

/// Armature resistance at 20 °C, Ω: R_a = ρ·Z·L_mt/(2·a²·A_c).
///
/// Z/2 turns of length L_mt make the wire; each of the a paths holds 1/a of it, and the a
/// paths are in parallel. `z` conductors, `paths` a, `mean_turn_mm` L_mt, `area_mm2` A_c.
pub fn armature_resistance_20(z: u64, paths: u32, mean_turn_mm: f64, area_mm2: f64) -> f64 {
    let a = f64::from(paths);
    COPPER_RHO_20 * z as f64 * (mean_turn_mm / 1000.0) / (2.0 * a * a * area_mm2)
}

/// Armature resistance at 20 °C of several winding elements on one commutator (a frog-leg's
/// lap and wave elements), Ω: each element `(z, a)` is R_e = ρ·Z_e·L_mt/(2·a_e²·A_c) between
/// the brushes, and the elements are in parallel there, so 1/R_a = Σ 1/R_e [derived: the
/// elements meet only at the bars, and the brushes tie each polarity's bars]. With equal turns
/// this is [`armature_resistance_20`] with the total Z and a.
pub fn elements_resistance_20(elements: &[(u64, u32)], mean_turn_mm: f64, area_mm2: f64) -> f64 {
    let g: f64 = elements
        .iter()
        .map(|&(z, a)| 1.0 / armature_resistance_20(z, a, mean_turn_mm, area_mm2))
        .sum();
    1.0 / g
}

/// The armature resistance, cold and hot.
#[derive(Clone, Debug, PartialEq)]
pub struct Resistance {
    /// At 20 °C, Ω.
    pub r20_ohm: f64,
    /// The reference temperature, °C (20 when no thermal class is given).
    pub reference_c: f64,
    /// At the reference temperature, Ω.
    pub hot_ohm: f64,
    /// True when the hot value came from a thermal class.
    pub from_class: bool,
    /// True when the 20 °C value is a measurement (`rewind --ra`), not a calculation.
    pub measured: bool,
    /// Winding elements in parallel behind the calculated value (2 for frog-leg, else 1).
    pub elements: u32,
}

impl Resistance {
    /// Builds both values from a 20 °C resistance and an optional class.
    pub fn new(r20_ohm: f64, class: Option<ThermalClass>, measured: bool) -> Resistance {
        let reference_c = class.map_or(20.0, reference_temperature_c);
        Resistance {
            r20_ohm,
            reference_c,
            hot_ohm: correct_temperature(r20_ohm, 20.0, reference_c),
            from_class: class.is_some(),
            measured,
            elements: 1,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn alpha_matches_the_inferred_zero() {
        // 1/(234.5 + 20) = 0.003929 /K, the IEC 60028 α20 of 0.00393 to its published places.
        assert!((1.0 / (COPPER_T0 + 20.0) - COPPER_ALPHA_20).abs() < 5e-6);
    }

    #[test]
    fn equal_elements_in_parallel_halve() {
        // Two equal elements of Z = 200, a = 2 in parallel: half of one, which is the total
        // Z = 400, a = 4 in the one-element formula.
        let one = armature_resistance_20(200, 2, 500.0, 1.0);
        let two = elements_resistance_20(&[(200, 2), (200, 2)], 500.0, 1.0);
        assert!((two - one / 2.0).abs() < 1e-15);
        assert!((two - armature_resistance_20(400, 4, 500.0, 1.0)).abs() < 1e-15);
    }

    #[test]
    fn simple_lap_resistance() {
        // Z = 200, a = 2, L_mt = 500 mm, A = 1 mm²: wire 50 m, 25 m per path, 2 in parallel.
        let r = armature_resistance_20(200, 2, 500.0, 1.0);
        assert!((r - COPPER_RHO_20 * 25.0 / 2.0).abs() < 1e-12);
    }
}
