//! The one number writer: every number that reaches output goes through here.
//!
//! Part of the `base` leaf, used by every stage that words a number. Fixed precision, never `-0.00`, so output is byte-stable.
//! One function a form: fixed places ([`fmt_fixed`]), significant digits ([`fmt_sig`],
//! [`round_sig`]), trailing zeros dropped ([`fmt_trimmed`], SVG coordinates), a sign always
//! shown ([`fmt_signed`]) and a TOML number ([`fmt_toml`], design files).

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

#[cfg(test)]
mod tests {
    use super::*;

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
