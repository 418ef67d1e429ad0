//! `parse_design`: TOML text → validated [`Design`], or the first located [`Diagnostic`].
//!
//! Part of the `design` stage: no I/O. The CLI reads the bytes and hands them here.

use toml::de::{DeTable, DeValue};

use super::Diagnostic;
use super::model::*;
use super::reader::{At, Source, TableReader, nearest};
use crate::theory::wave_pitch_whole;

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
const JOB_KEYS: &[&str] = &["id", "title", "customer", "date", "notes"];
const ARMATURE_KEYS: &[&str] = &[
    "poles",
    "slots",
    "coils_per_slot",
    "segments",
    "rotation",
    "pole_arc",
];
const WINDING_KEYS: &[&str] = &[
    "type",
    "multiplicity",
    "direction",
    "span",
    "turns",
    "lead_offset",
    "equalizers",
    "flux_per_pole_mwb",
    "speed_rpm",
];
const RATING_KEYS: &[&str] = &[
    "voltage",
    "current",
    "speed_rpm",
    "mode",
    "thermal_class",
    "flux_per_pole_mwb",
];
const CONDUCTOR_KEYS: &[&str] = &[
    "diameter_mm",
    "awg",
    "strands",
    "width_mm",
    "height_mm",
    "corner_radius_mm",
    "mean_turn_mm",
];
const CORE_KEYS: &[&str] = &["diameter_mm", "length_mm"];
const COMMUTATOR_KEYS: &[&str] = &[
    "diameter_mm",
    "brush_width_mm",
    "brush_width_segments",
    "brush_grade",
];
/// `[limits]` keys, in the order of [`Limits`]' fields.
pub const LIMIT_KEYS: &[&str] = &[
    "segment_volts_avg_max",
    "segment_volts_peak_max",
    "path_current_max",
    "brush_arm_current_max",
    "segment_pitch_min_mm",
    "commutator_speed_preferred_m_s",
    "commutator_speed_max_m_s",
    "current_density_min_a_mm2",
    "current_density_max_a_mm2",
    "brush_width_min_segments",
    "brush_width_max_segments",
    "electric_loading_max_a_m",
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
        Some(t) => read_job(&t)?,
        None => Job::default(),
    };
    let arm =
        table("armature").ok_or_else(|| missing_table("armature", "poles = 4\n    slots = 24"))?;
    let win = table("winding")
        .ok_or_else(|| missing_table("winding", "type = \"lap\"\n    turns = 2"))?;
    arm.deny_unknown(ARMATURE_KEYS)?;
    win.deny_unknown(WINDING_KEYS)?;

    // [armature]
    let poles = arm
        .int(
            "poles",
            2..=bounds::MAX_POLES,
            "the number of poles",
            "a DC machine has 2, 4, 6, 8 … poles",
        )?
        .ok_or_else(|| arm.missing("poles", "the number of poles", "poles = 4"))?;
    if poles.value % 2 != 0 {
        return Err(src
            .error(
                poles.span.clone(),
                "armature.poles",
                format!("poles must be even, found {}", poles.value),
            )
            .with_hint(format!(
                "poles come in north-south pairs: try {} or {}",
                poles.value - 1,
                poles.value + 1
            )));
    }
    let slots = arm
        .int(
            "slots",
            2..=bounds::MAX_SLOTS,
            "the number of armature slots",
            "count the slots on the stripped core",
        )?
        .ok_or_else(|| arm.missing("slots", "the number of armature slots", "slots = 24"))?;
    let u = arm
        .int(
            "coils_per_slot",
            1..=bounds::MAX_COILS_PER_SLOT,
            "coil sides per slot per layer",
            "1 for one coil side per layer; 2 or 3 when each slot holds several coils",
        )?
        .map_or(1, |a| a.value);
    let positions = slots.value * u;
    if positions > bounds::MAX_COILS {
        let at = arm
            .raw("coils_per_slot")
            .map_or(slots.span.clone(), |v| v.span());
        return Err(src
            .error(
                at,
                "armature.coils_per_slot",
                format!(
                    "{} slots × {u} coils per slot = {positions} coils is beyond any real machine: at most {} coils",
                    slots.value,
                    bounds::MAX_COILS
                ),
            )
            .with_hint("check the slot count and coils per slot"));
    }
    let segments = arm.int(
        "segments",
        2..=bounds::MAX_COILS,
        "the number of commutator segments (bars)",
        "count the bars; leave the key out to let armsheet work it out",
    )?;
    let rotation = match arm.choice("rotation", &["cw", "ccw"])? {
        Some(At { value: "ccw", .. }) => Rotation::CounterClockwise,
        _ => Rotation::Clockwise,
    };
    let pole_arc = arm
        .number(
            "pole_arc",
            0.3,
            false,
            1.0,
            "the pole arc as a fraction of the pole pitch",
        )?
        .map_or(0.7, |a| a.value);

    // [winding]
    let wtype = match win.choice("type", &["lap", "wave"])? {
        Some(At { value: "wave", .. }) => WindingType::Wave,
        Some(_) => WindingType::Lap,
        None => return Err(win.missing("type", "\"lap\" or \"wave\"", "type = \"lap\"")),
    };
    let m = win
        .int(
            "multiplicity",
            1..=bounds::MAX_MULTIPLICITY,
            "the multiplicity (1 simplex, 2 duplex, 3 triplex)",
            "use 1 for a simplex winding",
        )?
        .map_or(1, |a| a.value);
    let direction = match win.choice("direction", &["progressive", "retrogressive"])? {
        Some(At {
            value: "retrogressive",
            ..
        }) => Direction::Retrogressive,
        _ => Direction::Progressive,
    };
    let p = poles.value / 2;
    if wtype == WindingType::Wave && p < 2 {
        let at = win.raw("type").map_or(win.span.clone(), |v| v.span());
        return Err(src
            .error(
                at,
                "winding.type",
                "a wave winding needs at least 4 poles; with 2 poles it is a lap winding",
            )
            .with_hint("use type = \"lap\" for a 2-pole armature"));
    }
    let turns = win
        .int(
            "turns",
            1..=bounds::MAX_TURNS,
            "turns per coil",
            "count the turns of one coil",
        )?
        .ok_or_else(|| win.missing("turns", "turns per coil", "turns = 3"))?;
    let (span, span_source) = read_span(&win, slots.value, poles.value)?;

    // Active coils: lap uses every position; wave may need dummies.
    let active = resolve_segments(
        &src,
        &win,
        &arm,
        wtype,
        direction,
        positions,
        m,
        p,
        segments.as_ref(),
    )?;
    if active < (m + 1) * poles.value {
        let at = segments
            .as_ref()
            .map_or(slots.span.clone(), |s| s.span.clone());
        return Err(src
            .error(
                at,
                "armature.segments",
                format!(
                    "{active} segments is too few for {} poles and multiplicity {m}: expected at least {} ((m + 1) segments per pole)",
                    poles.value,
                    (m + 1) * poles.value
                ),
            )
            .with_hint("the brushes of neighbouring poles would touch; check the poles, slots and coils per slot"));
    }

    let lead_offset = win.int(
        "lead_offset",
        -1000..=1000,
        "the lead offset in segments",
        "0 puts each coil's two segments either side of its centre line",
    )?;
    if let Some(lo) = &lead_offset
        && 2 * poles.value * lo.value.abs() >= active
    {
        return Err(src
                .error(
                    lo.span.clone(),
                    "winding.lead_offset",
                    format!(
                        "lead offset {} is half a pole pitch or more: expected |lead_offset| < {} segments ({active} segments, {} poles)",
                        lo.value,
                        fmt_half_pitch(active, poles.value),
                        poles.value
                    ),
                )
                .with_hint("the offset swings the leads a few segments from the symmetric position; measure it on the old winding"));
    }
    let equalizers = read_equalizers(&win, wtype)?;

    // [rating], [conductor], [core], [commutator], [limits]
    let rating_t = table("rating");
    if let Some(t) = &rating_t {
        t.deny_unknown(RATING_KEYS)?;
    }
    let flux = merge_optional(
        &src,
        win.number(
            "flux_per_pole_mwb",
            0.0,
            true,
            100_000.0,
            "the flux per pole in mWb",
        )?,
        rating_t
            .as_ref()
            .map(|t| {
                t.number(
                    "flux_per_pole_mwb",
                    0.0,
                    true,
                    100_000.0,
                    "the flux per pole in mWb",
                )
            })
            .transpose()?
            .flatten(),
        "flux_per_pole_mwb",
    )?;
    let speed = merge_optional(
        &src,
        win.number("speed_rpm", 0.0, true, 200_000.0, "the speed in rpm")?,
        rating_t
            .as_ref()
            .map(|t| t.number("speed_rpm", 0.0, true, 200_000.0, "the speed in rpm"))
            .transpose()?
            .flatten(),
        "speed_rpm",
    )?;
    let (mode, rating) = match &rating_t {
        Some(t) => read_rating(t)?,
        None => (Mode::Motor, None),
    };
    let conductor = table("conductor").map(|t| read_conductor(&t)).transpose()?;
    let core = table("core").map(|t| read_core(&t)).transpose()?;
    let commutator = table("commutator")
        .map(|t| read_commutator(&t, active))
        .transpose()?;
    let limits = match table("limits") {
        Some(t) => read_limits(&t)?,
        None => Limits::default(),
    };

    Ok(Design {
        file_name: file.to_string(),
        job,
        poles: poles.value as u32,
        slots: slots.value as u32,
        coils_per_slot: u as u32,
        segments: active as u32,
        segments_derived: segments.is_none(),
        rotation,
        pole_arc,
        winding_type: wtype,
        multiplicity: m as u32,
        direction,
        span,
        span_source,
        turns: turns.value as u32,
        lead_offset: lead_offset.map_or(0, |l| l.value as i32),
        equalizers,
        flux_per_pole_mwb: flux,
        speed_rpm: speed,
        mode,
        rating,
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

fn fmt_half_pitch(c: i64, poles: i64) -> String {
    let half = c as f64 / (2.0 * poles as f64);
    super::reader::fmt_num((half * 100.0).round() / 100.0)
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

fn read_job(t: &TableReader<'_, '_>) -> Result<Job, Diagnostic> {
    t.deny_unknown(JOB_KEYS)?;
    let s = |k| t.string(k).map(|o| o.map(|a| a.value));
    Ok(Job {
        id: s("id")?,
        title: s("title")?,
        customer: s("customer")?,
        date: s("date")?,
        notes: s("notes")?,
    })
}

fn read_span(
    t: &TableReader<'_, '_>,
    slots: i64,
    poles: i64,
) -> Result<(u32, SpanSource), Diagnostic> {
    let Some(v) = t.raw("span") else {
        return Ok(((slots / poles).max(1) as u32, SpanSource::Default));
    };
    let src = t.src;
    let max = slots - 1;
    let hint = format!("the span is in slots: 1 to {max}; near {slots}/{poles} = one pole pitch");
    let value = match v.get_ref() {
        DeValue::Integer(_) => t
            .int("span", i64::MIN..=i64::MAX, "the coil span in slots", &hint)?
            .map(|a| a.value),
        DeValue::String(s) => {
            let norm = s.replace(['–', '—'], "-");
            let parts: Vec<&str> = norm.split('-').map(str::trim).collect();
            match parts.as_slice() {
                [a, b] => match (a.parse::<i64>(), b.parse::<i64>()) {
                    (Ok(a), Ok(b)) if a >= 1 && b > a => Some(b - a),
                    _ => None,
                },
                _ => None,
            }
            .ok_or_else(|| {
                src.error(
                    v.span(),
                    "winding.span",
                    format!("expected a span such as 7 or \"1-8\", found \"{s}\""),
                )
                .with_hint(
                    "the shop form \"1-8\" means the coil lies in slots 1 and 8, a span of 7 slots",
                )
            })
            .map(Some)?
        }
        other => {
            return Err(src
                .error(
                    v.span(),
                    "winding.span",
                    format!(
                        "expected a span such as 7 or \"1-8\", found {}",
                        other.type_str()
                    ),
                )
                .with_hint(hint));
        }
    };
    let value = value.unwrap_or(0);
    if value < 1 || value > max {
        return Err(src
            .error(
                v.span(),
                "winding.span",
                format!(
                    "span {value} is out of range: expected 1 to {max} slots for {slots} slots"
                ),
            )
            .with_hint(hint));
    }
    Ok((value as u32, SpanSource::Given))
}

#[allow(clippy::too_many_arguments)]
fn resolve_segments(
    src: &Source<'_>,
    win: &TableReader<'_, '_>,
    arm: &TableReader<'_, '_>,
    wtype: WindingType,
    direction: Direction,
    positions: i64,
    m: i64,
    p: i64,
    given: Option<&At<i64>>,
) -> Result<i64, Diagnostic> {
    match (wtype, given) {
        (WindingType::Lap, None) => Ok(positions),
        (WindingType::Lap, Some(c)) if c.value == positions => Ok(positions),
        (WindingType::Lap, Some(c)) => Err(src
            .error(
                c.span.clone(),
                arm.dotted("segments"),
                format!(
                    "a lap winding uses every coil: expected {positions} segments (slots × coils_per_slot), found {}",
                    c.value
                ),
            )
            .with_hint(format!(
                "set segments = {positions}, or change coils_per_slot; dummy coils belong to wave windings"
            ))),
        (WindingType::Wave, None) => {
            wtype
                .kind()
                .default_segments(positions as u32, m as u32, p as u32, direction)
                .map(i64::from)
                .ok_or_else(|| {
                    let at = win.raw("type").map_or(win.span.clone(), |v| v.span());
                    src.error(at, "winding.type", "no segment count up to the coil count gives a whole commutator pitch")
                        .with_hint("check poles and multiplicity")
                })
        }
        (WindingType::Wave, Some(c)) => {
            let sign = direction.sign();
            let workable =
                |n: i64| n >= 2 && wave_pitch_whole(n as u32, m as u32, p as u32, direction);
            if c.value > positions {
                let below = (2..=positions).rev().find(|&n| workable(n));
                return Err(src
                    .error(
                        c.span.clone(),
                        arm.dotted("segments"),
                        format!(
                            "{} segments is more than the {positions} coils (slots × coils_per_slot): each segment needs a coil",
                            c.value
                        ),
                    )
                    .with_hint(match below {
                        Some(b) => format!("the nearest workable count is {b} ({} dummy coil(s))", positions - b),
                        None => "raise coils_per_slot or slots".to_string(),
                    }));
            }
            if !workable(c.value) {
                let below = (2..c.value).rev().find(|&n| workable(n));
                let above = (c.value + 1..=positions).find(|&n| workable(n));
                let near: Vec<String> = below
                    .into_iter()
                    .chain(above)
                    .map(|n| format!("{n} ({} dummy coil(s))", positions - n))
                    .collect();
                let other = wave_pitch_whole(c.value as u32, m as u32, p as u32, direction.other());
                let mut hint = if near.is_empty() {
                    "no count up to the coil count works".to_string()
                } else {
                    format!("the nearest workable count(s): {}", near.join(" or "))
                };
                if other {
                    let other_dir = direction.other().as_str();
                    hint.push_str(&format!("; or keep {} and make the winding {other_dir}", c.value));
                }
                let sym = if sign > 0 { "+" } else { "−" };
                return Err(src
                    .error(
                        c.span.clone(),
                        arm.dotted("segments"),
                        format!(
                            "a {} wave winding needs (C {sym} m)/p to be a whole number: ({} {sym} {m})/{p} is not",
                            direction.as_str(),
                            c.value
                        ),
                    )
                    .with_hint(hint));
            }
            Ok(c.value)
        }
    }
}

fn read_equalizers(
    t: &TableReader<'_, '_>,
    wtype: WindingType,
) -> Result<EqualizerChoice, Diagnostic> {
    let Some(v) = t.raw("equalizers") else {
        return Ok(EqualizerChoice::None);
    };
    let choice = match v.get_ref() {
        DeValue::String(_) => match t.choice("equalizers", &["none", "full"])? {
            Some(At { value: "full", .. }) => EqualizerChoice::Full,
            _ => EqualizerChoice::None,
        },
        DeValue::Integer(_) => {
            let n = t
                .int(
                    "equalizers",
                    1..=10_000,
                    "\"none\", \"full\" or every n-th possible connection",
                    "2 fits every second connection",
                )?
                .map_or(1, |a| a.value);
            if n == 1 {
                EqualizerChoice::Full
            } else {
                EqualizerChoice::EveryNth(n as u32)
            }
        }
        other => {
            return Err(t
                .src
                .error(
                    v.span(),
                    "winding.equalizers",
                    format!(
                        "expected \"none\", \"full\" or a whole number n, found {}",
                        other.type_str()
                    ),
                )
                .with_hint("equalizers = 3 fits every third possible connection"));
        }
    };
    if wtype == WindingType::Wave && choice != EqualizerChoice::None {
        return Err(t
            .src
            .error(
                v.span(),
                "winding.equalizers",
                "equalizers belong to lap windings: a wave winding needs none",
            )
            .with_hint("remove the key or set equalizers = \"none\""));
    }
    Ok(choice)
}

fn merge_optional(
    src: &Source<'_>,
    a: Option<At<f64>>,
    b: Option<At<f64>>,
    key: &str,
) -> Result<Option<f64>, Diagnostic> {
    match (a, b) {
        (Some(a), Some(b)) if (a.value - b.value).abs() > 1e-9 * a.value.abs().max(1.0) => Err(src
            .error(
                b.span,
                format!("rating.{key}"),
                format!(
                    "{key} is given twice with different values ({} in [winding], {} in [rating])",
                    a.value, b.value
                ),
            )
            .with_hint("give it once, in [rating]")),
        (Some(a), _) => Ok(Some(a.value)),
        (None, b) => Ok(b.map(|b| b.value)),
    }
}

fn read_rating(t: &TableReader<'_, '_>) -> Result<(Mode, Option<Rating>), Diagnostic> {
    let mode = match t.choice("mode", &["motor", "generator"])? {
        Some(At {
            value: "generator", ..
        }) => Mode::Generator,
        _ => Mode::Motor,
    };
    let voltage = t
        .number(
            "voltage",
            0.0,
            true,
            100_000.0,
            "the rated terminal voltage in V",
        )?
        .map(|a| a.value);
    let current = t
        .number(
            "current",
            0.0,
            true,
            100_000.0,
            "the rated armature current in A",
        )?
        .map(|a| a.value);
    let thermal_class = match t.raw("thermal_class") {
        None => None,
        Some(v) => {
            let word = match v.get_ref() {
                DeValue::Integer(i) => i.as_str().to_string(),
                DeValue::String(s) => s.trim().to_ascii_uppercase(),
                other => other.type_str().to_string(),
            };
            Some(match word.as_str() {
                "105" | "A" => ThermalClass::A,
                "120" | "E" => ThermalClass::E,
                "130" | "B" => ThermalClass::B,
                "155" | "F" => ThermalClass::F,
                "180" | "H" => ThermalClass::H,
                _ => {
                    return Err(t
                        .src
                        .error(v.span(), "rating.thermal_class", format!("expected a thermal class 105, 120, 130, 155 or 180 (A, E, B, F, H), found {word}"))
                        .with_hint("the class is on the nameplate or the insulation system's data, e.g. thermal_class = 155 or \"F\""));
                }
            })
        }
    };
    Ok((
        mode,
        Some(Rating {
            voltage,
            current,
            thermal_class,
        }),
    ))
}

fn read_conductor(t: &TableReader<'_, '_>) -> Result<Conductor, Diagnostic> {
    t.deny_unknown(CONDUCTOR_KEYS)?;
    let num = |k: &str, what: &str, max: f64| t.number(k, 0.0, true, max, what);
    let d = num("diameter_mm", "the bare wire diameter in mm", 20.0)?;
    let awg = t.int(
        "awg",
        -3..=40,
        "the AWG gauge (0000 is -3)",
        "ASTM B258 gauges run from 0000 (-3) to 40",
    )?;
    let strands = t
        .int(
            "strands",
            1..=200,
            "wires or strips in hand",
            "1 for a single conductor",
        )?
        .map_or(1, |a| a.value as u32);
    let w = num("width_mm", "the strip width in mm", 100.0)?;
    let h = num("height_mm", "the strip height in mm", 100.0)?;
    let r = t.number(
        "corner_radius_mm",
        0.0,
        false,
        10.0,
        "the strip corner radius in mm",
    )?;
    let mean_turn_mm = num(
        "mean_turn_mm",
        "the mean length of one turn in mm",
        100_000.0,
    )?
    .map(|a| a.value);
    let shape = match (d, awg, w, h) {
        (Some(_), Some(a), _, _) => {
            return Err(t
                .src
                .error(
                    a.span,
                    "conductor.awg",
                    "give the wire either as diameter_mm or as awg, not both",
                )
                .with_hint("remove one of the two keys"));
        }
        (Some(d), None, None, None) => ConductorShape::Round {
            diameter_mm: d.value,
            awg: None,
            strands,
        },
        (None, Some(a), None, None) => ConductorShape::Round {
            diameter_mm: super::model::awg_diameter_mm(a.value as i32),
            awg: Some(a.value as i32),
            strands,
        },
        (None, None, Some(w), Some(h)) => {
            let rad = r.as_ref().map_or(0.0, |r| r.value);
            if 2.0 * rad > w.value.min(h.value) {
                return Err(t
                    .src
                    .error(
                        r.map_or(w.span, |r| r.span),
                        "conductor.corner_radius_mm",
                        format!(
                            "a corner radius of {rad} mm does not fit a {} × {} mm strip",
                            w.value, h.value
                        ),
                    )
                    .with_hint("the radius is at most half the smaller side"));
            }
            ConductorShape::Rectangular {
                width_mm: w.value,
                height_mm: h.value,
                corner_radius_mm: rad,
                strands,
            }
        }
        (Some(d), None, Some(_), _) | (Some(d), None, _, Some(_)) => {
            return Err(t
                .src
                .error(d.span, "conductor.diameter_mm", "a conductor is either round (diameter_mm or awg) or rectangular (width_mm, height_mm), not both")
                .with_hint("remove the keys of the shape you do not use"));
        }
        (None, Some(a), _, _) => {
            return Err(t
                .src
                .error(a.span, "conductor.awg", "a conductor is either round (diameter_mm or awg) or rectangular (width_mm, height_mm), not both")
                .with_hint("remove the keys of the shape you do not use"));
        }
        (None, None, Some(_), None) => {
            return Err(t.missing("height_mm", "the strip height in mm", "height_mm = 2.5"));
        }
        (None, None, None, Some(_)) => {
            return Err(t.missing("width_mm", "the strip width in mm", "width_mm = 6.3"));
        }
        (None, None, None, None) => {
            return Err(t.missing(
                "diameter_mm",
                "the wire size: diameter_mm, awg, or width_mm and height_mm",
                "diameter_mm = 1.25",
            ));
        }
    };
    Ok(Conductor {
        shape,
        mean_turn_mm,
    })
}

fn read_core(t: &TableReader<'_, '_>) -> Result<Core, Diagnostic> {
    t.deny_unknown(CORE_KEYS)?;
    Ok(Core {
        diameter_mm: t
            .number(
                "diameter_mm",
                0.0,
                true,
                10_000.0,
                "the armature diameter in mm",
            )?
            .map(|a| a.value),
        length_mm: t
            .number("length_mm", 0.0, true, 10_000.0, "the core length in mm")?
            .map(|a| a.value),
    })
}

fn read_commutator(t: &TableReader<'_, '_>, segments: i64) -> Result<Commutator, Diagnostic> {
    t.deny_unknown(COMMUTATOR_KEYS)?;
    let diameter = t.number(
        "diameter_mm",
        0.0,
        true,
        10_000.0,
        "the commutator diameter in mm",
    )?;
    let wmm = t.number(
        "brush_width_mm",
        0.0,
        true,
        1_000.0,
        "the brush width (circumferential) in mm",
    )?;
    let wseg = t.number(
        "brush_width_segments",
        0.0,
        true,
        1_000.0,
        "the brush width in segment pitches",
    )?;
    let brush_width = match (wmm, wseg) {
        (Some(_), Some(s)) => {
            return Err(t
                .src
                .error(
                    s.span,
                    "commutator.brush_width_segments",
                    "give the brush width either in mm or in segments, not both",
                )
                .with_hint("remove one of brush_width_mm and brush_width_segments"));
        }
        (Some(w), None) => {
            if let Some(d) = &diameter {
                let circumference = std::f64::consts::PI * d.value;
                if w.value >= circumference / 2.0 {
                    return Err(t
                        .src
                        .error(w.span, "commutator.brush_width_mm", format!("a {} mm brush is wider than half the commutator's {:.1} mm circumference", w.value, circumference))
                        .with_hint("the brush width is measured around the commutator, usually 1 to 3 segment pitches"));
                }
            }
            Some(BrushWidth::Millimetres(w.value))
        }
        (None, Some(s)) => {
            if s.value >= segments as f64 / 2.0 {
                return Err(t
                    .src
                    .error(s.span, "commutator.brush_width_segments", format!("a brush {} segments wide is wider than half the commutator ({segments} segments)", s.value))
                    .with_hint("brushes usually cover 1 to 3 segments"));
            }
            Some(BrushWidth::Segments(s.value))
        }
        (None, None) => None,
    };
    let brush_grade = match t.choice("brush_grade", &["carbon", "metal-graphite"])? {
        Some(At {
            value: "metal-graphite",
            ..
        }) => Some(BrushGrade::MetalGraphite),
        Some(_) => Some(BrushGrade::Carbon),
        None => None,
    };
    Ok(Commutator {
        diameter_mm: diameter.map(|d| d.value),
        brush_width,
        brush_grade,
    })
}

fn read_limits(t: &TableReader<'_, '_>) -> Result<Limits, Diagnostic> {
    t.deny_unknown(LIMIT_KEYS)?;
    let mut l = Limits::default();
    {
        let fields: [&mut f64; 12] = [
            &mut l.segment_volts_avg_max,
            &mut l.segment_volts_peak_max,
            &mut l.path_current_max,
            &mut l.brush_arm_current_max,
            &mut l.segment_pitch_min_mm,
            &mut l.commutator_speed_preferred_m_s,
            &mut l.commutator_speed_max_m_s,
            &mut l.current_density_min_a_mm2,
            &mut l.current_density_max_a_mm2,
            &mut l.brush_width_min_segments,
            &mut l.brush_width_max_segments,
            &mut l.electric_loading_max_a_m,
        ];
        for (field, key) in fields.into_iter().zip(LIMIT_KEYS) {
            if let Some(a) = t.number(key, 0.0, true, 1e9, "a limit (see the README for units)")? {
                *field = a.value;
            }
        }
    }
    Ok(l)
}
