//! `sheets.pdf`: every sheet, in order, one page each, at true size.
//!
//! Part of the `render` stage. Each SVG sheet is parsed by usvg and drawn by krilla-svg onto
//! its own page of one krilla document; the page is the SVG's size (mm → pt at 72/25.4).
//! Text stays text: the glyphs are set in DejaVu Sans, embedded as a subset with a ToUnicode
//! map, so the words can be selected and searched. The fonts are compiled into the binary
//! (Bitstream Vera licence, see `tests/fixtures/fonts/LICENSE-DejaVu.txt`) so that a machine
//! with no fonts still writes a complete PDF. No date or clock goes into the file: krilla
//! derives the document id from a hash of the bytes, so the same sheets give the same file.

use std::fmt;
use std::sync::Arc;

use krilla::Document;
use krilla::geom::Size;
use krilla::metadata::Metadata;
use krilla::page::PageSettings;
use krilla_svg::{SurfaceExt, SvgSettings};

/// DejaVu Sans, the sheets' typeface.
pub const FONT_REGULAR: &[u8] = include_bytes!("../../tests/fixtures/fonts/DejaVuSans.ttf");
/// DejaVu Sans Bold.
pub const FONT_BOLD: &[u8] = include_bytes!("../../tests/fixtures/fonts/DejaVuSans-Bold.ttf");

/// A sheet that could not be turned into PDF.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PdfError {
    /// Sheet number, 1-based; 0 when the document as a whole could not be written.
    pub sheet: usize,
    /// What went wrong.
    pub message: String,
}

impl fmt::Display for PdfError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.sheet == 0 {
            write!(f, "{}", self.message)
        } else {
            write!(f, "sheet {}: {}", self.sheet, self.message)
        }
    }
}

/// A font database holding only DejaVu Sans (regular and bold), with every generic family
/// mapped to it, so that rendering does not depend on the fonts of the machine.
pub fn sheet_fonts() -> usvg::fontdb::Database {
    let mut db = usvg::fontdb::Database::new();
    db.load_font_data(FONT_REGULAR.to_vec());
    db.load_font_data(FONT_BOLD.to_vec());
    db.set_sans_serif_family("DejaVu Sans");
    db.set_serif_family("DejaVu Sans");
    db.set_monospace_family("DejaVu Sans");
    db.set_cursive_family("DejaVu Sans");
    db.set_fantasy_family("DejaVu Sans");
    db
}

/// usvg options with [`sheet_fonts`].
pub fn sheet_usvg_options() -> usvg::Options<'static> {
    usvg::Options {
        font_family: "DejaVu Sans".to_string(),
        fontdb: Arc::new(sheet_fonts()),
        ..usvg::Options::default()
    }
}

/// Builds one PDF with a page per SVG, in order.
pub fn sheets_pdf(svgs: &[String]) -> Result<Vec<u8>, PdfError> {
    let opt = sheet_usvg_options();
    let mut document = Document::new();
    for (i, svg) in svgs.iter().enumerate() {
        let err = |message: String| PdfError {
            sheet: i + 1,
            message,
        };
        let tree = usvg::Tree::from_str(svg, &opt).map_err(|e| err(e.to_string()))?;
        // usvg sizes are CSS px (96 per inch); PDF points are 72 per inch.
        let (w, h) = (tree.size().width() * 0.75, tree.size().height() * 0.75);
        let size = Size::from_wh(w, h).ok_or_else(|| err(format!("page size {w} × {h} pt")))?;
        let mut page = document.start_page_with(PageSettings::new(size));
        let mut surface = page.surface();
        let settings = SvgSettings {
            embed_text: true,
            ..SvgSettings::default()
        };
        surface
            .draw_svg(&tree, size, settings)
            .ok_or_else(|| err("the sheet cannot be drawn".into()))?;
        surface.finish();
        page.finish();
    }
    document.set_metadata(Metadata::new().producer("armsheet".into()));
    document.finish().map_err(|e| PdfError {
        sheet: 0,
        message: e.to_string(),
    })
}
