//! `connections.csv`: the connection table for a spreadsheet (RFC 4180).
//!
//! Part of the `render` stage. Records end in CRLF, fields holding a comma, a quote or a line
//! break are quoted with inner quotes doubled [src: RFC 4180, *Common Format and MIME Type for
//! CSV Files*, section 2]. A text cell starting with `=`, `+`, `-` or `@` (or a tab or carriage
//! return) is prefixed with a single quote, so that a spreadsheet shows it instead of running
//! it as a formula [src: OWASP, *CSV Injection*]. Numeric cells are written as numbers.

use crate::design::Design;
use crate::winding::Winding;

use crate::layout::sheet::rows::sequence_labels;

/// One CSV cell.
enum Cell {
    Num(String),
    Text(String),
}

/// Quotes and neutralises one field.
pub fn csv_text(s: &str) -> String {
    let mut t = String::with_capacity(s.len() + 2);
    if s.starts_with(['=', '+', '-', '@', '\t', '\r']) {
        t.push('\'');
    }
    t.push_str(s);
    if t.contains([',', '"', '\n', '\r']) || t != t.trim() {
        format!("\"{}\"", t.replace('"', "\"\""))
    } else {
        t
    }
}

fn record(out: &mut String, cells: &[Cell]) {
    for (i, c) in cells.iter().enumerate() {
        if i > 0 {
            out.push(',');
        }
        match c {
            Cell::Num(n) => out.push_str(n),
            Cell::Text(s) => out.push_str(&csv_text(s)),
        }
    }
    out.push_str("\r\n");
}

/// The column names, in order.
pub const CSV_COLUMNS: [&str; 14] = [
    "job",
    "coil",
    "top_slot",
    "top_position",
    "top_side",
    "bottom_slot",
    "bottom_position",
    "bottom_side",
    "start_segment",
    "end_segment",
    "dummy",
    "sequence",
    "path",
    "current",
];

/// The connection table, one record per coil position, with a header record. The `job`
/// column repeats the design's job id (or its file name) so that tables of several jobs can
/// be pasted together.
pub fn connections_csv(design: &Design, winding: &Winding) -> String {
    let mut out = String::with_capacity(64 * (winding.connections.len() + 1));
    record(&mut out, &CSV_COLUMNS.map(|c| Cell::Text(c.to_string())));
    let job = design
        .job
        .id
        .clone()
        .unwrap_or_else(|| design.file_name.clone());
    let seq = sequence_labels(winding);
    let n = |x: u32| Cell::Num(x.to_string());
    let opt = |x: Option<u32>| x.map_or(Cell::Text(String::new()), |x| Cell::Num(x.to_string()));
    for c in &winding.connections {
        let i = (c.coil - 1) as usize;
        record(
            &mut out,
            &[
                Cell::Text(job.clone()),
                n(c.coil),
                n(c.top.slot),
                n(c.top.position),
                n(c.top.side),
                n(c.bottom.slot),
                n(c.bottom.position),
                n(c.bottom.side),
                opt(c.start_segment),
                opt(c.end_segment),
                Cell::Text(if c.dummy { "yes" } else { "no" }.to_string()),
                Cell::Text(seq[i].clone()),
                n(winding.coil_path[i]),
                Cell::Num(winding.coil_current[i].to_string()),
            ],
        );
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fields_are_quoted_and_neutralised() {
        assert_eq!(csv_text("plain"), "plain");
        assert_eq!(csv_text("a,b"), "\"a,b\"");
        assert_eq!(csv_text("say \"hi\""), "\"say \"\"hi\"\"\"");
        assert_eq!(csv_text("=1+2"), "'=1+2");
        assert_eq!(csv_text("+cmd"), "'+cmd");
        assert_eq!(csv_text("-2"), "'-2");
        assert_eq!(csv_text("@SUM(A1)"), "'@SUM(A1)");
        assert_eq!(
            csv_text("=HYPERLINK(\"x\",\"y\")"),
            "\"'=HYPERLINK(\"\"x\"\",\"\"y\"\")\""
        );
        assert_eq!(csv_text("two\nlines"), "\"two\nlines\"");
    }
}
