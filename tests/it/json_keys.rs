//! Every JSON armsheet prints has the keys of every object sorted, whichever command wrote it
//! (`check`, `test` with and without readings, `identify`, `explore`, `archive`), so the same
//! input gives the same bytes and a reader finds a key where it expects it.

use crate::support::{self, armsheet, scratch, text};

/// The first object of the command's JSON whose keys are printed out of order, read from the
/// printed text (a parsed value would sort them itself).
fn keys_in_print_order(args: &[&str]) -> Option<String> {
    let o = armsheet(args);
    assert!(
        matches!(o.status.code(), Some(0 | 1)),
        "{args:?}: {}",
        text(&o.stderr)
    );
    let raw = text(&o.stdout);
    // Rebuild each object's key order from the printed text: a key is a line `"name": …` at
    // one indent, an object opens with `{` at the end of a line.
    let mut stack: Vec<(usize, Vec<String>)> = Vec::new();
    for line in raw.lines() {
        let indent = line.len() - line.trim_start().len();
        let t = line.trim_start();
        while stack.last().is_some_and(|(i, _)| *i > indent) {
            let (_, keys) = stack.pop().unwrap();
            let mut sorted = keys.clone();
            sorted.sort();
            if keys != sorted {
                return Some(format!("{args:?}: {keys:?}"));
            }
        }
        if let Some(rest) = t.strip_prefix('"')
            && let Some((k, _)) = rest.split_once("\": ")
        {
            match stack.last_mut() {
                Some((i, keys)) if *i == indent => keys.push(k.to_string()),
                _ => stack.push((indent, vec![k.to_string()])),
            }
        }
    }
    // The whole output is one JSON value.
    assert!(
        serde_json::from_str::<serde_json::Value>(&raw).is_ok(),
        "{args:?}"
    );
    None
}

#[test]
fn every_commands_json_has_its_keys_sorted() {
    let dir = scratch("json-keys");
    let hoist = support::demo_path("hoist-lap");
    // Readings: the expected ones, one pair raised (a fault to locate).
    let o = armsheet(&["test", &hoist, "-o", dir.to_str().unwrap()]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let filled: String = std::fs::read_to_string(dir.join("hoist-lap").join("readings.csv"))
        .unwrap()
        .lines()
        .enumerate()
        .map(|(i, l)| {
            if i == 0 {
                return "from_bar,to_bar,reading".to_string();
            }
            let f: Vec<&str> = l.trim_end().split(',').collect();
            let v: f64 = f[2].parse().unwrap();
            format!("{},{},{}", f[0], f[1], if i == 10 { v * 1.5 } else { v })
        })
        .collect::<Vec<_>>()
        .join("\n");
    let readings = dir.join("r.csv");
    std::fs::write(&readings, filled).unwrap();
    let db = dir.join("a.sqlite");
    let db = db.to_str().unwrap();
    assert!(
        armsheet(&["archive", "add", &hoist, "--archive", db])
            .status
            .success()
    );
    let runs: Vec<Vec<&str>> = vec![
        vec!["check", &hoist, "--json"],
        vec!["test", &hoist, "--json"],
        vec![
            "test",
            &hoist,
            "--json",
            "--readings",
            readings.to_str().unwrap(),
        ],
        vec!["identify", "designs/cards/sawmill-card.toml", "--json"],
        vec!["explore", "designs/frames/hoist-frame.toml", "--json"],
        vec![
            "archive",
            "find",
            "--design",
            &hoist,
            "--json",
            "--archive",
            db,
        ],
        vec!["archive", "show", "CW-2611", "--json", "--archive", db],
    ];
    for args in &runs {
        assert_eq!(keys_in_print_order(args), None, "{args:?}");
    }
}
