//! `[limits]`: shop overrides of the rating limits.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). The keys, their units
//! and defaults are the rows of [`LIMITS`] (`design/limits.rs`); each value is a number
//! above 0 and at most 10^9, and an absent key keeps its default.

use crate::design::Diagnostic;
use crate::design::limits::{LIMIT_KEYS, LIMITS, Limits};
use crate::design::reader::TableReader;

/// Reads `[limits]`; an absent table is [`Limits::default`].
pub(crate) fn read(t: &TableReader<'_, '_>) -> Result<Limits, Diagnostic> {
    t.deny_unknown(&LIMIT_KEYS)?;
    let mut limits = Limits::default();
    for spec in &LIMITS {
        if let Some(a) = t.number(
            spec.key,
            0.0,
            true,
            1e9,
            "a limit (see the README for units)",
        )? {
            limits.set(spec.limit, a.value);
        }
    }
    Ok(limits)
}
