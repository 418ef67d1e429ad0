//! The armature test: the network's readings against the derived formulas, against an
//! independent solver (petgraph's components and a dense Laplacian of our own), and the
//! `test` command's outputs.

use crate::support;

use crate::support::random_design::{OFF, Space, designs, one_coil_a_slot as toml};
use crate::support::{armsheet, design, scratch, text};
use armsheet::check;
use armsheet::features::armature_test::{
    ArmatureTest, NetCoil, Network, TestOptions, armature_test, neighbour_pairs,
};
use armsheet::winding::{EqualizerPlan, Winding};
use petgraph::graph::UnGraph;
use petgraph::unionfind::UnionFind;
use proptest::prelude::*;

fn tested(text: &str) -> (Winding, ArmatureTest) {
    let c = check(design(text));
    let t = armature_test(&c.design, &c.winding, &TestOptions::default(), None).unwrap();
    (c.winding, t)
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * a.abs().max(1.0)
}

#[test]
fn simplex_lap_reads_r_c_minus_1_over_c() {
    // derived: one coil in parallel with the other C − 1 in series.
    for (poles, slots) in [(2, 12), (4, 36), (6, 54), (4, 25)] {
        let (_, t) = tested(&toml(poles, slots, "lap", 1, slots / poles, ""));
        let c = f64::from(slots);
        for r in &t.readings {
            assert!(
                close(r.expected.unwrap(), (c - 1.0) / c),
                "{poles} poles {slots} bars: {r:?}"
            );
        }
    }
}

#[test]
fn simplex_wave_reads_r_p_c_minus_p_over_c() {
    // derived: neighbouring bars are joined through p coils in series, and the rest of the
    // closed winding (C − p coils) in parallel with them.
    for (poles, slots) in [(4, 25), (4, 27), (6, 35), (8, 33)] {
        let (_, t) = tested(&toml(poles, slots, "wave", 1, slots / poles, ""));
        // C is the active coils: dummy coils are not in the network.
        let (c, p) = (f64::from(t.bars), f64::from(poles / 2));
        for r in &t.readings {
            assert!(
                close(r.expected.unwrap(), p * (c - p) / c),
                "{poles}p {slots}: {r:?}"
            );
        }
    }
}

#[test]
fn lap_with_an_equalizer_on_every_bar_reads_r_c_minus_p_over_pc() {
    // derived: the ties fold the ring into C/p nodes joined by p coils in parallel.
    for (poles, slots) in [(4, 36), (6, 54), (8, 48)] {
        let (w, t) = tested(&toml(
            poles,
            slots,
            "lap",
            1,
            slots / poles,
            "equalizers = \"full\"",
        ));
        assert!(
            matches!(&w.equalizers, EqualizerPlan::Possible(e) if e.groups.len() as u32 == 2 * slots / poles)
        );
        let (c, p) = (f64::from(slots), f64::from(poles / 2));
        for r in &t.readings {
            assert!(
                close(r.expected.unwrap(), (c - p) / (p * c)),
                "{poles}p {slots}: {r:?}"
            );
        }
    }
}

#[test]
fn doubly_reentrant_duplex_lap_reads_open_between_neighbours() {
    // 4 poles, 48 bars, duplex lap: gcd(48, 2) = 2 closed windings, so bars 1 and 2 are not
    // joined at all; bars 2 apart read as a simplex lap of 24 coils: r·23/24.
    let (w, t) = tested(&toml(4, 48, "lap", 2, 12, ""));
    assert_eq!(w.reentrancy(), 2);
    assert!(t.readings.iter().all(|r| r.expected.is_none()));
    let within = t.readings_within_winding.as_ref().unwrap();
    assert!(
        within
            .iter()
            .all(|r| close(r.expected.unwrap(), 23.0 / 24.0))
    );
    assert_eq!(t.drop_test.feeds.len(), 2);
    assert_eq!(
        (t.drop_test.feeds[0].from_bar, t.drop_test.feeds[1].from_bar),
        (1, 2)
    );
}

#[test]
fn a_feed_never_sits_on_two_tied_bars() {
    // 4 poles, 36 bars, full equalizers: bar 1 and bar 19 (opposite) are tied, so the
    // feed moves on and says so.
    let (_, t) = tested(&toml(4, 36, "lap", 1, 9, "equalizers = \"full\""));
    let f = &t.drop_test.feeds[0];
    assert_eq!(f.moved_from, Some(19));
    assert_ne!(t.network.node(f.from_bar), t.network.node(f.to_bar));
}

/// Effective resistances by an independent method: petgraph's union-find for the parts, a
/// dense Laplacian per part with one node grounded, solved by Gaussian elimination with
/// partial pivoting.
fn dense_effective(w: &Winding, pairs: &[(u32, u32)]) -> Vec<Option<f64>> {
    // Each coil a conductance of the first element's turns over its own element's turns.
    let unit = f64::from(w.elements[0].turns);
    let coils: Vec<(u32, u32, f64)> = w
        .connections
        .iter()
        .filter(|c| !c.dummy)
        .map(|c| {
            let turns = w.elements.iter().find(|e| e.holds(c.coil)).unwrap().turns;
            (
                c.start_segment.unwrap(),
                c.end_segment.unwrap(),
                f64::from(turns) / unit,
            )
        })
        .collect();
    let ties = match &w.equalizers {
        EqualizerPlan::Possible(e) => e.groups.clone(),
        _ => Vec::new(),
    };
    dense_of(w.active_coils, &coils, &ties, pairs)
}

/// [`dense_effective`] of `bars` bars, coils (from bar, to bar, resistance) and ideal `ties`.
fn dense_of(
    bars: u32,
    coils: &[(u32, u32, f64)],
    tie_groups: &[Vec<u32>],
    pairs: &[(u32, u32)],
) -> Vec<Option<f64>> {
    let n = bars as usize;
    // Equalizer ties first: bars an equalizer joins are one node.
    let mut ties = UnionFind::<usize>::new(n);
    for g in tie_groups {
        for b in g {
            ties.union(g[0] as usize - 1, *b as usize - 1);
        }
    }
    let mut g = UnGraph::<(), f64>::new_undirected();
    let nodes: Vec<_> = (0..n).map(|_| g.add_node(())).collect();
    for &(a, b, r) in coils {
        let (a, b) = (a as usize - 1, b as usize - 1);
        g.add_edge(nodes[ties.find(a)], nodes[ties.find(b)], 1.0 / r);
    }
    let mut uf = UnionFind::<usize>::new(n);
    for e in g.raw_edges() {
        uf.union(e.source().index(), e.target().index());
    }
    pairs
        .iter()
        .map(|&(a, b)| {
            let (a, b) = (ties.find(a as usize - 1), ties.find(b as usize - 1));
            if a == b {
                return Some(0.0);
            }
            if !uf.equiv(a, b) {
                return None;
            }
            // Laplacian over the part's nodes, ground a.
            let members: Vec<usize> = (0..n)
                .filter(|&i| ties.find(i) == i && uf.equiv(i, a) && i != a)
                .collect();
            let idx = |x: usize| members.iter().position(|&m| m == x);
            let k = members.len();
            let mut m = vec![vec![0.0f64; k + 1]; k];
            for e in g.raw_edges() {
                let (s, t) = (e.source().index(), e.target().index());
                if s == t || !uf.equiv(s, a) {
                    continue;
                }
                let y = e.weight;
                if let Some(i) = idx(s) {
                    m[i][i] += y;
                }
                if let Some(j) = idx(t) {
                    m[j][j] += y;
                }
                if let (Some(i), Some(j)) = (idx(s), idx(t)) {
                    m[i][j] -= y;
                    m[j][i] -= y;
                }
            }
            let bi = idx(b).unwrap();
            m[bi][k] = 1.0;
            for col in 0..k {
                let piv = (col..k)
                    .max_by(|&x, &y| m[x][col].abs().total_cmp(&m[y][col].abs()))
                    .unwrap();
                m.swap(col, piv);
                let pivot_row = m[col].clone();
                for (row, line) in m.iter_mut().enumerate() {
                    let f = line[col] / pivot_row[col];
                    if row != col && f != 0.0 {
                        for (x, p) in line.iter_mut().zip(&pivot_row).skip(col) {
                            *x -= f * p;
                        }
                    }
                }
            }
            Some(m[bi][k] / m[bi][bi])
        })
        .collect()
}

proptest! {
    #![proptest_config(support::properties(200))]

    #[test]
    fn the_sparse_solver_agrees_with_a_dense_one(
        c in designs(Space {
            pole_pairs: 1..=4,
            coils_per_slot: 1..=1,
            retrogressive: OFF,
            ccw: OFF,
            generator: OFF,
            span_delta: 0..=0,
            lead_offset: 0..=0,
            room: 2,
            more_slots: 24,
            ..Space::default()
        }),
        eq in 0u32..=2,
    ) {
        let eq = if c.wave { "" } else { ["", "equalizers = \"full\"", "equalizers = 2"][eq as usize] };
        let text = c.toml_with(&format!("{eq}\n"));
        let parsed = armsheet::design::parse_design(&text, "p.toml");
        prop_assume!(parsed.is_ok(), "refused: {}", text);
        let d = parsed.unwrap();
        let c = check(d);
        let w = &c.winding;
        let net = Network::of_winding(w);
        let mut pairs = neighbour_pairs(w.active_coils);
        pairs.push((1, 1 + w.active_coils / 2));
        let sparse = net.effective(&pairs);
        let dense = dense_effective(w, &pairs);
        for ((p, s), d) in pairs.iter().zip(&sparse).zip(&dense) {
            match (s, d) {
                (Some(s), Some(d)) => prop_assert!((s - d).abs() < 1e-8 * d.max(1.0), "{text} {p:?}: {s} vs {d}"),
                (None, None) => {}
                _ => prop_assert!(false, "{text} {p:?}: {s:?} vs {d:?}"),
            }
        }
    }
}

#[test]
fn test_command_writes_json_text_and_csv() {
    let out = armsheet(&["test", "designs/hoist-lap.toml", "--json"]);
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["unit"], "ohm");
    assert!(v["coil_resistance_ohm"].as_f64().unwrap() > 0.0);
    assert_eq!(v["readings"].as_array().unwrap().len(), 36);
    assert_eq!(v["readings"][35]["from_bar"], 36);
    assert_eq!(v["readings"][35]["to_bar"], 1);
    assert_eq!(v["drop_test"]["current_a"], 10.0);
    assert_eq!(v["drop_test"]["feeds"][0]["to_bar"], 19);
    let hot = armsheet(&[
        "test",
        "designs/hoist-lap.toml",
        "--json",
        "--temperature",
        "75",
    ]);
    let h: serde_json::Value = serde_json::from_slice(&hot.stdout).unwrap();
    let ratio =
        h["coil_resistance_ohm"].as_f64().unwrap() / v["coil_resistance_ohm"].as_f64().unwrap();
    // The 234.5 °C rule [src: IEC 60228 / IEEE 118 practice for copper].
    assert!((ratio - (234.5 + 75.0) / (234.5 + 20.0)).abs() < 1e-4);

    let t = text(&armsheet(&["test", "designs/press-duplex-lap.toml"]).stdout);
    assert!(t.contains("read open"), "{t}");
    assert!(t.contains("growler or the compass test"), "{t}");
    assert!(t.contains("residual or induced voltage"), "{t}");

    let dir = scratch("set");
    let o = armsheet(&[
        "test",
        "designs/pump-wave.toml",
        "-o",
        dir.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let csv = std::fs::read_to_string(dir.join("pump-wave").join("readings.csv")).unwrap();
    // RFC 4180, as every CSV armsheet writes: CRLF after every record.
    assert!(csv.starts_with("from_bar,to_bar,expected,measured\r\n1,2,"));
    assert!(csv.ends_with(",\r\n"));
    assert!(csv.lines().nth(1).unwrap().ends_with(','));
}

/// A frog-leg whose wave coils have twice the lap coils' turns (`turns = 2`, `wave_turns = 4`)
/// reads as wound: every expected reading agrees with the independent dense solve that
/// weighs each coil by its own element's turns (one wire, one mean turn) [derived, series
/// resistance of a coil ∝ its turns].
#[test]
fn a_frog_leg_with_heavier_wave_coils_reads_as_wound() {
    let design = "[armature]\npoles = 4\nslots = 29\ncoils_per_slot = 2\n\n[winding]\ntype = \"frog-leg\"\nspan = 7\nturns = 2\nwave_turns = 4\n";
    let (c, t) = tested(design);
    let pairs: Vec<(u32, u32)> = t.readings.iter().map(|r| (r.from_bar, r.to_bar)).collect();
    let dense = dense_effective(&c, &pairs);
    for (r, d) in t.readings.iter().zip(&dense) {
        let (e, d) = (r.expected.unwrap(), d.unwrap());
        assert!((e - d).abs() <= 1e-9 * d, "{r:?}: {e} against {d}");
    }
    // The same armature with wave_turns = turns reads lower: the wave coils count.
    let (_, even) = tested(&design.replace("wave_turns = 4", "wave_turns = 2"));
    assert!(even.readings[0].expected.unwrap() < 0.95 * t.readings[0].expected.unwrap());
}

/// Pairs that reach every path of the solver: neighbours, bars `m` apart, and bars far apart.
fn probe_pairs(bars: u32, m: u32) -> Vec<(u32, u32)> {
    let mut pairs = neighbour_pairs(bars);
    pairs.extend(armsheet::features::armature_test::pairs_apart(
        bars,
        m.max(2),
    ));
    pairs.extend([(1, 1 + bars / 2), (2, 1 + bars / 3), (bars, 1 + bars / 4)]);
    pairs
}

fn agree(what: &str, ours: &[Option<f64>], dense: &[Option<f64>], pairs: &[(u32, u32)], tol: f64) {
    for ((p, s), d) in pairs.iter().zip(ours).zip(dense) {
        match (s, d) {
            (Some(s), Some(d)) => assert!(
                (s - d).abs() <= tol * d.abs().max(1e-12),
                "{what} {p:?}: {s} against {d}"
            ),
            (None, None) => {}
            _ => panic!("{what} {p:?}: {s:?} against {d:?}"),
        }
    }
}

/// Each way the network works out a reading, against the independent dense solve to 1e-9
/// relative [derived, one physics two methods]: a part that is a simple cycle (simplex lap and
/// wave, a wave with dummy coils, a singly re-entrant duplex lap, each closed winding of a
/// doubly re-entrant duplex lap, whose neighbours read open), and the selected inverse of the
/// general parts (a lap with full and with every-other-bar equalizers, a duplex lap with
/// equalizers, whose neighbouring pairs are no coil of the network, frog-legs).
#[test]
fn every_path_of_the_network_agrees_with_the_dense_solve() {
    let cases = [
        ("simplex lap, a cycle", toml(4, 36, "lap", 1, 9, "")),
        ("simplex wave, a cycle", toml(6, 35, "wave", 1, 5, "")),
        (
            "lap, full equalizers",
            toml(4, 36, "lap", 1, 9, "equalizers = \"full\""),
        ),
        ("lap, 2 equalizers", toml(6, 54, "lap", 1, 9, "equalizers = 2")),
        ("duplex lap singly re-entrant", toml(4, 25, "lap", 2, 6, "")),
        ("duplex lap doubly re-entrant", toml(4, 48, "lap", 2, 12, "")),
        (
            "duplex lap doubly re-entrant, equalized",
            toml(4, 48, "lap", 2, 12, "equalizers = \"full\""),
        ),
        ("wave with dummy coils", support::demo("conveyor-wave-dummy")),
        ("frog-leg", support::demo("mill-frog-leg")),
        (
            "frog-leg, 4 poles",
            "[armature]\npoles = 4\nslots = 29\ncoils_per_slot = 2\n\n[winding]\ntype = \"frog-leg\"\nspan = 7\nturns = 2\nwave_turns = 4\n".to_string(),
        ),
    ];
    for (what, text) in &cases {
        let c = check(design(text));
        let w = &c.winding;
        let pairs = probe_pairs(w.active_coils, c.design.multiplicity);
        let ours = Network::of_winding(w).effective(&pairs);
        agree(what, &ours, &dense_effective(w, &pairs), &pairs, 1e-9);
    }
}

/// A part that is a path (a closed winding with a coil taken out: the resistance along it)
/// and a tree-like part with branches (an equalized lap with coils taken out), against the
/// dense solve [derived].
#[test]
fn a_winding_with_coils_taken_out_agrees_with_the_dense_solve() {
    for (what, text, out) in [
        (
            "simplex lap less one coil, a path",
            toml(4, 36, "lap", 1, 9, ""),
            vec![5],
        ),
        (
            "simplex lap less two coils, two paths",
            toml(4, 36, "lap", 1, 9, ""),
            vec![5, 20],
        ),
        (
            "equalized lap less three coils",
            toml(4, 36, "lap", 1, 9, "equalizers = \"full\""),
            vec![1, 2, 30],
        ),
    ] {
        let c = check(design(&text));
        let net = Network::of_winding(&c.winding);
        let ties = match &c.winding.equalizers {
            EqualizerPlan::Possible(e) => e.groups.clone(),
            _ => Vec::new(),
        };
        let coils: Vec<NetCoil> = net
            .coils
            .iter()
            .enumerate()
            .filter(|(i, _)| !out.contains(i))
            .map(|(_, c)| *c)
            .collect();
        let pairs = probe_pairs(net.bars, 2);
        let ours = Network::new(net.bars, coils.clone(), &ties).effective(&pairs);
        let edges: Vec<(u32, u32, f64)> = coils
            .iter()
            .map(|c| (c.from_bar, c.to_bar, c.resistance))
            .collect();
        agree(
            what,
            &ours,
            &dense_of(net.bars, &edges, &ties, &pairs),
            &pairs,
            1e-9,
        );
    }
}

/// One coil opened (10⁶ coil resistances) as a rank-one update of the solved network reads as
/// the network built again with that coil's resistance, on a frog-leg, an equalized lap and a
/// path where the opened coil is a bridge [derived, Sherman–Morrison].
#[test]
fn an_opened_coil_as_a_rank_one_update_reads_as_the_network_built_again() {
    let of = |text: &str| {
        let c = check(design(text));
        let ties = match &c.winding.equalizers {
            EqualizerPlan::Possible(e) => e.groups.clone(),
            _ => Vec::new(),
        };
        (Network::of_winding(&c.winding), ties)
    };
    let (lap, _) = of(&toml(4, 36, "lap", 1, 9, ""));
    let mut path = lap.coils.clone();
    path.remove(3);
    for (what, (net, ties)) in [
        ("frog-leg", of(&support::demo("mill-frog-leg"))),
        (
            "equalized lap",
            of(&toml(6, 54, "lap", 1, 9, "equalizers = \"full\"")),
        ),
        ("a path", (Network::new(36, path, &[]), Vec::new())),
    ] {
        let pairs = probe_pairs(net.bars, 2);
        let base = net.effective(&pairs);
        for index in [0, 7, net.coils.len() - 1] {
            let updated = net.effective_with_coil(&pairs, &base, index, 1e6);
            let mut coils = net.coils.clone();
            coils[index].resistance = 1e6;
            let rebuilt = Network::new(net.bars, coils, &ties).effective(&pairs);
            agree(
                &format!("{what}, coil index {index}"),
                &updated,
                &rebuilt,
                &pairs,
                1e-8,
            );
            // Not the base: the update moved something.
            assert!(updated.iter().zip(&base).any(|(u, b)| u != b), "{what}");
        }
    }
}
