//! Arnold's symmetry conditions for identical parallel paths, and the simulated balance.
//!
//! Part of the `checks` stage.

use super::sources::{SIMULATION, SYMMETRY};
use super::{Finding, Severity};
use crate::base::number::fmt_fixed;
use crate::design::Design;
use crate::winding::Winding;

/// The ids of the classical symmetry conditions.
const IDS: [&str; 3] = [
    "symmetry.coils-per-path-pair",
    "symmetry.slots-per-path-pair",
    "symmetry.pole-pairs-per-path-pair",
];

/// True when no classical symmetry condition fails.
pub fn is_symmetric(findings: &[Finding]) -> bool {
    findings
        .iter()
        .filter(|f| IDS.contains(&f.id.as_str()))
        .all(|f| f.passed)
}

fn whole(num: u32, den: u32) -> bool {
    den != 0 && num.is_multiple_of(den)
}

fn ratio(num: u32, den: u32) -> String {
    if den == 0 {
        return "undefined".into();
    }
    fmt_fixed(f64::from(num) / f64::from(den), 2)
}

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    let a = w.parallel_paths();
    let pairs = a / 2;
    let c = w.active_coils;
    let p = d.pole_pairs();
    out.push(Finding::new(
        IDS[0],
        Severity::Error,
        whole(c, pairs),
        format!(
            "coils per pair of paths C/(a/2) = {c}/{pairs} = {}; must be whole",
            ratio(c, pairs)
        ),
        SYMMETRY,
    ));
    out.push(Finding::new(
        IDS[1],
        Severity::Error,
        whole(d.slots, pairs),
        format!(
            "slots per pair of paths S/(a/2) = {}/{pairs} = {}; must be whole",
            d.slots,
            ratio(d.slots, pairs)
        ),
        SYMMETRY,
    ));
    if d.winding_type.kind().symmetry_counts_pole_pairs() {
        out.push(Finding::new(
            IDS[2],
            Severity::Error,
            whole(p, pairs),
            format!(
                "pole pairs per pair of paths p/(a/2) = {p}/{pairs} = {}; must be whole",
                ratio(p, pairs)
            ),
            SYMMETRY,
        ));
    }
    let rule_ok = is_symmetric(out);
    let b = &w.balance;
    let sim = format!(
        "simulated path EMFs differ by {} coil EMFs on average ({} at worst) over {} rotor positions",
        fmt_fixed(b.mean_spread_coils, 2),
        fmt_fixed(b.peak_spread_coils, 2),
        b.samples
    );
    let verdict = match (rule_ok, b.balanced) {
        (true, true) => "balanced; agrees with the symmetry rule".to_string(),
        (false, false) => "unbalanced; agrees with the symmetry rule".to_string(),
        (true, false) => format!(
            "unbalanced by more than {} coil EMF, although the symmetry rule passes: the two disagree; {}",
            crate::winding::BALANCE_TOLERANCE,
            if w.dummy_coils.is_empty() {
                "the rule counts coils and slots, the simulation also sees where each coil lies under the poles"
            } else {
                "the dummy coils leave a gap the rule does not count; spread them or choose a segment count that needs none"
            }
        ),
        (false, true) => "balanced on average, although the symmetry rule fails: the two disagree; the simulation sees only EMF, not the circulating currents an unsymmetrical winding carries, so follow the rule".to_string(),
    };
    out.push(Finding::new(
        "symmetry.simulated-balance",
        Severity::Warning,
        b.balanced,
        format!("{sim}: {verdict}"),
        SIMULATION,
    ));
}
