//! Insulation resistance (IR) test of the armature winding: the DC test voltage of the
//! megohmmeter, the minimum one-minute reading and the minimum polarization index.
//!
//! Part of the `rating` stage: pure arithmetic on the rated voltage and the thermal class. The
//! values follow IEEE 43 (recommended practice for testing insulation resistance of electric
//! machinery, 2013 edition), recalled [from memory]: verify them against the document. They
//! always defer to the applicable standard, local codes and licensed practice; the withstand
//! test that follows the IR test is [`super::test_voltage`] (IEC 60034-1).

use crate::design::ThermalClass;

/// Source line of the IR test voltage.
pub const IR_VOLTAGE_SOURCE: &str =
    "IEEE 43-2013, guidelines for DC voltages applied during the IR test [from memory]";
/// Source line of the minimum IR and polarization index.
pub const IR_MINIMUM_SOURCE: &str =
    "IEEE 43-2013, recommended minimum IR at 40 C and minimum PI by thermal class [from memory]";

/// The reading temperature the minimum refers to, °C (IEEE 43 corrects IR readings to 40 °C)
/// [from memory].
pub const REFERENCE_C: f64 = 40.0;
/// The rise over which IR roughly halves, °C: the simple correction to [`REFERENCE_C`] of the
/// 2000 edition (the 2013 edition gives separate curves for thermoplastic and thermosetting
/// insulation) [from memory].
pub const HALVING_STEP_C: f64 = 10.0;
/// Minimum one-minute IR at 40 °C for a DC armature, MΩ: 5 MΩ in the 2013 edition, which
/// lowered the armature value from 100 MΩ (the change is described in a trade association's
/// note on the 2013 edition) [from memory].
pub const MINIMUM_IR_MOHM: f64 = 5.0;
/// Above this one-minute IR, MΩ, the polarization index may not be meaningful and the winding
/// may be accepted on the IR alone [from memory].
pub const PI_WAIVED_ABOVE_MOHM: f64 = 5000.0;

/// The IR test of one winding.
#[derive(Clone, Debug, PartialEq)]
pub struct InsulationTest {
    /// Rated voltage U, V.
    pub rated_v: f64,
    /// DC test voltage of the megohmmeter, V: the lower end of the range for the rated voltage.
    pub test_v: f64,
    /// The upper end of the range, V, where the guideline gives a range (rated above 1000 V).
    pub test_v_max: Option<f64>,
    /// Minimum one-minute IR corrected to [`REFERENCE_C`], MΩ.
    pub minimum_ir_mohm: f64,
    /// Minimum polarization index IR(10 min)/IR(1 min).
    pub minimum_pi: f64,
    /// The thermal class the PI minimum was taken for; `None` when the design gives none (the
    /// stricter minimum applies).
    pub class: Option<ThermalClass>,
}

/// The DC test voltage range for rated voltage `u`, V: (low, high); high is `None` below
/// 1000 V, where one value is given [IEEE 43-2013, from memory].
pub fn ir_test_voltage(u: f64) -> (f64, Option<f64>) {
    // (rated voltage up to, test voltage low, high)
    const ROWS: [(f64, f64, f64); 4] = [
        (2500.0, 500.0, 1000.0),
        (5000.0, 1000.0, 2500.0),
        (12000.0, 2500.0, 5000.0),
        (f64::INFINITY, 5000.0, 10000.0),
    ];
    if u < 1000.0 {
        return (500.0, None);
    }
    let &(_, lo, hi) = ROWS
        .iter()
        .find(|r| u <= r.0)
        .unwrap_or(&ROWS[ROWS.len() - 1]);
    (lo, Some(hi))
}

/// Minimum polarization index for `class`: 1.5 for class A (105), 2.0 for B, F and H; class E
/// and an unknown class take the stricter 2.0 [IEEE 43-2013, from memory].
pub fn minimum_pi(class: Option<ThermalClass>) -> f64 {
    match class {
        Some(ThermalClass::A) => 1.5,
        _ => 2.0,
    }
}

/// The IR test for rated voltage `u` and the insulation's thermal `class`.
pub fn insulation_test(u: f64, class: Option<ThermalClass>) -> InsulationTest {
    let (test_v, test_v_max) = ir_test_voltage(u);
    InsulationTest {
        rated_v: u,
        test_v,
        test_v_max,
        minimum_ir_mohm: MINIMUM_IR_MOHM,
        minimum_pi: minimum_pi(class),
        class,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[track_caller]
    fn voltage(u: f64, expected: (f64, Option<f64>)) {
        assert_eq!(ir_test_voltage(u), expected, "rated {u} V");
    }

    #[test]
    fn test_voltage_follows_the_rated_voltage() {
        // IEEE 43-2013, guidelines for DC voltages applied during the IR test [from memory]:
        // < 1000 V: 500 V; 1000–2500 V: 500–1000 V; 2501–5000 V: 1000–2500 V;
        // 5001–12 000 V: 2500–5000 V; > 12 000 V: 5000–10 000 V.
        voltage(110.0, (500.0, None));
        voltage(760.0, (500.0, None));
        voltage(999.0, (500.0, None));
        voltage(1000.0, (500.0, Some(1000.0)));
        voltage(2500.0, (500.0, Some(1000.0)));
        voltage(2501.0, (1000.0, Some(2500.0)));
        voltage(5000.0, (1000.0, Some(2500.0)));
        voltage(6600.0, (2500.0, Some(5000.0)));
        voltage(13800.0, (5000.0, Some(10000.0)));
    }

    #[test]
    fn minimum_values_follow_the_class() {
        // IEEE 43-2013, minimum PI: class A 1.5; B, F, H 2.0 [from memory].
        assert_eq!(minimum_pi(Some(ThermalClass::A)), 1.5);
        for c in [ThermalClass::B, ThermalClass::F, ThermalClass::H] {
            assert_eq!(minimum_pi(Some(c)), 2.0);
        }
        assert_eq!(minimum_pi(None), 2.0);
        // IEEE 43-2013, minimum IR(1 min) at 40 C for DC armatures: 5 MOhm [from memory].
        let t = insulation_test(220.0, Some(ThermalClass::F));
        assert_eq!(
            (t.minimum_ir_mohm, t.minimum_pi, t.test_v),
            (5.0, 2.0, 500.0)
        );
    }
}
