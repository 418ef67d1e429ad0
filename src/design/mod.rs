//! `design`: parse and validate a TOML design file into a resolved [`Design`].
//!
//! Stage 2 of the pipeline (see [`crate::STAGES`]); it imports only `base` and `theory`.
//! Nothing here reads files: the CLI passes the bytes in. Errors are [`Diagnostic`]s naming
//! file, line, column, key, what was expected and a hint; a file's problems come back
//! together as [`Diagnostics`], in source order.
//!
//! The files:
//! - `parse.rs`: the orchestration — UTF-8, TOML, the list of tables, the order of readers;
//! - `tables/`: one reader per table (`job.rs`, `armature.rs`, `winding.rs`, `rating.rs`,
//!   `conductor.rs`, `core.rs`, `commutator.rs`, `limits.rs`), each with its `KEYS`, its
//!   reading and validation, and a doc listing the keys with their defaults; `segments.rs`
//!   resolves the segment count from `[armature]` and `[winding]`;
//! - `limits.rs`: the `[limits]` spec table [`LIMITS`], the one place a rating limit is written;
//! - `reader.rs`: located, typed access to one table (shared by every reader);
//! - `frame.rs`: a frame file (`armsheet explore`: the iron, commutator and rating a
//!   designer searches windings for, and the `[search]` table) → a validated [`Frame`], with
//!   the same readers and located errors;
//! - `card.rs`: a data card (what a rewinder records before stripping) → a validated
//!   [`Card`], with the same readers and located errors;
//! - `diagnostic.rs`: the error, the list of a file's errors and their rendering (every text
//!   from the file shown through `base::visible`); `model.rs`: the resolved [`Design`];
//! - `build.rs`: [`Design::new`], the one constructor of a [`Design`] (the parser, identify
//!   and the rewind all call it), with the defaults and the checks every design passes.
//!
//! To add a key: add it to the table reader's `KEYS`, read and validate it there, add the
//! field (with its key and default in the doc) to [`Design`] or the table's type in
//! `model.rs`, and document it in the reader's `//!`, the README and `src/cli/starter.toml`.
//! To add a `[limits]` key: add one row to [`LIMITS`] (see `limits.rs`); the reader, the
//! resolved [`Limits`] and the rating checks follow from it.
//! To add a table: add a reader in `tables/` with a `mod` line in `tables/mod.rs`, its name
//! to `TABLES` in `parse.rs`, and call it from `parse_design` at its place in the order.

// A diagnostic is built at most once per run, on the way out; boxing it would buy nothing.
#![allow(clippy::result_large_err)]

mod build;
mod card;
mod diagnostic;
mod frame;
mod limits;
mod model;
mod parse;
mod reader;
mod tables;

pub use build::{
    DEFAULT_POLE_ARC, DesignError, DesignSpec, MAX_EQUALIZER_STEP, MAX_LEAD_OFFSET_HALF_BARS,
    POLE_ARC_RANGE,
};
pub use card::{Card, OBSERVED_KEYS, parse_card, parse_card_bytes};
pub use diagnostic::{Diagnostic, Diagnostics, MAX_DIAGNOSTICS};
pub use frame::{
    ConductorFamily, Frame, SEARCH_KEYS, Search, SegmentChoice, frame_of_design, parse_frame,
    parse_frame_bytes,
};
pub use limits::{Bound, LIMIT_KEYS, LIMITS, LimitId, LimitSpec, Limits};
pub use model::*;
pub use parse::{parse_design, parse_design_bytes};
