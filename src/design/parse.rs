//! `parse_design`: TOML text → validated [`Design`], or every located [`Diagnostic`] found.
//!
//! Part of the `design` stage: no I/O. The CLI reads the bytes and hands them here. This file
//! only orchestrates: it checks UTF-8 and TOML, refuses unknown tables, and calls the table
//! readers in `tables/` in a fixed order. A reader records a problem and the reading goes on
//! with the next table (and, where its keys are independent, the next key), so the problems
//! of a file are reported together, in source order, up to [`super::MAX_DIAGNOSTICS`]. A table whose
//! values a later one needs (`[armature]` for `[winding]`, `[winding]`'s segment count for the
//! brush width) is skipped by that later reader when in error. Reading stops at the first
//! problem when the rest would mean nothing: not UTF-8, not TOML, an unknown or missing
//! table. Each table's keys, reading and validation live in its reader.

use toml::de::DeTable;

use crate::base::visible::{ECHO_WIDTH, clip};

use super::Diagnostic;
use super::build::DesignSpec;
use super::diagnostic::Diagnostics;
use super::model::*;
use super::reader::{Found, Source, TableReader, nearest, units_of};
use super::tables::{armature, commutator, conductor, core, job, limits, rating, winding};

/// The tables a design may hold, in the order of the design-file reference.
const TABLES: &[&str] = &[
    "job",
    "armature",
    "winding",
    "rating",
    "conductor",
    "core",
    "commutator",
    "limits",
];

/// Parses raw bytes: checks UTF-8 first, naming the line and column of the first bad byte.
pub fn parse_design_bytes(bytes: &[u8], file: &str) -> Result<Design, Diagnostics> {
    parse_design(utf8(bytes, file, "design")?, file)
}

/// The bytes as text, or the located error at the first byte that is not UTF-8 (for design
/// files and data cards alike; `what` names the kind of file in the hint).
pub(crate) fn utf8<'b>(bytes: &'b [u8], file: &str, what: &str) -> Result<&'b str, Diagnostics> {
    std::str::from_utf8(bytes).map_err(|e| {
        let good = &bytes[..e.valid_up_to()];
        let text = String::from_utf8_lossy(good);
        let line = text.matches('\n').count() + 1;
        let line_start = text.rfind('\n').map_or(0, |i| i + 1);
        let column = text[line_start..].chars().count() + 1;
        Diagnostics::from(Diagnostic {
            file: file.to_string(),
            line,
            column,
            span: e.valid_up_to()..e.valid_up_to() + 1,
            key: "file".to_string(),
            message: format!(
                "the file is not UTF-8 text: byte 0x{:02X} at line {line}, column {column} is not valid",
                bytes[e.valid_up_to()]
            ),
            hint: Some(format!("save the {what} as UTF-8 plain text (a TOML file)")),
            source_line: text[line_start..].to_string(),
        })
    })
}

/// Parses and validates a design held in `text`; `file` names it in diagnostics. On failure
/// every problem found is returned, in source order.
pub fn parse_design(text: &str, file: &str) -> Result<Design, Diagnostics> {
    read_all(text, file, "design", |found| read_design(text, file, found))
}

/// Runs `read` with a fresh record of problems and returns what it read, or every problem
/// recorded (in source order) followed by the one that stopped it. `what` names the kind of
/// file ("design", "card") in the fallback message.
pub(super) fn read_all<T>(
    text: &str,
    file: &str,
    what: &str,
    read: impl FnOnce(&Found) -> Result<Option<T>, Diagnostic>,
) -> Result<T, Diagnostics> {
    let found = Found::default();
    let result = read(&found);
    let mut list = found.into_vec();
    let value = result.unwrap_or_else(|stop| {
        list.push(stop);
        None
    });
    match Diagnostics::new(list) {
        Some(all) => Err(all),
        None => value.ok_or_else(|| {
            // Not reached: a reader that returns nothing records why.
            Diagnostic::new(
                file,
                text,
                0..0,
                "file",
                format!("the {what} could not be read"),
            )
            .into()
        }),
    }
}

/// Opens a document of `src`: refuses an empty one (`expect` says what it should hold, `hint`
/// how to start one), parses the TOML, checks its tables with `tables`, and settles its one
/// length system ([`units_of`]). The design, card and frame readers all start here.
pub(crate) fn open_document<'s>(
    src: Source<'s>,
    (expect, hint): (&str, &str),
    tables: fn(&Source<'_>, &DeTable<'_>) -> Result<(), Diagnostic>,
) -> Result<(Source<'s>, toml::Spanned<DeTable<'s>>), Diagnostic> {
    if src.text.trim().is_empty() {
        return Err(src.error(0..0, "file", expect).with_hint(hint));
    }
    let root = DeTable::parse(src.text).map_err(|e| toml_error(&src, &e))?;
    tables(&src, root.get_ref())?;
    let src = Source {
        units: units_of(&src, root.get_ref())?,
        ..src
    };
    Ok((src, root))
}

/// The tables of a document [`open_document`] opened, by name: each read by a
/// [`TableReader`] spanning its header (a value that is no table reads as `empty`; the
/// document's table check has refused it already).
pub(crate) fn tables<'a, 'i>(
    src: Source<'a>,
    root: &'a DeTable<'i>,
    empty: &'a DeTable<'i>,
) -> impl Fn(&'static str) -> Option<TableReader<'a, 'i>> {
    move |name| {
        root.get(name).map(|v| TableReader {
            src,
            name,
            table: v.get_ref().as_table().unwrap_or(empty),
            span: header_span(src.text, name).unwrap_or_else(|| v.span()),
        })
    }
}

/// The error for a missing table `[name]`, at the end of the file, with an `example` of its
/// keys.
pub(crate) fn missing_table(src: &Source<'_>, name: &str, example: &str) -> Diagnostic {
    let end = src.text.len();
    src.error(
        end..end,
        format!("[{name}]"),
        format!("missing table [{name}]"),
    )
    .with_hint(format!(
        "add the table, for example:\n    [{name}]\n    {example}"
    ))
}

/// Reads the design, recording problems in `found`: `Ok(None)` when any was recorded, `Err`
/// for a problem that stops the reading (reported after those recorded before it).
fn read_design(text: &str, file: &str, found: &Found) -> Result<Option<Design>, Diagnostic> {
    let (src, root) = open_document(
        Source::new(file, text, found),
        (
            "the design file is empty: expected [armature] and [winding] tables",
            "run `armsheet new design.toml` to write a commented starter design",
        ),
        check_tables,
    )?;
    let empty = DeTable::default();
    let table = tables(src, root.get_ref(), &empty);
    let missing_table = |name: &str, example: &str| missing_table(&src, name, example);

    let job = table("job").map_or_else(Job::default, |t| job::read(&t));
    let arm =
        table("armature").ok_or_else(|| missing_table("armature", "poles = 4\n    slots = 24"))?;
    let win = table("winding")
        .ok_or_else(|| missing_table("winding", "type = \"lap\"\n    turns = 2"))?;
    // A table with required keys is not read further when it has an unknown key: a misspelt
    // key would only come back as a missing one.
    let arm_keys = src.keep(arm.deny_unknown(armature::KEYS));
    let win_keys = src.keep(win.deny_unknown(winding::KEYS));
    let a = arm_keys.and_then(|()| armature::read(&arm));
    let w = win_keys.and_then(|()| winding::read(&win, &arm, a.as_ref()));
    let r = src.keep(rating::read(&src, &win, table("rating").as_ref()));
    let conductor = table("conductor").map(|t| conductor::read(&t));
    let core = table("core").map(|t| core::read(&t));
    let against = w
        .as_ref()
        .zip(a.as_ref())
        .map(|(w, a)| commutator::Against {
            segments: w.segments,
            poles: a.poles.value,
            winding_type: w.winding_type,
        });
    let commutator = table("commutator").map(|t| commutator::read(&t, against));
    let limits = table("limits").map(|t| src.keep(limits::read(&t)));
    let (Some(a), Some(w), Some(r)) = (a, w, r) else {
        return Ok(None);
    };
    if found.any() {
        return Ok(None);
    }
    let conductor = conductor.flatten();
    let core = core.flatten();
    let commutator = commutator.flatten();
    let limits = limits.flatten().unwrap_or_default();

    // The readers have checked every value where it stands in the file; the constructor
    // checks them again as a whole (a second guard) and fills in the defaults.
    Design::new(DesignSpec {
        file_name: file.to_string(),
        units: src.units,
        job,
        poles: a.poles.value as u32,
        slots: a.slots.value as u32,
        coils_per_slot: a.coils_per_slot as u32,
        // Given, or worked out again by the constructor as `segments::resolve` did.
        segments: a.segments.map(|_| w.segments as u32),
        rotation: a.rotation,
        pole_arc: a.pole_arc,
        winding_type: w.winding_type,
        multiplicity: w.multiplicity as u32,
        direction: w.direction,
        span: w.span,
        span_source: w.span_source,
        turns: w.turns as u32,
        wave_span: w.wave_coils.0,
        wave_turns: w.wave_coils.1,
        lead_offset: HalfBars(w.lead_offset as i32),
        equalizers: w.equalizers,
        dummy_coils: w.dummy_coils,
        flux_per_pole_mwb: r.flux_per_pole_mwb,
        speed_rpm: r.speed_rpm,
        mode: r.mode,
        rating: r.rating,
        conductor,
        core,
        commutator,
        limits,
    })
    .map(Some)
    .map_err(|e| Diagnostic::new(file, text, 0..0, e.key, e.message))
}

/// The top level of a design: only the tables of [`TABLES`], each a table.
fn check_tables(src: &Source<'_>, root_table: &DeTable<'_>) -> Result<(), Diagnostic> {
    for (k, v) in root_table.iter() {
        let word: &str = k.get_ref();
        if !TABLES.contains(&word) {
            let d = src.error(
                k.span(),
                word,
                format!(
                    "unknown table or key `{}` at the top level",
                    clip(word, ECHO_WIDTH)
                ),
            );
            return Err(match nearest(word, TABLES) {
                Some(n) => d.with_hint(format!("did you mean [{n}]?")),
                None => d.with_hint(format!("a design holds the tables {}", tables_list())),
            });
        }
        expect_table(src, word, v)?;
    }
    Ok(())
}

/// Refuses a top-level key `word` whose value `v` is not a table.
pub(crate) fn expect_table(
    src: &Source<'_>,
    word: &str,
    v: &toml::Spanned<toml::de::DeValue<'_>>,
) -> Result<(), Diagnostic> {
    if v.get_ref().is_table() {
        return Ok(());
    }
    Err(src
        .error(
            v.span(),
            word,
            format!(
                "expected a table [{word}], found {}",
                v.get_ref().type_str()
            ),
        )
        .with_hint(format!(
            "write `[{word}]` on a line of its own and the keys under it"
        )))
}

fn tables_list() -> String {
    TABLES
        .iter()
        .map(|t| format!("[{t}]"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// Finds the `[name]` header line so a missing key can point at it.
pub(crate) fn header_span(text: &str, name: &str) -> Option<std::ops::Range<usize>> {
    let mut offset = 0;
    for line in text.split_inclusive('\n') {
        let trimmed = line.trim_start();
        if let Some(rest) = trimmed.strip_prefix('[') {
            let inner = rest.split(']').next().unwrap_or("").trim();
            if inner == name {
                let start = offset + (line.len() - trimmed.len());
                let len = trimmed
                    .find(']')
                    .map_or(trimmed.trim_end().len(), |i| i + 1);
                return Some(start..start + len);
            }
        }
        offset += line.len();
    }
    None
}

pub(crate) fn toml_error(src: &Source<'_>, e: &toml::de::Error) -> Diagnostic {
    let span = e.span().unwrap_or(0..0);
    let msg = e.message().trim();
    let text = src.text;
    let at = span.start.min(text.len());
    let line_start = text[..at].rfind('\n').map_or(0, |i| i + 1);
    let table = table_above(&text[..line_start]);
    let line = &text[line_start..];
    let line = &line[..line.find('\n').unwrap_or(line.len())];
    let key = key_of_line(line);
    let dotted = match (&table, key) {
        (Some(t), Some(k)) => format!("{t}.{k}"),
        (None, Some(k)) => k.to_string(),
        (Some(t), None) if !line.trim_start().starts_with('[') => format!("[{t}]"),
        _ => "file".to_string(),
    };
    if msg == "duplicate key"
        && let Some(k) = key
    {
        let within = match &table {
            Some(t) => format!(" in [{t}]"),
            None => String::new(),
        };
        let first = first_definition(text, line_start, k)
            .map_or(String::new(), |n| format!(": first defined on line {n}"));
        return src
            .error(span, dotted, format!("duplicate key `{k}`{within}{first}"))
            .with_hint("a key is given once in its table: remove one of the two lines");
    }
    if msg == "duplicate key" && line.trim_start().starts_with('[') {
        let name = line.trim().trim_matches(['[', ']']).trim();
        let first = header_span(text, name)
            .filter(|h| h.start < line_start)
            .map_or(String::new(), |h| {
                format!(
                    ": first defined on line {}",
                    text[..h.start].matches('\n').count() + 1
                )
            });
        return src
            .error(
                span,
                format!("[{}]", clip(name, ECHO_WIDTH)),
                format!("duplicate table [{}]{first}", clip(name, ECHO_WIDTH)),
            )
            .with_hint("a table is given once: move its keys under the first header");
    }
    let hint = if key.is_some_and(|k| k == "date" || k.ends_with("_date")) && msg.contains("date") {
        "write the date as YYYY-MM-DD (a real day), or as text in quotes: `date = \"15 March 2024\"`"
    } else {
        "each line is `key = value`; text goes in quotes, tables are `[name]` on their own line"
    };
    src.error(span, dotted, format!("this is not valid TOML: {msg}"))
        .with_hint(hint)
}

/// The name of the last `[table]` header in `text`, if any.
fn table_above(text: &str) -> Option<String> {
    text.lines().rev().find_map(|l| {
        let l = l.trim();
        let inner = l.strip_prefix('[')?.split(']').next()?;
        let inner = inner.trim_start_matches('[').trim();
        (!inner.is_empty() && inner.chars().all(is_bare_key_char)).then(|| inner.to_string())
    })
}

/// The bare (possibly dotted) key a `key = value` line begins with.
fn key_of_line(line: &str) -> Option<&str> {
    let (key, _) = line.split_once('=')?;
    let key = key.trim();
    (!key.is_empty() && key.chars().all(is_bare_key_char)).then_some(key)
}

fn is_bare_key_char(c: char) -> bool {
    c.is_ascii_alphanumeric() || matches!(c, '_' | '-' | '.')
}

/// The 1-based line where `key` is first given in the table that holds byte `before`.
fn first_definition(text: &str, before: usize, key: &str) -> Option<usize> {
    let head = &text[..before];
    // The table starts after the last header line above `before`.
    let mut from = 0;
    let mut offset = 0;
    for l in head.split_inclusive('\n') {
        if l.trim_start().starts_with('[') {
            from = offset + l.len();
        }
        offset += l.len();
    }
    let mut n = head[..from].matches('\n').count();
    for l in head[from..].split_inclusive('\n') {
        n += 1;
        if key_of_line(l) == Some(key) {
            return Some(n);
        }
    }
    None
}
