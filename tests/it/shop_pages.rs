//! The shop pages of the sheet set: every page names itself in `data-page`, the commutator
//! end view carries the lead swing and the throw in shop words, and the winding order lists
//! every coil once, slot by slot, with its check-off boxes.

use crate::support;

use crate::support::sheets::checked_pages;
use armsheet::layout::tree::{Node, Page, PageKind};
use armsheet::layout::{Paper, Window};
use armsheet::render::svg::page_svg;

fn pages(name: &str) -> Vec<Page> {
    let checked = armsheet::check(support::design(&support::demo(name)));
    checked_pages(&checked, Paper::A4, Window::Auto)
}

fn texts(page: &Page) -> Vec<String> {
    page.texts().iter().map(|t| t.2.content.clone()).collect()
}

fn count(nodes: &[Node], class: &str) -> usize {
    nodes
        .iter()
        .map(|n| match n {
            Node::Group(g) => count(&g.children, class),
            Node::Rect(r) => usize::from(r.class.as_deref() == Some(class)),
            _ => 0,
        })
        .sum()
}

#[test]
fn every_page_names_itself() {
    for name in support::DEMOS {
        let ps = pages(name);
        for p in &ps {
            let svg = page_svg(p);
            let root = svg.lines().find(|l| l.starts_with("<svg")).unwrap();
            assert!(
                root.contains(&format!("data-page=\"{}\"", p.kind.data_page())),
                "{name}: {root}"
            );
        }
        let kinds: Vec<PageKind> = ps.iter().map(|p| p.kind).collect();
        assert_eq!(kinds[0], PageKind::Diagram, "{name}");
        assert_eq!(
            kinds
                .iter()
                .filter(|k| **k == PageKind::CommutatorEnd)
                .count(),
            1,
            "{name}"
        );
        assert!(kinds.contains(&PageKind::WindingOrder), "{name}");
    }
}

#[test]
fn the_commutator_end_view_says_where_bar_1_is() {
    let ps = pages("hoist-lap");
    let ring = ps
        .iter()
        .find(|p| p.kind == PageKind::CommutatorEnd)
        .unwrap();
    let all = texts(ring).join(" ");
    // hoist-lap: slot 1's centre line lies on the mica 33/34, bar 1 is 3.5 bars on; coil 1
    // goes to bars 1 and 2 (y_c = +1).
    assert!(all.contains("mica between bars 33 and 34"), "{all}");
    assert!(all.contains("+3.5 bars"), "{all}");
    assert!(
        all.contains("Commutator throw 1\u{2013}2 (y_c = +1)"),
        "{all}"
    );
    assert!(all.contains("Schematic"), "{all}");
    // Every brush is drawn, with its name and polarity.
    for b in ["B1\u{2212}", "B2+", "B3\u{2212}", "B4+"] {
        assert!(texts(ring).iter().any(|t| t == b), "{b}");
    }
}

#[test]
fn the_winding_order_lists_every_coil_once_with_its_boxes() {
    for name in ["hoist-lap", "conveyor-wave-dummy"] {
        let ps = pages(name);
        let checked = armsheet::check(support::design(&support::demo(name)));
        let order: Vec<&Page> = ps
            .iter()
            .filter(|p| p.kind == PageKind::WindingOrder)
            .collect();
        let mut steps = Vec::new();
        let mut boxes = 0;
        for p in &order {
            let svg = page_svg(p);
            for l in svg.lines().filter(|l| l.contains("class=\"order-row\"")) {
                let i = l.find("data-coil=\"").unwrap() + 11;
                steps.push(l[i..i + l[i..].find('"').unwrap()].parse::<u32>().unwrap());
            }
            boxes += count(&p.children, "checkbox");
        }
        let coils: Vec<u32> = checked.winding.connections.iter().map(|c| c.coil).collect();
        assert_eq!(steps, coils, "{name}");
        // Three boxes to tick (in, connected, soldered) and one to initial, each row.
        assert_eq!(boxes, 4 * coils.len(), "{name}");
        let first = texts(order[0]).join(" ");
        assert!(first.contains("lifted until the bottom sides"), "{first}");
    }
    let hoist = pages("hoist-lap");
    let order = hoist
        .iter()
        .find(|p| p.kind == PageKind::WindingOrder)
        .unwrap();
    assert!(
        texts(order)
            .iter()
            .any(|t| t == "4 turns, 2 in hand, \u{d8}1.60; top lifted")
    );
}

#[test]
fn the_pdf_is_titled_from_the_job() {
    let ps = pages("hoist-lap");
    assert_eq!(
        ps[0].document,
        "CW-2611 \u{b7} Hoist motor, 4-pole simplex lap"
    );
    let pdf = armsheet::render::pdf::sheets_pdf(&ps).unwrap();
    let raw = String::from_utf8_lossy(&pdf);
    assert!(raw.contains("/Title"), "no document title");
}

/// The rows of class `class` on `page`, each with its texts.
fn rows_of(nodes: &[Node], class: &str, out: &mut Vec<Vec<String>>) {
    for n in nodes {
        if let Node::Group(g) = n {
            if g.class.as_deref() == Some(class) {
                let mut t = Vec::new();
                for c in &g.children {
                    if let Node::Text(x) = c {
                        t.push(x.content.clone());
                    }
                }
                out.push(t);
            } else {
                rows_of(&g.children, class, out);
            }
        }
    }
}

#[test]
fn an_a4_winding_order_sheet_holds_30_steps() {
    // The mill's 1,056 coils: every winding-order sheet holds 30 steps or more.
    let ps = pages("mill-lap-12p");
    let per_page: Vec<usize> = ps
        .iter()
        .filter(|p| p.kind == PageKind::WindingOrder)
        .map(|p| {
            let mut r = Vec::new();
            rows_of(&p.children, "order-row", &mut r);
            r.len()
        })
        .collect();
    assert!(per_page.len() > 2);
    assert!(per_page.iter().all(|n| *n >= 30), "{per_page:?}");
}

#[test]
fn frog_leg_order_cells_are_whole_on_every_paper() {
    let checked = armsheet::check(support::design(&support::demo("mill-frog-leg")));
    for paper in Paper::ALL {
        let ps = checked_pages(&checked, paper, Window::Auto);
        let mut rows = Vec::new();
        for p in ps.iter().filter(|p| p.kind == PageKind::WindingOrder) {
            rows_of(&p.children, "order-row", &mut rows);
        }
        assert_eq!(rows.len(), checked.winding.connections.len(), "{paper:?}");
        for r in &rows {
            assert!(
                r.iter().all(|t| !t.contains('\u{2026}')),
                "{paper:?}: {r:?}"
            );
            // step, coil, element, top, bottom, start bar, end bar, turns and wire.
            assert!(r[2] == "lap" || r[2] == "wave", "{paper:?}: {r:?}");
            assert!(
                r[7].starts_with("1 turn, 1 in hand, 7.10\u{d7}2.24"),
                "{paper:?}: {r:?}"
            );
        }
        assert!(rows.iter().any(|r| r[7].ends_with("; top lifted")));
    }
}

#[test]
fn every_equalizer_ring_has_boxes_to_tick() {
    let ps = pages("mill-lap-12p");
    let eq: Vec<&Page> = ps
        .iter()
        .filter(|p| p.kind == PageKind::Equalizers)
        .collect();
    assert!(!eq.is_empty());
    let mut rings = 0;
    let mut boxes = 0;
    for p in eq {
        let mut r = Vec::new();
        rows_of(&p.children, "row", &mut r);
        rings += r.len();
        boxes += count(&p.children, "checkbox");
        let all = texts(p).join(" ");
        assert!(all.contains("fitted") && all.contains("sol-"), "{all}");
    }
    assert!(rings > 0);
    // Fitted and soldered, each ring.
    assert_eq!(boxes, 2 * rings);
}
