//! The commutator end view at 96 poles (a lap of 288 bars and a wave of 287, 96 brush
//! sets each) on every paper, and on every demo: walked in the page tree.
//!
//! - the legibility floor of `legibility.rs` holds: no two texts overlap, none under
//!   `TEXT_FLOOR`, none leaves the frame;
//! - every brush set is named (`B1+`) or, where no name fits, signed, and B1 is always named;
//! - the cord through slot 1's centre (0°, derived: slots are numbered from twelve o'clock)
//!   runs from the slot circle across the bar ring, and the bar shaded beside it is the one
//!   whose centre, from `Winding::segment_deg`, lies nearest 0° (the two beside it when 0°
//!   falls within a quarter bar of a mica's middle, the lead swing being told to the half bar);
//! - the rule to count by (derived, the counting rule of a graduated scale): bar 1 numbered
//!   and marked; a number at every multiple of the stated step and nowhere else, each on its
//!   own bar's ray; a tick at every 5th bar, a longer one at every 10th, a line at every mica;
//!   and at 96 poles a numbered bar at least every 10 bars round the ring (every 5 on A3 and
//!   Tabloid): any bar is at most 2 micas from a tick, and any tick at most one tick from a
//!   number.

use crate::legibility::{PAPERS, breaches};
use crate::support;
use crate::support::sheets::checked_pages;
use armsheet::Checked;
use armsheet::layout::font::ink_extent;
use armsheet::layout::style::TEXT_FLOOR;
use armsheet::layout::tree::{Group, Node, Page, PageKind, Text};
use armsheet::layout::{Paper, Window};

/// A 96-pole simplex lap: 96 brush sets, 288 bars; slot 1's centre line on a bar.
fn lap() -> String {
    support::fixture("ring-96-lap.toml")
}

/// A 96-pole simplex wave: 96 brush sets, 287 bars; slot 1's centre line on a mica.
fn wave() -> String {
    support::fixture("ring-96-wave.toml")
}

fn checked(toml: &str) -> Checked {
    armsheet::check(support::design(toml))
}

fn end_page(c: &Checked, paper: Paper) -> Page {
    checked_pages(c, paper, Window::Auto)
        .into_iter()
        .find(|p| p.kind == PageKind::CommutatorEnd)
        .expect("every set has an end view")
}

fn group<'a>(nodes: &'a [Node], id: &str) -> Option<&'a Group> {
    nodes.iter().find_map(|n| match n {
        Node::Group(g) if g.id.as_deref() == Some(id) => Some(g),
        Node::Group(g) => group(&g.children, id),
        _ => None,
    })
}

fn data<'a>(d: &'a [(&'static str, String)], key: &str) -> Option<&'a str> {
    d.iter().find(|(k, _)| *k == key).map(|(_, v)| v.as_str())
}

fn texts_in(g: &Group) -> Vec<&Text> {
    let mut out = Vec::new();
    for n in &g.children {
        match n {
            Node::Text(t) => out.push(t),
            Node::Group(h) => out.extend(texts_in(h)),
            _ => {}
        }
    }
    out
}

/// Clockwise from twelve o'clock, degrees 0…360, of `p` seen from `c`.
fn angle(c: (f64, f64), p: (f64, f64)) -> f64 {
    (p.0 - c.0).atan2(c.1 - p.1).to_degrees().rem_euclid(360.0)
}

fn apart(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

/// Every breach of the end view's own rules on `page`, worded.
fn ring_breaches(c: &Checked, page: &Page, dense: Option<u32>) -> Vec<String> {
    let w = &c.winding;
    let bars = w.active_coils;
    let seg = 360.0 / f64::from(bars);
    let mut out = Vec::new();
    let Some(ring) = group(&page.children, "commutator-end") else {
        return vec!["no commutator-end group".into()];
    };
    for t in texts_in(ring) {
        if t.size_mm < TEXT_FLOOR - 1e-9 {
            out.push(format!("{:?} at {} mm", t.content, t.size_mm));
        }
    }
    // The rings: bar face, risers' ring, slot circle (all about one centre).
    let mut circles: Vec<(f64, f64, f64)> = ring
        .children
        .iter()
        .filter_map(|n| match n {
            Node::Circle(k) if k.class == "core" => Some((k.cx, k.cy, k.r)),
            _ => None,
        })
        .collect();
    circles.sort_by(|a, b| a.2.total_cmp(&b.2));
    let [(cx, cy, r_in), _, (_, _, r_slot)] = circles[..] else {
        return vec![format!("{} core circles", circles.len())];
    };
    let centre = (cx, cy);
    // The cord.
    let cords: Vec<_> = ring
        .children
        .iter()
        .filter_map(|n| match n {
            Node::Line(l) if l.class == "cord" => Some(l),
            _ => None,
        })
        .collect();
    match cords[..] {
        [cord] => {
            let (f, t) = (cord.from, cord.to);
            let (rf, rt) = ((f.0 - cx).hypot(f.1 - cy), (t.0 - cx).hypot(t.1 - cy));
            if (rf - r_slot).abs() > 1e-6 || apart(angle(centre, f), 0.0) > 1e-6 {
                out.push(format!(
                    "the cord starts at r {rf:.2}, not on slot 1's centre"
                ));
            }
            if rt > r_in + 1e-6 || apart(angle(centre, t), 0.0) > 1e-6 {
                out.push(format!("the cord ends at r {rt:.2}, short of the bars"));
            }
        }
        _ => out.push(format!("{} cords", cords.len())),
    }
    // The in-line bar(s), from the traced bar centres.
    let mut near: Vec<(f64, u32)> = (1..=bars)
        .map(|s| (apart(w.segment_deg(s), 0.0), s))
        .collect();
    near.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut expected: Vec<u32> = if near[0].0 <= seg / 4.0 + 1e-9 {
        vec![near[0].1]
    } else {
        vec![near[0].1, near[1].1]
    };
    expected.sort_unstable();
    let mut shaded: Vec<u32> = Vec::new();
    for n in &ring.children {
        if let Node::Path(p) = n
            && p.class.as_deref() == Some("inline-bar")
        {
            let s: u32 = data(&p.data, "data-seg").unwrap().parse().unwrap();
            shaded.push(s);
        }
    }
    shaded.sort_unstable();
    if shaded != expected {
        out.push(format!("shaded bars {shaded:?}, in line {expected:?}"));
    }
    let cord_words = texts_in(ring)
        .into_iter()
        .find(|t| data(&t.data, "data-part") == Some("cord"))
        .map(|t| t.content.clone());
    let want = match expected[..] {
        [b] => format!("bar {b}"),
        _ => format!("mica {}|{}", expected[0], expected[1]),
    };
    if !cord_words.as_deref().is_some_and(|s| s.ends_with(&want)) {
        out.push(format!("the cord is labelled {cord_words:?}, not {want}"));
    }
    // Bar numbers.
    let numbers = group(&ring.children, "bar-numbers").unwrap();
    let step: u32 = data(&numbers.data, "data-step").unwrap().parse().unwrap();
    let mut numbered = Vec::new();
    for t in texts_in(numbers) {
        let s: u32 = data(&t.data, "data-seg").unwrap().parse().unwrap();
        if t.content != s.to_string() {
            out.push(format!("bar {s} reads {:?}", t.content));
        }
        let (up, down) = ink_extent(&t.content, t.size_mm, t.weight);
        let mid = (t.x, t.y - (up - down) / 2.0);
        if apart(angle(centre, mid), w.segment_deg(s)) > seg / 2.0 {
            out.push(format!("bar {s}'s number stands off its bar"));
        }
        numbered.push(s);
    }
    numbered.sort_unstable();
    let wanted: Vec<u32> = (1..=bars)
        .filter(|s| *s == 1 || (step < bars && s % step == 0))
        .collect();
    if numbered != wanted {
        out.push(format!("step {step}: numbered {numbered:?}"));
    }
    if let Some(most) = dense {
        let mut gaps: Vec<u32> = numbered.windows(2).map(|p| p[1] - p[0]).collect();
        gaps.push(bars + 1 - numbered.last().unwrap());
        if gaps.iter().any(|&g| g > most) {
            out.push(format!(
                "numbers {} bars apart somewhere",
                gaps.iter().max().unwrap()
            ));
        }
    }
    // Ticks: bar 1 marked, every 5th short, every 10th long; a line at every mica.
    let ticks = group(&ring.children, "bar-ticks").unwrap();
    let mut fives = Vec::new();
    let mut marked = false;
    for n in &ticks.children {
        if let Node::Line(l) = n {
            let s: u32 = data(&l.data, "data-seg").unwrap().parse().unwrap();
            let len = (l.from.0 - l.to.0).hypot(l.from.1 - l.to.1);
            match l.class.as_str() {
                "mark" => marked |= s == 1,
                "rule" if s.is_multiple_of(10) && len > 2.5 => fives.push(s),
                "leader" if s % 10 == 5 && len > 1.0 && len < 2.5 => fives.push(s),
                _ => out.push(format!("tick {} of bar {s}", l.class)),
            }
        }
    }
    if !marked {
        out.push("bar 1 is not marked".into());
    }
    if fives != (5..=bars).step_by(5).collect::<Vec<_>>() {
        out.push(format!("ticks at {fives:?}"));
    }
    let micas = ring
        .children
        .iter()
        .filter(|n| matches!(n, Node::Line(l) if l.class == "thin"))
        .count();
    if micas != bars as usize {
        out.push(format!("{micas} mica lines on {bars} bars"));
    }
    // Brushes: each named or signed, B1 named; signs alone only with the key in the words.
    let mut signed = 0;
    for b in &w.brushes {
        let g = group(&ring.children, &format!("ring-brush-{}", b.index)).unwrap();
        let sign = if data(&g.data, "data-polarity") == Some("+") {
            "+"
        } else {
            "\u{2212}"
        };
        let name = format!("B{}{sign}", b.index);
        let ok = texts_in(g)
            .iter()
            .any(|t| t.content == name || (b.index != 1 && t.content == sign));
        if !ok {
            out.push(format!("brush {} is neither named nor signed", b.index));
        }
        signed += usize::from(texts_in(g).iter().any(|t| t.content == sign));
    }
    let words = page
        .texts()
        .iter()
        .map(|t| t.2.content.as_str())
        .collect::<Vec<_>>()
        .join(" ");
    if (signed > 0) != words.contains("its sign alone is written") {
        out.push(format!(
            "{signed} brushes signed alone, and the words say otherwise"
        ));
    }
    out
}

#[test]
fn the_end_view_at_96_poles_is_legible_and_countable_on_every_paper() {
    let mut all = Vec::new();
    for (name, toml) in [("lap", lap()), ("wave", wave())] {
        let c = checked(&toml);
        assert_eq!(c.design.poles, 96);
        assert_eq!(c.winding.brushes.len(), 96, "{name}");
        for paper in PAPERS {
            let page = end_page(&c, paper);
            let dense = if matches!(paper, Paper::A3 | Paper::Tabloid) {
                5
            } else {
                10
            };
            for b in breaches(&page)
                .into_iter()
                .chain(ring_breaches(&c, &page, Some(dense)))
            {
                all.push(format!("{name} {}: {b}", paper.as_str()));
            }
        }
    }
    assert!(all.is_empty(), "{}", all.join("\n"));
}

#[test]
fn every_demo_end_view_draws_the_cord_and_numbers_bar_1() {
    let mut all = Vec::new();
    for name in support::DEMOS {
        let c = checked(&support::demo(name));
        for paper in [Paper::A4, Paper::A3] {
            for b in ring_breaches(&c, &end_page(&c, paper), None) {
                all.push(format!("{name} {}: {b}", paper.as_str()));
            }
        }
    }
    assert!(all.is_empty(), "{}", all.join("\n"));
}

/// The in-line bar of the two designs, as the trace places it: the lap's on a bar, the
/// wave's on a mica, so both cases of the cord are walked.
#[test]
fn the_designs_put_slot_1_on_a_bar_and_on_a_mica() {
    let lap = checked(&lap());
    let wave = checked(&wave());
    assert_eq!(lap.winding.lead_swing.in_line(288).1, None);
    assert!(wave.winding.lead_swing.in_line(287).1.is_some());
}

#[test]
fn the_ring_check_finds_a_missing_number_a_moved_cord_a_wrong_shade_and_a_lost_brush() {
    let c = checked(&lap());
    let page = end_page(&c, Paper::A4);
    assert!(ring_breaches(&c, &page, Some(10)).is_empty());
    fn edit(nodes: &mut [Node], f: &mut dyn FnMut(&mut Node) -> bool) {
        for n in nodes.iter_mut() {
            if f(n) {
                continue;
            }
            if let Node::Group(g) = n {
                edit(&mut g.children, f);
            }
        }
    }
    // Bar 20's number taken away.
    let mut p = page.clone();
    edit(&mut p.children, &mut |n| {
        if let Node::Group(g) = n
            && g.id.as_deref() == Some("bar-numbers")
        {
            g.children
                .retain(|t| !matches!(t, Node::Text(t) if data(&t.data, "data-seg") == Some("20")));
            return true;
        }
        false
    });
    let found = ring_breaches(&c, &p, Some(10)).join("\n");
    assert!(found.contains("numbered"), "{found}");
    assert!(found.contains("numbers 20 bars apart"), "{found}");
    // The cord turned a bar's width, and the shade moved to bar 1.
    let mut p = page.clone();
    edit(&mut p.children, &mut |n| match n {
        Node::Line(l) if l.class == "cord" => {
            l.to.0 += 3.0;
            true
        }
        Node::Path(q) if q.class.as_deref() == Some("inline-bar") => {
            q.data = vec![("data-seg", "1".into())];
            true
        }
        _ => false,
    });
    let found = ring_breaches(&c, &p, Some(10)).join("\n");
    assert!(found.contains("short of the bars"), "{found}");
    assert!(found.contains("shaded bars [1]"), "{found}");
    // Brush 5's name taken away, and brush 7's sign written alone with no key in the words.
    let mut p = page.clone();
    edit(&mut p.children, &mut |n| match n {
        Node::Group(g) if g.id.as_deref() == Some("ring-brush-5") => {
            g.children.retain(|t| !matches!(t, Node::Text(_)));
            true
        }
        Node::Group(g) if g.id.as_deref() == Some("ring-brush-7") => {
            for t in g.children.iter_mut() {
                if let Node::Text(t) = t {
                    t.content = t.content.chars().last().unwrap().to_string();
                }
            }
            true
        }
        _ => false,
    });
    let found = ring_breaches(&c, &p, Some(10)).join("\n");
    assert!(
        found.contains("brush 5 is neither named nor signed"),
        "{found}"
    );
    assert!(found.contains("1 brushes signed alone"), "{found}");
}
