//! The PDF holds one page per sheet, each the paper's size, and is byte-identical run to run.

mod sheet_support;

use armsheet::layout::{Paper, Window};
use armsheet::render::pdf::sheets_pdf;
use sheet_support::*;

fn media_boxes(pdf: &[u8]) -> Vec<String> {
    let text = String::from_utf8_lossy(pdf);
    text.match_indices("/MediaBox [")
        .map(|(i, _)| text[i + 11..].split(']').next().unwrap().trim().to_string())
        .collect()
}

#[test]
fn one_page_per_sheet_at_paper_size() {
    for (name, paper) in [
        ("sheet_lap.toml", Paper::A4),
        ("sheet_wave_dummy.toml", Paper::Letter),
    ] {
        let (d, w) = load(name, &fixture(name));
        let sheets = sheets_for(&d, &w, paper, Window::Auto);
        let pdf = sheets_pdf(&sheets).unwrap();
        assert!(pdf.starts_with(b"%PDF-"));
        let text = String::from_utf8_lossy(&pdf);
        let pages = text.matches("/Type /Page\n").count()
            + text.matches("/Type /Page ").count()
            + text.matches("/Type /Page/").count();
        assert_eq!(pages, sheets.len(), "{name}");
        assert!(text.contains(&format!("/Count {}", sheets.len())));
        // 1 mm = 72/25.4 pt.
        let (wmm, hmm) = paper.size_mm();
        let want = format!(
            "0 0 {} {}",
            trim(wmm * 72.0 / 25.4),
            trim(hmm * 72.0 / 25.4)
        );
        let boxes = media_boxes(&pdf);
        assert_eq!(boxes.len(), sheets.len());
        for b in boxes {
            let v: Vec<f64> = b.split_whitespace().map(|x| x.parse().unwrap()).collect();
            let w: Vec<f64> = want
                .split_whitespace()
                .map(|x| x.parse().unwrap())
                .collect();
            for (a, b) in v.iter().zip(&w) {
                assert!((a - b).abs() < 0.05, "{name}: {v:?} vs {w:?}");
            }
        }
        assert_eq!(pdf, sheets_pdf(&sheets).unwrap(), "{name}: deterministic");
    }
}

fn trim(x: f64) -> String {
    format!("{x:.3}")
}
