//! Label/value rows of the rating for the winding sheet's data block.
//!
//! Part of the `rating` stage; the sheet renderer places the rows, this only words them.

use super::RatingReport;
use crate::render::number::fmt_fixed;

/// Short label/value pairs for the sheet: resistance, EMF, segment voltage, currents,
/// commutator and the test voltages with their caution. Only rows whose values exist.
pub fn sheet_rows(r: &RatingReport) -> Vec<(String, String)> {
    let mut rows: Vec<(String, String)> = Vec::new();
    let mut add = |l: &str, v: String| rows.push((l.to_string(), v));
    if let Some(k) = &r.conductor {
        add(
            "conductor",
            format!("{} = {} mm2", k.description, fmt_fixed(k.area_mm2, 3)),
        );
    }
    if let Some(x) = &r.resistance {
        let mut v = format!("{} ohm at 20 C", fmt_fixed(x.r20_ohm, 4));
        if x.from_class {
            v.push_str(&format!(
                ", {} ohm at {} C",
                fmt_fixed(x.hot_ohm, 4),
                fmt_fixed(x.reference_c, 0)
            ));
        }
        add("armature resistance", v);
    }
    if let Some(e) = &r.emf {
        add("induced EMF", format!("{} V", fmt_fixed(e.emf_v, 1)));
        if let Some(f) = e.flux_needed_mwb {
            add("flux needed", format!("{} mWb per pole", fmt_fixed(f, 3)));
        }
        if let Some(n) = e.speed_at_flux_rpm {
            add("speed at flux", format!("{} rpm", fmt_fixed(n, 0)));
        }
        if let Some(t) = e.torque_nm {
            add("rated torque", format!("{} N m", fmt_fixed(t, 2)));
        }
    }
    if let Some(s) = &r.segment_voltage {
        add(
            "segment voltage",
            format!(
                "{} V average, {} V peak (est.)",
                fmt_fixed(s.average_v, 2),
                fmt_fixed(s.peak_v, 2)
            ),
        );
    }
    if let Some(c) = &r.currents {
        add(
            "current per path",
            format!("{} A", fmt_fixed(c.per_path_a, 2)),
        );
        if let Some(j) = c.density_a_mm2 {
            add("current density", format!("{} A/mm2", fmt_fixed(j, 2)));
        }
    }
    if let Some(k) = &r.commutator {
        if let Some(v) = k.peripheral_speed_m_s {
            add("commutator speed", format!("{} m/s", fmt_fixed(v, 2)));
        }
        if let Some(b) = k.brush_width_segments {
            add("brush width", format!("{} segments", fmt_fixed(b, 2)));
        }
    }
    if let Some(t) = &r.test_voltage {
        add(
            "withstand test 1 min",
            format!(
                "new/rewound {} V, overhauled {} V (IEC 60034-1; the applicable standard governs)",
                fmt_fixed(t.new_v, 0),
                fmt_fixed(t.overhauled_v, 0)
            ),
        );
    }
    let failed: Vec<&str> = r
        .checks
        .iter()
        .filter(|c| !c.passed)
        .map(|c| c.rule.id)
        .collect();
    if !r.checks.is_empty() {
        add(
            "rating checks",
            if failed.is_empty() {
                "all within limits".to_string()
            } else {
                format!("outside limits: {}", failed.join(", "))
            },
        );
    }
    rows
}
