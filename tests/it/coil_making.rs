//! Coil making: the coil's shape, the wire to order and the slot fill (issue 22, §1–§3).
//!
//! Each value names its source beside it: an outside table (IEC 60028, ASTM B258, IEC 60317),
//! or `derived` for our own hand arithmetic on the model of docs/domain.md, "Coil making".
//! The properties are checked against what a change of input must do to a physical coil,
//! never by running the formula again.

use crate::support;
use armsheet::check;
use armsheet::rating::CoilMaking;

/// A 4-pole lap: 36 slots, span 8, 4 turns of 2 x 1.6 mm, core 190 x 160 mm, slot 14 x 5.5 mm.
fn base(turns: u32, core_extra: &str) -> String {
    format!(
        "[armature]\npoles = 4\nslots = 36\n\n[winding]\ntype = \"lap\"\nspan = 8\nturns = {turns}\n\n\
         [conductor]\ndiameter_mm = 1.6\nstrands = 2\n\n\
         [core]\ndiameter_mm = 190\nlength_mm = 160\nslot_depth_mm = 14\nslot_width_mm = 5.5\n{core_extra}"
    )
}

fn coil(toml: &str) -> CoilMaking {
    check(support::design(toml))
        .rating
        .and_then(|r| r.coil_making)
        .expect("coil making worked out")
}

fn near(a: f64, b: f64, tol: f64, what: &str) {
    assert!((a - b).abs() <= tol, "{what}: {a} against {b} (± {tol})");
}

#[test]
fn the_coil_by_hand() {
    let k = coil(&base(4, "riser_distance_mm = 35\n"));
    let c = &k.shapes[0];
    // derived, by hand: r_m = 190/2 − 14/2 = 88 mm; s = 2π·88·8/36 = 122.871 mm.
    near(c.span_arc_mm, 122.871, 0.001, "span arc");
    // derived: legs at 25° (default): 61.4356/cos 25° = 61.4356/0.906308 = 67.787 mm.
    near(c.end_leg_mm, 67.787, 0.001, "end leg");
    // derived: nose 10 + 61.4356·tan 25° = 10 + 61.4356·0.466308 = 38.648 mm past the core.
    near(c.nose_reach_mm, 38.648, 0.001, "nose reach");
    // derived: straight 160 + 2·10 = 180 mm; mean turn 2·180 + 4·67.787 + 14 = 645.15 mm.
    near(c.straight_mm, 180.0, 1e-9, "straight");
    near(c.mean_turn_mm, 645.15, 0.005, "mean turn");
    near(c.loop_length_mm, 322.575, 0.005, "loop on the former");
    // derived: leads 2·35 = 70 mm; wire a coil 2 strands·(4·645.15 + 70) mm = 5.3012 m.
    near(c.wire_m_per_coil, 5.3012, 0.0001, "wire per coil");
    // 36 coils and 5 % scrap (default): 36·5.3012·1.05 = 200.385 m.
    near(k.wire_m_total, 200.385, 0.005, "wire to order");
}

#[test]
fn the_mean_turn_against_the_rule_of_thumb() {
    // The rule of thumb L_mt ≈ 2·L + 2.5·π·D·y_s/S [common practice, from memory] takes each
    // end as 1.25 coil pitches at the core surface; the coil builds it from a straight
    // extension of fixed length and legs that grow with the span. So on the hoist the two
    // agree within 1 %, a short span makes the coil longer than the rule (the extensions weigh
    // more) and a long one shorter (2/cos 25° = 2.21 pitches of legs against 2.5). The
    // resistance reckons with the coil's own mean turn: one length, not two.
    let estimate = |span: u32| {
        let toml = base(4, "").replace("span = 8", &format!("span = {span}"));
        let c = check(support::design(&toml));
        let r = c.rating.unwrap();
        let made = r.coil_making.unwrap().shapes[0].mean_turn_mm;
        assert_eq!(r.conductor.unwrap().mean_turn.unwrap().mm, made);
        let core = c.design.core.unwrap();
        let (len, dia) = (core.length_mm.unwrap(), core.diameter_mm.unwrap());
        let est = 2.0 * len + 2.5 * std::f64::consts::PI * dia * f64::from(span) / 36.0;
        (est, made)
    };
    let (est, made) = estimate(8);
    assert!((made / est - 1.0).abs() < 0.01, "{made} against {est}");
    let (est, made) = estimate(2);
    assert!(made > est, "short span: {made} against {est}");
    let (est, made) = estimate(17);
    assert!(made < est, "long span: {made} against {est}");
}

#[test]
fn a_longer_core_adds_twice_its_growth_to_every_turn() {
    let short = coil(&base(4, ""));
    let long = coil(&base(4, "").replace("length_mm = 160", "length_mm = 320"));
    // Physical: each turn runs the core's length twice, the ends are unchanged.
    near(
        long.shapes[0].mean_turn_mm - short.shapes[0].mean_turn_mm,
        2.0 * 160.0,
        1e-9,
        "mean turn growth",
    );
    near(
        long.shapes[0].end_leg_mm,
        short.shapes[0].end_leg_mm,
        1e-12,
        "end leg",
    );
    // And the wire of a coil grows by turns·strands·2ΔL: 4·2·0.32 m.
    near(
        long.shapes[0].wire_m_per_coil - short.shapes[0].wire_m_per_coil,
        2.56,
        1e-9,
        "wire per coil",
    );
}

#[test]
fn extension_scrap_and_strands_do_what_they_say() {
    let plain = coil(&base(4, ""));
    // Each turn has four straight extensions: 5 mm more each end adds 20 mm.
    let ext = coil(&base(4, "extension_mm = 15\n"));
    near(
        ext.shapes[0].mean_turn_mm - plain.shapes[0].mean_turn_mm,
        20.0,
        1e-9,
        "extension",
    );
    // No scrap: the total is the coils' wire alone; 10 % is 1.1 times it.
    let none = coil(&base(4, "scrap_percent = 0\n"));
    let ten = coil(&base(4, "scrap_percent = 10\n"));
    near(
        none.wire_m_total,
        36.0 * none.shapes[0].wire_m_per_coil,
        1e-9,
        "no scrap",
    );
    near(
        ten.wire_m_total,
        1.1 * none.wire_m_total,
        1e-9,
        "10 % scrap",
    );
    // Strands in hand: four strands of the same wire, twice the wire and twice the copper.
    let four = coil(&base(4, "").replace("strands = 2", "strands = 4"));
    near(four.wire_m_total, 2.0 * plain.wire_m_total, 1e-9, "strands");
    near(
        four.mass_kg_bare,
        2.0 * plain.mass_kg_bare,
        1e-9,
        "strands, mass",
    );
    // The leads: two a coil, each the riser distance, all strands: 36 coils·2·2·40 mm·1.05.
    let leads = coil(&base(4, "riser_distance_mm = 40\n"));
    near(
        leads.wire_m_total - plain.wire_m_total,
        36.0 * 2.0 * 2.0 * 0.040 * 1.05,
        1e-9,
        "leads",
    );
    assert!(leads.leads_counted && !plain.leads_counted);
}

#[test]
fn copper_mass_against_iec_60028_and_an_awg_table() {
    // AWG 10, one strand, scrap 0: the mass per metre of bare copper.
    let toml = base(4, "scrap_percent = 0\n").replace("diameter_mm = 1.6\nstrands = 2", "awg = 10");
    let k = coil(&toml);
    let per_m = k.mass_kg_bare / k.wire_m_total;
    // ASTM B258: AWG 10 is 0.1019 in = 2.588 mm; IEC 60028: 8.89 g/cm³.
    // π/4·2.588² mm² = 5.2604 mm² → 5.2604 cm³ a metre → 46.77 g a metre.
    near(
        per_m * 1000.0,
        46.77,
        0.02,
        "AWG 10, g/m (IEC 60028 density)",
    );
    // Copper wire tables: AWG 10 weighs 31.43 lb a 1000 ft = 46.77 g/m [from memory].
    near(
        per_m * 1000.0,
        31.43 * 453.592 / 304.8,
        0.05,
        "AWG 10 table",
    );
    // The enamel adds mass, never takes it away; grade 1 adds less than grade 2.
    assert!(k.mass_kg_insulated > k.mass_kg_bare);
    let g1 = coil(&format!("{toml}enamel_grade = 1\n"));
    assert!(g1.build_mm < k.build_mm && g1.mass_kg_insulated < k.mass_kg_insulated);
}

#[test]
fn enamel_build_by_grade() {
    use armsheet::rating::conductor::enamel_increase_mm;
    // IEC 60317-0-1, table 1, largest overall diameter [from memory]: 1.000 mm wire is at most
    // 1.062 mm over grade 1 and 1.093 mm over grade 2.
    near(1.0 + enamel_increase_mm(1.0, 1), 1.062, 1e-9, "grade 1");
    near(1.0 + enamel_increase_mm(1.0, 2), 1.093, 1e-9, "grade 2");
    // Between the rows it moves monotonically; a thicker wire never has a thinner enamel.
    let mut last = 0.0;
    for i in 1..=60 {
        let d = f64::from(i) * 0.1;
        let b = enamel_increase_mm(d, 2);
        assert!(b >= last && b > enamel_increase_mm(d, 1), "{d}");
        last = b;
    }
}

#[test]
fn a_strip_coil_side_and_its_fill() {
    let toml = "[armature]\npoles = 4\nslots = 36\n\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 3\n\n\
        [conductor]\nwidth_mm = 5\nheight_mm = 2\ncorner_radius_mm = 0.5\nstrands = 2\n\n\
        [core]\ndiameter_mm = 190\nlength_mm = 160\nslot_depth_mm = 40\nslot_width_mm = 6\nconductor_build_mm = 0.2\n";
    let k = coil(toml);
    let s = k.section.expect("a strip has a coil side");
    // derived: 3 turns × 2 strips stacked, each 5.2 × 2.2 mm insulated.
    near(s.width_mm, 5.2, 1e-9, "side width");
    near(s.height_mm, 6.0 * 2.2, 1e-9, "side height");
    let f = k.slot_fill.unwrap();
    // derived: room (6 − 0.5)·(40 − 0.25 − 0.25 − 2) = 5.5·37.5 = 206.25 mm²; two sides of six
    // strips, each 5.2·2.2 − (4 − π)·0.6² = 11.1309 mm².
    near(f.room_mm2, 206.25, 1e-9, "room");
    near(
        f.conductors_mm2,
        12.0 * (5.2 * 2.2 - (4.0 - std::f64::consts::PI) * 0.36),
        1e-9,
        "strips",
    );
    // Physical: the two stacked sides and the insulation fit the slot's depth and width.
    assert!(2.0 * s.height_mm + 2.5 < 40.0 && s.width_mm < 5.5);
}

#[test]
fn equalizers_from_the_same_wire() {
    let extra = "equalizer_wire = \"same\"\n";
    let toml = |e: &str| {
        format!(
            "[armature]\npoles = 4\nslots = 36\n\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 4\nequalizers = 2\n\n\
             [conductor]\ndiameter_mm = 1.6\n\n[core]\ndiameter_mm = 190\nlength_mm = 160\nscrap_percent = 0\n{e}\n\
             [commutator]\ndiameter_mm = 150\n"
        )
    };
    let apart = coil(&toml(""));
    let same = coil(&toml(extra));
    assert_eq!(apart.equalizer_wire_m, None);
    // derived: every second of the 2C/P = 18 possible connections: 9 rings round a 150 mm
    // commutator, π·150 mm each: 9·0.471239 = 4.241150 m.
    near(
        same.equalizer_wire_m.unwrap(),
        4.241_150,
        1e-5,
        "equalizer rings",
    );
    near(
        same.wire_m_total - apart.wire_m_total,
        4.241_150,
        1e-5,
        "added to the order",
    );
}

#[test]
fn frog_leg_orders_both_elements() {
    let k = coil(&support::demo("mill-frog-leg"));
    assert_eq!(k.shapes.len(), 2);
    // 75 slots, 2 coils a slot: 150 lap coils and 150 wave coils, the wave's span one more.
    assert!(k.shapes.iter().all(|s| s.coils == 150));
    assert!(k.shapes[1].span_arc_mm > k.shapes[0].span_arc_mm);
    let net: f64 = k.shapes.iter().map(|s| s.wire_m).sum();
    near(
        k.wire_m_total,
        net * 1.03,
        1e-9,
        "both elements and 3 % scrap",
    );
    // Four sides a slot, each of one strip: 8 insulated strips in the slot.
    assert_eq!(k.slot_fill.unwrap().sides, 8);
}

#[test]
fn reels_round_up() {
    let k = coil(&base(4, "reel_kg = 1\n"));
    assert_eq!(k.reels, Some(k.mass_kg_insulated.ceil() as u32));
    assert!(f64::from(k.reels.unwrap()) >= k.mass_kg_insulated);
    assert_eq!(coil(&base(4, "reel_kg = 1000\n")).reels, Some(1));
}

#[test]
fn an_overfilled_slot_fails_check_with_exit_1() {
    let dir = support::scratch("coil-overfill");
    let path = dir.join("over.toml");
    std::fs::write(&path, base(8, "")).unwrap();
    let out = support::armsheet(&["check", path.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    let text = support::text(&out.stdout);
    assert!(text.contains("[FAIL] rating.slot-fill"), "{text}");
    assert!(text.contains("COIL MAKING"), "{text}");
    // Within the limit: exit 0.
    std::fs::write(&path, base(4, "")).unwrap();
    assert_eq!(
        support::armsheet(&["check", path.to_str().unwrap()])
            .status
            .code(),
        Some(0)
    );
}

#[test]
fn json_carries_coil_making_in_si_or_null() {
    let dir = support::scratch("coil-json");
    let path = dir.join("c.toml");
    std::fs::write(&path, base(4, "")).unwrap();
    let out = support::armsheet(&["check", path.to_str().unwrap(), "--json"]);
    let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let k = &j["coil_making"];
    for key in [
        "wire_length_m_per_coil",
        "wire_length_m_total",
        "wire_mass_kg_total",
    ] {
        assert!(k[key].as_f64().is_some_and(|x| x > 0.0), "{key}: {k}");
    }
    // No core: no coil making, and the key is null as `rating` is without rating inputs.
    let bare =
        "[armature]\npoles = 4\nslots = 36\n\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 4\n";
    std::fs::write(&path, bare).unwrap();
    let out = support::armsheet(&["check", path.to_str().unwrap(), "--json"]);
    let j: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(j["coil_making"].is_null() && j["rating"].is_null());
}
