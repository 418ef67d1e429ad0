//! `[job]`: optional text that identifies the job, printed on reports and sheets.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, all optional text
//! with no default: `id`, `title`, `customer`, `date` (a TOML date is taken as text; the only
//! date armsheet ever prints), `notes`.

use crate::design::Diagnostic;
use crate::design::model::Job;
use crate::design::reader::TableReader;

/// The keys of `[job]`.
pub(crate) const KEYS: &[&str] = &["id", "title", "customer", "date", "notes"];

/// Reads `[job]`; an absent table is [`Job::default`].
pub(crate) fn read(t: &TableReader<'_, '_>) -> Result<Job, Diagnostic> {
    t.deny_unknown(KEYS)?;
    let s = |k| t.string(k).map(|o| o.map(|a| a.value));
    Ok(Job {
        id: s("id")?,
        title: s("title")?,
        customer: s("customer")?,
        date: s("date")?,
        notes: s("notes")?,
    })
}
