//! Frog-leg rules: the self-equalizing condition read off the traced connections, C/p whole,
//! the paths of each element, the wave element's reentrancy and equal coils in both elements.
//!
//! Part of the `checks` stage. Sources beside each rule: a trade association's technical note
//! on frog-leg windings, read in a public copy (docs/domain.md, "Frog-leg windings"); the
//! self-equalizing condition and its reading off the trace are derived.

use super::{Finding, rules};
use crate::design::Design;
use crate::winding::{Connection, Winding, WindingElement};

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let c = w.active_coils;
    let p = d.pole_pairs();
    // The kind gives the lap element first, then the wave element.
    let [lap, wave] = &w.elements[..] else {
        return;
    };
    out.push(Finding::of(&rules::FROGLEG_POLE_PAIRS_WHOLE, c.is_multiple_of(p), format!(
            "bars per pole pair C/p = {c}/{p}{}; must be whole so that bars two pole pitches apart exist",
            if c.is_multiple_of(p) {
                format!(" = {}", c / p)
            } else {
                " is not whole".to_string()
            }
        )));
    out.push(self_equalizing(w, lap, wave, c, p));
    out.push(one_neutral(d, w, lap, wave));
    out.push(element_paths(d, lap, wave));
    let r = wave.reentrancy;
    out.push(Finding::of(&rules::FROGLEG_WAVE_REENTRANCY, true, format!(
            "the wave element (multiplicity m_w = m x p = {}, y_c = {}) is {}: {r} closed winding(s) traced, gcd(C, y_c) = gcd({c}, {}) = {}; each is tested on its own",
            wave.multiplicity,
            wave.pitches.commutator,
            if r == 1 {
                "singly re-entrant".to_string()
            } else {
                format!("{r}-fold re-entrant")
            },
            wave.pitches.commutator.abs(),
            wave.reentrancy_formula
        )));
    let same = lap.turns == wave.turns;
    out.push(Finding::of(&rules::FROGLEG_EQUAL_COILS, same, format!(
            "lap coils {} turn(s), wave coils {} turn(s), both of the one [conductor]{}",
            lap.turns,
            wave.turns,
            if same {
                ""
            } else {
                ": the trade winds both elements alike; unequal turns give the elements unequal EMFs and a circulating current between them"
            }
        )));
}

/// Where element `e` is commutated, read off the traced winding: the first active coil's bar
/// midpoint (its start bar plus half the element's y_c) less the coil's centre line (its top
/// slot's centre plus half its span), in bars, modulo two pole pitches C/p, where the field
/// and the brushes repeat [derived: a coil is commutated with the brush at the midpoint of its
/// bars; docs/domain.md, "Frog-leg windings"].
fn commutated_at(d: &Design, w: &Winding, e: &WindingElement) -> Option<f64> {
    let c = f64::from(w.active_coils);
    let s = f64::from(d.slots);
    let k = rows(w, e).iter().find(|k| !k.dummy)?;
    let start = f64::from(k.start_segment?);
    let span = f64::from((k.bottom.slot + d.slots - k.top.slot) % d.slots);
    let centre_deg = (f64::from(k.top.slot - 1) + span / 2.0) * 360.0 / s;
    let centre_bars = (centre_deg - w.segment1_deg) * c / 360.0;
    let mid_bars = start - 1.0 + e.pitches.commutator as f64 / 2.0;
    Some((mid_bars - centre_bars).rem_euclid(c / f64::from(d.pole_pairs())))
}

/// Both elements are commutated on one neutral: the same brushes short the lap coils and the
/// wave coils with their sides in the same place (within a quarter bar).
fn one_neutral(d: &Design, w: &Winding, lap: &WindingElement, wave: &WindingElement) -> Finding {
    let pair = f64::from(w.active_coils) / f64::from(d.pole_pairs());
    let (a, b) = (commutated_at(d, w, lap), commutated_at(d, w, wave));
    let apart = match (a, b) {
        (Some(a), Some(b)) => {
            let x = (b - a).rem_euclid(pair);
            x.min(pair - x)
        }
        _ => 0.0,
    };
    let ok = apart < 0.25;
    Finding::of(
        &rules::FROGLEG_ONE_NEUTRAL,
        ok,
        if ok {
            "the lap and the wave coils are commutated on one neutral: each element's first coil has its bar midpoint at the same place from its centre line".to_string()
        } else {
            format!(
                "the wave coils are commutated {} bar(s) off the lap coils' neutral: brushes on the lap neutral short the wave coils off it; a wave_span one slot longer or shorter moves the wave element by u/2 bars",
                crate::base::number::fmt_fixed(apart, 1)
            )
        },
    )
}

/// The element's coil rows of `w`.
fn rows<'a>(w: &'a Winding, e: &WindingElement) -> &'a [Connection] {
    let first = (e.first_coil - 1) as usize;
    &w.connections[first..first + e.coils as usize]
}

/// y_c(lap) + |y_c(wave)| = C/p, read off the traced connections: from every bar, the lap coil
/// that starts there and the wave coil that starts where it ends reach the bar two pole
/// pitches on [derived; docs/domain.md, "Frog-leg windings"].
fn self_equalizing(
    w: &Winding,
    lap: &WindingElement,
    wave: &WindingElement,
    c: u32,
    p: u32,
) -> Finding {
    let starts = |e: &WindingElement| {
        let mut by_bar = vec![None; c as usize];
        for k in rows(w, e) {
            if let (Some(a), Some(b)) = (k.start_segment, k.end_segment) {
                by_bar[(a - 1) as usize] = Some(b);
            }
        }
        by_bar
    };
    let (lap_to, wave_to) = (starts(lap), starts(wave));
    let pair = c / p;
    let reach = |bar: u32| {
        let mid = lap_to[(bar - 1) as usize]?;
        wave_to[(mid - 1) as usize]
    };
    let wrong: Vec<u32> = (1..=c)
        .filter(|&b| reach(b) != Some((b - 1 + pair) % c + 1))
        .collect();
    let (yl, yw) = (lap.pitches.commutator, wave.pitches.commutator);
    let first = reach(1).map_or("nowhere".to_string(), |b| format!("bar {b}"));
    let message = if wrong.is_empty() {
        format!(
            "self-equalizing: y_c(lap) + |y_c(wave)| = {yl} + {} = {} = C/p; from every bar a lap coil and a wave coil in series reach the bar two pole pitches ({pair} bars) on (from bar 1: {first})",
            yw.abs(),
            yl + yw.abs()
        )
    } else {
        format!(
            "not self-equalizing: y_c(lap) + |y_c(wave)| = {yl} + {} = {}, but C/p = {pair}; from {} of {c} bars a lap coil and a wave coil in series miss the bar two pole pitches on (from bar 1: {first}, not bar {})",
            yw.abs(),
            yl + yw.abs(),
            wrong.len(),
            pair % c + 1
        )
    };
    Finding::of(&rules::FROGLEG_SELF_EQUALIZING, wrong.is_empty(), message)
}

/// Both elements have the same number of paths, so m_wave = m_lap·p and a = 2·m·P, as traced.
fn element_paths(d: &Design, lap: &WindingElement, wave: &WindingElement) -> Finding {
    let ok = lap.paths == wave.paths
        && lap.paths == lap.paths_formula
        && wave.paths == wave.paths_formula;
    Finding::of(
        &rules::FROGLEG_ELEMENT_PATHS,
        ok,
        format!(
            "traced paths: lap element {} (m x P = {} x {} = {}), wave element {} (2 m_w = 2 x {} = {}); {}",
            lap.paths,
            lap.multiplicity,
            d.poles,
            lap.paths_formula,
            wave.paths,
            wave.multiplicity,
            wave.paths_formula,
            if ok {
                "equal, as a frog-leg winding needs"
            } else {
                "they must be equal and match their formulas"
            }
        ),
    )
}
