//! Page geometry for printed sheets: frame, title block, blocks and table pagination.
//!
//! Part of the `layout` stage. Pure arithmetic in millimetres on the landscape page; the
//! blocks are filled by the sibling modules of `layout::sheet`.

use std::ops::Range;

use crate::layout::paper::Paper;

/// Page margin on every side, mm (inside most printers' unprintable edge).
pub const MARGIN: f64 = 10.0;
/// Height of the "not for winding" band, mm.
pub const BAND_HEIGHT: f64 = 9.0;
/// Title block size, mm.
pub const TITLE_BLOCK: (f64, f64) = (124.0, 31.0);
/// Connection-table font size, mm: 3.5 mm gives a cap height of 2.55 mm in DejaVu Sans (the
/// outline of "H" is 0.729 em tall; measured in `tests/it/sheet_render.rs`), above the 2.5 mm
/// asked for on A4.
pub const TABLE_FONT: f64 = 3.5;
/// Table row pitch, mm.
pub const TABLE_ROW: f64 = 5.0;
/// Table header height, mm (two lines).
pub const TABLE_HEADER: f64 = 9.0;
/// Gap between side-by-side column groups, mm.
pub const TABLE_GAP: f64 = 8.0;

/// An axis-aligned rectangle, mm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rect {
    /// Left.
    pub x: f64,
    /// Top.
    pub y: f64,
    /// Width.
    pub w: f64,
    /// Height.
    pub h: f64,
}

impl Rect {
    /// Right edge.
    pub fn right(&self) -> f64 {
        self.x + self.w
    }

    /// Bottom edge.
    pub fn bottom(&self) -> f64 {
        self.y + self.h
    }
}

/// The fixed parts of every page.
#[derive(Clone, Debug, PartialEq)]
pub struct PageFrame {
    /// The paper.
    pub paper: Paper,
    /// Page width, mm.
    pub width: f64,
    /// Page height, mm.
    pub height: f64,
    /// The drawing frame inside the margins.
    pub frame: Rect,
    /// The "not for winding" band across the top of the frame, when the design fails checks.
    pub band: Option<Rect>,
    /// The title block, bottom right.
    pub title_block: Rect,
    /// The free area above the title-block row (below the band).
    pub content: Rect,
}

/// Lays out the frame for `paper`; `failing` reserves the warning band.
pub fn page_frame(paper: Paper, failing: bool) -> PageFrame {
    let (width, height) = paper.size_mm();
    let frame = Rect {
        x: MARGIN,
        y: MARGIN,
        w: width - 2.0 * MARGIN,
        h: height - 2.0 * MARGIN,
    };
    let band = failing.then_some(Rect {
        x: frame.x,
        y: frame.y,
        w: frame.w,
        h: BAND_HEIGHT,
    });
    let top = frame.y + if failing { BAND_HEIGHT } else { 0.0 };
    let title_block = Rect {
        x: frame.right() - TITLE_BLOCK.0,
        y: frame.bottom() - TITLE_BLOCK.1,
        w: TITLE_BLOCK.0,
        h: TITLE_BLOCK.1,
    };
    let content = Rect {
        x: frame.x,
        y: top,
        w: frame.w,
        h: title_block.y - top,
    };
    PageFrame {
        paper,
        width,
        height,
        frame,
        band,
        title_block,
        content,
    }
}

/// The blocks of sheet 1: the diagram above; the winding data (with the numbering
/// convention), the legend and the caution box in a row below, beside the title block.
#[derive(Clone, Debug, PartialEq)]
pub struct DiagramSheet {
    /// The developed diagram.
    pub diagram: Rect,
    /// The winding-data block.
    pub data: Rect,
    /// The legend.
    pub legend: Rect,
    /// The caution box (above the title block).
    pub notes: Rect,
}

/// Height of the row of blocks under the diagram, mm.
pub const BLOCK_ROW: f64 = 78.0;

/// Lays out sheet 1 on `frame`.
pub fn diagram_sheet(frame: &PageFrame) -> DiagramSheet {
    let f = &frame.frame;
    let row_top = f.bottom() - BLOCK_ROW;
    let diagram = Rect {
        x: frame.content.x,
        y: frame.content.y + 1.0,
        w: frame.content.w,
        h: row_top - frame.content.y - 2.0,
    };
    let notes_w = TITLE_BLOCK.0;
    let rest = f.w - notes_w;
    let data_w = (rest * 0.58).floor();
    let data = Rect {
        x: f.x,
        y: row_top,
        w: data_w,
        h: BLOCK_ROW,
    };
    let legend = Rect {
        x: f.x + data_w,
        y: row_top,
        w: rest - data_w,
        h: BLOCK_ROW,
    };
    let notes = Rect {
        x: frame.title_block.x,
        y: row_top,
        w: notes_w,
        h: BLOCK_ROW - TITLE_BLOCK.1,
    };
    DiagramSheet {
        diagram,
        data,
        legend,
        notes,
    }
}

/// One page of a table: the rows each column group holds and where it stands.
#[derive(Clone, Debug, PartialEq)]
pub struct TablePage {
    /// The rows on this page.
    pub rows: Range<usize>,
    /// Column groups: left x and the rows in it.
    pub groups: Vec<(f64, Range<usize>)>,
    /// Top of the header.
    pub top: f64,
    /// Row pitch, mm.
    pub row: f64,
}

/// Splits `total` rows of a table whose columns take `width` mm into pages that fit `area`
/// at the [`TABLE_ROW`] pitch (see [`paginate_rows`]).
pub fn paginate(total: usize, width: f64, area: &Rect) -> Vec<TablePage> {
    paginate_rows(total, width, area, area, TABLE_ROW)
}

/// Splits `total` rows of a table whose columns take `width` mm into pages at `row` mm a row:
/// the first page's table in `first` (narrower or lower when the page carries blocks of its
/// own), every other page's in `rest`; the fewest pages that hold them. A table of several
/// pages shares its rows evenly between the pages (they differ by one row at most, the first
/// page holding no more than it can) and their column groups, so no last sheet carries a
/// handful of rows. Always returns at least one page.
pub fn paginate_rows(
    total: usize,
    width: f64,
    first: &Rect,
    rest: &Rect,
    row: f64,
) -> Vec<TablePage> {
    let fit = |a: &Rect| (((a.h - TABLE_HEADER) / row).floor() as usize).max(1);
    let groups = |a: &Rect| (((a.w + TABLE_GAP) / (width + TABLE_GAP)).floor() as usize).max(1);
    let cap_first = fit(first) * groups(first);
    let cap_rest = fit(rest) * groups(rest);
    let pages = if total <= cap_first {
        1
    } else {
        1 + (total - cap_first).div_ceil(cap_rest)
    };
    let sizes: Vec<usize> = if pages == 1 {
        vec![total]
    } else {
        let head = cap_first.min(total.div_ceil(pages));
        let (left, others) = (total - head, pages - 1);
        std::iter::once(head)
            .chain((0..others).map(|i| left / others + usize::from(i < left % others)))
            .collect()
    };
    let mut out = Vec::new();
    let mut start = 0;
    for (k, size) in sizes.into_iter().enumerate() {
        let area = if k == 0 { first } else { rest };
        let (fit_group, n_groups) = (fit(area), groups(area));
        let end = start + size;
        // A table that fits one page fills its column groups in turn.
        let per_group = if pages == 1 {
            fit_group
        } else {
            size.div_ceil(n_groups).max(1)
        };
        let mut gs = Vec::new();
        let mut r = start;
        for g in 0..n_groups {
            if r >= end && g > 0 {
                break;
            }
            let e = (r + per_group).min(end);
            gs.push((area.x + g as f64 * (width + TABLE_GAP), r..e));
            r = e;
        }
        out.push(TablePage {
            rows: start..end,
            groups: gs,
            top: area.y,
            row,
        });
        start = end;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pagination_keeps_every_row_once() {
        let area = Rect {
            x: 10.0,
            y: 20.0,
            w: 277.0,
            h: 150.0,
        };
        for total in [0usize, 1, 57, 58, 59, 1056] {
            let pages = paginate(total, 130.0, &area);
            let rows: Vec<usize> = pages
                .iter()
                .flat_map(|p| p.groups.iter().flat_map(|g| g.1.clone()))
                .collect();
            assert_eq!(rows, (0..total).collect::<Vec<_>>(), "total {total}");
        }
        // 150 mm: (150 − 9)/5 = 28 rows a group, two 130 mm groups across 277 mm.
        assert_eq!(paginate(1056, 130.0, &area).len(), 1056usize.div_ceil(56));
        // 57 rows need two pages of 56: they carry 29 and 28 rows, not 56 and 1.
        let sizes: Vec<usize> = paginate(57, 130.0, &area)
            .iter()
            .map(|p| p.rows.len())
            .collect();
        assert_eq!(sizes, [29, 28]);
        // 1,056 rows of 56 a page: 19 pages of 55 or 56, never a short last one.
        let sizes: Vec<usize> = paginate(1056, 130.0, &area)
            .iter()
            .map(|p| p.rows.len())
            .collect();
        assert_eq!(sizes.iter().sum::<usize>(), 1056);
        assert!(sizes.iter().all(|&n| n == 55 || n == 56), "{sizes:?}");
    }

    #[test]
    fn a_first_page_with_words_holds_fewer_rows() {
        let area = Rect {
            x: 10.0,
            y: 20.0,
            w: 277.0,
            h: 150.0,
        };
        let lower = Rect {
            y: 40.0,
            h: 130.0,
            ..area
        };
        // (150 − 9)/4.5 = 31 rows, (130 − 9)/4.5 = 26 on the first page; one group.
        let pages = paginate_rows(57, 250.0, &lower, &area, 4.5);
        let sizes: Vec<usize> = pages.iter().map(|p| p.rows.len()).collect();
        assert_eq!(sizes, [26, 31]);
        assert_eq!((pages[0].top, pages[1].top), (40.0, 20.0));
        // 40 rows: two pages of 20, not 26 and 14.
        let sizes: Vec<usize> = paginate_rows(40, 250.0, &lower, &area, 4.5)
            .iter()
            .map(|p| p.rows.len())
            .collect();
        assert_eq!(sizes, [20, 20]);
        for total in [0usize, 1, 26, 27, 58, 1056] {
            let rows: Vec<usize> = paginate_rows(total, 250.0, &lower, &area, 4.5)
                .iter()
                .flat_map(|p| p.groups.iter().flat_map(|g| g.1.clone()))
                .collect();
            assert_eq!(rows, (0..total).collect::<Vec<_>>(), "total {total}");
        }
        // A narrow first page (one 120 mm group of two) then two groups a page.
        let narrow = Rect { w: 120.0, ..area };
        let pages = paginate_rows(100, 120.0, &narrow, &area, 5.0);
        let groups: Vec<usize> = pages.iter().map(|p| p.groups.len()).collect();
        assert_eq!(pages[0].rows.len(), 28);
        assert_eq!(groups[0], 1);
        assert!(groups[1..].iter().all(|&g| g == 2), "{groups:?}");
    }

    #[test]
    fn frame_fits_the_paper() {
        let f = page_frame(Paper::A4, true);
        assert_eq!((f.width, f.height), (297.0, 210.0));
        assert_eq!(f.title_block.right(), 287.0);
        assert_eq!(f.title_block.bottom(), 200.0);
        assert_eq!(f.content.y, MARGIN + BAND_HEIGHT);
    }
}
