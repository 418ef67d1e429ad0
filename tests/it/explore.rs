//! `armsheet explore`: the search against a brute force through `check`, every written pick
//! through `check`, a demo design found on its own frame, bad frames (the corpus in
//! `tests/broken_frames/`), and a search that finds nothing.

use std::collections::BTreeSet;
use std::path::Path;

use armsheet::check;
use armsheet::design::{
    ConductorShape, DesignSpec, Direction, EqualizerChoice, HalfBars, SpanSource, WindingType,
    parse_design, parse_frame,
};
use armsheet::features::explore::{Candidate, design_of, explore};
use armsheet::features::rewind::design_toml::write_design;
use proptest::prelude::*;

use crate::support::{ROOT, armsheet, properties, scratch, text};

/// A small frame: 4 poles, 13 slots, every kind, duplex, u 1-2, one dummy at most, four strips.
fn small_frame(voltage: f64, current: f64, flux: f64) -> String {
    format!(
        r#"
[armature]
poles = 4
slots = 13

[rating]
voltage = {voltage}
current = {current}
speed_rpm = 1500
flux_per_pole_mwb = {flux}
thermal_class = "F"

[core]
diameter_mm = 90
length_mm = 70

[commutator]
diameter_mm = 70
brush_width_segments = 1.5

[search]
multiplicity_max = 2
coils_per_slot_from = 1
coils_per_slot_to = 2
dummy_coils_max = 1
span_slack = 1
conductor = "rectangular"
strip_widths_mm = [1.0, 1.25]
strip_heights_mm = [0.8]
strands_max = 2
speed_tolerance = 0.1
"#
    )
}

/// The identity of a candidate: structure, turns, conductor.
type Key = (u32, String, u32, String, u32, u32, u32, u32, String);

fn key_of(k: &Candidate) -> Key {
    let s = &k.structure;
    (
        s.slots,
        s.kind.as_str().to_string(),
        s.multiplicity,
        s.direction.as_str().to_string(),
        s.coils_per_slot,
        s.segments,
        s.span,
        k.turns,
        format!("{:?}", k.conductor),
    )
}

#[test]
fn a_brute_force_through_check_finds_exactly_the_fits() {
    let text = small_frame(60.0, 10.0, 7.0);
    let f = parse_frame(&text, "small.toml").unwrap();
    let found = explore(&f);
    let fits: BTreeSet<Key> = found.fits.iter().map(key_of).collect();
    // The turns the search evaluates stay far below the brute force's reach.
    assert!(
        found.fits.iter().all(|k| k.turns < 15),
        "turns beyond the brute force"
    );
    let (widths, height) = ([1.0, 1.25], 0.8);
    let mut brute = BTreeSet::new();
    let mut checked = 0;
    for kind in WindingType::ALL {
        for m in 1..=2 {
            for direction in [Direction::Progressive, Direction::Retrogressive] {
                for u in 1..=2u32 {
                    let n = 13 * u;
                    // Every count the dummy limit allows, workable or not: the design stage
                    // refuses those no winding fits.
                    for c in n - 1..=n {
                        // The pole pitch 13/4 and one slot either side.
                        for span in 2..=5 {
                            for w in widths {
                                for strands in 1..=2 {
                                    let shape = ConductorShape::Rectangular {
                                        width_mm: w,
                                        height_mm: height,
                                        corner_radius_mm: 0.0,
                                        strands,
                                    };
                                    for turns in 1..=20 {
                                        let spec =
                                            spec(&f, kind, m, direction, u, c, span, turns, shape);
                                        let Ok(d) = armsheet::design::Design::new(spec) else {
                                            continue;
                                        };
                                        let file = write_design(&d, &[]);
                                        let back = parse_design(&file, "brute.toml").unwrap();
                                        let r = check(back);
                                        checked += 1;
                                        let rating = r.rating.as_ref().unwrap();
                                        let speed = rating
                                            .emf
                                            .as_ref()
                                            .and_then(|e| e.speed_at_flux_rpm)
                                            .unwrap_or(0.0);
                                        let fits = !r.has_errors()
                                            && rating.checks.iter().all(|x| x.passed)
                                            && (speed - 1500.0).abs() <= 0.1 * 1500.0;
                                        if fits {
                                            brute.insert((
                                                13,
                                                kind.as_str().to_string(),
                                                m,
                                                direction.as_str().to_string(),
                                                u,
                                                c,
                                                span,
                                                turns,
                                                format!("{shape:?}"),
                                            ));
                                        }
                                    }
                                }
                            }
                        }
                    }
                }
            }
        }
    }
    assert!(checked > 1000, "the brute force checked {checked} designs");
    assert!(!brute.is_empty(), "the small frame has fits");
    let missed: Vec<_> = brute.difference(&fits).collect();
    let extra: Vec<_> = fits.difference(&brute).collect();
    assert!(
        missed.is_empty() && extra.is_empty(),
        "the search missed {missed:?}\nand found what check refuses: {extra:?}"
    );
}

#[allow(clippy::too_many_arguments)]
fn spec(
    f: &armsheet::design::Frame,
    kind: WindingType,
    m: u32,
    direction: Direction,
    u: u32,
    c: u32,
    span: u32,
    turns: u32,
    shape: ConductorShape,
) -> DesignSpec {
    DesignSpec {
        file_name: "brute.toml".into(),
        units: f.units,
        job: Default::default(),
        poles: f.poles,
        slots: 13,
        coils_per_slot: u,
        segments: Some(c),
        rotation: None,
        pole_arc: None,
        winding_type: kind,
        multiplicity: m,
        direction,
        span,
        span_source: SpanSource::Given,
        turns,
        wave_span: None,
        wave_turns: None,
        lead_offset: HalfBars::ZERO,
        equalizers: EqualizerChoice::None,
        dummy_coils: None,
        flux_per_pole_mwb: Some(f.flux_per_pole_mwb),
        speed_rpm: Some(f.speed_rpm),
        mode: f.mode,
        rating: Some(f.rating.clone()),
        conductor: Some(armsheet::design::Conductor {
            shape,
            mean_turn_mm: None,
        }),
        core: Some(f.core.clone()),
        commutator: f.commutator.clone(),
        limits: f.limits.clone(),
    }
}

proptest! {
    #![proptest_config(properties(6))]

    /// Every fit of a small frame, built as a design, passes `check` with every rating limit,
    /// at the speed the search gave.
    #[test]
    fn every_fit_passes_check(v in 40.0..80.0f64, i in 6.0..14.0f64, flux in 5.0..10.0f64) {
        let f = parse_frame(&small_frame(v, i, flux), "small.toml").unwrap();
        let found = explore(&f);
        for k in found.fits.iter().take(40) {
            let d = design_of(&f, &k.structure, k.turns, k.conductor).unwrap();
            let r = check(d);
            prop_assert!(!r.has_errors(), "{:?} fails check", key_of(k));
            let rating = r.rating.as_ref().unwrap();
            prop_assert!(rating.checks.iter().all(|x| x.passed));
            let speed = rating.emf.as_ref().and_then(|e| e.speed_at_flux_rpm).unwrap();
            prop_assert!((speed - k.figures.speed_rpm).abs() < 1e-6 * speed);
        }
    }
}

#[test]
fn the_written_picks_pass_check() {
    let dir = scratch("picks");
    for n in ["1", "2", "7"] {
        let out = dir.join(format!("pick-{n}.toml"));
        let o = armsheet(&[
            "explore",
            "designs/frames/hoist-frame.toml",
            "--write",
            n,
            "-o",
            out.to_str().unwrap(),
        ]);
        assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
        let written = std::fs::read_to_string(&out).unwrap();
        assert!(
            written.contains("explore, candidate"),
            "the header records the search"
        );
        let c = armsheet(&["check", out.to_str().unwrap()]);
        assert_eq!(c.status.code(), Some(0), "{}", text(&c.stdout));
    }
}

#[test]
fn the_hoist_demo_is_a_fit_of_its_own_frame() {
    // designs/hoist-lap.toml: 36 slots, simplex lap, span 1-9, 4 turns, 2 x 1.6 mm.
    let f = parse_frame(
        &std::fs::read_to_string(format!("{ROOT}/designs/frames/hoist-frame.toml")).unwrap(),
        "hoist-frame.toml",
    )
    .unwrap();
    let found = explore(&f);
    let hit = found.fits.iter().any(|k| {
        let s = &k.structure;
        s.slots == 36
            && s.kind == WindingType::Lap
            && s.multiplicity == 1
            && s.direction == Direction::Progressive
            && s.coils_per_slot == 1
            && s.segments == 36
            && s.span == 8
            && k.turns == 4
            && k.conductor
                == ConductorShape::Round {
                    diameter_mm: 1.6,
                    awg: None,
                    strands: 2,
                }
    });
    assert!(hit, "the hoist demo is not among the fits of its frame");
}

#[test]
fn json_keys_are_fixed() {
    let o = armsheet(&[
        "explore",
        "designs/frames/hoist-frame.toml",
        "--json",
        "--top",
        "3",
    ]);
    assert_eq!(o.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(v["evaluated"].as_u64().unwrap() > 10_000);
    let c = &v["candidates"][0];
    for k in [
        "type",
        "multiplicity",
        "direction",
        "coils_per_slot",
        "segments",
        "dummy_coils",
        "span",
        "turns",
        "conductor",
        "on_front",
        "reactance_v",
        "copper_loss_w",
        "segment_volts_peak",
        "fill",
    ] {
        assert!(c.get(k).is_some(), "candidate lacks {k}");
    }
    assert_eq!(v["candidates"].as_array().unwrap().len(), 3);
    assert!(v["near_misses"].is_array());
}

#[test]
fn a_search_that_finds_nothing_names_the_limit_and_exits_1() {
    let dir = scratch("nothing");
    // A flux so small the turns it needs crowd the segments past their voltage.
    let frame = small_frame(400.0, 10.0, 7.0);
    let path = dir.join("f.toml");
    std::fs::write(&path, frame).unwrap();
    let o = armsheet(&["explore", path.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stdout));
    let out = text(&o.stdout);
    let said = out
        .lines()
        .find_map(|l| l.strip_prefix("nothing fits: "))
        .unwrap_or_else(|| panic!("{out}"));
    let limit = said.split(' ').next().unwrap();
    // A limit id the checks or the search name.
    assert!(
        [
            "rating.",
            "symmetry.",
            "search.",
            "trace.",
            "span.",
            "frogleg.",
            "lap."
        ]
        .iter()
        .any(|p| limit.starts_with(p)),
        "{out}"
    );
    let j = armsheet(&["explore", path.to_str().unwrap(), "--json"]);
    assert_eq!(j.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_slice(&j.stdout).unwrap();
    assert_eq!(v["last_cut"].as_str(), Some(limit));
    assert_eq!(v["candidates"].as_array().unwrap().len(), 0);
}

#[test]
fn new_frame_writes_a_starter_that_explores() {
    let dir = scratch("starter");
    let o = crate::support::armsheet_in(&["new", "--frame"], &dir);
    assert_eq!(o.status.code(), Some(0));
    let e = crate::support::armsheet_in(&["explore", "frame.toml"], &dir);
    assert_eq!(e.status.code(), Some(0), "{}", text(&e.stderr));
}

/// Each `tests/broken_frames/NAME.toml` makes `explore` exit 2 with nothing on stdout and
/// exactly `NAME.stderr` on stderr. ARMSHEET_BLESS=1 rewrites the expected files.
#[test]
fn every_broken_frame_gets_its_expected_message() {
    let dir = Path::new(ROOT).join("tests/broken_frames");
    let bless = std::env::var_os("ARMSHEET_BLESS").is_some();
    let mut names: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    names.sort();
    assert!(names.len() >= 8, "the corpus has {} frames", names.len());
    let mut failures = Vec::new();
    for path in names {
        let rel = format!(
            "tests/broken_frames/{}",
            path.file_name().unwrap().to_string_lossy()
        );
        let out = armsheet(&["explore", &rel]);
        let stderr = text(&out.stderr);
        let expected_path = path.with_extension("stderr");
        if bless {
            std::fs::write(&expected_path, &stderr).unwrap();
        }
        let expected = std::fs::read_to_string(&expected_path).unwrap_or_default();
        if out.status.code() != Some(2) {
            failures.push(format!("{rel}: exit {:?}, expected 2", out.status.code()));
        }
        if !out.stdout.is_empty() {
            failures.push(format!("{rel}: wrote to stdout"));
        }
        if stderr != expected {
            failures.push(format!("{rel}: stderr\n{stderr}\nexpected\n{expected}"));
        }
        if !stderr.contains(&rel) || !stderr.contains("hint") {
            failures.push(format!("{rel}: not located or no hint:\n{stderr}"));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn the_fill_limit_cuts_by_the_slot_area() {
    let with_area = |area: f64| {
        small_frame(60.0, 10.0, 7.0).replace(
            "strands_max = 2",
            &format!("strands_max = 2\nslot_area_mm2 = {area}\nfill_max = 0.4"),
        )
    };
    let roomy = explore(&parse_frame(&with_area(200.0), "roomy.toml").unwrap());
    let tight = explore(&parse_frame(&with_area(30.0), "tight.toml").unwrap());
    let free = explore(&parse_frame(&small_frame(60.0, 10.0, 7.0), "free.toml").unwrap());
    assert!(!roomy.fits.is_empty());
    assert!(
        tight.fits.len() < roomy.fits.len(),
        "a smaller slot fits fewer"
    );
    assert!(roomy.fits.len() <= free.fits.len());
    for k in roomy.fits.iter().chain(&tight.fits) {
        let fill = k.figures.fill.unwrap();
        assert!(fill <= 0.4, "{fill}");
    }
    // A slot cut by the fill alone is a near miss naming it.
    assert!(
        tight
            .near_misses
            .iter()
            .any(|k| k.fails == ["search.fill".to_string()])
    );
}

#[test]
fn awg_sizes_are_searched_by_gauge() {
    let text = small_frame(60.0, 10.0, 7.0)
        .replace("conductor = \"rectangular\"", "conductor = \"awg\"")
        .replace("strip_widths_mm = [1.0, 1.25]\n", "")
        .replace("strip_heights_mm = [0.8]\n", "");
    let found = explore(&parse_frame(&text, "awg.toml").unwrap());
    assert!(!found.fits.is_empty());
    for k in &found.fits {
        assert!(
            matches!(k.conductor, ConductorShape::Round { awg: Some(_), .. }),
            "{:?}",
            k.conductor
        );
    }
}

#[test]
fn csv_lists_every_fit_and_a_missing_pick_exits_2() {
    let dir = scratch("csv");
    let csv = dir.join("fits.csv");
    let o = armsheet(&[
        "explore",
        "designs/frames/hoist-frame.toml",
        "--csv",
        csv.to_str().unwrap(),
        "--json",
    ]);
    assert_eq!(o.status.code(), Some(0));
    let rows = std::fs::read_to_string(&csv).unwrap();
    assert!(rows.starts_with("rank,type,slots,multiplicity,direction,coils_per_slot,segments,dummy_coils,span,turns,conductor,on_front,reactance_v,copper_loss_w"));
    let n = serde_json::from_slice::<serde_json::Value>(&o.stdout).unwrap();
    let total = armsheet(&[
        "explore",
        "designs/frames/hoist-frame.toml",
        "--json",
        "--top",
        "100000",
    ]);
    let all: serde_json::Value = serde_json::from_slice(&total.stdout).unwrap();
    assert_eq!(
        rows.lines().count() - 1,
        all["candidates"].as_array().unwrap().len()
    );
    assert_eq!(
        n["candidates"].as_array().unwrap().len(),
        10,
        "--top defaults to 10"
    );
    let out = dir.join("never.toml");
    let e = armsheet(&[
        "explore",
        "designs/frames/hoist-frame.toml",
        "--write",
        "100000",
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(e.status.code(), Some(2));
    assert!(
        text(&e.stderr).contains("--write 100000"),
        "{}",
        text(&e.stderr)
    );
    assert!(!out.exists());
}

/// The demo designs that carry their rating and core, searched on their own frames
/// (`design::frame_of_design`: the same core, commutator, limits and rating, the demo's own
/// flux and speed): the search finds the winding the shop wound, with its turns and wire,
/// among its fits; or among the near misses, naming the one limit the search's stricter rule
/// holds against it (every rating limit, warnings too). The 12-pole mill's 26 m/s commutator
/// is above the preferred 15 m/s (a warning `check` passes); the frog-leg demo's wave
/// element is laid a slot longer than its lap element (`wave_span`), which the search does
/// not try: at the lap span its wave element would not equalize the lap's.
#[test]
fn every_rated_demo_is_found_on_its_own_frame() {
    let want: [(&str, Option<&str>); 4] = [
        ("hoist-lap", None),
        ("pump-wave", None),
        ("mill-lap-12p", Some("rating.commutator-speed-preferred")),
        ("mill-frog-leg", Some("frogleg.self-equalizing")),
    ];
    for (name, miss) in want {
        let d = crate::support::design(&crate::support::demo(name));
        let checked = armsheet::check(d.clone());
        let r = checked.rating.as_ref().unwrap();
        let e = r.emf.as_ref().unwrap();
        let rating = d.rating.as_ref().unwrap();
        let n = d.speed_rpm.or(e.speed_rpm).unwrap();
        let flux = d.flux_per_pole_mwb.or(e.flux_needed_mwb).unwrap();
        let mut frame = armsheet::design::frame_of_design(
            &d,
            rating.voltage.unwrap(),
            rating.current.unwrap(),
            n,
            flux,
        )
        .unwrap();
        frame.search.multiplicity_max = d.multiplicity.max(2);
        let out = explore(&frame);
        let mine = |k: &&armsheet::features::explore::Candidate| {
            k.structure.kind == d.winding_type
                && k.structure.multiplicity == d.multiplicity
                && k.structure.coils_per_slot == d.coils_per_slot
                && k.structure.segments == d.segments
                && k.structure.span == d.span
                && k.turns == d.turns
                && Some(&k.conductor) == d.conductor.as_ref().map(|c| &c.shape)
        };
        match miss {
            None => assert!(
                out.fits.iter().any(|k| mine(&k)),
                "{name}: not among the fits"
            ),
            Some(id) => {
                let near = out.near_misses.iter().find(mine);
                assert_eq!(
                    near.map(|k| k.fails.clone()),
                    Some(vec![id.to_string()]),
                    "{name}"
                );
            }
        }
    }
}

/// A fit that differs from the one before only in its direction (the same winding wound
/// progressive and retrogressive, every figure equal) is listed in one line pointing back to
/// it; every other fit gets its own full lines, and the numbering still counts every fit (so
/// `--write N` writes the N-th).
#[test]
fn a_direction_twin_is_listed_in_one_line() {
    let path = format!("{ROOT}/designs/frames/hoist-frame.toml");
    let f = parse_frame(&std::fs::read_to_string(&path).unwrap(), "hoist-frame.toml").unwrap();
    let found = explore(&f);
    let shown = armsheet::render::explore::candidates_text(found.fits.iter().take(10));
    let lines: Vec<&str> = shown.lines().collect();
    let mut twins = 0;
    for (i, pair) in found.fits[..10].windows(2).enumerate() {
        let (a, b) = (&pair[0], &pair[1]);
        let mut flipped = b.structure.clone();
        flipped.direction = a.structure.direction;
        let twin = a.structure.direction != b.structure.direction
            && flipped == a.structure
            && (a.turns, &a.conductor, &a.figures) == (b.turns, &b.conductor, &b.figures);
        let head = format!("{:>3}. ", i + 2);
        let line = lines.iter().find(|l| l.starts_with(&head)).unwrap();
        if twin {
            twins += 1;
            assert_eq!(
                *line,
                format!(
                    "{head}as no. {} wound {}: every figure the same",
                    i + 1,
                    b.structure.direction.as_str()
                )
            );
        } else {
            assert!(line.contains(&format!("turns={}", b.turns)), "{line}");
        }
    }
    assert!(
        twins > 0,
        "the hoist frame's top ten hold direction twins:\n{shown}"
    );
}
