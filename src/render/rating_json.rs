//! The `rating` object of `check --json` (null when the design has no rating inputs).
//!
//! Part of the `render` stage. Keys are sorted by serde_json's map and every float is rounded
//! by the one number writer, so output is byte-stable.

use serde_json::{Value, json};

use crate::base::number::round_to;
use crate::rating::test_voltage::{TEST_VOLTAGE_CAUTION, TEST_VOLTAGE_SOURCE};
use crate::rating::{Bound, EmfBasis, MeanTurnSource, RatingReport};

/// The `rating` value: an object, or null when the design has no rating inputs.
pub fn rating_value(rating: Option<&RatingReport>) -> Value {
    rating.map_or(Value::Null, report_value)
}

fn r(x: f64, n: i32) -> Value {
    if x.is_finite() {
        json!(round_to(x, n))
    } else {
        Value::Null
    }
}

fn ro(x: Option<f64>, n: i32) -> Value {
    x.map_or(Value::Null, |x| r(x, n))
}

/// The object for a computed report.
pub fn report_value(rep: &RatingReport) -> Value {
    let conductor = rep.conductor.as_ref().map_or(Value::Null, |k| {
        let (mt, est, formula) = match &k.mean_turn {
            Some(t) => match &t.source {
                MeanTurnSource::Given => (r(t.mm, 3), false, Value::Null),
                MeanTurnSource::Estimated(f) => (r(t.mm, 3), true, json!(f)),
            },
            None => (Value::Null, false, Value::Null),
        };
        json!({"description": k.description, "area_mm2": r(k.area_mm2, 6), "mean_turn_mm": mt,
               "mean_turn_estimated": est, "mean_turn_formula": formula})
    });
    let resistance = rep.resistance.as_ref().map_or(Value::Null, |x| {
        json!({"r20_ohm": r(x.r20_ohm, 6), "reference_c": r(x.reference_c, 1), "hot_ohm": r(x.hot_ohm, 6),
               "from_thermal_class": x.from_class, "measured": x.measured})
    });
    let emf = rep.emf.as_ref().map_or(Value::Null, |e| {
        json!({
            "mode": e.mode.as_str(),
            "basis": match e.basis { EmfBasis::Terminal => "terminal-voltage", EmfBasis::FluxAndSpeed => "flux-and-speed" },
            "terminal_v": ro(e.terminal_v, 3),
            "ir_drop_v": if e.ir_known { r(e.ir_drop_v, 4) } else { Value::Null },
            "brush_drop_v": r(e.brush_drop_v, 3),
            "brush_grade": e.brush_grade.as_str(),
            "emf_v": r(e.emf_v, 4),
            "flux_needed_mwb": ro(e.flux_needed_mwb, 4),
            "speed_at_flux_rpm": ro(e.speed_at_flux_rpm, 3),
            "k_phi": ro(e.k_phi, 6),
            "emf_v_per_1000_rpm": ro(e.v_per_1000_rpm, 4),
            "torque_nm": ro(e.torque_nm, 4),
            "speed_rpm": ro(e.speed_rpm, 3),
        })
    });
    let seg = rep.segment_voltage.as_ref().map_or(Value::Null, |v| {
        json!({"average_v": r(v.average_v, 4), "peak_v": r(v.peak_v, 4), "pole_arc": r(v.pole_arc, 4),
               "c_min_average": v.c_min_average, "c_min_peak": v.c_min_peak})
    });
    let cur = rep.currents.as_ref().map_or(Value::Null, |c| {
        json!({"armature_a": r(c.armature_a, 4), "per_path_a": r(c.per_path_a, 4), "per_brush_arm_a": r(c.per_brush_arm_a, 4),
               "brush_arms": c.brush_arms, "density_a_mm2": ro(c.density_a_mm2, 4)})
    });
    let com = rep.commutator.as_ref().map_or(Value::Null, |k| {
        json!({"diameter_mm": ro(k.diameter_mm, 3), "segment_pitch_mm": ro(k.segment_pitch_mm, 4),
               "peripheral_speed_m_s": ro(k.peripheral_speed_m_s, 4), "speed_rpm": ro(k.speed_rpm, 3),
               "brush_width_segments": ro(k.brush_width_segments, 4), "brush_width_mm": ro(k.brush_width_mm, 3),
               "coils_shorted_min": k.coils_shorted_min, "coils_shorted_max": k.coils_shorted_max})
    });
    let losses = rep.losses.as_ref().map_or(Value::Null, |l| {
        json!({"copper_w": ro(l.copper_w, 3), "copper_at_c": r(l.copper_at_c, 1), "brush_w": r(l.brush_w, 3)})
    });
    let tv = rep.test_voltage.as_ref().map_or(Value::Null, |t| {
        json!({"rated_v": r(t.rated_v, 3), "new_v": r(t.new_v, 1), "overhauled_v": r(t.overhauled_v, 1),
               "partly_rewound_v": r(t.partial_v, 1), "rule": t.rule.describe(), "source": TEST_VOLTAGE_SOURCE,
               "caution": TEST_VOLTAGE_CAUTION})
    });
    let checks: Vec<Value> = rep
        .checks
        .iter()
        .map(|c| {
            json!({"id": c.rule.id, "severity": c.rule.level.as_str(), "passed": c.passed,
                   "value": r(c.value, 4), "limit": r(c.limit, 4), "unit": c.rule.unit,
                   "bound": match c.rule.bound { Bound::AtMost => "at-most", Bound::AtLeast => "at-least" },
                   "limit_key": c.rule.key, "overridden": c.overridden, "source": c.rule.source,
                   "advice": c.advice})
        })
        .collect();
    json!({
        "paths": rep.paths,
        "conductors": rep.conductors,
        "segments": rep.segments,
        "conductor": conductor,
        "resistance": resistance,
        "emf": emf,
        "segment_voltage": seg,
        "currents": cur,
        "electric_loading_a_m": ro(rep.electric_loading_a_m, 1),
        "commutator": com,
        "losses": losses,
        "test_voltage": tv,
        "checks": checks,
        "notes": rep.notes,
    })
}
