//! The average reactance voltage of a coil under commutation, and whether interpoles are needed.
//!
//! Part of the `rating` stage: pure arithmetic on plain numbers, no trace, so a search can call
//! [`average_reactance_voltage`] once a candidate cheaply. The method is the specific-permeance
//! method of the design textbooks
//! [docs/domain.md, "Reactance voltage of the coil under commutation"]:
//!
//! - the coil's inductance from the permeance per metre of its slot, its tooth tips and its end
//!   winding: L = 2·μ0·T_c²·(u·(λ_s + λ_t)·L_core + λ_o·L_o), where λ are the specific
//!   permeances (dimensionless, times μ0 per metre), u the coils per slot (the coil sides of one
//!   layer of a slot commutate together and link each other's slot flux), L_core the core
//!   length and L_o the end-winding length of one coil side;
//! - the current in the coil reverses from +I_z to −I_z (I_z the path current) in the
//!   commutation time t_c = (b_b − (m − 1)·τ_c − δ)/v_c, the brush width b_b less the bars the
//!   coil's ends are apart (m − 1 for multiplicity m) and one mica δ, over the commutator's
//!   peripheral speed v_c;
//! - E_r(av) = L·2·I_z/t_c.
//!
//! [src: A. K. Sawhney, A Course in Electrical Machine Design, the DC-machine commutation
//! chapter; M. G. Say and E. O. Taylor, Direct Current Machines; from memory, not read] for the
//! method and the 2·I_z/t_c reversal; the commutation time with the multiplicity and the mica,
//! and the u factor, are derived.

use std::f64::consts::PI;

/// μ0, H/m.
pub const MU0: f64 = 4.0e-7 * PI;

/// Specific permeance of the tooth tips (dimensionless, times μ0 per metre of core), used with
/// or without slot dimensions [from memory: about 0.5 for the open slots of DC armatures].
pub const TOOTH_TIP_PERMEANCE: f64 = 0.5;

/// Specific permeance of the end winding per metre of one side's overhang [from memory: about
/// 0.6, that is about 0.8 lines per ampere per cm in the older texts' units].
pub const OVERHANG_PERMEANCE: f64 = 0.6;

/// The slot depth over width taken when the design gives no slot dimensions [common practice,
/// from memory: DC armature slots are 3 to 5 times as deep as they are wide].
pub const DEFAULT_SLOT_DEPTH_RATIO: f64 = 4.0;

/// Mica between segments, mm, taken for the commutation time [common practice: 0.8 mm, the
/// mica of the 4 mm minimum segment pitch].
pub const MICA_MM: f64 = 0.8;

/// Specific permeance of an open rectangular slot filled with conductor to its depth:
/// λ_s = h/(3·b) [textbook slot-leakage result, from memory; the wedge and lip are left out].
pub fn slot_permeance(depth_mm: f64, width_mm: f64) -> f64 {
    depth_mm / (3.0 * width_mm)
}

/// Specific permeance of the slot when the design gives no dimensions: a slot
/// [`DEFAULT_SLOT_DEPTH_RATIO`] times as deep as it is wide.
pub fn default_slot_permeance() -> f64 {
    DEFAULT_SLOT_DEPTH_RATIO / 3.0
}

/// What the reactance voltage is worked out from: plain numbers, SI-ish units as named.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ReactanceInputs {
    /// Turns per coil T_c.
    pub turns_per_coil: f64,
    /// Coils per slot u (coil sides per layer).
    pub coils_per_slot: f64,
    /// Core length L_core, mm.
    pub core_length_mm: f64,
    /// End-winding length of one coil side L_o, mm (half the mean turn less the core length).
    pub overhang_mm: f64,
    /// Specific permeance of the slot λ_s.
    pub slot_permeance: f64,
    /// Specific permeance of the tooth tips λ_t.
    pub tooth_tip_permeance: f64,
    /// Specific permeance of the end winding λ_o.
    pub overhang_permeance: f64,
    /// Current per path I_z, A.
    pub path_current_a: f64,
    /// Brush width, in segment pitches.
    pub brush_width_segments: f64,
    /// Segment pitch τ_c, mm.
    pub segment_pitch_mm: f64,
    /// Mica between segments δ, mm.
    pub mica_mm: f64,
    /// Multiplicity m.
    pub multiplicity: f64,
    /// Commutator peripheral speed v_c, m/s.
    pub commutator_speed_m_s: f64,
}

/// The coil's inductance under commutation, H: 2·μ0·T_c²·(u·(λ_s + λ_t)·L_core + λ_o·L_o).
pub fn coil_inductance_h(x: &ReactanceInputs) -> f64 {
    let slot = x.coils_per_slot * (x.slot_permeance + x.tooth_tip_permeance) * x.core_length_mm;
    let ends = x.overhang_permeance * x.overhang_mm;
    2.0 * MU0 * x.turns_per_coil * x.turns_per_coil * (slot + ends) / 1000.0
}

/// The commutation time t_c = (β·τ_c − (m − 1)·τ_c − δ)/v_c, s; `None` when the brush does
/// not bridge the coil's segments (t_c ≤ 0) or the commutator stands still.
pub fn commutation_time_s(x: &ReactanceInputs) -> Option<f64> {
    let bridge_mm =
        (x.brush_width_segments - (x.multiplicity - 1.0)) * x.segment_pitch_mm - x.mica_mm;
    let t = bridge_mm / 1000.0 / x.commutator_speed_m_s;
    (t.is_finite() && t > 0.0).then_some(t)
}

/// The average reactance voltage E_r(av) = L·2·I_z/t_c, V; `None` as for
/// [`commutation_time_s`].
pub fn average_reactance_voltage(x: &ReactanceInputs) -> Option<f64> {
    commutation_time_s(x).map(|t| coil_inductance_h(x) * 2.0 * x.path_current_a / t)
}

/// Whether interpoles are needed: the reactance voltage is above the limit for a machine
/// without them (`[limits] reactance_volts_no_interpoles_max`).
pub fn interpoles_needed(reactance_v: f64, no_interpoles_max_v: f64) -> bool {
    reactance_v > no_interpoles_max_v
}

/// The most turns per coil that keep the reactance voltage within `limit_v`, given the value
/// `now_v` at `turns` turns (E_r grows as T_c²): ⌊T_c·√(limit/now)⌋.
pub fn turns_for(turns: u32, now_v: f64, limit_v: f64) -> u32 {
    if now_v <= 0.0 {
        return turns;
    }
    let t = f64::from(turns) * (limit_v / now_v).sqrt();
    // Tolerance so a value exactly on the limit keeps its count.
    (t + 1e-9).floor().clamp(0.0, f64::from(u32::MAX)) as u32
}

/// The reactance voltage as rated, with the figures it came from.
#[derive(Clone, Debug, PartialEq)]
pub struct Reactance {
    /// The inputs used.
    pub inputs: ReactanceInputs,
    /// True when the slot permeance came from `[core]` slot dimensions, false when the
    /// default slot shape was taken.
    pub slot_given: bool,
    /// The coil's inductance under commutation, H.
    pub inductance_h: f64,
    /// The commutation time, s.
    pub commutation_time_s: f64,
    /// E_r(av), V.
    pub average_v: f64,
    /// Whether the design says interpoles are fitted (`[rating] interpoles`), when it says.
    pub interpoles: Option<bool>,
    /// Whether the value is above the no-interpole limit.
    pub interpoles_needed: bool,
}

/// Rates the reactance voltage; `None` when the brush does not bridge the coil's segments.
pub fn reactance(
    inputs: ReactanceInputs,
    slot_given: bool,
    interpoles: Option<bool>,
    no_interpoles_max_v: f64,
) -> Option<Reactance> {
    let t = commutation_time_s(&inputs)?;
    let average_v = average_reactance_voltage(&inputs)?;
    Some(Reactance {
        inputs,
        slot_given,
        inductance_h: coil_inductance_h(&inputs),
        commutation_time_s: t,
        average_v,
        interpoles,
        interpoles_needed: interpoles_needed(average_v, no_interpoles_max_v),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn turns_for_keeps_within_the_limit() {
        // 4 turns give 12 V; the limit 3 V allows 4·√(1/4) = 2 turns.
        assert_eq!(turns_for(4, 12.0, 3.0), 2);
        assert_eq!(turns_for(4, 13.0, 3.0), 1);
        assert_eq!(turns_for(4, 0.0, 3.0), 4);
    }
}
