//! The "COIL MAKING" section of the `check` text report: the coil a former is set to, the wire
//! to order and the slot fill, in mm, m and kg.
//!
//! Part of the `render` stage: formats what [`crate::rating::coil`] worked out, nothing more.
//! The slot-fill check itself is listed with the other checks.

use std::fmt::Write;

use crate::base::number::fmt_fixed;
use crate::rating::CoilMaking;

fn row(s: &mut String, label: &str, value: impl std::fmt::Display) {
    let _ = writeln!(s, "  {label:<22}{value}");
}

/// Writes the section (nothing when the coil making was not worked out).
pub fn coil_section(s: &mut String, k: Option<&CoilMaking>) {
    let Some(k) = k else {
        return;
    };
    let _ = writeln!(s, "\nCOIL MAKING\n-----------");
    let several = k.shapes.len() > 1;
    for (i, c) in k.shapes.iter().enumerate() {
        if several {
            row(
                s,
                &format!("element {}", i + 1),
                format!("span {}, turns {}, {} coils", c.span, c.turns, c.coils),
            );
        }
        row(
            s,
            "straight per side",
            format!(
                "{} mm, knuckle to knuckle (core + extension each end)",
                fmt_fixed(c.straight_mm, 1)
            ),
        );
        row(
            s,
            "end turn",
            format!(
                "legs {} mm over a span arc of {} mm, nose {} mm past the core, {}",
                fmt_fixed(c.end_leg_mm, 1),
                fmt_fixed(c.span_arc_mm, 1),
                fmt_fixed(c.nose_reach_mm, 1),
                if c.nose_drop_mm > 0.0 {
                    format!("drop {} mm", fmt_fixed(c.nose_drop_mm, 1))
                } else {
                    "sides taken at the core surface (no slot_depth_mm)".to_string()
                }
            ),
        );
        row(
            s,
            "mean turn, loop",
            format!(
                "{} mm a turn; loop on the former {} mm tip to tip",
                fmt_fixed(c.mean_turn_mm, 1),
                fmt_fixed(c.loop_length_mm, 1)
            ),
        );
        row(
            s,
            "wire per coil",
            format!(
                "{} m{}, {}",
                fmt_fixed(c.wire_m_per_coil, 3),
                if (c.wire_turn_mm - c.mean_turn_mm).abs() > 1e-9 {
                    format!(
                        " at the given mean turn of {} mm",
                        fmt_fixed(c.wire_turn_mm, 1)
                    )
                } else {
                    String::new()
                },
                if k.leads_counted {
                    format!("leads {} mm included", fmt_fixed(c.leads_mm, 0))
                } else {
                    "leads not counted (no riser_distance_mm)".to_string()
                }
            ),
        );
    }
    if let Some(x) = &k.section {
        row(
            s,
            "coil side",
            format!(
                "{} x {} mm insulated (turns and strips stacked)",
                fmt_fixed(x.width_mm, 2),
                fmt_fixed(x.height_mm, 2)
            ),
        );
    }
    if let Some(e) = k.equalizer_wire_m {
        row(
            s,
            "equalizers",
            format!("{} m of the same wire", fmt_fixed(e, 2)),
        );
    }
    row(
        s,
        "wire to order",
        format!(
            "{} m with {} % scrap; {} kg bare copper, {} kg enamelled (build {} mm)",
            fmt_fixed(k.wire_m_total, 1),
            fmt_fixed(k.scrap_percent, 1),
            fmt_fixed(k.mass_kg_bare, 3),
            fmt_fixed(k.mass_kg_insulated, 3),
            fmt_fixed(k.build_mm, 3)
        ),
    );
    if let Some(n) = k.reels {
        row(s, "reels", n);
    }
    if let Some(f) = &k.slot_fill {
        row(
            s,
            "slot fill",
            format!(
                "{} %: {} coil sides take {} mm2 of {} mm2 inside the slot insulation",
                fmt_fixed(f.percent, 1),
                f.sides,
                fmt_fixed(f.conductors_mm2, 1),
                fmt_fixed(f.room_mm2, 1)
            ),
        );
    }
}
