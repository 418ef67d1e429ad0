//! Wave rules: reentrancy, dummy coils, and the direction that needs fewer of them. A whole
//! commutator pitch is the design stage's to refuse.
//!
//! Part of the `checks` stage.

use super::lap::{multiplex_brush, narrow_multiplex_brush};
use super::sources::{DUMMY, PITCH_TEXTS};
use super::{Finding, Severity};
use crate::design::{Design, WindingType};
use crate::winding::Winding;

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let (c, m, p) = (w.active_coils, d.multiplicity, d.pole_pairs());
    let r = w.reentrancy();
    out.push(Finding::new(
        "wave.reentrancy",
        Severity::Info,
        true,
        format!(
            "{r} closed winding(s): gcd(C, y_c) = gcd({c}, {}) = {}; {}",
            w.pitches.commutator,
            w.reentrancy_formula,
            if r == 1 {
                "singly re-entrant"
            } else {
                "multiply re-entrant"
            }
        ),
        PITCH_TEXTS,
    ));
    if m > 1 {
        out.push(multiplex_brush(m));
        out.extend(narrow_multiplex_brush(m, w));
    }
    let dummies = w.dummy_coils.len() as u32;
    let wave = WindingType::Wave.kind();
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
                    "; {best} segments would need only {} dummy coil(s)",
                    w.coils - best
                ),
            )
        } else {
            (true, Severity::Info, String::new())
        };
        out.push(Finding::new(
            "wave.dummy-coils",
            sev,
            passed,
            format!(
                "{dummies} dummy coil(s) at position(s) {list}: wind them for balance, cut the ends back and tape them{extra}"
            ),
            DUMMY,
        ));
    }
    if w.segments_derived {
        let other = d.direction.other();
        if let Some(alt) = wave.default_segments(w.coils, m, p, other)
            && alt > c
        {
            out.push(Finding::new(
                "wave.direction-hint",
                Severity::Info,
                true,
                format!(
                    "a {} winding would use {alt} segments with {} dummy coil(s) instead of {}",
                    other.as_str(),
                    w.coils - alt,
                    dummies
                ),
                DUMMY,
            ));
        }
    }
}
