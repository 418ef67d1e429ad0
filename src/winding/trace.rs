//! The trace: segments are nodes, active coils are edges (start segment → end segment).
//!
//! Part of the `winding` stage. Every segment carries one start lead and one end lead, so the
//! coils form a permutation of the segments; its cycles are the closed windings.

use super::{ClosedWinding, Connection, TraceStep};

/// For each segment (0-based), the index into `connections` of the coil whose start lead is
/// on it (one element's connections: one start lead a segment).
pub(crate) fn out_coils(connections: &[Connection], segments: u32) -> Vec<usize> {
    let mut out = vec![0usize; segments as usize];
    for (i, c) in connections.iter().enumerate() {
        if let Some(s) = c.start_segment {
            out[(s - 1) as usize] = i;
        }
    }
    out
}

/// Follows start → end leads from the lowest unvisited segment until the trace closes, over
/// one element's `connections`.
pub(crate) fn trace_closed_windings(
    connections: &[Connection],
    segments: u32,
) -> Vec<ClosedWinding> {
    let out = out_coils(connections, segments);
    let mut visited = vec![false; segments as usize];
    let mut windings = Vec::new();
    for first in 0..segments as usize {
        if visited[first] {
            continue;
        }
        let mut steps = Vec::new();
        let mut seg = first;
        while !visited[seg] {
            visited[seg] = true;
            let conn = &connections[out[seg]];
            let to = conn.end_segment.unwrap_or(0);
            steps.push(TraceStep {
                coil: conn.coil,
                from_segment: seg as u32 + 1,
                to_segment: to,
            });
            seg = (to - 1) as usize;
        }
        windings.push(ClosedWinding { steps });
    }
    windings
}
