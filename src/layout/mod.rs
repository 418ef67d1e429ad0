//! `layout`: design and winding into drawing geometry, in millimetres, with no SVG strings.
//!
//! Fourth stage of the pipeline, between the pure engine and the renderers. [`developed`]
//! unrolls the armature into a developed winding diagram; [`sheet`] places the frame, title
//! block, blocks and paginated tables on a [`paper::Paper`]. Everything here is deterministic
//! arithmetic on the engine's angles: no fonts are measured, text widths are estimated.

pub mod developed;
pub mod paper;
pub mod sheet;

pub use developed::{Diagram, DiagramOptions, Window, layout_developed};
pub use paper::Paper;

/// Estimated advance width of `text` at `size` mm in DejaVu Sans (about 0.57 em a character on
/// average for digits and lower case; generous so that text never overruns its box).
pub fn text_width(text: &str, size: f64) -> f64 {
    text.chars().count() as f64 * size * 0.57
}

/// Breaks `text` into lines of at most `width` mm at `size` mm, at spaces.
pub fn wrap_text(text: &str, size: f64, width: f64) -> Vec<String> {
    let mut lines = Vec::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        let candidate = if line.is_empty() {
            word.to_string()
        } else {
            format!("{line} {word}")
        };
        if text_width(&candidate, size) > width && !line.is_empty() {
            lines.push(std::mem::take(&mut line));
            line = word.to_string();
        } else {
            line = candidate;
        }
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
}
