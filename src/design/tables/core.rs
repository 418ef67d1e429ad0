//! `[core]`: the armature core's size, for the mean turn and the electric loading.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, both optional with
//! no default: `diameter_mm` (armature outside diameter) and `length_mm` (stack length), each
//! above 0 and at most 10 000.

use crate::design::Diagnostic;
use crate::design::model::Core;
use crate::design::reader::TableReader;

/// The keys of `[core]`.
pub(crate) const KEYS: &[&str] = &["diameter_mm", "length_mm"];

/// Reads `[core]`.
pub(crate) fn read(t: &TableReader<'_, '_>) -> Result<Core, Diagnostic> {
    t.deny_unknown(KEYS)?;
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
