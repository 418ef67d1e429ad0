//! The winding-order sheets as a winder works from them: every cell whole and clear of its
//! neighbours on every demo and paper, at least 30 steps an A4 sheet, and a frog-leg's order
//! that places every coil side of both elements once across the slot, the lap element first,
//! each element's tops lifted for its closing throw.

use std::collections::BTreeSet;

use crate::support;
use crate::support::sheets::checked_pages;
use armsheet::layout::font::ink_extent;
use armsheet::layout::tree::{Node, Page, PageKind, Text};
use armsheet::layout::{Paper, Window};

/// Every demo, with the identified sawmill.
fn demos() -> Vec<&'static str> {
    let mut d = support::DEMOS.to_vec();
    d.push("sawmill-identified");
    d
}

fn order_pages(name: &str, paper: Paper) -> (armsheet::checks::Checked, Vec<Page>) {
    let checked = armsheet::check(support::design(&support::demo(name)));
    let pages = checked_pages(&checked, paper, Window::Auto)
        .into_iter()
        .filter(|p| p.kind == PageKind::WindingOrder)
        .collect();
    (checked, pages)
}

/// The order rows of `nodes`, each with its text cells in column order.
fn rows_of(nodes: &[Node], out: &mut Vec<Vec<String>>) {
    for n in nodes {
        if let Node::Group(g) = n {
            if g.class.as_deref() == Some("order-row") {
                out.push(
                    g.children
                        .iter()
                        .filter_map(|c| match c {
                            Node::Text(t) => Some(t.content.clone()),
                            _ => None,
                        })
                        .collect(),
                );
            } else {
                rows_of(&g.children, out);
            }
        }
    }
}

fn rows(pages: &[Page]) -> Vec<Vec<String>> {
    let mut out = Vec::new();
    for p in pages {
        rows_of(&p.children, &mut out);
    }
    out
}

/// The ink box of an unrotated text: left, top, right, bottom, mm.
fn ink(dx: f64, dy: f64, t: &Text) -> (f64, f64, f64, f64) {
    let (l, r) = t.span();
    let (up, down) = ink_extent(&t.content, t.size_mm, t.weight);
    (dx + l, dy + t.y - up, dx + r, dy + t.y + down)
}

#[test]
fn winding_order_cells_are_whole_and_apart_on_every_demo_and_paper() {
    for name in demos() {
        for paper in Paper::ALL {
            let (checked, pages) = order_pages(name, paper);
            assert!(!pages.is_empty(), "{name} {paper}");
            let mut steps = 0;
            for (k, p) in pages.iter().enumerate() {
                let texts = p.texts();
                for (_, _, t) in &texts {
                    assert!(
                        !t.content.ends_with('\u{2026}'),
                        "{name} {paper} order page {}: cut cell {:?}",
                        k + 1,
                        t.content
                    );
                    assert!(t.rotate.is_none());
                }
                let boxes: Vec<_> = texts
                    .iter()
                    .filter(|(_, _, t)| !t.content.trim().is_empty())
                    .map(|(dx, dy, t)| (ink(*dx, *dy, t), *t))
                    .collect();
                for (i, (a, ta)) in boxes.iter().enumerate() {
                    for (b, tb) in &boxes[i + 1..] {
                        let w = a.2.min(b.2) - a.0.max(b.0);
                        let h = a.3.min(b.3) - a.1.max(b.1);
                        assert!(
                            w <= 0.01 || h <= 0.01,
                            "{name} {paper} order page {}: {:?} and {:?} overlap by {w:.2} × {h:.2} mm",
                            k + 1,
                            ta.content,
                            tb.content
                        );
                    }
                }
                // Every text stays inside the page's drawing area (the frame's margins).
                for ((l, t, r, b), text) in &boxes {
                    assert!(
                        *l >= 10.0
                            && *t >= 10.0
                            && *r <= p.width_mm - 10.0
                            && *b <= p.height_mm - 10.0,
                        "{name} {paper}: {:?} leaves the frame",
                        text.content
                    );
                }
                let mut r = Vec::new();
                rows_of(&p.children, &mut r);
                steps += r.len();
            }
            assert_eq!(steps, checked.winding.connections.len(), "{name} {paper}");
        }
    }
}

#[test]
fn an_a4_winding_order_sheet_holds_30_steps_or_more_from_the_first() {
    // A design of 60 coils or more runs to several sheets, never more than 30 steps a sheet
    // would need; where they share out to 30 or more, each sheet, the first with its words
    // too, holds at least 30 at the 3.5 mm row (the mills; the pump's 87 share out as 29
    // a sheet over the three that 30 a sheet needs too).
    let mut long = 0;
    for name in demos() {
        let (checked, pages) = order_pages(name, Paper::A4);
        if checked.winding.connections.len() < 60 {
            continue;
        }
        long += 1;
        let per_page: Vec<usize> = pages
            .iter()
            .map(|p| {
                let mut r = Vec::new();
                rows_of(&p.children, &mut r);
                r.len()
            })
            .collect();
        let total = checked.winding.connections.len();
        assert!(per_page.len() > 1, "{name}: {per_page:?}");
        assert!(per_page.len() <= total.div_ceil(30), "{name}: {per_page:?}");
        if name.starts_with("mill-") {
            assert!(per_page.iter().all(|&n| n >= 30), "{name}: {per_page:?}");
        }
    }
    assert!(long >= 3, "{long} demos of 60 coils or more");
    // The hoist's 36 coils fit one A4 sheet below its words, not two of 18.
    let (checked, pages) = order_pages("hoist-lap", Paper::A4);
    assert_eq!(checked.winding.connections.len(), 36);
    assert_eq!(pages.len(), 1);
    assert_eq!(rows(&pages).len(), 36);
}

/// "12/3" as (12, 3).
fn slot_pos(cell: &str) -> (u32, u32) {
    let (s, p) = cell.split_once('/').unwrap_or_else(|| panic!("{cell:?}"));
    (s.parse().unwrap(), p.parse().unwrap())
}

#[test]
fn a_frog_leg_order_places_every_side_once_across_the_slot() {
    for paper in Paper::ALL {
        let (checked, pages) = order_pages("mill-frog-leg", paper);
        let (d, w) = (&checked.design, &checked.winding);
        let u = d.coils_per_slot;
        let rows = rows(&pages);
        assert_eq!(rows.len(), w.connections.len());
        // step, coil, element, top slot/pos, bottom slot/pos, start bar, end bar, turns…
        let elements: Vec<&str> = rows.iter().map(|r| r[2].as_str()).collect();
        let first_wave = elements.iter().position(|e| *e == "wave").unwrap();
        // The lap element goes in first, then the wave element (common practice, from memory).
        assert!(elements[..first_wave].iter().all(|e| *e == "lap"));
        assert!(elements[first_wave..].iter().all(|e| *e == "wave"));
        assert_eq!(first_wave, w.connections.len() / 2);
        // Every slot holds u sides of each element a layer, the wave element's beside the
        // lap element's: lap at places 1…u, wave at u+1…2u, counted across the slot; no place
        // is taken twice and none is left empty.
        let mut taken = BTreeSet::new();
        for r in &rows {
            let places = if r[2] == "lap" { 1..=u } else { u + 1..=2 * u };
            for (layer, cell) in [("top", &r[3]), ("bottom", &r[4])] {
                let (slot, pos) = slot_pos(cell);
                assert!(places.contains(&pos), "{paper}: {r:?}");
                assert!(taken.insert((slot, layer, pos)), "{paper}: twice {r:?}");
            }
        }
        assert_eq!(taken.len() as u32, d.slots * 2 * 2 * u);
        // Each element's tops lifted for its own closing throw: the top sides in its first
        // `span` slots (common practice), u a slot; its last step drops them in.
        for (k, name) in ["lap", "wave"].iter().enumerate() {
            let own: Vec<&Vec<String>> = rows.iter().filter(|r| r[2] == *name).collect();
            let span = w.elements[k].pitches.span;
            let lifted: Vec<u32> = own
                .iter()
                .filter(|r| r[7].contains("top lifted"))
                .map(|r| slot_pos(&r[3]).0)
                .collect();
            assert_eq!(lifted.len() as u32, span * u, "{paper} {name}");
            assert!(lifted.iter().all(|&s| s <= span), "{paper} {name}");
            let drops: Vec<usize> = own
                .iter()
                .enumerate()
                .filter(|(_, r)| r[7].contains("drop lifted tops"))
                .map(|(i, _)| i)
                .collect();
            assert_eq!(drops, [own.len() - 1], "{paper} {name}");
        }
        // The first sheet says how the two elements lie together.
        let words: String = pages[0]
            .texts()
            .iter()
            .map(|t| t.2.content.clone())
            .collect::<Vec<_>>()
            .join(" ");
        for needle in [
            "separate coils in the same slots",
            "the lap element's at positions 1\u{2013}2",
            "the wave element's at positions 3\u{2013}4",
            "Wind the lap element first, steps 1\u{2013}150",
            "Then the wave element beside it, steps 151\u{2013}300",
            "steps 151\u{2013}176 (slots 1\u{2013}13)",
        ] {
            assert!(words.contains(needle), "{paper}: {needle:?} in {words}");
        }
    }
}

#[test]
fn a_one_element_order_counts_positions_within_its_own_element() {
    // A lap with two coils a slot: places 1 and 2, the first span slots' tops lifted.
    let (checked, pages) = order_pages("press-duplex-lap", Paper::A4);
    let rows = rows(&pages);
    let u = checked.design.coils_per_slot;
    assert!(u > 1);
    assert!(rows.iter().all(|r| (1..=u).contains(&slot_pos(&r[2]).1)));
    let lifted = rows.iter().filter(|r| r[6].contains("top lifted")).count() as u32;
    assert_eq!(lifted, checked.winding.pitches.span * u);
}
