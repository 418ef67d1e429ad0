//! The shop cautions every report and sheet carries, written once.
//!
//! Part of the `base` leaf: the text reports, the rewind report and the sheets all print this
//! list. Rewinding and testing machines can hurt people; the wording defers to the applicable
//! standard, local codes and licensed practice.

/// The shop caution carried by every report and sheet.
pub const CAUTIONS: [&str; 4] = [
    "Isolate, lock out and discharge the machine before work; armatures and field circuits can hold charge.",
    "Verify this data against the original winding (span, lead throw, bar of coil 1) before cutting any coil.",
    "Run insulation-resistance and high-voltage (withstand) tests per the applicable standard, e.g. IEC 60034-1.",
    "Local codes and licensed practice govern; this report is an aid, not a substitute for them.",
];

/// The cautions the armature test's report and plot carry: the first and last shop cautions
/// ([`CAUTIONS`]) with the two that belong to testing between them.
pub const TEST_CAUTIONS: [&str; 4] = [
    CAUTIONS[0],
    "Keep the test current low (about 10 A at most) and short: bars, risers and coils heat, and a poor contact can arc.",
    "Large armatures can hold a residual or induced voltage after a run or a high-voltage test: discharge them to earth before touching the bars.",
    CAUTIONS[3],
];
