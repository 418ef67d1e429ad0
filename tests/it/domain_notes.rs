//! Tidy test: the project's domain notes, `docs/domain.md`, exist, and every citation of them in
//! `src/` and `tests/` names a section that is there.
//!
//! A citation is `docs/domain.md, "Heading"` (or several headings: `docs/domain.md, "Lap
//! windings", "Wave windings"`) inside a comment; it may run on over the next comment line.
//! A bare `docs/domain.md` without a heading, a heading the notes do not have, and any
//! reference to the old file name in capitals are all reported. The notes' headings are
//! unique, so a citation names one section.

use std::path::Path;

const ROOT: &str = env!("CARGO_MANIFEST_DIR");
const NOTES: &str = "docs/domain.md";
/// The name the code once cited, of a file outside the repository.
const OLD: &str = "DOMAIN.md";
/// This file: it plants violations in string literals, so it is not scanned itself.
const THIS: &str = "tests/it/domain_notes.rs";

/// The headings of a Markdown text: every line that starts with `#`, without the marks.
fn headings(md: &str) -> Vec<String> {
    md.lines()
        .filter(|l| l.starts_with('#'))
        .map(|l| l.trim_start_matches('#').trim().to_string())
        .collect()
}

/// The text with every comment line's marker (`//`, `///`, `//!`) and indentation taken off
/// and the lines joined by single spaces, so that a citation running over two comment lines
/// reads as one; with the line number (1-based) each byte of the joined text came from.
fn joined(text: &str) -> (String, Vec<usize>) {
    let mut out = String::new();
    let mut line_of = Vec::new();
    for (i, line) in text.lines().enumerate() {
        let t = line.trim_start();
        let t = t
            .strip_prefix("//")
            .map_or(t, |c| c.trim_start_matches(['/', '!']).trim_start());
        if !out.is_empty() {
            out.push(' ');
            line_of.push(i + 1);
        }
        out.push_str(t);
        line_of.extend(std::iter::repeat_n(i + 1, t.len()));
    }
    (out, line_of)
}

/// The problems of one file's text against the notes' headings, each as `path:line: what`.
fn problems(path: &str, text: &str, known: &[String]) -> Vec<String> {
    let (s, line_of) = joined(text);
    let at = |i: usize| line_of.get(i).copied().unwrap_or(0);
    let mut out = Vec::new();
    for (i, _) in s.match_indices(OLD) {
        out.push(format!(
            "{path}:{}: cites the old {OLD}, which is not in the repository; cite {NOTES}, \"Heading\"",
            at(i)
        ));
    }
    for (i, _) in s.match_indices(NOTES) {
        let mut rest = &s[i + NOTES.len()..];
        let mut cited = 0;
        while let Some(r) = rest.strip_prefix(", \"") {
            let Some(end) = r.find('"') else { break };
            let heading = &r[..end];
            if !known.iter().any(|k| k == heading) {
                out.push(format!(
                    "{path}:{}: cites \"{heading}\", which is no heading of {NOTES}",
                    at(i)
                ));
            }
            cited += 1;
            rest = &r[end + 1..];
        }
        if cited == 0 {
            out.push(format!(
                "{path}:{}: cites {NOTES} without a section: write {NOTES}, \"Heading\"",
                at(i)
            ));
        }
    }
    out
}

fn notes() -> String {
    let path = Path::new(ROOT).join(NOTES);
    std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

#[test]
fn the_notes_exist_and_their_headings_are_unique() {
    let h = headings(&notes());
    assert!(h.len() > 10, "{NOTES} has only {} headings", h.len());
    let mut sorted = h.clone();
    sorted.sort();
    for w in sorted.windows(2) {
        assert_ne!(w[0], w[1], "{NOTES} has the heading \"{}\" twice", w[0]);
    }
}

#[test]
fn every_citation_names_a_heading_of_the_notes() {
    let known = headings(&notes());
    let files = ["src", "tests"].into_iter().flat_map(|dir| {
        crate::support::source::rust_files(&format!("{ROOT}/{dir}"))
            .into_iter()
            .map(move |(rel, text)| (format!("{dir}/{rel}"), text))
    });
    let mut all = Vec::new();
    let mut citing = 0;
    for (rel, text) in files {
        if rel == THIS {
            continue;
        }
        citing += usize::from(text.contains(NOTES));
        all.extend(problems(&rel, &text, &known));
    }
    assert!(all.is_empty(), "{}", all.join("\n"));
    assert!(
        citing > 0,
        "no file cites {NOTES}: is the scan looking in the right place?"
    );
}

#[test]
fn the_checker_reports_planted_violations() {
    let known = vec![
        "Lap windings".to_string(),
        "Brush neutral with several coils per slot".into(),
    ];
    // Good citations, one of them running over two comment lines: nothing to report.
    let good = "/// y_c = ±m [src: docs/domain.md, \"Lap windings\"].\n\
                /// shift [derived; docs/domain.md, \"Brush neutral with several coils per\n    \
                /// slot\"].\nfn f() {}\n";
    assert_eq!(problems("good.rs", good, &known), Vec::<String>::new());
    // A heading the notes lack, a bare citation, and the old file name.
    let bad = "//! see docs/domain.md, \"Lap windings\", \"Wave windings\"\n\
               // (docs/domain.md) on line 2\n\
               /// and DOMAIN.md \"Lap windings\" on line 3\n";
    let p = problems("bad.rs", bad, &known);
    assert_eq!(p.len(), 3, "{p:#?}");
    assert!(
        p.iter()
            .any(|m| m.starts_with("bad.rs:1: cites \"Wave windings\"")),
        "{p:#?}"
    );
    assert!(
        p.iter()
            .any(|m| m.starts_with("bad.rs:2:") && m.contains("without a section")),
        "{p:#?}"
    );
    assert!(
        p.iter()
            .any(|m| m.starts_with("bad.rs:3:") && m.contains("cites the old")),
        "{p:#?}"
    );
}

#[test]
fn headings_are_read_at_every_level() {
    assert_eq!(
        headings("# Notes\ntext\n## Lap windings\n### Sub part\nnot # a heading\n"),
        ["Notes", "Lap windings", "Sub part"]
    );
}
