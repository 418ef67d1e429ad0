//! The `[limits]`: one spec table, the one place a rating limit is written.
//!
//! Part of the `design` stage. Each [`LimitSpec`] row holds the design-file key, its default,
//! unit, what it measures, whether it is an upper or a lower bound, the severity of a failure,
//! the finding id and the rule's source. The `[limits]` reader (`tables/limits.rs`), the
//! resolved [`Limits`] values, the rating checks (`rating::limits`) and the rewritten design
//! file (`features::rewind::design_toml`) all read this table; nothing else lists the limits.
//!
//! A shop may move a limit to anywhere from 1/[`LIMIT_RANGE_FACTOR`] to
//! [`LIMIT_RANGE_FACTOR`] times its default ([`LimitSpec::accepted`]); the reader refuses any
//! other value with a located error naming the key and the range, so an absurd limit (a brush
//! arm current of 10^-7 A, say) never reaches the rating's arithmetic.
//!
//! To add a limit: add a [`LimitId`] variant and its row in [`LIMITS`] at the same index (a
//! compile-time assertion checks the order), a check in `rating::run_checks`, and the key to
//! the README's `[limits]` row and to `src/cli/starter.toml` (a test checks both).

use crate::base::Severity;

/// Whether the limit is an upper or a lower bound.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Bound {
    /// value ≤ limit.
    AtMost,
    /// value ≥ limit.
    AtLeast,
}

/// One limit by name; its discriminant indexes [`LIMITS`] and the values of [`Limits`].
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum LimitId {
    /// `segment_volts_avg_max`.
    SegmentVoltsAvgMax,
    /// `segment_volts_peak_max`.
    SegmentVoltsPeakMax,
    /// `path_current_max`.
    PathCurrentMax,
    /// `brush_arm_current_max`.
    BrushArmCurrentMax,
    /// `segment_pitch_min_mm`.
    SegmentPitchMin,
    /// `commutator_speed_preferred_m_s`.
    CommutatorSpeedPreferred,
    /// `commutator_speed_max_m_s`.
    CommutatorSpeedMax,
    /// `current_density_min_a_mm2`.
    CurrentDensityMin,
    /// `current_density_max_a_mm2`.
    CurrentDensityMax,
    /// `brush_width_min_segments`.
    BrushWidthMin,
    /// `brush_width_max_segments`.
    BrushWidthMax,
    /// `electric_loading_max_a_m`.
    ElectricLoadingMax,
    /// `reactance_volts_no_interpoles_max`.
    ReactanceVoltsNoInterpolesMax,
    /// `reactance_volts_max`.
    ReactanceVoltsMax,
    /// `slot_fill_max`.
    SlotFillMax,
}

/// How far a shop limit may move from its default, either way: a factor of 1000 keeps every
/// real shop's choice and refuses typing slips and absurd values.
pub const LIMIT_RANGE_FACTOR: f64 = 1000.0;

impl LimitSpec {
    /// The values `[limits]` accepts for this key, inclusive: the default divided and
    /// multiplied by `LIMIT_RANGE_FACTOR`.
    pub fn accepted(&self) -> (f64, f64) {
        (
            self.default / LIMIT_RANGE_FACTOR,
            self.default * LIMIT_RANGE_FACTOR,
        )
    }
}

impl LimitId {
    /// The spec row of this limit.
    pub const fn spec(self) -> &'static LimitSpec {
        &LIMITS[self as usize]
    }
}

/// One `[limits]` key and the rating rule that applies it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LimitSpec {
    /// Which limit this row is (its index in [`LIMITS`]).
    pub limit: LimitId,
    /// The `[limits]` key.
    pub key: &'static str,
    /// The default, in `unit`, used when `[limits]` leaves the key out.
    pub default: f64,
    /// Unit of value and limit.
    pub unit: &'static str,
    /// What is measured, lower-case.
    pub quantity: &'static str,
    /// Upper or lower bound.
    pub bound: Bound,
    /// Severity when the check fails.
    pub level: Severity,
    /// Finding id, `rating.…`, stable once released.
    pub id: &'static str,
    /// Decimals shown for the computed value.
    pub decimals: usize,
    /// Where the rule and its default come from.
    pub source: &'static str,
}

/// Every limit, in key order, which is also the order of the rating checks in a report.
pub const LIMITS: [LimitSpec; 15] = [
    LimitSpec {
        limit: LimitId::SegmentVoltsAvgMax,
        key: "segment_volts_avg_max",
        default: 15.0,
        unit: "V",
        quantity: "average voltage between adjacent segments E*P/C",
        bound: Bound::AtMost,
        level: Severity::Error,
        id: "rating.segment-volts-average",
        decimals: 2,
        source: "keep the average segment voltage within about 15 V [common practice]",
    },
    LimitSpec {
        limit: LimitId::SegmentVoltsPeakMax,
        key: "segment_volts_peak_max",
        default: 30.0,
        unit: "V",
        quantity: "estimated peak segment voltage (average / pole arc)",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.segment-volts-peak",
        decimals: 2,
        source: "peak about the average divided by the pole-arc ratio, within about 30 V [common practice; Sawhney, A Course in Electrical Machine Design, from memory]",
    },
    LimitSpec {
        limit: LimitId::PathCurrentMax,
        key: "path_current_max",
        default: 250.0,
        unit: "A",
        quantity: "current per parallel path I/a",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.path-current",
        decimals: 2,
        source: "about 200-250 A per path at most; above that use more paths [common practice]",
    },
    LimitSpec {
        limit: LimitId::BrushArmCurrentMax,
        key: "brush_arm_current_max",
        default: 400.0,
        unit: "A",
        quantity: "current per brush arm 2I/(brush sets)",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.brush-arm-current",
        decimals: 2,
        source: "at most about 400 A per brush arm [common practice]",
    },
    LimitSpec {
        limit: LimitId::SegmentPitchMin,
        key: "segment_pitch_min_mm",
        default: 4.0,
        unit: "mm",
        quantity: "segment pitch pi*D_c/C",
        bound: Bound::AtLeast,
        level: Severity::Error,
        id: "rating.segment-pitch",
        decimals: 2,
        source: "segment pitch at least 4 mm (3.2 mm copper + 0.8 mm mica) [common practice]",
    },
    LimitSpec {
        limit: LimitId::CommutatorSpeedPreferred,
        key: "commutator_speed_preferred_m_s",
        default: 15.0,
        unit: "m/s",
        quantity: "commutator peripheral speed",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.commutator-speed-preferred",
        decimals: 2,
        source: "commutator peripheral speed about 15 m/s preferred, 30 m/s at most [common practice]",
    },
    LimitSpec {
        limit: LimitId::CommutatorSpeedMax,
        key: "commutator_speed_max_m_s",
        default: 30.0,
        unit: "m/s",
        quantity: "commutator peripheral speed",
        bound: Bound::AtMost,
        level: Severity::Error,
        id: "rating.commutator-speed-max",
        decimals: 2,
        source: "commutator peripheral speed about 15 m/s preferred, 30 m/s at most [common practice]",
    },
    LimitSpec {
        limit: LimitId::CurrentDensityMin,
        key: "current_density_min_a_mm2",
        default: 4.5,
        unit: "A/mm2",
        quantity: "current density in the conductor",
        bound: Bound::AtLeast,
        level: Severity::Info,
        id: "rating.current-density-min",
        decimals: 2,
        source: "armature current density 4.5-7 A/mm2 [common practice, from memory]",
    },
    LimitSpec {
        limit: LimitId::CurrentDensityMax,
        key: "current_density_max_a_mm2",
        default: 7.0,
        unit: "A/mm2",
        quantity: "current density in the conductor",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.current-density-max",
        decimals: 2,
        source: "armature current density 4.5-7 A/mm2 [common practice, from memory]",
    },
    LimitSpec {
        limit: LimitId::BrushWidthMin,
        key: "brush_width_min_segments",
        default: 1.0,
        unit: "segment pitches",
        quantity: "brush width",
        bound: Bound::AtLeast,
        level: Severity::Warning,
        id: "rating.brush-width-min",
        decimals: 2,
        source: "brushes 1 to 3 segment pitches wide [common practice]",
    },
    LimitSpec {
        limit: LimitId::BrushWidthMax,
        key: "brush_width_max_segments",
        default: 3.0,
        unit: "segment pitches",
        quantity: "brush width",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.brush-width-max",
        decimals: 2,
        source: "brushes 1 to 3 segment pitches wide [common practice]",
    },
    LimitSpec {
        limit: LimitId::ElectricLoadingMax,
        key: "electric_loading_max_a_m",
        default: 40_000.0,
        unit: "A/m",
        quantity: "electric loading Z*I/(a*pi*D)",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.electric-loading",
        decimals: 0,
        source: "armature electric loading up to about 40 000 A/m [common practice, from memory]",
    },
    LimitSpec {
        limit: LimitId::ReactanceVoltsNoInterpolesMax,
        key: "reactance_volts_no_interpoles_max",
        default: 3.0,
        unit: "V",
        quantity: "average reactance voltage of the coil under commutation, against the limit without interpoles (above it interpoles are needed)",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.interpoles-needed",
        decimals: 2,
        source: "about 3 V without interpoles; specific-permeance method [common practice; Sawhney, A Course in Electrical Machine Design, from memory]",
    },
    LimitSpec {
        limit: LimitId::ReactanceVoltsMax,
        key: "reactance_volts_max",
        default: 6.0,
        unit: "V",
        quantity: "average reactance voltage of the coil under commutation, against the limit with interpoles",
        bound: Bound::AtMost,
        level: Severity::Warning,
        id: "rating.reactance-voltage",
        decimals: 2,
        source: "about 5-6 V with interpoles; specific-permeance method [common practice; Sawhney, A Course in Electrical Machine Design, from memory]",
    },
    LimitSpec {
        limit: LimitId::SlotFillMax,
        key: "slot_fill_max",
        default: 75.0,
        unit: "%",
        quantity: "slot fill: insulated conductors over the room inside liner, separator and wedge",
        bound: Bound::AtMost,
        level: Severity::Error,
        id: "rating.slot-fill",
        decimals: 1,
        source: "insulated conductor area at most about 75 % of the room inside the slot insulation for coils pressed in by hand [common practice, from memory]",
    },
];

// Row i of the table is the limit whose discriminant is i.
const _: () = {
    let mut i = 0;
    while i < LIMITS.len() {
        assert!(LIMITS[i].limit as usize == i, "LIMITS out of LimitId order");
        i += 1;
    }
};

/// The `[limits]` keys, in table order (for the unknown-key error).
pub const LIMIT_KEYS: [&str; 15] = {
    let mut keys = [""; 15];
    let mut i = 0;
    while i < LIMITS.len() {
        keys[i] = LIMITS[i].key;
        i += 1;
    }
    keys
};

/// The resolved `[limits]`: one value per [`LIMITS`] row, the default where the key is absent.
#[derive(Clone, Debug, PartialEq)]
pub struct Limits {
    values: [f64; 15],
}

impl Default for Limits {
    fn default() -> Self {
        Limits {
            values: LIMITS.map(|s| s.default),
        }
    }
}

impl Limits {
    /// The value of `limit`, in its spec's unit.
    pub fn get(&self, limit: LimitId) -> f64 {
        self.values[limit as usize]
    }

    /// Sets `limit` to `value` (in its spec's unit).
    pub fn set(&mut self, limit: LimitId, value: f64) {
        self.values[limit as usize] = value;
    }

    /// True when `limit` differs from its default (a shop override).
    pub fn is_overridden(&self, limit: LimitId) -> bool {
        self.get(limit) != limit.spec().default
    }

    /// The limits that differ from their defaults, in table order, with their values.
    pub fn overrides(&self) -> impl Iterator<Item = (&'static LimitSpec, f64)> + '_ {
        LIMITS
            .iter()
            .filter(|s| self.is_overridden(s.limit))
            .map(|s| (s, self.get(s.limit)))
    }
}
