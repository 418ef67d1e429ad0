//! The shop cautions every report and sheet carries.
//!
//! Part of the `render` stage. The list is written once, in the `layout` stage (the sheets
//! lay it out); the text reports take it from here.

pub use crate::layout::sheet::caution::CAUTIONS;
