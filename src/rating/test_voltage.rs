//! Withstand (high-voltage) test voltage for the armature winding.
//!
//! Part of the `rating` stage: pure arithmetic. The values follow IEC 60034-1, Table 16 (test
//! voltages, 1 min) [src: IEC 60034-1, read in an extract]. They always defer to the applicable
//! standard, local codes and licensed practice.

/// The caution printed beside every test voltage.
pub const TEST_VOLTAGE_CAUTION: &str = "test voltages are for guidance: the applicable standard (e.g. IEC 60034-1), local codes and licensed practice govern; isolate, lock out and discharge before and after testing";

/// Source line for the test voltages.
pub const TEST_VOLTAGE_SOURCE: &str =
    "IEC 60034-1, Table 16, withstand test 1 min [standard, read in an extract]";

/// Which row of the table applied to the new winding.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TestRule {
    /// Machines under 1 kW and under 100 V: 500 V + 2U.
    Small,
    /// Other machines under 10 MW: 1000 V + 2U, at least 1500 V.
    General,
    /// As `General`, where the 1500 V minimum set the value.
    GeneralMinimum,
}

/// Test voltages for one rated voltage.
#[derive(Clone, Debug, PartialEq)]
pub struct TestVoltage {
    /// Rated voltage U, V.
    pub rated_v: f64,
    /// Rated power used to pick the row, W (U·I; `None` without a current).
    pub power_w: Option<f64>,
    /// The row used for the new winding.
    pub rule: TestRule,
    /// New or fully rewound winding, V.
    pub new_v: f64,
    /// Overhauled machine after cleaning and drying: 1.5·U, at least `overhauled_minimum_v`.
    pub overhauled_v: f64,
    /// The floor of the overhauled value: 1000 V when U ≥ 100 V, else 500 V.
    pub overhauled_minimum_v: f64,
    /// Partly rewound: 75 % of the new value [from memory].
    pub partial_v: f64,
}

/// Test voltages for rated voltage `u` and, when known, the rated power `power_w`.
///
/// The small-machine row needs both U < 100 V and a power under 1 kW; without a power the
/// general row, the stricter one, applies. U·I is used as the power: for a motor it is the
/// input, at least the output, so the small row is never chosen wrongly.
pub fn test_voltages(u: f64, power_w: Option<f64>) -> TestVoltage {
    let small = u < 100.0 && power_w.is_some_and(|p| p < 1000.0);
    let (rule, new_v) = if small {
        (TestRule::Small, 500.0 + 2.0 * u)
    } else {
        let v = 1000.0 + 2.0 * u;
        if v < 1500.0 {
            (TestRule::GeneralMinimum, 1500.0)
        } else {
            (TestRule::General, v)
        }
    };
    let overhauled_minimum_v = if u >= 100.0 { 1000.0 } else { 500.0 };
    let overhauled_v = (1.5 * u).max(overhauled_minimum_v);
    TestVoltage {
        rated_v: u,
        power_w,
        rule,
        new_v,
        overhauled_v,
        overhauled_minimum_v,
        partial_v: 0.75 * new_v,
    }
}
