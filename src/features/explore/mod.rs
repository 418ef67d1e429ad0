//! The designer's search (`armsheet explore`): every winding that fits a frame and its rating,
//! with the figures it is ranked by.
//!
//! A feature above `checks`: pure, no I/O. The space is slots × kind × multiplicity ×
//! direction × coils per slot × segments (and so dummy coils) × span × turns × conductor ×
//! strands, narrowed by the frame's `[search]` ([`crate::design::Search`]).
//!
//! How a candidate is judged, with the verdict of `check`:
//! - a *structure* (everything but turns and conductor) is built with [`Design::new`] (which
//!   refuses unworkable segment counts, dummy coils and brush sets, as for any design) and run
//!   once through [`crate::check`] with one turn: its winding rules (symmetry, trace, span,
//!   kind rules) and the rating limits that depend on neither turns nor conductor (path
//!   current, brush arm current, segment pitch, commutator speed, brush width) are the
//!   trace's own, and hold for every turns and conductor on that structure;
//! - each turns × conductor × strands on it is then rated without tracing, by the rating
//!   stage's own functions (resistance, EMF, segment voltage, losses) in the order
//!   [`crate::rating::rate_with`] applies them, and its turn- and conductor-dependent limits
//!   (segment voltage, current density, electric loading) by [`RatingCheck::new`];
//! - a candidate *fits* when no error-level rule fails, every rating limit passes, the speed
//!   the whole turns give at the frame's flux is within `speed_tolerance` of the rated speed,
//!   and, with a slot area, the bare copper fill is at most `fill_max`.
//!
//! The turns searched on each structure and conductor are those around the speed band: the
//! speed falls as the turns rise, so the band's ends are found by bisection on the rated speed
//! itself and one turn either side is evaluated too (those are near misses on the speed).
//! `tests/it/explore.rs` writes every candidate of small frames as a design file and runs
//! `check` on it, and finds exactly the set this search finds.

use rayon::prelude::*;

use crate::base::number::{counted, fmt_fixed};
use crate::checks::{Checked, Severity, check};
use crate::design::{
    Conductor, ConductorFamily, ConductorShape, Design, DesignError, DesignSpec, Direction,
    EqualizerChoice, Frame, HalfBars, LimitId, SegmentChoice, SpanSource, WindingType,
    awg_diameter_mm, bounds,
};
use crate::rating::conductor::{AWG_RANGE, conductor_area_mm2, mean_turn, r20_diameters_mm};
use crate::rating::limits::{RatingCheck, rules};
use crate::rating::reactance::average_reactance_voltage;
use crate::rating::{ReactanceInputs, Resistance, commutator, emf, losses, resistance};
use crate::winding::Winding;

/// The limit a speed outside the band fails.
pub const SPEED_LIMIT: &str = "search.speed";
/// The limit a slot too full fails.
pub const FILL_LIMIT: &str = "search.fill";

/// A winding on the frame without its turns and conductor.
#[derive(Clone, Debug, PartialEq)]
pub struct Structure {
    /// Slots S.
    pub slots: u32,
    /// Lap, wave or frog-leg.
    pub kind: WindingType,
    /// Multiplicity m.
    pub multiplicity: u32,
    /// Progressive or retrogressive.
    pub direction: Direction,
    /// Coils per slot u.
    pub coils_per_slot: u32,
    /// Segments C.
    pub segments: u32,
    /// Span, slots.
    pub span: u32,
}

impl Structure {
    /// Dummy coils u·S − C.
    pub fn dummy_coils(&self) -> u32 {
        self.coils_per_slot * self.slots - self.segments
    }
}

/// The figures a candidate is judged and ranked by.
#[derive(Clone, Debug, PartialEq)]
pub struct Figures {
    /// Copper loss I²·R at the rated temperature, W.
    pub copper_loss_w: f64,
    /// Armature resistance at the rated temperature, Ω.
    pub resistance_ohm: f64,
    /// Induced EMF, V.
    pub emf_v: f64,
    /// Speed the whole turns give at the frame's flux, rpm.
    pub speed_rpm: f64,
    /// Average segment voltage, V.
    pub segment_volts_avg: f64,
    /// Estimated peak segment voltage, V.
    pub segment_volts_peak: f64,
    /// Current density, A/mm².
    pub density_a_mm2: f64,
    /// Electric loading, A/m.
    pub electric_loading_a_m: f64,
    /// Bare copper in one slot, mm².
    pub copper_per_slot_mm2: f64,
    /// Bare copper over slot area, when the slot area is known.
    pub fill: Option<f64>,
    /// Parallel paths a.
    pub paths: u32,
    /// Average reactance voltage of the coil under commutation, V
    /// ([`crate::rating::reactance`]), when the frame gives its inputs.
    pub reactance_v: Option<f64>,
}

/// One candidate winding.
#[derive(Clone, Debug, PartialEq)]
pub struct Candidate {
    /// Its structure.
    pub structure: Structure,
    /// Turns per coil.
    pub turns: u32,
    /// The conductor, strands included.
    pub conductor: ConductorShape,
    /// Its figures.
    pub figures: Figures,
    /// The limits it fails (ids), in check order; empty when it fits.
    pub fails: Vec<String>,
    /// On the Pareto front of the fitting candidates.
    pub on_front: bool,
    /// Why it is on the front: the figure in which no other fitting candidate beats it
    /// without losing in another.
    pub front_reason: Option<String>,
}

/// A structure `Design::new` refuses (no trace is made): the key and how many.
#[derive(Clone, Debug, PartialEq)]
pub struct Refusal {
    /// The design key, e.g. `armature.segments`.
    pub key: String,
    /// Structures refused for it.
    pub structures: u64,
}

/// The search's result.
#[derive(Clone, Debug, PartialEq)]
pub struct Explored {
    /// Candidates evaluated (each a turns × conductor on a traced structure).
    pub evaluated: u64,
    /// Structures built and traced.
    pub traced: u64,
    /// Structures refused before tracing, by key.
    pub refused: Vec<Refusal>,
    /// The fitting candidates, ranked (front first, then by copper loss, peak segment
    /// voltage, fill).
    pub fits: Vec<Candidate>,
    /// Candidates failing exactly one limit, ranked as the fits, at most [`NEAR_MISS_LIST`].
    pub near_misses: Vec<Candidate>,
    /// All candidates failing exactly one limit.
    pub near_miss_count: u64,
    /// For each limit, the candidates that fail it (alone or with others), most first.
    pub cut_by: Vec<(String, u64)>,
    /// Where the space was cut short, in words (empty when exhaustive within `[search]`).
    pub cut_short: Vec<String>,
    /// Among the candidates that fail the fewest limits, the limit most of them fail: the
    /// limit, how many of them fail it, and how many limits each fails.
    pub last_cut: Option<(String, u64, usize)>,
}

/// Near misses listed at most.
pub const NEAR_MISS_LIST: usize = 20;

/// Every structure of the frame's `[search]`, in a fixed order.
pub fn structures(f: &Frame) -> Vec<Structure> {
    let s = &f.search;
    let p = f.poles / 2;
    let mut out = Vec::new();
    for &slots in &f.slots {
        let pitch = f64::from(slots) / f64::from(f.poles);
        let lo = (pitch.floor() as i64 - i64::from(s.span_slack)).max(1) as u32;
        let hi = ((pitch.ceil() as i64 + i64::from(s.span_slack)) as u32).min(slots - 1);
        for &kind in &s.kinds {
            for m in 1..=s.multiplicity_max {
                for direction in [Direction::Progressive, Direction::Retrogressive] {
                    for u in s.coils_per_slot.0..=s.coils_per_slot.1 {
                        let n = u * slots;
                        if i64::from(n) > bounds::MAX_COILS {
                            continue;
                        }
                        for c in segment_counts(f, s, n, kind, m, p, direction) {
                            for span in lo..=hi {
                                out.push(Structure {
                                    slots,
                                    kind,
                                    multiplicity: m,
                                    direction,
                                    coils_per_slot: u,
                                    segments: c,
                                    span,
                                });
                            }
                        }
                    }
                }
            }
        }
    }
    out
}

/// The segment counts tried on `n` coil positions: the list given, the bar pitch range, or
/// every count with at most `dummy_coils_max` dummies that the kind can wind.
fn segment_counts(
    f: &Frame,
    s: &crate::design::Search,
    n: u32,
    kind: WindingType,
    m: u32,
    p: u32,
    dir: Direction,
) -> Vec<u32> {
    let k = kind.kind();
    let least = n.saturating_sub(s.dummy_coils_max).max(2);
    match &s.segments {
        SegmentChoice::List(list) => list.iter().copied().filter(|&c| c <= n).collect(),
        SegmentChoice::Workable => (least..=n)
            .filter(|&c| k.workable(c, n, m, p, dir))
            .collect(),
        SegmentChoice::BarPitch { min_mm, max_mm } => {
            let d = f
                .commutator
                .as_ref()
                .and_then(|k| k.diameter_mm)
                .unwrap_or(0.0);
            (2..=n)
                .filter(|&c| {
                    let pitch = std::f64::consts::PI * d / f64::from(c);
                    pitch >= *min_mm && pitch <= *max_mm
                })
                .collect()
        }
    }
}

/// Every conductor of the family, strands included, ascending by copper area.
pub fn conductors(f: &Frame) -> Vec<ConductorShape> {
    let s = &f.search;
    let mut one: Vec<ConductorShape> = match &s.conductor {
        ConductorFamily::R20 => r20_diameters_mm()
            .into_iter()
            .map(|d| ConductorShape::Round {
                diameter_mm: d,
                awg: None,
                strands: 1,
            })
            .collect(),
        ConductorFamily::Awg => AWG_RANGE
            .map(|g| ConductorShape::Round {
                diameter_mm: awg_diameter_mm(g),
                awg: Some(g),
                strands: 1,
            })
            .collect(),
        ConductorFamily::Rectangular {
            widths_mm,
            heights_mm,
            corner_radius_mm,
        } => {
            let mut v = Vec::new();
            for &w in widths_mm {
                for &h in heights_mm {
                    v.push(ConductorShape::Rectangular {
                        width_mm: w,
                        height_mm: h,
                        corner_radius_mm: *corner_radius_mm,
                        strands: 1,
                    });
                }
            }
            v
        }
    };
    let mut out = Vec::new();
    for shape in one.drain(..) {
        for n in 1..=s.strands_max {
            out.push(with_strands(shape, n));
        }
    }
    out.sort_by(|a, b| conductor_area_mm2(a).total_cmp(&conductor_area_mm2(b)));
    out
}

fn with_strands(shape: ConductorShape, n: u32) -> ConductorShape {
    match shape {
        ConductorShape::Round {
            diameter_mm, awg, ..
        } => ConductorShape::Round {
            diameter_mm,
            awg,
            strands: n,
        },
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            ..
        } => ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            strands: n,
        },
    }
}

/// The design of `structure` on the frame with `turns` and `conductor`: what the search
/// traces, and what `--write` writes.
pub fn design_of(
    f: &Frame,
    st: &Structure,
    turns: u32,
    conductor: ConductorShape,
) -> Result<Design, DesignError> {
    Design::new(DesignSpec {
        file_name: f.file_name.clone(),
        units: f.units,
        job: f.job.clone(),
        poles: f.poles,
        slots: st.slots,
        coils_per_slot: st.coils_per_slot,
        segments: Some(st.segments),
        rotation: f.rotation,
        pole_arc: f.pole_arc,
        winding_type: st.kind,
        multiplicity: st.multiplicity,
        direction: st.direction,
        span: st.span,
        span_source: SpanSource::Given,
        turns,
        wave_span: None,
        wave_turns: None,
        lead_offset: HalfBars::ZERO,
        equalizers: EqualizerChoice::None,
        dummy_coils: None,
        flux_per_pole_mwb: Some(f.flux_per_pole_mwb),
        speed_rpm: Some(f.speed_rpm),
        mode: f.mode,
        rating: Some(f.rating.clone()),
        conductor: Some(Conductor {
            shape: conductor,
            mean_turn_mm: f.search.mean_turn_mm,
        }),
        core: Some(f.core.clone()),
        commutator: f.commutator.clone(),
        limits: f.limits.clone(),
    })
}

/// One structure traced and checked once: what it fixes for every turns and conductor on it.
pub struct Traced<'a> {
    frame: &'a Frame,
    /// The failed error-level winding rules and the failed rating limits that depend on
    /// neither turns nor conductor, in check order.
    pub fails: Vec<String>,
    /// Conductors Z with one turn.
    z1: u64,
    /// Each element's (Z with one turn, paths), for several elements.
    elements: Vec<(u64, u32)>,
    paths: u32,
    active: u32,
    linkage: f64,
    mean_turn_mm: f64,
    coil_sides_per_slot: u32,
    brush_drop_v: f64,
    pole_arc: f64,
    /// The reactance voltage's inputs with one turn a coil, and whether interpoles are
    /// fitted; the turns are set for each candidate.
    reactance: Option<(ReactanceInputs, bool)>,
}

/// The rating limits that depend on the turns or the conductor; the others are the
/// structure's.
const PER_CANDIDATE: [LimitId; 7] = [
    LimitId::SegmentVoltsAvgMax,
    LimitId::SegmentVoltsPeakMax,
    LimitId::CurrentDensityMin,
    LimitId::CurrentDensityMax,
    LimitId::ElectricLoadingMax,
    LimitId::ReactanceVoltsNoInterpolesMax,
    LimitId::ReactanceVoltsMax,
];

/// The per-candidate limits a mask bit stands for, in check order, then the search's own.
const MASK_IDS: [&str; 9] = [
    rules::SEGMENT_VOLTS_AVG.id,
    rules::SEGMENT_VOLTS_PEAK.id,
    rules::DENSITY_MIN.id,
    rules::DENSITY_MAX.id,
    rules::ELECTRIC_LOADING.id,
    rules::INTERPOLES_NEEDED.id,
    rules::REACTANCE_VOLTAGE.id,
    SPEED_LIMIT,
    FILL_LIMIT,
];

/// A candidate's figures and the per-candidate limits it fails, one bit a limit (segment voltage average and peak, density min and max, electric loading, speed, fill).
pub struct Rated {
    /// The figures.
    pub figures: Figures,
    /// Failed per-candidate limits.
    pub mask: u16,
}

/// Traces and checks `st` once (one turn, the first conductor) and keeps what every
/// candidate on it shares; `Err` with the design key when [`Design::new`] refuses it.
pub fn trace_structure<'a>(
    f: &'a Frame,
    st: &Structure,
    probe: ConductorShape,
) -> Result<Traced<'a>, &'static str> {
    let d = design_of(f, st, 1, probe).map_err(|e| e.key)?;
    let checked = check(d);
    traced(f, &checked).ok_or("rating")
}

fn traced<'a>(f: &'a Frame, checked: &Checked) -> Option<Traced<'a>> {
    let d = &checked.design;
    let w: &Winding = &checked.winding;
    let rating = checked.rating.as_ref()?;
    let mut fails: Vec<String> = checked
        .findings
        .iter()
        .filter(|x| x.severity == Severity::Error && !x.passed && !x.id.starts_with("rating."))
        .map(|x| x.id.clone())
        .collect();
    fails.extend(
        rating
            .checks
            .iter()
            .filter(|c| !c.passed && !PER_CANDIDATE.contains(&c.rule.limit))
            .map(|c| c.rule.id.to_string()),
    );
    let k = d.conductor.as_ref()?;
    let mt = mean_turn(d, k)?.mm;
    let grade = d
        .commutator
        .as_ref()
        .and_then(|k| k.brush_grade)
        .unwrap_or(crate::design::BrushGrade::Carbon);
    Some(Traced {
        frame: f,
        fails,
        z1: w.conductors,
        elements: if w.is_multi_element() {
            w.elements
                .iter()
                .map(|e| (2 * u64::from(w.active_coils), e.paths_formula.max(1)))
                .collect()
        } else {
            Vec::new()
        },
        paths: w.paths_formula.max(1),
        active: w.active_coils,
        linkage: w.constants.flux_linkage,
        mean_turn_mm: mt,
        coil_sides_per_slot: 2 * d.coils_per_slot * d.winding_type.kind().element_count(),
        brush_drop_v: emf::brush_drop_v(grade),
        pole_arc: d.pole_arc,
        reactance: rating
            .reactance
            .as_ref()
            .map(|x| (x.inputs, x.interpoles == Some(true))),
    })
}

impl Traced<'_> {
    /// The hot resistance, EMF, conductors and speed of `turns` with copper `area`, as
    /// [`crate::rating::rate_with`] works them out.
    fn emf(&self, turns: u32, area: f64) -> (Resistance, f64, u64, f64) {
        let f = self.frame;
        let t = u64::from(turns);
        let z = self.z1 * t;
        let a = self.paths;
        let r20 = if self.elements.is_empty() {
            resistance::armature_resistance_20(z, a, self.mean_turn_mm, area)
        } else {
            let el: Vec<(u64, u32)> = self.elements.iter().map(|&(z, a)| (z * t, a)).collect();
            resistance::elements_resistance_20(&el, self.mean_turn_mm, area)
        };
        let r = Resistance::new(r20, f.rating.thermal_class, false);
        let v = f.rating.voltage.unwrap_or(0.0);
        let i = f.rating.current.unwrap_or(0.0);
        let e = emf::induced_emf(f.mode, v, i * r.hot_ohm, self.brush_drop_v);
        let flux = f.flux_per_pole_mwb / 1000.0 * self.linkage;
        let speed = if e > 0.0 && flux > 0.0 {
            emf::speed_for(f.poles, z, a, e, flux)
        } else {
            0.0
        };
        (r, e, z, speed)
    }

    /// The figures of `turns` with copper `area`, and the per-candidate limits they fail.
    pub fn evaluate(&self, turns: u32, area: f64) -> Rated {
        let f = self.frame;
        let l = &f.limits;
        let a = self.paths;
        let (r, e, z, speed) = self.emf(turns, area);
        let i = f.rating.current.unwrap_or(0.0);
        let sv = commutator::segment_voltage(
            e,
            f.poles,
            self.active,
            self.pole_arc,
            l.get(LimitId::SegmentVoltsAvgMax),
            l.get(LimitId::SegmentVoltsPeakMax),
        );
        let density = i / f64::from(a) / area;
        let dia = f.core.diameter_mm.unwrap_or(0.0);
        let loading = z as f64 * i / (f64::from(a) * std::f64::consts::PI * dia / 1000.0);
        let copper = losses::losses(i, Some(r.hot_ohm), r.reference_c, self.brush_drop_v)
            .copper_w
            .unwrap_or(0.0);
        let per_slot = f64::from(self.coil_sides_per_slot) * f64::from(turns) * area;
        let fill = f.search.slot_area_mm2.map(|s| per_slot / s);
        let fails = |rule: crate::rating::Rule, value: f64| {
            value.is_finite() && !RatingCheck::new(rule, value, l).passed
        };
        let tol = f.search.speed_tolerance;
        // The reactance voltage of these turns, from the structure's inputs.
        let reactance_v = self.reactance.as_ref().and_then(|(x, _)| {
            average_reactance_voltage(&ReactanceInputs {
                turns_per_coil: f64::from(turns),
                ..*x
            })
        });
        let fitted = self.reactance.as_ref().is_some_and(|r| r.1);
        let bits = [
            e > 0.0 && fails(rules::SEGMENT_VOLTS_AVG, sv.average_v),
            e > 0.0 && fails(rules::SEGMENT_VOLTS_PEAK, sv.peak_v),
            fails(rules::DENSITY_MIN, density),
            fails(rules::DENSITY_MAX, density),
            fails(rules::ELECTRIC_LOADING, loading),
            !fitted && reactance_v.is_some_and(|v| fails(rules::INTERPOLES_NEEDED, v)),
            reactance_v.is_some_and(|v| fails(rules::REACTANCE_VOLTAGE, v)),
            !(speed >= f.speed_rpm * (1.0 - tol) && speed <= f.speed_rpm * (1.0 + tol)),
            fill.is_some_and(|x| x > f.search.fill_max),
        ];
        let mask = bits
            .iter()
            .enumerate()
            .fold(0u16, |m, (n, &b)| if b { m | (1 << n) } else { m });
        Rated {
            figures: Figures {
                copper_loss_w: copper,
                resistance_ohm: r.hot_ohm,
                emf_v: e,
                speed_rpm: speed,
                segment_volts_avg: sv.average_v,
                segment_volts_peak: sv.peak_v,
                density_a_mm2: density,
                electric_loading_a_m: loading,
                copper_per_slot_mm2: per_slot,
                fill,
                paths: a,
                reactance_v,
            },
            mask,
        }
    }

    /// The limits a candidate with `mask` fails, in check order.
    pub fn fails_of(&self, mask: u16) -> Vec<String> {
        let mut out = self.fails.clone();
        out.extend(
            MASK_IDS
                .iter()
                .enumerate()
                .filter(|(n, _)| mask & (1 << n) != 0)
                .map(|(_, id)| id.to_string()),
        );
        out
    }

    /// How many limits a candidate with `mask` fails.
    pub fn fail_count(&self, mask: u16) -> usize {
        self.fails.len() + mask.count_ones() as usize
    }

    /// The turns whose speed may fall in the band, one either side: the speed falls as the
    /// turns rise, so the band's ends are found by bisection on the speed itself.
    pub fn turns_window(&self, area: f64) -> std::ops::RangeInclusive<u32> {
        let f = self.frame;
        let tol = f.search.speed_tolerance;
        let max = bounds::MAX_TURNS as u32;
        let speed = |t: u32| self.emf(t, area).3;
        let first = partition(1, max, |t| speed(t) <= f.speed_rpm * (1.0 + tol));
        let after = partition(1, max, |t| speed(t) < f.speed_rpm * (1.0 - tol));
        first.saturating_sub(1).max(1)..=after.min(max)
    }
}

/// The least `t` in `lo..=hi` with `pred(t)`, `pred` false then true; `hi + 1` when never.
fn partition(lo: u32, hi: u32, pred: impl Fn(u32) -> bool) -> u32 {
    let (mut lo, mut hi) = (lo, hi + 1);
    while lo < hi {
        let mid = lo + (hi - lo) / 2;
        if pred(mid) {
            hi = mid;
        } else {
            lo = mid + 1;
        }
    }
    lo
}

/// One structure's result.
enum Outcome {
    Refused(&'static str),
    Rated {
        evaluated: u64,
        candidates: Vec<Candidate>,
        cut: Vec<(String, u64)>,
        closest: Closest,
    },
}

/// The candidates failing the fewest limits: how few, and how many fail each limit among them.
#[derive(Default)]
struct Closest {
    fewest: Option<usize>,
    limits: std::collections::BTreeMap<String, u64>,
}

impl Closest {
    fn add_n(&mut self, fails: &[String], count: u64) {
        match self.fewest {
            Some(n) if fails.len() > n => return,
            Some(n) if fails.len() == n => {}
            _ => {
                self.fewest = Some(fails.len());
                self.limits.clear();
            }
        }
        for x in fails {
            *self.limits.entry(x.clone()).or_default() += count;
        }
    }

    fn merge(&mut self, other: Closest) {
        match (self.fewest, other.fewest) {
            (_, None) => {}
            (Some(a), Some(b)) if b > a => {}
            (Some(a), Some(b)) if b == a => {
                for (k, n) in other.limits {
                    *self.limits.entry(k).or_default() += n;
                }
            }
            _ => *self = other,
        }
    }
}

fn explore_structure(f: &Frame, st: &Structure, conductors: &[(ConductorShape, f64)]) -> Outcome {
    let mut evaluated = 0;
    let mut candidates = Vec::new();
    let mut cut: std::collections::BTreeMap<String, u64> = std::collections::BTreeMap::new();
    let mut closest = Closest::default();
    let Some(&(probe, _)) = conductors.first() else {
        return Outcome::Rated {
            evaluated,
            candidates,
            cut: Vec::new(),
            closest,
        };
    };
    let fx = match trace_structure(f, st, probe) {
        Ok(fx) => fx,
        Err(key) => return Outcome::Refused(key),
    };
    // Tallies by mask, turned into limit counts once per structure.
    let mut masks = vec![0u64; 1 << MASK_IDS.len()];
    for &(shape, area) in conductors {
        for turns in fx.turns_window(area) {
            evaluated += 1;
            let r = fx.evaluate(turns, area);
            masks[r.mask as usize] += 1;
            if fx.fail_count(r.mask) <= 1 {
                candidates.push(Candidate {
                    structure: st.clone(),
                    turns,
                    conductor: shape,
                    figures: r.figures,
                    fails: fx.fails_of(r.mask),
                    on_front: false,
                    front_reason: None,
                });
            }
        }
    }
    for (mask, &n) in masks.iter().enumerate() {
        if n == 0 {
            continue;
        }
        let fails = fx.fails_of(mask as u16);
        for x in &fails {
            *cut.entry(x.clone()).or_default() += n;
        }
        closest.add_n(&fails, n);
    }
    Outcome::Rated {
        evaluated,
        candidates,
        cut: cut.into_iter().collect(),
        closest,
    }
}

/// Searches the frame: every candidate evaluated, the fits ranked with the front marked.
pub fn explore(f: &Frame) -> Explored {
    let sts = structures(f);
    let conds: Vec<(ConductorShape, f64)> = conductors(f)
        .into_iter()
        .map(|c| (c, conductor_area_mm2(&c)))
        .collect();
    let outcomes: Vec<Outcome> = sts
        .par_iter()
        .map(|st| explore_structure(f, st, &conds))
        .collect();
    let mut evaluated = 0;
    let mut traced = 0;
    let mut refused: std::collections::BTreeMap<String, u64> = Default::default();
    let mut cut: std::collections::BTreeMap<String, u64> = Default::default();
    let mut fits = Vec::new();
    let mut near = Vec::new();
    let mut closest = Closest::default();
    for o in outcomes {
        match o {
            Outcome::Refused(key) => *refused.entry(key.to_string()).or_default() += 1,
            Outcome::Rated {
                evaluated: n,
                candidates,
                cut: c,
                closest: k,
            } => {
                closest.merge(k);
                traced += 1;
                evaluated += n;
                for (k, n) in c {
                    *cut.entry(k).or_default() += n;
                }
                for k in candidates {
                    if k.fails.is_empty() {
                        fits.push(k);
                    } else {
                        near.push(k);
                    }
                }
            }
        }
    }
    mark_front(&mut fits);
    rank(&mut fits);
    rank(&mut near);
    let near_miss_count = near.len() as u64;
    let near = near_miss_list(near);
    // Every limit with the candidates it cuts, most first.
    let mut cut_by: Vec<(String, u64)> = cut.into_iter().collect();
    cut_by.sort_by(|a, b| b.1.cmp(&a.1).then(a.0.cmp(&b.0)));
    // Among the candidates closest to fitting (the fewest limits failed), the limit most of
    // them fail.
    let mut last: Vec<(String, u64)> = closest.limits.into_iter().collect();
    last.sort_by(|a, b| b.1.cmp(&a.1).then(a.0.cmp(&b.0)));
    let last_cut = last
        .into_iter()
        .next()
        .map(|(limit, n)| (limit, n, closest.fewest.unwrap_or(0)));
    let mut cut_short = Vec::new();
    if f.search.segments == SegmentChoice::Workable {
        cut_short.push(format!(
            "segment counts: at most {} dummy coils (search.dummy_coils_max)",
            f.search.dummy_coils_max
        ));
    }
    cut_short.push(format!(
        "spans: the pole pitch S/P and {} either side (search.span_slack)",
        counted(f.search.span_slack, "slot", "slots")
    ));
    cut_short.push("turns: the speed band's turns and one either side".to_string());
    cut_short.push("no equalizers, lead offset 0, dummy coils spread evenly, brush sets as the commutator gives".to_string());
    Explored {
        evaluated,
        traced,
        refused: refused
            .into_iter()
            .map(|(key, structures)| Refusal { key, structures })
            .collect(),
        fits,
        near_misses: near,
        near_miss_count,
        cut_by,
        cut_short,
        last_cut,
    }
}

/// The near misses listed: each failing limit in turn (in id order), its best-ranked first,
/// so that every limit that alone cuts a candidate shows, up to [`NEAR_MISS_LIST`].
fn near_miss_list(ranked: Vec<Candidate>) -> Vec<Candidate> {
    let mut by_limit: std::collections::BTreeMap<String, std::collections::VecDeque<Candidate>> =
        Default::default();
    for k in ranked {
        let id = k.fails.first().cloned().unwrap_or_default();
        by_limit.entry(id).or_default().push_back(k);
    }
    let mut out = Vec::new();
    while out.len() < NEAR_MISS_LIST && by_limit.values().any(|q| !q.is_empty()) {
        for q in by_limit.values_mut() {
            if out.len() < NEAR_MISS_LIST
                && let Some(k) = q.pop_front()
            {
                out.push(k);
            }
        }
    }
    out
}

/// The figures a front is taken over, each minimised: reactance voltage (0 for all when the
/// frame lacks its inputs), copper loss, peak segment voltage, and slot fill (the copper per
/// slot when the slot area is not known, which orders the same).
fn objectives(k: &Candidate) -> [f64; 4] {
    let g = &k.figures;
    [
        g.reactance_v.unwrap_or(0.0),
        g.copper_loss_w,
        g.segment_volts_peak,
        g.fill.unwrap_or(g.copper_per_slot_mm2),
    ]
}

const OBJECTIVE_NAMES: [&str; 4] = [
    "reactance voltage",
    "copper loss",
    "peak segment voltage",
    "slot fill",
];

/// Marks the Pareto front, and for each member the figure it is best in among the
/// candidates that beat it in another.
fn mark_front(fits: &mut [Candidate]) {
    let mut order: Vec<usize> = (0..fits.len()).collect();
    order.sort_by(|&a, &b| {
        let (x, y) = (objectives(&fits[a]), objectives(&fits[b]));
        x.iter()
            .zip(&y)
            .fold(std::cmp::Ordering::Equal, |o, (a, b)| {
                o.then(a.total_cmp(b))
            })
    });
    let mut front: Vec<usize> = Vec::new();
    for &i in &order {
        let x = objectives(&fits[i]);
        let dominated = front.iter().any(|&j| {
            let y = objectives(&fits[j]);
            y.iter().zip(&x).all(|(a, b)| a <= b) && y != x
        });
        if !dominated {
            front.push(i);
        }
    }
    let best: Vec<f64> = (0..OBJECTIVE_NAMES.len())
        .map(|n| {
            front
                .iter()
                .map(|&i| objectives(&fits[i])[n])
                .fold(f64::INFINITY, f64::min)
        })
        .collect();
    for &i in &front {
        let x = objectives(&fits[i]);
        let reason = if let Some(n) = (0..OBJECTIVE_NAMES.len())
            .filter(|&n| n > 0 || fits[i].figures.reactance_v.is_some())
            .find(|&n| x[n] <= best[n])
        {
            format!(
                "least {} of all fits ({})",
                OBJECTIVE_NAMES[n],
                fmt_fixed(x[n], 2)
            )
        } else {
            "no fit is better in one figure without being worse in another".to_string()
        };
        fits[i].on_front = true;
        fits[i].front_reason = Some(reason);
    }
}

/// The default order: the front first, then copper loss, peak segment voltage, fill, and the
/// structure, turns and conductor so the order is total.
fn rank(v: &mut [Candidate]) {
    v.sort_by(|a, b| {
        let (x, y) = (objectives(a), objectives(b));
        b.on_front
            .cmp(&a.on_front)
            .then(x[0].total_cmp(&y[0]))
            .then(x[1].total_cmp(&y[1]))
            .then(x[2].total_cmp(&y[2]))
            .then(key(a).cmp(&key(b)))
    });
}

fn key(
    k: &Candidate,
) -> (
    u32,
    WindingType,
    u32,
    Direction,
    u32,
    u32,
    u32,
    u32,
    u64,
    u32,
) {
    let s = &k.structure;
    let (size, strands) = match k.conductor {
        ConductorShape::Round {
            diameter_mm,
            strands,
            ..
        } => ((diameter_mm * 1e6) as u64, strands),
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            strands,
            ..
        } => (
            (width_mm * 1e6) as u64 * 1_000_000 + (height_mm * 1e3) as u64,
            strands,
        ),
    };
    (
        s.slots,
        s.kind,
        s.multiplicity,
        s.direction,
        s.coils_per_slot,
        s.segments,
        s.span,
        k.turns,
        size,
        strands,
    )
}

/// The header of a written pick: the search it came from.
pub fn pick_header(f: &Frame, k: &Candidate, n: usize, version: &str) -> Vec<String> {
    let s = &k.structure;
    vec![
        format!(
            "Written by armsheet {version} explore, candidate {n} of the search on {}.",
            f.file_name
        ),
        format!(
            "Search: {} poles, slots {:?}, kinds {}, multiplicity up to {}, coils per slot {} to {}, conductor {}, strands up to {}.",
            f.poles,
            f.slots,
            f.search
                .kinds
                .iter()
                .map(|k| k.as_str())
                .collect::<Vec<_>>()
                .join("/"),
            f.search.multiplicity_max,
            f.search.coils_per_slot.0,
            f.search.coils_per_slot.1,
            f.search.conductor.as_str(),
            f.search.strands_max
        ),
        format!(
            "Pick: {} m={} {} u={} C={} span {} turns {}; copper loss {} W, peak segment voltage {} V, speed {} rpm at the frame's flux.",
            s.kind.as_str(),
            s.multiplicity,
            s.direction.as_str(),
            s.coils_per_slot,
            s.segments,
            s.span,
            k.turns,
            fmt_fixed(k.figures.copper_loss_w, 1),
            fmt_fixed(k.figures.segment_volts_peak, 2),
            fmt_fixed(k.figures.speed_rpm, 0)
        ),
        "Run `armsheet check` on this file: it is the judge.".to_string(),
    ]
}

/// Re-runs `check` on candidate `k` (the finalists are traced with their own turns and
/// conductor): the checked design and whether it fits as the search said (no error-level
/// finding and every rating limit passed).
pub fn confirm(f: &Frame, k: &Candidate) -> Result<(Checked, bool), DesignError> {
    let d = design_of(f, &k.structure, k.turns, k.conductor)?;
    let c = check(d);
    let ok = !c.has_errors()
        && c.rating
            .as_ref()
            .is_some_and(|r| r.checks.iter().all(|x| x.passed));
    Ok((c, ok))
}
