//! Reference outputs of `check` (text and JSON) for every demo design, kept with insta.
//! A change of wording or numbers shows up as a snapshot diff to review.

use armsheet::check;
use armsheet::design::parse_design;
use armsheet::render::json::report_json;
use armsheet::render::text::{TextOptions, render_text};

const DEMOS: [&str; 5] = [
    "hoist-lap",
    "press-duplex-lap",
    "pump-wave",
    "conveyor-wave-dummy",
    "mill-lap-12p",
];

fn outputs(name: &str) -> (String, String) {
    let path = format!("designs/{name}.toml");
    let text = std::fs::read_to_string(format!("{}/{path}", env!("CARGO_MANIFEST_DIR"))).unwrap();
    let r = check(parse_design(&text, &path).unwrap());
    (
        render_text(
            &r,
            TextOptions {
                unicode: false,
                version: env!("CARGO_PKG_VERSION"),
            },
        ),
        report_json(&r),
    )
}

#[test]
fn demo_text_reports() {
    for name in DEMOS {
        let (text, _) = outputs(name);
        insta::assert_snapshot!(format!("text-{name}"), text);
    }
}

#[test]
fn demo_json_reports() {
    for name in DEMOS {
        let (_, json) = outputs(name);
        insta::assert_snapshot!(format!("json-{name}"), json);
    }
}

#[test]
fn reports_are_byte_identical_on_a_second_run() {
    for name in DEMOS {
        assert_eq!(outputs(name), outputs(name), "{name}");
    }
}
