//! `RULES`: the spec table of every rule a finding can come from, one row each: its id, its
//! severity when it fails and its source.
//!
//! Part of the `checks` stage. Like [`crate::design::LIMITS`] for the `[limits]` keys, this
//! table is the one place a rule's id, severity and source are written: every finding is made
//! by [`Finding::of`](crate::base::Finding::of) from its row (a rule that says so lowers its
//! severity for a case, never raises it). The rating rules are the rows of `LIMITS`, taken
//! into [`RULES`] here. `tests/rule_cases.rs` iterates [`RULES`] and requires a passing and a
//! failing row (a fact that cannot fail: a reported and an absent row) for every id.

use super::sources::{
    BAR_RULE, DUMMY, DUMMY_FRONT_PITCH, EQUALIZERS, EXACT_SYMMETRY, FROG_LEG, FROG_LEG_DERIVED,
    MULTIPLEX_BRUSH, PITCH_TEXTS, SIMULATION, SPAN, SPAN_OPPOSITE, SYMMETRY, TRACE,
};
use crate::base::{RuleSpec, Severity};
use crate::design::LIMITS;
use crate::rating::findings::limit_rule;

const fn row(id: &'static str, severity: Severity, source: &'static str) -> RuleSpec {
    RuleSpec {
        id,
        severity,
        source,
    }
}

/// Coils per pair of paths whole (the textbook rule); a warning where the exact test passes.
pub const SYMMETRY_COILS_PER_PATH_PAIR: RuleSpec =
    row("symmetry.coils-per-path-pair", Severity::Error, SYMMETRY);
/// Slots per pair of paths whole (the textbook rule); a warning where the exact test passes.
pub const SYMMETRY_SLOTS_PER_PATH_PAIR: RuleSpec =
    row("symmetry.slots-per-path-pair", Severity::Error, SYMMETRY);
/// Pole pairs per pair of paths whole, for wave windings (the textbook rule).
pub const SYMMETRY_POLE_PAIRS_PER_PATH_PAIR: RuleSpec = row(
    "symmetry.pole-pairs-per-path-pair",
    Severity::Error,
    SYMMETRY,
);
/// The exact symmetry test: it may rescue a winding the textbook rule refuses; information
/// where the rule passes.
pub const SYMMETRY_EXACT: RuleSpec = row("symmetry.exact", Severity::Error, EXACT_SYMMETRY);
/// The simulated balance of the path EMFs.
pub const SYMMETRY_SIMULATED_BALANCE: RuleSpec =
    row("symmetry.simulated-balance", Severity::Warning, SIMULATION);
/// Bars per pole pair whole, so bars two pole pitches apart exist.
pub const FROGLEG_POLE_PAIRS_WHOLE: RuleSpec =
    row("frogleg.pole-pairs-whole", Severity::Error, FROG_LEG);
/// The wave element's closed windings (a fact).
pub const FROGLEG_WAVE_REENTRANCY: RuleSpec =
    row("frogleg.wave-reentrancy", Severity::Info, FROG_LEG_DERIVED);
/// Lap and wave coils of equal turns.
pub const FROGLEG_EQUAL_COILS: RuleSpec = row("frogleg.equal-coils", Severity::Warning, FROG_LEG);
/// Both elements commutated on one neutral.
pub const FROGLEG_ONE_NEUTRAL: RuleSpec =
    row("frogleg.one-neutral", Severity::Warning, FROG_LEG_DERIVED);
/// A lap coil and a wave coil in series reach the bar two pole pitches on.
pub const FROGLEG_SELF_EQUALIZING: RuleSpec =
    row("frogleg.self-equalizing", Severity::Error, FROG_LEG_DERIVED);
/// Each element's traced paths against its formula.
pub const FROGLEG_ELEMENT_PATHS: RuleSpec = row("frogleg.element-paths", Severity::Error, FROG_LEG);
/// A multiplex lap's closed windings (a fact).
pub const LAP_REENTRANCY: RuleSpec = row("lap.reentrancy", Severity::Info, PITCH_TEXTS);
/// Equalizers possible; an error only where the design asks for them.
pub const LAP_EQUALIZERS: RuleSpec = row("lap.equalizers", Severity::Error, EQUALIZERS);
/// A multiplex winding's brush at least m segments wide.
pub const MULTIPLEX_BRUSH_TOO_NARROW: RuleSpec = row(
    "multiplex.brush-too-narrow",
    Severity::Error,
    MULTIPLEX_BRUSH,
);
/// The brush width a multiplex winding needs (a fact).
pub const MULTIPLEX_BRUSH_WIDTH: RuleSpec =
    row("multiplex.brush-width", Severity::Info, MULTIPLEX_BRUSH);
/// The bar-count rule of thumb (lap or wave).
pub const SHOP_BAR_COUNT: RuleSpec = row("shop.bar-count", Severity::Info, BAR_RULE);
/// The span within one slot of the pole pitch.
pub const SPAN_POLE_PITCH: RuleSpec = row("span.pole-pitch", Severity::Warning, SPAN);
/// The coil's sides under poles of opposite polarity (half to one and a half pole pitches).
pub const SPAN_OPPOSITE_POLES: RuleSpec =
    row("span.opposite-poles", Severity::Error, SPAN_OPPOSITE);
/// The span taken by default (a fact).
pub const SPAN_DEFAULT: RuleSpec = row("span.default", Severity::Info, SPAN);
/// The traced paths against the formula.
pub const TRACE_PATHS: RuleSpec = row("trace.paths", Severity::Error, TRACE);
/// The traced closed windings against the formula.
pub const TRACE_REENTRANCY: RuleSpec = row("trace.reentrancy", Severity::Error, TRACE);
/// The trace visits every active coil.
pub const TRACE_EVERY_COIL: RuleSpec = row("trace.every-coil", Severity::Error, TRACE);
/// A wave winding's closed windings (a fact).
pub const WAVE_REENTRANCY: RuleSpec = row("wave.reentrancy", Severity::Info, PITCH_TEXTS);
/// Dummy coils, a warning where another bar count needs fewer; else a fact.
pub const WAVE_DUMMY_COILS: RuleSpec = row("wave.dummy-coils", Severity::Warning, DUMMY);
/// The other direction would need fewer dummy coils (a fact).
pub const WAVE_DIRECTION_HINT: RuleSpec = row("wave.direction-hint", Severity::Info, DUMMY);
/// Front connections that step over a dummy coil (a fact).
pub const WAVE_DUMMY_FRONT_PITCH: RuleSpec =
    row("wave.dummy-front-pitch", Severity::Info, DUMMY_FRONT_PITCH);

/// The rules of the checks, in report order.
const CHECK_RULES: [RuleSpec; 26] = [
    SYMMETRY_COILS_PER_PATH_PAIR,
    SYMMETRY_SLOTS_PER_PATH_PAIR,
    SYMMETRY_POLE_PAIRS_PER_PATH_PAIR,
    SYMMETRY_EXACT,
    SYMMETRY_SIMULATED_BALANCE,
    FROGLEG_POLE_PAIRS_WHOLE,
    FROGLEG_WAVE_REENTRANCY,
    FROGLEG_EQUAL_COILS,
    FROGLEG_ONE_NEUTRAL,
    FROGLEG_SELF_EQUALIZING,
    FROGLEG_ELEMENT_PATHS,
    LAP_REENTRANCY,
    LAP_EQUALIZERS,
    MULTIPLEX_BRUSH_TOO_NARROW,
    MULTIPLEX_BRUSH_WIDTH,
    SHOP_BAR_COUNT,
    SPAN_POLE_PITCH,
    SPAN_OPPOSITE_POLES,
    SPAN_DEFAULT,
    TRACE_PATHS,
    TRACE_REENTRANCY,
    TRACE_EVERY_COIL,
    WAVE_REENTRANCY,
    WAVE_DUMMY_COILS,
    WAVE_DIRECTION_HINT,
    WAVE_DUMMY_FRONT_PITCH,
];

/// Every rule: the checks' rules, then the rating rules (one per `[limits]` key), in report
/// order.
pub const RULES: [RuleSpec; CHECK_RULES.len() + LIMITS.len()] = {
    let mut all = [CHECK_RULES[0]; CHECK_RULES.len() + LIMITS.len()];
    let mut i = 0;
    while i < CHECK_RULES.len() {
        all[i] = CHECK_RULES[i];
        i += 1;
    }
    while i < all.len() {
        all[i] = limit_rule(&LIMITS[i - CHECK_RULES.len()]);
        i += 1;
    }
    all
};

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_id_is_written_once() {
        for (i, a) in RULES.iter().enumerate() {
            assert!(
                RULES[i + 1..].iter().all(|b| b.id != a.id),
                "{} twice",
                a.id
            );
        }
    }
}
