//! The legibility floor of the printed sheets, checked by walking the page tree: every demo
//! on every paper, and a sample of random designs.
//!
//! - no text under 2.5 mm font size (cap height about 1.8 mm, the smallest nominal lettering
//!   height of ISO 3098, from memory); table bodies and the winding-data sheet at least 3.5 mm;
//!   the compact winding-data block of sheet 1 (class `bench`, two columns) at least 2.5 mm;
//! - no two texts overlap, measured with the embedded font's glyph boxes; no text leaves the
//!   page or crosses the drawing frame;
//! - neighbouring coil-side lines of the developed diagram at least 1.0 mm apart on paper;
//! - every line cut at an edge of the developed diagram ends in one dot with one label
//!   (coil→slot or bar), dots on an edge with at least 0.2 mm of paper between them, and in the whole view both
//!   edges carry the same labels in the same order.

use crate::support;

use crate::support::random_design::{OFF, RandomDesign, Space, designs, fixed};
use crate::support::sheets::checked_pages;
use armsheet::layout::font::ink_extent;
use armsheet::layout::tree::{Circle, Group, Node, Page, Text};
use armsheet::layout::{Paper, Window};
use proptest::prelude::*;

/// Smallest font size anywhere, mm.
const FLOOR: f64 = 2.5;
/// Smallest font size of table bodies and the data block, mm.
const BODY_FLOOR: f64 = 3.5;
/// Least distance between neighbouring coil-side lines, mm.
const SIDE_GAP: f64 = 1.0;
/// Overlap below this is not counted, mm (far below what the eye sees).
const SLACK: f64 = 0.02;

pub(crate) const PAPERS: [Paper; 4] = [Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid];

/// A text placed on the page, with the classes and ids of the groups around it.
struct Placed<'a> {
    text: &'a Text,
    context: Vec<String>,
    /// Ink box: left, top, right, bottom, mm.
    bbox: (f64, f64, f64, f64),
}

fn ink_box(t: &Text, dx: f64, dy: f64) -> (f64, f64, f64, f64) {
    let (left, right) = t.span();
    let (up, down) = ink_extent(&t.content, t.size_mm, t.weight);
    let rad = t.rotate.unwrap_or(0.0).to_radians();
    let (ax, ay) = (dx + t.x, dy + t.y);
    let corners = [
        (left - t.x, -up),
        (right - t.x, -up),
        (left - t.x, down),
        (right - t.x, down),
    ];
    let mut b = (f64::MAX, f64::MAX, f64::MIN, f64::MIN);
    for (ex, ey) in corners {
        let x = ax + ex * rad.cos() - ey * rad.sin();
        let y = ay + ex * rad.sin() + ey * rad.cos();
        b = (b.0.min(x), b.1.min(y), b.2.max(x), b.3.max(y));
    }
    b
}

fn walk<'a>(
    nodes: &'a [Node],
    dx: f64,
    dy: f64,
    context: &mut Vec<String>,
    texts: &mut Vec<Placed<'a>>,
    sides: &mut Vec<f64>,
    dots: &mut Vec<(f64, f64)>,
) {
    for n in nodes {
        match n {
            Node::Group(g) => {
                let (tx, ty) = g.translate.unwrap_or((0.0, 0.0));
                let mut names = Vec::new();
                names.extend(g.id.clone());
                names.extend(
                    g.class
                        .iter()
                        .flat_map(|c| c.split(' ').map(str::to_string)),
                );
                let depth = context.len();
                context.extend(names);
                walk(&g.children, dx + tx, dy + ty, context, texts, sides, dots);
                context.truncate(depth);
            }
            Node::Text(t) if !t.content.trim().is_empty() => texts.push(Placed {
                text: t,
                context: context.clone(),
                bbox: ink_box(t, dx, dy),
            }),
            Node::Line(l)
                if (l.class == "side-top" || l.class == "side-bot")
                    && context.iter().any(|c| c == "coils") =>
            {
                sides.push(dx + l.from.0);
            }
            Node::Circle(c) if c.class == "cutdot" && context.iter().any(|c| c == "coils") => {
                dots.push((dx + c.cx, dy + c.cy))
            }
            _ => {}
        }
    }
}

/// Every breach of the floor on `page`, worded.
pub(crate) fn breaches(page: &Page) -> Vec<String> {
    let mut texts = Vec::new();
    let mut sides = Vec::new();
    let mut dots = Vec::new();
    walk(
        &page.children,
        0.0,
        0.0,
        &mut Vec::new(),
        &mut texts,
        &mut sides,
        &mut dots,
    );
    let frame = page
        .children
        .iter()
        .find_map(|n| match n {
            Node::Rect(r) if r.class.as_deref() == Some("frame") => {
                Some((r.x, r.y, r.x + r.w, r.y + r.h))
            }
            _ => None,
        })
        .unwrap_or((0.0, 0.0, page.width_mm, page.height_mm));
    let mut out = Vec::new();
    for p in &texts {
        let t = p.text;
        let body = p
            .context
            .iter()
            .any(|c| c == "row" || c == "datum" || c == "order-row" || c == "reading-row");
        let floor = if body { BODY_FLOOR } else { FLOOR };
        if t.size_mm < floor - 1e-9 {
            out.push(format!(
                "{:?} at {:.2} mm (floor {floor}) in {:?}",
                t.content, t.size_mm, p.context
            ));
        }
        let b = p.bbox;
        if b.0 < frame.0 - SLACK
            || b.1 < frame.1 - SLACK
            || b.2 > frame.2 + SLACK
            || b.3 > frame.3 + SLACK
        {
            out.push(format!(
                "{:?} box ({:.1}, {:.1})–({:.1}, {:.1}) leaves the frame",
                t.content, b.0, b.1, b.2, b.3
            ));
        }
    }
    let mut order: Vec<usize> = (0..texts.len()).collect();
    order.sort_by(|&a, &b| texts[a].bbox.0.total_cmp(&texts[b].bbox.0));
    for (i, &a) in order.iter().enumerate() {
        let ba = texts[a].bbox;
        for &b in &order[i + 1..] {
            let bb = texts[b].bbox;
            if bb.0 > ba.2 - SLACK {
                break;
            }
            let w = ba.2.min(bb.2) - ba.0.max(bb.0);
            let h = ba.3.min(bb.3) - ba.1.max(bb.1);
            if w > SLACK && h > SLACK {
                out.push(format!(
                    "{:?} and {:?} overlap by {w:.2} × {h:.2} mm near ({:.1}, {:.1})",
                    texts[a].text.content,
                    texts[b].text.content,
                    ba.0.max(bb.0),
                    ba.1.max(bb.1)
                ));
            }
        }
    }
    out.extend(edge_breaches(&texts, &dots));
    sides.sort_by(f64::total_cmp);
    for w in sides.windows(2) {
        let gap = w[1] - w[0];
        if gap < SIDE_GAP - 1e-9 {
            out.push(format!(
                "coil sides at x = {:.2} and {:.2} mm are {gap:.2} mm apart",
                w[0], w[1]
            ));
        }
    }
    out
}

/// Least distance between two dots on one edge, mm: at least 0.2 mm of paper shows between
/// two dots (the layout aims for 1.2 mm and reaches at least this).
const DOT_GAP: f64 = armsheet::layout::developed::nodes::CUT_DOT_FLOOR;

/// The edge-label breaches of a developed diagram: a dot without its own label, two dots
/// closer than [`DOT_GAP`], and in the whole view edges that read differently.
fn edge_breaches(texts: &[Placed<'_>], dots: &[(f64, f64)]) -> Vec<String> {
    let mut out = Vec::new();
    let whole = texts
        .iter()
        .any(|p| p.text.content.starts_with("whole armature shown"));
    let mut edges: Vec<f64> = dots.iter().map(|d| d.0).collect();
    edges.sort_by(f64::total_cmp);
    edges.dedup_by(|a, b| (*a - *b).abs() < 0.01);
    let mut sequences = Vec::new();
    for &x in &edges {
        let mut ys: Vec<f64> = dots
            .iter()
            .filter(|d| (d.0 - x).abs() < 0.01)
            .map(|d| d.1)
            .collect();
        ys.sort_by(f64::total_cmp);
        for w in ys.windows(2) {
            if w[1] - w[0] < DOT_GAP - 1e-9 {
                out.push(format!(
                    "edge dots at x = {x:.1}, y = {:.2} and {:.2} mm are {:.2} mm apart",
                    w[0],
                    w[1],
                    w[1] - w[0]
                ));
            }
        }
        let mut labels: Vec<(f64, &str)> = texts
            .iter()
            .filter(|p| {
                p.text.class.split(' ').any(|c| c == "cut-label")
                    && ((p.bbox.0 - x).abs() < 5.0 || (p.bbox.2 - x).abs() < 5.0)
            })
            .map(|p| (p.bbox.3, p.text.content.as_str()))
            .collect();
        labels.sort_by(|a, b| a.0.total_cmp(&b.0));
        if labels.len() != ys.len() {
            out.push(format!(
                "edge at x = {x:.1} has {} dots and {} labels",
                ys.len(),
                labels.len()
            ));
        }
        sequences.push(
            labels
                .into_iter()
                .map(|l| l.1.to_string())
                .collect::<Vec<_>>(),
        );
    }
    if whole && sequences.len() == 2 && sequences[0] != sequences[1] {
        out.push(format!(
            "the edges read differently: {:?} / {:?}",
            sequences[0], sequences[1]
        ));
    }
    out
}

/// Breaches of every sheet of `toml` on every paper, worded with where they are.
fn sheet_breaches(name: &str, toml: &str) -> Vec<String> {
    let checked = armsheet::check(support::design(toml));
    let mut out = Vec::new();
    for paper in PAPERS {
        for (i, page) in checked_pages(&checked, paper, Window::Auto)
            .iter()
            .enumerate()
        {
            for b in breaches(page) {
                out.push(format!("{name} {} sheet {}: {b}", paper.as_str(), i + 1));
            }
        }
    }
    out
}

fn report(all: &[String]) -> String {
    let shown: Vec<&str> = all.iter().take(25).map(String::as_str).collect();
    format!("{} breaches, first:\n{}", all.len(), shown.join("\n"))
}

#[test]
fn every_demo_sheet_meets_the_floor_on_every_paper() {
    let mut all = Vec::new();
    for name in support::DEMOS {
        all.extend(sheet_breaches(name, &support::demo(name)));
    }
    assert!(all.is_empty(), "{}", report(&all));
}

#[test]
fn the_floor_check_finds_small_overlapping_and_outside_text() {
    let checked = armsheet::check(support::design(&support::demo("hoist-lap")));
    let mut page = checked_pages(&checked, Paper::A4, Window::Auto).remove(0);
    assert!(breaches(&page).is_empty(), "{}", report(&breaches(&page)));
    page.children
        .push(Text::new(100.0, 100.0, 2.0, "", "small").into());
    page.children
        .push(Text::new(100.5, 100.2, 3.0, "", "on top").into());
    page.children
        .push(Text::new(295.0, 5.0, 3.0, "", "outside").into());
    // An extra edge dot beside the first one, with no label of its own.
    let first_dot = page
        .children
        .iter()
        .find_map(|n| first_cut_dot(n, 0.0, 0.0));
    let (dx, dy) = first_dot.expect("hoist-lap's whole view has edge dots");
    let mut coils = Group::id("coils");
    coils.push(Circle::new("cutdot", dx, dy + 0.5, 0.35));
    page.children.push(coils.into());
    let found = breaches(&page).join("\n");
    assert!(found.contains("0.50 mm apart"), "{found}");
    assert!(found.contains("dots and"), "{found}");
    assert!(found.contains("\"small\" at 2.00 mm"), "{found}");
    assert!(found.contains("overlap"), "{found}");
    assert!(found.contains("\"outside\" box"), "{found}");
}

/// The page position of the first edge dot under `n`.
fn first_cut_dot(n: &Node, dx: f64, dy: f64) -> Option<(f64, f64)> {
    match n {
        Node::Group(g) => {
            let (tx, ty) = g.translate.unwrap_or((0.0, 0.0));
            g.children
                .iter()
                .find_map(|c| first_cut_dot(c, dx + tx, dy + ty))
        }
        Node::Circle(c) if c.class == "cutdot" => Some((dx + c.cx, dy + c.cy)),
        _ => None,
    }
}

/// The designs the random search once found below the floor (kept in
/// `legibility.proptest-regressions` in an older strategy's terms): 2-pole laps of 97 slots
/// (duplex), 14 and 22 slots.
#[test]
fn designs_the_random_search_found_meet_the_floor() {
    for (slots, m) in [(97, 2), (14, 1), (22, 1)] {
        let d = fixed(2, slots, 1, false, m, slots / 2);
        let all = sheet_breaches("found", &d.toml());
        assert!(all.is_empty(), "{}\n{}", d.toml(), report(&all));
    }
}

/// P 2-8, u 1-3, m 1-2, m + 2 segments a pole at least, the span the pole pitch, up to 90
/// slots above the fewest.
fn case() -> impl Strategy<Value = RandomDesign> {
    designs(Space {
        pole_pairs: 1..=4,
        coils_per_slot: 1..=3,
        multiplicity: 1..=2,
        retrogressive: OFF,
        ccw: OFF,
        generator: OFF,
        span_delta: 0..=0,
        lead_offset: 0..=0,
        room: 2,
        more_slots: 90,
        ..Space::default()
    })
}

proptest! {
    #![proptest_config(support::properties(12))]

    #[test]
    fn random_designs_meet_the_floor(c in case()) {
        let toml = format!(
            "[job]\nid = \"R-{s}\"\ntitle = \"Random design {p}-pole, {s} slots, u = {u}\"\n\n{design}",
            p = c.poles,
            s = c.slots,
            u = c.u,
            design = c.toml(),
        );
        let all = sheet_breaches("random", &toml);
        prop_assert!(all.is_empty(), "{}\n{}", toml, report(&all));
    }
}

/// Readings for `t`'s listed pairs: the expected ones in micro-ohms (or as given for units of
/// a coil), every `every`-th pair `factor` times its value, so the locator finds suspects.
fn readings_for(
    t: &armsheet::features::armature_test::ArmatureTest,
    every: usize,
    factor: f64,
) -> String {
    let mut s = String::from("from_bar,to_bar,reading\n");
    let rows = t.listed();
    for (i, r) in rows.enumerate() {
        if let Some(e) = r.expected {
            let f = if every > 0 && i % every == 0 {
                factor
            } else {
                1.0
            };
            s.push_str(&format!("{},{},{}\n", r.from_bar, r.to_bar, e * 1e6 * f));
        }
    }
    s
}

#[test]
fn every_demo_readings_plot_meets_the_floor() {
    use armsheet::features::armature_test::{TestOptions, armature_test};
    use armsheet::layout::readings_plot::readings_plot_page;
    let mut all = Vec::new();
    for name in support::DEMOS {
        let c = armsheet::check(support::design(&support::demo(name)));
        let plain = armature_test(&c.design, &c.winding, &TestOptions::default(), None).unwrap();
        // Expected only; healthy readings; one pair 36 times high; suspects all round (every 7th
        // pair doubled: many numbered bars that must not collide).
        let mut cases = vec![("expected", plain)];
        let t = &cases[0].1;
        let texts = [
            ("healthy", readings_for(t, 0, 1.0)),
            ("many", readings_for(t, 7, 2.0)),
        ];
        let first_high = {
            let base = readings_for(t, 0, 1.0);
            let mut lines: Vec<String> = base.lines().map(String::from).collect();
            if let Some(l) = lines.get_mut(10) {
                let f: Vec<&str> = l.split(',').collect();
                let v: f64 = f[2].parse().unwrap();
                *l = format!("{},{},{}", f[0], f[1], v * 36.0);
            }
            lines.join("\n")
        };
        for (label, text) in texts.into_iter().chain([("spike", first_high)]) {
            if let Ok(t) =
                armature_test(&c.design, &c.winding, &TestOptions::default(), Some(&text))
            {
                cases.push((label, t));
            }
        }
        assert!(cases.len() >= 4, "{name}: the readings cases must all run");
        for (label, t) in &cases {
            let page = readings_plot_page(t, name, &[]);
            for b in breaches(&page) {
                all.push(format!("{name} plot ({label}): {b}"));
            }
        }
    }
    assert!(all.is_empty(), "{}", report(&all));
}
