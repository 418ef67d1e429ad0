//! `[core]`: the armature core's size, for the mean turn and the electric loading.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, both optional with
//! no default: `diameter_mm` (armature outside diameter) and `length_mm` (stack length), each
//! above 0 and at most 10 000.

use crate::design::model::Core;
use crate::design::reader::TableReader;

/// The keys of `[core]`.
pub(crate) const KEYS: &[&str] = &["diameter_mm", "length_mm"];

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
    keys?;
    Some(Core {
        diameter_mm: diameter?.map(|a| a.value),
        length_mm: length?.map(|a| a.value),
    })
}
