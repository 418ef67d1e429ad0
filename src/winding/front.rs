//! Front pitch per connection, read off the connected coils.
//!
//! Part of the `winding` stage, run once the coils are connected. The front connection runs
//! from a coil's bottom side (its end lead's segment) to the top side of the coil whose start
//! lead is on that segment. The top-to-top step y_r between the two is measured in coil-side
//! numbers, taken the way the commutator pitch runs (0 < y_r ≤ 2N for y_c > 0, −2N ≤ y_r < 0
//! for y_c < 0), and the winding kind turns the half step into a front pitch in the sign
//! convention of the nominal one ([`crate::theory::WindingKind::front_pitch`]: lap
//! y_f = y_b − y_r, wave y_f = y_r − y_b). Where the step passes over dummy coils it is longer
//! than 2·y_c by 2 per dummy, and so is a wave's front pitch.

use super::Connection;
use super::trace::out_coils;
use crate::theory::WindingKind;

/// Fills in `front_pitch` for every active coil of `connections` (one row per coil position,
/// `segments` active coils, back pitch `back`, signed commutator pitch `yc`); dummy coils keep
/// `None`.
pub(crate) fn set_front_pitches(
    connections: &mut [Connection],
    segments: u32,
    kind: &dyn WindingKind,
    back: i64,
    yc: i64,
) {
    let sides = 2 * connections.len() as i64;
    let starts = out_coils(connections, segments);
    let top_side = |i: usize| i64::from(connections[i].top.side);
    let pitches: Vec<Option<i64>> = connections
        .iter()
        .map(|c| {
            let end = c.end_segment?;
            let next = starts[(end - 1) as usize];
            let step = top_side(next) - i64::from(c.top.side);
            let step = if yc > 0 {
                (step - 1).rem_euclid(sides) + 1
            } else {
                -((-step - 1).rem_euclid(sides) + 1)
            };
            Some(kind.front_pitch(back, step / 2))
        })
        .collect();
    for (c, y) in connections.iter_mut().zip(pitches) {
        c.front_pitch = y;
    }
}
