//! The CSV files of a sheet set from hostile job text: the job is written once, in `job.csv`,
//! so `connections.csv` does not grow with it, and formula characters behind leading
//! whitespace or control characters are neutralised.

use crate::support;

use armsheet::render::csv::{CSV_COLUMNS, JOB_COLUMNS, connections_csv, job_csv};

/// The hoist demo with its `[job] id` set to `id` (a TOML basic string, escapes allowed).
fn hoist_with_id(id: &str) -> String {
    let text = support::demo("hoist-lap");
    let line = text
        .lines()
        .find(|l| l.starts_with("id = "))
        .expect("the demo has a job id");
    text.replace(line, &format!("id = \"{id}\""))
}

#[test]
fn a_long_job_id_does_not_grow_the_connection_table() {
    let short = armsheet::check(support::design(&hoist_with_id("J")));
    // The longest id `[job]` accepts; before job.csv it was repeated on every row.
    let long_id = "J".repeat(200);
    let long = armsheet::check(support::design(&hoist_with_id(&long_id)));
    assert_eq!(
        connections_csv(&short.winding),
        connections_csv(&long.winding)
    );
    let rows = connections_csv(&long.winding);
    assert!(!rows.contains("JJ"));
    assert_eq!(rows.lines().count(), 1 + long.winding.connections.len());
    assert_eq!(rows.lines().next().unwrap(), CSV_COLUMNS.join(","));
    // The job file holds the id once, and every record has the same fields (RFC 4180).
    let job = job_csv(&long.design);
    assert_eq!(job.matches(&long_id).count(), 1);
    assert!(job.len() < long_id.len() + 200);
    let lines: Vec<&str> = job.split("\r\n").collect();
    assert_eq!(lines.len(), 3, "{job:?}");
    assert_eq!(lines[0], JOB_COLUMNS.join(","));
    assert_eq!(lines[2], "");
    assert!(lines[1].starts_with(&format!("{long_id},")));
    assert!(lines[1].ends_with(",t.toml"), "{}", lines[1]);
}

#[test]
fn formulas_behind_blanks_and_controls_are_neutralised_in_job_csv() {
    for (toml_id, cell) in [
        (" =cmd()", "' =cmd()"),
        ("\\u00A0+1", "'\u{a0}+1"),
        ("\\t-2", "'\t-2"),
        ("\\r\\n@SUM(A1)", "\"'\r\n@SUM(A1)\""),
        ("\\u0007=x", "'\u{7}=x"),
        ("plain-text", "plain-text"),
    ] {
        let checked = armsheet::check(support::design(&hoist_with_id(toml_id)));
        let job = job_csv(&checked.design);
        let record = &job[job.find("\r\n").unwrap() + 2..];
        assert!(
            record.starts_with(&format!("{cell},")),
            "{toml_id}: {record:?}"
        );
    }
}

#[test]
fn negative_numbers_the_writer_makes_stay_numbers() {
    // The connection table's current column holds -1 for coils carrying current backwards.
    let checked = armsheet::check(support::design(&support::demo("hoist-lap")));
    let rows = connections_csv(&checked.winding);
    assert!(rows.lines().skip(1).any(|l| l.ends_with(",-1")), "{rows}");
    assert!(!rows.contains('\''));
}

#[test]
fn the_readings_file_is_rfc_4180_and_reads_back_in_any_common_form() {
    use armsheet::features::armature_test::{ReadingValue, TestOptions, expected, parse_readings};
    use armsheet::render::armature_test::readings_csv;
    let checked = armsheet::check(support::design(&support::demo("hoist-lap")));
    let t = expected(&checked.design, &checked.winding, &TestOptions::default());
    let written = readings_csv(&t);
    // Written: CRLF after every record, as every CSV armsheet writes.
    assert!(written.starts_with("from_bar,to_bar,expected,measured\r\n"));
    assert_eq!(
        written.matches("\r\n").count(),
        written.matches('\n').count()
    );
    let bars = checked.design.segments;
    let pairs: Vec<(u32, u32)> = t.readings.iter().map(|r| (r.from_bar, r.to_bar)).collect();
    // The shop fills in the measured column: read back as written (CRLF) ...
    let filled = written
        .replace(",\r\n", ",1.5\r\n")
        .replacen(",1.5\r\n", ",\r\n", 1);
    let back = parse_readings(&filled, bars, &pairs, &[]).unwrap();
    assert_eq!(
        back.values.len(),
        pairs.len() - 1,
        "the first pair left empty is missing"
    );
    // ... with LF line ends, a byte-order mark, quoted fields and blank lines alike.
    let lf = format!(
        "\u{feff}{}\n\n",
        filled.replace("\r\n", "\n").replace("1,2,", "\"1\",\"2\",")
    );
    assert_eq!(parse_readings(&lf, bars, &pairs, &[]).unwrap(), back);
    let quoted = "from_bar,to_bar,reading\n\"1\",2,\"open\"\n2,3,\" 1.5 \"\n3,4,OL\n";
    let r = parse_readings(quoted, bars, &pairs, &[]).unwrap();
    assert_eq!(r.values[&(1, 2)], ReadingValue::Open);
    assert_eq!(r.values[&(2, 3)], ReadingValue::Value(1.5));
    // Errors stay located: line and column of the field, a quoted line break counted.
    let e = parse_readings(
        "from_bar,to_bar,reading\r\n\"1\",2,\"a\nb\"\r\n",
        bars,
        &pairs,
        &[],
    )
    .unwrap_err();
    assert_eq!((e.line, e.column), (2, 3), "{e:?}");
    let e = parse_readings(
        "\u{feff}from_bar,to_bar,reading\r\n1,2,1\r\n\"x\ny\",3,1\r\n2,99,1\r\n",
        bars,
        &pairs,
        &[],
    )
    .unwrap_err();
    assert_eq!((e.line, e.column), (3, 1), "{e:?}");
    assert!(e.message.contains("expected a bar number"), "{e:?}");
}
