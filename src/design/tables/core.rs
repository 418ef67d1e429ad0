//! `[core]`: the armature core, its slots and the coils made for them (for the mean turn, the
//! electric loading, the coil making and the slot fill).
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, all optional:
//! - `diameter_mm` (armature outside diameter) and `length_mm` (stack length), each above 0
//!   and at most 10 000, no default;
//! - `slot_depth_mm`, `slot_width_mm`: the slot (parallel sided, for the coil making, the
//!   slot fill and the slot's specific permeance in the reactance voltage), above 0 and at
//!   most 500, given together or not at all, no default;
//! - slot insulation, each 0 to 20 mm: `liner_mm` (default 0.25), `separator_mm` (between the
//!   layers, default 0.25), `wedge_mm` (default 2.0); together they must leave room in the
//!   slot;
//! - coil making: `extension_mm` (straight past the core each end, 0 to 500, default 10),
//!   `end_turn_angle_deg` (5 to 60, default 25), `riser_distance_mm` (core end to the risers,
//!   0 to 2000, no default: the leads are left out without it), `scrap_percent` (0 to 100,
//!   default 5), `reel_kg` (a reel's copper, above 0 and at most 10 000, no default),
//!   `enamel_grade` (1 or 2, IEC 60317, default 2), `conductor_build_mm` (the insulation's
//!   increase of each dimension, 0 to 5; default by grade for round wire, 0.15 for strip),
//!   `equalizer_wire` (`"same"` when the equalizers are wound from the coils' wire, default
//!   `"separate"`).
//!
//! Every `_mm` key may be given by its inch twin (`diameter_in`, …; `TableReader::length`).
//! The defaults and their sources are on [`Core`]'s accessors, in `model.rs`.

use crate::design::Diagnostic;
use crate::design::model::Core;
use crate::design::reader::{At, TableReader};

/// The keys of `[core]`.
pub(crate) const KEYS: &[&str] = &[
    "diameter_mm",
    "length_mm",
    "slot_depth_mm",
    "slot_width_mm",
    "liner_mm",
    "separator_mm",
    "wedge_mm",
    "extension_mm",
    "end_turn_angle_deg",
    "riser_distance_mm",
    "scrap_percent",
    "reel_kg",
    "enamel_grade",
    "conductor_build_mm",
    "equalizer_wire",
];

/// Reads `[core]`, recording every problem; `None` when any value is in error.
pub(crate) fn read(t: &TableReader<'_, '_>) -> Option<Core> {
    let keys = t.keep(t.deny_unknown(KEYS));
    let pos = |k: &str, max: f64, what: &str| t.keep(t.number(k, 0.0, true, max, what));
    let nonneg = |k: &str, max: f64, what: &str| t.keep(t.number(k, 0.0, false, max, what));
    let len = |stem: &str, min_exclusive: bool, max: f64, what: &str| {
        t.keep(t.length(stem, 0.0, min_exclusive, max, what))
    };
    let diameter = len("diameter", true, 10_000.0, "the armature diameter");
    let length = len("length", true, 10_000.0, "the core length");
    let depth = len("slot_depth", true, 500.0, "the slot depth");
    let width = len("slot_width", true, 500.0, "the slot width");
    let liner = len("liner", false, 20.0, "the slot liner's thickness");
    let separator = len("separator", false, 20.0, "the layer separator's thickness");
    let wedge = len("wedge", false, 20.0, "the slot wedge's thickness");
    let extension = len(
        "extension",
        false,
        500.0,
        "the coil's straight extension past the core at each end",
    );
    let angle = t.keep(t.number(
        "end_turn_angle_deg",
        5.0,
        false,
        60.0,
        "the end turn's angle to the core end face in degrees",
    ));
    let risers = len(
        "riser_distance",
        false,
        2000.0,
        "the distance from the core end to the risers",
    );
    let scrap = nonneg("scrap_percent", 100.0, "the scrap allowance in percent");
    let reel = pos("reel_kg", 10_000.0, "the copper on one reel in kg");
    let grade = t.keep(t.int(
        "enamel_grade",
        1..=2,
        "the enamel grade (IEC 60317)",
        "grade 1 is the thinner enamel, grade 2 the thicker",
    ));
    let build = len(
        "conductor_build",
        false,
        5.0,
        "the insulation's increase of each conductor dimension",
    );
    let eq_wire = t.keep(t.choice("equalizer_wire", &["same", "separate"]));
    let (depth, width) = (depth?, width?);
    let slot = t.keep(slot_pair(t, depth.clone(), width.clone()));
    keys?;
    slot?;
    let (liner, separator, wedge) = (liner?, separator?, wedge?);
    let core = Core {
        diameter_mm: diameter?.map(|a| a.value),
        length_mm: length?.map(|a| a.value),
        slot_depth_mm: depth.as_ref().map(|a| a.value),
        slot_width_mm: width.as_ref().map(|a| a.value),
        liner_mm: liner.as_ref().map(|a| a.value),
        separator_mm: separator.as_ref().map(|a| a.value),
        wedge_mm: wedge.as_ref().map(|a| a.value),
        extension_mm: extension?.map(|a| a.value),
        end_turn_angle_deg: angle?.map(|a| a.value),
        riser_distance_mm: risers?.map(|a| a.value),
        scrap_percent: scrap?.map(|a| a.value),
        reel_kg: reel?.map(|a| a.value),
        enamel_grade: grade?.map(|a| a.value as u8),
        conductor_build_mm: build?.map(|a| a.value),
        equalizer_wire_same: eq_wire?.map(|a| a.value == "same"),
    };
    check_room(t, &core, [depth, width, liner, separator, wedge])?;
    Some(core)
}

/// Refuses slot insulation that leaves no room for the coil sides, at the key that does it:
/// `given` holds `slot_depth_mm`, `slot_width_mm`, `liner_mm`, `separator_mm`, `wedge_mm`.
fn check_room(t: &TableReader<'_, '_>, core: &Core, given: [Option<At<f64>>; 5]) -> Option<()> {
    let [depth, width, liner, separator, wedge] = given;
    let u = t.src.units;
    if let Some(h) = &depth {
        let taken = core.liner() + core.separator() + core.wedge();
        if taken >= h.value {
            let span = wedge
                .as_ref()
                .or(separator.as_ref())
                .or(liner.as_ref())
                .map_or(h.span.clone(), |a| a.span.clone());
            let key = t.length_key(if wedge.is_some() {
                "wedge"
            } else if separator.is_some() {
                "separator"
            } else if liner.is_some() {
                "liner"
            } else {
                "slot_depth"
            });
            t.keep::<()>(Err(t
                .src
                .error(
                        span,
                        t.dotted(&key),
                        format!(
                            "the wedge ({}), liner ({}) and separator ({}) leave no room in the {} slot depth",
                            u.echo(core.wedge()),
                            u.echo(core.liner()),
                            u.echo(core.separator()),
                            u.echo(h.value)
                        ),
                    )
                    .with_hint("the wedge, the liner at the slot bottom and the separator together must be less than the slot depth")));
            return None;
        }
    }
    if let Some(w) = &width
        && 2.0 * core.liner() >= w.value
    {
        let span = liner.as_ref().map_or(w.span.clone(), |a| a.span.clone());
        t.keep::<()>(Err(t
            .src
            .error(
                span,
                t.dotted(&t.length_key(if liner.is_some() {
                    "liner"
                } else {
                    "slot_width"
                })),
                format!(
                    "a liner of {} on both walls fills the {} slot width",
                    u.echo(core.liner()),
                    u.echo(w.value)
                ),
            )
            .with_hint("the liner must be less than half the slot width")));
        return None;
    }
    Some(())
}

/// The slot depth and width, both or neither.
fn slot_pair(
    t: &TableReader<'_, '_>,
    depth: Option<At<f64>>,
    width: Option<At<f64>>,
) -> Result<(Option<f64>, Option<f64>), Diagnostic> {
    let lone = |given: At<f64>, key: &str, other: &str| {
        let (key, other) = (t.length_key(key), t.length_key(other));
        t.src
            .error(
                given.span,
                format!("core.{key}"),
                format!("{key} is given without {other}: the slot's permeance needs both"),
            )
            .with_hint(format!(
                "add {other}, or leave both out to take a slot 4 times as deep as wide"
            ))
    };
    match (depth, width) {
        (Some(d), Some(w)) => Ok((Some(d.value), Some(w.value))),
        (Some(d), None) => Err(lone(d, "slot_depth", "slot_width")),
        (None, Some(w)) => Err(lone(w, "slot_width", "slot_depth")),
        (None, None) => Ok((None, None)),
    }
}
