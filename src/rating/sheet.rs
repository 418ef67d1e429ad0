//! Label/value rows of the rating for the winding sheet's data block.
//!
//! Part of the `rating` stage; the sheet renderer places the rows, this only words them.
//! Values are kept to about 20 characters so they fit the block's value column.

use super::RatingReport;
use crate::base::number::fmt_fixed;

/// Short label/value pairs for the sheet: conductor, resistance, EMF, segment voltage,
/// currents, commutator speed and the withstand test voltages (the sheet carries the caution
/// that the applicable standard governs). Only rows whose values exist.
pub fn sheet_rows(r: &RatingReport) -> Vec<(String, String)> {
    let mut rows: Vec<(String, String)> = Vec::new();
    let mut add = |l: &str, v: String| rows.push((l.to_string(), v));
    if let Some(k) = &r.conductor {
        add(
            "conductor area",
            format!("{} mm2", fmt_fixed(k.area_mm2, 3)),
        );
    }
    if let Some(x) = &r.resistance {
        add("R_a at 20 C", format!("{} ohm", fmt_fixed(x.r20_ohm, 4)));
        if x.from_class {
            add(
                &format!("R_a at {} C", fmt_fixed(x.reference_c, 0)),
                format!("{} ohm", fmt_fixed(x.hot_ohm, 4)),
            );
        }
    }
    if let Some(e) = &r.emf {
        add("induced EMF", format!("{} V", fmt_fixed(e.emf_v, 1)));
        if let Some(f) = e.flux_needed_mwb {
            add("flux needed", format!("{} mWb", fmt_fixed(f, 3)));
        }
        if let Some(n) = e.speed_at_flux_rpm {
            add("speed at flux", format!("{} rpm", fmt_fixed(n, 0)));
        }
        if let Some(t) = e.torque_nm {
            add("rated torque", format!("{} N m", fmt_fixed(t, 1)));
        }
    }
    if let Some(s) = &r.segment_voltage {
        add(
            "segment V, average",
            format!("{} V", fmt_fixed(s.average_v, 2)),
        );
        add(
            "segment V, peak est.",
            format!("{} V", fmt_fixed(s.peak_v, 2)),
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
            "test 1 min, new",
            format!("{} V (IEC 60034-1)", fmt_fixed(t.new_v, 0)),
        );
        add(
            "test 1 min, overhaul",
            format!("{} V (IEC 60034-1)", fmt_fixed(t.overhauled_v, 0)),
        );
    }
    if !r.checks.is_empty() {
        let failed = r.checks.iter().filter(|c| !c.passed).count();
        add(
            "rating checks",
            if failed == 0 {
                "all within limits".to_string()
            } else {
                format!("{failed} outside limits")
            },
        );
    }
    rows
}
