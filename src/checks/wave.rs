//! Wave rules: reentrancy, dummy coils (and the front connections that step over them), and
//! the direction that needs fewer of them. A whole commutator pitch is the design stage's to
//! refuse.
//!
//! Part of the `checks` stage.

use std::collections::BTreeMap;

use super::lap::{multiplex_brush, narrow_multiplex_brush};
use super::{Finding, Severity, rules};
use crate::base::number::{counted, plural};
use crate::design::Design;
use crate::winding::Winding;

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let (c, m, p) = (w.active_coils, d.multiplicity, d.pole_pairs());
    let r = w.reentrancy();
    out.push(Finding::of(
        &rules::WAVE_REENTRANCY,
        true,
        format!(
            "{}: gcd(C, y_c) = gcd({c}, {}) = {}; {}",
            counted(r, "closed winding", "closed windings"),
            w.pitches.commutator,
            w.reentrancy_formula,
            if r == 1 {
                "singly re-entrant"
            } else {
                "multiply re-entrant"
            }
        ),
    ));
    if m > 1 {
        out.push(multiplex_brush(m));
        out.extend(narrow_multiplex_brush(m, w));
    }
    let dummies = w.dummy_coils.len() as u32;
    let wave = d.winding_type.kind();
    let best = wave
        .default_segments(w.coils, m, p, d.direction)
        .unwrap_or(c);
    if dummies > 0 || best > c {
        let list = w
            .dummy_coils
            .iter()
            .map(u32::to_string)
            .collect::<Vec<_>>()
            .join(", ");
        let (passed, sev, extra) = if best > c {
            (
                false,
                Severity::Warning,
                format!(
                    "; {best} segments would need only {}",
                    counted(w.coils - best, "dummy coil", "dummy coils")
                ),
            )
        } else {
            (true, Severity::Info, String::new())
        };
        out.push(Finding::of(&rules::WAVE_DUMMY_COILS, passed, format!(
                "{} at {} {list}: wind {them} for balance, cut the ends back and tape {them}{extra}",
                counted(dummies, "dummy coil", "dummy coils"),
                plural(dummies, "position", "positions"),
                them = plural(dummies, "it", "them")
            )).lowered_to(sev));
    }
    dummy_front_pitch(w, out);
    if w.segments_derived {
        let other = d.direction.other();
        if let Some(alt) = wave.default_segments(w.coils, m, p, other)
            && alt > c
        {
            out.push(Finding::of(
                &rules::WAVE_DIRECTION_HINT,
                true,
                format!(
                    "a {} winding would use {alt} segments with {} instead of {}",
                    other.as_str(),
                    counted(w.coils - alt, "dummy coil", "dummy coils"),
                    dummies
                ),
            ));
        }
    }
}

/// Most coil runs a finding names before it says how many more there are.
const LISTED_RUNS: usize = 8;

/// The front connections that step over dummy coils, so that their front pitch is not the
/// nominal one: how many, by how much, and from which coils.
fn dummy_front_pitch(w: &Winding, out: &mut Vec<Finding>) {
    let nominal = w.pitches.front;
    let mut by_pitch: BTreeMap<i64, Vec<u32>> = BTreeMap::new();
    for c in &w.connections {
        if let Some(y) = c.front_pitch.filter(|&y| y != nominal) {
            by_pitch.entry(y).or_default().push(c.coil);
        }
    }
    if by_pitch.is_empty() {
        return;
    }
    let stepping: usize = by_pitch.values().map(Vec::len).sum();
    let groups = by_pitch
        .iter()
        .map(|(y, coils)| {
            format!(
                "{} use {y} ({:+}), from {} {}",
                coils.len(),
                y - nominal,
                plural(coils.len(), "coil", "coils"),
                coil_runs(coils)
            )
        })
        .collect::<Vec<_>>()
        .join("; ");
    out.push(Finding::of(&rules::WAVE_DUMMY_FRONT_PITCH, true, format!(
            "{stepping} of {} front connections step over a dummy coil and differ from the nominal y_f = {nominal} by 2 coil sides per dummy: {groups}",
            w.active_coils
        )));
}

/// Ascending coil numbers as runs (`24-35, 40`), at most [`LISTED_RUNS`] of them, then how
/// many coils are left out.
fn coil_runs(coils: &[u32]) -> String {
    let mut runs: Vec<(u32, u32)> = Vec::new();
    for &c in coils {
        match runs.last_mut() {
            Some((_, last)) if *last + 1 == c => *last = c,
            _ => runs.push((c, c)),
        }
    }
    let mut text = runs
        .iter()
        .take(LISTED_RUNS)
        .map(|&(a, b)| {
            if a == b {
                a.to_string()
            } else {
                format!("{a}-{b}")
            }
        })
        .collect::<Vec<_>>()
        .join(", ");
    let left: u32 = runs.iter().skip(LISTED_RUNS).map(|(a, b)| b - a + 1).sum();
    if left > 0 {
        text.push_str(&format!(" and {left} more"));
    }
    text
}
