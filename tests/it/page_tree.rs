//! The page tree of every demo design (every sheet on every paper, and the screen page):
//! every text has a measured width and lies inside its page.

use crate::support::sheets::checked_pages;
use armsheet::design::parse_design;
use armsheet::layout::tree::Page;
use armsheet::layout::{Paper, Window, draw_page};

/// The designs in `designs/` and the sheet fixtures, in name order.
fn designs() -> Vec<(String, String)> {
    let mut out = Vec::new();
    for dir in ["designs", "tests/fixtures"] {
        let dir = format!("{}/{dir}", env!("CARGO_MANIFEST_DIR"));
        let mut paths: Vec<_> = std::fs::read_dir(&dir)
            .unwrap()
            .filter_map(Result::ok)
            .map(|e| e.path())
            .filter(|p| p.extension().is_some_and(|e| e == "toml"))
            .collect();
        paths.sort();
        for p in paths {
            let name = p.file_name().unwrap().to_string_lossy().into_owned();
            out.push((name, std::fs::read_to_string(&p).unwrap()));
        }
    }
    out
}

/// Asserts every text of `page` is measured and inside the page, rotation included.
fn check_texts(page: &Page, what: &str) -> usize {
    let texts = page.texts();
    for (dx, dy, t) in &texts {
        assert!(
            t.width_mm > 0.0,
            "{what}: text {:?} has no measured width",
            t.content
        );
        let (left, right) = t.span();
        let (ax, ay) = (dx + t.x, dy + t.y);
        let rad = t.rotate.unwrap_or(0.0).to_radians();
        for end in [left, right] {
            // The baseline end, turned about the anchor.
            let (ex, ey) = (end - t.x, 0.0);
            let x = ax + ex * rad.cos() - ey * rad.sin();
            let y = ay + ex * rad.sin() + ey * rad.cos();
            assert!(
                (0.0..=page.width_mm).contains(&x) && (0.0..=page.height_mm).contains(&y),
                "{what}: text {:?} reaches ({x:.2}, {y:.2}) outside {} × {} mm",
                t.content,
                page.width_mm,
                page.height_mm
            );
        }
    }
    texts.len()
}

#[test]
fn every_text_is_measured_and_on_its_page() {
    let mut total = 0;
    for (name, text) in designs() {
        let Ok(design) = parse_design(&text, &name) else {
            continue;
        };
        let checked = armsheet::check(design);
        for paper in Paper::ALL {
            for (i, page) in checked_pages(&checked, paper, Window::Auto)
                .iter()
                .enumerate()
            {
                total += check_texts(page, &format!("{name} {paper} sheet {}", i + 1));
            }
        }
        total += check_texts(&draw_page(&checked, Window::Auto), &format!("{name} draw"));
    }
    assert!(total > 10_000, "only {total} texts");
}
