//! Frog-leg self-equalizing judged from the slots: the loop of a lap coil and a wave coil in
//! series between bars two pole pitches apart must enclose no EMF at any rotor angle.
//!
//! The oracle here turns the rotor through two pole pitches in 2,000 steps and sums each
//! traced coil's side EMFs at its slot's physical angle ((k − 1)·360/S) under a sinusoidal
//! field and under a flat-topped field over the pole arc; it shares no code with the check,
//! which works the flat field exactly between pole-tip crossings. The rule it is cross-checked
//! against [derived; docs/domain.md, "Frog-leg equalizing"]: the loop is free of EMF only when
//! lap span + wave span = two pole pitches with whole slots per pole pair, or the spans are
//! equal with whole slots per pole.

use crate::support;

use armsheet::check;
use armsheet::checks::Checked;
use armsheet::design::parse_design;
use proptest::prelude::*;

fn frog(poles: u32, slots: u32, u: u32, span: u32, wave_span: u32, retro: bool) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = {u}\n\n[winding]\ntype = \"frog-leg\"\ndirection = \"{}\"\nspan = {span}\nwave_span = {wave_span}\nturns = 1\n",
        if retro {
            "retrogressive"
        } else {
            "progressive"
        }
    )
}

/// The largest loop EMF over every bar and every sampled rotor angle, in lap-coil peak EMFs:
/// (sinusoidal, flat-topped).
fn sampled_loop(c: &Checked) -> (f64, f64) {
    let d = &c.design;
    let w = &c.winding;
    let s = f64::from(d.slots);
    let pitch = 360.0 / f64::from(d.poles);
    let axis = w.pole_axes_deg[0];
    let sine = |x: f64| ((x - axis) * f64::from(d.poles) / 2.0).to_radians().cos();
    let flat = |x: f64| {
        let rel = (x - axis).rem_euclid(360.0);
        let j = ((rel + pitch / 2.0) / pitch).floor();
        if (rel - j * pitch).abs() < d.pole_arc * pitch / 2.0 - 1e-9 {
            if (j as i64).rem_euclid(2) == 0 {
                1.0
            } else {
                -1.0
            }
        } else if (rel - j * pitch).abs() <= d.pole_arc * pitch / 2.0 + 1e-9 {
            // On a pole tip: half the field, alike for every side that stands there.
            if (j as i64).rem_euclid(2) == 0 {
                0.5
            } else {
                -0.5
            }
        } else {
            0.0
        }
    };
    let lap = &w.elements[0];
    let wave = &w.elements[1];
    let bars = w.active_coils as usize;
    let mut lap_from = vec![None; bars];
    let mut wave_from = vec![None; bars];
    for k in &w.connections {
        let Some(st) = k.start_segment else { continue };
        let into = if lap.holds(k.coil) {
            &mut lap_from
        } else {
            &mut wave_from
        };
        into[(st - 1) as usize] = Some(k);
    }
    let angle = |slot: u32| f64::from(slot - 1) * 360.0 / s;
    let (mut worst_sine, mut worst_flat) = (0.0f64, 0.0f64);
    for l in lap_from.iter().flatten() {
        let Some(v) = wave_from[(l.end_segment.unwrap() - 1) as usize] else {
            continue;
        };
        let (nl, nw) = (f64::from(lap.turns), f64::from(wave.turns));
        for i in 0..2000 {
            let phi = f64::from(i) * 2.0 * pitch / 2000.0;
            let emf = |f: &dyn Fn(f64) -> f64| {
                nl * (f(angle(l.top.slot) + phi) - f(angle(l.bottom.slot) + phi))
                    + nw * (f(angle(v.top.slot) + phi) - f(angle(v.bottom.slot) + phi))
            };
            worst_sine = worst_sine.max(emf(&sine).abs() / (2.0 * nl));
            worst_flat = worst_flat.max(emf(&flat).abs() / (2.0 * nl));
        }
    }
    (worst_sine, worst_flat)
}

fn finding_passes(c: &Checked) -> bool {
    c.findings
        .iter()
        .find(|f| f.id == "frogleg.self-equalizing")
        .unwrap()
        .passed
}

#[test]
fn the_minimal_unequalized_frog_leg_is_an_error() {
    // Issue example: 4 poles, 42 slots, u 2, retrogressive, spans 11 and 11 on a pole pitch of
    // 10.5 slots: slots per pole not whole, so equal spans leave EMF in the loop.
    let c = check(parse_design(&frog(4, 42, 2, 11, 11, true), "t.toml").unwrap());
    let (sine, flat) = sampled_loop(&c);
    assert!((sine - 0.149).abs() < 0.01, "sinusoidal loop {sine}");
    assert!(flat > 0.1, "flat-topped loop {flat}");
    assert!(!finding_passes(&c));
    assert!(c.has_errors());
    // Unequal turns: the loop reaches a large share of a coil EMF, an error now.
    let text = frog(4, 44, 2, 11, 11, true) + "wave_turns = 2\n";
    let c = check(parse_design(&text, "t.toml").unwrap());
    assert!(sampled_loop(&c).0 > 0.4);
    assert!(!finding_passes(&c) && c.has_errors());
    // The same winding on 44 slots (11 a pole) with equal turns is self-equalizing.
    let c = check(parse_design(&frog(4, 44, 2, 11, 11, true), "t.toml").unwrap());
    let (sine, flat) = sampled_loop(&c);
    assert!(sine < 1e-9 && flat < 1e-9, "{sine} {flat}");
    assert!(finding_passes(&c));
}

proptest! {
    #![proptest_config(support::properties(60))]

    #[test]
    fn self_equalizing_follows_the_loop_emf_of_the_traced_coils(
        p in 2u32..=4,
        u in 1u32..=2,
        per_pole_pair in 6u32..=16,
        dl in -1i32..=1,
        dw in -1i32..=1,
        retro in any::<bool>(),
    ) {
        let slots = per_pole_pair * p;
        let poles = 2 * p;
        let tau = f64::from(slots) / f64::from(poles);
        let span = ((tau.floor() as i32) + dl).max(1) as u32;
        let wave_span = ((tau.round() as i32) + dw).max(1) as u32;
        let text = frog(poles, slots, u, span, wave_span, retro);
        let parsed = parse_design(&text, "t.toml");
        prop_assume!(parsed.is_ok());
        let c = check(parsed.unwrap());
        let pitch_ok = c.findings.iter().any(|f| {
            f.id == "frogleg.self-equalizing" && !f.message.contains("miss the bar")
        });
        prop_assume!(pitch_ok);
        let (sine, flat) = sampled_loop(&c);
        let passes = finding_passes(&c);
        // Never passes a loop the oracle sees EMF in; never fails one it sees none in.
        prop_assert_eq!(passes, sine < 1e-6 && flat < 1e-6, "{}\nsine {} flat {}", text, sine, flat);
        // The rule agrees.
        let two_pitches = u64::from(span + wave_span) * u64::from(poles) == 2 * u64::from(slots);
        let rule = (two_pitches && slots.is_multiple_of(p)) || (span == wave_span && slots.is_multiple_of(poles));
        prop_assert_eq!(passes, rule, "{}", text);
    }
}

/// Every coil's lead midpoint, from its traced start bar and commutator pitch, against the
/// coil's centre line from its traced slots, in degrees folded to ±180.
fn lead_offsets(c: &Checked) -> Vec<(u32, f64)> {
    let w = &c.winding;
    let s = f64::from(c.design.slots);
    let bars = f64::from(w.active_coils);
    w.elements
        .iter()
        .flat_map(|e| {
            w.connections
                .iter()
                .filter(move |k| e.holds(k.coil) && !k.dummy)
                .map(move |k| {
                    let span =
                        f64::from((k.bottom.slot + c.design.slots - k.top.slot) % c.design.slots);
                    let centre = (f64::from(k.top.slot - 1) + span / 2.0) * 360.0 / s;
                    let mid = w.segment_deg(k.start_segment.unwrap())
                        + e.pitches.commutator as f64 * 180.0 / bars;
                    let off = (mid - centre + 180.0).rem_euclid(360.0) - 180.0;
                    (k.coil, off)
                })
        })
        .collect()
}

#[test]
fn the_mill_wave_coils_have_their_leads_beside_them() {
    // Issue example: coil 151 (slots 1-14) of the 150-bar mill frog-leg has its leads on bars
    // 128 and 27, either side of slot 1's centre line, not 28 and 77.
    let c = check(parse_design(&support::demo("mill-frog-leg"), "t.toml").unwrap());
    let k = &c.winding.connections[150];
    assert_eq!(
        (k.coil, k.start_segment, k.end_segment),
        (151, Some(128), Some(27))
    );
}

proptest! {
    #![proptest_config(support::properties(60))]

    /// Lap and wave coils alike: the lead midpoint lies within half a pole pitch of the coil's
    /// own centre line (a wave coil's leads swung two pole pitches away would be a whole
    /// 720/P degrees off).
    #[test]
    fn every_coil_has_its_leads_beside_its_centre_line(
        p in 2u32..=4,
        u in 1u32..=2,
        per_pole_pair in 6u32..=16,
        dl in -1i32..=1,
        retro in any::<bool>(),
    ) {
        let slots = per_pole_pair * p;
        let poles = 2 * p;
        let tau = f64::from(slots) / f64::from(poles);
        let span = ((tau.floor() as i32) + dl).max(1) as u32;
        let wave_span = (2.0 * tau).round() as u32 - span;
        let parsed = parse_design(&frog(poles, slots, u, span, wave_span, retro), "t.toml");
        prop_assume!(parsed.is_ok());
        let c = check(parsed.unwrap());
        let half_pole = 180.0 / f64::from(poles);
        for (coil, off) in lead_offsets(&c) {
            prop_assert!(off.abs() < half_pole, "coil {} leads {} degrees off its centre line", coil, off);
        }
    }
}
