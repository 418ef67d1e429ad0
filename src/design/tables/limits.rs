//! `[limits]`: shop overrides of the rating limits.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). The keys, their units
//! and defaults are the rows of [`LIMITS`] (`design/limits.rs`); each value is a number within
//! its row's accepted range ([`crate::design::LimitSpec::accepted`]: 1/1000 to 1000
//! times the default), and an absent key keeps its default.

use crate::design::Diagnostic;
use crate::design::limits::{LIMIT_KEYS, LIMIT_RANGE_FACTOR, LIMITS, Limits};
use crate::design::reader::{TableReader, fmt_num};

/// Reads `[limits]`; an absent table is [`Limits::default`].
pub(crate) fn read(t: &TableReader<'_, '_>) -> Result<Limits, Diagnostic> {
    t.deny_unknown(&LIMIT_KEYS)?;
    let mut limits = Limits::default();
    for spec in &LIMITS {
        let (min, max) = spec.accepted();
        let what = format!(
            "the limit on the {} in {} (default {}; a shop may set 1/{factor} to {factor} times it)",
            spec.quantity,
            spec.unit,
            fmt_num(spec.default),
            factor = fmt_num(LIMIT_RANGE_FACTOR),
        );
        if let Some(a) = t.number(spec.key, min, false, max, &what)? {
            limits.set(spec.limit, a.value);
        }
    }
    Ok(limits)
}
