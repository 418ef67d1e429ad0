//! The "COIL MAKING" section of the `check` text report: the coil a former is set to, the wire
//! to order and the slot fill: lengths in the design's units (`Units::length`), wire in m and
//! kg, areas in mm2.
//!
//! Part of the `render` stage: formats what [`crate::rating::coil`] worked out, nothing more.
//! The slot-fill check itself is listed with the other checks.

use std::fmt::Write;

use crate::base::Units;
use crate::base::number::fmt_fixed;
use crate::rating::CoilMaking;

fn row(s: &mut String, label: &str, value: impl std::fmt::Display) {
    let _ = writeln!(s, "  {label:<22}{value}");
}

/// Writes the section (nothing when the coil making was not worked out).
pub fn coil_section(s: &mut String, k: Option<&CoilMaking>, u: Units) {
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
                "{}, knuckle to knuckle (core + extension each end)",
                u.length(c.straight_mm, 1)
            ),
        );
        row(
            s,
            "end turn",
            format!(
                "legs {} over a span arc of {}, nose {} past the core, {}",
                u.length(c.end_leg_mm, 1),
                u.length(c.span_arc_mm, 1),
                u.length(c.nose_reach_mm, 1),
                if c.nose_drop_mm > 0.0 {
                    format!("drop {}", u.length(c.nose_drop_mm, 1))
                } else {
                    format!(
                        "sides taken at the core surface (no slot_depth{})",
                        u.key_suffix()
                    )
                }
            ),
        );
        row(
            s,
            "mean turn, loop",
            format!(
                "{} a turn; loop on the former {} tip to tip",
                u.length(c.mean_turn_mm, 1),
                u.length(c.loop_length_mm, 1)
            ),
        );
        row(
            s,
            "wire per coil",
            format!(
                "{}{}, {}",
                u.wire_length(c.wire_m_per_coil, 3),
                if (c.wire_turn_mm - c.mean_turn_mm).abs() > 1e-9 {
                    format!(" at the given mean turn of {}", u.length(c.wire_turn_mm, 1))
                } else {
                    String::new()
                },
                if k.leads_counted {
                    format!("leads {} included", u.length(c.leads_mm, 0))
                } else {
                    format!("leads not counted (no riser_distance{})", u.key_suffix())
                }
            ),
        );
    }
    if let Some(x) = &k.section {
        row(
            s,
            "coil side",
            format!(
                "{} x {} insulated (turns and strips stacked)",
                u.number(x.width_mm, 2),
                u.length(x.height_mm, 2)
            ),
        );
    }
    if let Some(e) = k.equalizer_wire_m {
        row(
            s,
            "equalizers",
            format!("{} of the same wire", u.wire_length(e, 2)),
        );
    }
    row(
        s,
        "wire to order",
        format!(
            "{} with {} % scrap; {} bare copper, {} enamelled (build {})",
            u.wire_length(k.wire_m_total, 1),
            fmt_fixed(k.scrap_percent, 1),
            u.mass(k.mass_kg_bare, 3),
            u.mass(k.mass_kg_insulated, 3),
            u.length(k.build_mm, 3)
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
                "{} %: {} coil sides take {} of {} inside the slot insulation",
                fmt_fixed(f.percent, 1),
                f.sides,
                u.area(f.conductors_mm2, 1),
                u.area(f.room_mm2, 1)
            ),
        );
    }
}
