//! Frog-leg rules: the self-equalizing condition read off the traced connections, C/p whole,
//! the paths of each element, the wave element's reentrancy and equal coils in both elements.
//!
//! Part of the `checks` stage. Sources beside each rule: a trade association's technical note
//! on frog-leg windings, read in a public copy (docs/domain.md, "Frog-leg windings"); the
//! self-equalizing condition and its reading off the trace are derived.

use super::{Finding, rules};
use crate::base::number::{counted, fmt_fixed};
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
    out.push(self_equalizing(d, w, lap, wave, c, p));
    out.push(one_neutral(d, w, lap, wave));
    out.push(element_paths(d, lap, wave));
    let r = wave.reentrancy;
    out.push(Finding::of(&rules::FROGLEG_WAVE_REENTRANCY, true, format!(
            "the wave element (multiplicity m_w = m x p = {}, y_c = {}) is {}: {} traced, gcd(C, y_c) = gcd({c}, {}) = {}; each is tested on its own",
            wave.multiplicity,
            wave.pitches.commutator,
            if r == 1 {
                "singly re-entrant".to_string()
            } else {
                format!("{r}-fold re-entrant")
            },
            counted(r, "closed winding", "closed windings"),
            wave.pitches.commutator.abs(),
            wave.reentrancy_formula
        )));
    let same = lap.turns == wave.turns;
    out.push(Finding::of(&rules::FROGLEG_EQUAL_COILS, same, format!(
            "lap coils {}, wave coils {}, both of the one [conductor]{}",
            counted(lap.turns, "turn", "turns"),
            counted(wave.turns, "turn", "turns"),
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
                "the wave coils are commutated {} bars off the lap coils' neutral: brushes on the lap neutral short the wave coils off it; a wave_span one slot longer or shorter moves the wave element by u/2 bars",
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

/// Self-equalizing, read off the traced winding in two steps [derived; docs/domain.md,
/// "Frog-leg equalizing"]:
/// - y_c(lap) + |y_c(wave)| = C/p: from every bar, the lap coil that starts there and the wave
///   coil that starts where it ends reach the bar two pole pitches on;
/// - that lap coil and wave coil, in series between bars two pole pitches apart (which the lap
///   element holds at one potential), enclose no EMF at any rotor angle, worked from their
///   traced slot positions under a flat-topped field over the pole arc and under a sinusoidal
///   field ([`loop_emf`]).
fn self_equalizing(
    d: &Design,
    w: &Winding,
    lap: &WindingElement,
    wave: &WindingElement,
    c: u32,
    p: u32,
) -> Finding {
    let coil_from = |e: &WindingElement| {
        let mut by_bar = vec![None; c as usize];
        for k in rows(w, e) {
            if let (Some(a), Some(_)) = (k.start_segment, k.end_segment) {
                by_bar[(a - 1) as usize] = Some(k);
            }
        }
        by_bar
    };
    let (lap_from, wave_from) = (coil_from(lap), coil_from(wave));
    let pair = c / p;
    // The lap coil from `bar` and the wave coil from where it ends.
    let series = |bar: u32| {
        let l = lap_from[(bar - 1) as usize]?;
        let wv = wave_from[(l.end_segment? - 1) as usize]?;
        Some((l, wv))
    };
    let reach = |bar: u32| series(bar).and_then(|(_, wv)| wv.end_segment);
    let wrong: Vec<u32> = (1..=c)
        .filter(|&b| reach(b) != Some((b - 1 + pair) % c + 1))
        .collect();
    let (yl, yw) = (lap.pitches.commutator, wave.pitches.commutator);
    let first = reach(1).map_or("nowhere".to_string(), |b| format!("bar {b}"));
    if !wrong.is_empty() {
        return Finding::of(
            &rules::FROGLEG_SELF_EQUALIZING,
            false,
            format!(
                "not self-equalizing: y_c(lap) + |y_c(wave)| = {yl} + {} = {}, but C/p = {pair}; from {} of {c} bars a lap coil and a wave coil in series miss the bar two pole pitches on (from bar 1: {first}, not bar {})",
                yw.abs(),
                yl + yw.abs(),
                wrong.len(),
                pair % c + 1
            ),
        );
    }
    // The worst loop over every bar, as a share of one lap coil's peak EMF.
    let (mut worst, mut at) = ((0.0f64, 0.0f64), 1u32);
    for bar in 1..=c {
        if let Some((l, wv)) = series(bar) {
            let x = loop_emf(d, w, (l, lap.turns), (wv, wave.turns));
            if x.0.max(x.1) > worst.0.max(worst.1) + 1e-12 {
                (worst, at) = (x, bar);
            }
        }
    }
    let ok = worst.0.max(worst.1) < 1e-6;
    let tau = f64::from(d.slots) / f64::from(d.poles);
    let spans = format!(
        "spans {} + {} slots on a pole pitch of {} slots",
        lap.pitches.span,
        wave.pitches.span,
        fmt_fixed(tau, 2)
    );
    let message = if ok {
        format!(
            "self-equalizing: y_c(lap) + |y_c(wave)| = {yl} + {} = {} = C/p; from every bar a lap coil and a wave coil in series reach the bar two pole pitches ({pair} bars) on (from bar 1: {first}), and their loop encloses no EMF at any rotor angle ({spans})",
            yw.abs(),
            yl + yw.abs()
        )
    } else {
        let (l, wv) = series(at).expect("the worst loop was found on a traced series");
        format!(
            "not self-equalizing: the lap coil {} (slots {}-{}, {}) and the wave coil {} (slots {}-{}, {}) in series from bar {at} to the bar two pole pitches on enclose up to {} % of a lap coil's EMF (flat-topped field; {} % sinusoidal), which circulates current through the brushes; the loop is free of EMF when lap span + wave span = two pole pitches with whole slots per pole pair, or the spans are equal with whole slots per pole ({spans}), and equal turns",
            l.coil,
            l.top.slot,
            l.bottom.slot,
            counted(lap.turns, "turn", "turns"),
            wv.coil,
            wv.top.slot,
            wv.bottom.slot,
            counted(wave.turns, "turn", "turns"),
            fmt_fixed(100.0 * worst.0, 1),
            fmt_fixed(100.0 * worst.1, 1)
        )
    };
    Finding::of(&rules::FROGLEG_SELF_EQUALIZING, ok, message)
}

/// The largest EMF round the loop of two coils in series, each traversed from its start lead
/// to its end lead, as a share of the first coil's peak EMF: (flat-topped field over the pole
/// arc, sinusoidal field). A side at angle θ_s sees B(θ_s + φ) at rotor angle φ; a coil's EMF
/// is N·(B(top) − B(bottom)). Under the flat field the loop EMF changes only where a side
/// crosses a pole tip, so it is evaluated once between each pair of neighbouring crossings over
/// two pole pitches (exact); under the sinusoidal field it is one sinusoid, whose amplitude is
/// the length of the sum of the sides' phasors.
fn loop_emf(d: &Design, w: &Winding, a: (&Connection, u32), b: (&Connection, u32)) -> (f64, f64) {
    let s = f64::from(d.slots);
    let poles = f64::from(d.poles);
    let pitch = 360.0 / poles;
    let axis = w.pole_axes_deg[0];
    let angle = |slot: u32| f64::from(slot - 1) * 360.0 / s;
    // (angle, signed turns) of each side: + for a top side, − for a bottom side.
    let sides = [
        (angle(a.0.top.slot), f64::from(a.1)),
        (angle(a.0.bottom.slot), -f64::from(a.1)),
        (angle(b.0.top.slot), f64::from(b.1)),
        (angle(b.0.bottom.slot), -f64::from(b.1)),
    ];
    let half_arc = d.pole_arc * pitch / 2.0;
    let flat = |x: f64| {
        let rel = (x - axis).rem_euclid(360.0);
        let j = ((rel + pitch / 2.0) / pitch).floor();
        if (rel - j * pitch).abs() < half_arc {
            if (j as i64).rem_euclid(2) == 0 {
                1.0
            } else {
                -1.0
            }
        } else {
            0.0
        }
    };
    // Rotor angles where some side meets some pole tip, over two pole pitches.
    let period = 2.0 * pitch;
    let mut cuts: Vec<f64> = Vec::new();
    for (theta, _) in sides {
        for k in 0..2 {
            let centre = axis + f64::from(k) * pitch;
            for tip in [centre - half_arc, centre + half_arc] {
                cuts.push((tip - theta).rem_euclid(period));
            }
        }
    }
    cuts.sort_by(f64::total_cmp);
    cuts.push(cuts[0] + period);
    let peak_a = 2.0 * f64::from(a.1);
    // Crossings closer than a rounding error are one crossing: a zero-width interval between
    // them would sit on a pole tip, where rounding alone decides which side of it a side is.
    let flat_max = cuts
        .windows(2)
        .filter(|x| x[1] - x[0] > 1e-9)
        .map(|x| {
            let phi = (x[0] + x[1]) / 2.0;
            sides
                .iter()
                .map(|(t, n)| n * flat(t + phi))
                .sum::<f64>()
                .abs()
        })
        .fold(0.0, f64::max)
        / peak_a;
    let (re, im) = sides.iter().fold((0.0, 0.0), |(re, im), (t, n)| {
        let e = (t - axis).to_radians() * poles / 2.0;
        (re + n * e.cos(), im + n * e.sin())
    });
    let sine_peak = {
        // One coil at full pitch: amplitude 2·N.
        (re * re + im * im).sqrt() / peak_a
    };
    (flat_max, sine_peak)
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
