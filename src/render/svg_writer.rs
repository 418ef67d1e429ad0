//! A small SVG/XML writer: elements as strings, every number through one fixed-precision
//! writer, every piece of text escaped.
//!
//! Part of the `render` stage. Coordinates are millimetres written with at most two decimals
//! (0.01 mm is far below what a printer resolves), trailing zeros dropped, never `-0`.

use std::fmt::Write as _;

use crate::base::number::fmt_trimmed;

/// Decimals of a coordinate or length in mm (written by [`fmt_trimmed`]: trailing zeros
/// dropped, never "-0").
pub const MM_DECIMALS: usize = 2;

/// Escapes text content and attribute values (`&`, `<`, `>`, `"`, `'`), and drops control
/// characters that XML 1.0 does not allow.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            '\t' | '\n' | '\r' => out.push(' '),
            c if (c as u32) < 0x20 || c == '\u{FFFE}' || c == '\u{FFFF}' => {}
            c => out.push(c),
        }
    }
    out
}

/// An attribute value.
pub enum Val<'a> {
    /// A number, written by [`fmt_trimmed`] with [`MM_DECIMALS`].
    N(f64),
    /// Text, escaped.
    S(&'a str),
    /// An owned string, escaped.
    O(String),
}

impl From<f64> for Val<'_> {
    fn from(x: f64) -> Self {
        Val::N(x)
    }
}

impl<'a> From<&'a str> for Val<'a> {
    fn from(s: &'a str) -> Self {
        Val::S(s)
    }
}

impl From<String> for Val<'_> {
    fn from(s: String) -> Self {
        Val::O(s)
    }
}

impl From<u32> for Val<'_> {
    fn from(n: u32) -> Self {
        Val::O(n.to_string())
    }
}

/// Builds an SVG document in a string.
#[derive(Default)]
pub struct SvgWriter {
    out: String,
    depth: usize,
}

impl SvgWriter {
    /// An empty writer.
    pub fn new() -> SvgWriter {
        SvgWriter {
            out: String::with_capacity(64 * 1024),
            depth: 0,
        }
    }

    fn indent(&mut self) {
        for _ in 0..self.depth {
            self.out.push(' ');
        }
    }

    fn attrs(&mut self, attrs: &[(&str, Val<'_>)]) {
        for (k, v) in attrs {
            let _ = match v {
                Val::N(x) => write!(self.out, " {k}=\"{}\"", fmt_trimmed(*x, MM_DECIMALS)),
                Val::S(s) => write!(self.out, " {k}=\"{}\"", escape(s)),
                Val::O(s) => write!(self.out, " {k}=\"{}\"", escape(s)),
            };
        }
    }

    /// Opens `<name …>`.
    pub fn open(&mut self, name: &str, attrs: &[(&str, Val<'_>)]) {
        self.indent();
        self.out.push('<');
        self.out.push_str(name);
        self.attrs(attrs);
        self.out.push_str(">\n");
        self.depth += 1;
    }

    /// Closes `</name>`.
    pub fn close(&mut self, name: &str) {
        self.depth = self.depth.saturating_sub(1);
        self.indent();
        let _ = writeln!(self.out, "</{name}>");
    }

    /// Writes `<name …/>`.
    pub fn empty(&mut self, name: &str, attrs: &[(&str, Val<'_>)]) {
        self.indent();
        self.out.push('<');
        self.out.push_str(name);
        self.attrs(attrs);
        self.out.push_str("/>\n");
    }

    /// Writes `<name …>text</name>` with the text escaped.
    pub fn text_elem(&mut self, name: &str, attrs: &[(&str, Val<'_>)], text: &str) {
        self.indent();
        self.out.push('<');
        self.out.push_str(name);
        self.attrs(attrs);
        self.out.push('>');
        self.out.push_str(&escape(text));
        let _ = writeln!(self.out, "</{name}>");
    }

    /// Writes `<text x y class>content</text>`.
    pub fn text(&mut self, x: f64, y: f64, class: &str, content: &str) {
        self.text_elem(
            "text",
            &[("x", x.into()), ("y", y.into()), ("class", class.into())],
            content,
        );
    }

    /// Writes pre-formed markup (for the style sheet and the XML declaration).
    pub fn raw(&mut self, s: &str) {
        self.out.push_str(s);
    }

    /// The document.
    pub fn finish(self) -> String {
        self.out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_are_fixed_and_short() {
        assert_eq!(fmt_trimmed(0.1 + 0.2, MM_DECIMALS), "0.3");
        assert_eq!(fmt_trimmed(-0.001, MM_DECIMALS), "0");
        assert_eq!(fmt_trimmed(12.0, MM_DECIMALS), "12");
        assert_eq!(fmt_trimmed(297.0, MM_DECIMALS), "297");
        assert_eq!(fmt_trimmed(1.005, MM_DECIMALS), "1");
        assert_eq!(fmt_trimmed(-3.456, MM_DECIMALS), "-3.46");
        assert_eq!(fmt_trimmed(100.10, MM_DECIMALS), "100.1");
    }

    #[test]
    fn hostile_text_is_escaped() {
        assert_eq!(
            escape("<script>alert('x')</script> & \"q\""),
            "&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; &quot;q&quot;"
        );
        assert_eq!(escape("a\u{0}b\u{7}c\nd"), "abc d");
        let mut w = SvgWriter::new();
        w.text(1.0, 2.0, "t", "<b>&");
        assert_eq!(
            w.finish(),
            "<text x=\"1\" y=\"2\" class=\"t\">&lt;b&gt;&amp;</text>\n"
        );
    }
}
