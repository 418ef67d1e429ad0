//! Writes a resolved [`Design`] back as a design file, with a comment header.
//!
//! Part of the rewind feature: pure text, deterministic. Every key is
//! written explicitly, in the order of the design-file reference, and only `[limits]` keys
//! that differ from the defaults. The output parses back with [`crate::design::parse_design`].

use std::fmt::Write;

use crate::theory::words::span_shop;

use crate::design::{BrushWidth, ConductorShape, Design, EqualizerChoice, ThermalClass};

/// The design as TOML, `header` lines first as `# ` comments (each made safe by
/// [`comment_text`], so a header can never start a line of TOML).
pub fn write_design(d: &Design, header: &[String]) -> String {
    let mut s = String::new();
    for line in header {
        let _ = writeln!(s, "# {}", comment_text(line));
    }
    if !header.is_empty() {
        s.push('\n');
    }
    let j = &d.job;
    if [&j.id, &j.title, &j.customer, &j.date, &j.notes]
        .iter()
        .any(|v| v.is_some())
    {
        s.push_str("[job]\n");
        for (k, v) in [
            ("id", &j.id),
            ("title", &j.title),
            ("customer", &j.customer),
            ("date", &j.date),
            ("notes", &j.notes),
        ] {
            if let Some(v) = v {
                let _ = writeln!(s, "{k} = {}", quote(v));
            }
        }
        s.push('\n');
    }
    s.push_str("[armature]\n");
    let _ = writeln!(s, "poles = {}", d.poles);
    let _ = writeln!(s, "slots = {}", d.slots);
    let _ = writeln!(s, "coils_per_slot = {}", d.coils_per_slot);
    if !d.segments_derived {
        let _ = writeln!(s, "segments = {}", d.segments);
    }
    let _ = writeln!(s, "rotation = \"{}\"", d.rotation.as_str());
    let _ = writeln!(s, "pole_arc = {}", num(d.pole_arc, 4));
    s.push_str("\n[winding]\n");
    let _ = writeln!(s, "type = \"{}\"", d.winding_type.as_str());
    let _ = writeln!(s, "multiplicity = {}", d.multiplicity);
    let _ = writeln!(s, "direction = \"{}\"", d.direction.as_str());
    let _ = writeln!(s, "span = \"{}\"", span_shop(d.span));
    let _ = writeln!(s, "turns = {}", d.turns);
    if let Some(w) = d.wave_coils {
        let _ = writeln!(s, "wave_span = \"{}\"", span_shop(w.span));
        let _ = writeln!(s, "wave_turns = {}", w.turns);
    }
    let _ = writeln!(s, "lead_offset = {}", d.lead_offset);
    match d.equalizers {
        EqualizerChoice::None => s.push_str("equalizers = \"none\"\n"),
        EqualizerChoice::Full => s.push_str("equalizers = \"full\"\n"),
        EqualizerChoice::EveryNth(n) => {
            let _ = writeln!(s, "equalizers = {n}");
        }
    }
    if let Some(list) = &d.dummy_coils {
        let coils: Vec<String> = list.iter().map(u32::to_string).collect();
        let _ = writeln!(s, "dummy_coils = [{}]", coils.join(", "));
    }
    let has_rating = d.rating.is_some() || d.flux_per_pole_mwb.is_some() || d.speed_rpm.is_some();
    if has_rating {
        s.push_str("\n[rating]\n");
        let r = d.rating.clone().unwrap_or_default();
        if let Some(v) = r.voltage {
            let _ = writeln!(s, "voltage = {}", num(v, 3));
        }
        if let Some(i) = r.current {
            let _ = writeln!(s, "current = {}", num(i, 4));
        }
        if let Some(n) = d.speed_rpm {
            let _ = writeln!(s, "speed_rpm = {}", num(n, 3));
        }
        let _ = writeln!(s, "mode = \"{}\"", d.mode.as_str());
        if let Some(c) = r.thermal_class {
            let _ = writeln!(s, "thermal_class = {}", class_number(c));
        }
        if let Some(f) = d.flux_per_pole_mwb {
            let _ = writeln!(s, "flux_per_pole_mwb = {}", num(f, 4));
        }
    }
    if let Some(k) = &d.conductor {
        s.push_str("\n[conductor]\n");
        match k.shape {
            ConductorShape::Round {
                diameter_mm,
                awg,
                strands,
            } => {
                match awg {
                    Some(g) => {
                        let _ = writeln!(s, "awg = {g}");
                    }
                    None => {
                        let _ = writeln!(s, "diameter_mm = {}", num(diameter_mm, 4));
                    }
                }
                let _ = writeln!(s, "strands = {strands}");
            }
            ConductorShape::Rectangular {
                width_mm,
                height_mm,
                corner_radius_mm,
                strands,
            } => {
                let _ = writeln!(s, "width_mm = {}", num(width_mm, 3));
                let _ = writeln!(s, "height_mm = {}", num(height_mm, 3));
                let _ = writeln!(s, "corner_radius_mm = {}", num(corner_radius_mm, 3));
                let _ = writeln!(s, "strands = {strands}");
            }
        }
        if let Some(l) = k.mean_turn_mm {
            let _ = writeln!(s, "mean_turn_mm = {}", num(l, 2));
        }
    }
    if let Some(c) = &d.core {
        s.push_str("\n[core]\n");
        if let Some(x) = c.diameter_mm {
            let _ = writeln!(s, "diameter_mm = {}", num(x, 3));
        }
        if let Some(x) = c.length_mm {
            let _ = writeln!(s, "length_mm = {}", num(x, 3));
        }
    }
    if let Some(c) = &d.commutator {
        s.push_str("\n[commutator]\n");
        if let Some(x) = c.diameter_mm {
            let _ = writeln!(s, "diameter_mm = {}", num(x, 3));
        }
        match c.brush_width {
            Some(BrushWidth::Millimetres(x)) => {
                let _ = writeln!(s, "brush_width_mm = {}", num(x, 3));
            }
            Some(BrushWidth::Segments(x)) => {
                let _ = writeln!(s, "brush_width_segments = {}", num(x, 3));
            }
            None => {}
        }
        if let Some(g) = c.brush_grade {
            let _ = writeln!(s, "brush_grade = \"{}\"", g.as_str());
        }
        if let Some(n) = c.brush_sets {
            let _ = writeln!(s, "brush_sets = {n}");
        }
    }
    // `[limits]` keys whose values differ from the defaults, in key order.
    if d.limits.overrides().next().is_some() {
        s.push_str("\n[limits]\n");
        for (spec, v) in d.limits.overrides() {
            let _ = writeln!(s, "{} = {}", spec.key, num(v, 6));
        }
    }
    s
}

fn class_number(c: ThermalClass) -> u32 {
    match c {
        ThermalClass::A => 105,
        ThermalClass::E => 120,
        ThermalClass::B => 130,
        ThermalClass::F => 155,
        ThermalClass::H => 180,
    }
}

/// A number rounded to `decimals` places, trailing zeros dropped ("230", "1.25"), as TOML.
///
/// A number the fixed form would lose (a non-zero value rounding to 0, or one off by more
/// than 0.1 %, or one of 10^15 and more, which TOML would read as an out-of-range integer) is
/// written in exponent form with `decimals` significant figures, at least 4 ("5e-324",
/// "1.2346e-2"); never 0 for a non-zero number. Not-a-number and the infinities are written in
/// TOML's words (`nan`, `inf`, `-inf`), which the design parser refuses by name.
pub fn num(x: f64, decimals: usize) -> String {
    if x.is_nan() {
        return "nan".to_string();
    }
    if x.is_infinite() {
        return if x > 0.0 { "inf" } else { "-inf" }.to_string();
    }
    let fixed = trim_zeros(format!("{x:.decimals$}"));
    let back: f64 = fixed.parse().unwrap_or(0.0);
    let lost = x != 0.0 && (back == 0.0 || ((back - x) / x).abs() > 1e-3);
    if lost || x.abs() >= 1e15 {
        let e = format!("{x:.*e}", decimals.max(4) - 1);
        let (mantissa, exp) = e.split_once('e').unwrap_or((&e, "0"));
        format!("{}e{exp}", trim_zeros(mantissa.to_string()))
    } else if fixed == "-0" {
        "0".to_string()
    } else {
        fixed
    }
}

/// "1.2500" → "1.25", "2.000" → "2"; a number without a point is kept.
fn trim_zeros(s: String) -> String {
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
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

/// A TOML basic string.
fn quote(v: &str) -> String {
    let mut out = String::from("\"");
    for c in v.chars() {
        match c {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\t' => out.push_str("\\t"),
            '\r' => out.push_str("\\r"),
            c if c.is_control() => {
                let _ = write!(out, "\\u{:04X}", c as u32);
            }
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[track_caller]
    fn case(x: f64, decimals: usize, want: &str) {
        assert_eq!(num(x, decimals), want, "num({x:e}, {decimals})");
        if x.is_finite() {
            let back: f64 = want.parse().unwrap();
            assert!(x == 0.0 || back != 0.0, "{x:e} became 0");
        }
    }

    #[test]
    fn numbers_keep_their_fixed_form_and_never_round_to_nothing() {
        // As before: fixed places, trailing zeros dropped.
        case(230.0, 3, "230");
        case(1.25, 4, "1.25");
        case(19.033_456, 4, "19.0335");
        case(0.7, 4, "0.7");
        case(-0.000_01, 2, "-1e-5");
        case(0.0, 3, "0");
        case(-0.0, 3, "0");
        // Lost in the fixed form: exponent form, at least 4 significant figures.
        case(5e-324, 4, "4.941e-324");
        case(0.000_123_46, 4, "1.235e-4");
        case(0.012_345_6, 4, "1.235e-2");
        case(1e308, 4, "1e308");
        case(4.2e15, 2, "4.2e15");
        // Not numbers: TOML's words, which the parser refuses by name.
        case(f64::NAN, 4, "nan");
        case(f64::INFINITY, 4, "inf");
        case(f64::NEG_INFINITY, 4, "-inf");
    }

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
