//! The brushes commutate on neutral for every armature: u coils per slot, dummy coils,
//! multiplex, lap and wave, both directions, both rotations.
//!
//! Measured from the traced winding, not from the formula that places the brushes: the rotor
//! is turned through one slot pitch; at each position the segments under each brush are found
//! from the segments' and brushes' angles, the closed windings are cut there, and the runs
//! between brushes of one polarity are the shorted coils. Each shorted coil's centre line (the
//! midpoint of its two slots, turned with the rotor) is compared with the nearest pole axis.
//! Neutral is "the commutated coil's sides in the interpolar zone", i.e. its centre line on the
//! pole axis (common practice; textbook treatments of brush position, docs/domain.md,
//! "Brush neutral with several coils per slot").

use crate::support;
use crate::support::random_design::{OFF, RandomDesign, Space, designs};

use armsheet::design::{Design, parse_design};
use armsheet::winding::{Winding, trace_winding};
use proptest::prelude::*;

/// Wraps an angle into (−half, half].
fn wrap(x: f64, period: f64) -> f64 {
    let r = x.rem_euclid(period);
    if r > period / 2.0 { r - period } else { r }
}

/// Brush width in segment pitches the trace uses.
fn brush_width(w: &Winding, d: &Design) -> f64 {
    w.brushes
        .first()
        .map_or(f64::from(d.multiplicity), |b| b.width_segments)
}

/// Shorted coils (coil position, brush index) with the rotor turned `phi` degrees in its sense
/// of rotation from the reference position.
fn shorted_at(w: &Winding, d: &Design, phi: f64) -> Vec<u32> {
    let c = w.active_coils;
    let delta = 360.0 / f64::from(c);
    let rot = match d.rotation {
        armsheet::design::Rotation::Clockwise => 1.0,
        armsheet::design::Rotation::CounterClockwise => -1.0,
    };
    let half_reach = (brush_width(w, d) + 1.0) / 2.0 * delta;
    // The brush touching each segment (index into w.brushes), if any.
    let mut touch: Vec<Option<usize>> = vec![None; c as usize];
    for (b, brush) in w.brushes.iter().enumerate() {
        let at = w.pole_axes_deg[0] + brush.angle_deg;
        for s in 1..=c {
            let seg = w.segment_deg(s) + rot * phi;
            if wrap(seg - at, 360.0).abs() < half_reach - 1e-9 {
                touch[(s - 1) as usize] = Some(b);
            }
        }
    }
    // Cut each closed winding at the touched segments.
    let mut shorted = Vec::new();
    for cw in &w.closed_windings {
        let steps = &cw.steps;
        let Some(first) = steps
            .iter()
            .position(|st| touch[(st.from_segment - 1) as usize].is_some())
        else {
            continue;
        };
        let mut from = touch[(steps[first].from_segment - 1) as usize].unwrap();
        let mut run = Vec::new();
        for k in 0..steps.len() {
            let st = steps[(first + k) % steps.len()];
            run.push(st.coil);
            if let Some(to) = touch[(st.to_segment - 1) as usize] {
                let same = w.brushes[from].polarity == w.brushes[to].polarity;
                if same {
                    shorted.append(&mut run);
                } else {
                    run.clear();
                }
                from = to;
            }
        }
    }
    shorted
}

/// Mean distance, in bars, of the shorted coils' centre lines from the nearest pole axis, over
/// one slot pitch of rotor travel; and how many shorted coils were seen.
fn mean_offset_bars(w: &Winding, d: &Design) -> (f64, usize) {
    let c = f64::from(w.active_coils);
    let delta = 360.0 / c;
    let slot_pitch = 360.0 / f64::from(d.slots);
    let pole_pitch = 360.0 / f64::from(d.poles);
    let rot = match d.rotation {
        armsheet::design::Rotation::Clockwise => 1.0,
        armsheet::design::Rotation::CounterClockwise => -1.0,
    };
    let steps = (16.0 * c / f64::from(d.slots)).ceil().max(16.0) as usize;
    let (mut sum, mut count) = (0.0, 0usize);
    for j in 0..steps {
        let phi = slot_pitch * j as f64 / steps as f64;
        for coil in shorted_at(w, d, phi) {
            let conn = &w.connections[(coil - 1) as usize];
            let top = f64::from(conn.top.slot - 1) * slot_pitch;
            let centre =
                top + f64::from(w.element_of(coil).pitches.span) * slot_pitch / 2.0 + rot * phi;
            let nearest = w
                .pole_axes_deg
                .iter()
                .map(|a| wrap(centre - a, 360.0))
                .min_by(|a, b| a.abs().total_cmp(&b.abs()))
                .unwrap();
            assert!(nearest.abs() <= pole_pitch / 2.0 + 1e-9);
            sum += nearest / delta;
            count += 1;
        }
    }
    (if count == 0 { 0.0 } else { sum / count as f64 }, count)
}

/// Brush-room designs: P 2-10, u 1-4, m 1-3, m + 2 segments a pole at least (room for the
/// brushes), the lead offset within a bar in half bars, up to 60 slots above the fewest.
fn case() -> impl Strategy<Value = RandomDesign> {
    designs(Space {
        pole_pairs: 1..=5,
        generator: OFF,
        lead_offset: -2..=2,
        whole_bars: false,
        room: 2,
        more_slots: 60,
        ..Space::default()
    })
}

proptest! {
    #![proptest_config(support::properties(1000))]

    #[test]
    fn the_commutation_zone_is_centred_on_the_pole_axis(c in case()) {
        let text = c.toml();
        let d = parse_design(&text, "prop.toml")
            .unwrap_or_else(|e| panic!("valid design rejected:\n{text}\n{e}"));
        let w = trace_winding(&d);
        let (mean, count) = mean_offset_bars(&w, &d);
        prop_assert!(count > 0, "no coil was ever shorted:\n{}", text);
        prop_assert!(mean.abs() <= 0.2, "commutation zone {mean:.3} bar off neutral ({} dummies):\n{}", w.dummy_coils.len(), text);
    }
}

fn design(toml: &str) -> Design {
    support::design(toml)
}

/// The cases, which were off neutral by −0.5, −1.0, −1.45 and −0.47 bar.
#[test]
fn several_coils_per_slot_and_dummies_are_on_neutral() {
    for (u, slots, poles, kind, span) in [
        (1, 24, 4, "lap", 6),
        (2, 24, 4, "lap", 6),
        (3, 24, 4, "lap", 6),
        (4, 24, 4, "lap", 6),
        (1, 36, 6, "wave", 6),
    ] {
        let d = design(&format!(
            "[armature]\npoles = {poles}\nslots = {slots}\ncoils_per_slot = {u}\n\n[winding]\ntype = \"{kind}\"\nspan = {span}\nturns = 1\n"
        ));
        let w = trace_winding(&d);
        let (mean, _) = mean_offset_bars(&w, &d);
        assert!(mean.abs() <= 0.2, "u {u} {kind}: {mean}");
        if kind == "lap" && u == 1 {
            assert!(
                mean.abs() < 1e-9,
                "u 1 without dummies is exactly on neutral: {mean}"
            );
        }
    }
}

/// A lead offset moves the brushes and the leads together: the brush is that many bars from
/// the pole axis and the commutation stays on neutral.
#[test]
fn a_half_bar_lead_offset_moves_the_brushes_with_the_leads() {
    let base = "[armature]\npoles = 4\nslots = 24\ncoils_per_slot = 2\n\n[winding]\ntype = \"lap\"\nspan = 6\nturns = 1\n";
    let d0 = design(base);
    let d1 = design(&format!("{base}lead_offset = -1.5\n"));
    let (w0, w1) = (trace_winding(&d0), trace_winding(&d1));
    assert_eq!(w1.lead_swing.from_pole_axis_bars, -1.5);
    assert!((w1.brushes[0].angle_deg - (360.0 - 1.5 * 360.0 / 48.0)).abs() < 1e-9);
    assert_eq!(w0.shorted_coils, w1.shorted_coils);
    assert!(mean_offset_bars(&w1, &d1).0.abs() <= 0.2);
    // u = 2 simplex lap: the slot group's bars 1, 2, 3 are centred on bar 2, one bar (two half
    // bars) further on than coil 1's own pair would put them.
    assert_eq!(w0.brushes[0].centre_segment, 2.0);
}

/// The segments each brush touches at the reference position, from the brush and segment
/// angles and the brush width (no mica): |segment − brush| < (width + 1)/2 bar pitches.
fn touched(w: &Winding, b: usize) -> Vec<u32> {
    let delta = 360.0 / f64::from(w.active_coils);
    let brush = &w.brushes[b];
    let at = w.pole_axes_deg[0] + brush.angle_deg;
    let reach = (brush.width_segments + 1.0) / 2.0 * delta;
    (1..=w.active_coils)
        .filter(|&s| wrap(w.segment_deg(s) - at, 360.0).abs() < reach - 1e-9)
        .collect()
}

#[derive(Debug, Clone)]
struct WidthCase {
    base: RandomDesign,
    /// Brush width in quarter segment pitches above m.
    extra_quarters: u32,
    /// Brush sets as a fraction of P for a wave (lap always P).
    sets_halved: bool,
}

fn width_case() -> impl Strategy<Value = WidthCase> {
    (case(), 0u32..=8, any::<bool>()).prop_map(|(base, extra_quarters, sets_halved)| WidthCase {
        base,
        extra_quarters,
        sets_halved,
    })
}

proptest! {
    #![proptest_config(support::properties(1000))]

    /// §2 and §3: the trace uses the design's brush width and brush sets; the contacts, the
    /// shorted coils and the rating's coils shorted all follow from that one width.
    #[test]
    fn contacts_and_shorted_coils_follow_the_given_width_and_sets(c in width_case()) {
        let b = &c.base;
        let width = f64::from(b.m) + f64::from(c.extra_quarters) / 4.0;
        let sets = if b.wave && c.sets_halved { (b.poles / 2).max(2) / 2 * 2 } else { b.poles };
        let text = format!(
            "{}\n[commutator]\ndiameter_mm = 200\nbrush_width_segments = {width}\nbrush_sets = {sets}\n\n[rating]\nvoltage = 220\ncurrent = 10\n",
            b.toml()
        );
        let Ok(d) = parse_design(&text, "prop.toml") else {
            // A brush half the commutator wide or more is refused; nothing to trace.
            prop_assume!(false);
            unreachable!()
        };
        let checked = armsheet::check(d);
        let (d, w) = (&checked.design, &checked.winding);
        prop_assert_eq!(w.brushes.len() as u32, sets);
        for (k, brush) in w.brushes.iter().enumerate() {
            prop_assert!((brush.width_segments - width).abs() < 1e-12);
            prop_assert_eq!(&brush.contacts, &touched(w, k), "brush {}:\n{}", k + 1, text);
        }
        let mut mine = shorted_at(w, d, 0.0);
        mine.sort_unstable();
        mine.dedup();
        prop_assert_eq!(&w.shorted_coils, &mine, "\n{}", text);
        if !b.wave && 2.0 * width * f64::from(b.poles) < f64::from(w.active_coils) {
            // Lap, brushes apart: a brush touching k bars shorts the k − m coils whose two
            // bars it covers, never more than the rating's most.
            let k = checked.rating.as_ref().and_then(|r| r.commutator.as_ref()).unwrap();
            for brush in &w.brushes {
                let own = w
                    .connections
                    .iter()
                    .filter(|conn| {
                        conn.start_segment.is_some_and(|s| brush.contacts.contains(&s))
                            && conn.end_segment.is_some_and(|s| brush.contacts.contains(&s))
                    })
                    .count() as u32;
                prop_assert_eq!(own, (brush.contacts.len() as u32).saturating_sub(b.m), "\n{}", text);
                prop_assert!(own <= k.coils_shorted_max.unwrap(), "{} above {:?}\n{}", own, k.coils_shorted_max, text);
            }
        }
    }
}

/// The case: a 4-pole simplex lap with 3-bar brushes touches four bars and shorts
/// three coils per brush, in the trace and in the rating alike.
#[test]
fn a_three_bar_brush_shorts_three_lap_coils() {
    let c = armsheet::check(design(
        "[armature]\npoles = 4\nslots = 24\n\n[winding]\ntype = \"lap\"\nturns = 3\n\n[commutator]\ndiameter_mm = 100\nbrush_width_segments = 3.0\n\n[rating]\nvoltage = 110\ncurrent = 10\n",
    ));
    let w = &c.winding;
    assert_eq!(w.brushes[0].contacts.len(), 4);
    assert_eq!(w.shorted_coils.len(), 4 * 3);
    let k = c.rating.as_ref().unwrap().commutator.as_ref().unwrap();
    assert_eq!(
        (k.coils_shorted_min, k.coils_shorted_max),
        (Some(3), Some(3))
    );
}

/// A 4-pole wave with two brush holders: each arm carries the whole armature current.
#[test]
fn two_brush_sets_on_a_four_pole_wave_carry_i_per_arm() {
    let c = armsheet::check(design(
        "[armature]\npoles = 4\nslots = 25\n\n[winding]\ntype = \"wave\"\nturns = 3\n\n[commutator]\nbrush_sets = 2\n\n[rating]\nvoltage = 110\ncurrent = 10\n",
    ));
    assert_eq!(c.winding.brush_sets(), 2);
    assert_eq!(c.winding.parallel_paths(), 2);
    let i = c.rating.as_ref().unwrap().currents.as_ref().unwrap();
    assert_eq!((i.brush_arms, i.per_brush_arm_a), (2, 10.0));
}

/// Every demo commutates on neutral, the dummy-coil wave and the 4-coils-a-slot lap included.
#[test]
fn every_demo_commutates_on_neutral() {
    for name in [
        "hoist-lap",
        "press-duplex-lap",
        "pump-wave",
        "conveyor-wave-dummy",
        "mill-lap-12p",
        "mill-frog-leg",
    ] {
        let d = design(&support::demo(name));
        let w = trace_winding(&d);
        let (mean, count) = mean_offset_bars(&w, &d);
        assert!(count > 0 && mean.abs() <= 0.2, "{name}: {mean} bar");
    }
}
