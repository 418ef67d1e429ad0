//! `render`: bytes for people and programs: the text report, JSON, CSV, SVG and PDF.
//!
//! Stage 7 of the pipeline. Renderers hold no winding logic: they format what the engine,
//! the rating, the checks and the layout resolved, and word the rating's typed values
//! ([`rating_words`]). Every number goes through [`crate::base::number`].

pub mod csv;
pub mod json;
pub mod pdf;
pub mod rating_json;
pub mod rating_text;
pub mod rating_words;
pub mod report;
pub mod rewind_text;
pub mod sheet;
pub mod sheet_data;
pub mod svg;
pub mod svg_writer;
pub mod text;
