//! The rating checks as [`Finding`]s, for the checks list of `check`.
//!
//! Bridges the pure `rating` stage into the `checks` stage: each finding carries the rule's
//! id, severity, the computed value and the limit with units, and the rule's source.

use super::{Level, RatingReport, rate};
use crate::checks::{Finding, Severity};
use crate::design::Design;
use crate::winding::Winding;

/// The rating findings of `design`, in rule order; empty without rating inputs.
pub fn rating_findings(design: &Design, winding: &Winding) -> Vec<Finding> {
    rate(design, winding).map_or_else(Vec::new, |r| findings_of(&r))
}

/// The findings of a computed report.
pub fn findings_of(r: &RatingReport) -> Vec<Finding> {
    r.checks
        .iter()
        .map(|c| {
            let severity = match c.rule.level {
                Level::Error => Severity::Error,
                Level::Warning => Severity::Warning,
                Level::Info => Severity::Info,
            };
            Finding::new(c.rule.id, severity, c.passed, c.message(), c.rule.source)
        })
        .collect()
}
