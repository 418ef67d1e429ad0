//! Label placement in the developed diagram: edge labels moved apart, path tags thinned,
//! labels centred on boxes split at the seam.
//!
//! Part of the `layout` stage (the developed diagram).

use super::coils::CoilDrawing;
use crate::layout::font::{Weight, text_width};

/// Least distance between two edge labels' baselines, mm (labels are set at the floor,
/// digits 0.73 em tall).
pub(super) const EDGE_LABEL_GAP: f64 = 2.6;

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

/// Drops path tags that would come within `gap` mm of a tag already placed to their left
/// (coils of one slot share an apex), measured at `size` mm in bold; the colour and dash
/// pattern still name the path.
pub(super) fn thin_tags(coils: &mut [CoilDrawing], size: f64, gap: f64) {
    let mut order: Vec<(f64, usize)> = coils
        .iter()
        .enumerate()
        .filter_map(|(i, c)| c.tag.map(|t| (t.0, i)))
        .collect();
    order.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    let mut last_right = f64::NEG_INFINITY;
    for (x, i) in order {
        let half = text_width(&tag_text(&coils[i]), size, Weight::Bold) / 2.0;
        if x - half < last_right + gap {
            coils[i].tag = None;
        } else {
            last_right = x + half;
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
