//! `[commutator]`: the commutator and its brushes.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, all optional:
//! - `diameter_mm`: above 0 and at most 10 000 (every `_mm` key may be given by its inch
//!   twin, `diameter_in`, `brush_width_in`: `TableReader::length`);
//! - `brush_width_mm` (circumferential, less than half the circumference) or
//!   `brush_width_segments` (less than half the segments), not both;
//! - `brush_grade`: `"carbon"` or `"metal-graphite"` (no default here; the rating takes
//!   carbon when absent);
//! - `brush_sets` (default P): how many brush sets are fitted. A lap winding needs one at
//!   every pole (P); a wave winding may have any even number from 2 to P, at adjacent poles.

use crate::design::Diagnostic;
use crate::design::model::{BrushGrade, BrushWidth, Commutator, WindingType, bounds};
use crate::design::reader::{At, TableReader, fmt_num};

/// The keys of `[commutator]`.
pub(crate) const KEYS: &[&str] = &[
    "diameter_mm",
    "brush_width_mm",
    "brush_width_segments",
    "brush_grade",
    "brush_sets",
];

/// What `[commutator]` is read against: the winding's segments, poles and kind.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Against {
    /// Segments C.
    pub segments: i64,
    /// Poles P.
    pub poles: i64,
    /// Lap or wave.
    pub winding_type: WindingType,
}

/// Reads `[commutator]` for a winding (`None` when the winding is in error: the brush width
/// in segments and the brush sets are then not checked against it), recording every problem;
/// `None` when any value is in error.
pub(crate) fn read(t: &TableReader<'_, '_>, against: Option<Against>) -> Option<Commutator> {
    let segments = against.map(|a| a.segments);
    let keys = t.keep(t.deny_unknown(KEYS));
    let diameter = t.keep(t.length("diameter", 0.0, true, 10_000.0, "the commutator diameter"));
    let wmm = t.keep(t.length(
        "brush_width",
        0.0,
        true,
        1_000.0,
        "the brush width (circumferential)",
    ));
    let wseg = t.keep(t.number(
        "brush_width_segments",
        0.0,
        true,
        1_000.0,
        "the brush width in segment pitches",
    ));
    let brush_grade = t.keep(t.choice("brush_grade", &["carbon", "metal-graphite"]));
    let sets = t.keep(
        t.int(
            "brush_sets",
            1..=bounds::MAX_POLES,
            "the brush sets fitted",
            "leave it out to fit one brush set at every pole",
        )
        .and_then(|s| brush_sets(t, s, against)),
    );
    let diameter = diameter?;
    let brush_width = t.keep(brush_width(t, diameter.as_ref(), wmm?, wseg?, segments));
    let brush_width = brush_width.and_then(|bw| t.keep(apart(t, bw, diameter.as_ref(), against)));
    let (brush_width, brush_grade, brush_sets, ()) = (brush_width?, brush_grade?, sets?, keys?);
    let brush_grade = match brush_grade {
        Some(At {
            value: "metal-graphite",
            ..
        }) => Some(BrushGrade::MetalGraphite),
        Some(_) => Some(BrushGrade::Carbon),
        None => None,
    };
    Some(Commutator {
        diameter_mm: diameter.map(|d| d.value),
        brush_width,
        brush_grade,
        brush_sets,
    })
}

/// Brushes of neighbouring poles must not touch one segment: a brush β segment pitches wide
/// reaches (β + 1)/2 pitches either side of its centre, and the centres are C/P apart, so
/// β + 1 ≤ C/P (at equality the bar midway is just out of reach of both).
fn apart(
    t: &TableReader<'_, '_>,
    bw: Option<BrushWidth>,
    diameter: Option<&At<f64>>,
    against: Option<Against>,
) -> Result<Option<BrushWidth>, Diagnostic> {
    let (Some(w), Some(a)) = (bw, against) else {
        return Ok(bw);
    };
    let (beta, key) = match w {
        BrushWidth::Segments(x) => (Some(x), "brush_width_segments".to_string()),
        BrushWidth::Millimetres(mm) => (
            diameter.map(|d| mm * a.segments as f64 / (std::f64::consts::PI * d.value)),
            t.length_key("brush_width"),
        ),
    };
    let spacing = a.segments as f64 / a.poles as f64;
    match beta {
        Some(beta) if beta + 1.0 > spacing + 1e-9 => {
            let at = t.raw(&key).map_or(t.span.clone(), |v| v.span());
            Err(t
                .src
                .error(
                    at,
                    format!("commutator.{key}"),
                    format!(
                        "a brush {} segment pitches wide touches the next pole's brush: brush centres are C/P = {} segments apart, so expected at most {} segment pitches",
                        fmt_num((beta * 100.0).round() / 100.0),
                        fmt_num((spacing * 100.0).round() / 100.0),
                        fmt_num(((spacing - 1.0) * 100.0).round() / 100.0)
                    ),
                )
                .with_hint("brushes usually cover 1 to 3 segments; a wider brush shorts brushes of opposite polarity"))
        }
        _ => Ok(bw),
    }
}

/// `brush_sets` against the winding: even, at most P, and P for a lap winding.
fn brush_sets(
    t: &TableReader<'_, '_>,
    sets: Option<At<i64>>,
    against: Option<Against>,
) -> Result<Option<u32>, Diagnostic> {
    let Some(s) = sets else { return Ok(None) };
    let err = |msg: String, hint: &str| {
        t.src
            .error(s.span.clone(), "commutator.brush_sets", msg)
            .with_hint(hint.to_string())
    };
    if s.value % 2 == 1 {
        return Err(err(
            format!(
                "{} brush sets is odd: brush sets alternate + and -, so expected an even number",
                s.value
            ),
            "fit brush sets in pairs; a wave winding works with 2",
        ));
    }
    if let Some(a) = against {
        if s.value > a.poles {
            return Err(err(
                format!(
                    "{} brush sets on {} poles: expected at most one by each pole ({})",
                    s.value, a.poles, a.poles
                ),
                "leave brush_sets out to fit one at every pole",
            ));
        }
        let fewest = i64::from(a.winding_type.kind().fewest_brush_sets(a.poles as u32));
        if s.value < fewest {
            return Err(err(
                format!(
                    "{} brush sets on a {}-pole {} winding: expected {fewest}, one by each pole, to collect every path",
                    s.value,
                    a.poles,
                    a.winding_type.as_str()
                ),
                "a lap winding's paths lie under each pole; fit all brush sets, or leave brush_sets out",
            ));
        }
    }
    Ok(Some(s.value as u32))
}

/// The brush width, in mm or in segments (not both), less than half the commutator.
fn brush_width(
    t: &TableReader<'_, '_>,
    diameter: Option<&At<f64>>,
    wmm: Option<At<f64>>,
    wseg: Option<At<f64>>,
    segments: Option<i64>,
) -> Result<Option<BrushWidth>, Diagnostic> {
    Ok(match (wmm, wseg) {
        (Some(_), Some(s)) => {
            return Err(t
                .src
                .error(
                    s.span,
                    "commutator.brush_width_segments",
                    format!(
                        "give the brush width either in {} or in segments, not both",
                        t.src.units.symbol()
                    ),
                )
                .with_hint(format!(
                    "remove one of {} and brush_width_segments",
                    t.length_key("brush_width")
                )));
        }
        (Some(w), None) => {
            let u = t.src.units;
            if let Some(d) = diameter {
                let circumference = std::f64::consts::PI * d.value;
                if w.value >= circumference / 2.0 {
                    return Err(t
                        .src
                        .error(w.span, t.dotted(&t.length_key("brush_width")), format!("a {} brush covers half the commutator's {} circumference or more: expected less than {}", u.echo(w.value), u.length(circumference, 1), u.length(circumference / 2.0, 1)))
                        .with_hint("the brush width is measured around the commutator, usually 1 to 3 segment pitches"));
                }
            }
            Some(BrushWidth::Millimetres(w.value))
        }
        (None, Some(s)) => {
            if let Some(segments) = segments
                && s.value >= segments as f64 / 2.0
            {
                return Err(t
                    .src
                    .error(s.span, "commutator.brush_width_segments", format!("a brush {} segments wide covers half the commutator's {segments} segments or more: expected less than {}", s.value, fmt_num(segments as f64 / 2.0)))
                    .with_hint("brushes usually cover 1 to 3 segments"));
            }
            Some(BrushWidth::Segments(s.value))
        }
        (None, None) => None,
    })
}
