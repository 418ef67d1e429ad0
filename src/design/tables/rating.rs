//! `[rating]`: the nameplate, and the flux and speed that `[winding]` may also give.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, all optional:
//! - `voltage`: V at the terminals, above 0 and at most 100 000;
//! - `current`: A in the armature, above 0 and at most 100 000;
//! - `speed_rpm`: above 0 and at most 200 000 (also accepted in `[winding]`);
//! - `mode`: `"motor"` (default) or `"generator"`;
//! - `thermal_class`: 105, 120, 130, 155, 180 or `"A"`, `"E"`, `"B"`, `"F"`, `"H"`;
//! - `flux_per_pole_mwb`: above 0 and at most 100 000 (also accepted in `[winding]`);
//! - `interpoles`: `true` or `false`, whether interpoles are fitted (the reactance-voltage
//!   check then takes the limit with interpoles and says no more that they are needed).
//!
//! A flux or speed given in both tables must agree.

use toml::de::DeValue;

use crate::base::visible::{ECHO_WIDTH, clip};
use crate::design::Diagnostic;
use crate::design::model::{Mode, Rating, ThermalClass, bounds};
use crate::design::reader::{At, Source, TableReader};

/// The keys of `[rating]`.
pub(crate) const KEYS: &[&str] = &[
    "voltage",
    "current",
    "speed_rpm",
    "mode",
    "thermal_class",
    "flux_per_pole_mwb",
    "interpoles",
];

/// `[rating]` as read, merged with the flux and speed of `[winding]`.
pub(crate) struct RatingTable {
    /// Flux per pole, mWb, from either table.
    pub flux_per_pole_mwb: Option<f64>,
    /// Speed, rpm, from either table.
    pub speed_rpm: Option<f64>,
    /// `mode`.
    pub mode: Mode,
    /// The nameplate, when the table is present.
    pub rating: Option<Rating>,
}

fn flux(t: &TableReader<'_, '_>) -> Result<Option<At<f64>>, Diagnostic> {
    t.number(
        "flux_per_pole_mwb",
        0.0,
        true,
        bounds::MAX_FLUX_MWB,
        "the flux per pole in mWb",
    )
}

fn speed(t: &TableReader<'_, '_>) -> Result<Option<At<f64>>, Diagnostic> {
    t.number(
        "speed_rpm",
        0.0,
        true,
        bounds::MAX_SPEED_RPM,
        "the speed in rpm",
    )
}

/// Reads `[rating]` (when present) with the flux and speed keys of `[winding]`.
pub(crate) fn read(
    src: &Source<'_>,
    win: &TableReader<'_, '_>,
    rating_t: Option<&TableReader<'_, '_>>,
) -> Result<RatingTable, Diagnostic> {
    if let Some(t) = rating_t {
        t.deny_unknown(KEYS)?;
    }
    let flux = merge_optional(
        src,
        flux(win)?,
        rating_t.map(flux).transpose()?.flatten(),
        "flux_per_pole_mwb",
    )?;
    let speed = merge_optional(
        src,
        speed(win)?,
        rating_t.map(speed).transpose()?.flatten(),
        "speed_rpm",
    )?;
    let (mode, rating) = match rating_t {
        Some(t) => read_rating(t)?,
        None => (Mode::Motor, None),
    };
    Ok(RatingTable {
        flux_per_pole_mwb: flux,
        speed_rpm: speed,
        mode,
        rating,
    })
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
    // Each key is read on its own: a problem is recorded and the next key read.
    let mode = match t.keep(t.choice("mode", &["motor", "generator"])).flatten() {
        Some(At {
            value: "generator", ..
        }) => Mode::Generator,
        _ => Mode::Motor,
    };
    let voltage = t
        .keep(t.number(
            "voltage",
            0.0,
            true,
            bounds::MAX_VOLTAGE,
            "the rated terminal voltage in V",
        ))
        .flatten()
        .map(|a| a.value);
    let current = t
        .keep(t.number(
            "current",
            0.0,
            true,
            bounds::MAX_CURRENT_A,
            "the rated armature current in A",
        ))
        .flatten()
        .map(|a| a.value);
    let thermal_class = t.keep(thermal_class(t)).flatten();
    let interpoles = t
        .keep(t.boolean("interpoles", "whether interpoles are fitted"))
        .flatten()
        .map(|a| a.value);
    Ok((
        mode,
        Some(Rating {
            voltage,
            current,
            thermal_class,
            interpoles,
        }),
    ))
}

fn thermal_class(t: &TableReader<'_, '_>) -> Result<Option<ThermalClass>, Diagnostic> {
    Ok(match t.raw("thermal_class") {
        None => None,
        Some(v) => {
            let word = match v.get_ref() {
                DeValue::Integer(i) => i.as_str().to_string(),
                DeValue::String(s) => s.trim().to_ascii_uppercase(),
                other => other.type_str().to_string(),
            };
            match ThermalClass::from_word(&word) {
                Some(class) => Some(class),
                None => {
                    let (numbers, letters): (Vec<String>, Vec<&str>) = ThermalClass::TABLE
                        .iter()
                        .map(|&(_, c, l)| (c.to_string(), l))
                        .unzip();
                    return Err(t
                        .src
                        .error(v.span(), "rating.thermal_class", format!("expected a thermal class {} or {} ({}), found {}", numbers[..numbers.len() - 1].join(", "), numbers[numbers.len() - 1], letters.join(", "), clip(&word, ECHO_WIDTH)))
                        .with_hint("the class is on the nameplate or the insulation system's data, e.g. thermal_class = 155 or \"F\""));
                }
            }
        }
    })
}
