//! The search plot holds the legibility floor with many candidates, ticks its axes at round
//! values and draws one marker a candidate, filled on the front.

use crate::legibility::breaches;
use armsheet::layout::front_plot::{Scatter, ScatterPoint, front_plot_page};
use armsheet::layout::tree::{Node, Page, PathOp};

fn scatter(n: usize) -> Scatter {
    // A spread of points on three series, every 7th on the front (invented figures).
    let points = (0..n)
        .map(|i| {
            let t = i as f64;
            ScatterPoint {
                x: 1.2 + (t * 0.37) % 4.1,
                y: 800.0 + (t * 53.0) % 2300.0,
                series: i % 3,
                front: i % 7 == 0,
                number: i + 1,
            }
        })
        .collect();
    Scatter {
        title: "Search: invented frame, 4 poles, 220 V".into(),
        x_label: "reactance voltage, V".into(),
        y_label: "copper loss at 75 \u{b0}C, W".into(),
        series: vec!["lap".into(), "wave".into(), "frog-leg".into()],
        points,
        notes: vec!["every candidate that passes check, 12,345 evaluated".into()],
    }
}

fn classes<'a>(nodes: &'a [Node], out: &mut Vec<(&'a str, Vec<(f64, f64)>)>) {
    for n in nodes {
        match n {
            Node::Group(g) => classes(&g.children, out),
            Node::Path(p) => out.push((
                p.class.as_deref().unwrap_or(""),
                p.ops
                    .iter()
                    .filter_map(|op| match op {
                        PathOp::Move(x, y) | PathOp::Line(x, y) => Some((*x, *y)),
                        PathOp::Close => None,
                    })
                    .collect(),
            )),
            _ => {}
        }
    }
}

fn paths(page: &Page) -> Vec<(&str, Vec<(f64, f64)>)> {
    let mut out = Vec::new();
    classes(&page.children, &mut out);
    out
}

#[test]
fn the_plot_holds_the_floor_with_many_candidates() {
    for n in [1, 5, 60, 400] {
        let page = front_plot_page(&scatter(n));
        let all = breaches(&page);
        assert!(all.is_empty(), "{n} points: {all:#?}");
        assert_eq!(page.kind.data_page(), "search-front");
    }
}

#[test]
fn one_marker_a_candidate_filled_on_the_front() {
    let s = scatter(60);
    let page = front_plot_page(&s);
    let p = paths(&page);
    let on = p.iter().filter(|(c, _)| *c == "mark-on").count();
    let off = p.iter().filter(|(c, _)| *c == "mark-off").count();
    let front = s.points.iter().filter(|q| q.front).count();
    // The key draws one filled and one open marker per series.
    assert_eq!(on, front + s.series.len());
    assert_eq!(off, s.points.len() - front + s.series.len());
}

#[test]
fn ticks_are_round_values() {
    let page = front_plot_page(&scatter(60));
    let texts: Vec<String> = page
        .texts()
        .iter()
        .map(|(_, _, t)| t.content.clone())
        .collect();
    // x runs 0…5.3 → 0, 2, 4, 6; y 0…3,099 → 0, 1000, …, 4000 (about five steps of 1, 2 or
    // 5 × 10ⁿ, the axis rounded out to a whole step).
    for t in ["0", "2", "4", "6", "1000", "2000", "3000", "4000"] {
        assert!(texts.iter().any(|s| s == t), "tick {t}: {texts:?}");
    }
}

/// The demo frame's search drawn: every fit a marker, the page at the floor; through the
/// binary, `--plot` writes it.
#[test]
fn the_demo_search_is_plotted() {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/designs/frames/hoist-frame.toml"
    );
    let frame = armsheet::design::parse_frame_bytes(&std::fs::read(path).unwrap(), path).unwrap();
    let found = armsheet::features::explore::explore(&frame);
    let page = armsheet::layout::front_plot::search_front_page(&found, "hoist frame");
    assert!(breaches(&page).is_empty(), "{:#?}", breaches(&page));
    let p = paths(&page);
    let markers = p
        .iter()
        .filter(|(c, _)| *c == "mark-on" || *c == "mark-off")
        .count();
    let kinds: std::collections::BTreeSet<&str> = found
        .fits
        .iter()
        .map(|k| k.structure.kind.as_str())
        .collect();
    assert_eq!(markers, found.fits.len() + 2 * kinds.len());
    let dir = crate::support::scratch("explore-plot");
    let out = crate::support::armsheet_in(&["explore", path, "--plot", "front.svg"], &dir);
    assert_eq!(out.status.code(), Some(0));
    let svg = std::fs::read_to_string(dir.join("front.svg")).unwrap();
    assert!(svg.contains("data-page=\"search-front\""));
    assert!(svg.contains("average reactance voltage of the coil under commutation, V"));
}
