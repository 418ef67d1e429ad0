//! The rating arithmetic against outside sources: IEC 60028 copper, ASTM B258 AWG, the
//! copper temperature correction, IEC 60034-1 test voltages and a published EMF example.
//! The source is written beside each check.

use armsheet::design::{ThermalClass, awg_diameter_mm, parse_design};
use armsheet::rating::emf::emf_v;
use armsheet::rating::resistance::{
    COPPER_RHO_20, armature_resistance_20, copper_resistance_20, correct_temperature,
    reference_temperature_c,
};
use armsheet::rating::test_voltage::{TestRule, test_voltages};
use armsheet::rating::{EmfBasis, RatingReport, rate};
use armsheet::winding::trace_winding;

fn rated(toml: &str) -> RatingReport {
    let d = parse_design(toml, "t.toml").unwrap_or_else(|e| panic!("{e}"));
    let w = trace_winding(&d);
    rate(&d, &w).expect("rating inputs present")
}

#[track_caller]
fn close(got: f64, want: f64, tol: f64) {
    assert!((got - want).abs() <= tol, "got {got}, want {want} ± {tol}");
}

#[test]
fn iec_60028_copper_is_17_241_ohm_per_km_for_1_mm2() {
    // IEC 60028, International standard of resistance for copper: 1/58 Ω·mm²/m at 20 °C,
    // i.e. 17.241 Ω per km of 1 mm² (the published value, to its three decimals).
    close(copper_resistance_20(1000.0, 1.0), 17.241, 0.0005);
    close(COPPER_RHO_20, 0.017241, 0.0000005);
}

#[test]
fn astm_b258_awg_diameters() {
    // ASTM B258, Standard Specification for Standard Nominal Diameters and Cross-Sectional
    // Areas of AWG Sizes of Solid Round Wires: published table values in mm (the table rounds
    // through inches, so ±0.002 mm).
    for (gauge, mm) in [
        (10, 2.588),
        (14, 1.628),
        (18, 1.024),
        (20, 0.812),
        (24, 0.511),
    ] {
        close(awg_diameter_mm(gauge), mm, 0.002);
    }
}

#[test]
fn copper_temperature_correction_worked_value() {
    // IEC 60228 / IEEE 118 practice for copper: R_T = R_20·(234.5 + T)/(234.5 + 20).
    // Worked value (own arithmetic from the formula): 10 Ω at 20 °C is 10·309.5/254.5 =
    // 12.1611 Ω at 75 °C, and back again.
    close(correct_temperature(10.0, 20.0, 75.0), 12.1611, 0.0001);
    close(correct_temperature(12.1611, 75.0, 20.0), 10.0, 0.0001);
    // IEC 60034-1 reference temperatures, from memory: class 155 (F) is 115 °C.
    assert_eq!(reference_temperature_c(ThermalClass::F), 115.0);
}

#[test]
fn iec_60034_1_withstand_test_voltages() {
    // IEC 60034-1, Table 16 (1 min), read in an extract.
    // 230 V: 1000 + 2·230 = 1460 V, so the 1500 V minimum applies.
    let t = test_voltages(230.0, Some(230.0 * 40.0));
    assert_eq!((t.new_v, t.rule), (1500.0, TestRule::GeneralMinimum));
    // 440 V: 1000 + 2·440 = 1880 V.
    let t = test_voltages(440.0, Some(440.0 * 100.0));
    assert_eq!((t.new_v, t.rule), (1880.0, TestRule::General));
    // 24 V small machine (under 1 kW, under 100 V): 500 + 2·24 = 548 V.
    let t = test_voltages(24.0, Some(24.0 * 10.0));
    assert_eq!((t.new_v, t.rule), (548.0, TestRule::Small));
    // Overhauled, after cleaning and drying: 1.5·U, at least 1000 V (U ≥ 100 V) or 500 V.
    assert_eq!(test_voltages(230.0, None).overhauled_v, 1000.0);
    assert_eq!(test_voltages(24.0, None).overhauled_v, 500.0);
    assert_eq!(test_voltages(1000.0, None).overhauled_v, 1500.0);
    // Without a power the small-machine row is not assumed: the stricter general row applies.
    assert_eq!(test_voltages(24.0, None).new_v, 1500.0);
}

#[test]
fn published_emf_example_6_poles_664_conductors_wave() {
    // Textbook EMF example (published worked example, from memory as to the book): a 6-pole
    // wave-wound armature with 664 conductors, 0.06 Wb per pole, 250 rpm: E = 498 V.
    close(emf_v(6, 664, 2, 0.06, 250.0), 498.0, 1e-9);
    // The same through the whole pipeline: 83 coils of 4 turns, simplex wave.
    let r = rated(
        "[armature]\npoles = 6\nslots = 83\n[winding]\ntype = \"wave\"\nspan = 13\nturns = 4\n\
         flux_per_pole_mwb = 60\nspeed_rpm = 250\n[rating]\nmode = \"generator\"\n",
    );
    assert_eq!((r.conductors, r.paths), (664, 2));
    let e = r.emf.unwrap();
    assert_eq!(e.basis, EmfBasis::FluxAndSpeed);
    close(e.emf_v, 498.0, 1e-9);
}

#[test]
fn torque_check_from_the_domain_notes() {
    // P = 4, Z = 500, a = 2, Φ = 0.02 Wb, I = 10 A: T = K·Φ·I = 31.83 N·m (own arithmetic from
    // T = P·Z·Φ·I/(2π·a), any DC machine text, e.g. Chapman, DC machine chapters).
    let r = rated(
        "[armature]\npoles = 4\nslots = 125\n[winding]\ntype = \"wave\"\nspan = 31\nturns = 2\n\
         flux_per_pole_mwb = 20\nspeed_rpm = 1000\n[rating]\ncurrent = 10\n",
    );
    assert_eq!((r.conductors, r.paths), (500, 2));
    let e = r.emf.unwrap();
    close(e.torque_nm.unwrap(), 31.83, 0.005);
    // K·Φ in V·s/rad equals K·Φ in N·m/A: E/ω = T/I.
    let omega = 1000.0 * 2.0 * std::f64::consts::PI / 60.0;
    close(e.emf_v / omega, e.torque_nm.unwrap() / 10.0, 1e-12);
}

#[test]
fn armature_resistance_through_the_pipeline() {
    // 4-pole simplex lap, 36 coils of 4 turns: Z = 288, a = 4. Two 1.6 mm wires in hand,
    // mean turn 650 mm. R_a = ρ·Z·L_mt/(2a²A) with ρ = 1/58 (IEC 60028).
    let r = rated(
        "[armature]\npoles = 4\nslots = 36\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 4\n\
         [rating]\nvoltage = 110\ncurrent = 85\nthermal_class = \"F\"\n\
         [conductor]\ndiameter_mm = 1.6\nstrands = 2\nmean_turn_mm = 650\n",
    );
    let area = 2.0 * std::f64::consts::PI / 4.0 * 1.6 * 1.6;
    let want = 288.0 * 0.650 / (58.0 * 2.0 * 16.0 * area);
    let x = r.resistance.unwrap();
    close(x.r20_ohm, want, 1e-12);
    close(armature_resistance_20(288, 4, 650.0, area), want, 1e-12);
    // Class F: 115 °C.
    close(x.hot_ohm, want * (234.5 + 115.0) / 254.5, 1e-12);
    // E = V − I·R_hot − 2 V (carbon, conventional drop).
    let e = r.emf.unwrap();
    close(e.emf_v, 110.0 - 85.0 * x.hot_ohm - 2.0, 1e-9);
    // Copper loss I²R at the reference temperature; brush loss 2 V · I.
    let l = r.losses.unwrap();
    close(l.copper_w.unwrap(), 85.0 * 85.0 * x.hot_ohm, 1e-9);
    close(l.brush_w, 170.0, 1e-12);
}

#[test]
fn generator_adds_the_drops_and_metal_graphite_drops_less() {
    let base =
        "[armature]\npoles = 4\nslots = 36\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 4\n";
    let r = rated(&format!(
        "{base}[rating]\nvoltage = 110\ncurrent = 85\nmode = \"generator\"\n[commutator]\nbrush_grade = \"metal-graphite\"\n"
    ));
    let e = r.emf.unwrap();
    // No conductor, so no I·R_a; metal-graphite drop 0.6 V (IEC 60034-2-1 conventional, from memory).
    close(e.emf_v, 110.6, 1e-12);
    assert!(!e.ir_known);
}

#[test]
fn segment_voltage_pitch_speed_and_loading() {
    // Hand arithmetic on the formulas: E·P/C, π·D_c/C, π·D_c·N/60, Z·I/(a·π·D).
    let r = rated(
        "[armature]\npoles = 4\nslots = 36\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 4\n\
         flux_per_pole_mwb = 20\nspeed_rpm = 1200\n[rating]\ncurrent = 80\n\
         [core]\ndiameter_mm = 200\n[commutator]\ndiameter_mm = 150\nbrush_width_mm = 19.635\n",
    );
    let e = emf_v(4, 288, 4, 0.02, 1200.0);
    let sv = r.segment_voltage.unwrap();
    close(sv.average_v, e * 4.0 / 36.0, 1e-12);
    close(sv.peak_v, e * 4.0 / 36.0 / 0.7, 1e-12);
    let k = r.commutator.unwrap();
    let pitch = std::f64::consts::PI * 150.0 / 36.0;
    close(k.segment_pitch_mm.unwrap(), pitch, 1e-12);
    close(
        k.peripheral_speed_m_s.unwrap(),
        std::f64::consts::PI * 0.150 * 1200.0 / 60.0,
        1e-12,
    );
    close(k.brush_width_segments.unwrap(), 19.635 / pitch, 1e-12);
    close(
        r.electric_loading_a_m.unwrap(),
        288.0 * 80.0 / (4.0 * std::f64::consts::PI * 0.2),
        1e-9,
    );
    let c = r.currents.unwrap();
    assert_eq!((c.per_path_a, c.per_brush_arm_a), (20.0, 40.0));
}

#[test]
fn mean_turn_is_estimated_and_said_so() {
    let r = rated(
        "[armature]\npoles = 4\nslots = 36\n[winding]\ntype = \"lap\"\nspan = 8\nturns = 4\n\
         [conductor]\ndiameter_mm = 1.6\n[core]\ndiameter_mm = 190\nlength_mm = 160\n",
    );
    let notes = armsheet::render::rating_words::notes(&r);
    let t = r.conductor.unwrap().mean_turn.unwrap();
    // The coil's own mean turn, within 2 % of the rule of thumb L_mt ≈ 2·L + 2.5·π·D·y_s/S
    // [common practice, from memory], and the one the coil making reckons the wire with.
    let rule = 2.0 * 160.0 + 2.5 * std::f64::consts::PI * 190.0 * 8.0 / 36.0;
    assert!((t.mm / rule - 1.0).abs() < 0.02, "{} against {rule}", t.mm);
    assert_eq!(t.mm, r.coil_making.as_ref().unwrap().shapes[0].mean_turn_mm);
    assert!(
        notes
            .iter()
            .any(|n| n.contains("estimated from the coil's shape")),
        "{notes:?}"
    );
}

#[test]
fn no_rating_inputs_gives_none() {
    let d = parse_design(
        "[armature]\npoles = 4\nslots = 36\n[winding]\ntype = \"lap\"\nturns = 4\n",
        "t.toml",
    )
    .unwrap();
    let w = trace_winding(&d);
    assert!(rate(&d, &w).is_none());
}
