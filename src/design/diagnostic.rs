//! `Diagnostic`: one located problem in a design file, with the key, what was expected and a hint.
//!
//! Part of the `design` stage. Rendering a diagnostic to text is pure; the CLI decides where it goes.

use std::fmt;
use std::ops::Range;

/// A located error in a design file.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Diagnostic {
    /// The design file's name as given on the command line.
    pub file: String,
    /// 1-based line of the problem.
    pub line: usize,
    /// 1-based column (in characters) of the problem.
    pub column: usize,
    /// Byte range of the offending text in the source.
    pub span: Range<usize>,
    /// The dotted key at fault (`armature.poles`), or the table (`[armature]`), or `file`.
    pub key: String,
    /// What was wrong and what was expected, lower-case, one sentence.
    pub message: String,
    /// How to fix it.
    pub hint: Option<String>,
    /// The source line, kept so the report can show it with a caret.
    pub source_line: String,
}

impl Diagnostic {
    /// Builds a diagnostic for `span` in `source`.
    pub fn new(
        file: &str,
        source: &str,
        span: Range<usize>,
        key: impl Into<String>,
        message: impl Into<String>,
    ) -> Self {
        let start = floor_char_boundary(source, span.start.min(source.len()));
        let end = floor_char_boundary(source, span.end.min(source.len())).max(start);
        let line_start = source[..start].rfind('\n').map_or(0, |i| i + 1);
        let line_end = source[start..]
            .find('\n')
            .map_or(source.len(), |i| start + i);
        let line = source[..start].matches('\n').count() + 1;
        let column = source[line_start..start].chars().count() + 1;
        Diagnostic {
            file: file.to_string(),
            line,
            column,
            span: start..end,
            key: key.into(),
            message: message.into(),
            hint: None,
            source_line: source[line_start..line_end]
                .trim_end_matches('\r')
                .to_string(),
        }
    }

    /// Adds a hint.
    #[must_use]
    pub fn with_hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        self
    }
}

fn floor_char_boundary(s: &str, mut i: usize) -> usize {
    while i > 0 && !s.is_char_boundary(i) {
        i -= 1;
    }
    i
}

impl fmt::Display for Diagnostic {
    /// ```text
    /// error: armature.poles: poles must be even, found 5
    ///   --> shop.toml:4:9
    ///    |
    ///  4 | poles = 5
    ///    |         ^
    ///    = hint: a DC machine has pairs of poles: try 4 or 6
    /// ```
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        writeln!(f, "error: {}: {}", self.key, self.message)?;
        let gutter = self.line.to_string().len();
        let pad = " ".repeat(gutter);
        writeln!(f, "{pad} --> {}:{}:{}", self.file, self.line, self.column)?;
        writeln!(f, "{pad} |")?;
        writeln!(f, "{} | {}", self.line, self.source_line)?;
        let line_chars = self.source_line.chars().count();
        let col0 = (self.column - 1).min(line_chars);
        let span_chars = {
            // Width of the underline: the span's characters on this line, at least one.
            let text = self.source_line.chars().skip(col0).collect::<String>();
            let span_len = self.span.end.saturating_sub(self.span.start);
            let mut w = 0;
            let mut bytes = 0;
            for c in text.chars() {
                if bytes >= span_len {
                    break;
                }
                bytes += c.len_utf8();
                w += 1;
            }
            w.max(1)
        };
        writeln!(f, "{pad} | {}{}", " ".repeat(col0), "^".repeat(span_chars))?;
        if let Some(hint) = &self.hint {
            writeln!(f, "{pad} = hint: {hint}")?;
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn locates_line_and_column_in_characters() {
        let src = "[job]\ntitle = \"Café\"\npoles = 5\n";
        let at = src.find('5').unwrap();
        let d = Diagnostic::new("x.toml", src, at..at + 1, "armature.poles", "bad");
        assert_eq!((d.line, d.column), (3, 9));
        assert_eq!(d.source_line, "poles = 5");
        let text = d.with_hint("try 4").to_string();
        assert_eq!(
            text,
            "error: armature.poles: bad\n  --> x.toml:3:9\n  |\n3 | poles = 5\n  |         ^\n  = hint: try 4\n"
        );
    }
}
