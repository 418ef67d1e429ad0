//! `Diagnostic`: one located problem in a design file, with the key, what was expected and a hint.
//!
//! Part of the `design` stage. Rendering a diagnostic to text is pure; the CLI decides where it goes.

use std::fmt;
use std::ops::Range;

use crate::base::visible::{ECHO_WIDTH, clip, push_visible, visible, visible_lines};

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
    ///
    /// Every text from the file (key, message, source line, file name, hint) is shown through
    /// [`visible`], so a design cannot send escapes to the terminal; the caret column counts
    /// the escapes. A key, or a source line wider than [`ECHO_WIDTH`] characters, is cut to a
    /// window around the caret with `…`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        writeln!(
            f,
            "error: {}: {}",
            visible(&clip(&self.key, ECHO_WIDTH)),
            visible(&self.message)
        )?;
        let gutter = self.line.to_string().len();
        let pad = " ".repeat(gutter);
        writeln!(
            f,
            "{pad} --> {}:{}:{}",
            visible(&self.file),
            self.line,
            self.column
        )?;
        writeln!(f, "{pad} |")?;
        let (shown, caret_pad, carets) = self.caret_window();
        writeln!(f, "{} | {shown}", self.line)?;
        writeln!(f, "{pad} | {caret_pad}{}", "^".repeat(carets))?;
        if let Some(hint) = &self.hint {
            let lines: Vec<_> = visible_lines(hint).collect();
            writeln!(f, "{pad} = hint: {}", lines.join("\n"))?;
        }
        Ok(())
    }
}

impl Diagnostic {
    /// The source line as shown (escaped, cut to [`ECHO_WIDTH`] around the caret), the
    /// padding before the caret (the line's tabs kept so the caret lines up) and the caret
    /// count.
    fn caret_window(&self) -> (String, String, usize) {
        let raw: Vec<char> = self.source_line.chars().collect();
        let col0 = (self.column - 1).min(raw.len());
        // Width of the underline: the span's characters on this line, at least one.
        let span_len = self.span.end.saturating_sub(self.span.start);
        let mut under = 0;
        let mut bytes = 0;
        for c in &raw[col0..] {
            if bytes >= span_len {
                break;
            }
            bytes += c.len_utf8();
            under += 1;
        }
        // The line as shown, with where the caret starts and ends in it.
        let mut shown: Vec<char> = Vec::with_capacity(raw.len());
        let mut one = String::new();
        let (mut start, mut end) = (0, 0);
        for (i, c) in raw.iter().enumerate() {
            if i == col0 {
                start = shown.len();
            }
            if i == col0 + under {
                end = shown.len();
            }
            one.clear();
            push_visible(&mut one, *c);
            shown.extend(one.chars());
        }
        if col0 == raw.len() {
            start = shown.len();
        }
        if col0 + under == raw.len() {
            end = shown.len();
        }
        // The window: the whole line when it fits, else ECHO_WIDTH characters that hold the
        // caret's start, with `…` where the line is cut.
        let width = ECHO_WIDTH;
        let from = if shown.len() <= width || start < width * 2 / 3 {
            0
        } else {
            start - width / 3
        };
        let to = shown.len().min(from + width);
        let mut line: String = shown[from..to].iter().collect();
        let mut caret_pad: String = shown[from..start.min(to)]
            .iter()
            .map(|c| if *c == '\t' { '\t' } else { ' ' })
            .collect();
        if from > 0 {
            line.insert(0, '…');
            caret_pad.insert(0, ' ');
        }
        if to < shown.len() {
            line.push('…');
        }
        let carets = end.min(to).saturating_sub(start).max(1);
        (line, caret_pad, carets)
    }
}

/// The most diagnostics one reading of a file reports; reading stops at the limit.
pub const MAX_DIAGNOSTICS: usize = 20;

/// Every problem found in one design file, in source order: never empty, at most
/// [`MAX_DIAGNOSTICS`].
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Diagnostics {
    list: Vec<Diagnostic>,
    /// True when reading stopped at [`MAX_DIAGNOSTICS`] and more problems may follow.
    capped: bool,
}

impl Diagnostics {
    /// The diagnostics of `list` in source order (line, then column), duplicates dropped and
    /// cut to [`MAX_DIAGNOSTICS`]; `None` when `list` is empty.
    pub fn new(mut list: Vec<Diagnostic>) -> Option<Self> {
        list.sort_by_key(|d| (d.line, d.column));
        list.dedup();
        let capped = list.len() > MAX_DIAGNOSTICS;
        list.truncate(MAX_DIAGNOSTICS);
        (!list.is_empty()).then_some(Diagnostics { list, capped })
    }

    /// The first problem in source order.
    pub fn first(&self) -> &Diagnostic {
        &self.list[0]
    }

    /// The problems in source order.
    pub fn iter(&self) -> std::slice::Iter<'_, Diagnostic> {
        self.list.iter()
    }

    /// How many problems are listed (at least 1).
    pub fn len(&self) -> usize {
        self.list.len()
    }

    /// Always false: a `Diagnostics` holds at least one problem.
    pub fn is_empty(&self) -> bool {
        false
    }

    /// True when more problems may follow the ones listed.
    pub fn capped(&self) -> bool {
        self.capped
    }
}

impl From<Diagnostic> for Diagnostics {
    fn from(d: Diagnostic) -> Self {
        Diagnostics {
            list: vec![d],
            capped: false,
        }
    }
}

impl<'a> IntoIterator for &'a Diagnostics {
    type Item = &'a Diagnostic;
    type IntoIter = std::slice::Iter<'a, Diagnostic>;
    fn into_iter(self) -> Self::IntoIter {
        self.list.iter()
    }
}

impl fmt::Display for Diagnostics {
    /// One problem prints as the [`Diagnostic`] alone; several print one after the other,
    /// each after a blank line, and end in a count:
    /// `error: 3 errors in shop.toml` (`error: more than 20 errors in shop.toml: the first 20
    /// are shown` when capped).
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, d) in self.list.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "{d}")?;
        }
        if self.list.len() > 1 {
            let file = visible(&self.list[0].file);
            if self.capped {
                writeln!(
                    f,
                    "\nerror: more than {MAX_DIAGNOSTICS} errors in {file}: the first {MAX_DIAGNOSTICS} are shown"
                )?;
            } else {
                writeln!(f, "\nerror: {} errors in {file}", self.list.len())?;
            }
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

    #[test]
    fn escapes_widen_the_line_and_the_caret_follows() {
        let src = "title = \"\u{202e}ab\" junk\n";
        let at = src.find("junk").unwrap();
        let d = Diagnostic::new("x\u{1b}.toml", src, at..at + 4, "job.title", "bad \u{7}");
        let text = d.to_string();
        assert_eq!(
            text,
            "error: job.title: bad \\u{7}\n  --> x\\u{1b}.toml:1:15\n  |\n1 | title = \"\\u{202e}ab\" junk\n  |                      ^^^^\n"
        );
    }

    #[test]
    fn tabs_before_the_caret_are_kept_so_it_lines_up() {
        let src = "\tpoles = 5\n";
        let at = src.find('5').unwrap();
        let d = Diagnostic::new("x.toml", src, at..at + 1, "armature.poles", "bad");
        assert!(d.to_string().contains("1 | \tpoles = 5\n  | \t        ^\n"));
    }

    #[test]
    fn a_long_line_is_cut_to_a_window_around_the_caret() {
        let long = "y".repeat(10_000);
        let src = format!("k = \"{long}\" junk\n");
        let at = src.find("junk").unwrap();
        let d = Diagnostic::new("x.toml", &src, at..at + 4, "job.k", "bad");
        let text = d.to_string();
        let lines: Vec<&str> = text.lines().collect();
        let shown = lines[3].strip_prefix("1 | ").unwrap();
        assert!(
            shown.starts_with('…') && shown.ends_with("\" junk"),
            "{shown}"
        );
        assert!(shown.chars().count() <= ECHO_WIDTH + 1);
        let caret = lines[4].strip_prefix("  | ").unwrap();
        let col = caret.chars().position(|c| c == '^').unwrap();
        let junk = shown.chars().collect::<Vec<_>>();
        assert_eq!(junk[col..col + 4].iter().collect::<String>(), "junk");
        // A value at the start of a long line: the line is cut after the window.
        let src = format!("k = {long}\n");
        let d = Diagnostic::new("x.toml", &src, 4..src.len() - 1, "job.k", "bad");
        let text = d.to_string();
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(lines[3], format!("1 | k = {}…", &long[..ECHO_WIDTH - 4]));
        assert_eq!(lines[4], format!("  |     {}", "^".repeat(ECHO_WIDTH - 4)));
    }

    #[test]
    fn diagnostics_are_listed_in_source_order_with_a_count() {
        let src = "a = 1\nb = 2\n";
        let at = |w: &str| {
            let i = src.find(w).unwrap();
            Diagnostic::new("x.toml", src, i..i + 1, w, "bad")
        };
        let one = Diagnostics::new(vec![at("a")]).unwrap();
        assert_eq!(one.to_string(), at("a").to_string());
        let two = Diagnostics::new(vec![at("b"), at("a"), at("b")]).unwrap();
        assert_eq!(two.len(), 2);
        assert_eq!(two.first().key, "a");
        assert_eq!(
            two.to_string(),
            format!("{}\n{}\nerror: 2 errors in x.toml\n", at("a"), at("b"))
        );
        assert!(Diagnostics::new(Vec::new()).is_none());
        let many: Vec<_> = (0..MAX_DIAGNOSTICS + 5)
            .map(|i| Diagnostic::new("x.toml", src, 0..1, format!("k{i:02}"), "bad"))
            .collect();
        let capped = Diagnostics::new(many).unwrap();
        assert_eq!(capped.len(), MAX_DIAGNOSTICS);
        assert!(capped.capped());
        assert!(
            capped
                .to_string()
                .ends_with("error: more than 20 errors in x.toml: the first 20 are shown\n")
        );
    }
}
