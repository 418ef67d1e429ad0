//! The rating checks as [`Finding`]s, for the checks list of `check`.
//!
//! Part of the `rating` stage: each finding carries the rule's id, severity, the computed value
//! and the limit with units, and the rule's source. The `checks` stage merges them into its
//! list; the report is computed once, by [`crate::checks::check`].

use super::RatingReport;
use crate::base::{Finding, RuleSpec};
use crate::design::LimitSpec;

/// A rating rule's row of the rules table (`checks::rules::RULES`): the id, severity and
/// source its `[limits]` row gives.
pub const fn limit_rule(spec: &LimitSpec) -> RuleSpec {
    RuleSpec {
        id: spec.id,
        severity: spec.level,
        source: spec.source,
    }
}

/// The findings of a computed report, in rule order.
pub fn findings_of(r: &RatingReport) -> Vec<Finding> {
    r.checks
        .iter()
        .map(|c| Finding::of(&limit_rule(&c.rule), c.passed, c.message()))
        .collect()
}
