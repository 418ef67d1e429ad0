//! Pitch arithmetic: back, front, resultant and commutator pitches, and the reentrancy formula.
//!
//! Part of the `theory` stage; pure integer arithmetic, used by `design` validation, the
//! engine, the checks and the rating.

use super::kind::WindingType;

/// Greatest common divisor.
pub fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 { a } else { gcd(b, a % b) }
}

/// The pitches, in coil-side units of the textbook numbering unless said otherwise.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Pitches {
    /// Coil span in slots (y_s); shop form "1–(1+y_s)".
    pub span: u32,
    /// Back pitch y_b = 2u·y_s + 1.
    pub back: i64,
    /// Front pitch y_f: lap y_b ∓ 2m, wave 2y_c − y_b.
    pub front: i64,
    /// Resultant pitch: top side to the next top side in the trace, 2·y_c.
    pub resultant: i64,
    /// Commutator pitch y_c in segments, signed: + towards rising segment numbers.
    /// Lap ±m; wave (C ± m)/p, which is positive for both directions.
    pub commutator: i64,
}

/// All pitches for a winding with `u` coils per slot and span `span` slots.
///
/// Back pitch y_b = 2u·y_s + 1 (top sides odd, bottom sides even). Lap: y_f = y_b − 2·y_c
/// (= y_b ∓ 2m). Wave: y_f = 2·y_c − y_b. Resultant 2·y_c.
pub fn pitches(kind: WindingType, span: u32, u: u32, yc: i64) -> Pitches {
    let back = 2 * i64::from(u) * i64::from(span) + 1;
    Pitches {
        span,
        back,
        front: kind.kind().front_pitch(back, yc),
        resultant: 2 * yc,
        commutator: yc,
    }
}

/// Reentrancy by the formula: gcd(C, |y_c|) closed windings.
pub fn reentrancy(c: u32, yc: i64) -> u32 {
    gcd(u64::from(c), yc.unsigned_abs()) as u32
}

/// A coil span against the poles: its sides' distance in pole pitches and in electrical degrees.
///
/// A coil works only when its two sides lie under poles of opposite polarity: with the coil
/// centred on the interpolar axis, where it makes its EMF, each side must lie in the middle half
/// of a pole, within a quarter pole pitch of that pole's axis, so |y/2 − 1/2| ≤ 1/4 pole pitch:
/// the sides are half to one and a half pole pitches apart (90° to 270° electrical, a pitch
/// factor of at least sin 45°), modulo two pole pitches [derived; docs/domain.md, "Coil span
/// limits"].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SpanAngle {
    /// The sides' distance in pole pitches, y·P/S.
    pub pole_pitches: f64,
    /// The electrical angle between the sides, 0 to 360.
    pub electrical_deg: f64,
}

impl SpanAngle {
    /// The angle of a coil whose sides lie `span` slots apart on `slots` slots and `poles` poles.
    pub fn new(span: u32, slots: u32, poles: u32) -> Self {
        let pole_pitches = f64::from(span) * f64::from(poles) / f64::from(slots);
        Self {
            pole_pitches,
            electrical_deg: (pole_pitches * 180.0).rem_euclid(360.0),
        }
    }

    /// Whether the sides lie under poles of opposite polarity (90° to 270° electrical).
    pub fn opposite_poles(&self) -> bool {
        (90.0 - 1e-9..=270.0 + 1e-9).contains(&self.electrical_deg)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::theory::kind::{Direction::*, Lap, Wave, WindingKind};

    #[test]
    fn gcd_cases() {
        assert_eq!(gcd(12, 18), 6);
        assert_eq!(gcd(35, 12), 1);
        assert_eq!(gcd(7, 0), 7);
        assert_eq!(reentrancy(36, -2), 2);
    }

    #[test]
    fn lap_pitches() {
        // Simplex progressive lap, u = 1, span 3: y_b = 7, y_f = 5.
        let p = pitches(
            WindingType::Lap,
            3,
            1,
            Lap.commutator_pitch(6, 1, 1, Progressive),
        );
        assert_eq!((p.back, p.front, p.commutator, p.resultant), (7, 5, 1, 2));
        // Retrogressive: y_f = y_b + 2.
        let p = pitches(
            WindingType::Lap,
            3,
            1,
            Lap.commutator_pitch(6, 1, 1, Retrogressive),
        );
        assert_eq!((p.back, p.front, p.commutator), (7, 9, -1));
    }

    #[test]
    fn wave_pitches() {
        let yc = Wave.commutator_pitch(35, 1, 3, Progressive);
        let p = pitches(WindingType::Wave, 6, 1, yc);
        assert_eq!((p.back, p.front, p.commutator), (13, 11, 12));
    }
}
