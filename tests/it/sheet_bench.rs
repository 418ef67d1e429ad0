//! Sheet 1 carries the winder's data: on every paper, for every design in `designs/`, the
//! compact winding-data block of sheet 1 holds every bench row (connection, counts, span and
//! throw in shop form, turns, wire and strands, lead swing, brush position, equalizers, dummy
//! coils), whole (never cut) and at or above the legibility floor. Read from the page tree.

use crate::support::ROOT;
use crate::support::sheets::{checked_pages, load};
use armsheet::layout::sheet::rows::bench_rows;
use armsheet::layout::style::TEXT_FLOOR;
use armsheet::layout::tree::{Group, Node};
use armsheet::layout::{Paper, Window};

/// The groups of class `bench` under `nodes`: their data-key and their texts.
fn bench_groups(nodes: &[Node], out: &mut Vec<(String, Vec<(f64, String)>)>) {
    for n in nodes {
        if let Node::Group(g) = n {
            if g.class.as_deref() == Some("bench") {
                out.push((key(g), texts(g)));
            } else {
                bench_groups(&g.children, out);
            }
        }
    }
}

fn key(g: &Group) -> String {
    g.data
        .iter()
        .find(|(k, _)| *k == "data-key")
        .map(|(_, v)| v.clone())
        .unwrap_or_default()
}

fn texts(g: &Group) -> Vec<(f64, String)> {
    g.children
        .iter()
        .filter_map(|n| match n {
            Node::Text(t) => Some((t.size_mm, t.content.clone())),
            _ => None,
        })
        .collect()
}

fn demo_files() -> Vec<std::path::PathBuf> {
    let mut v: Vec<_> = std::fs::read_dir(format!("{ROOT}/designs"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    v.sort();
    v
}

#[test]
fn sheet_1_carries_the_bench_rows_on_every_paper() {
    let files = demo_files();
    assert!(files.len() >= 7, "{files:?}");
    for path in files {
        let name = path.file_name().unwrap().to_string_lossy().to_string();
        let (d, w) = load(&name, &std::fs::read_to_string(&path).unwrap());
        let want = bench_rows(&d, &w);
        let checked = armsheet::check(d.clone());
        for paper in Paper::ALL {
            let pages = checked_pages(&checked, paper, Window::Auto);
            let mut got = Vec::new();
            bench_groups(&pages[0].children, &mut got);
            for (k, v) in &want {
                let (_, t) = got
                    .iter()
                    .find(|(gk, _)| gk == k)
                    .unwrap_or_else(|| panic!("{name} {paper:?}: no {k} on sheet 1"));
                // The label, then the value's lines: joined again they give the value whole.
                assert_eq!(t[0].1, *k, "{name} {paper:?}");
                let value: Vec<&str> = t[1..].iter().map(|(_, s)| s.as_str()).collect();
                assert_eq!(value.join(" "), *v, "{name} {paper:?}: {k} cut or changed");
                for (size, s) in t {
                    assert!(
                        *size >= TEXT_FLOOR - 1e-9,
                        "{name} {paper:?}: {s} at {size}"
                    );
                    assert!(!s.contains('\u{2026}'), "{name} {paper:?}: {s} cut");
                }
            }
            // Span and throw in shop form, "1–n", never the signed commutator pitch.
            for k in ["span", "throw"] {
                let (_, t) = got.iter().find(|(gk, _)| gk == k).unwrap();
                assert!(
                    t[1].1.starts_with("1\u{2013}"),
                    "{name} {paper:?}: {k} {:?}",
                    t[1]
                );
            }
        }
    }
}

/// The check fails on a sheet 1 without the block: the hoist's diagram sheet with the
/// winding-data group taken out.
#[test]
fn the_bench_row_check_finds_a_missing_block() {
    let path = format!("{ROOT}/designs/hoist-lap.toml");
    let (d, _) = load("hoist-lap.toml", &std::fs::read_to_string(path).unwrap());
    let mut pages = checked_pages(&armsheet::check(d), Paper::A4, Window::Auto);
    let mut got = Vec::new();
    bench_groups(&pages[0].children, &mut got);
    assert!(got.iter().any(|(k, _)| k == "throw"));
    pages[0]
        .children
        .retain(|n| !matches!(n, Node::Group(g) if g.id.as_deref() == Some("winding-data")));
    let mut none = Vec::new();
    bench_groups(&pages[0].children, &mut none);
    assert!(none.is_empty());
}
