//! `archive export`'s CSV: every revision of every job, one record each, with the search
//! fields and the long ones (the design file, the data card and the readings as written, the
//! sign-off names and the sheet set's hashes), through the one CSV writer
//! ([`super::csv::csv_file`]: RFC 4180, text a spreadsheet could run neutralised). A long
//! field keeps its line breaks inside its quotes.

use super::csv::{Cell, csv_file};
use crate::features::archive::Record;

/// The CSV columns of `archive export`, in order.
pub const EXPORT_COLUMNS: [&str; 29] = [
    "job",
    "revision",
    "customer",
    "title",
    "date",
    "design_name",
    "poles",
    "slots",
    "bars",
    "kind",
    "multiplicity",
    "direction",
    "coils_per_slot",
    "span",
    "throw",
    "turns",
    "wire",
    "strands",
    "lead_swing_bars",
    "brush_sets",
    "equalizers",
    "dummies",
    "rating",
    "verdict",
    "signed_by",
    "sheets",
    "design",
    "card",
    "readings",
];

/// The archive's records as one RFC 4180 file: a header, then a record a revision. The
/// sign-off names are joined by `; `; the sheet set is a line a file, `SHA256  FILE` (as
/// `sha256sum -c` reads them); the lead swing is a number of bars, signed as in the report's
/// words (`1.5`, `-1`).
pub fn export_csv(records: &[Record]) -> String {
    let header = EXPORT_COLUMNS.iter().map(|c| Cell::Text(c.to_string()));
    let text = |s: &str| Cell::Text(s.to_string());
    let some = |s: &Option<String>| Cell::Text(s.clone().unwrap_or_default());
    let num = |n: u32| Cell::Num(n.to_string());
    let rows = records.iter().map(|r| {
        let m = &r.summary;
        let sheets: Vec<String> = r
            .sheets
            .iter()
            .map(|s| format!("{}  {}", s.sha256, s.file))
            .collect();
        vec![
            text(&r.job.job),
            num(r.revision),
            some(&r.job.customer),
            some(&r.job.title),
            some(&r.job.date),
            text(&r.design_name),
            num(m.poles),
            num(m.slots),
            num(m.bars),
            text(&m.kind),
            num(m.multiplicity),
            text(&m.direction),
            num(m.coils_per_slot),
            text(&m.span_shop),
            text(&m.throw_shop),
            num(m.turns),
            some(&m.wire),
            Cell::Num(m.strands.map(|n| n.to_string()).unwrap_or_default()),
            Cell::Num(half_bars_number(m.lead_swing_half_bars)),
            num(m.brush_sets),
            num(m.equalizers),
            num(m.dummies),
            some(&m.rating),
            some(&r.verdict),
            text(&r.signed_by.join("; ")),
            text(&sheets.join("\n")),
            text(&r.design),
            some(&r.card),
            some(&r.readings),
        ]
    });
    csv_file(std::iter::once(header.collect()).chain(rows))
}

/// A count of half bars as a number of bars: `3` → `1.5`, `-2` → `-1`.
fn half_bars_number(h: i64) -> String {
    if h % 2 == 0 {
        (h / 2).to_string()
    } else {
        format!("{}{}.5", if h < 0 { "-" } else { "" }, (h / 2).abs())
    }
}
