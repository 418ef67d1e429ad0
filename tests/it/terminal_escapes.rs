//! Hostile text in a design file never reaches the terminal raw: the text report, the
//! diagnostics and the CLI's errors show control and bidi characters as `\u{…}`
//! (`base::visible`), while the JSON report keeps the text exact.

use crate::support;

use std::path::Path;

use crate::support::{armsheet, armsheet_in, scratch, text};

/// Characters that must never reach a terminal raw.
const RAW: [char; 18] = [
    '\u{1b}', '\u{7}', '\r', '\0', '\u{9b}', '\u{7f}', '\u{61c}', '\u{200e}', '\u{200f}',
    '\u{202a}', '\u{202b}', '\u{202c}', '\u{202d}', '\u{202e}', '\u{2066}', '\u{2067}', '\u{2068}',
    '\u{2069}',
];

/// The hostile values, as TOML basic-string bodies, and the text each decodes to.
const HOSTILE: [(&str, &str); 5] = [
    // Sets the terminal title and clears the screen.
    (r"\u001b]0;x\u0007\u001b[2J", "\u{1b}]0;x\u{7}\u{1b}[2J"),
    // Rewrites the line above.
    (
        r"x\u001b[1A\u001b[2Kfake line",
        "x\u{1b}[1A\u{1b}[2Kfake line",
    ),
    // Carriage return, NUL, a C1 CSI and DEL.
    (r"a\rb\u0000c\u009b2J\u007f", "a\rb\0c\u{9b}2J\u{7f}"),
    // Bidi overrides, embeddings, isolates and marks.
    (
        r"\u202Eevil\u202A\u202B\u202C\u202D\u2066\u2067\u2068\u2069\u200E\u200F\u061C",
        "\u{202e}evil\u{202a}\u{202b}\u{202c}\u{202d}\u{2066}\u{2067}\u{2068}\u{2069}\u{200e}\u{200f}\u{61c}",
    ),
    // A newline inside a one-line field.
    (r"first\nsecond", "first\nsecond"),
];

const BODY: &str = "[armature]\npoles = 4\nslots = 24\n\n[winding]\ntype = \"lap\"\nturns = 3\n";

#[track_caller]
fn assert_no_raw(what: &str, out: &str) {
    for c in RAW {
        assert!(!out.contains(c), "{what}: raw U+{:04X} in\n{out}", c as u32);
    }
}

fn write(dir: &Path, name: &str, toml: &str) -> String {
    let path = dir.join(name);
    std::fs::write(&path, toml).unwrap();
    path.to_str().unwrap().to_string()
}

fn job_with(value: &str) -> String {
    let fields = ["id", "title", "customer", "date", "notes"]
        .map(|k| format!("{k} = \"{value}\""))
        .join("\n");
    format!("[job]\n{fields}\n\n{BODY}")
}

#[test]
fn every_job_field_is_shown_escaped_in_the_text_report() {
    let dir = scratch("terminal-escapes-report");
    for (i, (toml, _)) in HOSTILE.iter().enumerate() {
        let path = write(&dir, &format!("job-{i}.toml"), &job_with(toml));
        let out = armsheet(&["check", &path]);
        let stdout = text(&out.stdout);
        assert!(out.status.code().is_some_and(|c| c < 2), "{stdout}");
        assert_no_raw(toml, &stdout);
        for label in ["job", "title", "customer", "date", "notes"] {
            if i == 4 && label == "notes" {
                // Notes are multi-line by design: the newline starts a new line (below).
                continue;
            }
            let line = stdout
                .lines()
                .find(|l| l.starts_with(&format!("  {label:<10}")))
                .unwrap_or_else(|| panic!("no {label} line in\n{stdout}"));
            assert!(line.contains("\\u{"), "{label}: {line}");
        }
    }
    // The visible forms, one per kind of character.
    let path = write(&dir, "job-0.toml", &job_with(HOSTILE[0].0));
    let stdout = text(&armsheet(&["check", &path]).stdout);
    assert!(
        stdout.contains("  title     \\u{1b}]0;x\\u{7}\\u{1b}[2J\n"),
        "{stdout}"
    );
    let path = write(&dir, "job-2.toml", &job_with(HOSTILE[2].0));
    let stdout = text(&armsheet(&["check", &path]).stdout);
    assert!(
        stdout.contains("  date      a\\u{d}b\\u{0}c\\u{9b}2J\\u{7f}\n"),
        "{stdout}"
    );
    let path = write(&dir, "job-3.toml", &job_with(HOSTILE[3].0));
    let stdout = text(&armsheet(&["check", &path]).stdout);
    assert!(stdout.contains("\\u{202e}evil\\u{202a}"), "{stdout}");
    // A newline in a one-line field stays on its line; notes keep their lines.
    let path = write(&dir, "job-4.toml", &job_with(HOSTILE[4].0));
    let stdout = text(&armsheet(&["check", &path]).stdout);
    assert!(
        stdout.contains("  title     first\\u{a}second\n"),
        "{stdout}"
    );
    assert!(
        stdout.contains("  notes     first\n            second\n"),
        "{stdout}"
    );
}

#[test]
fn json_keeps_the_text_exact() {
    let dir = scratch("terminal-escapes-json");
    for (i, (toml, decoded)) in HOSTILE.iter().enumerate() {
        let path = write(&dir, &format!("job-{i}.toml"), &job_with(toml));
        let out = armsheet(&["check", &path, "--json"]);
        let stdout = text(&out.stdout);
        // JSON escapes the C0 controls (U+0000–U+001F) and keeps all else as it is.
        for c in stdout.chars() {
            assert!(c >= ' ' || c == '\n', "raw U+{:04X}", c as u32);
        }
        let v: serde_json::Value = serde_json::from_str(&stdout).unwrap();
        for k in ["id", "title", "customer", "date", "notes"] {
            assert_eq!(v["job"][k].as_str(), Some(*decoded), "{k}");
        }
    }
}

#[test]
fn a_bad_value_is_echoed_escaped() {
    let dir = scratch("terminal-escapes-diagnostic");
    for (i, (toml, _)) in HOSTILE.iter().enumerate() {
        let design = BODY.replace("turns = 3", &format!("turns = 3\ndirection = \"{toml}\""));
        let path = write(&dir, &format!("bad-{i}.toml"), &design);
        let out = armsheet(&["check", &path]);
        let stderr = text(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{stderr}");
        assert!(
            stderr.contains("error: winding.direction: expected"),
            "{stderr}"
        );
        assert!(stderr.contains("found \""), "{stderr}");
        assert_no_raw(toml, &stderr);
    }
    // A hostile key name.
    let design = format!("[job]\n\"\\u001b[2J\u{202e}\" = 1\n\n{BODY}");
    let path = write(&dir, "key.toml", &design);
    let stderr = text(&armsheet(&["check", &path]).stderr);
    assert_no_raw("key", &stderr);
    assert!(
        stderr
            .contains("error: job.\\u{1b}[2J\\u{202e}: unknown key `\\u{1b}[2J\\u{202e}` in [job]"),
        "{stderr}"
    );
    let design = BODY.replace("turns = 3", "turns = 3\ndirection = \"\\u001b[2J\"");
    let path = write(&dir, "bad.toml", &design);
    let stderr = text(&armsheet(&["check", &path]).stderr);
    assert!(stderr.contains("found \"\\u{1b}[2J\""), "{stderr}");
}

#[test]
fn raw_characters_in_a_source_line_are_escaped_and_the_caret_still_points_right() {
    let dir = scratch("terminal-escapes-source");
    // A raw bidi override is allowed in a TOML string; the junk after the string is not TOML.
    let design = format!("[job]\ntitle = \"\u{202e}ab\" junk\n\n{BODY}");
    let path = write(&dir, "line.toml", &design);
    let stderr = text(&armsheet(&["check", &path]).stderr);
    assert_no_raw("source line", &stderr);
    let shown = "2 | title = \"\\u{202e}ab\" junk\n";
    assert!(stderr.contains(shown), "{stderr}");
    let caret = stderr
        .lines()
        .find(|l| l.trim_start().starts_with("| ") && l.contains('^'))
        .unwrap();
    let junk = shown.find("junk").unwrap();
    assert_eq!(caret.find('^'), Some(junk), "{stderr}");
    // A raw control character is not TOML at all: the line is still shown escaped.
    let design = format!("[job]\ntitle = \"\u{1b}[2J\"\n\n{BODY}");
    let path = write(&dir, "control.toml", &design);
    let stderr = text(&armsheet(&["check", &path]).stderr);
    assert_no_raw("control in source", &stderr);
    assert!(stderr.contains("title = \"\\u{1b}[2J\""), "{stderr}");
}

#[test]
fn a_hostile_file_name_is_escaped_in_the_report_and_the_errors() {
    let dir = scratch("terminal-escapes-name");
    let name = "evil\u{1b}]0;x\u{7}\u{202e}.toml";
    write(&dir, name, BODY);
    let out = armsheet_in(&["check", name], &dir);
    let stdout = text(&out.stdout);
    assert_no_raw("file name in report", &stdout);
    assert!(
        stdout.contains("winding check of evil\\u{1b}]0;x\\u{7}\\u{202e}.toml\n"),
        "{stdout}"
    );
    // In a diagnostic.
    write(&dir, name, &BODY.replace("poles = 4", "poles = 5"));
    let stderr = text(&armsheet_in(&["check", name], &dir).stderr);
    assert_no_raw("file name in diagnostic", &stderr);
    assert!(
        stderr.contains("--> evil\\u{1b}]0;x\\u{7}\\u{202e}.toml:2:9"),
        "{stderr}"
    );
    // In the `wrote …` lines of `sheet`, whose folder is named after the design.
    write(&dir, name, BODY);
    let out = armsheet_in(&["sheet", name, "-o", "sheets"], &dir);
    let stdout = text(&out.stdout);
    assert_no_raw("file name in wrote lines", &stdout);
    assert!(
        stdout.contains("wrote sheets/evil\\u{1b}]0;x\\u{7}\\u{202e}/sheet-1.svg\n"),
        "{stdout}"
    );
    // In the rewind report, or in its refusal.
    std::fs::write(dir.join(name), support::demo("hoist-lap")).unwrap();
    let out = armsheet_in(
        &["rewind", name, "--voltage", "200", "-o", "new.toml"],
        &dir,
    );
    assert_no_raw("rewind stdout", &text(&out.stdout));
    assert_no_raw("rewind stderr", &text(&out.stderr));
    assert!(
        text(&out.stdout).contains("evil\\u{1b}]0;x\\u{7}\\u{202e}.toml")
            || text(&out.stderr).contains("evil\\u{1b}]0;x\\u{7}\\u{202e}.toml"),
        "{}{}",
        text(&out.stdout),
        text(&out.stderr)
    );
    // In a CLI error: a file that cannot be read.
    let missing = "gone\u{1b}[2J.toml";
    let stderr = text(&armsheet_in(&["check", missing], &dir).stderr);
    assert_no_raw("file name in CLI error", &stderr);
    assert!(
        stderr.contains("cannot read design file gone\\u{1b}[2J.toml"),
        "{stderr}"
    );
}

#[test]
fn a_long_bad_value_is_echoed_cut() {
    let dir = scratch("terminal-escapes-long");
    let long = "x".repeat(5_000_000);
    let design = BODY.replace("turns = 3", &format!("turns = 3\ndirection = \"{long}\""));
    let path = write(&dir, "long.toml", &design);
    let out = armsheet(&["check", &path]);
    let stderr = text(&out.stderr);
    assert_eq!(out.status.code(), Some(2));
    assert!(stderr.len() < 2_000, "{} bytes of stderr", stderr.len());
    assert!(stderr.contains("x…"), "{stderr}");
    // An over-long title is refused, not echoed.
    let design = format!("[job]\ntitle = \"{long}\"\n\n{BODY}");
    let path = write(&dir, "title.toml", &design);
    let stderr = text(&armsheet(&["check", &path]).stderr);
    assert!(stderr.len() < 2_000, "{} bytes of stderr", stderr.len());
    assert!(
        stderr.contains("error: job.title: title is 5000000 characters long: expected at most 200"),
        "{stderr}"
    );
}
