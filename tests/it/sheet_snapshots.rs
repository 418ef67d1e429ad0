//! Snapshots of sheet 1 (developed diagram, title and data blocks) for two small fixtures:
//! a simplex lap with equalizers and a simplex wave with a dummy coil.

use crate::support::sheets::*;
use armsheet::layout::{Paper, Window};

#[test]
fn lap_sheet_1() {
    let (d, _) = load("sheet_lap.toml", &fixture("sheet_lap.toml"));
    insta::assert_snapshot!("lap_sheet_1", sheets_for(&d, Paper::A4, Window::Auto)[0]);
}

#[test]
fn wave_dummy_sheet_1() {
    let (d, _) = load("sheet_wave_dummy.toml", &fixture("sheet_wave_dummy.toml"));
    insta::assert_snapshot!(
        "wave_dummy_sheet_1",
        sheets_for(&d, Paper::A4, Window::Auto)[0]
    );
}

#[test]
fn wave_dummy_draw() {
    let (d, _) = load("sheet_wave_dummy.toml", &fixture("sheet_wave_dummy.toml"));
    let svg = draw_svg(&d, Window::Auto);
    assert!(!svg.contains("title-block"));
    assert!(svg.contains("width=\"1120px\""));
    insta::assert_snapshot!("wave_dummy_draw", svg);
}
