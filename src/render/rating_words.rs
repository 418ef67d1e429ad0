//! The rating in words: notes, the mean-turn estimate, the test-voltage rule, the coils under
//! a brush, and the short label/value rows of the winding sheet's data block.
//!
//! Part of the `render` stage: the rating returns typed values with their numbers, this file
//! words them once for the text report, the JSON and the sheet. Sheet values are kept to about
//! 20 characters so they fit the block's value column.

use crate::base::number::fmt_fixed;
use crate::design::Design;
use crate::rating::test_voltage::TestRule;
use crate::rating::{
    CommutatorData, MeanTurn, MeanTurnSource, RatingNote, RatingReport, Reactance,
};

/// A note of the rating in words.
pub fn note(n: &RatingNote) -> String {
    match n {
        RatingNote::MeanTurnEstimated(t) => format!(
            "mean turn {}; give [conductor] mean_turn_mm for a measured value",
            mean_turn_formula(t).unwrap_or_default()
        ),
        RatingNote::NoConductor => "no armature resistance: give [conductor] (diameter_mm or awg, or width_mm and height_mm)".to_string(),
        RatingNote::NoMeanTurn => "no armature resistance: give [conductor] mean_turn_mm, or [core] diameter_mm and length_mm to estimate it".to_string(),
        RatingNote::NoThermalClass => "no [rating] thermal_class: resistance and losses are taken at 20 C".to_string(),
        RatingNote::EmfWithoutIrDrop => "EMF: I*R_a left out (no armature resistance)".to_string(),
        RatingNote::NoEmf => "no EMF: give [rating] voltage, or a flux and a speed".to_string(),
        RatingNote::DropsExceedVoltage => "the drops exceed the terminal voltage: no positive EMF, so no flux or speed follows".to_string(),
        RatingNote::NoCurrent => "no [rating] current: currents, density, loading, losses and torque need it".to_string(),
        RatingNote::TestVoltageGeneralRow => "test voltage: no current, so the machine is not taken as under 1 kW (the general row applies)".to_string(),
    }
}

/// Every note of `r` in words, in order.
pub fn notes(r: &RatingReport) -> Vec<String> {
    r.notes.iter().map(note).collect()
}

/// The estimate of the mean turn with its numbers; `None` when the length was given.
pub fn mean_turn_formula(t: &MeanTurn) -> Option<String> {
    match t.source {
        MeanTurnSource::Given => None,
        MeanTurnSource::Estimated(e) => Some(format!(
            "estimated from the coil's shape on [core] (see coil making): L_mt = 2*straight + 4*end leg + 2*drop = 2*{} + 4*{} + 2*{} = {} mm [derived]",
            fmt_fixed(e.straight_mm, 1),
            fmt_fixed(e.end_leg_mm, 1),
            fmt_fixed(e.drop_mm, 1),
            fmt_fixed(t.mm, 1)
        )),
    }
}

/// The average reactance voltage with its inductance, commutation time and the interpole
/// verdict against `no_interpoles_max` V, in one line.
pub fn reactance(x: &Reactance, no_interpoles_max: f64) -> String {
    let verdict = match (x.interpoles, x.interpoles_needed) {
        (Some(true), _) => "interpoles fitted".to_string(),
        (_, true) => format!(
            "interpoles needed (above {} V)",
            fmt_fixed(no_interpoles_max, 1)
        ),
        (_, false) => format!(
            "no interpoles needed (within {} V)",
            fmt_fixed(no_interpoles_max, 1)
        ),
    };
    let slot = if x.slot_given {
        "slot from [core]"
    } else {
        "slot taken 4 deep : 1 wide"
    };
    format!(
        "{} V average = L*2*I_z/t_c, L = {} uH, t_c = {} ms ({slot}); {verdict}",
        fmt_fixed(x.average_v, 2),
        fmt_fixed(x.inductance_h * 1e6, 2),
        fmt_fixed(x.commutation_time_s * 1000.0, 3),
    )
}

/// The row of the withstand-test table used for the new winding, in words.
pub fn test_rule(rule: TestRule) -> &'static str {
    match rule {
        TestRule::Small => "under 1 kW and under 100 V: 500 V + 2U",
        TestRule::General => "1000 V + 2U (minimum 1500 V)",
        TestRule::GeneralMinimum => "1000 V + 2U, raised to the 1500 V minimum",
    }
}

/// How the coils shorted by one brush were counted, for the design's kind, multiplicity and
/// pole pairs; `None` when the brush width is not known.
pub fn coils_shorted_rule(d: &Design, k: &CommutatorData) -> Option<String> {
    k.brush_width_segments.map(|_| {
        d.winding_type
            .kind()
            .shorting_rule(d.multiplicity, d.pole_pairs())
    })
}
