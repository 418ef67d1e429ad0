//! Which part of the armature the developed diagram shows, and the map from rotor angle to
//! strip x with cutting at the edges.
//!
//! Part of the `layout` stage (the developed diagram). The strip starts half a slot pitch
//! before the centre of the first slot shown, so slot k sits at ((k − first) + ½) slot
//! pitches; a line that runs past an edge is cut there.

use crate::design::Design;
use crate::winding::Winding;

use super::Point;

/// Above this many segments the diagram shows a window of whole pole pairs by default.
pub const LEGIBLE_SEGMENTS: u32 = 120;

/// Which part of the armature to draw (`--window`).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Window {
    /// The whole armature up to [`LEGIBLE_SEGMENTS`], else the most whole pole pairs that stay
    /// within it (at least one).
    #[default]
    Auto,
    /// The whole armature, however dense.
    Whole,
    /// `pairs` whole pole pairs starting at slot `first_slot` (1-based).
    PolePairs {
        /// Pole pairs shown (≥ 1).
        pairs: u32,
        /// First slot at the left edge.
        first_slot: u32,
    },
}

/// What part of the armature is shown.
#[derive(Clone, Debug, PartialEq)]
pub struct View {
    /// True when all S slots are shown and edge cuts wrap round.
    pub whole: bool,
    /// First slot shown (1-based).
    pub first_slot: u32,
    /// Number of slots shown.
    pub slots: u32,
    /// Slots on the armature (S).
    pub total_slots: u32,
    /// Pole pairs shown, for a window.
    pub pole_pairs: Option<u32>,
    /// Slots after which the pattern repeats (S/p) when that is whole and the segments
    /// (C/p) are whole too.
    pub repeat_slots: Option<u32>,
    /// A whole view with more lines at its seam than its gutters can label at the floor (a
    /// printed set continues the diagram on further sheets instead).
    pub crowded: bool,
    /// On a part of a continued diagram: which coils the part may draw.
    pub part: Option<PartRequest>,
}

/// The coils a part of a continued diagram may draw: those whose top sides lie in the
/// `tops` slots from the view's first slot (of `element` alone, on a winding of several).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct PartRequest {
    /// Slots, from the view's first, whose coils are still to be drawn.
    pub tops: u32,
    /// The element drawn (an index into `Winding::elements`), on a winding of several.
    pub element: Option<usize>,
    /// Side by side: the parts' strips meet edge to edge at one scale, each draws every
    /// coil of its own slots and the pieces of the others' that pass through it, and a line
    /// leaving one part at a match line enters the next at the same height (no edge labels).
    /// Else each part draws only the coils of its own slots, each line cut at an edge
    /// labelled with where it goes.
    pub side_by_side: bool,
}

/// Resolves the window into a [`View`]; `fit_slots` (a sheet's legibility limit) caps the
/// slots shown, so that a window that cannot meet the floor shows fewer slots at a larger
/// scale.
pub fn resolve_view(
    design: &Design,
    winding: &Winding,
    window: Window,
    fit_slots: Option<u32>,
) -> View {
    let view = requested_view(design, winding, window);
    match fit_slots {
        Some(n) if n.max(1) < view.slots => View {
            whole: false,
            slots: n.max(1),
            pole_pairs: None,
            ..view
        },
        _ => view,
    }
}

fn requested_view(design: &Design, winding: &Winding, window: Window) -> View {
    let s = design.slots;
    let p = design.pole_pairs();
    let c = winding.active_coils;
    let repeat_slots = (p > 1 && s.is_multiple_of(p) && c.is_multiple_of(p)).then_some(s / p);
    let whole = View {
        whole: true,
        first_slot: 1,
        slots: s,
        total_slots: s,
        pole_pairs: None,
        repeat_slots,
        crowded: false,
        part: None,
    };
    let (pairs, first) = match window {
        Window::Whole => return whole,
        Window::Auto => {
            if c <= LEGIBLE_SEGMENTS {
                return whole;
            }
            let per_pair = f64::from(c) / f64::from(p);
            (
                (f64::from(LEGIBLE_SEGMENTS) / per_pair).floor().max(1.0) as u32,
                1,
            )
        }
        Window::PolePairs { pairs, first_slot } => (pairs.max(1), first_slot.clamp(1, s)),
    };
    if pairs >= p {
        return whole;
    }
    let slots = ((f64::from(pairs) * f64::from(s) / f64::from(p)).round() as u32).clamp(1, s);
    View {
        whole: false,
        first_slot: first,
        slots,
        total_slots: s,
        pole_pairs: Some(pairs),
        repeat_slots,
        crowded: false,
        part: None,
    }
}

/// Mapping from rotor angle to strip x, with cutting at the edges.
pub(super) struct Geo {
    pub(super) start_deg: f64,
    pub(super) scale: f64,
    pub(super) turn: f64,
    pub(super) strip: (f64, f64),
    pub(super) whole: bool,
    /// Draw every copy of a line round the turn that falls in the strip (the whole view, and
    /// the parts of a diagram continued side by side).
    pub(super) copies: bool,
}

impl Geo {
    /// x of `deg` in [strip.0, strip.0 + turn).
    pub(super) fn x(&self, deg: f64) -> f64 {
        self.strip.0 + (deg - self.start_deg).rem_euclid(360.0) * self.scale
    }

    pub(super) fn inside(&self, x: f64) -> bool {
        x >= self.strip.0 - 1e-9 && x < self.strip.1 - 1e-9
    }

    /// The visible pieces of the interval [a, b] (any copy round the turn).
    pub(super) fn interval(&self, a: f64, b: f64) -> Vec<(f64, f64)> {
        let mut out = Vec::new();
        for k in -1..=1 {
            let shift = f64::from(k) * self.turn;
            let lo = (a + shift).max(self.strip.0);
            let hi = (b + shift).min(self.strip.1);
            if hi - lo > 1e-6 {
                out.push((lo, hi));
            }
        }
        out.sort_by(|p, q| p.0.total_cmp(&q.0));
        out
    }

    /// The visible pieces of a polyline (any copy round the turn), each with a flag for a cut
    /// at its start and at its end.
    pub(super) fn polyline(&self, pts: &[Point]) -> Vec<(Vec<Point>, bool, bool)> {
        let mut out = Vec::new();
        // A window draws each coil once, from the copy whose top side is in view.
        let shifts = if self.copies { -1..=1 } else { 0..=0 };
        for k in shifts {
            let shift = f64::from(k) * self.turn;
            let moved: Vec<Point> = pts.iter().map(|&(x, y)| (x + shift, y)).collect();
            clip_polyline(&moved, self.strip.0, self.strip.1, &mut out);
        }
        out
    }
}

/// Appends the parts of `pts` inside x0 ≤ x ≤ x1 to `out`, flagging cut ends.
pub(super) fn clip_polyline(
    pts: &[Point],
    x0: f64,
    x1: f64,
    out: &mut Vec<(Vec<Point>, bool, bool)>,
) {
    let inside = |p: Point| p.0 >= x0 - 1e-9 && p.0 <= x1 + 1e-9;
    let mut cur: Vec<Point> = Vec::new();
    let mut cut_start = false;
    if let Some(&p) = pts.first()
        && inside(p)
    {
        cur.push(p);
    }
    for w in pts.windows(2) {
        let (a, b) = (w[0], w[1]);
        let (ia, ib) = (inside(a), inside(b));
        // Points where the segment a→b crosses the edges, in order along it.
        let mut hits: Vec<(f64, Point)> = Vec::new();
        if (b.0 - a.0).abs() > 1e-12 {
            for edge in [x0, x1] {
                let t = (edge - a.0) / (b.0 - a.0);
                if t > 1e-9 && t < 1.0 - 1e-9 {
                    hits.push((t, (edge, a.1 + t * (b.1 - a.1))));
                }
            }
        }
        hits.sort_by(|p, q| p.0.total_cmp(&q.0));
        let mut now_inside = ia;
        for (_, h) in hits {
            if now_inside {
                cur.push(h);
                out.push((std::mem::take(&mut cur), cut_start, true));
                now_inside = false;
            } else {
                cur = vec![h];
                cut_start = true;
                now_inside = true;
            }
        }
        if ib && now_inside {
            cur.push(b);
        } else if ib && !now_inside {
            cur = vec![b];
            cut_start = true;
        }
    }
    if cur.len() >= 2 {
        out.push((cur, cut_start, false));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clipping_splits_at_both_edges() {
        let mut out = Vec::new();
        clip_polyline(&[(5.0, 0.0), (15.0, 10.0)], 0.0, 10.0, &mut out);
        assert_eq!(out.len(), 1);
        assert_eq!(out[0].0, vec![(5.0, 0.0), (10.0, 5.0)]);
        assert!(!out[0].1 && out[0].2);

        let mut out = Vec::new();
        clip_polyline(&[(-5.0, 0.0), (5.0, 0.0), (15.0, 0.0)], 0.0, 10.0, &mut out);
        assert_eq!(out.len(), 1);
        assert_eq!(out[0].0, vec![(0.0, 0.0), (5.0, 0.0), (10.0, 0.0)]);
        assert!(out[0].1 && out[0].2);

        let mut out = Vec::new();
        clip_polyline(&[(12.0, 0.0), (20.0, 0.0)], 0.0, 10.0, &mut out);
        assert!(out.is_empty());
    }
}
