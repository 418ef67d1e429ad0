//! `base`: the leaf every stage may use: rule findings with their severity, the one number
//! writer, and the shop cautions.
//!
//! Stage 0 of the pipeline (see [`crate::STAGES`]). It knows nothing of windings, designs or
//! output formats; it imports nothing from the crate.

pub mod caution;
pub mod finding;
pub mod number;

pub use finding::{Finding, Severity, has_errors};
