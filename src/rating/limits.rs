//! The rating checks: each computed value against its `[limits]` threshold.
//!
//! Part of the `rating` stage. Every rule is a row of the spec table
//! [`crate::design::LIMITS`] (key, default, unit, bound, severity, id, source), so a shop's
//! `[limits]` override changes the verdict and no rule is written twice. The words of a
//! check ([`RatingCheck::message`], [`fmt_limit`]) are in `limits/words.rs`.

mod words;

pub use crate::design::Bound;
use crate::design::{LIMITS, LimitId, LimitSpec, Limits};
pub use words::fmt_limit;

/// One threshold: a row of [`LIMITS`].
pub type Rule = LimitSpec;

/// The rules by name, each a row of [`LIMITS`].
pub mod rules {
    use super::{LIMITS, LimitId, Rule};

    const fn rule(id: LimitId) -> Rule {
        LIMITS[id as usize]
    }

    /// Average segment voltage.
    pub const SEGMENT_VOLTS_AVG: Rule = rule(LimitId::SegmentVoltsAvgMax);
    /// Estimated peak segment voltage.
    pub const SEGMENT_VOLTS_PEAK: Rule = rule(LimitId::SegmentVoltsPeakMax);
    /// Current per parallel path.
    pub const PATH_CURRENT: Rule = rule(LimitId::PathCurrentMax);
    /// Current per brush arm.
    pub const BRUSH_ARM_CURRENT: Rule = rule(LimitId::BrushArmCurrentMax);
    /// Segment pitch.
    pub const SEGMENT_PITCH: Rule = rule(LimitId::SegmentPitchMin);
    /// Commutator peripheral speed, preferred.
    pub const SPEED_PREFERRED: Rule = rule(LimitId::CommutatorSpeedPreferred);
    /// Commutator peripheral speed, maximum.
    pub const SPEED_MAX: Rule = rule(LimitId::CommutatorSpeedMax);
    /// Current density, lower bound.
    pub const DENSITY_MIN: Rule = rule(LimitId::CurrentDensityMin);
    /// Current density, upper bound.
    pub const DENSITY_MAX: Rule = rule(LimitId::CurrentDensityMax);
    /// Brush width, lower bound.
    pub const BRUSH_WIDTH_MIN: Rule = rule(LimitId::BrushWidthMin);
    /// Brush width, upper bound.
    pub const BRUSH_WIDTH_MAX: Rule = rule(LimitId::BrushWidthMax);
    /// Electric loading.
    pub const ELECTRIC_LOADING: Rule = rule(LimitId::ElectricLoadingMax);
    /// Reactance voltage against the limit without interpoles.
    pub const INTERPOLES_NEEDED: Rule = rule(LimitId::ReactanceVoltsNoInterpolesMax);
    /// Reactance voltage against the limit with interpoles.
    pub const REACTANCE_VOLTAGE: Rule = rule(LimitId::ReactanceVoltsMax);
    /// Slot fill.
    pub const SLOT_FILL: Rule = rule(LimitId::SlotFillMax);

    /// Every rule, one per `[limits]` key, in report order.
    pub const ALL: [Rule; 15] = LIMITS;
}

/// The threshold `rule` uses in `limits`, and its default.
pub fn limit_of(rule: &Rule, limits: &Limits) -> (f64, f64) {
    (limits.get(rule.limit), rule.default)
}

/// One rating check's outcome.
#[derive(Clone, Debug, PartialEq)]
pub struct RatingCheck {
    /// The rule.
    pub rule: Rule,
    /// Whether the value is within the limit.
    pub passed: bool,
    /// The computed value, in `rule.unit`.
    pub value: f64,
    /// The limit applied, in `rule.unit`.
    pub limit: f64,
    /// True when `[limits]` set the limit (it differs from the default).
    pub overridden: bool,
    /// What would fix a failure, with numbers (empty when passed).
    pub advice: Vec<String>,
}

impl RatingCheck {
    /// Applies `rule` to `value`.
    pub fn new(rule: Rule, value: f64, limits: &Limits) -> RatingCheck {
        let (limit, default) = limit_of(&rule, limits);
        let passed = match rule.bound {
            Bound::AtMost => value <= limit,
            Bound::AtLeast => value >= limit,
        };
        RatingCheck {
            rule,
            passed,
            value,
            limit,
            overridden: limit != default,
            advice: Vec::new(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_rule_reads_its_own_limit() {
        let mut l = Limits::default();
        for (i, spec) in LIMITS.iter().enumerate() {
            l.set(spec.limit, 1000.0 + i as f64);
        }
        for (i, rule) in rules::ALL.iter().enumerate() {
            assert_eq!(limit_of(rule, &l), (1000.0 + i as f64, rule.default));
            assert_eq!(LimitId::spec(rule.limit).key, rule.key);
        }
    }
}
