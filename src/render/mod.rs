//! `render`: bytes for people and programs: the text report, JSON, CSV, SVG and PDF.
//!
//! Fifth stage of the pipeline. Renderers hold no winding logic: they format what the engine,
//! the checks and the layout resolved. Every number goes through [`number`].

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
