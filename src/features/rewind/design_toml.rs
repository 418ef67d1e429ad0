//! Writes a resolved [`Design`] back as a design file, with a comment header.
//!
//! Part of the `features` stage (used by the rewind): pure text, deterministic. The file is
//! built as a `toml_edit` document, which does the TOML quoting and keeps the comment header
//! as the document's prefix. Every key is written explicitly, in the order of the design-file
//! reference, and only `[limits]` keys that differ from the defaults. Numbers are written by
//! [`fmt_toml`] (the one number writer). The output parses back with
//! [`crate::design::parse_design`].

use std::fmt::Write;

use toml_edit::{Array, DocumentMut, Item, Table, Value};
use toml_writer::{ToTomlValue, TomlStringBuilder};

use crate::base::number::fmt_toml;
use crate::theory::words::span_shop;

use crate::design::{BrushWidth, ConductorShape, Design, EqualizerChoice};

/// A number rounded to `decimals` places as TOML, its text exactly as [`fmt_toml`] writes it.
fn number(x: f64, decimals: usize) -> Value {
    let text = fmt_toml(x, decimals);
    // `fmt_toml` writes a TOML integer, float, `nan` or `inf`; read as a TOML value, the
    // number keeps that text (and a text that would not read stays the value itself).
    text.parse::<Value>().unwrap_or_else(|_| Value::from(x))
}

/// Free text (the `[job]` keys) as a one-line TOML basic string, `"` and `\\` and control
/// characters escaped, as every design file has always written it (`toml_edit` on its own
/// would pick a literal or a multi-line string for some texts).
fn text(v: &str) -> Value {
    let quoted = TomlStringBuilder::new(v).as_basic().to_toml_value();
    quoted.parse::<Value>().unwrap_or_else(|_| Value::from(v))
}

/// Inserts the length `mm` as `<stem>_mm` or, in an inch design, `<stem>_in`, to
/// `mm_decimals` decimals of a mm (or as many more as an inch needs).
fn length(t: &mut Table, d: &Design, stem: &str, mm: f64, mm_decimals: usize) {
    let u = d.units;
    t.insert(
        &format!("{stem}{}", u.key_suffix()),
        number(u.value(mm), u.file_decimals(mm_decimals)).into(),
    );
}

/// A whole number (a count, a bar, a number of turns).
fn whole(n: impl Into<i64>) -> Value {
    Value::from(n.into())
}

/// Adds `table` under `name`, a blank line before it unless it is the document's first.
fn section(doc: &mut DocumentMut, name: &str, mut table: Table) {
    if doc.iter().next().is_some() {
        table.decor_mut().set_prefix("\n");
    }
    doc.insert(name, Item::Table(table));
}

/// The design as TOML, `header` lines first as `# ` comments (each made safe by
/// [`comment_text`], so a header can never start a line of TOML).
pub fn write_design(d: &Design, header: &[String]) -> String {
    let mut doc = DocumentMut::new();
    let mut prefix = String::new();
    for line in header {
        let _ = writeln!(prefix, "# {}", comment_text(line));
    }
    if !header.is_empty() {
        prefix.push('\n');
    }
    doc.decor_mut().set_prefix(prefix);
    job_table(&mut doc, d);
    armature_table(&mut doc, d);
    winding_table(&mut doc, d);
    rating_table(&mut doc, d);
    conductor_table(&mut doc, d);
    core_and_commutator_tables(&mut doc, d);
    limits_table(&mut doc, d);
    doc.to_string()
}

/// `[job]`: the text keys given, in the reference's order.
fn job_table(doc: &mut DocumentMut, d: &Design) {
    let j = &d.job;
    let mut job = Table::new();
    for (k, v) in [
        ("id", &j.id),
        ("title", &j.title),
        ("customer", &j.customer),
        ("date", &j.date),
        ("notes", &j.notes),
    ] {
        if let Some(v) = v {
            job.insert(k, text(v).into());
        }
    }
    if !job.is_empty() {
        section(doc, "job", job);
    }
}

/// `[armature]`: every key, the segment count only when the design gave it.
fn armature_table(doc: &mut DocumentMut, d: &Design) {
    let mut t = Table::new();
    t.insert("poles", whole(d.poles).into());
    t.insert("slots", whole(d.slots).into());
    t.insert("coils_per_slot", whole(d.coils_per_slot).into());
    if !d.segments_derived {
        t.insert("segments", whole(d.segments).into());
    }
    t.insert("rotation", Value::from(d.rotation.as_str()).into());
    t.insert("pole_arc", number(d.pole_arc, 4).into());
    section(doc, "armature", t);
}

/// `[winding]`: every key, span in shop form, the wave coils' keys on a frog-leg.
fn winding_table(doc: &mut DocumentMut, d: &Design) {
    let mut t = Table::new();
    t.insert("type", Value::from(d.winding_type.as_str()).into());
    t.insert("multiplicity", whole(d.multiplicity).into());
    t.insert("direction", Value::from(d.direction.as_str()).into());
    t.insert("span", Value::from(span_shop(d.span)).into());
    t.insert("turns", whole(d.turns).into());
    if let Some(w) = d.wave_coils {
        t.insert("wave_span", Value::from(span_shop(w.span)).into());
        t.insert("wave_turns", whole(w.turns).into());
    }
    t.insert("lead_offset", number(d.lead_offset.bars(), 1).into());
    let equalizers = match d.equalizers {
        EqualizerChoice::None => Value::from("none"),
        EqualizerChoice::Full => Value::from("full"),
        EqualizerChoice::EveryNth(n) => whole(n),
    };
    t.insert("equalizers", equalizers.into());
    if let Some(list) = &d.dummy_coils {
        let coils: Array = list.iter().map(|&c| i64::from(c)).collect();
        t.insert("dummy_coils", Value::Array(coils).into());
    }
    section(doc, "winding", t);
}

/// `[rating]`, with the flux and speed, when the design has any of them.
fn rating_table(doc: &mut DocumentMut, d: &Design) {
    let has_rating = d.rating.is_some() || d.flux_per_pole_mwb.is_some() || d.speed_rpm.is_some();
    if has_rating {
        let mut t = Table::new();
        let r = d.rating.clone().unwrap_or_default();
        if let Some(v) = r.voltage {
            t.insert("voltage", number(v, 3).into());
        }
        if let Some(i) = r.current {
            t.insert("current", number(i, 4).into());
        }
        if let Some(n) = d.speed_rpm {
            t.insert("speed_rpm", number(n, 3).into());
        }
        t.insert("mode", Value::from(d.mode.as_str()).into());
        if let Some(c) = r.thermal_class {
            t.insert("thermal_class", whole(c.celsius()).into());
        }
        if let Some(b) = r.interpoles {
            t.insert("interpoles", Value::from(b).into());
        }
        if let Some(f) = d.flux_per_pole_mwb {
            t.insert("flux_per_pole_mwb", number(f, 4).into());
        }
        section(doc, "rating", t);
    }
}

/// `[conductor]`: round (by gauge or diameter) or rectangular, and the mean turn.
fn conductor_table(doc: &mut DocumentMut, d: &Design) {
    if let Some(k) = &d.conductor {
        let mut t = Table::new();
        match k.shape {
            ConductorShape::Round {
                diameter_mm,
                awg,
                strands,
            } => {
                match awg {
                    Some(g) => {
                        t.insert("awg", whole(g).into());
                    }
                    None => length(&mut t, d, "diameter", diameter_mm, 4),
                }
                t.insert("strands", whole(strands).into());
            }
            ConductorShape::Rectangular {
                width_mm,
                height_mm,
                corner_radius_mm,
                strands,
            } => {
                length(&mut t, d, "width", width_mm, 3);
                length(&mut t, d, "height", height_mm, 3);
                length(&mut t, d, "corner_radius", corner_radius_mm, 3);
                t.insert("strands", whole(strands).into());
            }
        }
        if let Some(l) = k.mean_turn_mm {
            length(&mut t, d, "mean_turn", l, 2);
        }
        section(doc, "conductor", t);
    }
}

/// `[core]` and `[commutator]`, the keys given.
fn core_and_commutator_tables(doc: &mut DocumentMut, d: &Design) {
    if let Some(c) = &d.core {
        let mut t = Table::new();
        for (stem, x, decimals) in [
            ("diameter", c.diameter_mm, 3),
            ("length", c.length_mm, 3),
            // The slot and the coil-making lengths, those given, as given.
            ("slot_depth", c.slot_depth_mm, 4),
            ("slot_width", c.slot_width_mm, 4),
            ("liner", c.liner_mm, 4),
            ("separator", c.separator_mm, 4),
            ("wedge", c.wedge_mm, 4),
            ("extension", c.extension_mm, 4),
        ] {
            if let Some(x) = x {
                length(&mut t, d, stem, x, decimals);
            }
        }
        if let Some(x) = c.end_turn_angle_deg {
            t.insert("end_turn_angle_deg", number(x, 4).into());
        }
        if let Some(x) = c.riser_distance_mm {
            length(&mut t, d, "riser_distance", x, 4);
        }
        for (key, x) in [("scrap_percent", c.scrap_percent), ("reel_kg", c.reel_kg)] {
            if let Some(x) = x {
                t.insert(key, number(x, 4).into());
            }
        }
        if let Some(x) = c.conductor_build_mm {
            length(&mut t, d, "conductor_build", x, 4);
        }
        if let Some(g) = c.enamel_grade {
            t.insert("enamel_grade", whole(g).into());
        }
        if let Some(same) = c.equalizer_wire_same {
            t.insert(
                "equalizer_wire",
                if same { "same" } else { "separate" }.into(),
            );
        }
        section(doc, "core", t);
    }
    if let Some(c) = &d.commutator {
        let mut t = Table::new();
        if let Some(x) = c.diameter_mm {
            length(&mut t, d, "diameter", x, 3);
        }
        match c.brush_width {
            Some(BrushWidth::Millimetres(x)) => {
                length(&mut t, d, "brush_width", x, 3);
            }
            Some(BrushWidth::Segments(x)) => {
                t.insert("brush_width_segments", number(x, 3).into());
            }
            None => {}
        }
        if let Some(g) = c.brush_grade {
            t.insert("brush_grade", Value::from(g.as_str()).into());
        }
        if let Some(n) = c.brush_sets {
            t.insert("brush_sets", whole(n).into());
        }
        section(doc, "commutator", t);
    }
}

/// `[limits]`: the keys whose values differ from the defaults, in key order.
fn limits_table(doc: &mut DocumentMut, d: &Design) {
    if d.limits.overrides().next().is_some() {
        let mut t = Table::new();
        for (spec, v) in d.limits.overrides() {
            t.insert(spec.key, number(v, 6).into());
        }
        section(doc, "limits", t);
    }
}

/// `line` made safe to follow `# ` on one comment line: every control character (newline,
/// carriage return, tab, escape, DEL, the C1 controls), the Unicode line and paragraph
/// separators and the bidirectional and zero-width format characters are written as visible
/// escapes (`\n`, `\r`, `\t`, `\u001B`, `\u2028`), so nothing in a file name or a request can
/// end the comment and start a line of TOML, or hide what the line says. Backslashes are kept
/// as they are (paths on Windows), so the escapes are for reading, not for undoing.
pub fn comment_text(line: &str) -> String {
    let mut out = String::with_capacity(line.len());
    for c in line.chars() {
        match c {
            '\n' => out.push_str("\\n"),
            '\r' => out.push_str("\\r"),
            '\t' => out.push_str("\\t"),
            c if c.is_control() || is_invisible_format(c) => {
                let _ = write!(out, "\\u{:04X}", c as u32);
            }
            c => out.push(c),
        }
    }
    out
}

/// Line and paragraph separators, bidirectional controls, zero-width characters and the
/// byte-order mark: not control characters, but they break or disguise a line on screen.
fn is_invisible_format(c: char) -> bool {
    matches!(c, '\u{200B}'..='\u{200F}' | '\u{2028}'..='\u{202E}' | '\u{2060}'..='\u{2069}' | '\u{FEFF}')
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn comment_text_escapes_everything_that_could_end_or_hide_a_line() {
        assert_eq!(
            comment_text("evil\n[limits]\r\nx = 1\t#"),
            "evil\\n[limits]\\r\\nx = 1\\t#"
        );
        assert_eq!(
            comment_text("a\u{1b}[2Jb\u{7f}\u{85}"),
            "a\\u001B[2Jb\\u007F\\u0085"
        );
        assert_eq!(
            comment_text("x\u{2028}y\u{202e}z\u{feff}"),
            "x\\u2028y\\u202Ez\\uFEFF"
        );
        // Ordinary text, backslashes and non-ASCII letters stay as they are.
        assert_eq!(
            comment_text(r"C:\jobs\Motor Ölpumpe.toml"),
            r"C:\jobs\Motor Ölpumpe.toml"
        );
    }

    #[test]
    fn a_header_never_adds_a_line_of_toml() {
        let d = crate::design::parse_design(
            "[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 5\n",
            "t.toml",
        )
        .unwrap();
        let text = write_design(
            &d,
            &["a\n[limits]\nsegment_volts_avg_max = 999".to_string()],
        );
        assert!(text.starts_with("# a\\n[limits]\\nsegment_volts_avg_max = 999\n\n[armature]\n"));
        let back = crate::design::parse_design(&text, "t.toml").unwrap();
        assert!(back.limits.overrides().next().is_none());
    }
}
