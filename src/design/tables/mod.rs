//! One reader per design-file table: each owns its list of keys, reads and validates its
//! values, and documents the keys with their defaults.
//!
//! Part of the `design` stage, called in document order by `parse::parse_design`, which
//! keeps only the top-level orchestration. Every reader works through the located access of
//! `reader::TableReader`; a problem is a [`super::Diagnostic`], recorded (`TableReader::keep`)
//! so the reader goes on with its other keys wherever they stand alone, and the reader returns
//! `None` when any value is in error (`job.rs` leaves a field in error out; `limits.rs` and `rating.rs` return their first
//! problem, which the caller records). None does I/O.
//!
//! `segments.rs` is not a table: it resolves the commutator segment count, which needs both
//! `[armature]` and `[winding]`.

pub(super) mod armature;
pub(super) mod commutator;
pub(super) mod conductor;
pub(super) mod core;
pub(super) mod job;
pub(super) mod limits;
pub(super) mod rating;
pub(super) mod segments;
pub(super) mod winding;
