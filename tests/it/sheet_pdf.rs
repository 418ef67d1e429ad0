//! The PDF holds one page per sheet, each the paper's size, keeps its text as real text in
//! embedded DejaVu fonts, and is byte-identical run to run.

use std::io::Read;

use crate::support::sheets::*;
use armsheet::layout::tree::PageKind;
use armsheet::layout::{Paper, Window};
use armsheet::render::pdf::sheets_pdf;

/// Every `/Key` followed by optional whitespace: the index just past it.
fn keys<'a>(text: &'a str, key: &'a str) -> impl Iterator<Item = usize> + 'a {
    text.match_indices(key)
        .map(move |(i, _)| i + key.len())
        .map(move |j| j + text[j..].len() - text[j..].trim_start().len())
}

/// The four numbers of every `/MediaBox [..]`.
fn media_boxes(text: &str) -> Vec<Vec<f64>> {
    keys(text, "/MediaBox")
        .map(|j| {
            let inner = text[j..]
                .strip_prefix('[')
                .unwrap()
                .split(']')
                .next()
                .unwrap();
            inner
                .split_whitespace()
                .map(|x| x.parse().unwrap())
                .collect()
        })
        .collect()
}

/// Objects of `/Type /Page` (not `/Pages`).
fn page_objects(text: &str) -> usize {
    keys(text, "/Type")
        .filter(|&j| text[j..].starts_with("/Page") && !text[j..].starts_with("/Pages"))
        .count()
}

/// Every FlateDecode stream, decompressed: (object number, dictionary, data).
fn streams(pdf: &[u8]) -> Vec<(u32, String, Vec<u8>)> {
    let mut out = Vec::new();
    let mut at = 0;
    while let Some(k) = find(&pdf[at..], b"stream\n").map(|k| k + at) {
        let start = k + b"stream\n".len();
        let end = find(&pdf[start..], b"endstream").unwrap() + start;
        let obj = pdf[..k].windows(6).rposition(|w| w == b" 0 obj").unwrap();
        let num_start = pdf[..obj]
            .iter()
            .rposition(|b| !b.is_ascii_digit())
            .map_or(0, |i| i + 1);
        let num = std::str::from_utf8(&pdf[num_start..obj])
            .unwrap()
            .parse()
            .unwrap();
        let dict = String::from_utf8_lossy(&pdf[obj..k]).into_owned();
        if dict.contains("/FlateDecode") {
            let mut data = Vec::new();
            flate2::read::ZlibDecoder::new(&pdf[start..end])
                .read_to_end(&mut data)
                .unwrap();
            out.push((num, dict, data));
        }
        at = end + b"endstream".len();
    }
    out
}

fn find(hay: &[u8], needle: &[u8]) -> Option<usize> {
    hay.windows(needle.len()).position(|w| w == needle)
}

#[test]
fn one_page_per_sheet_at_paper_size() {
    for (name, paper) in [
        ("sheet_lap.toml", Paper::A4),
        ("sheet_wave_dummy.toml", Paper::Letter),
    ] {
        let (d, _) = load(name, &fixture(name));
        let sheets = pages_for(&d, paper, Window::Auto);
        assert!(sheets.len() >= 2, "{name}");
        let pdf = sheets_pdf(&sheets).unwrap();
        assert!(pdf.starts_with(b"%PDF-"));
        let text = String::from_utf8_lossy(&pdf);
        assert_eq!(page_objects(&text), sheets.len(), "{name}");
        let counts: Vec<&str> = keys(&text, "/Count")
            .map(|j| {
                text[j..]
                    .split(|c: char| !c.is_ascii_digit())
                    .next()
                    .unwrap()
            })
            .collect();
        assert_eq!(counts, [sheets.len().to_string()], "{name}");
        // 1 mm = 72/25.4 pt.
        let (wmm, hmm) = paper.size_mm();
        let want = [0.0, 0.0, wmm * 72.0 / 25.4, hmm * 72.0 / 25.4];
        let boxes = media_boxes(&text);
        assert_eq!(boxes.len(), sheets.len(), "{name}");
        for b in boxes {
            assert_eq!(b.len(), 4, "{name}: {b:?}");
            for (a, w) in b.iter().zip(want) {
                assert!((a - w).abs() < 0.05, "{name}: {b:?} vs {want:?}");
            }
        }
    }
}

#[test]
fn same_sheets_give_the_same_bytes() {
    let (d, _) = load("sheet_lap.toml", &fixture("sheet_lap.toml"));
    let sheets = pages_for(&d, Paper::A4, Window::Auto);
    let first = sheets_pdf(&sheets).unwrap();
    let second = sheets_pdf(&sheets).unwrap();
    assert!(first.len() > 10_000, "{} bytes", first.len());
    assert!(first == second, "two conversions of the same sheets differ");
    // No clock reaches the file.
    let text = String::from_utf8_lossy(&first);
    assert!(!text.contains("/CreationDate") && !text.contains("/ModDate"));
    assert!(!text.contains("xmp:CreateDate") && !text.contains("xmp:ModifyDate"));
}

/// The text is kept as text: both DejaVu faces are embedded (as subsets, TrueType outlines in
/// /FontFile2) with a ToUnicode map, and the pages draw every text of the page tree with text
/// operators, so a reader can select and search the words.
#[test]
fn text_is_real_text_in_embedded_fonts() {
    let (d, _) = load("sheet_lap.toml", &fixture("sheet_lap.toml"));
    let sheets = pages_for(&d, Paper::A4, Window::Auto);
    let pdf = sheets_pdf(&sheets).unwrap();
    let text = String::from_utf8_lossy(&pdf);
    let mut base_fonts: Vec<&str> = keys(&text, "/Subtype/Type0/BaseFont/")
        .map(|j| text[j..].split(['/', '>', ' ']).next().unwrap())
        .map(|f| f.split_once('+').expect("a subset tag").1)
        .collect();
    base_fonts.sort_unstable();
    assert_eq!(base_fonts, ["DejaVuSans", "DejaVuSans-Bold"]);
    assert_eq!(text.matches("/FontFile2 ").count(), 2);
    assert_eq!(text.matches("/ToUnicode ").count(), 2);

    // The characters each ToUnicode map gives back, as Unicode scalar values.
    let streams = streams(&pdf);
    let mut mapped = std::collections::BTreeSet::new();
    for (_, _, data) in streams.iter().filter(|(_, d, _)| d.contains("/Type/CMap")) {
        let cmap = String::from_utf8_lossy(data);
        for line in cmap.lines() {
            let hex: Vec<&str> = line
                .split(['<', '>'])
                .filter(|s| !s.trim().is_empty())
                .collect();
            if let [_, unicode] = hex[..]
                && let Ok(u) = u32::from_str_radix(unicode, 16)
                && let Some(c) = char::from_u32(u)
            {
                mapped.insert(c);
            }
        }
    }
    for c in "Connection table: coil 0123456789 CAUTION sheet of".chars() {
        assert!(mapped.contains(&c), "{c:?} has no ToUnicode entry");
    }
    // Page contents show glyphs with text operators (BT … Tf … TJ/Tj … ET).
    let content_refs: Vec<u32> = keys(&text, "/Contents")
        .map(|j| text[j..].split(' ').next().unwrap().parse().unwrap())
        .collect();
    assert_eq!(content_refs.len(), sheets.len());
    let contents: Vec<String> = content_refs
        .iter()
        .map(|r| {
            let (_, _, data) = streams
                .iter()
                .find(|(n, _, _)| n == r)
                .expect("a content stream");
            String::from_utf8_lossy(data).into_owned()
        })
        .collect();
    // At least one text object for every text of the page tree (a haloed text takes two).
    for (c, page) in contents.iter().zip(&sheets) {
        let texts = page
            .texts()
            .iter()
            .filter(|(_, _, t)| !t.content.is_empty())
            .count();
        assert!(texts > 20, "{texts} texts");
        let objects = c.matches("BT ").count();
        assert!(objects >= texts, "{objects} text objects for {texts} texts");
        assert!(c.contains(" Tf ") && c.contains("Tj"), "no text shown");
    }
}

/// An independent PDF reader (poppler's `pdftotext`, where installed) reads the connection
/// table back: the heading and every row's cells in order.
#[test]
fn pdftotext_reads_the_connection_table() {
    let (d, w) = load("sheet_lap.toml", &fixture("sheet_lap.toml"));
    let pages = pages_for(&d, Paper::A4, Window::Auto);
    let pdf = sheets_pdf(&pages).unwrap();
    let sheet = (1 + pages
        .iter()
        .position(|p| p.kind == PageKind::Connections)
        .unwrap())
    .to_string();
    let dir = std::env::temp_dir().join(format!("armsheet-pdftotext-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("sheets.pdf");
    std::fs::write(&file, &pdf).unwrap();
    let out = std::process::Command::new("pdftotext")
        .args(["-layout", "-f", &sheet, "-l", &sheet])
        .arg(&file)
        .arg("-")
        .output();
    let _ = std::fs::remove_dir_all(&dir);
    let Ok(out) = out else {
        eprintln!("pdftotext is not installed; the ToUnicode test above covers the text");
        return;
    };
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(
        text.contains("Connection table: coils 1\u{2013}12 of 12"),
        "{text}"
    );
    for c in &w.connections {
        let row = format!("{} {} {}", c.coil, c.top.slot, c.bottom.slot);
        let found = text
            .lines()
            .any(|l| l.split_whitespace().take(3).collect::<Vec<_>>().join(" ") == row);
        assert!(found, "row {row} not read back:\n{text}");
    }
}
