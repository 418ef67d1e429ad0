//! The horizontal bands of the developed diagram, top to bottom: header, pole shoes, back
//! end connections, slots, front end connections and leads, commutator, brushes, equalizers.
//!
//! Part of the `layout` stage (the developed diagram): y values in millimetres.

use crate::design::Design;
use crate::winding::{EqualizerPlan, Winding};

/// Largest number of equalizer rings drawn as separate full-width lines; above it the band
/// shows one labelled tap per equalized segment instead.
pub const MAX_RING_ROWS: usize = 8;

/// The vertical bands, as y values in mm.
#[derive(Clone, Debug, PartialEq)]
pub struct Bands {
    /// Baselines of the header's lines, top to bottom (at least two: the rotation, then the
    /// note on what is shown when it does not fit beside, wrapped over as many as it needs,
    /// then on a part of a continued diagram its match lines).
    pub header: Vec<f64>,
    /// Pole-shoe row top and bottom.
    pub pole: (f64, f64),
    /// Apex of the back end connections.
    pub back_apex: f64,
    /// Top and bottom of the slot (core) band.
    pub core: (f64, f64),
    /// Baseline of the slot numbers.
    pub slot_labels: f64,
    /// Where the leads turn straight down into their segment.
    pub riser: f64,
    /// Top and bottom of the commutator row.
    pub commutator: (f64, f64),
    /// Top and bottom of the brush row.
    pub brush: (f64, f64),
    /// One y per equalizer row (empty when there are none).
    pub equalizer_rows: Vec<f64>,
}

/// The number of equalizer rows the band needs.
pub(super) fn equalizer_rows(winding: &Winding) -> usize {
    match &winding.equalizers {
        EqualizerPlan::Possible(e) if !e.groups.is_empty() => {
            if e.groups.len() <= MAX_RING_ROWS {
                e.groups.len()
            } else {
                2
            }
        }
        _ => 0,
    }
}

/// Distance between the header's baselines, mm.
pub(super) const HEADER_LEADING: f64 = 3.4;

/// The bands of a diagram `height` mm tall whose header takes `header_lines` lines (two are
/// always kept, so that a header of one line leaves the bands where a header of two puts
/// them).
pub(super) fn bands(design: &Design, winding: &Winding, height: f64, header_lines: usize) -> Bands {
    let _ = design;
    let lines = header_lines.max(2);
    let header: Vec<f64> = (0..lines)
        .map(|i| 3.2 + HEADER_LEADING * i as f64)
        .collect();
    let below = header[lines - 1] + 1.6;
    let rows = equalizer_rows(winding);
    let eq_pitch = 2.4;
    let eq_height = if rows == 0 {
        0.0
    } else {
        3.0 + rows as f64 * eq_pitch
    };
    let pole = (below, below + 5.5);
    let commutator_h = 7.0;
    let brush_h = 5.5;
    let fixed = pole.1 + 2.0 + commutator_h + brush_h + 1.0 + eq_height + 1.0;
    let free = (height - fixed).max(30.0);
    let back_h = free * 0.26;
    let core_h = free * 0.26;
    let front_h = free - back_h - core_h;
    let back_apex = pole.1 + 2.0;
    let core = (back_apex + back_h, back_apex + back_h + core_h);
    let commutator = (core.1 + front_h, core.1 + front_h + commutator_h);
    let brush = (commutator.1 + 0.6, commutator.1 + 0.6 + brush_h);
    let eq0 = brush.1 + 3.0;
    Bands {
        header,
        pole,
        back_apex,
        core,
        slot_labels: core.0 + 3.0,
        riser: commutator.0 - (front_h * 0.12).clamp(1.5, 4.0),
        commutator,
        brush,
        equalizer_rows: (0..rows).map(|i| eq0 + i as f64 * eq_pitch).collect(),
    }
}
