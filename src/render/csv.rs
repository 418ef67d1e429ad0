//! `connections.csv` and `job.csv`: the connection table and the job it belongs to, for a
//! spreadsheet (RFC 4180).
//!
//! Part of the `render` stage, and the one CSV writer of every CSV armsheet writes (the
//! connection table, its job, and the readings file of `armsheet test`): the `csv` crate's
//! writer, records ending in CRLF, fields holding a comma, a quote or a line break quoted with
//! inner quotes doubled [src: RFC 4180, *Common Format and MIME Type for CSV Files*, section
//! 2]. A text cell that starts with `=`, `+`, `-` or `@`, also after any leading whitespace or
//! control characters (space, no-break space, tab, CR, line feed …), or that starts with a tab
//! or a carriage return, is prefixed with a single quote, so that a spreadsheet shows it
//! instead of running it as a formula [src: OWASP, *CSV Injection*].
//! Numeric cells, the numbers the writer makes itself (a negative current, say), are written as
//! numbers and never prefixed.
//!
//! The job is written once, in its own two-record file `job.csv` ([`JOB_COLUMNS`]), not on
//! every connection row: repeating a long job id on each of thousands of rows multiplied the
//! table's size by the id's length. Every record of an RFC 4180 file has the same fields, so
//! the job is neither a leading comment nor a differently shaped first record of
//! `connections.csv`; to combine the tables of several jobs, join each `connections.csv` with
//! its `job.csv`.

use crate::design::Design;
use crate::winding::Winding;

use crate::layout::sheet::rows::sequence_labels;

/// One CSV cell.
pub enum Cell {
    /// A number the writer makes itself, written as it is.
    Num(String),
    /// Text, neutralised if a spreadsheet could run it ([`neutralised`]).
    Text(String),
}

/// Whether a spreadsheet could take the text cell `s` for a formula: it starts with a formula
/// character, or with a tab or carriage return, or with a formula character once leading
/// whitespace and control characters are skipped.
fn looks_like_formula(s: &str) -> bool {
    const FORMULA: [char; 4] = ['=', '+', '-', '@'];
    s.starts_with(['\t', '\r'])
        || s.trim_start_matches(|c: char| c.is_whitespace() || c.is_control())
            .starts_with(FORMULA)
}

/// A text cell as it goes to the writer: a single quote first if a spreadsheet could run it.
pub fn neutralised(s: &str) -> String {
    if looks_like_formula(s) {
        format!("'{s}")
    } else {
        s.to_string()
    }
}

/// The records as one RFC 4180 file: the `csv` crate's writer, CRLF after every record, a
/// field quoted only when it holds a comma, a quote or a line break, text cells
/// [`neutralised`]. Every record must have as many fields as the first.
pub fn csv_file(records: impl IntoIterator<Item = Vec<Cell>>) -> String {
    let mut w = csv::WriterBuilder::new()
        .terminator(csv::Terminator::CRLF)
        .quote_style(csv::QuoteStyle::Necessary)
        .from_writer(Vec::new());
    for cells in records {
        let fields = cells.into_iter().map(|c| match c {
            Cell::Num(n) => n,
            Cell::Text(s) => neutralised(&s),
        });
        // Writing to memory cannot fail, and every caller's records have equal lengths.
        let _ = w.write_record(fields);
    }
    let bytes = w
        .into_inner()
        .unwrap_or_else(|e| e.into_inner().get_ref().clone());
    String::from_utf8(bytes).unwrap_or_default()
}

/// The column names of `connections.csv`, in order.
pub const CSV_COLUMNS: [&str; 14] = [
    "coil",
    "top_slot",
    "top_position",
    "top_side",
    "bottom_slot",
    "bottom_position",
    "bottom_side",
    "start_segment",
    "end_segment",
    "front_pitch",
    "dummy",
    "sequence",
    "path",
    "current",
];

/// The column names of `job.csv`, in order: the `[job]` keys and the design file's name.
pub const JOB_COLUMNS: [&str; 5] = ["job", "title", "customer", "date", "design_file"];

/// The job the connection table belongs to: a header record and one record with the `[job]`
/// id, title, customer and date (empty when absent) and the design file's name.
pub fn job_csv(design: &Design) -> String {
    let text = |x: &Option<String>| Cell::Text(x.clone().unwrap_or_default());
    let job = &design.job;
    csv_file([
        JOB_COLUMNS.map(|c| Cell::Text(c.to_string())).into(),
        vec![
            text(&job.id),
            text(&job.title),
            text(&job.customer),
            text(&job.date),
            Cell::Text(design.file_name.clone()),
        ],
    ])
}

/// The column a winding of several elements (frog-leg) adds last: each row's element, `lap`
/// or `wave`.
pub const ELEMENT_COLUMN: &str = "element";

/// The connection table, one record per coil position, with a header record. The job is in
/// [`job_csv`], once, not on every row. A frog-leg winding's table lists both elements' coils
/// and ends each record with [`ELEMENT_COLUMN`].
pub fn connections_csv(winding: &Winding) -> String {
    let multi = winding.is_multi_element();
    let header: Vec<Cell> = CSV_COLUMNS
        .iter()
        .chain(multi.then_some(&ELEMENT_COLUMN))
        .map(|c| Cell::Text(c.to_string()))
        .collect();
    let seq = sequence_labels(winding);
    let n = |x: u32| Cell::Num(x.to_string());
    let opt = |x: Option<u32>| x.map_or(Cell::Text(String::new()), |x| Cell::Num(x.to_string()));
    let rows = winding.connections.iter().map(|c| {
        let i = (c.coil - 1) as usize;
        [
            n(c.coil),
            n(c.top.slot),
            n(c.top.position),
            n(c.top.side),
            n(c.bottom.slot),
            n(c.bottom.position),
            n(c.bottom.side),
            opt(c.start_segment),
            opt(c.end_segment),
            c.front_pitch
                .map_or(Cell::Text(String::new()), |y| Cell::Num(y.to_string())),
            Cell::Text(if c.dummy { "yes" } else { "no" }.to_string()),
            Cell::Text(seq[i].clone()),
            n(winding.coil_path[i]),
            Cell::Num(winding.coil_current[i].to_string()),
        ]
        .into_iter()
        .chain(multi.then(|| Cell::Text(c.element.as_str().to_string())))
        .collect::<Vec<_>>()
    });
    csv_file(std::iter::once(header).chain(rows))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// One text cell as the writer writes it, without the record's CRLF.
    fn csv_text(s: &str) -> String {
        let out = csv_file([vec![Cell::Text(s.to_string()), Cell::Num("1".into())]]);
        out.strip_suffix(",1\r\n").unwrap_or(&out).to_string()
    }

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

    #[test]
    fn formulas_behind_leading_whitespace_or_controls_are_neutralised() {
        // The quote goes first, so the field no longer starts with a blank; line breaks are
        // quoted as always.
        assert_eq!(csv_text(" =1+2"), "' =1+2");
        assert_eq!(csv_text("\u{a0}=1+2"), "'\u{a0}=1+2");
        assert_eq!(csv_text("\t=1+2"), "'\t=1+2");
        assert_eq!(csv_text("\r\n@SUM(A1)"), "\"'\r\n@SUM(A1)\"");
        assert_eq!(csv_text("\n+cmd"), "\"'\n+cmd\"");
        assert_eq!(csv_text("\u{3000}-2"), "'\u{3000}-2");
        assert_eq!(csv_text("\u{1}\u{7f}=x"), "'\u{1}\u{7f}=x");
        assert_eq!(csv_text("\u{2028}=x"), "'\u{2028}=x");
        assert_eq!(csv_text(" \u{a0}\t\u{85} @x"), "' \u{a0}\t\u{85} @x");
        // A tab or CR alone at the start is neutralised as before; other text is left alone
        // (RFC 4180: spaces are part of a field).
        assert_eq!(csv_text("\tplain"), "'\tplain");
        assert_eq!(csv_text(" plain"), " plain");
        assert_eq!(csv_text("a-b"), "a-b");
        assert_eq!(csv_text(""), "");
    }

    #[test]
    fn numbers_the_writer_makes_stay_numbers() {
        let out = csv_file([vec![Cell::Num("-1".into()), Cell::Text("-1".into())]]);
        assert_eq!(out, "-1,'-1\r\n");
    }
}
