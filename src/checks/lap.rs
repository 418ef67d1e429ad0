//! Lap rules: reentrancy of multiplex windings, equalizer feasibility, brush width.
//!
//! Part of the `checks` stage.

use super::{Finding, Severity, rules};
use crate::base::number::{counted, fmt_fixed};
use crate::design::{Design, EqualizerChoice};
use crate::winding::{EqualizerPlan, Winding};

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let m = d.multiplicity;
    if m > 1 {
        let r = w.reentrancy();
        out.push(Finding::of(
            &rules::LAP_REENTRANCY,
            true,
            format!(
                "{}: gcd(C, m) = gcd({}, {m}) = {}; {}",
                counted(r, "closed winding", "closed windings"),
                w.active_coils,
                w.reentrancy_formula,
                if r == 1 {
                    "singly re-entrant"
                } else {
                    "multiply re-entrant: each closed winding is wound and tested on its own"
                }
            ),
        ));
        out.push(multiplex_brush(m));
        out.extend(narrow_multiplex_brush(m, w));
    }
    let asked = d.equalizers != EqualizerChoice::None;
    match &w.equalizers {
        EqualizerPlan::Possible(e) => {
            let fitted = e.groups.len();
            let pct = 100.0 * fitted as f64 / f64::from(e.possible.max(1));
            let msg = if fitted == 0 {
                format!(
                    "equalizers possible at a pitch of {} segments ({} possible, {} points each); none fitted: large lap machines usually carry 1/3 to 1/2 of them",
                    e.pitch,
                    e.possible,
                    d.pole_pairs()
                )
            } else {
                format!(
                    "{fitted} of {} possible equalizers fitted ({} %), pitch {} segments, {} points each",
                    e.possible,
                    fmt_fixed(pct, 1),
                    e.pitch,
                    d.pole_pairs()
                )
            };
            out.push(Finding::of(&rules::LAP_EQUALIZERS, true, msg).lowered_to(Severity::Info));
        }
        EqualizerPlan::Impossible(why) => out.push(
            Finding::of(
                &rules::LAP_EQUALIZERS,
                !asked,
                format!("equalizing is impossible: {why}"),
            )
            .lowered_to(if asked {
                Severity::Error
            } else {
                Severity::Info
            }),
        ),
        EqualizerPlan::NotNeeded => {}
    }
}

/// A multiplex winding whose brush is narrower than m bars: a coil joining bars s and s + m
/// is shorted only while the brush spans more than m − 1 bar pitches, and a brush touching
/// fewer than m + 1 bars at a time leaves windings uncollected for part of each bar pitch
/// [derived from the contact model; common practice: brushes at least m bars wide]. An error;
/// `None` when the trace's brush is wide enough.
pub(super) fn narrow_multiplex_brush(m: u32, w: &Winding) -> Option<Finding> {
    let b = w.brush_width.segments;
    (m > 1 && b < f64::from(m) - 1e-9).then(|| {
        Finding::of(&rules::MULTIPLEX_BRUSH_TOO_NARROW, false, format!(
                "the brush is {} segment pitches wide on a multiplicity-{m} winding: a coil joining bars s and s+{m} is shorted only while the brush spans more than {} bar pitch(es), so it must be at least {m} segment pitches wide to commutate and collect from every winding",
                fmt_fixed(b, 2),
                m - 1
            ))
    })
}

/// The brush-width note for multiplex windings.
pub(super) fn multiplex_brush(m: u32) -> Finding {
    Finding::of(
        &rules::MULTIPLEX_BRUSH_WIDTH,
        true,
        format!(
            "multiplicity {m}: each brush must cover at least {m} segments to collect from every winding"
        ),
    )
}
