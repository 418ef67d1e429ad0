//! The `rewind` text report: flux kept, new turns and speed error, conductor options, slot fill,
//! segments, and the new design's rating checks.
//!
//! Part of the `render` stage: formats a [`RewindPlan`]; no arithmetic beyond display.

use std::fmt::Write;

use crate::base::caution::CAUTIONS;
use crate::base::number::{counted, fmt_fixed, fmt_signed};
use crate::base::visible::visible;
use crate::base::{Severity, Units};
use crate::checks::Checked;
use crate::features::rewind::alternatives::{Alternative, Change};
use crate::features::rewind::{NoLoadTest, RewindPlan};
use crate::rating::RatingReport;
use crate::rating::conductor::{self, WireFamily};

fn section(s: &mut String, title: &str) {
    let _ = writeln!(s, "\n{title}\n{}", "-".repeat(title.len()));
}

fn row(s: &mut String, label: &str, value: impl std::fmt::Display) {
    let _ = writeln!(s, "  {label:<22}{value}");
}

/// An alternative offered with the command line that gives it (the CLI words it).
pub struct Offered<'a> {
    /// The command line.
    pub command: String,
    /// The worked-out alternative.
    pub alternative: &'a Alternative,
}

/// What a refused rewind offers: the alternatives that pass, and how many were tried.
pub struct Offers<'a> {
    /// Requests worked out and checked.
    pub tried: usize,
    /// Nearest first.
    pub offered: Vec<Offered<'a>>,
    /// What the designer's search over the old core found, worded (empty when it did not
    /// run).
    pub searched: String,
}

/// Renders the rewind report; `new` is the new design checked, `offers` what a refused one
/// offers instead, `version` the armsheet version for the first line (the CLI passes its
/// package version).
pub fn render_rewind(
    p: &RewindPlan,
    file: &str,
    asked: &str,
    new: &Checked,
    offers: Option<&Offers>,
    version: &str,
) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "armsheet {version} - rewind of {}", visible(file));
    row(&mut s, "asked", visible(asked));
    flux_and_speed(&mut s, p);
    winding(&mut s, p);
    conductor_sizes(&mut s, p);
    plan_notes(&mut s, p);
    new_design_verdict(&mut s, new);
    new_rating_checks(&mut s, new.rating.as_ref());
    if let Some(o) = offers {
        offered(&mut s, o, p);
        s.push_str(&o.searched);
    }
    caution(&mut s);
    s
}

/// What `check` says of the new design: every winding rule that fails (errors, then warnings),
/// and whether the file may be written; the rating's own lines follow.
fn new_design_verdict(s: &mut String, new: &Checked) {
    section(s, "NEW DESIGN: CHECK");
    let failed: Vec<_> = new
        .findings
        .iter()
        .filter(|f| !f.passed && f.severity != Severity::Info && !is_rating(&f.id))
        .collect();
    for severity in [Severity::Error, Severity::Warning] {
        for f in failed.iter().filter(|f| f.severity == severity) {
            let _ = writeln!(
                s,
                "  [{}] {}: {}",
                severity.as_str(),
                f.id,
                visible(&f.message)
            );
        }
    }
    if new.has_errors() {
        let _ = writeln!(
            s,
            "  check refuses the new design (the failed checks above and in the rating checks below): it was not written (exit 1); the fixes below, or another connection, voltage or speed, may pass"
        );
    } else {
        let _ = writeln!(s, "  check passes the new design");
    }
}

/// The alternatives that pass `check`, nearest first, each with its command line; or that
/// none of those tried does.
fn offered(s: &mut String, o: &Offers, p: &RewindPlan) {
    section(s, "ALTERNATIVES THAT PASS CHECK");
    if o.offered.is_empty() {
        let _ = writeln!(
            s,
            "  none: of {} requests tried at {} (another connection, multiplicity or coils per slot), check passes none; try another voltage or speed",
            o.tried,
            volts(p.new.voltage)
        );
        return;
    }
    let _ = writeln!(
        s,
        "  nearest first (fewest changes, then the commutator kept, then the speed error); {} of {} tried shown:",
        o.offered.len(),
        o.tried
    );
    for (i, off) in o.offered.iter().enumerate() {
        let a = &off.alternative.plan;
        let n = &a.new;
        let changes: Vec<String> = off
            .alternative
            .changes
            .iter()
            .map(|c| match c {
                Change::Kind(k) => format!("{} winding", k.as_str()),
                Change::Multiplicity(m) => format!("multiplicity {m}"),
                Change::CoilsPerSlot(u) => format!("{} per slot", counted(*u, "coil", "coils")),
            })
            .collect();
        let wire = n.conductor.as_ref().map_or(String::new(), |c| {
            format!(", {}", conductor::describe(c, a.design.units))
        });
        let _ = writeln!(
            s,
            "  {}. {}: {}, {} turns{wire}; {} rpm at {} ({} %), {} V between segments",
            i + 1,
            changes.join(", "),
            n.scheme.label(),
            n.turns,
            fmt_fixed(a.speed_at_whole_turns, 0),
            volts(n.voltage),
            fmt_signed(a.speed_error * 100.0, 2),
            fmt_fixed(a.segment_volts_avg, 2)
        );
        let _ = writeln!(s, "     {}", visible(&off.command));
    }
}

/// Whether a finding id is one of the rating's family (they have their own section below).
fn is_rating(id: &str) -> bool {
    id.starts_with("rating.")
}

/// The flux kept, the voltages, the EMFs and the speed asked.
fn flux_and_speed(s: &mut String, p: &RewindPlan) {
    let (o, n) = (&p.old, &p.new);
    section(s, "FLUX AND SPEED");
    row(
        s,
        "flux per pole kept",
        format!(
            "{} mWb ({})",
            fmt_fixed(p.flux_mwb, 3),
            p.flux_source.describe()
        ),
    );
    row(
        s,
        "voltage",
        format!("{} -> {}", volts(o.voltage), volts(n.voltage)),
    );
    row(
        s,
        "EMF",
        format!("{} V -> {} V", fmt_fixed(o.emf_v, 2), fmt_fixed(n.emf_v, 2)),
    );
    row(
        s,
        "speed asked",
        format!(
            "{} rpm (was {} rpm)",
            fmt_fixed(n.speed_rpm, 0),
            fmt_fixed(o.speed_rpm, 0)
        ),
    );
}

/// The connection, conductors, turns, the speed the whole turns give, current and segment voltage.
fn winding(s: &mut String, p: &RewindPlan) {
    let (o, n) = (&p.old, &p.new);
    section(s, "WINDING");
    row(
        s,
        "connection",
        format!("{} -> {}", o.scheme.label(), n.scheme.label()),
    );
    row(
        s,
        "conductors Z",
        format!(
            "{} -> {} ({} -> {} per path)",
            o.conductors,
            n.conductors,
            fmt_fixed(o.conductors as f64 / f64::from(o.scheme.paths), 1),
            fmt_fixed(n.conductors as f64 / f64::from(n.scheme.paths), 1)
        ),
    );
    row(
        s,
        "turns per coil",
        format!(
            "{} -> {} ({} exact)",
            o.turns,
            n.turns,
            fmt_fixed(p.exact_turns, 3)
        ),
    );
    row(
        s,
        "speed, whole turns",
        format!(
            "{} rpm at {}: {} % against the speed asked",
            fmt_fixed(p.speed_at_whole_turns, 1),
            volts(n.voltage),
            fmt_signed(p.speed_error * 100.0, 2)
        ),
    );
    if let (Some(i0), Some(i1)) = (o.current, n.current) {
        row(
            s,
            "current",
            format!(
                "{} A -> {} A (same power, same copper)",
                fmt_fixed(i0, 2),
                fmt_fixed(i1, 2)
            ),
        );
    }
    row(
        s,
        "segment voltage",
        format!("{} V average (E*P/C)", fmt_fixed(p.segment_volts_avg, 2)),
    );
}

/// The old conductor, the area needed, the size chosen, the standard sizes and the slot fill.
fn conductor_sizes(s: &mut String, p: &RewindPlan) {
    let (o, n) = (&p.old, &p.new);
    let u = p.design.units;
    section(s, "CONDUCTOR");
    match (p.area_needed_mm2, &o.conductor) {
        (Some(need), Some(oc)) => {
            row(
                s,
                "old",
                format!(
                    "{}, {}",
                    conductor::describe(oc, u),
                    u.wire_area(o.area_mm2.unwrap_or(0.0))
                ),
            );
            row(
                s,
                "needed",
                format!("{} for the same current density", u.wire_area(need)),
            );
            if let Some(nc) = &n.conductor {
                row(
                    s,
                    "chosen",
                    format!(
                        "{}, {}",
                        conductor::describe(nc, u),
                        u.wire_area(n.area_mm2.unwrap_or(0.0))
                    ),
                );
            }
            if let Some(j) = p.density_a_mm2 {
                row(
                    s,
                    "current density",
                    format!("{} with the chosen size", u.current_density(j)),
                );
            }
            let _ = writeln!(
                s,
                "  standard sizes (up to 4 in hand; area, error against the need):"
            );
            for fam in [WireFamily::Awg, WireFamily::Metric] {
                for opt in p.options.iter().filter(|x| x.family == fam) {
                    // A metric size is named as it is sold, in mm, in any design.
                    let (tag, named) = if fam == WireFamily::Awg {
                        ("AWG   ", u)
                    } else {
                        ("metric", Units::Millimetres)
                    };
                    let _ = writeln!(
                        s,
                        "    {tag} {:<28}{:>13}  {:>7} %",
                        opt.label(named),
                        u.wire_area(opt.area_mm2),
                        fmt_signed(opt.error * 100.0, 1)
                    );
                }
            }
            if let Some(f) = p.fill_exact {
                row(
                    s,
                    "slot fill",
                    format!(
                        "{} % of the original copper per slot at the exact area",
                        fmt_fixed(f * 100.0, 1)
                    ),
                );
            }
            if let Some(f) = p.fill_chosen {
                row(
                    s,
                    "",
                    format!("{} % with the chosen size", fmt_fixed(f * 100.0, 1)),
                );
            }
        }
        _ => row(
            s,
            "conductor",
            "not given in the design: no size worked out",
        ),
    }
}

/// The segment and other notes of the plan.
fn plan_notes(s: &mut String, p: &RewindPlan) {
    if !p.notes.is_empty() {
        section(s, "SEGMENTS AND NOTES");
        for note in &p.notes {
            let _ = writeln!(s, "  - {}", visible(note));
        }
    }
}

/// The new design's rating checks that fail (rating errors refuse the design too), and its
/// withstand test voltages.
fn new_rating_checks(s: &mut String, new_rating: Option<&RatingReport>) {
    if let Some(r) = new_rating {
        section(s, "NEW DESIGN: RATING CHECKS");
        let failed: Vec<_> = r.checks.iter().filter(|c| !c.passed).collect();
        if failed.is_empty() {
            let _ = writeln!(s, "  all {} rating checks within limits", r.checks.len());
        }
        for c in failed {
            let _ = writeln!(
                s,
                "  [{}] {}: {}",
                c.rule.level.as_str(),
                c.rule.id,
                c.message()
            );
        }
        if let Some(t) = &r.test_voltage {
            row(
                s,
                "withstand test, 1 min",
                format!(
                    "new or fully rewound {} V; overhauled {} V (IEC 60034-1)",
                    fmt_fixed(t.new_v, 0),
                    fmt_fixed(t.overhauled_v, 0)
                ),
            );
        }
    }
}

/// The cautions every output carries.
fn caution(s: &mut String) {
    section(s, "CAUTION");
    for c in CAUTIONS {
        let _ = writeln!(s, "  - {c}");
    }
}

/// A voltage, or "(not given)".
fn volts(x: Option<f64>) -> String {
    x.map_or("(not given)".to_string(), |v| {
        format!("{} V", fmt_fixed(v, 1))
    })
}

/// Renders the no-load test report of `rewind --from-test` without `--voltage`: the flux per
/// pole with its arithmetic, the design's own flux against it, and what follows at the rating.
pub fn render_no_load(t: &NoLoadTest, file: &str, version: &str) -> String {
    let mut s = format!("armsheet {version} - no-load test of {}\n", visible(file));
    let d = &t.design;
    let _ = writeln!(
        s,
        "  flux per pole         {} mWb = 60*a*V0/(P*Z*N0) = 60*{}*{}/({}*{}*{}) (open circuit, E = V0)",
        fmt_fixed(t.flux_mwb, 4),
        t.paths,
        fmt_fixed(t.volts, 2),
        d.poles,
        t.conductors,
        fmt_fixed(t.rpm, 1)
    );
    if let Some(f) = t.design_flux_mwb {
        let _ = writeln!(
            s,
            "  design flux           {} mWb ({} % against the test)",
            fmt_fixed(f, 4),
            fmt_signed((f / t.flux_mwb - 1.0) * 100.0, 2)
        );
    }
    if let Some(n) = t.rated.emf.as_ref().and_then(|e| e.speed_at_flux_rpm) {
        let _ = writeln!(
            s,
            "  speed at the rating   {} rpm with this flux",
            fmt_fixed(n, 1)
        );
    }
    if let Some(r) = &t.rated.resistance {
        let how = if r.measured {
            "measured (--ra)"
        } else {
            "calculated"
        };
        let _ = writeln!(
            s,
            "  armature resistance   {} ohm at 20 C, {how}",
            fmt_fixed(r.r20_ohm, 4)
        );
    }
    s.push_str("  use it: armsheet rewind DESIGN --from-test V0 N0 --voltage V\n");
    s
}

/// The comment header of a design file that records a no-load test's flux.
pub fn no_load_header(t: &NoLoadTest, file: &str, asked: &str) -> Vec<String> {
    vec![
        format!("armsheet: {file} with the flux per pole from a no-load test"),
        format!("asked: {asked}"),
        format!(
            "flux per pole {} mWb = 60*a*V0/(P*Z*N0), open circuit",
            fmt_fixed(t.flux_mwb, 4)
        ),
    ]
}
