//! `render`: bytes for people and programs: the text report, JSON, CSV, SVG and PDF.
//!
//! Stage 7 of the pipeline. Renderers hold no winding logic: they format what the engine,
//! the rating, the checks and the layout resolved, and word the rating's typed values
//! ([`rating_words`]). Every number goes through the one number writer (`base::number`;
//! coordinates with [`svg_writer::MM_DECIMALS`]).
//!
//! The drawings are laid out by `layout` into a page tree (`layout::tree::Page`); the
//! drawing renderers only walk that tree: [`svg`] writes each node as one element and the
//! style table as the style sheet, [`pdf`] draws the same nodes with krilla, resolving
//! their classes through the same style table. Neither measures, fits, wraps or places
//! anything: a new drawing or a change of looks belongs in `layout`, not here.

pub mod archive;
pub mod armature_test;
pub mod coil_json;
pub mod coil_text;
pub mod csv;
pub mod explore;
pub mod identify;
pub mod json;
pub mod pdf;
pub mod rating_json;
pub mod rating_text;
pub mod rating_words;
pub mod rewind_text;
pub mod svg;
pub mod svg_writer;
pub mod text;
