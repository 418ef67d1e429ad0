//! Rigid rotations of the armature that map the winding onto itself.
//!
//! Part of the `winding` stage. A rotation by k slots moves coil position n to n + k·u (mod N),
//! keeping each coil's place in its slot. It maps the winding onto itself when it carries
//! dummies to dummies and shifts every active coil's start and end segment by one constant j
//! (mod C): then it maps slots to slots, coils to coils and segments to segments and keeps
//! every connection [derived]. The equalizer plan and the exact symmetry test use it.

use super::Connection;

/// The segment shift j of the rotation by `k_slots` slots, when that rotation maps the winding
/// onto itself; `None` when it breaks a connection or moves a dummy onto an active coil.
pub fn rotation_segment_shift(
    connections: &[Connection],
    coils_per_slot: u32,
    segments: u32,
    k_slots: u32,
) -> Option<u32> {
    let n = connections.len();
    if n == 0 {
        return None;
    }
    let t = (k_slots as usize * coils_per_slot as usize) % n;
    let c = i64::from(segments);
    let mut shift: Option<i64> = None;
    for (i, from) in connections.iter().enumerate() {
        let to = &connections[(i + t) % n];
        match (
            from.start_segment,
            from.end_segment,
            to.start_segment,
            to.end_segment,
        ) {
            (None, None, None, None) => {}
            (Some(s0), Some(e0), Some(s1), Some(e1)) => {
                let js = (i64::from(s1) - i64::from(s0)).rem_euclid(c);
                let je = (i64::from(e1) - i64::from(e0)).rem_euclid(c);
                if js != je || shift.is_some_and(|j| j != js) {
                    return None;
                }
                shift = Some(js);
            }
            _ => return None,
        }
    }
    shift.map(|j| j as u32)
}
