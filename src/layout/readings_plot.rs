//! The armature test's plot: the readings round the commutator, expected and measured, with
//! the suspect bars marked.
//!
//! Part of the `layout` stage: a computed [`ArmatureTest`] in, one [`Page`] out (an A4
//! landscape page in millimetres). Each pair of bars is a spoke at the angle of the mica
//! between them, bar 1 at the top, bars rising clockwise; a reading is drawn as the distance
//! from the inner circle, so a sound armature draws a smooth ring and a fault a spike.
//! Measured readings are drawn at the locator's fitted scale. Rings at a quarter, a half, three
//! quarters and the whole of twice the largest expected reading (a spike beyond is cut at the
//! outer ring) carry their values in the
//! test's prefixed unit (µΩ, mΩ, Ω or coil); the suspect bars carry their numbers; the side
//! column gives the verdict first, then the legend, the units (the readings' as given) and the
//! cautions.

use std::f64::consts::PI;

use super::font::{Weight, wrap_text};
use super::sheet::title::failure_band;
use super::sheet::{BAND_HEIGHT, Rect as SheetRect};
use super::tree::{Circle, Group, Page, PageKind, PageUnit, Path, Rect, Text};
use crate::base::caution::TEST_CAUTIONS;
use crate::base::number::{Prefix, fmt_fixed, fmt_prefixed, fmt_sig};
use crate::features::armature_test::{ArmatureTest, ReadingValue, Unit};

const W: f64 = 297.0;
const H: f64 = 210.0;
const CX: f64 = 105.0;
const CY: f64 = 108.0;
const R0: f64 = 40.0;
/// The cautions' font size, mm (the legibility floor is 2.5 mm).
const CAUTION_SIZE: f64 = 3.0;
const SPAN: f64 = 45.0;

fn at(angle: f64, r: f64) -> (f64, f64) {
    (CX + r * angle.sin(), CY - r * angle.cos())
}

/// The scale of a plot: the angle of each pair of bars and the radius of each reading.
struct Plot {
    /// Bars round the commutator.
    c: f64,
    /// The largest expected reading.
    top: f64,
}

impl Plot {
    /// The angle of the mica between bar `from` and the next, radians from the top.
    fn angle(&self, from: u32) -> f64 {
        2.0 * PI * (f64::from(from) - 0.5) / self.c
    }

    /// The radius of a reading `v`. Up to twice the largest expected reading fits; beyond,
    /// the spike is cut at the edge.
    fn radius(&self, v: f64) -> f64 {
        R0 + SPAN * (v / (2.0 * self.top)).clamp(0.0, 1.0)
    }
}

/// The plot page of `t`, titled `title`; `failures` are the design's failed error-level checks
/// (`Checked::failures`): when any, the page carries the sheets' "not for winding" band.
pub fn readings_plot_page(t: &ArmatureTest, title: &str, failures: &[String]) -> Page {
    let rows = t.judged();
    let plot = Plot {
        c: f64::from(t.bars),
        top: rows
            .iter()
            .filter_map(|r| r.expected)
            .fold(0.0_f64, f64::max)
            .max(1e-300),
    };
    let mut g = Group::id("readings");
    g.push(scale_rings(t, &plot));
    let step = (t.bars / 24).max(1);
    for r in rows.iter().filter(|r| (r.from_bar - 1) % step == 0) {
        let (x, y) = at(plot.angle(r.from_bar), R0 + SPAN + 4.0);
        g.push(Text::new(x, y + 1.0, 2.5, "mid", r.from_bar.to_string()));
    }
    let expected: Vec<(f64, f64)> = rows
        .iter()
        .map(|r| {
            at(
                plot.angle(r.from_bar),
                plot.radius(r.expected.unwrap_or(0.0)),
            )
        })
        .chain(rows.first().map(|r| {
            at(
                plot.angle(r.from_bar),
                plot.radius(r.expected.unwrap_or(0.0)),
            )
        }))
        .collect();
    g.push(Path::polyline("conn k1", &expected));
    let mut legend = vec![("conn k1", "expected (a spike is cut at the outer ring)", "")];
    if t.location.is_some() {
        measured_and_suspects(&mut g, t, &plot);
        legend.push(("conn k2", "measured (fitted scale)", "d2"));
    }
    let mut page = Page {
        kind: PageKind::TestPlot,
        title: title.to_string(),
        document: title.to_string(),
        width_mm: W,
        height_mm: H,
        unit: PageUnit::Millimetres,
        data: Vec::new(),
        children: vec![
            Rect::filled("#fff", 0.0, 0.0, W, H).into(),
            Text::new(
                12.0,
                14.0,
                4.0,
                "b",
                format!("Bar-to-bar readings: {title}"),
            )
            .into(),
            g.into(),
            side_notes(t, &legend).into(),
        ],
    };
    if !failures.is_empty() {
        let band = SheetRect {
            x: 6.0,
            y: 1.0,
            w: W - 12.0,
            h: BAND_HEIGHT,
        };
        page.children.push(failure_band(&band, failures).into());
    }
    page
}

/// The measured readings at the locator's fitted scale, a line broken where a pair was not
/// read, and a dot at each suspect bar.
fn measured_and_suspects(g: &mut Group, t: &ArmatureTest, plot: &Plot) {
    let Some(l) = &t.location else { return };
    let by_pair: std::collections::BTreeMap<(u32, u32), ReadingValue> = l
        .measured
        .iter()
        .map(|(r, m)| ((r.from_bar, r.to_bar), *m))
        .collect();
    let scale = l.healthy_scale.max(1e-300);
    // Dashed as well as coloured, so the two lines part in greyscale.
    let mut measured = Group::class("d2");
    let mut run: Vec<(f64, f64)> = Vec::new();
    for r in t.judged() {
        match by_pair.get(&(r.from_bar, r.to_bar)) {
            Some(ReadingValue::Value(v)) => {
                run.push(at(plot.angle(r.from_bar), plot.radius(v / scale)));
            }
            Some(ReadingValue::Open) => run.push(at(plot.angle(r.from_bar), R0 + SPAN)),
            None => {
                if run.len() > 1 {
                    measured.push(Path::polyline("conn k2", &run));
                }
                run.clear();
            }
        }
    }
    if run.len() > 1 {
        measured.push(Path::polyline("conn k2", &run));
    }
    g.push(measured);
    for &b in &l.suspect_bars {
        let (x, y) = at(2.0 * PI * (f64::from(b) - 1.0) / plot.c, R0 - 3.0);
        g.push(Circle::new("f2", x, y, 1.2));
    }
    // Each run of neighbouring suspect bars numbered once (`21-22`), inside its dots at the
    // run's middle, where it clears the numbers already placed (the verdict lists every
    // suspect bar).
    let mut runs: Vec<(u32, u32)> = Vec::new();
    for &b in &l.suspect_bars {
        match runs.last_mut() {
            Some((_, last)) if *last + 1 == b => *last = b,
            _ => runs.push((b, b)),
        }
    }
    let mut placed: Vec<(f64, f64)> = Vec::new();
    for (first, last) in runs {
        let middle = (f64::from(first) + f64::from(last)) / 2.0;
        let angle = 2.0 * PI * (middle - 1.0) / plot.c;
        let words = if first == last {
            first.to_string()
        } else {
            format!("{first}-{last}")
        };
        let label = Text::new(0.0, 0.0, 3.0, "mid b", words);
        // Far enough inside that the text's half-width, seen along the spoke, clears the dots.
        let inward = 6.0 + label.width_mm / 2.0 * angle.sin().abs();
        let (lx, ly) = at(angle, R0 - inward);
        if placed
            .iter()
            .all(|&(px, py)| (px - lx).abs() > 11.0 || (py - ly).abs() > 3.5)
        {
            placed.push((lx, ly));
            g.push(Text {
                x: lx,
                y: ly + 1.0,
                ..label
            });
        }
    }
}

/// The test's unit of the bar-to-bar readings as printed: `mΩ`, `µΩ`, `Ω` or `coil`.
fn unit_symbol(t: &ArmatureTest) -> String {
    match t.unit {
        Unit::Ohm => format!("{}\u{3a9}", t.reading_prefix().symbol()),
        Unit::Coil => "coil".into(),
    }
}

/// The radial scale: the inner circle is zero; rings at a quarter, a half, three quarters and
/// all of twice the largest expected reading, each with its value in the test's unit, written
/// just inside the ring to the right of the top.
fn scale_rings(t: &ArmatureTest, plot: &Plot) -> Group {
    let mut g = Group::id("scale");
    let p = t.reading_prefix();
    g.push(Circle::new("thin", CX, CY, R0));
    g.push(Text::new(CX + 1.5, CY - R0 + 3.2, 2.5, "", "0"));
    for k in 1..=4 {
        let v = 2.0 * plot.top * f64::from(k) / 4.0;
        let r = plot.radius(v);
        g.push(Circle::new("thin", CX, CY, r));
        let words = format!("{} {}", fmt_prefixed(v, p), unit_symbol(t));
        g.push(Text::new(CX + 1.5, CY - r + 3.2, 2.5, "", words));
    }
    g
}

/// The verdict in words, for the side column: healthy or not with the suspect bars and the
/// best-fitting fault, or that only expected readings are drawn.
fn verdict_words(t: &ArmatureTest) -> (String, Vec<String>) {
    let Some(l) = &t.location else {
        return (
            "Expected readings only".into(),
            vec!["give the measured readings with --readings to compare them".into()],
        );
    };
    if l.healthy {
        return (
            "Verdict: healthy".into(),
            vec![format!(
                "every reading within {} % of the healthy pattern",
                fmt_fixed(100.0 * l.tolerance, 1)
            )],
        );
    }
    // At most twelve bars named; the report lists them all.
    let bars: Vec<String> = l.suspect_bars.iter().take(12).map(u32::to_string).collect();
    let more = match l.suspect_bars.len() {
        n if n > 12 => format!(" and {} more ({n} in all, listed in test.txt)", n - 12),
        _ => String::new(),
    };
    let mut lines = vec![format!("suspect bars {}{more}", bars.join(", "))];
    if let Some(f) = l.faults.first() {
        let bars: Vec<String> = f.bars.iter().take(12).map(u32::to_string).collect();
        lines.push(format!(
            "best fit: {} at bars {}",
            f.kind.key(),
            bars.join(", ")
        ));
    }
    ("Verdict: NOT HEALTHY".into(), lines)
}

/// The side column: the legend of the lines (class, words, dash class), the unit, and the
/// cautions.
fn side_notes(t: &ArmatureTest, legend: &[(&str, &str, &str)]) -> Group {
    let mut side = Group::id("notes");
    let x0 = 200.0;
    // The side column's width, to the page margin.
    let width = W - x0 - 10.0;
    let mut y = 26.0;
    let (head, lines) = verdict_words(t);
    side.push(Text::new(x0, y, 4.0, "b", head));
    for l in lines {
        for line in wrap_text(&l, 3.0, Weight::Regular, width) {
            y += 4.2;
            side.push(Text::new(x0, y, 3.0, "", line));
        }
    }
    y += 9.0;
    for (class, words, dash) in legend {
        let line = Path::polyline(class, &[(x0, y - 1.0), (x0 + 8.0, y - 1.0)]);
        if dash.is_empty() {
            side.push(line);
        } else {
            let mut key = Group::class(*dash);
            key.push(line);
            side.push(key);
        }
        side.push(Text::new(x0 + 10.0, y, 3.0, "", *words));
        y += 6.0;
    }
    if t.location
        .as_ref()
        .is_some_and(|l| !l.suspect_bars.is_empty())
    {
        side.push(Circle::new("f2", x0 + 4.0, y - 1.0, 1.2));
        side.push(Text::new(x0 + 10.0, y, 3.0, "", "suspect bar (numbered)"));
        y += 6.0;
    }
    let mut units = vec![match t.coil_resistance_ohm {
        Some(r) => format!(
            "readings in {} (one coil {} \u{3a9} at {} \u{b0}C)",
            unit_symbol(t),
            fmt_sig(r, 4),
            fmt_fixed(t.temperature_c, 1)
        ),
        None => "readings in units of one coil's resistance (no conductor data)".into(),
    }];
    if let Some(l) = &t.location {
        let given = match (t.unit, Prefix::of_scale(l.healthy_scale)) {
            (Unit::Ohm, Some(p)) => format!("{}\u{3a9}", p.symbol()),
            (Unit::Ohm, _) => format!(
                "the file's own unit (one \u{3a9} reads {})",
                fmt_sig(l.healthy_scale, 4)
            ),
            (Unit::Coil, _) => format!(
                "the file's own unit (one coil reads {})",
                fmt_sig(l.healthy_scale, 4)
            ),
        };
        units.push(format!(
            "measured readings as given: {given}; drawn at the fitted scale"
        ));
    }
    for u in units {
        for line in wrap_text(&u, 3.0, Weight::Regular, width) {
            y += 4.2;
            side.push(Text::new(x0, y, 3.0, "", line));
        }
    }
    let mut cy = (y + 10.0).max(128.0);
    side.push(Text::new(x0, cy, 3.0, "b", "Caution"));
    // The cautions whole, wrapped to the side column between x0 and the page margin.
    for c in TEST_CAUTIONS {
        cy += 2.0;
        for line in wrap_text(c, CAUTION_SIZE, Weight::Regular, width) {
            cy += 4.2;
            side.push(Text::new(x0, cy, CAUTION_SIZE, "", line));
        }
    }
    side
}
