//! Every sheet is parsed and rendered by an independent SVG library (usvg/resvg): the page is
//! the paper's size, the rendering is not blank and its text found a font.
//! Set SHEET_PNG_DIR to also write the renderings as PNG for a look by eye.

use crate::support::sheets::*;
use armsheet::layout::{Paper, Window};

fn check_design(name: &str, text: &str, paper: Paper) -> usize {
    let (d, _) = load(name, text);
    let sheets = sheets_for(&d, paper, Window::Auto);
    let (pw, ph) = paper.size_mm();
    for (i, svg) in sheets.iter().enumerate() {
        let tree = parse(svg);
        // usvg gives CSS px at 96 per inch; 1 mm = 96/25.4 px.
        let px = 96.0 / 25.4;
        assert!(
            (f64::from(tree.size().width()) - pw * px).abs() < 0.01,
            "{name} sheet {} width",
            i + 1
        );
        assert!(
            (f64::from(tree.size().height()) - ph * px).abs() < 0.01,
            "{name} sheet {} height",
            i + 1
        );
        assert!(svg.contains(&format!("viewBox=\"0 0 {} {}\"", fmt(pw), fmt(ph))));
        let pm = render(&tree, 1.0);
        let ink = ink(&pm);
        assert!(ink > 0.01 && ink < 0.6, "{name} sheet {}: ink {ink}", i + 1);
        let texts = text_with_glyphs(&tree);
        assert!(
            texts > 20,
            "{name} sheet {}: only {texts} text nodes found a font",
            i + 1
        );
        if let Ok(dir) = std::env::var("SHEET_PNG_DIR") {
            std::fs::create_dir_all(&dir).unwrap();
            let stem = name.trim_end_matches(".toml").rsplit('/').next().unwrap();
            let hi = render(&tree, 6.0);
            hi.save_png(format!("{dir}/{stem}-{}-{}.png", paper.as_str(), i + 1))
                .unwrap();
            if i == 0 {
                let crop_px = crop(&tree, 14.0, (0.0, 0.0, 0.33 * pw as f32, 0.5 * ph as f32));
                crop_px
                    .save_png(format!("{dir}/{stem}-{}-crop.png", paper.as_str()))
                    .unwrap();
                grey(&hi)
                    .save_png(format!("{dir}/{stem}-{}-grey.png", paper.as_str()))
                    .unwrap();
            }
        }
    }
    sheets.len()
}

/// Renders the region (x, y, w, h) in mm at `px_per_mm`.
fn crop(
    tree: &resvg::usvg::Tree,
    px_per_mm: f32,
    r: (f32, f32, f32, f32),
) -> resvg::tiny_skia::Pixmap {
    let s = px_per_mm * 25.4 / 96.0;
    let mm = 96.0 / 25.4;
    let mut pm =
        resvg::tiny_skia::Pixmap::new((r.2 * px_per_mm) as u32, (r.3 * px_per_mm) as u32).unwrap();
    let t = resvg::tiny_skia::Transform::from_translate(-r.0 * mm, -r.1 * mm).post_scale(s, s);
    resvg::render(tree, t, &mut pm.as_mut());
    pm
}

/// A greyscale copy (luma, Rec. 601 weights), as a monochrome printer would give.
fn grey(pm: &resvg::tiny_skia::Pixmap) -> resvg::tiny_skia::Pixmap {
    let mut out = pm.clone();
    for px in out.data_mut().chunks_exact_mut(4) {
        let l =
            (0.299 * f32::from(px[0]) + 0.587 * f32::from(px[1]) + 0.114 * f32::from(px[2])) as u8;
        px[0] = l;
        px[1] = l;
        px[2] = l;
    }
    out
}

fn fmt(x: f64) -> String {
    let s = format!("{x:.2}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

#[test]
fn fixture_sheets_render_on_every_paper() {
    for paper in Paper::ALL {
        assert_eq!(
            // Diagram (with the winding data, all of it on sheet 1's compact block),
            // commutator end view, winding order, connection table, equalizer table, tests
            // and sign-off.
            check_design("sheet_lap.toml", &fixture("sheet_lap.toml"), paper),
            6,
            "{paper}"
        );
        assert_eq!(
            check_design(
                "sheet_wave_dummy.toml",
                &fixture("sheet_wave_dummy.toml"),
                paper
            ),
            // No equalizer table; the winding data all on sheet 1.
            5,
            "{paper}"
        );
    }
}

#[test]
fn the_screen_diagram_renders() {
    for name in ["sheet_lap.toml", "sheet_wave_dummy.toml"] {
        let (d, _) = load(name, &fixture(name));
        let svg = draw_svg(&d, Window::Auto);
        let tree = parse(&svg);
        let pm = render(&tree, 1.0);
        let ink = ink(&pm);
        assert!(ink > 0.01 && ink < 0.6, "{name}: ink {ink}");
        assert!(text_with_glyphs(&tree) > 20, "{name}");
        if let Ok(dir) = std::env::var("SHEET_PNG_DIR") {
            std::fs::create_dir_all(&dir).unwrap();
            render(&tree, 5.0)
                .save_png(format!("{dir}/draw-{name}.png"))
                .unwrap();
        }
    }
}

#[test]
fn demo_sheets_render() {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/designs");
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    let mut names: Vec<_> = entries
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|e| e == "toml"))
        .collect();
    names.sort();
    assert!(!names.is_empty());
    for p in names {
        let text = std::fs::read_to_string(&p).unwrap();
        let n = check_design(&p.display().to_string(), &text, Paper::A4);
        assert!(n >= 2);
    }
    // The hostile fixture too (it fails checks and carries the band).
    assert_eq!(
        check_design(
            "sheet_hostile.toml",
            &fixture("sheet_hostile.toml"),
            Paper::A4
        ),
        5
    );
}

/// The connection table's type is at least 2.5 mm in cap height (the floor for A4):
/// measured on the outline of "H" in the shipped DejaVu Sans.
#[test]
fn table_type_has_a_cap_height_of_at_least_2_5_mm() {
    let size = armsheet::layout::sheet::TABLE_FONT;
    let svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"20mm\" height=\"20mm\" viewBox=\"0 0 20 20\"><text x=\"2\" y=\"10\" font-size=\"{size}\" font-family=\"DejaVu Sans\">H</text></svg>"
    );
    let tree = parse(&svg);
    fn first_text(g: &resvg::usvg::Group) -> Option<&resvg::usvg::Text> {
        g.children().iter().find_map(|n| match n {
            resvg::usvg::Node::Text(t) => Some(&**t),
            resvg::usvg::Node::Group(g) => first_text(g),
            _ => None,
        })
    }
    let t = first_text(tree.root()).expect("a text node");
    // The glyph outlines, in user units, which the viewBox makes millimetres.
    let cap_mm = f64::from(t.flattened().abs_bounding_box().height());
    assert!(cap_mm >= 2.5, "cap height {cap_mm:.3} mm");
    assert!(cap_mm < 2.7, "cap height {cap_mm:.3} mm");
}
