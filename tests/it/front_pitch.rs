//! Front pitch per connection, against the physical coil positions.
//!
//! The front connection runs from a coil's bottom side (its end lead's segment) to the top side
//! of the coil that starts at that segment. Counted in coil sides with the dummy coils
//! included, it is the nominal front pitch wherever the step passes no dummy coil; every dummy
//! it passes lengthens the top-to-top step, and so a wave's front pitch, by 2 coil sides
//! (derived from the numbering: top sides odd, 2 coil sides per coil position). The property
//! counts the dummies between the two coils' slots and positions; it does not use the engine's
//! own front-pitch arithmetic. The other tests follow the values of a demo into the finding,
//! the JSON, the CSV and the sheets' connection table.

use crate::support;

use crate::support::random_design::{OFF, RandomDesign, Space, designs};
use crate::support::sheets::{attr_values, load, sheets_for};
use crate::support::{demo, design};
use armsheet::check;
use armsheet::design::parse_design;
use armsheet::layout::{Paper, Window};
use armsheet::render::csv::{CSV_COLUMNS, connections_csv};
use armsheet::render::json::report_json;
use armsheet::theory::{Direction, WindingType};
use armsheet::winding::{Winding, trace_winding};
use proptest::prelude::*;

/// P 2-12, u 1-4, m 1-3, either direction, the span within a slot of the pole pitch, up to
/// 120 slots above the fewest; a wave takes 0-3 pole pairs' worth of segments fewer than the
/// fewest-dummy count (more dummy coils), while the design stays valid.
fn case() -> impl Strategy<Value = RandomDesign> {
    let space = Space {
        pole_pairs: 1..=6,
        ccw: OFF,
        generator: OFF,
        lead_offset: 0..=0,
        more_slots: 120,
        ..Space::default()
    };
    (designs(space), 0u32..=3).prop_map(|(mut c, fewer)| {
        if c.wave {
            c.segments = Some(wave_segments(&c, fewer));
        }
        c
    })
}

/// A wave's segments: the fewest-dummy count, less `fewer` times p while at least (m + 1)·P
/// remain.
fn wave_segments(c: &RandomDesign, fewer: u32) -> u32 {
    let dir = if c.retro {
        Direction::Retrogressive
    } else {
        Direction::Progressive
    };
    let p = c.poles / 2;
    let best = WindingType::Wave
        .kind()
        .default_segments(c.u * c.slots, c.m, p, dir)
        .expect("a wave count exists");
    // (C ± m)/p stays whole when C drops by whole multiples of p.
    let least = (c.m + 1) * c.poles;
    let mut segments = best;
    for _ in 0..fewer {
        if segments >= least + p {
            segments -= p;
        }
    }
    segments
}

fn traced(c: &RandomDesign) -> Winding {
    let text = c.toml();
    let d = parse_design(&text, "prop.toml")
        .unwrap_or_else(|e| panic!("valid design rejected:\n{text}\n{e}"));
    trace_winding(&d)
}

/// Physical coil position, 1…N, from the slot and the position in the slot.
fn place(w: &Winding, coil: u32, u: u32) -> u32 {
    let c = &w.connections[(coil - 1) as usize];
    (c.top.slot - 1) * u + c.top.position
}

proptest! {
    #![proptest_config(support::properties(1000))]

    #[test]
    fn front_pitch_differs_by_two_per_dummy_stepped_over(c in case()) {
        let w = traced(&c);
        let n = w.coils;
        let nominal = w.pitches.front;
        let forward = w.pitches.commutator > 0;
        let dummy_at: Vec<bool> = {
            let mut v = vec![false; n as usize + 1];
            for k in w.connections.iter().filter(|k| k.dummy) {
                v[place(&w, k.coil, c.u) as usize] = true;
            }
            v
        };
        for k in &w.connections {
            if k.dummy {
                prop_assert_eq!(k.front_pitch, None, "dummy coil {}", k.coil);
                continue;
            }
            let y = k.front_pitch.expect("an active coil has a front pitch");
            let end = k.end_segment.unwrap();
            let next = w
                .connections
                .iter()
                .find(|j| j.start_segment == Some(end))
                .expect("some coil starts at every segment");
            // Walk the positions from this coil to the next, the way the commutator pitch
            // runs, and count the dummy coils in between.
            let (from, to) = (place(&w, k.coil, c.u), place(&w, next.coil, c.u));
            let mut at = from;
            let mut stepped = 0i64;
            loop {
                at = if forward { at % n + 1 } else { (at + n - 2) % n + 1 };
                if at == to {
                    break;
                }
                stepped += i64::from(dummy_at[at as usize]);
            }
            if w.dummy_coils.is_empty() {
                prop_assert_eq!(y, nominal, "coil {} of\n{}", k.coil, c.toml());
            } else {
                prop_assert!(c.wave, "dummy coils on a lap winding");
                prop_assert_eq!(
                    y - nominal,
                    2 * stepped,
                    "coil {} ({} dummies stepped over) of\n{}",
                    k.coil,
                    stepped,
                    c.toml()
                );
            }
        }
    }
}

/// The conveyor demo (120 coil positions, 119 segments, dummy coil 120): the 40 front
/// connections from coils 80–119 step over the dummy and use 45; the other 79 use the nominal
/// 43 [derived, by counting the dummy between neighbouring coils of the trace].
#[test]
fn conveyor_demo_front_pitches() {
    let checked = check(design(&demo("conveyor-wave-dummy")));
    let w = &checked.winding;
    assert_eq!((w.pitches.front, w.dummy_coils.clone()), (43, vec![120]));
    let long: Vec<u32> = w
        .connections
        .iter()
        .filter(|c| c.front_pitch == Some(45))
        .map(|c| c.coil)
        .collect();
    assert_eq!(long, (80..=119).collect::<Vec<_>>());
    let nominal = w
        .connections
        .iter()
        .filter(|c| c.front_pitch == Some(43))
        .count();
    assert_eq!(nominal, 79);
    assert_eq!(w.connections[119].front_pitch, None);

    let f = checked
        .findings
        .iter()
        .find(|f| f.id == "wave.dummy-front-pitch")
        .expect("the finding is reported");
    assert!(f.passed);
    assert!(
        f.message.starts_with("40 of 119 front connections")
            && f.message.contains("40 use 45 (+2), from coils 80-119"),
        "{}",
        f.message
    );

    // JSON: an integer per active coil, null for the dummy; the top-level key stays nominal.
    let json: serde_json::Value = serde_json::from_str(&report_json(&checked)).unwrap();
    assert_eq!(json["front_pitch"], 43);
    let conns = json["connections"].as_array().unwrap();
    assert_eq!(conns[0]["front_pitch"], 43);
    assert_eq!(conns[79]["front_pitch"], 45);
    assert!(conns[119]["front_pitch"].is_null());

    // CSV: the column by name, empty for the dummy.
    let csv = connections_csv(w);
    let col = CSV_COLUMNS
        .iter()
        .position(|c| *c == "front_pitch")
        .unwrap();
    let cell = |row: usize| csv.lines().nth(row).unwrap().split(',').nth(col).unwrap();
    assert_eq!((cell(1), cell(80), cell(120)), ("43", "45", ""));
}

/// A lap winding never has dummy coils, so the finding is absent and every connection has the
/// nominal front pitch, retrogressive (y_b + 2m) included.
#[test]
fn lap_rows_carry_the_nominal_pitch() {
    let checked = check(design(&demo("press-duplex-lap")));
    let w = &checked.winding;
    assert!(
        w.connections
            .iter()
            .all(|c| c.front_pitch == Some(w.pitches.front))
    );
    assert!(
        checked
            .findings
            .iter()
            .all(|f| f.id != "wave.dummy-front-pitch")
    );
}

/// The sheets' connection table: a front-pitch column with each coil's value where dummy coils
/// make it vary, none where every row would read the nominal value.
#[test]
fn sheet_table_shows_the_column_only_where_it_varies() {
    let rows_with_pitch = |name: &str| {
        let (d, w) = load(name, &demo(name));
        let svgs = sheets_for(&d, Paper::A4, Window::Auto);
        let coils: Vec<u32> = svgs[1..]
            .iter()
            .flat_map(|s| attr_values(s, "class=\"row\"", "data-coil"))
            .map(|v| v.parse().unwrap())
            .collect();
        let pitches: Vec<Option<i64>> = svgs[1..]
            .iter()
            .flat_map(|s| {
                s.lines()
                    .filter(|l| l.contains("class=\"row\""))
                    .map(|l| {
                        let needle = " data-front-pitch=\"";
                        l.find(needle).map(|i| {
                            let r = &l[i + needle.len()..];
                            r[..r.find('"').unwrap()].parse().unwrap()
                        })
                    })
                    .collect::<Vec<_>>()
            })
            .collect();
        let heading = svgs
            .iter()
            .find(|s| s.contains("data-page=\"connections\""))
            .unwrap()
            .contains(">pitch<");
        (w, coils, pitches, heading)
    };

    let (w, coils, pitches, heading) = rows_with_pitch("conveyor-wave-dummy");
    assert!(heading, "the column has its heading");
    assert_eq!(coils.len(), w.connections.len());
    for (coil, y) in coils.iter().zip(&pitches) {
        assert_eq!(
            *y,
            w.connections[(coil - 1) as usize].front_pitch,
            "coil {coil}"
        );
    }

    let (_, coils, pitches, heading) = rows_with_pitch("pump-wave");
    assert!(!heading, "no column when every row is nominal");
    assert!(!coils.is_empty() && pitches.iter().all(Option::is_none));
}
