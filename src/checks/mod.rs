//! `checks`: the trade's rules applied to a design, its traced winding and its rating; and
//! [`check`], the one entry that runs the pure pipeline once.
//!
//! Stage 5 of the pipeline (see [`crate::STAGES`]). One file per rule family; each pushes
//! [`Finding`]s and never prints. To add a rule, add a function to the family's file (or a new
//! file) that pushes findings, call it from [`run_checks`], and give it an id, a severity and
//! its source; then add a passing and a failing row to `tests/it/rule_cases.rs`. A family that
//! belongs to some winding kinds only runs when the kind's answer to a question says so (see
//! [`run_checks`]); no family names a kind.
//!
//! [`identify`](crate::features::identify) is no rule family: it builds the designs a data card
//! allows and runs each through [`check`], keeping those whose trace reproduces the
//! observations.

mod frog_leg;
mod lap;
pub mod rules;
mod shop;
mod sources;
mod span;
mod symmetry;
mod trace;
mod wave;

pub use crate::base::{Finding, Severity, has_errors};
pub use sources::BAR_RULE;

use crate::design::Design;
use crate::rating::{RatingReport, findings_of, rate};
use crate::winding::{Winding, trace_winding};

/// A design traced, rated and checked: everything layout and render need, computed once.
#[derive(Clone, Debug)]
pub struct Checked {
    /// The resolved design.
    pub design: Design,
    /// The traced winding.
    pub winding: Winding,
    /// The rating, `None` when the design has no rating inputs.
    pub rating: Option<RatingReport>,
    /// The rule findings in report order, rating findings last.
    pub findings: Vec<Finding>,
    /// Whether the paths are symmetric: the textbook rule passes, or the exact structural test
    /// (`symmetry.exact`, [`Winding::exact_symmetric`]) rescues a winding the rule refuses.
    pub symmetric: bool,
}

/// The lead every output of a design `check` refuses carries (the sheets' band, `draw`'s
/// page, `test`'s report, plot and JSON, the `wrote` lines of `sheet` and `draw`): written once.
pub const NOT_FOR_WINDING: &str = "NOT FOR WINDING: design fails checks";

impl Checked {
    /// True when an error-level rule failed (`check` exits 1).
    pub fn has_errors(&self) -> bool {
        has_errors(&self.findings)
    }

    /// The failed error-level checks, `id: message`, in report order: what every output of a
    /// design `check` refuses names after [`NOT_FOR_WINDING`]. Empty when `check` passes it.
    pub fn failures(&self) -> Vec<String> {
        self.findings
            .iter()
            .filter(|f| f.is_failure())
            .map(|f| format!("{}: {}", f.id, f.message))
            .collect()
    }

    /// The ids of the failed error-level checks, in report order.
    pub fn failed_ids(&self) -> Vec<String> {
        self.findings
            .iter()
            .filter(|f| f.is_failure())
            .map(|f| f.id.clone())
            .collect()
    }
}

/// The one line a text output of a refused design says (`None` when `check` passes it):
/// [`NOT_FOR_WINDING`], the exit code and the failed checks, `id: message`.
pub fn refusal_line(failures: &[String]) -> Option<String> {
    (!failures.is_empty()).then(|| format!("{NOT_FOR_WINDING} (exit 1): {}", failures.join("; ")))
}

/// Traces, rates and checks `design`, each exactly once.
pub fn check(design: Design) -> Checked {
    let winding = trace_winding(&design);
    let rating = rate(&design, &winding);
    let mut findings = run_checks(&design, &winding, rating.as_ref());
    let symmetric = symmetry::symmetric(&design, &winding);
    if let Some(r) = &rating {
        findings.extend(findings_of(r));
    }
    Checked {
        design,
        winding,
        rating,
        findings,
        symmetric,
    }
}

/// Runs every winding rule family in a fixed order (the rating's findings are added by
/// [`check`]).
pub fn run_checks(
    design: &Design,
    winding: &Winding,
    rating: Option<&RatingReport>,
) -> Vec<Finding> {
    let mut out = Vec::new();
    span::check(design, winding, &mut out);
    symmetry::check(design, winding, rating, &mut out);
    // Each kind-specific family runs when the kind asks its question: the equalizer rules for
    // a kind that takes equalizers (lap), the dummy-coil rules for one that may leave dummies
    // (wave), the element rules for one of several elements (frog-leg).
    let kind = design.winding_type.kind();
    if kind.takes_equalizers() {
        lap::check(design, winding, &mut out);
    }
    if !kind.uses_every_coil() {
        wave::check(design, winding, &mut out);
    }
    if kind.element_count() > 1 {
        frog_leg::check(design, winding, &mut out);
    }
    trace::check(design, winding, &mut out);
    shop::check(design, winding, &mut out);
    out
}
