//! The words of a rating check: value, limit with units, verdict and `[limits]` key.
//!
//! Part of the `rating` stage, not `render`: every [`crate::base::Finding`] carries its
//! message, and the rating's findings are built in stage 4 (`rating::findings_of`),
//! which may not import the render stage above it. Renderers that print a check
//! (`render::rewind_text`) call [`RatingCheck::message`] too, so the wording is written once.

use super::{Bound, RatingCheck};
use crate::base::number::fmt_fixed;

impl RatingCheck {
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
