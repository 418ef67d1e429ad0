//! The trade's words for winding facts, written once: multiplicity names and the shop form of
//! a span.
//!
//! Part of the `theory` stage; used by every report, sheet and message.

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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn words() {
        assert_eq!(multiplicity_word(4), "quadruplex");
        assert_eq!(multiplicity_word(5), "5-plex");
        assert_eq!(span_shop(7), "1-8");
    }
}
