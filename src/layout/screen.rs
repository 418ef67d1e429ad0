//! `armsheet draw`: the developed diagram alone on one page sized for a screen, with no
//! frame or blocks.
//!
//! Part of the `layout` stage: [`Checked`] in, one [`Page`] out.

use crate::checks::Checked;

use super::developed::{
    DiagramOptions, Window, layout_developed, nodes::diagram_group, resolve_view,
};
use super::sheet::title::failure_band;
use super::sheet::{BAND_HEIGHT, Rect as SheetRect};
use super::tree::{Page, PageKind, PageUnit, Rect, Text};

/// Screen pixels to the millimetre of the screen page.
pub const SCREEN_PX_PER_MM: f64 = 4.0;

/// The screen page of `checked`'s developed diagram, showing `window`.
pub fn draw_page(checked: &Checked, window: Window) -> Page {
    let (design, winding) = (&checked.design, &checked.winding);
    let shown = resolve_view(design, winding, window, None);
    let per_slot = if shown.slots > 0 {
        f64::from(winding.active_coils) / f64::from(design.slots)
    } else {
        1.0
    };
    // About 4 mm a segment, never narrower than a landscape page.
    let width = (f64::from(shown.slots) * per_slot * 4.0 + 22.0).clamp(280.0, 1200.0);
    let height = 150.0_f64.max(width * 0.42).min(240.0);
    let diagram = layout_developed(
        design,
        winding,
        &DiagramOptions {
            width,
            height: height - 8.0,
            window,
            floor: false,
        },
    );
    let title = job_title(design);
    // A design `check` refuses carries the sheets' band across the top, the page grown by it.
    let failures = checked.failures();
    let top = if failures.is_empty() {
        0.0
    } else {
        BAND_HEIGHT
    };
    let height = height + top;
    let mut heading = Text::new(11.0, top + 5.5, 3.2, "b", title.clone());
    heading.class_first = true;
    let mut page = Page {
        kind: PageKind::Screen,
        document: title.clone(),
        title,
        width_mm: width,
        height_mm: height,
        unit: PageUnit::Pixels(SCREEN_PX_PER_MM),
        data: vec![("data-page", PageKind::Screen.data_page().to_string())],
        children: vec![
            Rect::filled("#fff", 0.0, 0.0, width, height).into(),
            heading.into(),
            diagram_group(&diagram, 0.0, top + 8.0).into(),
        ],
    };
    if !failures.is_empty() {
        let band = SheetRect {
            x: 0.0,
            y: 0.0,
            w: width,
            h: BAND_HEIGHT,
        };
        page.children.push(failure_band(&band, &failures).into());
    }
    // The page grows to hold its lowest baseline (the brush names under narrow brushes
    // stand below the diagram box when no equalizer band follows).
    let lowest = page
        .texts()
        .iter()
        .map(|(_, dy, t)| dy + t.y)
        .fold(0.0, f64::max);
    if lowest + FOOT > height {
        page.height_mm = lowest + FOOT;
        page.children[0] = Rect::filled("#fff", 0.0, 0.0, width, page.height_mm).into();
    }
    page
}

/// The job's name for titles: its id and title joined by " · ", else the design file's name.
pub fn job_title(design: &crate::design::Design) -> String {
    let title = [design.job.id.as_deref(), design.job.title.as_deref()]
        .into_iter()
        .flatten()
        .collect::<Vec<_>>()
        .join(" \u{b7} ");
    if title.is_empty() {
        design.file_name.clone()
    } else {
        title
    }
}

/// Least paper below the lowest baseline of the screen page, mm.
const FOOT: f64 = 0.8;
