//! `design`: parse and validate a TOML design file into a resolved [`Design`].
//!
//! First stage of the pipeline. Nothing here reads files: the CLI passes the bytes in.
//! Errors are [`Diagnostic`]s naming file, line, column, key, what was expected and a hint.

// A diagnostic is built at most once per run, on the way out; boxing it would buy nothing.
#![allow(clippy::result_large_err)]

mod diagnostic;
mod model;
mod parse;
mod reader;

pub use diagnostic::Diagnostic;
pub use model::*;
pub use parse::{LIMIT_KEYS, parse_design, parse_design_bytes};
