//! Structural checks on the drawn sheets: coil sides, segment labels, brushes, every
//! connection once (through the data attributes), pagination of a 1,056-segment design read
//! back row by row, escaping of hostile job text, and byte-identical output.

use std::collections::BTreeMap;

use crate::support::sheets::*;
use armsheet::layout::{Paper, Window};
use armsheet::render::csv::{connections_csv, job_csv};

/// The text content of a one-line `<text …>content</text>` element.
fn text_content(line: &str) -> Option<&str> {
    let t = line.trim();
    if !t.starts_with("<text") {
        return None;
    }
    let i = t.find('>')? + 1;
    let j = t.rfind("</text>")?;
    Some(&t[i..j])
}

fn diagram_checks(name: &str) {
    let (d, w) = load(name, &fixture(name));
    let sheets = sheets_for(&d, Paper::A4, Window::Auto);
    let svg = &sheets[0];
    // Coil sides: one top and one bottom element per coil position.
    let tops = svg.matches("class=\"side-top\" data-slot").count();
    let bots = svg.matches("class=\"side-bot\" data-slot").count();
    assert_eq!(tops + bots, 2 * w.coils as usize, "{name}: coil sides");
    assert_eq!(tops, w.coils as usize);

    // Segment labels run 1…C, in order, each inside its own seg-k group.
    let lines: Vec<&str> = svg.lines().collect();
    let mut labels = Vec::new();
    for (i, l) in lines.iter().enumerate() {
        if let Some(rest) = l.trim().strip_prefix("<g id=\"seg-") {
            let id: u32 = rest[..rest.find('"').unwrap()].parse().unwrap();
            let label = lines[i + 1..].iter().find_map(|l| text_content(l)).unwrap();
            assert_eq!(label, id.to_string(), "{name}: label of seg-{id}");
            labels.push(id);
        }
    }
    assert_eq!(
        labels,
        (1..=w.active_coils).collect::<Vec<_>>(),
        "{name}: segment labels"
    );

    // One brush element per brush set, with the engine's polarity.
    let pol = attr_values(svg, "class=\"brush\"", "data-polarity");
    assert_eq!(pol.len() as u32, w.brush_sets(), "{name}: brushes");
    let want: Vec<String> = w
        .brushes
        .iter()
        .map(|b| b.polarity.sign().to_string())
        .collect();
    assert_eq!(pol, want);

    // Every connection of the table appears exactly once in the drawing.
    let mut drawn: BTreeMap<u32, (Option<u32>, Option<u32>)> = BTreeMap::new();
    for l in svg
        .lines()
        .filter(|l| l.trim_start().starts_with("<g id=\"coil-"))
    {
        let get = |k: &str| {
            let n = format!(" {k}=\"");
            l.find(&n).map(|i| {
                let r = &l[i + n.len()..];
                r[..r.find('"').unwrap()].parse::<u32>().unwrap()
            })
        };
        let coil = get("data-coil").unwrap();
        assert!(
            drawn
                .insert(coil, (get("data-start-seg"), get("data-end-seg")))
                .is_none(),
            "{name}: coil {coil} twice"
        );
    }
    assert_eq!(drawn.len(), w.connections.len());
    for c in &w.connections {
        assert_eq!(
            drawn[&c.coil],
            (c.start_segment, c.end_segment),
            "{name}: coil {}",
            c.coil
        );
    }
    // Dummies are marked dead.
    assert_eq!(
        svg.matches("data-dummy=\"true\"").count(),
        w.dummy_coils.len()
    );
}

#[test]
fn lap_diagram_structure() {
    diagram_checks("sheet_lap.toml");
    // The lap fixture fits all six equalizer rings, each joining p = 2 segments 6 apart.
    let (d, _) = load("sheet_lap.toml", &fixture("sheet_lap.toml"));
    let svg = &sheets_for(&d, Paper::A4, Window::Auto)[0];
    let segs = attr_values(svg, "class=\"eq\"", "data-segs");
    assert_eq!(segs, ["1 7", "2 8", "3 9", "4 10", "5 11", "6 12"]);
}

#[test]
fn wave_with_dummy_diagram_structure() {
    diagram_checks("sheet_wave_dummy.toml");
    let (_, w) = load("sheet_wave_dummy.toml", &fixture("sheet_wave_dummy.toml"));
    assert_eq!(w.dummy_coils, [16]);
}

/// 8 poles, 264 slots, 4 coils a slot: 1,056 coil positions and segments.
const BIG_LAP: &str = "[job]\nid = \"BIG-1056\"\n[armature]\npoles = 8\nslots = 264\ncoils_per_slot = 4\n[winding]\ntype = \"lap\"\nspan = \"1-34\"\nturns = 1\nequalizers = 4\n";

#[test]
fn a_1056_segment_table_reads_back_complete() {
    let (d, w) = load("big.toml", BIG_LAP);
    assert_eq!(w.active_coils, 1056);
    let sheets = sheets_for(&d, Paper::A4, Window::Auto);
    let mut rows: Vec<Vec<String>> = Vec::new();
    let mut eq_rows = Vec::new();
    for svg in &sheets[1..] {
        let lines: Vec<&str> = svg.lines().collect();
        let mut i = 0;
        while i < lines.len() {
            let l = lines[i].trim();
            if l.starts_with("<g class=\"row\" data-coil=")
                || l.starts_with("<g class=\"row\" data-eq=")
            {
                let mut cells = Vec::new();
                i += 1;
                while lines[i].trim() != "</g>" {
                    cells.extend(text_content(lines[i]).map(str::to_string));
                    i += 1;
                }
                if l.contains("data-coil") {
                    rows.push(cells)
                } else {
                    eq_rows.push(cells)
                }
            }
            i += 1;
        }
    }
    assert_eq!(rows.len(), w.connections.len(), "no row lost");
    for (cells, c) in rows.iter().zip(&w.connections) {
        let want = [
            c.coil,
            c.top.slot,
            c.top.position,
            c.bottom.slot,
            c.bottom.position,
            c.start_segment.unwrap(),
            c.end_segment.unwrap(),
        ]
        .map(|x| x.to_string());
        assert_eq!(&cells[..7], &want[..], "coil {}", c.coil);
    }
    // Sequence column: simplex lap traces coil after coil.
    assert_eq!(rows[0][7], "1");
    assert_eq!(rows[1055][7], "1056");
    // Equalizers: every 4th of 2C/P = 264 possible, 4 segments each.
    let armsheet::winding::EqualizerPlan::Possible(e) = &w.equalizers else {
        panic!()
    };
    assert_eq!(eq_rows.len(), e.groups.len());
    assert_eq!(eq_rows.len(), 66);
    assert_eq!(eq_rows[0], ["E1", "1 \u{b7} 265 \u{b7} 529 \u{b7} 793"]);
    // Sheet count in every title block.
    let total = sheets.len();
    for (i, svg) in sheets.iter().enumerate() {
        assert!(
            svg.contains(&format!(">{} of {total}</text>", i + 1)),
            "sheet {}",
            i + 1
        );
    }
}

#[test]
fn a_large_armature_is_drawn_in_parts_the_print_can_hold() {
    let (d, _) = load("big.toml", BIG_LAP);
    let sheets = sheets_for(&d, Paper::A4, Window::Auto);
    // 1,056 segments, u = 4: eight coil sides a slot at least 1 mm apart over 85 % of the
    // slot pitch need 9.41 mm a slot, so the 249 mm strip of A4 (no edge labels, so the
    // least gutters) holds 26 slots; the note says which are shown and where the pattern
    // repeats. A coil spans 33 slots, more than the strip: a part drawing its own coils with
    // their cut lines labelled would hold one slot's (the back ends of neighbouring coils
    // meet the edge under 0.6 mm apart), so the parts go side by side: 26 slots each, edge
    // to edge, ⌈264 / 26⌉ = 11 of them.
    let svg = &sheets[0];
    assert!(svg.contains(
        "slots 1\u{2013}26 of 264 shown \u{b7} pattern repeats every 66 slots \u{b7} drawn here: the coils whose top sides lie in slots 1\u{2013}26, and the lines of others that pass;"
    ));
    assert!(svg.contains("slot 27 on: sheet 2 \u{2192}"));
    assert!(svg.contains("\u{2190} slot 264 and before: sheet 11"));
    let parts = sheets
        .iter()
        .filter(|s| s.contains("data-page=\"developed\""))
        .count();
    assert_eq!(parts, 11);
    // A3 shows 39 slots at the same scale: ⌈264 / 39⌉ = 7 parts.
    let a3 = sheets_for(&d, Paper::A3, Window::Auto);
    assert!(a3[0].contains("slots 1\u{2013}39 of 264 shown"));
    let a3_parts = a3
        .iter()
        .filter(|s| s.contains("data-page=\"developed\""))
        .count();
    assert_eq!(a3_parts, 7);
    // A window of pole pairs is drawn in parts too, over its own slots.
    let window = sheets_for(
        &d,
        Paper::A4,
        Window::PolePairs {
            pairs: 2,
            first_slot: 1,
        },
    );
    assert!(window[0].contains("slots 1\u{2013}26 of 264 shown"));
    assert!(window[0].contains("slot 27 on: sheet 2"));
    assert!(!window[0].contains("and before: sheet"));
}

#[test]
fn hostile_job_text_is_escaped_everywhere() {
    let text = fixture("sheet_hostile.toml");
    let (d, w) = load("sheet_hostile.toml", &text);
    let sheets = sheets_for(&d, Paper::A4, Window::Auto);
    for svg in &sheets {
        assert!(!svg.contains("<script>"));
        assert!(svg.contains("&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quoted&quot;"));
        // It still parses as XML, and the text reads back as written.
        let tree = parse(svg);
        assert!(text_with_glyphs(&tree) > 10);
    }
    // This design fails the symmetry checks: every sheet carries the band.
    for svg in &sheets {
        assert!(svg.contains("NOT FOR WINDING: design fails checks"));
    }
    let job = job_csv(&d);
    let first = job.lines().nth(1).unwrap();
    assert!(
        first.starts_with("\"'=HYPERLINK(\"\"http://x\"\")\","),
        "{first}"
    );
    assert_eq!(job.lines().count(), 2);
    let csv = connections_csv(&w);
    assert!(csv.lines().nth(1).unwrap().starts_with("1,"));
    assert!(csv.ends_with("\r\n"));
    assert_eq!(csv.lines().count(), 1 + w.connections.len());
    // Numbers stay numbers: the current column keeps its sign, unquoted.
    assert!(
        csv.lines().nth(2).unwrap().ends_with(",-1") || csv.lines().nth(2).unwrap().ends_with(",1")
    );
}

#[test]
fn a_passing_design_has_no_band_and_output_is_byte_identical() {
    let (d, w) = load("sheet_lap.toml", &fixture("sheet_lap.toml"));
    let a = sheets_for(&d, Paper::A3, Window::Auto);
    let b = sheets_for(&d, Paper::A3, Window::Auto);
    assert_eq!(a, b);
    assert!(!a[0].contains("NOT FOR WINDING"));
    assert_eq!(connections_csv(&w), connections_csv(&w));
}

/// The rating's rows follow the design's in the winding-data block.
#[test]
fn the_rating_rows_go_into_the_data_block() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/designs/pump-wave.toml");
    let (d, _) = load("pump-wave.toml", &std::fs::read_to_string(path).unwrap());
    let checked = armsheet::check(d.clone());
    let rows = armsheet::layout::sheet::rows::rating_sheet_rows(
        checked.rating.as_ref().expect("a rating"),
        checked.design.units,
    );
    assert!(!rows.is_empty());
    // Sheet 1 holds what it can at the body size; the winding-data sheet, last, holds all.
    let s = sheets_for(&d, Paper::A4, Window::Auto);
    let data = s.last().unwrap();
    assert!(data.contains("data-page=\"winding-data\""));
    for (k, _) in &rows {
        assert!(data.contains(&format!("data-key=\"{k}\"")), "row {k}");
    }
}
