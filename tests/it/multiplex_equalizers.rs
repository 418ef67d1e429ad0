//! Type-A equalizers on multiply re-entrant laps, checked by an independent network solve.
//!
//! The engine allows equalizers when turning the armature one pole pair maps the winding onto
//! itself (derived; `plan_equalizers`). Here the bar potentials are computed without the
//! engine's reasoning: every active coil is a unit resistance in series with its EMF under a
//! flat-topped field (from the slot positions and pole axes the winding reports), the bars
//! each brush touches are joined, the brushes of one polarity are tied together, no load is
//! connected, and the node equations (a hand-built Laplacian) are solved by Gaussian
//! elimination. The joined bars must come out at one potential.

use crate::support::design;
use armsheet::check;
use armsheet::checks::Checked;
use armsheet::winding::EqualizerPlan;

/// Bar potentials (index 0 = bar 1) with the rotor turned `phi` degrees from the reference.
fn bar_potentials(c: &Checked, phi: f64) -> Vec<f64> {
    let d = &c.design;
    let w = &c.winding;
    let cc = w.active_coils as usize;
    let s = f64::from(d.slots);
    let bar = 360.0 / cc as f64;
    let pole_pitch = 360.0 / f64::from(d.poles);
    let axis0 = w.pole_axes_deg[0];
    let field = |angle: f64| -> f64 {
        let rel = (angle - axis0).rem_euclid(360.0);
        let j = ((rel + pole_pitch / 2.0) / pole_pitch).floor();
        if (rel - j * pole_pitch).abs() < d.pole_arc * pole_pitch / 2.0 {
            if (j as i64 % i64::from(d.poles)) % 2 == 0 {
                1.0
            } else {
                -1.0
            }
        } else {
            0.0
        }
    };
    // Node of each bar: its own, or the node of the brush polarity touching it.
    let mut node: Vec<usize> = (0..cc).collect();
    for (b, brush) in w.brushes.iter().enumerate() {
        let centre = axis0 + brush.angle_deg;
        for (x, n) in node.iter_mut().enumerate() {
            let mut diff = (w.segment_deg(x as u32 + 1) + phi - centre).rem_euclid(360.0);
            if diff > 180.0 {
                diff = 360.0 - diff;
            }
            if diff < (f64::from(d.multiplicity) + 1.0) / 2.0 * bar {
                *n = cc + b % 2;
            }
        }
    }
    let size = cc + 2;
    let mut a = vec![vec![0.0f64; size]; size];
    let mut rhs = vec![0.0f64; size];
    for k in w.connections.iter().filter(|k| !k.dummy) {
        let from = node[(k.start_segment.unwrap() - 1) as usize];
        let to = node[(k.end_segment.unwrap() - 1) as usize];
        if from == to {
            continue;
        }
        let top = f64::from(k.top.slot - 1) * 360.0 / s + phi;
        let bottom = f64::from(k.bottom.slot - 1) * 360.0 / s + phi;
        let e = field(top) - field(bottom);
        // current from -> to: V_from - V_to + e (unit resistance)
        a[from][from] += 1.0;
        a[to][to] += 1.0;
        a[from][to] -= 1.0;
        a[to][from] -= 1.0;
        rhs[from] -= e;
        rhs[to] += e;
    }
    // Nodes that no coil reaches (bars merged into a brush) get identity rows; the node of
    // the brushes of the first polarity is the ground (V = 0).
    for (i, row) in a.iter_mut().enumerate() {
        if row[i] == 0.0 {
            row[i] = 1.0;
        }
    }
    a[cc] = vec![0.0; size];
    a[cc][cc] = 1.0;
    rhs[cc] = 0.0;
    let v = solve(a, rhs);
    (0..cc).map(|x| v[node[x]]).collect()
}

/// Gaussian elimination with partial pivoting.
fn solve(mut a: Vec<Vec<f64>>, mut b: Vec<f64>) -> Vec<f64> {
    let n = b.len();
    for col in 0..n {
        let piv = (col..n)
            .max_by(|&i, &j| a[i][col].abs().total_cmp(&a[j][col].abs()))
            .unwrap();
        a.swap(col, piv);
        b.swap(col, piv);
        assert!(
            a[col][col].abs() > 1e-12,
            "singular network at column {col}"
        );
        for row in col + 1..n {
            let f = a[row][col] / a[col][col];
            if f != 0.0 {
                let pivot_row = a[col].clone();
                for (x, p) in a[row].iter_mut().zip(&pivot_row).skip(col) {
                    *x -= f * p;
                }
                b[row] -= f * b[col];
            }
        }
    }
    let mut x = vec![0.0; n];
    for row in (0..n).rev() {
        let sum: f64 = (row + 1..n).map(|k| a[row][k] * x[k]).sum();
        x[row] = (b[row] - sum) / a[row][row];
    }
    x
}

fn duplex_42(extra: &str) -> Checked {
    check(design(&format!(
        "[armature]\npoles = 4\nslots = 42\ncoils_per_slot = 3\n\n[winding]\ntype = \"lap\"\nmultiplicity = 2\nspan = 10\nturns = 2\n{extra}"
    )))
}

#[test]
fn a_doubly_reentrant_lap_with_an_odd_equalizer_pitch_takes_equalizers() {
    let c = duplex_42("equalizers = \"full\"\n");
    assert_eq!(c.winding.reentrancy(), 2);
    let EqualizerPlan::Possible(eq) = &c.winding.equalizers else {
        panic!("refused: {:?}", c.winding.equalizers);
    };
    // C/p = 126/2 = 63, odd: each equalizer joins a bar of one closed winding to a bar of the
    // other.
    assert_eq!(eq.pitch, 63);
    assert_eq!(eq.groups.len(), 63);
    assert_eq!(eq.groups[0], vec![1, 64]);
    let slot = 360.0 / 42.0;
    for phi in [0.13 * slot, 0.41 * slot, 0.77 * slot] {
        let v = bar_potentials(&c, phi);
        let swing = v.iter().fold(0.0f64, |m, x| m.max(x.abs()));
        assert!(swing > 1.0, "the network carries EMF: {swing}");
        for g in &eq.groups {
            let first = v[(g[0] - 1) as usize];
            for &bar in g {
                let at = v[(bar - 1) as usize];
                assert!(
                    (at - first).abs() < 1e-9,
                    "bars {g:?} at {first} and {at} (phi {phi})"
                );
            }
        }
        // Bars one pole pitch apart are not joined, and the solve tells them apart.
        let apart = (v[0] - v[31]).abs() + (v[1] - v[32]).abs();
        assert!(apart > 0.5, "bars one pole pitch apart: {apart}");
    }
}

#[test]
fn equalizers_are_still_refused_where_the_pole_pair_does_not_repeat() {
    // S/p = 27/2: the rotation by one pole pair is no whole number of slots.
    let c = check(design(
        "[armature]\npoles = 4\nslots = 27\ncoils_per_slot = 2\n\n[winding]\ntype = \"lap\"\nspan = 7\nturns = 2\nequalizers = \"full\"\n",
    ));
    let EqualizerPlan::Impossible(why) = &c.winding.equalizers else {
        panic!("allowed: {:?}", c.winding.equalizers);
    };
    assert!(why.contains("not at one potential"), "{why}");
}
