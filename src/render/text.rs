//! The `check` text report: summary, pitches, paths and brushes, constants, checks,
//! connection table and winding sequence.
//!
//! Part of the `render` stage. Plain ASCII except for the check marks, which are Unicode only
//! when the CLI says the output is a terminal.

use std::fmt::Write;

use crate::base::caution::CAUTIONS;
use crate::base::number::{counted, fmt_fixed, plural};
use crate::base::visible::{visible, visible_lines};
use crate::base::{Finding, Severity};
use crate::checks::Checked;
use crate::design::{Design, SpanSource};
use crate::theory::words::{half_bars_words, lead_swing_words, multiplicity_word, span_shop};
use crate::winding::{EqualizerPlan, Winding};

/// Options for the text report.
#[derive(Clone, Copy, Debug, Default)]
pub struct TextOptions<'a> {
    /// Use Unicode check marks (for a terminal).
    pub unicode: bool,
    /// The program version for the header line (the CLI passes its package version).
    pub version: &'a str,
}

/// Renders the whole `check` report.
pub fn render_text(r: &Checked, opts: TextOptions<'_>) -> String {
    let mut s = String::new();
    let (d, w) = (&r.design, &r.winding);
    header(&mut s, d, opts.version);
    summary(&mut s, d, w);
    pitches(&mut s, d, w);
    paths(&mut s, d, w);
    constants(&mut s, d, w);
    super::rating_text::rating_section(&mut s, d, r.rating.as_ref());
    checks(&mut s, &r.findings, opts);
    connections(&mut s, w);
    sequence(&mut s, w);
    equalizers(&mut s, w);
    section(&mut s, "CAUTION");
    for c in CAUTIONS {
        let _ = writeln!(s, "  - {c}");
    }
    s
}

fn section(s: &mut String, title: &str) {
    let _ = writeln!(s, "\n{title}\n{}", "-".repeat(title.len()));
}

fn row(s: &mut String, label: &str, value: impl std::fmt::Display) {
    let _ = writeln!(s, "  {label:<22}{value}");
}

fn header(s: &mut String, d: &Design, version: &str) {
    // Every text the design file (or its name) brings is made visible: no terminal escapes.
    let _ = writeln!(
        s,
        "armsheet {version} - winding check of {}",
        visible(&d.file_name)
    );
    let j = &d.job;
    let fields = [
        ("job", &j.id),
        ("title", &j.title),
        ("customer", &j.customer),
        ("date", &j.date),
    ];
    for (label, value) in fields {
        if let Some(v) = value {
            let _ = writeln!(s, "  {label:<10}{}", visible(v));
        }
    }
    if let Some(n) = &j.notes {
        for (i, line) in visible_lines(n).enumerate() {
            let _ = writeln!(s, "  {:<10}{line}", if i == 0 { "notes" } else { "" });
        }
    }
}

fn summary(s: &mut String, d: &Design, w: &Winding) {
    section(s, "DESIGN");
    row(
        s,
        "winding",
        format!(
            "{} {}, {}",
            multiplicity_word(d.multiplicity),
            d.winding_type.as_str(),
            d.direction.as_str()
        ),
    );
    row(s, "poles", d.poles);
    row(s, "slots", d.slots);
    row(
        s,
        "coils per slot (u)",
        format!("{} per layer, two layers", d.coils_per_slot),
    );
    row(s, "coil positions N", w.coils);
    let how = if w.segments_derived {
        "worked out from the coils"
    } else {
        "as given"
    };
    row(s, "segments C", format!("{} ({how})", w.active_coils));
    let dummies = if w.dummy_coils.is_empty() {
        "none".to_string()
    } else {
        format!(
            "{} at {} {}",
            w.dummy_coils.len(),
            plural(w.dummy_coils.len(), "position", "positions"),
            join(&w.dummy_coils)
        )
    };
    row(s, "dummy coils", dummies);
    row(s, "turns per coil", d.turns);
    row(
        s,
        "conductors Z",
        if w.is_multi_element() {
            format!("{} (2 x C x turns, both elements)", w.conductors)
        } else {
            format!("{} (2 x C x turns)", w.conductors)
        },
    );
    row(
        s,
        "rotation",
        format!(
            "{} seen from the commutator end; {}",
            d.rotation.as_str(),
            d.mode.as_str()
        ),
    );
    row(
        s,
        "pole arc",
        format!("{} of the pole pitch", fmt_fixed(d.pole_arc, 2)),
    );
}

fn pitches(s: &mut String, d: &Design, w: &Winding) {
    section(
        s,
        "PITCHES (coil-side units; top sides odd, bottom sides even)",
    );
    let p = &w.pitches;
    let src = match d.span_source {
        SpanSource::Given => "given",
        SpanSource::Default => "default floor(S/P)",
    };
    row(
        s,
        "span y_s",
        format!(
            "{} slots, shop form \"{}\" ({src})",
            p.span,
            span_shop(p.span)
        ),
    );
    row(s, "back pitch y_b", format!("{} (2u x y_s + 1)", p.back));
    row(s, "front pitch y_f", p.front);
    row(s, "resultant pitch", p.resultant);
    row(
        s,
        "commutator pitch y_c",
        format!("{:+} segments", p.commutator),
    );
    if w.is_multi_element() {
        elements(s, d, w);
    }
}

/// The elements of a frog-leg winding, one row each: the design's multiplicity and direction
/// are the lap element's; the wave element's follow from them.
fn elements(s: &mut String, d: &Design, w: &Winding) {
    section(s, "ELEMENTS (one commutator, four leads a bar)");
    for e in &w.elements {
        let p = &e.pitches;
        row(
            s,
            &format!("{} element", e.kind.as_str()),
            format!(
                "{} {}, y_c {:+}, span {} (\"{}\"), y_b {}, y_f {}, {}, {}, {} traced (formula {})",
                multiplicity_word(e.multiplicity),
                e.direction.as_str(),
                p.commutator,
                p.span,
                span_shop(p.span),
                p.back,
                p.front,
                counted(e.turns, "turn", "turns"),
                counted(e.reentrancy, "closed winding", "closed windings"),
                counted(e.paths, "path", "paths"),
                e.paths_formula
            ),
        );
    }
    row(
        s,
        "rule",
        format!(
            "multiplicity and direction are the lap element's; the wave element takes m_w = m x p = {} x {} and the other direction",
            d.multiplicity,
            d.pole_pairs()
        ),
    );
}

fn paths(s: &mut String, d: &Design, w: &Winding) {
    section(s, "PATHS, BRUSHES AND REENTRANCY");
    row(
        s,
        "parallel paths a",
        format!(
            "{} traced (formula {})",
            w.parallel_paths(),
            w.paths_formula
        ),
    );
    row(
        s,
        "closed windings",
        format!(
            "{} traced (formula gcd(C, |y_c|){} = {})",
            w.reentrancy(),
            if w.is_multi_element() {
                ", summed over the elements"
            } else {
                ""
            },
            w.reentrancy_formula
        ),
    );
    row(
        s,
        "brush sets",
        format!(
            "{} fitted (fewest that work: {})",
            w.brush_sets(),
            w.brush_sets_minimum
        ),
    );
    row(
        s,
        "lead offset",
        half_bars_words(i64::from(d.lead_offset.0)),
    );
    let ls = &w.lead_swing;
    row(
        s,
        "brush position",
        format!(
            "{} ({} deg) from the pole axis; at 0 the brushes commutate each slot's coil group on neutral",
            half_bars_words(i64::from(d.lead_offset.0)),
            fmt_fixed(ls.from_pole_axis_deg, 2)
        ),
    );
    let (bar, right) = ls.in_line(w.active_coils);
    row(
        s,
        "lead swing",
        lead_swing_words(bar, right, ls.swing_half_bars(w.active_coils)),
    );
    let bw = &w.brush_width;
    row(
        s,
        "brush width",
        if bw.given {
            format!("{} segment pitches", fmt_fixed(bw.segments, 2))
        } else {
            format!(
                "{} segment pitches (m bars: no brush width given; set [commutator] brush_width_segments, or brush_width{u} with diameter{u})",
                fmt_fixed(bw.segments, 2),
                u = d.units.key_suffix()
            )
        },
    );
    let _ = writeln!(
        s,
        "\n  brush  polarity  angle from pole 1 axis  centre on segment  under"
    );
    for b in &w.brushes {
        let under = b
            .under
            .iter()
            .map(u32::to_string)
            .collect::<Vec<_>>()
            .join("-");
        let _ = writeln!(
            s,
            "  B{:<5} {:<9} {:>10} deg            {:>8}           {under}",
            b.index,
            b.polarity.sign(),
            fmt_fixed(b.angle_deg, 2),
            fmt_fixed(b.centre_segment, 2)
        );
    }
    let _ = writeln!(
        s,
        "\n  path  from  to    coils  EMF at reference (conductor units)"
    );
    for p in &w.paths {
        let _ = writeln!(
            s,
            "  {:<5} B{:<4} B{:<4} {:<6} {}",
            p.index,
            p.from_brush,
            p.to_brush,
            p.coils.len(),
            p.emf_units
        );
    }
    if !w.shorted_coils.is_empty() {
        let _ = writeln!(s);
        row(
            s,
            "under commutation",
            format!(
                "{} {} (shorted by a brush at the reference position)",
                plural(w.shorted_coils.len(), "coil", "coils"),
                join(&w.shorted_coils)
            ),
        );
    }
}

fn constants(s: &mut String, d: &Design, w: &Winding) {
    section(s, "CONSTANTS");
    let k = &w.constants;
    row(
        s,
        "machine constant K",
        format!(
            "{} (K = P x Z / (2 pi a))",
            fmt_fixed(k.machine_constant, 4)
        ),
    );
    if k.flux_linkage < 1.0 {
        row(
            s,
            "flux linked",
            format!(
                "{} of the pole flux: the span ({} slots, {} pole pitches) against a pole arc of {}; the constants and E below use it",
                fmt_fixed(k.flux_linkage, 3),
                d.span,
                fmt_fixed(
                    f64::from(d.span) * f64::from(d.poles) / f64::from(d.slots),
                    3
                ),
                fmt_fixed(d.pole_arc, 2)
            ),
        );
    }
    match (k.emf_constant_v_per_rad_s, d.flux_per_pole_mwb) {
        (Some(kphi), Some(flux)) => {
            row(s, "flux per pole", format!("{} mWb", fmt_fixed(flux, 3)));
            row(
                s,
                "EMF constant K.Phi",
                format!("{} V per rad/s", fmt_fixed(kphi, 4)),
            );
            row(
                s,
                "",
                format!(
                    "{} V per 1000 rpm",
                    fmt_fixed(k.emf_v_per_1000_rpm.unwrap_or(0.0), 2)
                ),
            );
            row(
                s,
                "torque constant K.Phi",
                format!(
                    "{} N.m per A",
                    fmt_fixed(k.torque_constant_nm_per_a.unwrap_or(0.0), 4)
                ),
            );
            match (k.emf_v, d.speed_rpm) {
                (Some(e), Some(n)) => row(
                    s,
                    "induced EMF E",
                    format!(
                        "{} V at {} rpm (E = K.Phi.omega)",
                        fmt_fixed(e, 2),
                        fmt_fixed(n, 0)
                    ),
                ),
                _ => row(s, "induced EMF E", "give speed_rpm to work it out"),
            }
        }
        _ => row(
            s,
            "EMF and torque",
            "give flux_per_pole_mwb to work out K.Phi (E = K.Phi.omega, T = K.Phi.Ia)",
        ),
    }
}

fn mark(f: &Finding, unicode: bool) -> &'static str {
    match (f.passed, f.severity, unicode) {
        (_, Severity::Info, false) => "[info]",
        (true, _, false) => "[pass]",
        (false, Severity::Warning, false) => "[WARN]",
        (false, _, false) => "[FAIL]",
        (_, Severity::Info, true) => "  ·  ",
        (true, _, true) => "  ✓  ",
        (false, Severity::Warning, true) => "  ▲  ",
        (false, _, true) => "  ✗  ",
    }
}

fn checks(s: &mut String, findings: &[Finding], opts: TextOptions<'_>) {
    section(s, "CHECKS");
    let errors = findings.iter().filter(|f| f.is_failure()).count();
    let warnings = findings
        .iter()
        .filter(|f| !f.passed && f.severity == Severity::Warning)
        .count();
    for f in findings {
        let _ = writeln!(s, "  {} {}: {}", mark(f, opts.unicode), f.id, f.message);
        let _ = writeln!(s, "         source: {}", f.source);
    }
    let _ = writeln!(
        s,
        "\n  {}, {}",
        counted(errors, "error", "errors"),
        counted(warnings, "warning", "warnings")
    );
}

fn connections(s: &mut String, w: &Winding) {
    section(
        s,
        "CONNECTION TABLE (slot/position; position 1 is the first coil side wound into the slot)",
    );
    let _ = writeln!(
        s,
        "  coil   top     bottom   start seg  end seg  front y_f  note"
    );
    for c in &w.connections {
        let seg = |x: Option<u32>| x.map_or_else(|| "-".to_string(), |v| v.to_string());
        let note = if c.dummy {
            "DUMMY: cut back and tape"
        } else if w.is_multi_element() {
            c.element.as_str()
        } else {
            ""
        };
        let front = c
            .front_pitch
            .map_or_else(|| "-".to_string(), |y| y.to_string());
        let line = format!(
            "  {:<6} {:<7} {:<8} {:<10} {:<8} {front:<10} {note}",
            c.coil,
            format!("{}/{}", c.top.slot, c.top.position),
            format!("{}/{}", c.bottom.slot, c.bottom.position),
            seg(c.start_segment),
            seg(c.end_segment)
        );
        let _ = writeln!(s, "{}", line.trim_end());
    }
}

fn sequence(s: &mut String, w: &Winding) {
    section(
        s,
        "WINDING SEQUENCE (segment -coil- segment, in trace order)",
    );
    for (i, cw) in w.closed_windings.iter().enumerate() {
        let element = match cw.steps.first() {
            Some(st) if w.is_multi_element() => {
                format!("{} element, ", w.element_of(st.coil).kind.as_str())
            }
            _ => String::new(),
        };
        let _ = writeln!(
            s,
            "  closed winding {} ({element}{} coils):",
            i + 1,
            cw.steps.len()
        );
        let mut line = String::from("   ");
        for (k, st) in cw.steps.iter().enumerate() {
            let piece = if k == 0 {
                format!(" {} -c{}- {}", st.from_segment, st.coil, st.to_segment)
            } else {
                format!(" -c{}- {}", st.coil, st.to_segment)
            };
            if line.len() + piece.len() > 92 {
                let _ = writeln!(s, "{line}");
                line = String::from("   ");
            }
            line.push_str(&piece);
        }
        let _ = writeln!(s, "{line}");
    }
}

fn equalizers(s: &mut String, w: &Winding) {
    if let EqualizerPlan::Possible(e) = &w.equalizers
        && !e.groups.is_empty()
    {
        section(
            s,
            "EQUALIZERS (type A; each ring joins the segments listed)",
        );
        for (i, g) in e.groups.iter().enumerate() {
            let _ = writeln!(s, "  E{:<4} {}", i + 1, join(g));
        }
    }
}

fn join(v: &[u32]) -> String {
    v.iter().map(u32::to_string).collect::<Vec<_>>().join(", ")
}
