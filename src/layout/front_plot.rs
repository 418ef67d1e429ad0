//! The designer's search plotted: one figure against another for every candidate, each
//! series (a winding kind) with its own marker, the candidates on the Pareto front filled,
//! the others open. (The front is taken over more figures than the two drawn, so it is not
//! joined: in two of them it is no curve.)
//!
//! Part of the `layout` stage: plain figures in ([`Scatter`], filled by the caller from a
//! computed search), one [`Page`] out (A4 landscape, millimetres). The axes run from zero (or
//! the least value, when that is negative) to a round value above the largest, ticked at 1, 2
//! or 5 times a power of ten ([src: Heckbert, "Nice numbers for graph labels", Graphics Gems,
//! 1990, from memory]); every text holds the legibility floor.

use super::font::{Weight, text_width, wrap_text};
use super::style::TEXT_FLOOR;
use super::tree::{Group, Line, Page, PageKind, PageUnit, Path, PathOp, Rect, Text};
use crate::base::number::fmt_trimmed;
use crate::features::explore::Explored;

const W: f64 = 297.0;
const H: f64 = 210.0;
/// The plot box: left, top, right, bottom, mm.
const BOX: (f64, f64, f64, f64) = (32.0, 22.0, 205.0, 178.0);
/// Half the size of a marker, mm.
const MARK: f64 = 1.3;
/// The most fronts' numbers written beside their markers.
const NUMBERED: usize = 30;

/// One candidate on the plot.
#[derive(Clone, Debug, PartialEq)]
pub struct ScatterPoint {
    /// Value on the x axis.
    pub x: f64,
    /// Value on the y axis.
    pub y: f64,
    /// Index into [`Scatter::series`].
    pub series: usize,
    /// On the Pareto front.
    pub front: bool,
    /// The candidate's number in the ranked list, written beside a front marker.
    pub number: usize,
}

/// What the plot shows.
#[derive(Clone, Debug, PartialEq)]
pub struct Scatter {
    /// The page's heading.
    pub title: String,
    /// The x axis's name with its unit ("reactance voltage, V").
    pub x_label: String,
    /// The y axis's name with its unit.
    pub y_label: String,
    /// The series' names, in marker order.
    pub series: Vec<String>,
    /// The candidates.
    pub points: Vec<ScatterPoint>,
    /// Lines of notes beside the plot (what was searched, how the front is read).
    pub notes: Vec<String>,
}

/// The plot of a search's fits: reactance voltage against copper loss (peak segment
/// voltage against copper loss when the frame lacks the reactance voltage's inputs), a
/// marker a winding kind, the front filled, each numbered as in the ranked list.
pub fn search_front_page(e: &Explored, title: &str) -> Page {
    let reactance = e.fits.iter().all(|k| k.figures.reactance_v.is_some());
    let mut series: Vec<String> = Vec::new();
    let points = e
        .fits
        .iter()
        .enumerate()
        .map(|(i, k)| {
            let kind = k.structure.kind.as_str().to_string();
            let at = series.iter().position(|s| *s == kind).unwrap_or_else(|| {
                series.push(kind);
                series.len() - 1
            });
            let g = &k.figures;
            ScatterPoint {
                x: if reactance {
                    g.reactance_v.unwrap_or(0.0)
                } else {
                    g.segment_volts_peak
                },
                y: g.copper_loss_w,
                series: at,
                front: k.on_front,
                number: i + 1,
            }
        })
        .collect();
    let x_label = if reactance {
        "average reactance voltage of the coil under commutation, V"
    } else {
        "peak voltage between segments, V (no reactance voltage: the frame lacks its inputs)"
    };
    Scatter {
        title: title.to_string(),
        x_label: x_label.to_string(),
        y_label: "copper loss at the rated temperature, W".to_string(),
        series,
        points,
        notes: vec![
            format!(
                "{} candidates evaluated, {} fit, {} on the front",
                e.evaluated,
                e.fits.len(),
                e.fits.iter().filter(|k| k.on_front).count()
            ),
            "The front is taken over the reactance voltage, the copper loss, the peak segment voltage and the slot fill: a candidate on it can look beaten in the two figures drawn.".to_string(),
        ],
    }
    .page()
}

impl Scatter {
    /// The page of this plot ([`front_plot_page`]).
    pub fn page(&self) -> Page {
        front_plot_page(self)
    }
}

/// Round tick step for a span of `span` with about `ticks` ticks: 1, 2 or 5 × 10ⁿ.
fn nice_step(span: f64, ticks: f64) -> f64 {
    let raw = (span / ticks).max(1e-12);
    let p = 10f64.powf(raw.log10().floor());
    let f = raw / p;
    let nice = if f <= 1.0 {
        1.0
    } else if f <= 2.0 {
        2.0
    } else if f <= 5.0 {
        5.0
    } else {
        10.0
    };
    nice * p
}

/// An axis from `lo` to `hi` (rounded out to its step) and its ticks.
struct Axis {
    lo: f64,
    hi: f64,
    step: f64,
}

impl Axis {
    fn of(values: impl Iterator<Item = f64>) -> Axis {
        let (mut lo, mut hi) = (0.0_f64, f64::NEG_INFINITY);
        for v in values.filter(|v| v.is_finite()) {
            lo = lo.min(v);
            hi = hi.max(v);
        }
        if !hi.is_finite() || hi <= lo {
            hi = lo + 1.0;
        }
        let step = nice_step(hi - lo, 5.0);
        Axis {
            lo: (lo / step).floor() * step,
            hi: (hi / step).ceil() * step,
            step,
        }
    }

    fn ticks(&self) -> Vec<f64> {
        let n = ((self.hi - self.lo) / self.step).round() as usize;
        (0..=n).map(|k| self.lo + k as f64 * self.step).collect()
    }

    /// Where `v` falls between `a` and `b`, mm.
    fn at(&self, v: f64, a: f64, b: f64) -> f64 {
        a + (v - self.lo) / (self.hi - self.lo) * (b - a)
    }
}

/// The decimals a tick step needs.
fn decimals(step: f64) -> usize {
    (-step.log10().floor()).max(0.0) as usize
}

/// The marker of series `k` at (x, y): circle, square, triangle, diamond, then round again.
fn marker(k: usize, (x, y): (f64, f64), filled: bool) -> Path {
    let cls = if filled { "mark-on" } else { "mark-off" };
    let r = MARK;
    let pts: Vec<(f64, f64)> = match k % 4 {
        1 => vec![
            (x - r, y - r),
            (x + r, y - r),
            (x + r, y + r),
            (x - r, y + r),
        ],
        2 => vec![
            (x, y - r * 1.2),
            (x + r * 1.1, y + r * 0.8),
            (x - r * 1.1, y + r * 0.8),
        ],
        3 => vec![(x, y - r * 1.3), (x + r, y), (x, y + r * 1.3), (x - r, y)],
        _ => (0..12)
            .map(|i| {
                let a = f64::from(i) * std::f64::consts::TAU / 12.0;
                (x + r * a.cos(), y + r * a.sin())
            })
            .collect(),
    };
    let mut p = Path::polyline(cls, &[]);
    p.ops = pts
        .iter()
        .enumerate()
        .map(|(i, &(px, py))| {
            if i == 0 {
                PathOp::Move(px, py)
            } else {
                PathOp::Line(px, py)
            }
        })
        .chain([PathOp::Close])
        .collect();
    p
}

/// The page of `s`.
pub fn front_plot_page(s: &Scatter) -> Page {
    let (x0, y0, x1, y1) = BOX;
    let ax = Axis::of(s.points.iter().map(|p| p.x));
    let ay = Axis::of(s.points.iter().map(|p| p.y));
    let mut g = Group::id("front-plot");
    g.push(Text::new(x0, 12.0, 4.2, "b", s.title.clone()));
    g.push(Rect::new("plot-box", x0, y0, x1 - x0, y1 - y0));
    axes(&mut g, &ax, &ay, s);
    // Every marker, the front's on top, numbered in the ranked list's order where room.
    let mut front: Vec<&ScatterPoint> = s.points.iter().filter(|p| p.front).collect();
    front.sort_by_key(|p| p.number);
    let place = |p: &ScatterPoint| (ax.at(p.x, x0, x1), ay.at(p.y, y1, y0));
    for p in s.points.iter().filter(|p| !p.front) {
        g.push(marker(p.series, place(p), false));
    }
    for p in &front {
        g.push(marker(p.series, place(p), true));
    }
    // Numbers beside the front's markers, where they cover no marker and no other number.
    let r = MARK * 1.3;
    let mut taken: Vec<(f64, f64, f64, f64)> = s
        .points
        .iter()
        .map(|p| {
            let (x, y) = place(p);
            (x - r, y - r, x + r, y + r)
        })
        .collect();
    for p in front.iter().take(NUMBERED) {
        let (x, y) = place(p);
        let label = p.number.to_string();
        let w = text_width(&label, TEXT_FLOOR, Weight::Regular);
        let b = (x + r + 0.3, y - r - 2.2, x + r + 0.3 + w, y - r + 0.2);
        let clear = taken
            .iter()
            .all(|t| b.2 < t.0 || b.0 > t.2 || b.3 < t.1 || b.1 > t.3);
        if clear && b.2 < x1 && b.1 > y0 {
            taken.push(b);
            g.push(Text::new(b.0, y - r - 0.2, TEXT_FLOOR, "", label));
        }
    }
    side_notes(&mut g, s);
    Page {
        kind: PageKind::FrontPlot,
        title: s.title.clone(),
        document: s.title.clone(),
        width_mm: W,
        height_mm: H,
        unit: PageUnit::Millimetres,
        data: vec![("data-page", PageKind::FrontPlot.data_page().to_string())],
        children: vec![Rect::filled("#fff", 0.0, 0.0, W, H).into(), g.into()],
    }
}

/// Ticks, grid and the axes' names.
fn axes(g: &mut Group, ax: &Axis, ay: &Axis, s: &Scatter) {
    let (x0, y0, x1, y1) = BOX;
    for v in ax.ticks() {
        let x = ax.at(v, x0, x1);
        g.push(Line::new("grid", (x, y0), (x, y1)));
        let t = fmt_trimmed(v, decimals(ax.step));
        g.push(Text::new(x, y1 + 4.0, TEXT_FLOOR + 0.3, "mid", t));
    }
    for v in ay.ticks() {
        let y = ay.at(v, y1, y0);
        g.push(Line::new("grid", (x0, y), (x1, y)));
        let t = fmt_trimmed(v, decimals(ay.step));
        g.push(Text::new(x0 - 1.5, y + 1.0, TEXT_FLOOR + 0.3, "end", t));
    }
    g.push(Text::new(
        (x0 + x1) / 2.0,
        y1 + 10.0,
        3.2,
        "mid b",
        s.x_label.clone(),
    ));
    g.push(Text::new(9.0, (y0 + y1) / 2.0, 3.2, "mid b", s.y_label.clone()).rotated(-90.0));
}

/// The key (one marker a series, filled on the front) and the notes, right of the plot.
fn side_notes(g: &mut Group, s: &Scatter) {
    let x = BOX.2 + 10.0;
    let width = W - x - 8.0;
    let mut y = BOX.1 + 4.0;
    g.push(Text::new(x, y, 3.2, "b", "Key"));
    y += 6.0;
    for (k, name) in s.series.iter().enumerate() {
        g.push(marker(k, (x + 2.0, y - 1.0), true));
        g.push(marker(k, (x + 6.0, y - 1.0), false));
        g.push(Text::new(x + 9.5, y, 3.0, "", name.clone()));
        y += 5.0;
    }
    for line in wrap_text(
        "filled: on the front (no other candidate is as good in every figure and better in one), its number in the list beside it where room; open: passing, not on the front",
        3.0,
        Weight::Regular,
        width,
    ) {
        g.push(Text::new(x, y, 3.0, "", line));
        y += 3.9;
    }
    y += 2.0;
    for note in &s.notes {
        for line in wrap_text(note, 3.0, Weight::Regular, width) {
            g.push(Text::new(x, y, 3.0, "", line));
            y += 3.9;
        }
        y += 1.2;
    }
}
