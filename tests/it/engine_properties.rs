//! Property tests of the winding engine over random valid designs.
//!
//! Each case writes a TOML design, parses it with armsheet's own parser and traces it. The
//! assertions are the trade's invariants: one start and one end lead per segment, a constant
//! commutator pitch, every active coil traced once, and traced paths and reentrancy equal to
//! the textbook formulas (lap a = m·P, wave a = 2m; reentrancy gcd(C, |y_c|)).

use crate::support;
use crate::support::random_design::{RandomDesign, Space, designs};

use armsheet::design::parse_design;
use armsheet::theory::pitch;
use armsheet::winding::{Winding, trace_winding};
use proptest::prelude::*;

/// The engine's space: P 2-16, u 1-4, m 1-3, every flag either way, the span within a slot of
/// the pole pitch, the lead offset within a bar, up to 160 slots above the fewest.
fn case() -> impl Strategy<Value = RandomDesign> {
    designs(Space::default())
}

fn traced(c: &RandomDesign) -> Winding {
    let text = c.toml();
    let d = parse_design(&text, "prop.toml")
        .unwrap_or_else(|e| panic!("valid design rejected:\n{text}\n{e}"));
    trace_winding(&d)
}

proptest! {
    #![proptest_config(support::properties(1000))]

    #[test]
    fn every_segment_carries_one_start_and_one_end(c in case()) {
        let w = traced(&c);
        let n = w.active_coils as usize;
        let (mut starts, mut ends) = (vec![0; n], vec![0; n]);
        for conn in w.connections.iter().filter(|k| !k.dummy) {
            starts[(conn.start_segment.unwrap() - 1) as usize] += 1;
            ends[(conn.end_segment.unwrap() - 1) as usize] += 1;
        }
        prop_assert!(starts.iter().all(|&k| k == 1), "starts {:?}", starts);
        prop_assert!(ends.iter().all(|&k| k == 1), "ends {:?}", ends);
        prop_assert_eq!(w.connections.iter().filter(|k| k.dummy).count(), w.dummy_coils.len());
        prop_assert_eq!(w.coils - w.active_coils, w.dummy_coils.len() as u32);
    }

    #[test]
    fn end_minus_start_is_the_commutator_pitch(c in case()) {
        let w = traced(&c);
        let cc = i64::from(w.active_coils);
        for conn in w.connections.iter().filter(|k| !k.dummy) {
            let diff = i64::from(conn.end_segment.unwrap()) - i64::from(conn.start_segment.unwrap());
            prop_assert_eq!(diff.rem_euclid(cc), w.pitches.commutator.rem_euclid(cc));
        }
    }

    #[test]
    fn trace_visits_every_active_coil_once(c in case()) {
        let w = traced(&c);
        let mut seen = vec![0u32; w.coils as usize];
        for cw in &w.closed_windings {
            for (k, st) in cw.steps.iter().enumerate() {
                seen[(st.coil - 1) as usize] += 1;
                let next = &cw.steps[(k + 1) % cw.steps.len()];
                prop_assert_eq!(st.to_segment, next.from_segment);
            }
        }
        for conn in &w.connections {
            prop_assert_eq!(seen[(conn.coil - 1) as usize], u32::from(!conn.dummy));
        }
    }

    #[test]
    fn traced_paths_equal_the_formula(c in case()) {
        let w = traced(&c);
        let formula = if c.wave { 2 * c.m } else { c.m * c.poles };
        prop_assert_eq!(w.parallel_paths(), formula, "{}", c.toml());
        prop_assert_eq!(w.paths_formula, formula);
        // Every path has coils, and paths plus shorted coils account for every active coil.
        let in_paths: usize = w.paths.iter().map(|p| p.coils.len()).sum();
        prop_assert!(w.paths.iter().all(|p| !p.coils.is_empty()));
        prop_assert_eq!(in_paths + w.shorted_coils.len(), w.active_coils as usize);
    }

    #[test]
    fn traced_reentrancy_is_gcd(c in case()) {
        let w = traced(&c);
        let g = pitch::gcd(u64::from(w.active_coils), w.pitches.commutator.unsigned_abs()) as u32;
        prop_assert_eq!(w.reentrancy(), g);
        prop_assert_eq!(w.reentrancy_formula, g);
    }

    #[test]
    fn brushes_alternate_in_polarity(c in case()) {
        let w = traced(&c);
        prop_assert_eq!(w.brushes.len() as u32, c.poles);
        for pair in w.brushes.windows(2) {
            prop_assert_ne!(pair[0].polarity, pair[1].polarity);
        }
    }
}

proptest! {
    #![proptest_config(support::properties(1000))]

    /// No text, however broken, makes the parser panic.
    #[test]
    fn arbitrary_text_never_panics(text in "\\PC{0,200}") {
        let _ = parse_design(&text, "fuzz.toml");
    }

    /// Near-valid designs with one value mangled: an error or a design, never a panic,
    /// and a design that parses always traces.
    #[test]
    fn mangled_values_never_panic(key in 0usize..6, value in prop_oneof![
        Just("0".to_string()), Just("-3".to_string()), Just("99999999999999999999".to_string()),
        Just("\"x\"".to_string()), Just("1.5".to_string()), Just("[]".to_string()), Just("inf".to_string()),
        Just("nan".to_string()), Just("\"1-1\"".to_string()), (1i64..500).prop_map(|n| n.to_string()),
    ]) {
        let mut fields = [("poles", "6".to_string()), ("slots", "36".to_string()), ("coils_per_slot", "1".to_string()),
            ("segments", "35".to_string()), ("span", "6".to_string()), ("turns", "3".to_string())];
        fields[key].1 = value;
        let arm: String = fields[..4].iter().map(|(k, v)| format!("{k} = {v}\n")).collect();
        let win: String = fields[4..].iter().map(|(k, v)| format!("{k} = {v}\n")).collect();
        let text = format!("[armature]\n{arm}\n[winding]\ntype = \"wave\"\n{win}");
        if let Ok(d) = parse_design(&text, "mangled.toml") {
            let w = trace_winding(&d);
            prop_assert_eq!(w.active_coils, d.segments, "{}", text);
        }
    }
}
