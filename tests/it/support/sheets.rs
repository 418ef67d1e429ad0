//! Helpers shared by the sheet tests: build sheets from a fixture design, and render SVG with
//! an independent SVG library (usvg/resvg) using the DejaVu fonts the binary embeds
//! (`assets/fonts/`), so the tests do not depend on the fonts of the machine.
use std::sync::Arc;

use armsheet::checks::Checked;
use armsheet::design::{Design, parse_design};
use armsheet::features::armature_test::{TestOptions, expected};
use armsheet::layout::{Page, Paper, SheetOptions, Window, draw_page, sheet_pages};
use armsheet::render::svg::page_svg;
use armsheet::winding::{Winding, trace_winding};

pub use super::fixture;

pub const FONTS: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/assets/fonts");

pub fn load(name: &str, text: &str) -> (Design, Winding) {
    let d = parse_design(text, name).unwrap();
    let w = trace_winding(&d);
    (d, w)
}

/// The page trees of every sheet of `d`.
pub fn pages_for(d: &Design, paper: Paper, window: Window) -> Vec<Page> {
    checked_pages(&armsheet::check(d.clone()), paper, window)
}

/// The page trees of every sheet of a checked design, with the armature test at its
/// defaults, as `armsheet sheet` lays them out (panics on a refused `Window::Whole`: see
/// [`sheet_pages`]).
pub fn checked_pages(checked: &Checked, paper: Paper, window: Window) -> Vec<Page> {
    let options = SheetOptions {
        paper,
        window,
        version: "test".into(),
    };
    let test = expected(&checked.design, &checked.winding, &TestOptions::default());
    sheet_pages(checked, &test, &options).expect("a printable window")
}

/// Every sheet of `d` as SVG.
pub fn sheets_for(d: &Design, paper: Paper, window: Window) -> Vec<String> {
    pages_for(d, paper, window).iter().map(page_svg).collect()
}

/// The screen diagram of `d` as SVG.
pub fn draw_svg(d: &Design, window: Window) -> String {
    page_svg(&draw_page(&armsheet::check(d.clone()), window))
}

/// usvg options with only the embedded fonts, every generic family mapped to DejaVu Sans.
pub fn usvg_options() -> resvg::usvg::Options<'static> {
    let mut db = resvg::usvg::fontdb::Database::new();
    for f in ["DejaVuSans.ttf", "DejaVuSans-Bold.ttf"] {
        db.load_font_data(std::fs::read(format!("{FONTS}/{f}")).unwrap());
    }
    db.set_sans_serif_family("DejaVu Sans");
    db.set_serif_family("DejaVu Sans");
    resvg::usvg::Options {
        fontdb: Arc::new(db),
        ..Default::default()
    }
}

pub fn parse(svg: &str) -> resvg::usvg::Tree {
    resvg::usvg::Tree::from_str(svg, &usvg_options()).expect("the SVG parses")
}

/// Renders at `px_per_mm` pixels per millimetre of paper (the trees are in CSS px, 96/in).
pub fn render(tree: &resvg::usvg::Tree, px_per_mm: f32) -> resvg::tiny_skia::Pixmap {
    let s = px_per_mm * 25.4 / 96.0;
    let size = tree.size();
    let mut pm = resvg::tiny_skia::Pixmap::new(
        (size.width() * s).ceil() as u32,
        (size.height() * s).ceil() as u32,
    )
    .unwrap();
    resvg::render(
        tree,
        resvg::tiny_skia::Transform::from_scale(s, s),
        &mut pm.as_mut(),
    );
    pm
}

/// Fraction of pixels that are not (near) white.
pub fn ink(pm: &resvg::tiny_skia::Pixmap) -> f64 {
    let data = pm.data();
    let n = data.len() / 4;
    let inked = data
        .chunks_exact(4)
        .filter(|p| p[3] > 0 && (p[0] < 200 || p[1] < 200 || p[2] < 200))
        .count();
    inked as f64 / n as f64
}

/// Number of text nodes whose glyphs resolved to outlines (a text that found no font has none).
pub fn text_with_glyphs(tree: &resvg::usvg::Tree) -> usize {
    fn walk(g: &resvg::usvg::Group, n: &mut usize) {
        for node in g.children() {
            match node {
                resvg::usvg::Node::Group(g) => walk(g, n),
                resvg::usvg::Node::Text(t) if !t.flattened().children().is_empty() => *n += 1,
                _ => {}
            }
        }
    }
    let mut n = 0;
    walk(tree.root(), &mut n);
    n
}

/// All values of attribute `name` on elements whose start tag contains `marker`.
pub fn attr_values(svg: &str, marker: &str, name: &str) -> Vec<String> {
    let needle = format!(" {name}=\"");
    svg.lines()
        .filter(|l| l.contains(marker))
        .filter_map(|l| {
            let i = l.find(&needle)? + needle.len();
            let j = l[i..].find('"')? + i;
            Some(l[i..j].to_string())
        })
        .collect()
}
