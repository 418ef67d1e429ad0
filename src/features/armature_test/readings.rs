//! The shop's measured readings: a CSV with the header `from_bar,to_bar,reading` (bar to bar),
//! or `from_bar,to_bar,millivolts` (the drop test, at the design's feed bars).
//!
//! Part of the `features` stage (under [`super`]): the file's text in (the CLI reads it), the
//! readings out, or the first problem with its line and column. Read with the `csv` crate:
//! RFC 4180, quoted fields, LF or CRLF line ends, a UTF-8 byte-order mark; blank lines are
//! skipped and every field is trimmed; a file that is not UTF-8 is refused at its first bad
//! byte ([`readings_text`]), and a reading beyond any meter ([`MAX_READING`], [`MIN_READING`])
//! at its cell. Readings may be in any
//! consistent unit (the locator fits the scale); a reading may be `0`, or `open` / `OL` for an
//! open circuit; an empty reading is a missing pair. The readings CSV that `test -o` writes is
//! accepted too: its `measured` column is the reading.

use std::collections::BTreeMap;

use crate::base::number::counted;

/// One measured value.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ReadingValue {
    /// A number in the file's unit (≥ 0).
    Value(f64),
    /// The meter showed an open circuit.
    Open,
}

/// What the readings are, told by the header's third column.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum ReadingKind {
    /// `reading` (or `measured`): bar-to-bar resistances, in any consistent unit.
    #[default]
    BarToBar,
    /// `millivolts` (or `mv`): the drop test's millivolts between the bars each feed reaches,
    /// at the design's feed bars and the test current.
    Drop,
}

/// The readings of one file, keyed by the pair as the test lists it.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct MeasuredReadings {
    /// (from_bar, to_bar) → reading.
    pub values: BTreeMap<(u32, u32), ReadingValue>,
    /// Bar-to-bar resistances or drop-test millivolts.
    pub kind: ReadingKind,
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
    /// What to do about it, where the problem has a hint of its own (else the file format's).
    pub hint: Option<String>,
}

/// Fewest readings the locator works from.
pub const MIN_READINGS: usize = 3;

/// Largest reading taken, in the file's unit: 10⁹. In ohms that is a gigaohm, the range of an
/// insulation tester, not of the low-resistance ohmmeter a bar-to-bar test uses; in millivolts
/// it is a thousand kilovolts, beyond any drop test. A larger number is a slip (a value pasted
/// in the wrong column, a serial number), never a reading [derived from the meters' ranges].
pub const MAX_READING: f64 = 1e9;

/// Smallest reading other than zero, in the file's unit: 10⁻⁹ (a nano-ohm or a nanovolt, below
/// the resolution of any micro-ohm meter); a dead short is written `0` \[derived\].
pub const MIN_READING: f64 = 1e-9;

/// Most characters of a field echoed back in a message: a 300-digit number is cut, so no
/// message carries it whole.
const ECHO_CHARS: usize = 24;

/// The text of a readings file given as bytes: UTF-8, or the line and column (field) of the
/// first byte that is not, with the byte in hex.
pub fn readings_text(bytes: &[u8]) -> Result<&str, ReadingsError> {
    std::str::from_utf8(bytes).map_err(|e| {
        let good = &bytes[..e.valid_up_to()];
        let start = good.iter().rposition(|&b| b == b'\n').map_or(0, |k| k + 1);
        let line = 1 + good.iter().filter(|&&b| b == b'\n').count();
        let column = 1 + good[start..].iter().filter(|&&b| b == b',').count();
        let chars = String::from_utf8_lossy(&good[start..]).chars().count();
        ReadingsError {
            line,
            column,
            hint: None,
            message: format!(
                "byte 0x{:02x} (character {} of the line) is not UTF-8: save the file as UTF-8 (or plain ASCII) text",
                bytes[e.valid_up_to()],
                chars + 1
            ),
        }
    })
}

/// `raw` as echoed in a message: at most [`ECHO_CHARS`] characters, `...` marking a cut.
fn echo(raw: &str) -> String {
    if raw.chars().count() <= ECHO_CHARS {
        raw.to_string()
    } else {
        let head: String = raw.chars().take(ECHO_CHARS).collect();
        format!("{head}...")
    }
}

/// Reads `text` against the test's pairs: `pairs` are the neighbouring and within-winding
/// pairs the test lists, `drop_pairs` the pairs the drop test's feeds reach, on `bars` bars.
pub fn parse_readings(
    text: &str,
    bars: u32,
    pairs: &[(u32, u32)],
    drop_pairs: &[(u32, u32)],
) -> Result<MeasuredReadings, ReadingsError> {
    let err = |line: usize, column: usize, message: String| ReadingsError {
        line,
        column,
        message,
        hint: None,
    };
    let line_ends: Vec<usize> = text
        .bytes()
        .enumerate()
        .filter(|(_, b)| *b == b'\n')
        .map(|(i, _)| i)
        .collect();
    let mut records = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(text.as_bytes())
        .into_records()
        .map(|r| {
            let line = |p: Option<&csv::Position>| record_line(text, &line_ends, p);
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
    let (cf, ct, cr, kind) = columns(&header).map_err(|m| err(h, 1, m))?;
    let (pairs, what) = match kind {
        ReadingKind::BarToBar => (
            pairs,
            "a pair the test reads (neighbouring bars, or bars m apart within one winding)",
        ),
        ReadingKind::Drop => (
            drop_pairs,
            "a pair the drop test reads (the neighbouring pairs a feed reaches, as `armsheet test` lists them)",
        ),
    };
    let known: BTreeMap<(u32, u32), (u32, u32)> = pairs
        .iter()
        .flat_map(|&(a, b)| [((a, b), (a, b)), ((b, a), (a, b))])
        .collect();
    let mut out = MeasuredReadings {
        kind,
        ..MeasuredReadings::default()
    };
    let mut last = h;
    // Pairs listed with the reading left empty (the readings file `test -o` writes, unfilled).
    let mut empty = 0usize;
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
                    format!("expected a bar number, found \"{}\"", echo(field(c))),
                )),
            }
        };
        let (a, b) = (bar(cf)?, bar(ct)?);
        let Some(&pair) = known.get(&(a, b)) else {
            return Err(err(
                line,
                cf + 1,
                format!("bars {a} and {b} are not {what}"),
            ));
        };
        let Some(value) = reading_value(field(cr)).map_err(|m| err(line, cr + 1, m))? else {
            empty += 1;
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
        let column = header.get(cr).unwrap_or("");
        return Err(too_few(last, column, out.values.len(), empty));
    }
    Ok(out)
}

/// Fewer than [`MIN_READINGS`] readings, `n`, in the reading column named `column`, at the
/// file's last line `line`; with `empty` pairs listed and left empty (the file `test -o`
/// writes, unfilled), the hint is to fill in that column.
fn too_few(line: usize, column: &str, n: usize, empty: usize) -> ReadingsError {
    let column = echo(column.trim_start_matches('\u{feff}').trim());
    ReadingsError {
        line,
        column: 1,
        message: format!(
            "{} in the `{column}` column: the locator needs at least {MIN_READINGS}",
            counted(n, "reading", "readings")
        ),
        hint: (empty > 0).then(|| {
            format!(
                "fill in the `{column}` column with the meter's reading for each pair ({} left empty); a pair not read may stay empty",
                counted(empty, "row", "rows")
            )
        }),
    }
}

/// The columns of the header: from bar, to bar and the reading, and what the readings are;
/// the message when the header names none of them.
fn columns(header: &csv::StringRecord) -> Result<(usize, usize, usize, ReadingKind), String> {
    let names: Vec<String> = header
        .iter()
        .map(|s| s.trim().to_ascii_lowercase())
        .collect();
    let col = |n: &str| names.iter().position(|x| x == n);
    let reading = col("reading")
        .or_else(|| col("measured"))
        .map(|c| (c, ReadingKind::BarToBar))
        .or_else(|| {
            col("millivolts")
                .or_else(|| col("mv"))
                .map(|c| (c, ReadingKind::Drop))
        });
    match (col("from_bar"), col("to_bar"), reading) {
        (Some(cf), Some(ct), Some((cr, kind))) => Ok((cf, ct, cr, kind)),
        _ => Err(format!(
            "the header is `{}`: expected `from_bar,to_bar,reading` (bar to bar, any unit) or `from_bar,to_bar,millivolts` (the drop test)",
            echo(header.iter().collect::<Vec<_>>().join(",").trim())
        )),
    }
}

/// The line a record starts on, from 1, counted from its byte offset: the reader places a
/// record after a CR at the LF that follows it, a line early.
/// `line_ends` are the byte offsets of the text's line feeds, in order (a binary search, so
/// a file of many thousand readings is not read once a record).
fn record_line(text: &str, line_ends: &[usize], p: Option<&csv::Position>) -> usize {
    let at = p.map_or(0, |p| p.byte() as usize).min(text.len());
    let start = text[at..]
        .find(|c| c != '\r' && c != '\n')
        .map_or(text.len(), |k| at + k);
    1 + line_ends.partition_point(|&e| e < start)
}

/// A reading cell: `None` when empty (a pair not read), open for `open` or `OL`, else a
/// number: zero (`-0` is zero) or from [`MIN_READING`] to [`MAX_READING`]; the message when it
/// is none of these.
fn reading_value(raw: &str) -> Result<Option<ReadingValue>, String> {
    if raw.is_empty() {
        return Ok(None);
    }
    if raw.eq_ignore_ascii_case("open") || raw.eq_ignore_ascii_case("ol") {
        return Ok(Some(ReadingValue::Open));
    }
    let shown = echo(raw);
    match raw.parse::<f64>() {
        // `-0` matches too (a float pattern compares with ==), and is written as 0.
        Ok(0.0) => Ok(Some(ReadingValue::Value(0.0))),
        Ok(v) if v.is_nan() => Err(format!(
            "expected a reading (a number, `open` or `OL`), found \"{shown}\""
        )),
        Ok(v) if v < 0.0 => Err(format!(
            "a reading cannot be negative, found \"{shown}\": give the meter's reading without its sign"
        )),
        Ok(v) if v > MAX_READING => Err(format!(
            "\"{shown}\" is above 1e9, beyond any meter a bar-to-bar or drop test uses (a gigaohm in ohms, a thousand kilovolts in millivolts): write `open` for an open circuit"
        )),
        Ok(v) if v < MIN_READING => Err(format!(
            "\"{shown}\" is below 1e-9, finer than any meter resolves: write 0 for a dead short"
        )),
        Ok(v) => Ok(Some(ReadingValue::Value(v))),
        Err(_) => Err(format!(
            "expected a reading (a number, `open` or `OL`), found \"{shown}\""
        )),
    }
}
