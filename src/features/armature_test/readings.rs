//! The shop's measured readings: a CSV with the header `from_bar,to_bar,reading`.
//!
//! Part of the `features` stage (under [`super`]): the file's text in (the CLI reads it), the
//! readings out, or the first problem with its line and column. Read with the `csv` crate:
//! RFC 4180, quoted fields, LF or CRLF line ends, a UTF-8 byte-order mark; blank lines are
//! skipped and every field is trimmed. Readings may be in any
//! consistent unit (the locator fits the scale); a reading may be `0`, or `open` / `OL` for an
//! open circuit; an empty reading is a missing pair. The readings CSV that `test -o` writes is
//! accepted too: its `measured` column is the reading.

use std::collections::BTreeMap;

/// One measured value.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ReadingValue {
    /// A number in the file's unit (≥ 0).
    Value(f64),
    /// The meter showed an open circuit.
    Open,
}

/// The readings of one file, keyed by the pair as the test lists it.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct MeasuredReadings {
    /// (from_bar, to_bar) → reading.
    pub values: BTreeMap<(u32, u32), ReadingValue>,
}

/// A problem in the readings file, located.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ReadingsError {
    /// Line, from 1.
    pub line: usize,
    /// Column (field), from 1.
    pub column: usize,
    /// What is wrong, lower-case.
    pub message: String,
}

/// Fewest readings the locator works from.
pub const MIN_READINGS: usize = 3;

/// Reads `text` against the test's pairs: `pairs` are the neighbouring and within-winding
/// pairs the test lists, on `bars` bars.
pub fn parse_readings(
    text: &str,
    bars: u32,
    pairs: &[(u32, u32)],
) -> Result<MeasuredReadings, ReadingsError> {
    let err = |line: usize, column: usize, message: String| ReadingsError {
        line,
        column,
        message,
    };
    let mut records = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(text.as_bytes())
        .into_records()
        .map(|r| {
            let line = |p: Option<&csv::Position>| record_line(text, p);
            match r {
                Ok(rec) => Ok((line(rec.position()), rec)),
                Err(e) => Err(err(line(e.position()), 1, format!("not a CSV record: {e}"))),
            }
        })
        .filter(|r| {
            r.as_ref()
                .map_or(true, |(_, rec)| rec.iter().any(|f| !f.trim().is_empty()))
        });
    let Some(first) = records.next() else {
        return Err(err(
            1,
            1,
            "empty file: expected the header `from_bar,to_bar,reading`".into(),
        ));
    };
    let (h, header) = first?;
    let names: Vec<String> = header
        .iter()
        .map(|s| s.trim().to_ascii_lowercase())
        .collect();
    let col = |n: &str| names.iter().position(|x| x == n);
    let (Some(cf), Some(ct), Some(cr)) = (
        col("from_bar"),
        col("to_bar"),
        col("reading").or_else(|| col("measured")),
    ) else {
        return Err(err(
            h,
            1,
            format!(
                "the header is `{}`: expected `from_bar,to_bar,reading`",
                header.iter().collect::<Vec<_>>().join(",").trim()
            ),
        ));
    };
    let known: BTreeMap<(u32, u32), (u32, u32)> = pairs
        .iter()
        .flat_map(|&(a, b)| [((a, b), (a, b)), ((b, a), (a, b))])
        .collect();
    let mut out = MeasuredReadings::default();
    let mut last = h;
    for record in records {
        let (line, record) = record?;
        last = line;
        let fields: Vec<&str> = record.iter().map(str::trim).collect();
        let field = |c: usize| fields.get(c).copied().unwrap_or("");
        let bar = |c: usize| -> Result<u32, ReadingsError> {
            match field(c).parse::<u32>() {
                Ok(b) if (1..=bars).contains(&b) => Ok(b),
                Ok(b) => Err(err(
                    line,
                    c + 1,
                    format!("bar {b} is out of range: the commutator has bars 1 to {bars}"),
                )),
                Err(_) => Err(err(
                    line,
                    c + 1,
                    format!("expected a bar number, found \"{}\"", field(c)),
                )),
            }
        };
        let (a, b) = (bar(cf)?, bar(ct)?);
        let Some(&pair) = known.get(&(a, b)) else {
            return Err(err(
                line,
                cf + 1,
                format!(
                    "bars {a} and {b} are not a pair the test reads (neighbouring bars, or bars m apart within one winding)"
                ),
            ));
        };
        let Some(value) = reading_value(field(cr)).map_err(|m| err(line, cr + 1, m))? else {
            continue;
        };
        if out.values.insert(pair, value).is_some() {
            return Err(err(
                line,
                cf + 1,
                format!("bars {a} and {b} are read twice"),
            ));
        }
    }
    if out.values.len() < MIN_READINGS {
        return Err(err(
            last,
            1,
            format!(
                "{} reading(s): the locator needs at least {MIN_READINGS}",
                out.values.len()
            ),
        ));
    }
    Ok(out)
}

/// The line a record starts on, from 1, counted from its byte offset: the reader places a
/// record after a CR at the LF that follows it, a line early.
fn record_line(text: &str, p: Option<&csv::Position>) -> usize {
    let at = p.map_or(0, |p| p.byte() as usize).min(text.len());
    let start = text[at..]
        .find(|c| c != '\r' && c != '\n')
        .map_or(text.len(), |k| at + k);
    1 + text.as_bytes()[..start]
        .iter()
        .filter(|&&b| b == b'\n')
        .count()
}

/// A reading cell: `None` when empty (a pair not read), open for `open` or `OL`, else a
/// number of zero or more; the message when it is none of these.
fn reading_value(raw: &str) -> Result<Option<ReadingValue>, String> {
    if raw.is_empty() {
        Ok(None)
    } else if raw.eq_ignore_ascii_case("open") || raw.eq_ignore_ascii_case("ol") {
        Ok(Some(ReadingValue::Open))
    } else {
        match raw.parse::<f64>() {
            Ok(v) if v.is_finite() && v >= 0.0 => Ok(Some(ReadingValue::Value(v))),
            _ => Err(format!(
                "expected a reading (a number, `open` or `OL`), found \"{raw}\""
            )),
        }
    }
}
