//! `render`: bytes for people and programs: the text report, JSON, CSV, SVG and PDF.
//!
//! Fifth stage of the pipeline. Renderers hold no winding logic: they format what the engine,
//! the checks and the layout resolved. Every number goes through [`number`].

pub mod json;
pub mod number;
pub mod report;
pub mod text;

pub use report::Report;
