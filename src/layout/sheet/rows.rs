//! The rows of the winding-data block and the winding sequence, as plain (label, value) text.
//!
//! Part of the `layout` stage: it words what the engine resolved for the sheets (the CSV
//! writer uses the same sequence labels), and the rating's rows ([`rating_sheet_rows`]),
//! appended by [`super::sheet_pages`].

use crate::design::{ConductorShape, Design};
use crate::rating::RatingReport;
use crate::winding::{EqualizerPlan, Winding};

use crate::base::Units;
use crate::base::number::fmt_fixed;
use crate::theory::words::{half_bars_words, multiplicity_word, span_shop_dash, throw_shop_dash};

/// A signed pitch, "+1" or "−3".
pub fn signed(x: i64) -> String {
    if x < 0 {
        format!("\u{2212}{}", -x)
    } else {
        format!("+{x}")
    }
}

/// The winding-data rows, in the order they are printed: the bench rows ([`bench_rows`]),
/// which sheet 1 always carries, then the rest.
pub fn winding_data_rows(d: &Design, w: &Winding) -> Vec<(String, String)> {
    let mut rows = bench_rows(d, w);
    let mut row = |k: &str, v: String| rows.push((k.to_string(), v));
    row("comm. pitch", signed(w.pitches.commutator));
    row("lead offset", format!("{} seg", d.lead_offset));
    row("parallel paths", w.parallel_paths().to_string());
    row(
        "brush sets",
        format!("{} (min {})", w.brush_sets(), w.brush_sets_minimum),
    );
    row(
        "rotation",
        format!("{} / {}", d.rotation.as_str(), d.mode.as_str()),
    );
    row("pole arc", fmt_fixed(d.pole_arc, 2));
    rows
}

/// What the winder needs at the bench, in the order printed on sheet 1: the connection
/// (type, multiplicity, direction), the counts, span and throw in shop form, turns, wire and
/// strands, lead swing and brush position, equalizers and dummy coils.
pub fn bench_rows(d: &Design, w: &Winding) -> Vec<(String, String)> {
    let mut rows: Vec<(String, String)> = Vec::new();
    let mut row = |k: &str, v: String| rows.push((k.to_string(), v));
    row(
        "connection",
        format!(
            "{} {}, {}",
            multiplicity_word(d.multiplicity),
            d.winding_type.as_str(),
            d.direction.as_str()
        ),
    );
    row("poles/slots", format!("{} / {}", d.poles, d.slots));
    row(
        "segments",
        format!(
            "{}{}",
            w.active_coils,
            if w.segments_derived { " (derived)" } else { "" }
        ),
    );
    row("coils/slot", d.coils_per_slot.to_string());
    row(
        "span",
        format!(
            "{} ({} slots)",
            span_shop_dash(w.pitches.span),
            w.pitches.span
        ),
    );
    row("throw", coil1_throw(w));
    row(
        "back / front",
        format!("{} / {}", w.pitches.back, w.pitches.front),
    );
    // A frog-leg's wave element: its own span and throw (the rows above are the lap's).
    for e in w.elements.iter().skip(1) {
        let name = e.kind.as_str();
        row(
            &format!("{name} span / throw"),
            format!(
                "{} / {}",
                span_shop_dash(e.pitches.span),
                throw_shop_dash(e.pitches.commutator, w.active_coils)
            ),
        );
        row(
            &format!("{name} back / front"),
            format!("{} / {}", e.pitches.back, e.pitches.front),
        );
    }
    row("turns/coil", d.turns.to_string());
    row(
        "wire, strands",
        d.conductor.as_ref().map_or_else(
            || "not given".to_string(),
            |c| conductor_value(&c.shape, d.units),
        ),
    );
    row("lead swing", lead_swing_value(w));
    row(
        "brush position",
        format!(
            "{} off pole axis",
            half_bars_words(i64::from(d.lead_offset.0))
        ),
    );
    row("equalizers", equalizers_value(w));
    row("dummy coils", dummies_value(w));
    rows
}

/// The commutator throw in shop form, from the trace: the bars coil 1's leads go to,
/// "1–45"; a dash when coil 1 is a dummy with its ends cut.
pub fn coil1_throw(w: &Winding) -> String {
    w.connections
        .first()
        .and_then(|k| k.start_segment.zip(k.end_segment))
        .map_or_else(
            || "\u{2014}".to_string(),
            |(a, b)| format!("{a}\u{2013}{b}"),
        )
}

/// The dummy coils: none, up to three by number, else how many.
fn dummies_value(w: &Winding) -> String {
    match w.dummy_coils.len() {
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
    }
}

/// Where slot 1's centre lies on the bars, and the lead swing in shop words.
fn lead_swing_value(w: &Winding) -> String {
    let (bar, right) = w.lead_swing.in_line(w.active_coils);
    let in_line = match right {
        None => format!("bar {bar}"),
        Some(r) => format!("mica {bar}/{r}"),
    };
    format!(
        "slot 1 at {in_line}, {}",
        half_bars_words(w.lead_swing.swing_half_bars(w.active_coils))
    )
}

/// The equalizers: how many of how many possible, and their pitch.
fn equalizers_value(w: &Winding) -> String {
    match &w.equalizers {
        EqualizerPlan::NotNeeded => "not needed".to_string(),
        EqualizerPlan::Impossible(_) => "not possible".to_string(),
        EqualizerPlan::Possible(e) => {
            format!("{}/{}, pitch {}", e.groups.len(), e.possible, e.pitch)
        }
    }
}

/// The conductor's size and strands, mm.
fn conductor_value(shape: &ConductorShape, units: Units) -> String {
    // A design in mm leaves the unit to the trade's reading; one in inches says so.
    let unit = match units {
        Units::Millimetres => String::new(),
        Units::Inches => format!(" {}", units.symbol()),
    };
    match *shape {
        ConductorShape::Round {
            diameter_mm,
            awg,
            strands,
        } => {
            let g = awg.map(|a| format!(" (AWG {a})")).unwrap_or_default();
            format!(
                "\u{d8}{}{unit} \u{d7}{strands}{g}",
                units.number(diameter_mm, 3)
            )
        }
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            strands,
            ..
        } => {
            format!(
                "{}\u{d7}{}{unit} \u{d7}{strands}",
                units.number(width_mm, 2),
                units.number(height_mm, 2)
            )
        }
    }
}

/// Sequence label per coil position (index coil − 1): the step in the trace, "17", or
/// "2.17" (closed winding 2, step 17) when there is more than one closed winding; empty for
/// a dummy.
pub fn sequence_labels(w: &Winding) -> Vec<String> {
    let mut out = vec![String::new(); w.connections.len()];
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

/// Short label/value pairs for the sheet: conductor, resistance, EMF, segment voltage,
/// currents, commutator speed and the withstand test voltages (the sheet carries the caution
/// that the applicable standard governs). Only rows whose values exist.
pub fn rating_sheet_rows(r: &RatingReport, units: Units) -> Vec<(String, String)> {
    let mut rows: Vec<(String, String)> = Vec::new();
    let mut add = |l: &str, v: String| rows.push((l.to_string(), v));
    if let Some(k) = &r.conductor {
        add("conductor area", units.wire_area(k.area_mm2));
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
            add("current density", units.current_density(j));
        }
    }
    if let Some(k) = &r.commutator {
        if let Some(v) = k.peripheral_speed_m_s {
            add("commutator speed", units.surface_speed(v));
        }
        if let Some(b) = k.brush_width_segments {
            add("brush width", format!("{} segments", fmt_fixed(b, 2)));
        }
    }
    if let Some(x) = &r.reactance {
        let needed = if x.interpoles_needed && x.interpoles != Some(true) {
            " (interpoles)"
        } else {
            ""
        };
        add(
            "reactance V",
            format!("{} V{needed}", fmt_fixed(x.average_v, 2)),
        );
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
