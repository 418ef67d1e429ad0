//! `visible`: text from a design file made safe to show on a terminal, and `clip`: a long
//! value cut to a width for an echo.
//!
//! Part of the `base` stage: every stage that words text for a person (the text reports in
//! `render`, diagnostics in `design`, the CLI's errors) passes file-given text through
//! [`visible`]. A design file comes from a customer or another shop, so its text may carry
//! terminal escape sequences (ESC, CSI, OSC), BEL, CR, NUL, C1 controls or bidi overrides
//! that would rewrite the screen or reorder what a reader sees.
//!
//! What is escaped, as `\u{…}` with the code point in lower-case hex (ESC is `\u{1b}`):
//! - every control character (Unicode Cc: U+0000–U+001F, U+007F, U+0080–U+009F), newline and
//!   carriage return included, so a one-line field never starts a new output line; the one
//!   exception is TAB, kept as it is: it only moves the cursor forward and erases nothing;
//! - the bidi controls U+061C, U+200E, U+200F, U+202A–U+202E and U+2066–U+2069;
//! - the line and paragraph separators U+2028 and U+2029.
//!
//! Multi-line text (`[job] notes`) is escaped line by line with [`visible_lines`], which keeps
//! the line structure. Machine-read outputs (JSON, CSV, SVG, PDF) keep the text exact and use
//! their own escaping.

use std::borrow::Cow;

/// True for a character [`visible`] escapes (see the module doc for the list).
pub fn is_hidden(c: char) -> bool {
    (c.is_control() && c != '\t')
        || matches!(
            c,
            '\u{061C}'
                | '\u{200E}'
                | '\u{200F}'
                | '\u{202A}'..='\u{202E}'
                | '\u{2066}'..='\u{2069}'
                | '\u{2028}'
                | '\u{2029}'
        )
}

/// Writes `c` as it is shown: itself, or `\u{…}` when [`is_hidden`].
pub fn push_visible(out: &mut String, c: char) {
    if is_hidden(c) {
        out.push_str(&format!("\\u{{{:x}}}", c as u32));
    } else {
        out.push(c);
    }
}

/// `s` with every control and bidi character shown as `\u{…}`; borrowed when nothing changes.
pub fn visible(s: &str) -> Cow<'_, str> {
    if !s.chars().any(is_hidden) {
        return Cow::Borrowed(s);
    }
    let mut out = String::with_capacity(s.len() + 8);
    for c in s.chars() {
        push_visible(&mut out, c);
    }
    Cow::Owned(out)
}

/// The lines of multi-line text (LF or CRLF), each made [`visible`].
pub fn visible_lines(s: &str) -> impl Iterator<Item = Cow<'_, str>> {
    s.lines().map(visible)
}

/// The widest value or source line a diagnostic echoes, in characters; longer ones are cut
/// with [`clip`].
pub const ECHO_WIDTH: usize = 120;

/// `s` cut to at most `max` characters, ending in `…` when cut; borrowed when it fits.
pub fn clip(s: &str, max: usize) -> Cow<'_, str> {
    match s.char_indices().nth(max) {
        None => Cow::Borrowed(s),
        Some(_) => {
            let keep = max.saturating_sub(1);
            let end = s.char_indices().nth(keep).map_or(s.len(), |(i, _)| i);
            Cow::Owned(format!("{}…", &s[..end]))
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[track_caller]
    fn case(input: &str, expected: &str) {
        assert_eq!(visible(input), expected);
    }

    #[test]
    fn controls_and_bidi_are_escaped_and_plain_text_is_borrowed() {
        case("Café 1–8", "Café 1–8");
        assert!(matches!(visible("plain"), Cow::Borrowed(_)));
        case("\u{1b}]0;x\u{7}\u{1b}[2J", "\\u{1b}]0;x\\u{7}\\u{1b}[2J");
        case("a\rb\0c\nd", "a\\u{d}b\\u{0}c\\u{a}d");
        case("\u{9b}2J\u{7f}", "\\u{9b}2J\\u{7f}");
        case("tab\tkept", "tab\tkept");
        for c in [
            '\u{061C}', '\u{200E}', '\u{200F}', '\u{202A}', '\u{202B}', '\u{202C}', '\u{202D}',
            '\u{202E}', '\u{2066}', '\u{2067}', '\u{2068}', '\u{2069}', '\u{2028}', '\u{2029}',
        ] {
            let shown = visible(&c.to_string()).into_owned();
            assert_eq!(shown, format!("\\u{{{:x}}}", c as u32));
        }
        // Neighbours of the bidi ranges stay as they are.
        case(
            "\u{2029}\u{202F}\u{2065}\u{206A}",
            "\\u{2029}\u{202F}\u{2065}\u{206A}",
        );
    }

    #[test]
    fn notes_keep_their_lines() {
        let lines: Vec<_> = visible_lines("one\r\ntwo\u{1b}[1A\nthree").collect();
        assert_eq!(lines, ["one", "two\\u{1b}[1A", "three"]);
    }

    #[test]
    fn clip_cuts_long_text_in_characters() {
        assert_eq!(clip("abc", 3), "abc");
        assert_eq!(clip("abcd", 3), "ab…");
        assert_eq!(clip("ééééé", 4), "ééé…");
        assert_eq!(clip("", 0), "");
    }
}
