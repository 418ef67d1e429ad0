//! `parse_design`: TOML text → validated [`Design`], or the first located [`Diagnostic`].
//!
//! Part of the `design` stage: no I/O. The CLI reads the bytes and hands them here. This file
//! only orchestrates: it checks UTF-8 and TOML, refuses unknown tables, and calls the table
//! readers in `tables/` in a fixed order, so the first problem in that order is the one
//! reported. Each table's keys, reading and validation live in its reader.

use toml::de::DeTable;

use super::Diagnostic;
use super::limits::Limits;
use super::model::*;
use super::reader::{Source, TableReader, nearest};
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
pub fn parse_design_bytes(bytes: &[u8], file: &str) -> Result<Design, Diagnostic> {
    match std::str::from_utf8(bytes) {
        Ok(text) => parse_design(text, file),
        Err(e) => {
            let good = &bytes[..e.valid_up_to()];
            let text = String::from_utf8_lossy(good);
            let line = text.matches('\n').count() + 1;
            let line_start = text.rfind('\n').map_or(0, |i| i + 1);
            let column = text[line_start..].chars().count() + 1;
            Err(Diagnostic {
                file: file.to_string(),
                line,
                column,
                span: e.valid_up_to()..e.valid_up_to() + 1,
                key: "file".to_string(),
                message: format!(
                    "the file is not UTF-8 text: byte 0x{:02X} at line {line}, column {column} is not valid",
                    bytes[e.valid_up_to()]
                ),
                hint: Some("save the design as UTF-8 plain text (a TOML file)".to_string()),
                source_line: text[line_start..].to_string(),
            })
        }
    }
}

/// Parses and validates a design held in `text`; `file` names it in diagnostics.
pub fn parse_design(text: &str, file: &str) -> Result<Design, Diagnostic> {
    let src = Source { file, text };
    if text.trim().is_empty() {
        return Err(src
            .error(
                0..0,
                "file",
                "the design file is empty: expected [armature] and [winding] tables",
            )
            .with_hint("run `armsheet new design.toml` to write a commented starter design"));
    }
    let root = DeTable::parse(text).map_err(|e| toml_error(&src, &e))?;
    let root_table = root.get_ref();
    for (k, v) in root_table.iter() {
        let word: &str = k.get_ref();
        if !TABLES.contains(&word) {
            let d = src.error(
                k.span(),
                word,
                format!("unknown table or key `{word}` at the top level"),
            );
            return Err(match nearest(word, TABLES) {
                Some(n) => d.with_hint(format!("did you mean [{n}]?")),
                None => d.with_hint(format!("a design holds the tables {}", tables_list())),
            });
        }
        if !v.get_ref().is_table() {
            return Err(src
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
                )));
        }
    }
    let empty = DeTable::default();
    let table = |name: &'static str| -> Option<TableReader<'_, '_>> {
        root_table.get(name).map(|v| TableReader {
            src,
            name,
            table: v.get_ref().as_table().unwrap_or(&empty),
            span: header_span(text, name).unwrap_or_else(|| v.span()),
        })
    };
    let missing_table = |name: &str, example: &str| {
        let end = text.len();
        src.error(
            end..end,
            format!("[{name}]"),
            format!("missing table [{name}]"),
        )
        .with_hint(format!(
            "add the table, for example:\n    [{name}]\n    {example}"
        ))
    };

    let job = match table("job") {
        Some(t) => job::read(&t)?,
        None => Job::default(),
    };
    let arm =
        table("armature").ok_or_else(|| missing_table("armature", "poles = 4\n    slots = 24"))?;
    let win = table("winding")
        .ok_or_else(|| missing_table("winding", "type = \"lap\"\n    turns = 2"))?;
    // Both tables' keys are checked before any value, so a misspelt key is reported first.
    arm.deny_unknown(armature::KEYS)?;
    win.deny_unknown(winding::KEYS)?;
    let a = armature::read(&arm)?;
    let w = winding::read(&win, &arm, &a)?;
    let r = rating::read(&src, &win, table("rating").as_ref())?;
    let conductor = table("conductor")
        .map(|t| conductor::read(&t))
        .transpose()?;
    let core = table("core").map(|t| core::read(&t)).transpose()?;
    let commutator = table("commutator")
        .map(|t| commutator::read(&t, w.segments))
        .transpose()?;
    let limits = match table("limits") {
        Some(t) => limits::read(&t)?,
        None => Limits::default(),
    };

    Ok(Design {
        file_name: file.to_string(),
        job,
        poles: a.poles.value as u32,
        slots: a.slots.value as u32,
        coils_per_slot: a.coils_per_slot as u32,
        segments: w.segments as u32,
        segments_derived: a.segments.is_none(),
        rotation: a.rotation,
        pole_arc: a.pole_arc,
        winding_type: w.winding_type,
        multiplicity: w.multiplicity as u32,
        direction: w.direction,
        span: w.span,
        span_source: w.span_source,
        turns: w.turns as u32,
        lead_offset: w.lead_offset as i32,
        equalizers: w.equalizers,
        flux_per_pole_mwb: r.flux_per_pole_mwb,
        speed_rpm: r.speed_rpm,
        mode: r.mode,
        rating: r.rating,
        conductor,
        core,
        commutator,
        limits,
    })
}

fn tables_list() -> String {
    TABLES
        .iter()
        .map(|t| format!("[{t}]"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// Finds the `[name]` header line so a missing key can point at it.
fn header_span(text: &str, name: &str) -> Option<std::ops::Range<usize>> {
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

fn toml_error(src: &Source<'_>, e: &toml::de::Error) -> Diagnostic {
    let span = e.span().unwrap_or(0..0);
    let msg = e.message().trim().to_string();
    src.error(span, "file", format!("this is not valid TOML: {msg}"))
        .with_hint("each line is `key = value`; text goes in quotes, tables are `[name]` on their own line")
}
