//! `checks`: the trade's rules applied to a design and its traced winding.
//!
//! Third stage of the pipeline. One file per rule family; each returns [`Finding`]s and never
//! prints. To add a rule, add a function to the family's file (or a new file) that pushes
//! findings, call it from [`run_checks`], and give it an id, a severity and its source.

mod finding;
mod lap;
mod shop;
mod sources;
mod span;
mod symmetry;
mod trace;
mod wave;

pub use finding::{Finding, Severity, has_errors};
pub use symmetry::is_symmetric;

use crate::design::{Design, WindingType};
use crate::winding::Winding;

/// Runs every rule family in a fixed order.
pub fn run_checks(design: &Design, winding: &Winding) -> Vec<Finding> {
    let mut out = Vec::new();
    span::check(design, winding, &mut out);
    symmetry::check(design, winding, &mut out);
    match design.winding_type {
        WindingType::Lap => lap::check(design, winding, &mut out),
        WindingType::Wave => wave::check(design, winding, &mut out),
    }
    trace::check(design, winding, &mut out);
    shop::check(design, winding, &mut out);
    out.extend(crate::rating::rating_findings(design, winding));
    out
}
