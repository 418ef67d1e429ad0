//! The equalizer band of the developed diagram: one line per ring, or one labelled tap per
//! equalized segment when there are too many rings for lines.
//!
//! Part of the `layout` stage (the developed diagram).

use crate::design::EqualizerChoice;
use crate::winding::{EqualizerPlan, Winding};

use super::bands::{Bands, MAX_RING_ROWS};
use super::view::Geo;

/// One equalizer as drawn.
#[derive(Clone, Debug, PartialEq)]
pub struct EqualizerDrawing {
    /// 1-based index in the design's list of groups.
    pub index: u32,
    /// All segments it joins.
    pub segments: Vec<u32>,
    /// Row y (ring mode) or the tap end (tap mode).
    pub y: f64,
    /// Taps inside the strip: (segment, x).
    pub taps: Vec<(u32, f64)>,
}

/// How the equalizers are shown.
#[derive(Clone, Debug, PartialEq)]
pub enum EqualizerBand {
    /// No equalizers fitted.
    None,
    /// One full-width line per ring.
    Rings(Vec<EqualizerDrawing>),
    /// Too many rings for lines: a labelled tap per equalized segment in view.
    Taps(Vec<EqualizerDrawing>),
}

pub(super) fn equalizer_band(winding: &Winding, geo: &Geo, bands: &Bands) -> EqualizerBand {
    let EqualizerPlan::Possible(e) = &winding.equalizers else {
        return EqualizerBand::None;
    };
    if e.groups.is_empty() {
        return EqualizerBand::None;
    }
    let rings = e.groups.len() <= MAX_RING_ROWS;
    let drawings = e
        .groups
        .iter()
        .enumerate()
        .map(|(i, g)| {
            let taps = g
                .iter()
                .filter_map(|&s| {
                    let x = geo.x(winding.segment_deg(s));
                    geo.inside(x).then_some((s, x))
                })
                .collect();
            let y = if rings {
                bands.equalizer_rows[i]
            } else {
                bands.equalizer_rows[0]
            };
            EqualizerDrawing {
                index: i as u32 + 1,
                segments: g.clone(),
                y,
                taps,
            }
        })
        .collect();
    if rings {
        EqualizerBand::Rings(drawings)
    } else {
        EqualizerBand::Taps(drawings)
    }
}

/// How many equalizers the design asked for, in words, for the diagram header.
pub fn equalizer_choice_words(choice: EqualizerChoice) -> String {
    match choice {
        EqualizerChoice::None => "none".into(),
        EqualizerChoice::Full => "all possible".into(),
        EqualizerChoice::EveryNth(k) => format!("every {k}th possible"),
    }
}
