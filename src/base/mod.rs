//! `base`: the leaf every stage may use: rule findings with their severity, and the one number
//! writer.
//!
//! Stage 0 of the pipeline (see [`crate::STAGES`]). It knows nothing of windings, designs or
//! output formats; it imports nothing from the crate.

pub mod finding;
pub mod number;

pub use finding::{Finding, Severity, has_errors};
