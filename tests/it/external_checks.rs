//! The engine against sources outside the project: published worked examples, the EMF
//! relation of any DC machine text, and an independent graph library.

use armsheet::design::parse_design;
use armsheet::winding::{Winding, trace_winding};

fn wind(toml: &str) -> Winding {
    let d = parse_design(toml, "example.toml").unwrap_or_else(|e| panic!("{e}"));
    trace_winding(&d)
}

fn design(
    poles: u32,
    slots: u32,
    kind: &str,
    m: u32,
    span: u32,
    turns: u32,
    extra: &str,
) -> String {
    format!(
        "[armature]\npoles = {poles}\nslots = {slots}\n\n[winding]\ntype = \"{kind}\"\nmultiplicity = {m}\nspan = {span}\nturns = {turns}\n{extra}"
    )
}

/// 2 poles, 6 coils, simplex lap: y_b = 7, y_f = 5.
/// [src: published worked example of a simplex lap winding, textbook winding chapter
/// reproduced online; from memory as to the book.]
#[test]
fn lap_two_poles_six_coils() {
    let w = wind(&design(2, 6, "lap", 1, 3, 1, ""));
    assert_eq!(
        (w.pitches.back, w.pitches.front, w.pitches.commutator),
        (7, 5, 1)
    );
    assert_eq!(w.parallel_paths(), 2);
}

/// 4 poles, 25 coils, simplex wave: y_b = 13, y_f = 13, y_c = 13.
/// [src: textbook wave-winding example, reproduced in several tutorials; published worked
/// example, from memory as to the book.]
#[test]
fn wave_four_poles_25_coils() {
    let w = wind(&design(4, 25, "wave", 1, 6, 1, ""));
    assert_eq!(
        (w.pitches.back, w.pitches.front, w.pitches.commutator),
        (13, 13, 13)
    );
    assert_eq!(
        (w.active_coils, w.parallel_paths(), w.reentrancy()),
        (25, 2, 1)
    );
}

/// 4 poles, 12 slots, duplex lap: y_b = 7, y_f = 3, two closed windings.
/// [src: textbook duplex-lap example; published worked example, from memory as to the book.]
#[test]
fn duplex_lap_four_poles_12_slots() {
    let w = wind(&design(4, 12, "lap", 2, 3, 1, ""));
    assert_eq!(
        (w.pitches.back, w.pitches.front, w.pitches.commutator),
        (7, 3, 2)
    );
    assert_eq!(w.reentrancy(), 2);
    assert_eq!(w.parallel_paths(), 8, "a = m·P");
}

/// 6 poles, 36 slots, simplex wave: C = 35 with one dummy coil, y_c = 12, y_b = 13, y_f = 11.
/// [src: textbook dummy-coil example (e.g. Theraja, Electrical Technology vol. 2, armature
/// windings); from memory as to chapter.]
#[test]
fn wave_six_poles_36_slots_needs_one_dummy() {
    let w = wind(&design(6, 36, "wave", 1, 6, 1, ""));
    assert_eq!(w.active_coils, 35);
    assert_eq!(w.dummy_coils, vec![36]);
    assert_eq!(
        (w.pitches.commutator, w.pitches.back, w.pitches.front),
        (12, 13, 11)
    );
}

/// The same 6-pole, 36-slot example, connection by connection: with dummy coil 36 counted in
/// the coil-side numbering, the 12 front connections that step over it (from coils 24–35, whose
/// end leads are on segments 1–12) use y_f + 2 = 13, the other 23 use y_f = 11.
/// [src: textbook dummy-coil example (e.g. Theraja, Electrical Technology vol. 2, armature
/// windings), from memory as to chapter, for C = 35, y_c = 12, y_b = 13, y_f = 11; the
/// per-connection count is derived.]
#[test]
fn wave_six_poles_36_slots_front_pitch_per_connection() {
    let w = wind(&design(6, 36, "wave", 1, 6, 1, ""));
    let pitches: Vec<i64> = w.connections.iter().filter_map(|c| c.front_pitch).collect();
    assert_eq!(pitches.len(), 35, "one front pitch per active coil");
    assert_eq!(pitches.iter().filter(|&&y| y == 13).count(), 12);
    assert_eq!(pitches.iter().filter(|&&y| y == 11).count(), 23);
    let over: Vec<u32> = w
        .connections
        .iter()
        .filter(|c| c.front_pitch == Some(13))
        .map(|c| c.coil)
        .collect();
    assert_eq!(over, (24..=35).collect::<Vec<_>>());
    assert_eq!(w.connections[35].front_pitch, None, "the dummy has none");
}

/// 6 poles, Z = 664, wave, Φ = 0.06 Wb, 250 rpm: E = 498 V.
/// [src: textbook EMF example; E = P·Z·Φ·N/(60·a), e.g. Chapman, Electric Machinery
/// Fundamentals, DC machine chapters; published worked example, from memory as to the book.]
/// 83 coils of 4 turns give Z = 2·83·4 = 664, and (83 + 1)/3 = 28 is a whole commutator pitch.
#[test]
fn emf_six_pole_wave_664_conductors() {
    let w = wind(&design(
        6,
        83,
        "wave",
        1,
        14,
        4,
        "flux_per_pole_mwb = 60\nspeed_rpm = 250\n",
    ));
    assert_eq!(w.conductors, 664);
    assert_eq!(w.parallel_paths(), 2);
    let e = w.constants.emf_v.unwrap();
    assert!((e - 498.0).abs() < 1e-9, "E = {e}");
}

/// T = K·Φ·I_a with K = P·Z/(2π·a): P = 4, Z = 500, a = 2, Φ = 0.02 Wb, I = 10 A gives
/// T = 31.83 N·m. [src: own arithmetic from the formula in any DC machine text (Chapman,
/// DC machine chapters); the check value is in docs/domain.md, "EMF and torque".] K·Φ in V·s/rad
/// equals K·Φ in N·m/A.
#[test]
fn torque_constant_four_pole_wave_500_conductors() {
    // 125 coils of 2 turns: Z = 500; (125 + 1)/2 = 63.
    let w = wind(&design(
        4,
        125,
        "wave",
        1,
        31,
        2,
        "flux_per_pole_mwb = 20\n",
    ));
    assert_eq!((w.conductors, w.parallel_paths()), (500, 2));
    let kt = w.constants.torque_constant_nm_per_a.unwrap();
    assert!((kt * 10.0 - 31.83).abs() < 0.005, "T = {}", kt * 10.0);
    assert_eq!(
        w.constants.emf_constant_v_per_rad_s,
        w.constants.torque_constant_nm_per_a
    );
    let per_1000 = w.constants.emf_v_per_1000_rpm.unwrap();
    // E = P·Z·Φ·N/(60·a) at 1000 rpm.
    assert!((per_1000 - 4.0 * 500.0 * 0.02 * 1000.0 / 120.0).abs() < 1e-9);
}

/// The closed windings found by armsheet's own trace equal the strongly connected components
/// that petgraph (a general graph library from crates.io) finds in the same segment graph.
#[test]
fn closed_windings_match_an_independent_graph_library() {
    use petgraph::algo::tarjan_scc;
    use petgraph::graph::DiGraph;
    let cases = [
        design(4, 24, "lap", 2, 6, 1, ""),
        design(4, 18, "lap", 3, 4, 1, ""),
        design(8, 66, "wave", 2, 8, 1, ""),
        design(6, 36, "wave", 1, 6, 1, ""),
        design(12, 264, "lap", 1, 22, 1, ""),
        design(4, 30, "wave", 2, 7, 1, "direction = \"retrogressive\"\n"),
    ];
    for toml in &cases {
        let w = wind(toml);
        let mut g = DiGraph::<u32, u32>::new();
        let nodes: Vec<_> = (1..=w.active_coils).map(|s| g.add_node(s)).collect();
        for c in w.connections.iter().filter(|c| !c.dummy) {
            let (a, b) = (c.start_segment.unwrap(), c.end_segment.unwrap());
            g.add_edge(nodes[(a - 1) as usize], nodes[(b - 1) as usize], c.coil);
        }
        let mut sccs: Vec<Vec<u32>> = tarjan_scc(&g)
            .into_iter()
            .map(|comp| {
                let mut v: Vec<u32> = comp.into_iter().map(|n| g[n]).collect();
                v.sort_unstable();
                v
            })
            .collect();
        sccs.sort();
        let mut ours: Vec<Vec<u32>> = w
            .closed_windings
            .iter()
            .map(|cw| {
                let mut v: Vec<u32> = cw.steps.iter().map(|s| s.from_segment).collect();
                v.sort_unstable();
                v
            })
            .collect();
        ours.sort();
        assert_eq!(ours, sccs, "{toml}");
        assert_eq!(w.reentrancy() as usize, sccs.len());
    }
}
