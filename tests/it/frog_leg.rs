//! Frog-leg windings: the worked examples, the elements traced on one commutator, the checks,
//! and the combined network under load showing bars two pole pitches apart at one potential.
//!
//! The expected figures are derived by hand from the frog-leg rules (docs/domain.md, "Frog-leg
//! windings": a trade association's technical note read in a public copy; the
//! self-equalizing condition y_c(lap) + |y_c(wave)| = C/p is derived), never by calling the
//! engine's own formulas.

use crate::support;

use crate::support::design;
use armsheet::checks::{Checked, check};
use armsheet::features::armature_test::Network;
use armsheet::theory::WindingType;
use armsheet::winding::Winding;
use proptest::prelude::*;

fn frog(poles: u32, slots: u32, u: u32, span: u32, extra: &str) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = {u}\n\n[winding]\ntype = \"frog-leg\"\nspan = {span}\nturns = 1\n{extra}"
    )
}

fn checked(toml: &str) -> Checked {
    check(design(toml))
}

/// The throw of an element's coil 1 in shop form "1-y": from its start bar, counted on.
fn throw(w: &Winding, element: usize) -> u32 {
    let e = &w.elements[element];
    let k = &w.connections[(e.first_coil - 1) as usize];
    let (a, b) = (k.start_segment.unwrap(), k.end_segment.unwrap());
    (b + w.active_coils - a) % w.active_coils + 1
}

/// Largest |V(s) − V(s + C/p)| over the bars, against the largest |V| (0 when all are 0).
fn pair_spread(w: &Winding, v: &[f64], p: u32) -> (f64, f64) {
    let c = w.active_coils as usize;
    let pair = c / p as usize;
    let worst = (0..c)
        .map(|s| (v[s] - v[(s + pair) % c]).abs())
        .fold(0.0, f64::max);
    let scale = v.iter().fold(0.0f64, |m, x| m.max(x.abs()));
    (worst, scale)
}

/// The coil EMFs of the traced winding at the reference position, as floats.
fn emfs(w: &Winding) -> Vec<f64> {
    w.coil_emf.iter().map(|&e| e as f64).collect()
}

#[test]
fn four_pole_58_bar_worked_example() {
    // 4 poles, 58 bars [derived; docs/domain.md, "Frog-leg windings"]: lap throw 1-2; wave
    // y_c = (58 - 2)/2 = 28, throw 1-29; gcd(58, 28) = 2, doubly re-entrant; a = 2 x 1 x 4 = 8.
    // The pole pitch is 14.5 slots: lap span 14 and wave span 15 make two pole pitches, so the
    // loop of a lap and a wave coil between bars two pole pitches apart holds no EMF.
    let c = checked(&frog(4, 58, 1, 14, "wave_span = 15\n"));
    let w = &c.winding;
    assert_eq!(c.design.winding_type, WindingType::FrogLeg);
    assert_eq!(w.active_coils, 58);
    assert_eq!(w.connections.len(), 2 * 58);
    assert_eq!(w.elements.len(), 2);
    assert_eq!(w.elements[0].kind, WindingType::Lap);
    assert_eq!(w.elements[1].kind, WindingType::Wave);
    assert_eq!(throw(w, 0), 2);
    assert_eq!(throw(w, 1), 29);
    assert_eq!(w.elements[1].multiplicity, 2);
    assert_eq!(w.elements[1].reentrancy, 2);
    assert_eq!(w.elements[0].reentrancy, 1);
    assert_eq!(w.parallel_paths(), 8);
    assert_eq!((w.elements[0].paths, w.elements[1].paths), (4, 4));
    for id in [
        "frogleg.self-equalizing",
        "frogleg.pole-pairs-whole",
        "frogleg.element-paths",
        "trace.paths",
        "trace.every-coil",
    ] {
        let f = c.findings.iter().find(|f| f.id == id).unwrap();
        assert!(f.passed, "{id}: {}", f.message);
    }
    // Equal spans on a pole pitch of 14.5 slots leave EMF in that loop: not self-equalizing.
    let c = checked(&frog(4, 58, 1, 14, ""));
    let f = c
        .findings
        .iter()
        .find(|f| f.id == "frogleg.self-equalizing")
        .unwrap();
    assert!(!f.passed && c.has_errors(), "{}", f.message);
}

#[test]
fn six_pole_54_bar_example() {
    // 6 poles, 54 slots, u = 1 [derived]: lap y_c = 1; wave m_w = 1 x 3 = 3,
    // y_c = (54 - 3)/3 = 17, throw 1-18; gcd(54, 17) = 1, singly re-entrant;
    // 1 + 17 = 18 = 54/3; a = 2 x 1 x 6 = 12.
    let c = checked(&frog(6, 54, 1, 9, ""));
    let w = &c.winding;
    assert_eq!(throw(w, 0), 2);
    assert_eq!(throw(w, 1), 18);
    assert_eq!(w.elements[1].multiplicity, 3);
    assert_eq!(w.elements[1].reentrancy, 1);
    assert_eq!(w.parallel_paths(), 12);
    assert!(c.symmetric, "{:?}", c.findings);
}

#[test]
fn duplex_frog_leg_has_four_m_p_paths() {
    // Duplex lap element on 4 poles: m_w = 2 x 2 = 4, wave y_c = (60 - 4)/2 = 28,
    // a = 2 x 2 x 4 = 16 [derived].
    let c = checked(&frog(
        4,
        60,
        1,
        15,
        "multiplicity = 2\n[commutator]\nbrush_width_segments = 2\n",
    ));
    let w = &c.winding;
    assert_eq!(w.elements[0].pitches.commutator, 2);
    assert_eq!(w.elements[1].pitches.commutator, 28);
    assert_eq!(w.parallel_paths(), 16);
}

#[test]
fn json_lists_elements_and_marks_every_row() {
    let c = checked(&frog(4, 58, 1, 14, "wave_span = 15\n"));
    let j: serde_json::Value =
        serde_json::from_str(&armsheet::render::json::report_json(&c)).unwrap();
    assert_eq!(j["winding"]["type"], "frog-leg");
    assert_eq!(j["parallel_paths"], 8);
    let el = j["elements"].as_array().unwrap();
    assert_eq!(el.len(), 2);
    assert_eq!(el[0]["kind"], "lap");
    assert_eq!(el[1]["kind"], "wave");
    assert_eq!(el[1]["commutator_pitch"], 28);
    assert_eq!(el[1]["span"], 15);
    assert_eq!(el[1]["reentrancy"], 2);
    let rows = j["connections"].as_array().unwrap();
    assert_eq!(rows.len(), 2 * 58);
    assert_eq!(rows.iter().filter(|r| r["element"] == "lap").count(), 58);
    assert_eq!(rows.iter().filter(|r| r["element"] == "wave").count(), 58);
    // The demo's lists whole: 2·u·S rows, each element's rows in coil order with one start
    // and one end lead on every bar.
    let demo = checked(&support::demo("mill-frog-leg"));
    let j: serde_json::Value =
        serde_json::from_str(&armsheet::render::json::report_json(&demo)).unwrap();
    let rows = j["connections"].as_array().unwrap();
    assert_eq!(rows.len(), 2 * 2 * 75);
    for (k, kind) in ["lap", "wave"].into_iter().enumerate() {
        let mine: Vec<_> = rows.iter().filter(|r| r["element"] == kind).collect();
        assert_eq!(mine.len(), 150);
        let (mut starts, mut ends) = (vec![0; 150], vec![0; 150]);
        for (i, r) in mine.iter().enumerate() {
            assert_eq!(r["coil"].as_u64().unwrap() as usize, k * 150 + i + 1);
            starts[r["start_segment"].as_u64().unwrap() as usize - 1] += 1;
            ends[r["end_segment"].as_u64().unwrap() as usize - 1] += 1;
        }
        assert!(starts.iter().chain(&ends).all(|&x| x == 1), "{kind}");
    }
    // A plain lap keeps its rows as they were: no element key.
    let lap = checked("[armature]\npoles = 4\nslots = 36\n[winding]\ntype = \"lap\"\nturns = 2\n");
    let j: serde_json::Value =
        serde_json::from_str(&armsheet::render::json::report_json(&lap)).unwrap();
    assert!(j.get("elements").is_none());
    assert!(j["connections"][0].get("element").is_none());
}

/// The self-equalizing condition is read off the connections: moving one wave coil's end
/// lead breaks it; unequal turns warn.
#[test]
fn checks_fail_where_the_winding_does() {
    let c = checked(&frog(4, 58, 1, 14, ""));
    let mut w = c.winding.clone();
    let k = &mut w.connections[58];
    k.end_segment = Some(k.end_segment.unwrap() % 58 + 1);
    let f = armsheet::checks::run_checks(&c.design, &w, None)
        .into_iter()
        .find(|f| f.id == "frogleg.self-equalizing")
        .unwrap();
    assert!(!f.passed, "{}", f.message);
    let c = checked(&frog(4, 58, 1, 14, "wave_turns = 2\n"));
    let f = c
        .findings
        .iter()
        .find(|f| f.id == "frogleg.equal-coils")
        .unwrap();
    assert!(!f.passed);
    assert_eq!(c.winding.elements[1].turns, 2);
    // Z counts both elements: 2 x 58 x (1 + 2).
    assert_eq!(c.winding.conductors, 2 * 58 * 3);
}

/// Under load, with every coil's EMF at the reference position and the current fed at the
/// brushes, bars two pole pitches apart sit at one potential, as the series lap and wave
/// coils between them say; and each such pair of coils carries opposite EMFs.
#[test]
fn combined_network_under_load_holds_pairs_equipotential() {
    let c = checked(&support::demo("mill-frog-leg"));
    let w = &c.winding;
    let v = Network::under_load(w, &emfs(w), 16.0);
    let (worst, scale) = pair_spread(w, &v, c.design.pole_pairs());
    assert!(scale > 1.0, "the load gives the bars potentials: {scale}");
    assert!(worst <= 1e-9 * scale, "worst {worst} of {scale}");
    // The series loop: lap coil from bar s, then the wave coil from its end bar.
    let n = w.elements[0].coils as usize;
    let lap_from: Vec<usize> = {
        let mut by = vec![0; w.active_coils as usize];
        for (i, k) in w.connections[..n].iter().enumerate() {
            by[(k.start_segment.unwrap() - 1) as usize] = i;
        }
        by
    };
    let wave_from: Vec<usize> = {
        let mut by = vec![0; w.active_coils as usize];
        for (i, k) in w.connections[n..].iter().enumerate() {
            by[(k.start_segment.unwrap() - 1) as usize] = n + i;
        }
        by
    };
    for (s, &l) in lap_from.iter().enumerate() {
        let mid = (w.connections[l].end_segment.unwrap() - 1) as usize;
        let wv = wave_from[mid];
        assert_eq!(w.coil_emf[l] + w.coil_emf[wv], 0, "bar {}", s + 1);
    }
}

/// The feasible frog-leg designs the property tests draw: P 4-12, u 1-2, S a multiple of p
/// (so C/p and S/p are whole), span near the pole pitch.
fn case() -> impl Strategy<Value = (u32, u32, u32, u32, i32)> {
    (2u32..=6, 1u32..=2, 3u32..=8, -1i32..=1).prop_flat_map(|(p, u, k, dw)| {
        let slots = p * 2 * k + if k % 2 == 0 { p } else { 0 };
        let span = (slots / (2 * p)).max(1);
        (Just(2 * p), Just(slots), Just(u), Just(span), Just(dw))
    })
}

proptest! {
    #![proptest_config(support::properties(40))]

    #[test]
    fn random_frog_leg_designs((poles, slots, u, span, dw) in case()) {
        let wave_span = (span as i32 + dw).clamp(1, slots as i32 - 1);
        let c = checked(&frog(poles, slots, u, span, &format!("wave_span = {wave_span}\n")));
        let w = &c.winding;
        let bars = w.active_coils as usize;
        // One start lead and one end lead of each element on every bar: four leads a bar.
        for e in &w.elements {
            let (mut starts, mut ends) = (vec![0; bars], vec![0; bars]);
            for k in w.connections.iter().filter(|k| e.holds(k.coil)) {
                starts[(k.start_segment.unwrap() - 1) as usize] += 1;
                ends[(k.end_segment.unwrap() - 1) as usize] += 1;
            }
            prop_assert!(starts.iter().chain(&ends).all(|&x| x == 1));
        }
        // Paths as traced: 2 m P.
        prop_assert_eq!(w.parallel_paths(), 2 * poles);
        // Bars two pole pitches apart at one potential under load.
        let v = Network::under_load(w, &emfs(w), 1.0);
        let (worst, scale) = pair_spread(w, &v, poles / 2);
        prop_assert!(worst <= 1e-9 * scale.max(1.0), "worst {} of {}", worst, scale);
        // The card a rewinder records from this armature, in the physical convention (the
        // wave coil's leads either side of its own centre line, as traced), identifies it.
        let first = &w.connections[0];
        let wave = &w.connections[(w.elements[1].first_coil - 1) as usize];
        let span_of = |k: &armsheet::winding::Connection| (k.bottom.slot + slots - k.top.slot) % slots + 1;
        let card = format!(
            "[observed]\npoles = {poles}\nslots = {slots}\nbars = {bars}\ncoil_span = \"1-{}\"\nlead_throw = \"1-{}\"\nlead_swing = {}\ncoils_per_slot = {u}\nturns = 1\nleads_per_bar = 4\nwave_throw = \"{}-{}\"\nwave_coil_span = \"1-{}\"\n",
            span_of(first),
            first.end_segment.unwrap(),
            w.lead_swing.swing_half_bars(w.active_coils) as f64 / 2.0,
            wave.start_segment.unwrap(),
            wave.end_segment.unwrap(),
            span_of(wave),
        );
        let card = armsheet::design::parse_card(&card, "card.toml").unwrap_or_else(|e| panic!("{card}\n{e}"));
        let found = armsheet::features::identify::identify(&card);
        prop_assert!(
            found.candidates.iter().any(|k| k.checked.winding.connections == w.connections),
            "{:?}",
            found.conflicts
        );
    }
}

/// The equalizing shown, not assumed: with an eccentric air gap (coil EMFs 10 % up on one
/// side, down on the other, as cos of the slot angle) the plain lap of the same armature
/// leaves bars two pole pitches apart several coil EMFs apart, while the frog-leg's wave
/// element holds them within a tenth of that; with an even gap both hold them equal.
#[test]
fn frog_leg_equalizes_an_eccentric_gap() {
    let spread = |kind: &str, extra: &str, ecc: f64| {
        let toml = format!(
            "[armature]\npoles = 8\nslots = 116\ncoils_per_slot = 3\n[winding]\ntype = \"{kind}\"\nspan = 14\nturns = 1\n{extra}"
        );
        let c = checked(&toml);
        let w = &c.winding;
        let e: Vec<f64> = w
            .connections
            .iter()
            .map(|k| {
                let angle = std::f64::consts::TAU * f64::from(k.top.slot - 1) / 116.0;
                w.coil_emf[(k.coil - 1) as usize] as f64 * (1.0 + ecc * angle.cos())
            })
            .collect();
        let v = Network::under_load(w, &e, 16.0);
        pair_spread(w, &v, 4).0
    };
    assert!(spread("lap", "", 0.0) < 1e-9);
    assert!(spread("frog-leg", "wave_span = 15\n", 0.0) < 1e-9);
    let lap = spread("lap", "", 0.1);
    let frog = spread("frog-leg", "wave_span = 15\n", 0.1);
    assert!(lap > 1.0, "the plain lap is unequalized: {lap}");
    assert!(frog < lap / 10.0, "frog-leg {frog} against lap {lap}");
}

/// The rating's armature resistance is the combined network's: with the brushes on single
/// bars (no coil shorted), the network solved between the brush terminals gives the value the
/// rating states, in coil resistances (r = rho·T·L_mt/A, IEC 60028 copper 1/58 ohm mm2/m).
#[test]
fn armature_resistance_is_the_combined_networks() {
    let toml = frog(
        4,
        30,
        2,
        7,
        "wave_span = 8\n[conductor]\ndiameter_mm = 2.0\nmean_turn_mm = 800\n[rating]\nvoltage = 220\ncurrent = 40\n",
    );
    let c = checked(&toml);
    let w = &c.winding;
    assert!(w.shorted_coils.is_empty(), "{:?}", w.shorted_coils);
    assert_eq!(w.parallel_paths(), 8);
    let v = Network::under_load(w, &vec![0.0; w.connections.len()], 1.0);
    let at = |pol: armsheet::winding::Polarity| {
        let b = w.brushes.iter().find(|b| b.polarity == pol).unwrap();
        v[(b.contacts[0] - 1) as usize]
    };
    let r_net =
        at(armsheet::winding::Polarity::Positive) - at(armsheet::winding::Polarity::Negative);
    // By hand: each element C/a_e^2 = 60/16 coil resistances, two in parallel: 1.875.
    assert!((r_net - 1.875).abs() < 1e-9, "{r_net}");
    let area = std::f64::consts::PI; // 2 mm round wire: pi mm2
    let coil = (1.0 / 58.0) * 0.8 / area;
    let r20 = c
        .rating
        .as_ref()
        .unwrap()
        .resistance
        .as_ref()
        .unwrap()
        .r20_ohm;
    assert!(
        (r20 / coil - r_net).abs() < 1e-9,
        "{} against {r_net}",
        r20 / coil
    );
}

/// `armsheet test` on a frog-leg solves the combined network and says how it reads: about half
/// of the lap element alone, every reading equal on this symmetric winding.
#[test]
fn armature_test_describes_the_frog_leg_pattern() {
    let out = support::armsheet(&["test", "designs/mill-frog-leg.toml", "--json"]);
    assert_eq!(out.status.code(), Some(0));
    let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let words = j["elements_pattern"].as_str().unwrap();
    assert!(
        words.starts_with("frog-leg: each pair of neighbouring bars"),
        "{words}"
    );
    // Two equal elements: the combined reading is half the lap element's alone [derived; the
    // network's own figures, printed as "(50.0 % of it)"].
    assert!(words.contains("(50.0 % of it)"), "{words}");
    let lap = support::armsheet(&["test", "designs/hoist-lap.toml", "--json"]);
    let j: serde_json::Value = serde_json::from_slice(&lap.stdout).unwrap();
    assert!(j.get("elements_pattern").is_none());
}

/// The sheets tell the elements apart: the developed diagram marks every coil with its
/// element and draws both; the connection table and the winding order carry an element
/// column; the end view names the four leads a bar; the CSV ends each row with the element.
#[test]
fn sheets_show_both_elements() {
    let dir = support::scratch("sheets");
    let out = support::armsheet(&[
        "sheet",
        "designs/mill-frog-leg.toml",
        "-o",
        dir.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", support::text(&out.stderr));
    let set = dir.join("mill-frog-leg");
    let all: String = support::files_in(&set)
        .into_iter()
        .filter(|(n, _)| n.ends_with(".svg"))
        .map(|(_, b)| String::from_utf8(b).unwrap())
        .collect();
    assert!(all.contains(r#"data-element="lap""#));
    assert!(all.contains(r#"data-element="wave""#));
    assert!(all.contains(">elem.<"), "an element column heading");
    assert!(all.contains("Every bar takes four leads"));
    let csv = std::fs::read_to_string(set.join("connections.csv")).unwrap();
    let mut lines = csv.lines();
    assert!(lines.next().unwrap().ends_with(",element"));
    assert_eq!(csv.lines().filter(|l| l.ends_with(",wave")).count(), 150);
    assert_eq!(csv.lines().filter(|l| l.ends_with(",lap")).count(), 150);
}

/// A rewind keeps the frog-leg whole: the wave coils' span is written back, both elements
/// take the new turns, and the turns come from each element's share of the paths
/// (conductors per path 2·C·T/(a/2)), so the EMF lands near the new voltage.
#[test]
fn rewind_keeps_both_elements() {
    let dir = support::scratch("rewind");
    let file = dir.join("new.toml");
    // 480 V wants two turns, which put 18.9 V between segments: check refuses that design, so
    // it is not written and the exit is 1.
    let out = support::armsheet(&[
        "rewind",
        "designs/mill-frog-leg.toml",
        "--voltage",
        "480",
        "-o",
        file.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(1), "{}", support::text(&out.stderr));
    assert!(support::text(&out.stdout).contains("[error] rating.segment-volts-average"));
    assert!(!file.exists());
    // 360 V also takes two turns (the speed follows), within the segment voltage.
    let out = support::armsheet(&[
        "rewind",
        "designs/mill-frog-leg.toml",
        "--voltage",
        "360",
        "-o",
        file.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", support::text(&out.stderr));
    let c = checked(&std::fs::read_to_string(&file).unwrap());
    let d = &c.design;
    assert_eq!(d.winding_type, WindingType::FrogLeg);
    let wave = d.wave_coils.unwrap();
    assert_eq!((wave.span, wave.turns, d.turns), (13, 2, 2));
    // 240 V at 1 turn; two turns double the EMF at the old speed.
    let e = c.winding.constants.emf_v.unwrap();
    assert!((e - 2.0 * 228.0).abs() < 1.0, "{e}");
}

/// A card with four leads a bar and the wave coil's throw identifies the frog-leg it was taken
/// on: one candidate, traced to the demo's very connections; the same card with a wave throw
/// one bar off fits nothing and says why.
#[test]
fn identify_finds_the_frog_leg_from_its_card() {
    let text = support::fixture("frog-leg-card.toml");
    let card = armsheet::design::parse_card(&text, "card.toml").unwrap();
    let found = armsheet::features::identify::identify(&card);
    assert_eq!(found.candidates.len(), 1, "{:?}", found.conflicts);
    let got = &found.candidates[0].checked;
    assert_eq!(got.design.winding_type, WindingType::FrogLeg);
    let demo = checked(&support::demo("mill-frog-leg"));
    assert_eq!(got.winding.connections, demo.winding.connections);
    let off = text.replace("wave_throw = \"128-27\"", "wave_throw = \"129-28\"");
    let card = armsheet::design::parse_card(&off, "card.toml").unwrap();
    let found = armsheet::features::identify::identify(&card);
    assert!(found.candidates.is_empty());
    assert!(
        found
            .conflicts
            .iter()
            .any(|c| c.contains("not the 129-28 seen")),
        "{:?}",
        found.conflicts
    );
    // Without the four leads, the same bars read as a plain lap.
    let two = text
        .replace("leads_per_bar = 4\n", "")
        .replace("wave_throw = \"128-27\"\n", "")
        .replace("wave_coil_span = \"1-14\"\n", "");
    let card = armsheet::design::parse_card(&two, "card.toml").unwrap();
    let found = armsheet::features::identify::identify(&card);
    assert!(
        found
            .candidates
            .iter()
            .all(|k| k.checked.design.winding_type == WindingType::Lap)
    );
}

/// The drop test feeds a frog-leg as its lap element: once, at bar 1 and the bar opposite,
/// although the wave element adds closed windings of its own (4 poles, 58 bars: 1 + 2).
#[test]
fn drop_test_feeds_a_frog_leg_once_across_the_commutator() {
    let dir = support::scratch("drop");
    let file = dir.join("f.toml");
    std::fs::write(&file, frog(4, 58, 1, 14, "")).unwrap();
    let out = support::armsheet(&["test", file.to_str().unwrap(), "--json"]);
    let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let feeds = j["drop_test"]["feeds"].as_array().unwrap();
    assert_eq!(feeds.len(), 1);
    assert_eq!(
        (feeds[0]["from_bar"].as_u64(), feeds[0]["to_bar"].as_u64()),
        (Some(1), Some(30))
    );
}
