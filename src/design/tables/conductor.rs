//! `[conductor]`: the conductor of one turn, round or rectangular.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys:
//! - round wire: `diameter_mm` (bare, above 0 and at most 20) or `awg` (-3 for 0000 to 40,
//!   ASTM B258), not both;
//! - rectangular strip: `width_mm` and `height_mm` (above 0 and at most 100), with
//!   `corner_radius_mm` (0 to 10 and at most half the smaller side, default 0);
//! - `strands`: wires or strips in hand, 1 to 200 (default 1);
//! - `mean_turn_mm`: mean length of one turn (default: estimated from `[core]`).
//!
//! Every `_mm` key may be given by its inch twin (`diameter_in`, …; `TableReader::length`);
//! the wire is printed as given, AWG or mm.

use crate::design::Diagnostic;
use crate::design::model::{Conductor, ConductorShape, awg_diameter_mm};
use crate::design::reader::{At, TableReader};

/// The keys of `[conductor]`.
pub(crate) const KEYS: &[&str] = &[
    "diameter_mm",
    "awg",
    "strands",
    "width_mm",
    "height_mm",
    "corner_radius_mm",
    "mean_turn_mm",
];

/// Reads `[conductor]`, recording every problem; `None` when any value is in error. A table
/// with an unknown key is not read further (a misspelt size would come back as missing).
pub(crate) fn read(t: &TableReader<'_, '_>) -> Option<Conductor> {
    t.keep(t.deny_unknown(KEYS))?;
    let num = |k: &str, what: &str, max: f64| t.keep(t.length(k, 0.0, true, max, what));
    let (d, awg, strands) = read_wire(t);
    let w = num("width", "the strip width", 100.0);
    let h = num("height", "the strip height", 100.0);
    let r = t.keep(t.length("corner_radius", 0.0, false, 10.0, "the strip corner radius"));
    let mean_turn_mm = num("mean_turn", "the mean length of one turn", 100_000.0);
    let strands = strands?.map_or(1, |a| a.value as u32);
    let shape = t.keep(shape(t, d?, awg?, w?, h?, r?, strands))?;
    Some(Conductor {
        shape,
        mean_turn_mm: mean_turn_mm?.map(|a| a.value),
    })
}

/// The round-wire keys `diameter_mm`, `awg` and `strands` of table `t` (also read from a data
/// card's `[observed]`), each `None` when in error (the problem recorded).
#[allow(clippy::type_complexity)]
pub(crate) fn read_wire(
    t: &TableReader<'_, '_>,
) -> (
    Option<Option<At<f64>>>,
    Option<Option<At<i64>>>,
    Option<Option<At<i64>>>,
) {
    let d = t.keep(t.length("diameter", 0.0, true, 20.0, "the bare wire diameter"));
    let awg = t.keep(t.int(
        "awg",
        -3..=40,
        "the AWG gauge (0000 is -3)",
        "ASTM B258 gauges run from 0000 (-3) to 40",
    ));
    let strands = t.keep(t.int(
        "strands",
        1..=200,
        "wires or strips in hand",
        "1 for a single conductor",
    ));
    (d, awg, strands)
}

/// The conductor's shape from its size keys: round (`diameter_mm` or `awg`) or rectangular.
pub(crate) fn shape(
    t: &TableReader<'_, '_>,
    d: Option<At<f64>>,
    awg: Option<At<i64>>,
    w: Option<At<f64>>,
    h: Option<At<f64>>,
    r: Option<At<f64>>,
    strands: u32,
) -> Result<ConductorShape, Diagnostic> {
    Ok(match (d, awg, w, h) {
        (Some(_), Some(a), _, _) => {
            return Err(t
                .src
                .error(
                    a.span,
                    t.dotted("awg"),
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
            diameter_mm: awg_diameter_mm(a.value as i32),
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
                        t.dotted(&t.length_key("corner_radius")),
                        format!(
                            "a corner radius of {} does not fit a {} × {} strip",
                            t.src.units.echo(rad),
                            t.src.units.echo(w.value),
                            t.src.units.echo(h.value)
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
                .error(d.span, t.dotted("diameter_mm"), "a conductor is either round (diameter_mm or awg) or rectangular (width_mm, height_mm), not both")
                .with_hint("remove the keys of the shape you do not use"));
        }
        (None, Some(a), _, _) => {
            return Err(t
                .src
                .error(a.span, t.dotted("awg"), "a conductor is either round (diameter_mm or awg) or rectangular (width_mm, height_mm), not both")
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
    })
}
