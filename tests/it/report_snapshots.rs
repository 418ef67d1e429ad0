//! Reference outputs of `check` (text and JSON) for every demo design, kept with insta.
//! A change of wording or numbers shows up as a snapshot diff to review. The largest demo's
//! JSON is kept redacted (long lists cut to their ends and a count); its lists are checked
//! whole by `largest_demo_json_lists_are_whole_and_consistent`.

use armsheet::check;
use armsheet::design::parse_design;
use armsheet::render::json::report_json;
use armsheet::render::text::{TextOptions, render_text};

use crate::support::DEMOS;
use serde_json::Value;

/// The demo whose JSON is snapshotted redacted.
const LARGEST: &str = "mill-lap-12p";

/// The demos whose JSON is snapshotted redacted: the largest, and the frog-leg demo (two
/// elements' rows; its lists are checked whole in tests/it/frog_leg.rs).
const REDACTED: [&str; 2] = [LARGEST, "mill-frog-leg"];

/// Cuts every list longer than 8 entries to its first two, a `{"…": count}` marker and its last.
fn redact(v: &mut Value) {
    match v {
        Value::Array(items) => {
            if items.len() > 8 {
                let n = items.len();
                let last = items[n - 1].clone();
                items.truncate(2);
                items.push(serde_json::json!({ "…": n - 3 }));
                items.push(last);
            }
            items.iter_mut().for_each(redact);
        }
        Value::Object(map) => map.values_mut().for_each(redact),
        _ => {}
    }
}

fn outputs(name: &str) -> (String, String) {
    let path = format!("designs/{name}.toml");
    let text = std::fs::read_to_string(format!("{}/{path}", env!("CARGO_MANIFEST_DIR"))).unwrap();
    let r = check(parse_design(&text, &path).unwrap());
    (
        render_text(
            &r,
            TextOptions {
                unicode: false,
                version: env!("CARGO_PKG_VERSION"),
            },
        ),
        report_json(&r),
    )
}

#[test]
fn demo_text_reports() {
    for name in DEMOS {
        let (text, _) = outputs(name);
        insta::assert_snapshot!(format!("text-{name}"), text);
    }
}

#[test]
fn demo_json_reports() {
    for name in DEMOS {
        let (_, json) = outputs(name);
        if REDACTED.contains(&name) {
            let mut v: Value = serde_json::from_str(&json).unwrap();
            redact(&mut v);
            let redacted = serde_json::to_string_pretty(&v).unwrap();
            insta::assert_snapshot!(format!("json-{name}-redacted"), redacted);
        } else {
            insta::assert_snapshot!(format!("json-{name}"), json);
        }
    }
}

#[test]
fn reports_are_byte_identical_on_a_second_run() {
    for name in DEMOS {
        assert_eq!(outputs(name), outputs(name), "{name}");
    }
}

/// The lists the redacted snapshot cuts, checked whole: one row per coil position in order,
/// every segment taking one start and one end lead with end − start ≡ y_c (mod C), the
/// sequence visiting every active coil once, and every active coil in a path or shorted.
#[test]
fn largest_demo_json_lists_are_whole_and_consistent() {
    let (_, json) = outputs(LARGEST);
    let v: Value = serde_json::from_str(&json).unwrap();
    let n = v["coils"].as_u64().unwrap() as usize;
    let c = v["segments"].as_i64().unwrap();
    let yc = v["commutator_pitch"].as_i64().unwrap();
    let rows = v["connections"].as_array().unwrap();
    assert_eq!(rows.len(), n);
    let (mut starts, mut ends) = (vec![0; c as usize], vec![0; c as usize]);
    for (i, r) in rows.iter().enumerate() {
        assert_eq!(r["coil"].as_u64().unwrap() as usize, i + 1);
        if r["dummy"].as_bool().unwrap() {
            continue;
        }
        let s = r["start_segment"].as_i64().unwrap();
        let e = r["end_segment"].as_i64().unwrap();
        starts[(s - 1) as usize] += 1;
        ends[(e - 1) as usize] += 1;
        assert_eq!((e - s - yc).rem_euclid(c), 0, "coil {}", i + 1);
    }
    assert!(starts.iter().chain(&ends).all(|&k| k == 1));
    let active = v["active_coils"].as_u64().unwrap() as usize;
    let seq = v["sequence"].as_array().unwrap();
    let visited: usize = seq.iter().map(|w| w.as_array().map_or(1, Vec::len)).sum();
    assert_eq!(visited, active);
    let in_paths: usize = v["paths"]
        .as_array()
        .unwrap()
        .iter()
        .map(|p| p["coils"].as_array().unwrap().len())
        .sum();
    let shorted = v["shorted_coils"].as_array().unwrap().len();
    assert_eq!(in_paths + shorted, active);
}
