//! `[core]`: the armature core's size, for the mean turn, the electric loading and the
//! reactance voltage.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, all optional with
//! no default: `diameter_mm` (armature outside diameter) and `length_mm` (stack length), each
//! above 0 and at most 10 000; `slot_depth_mm` and `slot_width_mm` (the armature slot, for its
//! specific permeance), each above 0 and at most 1 000, given together or not at all.

use crate::design::Diagnostic;
use crate::design::model::Core;
use crate::design::reader::{At, TableReader};

/// The keys of `[core]`.
pub(crate) const KEYS: &[&str] = &["diameter_mm", "length_mm", "slot_depth_mm", "slot_width_mm"];

/// Reads `[core]`, recording every problem; `None` when any value is in error.
pub(crate) fn read(t: &TableReader<'_, '_>) -> Option<Core> {
    let keys = t.keep(t.deny_unknown(KEYS));
    let diameter = t.keep(t.number(
        "diameter_mm",
        0.0,
        true,
        10_000.0,
        "the armature diameter in mm",
    ));
    let length = t.keep(t.number("length_mm", 0.0, true, 10_000.0, "the core length in mm"));
    let depth = t.keep(t.number(
        "slot_depth_mm",
        0.0,
        true,
        1_000.0,
        "the armature slot depth in mm",
    ));
    let width = t.keep(t.number(
        "slot_width_mm",
        0.0,
        true,
        1_000.0,
        "the armature slot width in mm",
    ));
    let slot = t.keep(slot_pair(t, depth?, width?));
    keys?;
    let (slot_depth_mm, slot_width_mm) = slot?;
    Some(Core {
        diameter_mm: diameter?.map(|a| a.value),
        length_mm: length?.map(|a| a.value),
        slot_depth_mm,
        slot_width_mm,
    })
}

/// The slot depth and width, both or neither.
fn slot_pair(
    t: &TableReader<'_, '_>,
    depth: Option<At<f64>>,
    width: Option<At<f64>>,
) -> Result<(Option<f64>, Option<f64>), Diagnostic> {
    let lone = |given: At<f64>, key: &str, other: &str| {
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
        (Some(d), None) => Err(lone(d, "slot_depth_mm", "slot_width_mm")),
        (None, Some(w)) => Err(lone(w, "slot_width_mm", "slot_depth_mm")),
        (None, None) => Ok((None, None)),
    }
}
