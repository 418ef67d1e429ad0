//! The rows of the winding-data block and the winding sequence, as plain (label, value) text.
//!
//! Part of the `layout` stage: it words what the engine resolved for the sheets (the CSV
//! writer uses the same sequence labels). The rating adds rows of its own
//! (`rating::sheet_rows`), appended by [`super::sheet_pages`].

use crate::design::{ConductorShape, Design};
use crate::winding::{EqualizerPlan, Winding};

use crate::base::number::fmt_fixed;
use crate::theory::words::{multiplicity_word, span_shop_dash};

/// A signed pitch, "+1" or "−3".
pub fn signed(x: i64) -> String {
    if x < 0 {
        format!("\u{2212}{}", -x)
    } else {
        format!("+{x}")
    }
}

/// The winding-data rows, in the order they are printed.
pub fn winding_data_rows(d: &Design, w: &Winding) -> Vec<(String, String)> {
    let mut rows: Vec<(String, String)> = Vec::new();
    let mut row = |k: &str, v: String| rows.push((k.to_string(), v));
    row(
        "type",
        format!(
            "{} {}",
            multiplicity_word(d.multiplicity),
            d.winding_type.as_str()
        ),
    );
    row("direction", d.direction.as_str().to_string());
    row("poles", d.poles.to_string());
    row("slots", d.slots.to_string());
    row(
        "segments",
        format!(
            "{}{}",
            w.active_coils,
            if w.segments_derived { " (derived)" } else { "" }
        ),
    );
    row("coils per slot", d.coils_per_slot.to_string());
    let dummies = match w.dummy_coils.len() {
        0 => "none".to_string(),
        n if n <= 3 => format!(
            "{n}: coil {}",
            w.dummy_coils
                .iter()
                .map(u32::to_string)
                .collect::<Vec<_>>()
                .join(", ")
        ),
        n => format!("{n}"),
    };
    row("dummy coils", dummies);
    row(
        "span",
        format!(
            "{} ({} slots)",
            span_shop_dash(w.pitches.span),
            w.pitches.span
        ),
    );
    row("turns per coil", d.turns.to_string());
    row("lead offset", format!("{} seg", d.lead_offset));
    row("comm. pitch", signed(w.pitches.commutator));
    row(
        "back / front",
        format!("{} / {}", w.pitches.back, w.pitches.front),
    );
    row("parallel paths", w.parallel_paths().to_string());
    row(
        "brush sets",
        format!("{} (min {})", w.brush_sets(), w.brush_sets_minimum),
    );
    let eq = match &w.equalizers {
        EqualizerPlan::NotNeeded => "not needed".to_string(),
        EqualizerPlan::Impossible(_) => "not possible".to_string(),
        EqualizerPlan::Possible(e) => {
            format!("{}/{}, pitch {}", e.groups.len(), e.possible, e.pitch)
        }
    };
    row("equalizers", eq);
    row(
        "rotation",
        format!("{} / {}", d.rotation.as_str(), d.mode.as_str()),
    );
    row("pole arc", fmt_fixed(d.pole_arc, 2));
    if let Some(c) = &d.conductor {
        let v = match c.shape {
            ConductorShape::Round {
                diameter_mm,
                awg,
                strands,
            } => {
                let g = awg.map(|a| format!(" (AWG {a})")).unwrap_or_default();
                format!("\u{d8}{} \u{d7}{strands}{g}", fmt_fixed(diameter_mm, 3))
            }
            ConductorShape::Rectangular {
                width_mm,
                height_mm,
                strands,
                ..
            } => {
                format!(
                    "{}\u{d7}{} \u{d7}{strands}",
                    fmt_fixed(width_mm, 2),
                    fmt_fixed(height_mm, 2)
                )
            }
        };
        row("conductor, mm", v);
    }
    rows
}

/// Sequence label per coil position (index coil − 1): the step in the trace, "17", or
/// "2.17" (closed winding 2, step 17) when there is more than one closed winding; empty for
/// a dummy.
pub fn sequence_labels(w: &Winding) -> Vec<String> {
    let mut out = vec![String::new(); w.coils as usize];
    let many = w.closed_windings.len() > 1;
    for (i, cw) in w.closed_windings.iter().enumerate() {
        for (k, step) in cw.steps.iter().enumerate() {
            if let Some(slot) = out.get_mut((step.coil - 1) as usize) {
                *slot = if many {
                    format!("{}.{}", i + 1, k + 1)
                } else {
                    (k + 1).to_string()
                };
            }
        }
    }
    out
}
