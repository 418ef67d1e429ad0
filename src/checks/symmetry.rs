//! Symmetry of the parallel paths: the exact test from the winding's own structure, Arnold's
//! conditions as the textbook rule, and the simulated balance as a cross-check.
//!
//! Part of the `checks` stage.
//!
//! ## Who decides
//! The textbook rule decides (Arnold's conditions: C, S and, for a wave, p per pair of paths
//! whole). The exact structural test (the path classes the engine finds, see
//! [`crate::winding::PathClasses`] and docs/domain.md, "Symmetry") may *rescue* a winding the
//! rule refuses, when rotations through whole pole pitches carry every path onto another: the
//! failed conditions are then warnings. It never condemns a winding the rule passes: there its
//! finding is information, and what it sees (paths equal only up to the coils under
//! commutation) is ripple, which `symmetry.simulated-balance` sizes as a share of the path
//! EMF and, with a rating, as the current it would drive round two paths.
//!
//! [`symmetric`] is the verdict (`Checked.symmetric`); the exit code follows the rule's errors
//! and, where the rule fails, the exact test's.

use super::{Finding, Severity, rules};
use crate::base::RuleSpec;
use crate::base::number::{counted, fmt_fixed, plural};
use crate::design::Design;
use crate::rating::RatingReport;
use crate::winding::{Congruence, Winding, WindingElement};

/// The rules of the classical symmetry conditions.
const IDS: [&RuleSpec; 3] = [
    &rules::SYMMETRY_COILS_PER_PATH_PAIR,
    &rules::SYMMETRY_SLOTS_PER_PATH_PAIR,
    &rules::SYMMETRY_POLE_PAIRS_PER_PATH_PAIR,
];

/// The id of the exact symmetry test.
pub const EXACT: &str = rules::SYMMETRY_EXACT.id;

fn whole(num: u32, den: u32) -> bool {
    den != 0 && num.is_multiple_of(den)
}

fn ratio(num: u32, den: u32) -> String {
    if den == 0 {
        return "undefined".into();
    }
    fmt_fixed(f64::from(num) / f64::from(den), 2)
}

pub(super) fn check(
    d: &Design,
    w: &Winding,
    rating: Option<&RatingReport>,
    out: &mut Vec<Finding>,
) {
    for e in &w.elements {
        check_element(d, w, e, out);
    }
    balance(d, w, rating, out);
}

/// The symmetry verdict: for every element, the textbook rule passes, or it fails and the
/// exact structural test rescues it. The exact test never condemns a winding the rule passes.
pub fn symmetric(d: &Design, w: &Winding) -> bool {
    w.elements
        .iter()
        .all(|e| rule(d, w, e).iter().all(|(_, ok, _)| *ok) || exact_of(w, e))
}

/// The exact test's verdict for element `e`.
fn exact_of(w: &Winding, e: &WindingElement) -> bool {
    e.path_classes
        .symmetric(w.element_paths(e) as usize, w.balance.balanced)
}

/// The textbook rule for element `e`: each condition's id, whether it holds, and its numbers.
fn rule(d: &Design, w: &Winding, e: &WindingElement) -> Vec<(&'static RuleSpec, bool, String)> {
    let a = w.element_paths(e);
    let pairs = a / 2;
    let c = w.active_coils;
    let p = d.pole_pairs();
    let mut rule = vec![
        (
            IDS[0],
            whole(c, pairs),
            format!(
                "coils per pair of paths C/(a/2) = {c}/{pairs} = {}; must be whole",
                ratio(c, pairs)
            ),
        ),
        (
            IDS[1],
            whole(d.slots, pairs),
            format!(
                "slots per pair of paths S/(a/2) = {}/{pairs} = {}; must be whole",
                d.slots,
                ratio(d.slots, pairs)
            ),
        ),
    ];
    if e.kind.kind().symmetry_counts_pole_pairs() {
        rule.push((
            IDS[2],
            whole(p, pairs),
            format!(
                "pole pairs per pair of paths p/(a/2) = {p}/{pairs} = {}; must be whole",
                ratio(p, pairs)
            ),
        ));
    }
    rule
}

/// Arnold's conditions and the exact test for element `e` (the whole winding when it has one
/// element; each element of a frog-leg winding on its own, its messages naming it).
fn check_element(d: &Design, w: &Winding, e: &WindingElement, out: &mut Vec<Finding>) {
    let multi = w.is_multi_element();
    let label = |m: String| {
        if multi {
            format!("{} element: {m}", e.kind.as_str())
        } else {
            m
        }
    };
    let a = w.element_paths(e);
    let classes = &e.path_classes;
    let congruence = classes.congruence(a as usize);
    let exact = exact_of(w, e);
    let rule = rule(d, w, e);
    let rule_ok = rule.iter().all(|(_, ok, _)| *ok);
    for (id, ok, message) in rule {
        // The textbook rule decides; where it fails and the exact test finds the paths
        // symmetric, the exact test rescues the winding and a failed condition is a warning.
        let (severity, message) = if !ok && exact {
            (
                Severity::Warning,
                format!(
                    "{message}; the textbook rule fails but the exact test ({EXACT}) finds the paths symmetric, so this is a warning"
                ),
            )
        } else {
            (Severity::Error, message)
        };
        out.push(Finding::of(id, ok, label(message)).lowered_to(severity));
    }

    let sizes: Vec<String> = classes
        .classes
        .iter()
        .map(|c| c.len().to_string())
        .collect();
    let agree = if exact == rule_ok {
        "agrees with the textbook rule"
    } else if exact {
        "the textbook rule fails and the exact test rescues the winding"
    } else {
        "the textbook rule passes and decides: what the exact test sees is ripple from the coils under commutation, not a fault of the connection (see symmetry.simulated-balance)"
    };
    let n_classes = classes.classes.len();
    let class_words = counted(n_classes, "congruent class", "congruent classes");
    let paths_word = plural(
        classes.classes.iter().map(Vec::len).sum::<usize>(),
        "path",
        "paths",
    );
    let why = match congruence {
        Congruence::Proven => "rigid rotations carry every path onto every other, so they carry one EMF at every rotor position".to_string(),
        Congruence::UpToCommutation if exact => format!(
            "rotations through whole pole pitches and the slots' shared centre lines sort them into {} of {} {}, equal up to where the brushes cut them, and the simulated balance confirms it",
            class_words,
            sizes.join(" + "),
            paths_word
        ),
        Congruence::UpToCommutation => format!(
            "rotations through whole pole pitches and the slots' shared centre lines sort them into {} of {} {}, equal only up to where the brushes cut them, and the simulated balance finds the coils under commutation carry EMF{}",
            class_words,
            sizes.join(" + "),
            paths_word,
            if w.dummy_coils.is_empty() {
                String::new()
            } else {
                format!(
                    " (the {} {} the rotation)",
                    counted(w.dummy_coils.len(), "dummy coil", "dummy coils"),
                    plural(w.dummy_coils.len(), "breaks", "break")
                )
            }
        ),
        Congruence::No => format!(
            "rotations through whole pole pitches join them only into {} of {} {}",
            counted(n_classes, "class", "classes"),
            sizes.join(" + "),
            paths_word
        ),
    };
    // The exact test may rescue a winding the rule refuses; it never condemns one the rule
    // passes, so it is only information there.
    let finding = Finding::of(
        &rules::SYMMETRY_EXACT,
        exact,
        label(format!("exact symmetry of the {a} paths: {why}; {agree}")),
    );
    out.push(if rule_ok {
        finding.lowered_to(Severity::Info)
    } else {
        finding
    });
}

/// The simulated balance over every path, as a share of the path EMF and, when the rating
/// gives the EMF and the resistance, as the current it would drive round two paths.
fn balance(d: &Design, w: &Winding, rating: Option<&RatingReport>, out: &mut Vec<Finding>) {
    let symmetric = symmetric(d, w);
    let b = &w.balance;
    let sim = format!(
        "simulated path EMFs differ by {} coil EMFs on average ({} at worst) over {} rotor positions",
        fmt_fixed(b.mean_spread_coils, 2),
        fmt_fixed(b.peak_spread_coils, 2),
        b.samples
    );
    // The mean path EMF at the reference position, in coil EMFs (2 conductor units each).
    let paths = w.paths.len().max(1) as f64;
    let path_emf = w
        .paths
        .iter()
        .map(|p| p.emf_units.abs() as f64)
        .sum::<f64>()
        / paths
        / 2.0;
    let share =
        (path_emf > 0.0 && b.mean_spread_coils > 0.0).then(|| b.mean_spread_coils / path_emf);
    let mut size = share.map_or(String::new(), |x| {
        format!(" ({} % of the path EMF", fmt_fixed(100.0 * x, 1))
    });
    if let (Some(x), Some(r)) = (share, rating) {
        let emf = r.emf.as_ref().map(|e| e.emf_v).filter(|e| *e > 0.0);
        let path_r = r
            .resistance
            .as_ref()
            .map(|k| k.hot_ohm * f64::from(r.paths));
        if let (Some(e), Some(rp)) = (emf, path_r.filter(|v| *v > 0.0)) {
            size.push_str(&format!(
                "; at {} V and {} ohm a path it would drive about {} A round two paths",
                fmt_fixed(e, 1),
                fmt_fixed(rp, 4),
                fmt_fixed(x * e / (2.0 * rp), 2)
            ));
        }
    }
    if !size.is_empty() {
        size.push(')');
    }
    let verdict = match (symmetric, b.balanced) {
        (true, true) => "balanced; agrees with the symmetry verdict".to_string(),
        (false, false) => "unbalanced; agrees with the symmetry verdict".to_string(),
        (true, false) => format!(
            "unbalanced by more than {} coil EMF on average although the winding is symmetric: ripple at bar frequency from the coils under commutation (a dummy coil, a short or long pitch, or brushes off neutral leave EMF in them)",
            crate::winding::BALANCE_TOLERANCE,
        ),
        (false, true) => "balanced on average, although the winding is unsymmetrical: the simulation sees only EMF, not the circulating currents an unsymmetrical winding carries".to_string(),
    };
    out.push(Finding::of(
        &rules::SYMMETRY_SIMULATED_BALANCE,
        b.balanced,
        format!("{sim}{size}: {verdict}"),
    ));
}
