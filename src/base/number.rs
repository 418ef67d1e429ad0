//! The one number writer: every number that reaches output goes through here.
//!
//! Part of the `base` leaf, used by every stage that words a number. Fixed precision, never `-0.00`, so output is byte-stable.
//! One function a form: fixed places ([`fmt_fixed`]), significant digits ([`fmt_sig`],
//! [`round_sig`]), trailing zeros dropped ([`fmt_trimmed`], SVG coordinates), a sign always
//! shown ([`fmt_signed`]), a TOML number ([`fmt_toml`], design files) and a table of readings
//! in one prefixed unit ([`Prefix`], [`fmt_prefixed`]); and a count with its noun, singular
//! for one ([`counted`], [`plural`]).

/// Writes `x` with exactly `decimals` digits after the point; `-0.00` becomes `0.00`.
pub fn fmt_fixed(x: f64, decimals: usize) -> String {
    if !x.is_finite() {
        return "n/a".to_string();
    }
    let s = format!("{x:.decimals$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

/// A count and its noun, singular for one and plural otherwise: `counted(1, "coil", "coils")`
/// is "1 coil", `counted(2, "coil", "coils")` "2 coils", `counted(0, …)` "0 coils".
pub fn counted<N>(n: N, one: &str, many: &str) -> String
where
    N: Copy + std::fmt::Display + PartialEq + From<u8>,
{
    format!("{n} {}", plural(n, one, many))
}

/// The noun for a count `n`: `one` for 1, else `many` (for a count written apart from its noun).
pub fn plural<'a, N: PartialEq + From<u8>>(n: N, one: &'a str, many: &'a str) -> &'a str {
    if n == N::from(1) { one } else { many }
}

/// Rounds `x` to `decimals` places for JSON, where numbers stay numbers.
pub fn round_to(x: f64, decimals: i32) -> f64 {
    let f = 10f64.powi(decimals);
    let r = (x * f).round() / f;
    if r == 0.0 { 0.0 } else { r }
}

/// Rounds `x` to `digits` (at least 1) significant digits, for JSON (readings run from
/// micro-ohms to ohms) and for a value written to a design file. Rounded through the decimal
/// exponent form, so no power of ten overflows: the smallest subnormal stays itself, never NaN,
/// and nothing non-zero becomes 0.
pub fn round_sig(x: f64, digits: i32) -> f64 {
    if !x.is_finite() || x == 0.0 {
        return x;
    }
    format!("{x:.*e}", digits.max(1) as usize - 1)
        .parse()
        .unwrap_or(x)
}

/// Writes `x` with `digits` significant digits (at least none after the point).
pub fn fmt_sig(x: f64, digits: i32) -> String {
    if x == 0.0 || !x.is_finite() {
        return fmt_fixed(x, 0);
    }
    let decimals = (digits - 1 - x.abs().log10().floor() as i32).max(0) as usize;
    fmt_fixed(x, decimals)
}

/// Writes `x` with at most `decimals` digits after the point, trailing zeros dropped ("230",
/// "1.25"), never "-0": coordinates in SVG, the numbers of a design file.
pub fn fmt_trimmed(x: f64, decimals: usize) -> String {
    let s = fmt_fixed(x, decimals);
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    }
}

/// Writes `x` with its sign and exactly `decimals` digits after the point: "+1.25", "-0.80",
/// "0.00" (a change in per cent).
pub fn fmt_signed(x: f64, decimals: usize) -> String {
    let s = fmt_fixed(x, decimals);
    if s.starts_with('-') || s.chars().all(|c| c == '0' || c == '.') {
        s
    } else {
        format!("+{s}")
    }
}

/// Writes `x` as a TOML number: rounded to `decimals` places, trailing zeros dropped ("230",
/// "1.25"), as [`fmt_trimmed`].
///
/// A number the fixed form would lose (a non-zero value rounding to 0, or one off by more
/// than 0.1 %, or one of 10^15 and more, which TOML would read as an out-of-range integer) is
/// written in exponent form with `decimals` significant figures, at least 4 ("5e-324",
/// "1.2346e-2"); never 0 for a non-zero number. Not-a-number and the infinities are written in
/// TOML's words (`nan`, `inf`, `-inf`), which the design parser refuses by name.
pub fn fmt_toml(x: f64, decimals: usize) -> String {
    if x.is_nan() {
        return "nan".to_string();
    }
    if x.is_infinite() {
        return if x > 0.0 { "inf" } else { "-inf" }.to_string();
    }
    let fixed = fmt_trimmed(x, decimals);
    let back: f64 = fixed.parse().unwrap_or(0.0);
    let lost = x != 0.0 && (back == 0.0 || ((back - x) / x).abs() > 1e-3);
    if lost || x.abs() >= 1e15 {
        let e = format!("{x:.*e}", decimals.max(4) - 1);
        let (mantissa, exp) = e.split_once('e').unwrap_or((&e, "0"));
        let mantissa = if mantissa.contains('.') {
            mantissa.trim_end_matches('0').trim_end_matches('.')
        } else {
            mantissa
        };
        format!("{mantissa}e{exp}")
    } else {
        fixed
    }
}

/// An SI prefix for a whole table of values in one unit, chosen once from its largest value so
/// every row is written in the same unit and the columns compare: a reading of a few
/// milliohms is written `5.123` in mOhm, not `0.00512`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Prefix {
    /// The power of ten: −6 (micro), −3 (milli), 0, 3 (kilo) or 6 (mega).
    pub exponent: i32,
}

impl Prefix {
    /// No prefix.
    pub const NONE: Prefix = Prefix { exponent: 0 };

    /// The prefix that writes `largest` from 1 up to (not including) 1000, from micro to mega;
    /// no prefix for 0 or a value that is not finite.
    pub fn for_largest(largest: f64) -> Prefix {
        if !largest.is_finite() || largest <= 0.0 {
            return Prefix::NONE;
        }
        let e = 3 * (largest.log10().floor() as i32).div_euclid(3);
        Prefix {
            exponent: e.clamp(-6, 6),
        }
    }

    /// The prefix in ASCII, for the text report and the CSV: `u`, `m`, ``, `k`, `M`.
    pub fn ascii(self) -> &'static str {
        match self.exponent {
            -6 => "u",
            -3 => "m",
            3 => "k",
            6 => "M",
            _ => "",
        }
    }

    /// The prefix as printed on a drawing: `µ`, `m`, ``, `k`, `M`.
    pub fn symbol(self) -> &'static str {
        match self.exponent {
            -6 => "\u{b5}",
            e => Prefix { exponent: e }.ascii(),
        }
    }

    /// The prefix of the unit that numbers given at `scale` (numbers per base unit) are in:
    /// 10⁶ per ohm are micro-ohms, 10³ milli, 1 none, 10⁻³ kilo, 10⁻⁶ mega, each within 2 %;
    /// `None` for any other scale (a unit of the file's own).
    pub fn of_scale(scale: f64) -> Option<Prefix> {
        [-6, -3, 0, 3, 6]
            .into_iter()
            .map(|exponent| Prefix { exponent })
            .find(|p| scale > 0.0 && (scale * 10f64.powi(p.exponent) - 1.0).abs() <= 0.02)
    }

    /// `x` in the prefixed unit.
    pub fn of(self, x: f64) -> f64 {
        x / 10f64.powi(self.exponent)
    }
}

/// Decimals every row of a table in a [`Prefix`]ed unit is written with (fixed precision:
/// the largest value, from 1 to 999.9999, keeps five to seven significant digits).
pub const PREFIXED_DECIMALS: usize = 4;

/// Writes `x` in the unit `prefix` gives, with [`PREFIXED_DECIMALS`] places: the one writer of
/// a reading (the armature test's tables, its plot's scale).
pub fn fmt_prefixed(x: f64, prefix: Prefix) -> String {
    fmt_fixed(prefix.of(x), PREFIXED_DECIMALS)
}

/// Places after the point that write `largest` with `digits` significant digits (none for a
/// value of 1 and more with that many digits before the point, and for 0): the places of a
/// whole column, so its rows line up.
pub fn decimals_for(largest: f64, digits: i32) -> usize {
    if !largest.is_finite() || largest <= 0.0 {
        return 0;
    }
    (digits - 1 - largest.log10().floor() as i32).clamp(0, 12) as usize
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn one_prefix_per_table_from_its_largest_value() {
        let milli = Prefix::for_largest(0.0108649);
        assert_eq!(
            (milli.exponent, milli.ascii(), milli.symbol()),
            (-3, "m", "m")
        );
        assert_eq!(fmt_prefixed(0.0108649, milli), "10.8649");
        assert_eq!(fmt_prefixed(0.0006708, milli), "0.6708");
        let micro = Prefix::for_largest(5.2e-5);
        assert_eq!((micro.ascii(), micro.symbol()), ("u", "\u{b5}"));
        assert_eq!(fmt_prefixed(5.2e-5, micro), "52.0000");
        assert_eq!(Prefix::for_largest(1.0), Prefix::NONE);
        assert_eq!(Prefix::for_largest(999.9), Prefix::NONE);
        assert_eq!(Prefix::for_largest(1000.0).exponent, 3);
        assert_eq!(Prefix::for_largest(1e-12).exponent, -6);
        assert_eq!(Prefix::for_largest(1e30).exponent, 6);
        for bad in [0.0, -1.0, f64::NAN, f64::INFINITY] {
            assert_eq!(Prefix::for_largest(bad), Prefix::NONE);
        }
        assert_eq!(Prefix::of_scale(999_997.0), Some(micro));
        assert_eq!(Prefix::of_scale(1000.0), Some(milli));
        assert_eq!(Prefix::of_scale(1.01), Some(Prefix::NONE));
        assert_eq!(Prefix::of_scale(1.05), None);
        assert_eq!(Prefix::of_scale(0.0), None);
        assert_eq!(decimals_for(391_000.0, 6), 0);
        assert_eq!(decimals_for(0.0123, 6), 7);
        assert_eq!(decimals_for(0.0, 6), 0);
    }

    #[test]
    fn fixed_precision_cases() {
        assert_eq!(fmt_fixed(0.1 + 0.2, 2), "0.30");
        assert_eq!(fmt_fixed(-0.001, 2), "0.00");
        assert_eq!(fmt_fixed(-1.005, 1), "-1.0");
        assert_eq!(fmt_fixed(31.830_988, 2), "31.83");
        assert_eq!(fmt_fixed(f64::NAN, 2), "n/a");
        assert_eq!(round_to(-0.00001, 3), 0.0);
        assert_eq!(round_to(2.34567, 3), 2.346);
    }

    #[test]
    fn significant_digits_never_overflow_or_vanish() {
        assert_eq!(round_sig(1.23456, 3), 1.23);
        assert_eq!(round_sig(891_199_999.9, 4), 891_200_000.0);
        assert_eq!(round_sig(5e-324, 4), 5e-324);
        assert_eq!(round_sig(1e308, 2), 1e308);
        assert_eq!(round_sig(0.0, 4), 0.0);
        assert!(round_sig(f64::NAN, 4).is_nan());
        assert_eq!(fmt_sig(0.012_345, 3), "0.0123");
        assert_eq!(fmt_sig(1234.56, 3), "1235");
    }

    #[test]
    fn trimmed_and_signed_forms() {
        assert_eq!(fmt_trimmed(12.5, 2), "12.5");
        assert_eq!(fmt_trimmed(3.0, 2), "3");
        assert_eq!(fmt_trimmed(-0.001, 2), "0");
        assert_eq!(fmt_trimmed(-1.234, 2), "-1.23");
        assert_eq!(fmt_signed(1.25, 2), "+1.25");
        assert_eq!(fmt_signed(-0.8, 2), "-0.80");
        assert_eq!(fmt_signed(-0.001, 2), "0.00");
    }

    #[track_caller]
    fn toml_case(x: f64, decimals: usize, want: &str) {
        assert_eq!(fmt_toml(x, decimals), want, "fmt_toml({x:e}, {decimals})");
        if x.is_finite() {
            let back: f64 = want.parse().unwrap();
            assert!(x == 0.0 || back != 0.0, "{x:e} became 0");
        }
    }

    #[test]
    fn toml_numbers_keep_their_fixed_form_and_never_round_to_nothing() {
        // Fixed places, trailing zeros dropped.
        toml_case(230.0, 3, "230");
        toml_case(1.25, 4, "1.25");
        toml_case(19.033_456, 4, "19.0335");
        toml_case(0.7, 4, "0.7");
        toml_case(-0.000_01, 2, "-1e-5");
        toml_case(0.0, 3, "0");
        toml_case(-0.0, 3, "0");
        // Lost in the fixed form: exponent form, at least 4 significant figures.
        toml_case(5e-324, 4, "4.941e-324");
        toml_case(0.000_123_46, 4, "1.235e-4");
        toml_case(0.012_345_6, 4, "1.235e-2");
        toml_case(1e308, 4, "1e308");
        toml_case(4.2e15, 2, "4.2e15");
        // Not numbers: TOML's words, which the parser refuses by name.
        toml_case(f64::NAN, 4, "nan");
        toml_case(f64::INFINITY, 4, "inf");
        toml_case(f64::NEG_INFINITY, 4, "-inf");
    }
}
