//! Conductor cross-sections, standard wire sizes and the mean length of a turn.
//!
//! Part of the `rating` stage: pure arithmetic on the resolved [`Design`].

use std::f64::consts::PI;

use crate::base::Units;
use crate::design::{Conductor, ConductorShape, Design, awg_diameter_mm};

/// Copper cross-section of one turn's conductor, all strands in hand, mm².
///
/// Round: π/4·d²·strands. Rectangular: (w·h − (4 − π)·r²)·strands, the corners being quarter
/// circles of radius r (plain geometry).
pub fn conductor_area_mm2(shape: &ConductorShape) -> f64 {
    match *shape {
        ConductorShape::Round {
            diameter_mm,
            strands,
            ..
        } => round_area_mm2(diameter_mm) * f64::from(strands),
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            strands,
        } => strip_area_mm2(width_mm, height_mm, corner_radius_mm) * f64::from(strands),
    }
}

/// Area of one round wire of bare diameter `d` mm, mm².
pub fn round_area_mm2(d: f64) -> f64 {
    PI / 4.0 * d * d
}

/// Area of one rectangular strip w × h with corner radius r, mm².
pub fn strip_area_mm2(w: f64, h: f64, r: f64) -> f64 {
    w * h - (4.0 - PI) * r * r
}

/// Strands (wires or strips) in hand.
pub fn strands(shape: &ConductorShape) -> u32 {
    match *shape {
        ConductorShape::Round { strands, .. } | ConductorShape::Rectangular { strands, .. } => {
            strands
        }
    }
}

/// A conductor described in words, its sizes in `units`: "2 x AWG 17 (1.150 mm)", "1.250 mm
/// round", "0.2480 x 0.0984 in strip, corner radius 0.0197 in".
pub fn describe(shape: &ConductorShape, units: Units) -> String {
    let n = strands(shape);
    let body = size_words(shape, units);
    if n > 1 { format!("{n} x {body}") } else { body }
}

/// One strand's size in words, without the strands in hand, its sizes in `units` (a mm size
/// to 3 decimals, a strip's to 2): "AWG 17 (1.150 mm)", "1.250 mm round", "6.30 x 2.50 mm
/// strip, corner radius 0.50 mm".
pub fn size_words(shape: &ConductorShape, units: Units) -> String {
    let u = units.symbol();
    match *shape {
        ConductorShape::Round {
            diameter_mm,
            awg: Some(g),
            ..
        } => format!("AWG {} ({})", awg_name(g), units.length(diameter_mm, 3)),
        ConductorShape::Round {
            diameter_mm,
            awg: None,
            ..
        } => format!("{} round", units.length(diameter_mm, 3)),
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            ..
        } => format!(
            "{} x {} {u} strip, corner radius {}",
            units.number(width_mm, 2),
            units.number(height_mm, 2),
            units.length(corner_radius_mm, 2)
        ),
    }
}

/// The gauge as written on a reel: 0000 for −3, 000 for −2, 00 for −1.
pub fn awg_name(g: i32) -> String {
    match g {
        -3 => "0000".into(),
        -2 => "000".into(),
        -1 => "00".into(),
        n => n.to_string(),
    }
}

/// Enamel build of round wire by nominal diameter: (nominal d, grade 1 increase, grade 2
/// increase), mm, the increase being the largest overall diameter less the nominal one
/// [src: IEC 60317-0-1, table 1 (maximum overall diameter by grade); from memory as to the
/// values, not checked against the table].
pub const ENAMEL_BUILD_MM: [(f64, f64, f64); 7] = [
    (0.100, 0.017, 0.025),
    (0.250, 0.031, 0.047),
    (0.500, 0.044, 0.066),
    (1.000, 0.062, 0.093),
    (2.000, 0.074, 0.112),
    (3.150, 0.085, 0.125),
    (5.000, 0.091, 0.138),
];

/// The increase of a round wire's diameter by its enamel, grade 1 or 2 (any other grade is
/// taken as 2), mm: [`ENAMEL_BUILD_MM`] interpolated linearly on the nominal diameter and held
/// at its end values outside its range.
pub fn enamel_increase_mm(d: f64, grade: u8) -> f64 {
    let pick = |row: &(f64, f64, f64)| if grade == 1 { row.1 } else { row.2 };
    let t = &ENAMEL_BUILD_MM;
    if d <= t[0].0 {
        return pick(&t[0]);
    }
    for pair in t.windows(2) {
        let (a, b) = (&pair[0], &pair[1]);
        if d <= b.0 {
            let f = (d - a.0) / (b.0 - a.0);
            return pick(a) + f * (pick(b) - pick(a));
        }
    }
    pick(&t[t.len() - 1])
}

/// Smallest and largest AWG gauge considered for suggestions (0000 … 40).
pub const AWG_RANGE: std::ops::RangeInclusive<i32> = -3..=40;

/// Nominal diameters of metric enamelled round wire, mm: the R20 preferred numbers from
/// 0.100 mm to 5.00 mm.
///
/// [src: ISO 3 preferred numbers, series R20 (1.00 1.12 1.25 1.40 1.60 1.80 2.00 2.24 2.50
/// 2.80 3.15 3.55 4.00 4.50 5.00 5.60 6.30 7.10 8.00 9.00); their use for enamelled wire
/// nominal diameters per IEC 60317-0-1, from memory as to the full list.]
pub fn r20_diameters_mm() -> Vec<f64> {
    const R20: [f64; 20] = [
        1.00, 1.12, 1.25, 1.40, 1.60, 1.80, 2.00, 2.24, 2.50, 2.80, 3.15, 3.55, 4.00, 4.50, 5.00,
        5.60, 6.30, 7.10, 8.00, 9.00,
    ];
    let mut out = Vec::new();
    for decade in [0.1, 1.0] {
        for r in R20 {
            out.push((r * decade * 1000.0).round() / 1000.0);
        }
    }
    out.push(10.0);
    out.retain(|d| (0.1..=5.0).contains(d));
    out
}

/// Which family a suggested size belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum WireFamily {
    /// American Wire Gauge (ASTM B258).
    Awg,
    /// Metric R20 nominal diameter.
    Metric,
}

/// One standard round-wire option: `strands` wires of one size in hand.
#[derive(Clone, Debug, PartialEq)]
pub struct WireOption {
    /// AWG or metric.
    pub family: WireFamily,
    /// The gauge when AWG.
    pub awg: Option<i32>,
    /// Bare diameter, mm.
    pub diameter_mm: f64,
    /// Wires in hand, 1…4.
    pub strands: u32,
    /// Total copper area, mm².
    pub area_mm2: f64,
    /// (area − wanted)/wanted, as a fraction.
    pub error: f64,
}

impl WireOption {
    /// "2 x AWG 17 (1.150 mm)" or "3 x 1.120 mm round", sizes in `units`.
    pub fn label(&self, units: Units) -> String {
        describe(&self.shape(), units)
    }

    /// The option as a conductor shape.
    pub fn shape(&self) -> ConductorShape {
        ConductorShape::Round {
            diameter_mm: self.diameter_mm,
            awg: self.awg,
            strands: self.strands,
        }
    }
}

/// For each strand count 1…`max_strands` and each family, the standard size whose total area
/// is nearest to `wanted_mm2` (ties go to the larger wire). Sorted by family, then strands.
pub fn nearest_sizes(wanted_mm2: f64, max_strands: u32) -> Vec<WireOption> {
    let metric = r20_diameters_mm();
    let mut out = Vec::new();
    for family in [WireFamily::Awg, WireFamily::Metric] {
        for n in 1..=max_strands {
            let per = wanted_mm2 / f64::from(n);
            let candidates: Vec<(Option<i32>, f64)> = match family {
                WireFamily::Awg => AWG_RANGE.map(|g| (Some(g), awg_diameter_mm(g))).collect(),
                WireFamily::Metric => metric.iter().map(|&d| (None, d)).collect(),
            };
            let best = candidates
                .into_iter()
                .map(|(g, d)| (g, d, (round_area_mm2(d) - per).abs()))
                .fold(None::<(Option<i32>, f64, f64)>, |acc, c| match acc {
                    Some(a) if a.2 < c.2 || (a.2 == c.2 && a.1 > c.1) => Some(a),
                    _ => Some(c),
                });
            if let Some((g, d, _)) = best {
                let area = round_area_mm2(d) * f64::from(n);
                out.push(WireOption {
                    family,
                    awg: g,
                    diameter_mm: d,
                    strands: n,
                    area_mm2: area,
                    error: area / wanted_mm2 - 1.0,
                });
            }
        }
    }
    out
}

/// How far below the wanted area a size may be and still be wound: 3 %.
pub const SIZE_BELOW: f64 = 0.03;
/// How far above the wanted area a size may be and still fit the slot the old copper filled: 2 %.
pub const SIZE_ABOVE: f64 = 0.02;

/// The wire the old winding used: its bare diameter, mm, and strands in hand.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct OldWire {
    /// Bare diameter, mm.
    pub diameter_mm: f64,
    /// Strands in hand.
    pub strands: u32,
}

/// Picks the option to wind within `family`. Among the sizes within tolerance (at most
/// [`SIZE_BELOW`] under the wanted area, at most [`SIZE_ABOVE`] over it, so it fits the slot
/// space the old copper filled), in order of preference: the old wire's diameter (the wire on
/// the shelf), fewest strands; one strand; the old strand count; the fewest strands. When no
/// size is within tolerance, the option with the smallest error (fewest strands on a tie).
pub fn choose_size(
    options: &[WireOption],
    family: WireFamily,
    old: Option<OldWire>,
) -> Option<&WireOption> {
    let fam: Vec<&WireOption> = options.iter().filter(|o| o.family == family).collect();
    let fits: Vec<&WireOption> = fam
        .iter()
        .copied()
        .filter(|o| o.error >= -SIZE_BELOW && o.error <= SIZE_ABOVE)
        .collect();
    let same_wire =
        |o: &&WireOption| old.is_some_and(|w| (o.diameter_mm - w.diameter_mm).abs() < 1e-9);
    let old_strands = |o: &&WireOption| old.is_some_and(|w| o.strands == w.strands);
    fits.iter()
        .copied()
        .find(same_wire)
        .or_else(|| fits.iter().copied().find(|o| o.strands == 1))
        .or_else(|| fits.iter().copied().find(old_strands))
        .or_else(|| fits.first().copied())
        .or_else(|| {
            fam.iter()
                .copied()
                .fold(None, |acc: Option<&WireOption>, o| match acc {
                    Some(a) if a.error.abs() <= o.error.abs() => Some(a),
                    _ => Some(o),
                })
        })
}

/// Where the mean length of one turn came from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum MeanTurnSource {
    /// `[conductor] mean_turn_mm`.
    Given,
    /// Estimated from the core, with the numbers that went in.
    Estimated(MeanTurnEstimate),
}

/// The parts of the estimated mean turn, the coil's own shape (as the coil making lays it
/// out): L_mt = 2·straight + 4·end leg + 2·drop.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MeanTurnEstimate {
    /// One side's straight part, the core length and the extension each end, mm.
    pub straight_mm: f64,
    /// One end-turn leg, mm.
    pub end_leg_mm: f64,
    /// The drop from the slot's middle to the core surface at each end, mm.
    pub drop_mm: f64,
}

/// The mean length of one turn.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MeanTurn {
    /// mm.
    pub mm: f64,
    /// Given or estimated.
    pub source: MeanTurnSource,
}

/// The mean turn: given, or the mean turn of the coil the coil making lays out on `[core]`
/// (its straight sides, end-turn legs and drops, [`super::coil::coil_shape`]), so that the
/// resistance, the test readings and the wire to order reckon with one length.
/// `None` when neither the length nor the core diameter and length are known.
pub fn mean_turn(d: &Design, c: &Conductor) -> Option<MeanTurn> {
    if let Some(mm) = c.mean_turn_mm {
        return Some(MeanTurn {
            mm,
            source: MeanTurnSource::Given,
        });
    }
    let g = super::coil::geometry(d)?;
    let shape = super::coil::coil_shape(&g, d.span, d.turns, 1, 1);
    Some(MeanTurn {
        mm: shape.mean_turn_mm,
        source: MeanTurnSource::Estimated(MeanTurnEstimate {
            straight_mm: shape.straight_mm,
            end_leg_mm: shape.end_leg_mm,
            drop_mm: shape.nose_drop_mm,
        }),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn areas() {
        let round = ConductorShape::Round {
            diameter_mm: 1.0,
            awg: None,
            strands: 2,
        };
        assert!((conductor_area_mm2(&round) - PI / 2.0).abs() < 1e-12);
        let strip = ConductorShape::Rectangular {
            width_mm: 6.0,
            height_mm: 2.0,
            corner_radius_mm: 0.5,
            strands: 1,
        };
        assert!((conductor_area_mm2(&strip) - (12.0 - (4.0 - PI) * 0.25)).abs() < 1e-12);
    }

    #[test]
    fn r20_list_has_the_familiar_sizes() {
        let l = r20_diameters_mm();
        for d in [0.8, 0.9, 1.0, 1.12, 1.25, 1.4, 1.6, 1.8, 2.0] {
            assert!(l.contains(&d), "{d}");
        }
        assert_eq!(l.first(), Some(&0.1));
        assert_eq!(l.last(), Some(&5.0));
    }

    #[test]
    fn nearest_single_wire_is_exact_when_available() {
        let o = nearest_sizes(round_area_mm2(1.25), 4);
        let m1 = o
            .iter()
            .find(|o| o.family == WireFamily::Metric && o.strands == 1)
            .unwrap();
        assert_eq!(m1.diameter_mm, 1.25);
        let a = nearest_sizes(round_area_mm2(awg_diameter_mm(18)), 1);
        assert_eq!(a[0].awg, Some(18));
        assert_eq!(
            choose_size(&o, WireFamily::Metric, None).unwrap().strands,
            1
        );
    }
}
