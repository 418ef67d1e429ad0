//! The "RATING" section of the `check` text report.
//!
//! Part of the `render` stage: formats what [`crate::rating`] worked out, nothing more. The
//! rating checks themselves are listed with the other checks; this section gives the figures,
//! the withstand test voltages with their caution, the notes and the advice for failed limits.

use std::fmt::Write;

use super::rating_words;
use super::rating_words::{coils_shorted_rule, note, test_rule};
use crate::base::number::fmt_fixed;
use crate::design::{Design, LimitId, Mode};
use crate::rating::conductor::describe;
use crate::rating::test_voltage::{TEST_VOLTAGE_CAUTION, TEST_VOLTAGE_SOURCE};
use crate::rating::{EmfBasis, MeanTurnSource, RatingReport};

/// Appends the rating section for `d` (nothing when it has no rating inputs).
pub fn rating_section(s: &mut String, d: &Design, rating: Option<&RatingReport>) {
    if let Some(r) = rating {
        render_rating(s, d, r);
        super::coil_text::coil_section(s, r.coil_making.as_ref(), d.units);
    }
}

fn row(s: &mut String, label: &str, value: impl std::fmt::Display) {
    let _ = writeln!(s, "  {label:<22}{value}");
}

/// Writes the section for a computed report: the figures in the order a winder reads them,
/// then the advice and the notes.
pub fn render_rating(s: &mut String, d: &Design, r: &RatingReport) {
    let _ = writeln!(s, "\nRATING\n------");
    row(
        s,
        "paths, conductors",
        format!("{}, {} ({} segments)", r.paths, r.conductors, r.segments),
    );
    copper(s, d, r);
    emf(s, d, r);
    loading(s, d, r);
    commutator(s, d, r);
    losses_and_tests(s, r);
    advice_and_notes(s, r);
}

/// The conductor, the mean turn and the armature resistance.
fn copper(s: &mut String, d: &Design, r: &RatingReport) {
    if let Some(k) = &r.conductor {
        row(
            s,
            "conductor",
            format!(
                "{}, {}",
                describe(&k.shape, d.units),
                d.units.wire_area(k.area_mm2)
            ),
        );
        if let Some(t) = &k.mean_turn {
            let how = match t.source {
                MeanTurnSource::Given => "given",
                MeanTurnSource::Estimated(_) => "estimated, see notes",
            };
            row(
                s,
                "mean turn L_mt",
                format!("{} ({how})", d.units.length(t.mm, 1)),
            );
        }
    }
    if let Some(x) = &r.resistance {
        let what = if x.measured {
            "measured"
        } else if x.elements > 1 {
            "each element rho*Z_e*L_mt/(2*a_e^2*A_c), the elements in parallel, copper per IEC 60028"
        } else {
            "R_a = rho*Z*L_mt/(2*a^2*A_c), copper per IEC 60028"
        };
        row(
            s,
            "resistance R_a",
            format!("{} ohm at 20 C ({what})", fmt_fixed(x.r20_ohm, 4)),
        );
        if x.from_class {
            row(
                s,
                "",
                format!(
                    "{} ohm at {} C, the class reference temperature (234.5 C rule)",
                    fmt_fixed(x.hot_ohm, 4),
                    fmt_fixed(x.reference_c, 0)
                ),
            );
        }
    }
}

/// The mode, the induced EMF and what follows from it: flux, speed, K*Phi, torque.
fn emf(s: &mut String, d: &Design, r: &RatingReport) {
    if let Some(e) = &r.emf {
        row(s, "mode", e.mode.as_str());
        match (e.basis, e.terminal_v) {
            (EmfBasis::Terminal, Some(v)) => {
                let sign = if e.mode == Mode::Motor { "-" } else { "+" };
                let ir = if e.ir_known {
                    fmt_fixed(e.ir_drop_v, 2)
                } else {
                    "n/a".to_string()
                };
                row(
                    s,
                    "induced EMF E",
                    format!(
                        "{} V = {} V {sign} I*R_a {} V {sign} brush drop {} V ({})",
                        fmt_fixed(e.emf_v, 2),
                        fmt_fixed(v, 2),
                        ir,
                        fmt_fixed(e.brush_drop_v, 2),
                        e.brush_grade.as_str()
                    ),
                );
            }
            _ => row(
                s,
                "induced EMF E",
                format!("{} V from the flux and the speed", fmt_fixed(e.emf_v, 2)),
            ),
        }
        if let (Some(f), Some(n)) = (e.flux_needed_mwb, d.speed_rpm) {
            row(
                s,
                "flux needed",
                format!(
                    "{} mWb per pole at {} rpm",
                    fmt_fixed(f, 3),
                    fmt_fixed(n, 0)
                ),
            );
        }
        if let (Some(n), Some(f)) = (e.speed_at_flux_rpm, d.flux_per_pole_mwb) {
            row(
                s,
                "speed at given flux",
                format!(
                    "{} rpm at {} mWb per pole",
                    fmt_fixed(n, 1),
                    fmt_fixed(f, 3)
                ),
            );
        }
        if let Some(k) = e.k_phi {
            row(s, "K*Phi", format!("{} V s/rad = N m/A", fmt_fixed(k, 4)));
        }
        if let Some(v) = e.v_per_1000_rpm {
            row(s, "EMF per 1000 rpm", format!("{} V", fmt_fixed(v, 2)));
        }
        if let Some(t) = e.torque_nm {
            row(
                s,
                "rated torque",
                format!("{} N m (K*Phi*I)", fmt_fixed(t, 2)),
            );
        }
    }
}

/// Segment voltage, currents and the electric loading.
fn loading(s: &mut String, d: &Design, r: &RatingReport) {
    if let Some(v) = &r.segment_voltage {
        row(
            s,
            "segment voltage",
            format!("{} V average (E*P/C)", fmt_fixed(v.average_v, 2)),
        );
        row(
            s,
            "",
            format!(
                "{} V peak, estimated (average / pole arc {})",
                fmt_fixed(v.peak_v, 2),
                fmt_fixed(v.pole_arc, 2)
            ),
        );
        row(
            s,
            "",
            format!(
                "C_min {} for the average limit, {} for the peak limit",
                count(v.c_min_average),
                count(v.c_min_peak)
            ),
        );
    }
    if let Some(c) = &r.currents {
        row(
            s,
            "current per path",
            format!(
                "{} A (I/a, I = {} A)",
                fmt_fixed(c.per_path_a, 2),
                fmt_fixed(c.armature_a, 2)
            ),
        );
        row(
            s,
            "brush arm current",
            format!(
                "{} A ({} arms)",
                fmt_fixed(c.per_brush_arm_a, 2),
                c.brush_arms
            ),
        );
        if let Some(j) = c.density_a_mm2 {
            row(s, "current density", d.units.current_density(j));
        }
    }
    if let Some(q) = r.electric_loading_a_m {
        row(
            s,
            "electric loading",
            format!("{} (Z*I/(a*pi*D))", d.units.loading(q)),
        );
    }
}

/// The commutator: segment pitch, peripheral speed, brush width and coils shorted.
fn commutator(s: &mut String, d: &Design, r: &RatingReport) {
    if let Some(k) = &r.commutator {
        if let Some(p) = k.segment_pitch_mm {
            row(
                s,
                "segment pitch",
                format!("{} (pi*D_c/C)", d.units.length(p, 2)),
            );
        }
        if let (Some(v), Some(n)) = (k.peripheral_speed_m_s, k.speed_rpm) {
            row(
                s,
                "commutator speed",
                format!("{} at {} rpm", d.units.surface_speed(v), fmt_fixed(n, 0)),
            );
        }
        if let Some(b) = k.brush_width_segments {
            let mm = k
                .brush_width_mm
                .map_or(String::new(), |w| format!(" ({})", d.units.length(w, 1)));
            row(
                s,
                "brush width",
                format!("{} segment pitches{mm}", fmt_fixed(b, 2)),
            );
        }
        if let (Some(lo), Some(hi), Some(how)) = (
            k.coils_shorted_min,
            k.coils_shorted_max,
            coils_shorted_rule(d, k),
        ) {
            let n = if lo == hi {
                lo.to_string()
            } else {
                format!("{lo} to {hi}")
            };
            row(s, "coils shorted", format!("{n} per brush at once ({how})"));
        }
    }
    if let Some(x) = &r.reactance {
        row(
            s,
            "reactance voltage",
            rating_words::reactance(x, d.limits.get(LimitId::ReactanceVoltsNoInterpolesMax)),
        );
    }
}

/// The losses and the withstand test voltages with their source and caution.
fn losses_and_tests(s: &mut String, r: &RatingReport) {
    if let Some(l) = &r.losses {
        if let Some(w) = l.copper_w {
            row(
                s,
                "copper loss",
                format!(
                    "{} W (I^2*R_a at {} C)",
                    fmt_fixed(w, 1),
                    fmt_fixed(l.copper_at_c, 0)
                ),
            );
        }
        row(
            s,
            "brush contact loss",
            format!("{} W (brush drop * I)", fmt_fixed(l.brush_w, 1)),
        );
    }
    if let Some(t) = &r.test_voltage {
        row(
            s,
            "withstand test, 1 min",
            format!(
                "new or fully rewound: {} V ({})",
                fmt_fixed(t.new_v, 0),
                test_rule(t.rule)
            ),
        );
        row(
            s,
            "",
            format!(
                "overhauled, cleaned and dried: {} V (1.5*U, minimum {} V)",
                fmt_fixed(t.overhauled_v, 0),
                fmt_fixed(t.overhauled_minimum_v, 0)
            ),
        );
        row(
            s,
            "",
            format!(
                "partly rewound: about {} V (75 % of new) [from memory]",
                fmt_fixed(t.partial_v, 0)
            ),
        );
        row(s, "", format!("source: {TEST_VOLTAGE_SOURCE}"));
        row(s, "", format!("CAUTION: {TEST_VOLTAGE_CAUTION}"));
    }
}

/// Advice for the limits not met, then the notes.
fn advice_and_notes(s: &mut String, r: &RatingReport) {
    let failed: Vec<_> = r
        .checks
        .iter()
        .filter(|c| !c.passed && !c.advice.is_empty())
        .collect();
    if !failed.is_empty() {
        let _ = writeln!(s, "  advice for limits not met:");
        for c in failed {
            let _ = writeln!(s, "    {}:", c.rule.id);
            for a in &c.advice {
                let _ = writeln!(s, "      - {a}");
            }
        }
    }
    if !r.notes.is_empty() {
        let _ = writeln!(s, "  notes:");
        for n in &r.notes {
            let _ = writeln!(s, "    - {}", note(n));
        }
    }
}

/// A count, or words for one beyond `u32`.
fn count(n: Option<u32>) -> String {
    n.map_or_else(|| "beyond counting".to_string(), |n| n.to_string())
}
