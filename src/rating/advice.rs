//! What would fix a failed rating check: typed remedies with the numbers for each option.
//!
//! Part of the `rating` stage. Options follow the trade's usual remedies: more parallel paths
//! (lap instead of wave, a higher multiplicity), more segments, a larger conductor, or a
//! different commutator [common practice]. This file only works the numbers out; the words are
//! in the `advice_words` module (`Advice::words`).

use std::f64::consts::PI;

use super::conductor::{WireFamily, WireOption};
use super::scheme::{Scheme, connect, connect_with_coils};
use crate::design::{Design, WindingType, bounds};

/// What the advice needs to know about the machine as designed.
#[derive(Clone, Copy, Debug)]
pub struct Machine<'a> {
    /// The design.
    pub design: &'a Design,
    /// Segments C.
    pub segments: u32,
    /// Parallel paths a.
    pub paths: u32,
    /// Conductors Z.
    pub conductors: u64,
    /// Conductor area, mm², when known.
    pub area_mm2: Option<f64>,
}

impl Machine<'_> {
    /// Conductors per path Z/a, which fixes the EMF at a given flux and speed.
    fn per_path(&self) -> f64 {
        self.conductors as f64 / f64::from(self.paths)
    }

    /// Turns per coil on `paths` paths and `segments` segments for the same EMF, before
    /// rounding; each of the kind's elements holds `segments` coils and its share of the paths.
    fn turns_for(&self, kind: WindingType, paths: u32, segments: u32) -> f64 {
        let elements = kind.kind().element_count().max(1);
        self.per_path() * f64::from(paths / elements) / (2.0 * f64::from(segments))
    }

    /// One reconnection option with its current, turns and conductor.
    fn path_option(&self, route: PathRoute, k: Scheme, current: f64) -> PathOption {
        let exact = self.turns_for(k.kind, k.paths, k.segments);
        PathOption {
            route,
            scheme: k,
            per_path_a: current / f64::from(k.paths),
            turns: exact.round().max(1.0),
            turns_exact: exact,
            area_mm2: self
                .area_mm2
                .map(|a| a * f64::from(self.paths) / f64::from(k.paths)),
        }
    }
}

/// A remedy for one failed rating check, with its numbers.
#[derive(Clone, Debug, PartialEq)]
pub enum Advice {
    /// Path current too high: reconnect for more paths. `options` is empty when no lap or wave
    /// connection up to the largest multiplicity gives `need` paths.
    MorePaths {
        /// Paths needed; `None` when the count does not fit in a `u32`.
        need: Option<u32>,
        /// Poles P.
        poles: u32,
        /// The connections that give enough paths.
        options: Vec<PathOption>,
    },
    /// Segment voltage too high: more segments.
    MoreSegments {
        /// Fewest segments that keep the voltage within its limit; `None` when the count does
        /// not fit in a `u32`.
        c_min: Option<u32>,
        /// Segments now.
        now: u32,
        /// Slots S.
        slots: u32,
        /// The first coils-per-slot count that reaches `c_min`, if any does.
        option: Option<SegmentOption>,
    },
    /// Current density too high: a larger conductor.
    LargerConductor {
        /// Area needed, mm².
        need_mm2: f64,
        /// Per wire family (AWG, then metric), the smallest size for 1 to 4 strands.
        picks: Vec<Vec<WirePick>>,
        /// How much the copper per slot rises, %, when the present area is known.
        copper_rise_pct: Option<f64>,
    },
    /// Current density below its lower limit: the conductor may be smaller.
    SmallerConductor {
        /// The smallest area that keeps the density at the lower limit, mm².
        most_mm2: f64,
    },
    /// Segment pitch too small: a wider commutator or fewer segments.
    SegmentPitch {
        /// Diameter needed for the present segments, mm.
        min_diameter_mm: f64,
        /// Segments now.
        segments: u32,
        /// Most segments on the present commutator.
        max_segments: u32,
        /// The present commutator diameter, mm.
        diameter_mm: f64,
    },
    /// Peripheral speed too high: a smaller commutator or a lower speed.
    CommutatorSpeed {
        /// Largest diameter at the present speed, mm.
        max_diameter_mm: f64,
        /// The present speed, rpm.
        speed_rpm: f64,
        /// Highest speed on the present commutator, rpm.
        max_speed_rpm: f64,
        /// The present commutator diameter, mm.
        diameter_mm: f64,
    },
    /// Brush width outside `min..=max` segment pitches.
    BrushWidth {
        /// Narrowest, segment pitches.
        min: f64,
        /// Widest, segment pitches.
        max: f64,
        /// The segment pitch, mm, when the commutator diameter is known.
        pitch_mm: Option<f64>,
    },
    /// Brush-arm current too high: more arms (brush sets, then poles) or less current.
    BrushArm {
        /// Poles P.
        poles: u32,
        /// Brush sets fitted now.
        sets: u32,
        /// Brush arms needed (even, more than are fitted); `None` when the count does not fit
        /// in a `u32`. Up to P of them are more brush sets on the same poles; beyond P they
        /// need more poles.
        arms: Option<u32>,
        /// Highest armature current on the present arms, A.
        max_current_a: f64,
    },
    /// Electric loading too high: a larger armature or less current.
    ElectricLoading {
        /// Armature diameter needed, mm.
        min_diameter_mm: f64,
        /// Highest current on this winding, A.
        max_current_a: f64,
    },
    /// Reactance voltage too high: fewer turns per coil (E_r grows as their square), or
    /// interpoles.
    Reactance {
        /// Turns per coil now.
        turns_now: u32,
        /// Most turns per coil within the limit (0 when even one turn is above it).
        turns_max: u32,
        /// The reactance voltage at one turn per coil, V.
        one_turn_v: f64,
        /// The limit with interpoles, V, when fitting them is a remedy (the check is the
        /// no-interpole one).
        with_interpoles_v: Option<f64>,
    },
    /// Slot overfilled: less insulated conductor or thinner slot insulation.
    SlotFill {
        /// Room inside the slot insulation, mm².
        room_mm2: f64,
        /// Insulated conductor area in the slot now, mm².
        conductors_mm2: f64,
        /// Most insulated conductor area the limit allows, mm².
        most_mm2: f64,
    },
}

/// How a reconnection gets more paths.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PathRoute {
    /// A wave reconnected as a lap.
    LapInsteadOfWave,
    /// The same kind at a higher multiplicity.
    HigherMultiplicity,
}

/// One reconnection for more paths.
#[derive(Clone, Debug, PartialEq)]
pub struct PathOption {
    /// How the paths are gained.
    pub route: PathRoute,
    /// The new connection.
    pub scheme: Scheme,
    /// Current per path on it, A.
    pub per_path_a: f64,
    /// Whole turns per coil for the same EMF (at least 1).
    pub turns: f64,
    /// Turns per coil for the same EMF, before rounding.
    pub turns_exact: f64,
    /// Conductor area for the same current density, mm², when the present area is known.
    pub area_mm2: Option<f64>,
}

/// More coils per slot for more segments.
#[derive(Clone, Debug, PartialEq)]
pub struct SegmentOption {
    /// Coils per slot u.
    pub coils_per_slot: u32,
    /// Segments C it gives.
    pub segments: u32,
    /// Whole turns per coil for the same EMF.
    pub turns: f64,
    /// Turns per coil for the same EMF, before rounding.
    pub turns_exact: f64,
    /// How far whole turns move the EMF, %, when it is more than a tenth.
    pub emf_shift_pct: Option<f64>,
    /// Whether the turns fit, and the conductor that goes with them.
    pub fit: TurnsFit,
}

/// Whether the turns of a [`SegmentOption`] can be wound.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum TurnsFit {
    /// Less than one whole turn: not possible.
    BelowOneTurn,
    /// The conductor area, mm², that fills the same slot space.
    Area(f64),
    /// The present conductor is not known.
    Unknown,
}

/// The smallest standard size of one family for a number of strands.
#[derive(Clone, Debug, PartialEq)]
pub struct WirePick {
    /// AWG or metric.
    pub family: WireFamily,
    /// Wires in hand.
    pub strands: u32,
    /// The size, or `None` when even the largest of the family is too small.
    pub wire: Option<WireOption>,
}

/// More paths for a path current above `limit`: lap instead of wave, or a higher multiplicity.
pub fn more_paths(m: &Machine<'_>, current: f64, limit: f64) -> Advice {
    let d = m.design;
    let need = super::commutator::ceil_count(current / limit).map(|n| n.max(1));
    let mut options = Vec::new();
    let Some(need_n) = need else {
        return Advice::MorePaths {
            need,
            poles: d.poles,
            options,
        };
    };
    if let Some(more) = d.winding_type.kind().more_paths_kind()
        && let Some(k) = (d.multiplicity..=bounds::MAX_MULTIPLICITY as u32)
            .filter_map(|mm| connect(d, m.segments, more, mm).ok())
            .find(|k| k.paths >= need_n)
    {
        options.push(m.path_option(PathRoute::LapInsteadOfWave, k, current));
    }
    if let Some(k) = (d.multiplicity + 1..=bounds::MAX_MULTIPLICITY as u32)
        .filter_map(|mm| connect(d, m.segments, d.winding_type, mm).ok())
        .find(|k| k.paths >= need_n)
    {
        options.push(m.path_option(PathRoute::HigherMultiplicity, k, current));
    }
    Advice::MorePaths {
        need,
        poles: d.poles,
        options,
    }
}

/// More segments for a segment voltage above its limit: at least `c_min` (`None`: more than a
/// `u32` counts, so no coils-per-slot count reaches it).
pub fn more_segments(m: &Machine<'_>, c_min: Option<u32>) -> Advice {
    let d = m.design;
    let s = d.slots;
    let found = c_min.and_then(|c_min| {
        let first_u = c_min.div_ceil(s).max(d.coils_per_slot + 1);
        (first_u..=bounds::MAX_COILS_PER_SLOT as u32).find_map(|u| {
            let k = connect_with_coils(d, u, 0, d.winding_type, d.multiplicity).ok()?;
            (k.segments >= c_min).then_some((u, k))
        })
    });
    let option = found.map(|(u, k)| {
        let t = m.turns_for(k.kind, k.paths, k.segments);
        let whole = t.round();
        let emf_shift_pct =
            (whole >= 1.0 && (whole - t).abs() > 0.1 * t).then(|| (whole / t - 1.0) * 100.0);
        let fit = if whole < 1.0 {
            TurnsFit::BelowOneTurn
        } else {
            m.area_mm2.map_or(TurnsFit::Unknown, |a| {
                let ratio =
                    f64::from(d.turns) * f64::from(d.coils_per_slot) / (whole * f64::from(u));
                TurnsFit::Area(a * ratio)
            })
        };
        SegmentOption {
            coils_per_slot: u,
            segments: k.segments,
            turns: whole,
            turns_exact: t,
            emf_shift_pct,
            fit,
        }
    });
    Advice::MoreSegments {
        c_min,
        now: m.segments,
        slots: s,
        option,
    }
}

/// A larger conductor for a current density above its limit: area `need_mm2` or more.
pub fn larger_conductor(m: &Machine<'_>, need_mm2: f64) -> Advice {
    let picks = [WireFamily::Awg, WireFamily::Metric]
        .into_iter()
        .map(|family| {
            (1..=4)
                .map(|n| WirePick {
                    family,
                    strands: n,
                    wire: bigger_or_equal(family, n, need_mm2),
                })
                .collect()
        })
        .collect();
    Advice::LargerConductor {
        need_mm2,
        picks,
        copper_rise_pct: m.area_mm2.map(|a| (need_mm2 / a - 1.0) * 100.0),
    }
}

/// The smallest size of `family` whose `strands` wires reach `need` mm².
fn bigger_or_equal(family: WireFamily, strands: u32, need: f64) -> Option<WireOption> {
    use super::conductor::{AWG_RANGE, r20_diameters_mm, round_area_mm2};
    use crate::design::awg_diameter_mm;
    let n = f64::from(strands);
    let enough = |d: f64| round_area_mm2(d) * n >= need * (1.0 - 1e-9);
    let (awg, d) = match family {
        WireFamily::Awg => {
            let g = AWG_RANGE.rev().find(|&g| enough(awg_diameter_mm(g)))?;
            (Some(g), awg_diameter_mm(g))
        }
        WireFamily::Metric => (None, r20_diameters_mm().into_iter().find(|&d| enough(d))?),
    };
    let area = round_area_mm2(d) * n;
    Some(WireOption {
        family,
        awg,
        diameter_mm: d,
        strands,
        area_mm2: area,
        error: area / need - 1.0,
    })
}

/// A smaller conductor is possible when the density is below its lower limit.
pub fn smaller_conductor(most_mm2: f64) -> Advice {
    Advice::SmallerConductor { most_mm2 }
}

/// A wider commutator or fewer segments for a segment pitch below `min_mm`.
pub fn segment_pitch(m: &Machine<'_>, diameter_mm: f64, min_mm: f64) -> Advice {
    Advice::SegmentPitch {
        min_diameter_mm: f64::from(m.segments) * min_mm / PI,
        segments: m.segments,
        max_segments: (PI * diameter_mm / min_mm).floor() as u32,
        diameter_mm,
    }
}

/// A smaller commutator or a lower speed for a peripheral speed above `max_m_s`.
pub fn commutator_speed(diameter_mm: f64, speed_rpm: f64, max_m_s: f64) -> Advice {
    Advice::CommutatorSpeed {
        max_diameter_mm: max_m_s * 60_000.0 / (PI * speed_rpm),
        speed_rpm,
        max_speed_rpm: max_m_s * 60_000.0 / (PI * diameter_mm),
        diameter_mm,
    }
}

/// A brush of the right width when it is outside `min..=max` segment pitches.
pub fn brush_width(pitch_mm: Option<f64>, min: f64, max: f64) -> Advice {
    Advice::BrushWidth { min, max, pitch_mm }
}

/// More brush arms or less current for a brush-arm current above `limit`, with `sets` brush
/// sets fitted on `poles` poles. A wave winding with fewer sets than poles takes more sets first.
pub fn brush_arm(current: f64, sets: u32, poles: u32, limit: f64) -> Advice {
    // Checked: a tiny limit gives a count beyond u32, and rounding it up to even must not wrap.
    let arms = super::commutator::ceil_count(2.0 * current / limit)
        .and_then(|a| a.checked_add(a % 2))
        .and_then(|a| Some(a.max(sets.checked_add(2)?)));
    Advice::BrushArm {
        poles,
        sets,
        arms,
        max_current_a: limit * f64::from(sets) / 2.0,
    }
}

/// A larger armature or less current for an electric loading above `limit` A/m.
pub fn electric_loading(m: &Machine<'_>, current: f64, diameter_mm: f64, limit: f64) -> Advice {
    let x = m.per_path();
    Advice::ElectricLoading {
        min_diameter_mm: x * current / (PI * limit) * 1000.0,
        max_current_a: limit * PI * diameter_mm / 1000.0 / x,
    }
}

/// Fewer turns per coil, or interpoles, for a reactance voltage `value` V above `limit` V;
/// `with_interpoles` is the limit with interpoles when the check is the no-interpole one.
pub fn reactance(m: &Machine<'_>, value: f64, limit: f64, with_interpoles: Option<f64>) -> Advice {
    let turns = m
        .design
        .elements()
        .iter()
        .map(|e| e.turns)
        .max()
        .unwrap_or(m.design.turns);
    let t = f64::from(turns.max(1));
    Advice::Reactance {
        turns_now: turns,
        turns_max: super::reactance::turns_for(turns, value, limit),
        one_turn_v: value / (t * t),
        with_interpoles_v: with_interpoles,
    }
}

/// The remedy for one failed rating check.
#[derive(Clone, Debug, PartialEq)]
pub struct CheckAdvice {
    /// The check's id (`rating.…`).
    pub id: &'static str,
    /// The remedy.
    pub advice: Advice,
}

#[cfg(test)]
mod tests {
    use super::*;

    fn arms(current: f64, poles: u32, limit: f64) -> Option<u32> {
        match brush_arm(current, poles, poles, limit) {
            Advice::BrushArm { arms, .. } => arms,
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn brush_arms_round_up_to_even_and_never_wrap() {
        // 2 * 900 / 100 = 18 arms; 2 * 950 / 100 = 19 -> 20; at least P + 2.
        assert_eq!(arms(900.0, 4, 100.0), Some(18));
        assert_eq!(arms(950.0, 4, 100.0), Some(20));
        assert_eq!(arms(100.0, 12, 400.0), Some(14));
        // u32::MAX arms (odd) cannot be rounded up to even in a u32, and 2e10 is no u32.
        let odd_max = 2.0 * 1000.0 / f64::from(u32::MAX);
        assert_eq!(arms(1000.0 * (1.0 - 1e-12), 4, odd_max), None);
        assert_eq!(arms(1000.0, 4, 1e-7), None);
        assert!(
            Advice::BrushArm {
                poles: 4,
                sets: 4,
                arms: None,
                max_current_a: 0.0
            }
            .words()[0]
                .contains("more brush arms (poles) than can be counted")
        );
    }

    #[test]
    fn a_wave_with_fewer_brush_sets_takes_more_sets_before_more_poles() {
        // Two sets on six poles, 300 A, 200 A an arm: 2I/limit = 3 -> 4 arms, still within
        // the six poles, so the remedy is two more brush sets, not more poles.
        let a = brush_arm(300.0, 2, 6, 200.0);
        let words = a.words().join(" ");
        assert!(words.contains("4 brush sets on the 6 poles"), "{words}");
        assert!(words.contains("2I/(brush sets)"), "{words}");
        assert!(words.contains("at most 200.0 A"), "{words}");
        // Beyond the poles the remedy is more poles.
        let words = brush_arm(900.0, 2, 6, 200.0).words().join(" ");
        assert!(words.contains("10 brush arms (poles)"), "{words}");
    }
}
