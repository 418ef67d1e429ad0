//! Winding schemes for the same coils: any winding kind, any multiplicity — what the trade calls
//! "the connection" of an armature. Named [`Scheme`] so it is never confused with a row of the
//! connection table ([`crate::winding::Connection`]).
//!
//! Part of the `rating` stage. Used by the advice (more paths) and by the rewind.

use crate::design::{Design, WindingType, bounds};
use crate::theory::words::multiplicity_word;

/// One winding scheme for the armature's u·S coil positions: kind and multiplicity, with the
/// paths and segments they give.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Scheme {
    /// The winding kind.
    pub kind: WindingType,
    /// Multiplicity m.
    pub multiplicity: u32,
    /// Parallel paths, by the kind's formula.
    pub paths: u32,
    /// Segments C (active coils).
    pub segments: u32,
    /// Dummy coils u·S − C.
    pub dummies: u32,
    /// True when C equals the segments of the design's own commutator.
    pub keeps_commutator: bool,
}

/// Why the coils cannot be connected as asked; the numbers are fields, the words are in
/// [`std::fmt::Display`].
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ConnectError {
    /// The multiplicity is outside 1 to `max`.
    MultiplicityOutOfRange {
        /// The multiplicity asked for.
        multiplicity: u32,
        /// The largest one armsheet traces.
        max: u32,
    },
    /// The connection needs more poles than the armature has.
    TooFewPoles {
        /// The winding kind.
        kind: WindingType,
        /// The fewest poles it needs.
        min_poles: u32,
        /// The armature's poles.
        poles: u32,
    },
    /// No segment count up to the coil positions gives a whole commutator pitch.
    NoWholePitch {
        /// The coil positions u·S.
        coil_positions: u32,
    },
    /// Too few segments for the poles and the multiplicity.
    TooFewSegments {
        /// The segment count the connection would take.
        segments: u32,
        /// The armature's poles.
        poles: u32,
        /// The multiplicity asked for.
        multiplicity: u32,
        /// The fewest segments it needs, 2·m·P.
        min_segments: u32,
    },
}

impl std::fmt::Display for ConnectError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match *self {
            ConnectError::MultiplicityOutOfRange { multiplicity, max } => write!(
                f,
                "multiplicity {multiplicity} is out of range: expected 1 to {max}"
            ),
            ConnectError::TooFewPoles {
                kind,
                min_poles,
                poles,
            } => write!(
                f,
                "a {} winding needs at least {min_poles} poles; this armature has {poles}",
                kind.as_str()
            ),
            ConnectError::NoWholePitch { coil_positions } => write!(
                f,
                "no segment count up to {coil_positions} gives a whole commutator pitch"
            ),
            ConnectError::TooFewSegments {
                segments,
                poles,
                multiplicity,
                min_segments,
            } => write!(
                f,
                "{segments} segments is too few for {poles} poles and multiplicity {multiplicity} (needs at least {min_segments})"
            ),
        }
    }
}

/// The connection `kind`, `m` on the design's coils, or why it cannot be made.
///
/// The scheme keeps the design's segment count when the kind can wind it with the new
/// multiplicity; otherwise it takes the kind's own count (a lap every coil, a wave the largest
/// workable count, the fewest dummy coils).
pub fn connect(
    d: &Design,
    current_segments: u32,
    kind: WindingType,
    m: u32,
) -> Result<Scheme, ConnectError> {
    connect_with_coils(d, d.coils_per_slot, current_segments, kind, m)
}

/// [`connect`] on `u` coils per slot instead of the design's (the advice's "more segments"
/// asks what more coils would give).
pub fn connect_with_coils(
    d: &Design,
    u: u32,
    current_segments: u32,
    kind: WindingType,
    m: u32,
) -> Result<Scheme, ConnectError> {
    let n = u * d.slots;
    let p = d.pole_pairs();
    if !(1..=bounds::MAX_MULTIPLICITY as u32).contains(&m) {
        return Err(ConnectError::MultiplicityOutOfRange {
            multiplicity: m,
            max: bounds::MAX_MULTIPLICITY as u32,
        });
    }
    let rules = kind.kind();
    if d.poles < rules.min_poles() {
        return Err(ConnectError::TooFewPoles {
            kind,
            min_poles: rules.min_poles(),
            poles: d.poles,
        });
    }
    let segments = if rules.workable(current_segments, n, m, p, d.direction) {
        current_segments
    } else {
        rules
            .default_segments(n, m, p, d.direction)
            .ok_or(ConnectError::NoWholePitch { coil_positions: n })?
    };
    if segments < 2 * m * d.poles {
        return Err(ConnectError::TooFewSegments {
            segments,
            poles: d.poles,
            multiplicity: m,
            min_segments: 2 * m * d.poles,
        });
    }
    Ok(Scheme {
        kind,
        multiplicity: m,
        paths: rules.parallel_paths(m, d.poles),
        segments,
        dummies: n - segments,
        keeps_commutator: segments == current_segments,
    })
}

impl Scheme {
    /// "simplex lap (a = 4, C = 36)".
    pub fn label(&self) -> String {
        let word = multiplicity_word(self.multiplicity);
        let dummies = if self.dummies > 0 {
            format!(
                ", {}",
                crate::base::number::counted(self.dummies, "dummy coil", "dummy coils")
            )
        } else {
            String::new()
        };
        format!(
            "{word} {} (a = {}, C = {}{dummies})",
            self.kind.as_str(),
            self.paths,
            self.segments
        )
    }
}
