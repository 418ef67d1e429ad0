//! Every coil is drawn on the printed set, on any paper: the developed pages of the set,
//! whole or continued in parts, together draw each coil of the traced winding once, coil 1
//! on sheet 1; headings wrap, never cut; a window asked for is drawn as asked or refused
//! with why.

use std::collections::BTreeMap;

use crate::support;
use crate::support::random_design::{OFF, RandomDesign, Space, designs};
use crate::support::sheets::checked_pages;
use armsheet::layout::developed::{Diagram, DiagramOptions, printed_diagrams};
use armsheet::layout::sheet::{diagram_sheet, page_frame};
use armsheet::layout::tree::{Group, Node, Page, PageKind};
use armsheet::layout::{Paper, Window};
use proptest::prelude::*;

const PAPERS: [Paper; 4] = [Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid];

fn coil_groups<'a>(nodes: &'a [Node], out: &mut Vec<&'a Group>) {
    for n in nodes {
        if let Node::Group(g) = n {
            if g.data.iter().any(|(k, _)| *k == "data-coil") {
                out.push(g);
            }
            coil_groups(&g.children, out);
        }
    }
}

/// The coils whose top sides are drawn on a page: coil number → how many times. (A part of
/// a diagram continued side by side also draws the lines of other parts' coils that pass
/// through it; a coil's top side is drawn on its own part alone.)
fn coils_on(page: &Page) -> BTreeMap<u32, usize> {
    let mut groups = Vec::new();
    coil_groups(&page.children, &mut groups);
    let mut out = BTreeMap::new();
    for g in groups {
        let top = g
            .children
            .iter()
            .any(|n| matches!(n, Node::Line(l) if l.class.split(' ').any(|c| c == "side-top")));
        if !top {
            continue;
        }
        let (_, v) = g.data.iter().find(|(k, _)| *k == "data-coil").unwrap();
        *out.entry(v.parse::<u32>().unwrap()).or_insert(0) += 1;
    }
    out
}

/// Asserts that the developed pages of `pages` (the first pages of the set, sheet 1 first)
/// draw the top side of every one of the `coils` coils exactly once, and coil 1's on sheet 1.
fn assert_every_coil(name: &str, paper: Paper, pages: &[Page], coils: u32) {
    let developed: Vec<&Page> = pages
        .iter()
        .take_while(|p| p.kind == PageKind::Diagram)
        .collect();
    assert!(!developed.is_empty(), "{name} {paper:?}: no developed page");
    // The developed pages come first and together; none later.
    assert!(
        pages[developed.len()..]
            .iter()
            .all(|p| p.kind != PageKind::Diagram),
        "{name} {paper:?}: developed pages are not together at the front"
    );
    let mut all: BTreeMap<u32, usize> = BTreeMap::new();
    for p in &developed {
        for (c, n) in coils_on(p) {
            *all.entry(c).or_insert(0) += n;
        }
    }
    let missing: Vec<u32> = (1..=coils).filter(|c| !all.contains_key(c)).collect();
    assert!(
        missing.is_empty(),
        "{name} {paper:?}: coils not drawn: {missing:?}"
    );
    let twice: Vec<u32> = all
        .iter()
        .filter(|(_, n)| **n > 1)
        .map(|(c, _)| *c)
        .collect();
    assert!(twice.is_empty(), "{name} {paper:?}: drawn twice: {twice:?}");
    assert!(
        coils_on(developed[0]).contains_key(&1),
        "{name} {paper:?}: coil 1 is not on sheet 1"
    );
}

/// Every demo on every paper draws every coil; and no text of a developed page is cut
/// short ("…"): the header wraps over as many lines as it needs.
#[test]
fn every_demo_draws_every_coil_on_every_paper() {
    for name in support::DEMOS {
        let checked = armsheet::check(support::design(&support::demo(name)));
        let coils = checked.winding.connections.len() as u32;
        for paper in PAPERS {
            let pages = checked_pages(&checked, paper, Window::Auto);
            assert_every_coil(name, paper, &pages, coils);
            for (i, p) in pages
                .iter()
                .enumerate()
                .filter(|(_, p)| p.kind == PageKind::Diagram)
            {
                for (_, _, t) in p.texts() {
                    assert!(
                        !t.content.contains('\u{2026}'),
                        "{name} {paper:?} sheet {}: cut text {:?}",
                        i + 1,
                        t.content
                    );
                }
            }
        }
    }
}

/// The diagrams of the printed set of `toml` on `paper`, in the box sheet 1 gives them.
fn diagrams(toml: &str, paper: Paper, window: Window) -> (u32, Vec<Diagram>) {
    let checked = armsheet::check(support::design(toml));
    let area = diagram_sheet(&page_frame(paper, false)).diagram;
    let options = DiagramOptions {
        width: area.w,
        height: area.h,
        window,
        floor: true,
    };
    let d = printed_diagrams(&checked.design, &checked.winding, &options)
        .expect("a window that is not the whole is always printed");
    (checked.winding.connections.len() as u32, d)
}

/// Laps and waves of 2-8 poles, u 1-4, m 1-2, up to 120 slots above the fewest.
fn case() -> impl Strategy<Value = RandomDesign> {
    designs(Space {
        pole_pairs: 1..=4,
        coils_per_slot: 1..=4,
        multiplicity: 1..=2,
        retrogressive: OFF,
        generator: OFF,
        room: 2,
        more_slots: 120,
        ..Space::default()
    })
}

proptest! {
    #![proptest_config(support::properties(12))]

    /// On every paper the parts of a random design's diagram draw each coil once, the
    /// first part from coil 1's slot, and each takes over where the one before stopped.
    #[test]
    fn random_designs_draw_every_coil_on_every_paper(c in case()) {
        let toml = c.toml();
        for paper in PAPERS {
            let (coils, parts) = diagrams(&toml, paper, Window::Auto);
            let mut seen: BTreeMap<u32, usize> = BTreeMap::new();
            for d in &parts {
                for c in d.coils.iter().filter(|c| c.top.is_some()) {
                    *seen.entry(c.coil).or_insert(0) += 1;
                }
            }
            prop_assert_eq!(seen.len() as u32, coils, "{} {:?}", toml, paper);
            prop_assert!(seen.values().all(|&n| n == 1), "{} {:?}", toml, paper);
            prop_assert!(parts[0].coils.iter().any(|c| c.coil == 1 && c.top.is_some()));
            // Consecutive parts of one element: each starts at the slot after the last
            // one's last.
            for w in parts.windows(2) {
                let (Some(a), Some(b)) = (&w[0].part, &w[1].part) else { continue };
                if a.element == b.element {
                    prop_assert_eq!(b.first_slot, a.last_slot(c.slots) % c.slots + 1);
                    prop_assert_eq!(a.after, Some(b.number));
                    prop_assert_eq!(b.before, Some(a.number));
                }
            }
        }
    }
}

/// A window of pole pairs draws the coils whose top sides lie in it, all of them and no
/// other, over as many parts as it needs.
#[test]
fn a_window_draws_the_coils_of_its_slots() {
    let toml = support::demo("mill-lap-12p");
    let checked = armsheet::check(support::design(&toml));
    let per_pair = checked.design.slots / checked.design.pole_pairs();
    for (pairs, first) in [(1, 1), (1, 30), (2, 200)] {
        let window = Window::PolePairs {
            pairs,
            first_slot: first,
        };
        let (_, parts) = diagrams(&toml, Paper::A4, window);
        let s = checked.design.slots;
        let in_window = |slot: u32| (slot + s - first) % s < pairs * per_pair;
        let mut want: Vec<u32> = checked
            .winding
            .connections
            .iter()
            .filter(|c| in_window(c.top.slot))
            .map(|c| c.coil)
            .collect();
        want.sort_unstable();
        let mut got: Vec<u32> = parts
            .iter()
            .flat_map(|d| d.coils.iter().filter(|c| c.top.is_some()).map(|c| c.coil))
            .collect();
        got.sort_unstable();
        assert_eq!(got, want, "window {pairs} from slot {first}");
        assert_eq!(parts[0].part.as_ref().unwrap().first_slot, first);
    }
}

/// `--window all` draws the whole armature in one view where the paper can, and where it
/// cannot it is refused with why, exit 2 and nothing written; never silently replaced.
#[test]
fn window_all_is_drawn_as_asked_or_refused() {
    let dir = support::scratch("window-all");
    let lap = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/fixtures/sheet_lap.toml");
    let out = support::armsheet_in(&["sheet", lap, "-o", "o", "--window", "all"], &dir);
    assert_eq!(out.status.code(), Some(0), "{}", support::text(&out.stderr));
    let sheet1 = std::fs::read_to_string(dir.join("o/sheet_lap/sheet-1.svg")).unwrap();
    assert!(sheet1.contains("whole armature shown"));
    let mill = concat!(env!("CARGO_MANIFEST_DIR"), "/designs/mill-lap-12p.toml");
    let out = support::armsheet_in(&["sheet", mill, "-o", "m", "--window", "all"], &dir);
    assert_eq!(out.status.code(), Some(2));
    let err = support::text(&out.stderr);
    assert!(
        err.contains("--window all: the whole armature cannot be drawn in one view on a4")
            && err.contains("264 slots need a wider sheet")
            && err.contains("hint: leave --window out"),
        "{err}"
    );
    assert!(!dir.join("m").exists(), "nothing is written");
}
