//! Cross-checks of the traced winding against the textbook formulas.
//!
//! Part of the `checks` stage.

use super::sources::TRACE;
use super::{Finding, Severity};
use crate::design::Design;
use crate::winding::Winding;

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let formula = d.winding_type.kind().paths_formula(d.multiplicity, d.poles);
    out.push(Finding::new(
        "trace.paths",
        Severity::Error,
        w.parallel_paths() == w.paths_formula,
        format!(
            "traced {} parallel paths; formula {formula} = {}",
            w.parallel_paths(),
            w.paths_formula
        ),
        TRACE,
    ));
    out.push(Finding::new(
        "trace.reentrancy",
        Severity::Error,
        w.reentrancy() == w.reentrancy_formula,
        format!(
            "traced {} closed winding(s); formula gcd(C, |y_c|) = {}",
            w.reentrancy(),
            w.reentrancy_formula
        ),
        TRACE,
    ));
    let visited: usize = w.closed_windings.iter().map(|c| c.steps.len()).sum();
    out.push(Finding::new(
        "trace.every-coil",
        Severity::Error,
        visited == w.active_coils_all() as usize,
        format!(
            "the trace visits {visited} of {} active coils",
            w.active_coils_all()
        ),
        TRACE,
    ));
}
