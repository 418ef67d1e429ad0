//! The style table: every class the pages use, resolved once into stroke, fill, dash and face.
//!
//! Part of the `layout` stage. The table is an ordered list of CSS-like rules; the SVG writer
//! prints it as the pages' `<style>` sheet, and the PDF writer resolves an item's looks from
//! it with the same cascade (later and more specific rules win over earlier ones, a rule wins
//! over a look given on the element, everything else is inherited from the enclosing group).
//! Paths are told apart three ways so that a greyscale print still separates them: a
//! colour-blind-safe colour (after the Okabe–Ito palette [src: Okabe & Ito, *Color Universal
//! Design*, 2002/2008]), a dash pattern on the end connections, and the path number written
//! at every coil's back end. Each look has one meaning: colour and dash name the circuit a
//! coil is in (its path, or shorted by a brush, or a dummy), the stroke width the layer of a
//! coil side in its slot (top thick, bottom thin).

use std::sync::OnceLock;

use super::font::Weight;

/// The smallest font size on any sheet, mm: a cap height of about 1.8 mm in DejaVu Sans, the
/// smallest nominal lettering height of ISO 3098 (from memory).
pub const TEXT_FLOOR: f64 = 2.5;
/// The font size of table bodies and the winding-data block, mm.
pub const BODY_TEXT: f64 = 3.5;
/// The font size of the compact winding-data block of sheet 1, mm (between the floor and
/// the body size).
pub const COMPACT_TEXT: f64 = 2.8;
/// Least distance between neighbouring coil-side lines of the developed diagram on paper, mm.
pub const SIDE_GAP: f64 = 1.0;

/// Path colours, path k taking `PATH_COLOURS[(k − 1) % 6]`: Okabe–Ito's blue, vermillion
/// and bluish green, Tol's wine, and a dark purple and a dark cyan in place of Okabe–Ito's
/// orange and sky blue, which photocopy pale. Every colour is at least as dark as a mid grey
/// (CIE L* at most 60: 46, 54, 58, 32, 33, 42), and the three colours at odd places and the
/// three at even places each lie at least 10 apart in L* (46, 58, 33 and 54, 32, 42)
/// [src: Okabe & Ito, *Color Universal Design*, 2002/2008; P. Tol, *Colour schemes*, SRON
/// technical note, 2021, from memory; L* of each colour derived with the CIE 1976 formula].
/// Paths that share a dash pattern are 8, 16 apart, so two places apart in this list: a
/// greyscale print tells every pair of the first 24 paths apart by dash or by grey.
pub const PATH_COLOURS: [&str; 6] = [
    "#0072B2", "#D55E00", "#009E73", "#882255", "#5D3A9B", "#0B6E80",
];

/// Dash patterns of the end connections, mm (empty: solid); path k takes
/// `PATH_DASHES[(k − 1) % 8]`: solid, long dash, dots, dash-dot, short dash, dash-dot-dot,
/// long gaps, long-short.
pub const PATH_DASHES: [&[f64]; 8] = [
    &[],
    &[2.4, 0.9],
    &[0.6, 0.7],
    &[2.4, 0.7, 0.7, 0.7],
    &[1.2, 0.8],
    &[2.4, 0.6, 0.6, 0.6, 0.6, 0.6],
    &[3.6, 1.8],
    &[2.4, 0.7, 1.2, 0.7],
];

/// Dash pattern of a dummy coil's connections, mm.
pub const DUMMY_DASH: &[f64] = &[0.4, 0.6];
/// Dash pattern of the connections of a coil shorted by a brush (pairs of short dashes),
/// kept for those alone: in a greyscale print the shorted coils' grey is told from a dark
/// path colour by it, not by lightness.
pub const SHORTED_DASH: &[f64] = &[0.9, 0.5, 0.9, 1.9];
/// The dash of a match line of a continued diagram: long dash, gap, dot, gap (mm).
pub const MATCH_DASH: &[f64] = &[4.0, 1.0, 0.6, 1.0];

/// Dash pattern of the cord through slot 1's centre on the commutator end view, mm: a
/// centre line's long dash and dot.
pub const CORD_DASH: &[f64] = &[3.0, 0.8, 0.6, 0.8];

/// Grey of coils under commutation (shorted by a brush at the drawn instant).
pub const SHORTED_GREY: &str = "#505050";
/// Grey of dummy coils.
pub const DUMMY_GREY: &str = "#9a9a9a";
/// The ink of lines and text.
pub const INK: &str = "#111";

/// Paths apart by this many look alike (colour and dash both repeat): the least common
/// multiple of the colours and the dashes.
pub const LOOK_CYCLE: usize = {
    let (a, b) = (PATH_COLOURS.len(), PATH_DASHES.len());
    let (mut x, mut y) = (a, b);
    while y != 0 {
        (x, y) = (y, x % y);
    }
    a / x * b
};

/// The colour class number (1…6) of path `path` (1-based); 0 for no path.
pub fn colour_class(path: u32) -> usize {
    if path == 0 {
        0
    } else {
        (path as usize - 1) % PATH_COLOURS.len() + 1
    }
}

/// The dash class number (1…8) of path `path` (1-based).
pub fn dash_class(path: u32) -> usize {
    if path == 0 {
        1
    } else {
        (path as usize - 1) % PATH_DASHES.len() + 1
    }
}

/// Where a text stands on its anchor point.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Anchor {
    /// Starts at x.
    #[default]
    Start,
    /// Centred on x.
    Middle,
    /// Ends at x.
    End,
}

/// What a rule applies to.
#[derive(Clone, Debug, PartialEq)]
pub enum Selector {
    /// Every text.
    Text,
    /// Items of a class.
    Class(String),
    /// Items of the second class inside a group of the first.
    Inside(String, String),
}

impl Selector {
    fn specificity(&self) -> u32 {
        match self {
            Selector::Text => 1,
            Selector::Class(_) => 10,
            Selector::Inside(..) => 20,
        }
    }
}

/// One look.
#[derive(Clone, Debug, PartialEq)]
pub enum Decl {
    /// The sheets' typeface (DejaVu Sans, embedded).
    FontFamily,
    /// Fill colour, or none.
    Fill(Option<&'static str>),
    /// Stroke colour, or none.
    Stroke(Option<&'static str>),
    /// Stroke width, mm.
    StrokeWidth(f64),
    /// Dash pattern, mm (empty: solid).
    Dash(&'static [f64]),
    /// Round line ends.
    RoundCap,
    /// Round line joins.
    RoundJoin,
    /// The stroke is painted under the fill (a halo round text).
    StrokeUnder,
    /// Bold face.
    Bold,
    /// Text anchor.
    Anchor(Anchor),
}

/// A rule: selectors (any of them) and the looks they give.
#[derive(Clone, Debug, PartialEq)]
pub struct Rule {
    /// The selectors.
    pub selectors: Vec<Selector>,
    /// The looks.
    pub decls: Vec<Decl>,
}

fn rule(selectors: &[&str], decls: Vec<Decl>) -> Rule {
    let selectors = selectors
        .iter()
        .map(|s| match s.split_once(' ') {
            _ if *s == "text" => Selector::Text,
            Some((a, b)) => Selector::Inside(a.to_string(), b.to_string()),
            None => Selector::Class(s.to_string()),
        })
        .collect();
    Rule { selectors, decls }
}

/// The style table, in cascade order.
pub fn style_table() -> &'static [Rule] {
    static TABLE: OnceLock<Vec<Rule>> = OnceLock::new();
    TABLE.get_or_init(build_table)
}

fn build_table() -> Vec<Rule> {
    use Decl::*;
    let none = |c: fn(Option<&'static str>) -> Decl| c(None);
    let mut t = vec![
        rule(&["text"], vec![FontFamily, Fill(Some(INK)), none(Stroke)]),
        rule(
            &["halo"],
            vec![
                StrokeUnder,
                Stroke(Some("#fff")),
                StrokeWidth(0.55),
                RoundJoin,
            ],
        ),
        rule(
            &["side-top", "side-bot", "conn", "stub"],
            vec![none(Fill), RoundCap, RoundJoin],
        ),
        // The layer of a coil side is its width alone: dashes name circuits.
        rule(&["side-top"], vec![StrokeWidth(0.6)]),
        rule(&["side-bot"], vec![StrokeWidth(0.25)]),
        rule(&["conn"], vec![StrokeWidth(0.3)]),
        rule(&["stub"], vec![StrokeWidth(0.3)]),
        rule(&["k0"], vec![Stroke(Some(SHORTED_GREY))]),
        rule(&["dead"], vec![Stroke(Some(DUMMY_GREY))]),
        rule(&["dead conn", "dead stub"], vec![Dash(DUMMY_DASH)]),
        rule(&["pole-n"], vec![Fill(Some("#f2dcd3"))]),
        rule(&["pole-s"], vec![Fill(Some("#d8e4ef"))]),
        rule(
            &["pole-hatch"],
            vec![none(Fill), Stroke(Some("#8da2b8")), StrokeWidth(0.2)],
        ),
        rule(&["shade-n"], vec![Fill(Some("#f9efeb"))]),
        rule(&["shade-s"], vec![Fill(Some("#edf3f8"))]),
        rule(
            &["pole-edge"],
            vec![none(Fill), Stroke(Some("#555")), StrokeWidth(0.2)],
        ),
        rule(
            &["core"],
            vec![none(Fill), Stroke(Some("#777")), StrokeWidth(0.2)],
        ),
        rule(
            &["slot"],
            vec![none(Fill), Stroke(Some("#c4c4c4")), StrokeWidth(0.15)],
        ),
        rule(
            &["segbox"],
            vec![
                Fill(Some("#f4efe2")),
                Stroke(Some("#3a3a3a")),
                StrokeWidth(0.2),
            ],
        ),
        rule(&["brushbox"], vec![Stroke(Some(INK)), StrokeWidth(0.3)]),
        rule(&["brush-pos"], vec![Fill(Some(INK))]),
        rule(&["brush-neg"], vec![Fill(Some("#fff"))]),
        rule(
            &["eqline"],
            vec![none(Fill), Stroke(Some("#6b4b2a")), StrokeWidth(0.35)],
        ),
        rule(
            &["eqtap"],
            vec![none(Fill), Stroke(Some("#6b4b2a")), StrokeWidth(0.2)],
        ),
        rule(&["eqdot"], vec![Fill(Some("#6b4b2a"))]),
        rule(&["cutdot"], vec![Fill(Some(INK)), none(Stroke)]),
        rule(
            &["leader"],
            vec![none(Fill), Stroke(Some(INK)), StrokeWidth(0.15)],
        ),
        rule(&["arrow-head"], vec![none(Stroke)]),
        rule(
            &["mark"],
            vec![none(Fill), Stroke(Some(INK)), StrokeWidth(0.3)],
        ),
        rule(
            &["frame"],
            vec![none(Fill), Stroke(Some(INK)), StrokeWidth(0.5)],
        ),
        rule(
            &["rule"],
            vec![none(Fill), Stroke(Some(INK)), StrokeWidth(0.25)],
        ),
        rule(
            &["thin"],
            vec![none(Fill), Stroke(Some("#999")), StrokeWidth(0.15)],
        ),
        rule(
            &["checkbox"],
            vec![Fill(Some("#fff")), Stroke(Some(INK)), StrokeWidth(0.3)],
        ),
        rule(&["band"], vec![Fill(Some(INK))]),
        rule(&["band-text"], vec![Fill(Some("#fff")), Bold]),
        rule(
            &["caution"],
            vec![Fill(Some("#fff8e6")), Stroke(Some(INK)), StrokeWidth(0.35)],
        ),
        rule(&["wt"], vec![Fill(Some("#fff"))]),
        rule(&["cut-label"], vec![Fill(Some("#222"))]),
        rule(&["b"], vec![Bold]),
        rule(&["end"], vec![Anchor(self::Anchor::End)]),
        rule(&["mid"], vec![Anchor(self::Anchor::Middle)]),
    ];
    t.extend(end_view_rules());
    for (i, c) in PATH_COLOURS.iter().enumerate() {
        t.push(rule(&[&format!("k{}", i + 1)], vec![Stroke(Some(c))]));
        t.push(rule(&[&format!("f{}", i + 1)], vec![Fill(Some(c))]));
    }
    for (i, d) in PATH_DASHES.iter().enumerate() {
        t.push(rule(&[&format!("d{} conn", i + 1)], vec![Dash(d)]));
    }
    // After the path dashes, so that a shorted coil's (classes k0 d1) wins.
    t.push(rule(&["k0 conn", "k0 stub"], vec![Dash(SHORTED_DASH)]));
    t.push(match_rule());
    t.extend(plot_rules());
    t
}

/// The looks of the plain drawings: the coil in plan (its outline, the core's ends dashed),
/// and the search plot's box, grid and markers on and off the front.
fn plot_rules() -> Vec<Rule> {
    use Decl::*;
    vec![
        rule(
            &["coil-outline"],
            vec![Fill(None), Stroke(Some(INK)), StrokeWidth(0.5)],
        ),
        rule(
            &["core-end"],
            vec![
                Fill(None),
                Stroke(Some("#555")),
                StrokeWidth(0.25),
                Dash(DUMMY_DASH),
            ],
        ),
        rule(
            &["plot-box"],
            vec![Fill(None), Stroke(Some(INK)), StrokeWidth(0.3)],
        ),
        rule(
            &["grid"],
            vec![Fill(None), Stroke(Some("#c8c8c8")), StrokeWidth(0.15)],
        ),
        rule(
            &["mark-on"],
            vec![Fill(Some(INK)), Stroke(Some(INK)), StrokeWidth(0.2)],
        ),
        rule(
            &["mark-off"],
            vec![Fill(Some("#fff")), Stroke(Some("#444")), StrokeWidth(0.25)],
        ),
    ]
}

/// A match line of a continued diagram: long dash, dot, in ink.
fn match_rule() -> Rule {
    use Decl::*;
    let line = vec![
        Fill(None),
        Stroke(Some(INK)),
        StrokeWidth(0.35),
        Dash(MATCH_DASH),
    ];
    rule(&["match"], line)
}

/// The end view's own looks: the cord through slot 1's centre (a centre line, dash-dot),
/// the bar in line with it (shaded, outlined), and bar 1's dot.
fn end_view_rules() -> Vec<Rule> {
    use Decl::*;
    vec![
        rule(
            &["cord"],
            vec![
                Fill(None),
                Stroke(Some(INK)),
                StrokeWidth(0.35),
                Dash(CORD_DASH),
            ],
        ),
        rule(
            &["inline-bar"],
            vec![Fill(Some("#b0b0b0")), Stroke(Some(INK)), StrokeWidth(0.25)],
        ),
        rule(&["bar1-dot"], vec![Fill(Some(INK)), Stroke(None)]),
    ]
}

/// The looks of one item, after the cascade.
#[derive(Clone, Debug, PartialEq)]
pub struct Resolved {
    /// Fill colour (`#rgb` or `#rrggbb`), or none.
    pub fill: Option<&'static str>,
    /// Stroke colour, or none.
    pub stroke: Option<&'static str>,
    /// Stroke width, mm.
    pub stroke_width: f64,
    /// Dash pattern, mm (empty: solid).
    pub dash: &'static [f64],
    /// Round line ends.
    pub round_cap: bool,
    /// Round line joins.
    pub round_join: bool,
    /// Stroke painted under the fill.
    pub stroke_under: bool,
    /// The face.
    pub weight: Weight,
    /// The text anchor.
    pub anchor: Anchor,
}

impl Default for Resolved {
    /// The initial looks: black fill, no stroke, 1 mm stroke width, regular face.
    fn default() -> Resolved {
        Resolved {
            fill: Some("#000"),
            stroke: None,
            stroke_width: 1.0,
            dash: &[],
            round_cap: false,
            round_join: false,
            stroke_under: false,
            weight: Weight::Regular,
            anchor: Anchor::Start,
        }
    }
}

impl Resolved {
    fn apply(&mut self, d: &Decl) {
        match d {
            Decl::FontFamily => {}
            Decl::Fill(c) => self.fill = *c,
            Decl::Stroke(c) => self.stroke = *c,
            Decl::StrokeWidth(w) => self.stroke_width = *w,
            Decl::Dash(a) => self.dash = a,
            Decl::RoundCap => self.round_cap = true,
            Decl::RoundJoin => self.round_join = true,
            Decl::StrokeUnder => self.stroke_under = true,
            Decl::Bold => self.weight = Weight::Bold,
            Decl::Anchor(a) => self.anchor = *a,
        }
    }
}

/// The looks of an item with classes `class` (space-separated), inside groups whose classes
/// are `outer`, given the looks `inherited` from its group and the looks `own` set on the
/// element itself.
pub fn resolve(
    inherited: &Resolved,
    is_text: bool,
    class: &str,
    outer: &[&str],
    own: &[Decl],
) -> Resolved {
    let mut out = inherited.clone();
    for d in own {
        out.apply(d);
    }
    let mine: Vec<&str> = class.split_whitespace().collect();
    let mut hits: Vec<(u32, usize, &Rule)> = Vec::new();
    for (order, r) in style_table().iter().enumerate() {
        let spec = r
            .selectors
            .iter()
            .filter(|s| match s {
                Selector::Text => is_text,
                Selector::Class(c) => mine.contains(&c.as_str()),
                Selector::Inside(a, c) => mine.contains(&c.as_str()) && outer.contains(&a.as_str()),
            })
            .map(Selector::specificity)
            .max();
        if let Some(spec) = spec {
            hits.push((spec, order, r));
        }
    }
    hits.sort_by_key(|h| (h.0, h.1));
    for (_, _, r) in hits {
        for d in &r.decls {
            out.apply(d);
        }
    }
    out
}

/// The face and anchor a text of classes `class` takes.
pub fn text_face(class: &str) -> (Weight, Anchor) {
    let r = resolve(&Resolved::default(), true, class, &[], &[]);
    (r.weight, r.anchor)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_cascade_follows_specificity_then_order() {
        let base = Resolved::default();
        let coil = resolve(&base, false, "coil dead", &[], &[]);
        assert_eq!(coil.stroke, Some(DUMMY_GREY));
        let conn = resolve(&coil, false, "conn", &["coil", "dead"], &[]);
        assert_eq!(conn.dash, DUMMY_DASH);
        assert_eq!(conn.stroke, Some(DUMMY_GREY));
        assert_eq!(conn.stroke_width, 0.3);
        assert_eq!(conn.fill, None);
        // A rule beats a fill given on the element.
        let t = resolve(&base, true, "mid", &[], &[Decl::Fill(Some("#666"))]);
        assert_eq!(t.fill, Some(INK));
        assert_eq!(t.anchor, Anchor::Middle);
        assert_eq!(text_face("b end"), (Weight::Bold, Anchor::End));
        assert_eq!(text_face(""), (Weight::Regular, Anchor::Start));
    }

    /// CIE 1976 L* of an sRGB colour "#rrggbb" [src: IEC 61966-2-1 (sRGB transfer) and the
    /// CIE 1976 L* formula, from memory; the check's own arithmetic, not the palette's].
    fn lightness(hex: &str) -> f64 {
        let channel = |i: usize| {
            let c = f64::from(u8::from_str_radix(&hex[i..i + 2], 16).unwrap()) / 255.0;
            if c <= 0.04045 {
                c / 12.92
            } else {
                ((c + 0.055) / 1.055).powf(2.4)
            }
        };
        let y = 0.2126 * channel(1) + 0.7152 * channel(3) + 0.0722 * channel(5);
        let f = if y > 216.0 / 24389.0 {
            y.cbrt()
        } else {
            (24389.0 / 27.0 * y + 16.0) / 116.0
        };
        116.0 * f - 16.0
    }

    /// Whether paths `a` and `b` look alike in a greyscale print: the same dash and greys
    /// less than 10 L* apart.
    fn alike_in_grey(a: u32, b: u32) -> bool {
        dash_class(a) == dash_class(b)
            && (lightness(PATH_COLOURS[colour_class(a) - 1])
                - lightness(PATH_COLOURS[colour_class(b) - 1]))
            .abs()
                < 10.0
    }

    #[test]
    fn every_pair_of_the_first_24_paths_stays_apart_in_greyscale() {
        // Okabe–Ito blue is L* 46 and sky blue 70 (derived here, from memory as to the
        // published values); the check is on the formula above.
        assert!((lightness("#0072B2") - 46.0).abs() < 1.0);
        assert!((lightness("#56B4E9") - 69.8).abs() < 1.0);
        for a in 1..=24 {
            for b in a + 1..=24 {
                assert!(!alike_in_grey(a, b), "paths {a} and {b} look alike in grey");
            }
        }
        // Colour and dash both come round again after 24 paths; the path number at each
        // coil's back end tells those apart.
        assert_eq!(colour_class(1), colour_class(25));
        assert_eq!(dash_class(1), dash_class(25));
    }

    #[test]
    fn the_old_four_dash_cycle_fails_the_grey_check() {
        // Paths 4 and 8 shared a dash under the four-pattern cycle, in the reddish purple
        // and the vermillion of Okabe–Ito: L* 61 and 54.
        assert!((lightness("#CC79A7") - lightness("#D55E00")).abs() < 10.0);
        assert_ne!(dash_class(4), dash_class(8));
    }
}
