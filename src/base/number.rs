//! The one number writer: every number that reaches output goes through here.
//!
//! Part of the `base` leaf, used by every stage that words a number. Fixed precision, never `-0.00`, so output is byte-stable.

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

/// Rounds `x` to `digits` significant digits for JSON (readings run from micro-ohms to ohms).
pub fn round_sig(x: f64, digits: i32) -> f64 {
    if x == 0.0 || !x.is_finite() {
        return x;
    }
    round_to(x, digits - 1 - x.abs().log10().floor() as i32)
}

/// Writes `x` with `digits` significant digits (at least none after the point).
pub fn fmt_sig(x: f64, digits: i32) -> String {
    if x == 0.0 || !x.is_finite() {
        return fmt_fixed(x, 0);
    }
    let decimals = (digits - 1 - x.abs().log10().floor() as i32).max(0) as usize;
    fmt_fixed(x, decimals)
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
}
