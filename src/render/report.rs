//! The shop cautions every report and sheet carries.
//!
//! Part of the `render` stage.

/// The shop caution carried by every report and sheet.
pub const CAUTIONS: [&str; 4] = [
    "Isolate, lock out and discharge the machine before work; armatures and field circuits can hold charge.",
    "Verify this data against the original winding (span, lead throw, bar of coil 1) before cutting any coil.",
    "Run insulation-resistance and high-voltage (withstand) tests per the applicable standard, e.g. IEC 60034-1.",
    "Local codes and licensed practice govern; this report is an aid, not a substitute for them.",
];
