//! Every coil shorted by a brush at the drawn instant carries the `sc` tag at its back end on
//! the developed diagram, or stands next to one that does (the coils of one slot have
//! their apexes within a tag's width), on every demo at sheet size.

use crate::support;

use armsheet::layout::developed::tag_text;
use armsheet::layout::font::{Weight, text_width};
use armsheet::layout::{DiagramOptions, Window, layout_developed};

#[test]
fn every_shorted_coil_in_view_is_tagged() {
    let mut seen = 0;
    for name in support::DEMOS {
        let checked = armsheet::check(support::design(&support::demo(name)));
        let d = layout_developed(
            &checked.design,
            &checked.winding,
            &DiagramOptions {
                width: 277.0,
                height: 120.0,
                window: Window::Auto,
                floor: true,
            },
        );
        let tagged_sc: Vec<f64> = d
            .coils
            .iter()
            .filter(|c| c.tag.is_some() && tag_text(c) == "sc")
            .map(|c| c.tag.unwrap().0)
            .collect();
        // A kept tag takes the place of any other within its own width and the 0.6 mm gap.
        let reach = text_width("sc", d.label_size, Weight::Bold) + 0.6 + 1e-6;
        let shorted: Vec<_> = d.coils.iter().filter(|c| c.path == 0 && !c.dummy).collect();
        seen += shorted.len();
        for c in shorted {
            if c.tag.is_some() {
                continue;
            }
            // The apex: the highest point of the back end connection, where it is in view.
            let top = d.bands.back_apex;
            let apex: Vec<f64> = c
                .back
                .iter()
                .flatten()
                .filter(|p| (p.1 - top).abs() < 1e-6)
                .map(|p| p.0)
                .collect();
            let shared = apex
                .iter()
                .any(|&x| tagged_sc.iter().any(|&t| (t - x).abs() < reach));
            let beside_edge = apex
                .iter()
                .all(|&x| x < d.strip.0 + 3.0 || x > d.strip.1 - 3.0);
            assert!(
                shared || beside_edge,
                "{name}: shorted coil {} has no sc tag at its apex",
                c.coil
            );
        }
    }
    assert!(seen > 0, "some demo has coils under a brush");
}
