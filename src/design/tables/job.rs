//! `[job]`: optional text that identifies the job, printed on reports and sheets.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys, all optional text
//! with no default: `id`, `title`, `customer`, `date` (a TOML date is taken as text; the only
//! date armsheet ever prints), each at most [`MAX_LINE_CHARS`] characters, and `notes`, at
//! most [`MAX_NOTES_CHARS`].

use crate::design::Diagnostic;
use crate::design::model::Job;
use crate::design::reader::TableReader;

/// The keys of `[job]`.
pub(crate) const KEYS: &[&str] = &["id", "title", "customer", "date", "notes"];

/// The longest `id`, `title`, `customer` or `date`, in characters.
pub const MAX_LINE_CHARS: usize = 200;

/// The longest `notes`, in characters.
pub const MAX_NOTES_CHARS: usize = 4_000;

/// Reads `[job]`, recording every problem (an absent table is [`Job::default`]); a field in
/// error is left out.
pub(crate) fn read(t: &TableReader<'_, '_>) -> Job {
    t.keep(t.deny_unknown(KEYS));
    let s = |k: &str| t.keep(text(t, k)).flatten();
    Job {
        id: s("id"),
        title: s("title"),
        customer: s("customer"),
        date: s("date"),
        notes: s("notes"),
    }
}

/// One text key, refused when longer than its cap.
fn text(t: &TableReader<'_, '_>, key: &str) -> Result<Option<String>, Diagnostic> {
    let Some(a) = t.string(key)? else {
        return Ok(None);
    };
    let max = if key == "notes" {
        MAX_NOTES_CHARS
    } else {
        MAX_LINE_CHARS
    };
    let n = a.value.chars().count();
    if n > max {
        let hint = if key == "notes" {
            "keep the notes short; a longer text belongs in a document of its own"
        } else {
            "shorten it; longer text belongs in `notes`"
        };
        return Err(t
            .src
            .error(
                a.span,
                t.dotted(key),
                format!("{key} is {n} characters long: expected at most {max}"),
            )
            .with_hint(hint));
    }
    Ok(Some(a.value))
}
