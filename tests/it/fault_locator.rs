//! The fault locator: the published fault signatures, the readings file's located errors,
//! and a round trip over random designs (inject one fault, re-solve the faulty network from
//! scratch, add 1 % noise, and ask the locator).

use crate::support;

use crate::support::random_design::{OFF, Space, designs, one_coil_a_slot as toml};
use crate::support::{armsheet, scratch, text};
use armsheet::check;
use armsheet::features::armature_test::{
    ArmatureTest, FaultKind, NetCoil, Network, TestOptions, armature_test, locator::crossed_leads,
};
use armsheet::winding::EqualizerPlan;
use proptest::prelude::*;

/// An injected fault.
#[derive(Clone, Copy, Debug)]
enum Inject {
    Open(usize),
    Short(usize, f64),
    Joint(usize, f64),
    Bars(u32, f64),
    Crossed(u32),
}

/// The readings of the faulty armature, solved from scratch, as a readings file; `None` when
/// the fault cannot be made at that place. Also the largest relative change it makes.
fn faulty_readings(
    text_toml: &str,
    inject: Inject,
    noise: &[f64],
) -> Option<(String, f64, ArmatureTest)> {
    let c = check(armsheet::design::parse_design(text_toml, "f.toml").ok()?);
    let t = armature_test(&c.design, &c.winding, &TestOptions::default(), None).unwrap();
    let healthy = Network::of_winding(&c.winding);
    let ties = match &c.winding.equalizers {
        EqualizerPlan::Possible(e) => e.groups.clone(),
        _ => Vec::new(),
    };
    let mut coils = healthy.coils.clone();
    let n = coils.len();
    match inject {
        Inject::Open(k) => {
            coils.remove(k % n);
        }
        Inject::Short(k, f) => coils[k % n].resistance = 1.0 - f,
        Inject::Joint(k, x) => coils[k % n].resistance = 1.0 + x,
        Inject::Bars(j, r) => {
            let j = j % t.bars + 1;
            coils.push(NetCoil {
                coil: 0,
                from_bar: j,
                to_bar: j % t.bars + 1,
                resistance: r,
            })
        }
        Inject::Crossed(j) => {
            let j = j % t.bars + 1;
            let moves = crossed_leads(&coils, j, j % t.bars + 1)?;
            for (i, c) in moves {
                coils[i] = c;
            }
        }
    }
    let faulty = Network::new(t.bars, coils, &ties);
    let listed: Vec<(u32, u32, Option<f64>)> = t
        .listed()
        .map(|r| (r.from_bar, r.to_bar, r.expected))
        .collect();
    let pairs: Vec<(u32, u32)> = listed.iter().map(|&(a, b, _)| (a, b)).collect();
    let values = faulty.effective(&pairs);
    let mut csv = String::from("from_bar,to_bar,reading\n");
    let mut change: f64 = 0.0;
    for (i, ((a, b, e), v)) in listed.iter().zip(&values).enumerate() {
        match (e, v) {
            (Some(e), Some(v)) => {
                change = change.max((v - e).abs() / e);
                // Milliohms of a 5 mΩ coil, with noise.
                let x = v * 5.0 * (1.0 + 0.01 * noise[i % noise.len()]);
                csv.push_str(&format!("{a},{b},{x}\n"));
            }
            (None, None) => csv.push_str(&format!("{a},{b},OL\n")),
            _ => {
                change = f64::INFINITY;
                csv.push_str(&format!(
                    "{a},{b},{}\n",
                    v.map_or("open".into(), |v| v.to_string())
                ));
            }
        }
    }
    Some((csv, change, t))
}

fn locate(text_toml: &str, csv: &str) -> ArmatureTest {
    let c = check(armsheet::design::parse_design(text_toml, "f.toml").unwrap());
    armature_test(&c.design, &c.winding, &TestOptions::default(), Some(csv)).unwrap()
}

fn off_readings(t: &ArmatureTest) -> Vec<(u32, f64)> {
    let l = t.location.as_ref().unwrap();
    l.measured
        .iter()
        .filter_map(|(r, m)| match m {
            armsheet::features::armature_test::ReadingValue::Value(v) => {
                let e = r.expected.unwrap() * l.healthy_scale;
                ((v - e).abs() > l.tolerance * e).then_some((r.from_bar, v / e))
            }
            _ => None,
        })
        .collect()
}

// Signatures [src: a published trade training text on growlers and armature testers; see
// docs/domain.md, "Faults the armature tests find"]: lap, a shorted coil gives one low reading and
// an open coil one high reading.
#[test]
fn lap_signatures_one_low_or_one_high_reading() {
    let design = toml(4, 36, "lap", 1, 9, "");
    let (csv, _, _) = faulty_readings(&design, Inject::Short(9, 0.95), &[0.0]).unwrap();
    let t = locate(&design, &csv);
    let off = off_readings(&t);
    assert_eq!(off.len(), 1, "{off:?}");
    assert!(off[0].1 < 1.0);
    let f = &t.location.as_ref().unwrap().faults[0];
    assert!(f.bars == [10, 11], "{f:?}");

    let (csv, _, _) = faulty_readings(&design, Inject::Open(9), &[0.0]).unwrap();
    let t = locate(&design, &csv);
    let off = off_readings(&t);
    assert_eq!(off.len(), 1, "{off:?}");
    assert!(off[0].1 > 1.0);
    let f = &t.location.as_ref().unwrap().faults[0];
    assert_eq!(
        (f.kind, f.coils.as_slice()),
        (FaultKind::OpenCoil, &[10][..])
    );
}

// Signatures [src: the same training text]: wave, each fault shows as P/2 readings, about one
// pole pair apart.
#[test]
fn wave_signatures_p_over_2_readings_a_pole_pair_apart() {
    for (poles, slots) in [(4, 25), (6, 35), (8, 33)] {
        let design = toml(poles, slots, "wave", 1, slots / poles, "");
        for inject in [Inject::Open(7), Inject::Short(7, 1.0 - 1e-9)] {
            let (csv, _, t0) = faulty_readings(&design, inject, &[0.0]).unwrap();
            let t = locate(&design, &csv);
            let off = off_readings(&t);
            let p = poles / 2;
            assert_eq!(off.len() as u32, p, "{poles}p {slots} {inject:?}: {off:?}");
            let pair = f64::from(t0.bars) / f64::from(p);
            let bars: Vec<u32> = off.iter().map(|o| o.0).collect();
            for w in bars.windows(2) {
                assert!(
                    (f64::from(w[1] - w[0]) - pair).abs() <= 2.0,
                    "{bars:?} pair {pair}"
                );
            }
        }
    }
}

#[test]
fn readings_file_errors_are_located() {
    let dir = scratch("bad");
    let cases = [
        (
            "from_bar,to_bar,reading\n1,2,1\n2,3,abc\n3,4,1\n",
            "3:3: expected a reading",
        ),
        (
            "from_bar,to_bar,reading\n1,2,1\n2,3,1\n99,100,1\n",
            "4:1: bar 99 is out of range",
        ),
        (
            "from_bar,to_bar,reading\n1,2,1\n2,3,1\n2,1,1\n",
            "4:1: bars 2 and 1 are read twice",
        ),
        (
            "from_bar,to_bar,reading\n1,2,1\n2,3,1\n1,5,1\n",
            "4:1: bars 1 and 5 are not a pair",
        ),
        (
            "from_bar,to_bar,reading\n1,2,1\n2,3,1\n",
            "3:1: 2 readings in the `reading` column: the locator needs at least 3",
        ),
    ];
    for (i, (body, want)) in cases.iter().enumerate() {
        let p = dir.join(format!("r{i}.csv"));
        std::fs::write(&p, body).unwrap();
        let o = armsheet(&[
            "test",
            "designs/hoist-lap.toml",
            "--readings",
            p.to_str().unwrap(),
        ]);
        assert_eq!(o.status.code(), Some(2));
        let e = text(&o.stderr);
        assert!(e.contains(want), "{want}: {e}");
    }
    // A value that carries a terminal escape is shown escaped.
    let p = dir.join("esc.csv");
    std::fs::write(&p, "from_bar,to_bar,reading\n1,2,\u{1b}[31mred\n").unwrap();
    let o = armsheet(&[
        "test",
        "designs/hoist-lap.toml",
        "--readings",
        p.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        !o.stderr.contains(&0x1b) && text(&o.stderr).contains("\\u{1b}[31mred"),
        "{}",
        text(&o.stderr)
    );
    // open, OL, 0 and a missing pair are all fine.
    let p = dir.join("ok.csv");
    std::fs::write(
        &p,
        "from_bar,to_bar,reading\n1,2,open\n2,3,OL\n3,4,0\n4,5,10.8\n5,6,\n",
    )
    .unwrap();
    let o = armsheet(&[
        "test",
        "designs/hoist-lap.toml",
        "--readings",
        p.to_str().unwrap(),
        "--json",
    ]);
    // Not healthy: exit 1, the report still written.
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["readings_compared"], 4);
    assert_eq!(v["missing_pairs"], 32);
    assert_eq!(v["healthy"], false);
}

fn injection() -> impl Strategy<Value = Inject> {
    prop_oneof![
        any::<usize>().prop_map(Inject::Open),
        (any::<usize>(), 0.3f64..0.95).prop_map(|(k, f)| Inject::Short(k, f)),
        (any::<usize>(), 0.5f64..5.0).prop_map(|(k, x)| Inject::Joint(k, x)),
        (any::<u32>(), 0.05f64..2.0).prop_map(|(j, r)| Inject::Bars(j, r)),
        any::<u32>().prop_map(Inject::Crossed),
    ]
}

fn names(
    kind: FaultKind,
    inject: Inject,
    t: &ArmatureTest,
    f: &armsheet::features::armature_test::Fault,
) -> bool {
    let net = &t.network;
    let n = net.coils.len();
    let coil = |k: usize| net.coils[k % n];
    let bar = |j: u32| j % t.bars + 1;
    match inject {
        Inject::Open(k) => kind == FaultKind::OpenCoil && f.coils == [coil(k).coil],
        Inject::Short(k, _) => kind == FaultKind::ShortedCoil && f.coils == [coil(k).coil],
        Inject::Joint(k, _) => kind == FaultKind::HighResistanceJoint && f.coils == [coil(k).coil],
        Inject::Bars(j, _) => {
            kind == FaultKind::ShortedBars && f.bars == [bar(j), bar(j) % t.bars + 1]
        }
        Inject::Crossed(j) => {
            kind == FaultKind::CrossedLeads && f.bars == [bar(j), bar(j) % t.bars + 1]
        }
    }
}

proptest! {
    #![proptest_config(support::properties(500))]

    #[test]
    fn the_locator_names_the_injected_fault(
        c in designs(Space {
            pole_pairs: 1..=3,
            coils_per_slot: 1..=1,
            multiplicity: 1..=1,
            retrogressive: OFF,
            ccw: OFF,
            generator: OFF,
            span_delta: 0..=0,
            lead_offset: 0..=0,
            room: 3,
            more_slots: 20,
            ..Space::default()
        }),
        eq in any::<bool>(),
        inject in injection(),
        noise in proptest::collection::vec(-1.0f64..1.0, 16),
    ) {
        let eq = if eq && !c.wave { "equalizers = \"full\"" } else { "" };
        let design = c.toml_with(&format!("{eq}\n"));
        prop_assume!(armsheet::design::parse_design(&design, "f.toml").is_ok(), "refused: {}", design);
        let made = faulty_readings(&design, inject, &noise);
        // A pair of leads that cannot be crossed at that place: nothing to inject.
        prop_assume!(made.is_some(), "no such fault: {:?}", inject);
        let (csv, change, _) = made.unwrap();
        let t = locate(&design, &csv);
        let l = t.location.as_ref().unwrap();
        if change < 1e-9 {
            // A fault that changes nothing is said to be invisible.
            prop_assert!(!l.invisible.is_empty() || l.healthy, "{design}{inject:?}");
        }
        // Below three times the noise the test cannot see the fault: nothing more to assert.
        if change >= 0.03 {
            prop_assert!(!l.healthy, "{design}{inject:?}: healthy");
            let top = &l.faults[0];
            // The top hypothesis names the fault, or the injected one ties with it (faults
            // that read alike, such as a shorted lap coil and a track across its two bars).
            let injected = l.faults.iter().find(|f| names(f.kind, inject, &t, f));
            let ok = names(top.kind, inject, &t, top)
                || injected.is_some_and(|f| f.score <= top.score * (1.0 + 1e-6) + 1e-9);
            prop_assert!(ok, "{design}{inject:?}\ntop {top:?}\ninjected {injected:?}");
        }
    }
}

#[test]
fn the_plot_shows_expected_and_measured_and_marks_the_suspect_bars() {
    let design = "designs/hoist-lap.toml";
    let dir = scratch("plot");
    let healthy = armsheet(&["test", design, "-o", dir.to_str().unwrap()]);
    assert!(healthy.status.success(), "{}", text(&healthy.stderr));
    let svg = std::fs::read_to_string(dir.join("hoist-lap").join("readings.svg")).unwrap();
    assert!(svg.contains("conn k1") && !svg.contains("conn k2"));
    // Coil 10 open: bars 10 and 11 read high.
    let csv = std::fs::read_to_string(dir.join("hoist-lap").join("readings.csv")).unwrap();
    let mut measured = String::from("from_bar,to_bar,reading\n");
    for line in csv.lines().skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let v: f64 = f[2].parse().unwrap();
        let v = if f[0] == "10" { v * 36.0 } else { v };
        measured.push_str(&format!("{},{},{}\n", f[0], f[1], v * 1e6));
    }
    let m = dir.join("m.csv");
    std::fs::write(&m, measured).unwrap();
    let out = dir.join("with");
    let o = armsheet(&[
        "test",
        design,
        "--readings",
        m.to_str().unwrap(),
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    let svg = std::fs::read_to_string(out.join("hoist-lap").join("readings.svg")).unwrap();
    assert!(svg.contains("conn k2"));
    assert_eq!(
        svg.matches("class=\"f2\"").count(),
        3,
        "two suspect bars and the legend's mark"
    );
    let report = std::fs::read_to_string(out.join("hoist-lap").join("test.txt")).unwrap();
    assert!(report.contains("1. open-coil"), "{report}");
    assert!(report.contains("slots 10, 18"), "{report}");
    // The readings were given in micro-ohms: the fitted scale says so.
    let json = std::fs::read_to_string(out.join("hoist-lap").join("test.json")).unwrap();
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert!(
        (v["scale"].as_f64().unwrap() - 1e6).abs() < 10.0,
        "{}",
        v["scale"]
    );
    assert_eq!(v["healthy"], false);
    assert_eq!(v["faults"][0]["kind"], "open-coil");
    assert_eq!(v["faults"][0]["coils"][0], 10);
}
