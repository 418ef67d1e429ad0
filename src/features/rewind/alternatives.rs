//! The alternatives a refused rewind offers: the nearest requests whose new design `check`
//! passes.
//!
//! Part of the `features` stage, pure. Each alternative is the asked request with one, two or
//! three things changed (the connection, the multiplicity, the coils per slot: each a flag of
//! `armsheet rewind`), worked out by the same [`super::rewind_rated`], written as the same
//! design file, parsed back with armsheet's own parser and run through the whole [`check`],
//! exactly as the CLI does before it writes; only a design with no error-level finding is
//! offered. Nearest first: fewest changes, then the commutator kept, then the speed the whole
//! turns give closest to the speed asked.

use super::{RewindPlan, RewindRequest, rewind_rated};
use crate::checks::check;
use crate::design::{Design, WindingType, bounds, parse_design};
use crate::rating::RatingReport;
use crate::winding::Winding;

/// The most multiplicity an alternative tries: a triplex is as far as a shop goes to pass a
/// check.
const MOST_MULTIPLICITY: u32 = 3;
/// The most coils per slot an alternative adds to the asked count.
const MORE_COILS_PER_SLOT: u32 = 3;

/// One thing an alternative changes against the request.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Change {
    /// Another winding kind (`--type`).
    Kind(WindingType),
    /// Another multiplicity (`--multiplicity`).
    Multiplicity(u32),
    /// Another count of coils per slot (`--coils-per-slot`).
    CoilsPerSlot(u32),
}

/// A request whose new design passes `check`.
#[derive(Clone, Debug, PartialEq)]
pub struct Alternative {
    /// The request that gives it: the asked one with [`Alternative::changes`] made; a field
    /// equal to the design's own value is left `None`, as the command line leaves its flag out.
    pub request: RewindRequest,
    /// What differs from the asked request, in flag order.
    pub changes: Vec<Change>,
    /// The worked-out rewind; its design passes `check`.
    pub plan: RewindPlan,
}

/// What the search found: the alternatives that pass (nearest first, at most the number asked)
/// and how many requests were tried.
#[derive(Clone, Debug, PartialEq)]
pub struct Alternatives {
    /// Nearest first.
    pub passing: Vec<Alternative>,
    /// Requests worked out and checked.
    pub tried: usize,
}

/// Up to `most` requests near `req` whose new design `check` passes, for the design `d`
/// (traced as `w`, rated as `rated` when already done).
pub fn alternatives(
    d: &Design,
    w: &Winding,
    rated: Option<&RatingReport>,
    req: &RewindRequest,
    most: usize,
) -> Alternatives {
    let asked_kind = req.kind.unwrap_or(d.winding_type);
    let asked_m = req.multiplicity.unwrap_or(d.multiplicity);
    let asked_u = req.coils_per_slot.unwrap_or(d.coils_per_slot);
    let most_u = (bounds::MAX_COILS / i64::from(d.slots.max(1))).min(bounds::MAX_COILS_PER_SLOT);
    let most_u = u32::try_from(most_u).unwrap_or(1);
    let top_u = asked_u.saturating_add(MORE_COILS_PER_SLOT).min(most_u);
    let top_m = MOST_MULTIPLICITY.max(asked_m);

    let mut candidates = Vec::new();
    for kind in WindingType::ALL {
        for m in 1..=top_m {
            for u in 1..=top_u {
                let mut changes = Vec::new();
                if kind != asked_kind {
                    changes.push(Change::Kind(kind));
                }
                if m != asked_m {
                    changes.push(Change::Multiplicity(m));
                }
                if u != asked_u {
                    changes.push(Change::CoilsPerSlot(u));
                }
                if !changes.is_empty() {
                    candidates.push(changes);
                }
            }
        }
    }

    let mut passing = Vec::new();
    let mut tried = 0;
    // Layer by layer: one change, then two, then three; a layer is searched whole so that
    // the nearest of it come first, and the search stops once enough pass.
    for n in 1..=3 {
        if passing.len() >= most {
            break;
        }
        let mut layer = Vec::new();
        for changes in candidates.iter().filter(|c| c.len() == n) {
            let request = changed_request(d, req, changes);
            tried += 1;
            if let Some(plan) = passes(d, w, rated, &request) {
                layer.push(Alternative {
                    request,
                    changes: changes.clone(),
                    plan,
                });
            }
        }
        layer.sort_by(|a, b| {
            let key = |x: &Alternative| {
                (
                    !x.plan.new.scheme.keeps_commutator,
                    x.plan.speed_error.abs(),
                )
            };
            let (ka, kb) = (key(a), key(b));
            ka.0.cmp(&kb.0).then(ka.1.total_cmp(&kb.1))
        });
        passing.extend(layer);
    }
    passing.truncate(most);
    Alternatives { passing, tried }
}

/// The asked request with `changes` made; a value equal to the design's own is `None`.
fn changed_request(d: &Design, req: &RewindRequest, changes: &[Change]) -> RewindRequest {
    let mut r = req.clone();
    for c in changes {
        match *c {
            Change::Kind(k) => r.kind = (k != d.winding_type).then_some(k),
            Change::Multiplicity(m) => r.multiplicity = (m != d.multiplicity).then_some(m),
            Change::CoilsPerSlot(u) => r.coils_per_slot = (u != d.coils_per_slot).then_some(u),
        }
    }
    r
}

/// The plan for `req` when its design file, parsed back, passes `check` (no error-level
/// finding); `None` when the request cannot be met or `check` refuses it.
fn passes(
    d: &Design,
    w: &Winding,
    rated: Option<&RatingReport>,
    req: &RewindRequest,
) -> Option<RewindPlan> {
    let plan = rewind_rated(d, w, rated, req).ok()?;
    let text = plan.design_file("", "");
    let back = parse_design(&text, "new.toml").ok()?;
    (!check(back).has_errors()).then_some(plan)
}
