//! The average reactance voltage of the coil under commutation (`rating::reactance`): a worked
//! example, the check's inputs and verdicts, and properties from physical reasoning.
//!
//! The worked example is done by hand [derived] (docs/domain.md, "Reactance voltage of the coil
//! under commutation"): no textbook worked example of the specific-permeance method was at hand
//! to read, so none is quoted. The properties check how E_r must scale, from the physics of a
//! coil whose current reverses in the commutation time, not by re-running the formula.

use armsheet::design::parse_design;
use armsheet::rating::reactance::{
    ReactanceInputs, average_reactance_voltage, commutation_time_s, interpoles_needed,
};
use armsheet::rating::{RatingReport, rate};
use armsheet::winding::trace_winding;
use proptest::prelude::*;

use crate::support;

fn rated(toml: &str) -> RatingReport {
    let d = parse_design(toml, "t.toml").unwrap_or_else(|e| panic!("{e}"));
    let w = trace_winding(&d);
    rate(&d, &w).unwrap()
}

/// The rated lap fixture without its slot's size: the worked example takes the default slot
/// permeance, then a slot of its own.
fn lap() -> String {
    support::fixture("rated-lap.toml").replace("slot_depth_mm = 14\nslot_width_mm = 5.5\n", "")
}

fn close(got: f64, want: f64, rel: f64, what: &str) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "{what}: got {got}, expected {want}"
    );
}

/// The rated fixture worked by hand [derived]: 4-pole, 36-slot simplex lap, 4 turns, u = 1,
/// 85 A on 4 paths, core 160 mm, mean turn 650 mm, commutator 150 mm at 1150 rpm, 20 mm brush.
#[test]
fn worked_example_by_hand() {
    let r = rated(&lap());
    let x = r
        .reactance
        .as_ref()
        .expect("reactance on the rated fixture");
    // v_c = pi * 0.150 m * 1150/60 = 9.0321 m/s; t_c = (20 - 0.8) mm / v_c = 2.1258 ms.
    close(x.commutation_time_s, 2.1258e-3, 1e-4, "t_c");
    // Overhang of one side: 650/2 - 160 = 165 mm. Slot taken 4 deep : 1 wide, lambda_s = 4/3.
    // L = 2 * 4e-7*pi * 4^2 * ((4/3 + 0.5) * 0.160 + 0.6 * 0.165) = 15.777 uH.
    close(x.inductance_h, 15.777e-6, 1e-4, "L");
    // E_r = L * 2 * 21.25 A / t_c = 0.31542 V.
    close(x.average_v, 0.31542, 1e-4, "E_r");
    assert!(!x.slot_given && !x.interpoles_needed && x.interpoles.is_none());
    // A 30 mm deep, 6 mm wide slot: lambda_s = 30/18 = 1.6667, L = 17.921 uH, E_r = 0.35830 V.
    let slot = lap().replace(
        "length_mm = 160",
        "length_mm = 160\nslot_depth_mm = 30\nslot_width_mm = 6",
    );
    let x = rated(&slot).reactance.unwrap();
    assert!(x.slot_given);
    close(x.inductance_h, 17.921e-6, 1e-4, "L with the slot");
    close(x.average_v, 0.35830, 1e-4, "E_r with the slot");
}

/// Both checks run when interpoles are not said to be fitted; with `interpoles = true` the
/// no-interpole check is left out and the limit with interpoles applies.
#[test]
fn interpoles_choose_the_checks() {
    let base = lap();
    for (extra, no_interpole_check) in [
        ("", true),
        ("interpoles = false\n", true),
        ("interpoles = true\n", false),
    ] {
        let toml = base.replace(
            "thermal_class = \"F\"\n",
            &format!("thermal_class = \"F\"\n{extra}"),
        );
        let r = rated(&toml);
        assert_eq!(
            r.check("rating.interpoles-needed").is_some(),
            no_interpole_check,
            "{extra:?}"
        );
        assert!(r.check("rating.reactance-voltage").is_some(), "{extra:?}");
    }
}

/// A coil of many turns at speed needs interpoles: 14 turns give (14/4)^2 = 12.25 times the
/// fixture's 0.315 V, 3.86 V, above the 3 V without interpoles and within the 6 V with them.
/// The advice's turns, written back, pass.
#[test]
fn many_turns_need_interpoles_and_the_advice_fixes_it() {
    let base = lap();
    let toml = base.replace("turns = 4", "turns = 14");
    let r = rated(&toml);
    let needed = r.check("rating.interpoles-needed").unwrap();
    assert!(!needed.passed, "{}", needed.message());
    assert!(r.reactance.as_ref().unwrap().interpoles_needed);
    assert!(
        needed.message().contains("interpoles are needed"),
        "{}",
        needed.message()
    );
    assert!(r.check("rating.reactance-voltage").unwrap().passed);
    let words = needed.advice.join("; ");
    let turns: u32 = words
        .split("fewer turns per coil: at most ")
        .nth(1)
        .and_then(|s| s.split(' ').next())
        .and_then(|s| s.parse().ok())
        .unwrap_or_else(|| panic!("no turn count in {words}"));
    assert!(turns < 14, "{words}");
    let fixed = rated(&base.replace("turns = 4", &format!("turns = {turns}")));
    assert!(fixed.check("rating.interpoles-needed").unwrap().passed);
    let one_more = rated(&base.replace("turns = 4", &format!("turns = {}", turns + 1)));
    assert!(!one_more.check("rating.interpoles-needed").unwrap().passed);
    // Fitted, the same winding passes: the limit with interpoles applies.
    let fitted = rated(&toml.replace(
        "thermal_class = \"F\"\n",
        "thermal_class = \"F\"\ninterpoles = true\n",
    ));
    assert!(fitted.checks.iter().all(|c| c.passed));
}

/// Without any one of its inputs the reactance voltage is absent, and so are its checks.
#[test]
fn absent_without_its_inputs() {
    let base = lap();
    for (what, from, to) in [
        ("brush width", "brush_width_mm = 20\n", ""),
        ("core length", "length_mm = 160\n", ""),
        ("current", "current = 85\n", ""),
        (
            "commutator diameter",
            "[commutator]\ndiameter_mm = 150\n",
            "[commutator]\n",
        ),
    ] {
        let toml = base.replace(from, to);
        assert_ne!(toml, base, "{what}");
        let r = rated(&toml);
        assert!(r.reactance.is_none(), "{what}");
        assert!(r.check("rating.interpoles-needed").is_none(), "{what}");
        assert!(r.check("rating.reactance-voltage").is_none(), "{what}");
    }
}

fn inputs() -> impl Strategy<Value = ReactanceInputs> {
    (
        (1u32..=40, 1u32..=6, 20.0..600.0f64, 10.0..400.0f64),
        (0.5..4.0f64, 0.1..1.0f64, 0.1..1.5f64, 1.0..500.0f64),
        (1.0..3.0f64, 3.0..30.0f64, 1u32..=3, 1.0..40.0f64),
    )
        .prop_map(
            |((t, u, l, lo), (ls, lt, lov, i), (beta, pitch, m, v))| ReactanceInputs {
                turns_per_coil: f64::from(t),
                coils_per_slot: f64::from(u),
                core_length_mm: l,
                overhang_mm: lo,
                slot_permeance: ls,
                tooth_tip_permeance: lt,
                overhang_permeance: lov,
                path_current_a: i,
                // Wide enough to bridge the coil's m bars and the mica.
                brush_width_segments: beta + f64::from(m - 1),
                segment_pitch_mm: pitch,
                mica_mm: 0.8,
                multiplicity: f64::from(m),
                commutator_speed_m_s: v,
            },
        )
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(500))]

    /// The stored energy of a coil goes as the square of its turns, and so does the voltage
    /// that reverses its current in a given time: doubling T_c quadruples E_r.
    #[test]
    fn grows_as_the_turns_squared(x in inputs()) {
        let e = average_reactance_voltage(&x).unwrap();
        let two = ReactanceInputs { turns_per_coil: 2.0 * x.turns_per_coil, ..x };
        let e2 = average_reactance_voltage(&two).unwrap();
        prop_assert!((e2 / e - 4.0).abs() < 1e-9);
    }

    /// Twice the current reversed in the same time needs twice the voltage (a linear coil).
    #[test]
    fn grows_with_the_current(x in inputs(), k in 0.1..10.0f64) {
        let e = average_reactance_voltage(&x).unwrap();
        let y = ReactanceInputs { path_current_a: k * x.path_current_a, ..x };
        prop_assert!((average_reactance_voltage(&y).unwrap() / e - k).abs() < 1e-9 * k);
    }

    /// A faster commutator passes the brush in less time: the reversal is quicker and the
    /// voltage higher, in proportion.
    #[test]
    fn grows_with_the_speed(x in inputs(), k in 0.1..10.0f64) {
        let e = average_reactance_voltage(&x).unwrap();
        let y = ReactanceInputs { commutator_speed_m_s: k * x.commutator_speed_m_s, ..x };
        prop_assert!((average_reactance_voltage(&y).unwrap() / e - k).abs() < 1e-9 * k);
        prop_assert!((commutation_time_s(&y).unwrap() * k / commutation_time_s(&x).unwrap() - 1.0).abs() < 1e-9);
    }

    /// A wider brush shorts the coil for longer and so lowers the voltage; a longer core, more
    /// coils in the slot or a longer overhang add flux and raise it.
    #[test]
    fn monotone_in_the_geometry(x in inputs(), d in 0.01..2.0f64) {
        let e = average_reactance_voltage(&x).unwrap();
        let wider = ReactanceInputs { brush_width_segments: x.brush_width_segments + d, ..x };
        prop_assert!(average_reactance_voltage(&wider).unwrap() < e);
        let longer = ReactanceInputs { core_length_mm: x.core_length_mm * (1.0 + d), ..x };
        prop_assert!(average_reactance_voltage(&longer).unwrap() > e);
        let more = ReactanceInputs { coils_per_slot: x.coils_per_slot + 1.0, ..x };
        prop_assert!(average_reactance_voltage(&more).unwrap() > e);
        let ends = ReactanceInputs { overhang_mm: x.overhang_mm * (1.0 + d), ..x };
        prop_assert!(average_reactance_voltage(&ends).unwrap() > e);
    }

    /// A brush that does not bridge the coil's bars never shorts it: no commutation time and
    /// no reactance voltage, rather than a negative or infinite one.
    #[test]
    fn no_value_without_a_short(x in inputs(), short in 0.0..1.0f64) {
        let narrow = ReactanceInputs {
            brush_width_segments: (x.multiplicity - 1.0) + short * x.mica_mm / x.segment_pitch_mm,
            ..x
        };
        prop_assert!(average_reactance_voltage(&narrow).is_none());
        prop_assert!(commutation_time_s(&narrow).is_none());
    }

    /// Interpoles are needed exactly above the no-interpole limit.
    #[test]
    fn interpoles_needed_above_the_limit(v in 0.0..20.0f64, limit in 0.1..10.0f64) {
        prop_assert_eq!(interpoles_needed(v, limit), v > limit);
    }
}

/// Through the design file: the turns per coil in `[winding]` quadruple E_r when doubled (the
/// mean turn given, so the overhang stays), and the speed in `[rating]` scales it.
#[test]
fn the_design_file_scales_as_the_physics_says() {
    let base = lap();
    let e = |toml: &str| rated(toml).reactance.unwrap().average_v;
    let e0 = e(&base);
    close(
        e(&base.replace("turns = 4", "turns = 8")),
        4.0 * e0,
        1e-9,
        "turns",
    );
    close(
        e(&base.replace("speed_rpm = 1150", "speed_rpm = 2300")),
        2.0 * e0,
        1e-9,
        "speed",
    );
    // The current enters as I/a: the same 85 A.
    close(
        e(&base.replace("current = 85", "current = 170")),
        2.0 * e0,
        1e-9,
        "current",
    );
}
