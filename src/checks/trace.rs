//! Cross-checks of the traced winding against the textbook formulas.
//!
//! Part of the `checks` stage.

use super::{Finding, rules};
use crate::base::number::counted;
use crate::design::Design;
use crate::winding::Winding;

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let formula = d.winding_type.kind().paths_formula(d.multiplicity, d.poles);
    out.push(Finding::of(
        &rules::TRACE_PATHS,
        w.parallel_paths() == w.paths_formula,
        format!(
            "traced {} parallel paths; formula {formula} = {}",
            w.parallel_paths(),
            w.paths_formula
        ),
    ));
    out.push(Finding::of(
        &rules::TRACE_REENTRANCY,
        w.reentrancy() == w.reentrancy_formula,
        format!(
            "traced {}; formula gcd(C, |y_c|) = {}",
            counted(w.reentrancy(), "closed winding", "closed windings"),
            w.reentrancy_formula
        ),
    ));
    let visited: usize = w.closed_windings.iter().map(|c| c.steps.len()).sum();
    out.push(Finding::of(
        &rules::TRACE_EVERY_COIL,
        visited == w.active_coils_all() as usize,
        format!(
            "the trace visits {visited} of {} active coils",
            w.active_coils_all()
        ),
    ));
}
