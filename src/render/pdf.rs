//! `sheets.pdf`: every sheet, in order, one page each, at true size, drawn straight from the
//! page tree with krilla.
//!
//! Part of the `render` stage: a plain walk, like the SVG writer. Each item's looks are
//! resolved from the layout's style table (the same cascade the SVG style sheet gives a
//! browser); millimetres become points at 72/25.4. Text stays text: the glyphs are set in
//! the embedded DejaVu Sans (`layout::font`) at the advances the layout measured, embedded
//! as a subset with a ToUnicode map, so the words can be selected and searched. No date or
//! clock goes into the file: krilla derives the document id from a hash of the bytes, so
//! the same pages give the same file.

use std::fmt;

use krilla::Document;
use krilla::color::rgb;
use krilla::geom::{Path as PdfPath, PathBuilder, Point, Size, Transform};
use krilla::metadata::Metadata;
use krilla::page::PageSettings;
use krilla::paint::{Fill, LineCap, LineJoin, Stroke, StrokeDash};
use krilla::surface::Surface;
use krilla::text::{Font, GlyphId, KrillaGlyph};

use crate::layout::font::{Weight, glyphs};
use crate::layout::style::{Anchor, Decl, Resolved, resolve};
use crate::layout::tree::{Node, Page, PathOp, Text};

/// Points per millimetre.
const PT_PER_MM: f32 = 72.0 / 25.4;

/// A page that could not be turned into PDF.
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

/// The two faces, loaded once a document.
struct Fonts {
    regular: Font,
    bold: Font,
}

impl Fonts {
    fn get(&self, w: Weight) -> Font {
        match w {
            Weight::Regular => self.regular.clone(),
            Weight::Bold => self.bold.clone(),
        }
    }
}

/// Builds one PDF with a page per tree page, in order.
pub fn sheets_pdf(pages: &[Page]) -> Result<Vec<u8>, PdfError> {
    let font = |w: Weight| {
        Font::new(w.font_data().into(), 0).ok_or_else(|| PdfError {
            sheet: 0,
            message: "the embedded font cannot be read".into(),
        })
    };
    let fonts = Fonts {
        regular: font(Weight::Regular)?,
        bold: font(Weight::Bold)?,
    };
    let mut document = Document::new();
    for (i, p) in pages.iter().enumerate() {
        let (w, h) = (
            p.width_mm as f32 * PT_PER_MM,
            p.height_mm as f32 * PT_PER_MM,
        );
        let size = Size::from_wh(w, h).ok_or_else(|| PdfError {
            sheet: i + 1,
            message: format!("page size {w} × {h} pt"),
        })?;
        let mut page = document.start_page_with(PageSettings::new(size));
        let mut surface = page.surface();
        surface.push_transform(&Transform::from_scale(PT_PER_MM, PT_PER_MM));
        let mut walker = Walker {
            surface: &mut surface,
            fonts: &fonts,
            outer: Vec::new(),
        };
        walker.nodes(&p.children, &Resolved::default());
        surface.pop();
        surface.finish();
        page.finish();
    }
    let mut metadata = Metadata::new().producer("armsheet".into());
    if let Some(title) = pages
        .first()
        .map(|p| p.document.clone())
        .filter(|t| !t.is_empty())
    {
        metadata = metadata.title(title);
    }
    document.set_metadata(metadata);
    document.finish().map_err(|e| PdfError {
        sheet: 0,
        message: format!("{e:?}"),
    })
}

/// `#rgb` or `#rrggbb` as a colour (black for anything else).
fn colour(hex: &str) -> rgb::Color {
    let h = hex.trim_start_matches('#');
    let digit = |i: usize, n: usize| u8::from_str_radix(&h[i..i + n], 16).unwrap_or(0);
    match h.len() {
        3 => rgb::Color::new(digit(0, 1) * 17, digit(1, 1) * 17, digit(2, 1) * 17),
        6 => rgb::Color::new(digit(0, 2), digit(2, 2), digit(4, 2)),
        _ => rgb::Color::black(),
    }
}

fn fill_of(r: &Resolved) -> Option<Fill> {
    r.fill.map(|c| Fill {
        paint: colour(c).into(),
        ..Fill::default()
    })
}

fn stroke_of(r: &Resolved) -> Option<Stroke> {
    r.stroke.map(|c| Stroke {
        paint: colour(c).into(),
        width: r.stroke_width as f32,
        line_cap: if r.round_cap {
            LineCap::Round
        } else {
            LineCap::Butt
        },
        line_join: if r.round_join {
            LineJoin::Round
        } else {
            LineJoin::Miter
        },
        dash: (!r.dash.is_empty()).then(|| StrokeDash {
            array: r.dash.iter().map(|&d| d as f32).collect(),
            offset: 0.0,
        }),
        ..Stroke::default()
    })
}

struct Walker<'s, 'p> {
    surface: &'s mut Surface<'p>,
    fonts: &'s Fonts,
    /// Classes of the enclosing groups.
    outer: Vec<String>,
}

impl Walker<'_, '_> {
    fn resolve(&self, inherited: &Resolved, text: bool, class: &str, own: &[Decl]) -> Resolved {
        let outer: Vec<&str> = self.outer.iter().map(String::as_str).collect();
        resolve(inherited, text, class, &outer, own)
    }

    fn draw(&mut self, path: Option<PdfPath>, style: &Resolved, fill: bool) {
        let Some(path) = path else { return };
        self.surface
            .set_fill(if fill { fill_of(style) } else { None });
        self.surface.set_stroke(stroke_of(style));
        self.surface.draw_path(&path);
    }

    fn nodes(&mut self, nodes: &[Node], inherited: &Resolved) {
        for n in nodes {
            self.node(n, inherited);
        }
    }

    fn node(&mut self, n: &Node, inherited: &Resolved) {
        match n {
            Node::Group(g) => {
                let class = g.class.as_deref().unwrap_or("");
                let style = self.resolve(inherited, false, class, &[]);
                if let Some((x, y)) = g.translate {
                    self.surface
                        .push_transform(&Transform::from_translate(x as f32, y as f32));
                }
                let depth = self.outer.len();
                self.outer
                    .extend(class.split_whitespace().map(str::to_string));
                self.nodes(&g.children, &style);
                self.outer.truncate(depth);
                if g.translate.is_some() {
                    self.surface.pop();
                }
            }
            Node::Text(t) => self.text(t, inherited),
            Node::Line(l) => {
                let mut own = Vec::new();
                if let Some(s) = l.stroke {
                    own.push(Decl::Stroke(Some(s)));
                }
                if let Some(d) = l.dash {
                    own.push(Decl::Dash(d));
                }
                let style = self.resolve(inherited, false, &l.class, &own);
                let mut pb = PathBuilder::new();
                pb.move_to(l.from.0 as f32, l.from.1 as f32);
                pb.line_to(l.to.0 as f32, l.to.1 as f32);
                self.draw(pb.finish(), &style, false);
            }
            Node::Path(p) => {
                let own: Vec<Decl> = p.fill.map(|f| Decl::Fill(Some(f))).into_iter().collect();
                let style = self.resolve(inherited, false, p.class.as_deref().unwrap_or(""), &own);
                let mut pb = PathBuilder::new();
                for op in &p.ops {
                    match *op {
                        PathOp::Move(x, y) => pb.move_to(x as f32, y as f32),
                        PathOp::Line(x, y) => pb.line_to(x as f32, y as f32),
                        PathOp::Close => pb.close(),
                    }
                }
                self.draw(pb.finish(), &style, true);
            }
            Node::Rect(r) => {
                let own: Vec<Decl> = r.fill.map(|f| Decl::Fill(Some(f))).into_iter().collect();
                let style = self.resolve(inherited, false, r.class.as_deref().unwrap_or(""), &own);
                let Some(rect) =
                    krilla::geom::Rect::from_xywh(r.x as f32, r.y as f32, r.w as f32, r.h as f32)
                else {
                    return;
                };
                let mut pb = PathBuilder::new();
                pb.push_rect(rect);
                self.draw(pb.finish(), &style, true);
            }
            Node::Circle(c) => {
                let style = self.resolve(inherited, false, &c.class, &[]);
                // Four cubic arcs; the control points at 0.5523 r [src: the usual Bézier
                // circle approximation, 4/3·(√2 − 1)].
                let (x, y, r) = (c.cx as f32, c.cy as f32, c.r as f32);
                let k = 0.552_284_8 * r;
                let mut pb = PathBuilder::new();
                pb.move_to(x + r, y);
                pb.cubic_to(x + r, y + k, x + k, y + r, x, y + r);
                pb.cubic_to(x - k, y + r, x - r, y + k, x - r, y);
                pb.cubic_to(x - r, y - k, x - k, y - r, x, y - r);
                pb.cubic_to(x + k, y - r, x + r, y - k, x + r, y);
                pb.close();
                self.draw(pb.finish(), &style, true);
            }
        }
    }

    fn text(&mut self, t: &Text, inherited: &Resolved) {
        if t.content.is_empty() {
            return;
        }
        let own: Vec<Decl> = t.fill.map(|f| Decl::Fill(Some(f))).into_iter().collect();
        let style = self.resolve(inherited, true, &t.class, &own);
        let glyphs: Vec<KrillaGlyph> = t
            .content
            .char_indices()
            .zip(glyphs(&t.content, t.weight))
            .map(|((i, c), g)| KrillaGlyph {
                glyph_id: GlyphId::new(u32::from(g.id)),
                text_range: i..i + c.len_utf8(),
                x_advance: g.advance as f32,
                x_offset: 0.0,
                y_offset: 0.0,
                y_advance: 0.0,
                location: None,
            })
            .collect();
        let dx = match t.anchor {
            Anchor::Start => 0.0,
            Anchor::Middle => -t.width_mm / 2.0,
            Anchor::End => -t.width_mm,
        };
        if let Some(deg) = t.rotate {
            self.surface.push_transform(&Transform::from_rotate_at(
                deg as f32, t.x as f32, t.y as f32,
            ));
        }
        let start = Point::from_xy((t.x + dx) as f32, t.y as f32);
        let font = self.fonts.get(t.weight);
        let size = t.size_mm as f32;
        if style.stroke_under && style.stroke.is_some() {
            // A halo: the stroke first, then the fill over it.
            self.surface.set_fill(None);
            self.surface.set_stroke(stroke_of(&style));
            self.surface
                .draw_glyphs(start, &glyphs, font.clone(), &t.content, size, false);
            self.surface.set_stroke(None);
        } else {
            self.surface.set_stroke(stroke_of(&style));
        }
        self.surface.set_fill(fill_of(&style));
        self.surface
            .draw_glyphs(start, &glyphs, font, &t.content, size, false);
        if t.rotate.is_some() {
            self.surface.pop();
        }
    }
}
