//! `base`: the leaf every stage may use: rule findings with their severity, the one number
//! writer, the shop cautions, and the one escaper of file-given text for a terminal.
//!
//! Stage 0 of the pipeline (see [`crate::STAGES`]). It knows nothing of windings, designs or
//! output formats; it imports nothing from the crate.

pub mod caution;
pub mod finding;
pub mod number;
pub mod units;
pub mod visible;

pub use finding::{Finding, RuleSpec, Severity, has_errors};
pub use units::Units;
