//! The sheets' typeface and the text measurer: real advance widths from the embedded font.
//!
//! Part of the `layout` stage. DejaVu Sans (regular and bold) is compiled into the binary
//! (Bitstream Vera licence, see `assets/fonts/LICENSE-DejaVu.txt`), so every width that a
//! layout decision rests on (fitting, wrapping, anchoring) is the width the PDF draws, and a
//! machine with no fonts still lays out and writes the same pages. Widths are the sum of the
//! glyphs' horizontal advances (`hmtx`), without kerning; the PDF writer sets the glyphs at
//! exactly these advances.

use std::sync::OnceLock;

/// DejaVu Sans, the sheets' typeface.
pub const FONT_REGULAR: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");
/// DejaVu Sans Bold.
pub const FONT_BOLD: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans-Bold.ttf");

/// A face of the sheets' typeface.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Weight {
    /// DejaVu Sans.
    Regular,
    /// DejaVu Sans Bold.
    Bold,
}

impl Weight {
    /// The embedded font file of this face.
    pub fn font_data(self) -> &'static [u8] {
        match self {
            Weight::Regular => FONT_REGULAR,
            Weight::Bold => FONT_BOLD,
        }
    }

    fn face(self) -> &'static ttf_parser::Face<'static> {
        static REGULAR: OnceLock<ttf_parser::Face<'static>> = OnceLock::new();
        static BOLD: OnceLock<ttf_parser::Face<'static>> = OnceLock::new();
        let cell = match self {
            Weight::Regular => &REGULAR,
            Weight::Bold => &BOLD,
        };
        cell.get_or_init(|| {
            ttf_parser::Face::parse(self.font_data(), 0).expect("the embedded font parses")
        })
    }
}

/// One glyph as set: its id in the face and its advance in em.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SetGlyph {
    /// Glyph id (0, the missing glyph, for a character the face lacks).
    pub id: u16,
    /// Horizontal advance, em.
    pub advance: f64,
}

/// Characters below this are looked up once a face and kept (Latin, punctuation, arrows,
/// the mathematical operators and ⌈⌉): the texts of the sheets, measured many times over.
const KEPT: u32 = 0x2400;

/// The glyph of `c` in `face`.
fn look_up(face: &ttf_parser::Face<'_>, c: char) -> SetGlyph {
    let em = f64::from(face.units_per_em());
    let id = face.glyph_index(c).unwrap_or(ttf_parser::GlyphId(0));
    let advance = face.glyph_hor_advance(id).map_or(0.0, f64::from) / em;
    SetGlyph { id: id.0, advance }
}

/// The kept glyphs of `weight`, by character (see [`KEPT`]).
fn kept(weight: Weight) -> &'static [SetGlyph] {
    static REGULAR: OnceLock<Vec<SetGlyph>> = OnceLock::new();
    static BOLD: OnceLock<Vec<SetGlyph>> = OnceLock::new();
    let cell = match weight {
        Weight::Regular => &REGULAR,
        Weight::Bold => &BOLD,
    };
    cell.get_or_init(|| {
        let face = weight.face();
        (0..KEPT)
            .map(|u| char::from_u32(u).map_or(look_up(face, '\u{fffd}'), |c| look_up(face, c)))
            .collect()
    })
}

/// The glyphs of `text` in `weight`, one per character, in order.
pub fn glyphs(text: &str, weight: Weight) -> impl Iterator<Item = SetGlyph> + '_ {
    let face = weight.face();
    let table = kept(weight);
    text.chars().map(move |c| match table.get(c as usize) {
        Some(&g) => g,
        None => look_up(face, c),
    })
}

/// Advance width of `text` at `size` mm in `weight`, mm.
pub fn text_width(text: &str, size: f64, weight: Weight) -> f64 {
    glyphs(text, weight).map(|g| g.advance).sum::<f64>() * size
}

/// How far the ink of `text` at `size` mm in `weight` reaches above and below the baseline,
/// mm (both ≥ 0), from the glyphs' outline boxes in the embedded font; a text without ink
/// (spaces) reaches nowhere.
pub fn ink_extent(text: &str, size: f64, weight: Weight) -> (f64, f64) {
    let face = weight.face();
    let em = f64::from(face.units_per_em());
    let (mut up, mut down) = (0.0_f64, 0.0_f64);
    for c in text.chars() {
        let id = face.glyph_index(c).unwrap_or(ttf_parser::GlyphId(0));
        if let Some(b) = face.glyph_bounding_box(id) {
            up = up.max(f64::from(b.y_max) / em);
            down = down.max(-f64::from(b.y_min) / em);
        }
    }
    (up * size, down * size)
}

/// Breaks `text` into lines of at most `width` mm at `size` mm, at spaces (a single word
/// wider than the line stands alone on its line).
pub fn wrap_text(text: &str, size: f64, weight: Weight, width: f64) -> Vec<String> {
    let mut lines = Vec::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        let candidate = if line.is_empty() {
            word.to_string()
        } else {
            format!("{line} {word}")
        };
        if text_width(&candidate, size, weight) > width && !line.is_empty() {
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

/// The size, at most `size` and at least 80 % of it, at which `text` fits `width` mm.
pub fn fit_size(text: &str, size: f64, weight: Weight, width: f64) -> f64 {
    let w = text_width(text, size, weight);
    if w <= width {
        size
    } else {
        (size * width / w).max(size * 0.8)
    }
}

/// Slack of a fit, mm: far below print resolution, it absorbs the rounding of a size
/// computed to fit exactly.
const FIT_SLACK: f64 = 1e-6;

/// `text` cut to fit `width` mm at `size`, ending in an ellipsis when cut.
pub fn cut_to_width(text: &str, size: f64, weight: Weight, width: f64) -> String {
    let width = width + FIT_SLACK;
    if text_width(text, size, weight) <= width {
        return text.to_string();
    }
    let ellipsis = text_width("\u{2026}", size, weight);
    let mut used = 0.0;
    let mut out = String::new();
    for (c, g) in text.chars().zip(glyphs(text, weight)) {
        used += g.advance * size;
        if used + ellipsis > width {
            break;
        }
        out.push(c);
    }
    out.push('\u{2026}');
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn widths_come_from_the_font() {
        // DejaVu Sans: digits advance 1303/2048 em, the space 651/2048 em.
        let digit = 1303.0 / 2048.0;
        assert!((text_width("0123456789", 1.0, Weight::Regular) - 10.0 * digit).abs() < 1e-9);
        assert!((text_width(" ", 2.0, Weight::Regular) - 2.0 * 651.0 / 2048.0).abs() < 1e-9);
        // Bold is wider than regular.
        assert!(
            text_width("winding", 3.0, Weight::Bold) > text_width("winding", 3.0, Weight::Regular)
        );
        assert_eq!(text_width("", 3.0, Weight::Regular), 0.0);
    }

    #[test]
    fn wrapping_and_cutting_keep_within_the_width() {
        let text = "Verify this data against the original winding before cutting any coil.";
        let lines = wrap_text(text, 2.3, Weight::Regular, 40.0);
        assert!(lines.len() > 1);
        assert_eq!(lines.join(" "), text);
        for l in &lines {
            assert!(text_width(l, 2.3, Weight::Regular) <= 40.0, "{l}");
        }
        let cut = cut_to_width(text, 2.3, Weight::Bold, 30.0);
        assert!(cut.ends_with('\u{2026}'));
        assert!(text_width(&cut, 2.3, Weight::Bold) <= 30.0);
        assert_eq!(cut_to_width("ok", 2.3, Weight::Bold, 30.0), "ok");
        let s = fit_size(text, 3.0, Weight::Regular, 50.0);
        assert!((2.4..3.0).contains(&s));
    }
}
