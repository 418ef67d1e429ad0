//! Label placement in the developed diagram: edge labels moved apart, path tags thinned,
//! labels centred on boxes split at the seam.
//!
//! Part of the `layout` stage (the developed diagram).

use super::coils::CoilDrawing;
use crate::layout::font::{Weight, text_width};

/// Least distance between two edge labels' baselines, mm (labels are set at the floor,
/// digits 0.73 em tall).
pub(super) const EDGE_LABEL_GAP: f64 = 2.6;

/// How far a label may stand above or below its dot, mm; the leader between them stays
/// short enough to follow.
pub(super) const EDGE_LABEL_SHIFT: f64 = 7.0;

/// Where an edge's labels stand: each cut's label baseline in `[lo, hi]`, at least `gap`
/// apart and in the order of the dots, as near its dot (`at.1 + 0.65`) as those allow (least
/// squares, by pooling adjacent violators; [src: the pool-adjacent-violators algorithm for
/// isotonic regression, Barlow et al. 1972, from memory]). In the whole view (`twins`) the
/// left edge takes its places from the right: every line cut at the right edge re-enters at
/// the left at the same height with the same label, so both edges read alike. Returns false
/// when some edge cannot hold its labels within [`EDGE_LABEL_SHIFT`] of their dots.
pub(super) fn place_edge_labels(
    coils: &mut [CoilDrawing],
    gap: f64,
    (lo, hi): (f64, f64),
    twins: bool,
) -> bool {
    let edges: &[bool] = if twins { &[true] } else { &[false, true] };
    let mut fits = true;
    for &right in edges {
        let mut refs: Vec<(f64, usize, usize)> = Vec::new();
        for (i, c) in coils.iter().enumerate() {
            for (j, cut) in c.cuts.iter().enumerate() {
                if cut.right == right {
                    refs.push((cut.at.1 + 0.65, i, j));
                }
            }
        }
        refs.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)).then(a.2.cmp(&b.2)));
        let want: Vec<f64> = refs.iter().map(|r| r.0).collect();
        let placed = spread(&want, gap, lo, hi);
        for (&(y, i, j), &p) in refs.iter().zip(&placed) {
            fits &= (p - y).abs() <= EDGE_LABEL_SHIFT;
            coils[i].cuts[j].label_y = p;
        }
    }
    if twins {
        for c in coils.iter_mut() {
            let placed: Vec<(f64, f64)> = c
                .cuts
                .iter()
                .filter(|cut| cut.right)
                .map(|cut| (cut.at.1, cut.label_y))
                .collect();
            for cut in c.cuts.iter_mut().filter(|cut| !cut.right) {
                match placed.iter().find(|p| (p.0 - cut.at.1).abs() < 1e-6) {
                    Some(&(_, y)) => cut.label_y = y,
                    None => fits = false,
                }
            }
        }
    }
    fits
}

/// Positions as near `want` (sorted) as possible, `gap` apart, within `[lo, hi]` where they
/// fit there (else starting at `lo`).
fn spread(want: &[f64], gap: f64, lo: f64, hi: f64) -> Vec<f64> {
    // z_i = y_i − i·gap must not fall: pool adjacent blocks that do, at their mean.
    let mut blocks: Vec<(f64, usize)> = Vec::new();
    for (i, &w) in want.iter().enumerate() {
        blocks.push((w - i as f64 * gap, 1));
        while blocks.len() > 1 {
            let (b, nb) = blocks[blocks.len() - 1];
            let (a, na) = blocks[blocks.len() - 2];
            if a / na as f64 <= b / nb as f64 {
                break;
            }
            blocks.pop();
            let last = blocks.len() - 1;
            blocks[last] = (a + b, na + nb);
        }
    }
    let n = want.len();
    let top = (hi - n.saturating_sub(1) as f64 * gap).max(lo);
    let mut out = Vec::with_capacity(n);
    for (sum, count) in blocks {
        let z = (sum / count as f64).clamp(lo, top);
        for _ in 0..count {
            out.push(z + out.len() as f64 * gap);
        }
    }
    out
}

/// The words of a coil's tag at its back end: `dead` for a dummy, `sc` for a coil shorted
/// by a brush, else its path number.
pub fn tag_text(c: &CoilDrawing) -> String {
    if c.dummy {
        "dead".to_string()
    } else if c.path == 0 {
        "sc".to_string()
    } else {
        c.path.to_string()
    }
}

/// Drops path tags that would come within `gap` mm of a tag already kept (coils of one slot
/// share an apex), measured at `size` mm in bold. Tags of shorted coils (`sc`) and dummies
/// are kept first, so every coil under a brush stays tagged; path tags then fill in from the
/// left, and where one gives way the colour and dash pattern still name the path.
pub(super) fn thin_tags(coils: &mut [CoilDrawing], size: f64, gap: f64) {
    let mut order: Vec<(bool, f64, usize)> = coils
        .iter()
        .enumerate()
        .filter_map(|(i, c)| c.tag.map(|t| (c.path != 0 && !c.dummy, t.0, i)))
        .collect();
    order.sort_by(|a, b| a.0.cmp(&b.0).then(a.1.total_cmp(&b.1)).then(a.2.cmp(&b.2)));
    let mut kept: Vec<(f64, f64)> = Vec::new();
    for (_, x, i) in order {
        let half = text_width(&tag_text(&coils[i]), size, Weight::Bold) / 2.0;
        let (a, b) = (x - half, x + half);
        if kept.iter().any(|&(l, r)| a < r + gap && b > l - gap) {
            coils[i].tag = None;
        } else {
            kept.push((a, b));
        }
    }
}

/// Where to centre a label on a possibly split box.
pub(super) fn label_spot(pieces: &[(f64, f64)], x: f64) -> f64 {
    if pieces.iter().any(|&(a, b)| x >= a && x <= b) {
        return x;
    }
    pieces
        .iter()
        .max_by(|p, q| (p.1 - p.0).total_cmp(&(q.1 - q.0)))
        .map_or(x, |&(a, b)| (a + b) / 2.0)
}
