//! Inch units (issue 22, section 5): a design may give every length by the inch twin of its
//! `_mm` key; the same armature written in mm and in inches gives the same winding, rating
//! and checks (a property over random armatures with random core, conductor and commutator
//! lengths, and over every demo); reports print the design's units, the JSON stays SI and
//! names the units; `rewind` and `identify` write the units they were given. The refusals
//! (mixed systems, inch values out of range) are in `tests/broken/` and `tests/broken_cards/`.
//!
//! The conversion is exact by definition: 1 in = 25.4 mm (the 1959 international inch)
//! [standard].

use crate::support::random_design::{Space, designs};
use crate::support::{self, armsheet, demo, scratch, text};
use armsheet::base::Units;
use armsheet::check;
use armsheet::design::parse_design;
use armsheet::render::json::report_json;
use armsheet::render::text::{TextOptions, render_text};
use proptest::prelude::*;
use serde_json::Value;

/// `toml` with every `_mm` key outside `[limits]` written as its `_in` twin, the value
/// divided by 25.4 and written with every digit (Rust's shortest round-trip form).
fn to_inches(toml: &str) -> String {
    let mut table = String::new();
    let mut out = String::new();
    for line in toml.lines() {
        let trimmed = line.trim();
        if trimmed.starts_with('[') {
            table = trimmed.to_string();
        }
        let converted = trimmed
            .split_once('=')
            .map(|(k, v)| (k.trim(), v.trim()))
            .filter(|(k, _)| k.ends_with("_mm") && table != "[limits]")
            .and_then(|(k, v)| {
                let v = v.split('#').next().unwrap_or(v).trim();
                let mm: f64 = v.parse().ok()?;
                Some(format!(
                    "{}_in = {:?}",
                    k.trim_end_matches("_mm"),
                    mm / 25.4
                ))
            });
        out.push_str(converted.as_deref().unwrap_or(line));
        out.push('\n');
    }
    out
}

/// Compares two JSON reports: the same structure, the same strings and numbers equal within
/// one step of the decimals they are rounded to (a value on a rounding boundary may round
/// either way after the conversion), `file` and `units` aside.
fn same_json(a: &Value, b: &Value, at: &str) -> Result<(), String> {
    match (a, b) {
        (Value::Number(x), Value::Number(y)) => {
            let decimals = |n: &serde_json::Number| {
                let s = n.to_string();
                s.split_once('.').map_or(0, |(_, f)| f.len() as i32)
            };
            let step = 10f64.powi(-decimals(x).max(decimals(y)));
            let (x, y) = (x.as_f64().unwrap(), y.as_f64().unwrap());
            let tol = step * 1.001 + 1e-9 * x.abs().max(y.abs());
            if (x - y).abs() <= tol {
                Ok(())
            } else {
                Err(format!("{at}: {x} (mm) vs {y} (in)"))
            }
        }
        (Value::Object(x), Value::Object(y)) => {
            let keys: Vec<_> = x.keys().collect();
            if keys != y.keys().collect::<Vec<_>>() {
                return Err(format!("{at}: keys differ"));
            }
            for k in keys {
                if at.is_empty() && (k == "file" || k == "units") {
                    continue;
                }
                same_json(&x[k], &y[k], &format!("{at}.{k}"))?;
            }
            Ok(())
        }
        (Value::Array(x), Value::Array(y)) => {
            if x.len() != y.len() {
                return Err(format!("{at}: {} vs {} items", x.len(), y.len()));
            }
            for (i, (p, q)) in x.iter().zip(y).enumerate() {
                same_json(p, q, &format!("{at}[{i}]"))?;
            }
            Ok(())
        }
        _ if a == b => Ok(()),
        _ => Err(format!("{at}: {a} vs {b}")),
    }
}

/// The JSON report of `toml`, parsed.
fn json_of(toml: &str) -> Value {
    serde_json::from_str(&report_json(&check(support::design(toml)))).unwrap()
}

/// The text report of `toml`.
fn text_of(toml: &str) -> String {
    render_text(&check(support::design(toml)), TextOptions::default())
}

#[test]
fn every_demo_in_inches_gives_the_same_winding_rating_and_checks() {
    for name in support::DEMOS {
        let mm = demo(name);
        let inches = to_inches(&mm);
        let (a, b) = (json_of(&mm), json_of(&inches));
        same_json(&a, &b, "").unwrap_or_else(|e| panic!("{name}: {e}"));
        if inches != mm {
            assert_eq!(b["units"], "in", "{name}");
            assert_eq!(a["units"], "mm", "{name}");
        }
    }
}

#[test]
fn text_differs_only_on_the_lines_that_print_a_length() {
    // The pump demo is written in inches: its mm twin prints mm where it prints inches.
    let inches = demo("pump-wave");
    assert!(inches.contains("diameter_in") && !inches.contains("_mm"));
    let mm = inches.replace("_in = ", "_mm = ");
    let mm = to_mm(&mm);
    let (a, b) = (text_of(&mm), text_of(&inches));
    let (a, b): (Vec<_>, Vec<_>) = (a.lines().collect(), b.lines().collect());
    assert_eq!(a.len(), b.len());
    let mut differing = 0;
    for (x, y) in a.iter().zip(&b) {
        if x != y {
            differing += 1;
            let metric = [" mm", "mm2", "m/s", "A/m", " m ", " kg"];
            let inch = [" in", "in2", "cmil", "ft/min", "A/in", " ft", " lb"];
            assert!(
                inch.iter().any(|u| y.contains(u)) && metric.iter().any(|u| x.contains(u)),
                "a line differs by more than its unit:\n  mm: {x}\n  in: {y}"
            );
        }
    }
    // The mean turn, segment pitch, brush width and the coil-making rows.
    assert!(differing >= 6, "{differing} lines differ");
    // 22 in given: 558.8 mm, printed in the trade's thousandths of an inch.
    assert!(
        b.iter()
            .any(|l| l.contains("mean turn L_mt        22.000 in (given)"))
    );
    assert!(
        a.iter()
            .any(|l| l.contains("mean turn L_mt        558.8 mm (given)"))
    );
}

#[test]
fn an_inch_design_reads_areas_density_and_speeds_in_the_inch_trades_units() {
    let t = text_of(&demo("pump-wave"));
    let j = json_of(&demo("pump-wave"));
    let line = |label: &str| {
        t.lines()
            .find(|l| l.trim_start().starts_with(label))
            .unwrap_or_else(|| panic!("no {label} line in\n{t}"))
            .to_string()
    };
    // AWG 12: 0.0808 in, 6530 circular mils [src: ASTM B258, the AWG table; from memory]; a
    // circular mil is the area of a circle one mil across, so the count is the diameter in
    // mils squared [definition].
    let conductor = line("conductor ");
    assert!(
        conductor.contains("AWG 12 (0.0808 in), 6530 cmil"),
        "{conductor}"
    );
    let d_mm = (j["rating"]["conductor"]["area_mm2"].as_f64().unwrap() * 4.0
        / std::f64::consts::PI)
        .sqrt();
    let cmil = (d_mm / 0.0254).powi(2);
    assert_eq!(format!("{cmil:.0}"), "6530");
    // Current density as circular mils per ampere of a conductor's current (the current per
    // path) [derived from the definition].
    let per_path = j["rating"]["currents"]["per_path_a"].as_f64().unwrap();
    let density = line("current density");
    let shown: f64 = density.split_whitespace().nth(2).unwrap().parse().unwrap();
    assert!((shown - cmil / per_path).abs() <= 1.0, "{density}");
    assert!(density.contains("cmil/A"), "{density}");
    // Commutator surface speed in feet per minute: m/s × 60 / 0.3048 [definition].
    let v = j["rating"]["commutator"]["peripheral_speed_m_s"]
        .as_f64()
        .unwrap();
    let fpm = v * 60.0 / 0.3048;
    let speed = line("commutator speed");
    let shown: f64 = speed.split_whitespace().nth(2).unwrap().parse().unwrap();
    assert!((shown - fpm).abs() <= 1.0, "{speed} against {fpm}");
    assert!(speed.contains("ft/min"), "{speed}");
    // The slot's areas in square inches.
    assert!(
        line("slot fill").contains(" in2 of "),
        "{}",
        line("slot fill")
    );
    // Sheet 1's bench rows and rating rows read the same units.
    let c = check(support::design(&demo("pump-wave")));
    let bench = armsheet::layout::sheet::rows::bench_rows(&c.design, &c.winding);
    let wire = bench.iter().find(|(k, _)| k == "wire, strands").unwrap();
    assert_eq!(wire.1, "\u{d8}0.0808 in \u{d7}1 (AWG 12)");
    let rows =
        armsheet::layout::sheet::rows::rating_sheet_rows(c.rating.as_ref().unwrap(), Units::Inches);
    assert!(
        rows.iter()
            .any(|(k, v)| k == "conductor area" && v == "6530 cmil"),
        "{rows:?}"
    );
    // The mm twin keeps mm2, A/mm2 and m/s.
    let mm = text_of(&to_mm(&demo("pump-wave").replace("_in = ", "_mm = ")));
    assert!(mm.contains("3.309 mm2") && mm.contains("A/mm2") && mm.contains(" m/s at "));
}

/// `toml` whose `_mm` values are inches, each multiplied by 25.4 (the inverse of
/// [`to_inches`] on a file whose keys were renamed).
fn to_mm(toml: &str) -> String {
    toml.lines()
        .map(|line| {
            let Some((k, v)) = line.split_once(" = ") else {
                return line.to_string();
            };
            match (k.ends_with("_mm"), v.parse::<f64>()) {
                (true, Ok(x)) => format!("{k} = {:?}", x * 25.4),
                _ => line.to_string(),
            }
        })
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn units_write_lengths_in_the_trades_precision() {
    assert_eq!(Units::Inches.length(160.02, 1), "6.300 in");
    assert_eq!(Units::Millimetres.length(160.02, 1), "160.0 mm");
    assert_eq!(Units::Inches.length(25.4 * 0.0029, 3), "0.0029 in");
    assert_eq!(Units::Inches.length(30.0, 0), "1.18 in");
    assert_eq!(Units::Inches.symbol(), "in");
}

#[test]
fn an_inch_value_is_converted_exactly() {
    let mm = support::design(
        "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 2\n[core]\ndiameter_mm = 160.02\nlength_mm = 130.175\n",
    );
    let inches = support::design(
        "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 2\n[core]\ndiameter_in = 6.3\nlength_in = 5.125\n",
    );
    let (a, b) = (mm.core.unwrap(), inches.core.unwrap());
    assert!((a.diameter_mm.unwrap() - b.diameter_mm.unwrap()).abs() < 1e-9);
    assert!((a.length_mm.unwrap() - b.length_mm.unwrap()).abs() < 1e-9);
    assert_eq!(mm.units, Units::Millimetres);
    assert_eq!(inches.units, Units::Inches);
}

#[test]
fn rewind_writes_an_inch_design_in_inches() {
    let dir = scratch("rewind");
    let out = dir.join("new.toml");
    let o = armsheet(&[
        "rewind",
        "--voltage",
        "200",
        &support::demo_path("pump-wave"),
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    let written = std::fs::read_to_string(&out).unwrap();
    assert!(written.contains("diameter_in = 6.3"), "{written}");
    assert!(written.contains("mean_turn_in = 22"), "{written}");
    let length_mm = written
        .lines()
        .filter(|l| l.contains("_mm =") && !l.starts_with("segment_pitch"))
        .count();
    assert_eq!(length_mm, 0, "{written}");
    assert_eq!(
        parse_design(&written, "new.toml").unwrap().units,
        Units::Inches
    );
}

#[test]
fn identify_writes_an_inch_card_as_an_inch_design() {
    let dir = scratch("identify");
    let card = dir.join("card.toml");
    let out = dir.join("design.toml");
    let given = std::fs::read_to_string(format!(
        "{}/designs/cards/sawmill-card.toml",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap()
    .replace("awg = 17", "diameter_in = 0.0453");
    std::fs::write(&card, given).unwrap();
    let o = armsheet(&[
        "identify",
        card.to_str().unwrap(),
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("wire 0.0453 in x 2 in hand"));
    let written = std::fs::read_to_string(&out).unwrap();
    assert!(written.contains("diameter_in = 0.0453"), "{written}");
    assert!(!written.contains("diameter_mm"), "{written}");
}

/// A random armature with lengths in every table that takes them, in mm to 0.01.
fn with_lengths() -> impl Strategy<Value = String> {
    (
        designs(Space::default()),
        50u32..=600,
        30u32..=400,
        (800u32..=3000, 300u32..=1200),
        (0u32..=3000, 0u32..=6000),
        30u32..=250,
        50u32..=90,
        prop::option::of(200u32..=4000),
    )
        .prop_map(
            |(d, dia, len, (depth, width), (ext, risers), wire, comm, mean)| {
                let base = d.toml();
                let c = check(support::design(&base)).design.segments;
                let dc = f64::from(dia * comm) / 100.0;
                // 0.9 segment pitches: the brushes of neighbouring poles never touch.
                let brush = (0.9 * std::f64::consts::PI * dc / f64::from(c) * 100.0).floor() / 100.0;
                let mean = mean.map_or(String::new(), |m| format!("mean_turn_mm = {}\n", f64::from(m) / 10.0 + f64::from(len)));
                format!(
                    "{base}\n[conductor]\ndiameter_mm = {}\n{mean}\n[core]\ndiameter_mm = {dia}\nlength_mm = {len}\nslot_depth_mm = {}\nslot_width_mm = {}\nextension_mm = {}\nriser_distance_mm = {}\n\n[commutator]\ndiameter_mm = {dc}\nbrush_width_mm = {brush}\n",
                    f64::from(wire) / 100.0,
                    f64::from(depth) / 100.0,
                    f64::from(width) / 100.0,
                    f64::from(ext) / 100.0,
                    f64::from(risers) / 100.0,
                )
            },
        )
}

proptest! {
    #![proptest_config(support::properties(64))]

    /// The same armature in mm and in inches: the same winding, rating and checks.
    #[test]
    fn mm_and_inches_give_the_same_winding_rating_and_checks(mm in with_lengths()) {
        prop_assume!(parse_design(&mm, "t.toml").is_ok());
        let inches = to_inches(&mm);
        prop_assert!(!inches.contains("_mm"), "{}", inches);
        let (a, b) = (json_of(&mm), json_of(&inches));
        if let Err(e) = same_json(&a, &b, "") {
            return Err(TestCaseError::fail(format!("{e}\n{mm}")));
        }
        prop_assert_eq!(&b["units"], "in");
    }
}

#[test]
fn limits_keep_their_own_units_in_an_inch_design() {
    let inch = "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 2\n[commutator]\ndiameter_in = 4\n";
    let kept = support::design(&format!("{inch}[limits]\nsegment_pitch_min_mm = 3.5\n"));
    assert_eq!(kept.units, Units::Inches);
    let refused = parse_design(
        &format!("{inch}[limits]\nsegment_pitch_min_in = 0.15\n"),
        "t.toml",
    )
    .unwrap_err()
    .to_string();
    assert!(
        refused.contains("unknown key `segment_pitch_min_in`"),
        "{refused}"
    );
}

/// An inch design orders its wire in feet and pounds (1 ft = 0.3048 m and 1 lb = 0.45359237 kg
/// exactly, the international yard and pound of 1959); the JSON keeps metres and kilograms.
#[test]
fn an_inch_design_orders_wire_in_feet_and_pounds() {
    let pump = demo("pump-wave");
    let text = text_of(&pump);
    let line = text
        .lines()
        .find(|l| l.contains("wire to order"))
        .expect("the pump has a coil making");
    let json = json_of(&pump);
    let k = &json["coil_making"];
    let m = k["wire_length_m_total"].as_f64().unwrap();
    let kg = k["wire_mass_kg_total"].as_f64().unwrap();
    let feet = format!("{:.1} ft", m / 0.3048);
    let pounds = format!("{:.3} lb", kg / 0.453_592_37);
    assert!(
        line.contains(&feet) && line.contains(&pounds),
        "{line} ({feet}, {pounds})"
    );
    assert!(!line.contains(" m ") && !line.contains(" kg"), "{line}");
}
