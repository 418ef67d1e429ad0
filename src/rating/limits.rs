//! The rating checks: each computed value against its `[limits]` threshold.
//!
//! Part of the `rating` stage. Every threshold comes from [`Limits`] (defaults there, with
//! their sources), so a shop's `[limits]` override changes the verdict.

use crate::base::Severity;
use crate::base::number::fmt_fixed;
use crate::design::Limits;

/// Whether the limit is an upper or a lower bound.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Bound {
    /// value ≤ limit.
    AtMost,
    /// value ≥ limit.
    AtLeast,
}

/// One threshold: its id, `[limits]` key, what it measures and where the rule comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Rule {
    /// Finding id, `rating.…`.
    pub id: &'static str,
    /// The `[limits]` key.
    pub key: &'static str,
    /// What is measured, lower-case.
    pub quantity: &'static str,
    /// Unit of value and limit.
    pub unit: &'static str,
    /// Decimals shown.
    pub decimals: usize,
    /// Upper or lower bound.
    pub bound: Bound,
    /// Severity when it fails.
    pub level: Severity,
    /// Where the rule comes from.
    pub source: &'static str,
}

/// The rules, in report order.
pub mod rules {
    use super::{Bound, Rule};
    use crate::base::Severity;

    /// Average segment voltage.
    pub const SEGMENT_VOLTS_AVG: Rule = Rule {
        id: "rating.segment-volts-average",
        key: "segment_volts_avg_max",
        quantity: "average voltage between adjacent segments E*P/C",
        unit: "V",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Error,
        source: "keep the average segment voltage within about 15 V [common practice]",
    };
    /// Estimated peak segment voltage.
    pub const SEGMENT_VOLTS_PEAK: Rule = Rule {
        id: "rating.segment-volts-peak",
        key: "segment_volts_peak_max",
        quantity: "estimated peak segment voltage (average / pole arc)",
        unit: "V",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "peak about the average divided by the pole-arc ratio, within about 30 V [common practice; Sawhney, A Course in Electrical Machine Design, from memory]",
    };
    /// Current per parallel path.
    pub const PATH_CURRENT: Rule = Rule {
        id: "rating.path-current",
        key: "path_current_max",
        quantity: "current per parallel path I/a",
        unit: "A",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "about 200-250 A per path at most; above that use more paths [common practice]",
    };
    /// Current per brush arm.
    pub const BRUSH_ARM_CURRENT: Rule = Rule {
        id: "rating.brush-arm-current",
        key: "brush_arm_current_max",
        quantity: "current per brush arm 2I/P",
        unit: "A",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "at most about 400 A per brush arm [common practice]",
    };
    /// Current density, upper bound.
    pub const DENSITY_MAX: Rule = Rule {
        id: "rating.current-density-max",
        key: "current_density_max_a_mm2",
        quantity: "current density in the conductor",
        unit: "A/mm2",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "armature current density 4.5-7 A/mm2 [common practice, from memory]",
    };
    /// Current density, lower bound.
    pub const DENSITY_MIN: Rule = Rule {
        id: "rating.current-density-min",
        key: "current_density_min_a_mm2",
        quantity: "current density in the conductor",
        unit: "A/mm2",
        decimals: 2,
        bound: Bound::AtLeast,
        level: Severity::Info,
        source: "armature current density 4.5-7 A/mm2 [common practice, from memory]",
    };
    /// Segment pitch.
    pub const SEGMENT_PITCH: Rule = Rule {
        id: "rating.segment-pitch",
        key: "segment_pitch_min_mm",
        quantity: "segment pitch pi*D_c/C",
        unit: "mm",
        decimals: 2,
        bound: Bound::AtLeast,
        level: Severity::Error,
        source: "segment pitch at least 4 mm (3.2 mm copper + 0.8 mm mica) [common practice]",
    };
    /// Commutator peripheral speed, preferred.
    pub const SPEED_PREFERRED: Rule = Rule {
        id: "rating.commutator-speed-preferred",
        key: "commutator_speed_preferred_m_s",
        quantity: "commutator peripheral speed",
        unit: "m/s",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "commutator peripheral speed about 15 m/s preferred, 30 m/s at most [common practice]",
    };
    /// Commutator peripheral speed, maximum.
    pub const SPEED_MAX: Rule = Rule {
        id: "rating.commutator-speed-max",
        key: "commutator_speed_max_m_s",
        quantity: "commutator peripheral speed",
        unit: "m/s",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Error,
        source: "commutator peripheral speed about 15 m/s preferred, 30 m/s at most [common practice]",
    };
    /// Brush width, lower bound.
    pub const BRUSH_WIDTH_MIN: Rule = Rule {
        id: "rating.brush-width-min",
        key: "brush_width_min_segments",
        quantity: "brush width",
        unit: "segment pitches",
        decimals: 2,
        bound: Bound::AtLeast,
        level: Severity::Warning,
        source: "brushes 1 to 3 segment pitches wide [common practice]",
    };
    /// Brush width, upper bound.
    pub const BRUSH_WIDTH_MAX: Rule = Rule {
        id: "rating.brush-width-max",
        key: "brush_width_max_segments",
        quantity: "brush width",
        unit: "segment pitches",
        decimals: 2,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "brushes 1 to 3 segment pitches wide [common practice]",
    };
    /// Electric loading.
    pub const ELECTRIC_LOADING: Rule = Rule {
        id: "rating.electric-loading",
        key: "electric_loading_max_a_m",
        quantity: "electric loading Z*I/(a*pi*D)",
        unit: "A/m",
        decimals: 0,
        bound: Bound::AtMost,
        level: Severity::Warning,
        source: "armature electric loading up to about 40 000 A/m [common practice, from memory]",
    };

    /// Every rule, one per `[limits]` key.
    pub const ALL: [Rule; 12] = [
        SEGMENT_VOLTS_AVG,
        SEGMENT_VOLTS_PEAK,
        PATH_CURRENT,
        BRUSH_ARM_CURRENT,
        SEGMENT_PITCH,
        SPEED_PREFERRED,
        SPEED_MAX,
        DENSITY_MIN,
        DENSITY_MAX,
        BRUSH_WIDTH_MIN,
        BRUSH_WIDTH_MAX,
        ELECTRIC_LOADING,
    ];
}

/// The threshold `rule` uses in `limits`, and its default.
pub fn limit_of(rule: &Rule, limits: &Limits) -> (f64, f64) {
    let d = Limits::default();
    let pick = |l: &Limits| match rule.key {
        "segment_volts_avg_max" => l.segment_volts_avg_max,
        "segment_volts_peak_max" => l.segment_volts_peak_max,
        "path_current_max" => l.path_current_max,
        "brush_arm_current_max" => l.brush_arm_current_max,
        "segment_pitch_min_mm" => l.segment_pitch_min_mm,
        "commutator_speed_preferred_m_s" => l.commutator_speed_preferred_m_s,
        "commutator_speed_max_m_s" => l.commutator_speed_max_m_s,
        "current_density_min_a_mm2" => l.current_density_min_a_mm2,
        "current_density_max_a_mm2" => l.current_density_max_a_mm2,
        "brush_width_min_segments" => l.brush_width_min_segments,
        "brush_width_max_segments" => l.brush_width_max_segments,
        _ => l.electric_loading_max_a_m,
    };
    (pick(limits), pick(&d))
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

    /// The finding text: value, limit with units, and the `[limits]` key.
    pub fn message(&self) -> String {
        let r = &self.rule;
        let v = fmt_fixed(self.value, r.decimals);
        let l = fmt_limit(self.limit);
        let (word, fail) = match r.bound {
            Bound::AtMost => ("at most", "above"),
            Bound::AtLeast => ("at least", "below"),
        };
        let whose = if self.overridden {
            "shop limit"
        } else {
            "default limit"
        };
        let verdict = if self.passed { "within" } else { fail };
        let mut s = format!(
            "{} {v} {}: {verdict} the limit of {word} {l} {} ({whose}, [limits] {})",
            r.quantity, r.unit, r.unit, r.key
        );
        if !self.advice.is_empty() {
            s.push_str("; fix: ");
            s.push_str(&self.advice.join("; or "));
        }
        s
    }
}

/// A limit as written: whole numbers bare, others with two decimals.
pub fn fmt_limit(x: f64) -> String {
    if x.fract() == 0.0 {
        fmt_fixed(x, 0)
    } else {
        fmt_fixed(x, 2)
    }
}
