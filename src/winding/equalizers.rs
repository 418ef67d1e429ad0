//! Type-A equalizers: which points two pole pitches apart can be joined, and the rings a
//! design asks for.
//!
//! Part of the `winding` stage.

use super::symmetry::rotation_segment_shift;
use super::{Connection, EqualizerPlan, Equalizers};
use crate::design::{Design, EqualizerChoice};

/// Type-A equalizers: points two pole pitches (2C/P segments) apart, p points each.
///
/// The joined points are at one potential when the rotation by one pole pair (S/p slots) maps
/// the winding onto itself and carries each joined segment onto the next: the field and the
/// brushes repeat every pole pair, so the rotated winding is the same network under the same
/// field, and segment s stands where segment s + 2C/P stood [derived]. A multiply re-entrant
/// lap qualifies too: the rotation may carry one closed winding onto another.
pub(crate) fn plan_equalizers(d: &Design, c: u32, connections: &[Connection]) -> EqualizerPlan {
    if !d.winding_type.kind().takes_equalizers() {
        return EqualizerPlan::NotNeeded;
    }
    let p = d.pole_pairs();
    if p < 2 {
        return EqualizerPlan::Impossible(
            "a 2-pole lap winding has a single pole pair: there are no points two pole pitches apart to join".into(),
        );
    }
    if !c.is_multiple_of(p) {
        return EqualizerPlan::Impossible(format!(
            "the equalizer pitch 2C/P = {}/{} is not a whole number of segments",
            2 * c,
            d.poles
        ));
    }
    if !d.slots.is_multiple_of(p) {
        return EqualizerPlan::Impossible(format!(
            "slots per pole pair S/p = {}/{p} is not whole, so points two pole pitches apart are not at one potential",
            d.slots
        ));
    }
    let pitch = c / p;
    let pair_slots = d.slots / p;
    match rotation_segment_shift(connections, d.coils_per_slot, c, pair_slots) {
        Some(j) if j == pitch => {}
        Some(j) => {
            return EqualizerPlan::Impossible(format!(
                "turning the armature one pole pair ({pair_slots} slots) carries each segment {j} segments on, not the equalizer pitch {pitch}, so points {pitch} segments apart are not at one potential"
            ));
        }
        None => {
            return EqualizerPlan::Impossible(format!(
                "turning the armature one pole pair ({pair_slots} slots) does not map the winding onto itself (a connection or a dummy coil does not repeat), so points two pole pitches apart are not at one potential"
            ));
        }
    }
    let step = match d.equalizers {
        EqualizerChoice::None => 0,
        EqualizerChoice::Full => 1,
        EqualizerChoice::EveryNth(k) => k,
    };
    let groups = if step == 0 {
        Vec::new()
    } else {
        (1..=pitch)
            .step_by(step as usize)
            .map(|s| (0..p).map(|j| s + j * pitch).collect())
            .collect()
    };
    EqualizerPlan::Possible(Equalizers {
        pitch,
        possible: pitch,
        groups,
    })
}
