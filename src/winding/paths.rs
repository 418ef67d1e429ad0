//! Brushes on the commutator and the parallel paths between them.
//!
//! Part of the `winding` stage. A brush touches every segment its width overlaps; cutting each
//! closed winding at the touched segments leaves runs of coils. A run between brushes of
//! opposite polarity is a parallel path; a run between brushes of one polarity is shorted
//! (under commutation). Brush polarity comes from the EMF the runs carry.

use super::{ClosedWinding, ParallelPath, WindingElement};
use crate::design::Mode;

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
        // From the first touched segment round to it again.
        for step in steps[first..].iter().chain(&steps[..first]) {
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

/// The runs sorted into parallel paths (between brushes of opposite polarity) and shorted
/// coils (between brushes of one polarity), with each coil's current sense and path.
pub(crate) struct Cut {
    /// The parallel paths, numbered from 1 in trace order.
    pub paths: Vec<ParallelPath>,
    /// The coils under commutation, ascending.
    pub shorted: Vec<u32>,
    /// Per coil, its current sense (+1, −1; 0 when shorted or a dummy).
    pub coil_current: Vec<i8>,
    /// Per coil, its path (0 when on none).
    pub coil_path: Vec<u32>,
}

/// Cuts the runs into paths and shorted coils; counts each element's paths. The current flows
/// with the EMF in a generator and against it in a motor.
pub(crate) fn cut(
    mode: Mode,
    runs: &[Run],
    spots: &[BrushSpot],
    sign0: i64,
    elements: &mut [WindingElement],
    coils: usize,
) -> Cut {
    let current_sign = match mode {
        Mode::Generator => 1,
        Mode::Motor => -1,
    };
    let mut out = Cut {
        paths: Vec::new(),
        shorted: Vec::new(),
        coil_current: vec![0i8; coils],
        coil_path: vec![0u32; coils],
    };
    for r in runs {
        if !is_path(r, spots) {
            out.shorted.extend_from_slice(&r.coils);
            continue;
        }
        let to_positive = (if spots[r.to].pole.is_multiple_of(2) {
            sign0
        } else {
            -sign0
        }) > 0;
        let current = if to_positive {
            current_sign
        } else {
            -current_sign
        } as i8;
        let index = out.paths.len() as u32 + 1;
        if let Some(e) = elements.iter_mut().find(|e| e.holds(r.coils[0])) {
            e.paths += 1;
        }
        for &coil in &r.coils {
            out.coil_current[(coil - 1) as usize] = current;
            out.coil_path[(coil - 1) as usize] = index;
        }
        out.paths.push(ParallelPath {
            index,
            from_brush: r.from as u32 + 1,
            to_brush: r.to as u32 + 1,
            coils: r.coils.clone(),
            current,
            emf_units: if to_positive { r.emf } else { -r.emf },
        });
    }
    out.shorted.sort_unstable();
    out
}
