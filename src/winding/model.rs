//! The engine's result: a plain, fully resolved [`Winding`] that checks, layout and render read.
//!
//! Part of the `winding` stage. Numbering is 1-based throughout, as on the shop floor.
//! Angles are mechanical degrees in the rotor frame at the reference position, measured from
//! the centre of slot 1 towards rising slot numbers (clockwise seen from the commutator end).

use super::Pitches;
use crate::theory::{Direction, WindingType};

/// Where a coil side lies.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct SlotPlace {
    /// Slot, 1…S.
    pub slot: u32,
    /// Position within the layer, 1…u (1 is the first coil wound into the slot).
    pub position: u32,
    /// Coil-side number in the textbook numbering (top sides odd, bottom sides even).
    pub side: u32,
}

/// One row of the connection table.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Connection {
    /// Coil position number, 1…N (coil n has its top side in slot ⌈n/u⌉).
    pub coil: u32,
    /// The top-layer coil side.
    pub top: SlotPlace,
    /// The bottom-layer coil side.
    pub bottom: SlotPlace,
    /// Segment the start lead (from the top side) goes to; `None` for a dummy coil.
    pub start_segment: Option<u32>,
    /// Segment the end lead (from the bottom side) goes to; `None` for a dummy coil.
    pub end_segment: Option<u32>,
    /// This coil's own front pitch, in coil-side units and the sign convention of
    /// [`Pitches::front`](super::Pitches): the front connection runs from this coil's bottom
    /// side (at its end segment) to the top side of the coil that starts there. It equals the
    /// nominal front pitch except where the step passes over dummy coils (2 more per dummy
    /// on a wave). `None` for a dummy coil.
    pub front_pitch: Option<i64>,
    /// A dummy coil: wound for balance, ends cut back and taped, not connected.
    pub dummy: bool,
    /// The winding element the coil belongs to: [`WindingType::Lap`] or [`WindingType::Wave`]
    /// (a frog-leg winding has both; a lap or wave winding, its own kind).
    pub element: WindingType,
}

/// One winding element as traced: a lap or wave coil set on the commutator. A lap or wave
/// winding has one; a frog-leg winding two (the lap element first), each with its own coils,
/// pitches, connections and trace, on one commutator.
#[derive(Clone, Debug, PartialEq)]
pub struct WindingElement {
    /// [`WindingType::Lap`] or [`WindingType::Wave`].
    pub kind: WindingType,
    /// The element's multiplicity (a frog-leg's wave element: m·p).
    pub multiplicity: u32,
    /// The element's direction.
    pub direction: Direction,
    /// The element's pitches.
    pub pitches: Pitches,
    /// Turns per coil.
    pub turns: u32,
    /// The element's coils are `first_coil … first_coil + coils − 1` of
    /// [`Winding::connections`] (coil numbers, 1-based).
    pub first_coil: u32,
    /// Coil positions of the element, N = u·S.
    pub coils: u32,
    /// Bars from segment 1 to the start lead of the element's first active coil (0 for a
    /// lap or wave winding and a frog-leg's lap element).
    pub start_shift: u32,
    /// Closed windings of the element, as traced (the element's entries of
    /// [`Winding::closed_windings`], which lists the elements in order).
    pub reentrancy: u32,
    /// Reentrancy by the formula gcd(C, |y_c|).
    pub reentrancy_formula: u32,
    /// Parallel paths of the element, as traced.
    pub paths: u32,
    /// Parallel paths of the element by the formula (lap m·P, wave 2m).
    pub paths_formula: u32,
    /// The element's paths sorted into classes carried onto one another by rotations through
    /// whole pole pitches (the exact symmetry test).
    pub path_classes: super::PathClasses,
}

impl WindingElement {
    /// Whether coil number `coil` belongs to this element.
    pub fn holds(&self, coil: u32) -> bool {
        coil >= self.first_coil && coil < self.first_coil + self.coils
    }
}

/// One step of the trace: a coil and the segments it joins.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct TraceStep {
    /// Coil position number.
    pub coil: u32,
    /// Segment the coil starts from.
    pub from_segment: u32,
    /// Segment the coil ends at.
    pub to_segment: u32,
}

/// One closed winding: the order in which the trace visits coils and segments.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ClosedWinding {
    /// Steps in trace order; the last step ends where the first starts.
    pub steps: Vec<TraceStep>,
}

/// Brush polarity.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Polarity {
    /// Positive terminal.
    Positive,
    /// Negative terminal.
    Negative,
}

impl Polarity {
    /// "+" or "−" as ASCII.
    pub fn sign(self) -> &'static str {
        match self {
            Polarity::Positive => "+",
            Polarity::Negative => "-",
        }
    }
}

/// A brush set: the brushes at one place round the commutator, carried by one brush arm and
/// all of one polarity; one set by each of the first `brush_sets` poles.
///
/// The words, one meaning each: a *brush* is one carbon (its width, in segment pitches, is the
/// brush width); a *brush set* is the brushes at one place, which the report names B1…BP; a
/// *brush arm* (stud) carries one brush set, so the current per brush arm is the current per
/// set.
#[derive(Clone, Debug, PartialEq)]
pub struct BrushSet {
    /// 1…P; set k sits by the axis of pole k.
    pub index: u32,
    /// Polarity, from the EMF of the paths it collects.
    pub polarity: Polarity,
    /// Mechanical angle of the set's centre from the axis of pole 1, degrees, towards rising
    /// slot numbers: (k−1)·360/P + lead_offset·360/C.
    pub angle_deg: f64,
    /// Brush centre in segment numbers at the reference position (e.g. 1.5 = on the mica
    /// between segments 1 and 2).
    pub centre_segment: f64,
    /// The segment (or the two segments) under the set's centre at the reference position.
    pub under: Vec<u32>,
    /// Segments touched at the reference position by a brush [`Winding::brush_width`] wide.
    pub contacts: Vec<u32>,
    /// The brush width the trace uses, segment pitches.
    pub width_segments: f64,
}

/// The brush width the trace uses (`[commutator] brush_width_segments`, or `brush_width_mm`
/// with the commutator diameter; m segment pitches when neither is given).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BrushWidthUsed {
    /// Width, segment pitches.
    pub segments: f64,
    /// Whether the design gave it (false: the m-bar fallback).
    pub given: bool,
}

/// The brush position and the lead swing, as a shop measures them.
///
/// At `lead_offset = 0` the brushes sit on the pole axes, which is neutral for the slot's coil
/// group (see the `winding` module doc). "Lead swing" in shop words: stretch a cord through
/// the centre of slot 1; the bar (or mica) in line with it is where coil 1's start lead is
/// counted from [src: a winding manual's data-taking page, read in an extract; docs/domain.md,
/// "Lead swing"].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LeadSwing {
    /// Brush centre from the pole axis, bars (= `lead_offset`), towards rising slot numbers.
    pub from_pole_axis_bars: f64,
    /// The same, mechanical degrees.
    pub from_pole_axis_deg: f64,
    /// Segment position in line with slot 1's centre line (1.0 = the centre of segment 1,
    /// 1.5 = the mica between segments 1 and 2; fractional with dummy coils).
    pub in_line_segment: f64,
    /// That position rounded to the nearest half bar, in half bars from segment 1's centre
    /// (0…2C−1): even is a bar, odd a mica.
    pub in_line_half_bars: u32,
}

impl LeadSwing {
    /// The bar (`(bar, None)`) or mica (`(left, Some(right))`) in line with slot 1's centre
    /// line, to the nearest half bar, on `segments` bars.
    pub fn in_line(&self, segments: u32) -> (u32, Option<u32>) {
        let bar = self.in_line_half_bars / 2 + 1;
        if self.in_line_half_bars.is_multiple_of(2) {
            (bar, None)
        } else {
            (bar, Some(bar % segments + 1))
        }
    }

    /// Bars from the in-line position to bar 1 (coil 1's start lead), towards rising bar
    /// numbers when positive, in half bars, taken the short way round (−C < x ≤ C).
    pub fn swing_half_bars(&self, segments: u32) -> i64 {
        let c2 = 2 * i64::from(segments);
        let x = (-i64::from(self.in_line_half_bars)).rem_euclid(c2);
        if x > c2 / 2 { x - c2 } else { x }
    }
}

/// A parallel path: a run of coils between brush sets of opposite polarity.
#[derive(Clone, Debug, PartialEq)]
pub struct ParallelPath {
    /// 1…a, in the order found (by closed winding, then along the trace).
    pub index: u32,
    /// Brush the run leaves (at its first coil's start segment).
    pub from_brush: u32,
    /// Brush the run reaches (at its last coil's end segment).
    pub to_brush: u32,
    /// Coils in trace order.
    pub coils: Vec<u32>,
    /// Current sense in these coils at the drawn instant: +1 start→end, −1 end→start.
    pub current: i8,
    /// Net EMF of the path at the reference position, in conductor-EMF units.
    pub emf_units: i64,
}

/// Type-A equalizers.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Equalizers {
    /// Equalizer pitch 2C/P in segments.
    pub pitch: u32,
    /// How many distinct equalizers are possible (100 %): 2C/P.
    pub possible: u32,
    /// Each chosen equalizer's segments (p of them, pitch apart).
    pub groups: Vec<Vec<u32>>,
}

/// Whether equalizers can be fitted, and why not.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum EqualizerPlan {
    /// Wave windings need none.
    NotNeeded,
    /// Lap: possible; `chosen` lists the ones the design asked for (may be empty).
    Possible(Equalizers),
    /// Lap: impossible, with the reason in plain words.
    Impossible(String),
}

/// Simulated path balance: the rotor is turned through one period, lcm(u, m) segment pitches
/// (see [`crate::winding::balance_period_segments`]), in 8 steps a segment pitch, and the path
/// EMFs compared at each step (flat-topped field under the pole arcs).
#[derive(Clone, Debug, PartialEq)]
pub struct PathBalance {
    /// Rotor positions sampled.
    pub samples: u32,
    /// Mean over the samples of (largest − smallest path EMF), in coil EMFs.
    pub mean_spread_coils: f64,
    /// Largest such spread at any sample, in coil EMFs.
    pub peak_spread_coils: f64,
    /// True when the mean spread is within [`crate::winding::BALANCE_TOLERANCE`].
    pub balanced: bool,
}

/// Machine constants.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Constants {
    /// K = P·Z/(2π·a), per rad/s per Wb.
    pub machine_constant: f64,
    /// The share of the pole flux the coils link at most, 0 to 1 (1 unless the span falls
    /// short of the pole arc or reaches into the next poles); the constants below use it.
    pub flux_linkage: f64,
    /// K·Φ, V per rad/s (needs a flux).
    pub emf_constant_v_per_rad_s: Option<f64>,
    /// K·Φ·2π·1000/60, V per 1000 rpm (needs a flux).
    pub emf_v_per_1000_rpm: Option<f64>,
    /// K·Φ, N·m per A (needs a flux).
    pub torque_constant_nm_per_a: Option<f64>,
    /// E = K·Φ·ω at the given speed, V (needs a flux and a speed).
    pub emf_v: Option<f64>,
}

/// The traced winding.
#[derive(Clone, Debug, PartialEq)]
pub struct Winding {
    /// Coil positions N = u·S.
    pub coils: u32,
    /// Active coils C = segments.
    pub active_coils: u32,
    /// Dummy coil positions, ascending.
    pub dummy_coils: Vec<u32>,
    /// Whether the segment count was worked out (not given).
    pub segments_derived: bool,
    /// Active conductors Z = 2·C·turns, summed over the elements.
    pub conductors: u64,
    /// The pitches (of the first element: a frog-leg's lap element).
    pub pitches: Pitches,
    /// The winding elements on the commutator, in order: one for lap or wave, two for
    /// frog-leg (lap, then wave).
    pub elements: Vec<WindingElement>,
    /// One row per coil, element by element: coil positions 1…N of the first element, then
    /// N+1…2N of a frog-leg's wave element (coil N + k lies where coil k does, in the wave
    /// element's places).
    pub connections: Vec<Connection>,
    /// Closed windings found by the trace.
    pub closed_windings: Vec<ClosedWinding>,
    /// The brush sets fitted (`[commutator] brush_sets`, default P), at adjacent poles.
    pub brushes: Vec<BrushSet>,
    /// Fewest brush sets that work: lap P, wave 2.
    pub brush_sets_minimum: u32,
    /// The one brush width behind the contacts, the shorted coils, the sheet and the rating.
    pub brush_width: BrushWidthUsed,
    /// Parallel paths found by the trace at the reference position.
    pub paths: Vec<ParallelPath>,
    /// Coils shorted by a brush at the reference position (under commutation).
    pub shorted_coils: Vec<u32>,
    /// Current sense per coil position at the drawn instant: +1 start→end, −1, 0 (shorted or dummy).
    pub coil_current: Vec<i8>,
    /// Path index (1-based) per coil position, 0 when in no path.
    pub coil_path: Vec<u32>,
    /// EMF of each coil (index coil − 1) at the reference position, start→end sense, in
    /// conductor-EMF units of the flat-topped field (0 for a coil in the interpolar gap).
    pub coil_emf: Vec<i64>,
    /// Formula value of the parallel paths: lap m·P, wave 2m, frog-leg 2·m·P.
    pub paths_formula: u32,
    /// Formula value of the reentrancy: gcd(C, |y_c|), summed over the elements.
    pub reentrancy_formula: u32,
    /// Equalizers.
    pub equalizers: EqualizerPlan,
    /// Simulated path balance.
    pub balance: PathBalance,
    /// Angle of each pole axis, degrees (pole 1 is north).
    pub pole_axes_deg: Vec<f64>,
    /// Angle of segment 1's centre, degrees; segment s is at this + (s−1)·360/C.
    pub segment1_deg: f64,
    /// Where the brushes sit and which bar lines up with slot 1 (the lead swing).
    pub lead_swing: LeadSwing,
    /// Machine constants.
    pub constants: Constants,
}

impl Winding {
    /// Parallel paths a, as traced.
    pub fn parallel_paths(&self) -> u32 {
        self.paths.len() as u32
    }

    /// Reentrancy: the number of closed windings, as traced.
    pub fn reentrancy(&self) -> u32 {
        self.closed_windings.len() as u32
    }

    /// Whether the winding has more than one element (frog-leg).
    pub fn is_multi_element(&self) -> bool {
        self.elements.len() > 1
    }

    /// The element coil number `coil` belongs to.
    pub fn element_of(&self, coil: u32) -> &WindingElement {
        self.elements
            .iter()
            .find(|e| e.holds(coil))
            .unwrap_or(&self.elements[0])
    }

    /// Coil sides a slot holds in each layer when the design lays `u` coils a slot per
    /// element: u of each element (a frog-leg slot holds the wave element's beside the lap
    /// element's).
    pub fn sides_per_layer(&self, u: u32) -> u32 {
        u * self.elements.len() as u32
    }

    /// Where in its layer the side of `conn` at element place `position` (1…u) lies, counted
    /// across the whole slot (1…[`Self::sides_per_layer`]): the first element's sides take
    /// places 1…u, a frog-leg's wave element's the next u, beside them.
    pub fn place_in_slot(&self, conn: &Connection, position: u32, u: u32) -> u32 {
        let element = self
            .elements
            .iter()
            .position(|e| e.holds(conn.coil))
            .unwrap_or(0) as u32;
        element * u + position
    }

    /// Active coils over every element (C per element).
    pub fn active_coils_all(&self) -> u32 {
        self.active_coils * self.elements.len() as u32
    }

    /// Brush sets fitted (`[commutator] brush_sets`, default P).
    pub fn brush_sets(&self) -> u32 {
        self.brushes.len() as u32
    }

    /// Centre angle of segment `s` (1-based), degrees in [0, 360).
    pub fn segment_deg(&self, s: u32) -> f64 {
        let a = self.segment1_deg + f64::from(s - 1) * 360.0 / f64::from(self.active_coils);
        a.rem_euclid(360.0)
    }
}
