//! The coil-making sheet: in the set before the winding order when the design has a coil
//! making, never without one; its wire to order is the rating's, repeated on the winding
//! order's first page; each coil is drawn at the scale its title states.

use crate::support;
use crate::support::sheets::checked_pages;
use armsheet::layout::tree::{Node, Page, PageKind, PathOp};
use armsheet::layout::{Paper, Window};

fn outlines(nodes: &[Node], out: &mut Vec<Vec<(f64, f64)>>) {
    for n in nodes {
        match n {
            Node::Group(g) => outlines(&g.children, out),
            Node::Path(p) if p.class.as_deref() == Some("coil-outline") => out.push(
                p.ops
                    .iter()
                    .filter_map(|op| match op {
                        PathOp::Move(x, y) | PathOp::Line(x, y) => Some((*x, *y)),
                        PathOp::Close => None,
                    })
                    .collect(),
            ),
            _ => {}
        }
    }
}

fn texts(p: &Page) -> Vec<String> {
    p.texts()
        .iter()
        .map(|(_, _, t)| t.content.clone())
        .collect()
}

#[test]
fn the_coil_sheet_comes_before_the_order_with_the_rating_s_wire() {
    let mut seen = 0;
    for name in support::DEMOS {
        let checked = armsheet::check(support::design(&support::demo(name)));
        let making = checked.rating.as_ref().and_then(|r| r.coil_making.clone());
        for paper in [Paper::A4, Paper::Letter] {
            let pages = checked_pages(&checked, paper, Window::Auto);
            let at = pages.iter().position(|p| p.kind == PageKind::CoilMaking);
            let order = pages
                .iter()
                .position(|p| p.kind == PageKind::WindingOrder)
                .unwrap();
            let Some(k) = &making else {
                assert!(at.is_none(), "{name}: a coil page without a coil making");
                continue;
            };
            seen += 1;
            let at = at.unwrap_or_else(|| panic!("{name}: no coil-making page"));
            assert!(at < order, "{name}: the coils are made before the order");
            assert_eq!(pages[at].kind.data_page(), "coil-making");
            let t = texts(&pages[at]);
            let u = checked.design.units;
            let total = u.wire_length(k.wire_m_total, 1);
            assert!(
                t.iter().any(|s| s.contains(&total)),
                "{name}: {total} in {t:?}"
            );
            let bare = u.mass(k.mass_kg_bare, 2);
            assert!(t.iter().any(|s| s == &bare), "{name}: {bare}");
            // The order's first page repeats the wire to order when its line has room beside
            // the heading (the hoist's has, on A4).
            let first = texts(&pages[order]);
            let line = first.iter().find(|s| s.starts_with("Wire to order: "));
            if let Some(line) = line {
                assert!(line.contains(&total), "{name}: {line}");
            }
            if name == "hoist-lap" && paper == Paper::A4 {
                assert!(line.is_some(), "{name}: {first:?}");
            }
            // Each coil at its stated scale: the outline is the span arc wide.
            let mut o = Vec::new();
            outlines(&pages[at].children, &mut o);
            assert_eq!(o.len(), k.shapes.len());
            let titles: Vec<&String> = t
                .iter()
                .filter(|s| s.contains("coil, scale 1:") || s.contains("schematic"))
                .collect();
            assert_eq!(titles.len(), k.shapes.len());
            for ((shape, pts), title) in k.shapes.iter().zip(&o).zip(titles) {
                if let Some(n) = title.split("scale 1:").nth(1) {
                    let n: f64 = n.trim().parse().unwrap();
                    let xs = pts.iter().map(|p| p.0);
                    let w = xs.clone().fold(f64::MIN, f64::max) - xs.fold(f64::MAX, f64::min);
                    assert!(
                        (w - shape.span_arc_mm / n).abs() < 1e-6,
                        "{name}: {w} mm drawn for {} at 1:{n}",
                        shape.span_arc_mm
                    );
                }
            }
        }
    }
    assert!(seen >= 3, "demos with a coil making: {seen}");
}

fn caution_text(nodes: &[Node], inside: bool, out: &mut Vec<String>) {
    for n in nodes {
        match n {
            Node::Group(g) => {
                let here = inside || g.id.as_deref() == Some("caution");
                caution_text(&g.children, here, out);
            }
            Node::Text(t) if inside => out.push(t.content.clone()),
            _ => {}
        }
    }
}

/// Every sheet of every demo, on every paper, carries every caution whole (a short box sets
/// them smaller, tighter or in two columns; it never cuts one).
#[test]
fn every_sheet_carries_every_caution_whole() {
    for name in support::DEMOS {
        let checked = armsheet::check(support::design(&support::demo(name)));
        for paper in [Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid] {
            for (i, page) in checked_pages(&checked, paper, Window::Auto)
                .iter()
                .enumerate()
            {
                let mut t = Vec::new();
                caution_text(&page.children, false, &mut t);
                let joined = t.join(" ");
                for c in armsheet::base::caution::CAUTIONS {
                    assert!(
                        joined.contains(c),
                        "{name} {paper:?} sheet {}: {c:?} not whole in {joined:?}",
                        i + 1
                    );
                }
            }
        }
    }
}
