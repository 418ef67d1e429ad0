//! Every finding id, with a design that passes it and one that fails it (or, for the
//! informational facts, one where it is reported and one where it is not).
//!
//! Table-driven: each family's rows are a list of `Row`s (an id, what is wanted, the design
//! and, for the engine's own cross-checks, a tampering of the traced winding). The family
//! tests check their rows; `every_rule_has_its_rows` iterates the rules table
//! `armsheet::checks::rules::RULES`, the rating rules included, so a rule without rows fails
//! the suite; `every_finding_comes_from_its_row` checks that each finding's id, source and
//! severity are its row's. Both checkers are shown to catch a planted gap.

use crate::support;

use std::collections::BTreeSet;

use crate::support::design;
use armsheet::base::{Finding, RuleSpec, Severity};
use armsheet::checks::rules::RULES;
use armsheet::checks::run_checks;
use armsheet::winding::Winding;
use armsheet::{Checked, check};

#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
enum Want {
    /// Reported and passed.
    Pass,
    /// Reported and failed.
    Fail,
    /// Not reported for this design.
    Absent,
    /// Refused by the design stage (its located error is in `tests/broken/`): the rule's
    /// failing case never reaches the checks.
    Refused,
}

/// One row: the rule `id` on `toml` (its traced winding changed by `tamper`, if any) is
/// reported as `want` says.
struct Row {
    id: String,
    want: Want,
    toml: String,
    tamper: Option<fn(&mut Winding)>,
}

fn checked(toml: &str) -> Checked {
    check(design(toml))
}

fn case(id: &str, want: Want, toml: &str) -> Row {
    Row {
        id: id.to_string(),
        want,
        toml: toml.to_string(),
        tamper: None,
    }
}

/// A failing row on a winding tampered where the engine's own cross-checks read it: a real
/// design cannot fail them.
fn tampered(id: &str, toml: &str, tamper: fn(&mut Winding)) -> Row {
    Row {
        id: id.to_string(),
        want: Want::Fail,
        toml: toml.to_string(),
        tamper: Some(tamper),
    }
}

/// The findings of a row's design.
fn findings(row: &Row) -> Vec<Finding> {
    let c = checked(&row.toml);
    match row.tamper {
        None => c.findings,
        Some(tamper) => {
            let mut w = c.winding.clone();
            tamper(&mut w);
            run_checks(&c.design, &w, c.rating.as_ref())
        }
    }
}

#[track_caller]
fn holds(rows: Vec<Row>) {
    for row in rows {
        if row.want == Want::Refused {
            let refused = armsheet::design::parse_design(&row.toml, "t.toml").is_err();
            assert!(refused, "{} not refused:\n{}", row.id, row.toml);
            continue;
        }
        let all = findings(&row);
        let bad = foreign(&all, &RULES);
        assert!(bad.is_empty(), "{bad:?}");
        let (id, toml) = (&row.id, &row.toml);
        let got: Vec<_> = all.iter().filter(|f| &f.id == id).collect();
        match row.want {
            Want::Absent => assert!(got.is_empty(), "{id} reported for\n{toml}"),
            Want::Refused => unreachable!("handled above"),
            Want::Pass | Want::Fail => {
                assert!(!got.is_empty(), "{id} not reported for\n{toml}");
                let passed = row.want == Want::Pass;
                assert!(
                    got.iter().all(|f| f.passed == passed),
                    "{id}: expected passed = {passed}, got {:?}",
                    got.iter().map(|f| &f.message).collect::<Vec<_>>()
                );
            }
        }
    }
}

/// The rules of `rules` that lack rows: each needs a row where it is reported, a failing row
/// (or one the design stage refuses; for a fact, severity info, that cannot fail: an absent
/// row instead) and a row where it does not bite (passing or absent). Rows for an id outside `rules` are named too.
fn missing(rows: &[Row], rules: &[RuleSpec]) -> Vec<String> {
    let mut out = Vec::new();
    for rule in rules {
        let wants: BTreeSet<Want> = rows
            .iter()
            .filter(|r| r.id == rule.id)
            .map(|r| r.want)
            .collect();
        let has = |w: Want| wants.contains(&w);
        if !(has(Want::Pass) || has(Want::Fail)) {
            out.push(format!("{}: no row where it is reported", rule.id));
        }
        let differs = has(Want::Fail)
            || has(Want::Refused)
            || (rule.severity == Severity::Info && has(Want::Absent));
        if !differs {
            out.push(format!("{}: no failing row", rule.id));
        }
        if !(has(Want::Pass) || has(Want::Absent)) {
            out.push(format!("{}: no passing row", rule.id));
        }
    }
    for row in rows {
        if !rules.iter().any(|r| r.id == row.id) {
            out.push(format!("{}: a row for a rule not in RULES", row.id));
        }
    }
    out
}

/// The findings that do not come from their row of `rules`: an id not in the table, another
/// source, or a severity above the row's (a rule may lower its severity for a case, as the
/// textbook symmetry rule does where the exact test passes, never raise it).
fn foreign(findings: &[Finding], rules: &[RuleSpec]) -> Vec<String> {
    findings
        .iter()
        .filter(|f| {
            !rules
                .iter()
                .any(|r| r.id == f.id && r.source == f.source && f.severity >= r.severity)
        })
        .map(|f| {
            format!(
                "{} ({}, {}) is no row of RULES",
                f.id,
                f.severity.as_str(),
                f.source
            )
        })
        .collect()
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
    holds(symmetry_rows());
}

fn symmetry_rows() -> Vec<Row> {
    vec![
        // Source: Arnold's conditions as the trade states them (from memory; docs/domain.md, "Symmetry").
        case(
            "symmetry.coils-per-path-pair",
            Pass,
            &lap(4, 36, 1, 9, 1, ""),
        ),
        // 27 coils over 2 pairs of paths.
        case(
            "symmetry.coils-per-path-pair",
            Fail,
            &lap(4, 27, 1, 7, 1, ""),
        ),
        case(
            "symmetry.slots-per-path-pair",
            Pass,
            &lap(4, 36, 1, 9, 1, ""),
        ),
        // u = 2: 54 coils share evenly, 27 slots do not.
        case(
            "symmetry.slots-per-path-pair",
            Fail,
            &lap(4, 27, 2, 7, 1, ""),
        ),
        case(
            "symmetry.pole-pairs-per-path-pair",
            Pass,
            &wave(4, 29, 3, 7, 1, "", ""),
        ),
        // 6-pole duplex wave: p/(a/2) = 3/2.
        case(
            "symmetry.pole-pairs-per-path-pair",
            Fail,
            &wave(6, 34, 1, 6, 2, "", ""),
        ),
        case(
            "symmetry.pole-pairs-per-path-pair",
            Absent,
            &lap(4, 36, 1, 9, 1, ""),
        ),
        case("symmetry.simulated-balance", Pass, &lap(4, 36, 1, 9, 1, "")),
        case("symmetry.simulated-balance", Fail, &lap(4, 27, 1, 7, 1, "")),
    ]
}

#[test]
fn exact_symmetry_rules() {
    holds(exact_symmetry_rows());
}

fn exact_symmetry_rows() -> Vec<Row> {
    vec![
        // Source: derived (the armature's rotations through whole pole pitches; module doc of
        // src/checks/symmetry.rs), cross-checked by tests/exact_symmetry.rs.
        // Rigid rotations carry every path onto every other.
        case("symmetry.exact", Pass, &lap(4, 36, 1, 9, 1, "")),
        // m divides u: both windings of the duplex lap sit in the same slots; S/(a/2) = 7.5.
        case("symmetry.exact", Pass, &lap(4, 30, 2, 7, 2, "")),
        case(
            "symmetry.slots-per-path-pair",
            Fail,
            &lap(4, 30, 2, 7, 2, ""),
        ),
        // S/p = 13.5: no rotation joins the paths.
        case("symmetry.exact", Fail, &lap(4, 27, 1, 7, 1, "")),
        // 8 poles, 50 slots: only the half turn maps the winding onto itself; 4 classes of 2.
        case("symmetry.exact", Fail, &lap(8, 50, 1, 6, 1, "")),
        // Doubly re-entrant duplex lap, u = 1: the two windings lie in alternate slots, one slot
        // apart, which is no whole number of pole pitches; the textbook rule passes.
        case("symmetry.exact", Fail, &lap(4, 24, 1, 6, 2, "")),
        case(
            "symmetry.slots-per-path-pair",
            Pass,
            &lap(4, 24, 1, 6, 2, ""),
        ),
    ]
}

#[test]
fn span_rules() {
    holds(span_rows());
}

fn span_rows() -> Vec<Row> {
    let no_span = "[armature]\npoles = 4\nslots = 36\n\n[winding]\ntype = \"lap\"\nturns = 2\n";
    vec![
        // Source: the span is kept near one pole pitch (common practice; textbook winding chapters).
        case("span.pole-pitch", Pass, &lap(4, 36, 1, 9, 1, "")),
        case("span.pole-pitch", Fail, &lap(4, 36, 1, 5, 1, "")),
        // Two pole pitches: the coil's sides lie under poles of one polarity (derived).
        case("span.opposite-poles", Pass, &lap(4, 36, 1, 9, 1, "")),
        case("span.opposite-poles", Fail, &lap(4, 24, 1, 12, 1, "")),
        case("span.default", Pass, no_span),
        case("span.default", Absent, &lap(4, 36, 1, 9, 1, "")),
    ]
}

#[test]
fn lap_rules() {
    holds(lap_rows());
}

fn lap_rows() -> Vec<Row> {
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
    vec![
        case("lap.reentrancy", Pass, &lap(4, 36, 1, 9, 2, "")),
        case("lap.reentrancy", Absent, &lap(4, 36, 1, 9, 1, "")),
        case("multiplex.brush-width", Pass, &lap(4, 36, 1, 9, 2, "")),
        case("multiplex.brush-width", Absent, &lap(4, 36, 1, 9, 1, "")),
        case("multiplex.brush-too-narrow", Fail, &duplex_brush("1.1")),
        case("multiplex.brush-too-narrow", Absent, &duplex_brush("2.5")),
        case(
            "multiplex.brush-too-narrow",
            Absent,
            &lap(4, 36, 1, 9, 2, ""),
        ),
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
        ),
        // Equalizer pitch 2C/P = 18 segments on 36 bars, 4 poles.
        case(
            "lap.equalizers",
            Pass,
            &lap(4, 36, 1, 9, 1, "equalizers = \"full\"\n"),
        ),
        // 37 bars on 2 pole pairs: no whole equalizer pitch, and the design asks for them.
        case(
            "lap.equalizers",
            Fail,
            &lap(4, 37, 1, 9, 1, "equalizers = \"full\"\n"),
        ),
        case("lap.equalizers", Absent, &wave(4, 29, 3, 7, 1, "", "")),
    ]
}

#[test]
fn wave_rules() {
    holds(wave_rows());
}

fn wave_rows() -> Vec<Row> {
    // Retrogressive on 36 coils, 6 poles takes 34 bars; progressive would take 35.
    let retro = "direction = \"retrogressive\"\n";
    vec![
        case("wave.reentrancy", Pass, &wave(4, 29, 3, 7, 1, "", "")),
        case("wave.reentrancy", Absent, &lap(4, 36, 1, 9, 1, "")),
        // 36 slots, 6 poles: 35 bars and one dummy is the fewest (textbook dummy-coil example).
        case("wave.dummy-coils", Pass, &wave(6, 36, 1, 6, 1, "", "")),
        // 23 bars on 26 coils leave 3 dummies where 25 bars would leave 1.
        case(
            "wave.dummy-coils",
            Fail,
            &wave(4, 26, 1, 6, 1, "segments = 23\n", ""),
        ),
        case("wave.dummy-coils", Absent, &wave(4, 29, 3, 7, 1, "", "")),
        // The same 36-slot example: the 12 connections from coils 24-35 step over dummy coil 36.
        case(
            "wave.dummy-front-pitch",
            Pass,
            &wave(6, 36, 1, 6, 1, "", ""),
        ),
        // No dummy coils: every front connection has the nominal pitch.
        case(
            "wave.dummy-front-pitch",
            Absent,
            &wave(4, 29, 3, 7, 1, "", ""),
        ),
        case(
            "wave.direction-hint",
            Pass,
            &wave(6, 36, 1, 6, 1, "", retro),
        ),
        case(
            "wave.direction-hint",
            Absent,
            &wave(6, 36, 1, 6, 1, "segments = 34\n", retro),
        ),
    ]
}

#[test]
fn shop_rules() {
    holds(shop_rows());
}

fn shop_rows() -> Vec<Row> {
    vec![
        // Source: bar-count rule of thumb (common practice; a naval training text).
        case("shop.bar-count", Pass, &lap(4, 36, 1, 9, 1, "")),
        // A 4-pole duplex wave has an even bar count, which the rule reads as lap.
        case("shop.bar-count", Fail, &wave(4, 30, 1, 7, 2, "", "")),
        case("shop.bar-count", Absent, &lap(12, 96, 1, 8, 1, "")),
    ]
}

/// The trace cross-checks pass on every real design; a tampered winding shows each can fail.
#[test]
fn trace_cross_checks() {
    holds(trace_rows());
}

fn trace_rows() -> Vec<Row> {
    let toml = lap(4, 36, 1, 9, 1, "");
    let mut rows: Vec<Row> = ["trace.paths", "trace.reentrancy", "trace.every-coil"]
        .into_iter()
        .map(|id| case(id, Pass, &toml))
        .collect();
    rows.push(tampered("trace.paths", &toml, |w| {
        w.paths.pop();
    }));
    rows.push(tampered("trace.reentrancy", &toml, |w| {
        let extra = w.closed_windings[0].clone();
        w.closed_windings.push(extra);
    }));
    rows.push(tampered("trace.every-coil", &toml, |w| {
        w.closed_windings[0].steps.pop();
    }));
    rows
}

/// Each rating rule passes on a design within its limit and fails when the shop limit is
/// tightened past the computed value (the values themselves are checked in rating_limits.rs).
#[test]
fn rating_rules() {
    holds(rating_rows());
}

fn rating_rows() -> Vec<Row> {
    let base = support::fixture("rated-lap.toml");
    let c = checked(&base);
    let mut rows = Vec::new();
    for rule in armsheet::rating::rules::ALL {
        let value = c
            .rating
            .as_ref()
            .and_then(|r| r.check(rule.id))
            .map(|k| k.value)
            .unwrap_or_else(|| panic!("{} not computed on the rated fixture", rule.id));
        // Tighten the limit just past the value, in the failing direction.
        let tight = match rule.bound {
            armsheet::rating::Bound::AtMost => value * 0.5,
            armsheet::rating::Bound::AtLeast => value * 2.0 + 1.0,
        };
        let loose = match rule.bound {
            armsheet::rating::Bound::AtMost => value * 2.0 + 1.0,
            armsheet::rating::Bound::AtLeast => value * 0.5,
        };
        for (limit, want) in [(loose, Pass), (tight, Fail)] {
            let toml = format!("{base}\n[limits]\n{} = {limit}\n", rule.key);
            rows.push(case(rule.id, want, &toml));
        }
    }
    // The slot fill at its default limit: 4 turns of 2 x 1.6 mm fill 63.5 % of the slot room
    // (see coil_making.rs); 8 turns, 127 %, overfill it.
    rows.push(case("rating.slot-fill", Pass, &base));
    rows.push(case(
        "rating.slot-fill",
        Fail,
        &base.replace("turns = 4", "turns = 8"),
    ));
    rows
}

/// Every row of every family, without running them.
fn all_rows() -> Vec<Row> {
    [
        symmetry_rows(),
        exact_symmetry_rows(),
        span_rows(),
        lap_rows(),
        wave_rows(),
        shop_rows(),
        trace_rows(),
        rating_rows(),
        frog_leg_rows(),
    ]
    .into_iter()
    .flatten()
    .collect()
}

/// Every rule of the rules table, the rating rules included, has its rows here.
#[test]
fn every_rule_has_its_rows() {
    assert!(RULES.len() >= 37, "{} rules", RULES.len());
    let gaps = missing(&all_rows(), &RULES);
    assert!(
        gaps.is_empty(),
        "rows missing in tests/rule_cases.rs: {gaps:#?}"
    );
}

/// Planted gaps: the table check names a rule whose failing rows are taken away, a rule
/// added to the table without rows, and a row for an id the table does not hold; the
/// finding check names a finding with an id, a source or a severity that is not its row's.
#[test]
fn the_table_checks_catch_planted_gaps() {
    let rows: Vec<Row> = all_rows()
        .into_iter()
        .filter(|r| !(r.id == "span.pole-pitch" && r.want == Fail))
        .collect();
    assert_eq!(missing(&rows, &RULES), ["span.pole-pitch: no failing row"]);
    let planted = RuleSpec {
        id: "planted.rule",
        severity: Severity::Warning,
        source: "planted",
    };
    let mut rules = RULES.to_vec();
    rules.push(planted);
    let gaps = missing(&all_rows(), &rules);
    assert_eq!(
        gaps,
        [
            "planted.rule: no row where it is reported",
            "planted.rule: no failing row",
            "planted.rule: no passing row"
        ]
    );
    let mut rows = all_rows();
    rows.push(case("planted.rule", Pass, &lap(4, 36, 1, 9, 1, "")));
    assert_eq!(
        missing(&rows, &RULES),
        ["planted.rule: a row for a rule not in RULES"]
    );
    let good = checked(&lap(4, 36, 1, 9, 1, "")).findings;
    assert!(foreign(&good, &RULES).is_empty());
    let mut bad = good.clone();
    bad.push(Finding::of(&planted, false, "planted"));
    let mut other_source = good[0].clone();
    other_source.source = "somewhere else".into();
    bad.push(other_source);
    // A warning rule's finding raised to an error is not its row's.
    let warning_rule = RULES
        .iter()
        .rev()
        .find(|r| r.severity == Severity::Warning)
        .expect("a warning rule");
    let raised = Finding::of(warning_rule, false, "raised").lowered_to(Severity::Warning);
    let mut raised = raised;
    raised.severity = Severity::Error;
    bad.push(raised);
    assert_eq!(
        foreign(&bad, &RULES).len(),
        3,
        "{:?}",
        foreign(&bad, &RULES)
    );
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
    holds(frog_leg_rows());
}

fn frog_leg_rows() -> Vec<Row> {
    let mut rows = Vec::new();
    // Source: frog-leg windings, a trade association's technical note
    // (docs/domain.md, "Frog-leg windings"); derived.
    // Spans 14 and 15 on a pole pitch of 14.5 slots: two pole pitches together.
    let toml = frog_leg(4, 58, 14, "wave_span = 15\n");
    // Equal spans there leave EMF in the loop of a lap and a wave coil (derived).
    let equal = frog_leg(4, 58, 14, "");
    rows.push(case("frogleg.self-equalizing", Fail, &equal));
    for id in [
        "frogleg.self-equalizing",
        "frogleg.element-paths",
        "frogleg.pole-pairs-whole",
        "frogleg.equal-coils",
    ] {
        rows.push(case(id, Pass, &toml));
    }
    rows.push(case("frogleg.wave-reentrancy", Pass, &toml));
    rows.push(case(
        "frogleg.wave-reentrancy",
        Absent,
        &lap(4, 36, 1, 9, 1, ""),
    ));
    rows.push(case(
        "frogleg.pole-pairs-whole",
        Absent,
        &lap(4, 36, 1, 9, 1, ""),
    ));
    rows.push(case(
        "frogleg.equal-coils",
        Fail,
        &frog_leg(4, 58, 14, "wave_span = 15\nwave_turns = 2\n"),
    ));
    // One neutral (derived): with C/p = 29 odd and equal spans the wave coils' bar midpoints
    // fall half a bar from the lap coils'; a wave span one slot longer (u = 1) moves the wave
    // element half a bar onto the lap's neutral.
    rows.push(case("frogleg.one-neutral", Fail, &equal));
    rows.push(case("frogleg.one-neutral", Pass, &toml));
    rows.push(case(
        "frogleg.one-neutral",
        Absent,
        &lap(4, 36, 1, 9, 1, ""),
    ));
    // A wave coil's end lead one bar on: the lap and wave coils in series miss the bar two
    // pole pitches on.
    rows.push(tampered("frogleg.self-equalizing", &toml, |w| {
        let k = &mut w.connections[58];
        k.end_segment = Some(k.end_segment.unwrap() % 58 + 1);
    }));
    // One wave path lost: the elements no longer have equal paths.
    rows.push(tampered("frogleg.element-paths", &toml, |w| {
        w.elements[1].paths -= 1;
    }));
    // C/p = 50/3 not whole: the design stage refuses it
    // (tests/broken/frog-leg-bars-per-pole-pair.toml); the rule guards the checks behind it.
    rows.push(case(
        "frogleg.pole-pairs-whole",
        Refused,
        &frog_leg(6, 50, 8, ""),
    ));
    rows
}
