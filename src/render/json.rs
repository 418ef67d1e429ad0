//! The `check --json` object. Key names listed in the README are fixed; more may be added.
//!
//! Part of the `render` stage. Keys are sorted (serde_json's ordered map) and every float is
//! rounded to a fixed number of places, so the same design gives the same bytes.

use serde_json::{Map, Value, json};

use crate::base::number::round_to;
use crate::checks::Checked;
use crate::design::SpanSource;
use crate::theory::words::span_shop;
use crate::winding::EqualizerPlan;

/// Builds the report object.
pub fn report_value(r: &Checked) -> Value {
    let (d, w) = (&r.design, &r.winding);
    let k = &w.constants;
    let mut o = Map::new();
    let mut put = |key: &str, v: Value| {
        o.insert(key.to_string(), v);
    };
    put("file", json!(d.file_name));
    put(
        "job",
        json!({"id": d.job.id, "title": d.job.title, "customer": d.job.customer, "date": d.job.date, "notes": d.job.notes}),
    );
    put("poles", json!(d.poles));
    put("slots", json!(d.slots));
    put("coils_per_slot", json!(d.coils_per_slot));
    put("segments", json!(w.active_coils));
    put("segments_derived", json!(w.segments_derived));
    put("coils", json!(w.coils));
    put("active_coils", json!(w.active_coils));
    put("dummy_coils", json!(w.dummy_coils.len()));
    put("dummy_positions", json!(w.dummy_coils));
    put("conductors", json!(w.conductors));
    put("turns", json!(d.turns));
    put(
        "winding",
        json!({"type": d.winding_type.as_str(), "multiplicity": d.multiplicity, "direction": d.direction.as_str()}),
    );
    put("rotation", json!(d.rotation.as_str()));
    put("mode", json!(d.mode.as_str()));
    put("pole_arc", json!(round_to(d.pole_arc, 4)));
    put("span", json!(w.pitches.span));
    put("span_shop", json!(span_shop(w.pitches.span)));
    put(
        "span_defaulted",
        json!(d.span_source == SpanSource::Default),
    );
    put("back_pitch", json!(w.pitches.back));
    put("front_pitch", json!(w.pitches.front));
    put("resultant_pitch", json!(w.pitches.resultant));
    put("commutator_pitch", json!(w.pitches.commutator));
    put("lead_offset", json!(d.lead_offset));
    put("parallel_paths", json!(w.parallel_paths()));
    put("parallel_paths_formula", json!(w.paths_formula));
    put("reentrancy", json!(w.reentrancy()));
    put("reentrancy_formula", json!(w.reentrancy_formula));
    put("brush_sets", json!(w.brush_sets()));
    put("brush_sets_minimum", json!(w.brush_sets_minimum));
    put("machine_constant", json!(round_to(k.machine_constant, 6)));
    put("symmetric", json!(r.symmetric));
    put(
        "path_balance",
        json!({
            "samples": w.balance.samples,
            "mean_spread_coils": round_to(w.balance.mean_spread_coils, 4),
            "peak_spread_coils": round_to(w.balance.peak_spread_coils, 4),
            "balanced": w.balance.balanced,
        }),
    );
    if let Some(x) = k.emf_constant_v_per_rad_s {
        put(
            "flux_per_pole_mwb",
            json!(d.flux_per_pole_mwb.map(|f| round_to(f, 6))),
        );
        put("emf_constant_v_per_rad_s", json!(round_to(x, 6)));
        put(
            "emf_v_per_1000_rpm",
            json!(k.emf_v_per_1000_rpm.map(|v| round_to(v, 4))),
        );
        put(
            "torque_constant_nm_per_a",
            json!(k.torque_constant_nm_per_a.map(|v| round_to(v, 6))),
        );
    }
    if let Some(e) = k.emf_v {
        put("speed_rpm", json!(d.speed_rpm.map(|n| round_to(n, 3))));
        put("emf_v", json!(round_to(e, 4)));
    }
    put(
        "brushes",
        Value::Array(
            w.brushes
                .iter()
                .map(|b| {
                    json!({
                        "index": b.index,
                        "polarity": b.polarity.sign(),
                        "angle_deg": round_to(b.angle_deg, 4),
                        "centre_segment": round_to(b.centre_segment, 4),
                        "under": b.under,
                        "contacts": b.contacts,
                    })
                })
                .collect(),
        ),
    );
    put(
        "paths",
        Value::Array(
            w.paths
                .iter()
                .map(|p| {
                    json!({"index": p.index, "from_brush": p.from_brush, "to_brush": p.to_brush,
                           "coils": p.coils, "current": p.current, "emf_units": p.emf_units})
                })
                .collect(),
        ),
    );
    put("shorted_coils", json!(w.shorted_coils));
    put(
        "rating",
        super::rating_json::rating_value(r.rating.as_ref()),
    );
    put(
        "checks",
        Value::Array(
            r.findings
                .iter()
                .map(|f| {
                    json!({"id": f.id, "severity": f.severity.as_str(), "passed": f.passed,
                           "message": f.message, "source": f.source})
                })
                .collect(),
        ),
    );
    put(
        "connections",
        Value::Array(
            w.connections
                .iter()
                .map(|c| {
                    json!({
                        "coil": c.coil,
                        "top_slot": c.top.slot,
                        "top_position": c.top.position,
                        "bottom_slot": c.bottom.slot,
                        "bottom_position": c.bottom.position,
                        "start_segment": c.start_segment,
                        "end_segment": c.end_segment,
                        "dummy": c.dummy,
                    })
                })
                .collect(),
        ),
    );
    put(
        "sequence",
        Value::Array(
            w.closed_windings
                .iter()
                .map(|cw| {
                    Value::Array(
                        cw.steps
                            .iter()
                            .map(|s| json!([s.from_segment, s.coil, s.to_segment]))
                            .collect(),
                    )
                })
                .collect(),
        ),
    );
    let (eq, eq_status) = match &w.equalizers {
        EqualizerPlan::Possible(e) => (
            json!({"pitch": e.pitch, "possible": e.possible, "groups": e.groups}),
            json!({"status": "possible", "reason": null}),
        ),
        EqualizerPlan::Impossible(why) => {
            (Value::Null, json!({"status": "impossible", "reason": why}))
        }
        EqualizerPlan::NotNeeded => (
            Value::Null,
            json!({"status": "not needed", "reason": "wave windings need none"}),
        ),
    };
    put("equalizers", eq);
    put("equalizer_status", eq_status);
    Value::Object(o)
}

/// The report as pretty-printed JSON with a final newline.
pub fn report_json(r: &Checked) -> String {
    let mut s = serde_json::to_string_pretty(&report_value(r)).unwrap_or_else(|_| "{}".into());
    s.push('\n');
    s
}
