//! `Report`: everything a renderer needs about one checked design, borrowed.

use crate::checks::Finding;
use crate::design::Design;
use crate::winding::Winding;

/// One checked design, ready to render.
#[derive(Clone, Copy, Debug)]
pub struct Report<'a> {
    /// The resolved design.
    pub design: &'a Design,
    /// The traced winding.
    pub winding: &'a Winding,
    /// Rule findings, in check order.
    pub findings: &'a [Finding],
}

/// The shop caution carried by every report and sheet.
pub const CAUTIONS: [&str; 4] = [
    "Isolate, lock out and discharge the machine before work; armatures and field circuits can hold charge.",
    "Verify this data against the original winding (span, lead throw, bar of coil 1) before cutting any coil.",
    "Run insulation-resistance and high-voltage (withstand) tests per the applicable standard, e.g. IEC 60034-1.",
    "Local codes and licensed practice govern; this report is an aid, not a substitute for them.",
];

/// "simplex", "duplex", … for a multiplicity.
pub fn multiplicity_word(m: u32) -> String {
    match m {
        1 => "simplex".into(),
        2 => "duplex".into(),
        3 => "triplex".into(),
        4 => "quadruplex".into(),
        n => format!("{n}-plex"),
    }
}

/// The span in shop form, "1-8" for a span of 7 slots.
pub fn span_shop(span: u32) -> String {
    format!("1-{}", span + 1)
}
