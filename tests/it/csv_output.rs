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
