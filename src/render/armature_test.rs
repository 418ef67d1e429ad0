//! The armature test's outputs: the text report, the JSON object and the readings CSV.
//!
//! Part of the `render` stage: it words a computed [`ArmatureTest`] and never solves anything.
//! Readings are written to six significant digits (they run from micro-ohms to ohms).

use std::fmt::Write as _;
use std::io::{self, Write};

use serde::Serialize;

use super::csv::{Cell, csv_file};
use crate::base::caution::TEST_CAUTIONS;
use crate::base::number::{
    Prefix, counted, decimals_for, fmt_fixed, fmt_prefixed, fmt_sig, plural, round_sig,
};
use crate::checks::{NOT_FOR_WINDING, refusal_line};
use crate::features::armature_test::{
    ArmatureTest, DropFeed, ElementsPattern, Fault, Location, Pattern, Reading, ReadingKind,
    ReadingValue, Unit,
};
use crate::theory::words::{READING_DIGITS, multiplicity_word, reading_unit_basis};

const DIGITS: i32 = READING_DIGITS;

/// The faults a resistance reading cannot show, and the test that does.
pub const UNSEEN: [&str; 3] = [
    "a reversed coil (its two leads exchanged) reads the same as a good one: find it with a growler or the compass test",
    "a coil grounded to the core does not change a bar-to-bar reading: use the insulation-resistance and high-voltage tests",
    "a short between a few turns of one coil can change its reading by less than the spread: confirm with a growler",
];

/// The pattern in words.
pub fn pattern_words(p: Pattern) -> String {
    match p {
        Pattern::AllEqual => "all equal".into(),
        Pattern::TwoAlternating => "two alternating values".into(),
        Pattern::Repeats { period } => format!("repeats every {period} bars"),
        Pattern::Irregular => "no shorter repeat than the whole commutator".into(),
        Pattern::AllOpen => "every pair reads open".into(),
    }
}

/// The tables' unit and what it rests on: "mOhm (one coil … ohm at 20.0 C, …)".
fn unit_words(t: &ArmatureTest) -> String {
    format!(
        "{} ({})",
        reading_unit(t),
        reading_unit_basis(t.coil_resistance_ohm, t.temperature_c)
    )
}

/// The unit of a table of bar-to-bar readings, in ASCII: `Ohm`, `mOhm`, `uOhm`, or `coil`.
pub fn reading_unit(t: &ArmatureTest) -> String {
    match t.unit {
        Unit::Ohm => format!("{}Ohm", t.reading_prefix().ascii()),
        Unit::Coil => "coil".into(),
    }
}

/// The unit of the drop-test tables: `mV`, `V`, `uV`, or `A x coil`.
pub fn drop_unit(t: &ArmatureTest) -> String {
    match t.unit {
        Unit::Ohm => format!("{}V", t.drop_prefix().ascii()),
        Unit::Coil => "A x coil".into(),
    }
}

/// One cell of a table in the prefixed unit `p`: `open`, or the number with fixed places.
fn value(x: Option<f64>, p: Prefix) -> String {
    x.map_or("open".into(), |v| fmt_prefixed(v, p))
}

fn table(out: &mut String, rows: &[Reading], head: &str, p: Prefix) {
    let _ = writeln!(out, "  {:>6} {:>6}  {:>12}", "bar", "bar", head);
    for r in rows {
        row(out, r, p, "");
    }
}

/// One row of a readings table: the two bars, the expected value and a trailing mark.
fn row(out: &mut String, r: &Reading, p: Prefix, mark: &str) {
    let _ = writeln!(
        out,
        "  {:>6} {:>6}  {:>12}{mark}",
        r.from_bar,
        r.to_bar,
        value(r.expected, p)
    );
}

fn feed_words(f: &DropFeed, current: f64) -> String {
    let moved = f.moved_from.map_or(String::new(), |b| {
        format!(
            " (moved from bar {b}: an equalizer ties bar {b} to bar {}, so no current would flow)",
            f.from_bar
        )
    });
    format!(
        "feed {} A in at bar {} and out at bar {}{moved}",
        fmt_fixed(current, if current < 1.0 { 2 } else { 1 }),
        f.from_bar,
        f.to_bar
    )
}

/// The median of a feed's readings (the pairs that read).
fn feed_median(f: &DropFeed) -> f64 {
    let mut v: Vec<f64> = f.readings.iter().filter_map(|r| r.expected).collect();
    v.sort_by(f64::total_cmp);
    v.get(v.len() / 2).copied().unwrap_or(0.0)
}

/// The drop-test table of one feed: the pairs joined through a feed bar marked `*`, and why
/// they read so little beneath it.
fn drop_table(out: &mut String, f: &DropFeed, head: &str, p: Prefix) {
    let _ = writeln!(out, "  {:>6} {:>6}  {:>12}", "bar", "bar", head);
    let mut marked = Vec::new();
    for (r, through) in f.readings.iter().zip(&f.through_feed) {
        let mark = match through {
            Some(b) => {
                marked.push((r, *b));
                format!("  * through feed bar {b}")
            }
            None => String::new(),
        };
        row(out, r, p, &mark);
    }
    if marked.is_empty() {
        return;
    }
    let median = feed_median(f);
    let each: Vec<String> = marked
        .iter()
        .map(|(r, b)| {
            format!(
                "{}-{} through bar {b} ({}, {} % of the median)",
                r.from_bar,
                r.to_bar,
                if *b == f.from_bar { "in" } else { "out" },
                fmt_fixed(100.0 * r.expected.unwrap_or(0.0) / median.max(1e-300), 1)
            )
        })
        .collect();
    let _ = writeln!(
        out,
        "  * sound, though low: the shortest run of coils between these bars passes a feed bar ({}); the current flows away from the bar it goes in at (towards the bar it leaves at) through the coils on both sides, so their drops oppose and the pair reads far less than the others. Do not take them for shorts",
        each.join("; ")
    );
}

/// A frog-leg's bar-to-bar pattern in words, from the network's figures.
pub fn elements_words(e: &ElementsPattern, t: &ArmatureTest) -> String {
    let (p, unit) = (t.reading_prefix(), reading_unit(t));
    format!(
        "frog-leg: each pair of neighbouring bars has a lap coil across it, in parallel with the rest of the lap element and with the wave element, so the readings are about {} {unit}, against {} {unit} for the lap element alone ({} % of it); an open lap coil moves {} by more than 5 %, an open wave coil {}: lift the wave leads to test the lap element as a plain lap",
        fmt_prefixed(e.combined, p),
        fmt_prefixed(e.lap_alone, p),
        fmt_fixed(100.0 * e.combined / e.lap_alone.max(1e-300), 1),
        counted(e.open_lap_moves, "reading", "readings"),
        e.open_wave_moves
    )
}

/// The text report: the verdict and the ranked faults first (with measured readings), then
/// the expected readings, the drop test, the measured readings against the expected, and the
/// limits and cautions of the test.
///
/// `failures` are the design's failed error-level checks (`Checked::failures`): when any, the
/// report says first that `check` refuses the design and the exit is 1, whatever the readings.
pub fn render_test_text(t: &ArmatureTest, design_name: &str, failures: &[String]) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Armature test: {design_name}");
    if let Some(line) = refusal_line(failures) {
        let _ = writeln!(out, "{line}");
    }
    let _ = writeln!(
        out,
        "winding: {} {}, {} bars, {} poles, {}{}",
        multiplicity_word(t.multiplicity),
        t.winding_type.as_str(),
        t.bars,
        t.poles,
        counted(t.reentrancy, "closed winding", "closed windings"),
        if t.equalized {
            ", equalizers fitted (ideal)"
        } else {
            ""
        }
    );
    let _ = writeln!(out, "unit: {}", unit_words(t));
    if let Some(l) = &t.location {
        let _ = writeln!(out);
        locator_text(&mut out, l, t, !failures.is_empty());
    }
    let _ = writeln!(out);
    let (p, unit) = (t.reading_prefix(), reading_unit(t));
    let _ = writeln!(out, "Bar-to-bar readings, neighbouring bars ({unit})");
    let open = t.open_pairs();
    let _ = writeln!(out, "  pattern: {}", pattern_words(t.pattern));
    let _ = writeln!(
        out,
        "  spread to expect: {} % (largest - smallest, of the mean); judge the measured spread against it",
        fmt_fixed(t.spread_pct, 2)
    );
    if let Some(e) = &t.elements {
        let _ = writeln!(out, "  {}", elements_words(e, t));
    }
    if open > 0 {
        let _ = writeln!(
            out,
            "  {} read open: neighbouring bars lie on different closed windings; read bars {} apart, within one winding, instead",
            counted(open, "pair", "pairs"),
            t.multiplicity
        );
    }
    table(&mut out, &t.readings, &format!("expected {unit}"), p);
    if let Some(w) = &t.readings_within_winding {
        let _ = writeln!(out);
        let _ = writeln!(
            out,
            "Bar-to-bar readings, bars {} apart (within one winding, {unit})",
            t.multiplicity
        );
        table(&mut out, w, &format!("expected {unit}"), p);
    }
    let _ = writeln!(out);
    let (dp, dunit) = (t.drop_prefix(), drop_unit(t));
    // The drop test's readings are kept in millivolts (ohm) or A x coil.
    let to_base = |x: f64| if t.unit == Unit::Ohm { x / 1000.0 } else { x };
    let _ = writeln!(
        out,
        "Drop test (expected {dunit} between the bars of each pair)"
    );
    for f in &t.drop_test.feeds {
        let _ = writeln!(out, "  {}", feed_words(f, t.drop_test.current_a));
        let in_base = DropFeed {
            readings: f
                .readings
                .iter()
                .map(|r| Reading {
                    expected: r.expected.map(to_base),
                    ..*r
                })
                .collect(),
            ..f.clone()
        };
        drop_table(&mut out, &in_base, &dunit, dp);
    }
    if let Some(l) = &t.location {
        let _ = writeln!(out);
        measured_table(&mut out, l);
    }
    let _ = writeln!(out);
    let _ = writeln!(out, "Faults this test cannot see");
    for u in UNSEEN {
        let _ = writeln!(out, "  - {u}");
    }
    let _ = writeln!(out);
    let _ = writeln!(out, "Caution");
    for c in TEST_CAUTIONS {
        let _ = writeln!(out, "  - {c}");
    }
    out
}

fn list(v: &[u32]) -> String {
    v.iter().map(u32::to_string).collect::<Vec<_>>().join(", ")
}

/// The unit the measured readings were given in, from the locator's fitted scale: with
/// readings in ohms expected, a power of a thousand within 2 % names its prefix (`uOhm` for a
/// scale of 10^6); otherwise the file's own unit, with what one ohm (or one coil) reads in it.
pub fn measured_unit_words(t: &ArmatureTest, l: &Location) -> String {
    let s = l.healthy_scale;
    // Readings all zero fit no scale (the verdict says what that means).
    if l.all_zero {
        return match l.kind {
            ReadingKind::Drop => format!(
                "millivolts of the drop test, {} A fed at the feed bars listed below",
                fmt_sig(t.drop_test.current_a, 4)
            ),
            ReadingKind::BarToBar => "the file's own unit".to_string(),
        };
    }
    if l.kind == ReadingKind::Drop {
        return format!(
            "millivolts of the drop test, {} A fed at the feed bars listed below (the fitted scale: the readings are {} of the expected)",
            fmt_sig(t.drop_test.current_a, 4),
            fmt_sig(s, 4)
        );
    }
    if t.unit == Unit::Ohm {
        if let Some(p) = Prefix::of_scale(s) {
            return format!(
                "{}Ohm (the fitted scale is {} per ohm)",
                p.ascii(),
                fmt_sig(s, 4)
            );
        }
        format!(
            "the file's own unit (the fitted scale: one ohm reads {})",
            fmt_sig(s, 4)
        )
    } else {
        format!(
            "the file's own unit (the fitted scale: one coil's resistance reads {})",
            fmt_sig(s, 4)
        )
    }
}

/// The verdict, first: healthy or not (and the exit code), what was compared, the unit the
/// readings were given in, and the ranked faults.
fn locator_text(out: &mut String, l: &Location, t: &ArmatureTest, refused: bool) {
    if l.healthy {
        let _ = writeln!(
            out,
            "VERDICT: HEALTHY: every reading is within tolerance of the healthy pattern"
        );
        if refused {
            let _ = writeln!(
                out,
                "  the exit is 1 all the same: check refuses the design ({NOT_FOR_WINDING}, above)"
            );
        }
    } else if l.all_zero {
        let _ = writeln!(
            out,
            "VERDICT: NOT HEALTHY (exit 1): every reading is zero where the winding reads a resistance: a shorted commutator (solder, carbon or copper across the bars) or the meter on the wrong range; check the range and the probes, then look along the commutator"
        );
    } else {
        let pairs: Vec<String> = l
            .suspect_pairs
            .iter()
            .map(|(a, b)| format!("{a}-{b}"))
            .collect();
        let _ = writeln!(
            out,
            "VERDICT: NOT HEALTHY (exit 1): readings outside tolerance at the {} {} (bars {} to inspect)",
            plural(pairs.len(), "pair", "pairs"),
            pairs.join(", "),
            list(&l.suspect_bars)
        );
    }
    let _ = writeln!(
        out,
        "  {} compared, {} not read; tolerance {} % of the healthy pattern (default 5 %, --tolerance)",
        counted(l.measured.len(), "reading", "readings"),
        counted(l.missing, "pair", "pairs"),
        fmt_fixed(100.0 * l.tolerance, 1)
    );
    let _ = writeln!(out, "  readings as given: {}", measured_unit_words(t, l));
    if let Some(s) = l.off_scale {
        let _ = writeln!(
            out,
            "  WARNING: the readings are {} times what {} A through this winding should give: check the test current (--current) and the meter range, then the winding itself (wire size, turns, connection); the pattern is judged at the fitted scale",
            fmt_sig(s, 3),
            fmt_sig(t.drop_test.current_a, 3)
        );
    }
    match l.faults.first() {
        Some(best) if !l.healthy && best.explains && l.alike == 0 => {
            let _ = writeln!(
                out,
                "  one fault explains every reading within tolerance: {}",
                best.explanation
            );
        }
        Some(_) if !l.healthy && l.faults[0].explains => {
            let _ = writeln!(
                out,
                "  {} faults explain every reading within tolerance and these readings cannot tell them apart: inspect each of the first {}",
                l.alike + 1,
                l.alike + 1
            );
        }
        _ if !l.healthy && !l.all_zero => {
            let _ = writeln!(
                out,
                "  no single fault explains every reading within tolerance: check the probe contact and look for more than one fault; the closest are"
            );
        }
        _ => {}
    }
    if !l.healthy && !l.faults.is_empty() {
        let _ = writeln!(out, "  most likely faults, best first:");
        for (i, f) in l.faults.iter().take(3).enumerate() {
            fault_text(out, i + 1, f);
        }
    }
    for (k, n) in &l.invisible {
        let _ = writeln!(
            out,
            "  {} at {} would change no reading: this test cannot see it",
            k.key(),
            counted(*n, "place", "places")
        );
    }
}

/// One ranked fault, from what every [`Fault`] carries (its kind's key, explanation, bars,
/// slots and score), so a new kind reads without a change here.
fn fault_text(out: &mut String, rank: usize, f: &Fault) {
    let _ = writeln!(
        out,
        "  {rank}. {} (misfit {}, lower fits better; {}): {}",
        f.kind.key(),
        fmt_fixed(f.score, 3),
        if f.worst.is_finite() {
            format!("worst reading {} % off", fmt_fixed(100.0 * f.worst, 1))
        } else {
            "a reading open where it predicts one closed, or the other way round".to_string()
        },
        f.explanation
    );
    let _ = writeln!(
        out,
        "     inspect bars {}{}",
        list(&f.bars),
        if f.slots.is_empty() {
            String::new()
        } else {
            format!(", slots {}", list(&f.slots))
        }
    );
}

/// The measured readings against the expected ones at the fitted scale, both in the unit the
/// readings were given in, with fixed places from the largest.
fn measured_table(out: &mut String, l: &Location) {
    let largest = l
        .measured
        .iter()
        .flat_map(|(r, m)| {
            let m = match m {
                ReadingValue::Value(v) => Some(*v),
                ReadingValue::Open => None,
            };
            [r.expected.map(|e| e * l.healthy_scale), m]
        })
        .flatten()
        .fold(0.0, f64::max);
    let places = decimals_for(largest, DIGITS);
    let cell = |x: Option<f64>| x.map_or("open".to_string(), |v| fmt_fixed(v, places));
    let _ = writeln!(
        out,
        "Measured readings against the expected (in the unit the readings were given in)"
    );
    let _ = writeln!(
        out,
        "  {:>6} {:>6}  {:>12}  {:>12}",
        "bar", "bar", "expected", "measured"
    );
    for (r, m) in &l.measured {
        let e = r.expected.map(|e| e * l.healthy_scale);
        let m = match m {
            ReadingValue::Value(v) => Some(*v),
            ReadingValue::Open => None,
        };
        let _ = writeln!(
            out,
            "  {:>6} {:>6}  {:>12}  {:>12}",
            r.from_bar,
            r.to_bar,
            cell(e),
            cell(m)
        );
    }
}

#[derive(Serialize)]
struct FaultJson {
    bars: Vec<u32>,
    coils: Vec<u32>,
    explains: bool,
    explanation: String,
    kind: &'static str,
    score: f64,
    slots: Vec<u32>,
    /// The worst reading's misfit, %; `null` when a reading is open against the fault's
    /// prediction or the other way round.
    worst_pct: Option<f64>,
}

#[derive(Serialize)]
struct LocationJson {
    all_zero: bool,
    faults: Vec<FaultJson>,
    /// The faults after the first that read alike with it (the readings cannot tell them
    /// apart).
    faults_alike: usize,
    healthy: bool,
    invisible: Vec<String>,
    missing_pairs: usize,
    /// A drop test read at another scale than its current should give: measured over
    /// expected; `null` when within tolerance or not absolute.
    off_scale: Option<f64>,
    readings_compared: usize,
    scale: f64,
    suspect_bars: Vec<u32>,
    tolerance: f64,
}

fn fault_json(f: &Fault) -> FaultJson {
    FaultJson {
        bars: f.bars.clone(),
        coils: f.coils.clone(),
        explains: f.explains,
        explanation: f.explanation.clone(),
        kind: f.kind.key(),
        score: round_sig(f.score, DIGITS),
        slots: f.slots.clone(),
        worst_pct: f
            .worst
            .is_finite()
            .then(|| round_sig(100.0 * f.worst, DIGITS)),
    }
}

fn location_json(l: &Location) -> LocationJson {
    LocationJson {
        all_zero: l.all_zero,
        faults: l.faults.iter().map(fault_json).collect(),
        faults_alike: l.alike,
        healthy: l.healthy,
        invisible: l
            .invisible
            .iter()
            .map(|(k, n)| format!("{} at {}", k.key(), counted(*n, "place", "places")))
            .collect(),
        missing_pairs: l.missing,
        off_scale: l.off_scale.map(|s| round_sig(s, DIGITS)),
        readings_compared: l.measured.len(),
        scale: round_sig(l.healthy_scale, DIGITS),
        suspect_bars: l.suspect_bars.clone(),
        tolerance: l.tolerance,
    }
}

#[derive(Serialize)]
struct ReadingJson {
    expected: Option<f64>,
    from_bar: u32,
    to_bar: u32,
}

fn readings_json(rows: &[Reading]) -> Vec<ReadingJson> {
    rows.iter()
        .map(|r| ReadingJson {
            expected: r.expected.map(|v| round_sig(v, DIGITS)),
            from_bar: r.from_bar,
            to_bar: r.to_bar,
        })
        .collect()
}

/// A drop-test reading: `through_feed_bar` is the feed bar the pair's bars are joined through
/// (the pair reads far less than the others, though sound), else null.
#[derive(Serialize)]
struct DropReadingJson {
    expected: Option<f64>,
    from_bar: u32,
    through_feed_bar: Option<u32>,
    to_bar: u32,
}

#[derive(Serialize)]
struct FeedJson {
    expected_unit: &'static str,
    from_bar: u32,
    moved_from_bar: Option<u32>,
    readings: Vec<DropReadingJson>,
    to_bar: u32,
}

#[derive(Serialize)]
struct DropJson {
    current_a: f64,
    feeds: Vec<FeedJson>,
}

/// What `check` refuses the design for: [`NOT_FOR_WINDING`], the exit code and the failed
/// error-level checks, `id: message`.
#[derive(Serialize)]
struct RefusedJson {
    exit: u8,
    failed_checks: Vec<String>,
    says: &'static str,
}

#[derive(Serialize)]
struct TestJson {
    cannot_see: [&'static str; 3],
    cautions: [&'static str; 4],
    coil_resistance_ohm: Option<f64>,
    drop_test: DropJson,
    /// A frog-leg's bar-to-bar pattern in words; absent for lap and wave.
    #[serde(skip_serializing_if = "Option::is_none")]
    elements_pattern: Option<String>,
    /// Present when `check` refuses the design: the exit is 1 whatever the readings.
    #[serde(skip_serializing_if = "Option::is_none")]
    not_for_winding: Option<RefusedJson>,
    #[serde(flatten)]
    location: Option<LocationJson>,
    open_pairs: usize,
    pattern: String,
    readings: Vec<ReadingJson>,
    readings_within_winding: Option<Vec<ReadingJson>>,
    spread_pct: f64,
    temperature_c: f64,
    unit: &'static str,
}

fn test_json(t: &ArmatureTest, failures: &[String]) -> TestJson {
    let expected_unit = if t.unit == Unit::Ohm { "mV" } else { "A*coil" };
    TestJson {
        cannot_see: UNSEEN,
        cautions: TEST_CAUTIONS,
        coil_resistance_ohm: t.coil_resistance_ohm.map(|r| round_sig(r, DIGITS)),
        elements_pattern: t.elements.as_ref().map(|e| elements_words(e, t)),
        drop_test: DropJson {
            current_a: t.drop_test.current_a,
            feeds: t
                .drop_test
                .feeds
                .iter()
                .map(|f| FeedJson {
                    expected_unit,
                    from_bar: f.from_bar,
                    moved_from_bar: f.moved_from,
                    readings: f
                        .readings
                        .iter()
                        .zip(&f.through_feed)
                        .map(|(r, b)| DropReadingJson {
                            expected: r.expected.map(|v| round_sig(v, DIGITS)),
                            from_bar: r.from_bar,
                            through_feed_bar: *b,
                            to_bar: r.to_bar,
                        })
                        .collect(),
                    to_bar: f.to_bar,
                })
                .collect(),
        },
        not_for_winding: (!failures.is_empty()).then(|| RefusedJson {
            exit: 1,
            failed_checks: failures.to_vec(),
            says: NOT_FOR_WINDING,
        }),
        location: t.location.as_ref().map(location_json),
        open_pairs: t.open_pairs(),
        pattern: pattern_words(t.pattern),
        readings: readings_json(&t.readings),
        readings_within_winding: t.readings_within_winding.as_deref().map(readings_json),
        spread_pct: round_sig(t.spread_pct, DIGITS),
        temperature_c: t.temperature_c,
        unit: t.unit.key(),
    }
}

/// Writes the JSON object with a final newline; `failures` as for [`render_test_text`]
/// (`not_for_winding`, present when `check` refuses the design).
pub fn write_test_json<W: Write>(
    t: &ArmatureTest,
    failures: &[String],
    mut out: W,
) -> io::Result<()> {
    super::json::write_sorted(&test_json(t, failures), &mut out)?;
    out.write_all(b"\n")
}

/// The JSON object as a string.
pub fn test_json_string(t: &ArmatureTest, failures: &[String]) -> String {
    let mut buf = Vec::new();
    let _ = write_test_json(t, failures, &mut buf);
    String::from_utf8(buf).unwrap_or_default()
}

/// The readings CSV the shop fills in: `from_bar,to_bar,expected,measured`, the neighbouring
/// pairs then the within-winding pairs, `measured` empty; written by the one CSV writer
/// ([`csv_file`]: RFC 4180, CRLF).
pub fn readings_csv(t: &ArmatureTest) -> String {
    let header = ["from_bar", "to_bar", "expected", "measured"].map(|c| Cell::Text(c.to_string()));
    let within = t.readings_within_winding.as_deref().unwrap_or(&[]);
    let rows = t.readings.iter().chain(within).map(|r| {
        vec![
            Cell::Num(r.from_bar.to_string()),
            Cell::Num(r.to_bar.to_string()),
            Cell::Num(r.expected.map_or("open".into(), |v| fmt_sig(v, DIGITS))),
            Cell::Text(String::new()),
        ]
    });
    csv_file(std::iter::once(header.into()).chain(rows))
}
