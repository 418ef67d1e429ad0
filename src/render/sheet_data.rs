//! The winding-data rows and the winding sequence now live in the `layout` stage
//! ([`crate::layout::sheet::rows`]); this module re-exports them for the CSV writer.
//!
//! Part of the `render` stage.

pub use crate::layout::sheet::rows::{sequence_labels, signed, winding_data_rows};
