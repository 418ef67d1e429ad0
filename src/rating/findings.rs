//! The rating checks as [`Finding`]s, for the checks list of `check`.
//!
//! Part of the `rating` stage: each finding carries the rule's id, severity, the computed value
//! and the limit with units, and the rule's source. The `checks` stage merges them into its
//! list; the report is computed once, by [`crate::checks::check`].

use super::RatingReport;
use crate::base::Finding;

/// The findings of a computed report, in rule order.
pub fn findings_of(r: &RatingReport) -> Vec<Finding> {
    r.checks
        .iter()
        .map(|c| {
            Finding::new(
                c.rule.id,
                c.rule.level,
                c.passed,
                c.message(),
                c.rule.source,
            )
        })
        .collect()
}
