//! `armsheet test` at its edges: readings no meter gives and options outside a real range are
//! refused with a located error (exit 2); every CSV dialect a shop's tools write reads the
//! same; unhealthy readings exit 1; and `test -o` touches only its own four files.

use std::path::Path;
use std::process::Output;

use crate::support::{armsheet, files_in, names_in, scratch, text};

const DESIGN: &str = "designs/hoist-lap.toml";

/// The expected neighbouring readings of `DESIGN` as `(from, to, value)`, from `test -o`'s
/// readings.csv.
fn expected_rows(dir: &Path) -> Vec<(String, String, String)> {
    let o = armsheet(&["test", DESIGN, "-o", dir.to_str().unwrap()]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let csv = std::fs::read_to_string(dir.join("hoist-lap").join("readings.csv")).unwrap();
    csv.lines()
        .skip(1)
        .map(|l| {
            let f: Vec<&str> = l.trim_end().split(',').collect();
            (f[0].to_string(), f[1].to_string(), f[2].to_string())
        })
        .collect()
}

fn run_with(dir: &Path, name: &str, body: &[u8], extra: &[&str]) -> Output {
    let p = dir.join(name);
    std::fs::write(&p, body).unwrap();
    let mut args = vec!["test", DESIGN, "--readings", p.to_str().unwrap()];
    args.extend_from_slice(extra);
    armsheet(&args)
}

/// A readings file: the header, then `rows` as `from,to,value`, `eol` between lines.
fn file(rows: &[(String, String, String)], eol: &str) -> String {
    let mut s = format!("from_bar,to_bar,reading{eol}");
    for (a, b, v) in rows {
        s.push_str(&format!("{a},{b},{v}{eol}"));
    }
    s
}

#[test]
fn readings_beyond_any_meter_are_refused_at_their_cell() {
    let dir = scratch("meter");
    let digits300 = "9".repeat(300);
    let tiny300 = format!("0.{}1", "0".repeat(299));
    let cases: [(&str, &str); 7] = [
        ("2e9", "3:3: \"2e9\" is above 1e9"),
        ("inf", "3:3: \"inf\" is above 1e9"),
        (
            &digits300,
            "3:3: \"999999999999999999999999...\" is above 1e9",
        ),
        ("1e-12", "3:3: \"1e-12\" is below 1e-9"),
        (
            &tiny300,
            "3:3: \"0.0000000000000000000000...\" is below 1e-9",
        ),
        ("NaN", "3:3: expected a reading"),
        ("-1", "3:3: a reading cannot be negative"),
    ];
    for (i, (cell, want)) in cases.iter().enumerate() {
        let body = format!("from_bar,to_bar,reading\n1,2,1\n2,3,{cell}\n3,4,1\n");
        let o = run_with(&dir, &format!("r{i}.csv"), body.as_bytes(), &[]);
        assert_eq!(o.status.code(), Some(2), "{cell}");
        let e = text(&o.stderr);
        assert!(e.contains(want), "{want}: {e}");
        // No number of 30 digits or more reaches the message.
        let longest = e
            .split(|c: char| !c.is_ascii_digit())
            .map(str::len)
            .max()
            .unwrap_or(0);
        assert!(longest < 30, "{e}");
        assert!(o.stdout.is_empty());
    }
}

#[test]
fn negative_zero_reads_as_zero() {
    let dir = scratch("negzero");
    let body = "from_bar,to_bar,reading\n1,2,0.01\n2,3,-0\n3,4,0.01\n";
    let o = run_with(&dir, "z.csv", body.as_bytes(), &[]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    let report = text(&o.stdout);
    let row = report
        .lines()
        .find(|l| l.split_whitespace().take(2).eq(["2", "3"]) && l.split_whitespace().count() == 4)
        .unwrap_or_else(|| panic!("{report}"));
    // The measured column in fixed places, as zero.
    assert_eq!(row.split_whitespace().last(), Some("0.0000000"), "{row}");
    assert!(!report.contains(" -0"), "{report}");
}

#[test]
fn options_outside_a_real_range_are_refused() {
    let cases = [
        (
            ["--current", "0.001"],
            "a drop-test current in A from 0.01 to 1000",
        ),
        (
            ["--current", "2000"],
            "a drop-test current in A from 0.01 to 1000",
        ),
        (["--current", "NaN"], "a drop-test current"),
        (
            ["--temperature", "-60"],
            "a winding temperature in C from -50 to 250",
        ),
        (
            ["--temperature", "251"],
            "a winding temperature in C from -50 to 250",
        ),
        (["--temperature", "inf"], "a winding temperature"),
        (
            ["--tolerance", "0"],
            "a tolerance in % above 0 and at most 100",
        ),
        (
            ["--tolerance", "100.5"],
            "a tolerance in % above 0 and at most 100",
        ),
        (
            ["--tolerance", "-5"],
            "a tolerance in % above 0 and at most 100",
        ),
        (
            ["--current", "-0"],
            "a drop-test current in A from 0.01 to 1000",
        ),
    ];
    for (args, want) in cases {
        let mut all = vec!["test", DESIGN];
        all.extend_from_slice(&args);
        let o = armsheet(&all);
        assert_eq!(o.status.code(), Some(2), "{args:?}");
        assert!(
            text(&o.stderr).contains(want),
            "{args:?}: {}",
            text(&o.stderr)
        );
        assert!(o.stdout.is_empty());
    }
    // The ends of each range are taken, and -0 C is 0 C.
    for args in [
        ["--current", "0.01"],
        ["--current", "1000"],
        ["--temperature", "-50"],
        ["--temperature", "250"],
        ["--tolerance", "100"],
    ] {
        let mut all = vec!["test", DESIGN];
        all.extend_from_slice(&args);
        let o = armsheet(&all);
        assert!(o.status.success(), "{args:?}: {}", text(&o.stderr));
    }
    let o = armsheet(&["test", DESIGN, "--temperature", "-0", "--json"]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["temperature_c"].to_string(), "0.0");
}

#[test]
fn a_readings_file_not_utf8_is_refused_at_its_byte() {
    let dir = scratch("utf8");
    let o = run_with(
        &dir,
        "latin1.csv",
        b"from_bar,to_bar,reading\n1,2,1\n2,3,1\xb5\n3,4,1\n",
        &[],
    );
    assert_eq!(o.status.code(), Some(2));
    let e = text(&o.stderr);
    assert!(
        e.contains("latin1.csv:3:3: byte 0xb5 (character 6 of the line) is not UTF-8"),
        "{e}"
    );
    assert!(o.stdout.is_empty());
}

#[test]
fn every_csv_dialect_reads_the_same() {
    let dir = scratch("dialects");
    let rows = expected_rows(&dir.join("exp"));
    let lf = file(&rows, "\n");
    let quoted = {
        let mut s = String::from("\"from_bar\",\"to_bar\",\"reading\"\n");
        for (a, b, v) in &rows {
            s.push_str(&format!("\"{a}\",\"{b}\",\"{v}\"\n"));
        }
        s
    };
    let dialects: [(&str, Vec<u8>); 5] = [
        ("lf", lf.clone().into_bytes()),
        ("crlf", file(&rows, "\r\n").into_bytes()),
        ("bom", [b"\xef\xbb\xbf".as_slice(), lf.as_bytes()].concat()),
        ("quoted", quoted.into_bytes()),
        ("trailing-blank", format!("{lf}\n\n\r\n").into_bytes()),
    ];
    let mut first: Option<Vec<u8>> = None;
    for (name, body) in dialects {
        let o = run_with(&dir, &format!("{name}.csv"), &body, &["--json"]);
        assert_eq!(o.status.code(), Some(0), "{name}: {}", text(&o.stderr));
        let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
        assert_eq!(v["healthy"], true, "{name}");
        assert_eq!(v["readings_compared"], rows.len(), "{name}");
        match &first {
            None => first = Some(o.stdout),
            Some(f) => assert_eq!(f, &o.stdout, "{name}"),
        }
    }
}

#[test]
fn unhealthy_readings_exit_1_and_healthy_ones_0() {
    let dir = scratch("exit");
    let rows = expected_rows(&dir.join("exp"));
    let healthy = run_with(&dir, "h.csv", file(&rows, "\n").as_bytes(), &[]);
    assert_eq!(healthy.status.code(), Some(0), "{}", text(&healthy.stderr));
    let mut bad = rows.clone();
    // Coil 10 open: bars 10 and 11 read high.
    let v: f64 = bad[9].2.parse().unwrap();
    bad[9].2 = format!("{}", v * 36.0);
    let o = run_with(&dir, "u.csv", file(&bad, "\n").as_bytes(), &[]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("VERDICT: NOT HEALTHY (exit 1)"));
    let help = text(&armsheet(&["test", "--help"]).stdout);
    assert!(
        help.contains("the exit is 1 when the readings are not healthy"),
        "{help}"
    );
}

#[test]
fn test_out_and_a_sheet_set_share_a_folder() {
    let out = scratch("share");
    let dir = out.join("hoist-lap");
    let sheet = armsheet(&["sheet", DESIGN, "-o", out.to_str().unwrap()]);
    assert!(sheet.status.success(), "{}", text(&sheet.stderr));
    std::fs::write(dir.join("notes.txt"), "the customer's notes").unwrap();
    let sheets = files_in(&dir);
    let o = armsheet(&["test", DESIGN, "-o", out.to_str().unwrap()]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let after = files_in(&dir);
    let own = ["readings.csv", "readings.svg", "test.json", "test.txt"];
    for (name, bytes) in &sheets {
        assert_eq!(after.get(name), Some(bytes), "{name} changed or went");
    }
    for name in own {
        assert!(after.contains_key(name), "{name}");
    }
    assert_eq!(after.len(), sheets.len() + own.len());
    // Nothing beside the set folder: no staging folder, no temporary file.
    assert_eq!(names_in(&out), ["hoist-lap"]);
    // Again, and a sheet run after it: each keeps the other's files.
    let o = armsheet(&["test", DESIGN, "-o", out.to_str().unwrap()]);
    assert!(o.status.success());
    assert_eq!(files_in(&dir), after);
    let sheet = armsheet(&["sheet", DESIGN, "-o", out.to_str().unwrap()]);
    assert!(sheet.status.success());
    assert_eq!(files_in(&dir), after);
    assert_eq!(names_in(&out), ["hoist-lap"]);
}

#[test]
fn test_out_refuses_a_wrong_kind_before_writing_anything() {
    let out = scratch("kind");
    let dir = out.join("hoist-lap");
    std::fs::create_dir_all(dir.join("readings.svg")).unwrap();
    let o = armsheet(&["test", DESIGN, "-o", out.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2), "{}", text(&o.stderr));
    assert_eq!(names_in(&dir), ["readings.svg"]);
}

#[test]
fn the_verdict_and_the_faults_come_before_the_expected_readings() {
    let dir = scratch("first");
    let mut rows = expected_rows(&dir.join("exp"));
    // Coil 10 open, the readings in micro-ohms.
    for (i, r) in rows.iter_mut().enumerate() {
        let v: f64 = r.2.parse().unwrap();
        r.2 = format!("{}", v * 1e6 * if i == 9 { 36.0 } else { 1.0 });
    }
    let o = run_with(&dir, "u.csv", file(&rows, "\n").as_bytes(), &[]);
    assert_eq!(o.status.code(), Some(1));
    let report = text(&o.stdout);
    let at = |s: &str| {
        report
            .find(s)
            .unwrap_or_else(|| panic!("{s} missing:\n{report}"))
    };
    assert!(at("VERDICT: NOT HEALTHY") < at("1. open-coil"));
    assert!(at("1. open-coil") < at("Bar-to-bar readings, neighbouring bars"));
    assert!(at("Bar-to-bar readings") < at("Measured readings against the expected"));
    // The first lines say it: within the first 12.
    let verdict_line = report.lines().position(|l| l.starts_with("VERDICT"));
    assert!(verdict_line.is_some_and(|i| i < 12), "{report}");
    // The readings were in micro-ohms: the report says so from the fitted scale.
    assert!(
        report.contains("readings as given: uOhm (the fitted scale is 1000000 per ohm)")
            || report.contains("readings as given: uOhm (the fitted scale is 999"),
        "{report}"
    );
}

#[test]
fn readings_are_written_in_one_prefixed_unit_per_table() {
    // The hoist's coils are a few milliohms: the table is in mOhm, every row with four places.
    let report = text(&armsheet(&["test", DESIGN]).stdout);
    assert!(
        report.contains("Bar-to-bar readings, neighbouring bars (mOhm)"),
        "{report}"
    );
    let json: serde_json::Value =
        serde_json::from_slice(&armsheet(&["test", DESIGN, "--json"]).stdout).unwrap();
    let first = json["readings"][0]["expected"].as_f64().unwrap();
    assert!((0.001..1.0).contains(&first), "{first} ohm");
    let rows: Vec<&str> = report
        .lines()
        .skip_while(|l| !l.contains("expected mOhm"))
        .skip(1)
        .take_while(|l| !l.trim().is_empty())
        .collect();
    assert_eq!(rows.len(), json["readings"].as_array().unwrap().len());
    for r in &rows {
        let v = r.split_whitespace().last().unwrap();
        let places = v.split('.').nth(1).map_or(0, str::len);
        assert_eq!(places, 4, "{r}");
    }
    let shown: f64 = rows[0].split_whitespace().last().unwrap().parse().unwrap();
    assert!(
        (shown - first * 1000.0).abs() < 1e-3,
        "{shown} mOhm, {first} ohm"
    );
    // The drop test in mV: 10 A through milliohms.
    assert!(report.contains("Drop test (expected mV between the bars of each pair)"));
}

#[test]
fn drop_test_pairs_joined_through_a_feed_bar_are_flagged_with_why() {
    // A simplex wave: its neighbouring bars are joined through P/2 coils round the
    // commutator; the run between two of them passes each feed bar.
    let o = armsheet(&["test", "designs/pump-wave.toml", "--json"]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let feed = &v["drop_test"]["feeds"][0];
    let (a, b) = (
        feed["from_bar"].as_u64().unwrap(),
        feed["to_bar"].as_u64().unwrap(),
    );
    let rows = feed["readings"].as_array().unwrap();
    let mut values: Vec<f64> = rows.iter().filter_map(|r| r["expected"].as_f64()).collect();
    values.sort_by(f64::total_cmp);
    let median = values[values.len() / 2];
    let flagged: Vec<&serde_json::Value> = rows
        .iter()
        .filter(|r| !r["through_feed_bar"].is_null())
        .collect();
    assert_eq!(flagged.len(), 2, "one pair through each feed bar");
    for r in &flagged {
        let f = r["through_feed_bar"].as_u64().unwrap();
        assert!(f == a || f == b);
        // derived: the run from one bar of the pair to the other rises to the feed bar and
        // falls from it, so the pair reads a small part of the others.
        assert!(r["expected"].as_f64().unwrap() < 0.1 * median, "{r}");
    }
    // Every pair not flagged reads within 10 % of the median (derived: the rest of the ring
    // carries the current one way).
    for r in rows.iter().filter(|r| r["through_feed_bar"].is_null()) {
        let e = r["expected"].as_f64().unwrap();
        assert!((e - median).abs() <= 0.1 * median, "{r}");
    }
    let report = text(&armsheet(&["test", "designs/pump-wave.toml"]).stdout);
    assert_eq!(report.matches("* through feed bar").count(), 2, "{report}");
    assert!(
        report.contains("so their drops oppose") && report.contains("Do not take them for shorts"),
        "{report}"
    );
    // A simplex lap: neighbours share one coil, nothing is flagged.
    let lap: serde_json::Value =
        serde_json::from_slice(&armsheet(&["test", DESIGN, "--json"]).stdout).unwrap();
    assert!(
        lap["drop_test"]["feeds"][0]["readings"]
            .as_array()
            .unwrap()
            .iter()
            .all(|r| r["through_feed_bar"].is_null())
    );
}

#[test]
fn the_plot_has_a_scale_numbered_suspects_the_verdict_and_the_units() {
    let dir = scratch("plot");
    let mut rows = expected_rows(&dir.join("exp"));
    for (i, r) in rows.iter_mut().enumerate() {
        let v: f64 = r.2.parse().unwrap();
        r.2 = format!("{}", v * 1e6 * if i == 9 { 36.0 } else { 1.0 });
    }
    let m = dir.join("m.csv");
    std::fs::write(&m, file(&rows, "\n")).unwrap();
    let out = dir.join("out");
    let o = armsheet(&[
        "test",
        DESIGN,
        "--readings",
        m.to_str().unwrap(),
        "-o",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(1));
    let svg = std::fs::read_to_string(out.join("hoist-lap").join("readings.svg")).unwrap();
    let texts: Vec<String> = svg
        .split("<text")
        .skip(1)
        .filter_map(|t| Some(t.split_once('>')?.1.split_once("</text>")?.0.to_string()))
        .collect();
    let has = |s: &str| texts.iter().any(|t| t == s);
    // The scale: zero at the inner circle and four rings in mΩ, the outer at twice the largest
    // expected reading (10.7391 mΩ on the hoist, all neighbouring readings equal).
    assert!(has("0"), "{texts:?}");
    for v in ["5.3695", "10.7391", "16.1086", "21.4782"] {
        assert!(has(&format!("{v} m\u{3a9}")), "{v}: {texts:?}");
    }
    // The suspect bars 10 and 11, neighbours, numbered once as a run inside their dots.
    assert!(has("10-11"), "{texts:?}");
    assert!(has("Verdict: NOT HEALTHY"));
    assert!(has("suspect bars 10, 11"));
    assert!(has("best fit: open-coil at bars 10, 11"));
    assert!(
        texts.iter().any(|t| t.starts_with("readings in m\u{3a9}")),
        "{texts:?}"
    );
    assert!(
        texts
            .iter()
            .any(|t| t.starts_with("measured readings as given: \u{b5}\u{3a9}")),
        "{texts:?}"
    );
}
