//! Every finding id, with a design that passes it and one that fails it (or, for the
//! informational facts, one where it is reported and one where it is not).
//!
//! Table-driven, one `case(...)` row each. `every_rule_id_has_its_rows` reads the ids out of
//! `src/checks/` and the rating rules, so a new rule without rows fails the suite.

use crate::support;

use std::collections::BTreeSet;

use crate::support::design;
use armsheet::checks::run_checks;
use armsheet::{Checked, check};

#[derive(Clone, Copy, Debug, PartialEq)]
enum Want {
    /// Reported and passed.
    Pass,
    /// Reported and failed.
    Fail,
    /// Not reported for this design.
    Absent,
}

fn checked(toml: &str) -> Checked {
    check(design(toml))
}

#[track_caller]
fn case(id: &str, want: Want, toml: &str) {
    let c = checked(toml);
    let got: Vec<_> = c.findings.iter().filter(|f| f.id == id).collect();
    match want {
        Want::Absent => assert!(got.is_empty(), "{id} reported for\n{toml}"),
        Want::Pass | Want::Fail => {
            assert!(!got.is_empty(), "{id} not reported for\n{toml}");
            let passed = want == Want::Pass;
            assert!(
                got.iter().all(|f| f.passed == passed),
                "{id}: expected passed = {passed}, got {:?}",
                got.iter().map(|f| &f.message).collect::<Vec<_>>()
            );
        }
    }
}

fn lap(poles: u32, slots: u32, u: u32, span: u32, m: u32, extra: &str) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = {u}\n\n[winding]\ntype = \"lap\"\nmultiplicity = {m}\nspan = {span}\nturns = 2\n{extra}"
    )
}

fn wave(poles: u32, slots: u32, u: u32, span: u32, m: u32, arm: &str, extra: &str) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = {u}\n{arm}\n[winding]\ntype = \"wave\"\nmultiplicity = {m}\nspan = {span}\nturns = 2\n{extra}"
    )
}

use Want::*;

#[test]
fn symmetry_rules() {
    // Source: Arnold's conditions as the trade states them (from memory; DOMAIN.md "Symmetry").
    case(
        "symmetry.coils-per-path-pair",
        Pass,
        &lap(4, 36, 1, 9, 1, ""),
    );
    // 27 coils over 2 pairs of paths.
    case(
        "symmetry.coils-per-path-pair",
        Fail,
        &lap(4, 27, 1, 7, 1, ""),
    );
    case(
        "symmetry.slots-per-path-pair",
        Pass,
        &lap(4, 36, 1, 9, 1, ""),
    );
    // u = 2: 54 coils share evenly, 27 slots do not.
    case(
        "symmetry.slots-per-path-pair",
        Fail,
        &lap(4, 27, 2, 7, 1, ""),
    );
    case(
        "symmetry.pole-pairs-per-path-pair",
        Pass,
        &wave(4, 29, 3, 7, 1, "", ""),
    );
    // 6-pole duplex wave: p/(a/2) = 3/2.
    case(
        "symmetry.pole-pairs-per-path-pair",
        Fail,
        &wave(6, 34, 1, 6, 2, "", ""),
    );
    case(
        "symmetry.pole-pairs-per-path-pair",
        Absent,
        &lap(4, 36, 1, 9, 1, ""),
    );
    case("symmetry.simulated-balance", Pass, &lap(4, 36, 1, 9, 1, ""));
    case("symmetry.simulated-balance", Fail, &lap(4, 27, 1, 7, 1, ""));
}

#[test]
fn exact_symmetry_rules() {
    // Source: derived (the armature's rotations through whole pole pitches; module doc of
    // src/checks/symmetry.rs), cross-checked by tests/exact_symmetry.rs.
    // Rigid rotations carry every path onto every other.
    case("symmetry.exact", Pass, &lap(4, 36, 1, 9, 1, ""));
    // m divides u: both windings of the duplex lap sit in the same slots; S/(a/2) = 7.5.
    case("symmetry.exact", Pass, &lap(4, 30, 2, 7, 2, ""));
    case(
        "symmetry.slots-per-path-pair",
        Fail,
        &lap(4, 30, 2, 7, 2, ""),
    );
    // S/p = 13.5: no rotation joins the paths.
    case("symmetry.exact", Fail, &lap(4, 27, 1, 7, 1, ""));
    // 8 poles, 50 slots: only the half turn maps the winding onto itself; 4 classes of 2.
    case("symmetry.exact", Fail, &lap(8, 50, 1, 6, 1, ""));
    // Doubly re-entrant duplex lap, u = 1: the two windings lie in alternate slots, one slot
    // apart, which is no whole number of pole pitches; the textbook rule passes.
    case("symmetry.exact", Fail, &lap(4, 24, 1, 6, 2, ""));
    case(
        "symmetry.slots-per-path-pair",
        Pass,
        &lap(4, 24, 1, 6, 2, ""),
    );
}

#[test]
fn span_rules() {
    // Source: the span is kept near one pole pitch (common practice; textbook winding chapters).
    case("span.pole-pitch", Pass, &lap(4, 36, 1, 9, 1, ""));
    case("span.pole-pitch", Fail, &lap(4, 36, 1, 5, 1, ""));
    let no_span = "[armature]\npoles = 4\nslots = 36\n\n[winding]\ntype = \"lap\"\nturns = 2\n";
    case("span.default", Pass, no_span);
    case("span.default", Absent, &lap(4, 36, 1, 9, 1, ""));
}

#[test]
fn lap_rules() {
    case("lap.reentrancy", Pass, &lap(4, 36, 1, 9, 2, ""));
    case("lap.reentrancy", Absent, &lap(4, 36, 1, 9, 1, ""));
    case("multiplex.brush-width", Pass, &lap(4, 36, 1, 9, 2, ""));
    case("multiplex.brush-width", Absent, &lap(4, 36, 1, 9, 1, ""));
    // A duplex lap's brush 1.1 bars wide: a coil joining bars s and s+2 is shorted only while
    // the brush spans more than 1 bar pitch (derived from the contact model).
    let duplex_brush = |w: &str| {
        lap(
            4,
            36,
            1,
            9,
            2,
            &format!("\n[commutator]\nbrush_width_segments = {w}\n"),
        )
    };
    case("multiplex.brush-too-narrow", Fail, &duplex_brush("1.1"));
    case("multiplex.brush-too-narrow", Absent, &duplex_brush("2.5"));
    case(
        "multiplex.brush-too-narrow",
        Absent,
        &lap(4, 36, 1, 9, 2, ""),
    );
    case(
        "multiplex.brush-too-narrow",
        Fail,
        &wave(
            4,
            29,
            3,
            7,
            2,
            "",
            "\n[commutator]\nbrush_width_segments = 1.5\n",
        ),
    );
    // Equalizer pitch 2C/P = 18 segments on 36 bars, 4 poles.
    case(
        "lap.equalizers",
        Pass,
        &lap(4, 36, 1, 9, 1, "equalizers = \"full\"\n"),
    );
    // 37 bars on 2 pole pairs: no whole equalizer pitch, and the design asks for them.
    case(
        "lap.equalizers",
        Fail,
        &lap(4, 37, 1, 9, 1, "equalizers = \"full\"\n"),
    );
    case("lap.equalizers", Absent, &wave(4, 29, 3, 7, 1, "", ""));
}

#[test]
fn wave_rules() {
    case("wave.reentrancy", Pass, &wave(4, 29, 3, 7, 1, "", ""));
    case("wave.reentrancy", Absent, &lap(4, 36, 1, 9, 1, ""));
    // 36 slots, 6 poles: 35 bars and one dummy is the fewest (textbook dummy-coil example).
    case("wave.dummy-coils", Pass, &wave(6, 36, 1, 6, 1, "", ""));
    // 23 bars on 26 coils leave 3 dummies where 25 bars would leave 1.
    case(
        "wave.dummy-coils",
        Fail,
        &wave(4, 26, 1, 6, 1, "segments = 23\n", ""),
    );
    case("wave.dummy-coils", Absent, &wave(4, 29, 3, 7, 1, "", ""));
    // The same 36-slot example: the 12 connections from coils 24-35 step over dummy coil 36.
    case(
        "wave.dummy-front-pitch",
        Pass,
        &wave(6, 36, 1, 6, 1, "", ""),
    );
    // No dummy coils: every front connection has the nominal pitch.
    case(
        "wave.dummy-front-pitch",
        Absent,
        &wave(4, 29, 3, 7, 1, "", ""),
    );
    // Retrogressive on 36 coils, 6 poles takes 34 bars; progressive would take 35.
    let retro = "direction = \"retrogressive\"\n";
    case(
        "wave.direction-hint",
        Pass,
        &wave(6, 36, 1, 6, 1, "", retro),
    );
    case(
        "wave.direction-hint",
        Absent,
        &wave(6, 36, 1, 6, 1, "segments = 34\n", retro),
    );
}

#[test]
fn shop_rules() {
    // Source: bar-count rule of thumb (common practice; a naval training text).
    case("shop.bar-count", Pass, &lap(4, 36, 1, 9, 1, ""));
    // A 4-pole duplex wave has an even bar count, which the rule reads as lap.
    case("shop.bar-count", Fail, &wave(4, 30, 1, 7, 2, "", ""));
    case("shop.bar-count", Absent, &lap(12, 96, 1, 8, 1, ""));
}

/// The trace cross-checks pass on every real design; a tampered winding shows each can fail.
#[test]
fn trace_cross_checks() {
    let toml = lap(4, 36, 1, 9, 1, "");
    for id in ["trace.paths", "trace.reentrancy", "trace.every-coil"] {
        case(id, Pass, &toml);
    }
    let c = checked(&toml);
    let run = |w: &armsheet::winding::Winding, id: &str| {
        run_checks(&c.design, w)
            .into_iter()
            .find(|f| f.id == id)
            .unwrap()
            .passed
    };
    let mut w = c.winding.clone();
    w.paths.pop();
    assert!(!run(&w, "trace.paths"));
    let mut w = c.winding.clone();
    let extra = w.closed_windings[0].clone();
    w.closed_windings.push(extra);
    assert!(!run(&w, "trace.reentrancy"));
    let mut w = c.winding.clone();
    w.closed_windings[0].steps.pop();
    assert!(!run(&w, "trace.every-coil"));
}

/// Each rating rule passes on a design within its limit and fails when the shop limit is
/// tightened past the computed value (the values themselves are checked in rating_limits.rs).
#[test]
fn rating_rules() {
    let base = support::fixture("rated-lap.toml");
    let c = checked(&base);
    for rule in armsheet::rating::rules::ALL {
        let f = c.findings.iter().find(|f| f.id == rule.id);
        let f = f.unwrap_or_else(|| panic!("{} not reported on the rated fixture", rule.id));
        let value = c
            .rating
            .as_ref()
            .and_then(|r| r.check(rule.id))
            .map(|k| k.value)
            .unwrap();
        // Tighten the limit just past the value, in the failing direction.
        let tight = match rule.bound {
            armsheet::rating::Bound::AtMost => value * 0.5,
            armsheet::rating::Bound::AtLeast => value * 2.0 + 1.0,
        };
        let loose = match rule.bound {
            armsheet::rating::Bound::AtMost => value * 2.0 + 1.0,
            armsheet::rating::Bound::AtLeast => value * 0.5,
        };
        for (limit, passed) in [(loose, true), (tight, false)] {
            let toml = format!("{base}\n[limits]\n{} = {limit}\n", rule.key);
            let got = checked(&toml)
                .findings
                .into_iter()
                .find(|x| x.id == rule.id)
                .unwrap();
            assert_eq!(
                got.passed, passed,
                "{} with {} = {limit}",
                rule.id, rule.key
            );
        }
        let _ = f;
    }
}

/// The ids named in `src/checks/` and the rating rules are exactly the ids with rows here.
#[test]
fn every_rule_id_has_its_rows() {
    let here = include_str!("rule_cases.rs");
    let mut ids = BTreeSet::new();
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/src/checks");
    for e in std::fs::read_dir(dir).unwrap() {
        let text = std::fs::read_to_string(e.unwrap().path()).unwrap();
        for piece in text.split('"').skip(1).step_by(2) {
            let is_id = piece.split_once('.').is_some_and(|(a, b)| {
                !a.is_empty()
                    && !b.is_empty()
                    && a.chars().all(|c| c.is_ascii_lowercase())
                    && b.chars().all(|c| c.is_ascii_lowercase() || c == '-')
            });
            if is_id {
                ids.insert(piece.to_string());
            }
        }
    }
    assert!(ids.len() >= 15, "too few ids found: {ids:?}");
    for id in &ids {
        let rows = here.matches(&format!("\"{id}\"")).count();
        assert!(
            rows >= 2,
            "{id} has no passing and failing rows in tests/rule_cases.rs"
        );
    }
}

fn frog_leg(poles: u32, slots: u32, span: u32, extra: &str) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\n\n[winding]\ntype = \"frog-leg\"\nspan = {span}\nturns = 1\n{extra}"
    )
}

/// Frog-leg rules: passing on the worked example; failing on a winding tampered where it can
/// be (the rules read the traced connections and paths), on unequal turns, and absent on a
/// plain lap. C/p not whole is refused by the design stage (tests/broken/).
#[test]
fn frog_leg_rules() {
    // Source: frog-leg windings, a trade association's technical note (DOMAIN.md); derived.
    let toml = frog_leg(4, 58, 14, "");
    for id in [
        "frogleg.self-equalizing",
        "frogleg.element-paths",
        "frogleg.pole-pairs-whole",
        "frogleg.equal-coils",
    ] {
        case(id, Pass, &toml);
    }
    case("frogleg.wave-reentrancy", Pass, &toml);
    case("frogleg.wave-reentrancy", Absent, &lap(4, 36, 1, 9, 1, ""));
    case("frogleg.pole-pairs-whole", Absent, &lap(4, 36, 1, 9, 1, ""));
    case(
        "frogleg.equal-coils",
        Fail,
        &frog_leg(4, 58, 14, "wave_turns = 2\n"),
    );
    // One neutral (derived): with C/p = 29 odd and equal spans the wave coils' bar midpoints
    // fall half a bar from the lap coils'; a wave span one slot longer (u = 1) moves the wave
    // element half a bar onto the lap's neutral.
    case("frogleg.one-neutral", Fail, &toml);
    case(
        "frogleg.one-neutral",
        Pass,
        &frog_leg(4, 58, 14, "wave_span = 15\n"),
    );
    case("frogleg.one-neutral", Absent, &lap(4, 36, 1, 9, 1, ""));
    let c = checked(&toml);
    let run = |w: &armsheet::winding::Winding, id: &str| {
        run_checks(&c.design, w)
            .into_iter()
            .find(|f| f.id == id)
            .unwrap()
            .passed
    };
    // A wave coil's end lead one bar on: the lap and wave coils in series miss the bar two
    // pole pitches on.
    let mut w = c.winding.clone();
    let k = &mut w.connections[58];
    k.end_segment = Some(k.end_segment.unwrap() % 58 + 1);
    assert!(!run(&w, "frogleg.self-equalizing"));
    // One wave path lost: the elements no longer have equal paths.
    let mut w = c.winding.clone();
    w.elements[1].paths -= 1;
    assert!(!run(&w, "frogleg.element-paths"));
}
