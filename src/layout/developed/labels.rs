//! Label placement in the developed diagram: edge labels moved apart, path tags thinned,
//! labels centred on boxes split at the seam.
//!
//! Part of the `layout` stage (the developed diagram).

use super::coils::CoilDrawing;

/// Least distance between two edge labels' baselines, mm (labels are 1.8 mm type).
pub(super) const EDGE_LABEL_GAP: f64 = 2.0;

/// Moves edge labels apart along each edge, by at most one gap; a label that still collides
/// is left out (its dot stays, and the connection table holds the coil).
pub(super) fn space_edge_labels(coils: &mut [CoilDrawing], gap: f64) {
    for right in [false, true] {
        let mut refs: Vec<(f64, usize, usize)> = Vec::new();
        for (i, c) in coils.iter().enumerate() {
            for (j, cut) in c.cuts.iter().enumerate() {
                if cut.right == right {
                    refs.push((cut.label_y, i, j));
                }
            }
        }
        refs.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)).then(a.2.cmp(&b.2)));
        let mut last = f64::NEG_INFINITY;
        for (y, i, j) in refs {
            let cut = &mut coils[i].cuts[j];
            let want = y.max(last + gap);
            if want - y <= gap {
                cut.label_y = want;
                last = want;
            } else {
                cut.label.clear();
            }
        }
    }
}

/// Drops path tags that would overlap a tag already placed to their left (coils of one slot
/// share an apex); the colour and dash pattern still name the path.
pub(super) fn thin_tags(coils: &mut [CoilDrawing], gap: f64) {
    let mut order: Vec<(f64, usize)> = coils
        .iter()
        .enumerate()
        .filter_map(|(i, c)| c.tag.map(|t| (t.0, i)))
        .collect();
    order.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    let mut last = f64::NEG_INFINITY;
    for (x, i) in order {
        if x - last < gap {
            coils[i].tag = None;
        } else {
            last = x;
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
