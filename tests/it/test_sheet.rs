//! The test and sign-off sheets and the order of the sheet set: one row per bar pair of the
//! armature test with an empty measured box, the insulation-resistance and withstand values,
//! the notes and sign-off blocks; pages in shop order, the winding order filling its sheets,
//! and no table ending on a sheet with a handful of rows.

use crate::support;

use armsheet::base::number::fmt_fixed;
use armsheet::checks::Checked;
use armsheet::features::armature_test::{ArmatureTest, TestOptions, expected};
use armsheet::layout::tree::{Group, Node, Page, PageKind};
use armsheet::layout::{Paper, SheetOptions, Window, sheet_pages};

fn set(toml: &str, paper: Paper) -> (Checked, ArmatureTest, Vec<Page>) {
    let checked = armsheet::check(support::design(toml));
    let test = expected(&checked.design, &checked.winding, &TestOptions::default());
    let pages = sheet_pages(
        &checked,
        &test,
        &SheetOptions {
            paper,
            window: Window::Auto,
            version: "0.0.0".into(),
        },
    )
    .expect("the automatic window is always printed");
    (checked, test, pages)
}

fn groups<'a>(nodes: &'a [Node], out: &mut Vec<&'a Group>) {
    for n in nodes {
        if let Node::Group(g) = n {
            out.push(g);
            groups(&g.children, out);
        }
    }
}

fn all_groups(page: &Page) -> Vec<&Group> {
    let mut out = Vec::new();
    groups(&page.children, &mut out);
    out
}

fn has_class(g: &Group, class: &str) -> bool {
    g.class
        .as_deref()
        .is_some_and(|c| c.split(' ').any(|c| c == class))
}

fn data<'a>(g: &'a Group, key: &str) -> Option<&'a str> {
    g.data
        .iter()
        .find(|(k, _)| *k == key)
        .map(|(_, v)| v.as_str())
}

fn texts_of(nodes: &[Node], out: &mut Vec<String>) {
    for n in nodes {
        match n {
            Node::Group(g) => texts_of(&g.children, out),
            Node::Text(t) => out.push(t.content.clone()),
            _ => {}
        }
    }
}

fn group_text(page: &Page, id: &str) -> String {
    let g = all_groups(page)
        .into_iter()
        .find(|g| g.id.as_deref() == Some(id))
        .unwrap_or_else(|| panic!("no group {id}"));
    let mut t = Vec::new();
    texts_of(&g.children, &mut t);
    t.join(" ")
}

#[test]
fn every_bar_pair_has_one_row_with_an_empty_measured_box() {
    for name in support::DEMOS {
        for paper in [Paper::A4, Paper::Letter] {
            let (_, test, pages) = set(&support::demo(name), paper);
            let want: Vec<(String, String, String)> = test
                .listed()
                .map(|r| {
                    (
                        r.from_bar.to_string(),
                        r.to_bar.to_string(),
                        r.expected
                            .map_or("open".into(), |v| fmt_fixed(test.reading_prefix().of(v), 2)),
                    )
                })
                .collect();
            let mut got = Vec::new();
            for page in pages.iter().filter(|p| p.kind == PageKind::Tests) {
                for g in all_groups(page) {
                    if !has_class(g, "reading-row") {
                        continue;
                    }
                    let mut t = Vec::new();
                    texts_of(&g.children, &mut t);
                    let boxes = g
                        .children
                        .iter()
                        .filter(|n| matches!(n, Node::Rect(r) if r.class.as_deref() == Some("checkbox")))
                        .count();
                    // The bars and the expected value; the measured box carries no text.
                    assert_eq!(boxes, 1, "{name}: {t:?}");
                    assert_eq!(t.len(), 2, "{name}: {t:?}");
                    let (from, to) = (
                        data(g, "data-from-bar").unwrap(),
                        data(g, "data-to-bar").unwrap(),
                    );
                    assert_eq!(t[0], format!("{from}\u{2013}{to}"));
                    got.push((from.to_string(), to.to_string(), t[1].clone()));
                }
            }
            assert_eq!(got, want, "{name} {paper}");
        }
    }
}

#[test]
fn the_first_test_sheet_carries_the_insulation_withstand_notes_and_sign_off() {
    // hoist-lap: 110 V, class F. IEEE 43-2013 [from memory]: 500 V DC below 1000 V rated,
    // at least 5 MOhm at 1 min (40 C), PI at least 2.0 for class F. IEC 60034-1 Table 16:
    // 1000 V + 2U = 1220 V, at least 1500 V; overhauled 1.5U at least 1000 V (U >= 100 V).
    let (checked, _, pages) = set(&support::demo("hoist-lap"), Paper::A4);
    let tests: Vec<&Page> = pages.iter().filter(|p| p.kind == PageKind::Tests).collect();
    let first = tests[0];
    let ir = group_text(first, "insulation-resistance");
    assert!(ir.contains("500 V DC"), "{ir}");
    assert!(ir.contains("5 MOhm"), "{ir}");
    assert!(ir.contains("at least 2.0 for class 155 (F)"), "{ir}");
    assert!(ir.contains("IEEE 43"), "{ir}");
    let hv = group_text(first, "withstand");
    let t = checked
        .rating
        .as_ref()
        .unwrap()
        .test_voltage
        .as_ref()
        .unwrap();
    assert_eq!((t.new_v, t.overhauled_v), (1500.0, 1000.0));
    assert!(hv.contains("New or fully rewound 1500 V"), "{hv}");
    assert!(hv.contains("overhauled, cleaned and dried 1000 V"), "{hv}");
    assert!(hv.contains("IEC 60034-1"), "{hv}");
    assert!(hv.contains("licensed practice"), "the caution: {hv}");
    assert!(hv.contains("lock out and discharge"), "the caution: {hv}");
    for id in ["surge-test", "run-test"] {
        assert!(!group_text(first, id).is_empty());
    }
    // Sign-off: captions only; every date box is empty (the clock is never read).
    let sign = group_text(first, "sign-off");
    for word in ["tested", "checked", "revision", "signature", "date", "name"] {
        assert!(sign.contains(word), "{sign}");
    }
    assert!(!sign.chars().any(|c| c.is_ascii_digit()), "{sign}");
    // Only the first test sheet carries the blocks.
    for p in &tests[1..] {
        assert!(
            all_groups(p)
                .iter()
                .all(|g| g.id.as_deref() != Some("sign-off"))
        );
    }
    // mill-lap-12p: 760 V, class H: 500 V DC; 1000 V + 2U = 2520 V.
    let (_, _, pages) = set(&support::demo("mill-lap-12p"), Paper::A4);
    let first = pages.iter().find(|p| p.kind == PageKind::Tests).unwrap();
    assert!(group_text(first, "insulation-resistance").contains("500 V DC"));
    assert!(group_text(first, "withstand").contains("New or fully rewound 2520 V"));
}

#[test]
fn without_a_rated_voltage_the_sheet_defers_to_the_standard() {
    let toml = "[job]\nid = \"T-1\"\n[armature]\npoles = 4\nslots = 24\n[winding]\ntype = \"lap\"\nturns = 2\n";
    let (checked, test, pages) = set(toml, Paper::A4);
    assert!(checked.rating.is_none());
    let first = pages.iter().find(|p| p.kind == PageKind::Tests).unwrap();
    assert!(group_text(first, "insulation-resistance").contains("No [rating] voltage"));
    assert!(group_text(first, "withstand").contains("No [rating] voltage"));
    // Without a conductor the readings are in units of one coil.
    assert!(group_text(first, "readings-unit").contains("units of one coil's resistance"));
    assert_eq!(test.readings.len(), 24);
}

#[test]
fn sheets_come_in_shop_order_and_sheet_1_names_the_data_sheet() {
    use PageKind::*;
    let rank = |k: PageKind| match k {
        Diagram => 0,
        CommutatorEnd => 1,
        CoilMaking => 2,
        WindingOrder => 3,
        Connections => 4,
        Equalizers => 5,
        Tests => 6,
        WindingData => 7,
        other => panic!("{other:?} on a sheet"),
    };
    for name in support::DEMOS {
        let (_, _, pages) = set(&support::demo(name), Paper::A4);
        let kinds: Vec<usize> = pages.iter().map(|p| rank(p.kind)).collect();
        assert!(kinds.windows(2).all(|w| w[0] <= w[1]), "{name}: {kinds:?}");
        for k in [0, 1, 3, 4, 6] {
            assert!(kinds.contains(&k), "{name}: no {k} in {kinds:?}");
        }
        if let Some(i) = pages.iter().position(|p| p.kind == WindingData) {
            let mut t = Vec::new();
            texts_of(&pages[0].children, &mut t);
            let said = format!("more rows on sheet {} (winding data)", i + 1);
            assert!(t.iter().any(|s| s.ends_with(&said)), "{name}: {said}");
        }
    }
}

/// Rows a page of `kind` holds, by its row groups.
fn rows(page: &Page, class: &str) -> usize {
    all_groups(page)
        .iter()
        .filter(|g| has_class(g, class))
        .count()
}

#[test]
fn tables_fill_their_sheets_and_never_end_on_a_handful() {
    for name in support::DEMOS {
        for paper in [Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid] {
            let (_, _, pages) = set(&support::demo(name), paper);
            for (kind, class) in [
                (PageKind::WindingOrder, "order-row"),
                (PageKind::Connections, "row"),
                (PageKind::Tests, "reading-row"),
            ] {
                let counts: Vec<usize> = pages
                    .iter()
                    .filter(|p| p.kind == kind)
                    .map(|p| rows(p, class))
                    .collect();
                if counts.len() > 1 {
                    let (lo, hi) = (counts[1..].iter().min(), counts[1..].iter().max());
                    let (lo, hi) = (*lo.unwrap(), *hi.unwrap());
                    assert!(hi - lo <= 1, "{name} {paper} {kind:?}: {counts:?}");
                    assert!(counts[0] * 2 >= hi, "{name} {paper} {kind:?}: {counts:?}");
                }
            }
        }
    }
    // The 1,056-bar mill on A4: 30 winding-order steps a sheet after the first, and the
    // readings in four column groups of 27.
    let (_, _, pages) = set(&support::demo("mill-lap-12p"), Paper::A4);
    let order: Vec<usize> = pages
        .iter()
        .filter(|p| p.kind == PageKind::WindingOrder)
        .map(|p| rows(p, "order-row"))
        .collect();
    assert!(order[1..].iter().all(|&n| n >= 29), "{order:?}");
    let tests = pages.iter().filter(|p| p.kind == PageKind::Tests).count();
    assert!(tests <= 11, "{tests} test sheets");
}

fn rect_bottoms(nodes: &[Node], out: &mut Vec<f64>) {
    for n in nodes {
        match n {
            Node::Group(g) => rect_bottoms(&g.children, out),
            Node::Rect(r) => out.push(r.y + r.h),
            Node::Text(t) => out.push(t.y),
            _ => {}
        }
    }
}

#[test]
fn the_blocks_stay_above_the_title_block_on_every_paper_with_and_without_the_band() {
    let mut designs: Vec<(String, String)> = support::DEMOS
        .iter()
        .map(|n| (n.to_string(), support::demo(n)))
        .collect();
    designs.push(("hostile".into(), support::fixture("sheet_hostile.toml")));
    for (name, toml) in designs {
        for paper in [Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid] {
            let (checked, _, pages) = set(&toml, paper);
            let frame = armsheet::layout::sheet::page_frame(
                paper,
                checked.findings.iter().any(|f| f.is_failure()),
            );
            let page = pages.iter().find(|p| p.kind == PageKind::Tests).unwrap();
            let blocks = all_groups(page)
                .into_iter()
                .find(|g| g.id.as_deref() == Some("test-blocks"))
                .unwrap();
            let mut bottoms = Vec::new();
            rect_bottoms(&blocks.children, &mut bottoms);
            let lowest = bottoms.iter().copied().fold(f64::MIN, f64::max);
            assert!(
                lowest <= frame.title_block.y - 0.5,
                "{name} {paper}: the blocks reach {lowest:.1} mm, the title block starts at {:.1}",
                frame.title_block.y
            );
        }
    }
}

#[test]
fn a_multiplex_winding_says_where_the_within_winding_readings_start() {
    // press-duplex-lap: 48 bars, duplex, doubly re-entrant; the neighbours read open and the
    // bars 2 apart are read within each winding.
    let (_, test, pages) = set(&support::demo("press-duplex-lap"), Paper::A4);
    assert_eq!(
        test.readings_within_winding.as_ref().map(Vec::len),
        Some(48)
    );
    let first = pages.iter().find(|p| p.kind == PageKind::Tests).unwrap();
    let words = group_text(first, "readings-unit");
    assert!(
        words.contains("Readings 49\u{2013}96 are between bars 2 apart, within one winding."),
        "{words}"
    );
}

#[test]
fn the_stated_unit_is_the_unit_of_the_readings_table() {
    // The readings are written in the test's one prefixed unit (hoist-lap: milliohms); the
    // "Unit:" line of the first test sheet names that unit, as the table's heads do.
    for name in support::DEMOS {
        let (_, test, pages) = set(&support::demo(name), Paper::A4);
        let unit = match test.unit {
            armsheet::features::armature_test::Unit::Ohm => {
                format!("{}\u{3a9}", test.reading_prefix().symbol())
            }
            armsheet::features::armature_test::Unit::Coil => "coil".to_string(),
        };
        let first = pages.iter().find(|p| p.kind == PageKind::Tests).unwrap();
        let words = group_text(first, "readings-unit");
        assert!(
            words.contains(&format!("Unit: {unit} (")),
            "{name}: {unit}: {words}"
        );
        let table = all_groups(first)
            .into_iter()
            .find(|g| has_class(g, "readings"))
            .unwrap();
        let mut heads = Vec::new();
        texts_of(&table.children, &mut heads);
        assert!(heads.contains(&unit), "{name}: {heads:?}");
    }
    let (_, test, _) = set(&support::demo("hoist-lap"), Paper::A4);
    assert_eq!(
        test.reading_prefix().symbol(),
        "m",
        "hoist-lap reads milliohms"
    );
}

#[test]
fn the_readme_lists_every_kind_of_sheet_page() {
    // The README's list of `data-page` kinds is the set the demos' sheet sets carry (the
    // coil-making sheet among them), and its description of the set names the coil making.
    let readme = include_str!("../../README.md");
    let line = readme
        .lines()
        .find(|l| l.contains("names its kind in the attribute `data-page`:"))
        .expect("the README's sheet row");
    let listed: std::collections::BTreeSet<&str> = line
        .split("`data-page`:")
        .nth(1)
        .unwrap()
        .split('`')
        .skip(1)
        .step_by(2)
        .collect();
    let mut drawn = std::collections::BTreeSet::new();
    for name in support::DEMOS {
        let (_, _, pages) = set(&support::demo(name), Paper::A4);
        for p in &pages {
            drawn.insert(p.kind.data_page());
        }
    }
    assert!(drawn.contains("coil-making"), "{drawn:?}");
    assert_eq!(listed, drawn);
    let row = readme
        .lines()
        .find(|l| l.starts_with("| `armsheet sheet DESIGN"))
        .expect("the sheet command's row");
    assert!(row.contains("coil-making sheet"), "{row}");
}
