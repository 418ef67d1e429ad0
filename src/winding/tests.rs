//! Unit tests of the engine's placement rules: dummies, leads, brushes, polarity, equalizers.

use super::*;
use crate::design::parse_design;

fn wind(text: &str) -> Winding {
    trace_winding(&parse_design(text, "t.toml").unwrap())
}

fn lap(extra_arm: &str, extra_win: &str) -> Winding {
    wind(&format!(
        "[armature]\npoles = 4\nslots = 24\n{extra_arm}\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 2\n{extra_win}"
    ))
}

#[test]
fn dummies_are_spread_evenly_and_the_last_is_coil_n() {
    assert_eq!(place_dummies(36, 1), vec![36]);
    assert_eq!(place_dummies(120, 2), vec![60, 120]);
    assert_eq!(place_dummies(40, 0), Vec::<u32>::new());
}

#[test]
fn lap_connections_follow_the_numbering_convention() {
    let w = wind(
        "[armature]\npoles = 4\nslots = 12\ncoils_per_slot = 2\n[winding]\ntype = \"lap\"\nspan = 3\nturns = 1\n",
    );
    let c = &w.connections[2]; // coil 3: slot 2, position 1
    assert_eq!((c.top.slot, c.top.position, c.top.side), (2, 1, 5));
    assert_eq!(
        (c.bottom.slot, c.bottom.position, c.bottom.side),
        (5, 1, 5 + 13)
    );
    assert_eq!((c.start_segment, c.end_segment), (Some(3), Some(4)));
    // The last coil's bottom side wraps round to slot 3.
    let last = &w.connections[23];
    assert_eq!(
        (last.top.slot, last.top.position, last.bottom.slot),
        (12, 2, 3)
    );
    assert_eq!(last.end_segment, Some(1));
    assert_eq!(w.pitches.back, 13, "y_b = 2u·y_s + 1 = 2·2·3 + 1");
}

#[test]
fn retrogressive_lap_crosses_its_leads() {
    let w = lap("", "direction = \"retrogressive\"\n");
    assert_eq!(w.pitches.commutator, -1);
    assert_eq!(w.pitches.front, w.pitches.back + 2);
    assert_eq!(
        (w.connections[0].start_segment, w.connections[0].end_segment),
        (Some(1), Some(24))
    );
    // The trace runs backwards through the coils: 1, 24, 23, …
    let seq: Vec<u32> = w.closed_windings[0]
        .steps
        .iter()
        .take(3)
        .map(|s| s.coil)
        .collect();
    assert_eq!(seq, vec![1, 24, 23]);
}

#[test]
fn brushes_sit_on_the_pole_axes_shifted_by_the_lead_offset() {
    let w = lap("", "");
    let angles: Vec<f64> = w.brushes.iter().map(|b| b.angle_deg).collect();
    assert_eq!(angles, vec![0.0, 90.0, 180.0, 270.0]);
    // Simplex lap, symmetric leads: brush 1 is on the mica between segments 1 and 2.
    assert_eq!(w.brushes[0].under, vec![1, 2]);
    assert_eq!(w.brushes[1].under, vec![7, 8]);
    let shifted = lap("", "lead_offset = 2\n");
    assert!(
        (shifted.brushes[0].angle_deg - 30.0).abs() < 1e-12,
        "2 × 360/24 = 30°"
    );
    // The segments move with the leads, so the same segments are under the brushes.
    assert_eq!(shifted.brushes[0].under, vec![1, 2]);
    assert!((shifted.segment1_deg - w.segment1_deg - 30.0).abs() < 1e-9);
}

#[test]
fn rotation_flips_brush_polarity_and_mode_flips_current() {
    let cw = lap("rotation = \"cw\"\n", "");
    let ccw = lap("rotation = \"ccw\"\n", "");
    for (a, b) in cw.brushes.iter().zip(&ccw.brushes) {
        assert_ne!(a.polarity, b.polarity);
    }
    let gen_ = wind(
        "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 2\n[rating]\nmode = \"generator\"\n",
    );
    assert_eq!(
        gen_.brushes, cw.brushes,
        "terminal polarity does not depend on the mode"
    );
    for (g, m) in gen_.coil_current.iter().zip(&cw.coil_current) {
        assert_eq!(*g, -*m);
    }
}

#[test]
fn generator_current_flows_with_the_emf() {
    let w = wind(
        "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 2\n[rating]\nmode = \"generator\"\n",
    );
    for p in &w.paths {
        assert!(p.emf_units > 0);
        let to = &w.brushes[(p.to_brush - 1) as usize];
        let expected = if to.polarity == Polarity::Positive {
            1
        } else {
            -1
        };
        assert_eq!(
            p.current, expected,
            "current runs start→end towards the + brush"
        );
    }
}

#[test]
fn equalizer_groups_join_points_two_pole_pitches_apart() {
    let w = wind(
        "[armature]\npoles = 6\nslots = 36\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 1\nequalizers = 4\n",
    );
    let EqualizerPlan::Possible(e) = &w.equalizers else {
        panic!("{:?}", w.equalizers)
    };
    assert_eq!((e.pitch, e.possible), (12, 12));
    assert_eq!(
        e.groups,
        vec![vec![1, 13, 25], vec![5, 17, 29], vec![9, 21, 33]]
    );
    let full = wind(
        "[armature]\npoles = 6\nslots = 36\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 1\nequalizers = \"full\"\n",
    );
    let EqualizerPlan::Possible(f) = &full.equalizers else {
        panic!()
    };
    assert_eq!(f.groups.len(), 12);
    // 2 poles: nothing to join.
    let two =
        wind("[armature]\npoles = 2\nslots = 12\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 1\n");
    assert!(matches!(two.equalizers, EqualizerPlan::Impossible(_)));
    // 4 poles, 26 slots: C/p = 13 whole, 2C/P = 13.
    let odd =
        wind("[armature]\npoles = 4\nslots = 26\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 1\n");
    assert!(matches!(
        odd.equalizers,
        EqualizerPlan::Possible(Equalizers { pitch: 13, .. })
    ));
}

#[test]
fn machine_constant_is_pz_over_2_pi_a() {
    let w = lap("", "flux_per_pole_mwb = 10\nspeed_rpm = 1500\n");
    // P = 4, Z = 2·24·2 = 96, a = 4.
    let k = 4.0 * 96.0 / (2.0 * std::f64::consts::PI * 4.0);
    assert!((w.constants.machine_constant - k).abs() < 1e-12);
    let e = w.constants.emf_v.unwrap();
    // E = P·Z·Φ·N/(60·a) = 4·96·0.01·1500/240 = 24 V.
    assert!((e - 24.0).abs() < 1e-9, "{e}");
}

#[test]
fn balance_simulation_separates_symmetric_from_unsymmetric_lap() {
    let good = lap("", "");
    assert!(good.balance.balanced);
    assert_eq!(good.balance.mean_spread_coils, 0.0);
    let bad =
        wind("[armature]\npoles = 4\nslots = 25\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 1\n");
    assert!(!bad.balance.balanced, "{:?}", bad.balance);
}

/// Right-hand rule: clockwise from the commutator end, the surface moves towards rising slot
/// numbers; under a north pole (flux entering the armature) e = v × B points away from the
/// commutator. Coil 2 of a 4-pole, 36-slot lap has its top side (slot 2, 10°) under pole 1's
/// arc (40° ± 31.5°) and its bottom side (slot 10, 90°) in the gap, so a generator drives
/// current start → end in it, and a counter-clockwise rotor reverses that.
#[test]
fn current_follows_the_right_hand_rule() {
    let base = "[armature]\npoles = 4\nslots = 36\nrotation = \"ROT\"\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 1\n[rating]\nmode = \"MODE\"\n";
    let run = |rot: &str, mode: &str| {
        wind(&base.replace("ROT", rot).replace("MODE", mode)).coil_current[1]
    };
    assert_eq!(run("cw", "generator"), 1);
    assert_eq!(run("cw", "motor"), -1);
    assert_eq!(run("ccw", "generator"), -1);
    assert_eq!(run("ccw", "motor"), 1);
}
