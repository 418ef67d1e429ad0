//! Segment voltage, segment pitch, peripheral speed, brush width and coils under commutation.
//!
//! Part of the `rating` stage: pure arithmetic.

use std::f64::consts::PI;

use crate::design::{BrushWidth, WindingType};

/// Voltage between adjacent segments.
#[derive(Clone, Debug, PartialEq)]
pub struct SegmentVoltage {
    /// Average E·P/C, V.
    pub average_v: f64,
    /// Estimated peak: average ÷ pole-arc ratio, V [common practice].
    pub peak_v: f64,
    /// The pole-arc ratio used.
    pub pole_arc: f64,
    /// Fewest segments that keep the average within its limit: ⌈E·P/limit⌉; `None` when that
    /// count is beyond `u32` (no commutator has that many).
    pub c_min_average: Option<u32>,
    /// Fewest segments that keep the estimated peak within its limit: ⌈E·P/(arc·limit)⌉;
    /// `None` as for `c_min_average`.
    pub c_min_peak: Option<u32>,
}

/// The average voltage between adjacent segments, E·P/C, V: the EMF of a path spread over the
/// C/P segments between brushes of opposite polarity [textbook relation; docs/domain.md, "Commutator and rating rules of thumb"].
pub fn average_segment_volts(e: f64, poles: u32, segments: u32) -> f64 {
    e.abs() * f64::from(poles) / f64::from(segments)
}

/// Average and peak segment voltage for EMF `e`, `poles`, `segments`, and the limits.
pub fn segment_voltage(
    e: f64,
    poles: u32,
    segments: u32,
    pole_arc: f64,
    avg_max: f64,
    peak_max: f64,
) -> SegmentVoltage {
    let ep = e.abs() * f64::from(poles);
    let average_v = average_segment_volts(e, poles, segments);
    SegmentVoltage {
        average_v,
        peak_v: average_v / pole_arc,
        pole_arc,
        c_min_average: ceil_count(ep / avg_max),
        c_min_peak: ceil_count(ep / (pole_arc * peak_max)),
    }
}

/// ⌈x⌉ as a count, with a tiny tolerance so 30.000000001 stays 30; 0 for x ≤ 0, and `None`
/// when x is not a number or the count does not fit in a `u32` (never a clamped, plausible
/// looking but wrong count).
pub(crate) fn ceil_count(x: f64) -> Option<u32> {
    let r = x.round();
    let c = if (x - r).abs() < 1e-9 { r } else { x.ceil() };
    if c.is_nan() || c > f64::from(u32::MAX) {
        None
    } else {
        Some(c.max(0.0) as u32)
    }
}

/// The commutator and brushes.
#[derive(Clone, Debug, PartialEq)]
pub struct CommutatorData {
    /// Commutator diameter, mm.
    pub diameter_mm: Option<f64>,
    /// Segment pitch π·D_c/C, mm.
    pub segment_pitch_mm: Option<f64>,
    /// Peripheral speed π·D_c·N/60, m/s.
    pub peripheral_speed_m_s: Option<f64>,
    /// The speed used for it, rpm.
    pub speed_rpm: Option<f64>,
    /// Brush width in segment pitches.
    pub brush_width_segments: Option<f64>,
    /// Brush width, mm.
    pub brush_width_mm: Option<f64>,
    /// Most coils one brush shorts at once.
    pub coils_shorted_max: Option<u32>,
    /// Fewest coils one brush shorts at once.
    pub coils_shorted_min: Option<u32>,
}

/// Commutator figures from the design data; `speed_rpm` is the speed to rate at.
/// `traced_width_segments` is the brush width the trace used, when the design gave one
/// (`Winding::brush_width`), so the coils shorted here are the trace's.
#[allow(clippy::too_many_arguments)]
pub fn commutator_data(
    diameter_mm: Option<f64>,
    brush: Option<BrushWidth>,
    traced_width_segments: Option<f64>,
    segments: u32,
    speed_rpm: Option<f64>,
    kind: WindingType,
    multiplicity: u32,
    pole_pairs: u32,
) -> CommutatorData {
    let c = f64::from(segments);
    let pitch = diameter_mm.map(|d| PI * d / c);
    let speed = diameter_mm
        .zip(speed_rpm)
        .map(|(d, n)| PI * d / 1000.0 * n / 60.0);
    let w_seg = traced_width_segments;
    let w_mm = match brush {
        Some(BrushWidth::Millimetres(mm)) => Some(mm),
        _ => w_seg.zip(pitch).map(|(s, p)| s * p),
    };
    let shorted = w_seg.map(|b| coils_shorted(b, kind, multiplicity, pole_pairs));
    CommutatorData {
        diameter_mm,
        segment_pitch_mm: pitch,
        peripheral_speed_m_s: speed,
        speed_rpm: speed.and(speed_rpm),
        brush_width_segments: w_seg,
        brush_width_mm: w_mm,
        coils_shorted_max: shorted.map(|s| s.1),
        coils_shorted_min: shorted.map(|s| s.0),
    }
}

/// Coils one brush shorts at once, (fewest, most); the kind's `shorting_rule` words how.
///
/// A brush β segment pitches wide (mica neglected) touches ⌊β⌋+1 or ⌈β⌉+1 segments as the
/// commutator turns. In a lap winding a coil joins segments m apart, so k touched segments
/// short k − m coils. In a wave winding each gap between neighbouring segments closes a chain
/// of p coils in series through the brushes of one polarity, so the count is p times that
/// [common practice, textbook commutation treatment, from memory].
pub fn coils_shorted(beta: f64, kind: WindingType, m: u32, p: u32) -> (u32, u32) {
    let near = beta.round();
    let (lo, hi) = if (beta - near).abs() < 1e-9 {
        (near, near)
    } else {
        (beta.floor(), beta.ceil())
    };
    // The design stage bounds the brush width in segment pitches, so these counts are small;
    // the arithmetic still saturates rather than wrap on any input.
    let touch_lo = (lo as i64).saturating_add(1);
    let touch_hi = (hi as i64).saturating_add(1);
    let per = |k: i64| u32::try_from(k.saturating_sub(i64::from(m)).max(0)).unwrap_or(u32::MAX);
    let (fewest, most) = (per(touch_lo), per(touch_hi));
    let gap = kind.kind().coils_per_gap(p);
    (fewest.saturating_mul(gap), most.saturating_mul(gap))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn segment_voltage_and_minimum_bars() {
        let s = segment_voltage(450.0, 6, 150, 0.7, 15.0, 30.0);
        assert!((s.average_v - 18.0).abs() < 1e-12);
        assert_eq!(s.c_min_average, Some(180));
        assert_eq!(s.c_min_peak, Some(129)); // 2700 / 21 = 128.57
    }

    #[test]
    fn counts_beyond_u32_are_none_not_clamped() {
        assert_eq!(ceil_count(30.0000000001), Some(30));
        assert_eq!(ceil_count(30.2), Some(31));
        assert_eq!(ceil_count(-3.0), Some(0));
        assert_eq!(ceil_count(f64::from(u32::MAX)), Some(u32::MAX));
        assert_eq!(ceil_count(f64::from(u32::MAX) + 1.0), None);
        assert_eq!(ceil_count(f64::INFINITY), None);
        assert_eq!(ceil_count(f64::NAN), None);
        let s = segment_voltage(1e5, 96, 150, 0.7, 1e-9, 1e-9);
        assert_eq!((s.c_min_average, s.c_min_peak), (None, None));
    }

    #[test]
    fn shorted_coils() {
        // The kinds as a design file names them.
        let kind = |word| WindingType::from_word(word).unwrap();
        assert_eq!(coils_shorted(1.5, kind("lap"), 1, 2).0, 1);
        assert_eq!(coils_shorted(1.5, kind("lap"), 1, 2).1, 2);
        assert_eq!(coils_shorted(2.0, kind("lap"), 2, 2).1, 1);
        assert_eq!(coils_shorted(1.0, kind("wave"), 1, 3).1, 3);
    }
}
