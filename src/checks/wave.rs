//! Wave rules: a whole commutator pitch, reentrancy, dummy coils.

use super::lap::multiplex_brush;
use super::sources::{DUMMY, PITCH_TEXTS};
use super::{Finding, Severity};
use crate::design::{Design, Direction, WindingType};
use crate::theory::wave_pitch_whole;
use crate::winding::Winding;

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let (c, m, p) = (w.active_coils, d.multiplicity, d.pole_pairs());
    let sign = if d.direction == Direction::Progressive {
        "+"
    } else {
        "-"
    };
    out.push(Finding::new(
        "wave.commutator-pitch",
        Severity::Error,
        wave_pitch_whole(c, m, p, d.direction),
        format!(
            "y_c = (C {sign} m)/p = ({c} {sign} {m})/{p} = {}",
            w.pitches.commutator
        ),
        PITCH_TEXTS,
    ));
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
