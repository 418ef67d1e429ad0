//! Pitch arithmetic: commutator, back, front and resultant pitches, and the wave coil count.
//!
//! Part of the `winding` stage; pure integer arithmetic, also used by `design` validation.

use crate::design::{Direction, WindingType};

use super::Pitches;

/// Greatest common divisor.
pub fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 { a } else { gcd(b, a % b) }
}

/// Largest C ≤ `positions` with (C ± m)/p whole for `direction`, i.e. the fewest dummy coils.
///
/// [src: textbook treatment of dummy coils in wave windings, e.g. Theraja, *Electrical
/// Technology* vol. 2, ch. 26 — from memory as to chapter.]
pub fn wave_active_coils(positions: u32, m: u32, p: u32, direction: Direction) -> Option<u32> {
    let (n, m, p) = (i64::from(positions), i64::from(m), i64::from(p));
    let s = direction.sign();
    (2..=n)
        .rev()
        .find(|c| (c + s * m).rem_euclid(p) == 0)
        .map(|c| c as u32)
}

/// Signed commutator pitch y_c in segments.
///
/// Lap: ±m. Wave: (C ± m)/p with + progressive (always positive).
/// [src: standard textbook relations; DOMAIN.md "Lap windings", "Wave windings".]
pub fn commutator_pitch(kind: WindingType, dir: Direction, c: u32, m: u32, p: u32) -> i64 {
    let (c, m, p) = (i64::from(c), i64::from(m), i64::from(p));
    match kind {
        WindingType::Lap => dir.sign() * m,
        WindingType::Wave => (c + dir.sign() * m) / p,
    }
}

/// All pitches for a winding with `u` coils per slot and span `span` slots.
///
/// Back pitch y_b = 2u·y_s + 1 (top sides odd, bottom sides even). Lap: y_f = y_b − 2·y_c
/// (= y_b ∓ 2m). Wave: y_f = 2·y_c − y_b. Resultant 2·y_c.
pub fn pitches(kind: WindingType, span: u32, u: u32, yc: i64) -> Pitches {
    let back = 2 * i64::from(u) * i64::from(span) + 1;
    let front = match kind {
        WindingType::Lap => back - 2 * yc,
        WindingType::Wave => 2 * yc - back,
    };
    Pitches {
        span,
        back,
        front,
        resultant: 2 * yc,
        commutator: yc,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::design::Direction::*;
    use crate::design::WindingType::*;

    #[test]
    fn gcd_cases() {
        assert_eq!(gcd(12, 18), 6);
        assert_eq!(gcd(35, 12), 1);
        assert_eq!(gcd(7, 0), 7);
    }

    #[test]
    fn wave_coil_count_takes_fewest_dummies() {
        // 36 positions, 6 poles: (36+1)/3 is not whole, (35+1)/3 = 12 is.
        assert_eq!(wave_active_coils(36, 1, 3, Progressive), Some(35));
        // Retrogressive: (37−1)/3 would need 37; (34−1)/3 = 11 is the first at or below 36.
        assert_eq!(wave_active_coils(36, 1, 3, Retrogressive), Some(34));
        // No dummy needed.
        assert_eq!(wave_active_coils(25, 1, 2, Progressive), Some(25));
    }

    #[test]
    fn lap_pitches() {
        // Simplex progressive lap, u = 1, span 3: y_b = 7, y_f = 5.
        let p = pitches(Lap, 3, 1, commutator_pitch(Lap, Progressive, 6, 1, 1));
        assert_eq!((p.back, p.front, p.commutator, p.resultant), (7, 5, 1, 2));
        // Retrogressive: y_f = y_b + 2.
        let p = pitches(Lap, 3, 1, commutator_pitch(Lap, Retrogressive, 6, 1, 1));
        assert_eq!((p.back, p.front, p.commutator), (7, 9, -1));
    }

    #[test]
    fn wave_pitches() {
        let yc = commutator_pitch(Wave, Progressive, 35, 1, 3);
        let p = pitches(Wave, 6, 1, yc);
        assert_eq!((p.back, p.front, p.commutator), (13, 11, 12));
    }
}
