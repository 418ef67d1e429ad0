//! `check` is the judge: every output of a design `check` refuses says so, in the sheets' own
//! words ([`NOT_FOR_WINDING`] and the failed checks), and the exit is 1. `test` (text, JSON,
//! `-o` files) and `draw` as `sheet`; healthy readings do not hide the refusal.

use std::path::{Path, PathBuf};

use armsheet::checks::NOT_FOR_WINDING;

use crate::support::{armsheet, demo, scratch, text};

/// The rule the refused design fails: the hoist demo with a segment-voltage limit it exceeds.
const FAILED: &str = "rating.segment-volts-average";

/// Writes the refused design (`fail.toml`) and the passing demo (`pass.toml`) into `dir`.
fn designs(dir: &Path) -> (PathBuf, PathBuf) {
    let hoist = demo("hoist-lap");
    let fail = dir.join("fail.toml");
    std::fs::write(
        &fail,
        format!("{hoist}\n[limits]\nsegment_volts_avg_max = 5\n"),
    )
    .unwrap();
    let pass = dir.join("pass.toml");
    std::fs::write(&pass, hoist).unwrap();
    (fail, pass)
}

fn s(p: &Path) -> &str {
    p.to_str().unwrap()
}

/// The refusal as a text output says it: the band's lead, the exit and the failed rule's id.
fn says_refused(out: &str) -> bool {
    out.contains(&format!("{NOT_FOR_WINDING} (exit 1): {FAILED}: "))
}

#[test]
fn the_refused_design_fails_check_and_the_demo_passes() {
    let dir = scratch("check");
    let (fail, pass) = designs(&dir);
    let o = armsheet(&["check", s(&fail)]);
    assert_eq!(o.status.code(), Some(1));
    assert!(text(&o.stdout).contains(&format!("[FAIL] {FAILED}")));
    assert_eq!(armsheet(&["check", s(&pass)]).status.code(), Some(0));
}

#[test]
fn test_text_and_json_say_check_refuses_the_design() {
    let dir = scratch("test");
    let (fail, pass) = designs(&dir);
    let o = armsheet(&["test", s(&fail)]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    let out = text(&o.stdout);
    assert!(says_refused(&out), "{out}");
    // Said first, before any reading.
    assert!(out.find(NOT_FOR_WINDING) < out.find("Bar-to-bar"), "{out}");

    let o = armsheet(&["test", s(&fail), "--json"]);
    assert_eq!(o.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let n = &v["not_for_winding"];
    assert_eq!(n["exit"], 1, "{v}");
    assert_eq!(n["says"], NOT_FOR_WINDING);
    let failed = n["failed_checks"].as_array().unwrap();
    assert_eq!(failed.len(), 1, "{failed:?}");
    assert!(
        failed[0]
            .as_str()
            .unwrap()
            .starts_with(&format!("{FAILED}: "))
    );

    // The passing design says nothing of the kind.
    let o = armsheet(&["test", s(&pass)]);
    assert_eq!(o.status.code(), Some(0));
    assert!(!text(&o.stdout).contains(NOT_FOR_WINDING));
    let o = armsheet(&["test", s(&pass), "--json"]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(v.get("not_for_winding").is_none(), "{v}");
}

#[test]
fn healthy_readings_on_a_refused_design_say_why_the_exit_is_1() {
    let dir = scratch("healthy");
    let (fail, _) = designs(&dir);
    let out = dir.join("o");
    assert_eq!(
        armsheet(&["test", s(&fail), "-o", s(&out)]).status.code(),
        Some(1)
    );
    // The expected readings as measured ones: healthy.
    let csv = std::fs::read_to_string(out.join("fail").join("readings.csv")).unwrap();
    let mut readings = String::from("from_bar,to_bar,reading\n");
    for l in csv.lines().skip(1) {
        let f: Vec<&str> = l.trim_end().split(',').collect();
        readings.push_str(&format!("{},{},{}\n", f[0], f[1], f[2]));
    }
    let r = dir.join("ok.csv");
    std::fs::write(&r, readings).unwrap();
    let o = armsheet(&["test", s(&fail), "--readings", s(&r)]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    let t = text(&o.stdout);
    assert!(t.contains("VERDICT: HEALTHY"), "{t}");
    assert!(says_refused(&t), "{t}");
    assert!(
        t.contains("the exit is 1 all the same: check refuses the design"),
        "{t}"
    );
    assert!(t.find(NOT_FOR_WINDING) < t.find("VERDICT"), "{t}");
    let o = armsheet(&["test", s(&fail), "--readings", s(&r), "--json"]);
    assert_eq!(o.status.code(), Some(1));
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["healthy"], true, "{v}");
    assert_eq!(v["not_for_winding"]["exit"], 1, "{v}");
}

#[test]
fn the_files_test_o_writes_say_it() {
    let dir = scratch("files");
    let (fail, pass) = designs(&dir);
    let out = dir.join("o");
    let o = armsheet(&["test", s(&fail), "-o", s(&out)]);
    assert_eq!(o.status.code(), Some(1));
    let read = |stem: &str, name: &str| std::fs::read_to_string(out.join(stem).join(name)).unwrap();
    assert!(says_refused(&read("fail", "test.txt")));
    let v: serde_json::Value = serde_json::from_str(&read("fail", "test.json")).unwrap();
    assert_eq!(v["not_for_winding"]["says"], NOT_FOR_WINDING);
    let plot = read("fail", "readings.svg");
    assert!(plot.contains(NOT_FOR_WINDING), "no band on the plot");
    assert!(plot.contains(FAILED));
    assert_eq!(
        armsheet(&["test", s(&pass), "-o", s(&out)]).status.code(),
        Some(0)
    );
    for name in ["test.txt", "test.json", "readings.svg"] {
        assert!(!read("pass", name).contains(NOT_FOR_WINDING), "{name}");
    }
}

#[test]
fn draw_says_it_and_marks_its_page_as_sheet_does() {
    let dir = scratch("draw");
    let (fail, pass) = designs(&dir);
    let svg = dir.join("fd.svg");
    let o = armsheet(&["draw", s(&fail), "-o", s(&svg)]);
    assert_eq!(o.status.code(), Some(1));
    assert!(says_refused(&text(&o.stdout)), "{}", text(&o.stdout));
    let page = std::fs::read_to_string(&svg).unwrap();
    assert!(page.contains(NOT_FOR_WINDING), "no band on the page");
    assert!(page.contains(FAILED));
    // The sheet set carries the same band, and `sheet` says the same on standard output.
    let o = armsheet(&["sheet", s(&fail), "-o", s(&dir.join("set"))]);
    assert_eq!(o.status.code(), Some(1));
    assert!(says_refused(&text(&o.stdout)), "{}", text(&o.stdout));
    let sheet1 = std::fs::read_to_string(dir.join("set").join("fail").join("sheet-1.svg")).unwrap();
    assert!(sheet1.contains(NOT_FOR_WINDING));

    let ok = dir.join("ok.svg");
    let o = armsheet(&["draw", s(&pass), "-o", s(&ok)]);
    assert_eq!(o.status.code(), Some(0));
    assert!(!text(&o.stdout).contains(NOT_FOR_WINDING));
    assert!(
        !std::fs::read_to_string(&ok)
            .unwrap()
            .contains(NOT_FOR_WINDING)
    );
    let o = armsheet(&["sheet", s(&pass), "-o", s(&dir.join("set"))]);
    assert_eq!(o.status.code(), Some(0));
    assert!(!text(&o.stdout).contains(NOT_FOR_WINDING));
}
