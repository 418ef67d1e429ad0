//! A span that cannot work is an error, and the EMF never exceeds what the traced coils make.
//!
//! Judged from the physical positions the traced winding reports (slot centres at
//! (k − 1)·360/S, the pole axes `pole_axes_deg`, the design's pole arc) with a field and a flux
//! integral written here, sharing no code with the engine's span check or its flux linkage.

use crate::support;

use crate::support::design;
use armsheet::check;
use armsheet::checks::Checked;
use proptest::prelude::*;

fn toml(poles: u32, slots: u32, kind: &str, span: &str, arc: f64) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\npole_arc = {arc}\n\n[winding]\ntype = \"{kind}\"\nspan = {span}\nturns = 3\nflux_per_pole_mwb = 10\nspeed_rpm = 1500\n"
    )
}

/// Coil 1's sides, in degrees from slot 1's centre.
fn sides(c: &Checked) -> (f64, f64) {
    let s = f64::from(c.design.slots);
    let k = &c.winding.connections[0];
    (
        f64::from(k.top.slot - 1) * 360.0 / s,
        f64::from(k.bottom.slot - 1) * 360.0 / s,
    )
}

/// The field at `angle`: +1 under a north pole's arc, −1 under a south pole's, 0 between.
fn field(c: &Checked, angle: f64) -> f64 {
    let pole_pitch = 360.0 / f64::from(c.design.poles);
    let rel = (angle - c.winding.pole_axes_deg[0]).rem_euclid(360.0);
    let j = ((rel + pole_pitch / 2.0) / pole_pitch).floor();
    if (rel - j * pole_pitch).abs() < c.design.pole_arc * pole_pitch / 2.0 {
        if (j as i64) % 2 == 0 { 1.0 } else { -1.0 }
    } else {
        0.0
    }
}

/// The most flux coil 1 links as the rotor turns, as a share of one pole's flux: the field
/// integrated from the top side to the bottom side (the short way round the coil's own span),
/// maximised over rotor positions, numerically.
fn linked_at_most(c: &Checked) -> f64 {
    let (top, bottom) = sides(c);
    let span = (bottom - top).rem_euclid(360.0);
    let pole_flux = c.design.pole_arc * 360.0 / f64::from(c.design.poles);
    // The field repeats every two pole pitches: turn the rotor through that in fine steps.
    let period = 720.0 / f64::from(c.design.poles);
    let steps = 400;
    let n = 800;
    let dx = span / f64::from(n);
    (0..steps)
        .map(|i| {
            let phi = f64::from(i) * period / f64::from(steps);
            let sum: f64 = (0..n)
                .map(|k| field(c, top + phi + (f64::from(k) + 0.5) * dx) * dx)
                .sum();
            sum.abs() / pole_flux
        })
        .fold(0.0, f64::max)
}

/// With coil 1 centred on an interpolar axis (where it makes its EMF), each side's distance
/// from the nearest pole axis in pole pitches, and whether those two poles differ in polarity.
fn sides_at_emf_position(c: &Checked) -> (f64, f64, bool) {
    let pole_pitch = 360.0 / f64::from(c.design.poles);
    let (top, bottom) = sides(c);
    let span = (bottom - top).rem_euclid(360.0);
    let neutral = c.winding.pole_axes_deg[0] + pole_pitch / 2.0;
    let place = |angle: f64| {
        let rel = (angle - c.winding.pole_axes_deg[0]).rem_euclid(360.0);
        let j = (rel / pole_pitch).round();
        (
            (rel - j * pole_pitch).abs() / pole_pitch,
            (j as i64).rem_euclid(2),
        )
    };
    let (d1, p1) = place(neutral - span / 2.0);
    let (d2, p2) = place(neutral + span / 2.0);
    (d1, d2, p1 != p2)
}

#[test]
fn spans_that_cannot_work_are_errors() {
    // Issue examples: two pole pitches on 4 poles and 24 slots; span 13 on a 4-pole, 25-slot
    // wave; "1-18" on a pole pitch of 7.25 slots.
    for (poles, slots, kind, span) in [
        (4, 24, "lap", "12"),
        (4, 25, "wave", "13"),
        (4, 29, "wave", "\"1-18\""),
    ] {
        let c = check(design(&toml(poles, slots, kind, span, 0.7)));
        let f = c
            .findings
            .iter()
            .find(|f| f.id == "span.opposite-poles")
            .unwrap();
        assert!(f.is_failure(), "{poles} poles {slots} slots span {span}");
        assert!(c.has_errors());
        // The EMF is never more than the traced coils make.
        let linked = linked_at_most(&c);
        let e = c.winding.constants.emf_v.unwrap();
        let full =
            c.winding.constants.machine_constant * 0.010 * 1500.0 * 2.0 * std::f64::consts::PI
                / 60.0;
        assert!(
            e <= full * linked + 1e-6 * full,
            "E {e} against {full} x {linked}"
        );
    }
    // Two pole pitches: the coil links nothing and the report's E is zero.
    let c = check(design(&toml(4, 24, "lap", "12", 0.7)));
    assert!(linked_at_most(&c) < 1e-9);
    assert_eq!(c.winding.constants.emf_v, Some(0.0));
}

proptest! {
    #![proptest_config(support::properties(100))]

    #[test]
    fn the_span_rule_and_the_flux_linked_follow_the_physical_positions(
        pp in 1u32..=4,
        per_pole in 3u32..=9,
        extra in 0u32..4,
        span_frac in 0.1f64..1.95,
        arc in 0.5f64..=1.0,
    ) {
        let poles = 2 * pp;
        let slots = per_pole * poles + extra;
        let span = ((span_frac * f64::from(slots) / f64::from(poles)).round() as u32)
            .clamp(1, slots - 1);
        let arc = (arc * 100.0).round() / 100.0;
        let c = check(design(&toml(poles, slots, "lap", &span.to_string(), arc)));
        let (d1, d2, opposite) = sides_at_emf_position(&c);
        let works = opposite && d1 <= 0.25 + 1e-9 && d2 <= 0.25 + 1e-9;
        let f = c.findings.iter().find(|f| f.id == "span.opposite-poles").unwrap();
        prop_assert_eq!(f.passed, works, "{} poles {} slots span {}", poles, slots, span);
        // The engine's flux linkage against the numerical integral (800 strips a span, 400 rotor steps).
        let linked = linked_at_most(&c);
        prop_assert!(
            (c.winding.constants.flux_linkage - linked).abs() < 0.01,
            "{} poles {} slots span {} arc {}: engine {} integral {}",
            poles, slots, span, arc, c.winding.constants.flux_linkage, linked
        );
    }
}
