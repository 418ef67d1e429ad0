//! Brushes on the commutator and the parallel paths between them.
//!
//! Part of the `winding` stage. A brush touches every segment its width overlaps; cutting each
//! closed winding at the touched segments leaves runs of coils. A run between brushes of
//! opposite polarity is a parallel path; a run between brushes of one polarity is shorted
//! (under commutation). Brush polarity comes from the EMF the runs carry.

use super::ClosedWinding;

/// A brush centre, in units of 1/`units` of a segment pitch from segment 1's centre.
#[derive(Clone, Copy, Debug)]
pub(crate) struct BrushSpot {
    /// Pole index, 0-based: brush k sits by pole k.
    pub pole: usize,
    /// Centre position.
    pub centre: i64,
}

/// Marks, for each segment (0-based), the brush touching it, or −1.
///
/// The contact model: a brush `width` segment pitches wide (no mica) touches segment x when
/// their extents overlap, |x − centre| < (width + 1)/2.
pub(crate) fn contacts(
    spots: &[BrushSpot],
    segments: u32,
    width: u32,
    units: i64,
    shift: i64,
) -> Vec<i32> {
    contacts_units(spots, segments, i64::from(width) * units, units, shift)
}

/// [`contacts`] for a brush `width_units` wide, in units of 1/`units` of a segment pitch:
/// segment x is touched when 2·|x·units − centre| < width_units + units.
pub(crate) fn contacts_units(
    spots: &[BrushSpot],
    segments: u32,
    width_units: i64,
    units: i64,
    shift: i64,
) -> Vec<i32> {
    let c = i64::from(segments);
    let reach = width_units.div_euclid(units) + 1;
    let mut mark = vec![-1i32; segments as usize];
    for (b, spot) in spots.iter().enumerate() {
        let centre = spot.centre - shift;
        let lo = centre.div_euclid(units) - reach - 1;
        let hi = centre.div_euclid(units) + reach + 1;
        for x in lo..=hi {
            if 2 * (units * x - centre).abs() < width_units + units {
                mark[x.rem_euclid(c) as usize] = b as i32;
            }
        }
    }
    mark
}

/// A run of coils between two touched segments.
#[derive(Clone, Debug)]
pub(crate) struct Run {
    /// Index into the brush list at the run's first start segment.
    pub from: usize,
    /// Index into the brush list at the run's last end segment.
    pub to: usize,
    /// Coils in trace order.
    pub coils: Vec<u32>,
    /// Net EMF, start→end sense.
    pub emf: i64,
}

/// Walks every closed winding that a brush touches from its first touched segment, calling
/// `visit` with each coil in trace order and, when the coil ends on a touched segment, the
/// (from brush, to brush) of the run it closes. Every walk ends on the segment it began at, so
/// each run is closed before the next winding starts.
fn cut_cycles(
    cycles: &[ClosedWinding],
    mark: &[i32],
    mut visit: impl FnMut(u32, Option<(usize, usize)>),
) {
    for cycle in cycles {
        let steps = &cycle.steps;
        let Some(first) = steps
            .iter()
            .position(|s| mark[(s.from_segment - 1) as usize] >= 0)
        else {
            continue;
        };
        let mut from = mark[(steps[first].from_segment - 1) as usize] as usize;
        for k in 0..steps.len() {
            let step = steps[(first + k) % steps.len()];
            let at = mark[(step.to_segment - 1) as usize];
            if at >= 0 {
                visit(step.coil, Some((from, at as usize)));
                from = at as usize;
            } else {
                visit(step.coil, None);
            }
        }
    }
}

/// Cuts every closed winding at the touched segments.
pub(crate) fn runs(cycles: &[ClosedWinding], mark: &[i32], emf: &[i64]) -> Vec<Run> {
    let mut out = Vec::new();
    let mut coils = Vec::new();
    let mut sum = 0;
    cut_cycles(cycles, mark, |coil, cut| {
        coils.push(coil);
        sum += emf[(coil - 1) as usize];
        if let Some((from, to)) = cut {
            out.push(Run {
                from,
                to,
                coils: std::mem::take(&mut coils),
                emf: std::mem::take(&mut sum),
            });
        }
    });
    out
}

/// [`runs`] without the coil lists: (from brush, to brush, net EMF) of each run, for sweeps
/// that only compare EMFs.
pub(crate) fn run_emfs(
    cycles: &[ClosedWinding],
    mark: &[i32],
    emf: &[i64],
) -> Vec<(usize, usize, i64)> {
    let mut out = Vec::new();
    let mut sum = 0;
    cut_cycles(cycles, mark, |coil, cut| {
        sum += emf[(coil - 1) as usize];
        if let Some((from, to)) = cut {
            out.push((from, to, std::mem::take(&mut sum)));
        }
    });
    out
}

/// Polarity of the brush by pole 0: +1 or −1. Brushes alternate with the pole index.
///
/// Each run between brushes of opposite parity votes with its EMF for the polarity of the brush
/// it reaches (the EMF raises the potential towards that end).
pub(crate) fn first_brush_sign(runs: &[Run], spots: &[BrushSpot]) -> i64 {
    let mut vote = 0i64;
    for r in runs {
        let (a, b) = (spots[r.from].pole, spots[r.to].pole);
        if a % 2 != b % 2 {
            let parity = if b % 2 == 0 { 1 } else { -1 };
            vote += r.emf * parity;
        }
    }
    if vote < 0 { -1 } else { 1 }
}

/// Whether a run joins brushes of opposite polarity (a parallel path).
pub(crate) fn is_path(run: &Run, spots: &[BrushSpot]) -> bool {
    spots[run.from].pole % 2 != spots[run.to].pole % 2
}
