//! Snapshots of the rating section for the demos that carry rating data, the sheet rows, and
//! a rewind report with the new design file it writes. Review a changed .snap before accepting.

use armsheet::design::{WindingType, parse_design};
use armsheet::features::rewind::{RewindRequest, rewind};
use armsheet::layout::sheet::rows::rating_sheet_rows;
use armsheet::rating::rate;
use armsheet::render::rating_text::render_rating;
use armsheet::render::rewind_text::render_rewind;
use armsheet::winding::trace_winding;

const RATED_DEMOS: [&str; 3] = ["hoist-lap", "pump-wave", "mill-lap-12p"];

fn load(name: &str) -> armsheet::design::Design {
    let path = format!("{}/designs/{name}.toml", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap();
    parse_design(&text, &format!("designs/{name}.toml")).unwrap()
}

#[test]
fn rating_sections_of_the_demos() {
    for name in RATED_DEMOS {
        let d = load(name);
        let w = trace_winding(&d);
        let r = rate(&d, &w).unwrap_or_else(|| panic!("{name} has no rating data"));
        let mut s = String::new();
        render_rating(&mut s, &d, &r);
        let rows: Vec<String> = rating_sheet_rows(&r, d.units)
            .into_iter()
            .map(|(l, v)| format!("{l}: {v}"))
            .collect();
        s.push_str("\nsheet rows:\n");
        s.push_str(&rows.join("\n"));
        insta::assert_snapshot!(format!("rating-{name}"), s);
    }
}

#[test]
fn demos_without_rating_data_have_no_rating() {
    for name in ["conveyor-wave-dummy", "press-duplex-lap"] {
        let d = load(name);
        let w = trace_winding(&d);
        assert!(rate(&d, &w).is_none(), "{name}");
    }
}

#[test]
fn rewind_report_and_new_file_hoist_to_220_v_wave() {
    let d = load("hoist-lap");
    let w = trace_winding(&d);
    let req = RewindRequest {
        voltage: 220.0,
        kind: Some(WindingType::Wave),
        ..RewindRequest::default()
    };
    let p = rewind(&d, &w, &req).unwrap();
    let asked = "armsheet rewind designs/hoist-lap.toml --voltage 220 --type wave";
    let file = p.design_file("designs/hoist-lap.toml", asked);
    let back = parse_design(&file, "new.toml").unwrap();
    let report = render_rewind(
        &p,
        "designs/hoist-lap.toml",
        asked,
        &armsheet::check(back),
        None,
        env!("CARGO_PKG_VERSION"),
    );
    insta::assert_snapshot!("rewind-hoist-220v-wave-report", report);
    insta::assert_snapshot!("rewind-hoist-220v-wave-file", file);
}
