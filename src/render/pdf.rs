//! `sheets.pdf`: every sheet, in order, one page each, at true size.
//!
//! Part of the `render` stage. Each SVG sheet is parsed by usvg, turned into a PDF form
//! XObject by svg2pdf and placed on its own page with pdf-writer; the page is the SVG's size
//! (mm → pt at 72/25.4). Text is drawn as glyph outlines of DejaVu Sans, which is compiled into
//! the binary (Bitstream Vera licence, see `tests/fixtures/fonts/LICENSE-DejaVu.txt`) so that a
//! machine with no fonts still writes a complete PDF. No date or clock goes into the file.

use std::collections::BTreeMap;
use std::fmt;
use std::sync::Arc;

use pdf_writer::{Content, Finish, Name, Pdf, Rect, Ref, TextStr};
use svg2pdf::usvg;

/// DejaVu Sans, the sheets' typeface.
pub const FONT_REGULAR: &[u8] = include_bytes!("../../tests/fixtures/fonts/DejaVuSans.ttf");
/// DejaVu Sans Bold.
pub const FONT_BOLD: &[u8] = include_bytes!("../../tests/fixtures/fonts/DejaVuSans-Bold.ttf");

/// A sheet that could not be turned into PDF.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PdfError {
    /// Sheet number, 1-based.
    pub sheet: usize,
    /// What went wrong.
    pub message: String,
}

impl fmt::Display for PdfError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "sheet {}: {}", self.sheet, self.message)
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
    let mut alloc = Ref::new(1);
    let catalog_id = alloc.bump();
    let tree_id = alloc.bump();
    let mut pdf = Pdf::new();
    let mut page_ids = Vec::with_capacity(svgs.len());
    for (i, svg) in svgs.iter().enumerate() {
        let err = |message: String| PdfError {
            sheet: i + 1,
            message,
        };
        let tree = usvg::Tree::from_str(svg, &opt).map_err(|e| err(e.to_string()))?;
        // Text goes in as outlines: svg2pdf keeps its fonts and resource names in hash maps,
        // and with embedded fonts (or any opacity, which the sheets never use) the object
        // order would change from run to run. Outlines keep the file byte-identical.
        let options = svg2pdf::ConversionOptions {
            embed_text: false,
            ..Default::default()
        };
        let (chunk, svg_ref) = svg2pdf::to_chunk(&tree, options).map_err(|e| err(e.to_string()))?;
        let mut map = BTreeMap::new();
        let chunk = chunk.renumber(|old| *map.entry(old).or_insert_with(|| alloc.bump()));
        let svg_id = *map
            .get(&svg_ref)
            .ok_or_else(|| err("the converted sheet has no root object".into()))?;
        let page_id = alloc.bump();
        let content_id = alloc.bump();
        // usvg sizes are CSS px (96 per inch); PDF points are 72 per inch.
        let (w, h) = (tree.size().width() * 0.75, tree.size().height() * 0.75);
        let mut page = pdf.page(page_id);
        page.media_box(Rect::new(0.0, 0.0, w, h));
        page.parent(tree_id);
        page.contents(content_id);
        page.resources().x_objects().pair(Name(b"S1"), svg_id);
        page.finish();
        let mut content = Content::new();
        content
            .transform([w, 0.0, 0.0, h, 0.0, 0.0])
            .x_object(Name(b"S1"));
        pdf.stream(content_id, &content.finish());
        pdf.extend(&chunk);
        page_ids.push(page_id);
    }
    pdf.catalog(catalog_id).pages(tree_id);
    pdf.pages(tree_id)
        .kids(page_ids.iter().copied())
        .count(page_ids.len() as i32);
    pdf.document_info(alloc.bump())
        .producer(TextStr("armsheet"));
    Ok(pdf.finish())
}
