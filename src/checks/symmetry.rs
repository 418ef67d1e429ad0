//! Symmetry of the parallel paths: the exact test from the winding's own structure, Arnold's
//! conditions as the textbook rule, and the simulated balance as a cross-check.
//!
//! Part of the `checks` stage.
//!
//! ## The exact test [derived]
//! The field and the brushes repeat, with the polarity reversed, every pole pitch. Turning the
//! armature k slots keeps every coil under the same field (up to sign) when k·P ≡ 0 (mod S).
//! A closed winding W is *carried onto* a closed winding W' by a segment shift j when, for every
//! coil of W, the coil whose start lead is j segments on lies in W' exactly k slots on (one
//! such k for all of W). Every path of W then goes where its middle coil goes, onto a path of
//! W'; the relation sorts the paths into classes ([`path_classes`]).
//!
//! - When every map used moves each coil n to n + k·u (a rigid rotation of the whole armature,
//!   which then maps slots, coils and segments onto themselves and keeps every connection) and
//!   joins all paths into one class, the paths carry one EMF at every rotor position, whatever
//!   the brushes short: [`Congruence::Proven`].
//! - Two looser congruences hold the paths equal only where the brushes cut them among coils
//!   that carry no EMF: paths joined through the u coils of a slot, which share a centre line
//!   (with m dividing u the m closed windings lie in the same slots, k = 0, j not a rigid
//!   shift); and two classes of a/2 paths, one for each current sense, paired by the two layers
//!   (a path with its top sides under the north poles and one with its top sides under the
//!   south poles have the tops of one where the bottoms of the other are). These are
//!   [`Congruence::UpToCommutation`] and pass only when the simulated balance over a whole
//!   period confirms them: a short pitch, brushes off neutral or a dummy coil leave EMF in the
//!   coils under commutation and the simulation sees it.
//! - Otherwise some paths have no congruent partner and the winding is unsymmetrical.
//!
//! The test sets `Checked.symmetric` and the exit code (`symmetry.exact`, an error). Arnold's
//! conditions stay in the report as the textbook rule: errors where the exact test fails too,
//! warnings where it passes, and the exact finding says whether the two agree.

use super::{Finding, Severity, rules};
use crate::base::RuleSpec;
use crate::base::number::fmt_fixed;
use crate::design::Design;
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

pub(super) fn check(d: &Design, w: &Winding, out: &mut Vec<Finding>) {
    for e in &w.elements {
        check_element(d, w, e, out);
    }
    balance(w, out);
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
    let pairs = a / 2;
    let c = w.active_coils;
    let p = d.pole_pairs();
    let classes = &e.path_classes;
    let congruence = classes.congruence(a as usize);
    let exact = classes.symmetric(a as usize, w.balance.balanced);
    let mut rule = Vec::new();
    rule.push((
        IDS[0],
        whole(c, pairs),
        format!(
            "coils per pair of paths C/(a/2) = {c}/{pairs} = {}; must be whole",
            ratio(c, pairs)
        ),
    ));
    rule.push((
        IDS[1],
        whole(d.slots, pairs),
        format!(
            "slots per pair of paths S/(a/2) = {}/{pairs} = {}; must be whole",
            d.slots,
            ratio(d.slots, pairs)
        ),
    ));
    let counts_pole_pairs = if multi {
        e.kind.kind().symmetry_counts_pole_pairs()
    } else {
        d.winding_type.kind().symmetry_counts_pole_pairs()
    };
    if counts_pole_pairs {
        rule.push((
            IDS[2],
            whole(p, pairs),
            format!(
                "pole pairs per pair of paths p/(a/2) = {p}/{pairs} = {}; must be whole",
                ratio(p, pairs)
            ),
        ));
    }
    let rule_ok = rule.iter().all(|(_, ok, _)| *ok);
    for (id, ok, message) in rule {
        // The textbook rule sets the exit code only where the exact test agrees that it fails;
        // where the exact test passes, a failed condition is a warning.
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
        "the textbook rule fails: the two disagree and the exact test decides"
    } else {
        "the textbook rule passes: the two disagree and the exact test decides"
    };
    let n_classes = classes.classes.len();
    let why = match congruence {
        Congruence::Proven => "rigid rotations carry every path onto every other, so they carry one EMF at every rotor position".to_string(),
        Congruence::UpToCommutation if exact => format!(
            "rotations through whole pole pitches and the slots' shared centre lines sort them into {n_classes} congruent class(es) of {} path(s), equal up to where the brushes cut them, and the simulated balance confirms it",
            sizes.join(" + ")
        ),
        Congruence::UpToCommutation => format!(
            "rotations through whole pole pitches and the slots' shared centre lines sort them into {n_classes} congruent class(es) of {} path(s), equal only up to where the brushes cut them, and the simulated balance finds the coils under commutation carry EMF{}",
            sizes.join(" + "),
            if w.dummy_coils.is_empty() {
                String::new()
            } else {
                format!(" (the {} dummy coil(s) break the rotation)", w.dummy_coils.len())
            }
        ),
        Congruence::No => format!(
            "rotations through whole pole pitches join them only into {n_classes} classes of {} path(s)",
            sizes.join(" + ")
        ),
    };
    out.push(Finding::of(
        &rules::SYMMETRY_EXACT,
        exact,
        label(format!("exact symmetry of the {a} paths: {why}; {agree}")),
    ));
}

/// The simulated balance over every path.
fn balance(w: &Winding, out: &mut Vec<Finding>) {
    let exact = w.exact_symmetric();
    let b = &w.balance;
    let sim = format!(
        "simulated path EMFs differ by {} coil EMFs on average ({} at worst) over {} rotor positions",
        fmt_fixed(b.mean_spread_coils, 2),
        fmt_fixed(b.peak_spread_coils, 2),
        b.samples
    );
    let verdict = match (exact, b.balanced) {
        (true, true) => "balanced; agrees with the exact symmetry test".to_string(),
        (false, false) => "unbalanced; agrees with the exact symmetry test".to_string(),
        (true, false) => format!(
            "unbalanced by more than {} coil EMF, although the exact symmetry test passes: the two disagree; the brushes are probably off neutral",
            crate::winding::BALANCE_TOLERANCE,
        ),
        (false, true) => "balanced on average, although the exact symmetry test fails: the two disagree; the simulation sees only EMF, not the circulating currents an unsymmetrical winding carries, so follow the exact test".to_string(),
    };
    out.push(Finding::of(
        &rules::SYMMETRY_SIMULATED_BALANCE,
        b.balanced,
        format!("{sim}: {verdict}"),
    ));
}
