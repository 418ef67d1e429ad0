//! The palette in a greyscale photocopy: every path colour at least as dark as a mid grey,
//! and each look with one meaning (colour and dash name the circuit, width the layer), so
//! that the shorted coils' grey is told from a dark path colour by its dash, not its grey.
//!
//! L* is computed here from the sRGB definition and the CIE 1976 lightness, not taken from
//! the palette's own notes [src: IEC 61966-2-1:1999 (sRGB: the transfer function and the
//! relative luminance Y = 0.2126 R + 0.7152 G + 0.0722 B of linear values); CIE 15:2004
//! (CIELAB: L* = 116 f(Y/Yn) − 16, f(t) = t^(1/3) above (6/29)^3, else t/(3 (6/29)^2) + 4/29),
//! with white paper Yn = 1; from memory].

use armsheet::layout::style::{
    DUMMY_DASH, PATH_COLOURS, PATH_DASHES, Resolved, SHORTED_DASH, SHORTED_GREY, resolve,
};

/// CIE L* of "#rrggbb" against white paper.
fn lightness(hex: &str) -> f64 {
    let lin = |i: usize| {
        let c = f64::from(u8::from_str_radix(&hex[i..i + 2], 16).unwrap()) / 255.0;
        if c <= 0.04045 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        }
    };
    let y = 0.2126 * lin(1) + 0.7152 * lin(3) + 0.0722 * lin(5);
    let d = 6.0_f64 / 29.0;
    let f = if y > d.powi(3) {
        y.cbrt()
    } else {
        y / (3.0 * d * d) + 4.0 / 29.0
    };
    116.0 * f - 16.0
}

/// Mid grey on a photocopy: L* 60 and darker (white paper is 100, mid grey about 50–60).
const MID_GREY_L: f64 = 60.0;

/// The colours of `palette` lighter than a mid grey.
fn too_pale<'a>(palette: &[&'a str]) -> Vec<(&'a str, f64)> {
    palette
        .iter()
        .map(|c| (*c, lightness(c)))
        .filter(|(_, l)| *l > MID_GREY_L)
        .collect()
}

#[test]
fn the_lightness_formula_meets_known_points() {
    // White paper 100, black 0, sRGB mid grey #777777 about 50 (derived from the formulas).
    assert!((lightness("#ffffff") - 100.0).abs() < 1e-6);
    assert!(lightness("#000000").abs() < 1e-6);
    assert!((lightness("#777777") - 50.0).abs() < 0.5);
}

#[test]
fn every_path_colour_is_at_least_as_dark_as_a_mid_grey() {
    assert_eq!(too_pale(&PATH_COLOURS), vec![]);
    // The shorted coils' grey is dark too: a photocopy keeps it.
    assert!(lightness(SHORTED_GREY) <= MID_GREY_L);
}

#[test]
fn the_old_orange_and_sky_blue_fail_the_check() {
    // Okabe–Ito orange and sky blue, paths 5 and 6 of the old palette: L* 71 and 70.
    let old = [
        "#0072B2", "#D55E00", "#009E73", "#882255", "#E69F00", "#56B4E9",
    ];
    let pale: Vec<&str> = too_pale(&old).into_iter().map(|(c, _)| c).collect();
    assert_eq!(pale, vec!["#E69F00", "#56B4E9"]);
}

/// The looks of a coil's end connection with classes `coil` on its group.
fn connection(coil: &str) -> Resolved {
    let outer: Vec<&str> = coil.split(' ').collect();
    let group = resolve(&Resolved::default(), false, coil, &[], &[]);
    resolve(&group, false, "conn", &outer, &[])
}

#[test]
fn shorted_coils_are_told_from_every_path_by_their_dash() {
    let sc = connection("coil k0 d1");
    assert_eq!(sc.stroke, Some(SHORTED_GREY));
    assert_eq!(sc.dash, SHORTED_DASH);
    for (i, d) in PATH_DASHES.iter().enumerate() {
        assert_ne!(SHORTED_DASH, *d, "path dash {}", i + 1);
    }
    assert_ne!(SHORTED_DASH, DUMMY_DASH);
    // A path's connection keeps its own dash (path 1: solid).
    assert_eq!(connection("coil k1 d1").dash, PATH_DASHES[0]);
    assert_eq!(connection("coil k2 d2").dash, PATH_DASHES[1]);
}

#[test]
fn the_layer_is_told_by_width_and_never_by_dash() {
    for k in ["k0 d1", "k1 d1", "k3 d5"] {
        let outer: Vec<&str> = ["coil"].into_iter().chain(k.split(' ')).collect();
        let group = resolve(&Resolved::default(), false, &outer.join(" "), &[], &[]);
        let top = resolve(&group, false, "side-top", &outer, &[]);
        let bot = resolve(&group, false, "side-bot", &outer, &[]);
        assert!(top.dash.is_empty() && bot.dash.is_empty(), "{k}");
        assert!(top.stroke_width >= 2.0 * bot.stroke_width, "{k}");
    }
}
