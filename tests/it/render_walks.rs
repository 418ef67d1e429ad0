//! The drawing renderers only walk the page tree: no measuring, fitting, wrapping or laying
//! out in `render::svg` or `render::pdf` (those live in `layout`).

#[test]
fn svg_and_pdf_writers_make_no_layout_decisions() {
    let src = concat!(env!("CARGO_MANIFEST_DIR"), "/src/render");
    for file in ["svg.rs", "pdf.rs"] {
        let text = std::fs::read_to_string(format!("{src}/{file}")).unwrap();
        for call in [
            "text_width(",
            "wrap_text(",
            "fit_size(",
            "cut_to_width(",
            "layout_developed(",
            "sheet_pages(",
            "draw_page(",
            "paginate(",
            "crate::design",
            "crate::winding",
        ] {
            assert!(!text.contains(call), "render/{file} calls {call}");
        }
    }
}
