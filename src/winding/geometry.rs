//! Exact angular bookkeeping in integer ticks, and the EMF of a coil at a rotor position.
//!
//! Part of the `winding` stage. One turn is T = 16·P·N·C ticks, so coil sides, pole axes,
//! segment centres, brush centres and the eight sampled rotor positions per segment pitch all
//! fall on whole ticks and no comparison depends on floating-point rounding.

use crate::design::{Design, Rotation};

/// Brush and segment positions are kept in units of 1/(16·P) of a segment pitch.
pub(crate) const SAMPLES_PER_SEGMENT: i64 = 8;

/// Tick arithmetic for one design.
pub(crate) struct Geometry {
    /// Ticks per turn.
    pub turn: i64,
    /// Ticks per coil position (T/N).
    pub per_coil: i64,
    /// Ticks across one coil span, element by element (coil numbers N·k + 1 … N·(k+1) are
    /// element k's).
    pub element_spans: Vec<i64>,
    /// Coil positions N of one element.
    pub positions: i64,
    /// Angle of pole 1's axis: the centre line of coil 1 at the reference position.
    pub pole1: i64,
    /// Ticks per pole pitch.
    pub pole_pitch: i64,
    /// Half the pole arc, ticks.
    pub half_arc: f64,
    /// Number of poles.
    pub poles: i64,
    /// Coils per slot.
    pub coils_per_slot: i64,
    /// +1 clockwise, −1 counter-clockwise.
    pub rotation: i64,
    /// Ticks the rotor turns between two sampled positions (1/8 segment pitch).
    pub sample_step: i64,
    /// Units of brush position per segment pitch (16·P).
    pub per_segment_units: i64,
}

impl Geometry {
    pub fn new(d: &Design, segments: u32) -> Geometry {
        let p = i64::from(d.poles);
        let n = i64::from(d.coil_positions());
        let c = i64::from(segments);
        let turn = 16 * p * n * c;
        let per_coil = turn / n;
        let span = i64::from(d.span) * i64::from(d.coils_per_slot) * per_coil;
        let pole_pitch = turn / p;
        Geometry {
            turn,
            per_coil,
            element_spans: d
                .elements()
                .iter()
                .map(|e| i64::from(e.span) * i64::from(d.coils_per_slot) * per_coil)
                .collect(),
            positions: n,
            pole1: span / 2,
            pole_pitch,
            half_arc: d.pole_arc * pole_pitch as f64 / 2.0,
            poles: p,
            coils_per_slot: i64::from(d.coils_per_slot),
            rotation: match d.rotation {
                Rotation::Clockwise => 1,
                Rotation::CounterClockwise => -1,
            },
            sample_step: turn / (SAMPLES_PER_SEGMENT * c),
            per_segment_units: 16 * p,
        }
    }

    /// Field under a conductor at `angle`: +1 within a north pole arc, −1 within a south
    /// pole arc, 0 in the interpolar gap (a flat-topped field).
    pub fn field(&self, angle: i64) -> i64 {
        let rel = (angle - self.pole1).rem_euclid(self.turn);
        let j = (rel + self.pole_pitch / 2) / self.pole_pitch;
        let dist = (rel - j * self.pole_pitch).abs();
        if (dist as f64) < self.half_arc {
            if (j % self.poles) % 2 == 0 { 1 } else { -1 }
        } else {
            0
        }
    }

    /// EMF of coil position `coil` (1-based), start→end sense, in conductor units, with the
    /// rotor turned `shift` ticks on from the reference position.
    ///
    /// A conductor moving clockwise (seen from the commutator end) under a north pole has its
    /// EMF directed away from the commutator (right-hand rule, e = v × B with the flux entering
    /// the armature under a north pole). The start→end sense runs up the top side and down the
    /// bottom side, so the coil EMF is e(top) − e(bottom). Both sides sit at their slot's centre:
    /// the u coils of a slot share its angle, so slot-level asymmetry shows in the simulation.
    ///
    /// Coil N·k + j of element k lies where coil j does, with element k's span.
    pub fn coil_emf(&self, coil: u32, shift: i64) -> i64 {
        let u = self.coils_per_slot;
        let (element, position) = (
            i64::from(coil - 1) / self.positions,
            i64::from(coil - 1) % self.positions,
        );
        let span = self.element_spans[element as usize];
        let top = (position / u) * u * self.per_coil + shift;
        self.rotation * (self.field(top) - self.field(top + span))
    }

    /// Converts ticks to degrees.
    pub fn degrees(&self, ticks: i64) -> f64 {
        ticks as f64 * 360.0 / self.turn as f64
    }
}
