//! The trade's words for winding facts, written once: multiplicity names, the shop form of
//! a span, the lead swing and the unit of the bar-to-bar readings.
//!
//! Part of the `theory` stage; used by every report, sheet and message.

use crate::base::number::{fmt_fixed, fmt_sig};

/// Significant digits of a bar-to-bar reading (readings run from micro-ohms to ohms).
pub const READING_DIGITS: i32 = 6;

/// What the readings' unit rests on, beside the tables' own prefixed unit (the test report and
/// the test sheet): one coil's resistance at the temperature, or why the readings are in units
/// of one coil.
pub fn reading_unit_basis(coil_ohm: Option<f64>, temperature_c: f64) -> String {
    match coil_ohm {
        Some(r) => format!(
            "one coil {} ohm at {} C, IEC 60028 copper corrected by the 234.5 C rule",
            fmt_sig(r, READING_DIGITS),
            fmt_fixed(temperature_c, 1)
        ),
        None => {
            "no [conductor] data with a mean turn: readings are in units of one coil's resistance"
                .into()
        }
    }
}

/// "simplex", "duplex", "triplex", "quadruplex", then "5-plex", … for a multiplicity.
pub fn multiplicity_word(m: u32) -> String {
    match m {
        1 => "simplex".into(),
        2 => "duplex".into(),
        3 => "triplex".into(),
        4 => "quadruplex".into(),
        n => format!("{n}-plex"),
    }
}

/// The span in shop form, "1-8" for a span of 7 slots.
pub fn span_shop(span: u32) -> String {
    format!("1-{}", span + 1)
}

/// The span in words for sheets, "1-8" style with the en dash the shop writes.
pub fn span_shop_dash(span: u32) -> String {
    format!("1\u{2013}{}", span + 1)
}

/// The commutator throw in shop form, "1–45" for a commutator pitch of +44: the bars coil
/// 1's start and end leads go to, counted round the `bars` of the commutator (a
/// retrogressive lap's −1 on 36 bars is "1–36").
pub fn throw_shop_dash(commutator_pitch: i64, bars: u32) -> String {
    format!("1\u{2013}{}", throw_end_bar(commutator_pitch, bars))
}

/// The commutator throw in plain shop form, "1-45" for a commutator pitch of +44 (the
/// `lead_throw` of a data card): [`throw_end_bar`] after bar 1.
pub fn throw_shop(commutator_pitch: i64, bars: u32) -> String {
    format!("1-{}", throw_end_bar(commutator_pitch, bars))
}

/// The bar coil 1's end lead goes to when its start lead is on bar 1, counted round the
/// `bars` of the commutator: 45 for a commutator pitch of +44 on 87 bars.
pub fn throw_end_bar(commutator_pitch: i64, bars: u32) -> u32 {
    let bars = i64::from(bars.max(1));
    u32::try_from(commutator_pitch.rem_euclid(bars) + 1).unwrap_or(u32::MAX)
}

/// A signed count of half bars in words: "+1.5 bars", "-2 bars", "0 bars".
pub fn half_bars_words(half: i64) -> String {
    let sign = match half.signum() {
        1 => "+",
        -1 => "-",
        _ => "",
    };
    format!("{sign}{}", bars_count(half.unsigned_abs()))
}

/// `a` half bars unsigned: "1.5 bars", "1 bar".
fn bars_count(a: u64) -> String {
    let n = if a.is_multiple_of(2) {
        format!("{}", a / 2)
    } else {
        format!("{}.5", a / 2)
    };
    format!("{n} {}", if a == 2 { "bar" } else { "bars" })
}

/// The lead swing in shop words: what lines up with slot 1's centre line (`bar`, or the mica
/// between `bar` and `right`) and how far coil 1's start lead goes from there to bar 1, in
/// half bars (positive towards rising bar numbers). A lead swing of "3 bars on" counts the bar
/// in line as 1 [src: a winding manual's data-taking page, read in an extract].
pub fn lead_swing_words(bar: u32, right: Option<u32>, swing_half: i64) -> String {
    let line = match right {
        None => format!("bar {bar}"),
        Some(r) => format!("the mica between bars {bar} and {r}"),
    };
    let way = if swing_half >= 0 { "on" } else { "back" };
    let count = swing_half.unsigned_abs();
    let go = if count == 0 {
        "coil 1's start lead goes straight to it".to_string()
    } else if right.is_none() {
        format!(
            "coil 1's start lead swings {} {way} to bar 1 ({} counting the bar in line as 1)",
            bars_count(count),
            count / 2 + 1
        )
    } else {
        format!(
            "coil 1's start lead swings {} {way} to bar 1",
            bars_count(count)
        )
    };
    format!("slot 1's centre line is on {line}; {go}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn words() {
        assert_eq!(multiplicity_word(4), "quadruplex");
        assert_eq!(multiplicity_word(5), "5-plex");
        assert_eq!(span_shop(7), "1-8");
        assert_eq!(throw_shop_dash(44, 87), "1\u{2013}45");
        assert_eq!(throw_shop_dash(-1, 36), "1\u{2013}36");
        assert_eq!(throw_shop(28, 57), "1-29");
        assert_eq!(throw_end_bar(-1, 36), 36);
    }
}
