//! The test and sign-off sheets: the expected bar-to-bar readings with a ruled box for each
//! measured value, and on the first of them the insulation-resistance and withstand tests,
//! space for the surge and run test notes, and the signature, date and revision block.
//!
//! Part of the `layout` stage (the sheets). It only reads what was computed before it: the
//! armature test (`features::armature_test::expected`, computed once by the CLI) and the rating's
//! insulation and withstand values; it never solves or rates anything. The date boxes are
//! left empty for the shop: the clock is never read.

use crate::base::number::fmt_fixed;
use crate::features::armature_test::{ArmatureTest, Reading, Unit};
use crate::layout::font::{Weight, cut_to_width, wrap_text};
use crate::layout::style::{BODY_TEXT, TEXT_FLOOR};
use crate::layout::tree::{self, Group, Node, Text};
use crate::rating::insulation::{HALVING_STEP_C, PI_WAIVED_ABOVE_MOHM, REFERENCE_C};
use crate::rating::test_voltage::TEST_VOLTAGE_CAUTION;
use crate::theory::words::reading_unit_basis;

use super::table::{page_heading, table_area};
use super::{Input, PageFrame, Rect, TABLE_GAP, TABLE_HEADER, TablePage, hline};

/// The readings columns: heading and width, mm; the last is the empty measured box. At the
/// body size the bars column holds "1055–1056" (19.6 mm) and the expected one "0.0001234"
/// (18.9 mm); four groups (60 mm each) fit across A4.
const COLUMNS: [(&str, f64); 3] = [("bars", 21.0), ("expected", 20.5), ("measured", 18.5)];
/// Room a cell's text takes of its column, mm: all but the 1.5 mm right margin, and the bars
/// reach 0.5 mm into the gap before the group.
const CELL_ROOM: [f64; 2] = [COLUMNS[0].1 - 1.0, COLUMNS[1].1 - 1.5];
/// Places of an expected reading on the sheet, in the test's one prefixed unit (mΩ, µΩ, Ω or
/// coil, [`ArmatureTest::reading_prefix`]): from three to five significant digits, about what
/// a shop meter shows; `armsheet test` gives four places.
///
/// [`ArmatureTest::reading_prefix`]: crate::features::armature_test::ArmatureTest::reading_prefix
const SHEET_PLACES: usize = 2;
/// Width of the block column of the first test sheet, mm.
const PANEL_W: f64 = 100.0;
/// Heading size of a block, mm.
const BLOCK_HEAD: f64 = 3.5;
/// Size of the block texts, mm.
const BLOCK_TEXT: f64 = 3.0;
/// Height of a fill-in box, mm.
const FIELD_H: f64 = 6.0;
/// Height of a sign-off row, mm.
const SIGN_ROW: f64 = 8.0;
/// The least height of a notes box, mm.
const NOTES_MIN: f64 = 9.0;

/// Width of the readings table, mm.
pub(super) fn readings_width() -> f64 {
    COLUMNS.iter().map(|c| c.1).sum()
}

/// The readings in sheet order: neighbouring pairs, then (multiplex windings) the pairs m
/// apart within one winding.
fn readings<'a>(input: &Input<'a>) -> impl Iterator<Item = &'a Reading> {
    input.test.listed()
}

/// How many reading rows the sheets carry.
pub(super) fn reading_count(input: &Input<'_>) -> usize {
    readings(input).count()
}

/// Where the readings go: on the first test sheet (left of the block column) and on the rest.
pub(super) fn readings_areas(frame: &PageFrame) -> (Rect, Rect) {
    let area = table_area(frame);
    let first = Rect {
        w: area.w - PANEL_W - TABLE_GAP,
        ..area
    };
    (first, area)
}

/// A page of the test sheets; `first` carries the blocks.
pub(super) fn tests_page(
    out: &mut Vec<Node>,
    input: &Input<'_>,
    frame: &PageFrame,
    page: &TablePage,
    first: bool,
) {
    let total = reading_count(input);
    let heading = if total == 0 {
        "Tests and sign-off".to_string()
    } else {
        format!(
            "Tests and sign-off: bar-to-bar readings {}\u{2013}{} of {total}",
            page.rows.start + 1,
            page.rows.end
        )
    };
    out.push(page_heading(&frame.content, heading));
    out.push(readings_table(input, page).into());
    if first {
        let area = table_area(frame);
        let panel = Rect {
            x: area.right() - PANEL_W,
            w: PANEL_W,
            ..area
        };
        out.push(blocks(input, &panel).into());
    }
}

/// The unit of the readings table, in the test's one prefixed unit (mΩ, µΩ, Ω or coil): the
/// table's heads and the sheet's "Unit:" line both say this.
fn table_unit(t: &ArmatureTest) -> String {
    match t.unit {
        Unit::Ohm => format!("{}\u{3a9}", t.reading_prefix().symbol()),
        Unit::Coil => "coil".to_string(),
    }
}

/// The readings of `page`, column group by column group, each with an empty measured box.
fn readings_table(input: &Input<'_>, page: &TablePage) -> Group {
    let all: Vec<&Reading> = readings(input).collect();
    let prefix = input.test.reading_prefix();
    let unit = table_unit(input.test);
    let unit = unit.as_str();
    let neighbours = input.test.readings.len();
    let mut g = Group::id(format!("readings-{}", page.rows.start + 1)).with_class("readings");
    for (gx, rows) in &page.groups {
        let mut cx = *gx;
        for (j, (head, width)) in COLUMNS.into_iter().enumerate() {
            // Numbers are right-aligned under their heads; the measured head is centred on
            // its box.
            let (hx, cls) = if j == 2 {
                (cx + 1.5 + (width - 2.0) / 2.0, "b mid")
            } else {
                (cx + width - 1.5, "b end")
            };
            g.push(Text::new(hx, page.top + 3.6, 3.0, cls, head));
            if j > 0 {
                g.push(Text::new(hx, page.top + 7.3, 3.0, cls, unit));
            }
            cx += width;
        }
        let total = readings_width();
        g.push(hline(
            *gx,
            *gx + total,
            page.top + TABLE_HEADER - 0.3,
            "rule",
        ));
        for (i, r) in rows.clone().enumerate() {
            let reading = all[r];
            let y = page.top + TABLE_HEADER + (i as f64 + 1.0) * page.row - 1.4;
            let mut row = Group::class("reading-row")
                .with_data("data-from-bar", reading.from_bar)
                .with_data("data-to-bar", reading.to_bar);
            if r >= neighbours {
                row = row.with_class("reading-row within");
            }
            let bars = format!("{}\u{2013}{}", reading.from_bar, reading.to_bar);
            let expected = reading.expected.map_or_else(
                || "open".to_string(),
                |v| fmt_fixed(prefix.of(v), SHEET_PLACES),
            );
            let mut cx = *gx;
            for (j, (cell, cls)) in [(bars, "end"), (expected, "end")].iter().enumerate() {
                let width = COLUMNS[j].1;
                let (weight, _) = crate::layout::style::text_face(cls);
                let text = cut_to_width(cell, BODY_TEXT, weight, CELL_ROOM[j]);
                row.push(Text::new(cx + width - 1.5, y, BODY_TEXT, cls, text));
                cx += width;
            }
            let w = COLUMNS[2].1;
            row.push(tree::Rect::new(
                "checkbox",
                cx + 1.5,
                y + 1.4 - page.row + 0.5,
                w - 2.0,
                page.row - 1.0,
            ));
            g.push(row);
            g.push(hline(*gx, *gx + total, y + 1.4, "thin"));
        }
    }
    g
}

/// Lays the block column top down: text lines, fill-in boxes and notes boxes.
struct Column {
    g: Group,
    x: f64,
    w: f64,
    y: f64,
}

impl Column {
    fn head(&mut self, s: &str) {
        self.y += BLOCK_HEAD + 1.2;
        self.g
            .push(Text::new(self.x, self.y, BLOCK_HEAD, "b", s.to_string()));
        self.y += 0.8;
    }

    fn words(&mut self, s: &str, size: f64) {
        for line in wrap_text(s, size, Weight::Regular, self.w) {
            self.y += size * 1.3;
            self.g.push(Text::new(self.x, self.y, size, "", line));
        }
    }

    /// A row of fill-in fields: label, box width (mm; 0 for a tick box) and unit each.
    fn fields(&mut self, fields: &[(&str, f64, &str)]) {
        let top = self.y + 1.2;
        let base = top + FIELD_H - 1.6;
        let mut x = self.x;
        for &(label, width, unit) in fields {
            if !label.is_empty() {
                let t = Text::new(x, base, BLOCK_TEXT, "", label);
                x = t.span().1 + 1.0;
                self.g.push(t);
            }
            let w = if width == 0.0 { FIELD_H - 1.0 } else { width };
            let h = if width == 0.0 { FIELD_H - 1.0 } else { FIELD_H };
            self.g.push(tree::Rect::new(
                "checkbox",
                x,
                top + (FIELD_H - h) / 2.0,
                w,
                h,
            ));
            x += w + 1.0;
            if !unit.is_empty() {
                let t = Text::new(x, base, BLOCK_TEXT, "", unit);
                x = t.span().1 + 2.5;
                self.g.push(t);
            } else {
                x += 1.5;
            }
        }
        self.y = top + FIELD_H;
    }

    /// An empty ruled box `h` mm high for notes.
    fn notes(&mut self, h: f64) {
        self.y += 1.2;
        self.g
            .push(tree::Rect::new("checkbox", self.x, self.y, self.w, h));
        self.y += h;
    }
}

/// The insulation-resistance words: the test voltage, the minimum reading and the PI.
fn insulation_words(input: &Input<'_>) -> String {
    let Some(ir) = input.rating.and_then(|r| r.insulation.as_ref()) else {
        return "No [rating] voltage: take the test voltage and the minimum from the applicable standard.".into();
    };
    let volts = match ir.test_v_max {
        Some(hi) => format!("{}\u{2013}{}", fmt_fixed(ir.test_v, 0), fmt_fixed(hi, 0)),
        None => fmt_fixed(ir.test_v, 0),
    };
    let class = ir
        .class
        .map(|c| format!(" for class {}", c.label()))
        .unwrap_or_default();
    format!(
        "Megohmmeter {volts} V DC, winding to core ({} V winding). At least {} MOhm at 1 min, corrected to {} C (IR about halves for each {} C rise); PI = IR 10 min / IR 1 min at least {}{class}, waived above {} MOhm. IEEE 43-2013, from memory.",
        fmt_fixed(ir.rated_v, 0),
        fmt_fixed(ir.minimum_ir_mohm, 0),
        fmt_fixed(REFERENCE_C, 0),
        fmt_fixed(HALVING_STEP_C, 0),
        fmt_fixed(ir.minimum_pi, 1),
        fmt_fixed(PI_WAIVED_ABOVE_MOHM, 0),
    )
}

/// The withstand words: the test voltages of the rating.
fn withstand_words(input: &Input<'_>) -> String {
    let Some(t) = input.rating.and_then(|r| r.test_voltage.as_ref()) else {
        return "No [rating] voltage: take the test voltage from the applicable standard.".into();
    };
    format!(
        "After the IR test has passed. New or fully rewound {} V; overhauled, cleaned and dried {} V; partly rewound {} V (75 % of new, from memory). IEC 60034-1, Table 16.",
        fmt_fixed(t.new_v, 0),
        fmt_fixed(t.overhauled_v, 0),
        fmt_fixed(t.partial_v, 0),
    )
}

impl Column {
    /// Lays `f`'s items into a group of their own, with `id`.
    fn section(&mut self, id: &str, f: impl FnOnce(&mut Column)) {
        let outer = std::mem::replace(&mut self.g, Group::id(id));
        f(self);
        let inner = std::mem::replace(&mut self.g, outer);
        self.g.push(inner);
    }
}

/// The block column of the first test sheet in `r`.
fn blocks(input: &Input<'_>, r: &Rect) -> Group {
    let mut c = Column {
        g: Group::id("test-blocks").with_class("test-blocks"),
        x: r.x,
        w: r.w,
        y: r.y - 1.2,
    };
    let t = input.test;
    // A multiplex winding: say where the readings within one winding start.
    let within = t
        .readings_within_winding
        .as_ref()
        .map_or(String::new(), |w| {
            let n = t.readings.len();
            format!(
                " Readings {}\u{2013}{} are between bars {} apart, within one winding.",
                n + 1,
                n + w.len(),
                t.multiplicity
            )
        });
    c.section("readings-unit", |c| {
        c.head("Bar-to-bar readings");
        c.words(
            &format!(
                "Unit: {} ({}).{within} Write each reading in its box; armsheet test --readings ranks the faults they show.",
                table_unit(t),
                reading_unit_basis(t.coil_resistance_ohm, t.temperature_c)
            ),
            TEXT_FLOOR,
        );
    });
    c.section("insulation-resistance", |c| {
        c.head("Insulation resistance");
        c.words(&insulation_words(input), TEXT_FLOOR);
        c.fields(&[
            ("1 min", 16.0, "MOhm"),
            ("10 min", 16.0, "MOhm"),
            ("at", 10.0, "C"),
        ]);
    });
    c.section("withstand", |c| {
        c.head("Withstand (high-voltage) test, 1 min");
        c.words(&withstand_words(input), TEXT_FLOOR);
        c.fields(&[
            ("applied", 16.0, "V AC"),
            ("for", 10.0, "s"),
            ("passed", 0.0, ""),
        ]);
        c.y += 0.4;
        let mut caution = TEST_VOLTAGE_CAUTION.to_string();
        caution[..1].make_ascii_uppercase();
        c.words(&format!("{caution}."), TEXT_FLOOR);
    });
    // What is left, shared by the two notes boxes above the sign-off block.
    let heading = BLOCK_HEAD + 2.0;
    let sign_h = heading + 3.0 * (SIGN_ROW + 1.0);
    let notes_h = ((r.bottom() - c.y - sign_h - 2.0 * (heading + 1.2)) / 2.0).max(NOTES_MIN);
    c.section("surge-test", |c| {
        c.head("Surge test notes");
        c.notes(notes_h);
    });
    c.section("run-test", |c| {
        c.head("Run test notes");
        c.notes(notes_h);
    });
    c.section("sign-off", |c| {
        c.head("Sign-off");
        for (label, boxes) in [
            (
                "tested",
                [("name", 27.0), ("signature", 0.0), ("date", 17.0)],
            ),
            (
                "checked",
                [("name", 27.0), ("signature", 0.0), ("date", 17.0)],
            ),
            ("revision", [("rev.", 8.0), ("change", 0.0), ("date", 17.0)]),
        ] {
            sign_row(c, label, &boxes);
        }
    });
    c.g
}

/// One sign-off row: its label, then boxes with a small caption inside at the top left; a
/// width of 0 takes what is left.
fn sign_row(c: &mut Column, label: &str, boxes: &[(&str, f64); 3]) {
    let top = c.y + 1.0;
    let label_w = 17.0;
    c.g.push(Text::new(
        c.x,
        top + SIGN_ROW - 2.2,
        BLOCK_TEXT,
        "b",
        label.to_string(),
    ));
    let fixed: f64 = boxes.iter().map(|b| b.1).sum();
    let gaps = boxes.len() as f64 - 1.0;
    let free = c.w - label_w - fixed - gaps;
    let mut x = c.x + label_w;
    for &(caption, w) in boxes {
        let w = if w == 0.0 { free } else { w };
        c.g.push(tree::Rect::new("checkbox", x, top, w, SIGN_ROW));
        c.g.push(Text::new(
            x + 0.8,
            top + TEXT_FLOOR + 0.3,
            TEXT_FLOOR,
            "",
            caption,
        ));
        x += w + 1.0;
    }
    c.y = top + SIGN_ROW;
}
