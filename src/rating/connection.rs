//! Alternative connections of the same coils: lap or wave, any multiplicity.
//!
//! Part of the `rating` stage. Used by the advice (more paths) and by the rewind.

use crate::design::{Design, WindingType, bounds};
use crate::theory::words::multiplicity_word;

/// One way of connecting the armature's u·S coil positions.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Connection {
    /// Lap or wave.
    pub kind: WindingType,
    /// Multiplicity m.
    pub multiplicity: u32,
    /// Parallel paths: lap m·P, wave 2m.
    pub paths: u32,
    /// Segments C (active coils).
    pub segments: u32,
    /// Dummy coils u·S − C.
    pub dummies: u32,
    /// True when C equals the segments of the design's own commutator.
    pub keeps_commutator: bool,
}

/// The connection `kind`, `m` on the design's coils, or why it cannot be made.
///
/// A wave keeps the design's segment count when that count works for the new multiplicity;
/// otherwise it takes the largest workable count (fewest dummy coils). A lap uses every coil.
pub fn connect(
    d: &Design,
    current_segments: u32,
    kind: WindingType,
    m: u32,
) -> Result<Connection, String> {
    let n = d.coil_positions();
    let p = d.pole_pairs();
    if !(1..=bounds::MAX_MULTIPLICITY as u32).contains(&m) {
        return Err(format!(
            "multiplicity {m} is out of range: expected 1 to {}",
            bounds::MAX_MULTIPLICITY
        ));
    }
    let rules = kind.kind();
    if d.poles < rules.min_poles() {
        return Err(format!(
            "a {} winding needs at least {} poles; this armature has {}",
            rules.word(),
            rules.min_poles(),
            d.poles
        ));
    }
    let segments = if rules.workable(current_segments, n, m, p, d.direction) {
        current_segments
    } else {
        rules
            .default_segments(n, m, p, d.direction)
            .ok_or_else(|| format!("no segment count up to {n} gives a whole commutator pitch"))?
    };
    if segments < 2 * m * d.poles {
        return Err(format!(
            "{segments} segments is too few for {} poles and multiplicity {m} (needs at least {})",
            d.poles,
            2 * m * d.poles
        ));
    }
    Ok(Connection {
        kind,
        multiplicity: m,
        paths: rules.parallel_paths(m, d.poles),
        segments,
        dummies: n - segments,
        keeps_commutator: segments == current_segments,
    })
}

impl Connection {
    /// "simplex lap (a = 4, C = 36)".
    pub fn label(&self) -> String {
        let word = multiplicity_word(self.multiplicity);
        let dummies = if self.dummies > 0 {
            format!(", {} dummy", self.dummies)
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
