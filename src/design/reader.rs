//! `TableReader`: typed, located access to one table of the parsed TOML document.
//!
//! Part of the `design` stage. Every getter returns the value with its byte span, or a
//! [`Diagnostic`] that names the key, what was expected and a hint. Unknown keys are errors,
//! with the nearest known key suggested.

use std::cell::RefCell;
use std::ops::{Range, RangeInclusive};

use toml::Spanned;
use toml::de::{DeTable, DeValue};

use super::Diagnostic;
use crate::base::Units;
use crate::base::units::MM_PER_INCH;
use crate::base::visible::{ECHO_WIDTH, clip};

/// Tables whose keys keep the unit they name: a `[limits]` threshold in mm is not a length
/// of the design, and has no inch twin.
const OWN_UNIT_TABLES: &[&str] = &["limits"];

/// The source text and file name, shared by every reader of one document, with the list
/// the readers record their problems in.
#[derive(Clone, Copy)]
pub(crate) struct Source<'s> {
    pub file: &'s str,
    pub text: &'s str,
    pub found: &'s Found,
    /// The file's length system ([`units_of`]); millimetres until the document is read.
    pub units: Units,
}

impl<'s> Source<'s> {
    /// The source of `text` from `file`, its problems recorded in `found`, in millimetres
    /// until its length system is read ([`units_of`]).
    pub(crate) fn new(file: &'s str, text: &'s str, found: &'s Found) -> Source<'s> {
        Source {
            file,
            text,
            found,
            units: Units::Millimetres,
        }
    }
}

/// The problems found so far in one document; readers record one and read on, so a file's
/// problems are reported together.
#[derive(Default)]
pub(crate) struct Found(RefCell<Vec<Diagnostic>>);

impl Found {
    /// Records a problem.
    pub fn push(&self, d: Diagnostic) {
        self.0.borrow_mut().push(d);
    }

    /// The value of `r`, or `None` with its problem recorded.
    pub fn keep<T>(&self, r: Result<T, Diagnostic>) -> Option<T> {
        r.map_err(|d| self.push(d)).ok()
    }

    /// True once a problem is recorded.
    pub fn any(&self) -> bool {
        !self.0.borrow().is_empty()
    }

    /// The problems recorded, in the order found.
    pub fn into_vec(self) -> Vec<Diagnostic> {
        self.0.into_inner()
    }
}

impl<'s> Source<'s> {
    /// The value of `r`, or `None` with its problem recorded.
    pub fn keep<T>(&self, r: Result<T, Diagnostic>) -> Option<T> {
        self.found.keep(r)
    }

    pub fn error(
        &self,
        span: Range<usize>,
        key: impl Into<String>,
        message: impl Into<String>,
    ) -> Diagnostic {
        Diagnostic::new(self.file, self.text, span, key, message)
    }
}

/// The length system of a document: inches when any length is given by an `_in` key,
/// else millimetres. A file uses one system: an `_mm` key and an `_in` key in the same file
/// (the tables of [`OWN_UNIT_TABLES`] aside) are refused at the later of the two, naming both.
pub(crate) fn units_of(src: &Source<'_>, root: &DeTable<'_>) -> Result<Units, Diagnostic> {
    let mut lengths: Vec<(Range<usize>, String, Units)> = Vec::new();
    for (name, v) in root.iter() {
        let name: &str = name.get_ref();
        let Some(table) = v.get_ref().as_table() else {
            continue;
        };
        if OWN_UNIT_TABLES.contains(&name) {
            continue;
        }
        for (k, _) in table.iter() {
            let key: &str = k.get_ref();
            let units = if key.ends_with("_mm") {
                Units::Millimetres
            } else if key.ends_with("_in") {
                Units::Inches
            } else {
                continue;
            };
            lengths.push((k.span(), format!("{name}.{key}"), units));
        }
    }
    lengths.sort_by_key(|(span, _, _)| span.start);
    let Some((_, first, units)) = lengths.first() else {
        return Ok(Units::Millimetres);
    };
    match lengths.iter().find(|(_, _, u)| u != units) {
        None => Ok(*units),
        Some((span, other, _)) => Err(src
            .error(
                span.clone(),
                other.clone(),
                format!(
                    "this length is in {} but `{}` is in {}: a file gives every length in one system",
                    unit_name(units.other()),
                    clip(first, ECHO_WIDTH),
                    unit_name(*units),
                ),
            )
            .with_hint(
                "write every length with `_mm` keys or every length with `_in` keys (1 in = 25.4 mm); [limits] keep their own units",
            )),
    }
}

fn unit_name(u: Units) -> &'static str {
    match u {
        Units::Millimetres => "mm",
        Units::Inches => "inches",
    }
}

/// A value with the span it came from.
#[derive(Clone, Debug)]
pub(crate) struct At<T> {
    pub value: T,
    pub span: Range<usize>,
}

/// One table (`[armature]`) and the keys it may hold.
pub(crate) struct TableReader<'a, 'i> {
    pub src: Source<'a>,
    pub name: &'static str,
    pub table: &'a DeTable<'i>,
    /// Span of the table (its header where the parser gives one).
    pub span: Range<usize>,
}

/// Suggests the nearest of `known` to `word`, when one is close enough to be a typo.
pub(crate) fn nearest<'k>(word: &str, known: &[&'k str]) -> Option<&'k str> {
    // A word far longer than any key is no typo (and comparing it would cost its length).
    if word.len() > 64 {
        return None;
    }
    known
        .iter()
        .map(|k| (strsim::damerau_levenshtein(word, k), *k))
        .filter(|(d, k)| *d <= 2.max(k.len() / 3))
        .min()
        .map(|(_, k)| k)
}

impl<'a, 'i> TableReader<'a, 'i> {
    fn key(&self, key: &str) -> String {
        format!("{}.{}", self.name, key)
    }

    fn get(&self, key: &str) -> Option<&'a Spanned<DeValue<'i>>> {
        self.table.get(key)
    }

    /// Fails on a key not in `known`, suggesting the nearest: the first such key is the
    /// error returned, and any further ones are recorded in the source's [`Found`].
    pub fn deny_unknown(&self, known: &[&str]) -> Result<(), Diagnostic> {
        // In source order (the table iterates by name), and no more than a report shows.
        let mut unknown: Vec<_> = self
            .table
            .iter()
            .map(|(k, _)| k)
            .filter(|k| !self.knows(k.get_ref(), known))
            .collect();
        unknown.sort_by_key(|k| k.span().start);
        unknown.truncate(super::diagnostic::MAX_DIAGNOSTICS + 1);
        let mut first = None;
        for k in unknown {
            let word: &str = k.get_ref();
            let d = self.src.error(
                k.span(),
                self.key(word),
                format!(
                    "unknown key `{}` in [{}]",
                    clip(word, ECHO_WIDTH),
                    self.name
                ),
            );
            let d = match nearest(word, known) {
                Some(n) => d.with_hint(format!("did you mean `{}`?", self.in_file_units(n))),
                None => d.with_hint(format!(
                    "known keys in [{}]: {}",
                    self.name,
                    known.join(", ")
                )),
            };
            if first.is_none() {
                first = Some(d);
            } else {
                self.src.found.push(d);
            }
        }
        first.map_or(Ok(()), Err)
    }

    /// The value of `r`, or `None` with its problem recorded.
    pub fn keep<T>(&self, r: Result<T, Diagnostic>) -> Option<T> {
        self.src.keep(r)
    }

    /// Whether `key` is one of `known`, or the inch twin `<stem>_in` of a known `<stem>_mm`
    /// (outside the tables of [`OWN_UNIT_TABLES`]).
    fn knows(&self, key: &str, known: &[&str]) -> bool {
        known.contains(&key)
            || (!OWN_UNIT_TABLES.contains(&self.name)
                && key
                    .strip_suffix("_in")
                    .is_some_and(|stem| known.contains(&format!("{stem}_mm").as_str())))
    }

    /// `key` as this file would write it: a length's `_mm` key as its `_in` twin in an inch
    /// file (outside the tables of [`OWN_UNIT_TABLES`]).
    fn in_file_units(&self, key: &str) -> String {
        match key.strip_suffix("_mm") {
            Some(stem) if !OWN_UNIT_TABLES.contains(&self.name) => self.length_key(stem),
            _ => key.to_string(),
        }
    }

    /// The key a length `stem` is given by in this file: `<stem>_in` in an inch file,
    /// `<stem>_mm` otherwise (for the messages that name it).
    pub fn length_key(&self, stem: &str) -> String {
        format!("{stem}{}", self.src.units.key_suffix())
    }

    /// A length given by `<stem>_mm`, or by its inch twin `<stem>_in` (converted exactly,
    /// 25.4 mm to the inch), returned in mm; `min..=max` is in mm (`min_exclusive` excludes
    /// `min`) and is stated in the key's own unit. `what` names the length without a unit.
    /// Which of the two keys a file may use is settled for the whole file by [`units_of`].
    pub fn length(
        &self,
        stem: &str,
        min: f64,
        min_exclusive: bool,
        max: f64,
        what: &str,
    ) -> Result<Option<At<f64>>, Diagnostic> {
        let mm = format!("{stem}_mm");
        let inches = format!("{stem}_in");
        if self.get(&inches).is_none() {
            return self.number(&mm, min, min_exclusive, max, &format!("{what} in mm"));
        }
        // The bounds in inches, to a thousandth: they are sanity bounds, not tolerances.
        let to_in = |x: f64| (x / MM_PER_INCH * 1000.0).round() / 1000.0;
        let got = self.number(
            &inches,
            to_in(min),
            min_exclusive,
            to_in(max),
            &format!("{what} in inches"),
        )?;
        Ok(got.map(|a| At {
            value: a.value * MM_PER_INCH,
            span: a.span,
        }))
    }

    fn wrong_type(&self, key: &str, v: &Spanned<DeValue<'i>>, expected: &str) -> Diagnostic {
        self.src.error(
            v.span(),
            self.key(key),
            format!("expected {expected}, found {}", v.get_ref().type_str()),
        )
    }

    /// A required key: points at the table header when it is missing.
    pub fn missing(&self, key: &str, expected: &str, example: &str) -> Diagnostic {
        self.src
            .error(
                self.span.clone(),
                self.key(key),
                format!("missing key `{key}`: expected {expected}"),
            )
            .with_hint(format!("add a line such as `{example}` to [{}]", self.name))
    }

    /// An integer within `range`.
    pub fn int(
        &self,
        key: &str,
        range: RangeInclusive<i64>,
        what: &str,
        hint: &str,
    ) -> Result<Option<At<i64>>, Diagnostic> {
        let Some(v) = self.get(key) else {
            return Ok(None);
        };
        let expected = format!(
            "{what}, a whole number from {} to {}",
            range.start(),
            range.end()
        );
        let n = match v.get_ref() {
            DeValue::Integer(i) => i128::from_str_radix(i.as_str(), i.radix()).ok(),
            DeValue::Float(f) => {
                return Err(self
                    .src
                    .error(
                        v.span(),
                        self.key(key),
                        format!("expected {expected}, found the decimal {f}"),
                    )
                    .with_hint(hint.to_string()));
            }
            _ => {
                return Err(self
                    .wrong_type(key, v, &expected)
                    .with_hint(hint.to_string()));
            }
        };
        match n {
            Some(n) if n >= i128::from(*range.start()) && n <= i128::from(*range.end()) => {
                Ok(Some(At {
                    value: n as i64,
                    span: v.span(),
                }))
            }
            _ => {
                let shown = match v.get_ref() {
                    DeValue::Integer(i) => clip(&i.to_string(), ECHO_WIDTH).into_owned(),
                    _ => String::new(),
                };
                let msg = if n.is_some_and(|n| n > i128::from(*range.end())) && *range.end() >= 1000
                {
                    format!("{shown} is beyond any real machine: expected {expected}")
                } else {
                    format!("expected {expected}, found {shown}")
                };
                Err(self
                    .src
                    .error(v.span(), self.key(key), msg)
                    .with_hint(hint.to_string()))
            }
        }
    }

    /// A finite number (integer or decimal) within `min..=max`; `min_exclusive` excludes `min`.
    pub fn number(
        &self,
        key: &str,
        min: f64,
        min_exclusive: bool,
        max: f64,
        what: &str,
    ) -> Result<Option<At<f64>>, Diagnostic> {
        let Some(v) = self.get(key) else {
            return Ok(None);
        };
        let bound = if min_exclusive {
            format!("greater than {}", fmt_num(min))
        } else {
            format!("at least {}", fmt_num(min))
        };
        let expected = format!("{what}, a number {bound} and at most {}", fmt_num(max));
        let x = match v.get_ref() {
            DeValue::Integer(i) => i128::from_str_radix(i.as_str(), i.radix())
                .ok()
                .map(|n| n as f64),
            DeValue::Float(f) => f.as_str().replace('_', "").parse::<f64>().ok(),
            _ => {
                return Err(self.wrong_type(key, v, &expected).with_hint(format!(
                    "write a bare number, e.g. `{key} = {}`",
                    fmt_num(min.max(1.0))
                )));
            }
        };
        match x {
            Some(x) if x.is_finite() && (x > min || (!min_exclusive && x == min)) && x <= max => {
                Ok(Some(At {
                    value: x,
                    span: v.span(),
                }))
            }
            _ => Err(self
                .src
                .error(
                    v.span(),
                    self.key(key),
                    format!("expected {expected}, found {}", raw_number(v.get_ref())),
                )
                .with_hint(format!("{key} is {what}"))),
        }
    }

    /// A string.
    pub fn string(&self, key: &str) -> Result<Option<At<String>>, Diagnostic> {
        let Some(v) = self.get(key) else {
            return Ok(None);
        };
        match v.get_ref() {
            DeValue::String(s) => Ok(Some(At {
                value: s.to_string(),
                span: v.span(),
            })),
            DeValue::Datetime(d) if key == "date" => Ok(Some(At {
                value: d.to_string(),
                span: v.span(),
            })),
            _ => Err(self
                .wrong_type(key, v, "text in quotes")
                .with_hint(format!("write `{key} = \"…\"`"))),
        }
    }

    /// `true` or `false`.
    pub fn boolean(&self, key: &str, what: &str) -> Result<Option<At<bool>>, Diagnostic> {
        let Some(v) = self.get(key) else {
            return Ok(None);
        };
        match v.get_ref() {
            DeValue::Boolean(b) => Ok(Some(At {
                value: *b,
                span: v.span(),
            })),
            _ => Err(self
                .wrong_type(key, v, &format!("{what}, true or false"))
                .with_hint(format!(
                    "write `{key} = true` or `{key} = false`, without quotes"
                ))),
        }
    }

    /// One of a fixed set of words.
    pub fn choice(
        &self,
        key: &str,
        options: &[&'static str],
    ) -> Result<Option<At<&'static str>>, Diagnostic> {
        let Some(v) = self.get(key) else {
            return Ok(None);
        };
        let quoted = options
            .iter()
            .map(|o| format!("\"{o}\""))
            .collect::<Vec<_>>()
            .join(" or ");
        match v.get_ref() {
            DeValue::String(s) => {
                let lower = s.to_ascii_lowercase();
                if let Some(o) = options.iter().find(|o| **o == lower) {
                    return Ok(Some(At {
                        value: o,
                        span: v.span(),
                    }));
                }
                let d = self.src.error(
                    v.span(),
                    self.key(key),
                    format!("expected {quoted}, found \"{}\"", clip(s, ECHO_WIDTH)),
                );
                Err(match nearest(&lower, options) {
                    Some(n) => d.with_hint(format!("did you mean \"{n}\"?")),
                    None => d.with_hint(format!("{key} takes one of {quoted}")),
                })
            }
            _ => Err(self.wrong_type(key, v, &quoted).with_hint(format!(
                "write the word in quotes, e.g. `{key} = \"{}\"`",
                options[0]
            ))),
        }
    }

    /// An array of whole numbers, each in `range`, located.
    pub fn ints(
        &self,
        key: &str,
        v: &Spanned<DeValue<'i>>,
        range: RangeInclusive<i64>,
        what: &str,
        example: &str,
    ) -> Result<Vec<i64>, Diagnostic> {
        let bad = |span: Range<usize>, found: String| {
            self.src
                .error(
                    span,
                    self.dotted(key),
                    format!(
                        "expected {what}, whole numbers from {} to {}, found {found}",
                        range.start(),
                        range.end()
                    ),
                )
                .with_hint(format!("write e.g. `{key} = {example}`"))
        };
        let DeValue::Array(items) = v.get_ref() else {
            return Err(bad(v.span(), v.get_ref().type_str().to_string()));
        };
        items
            .iter()
            .map(|i| match i.get_ref() {
                DeValue::Integer(n) => i64::from_str_radix(n.as_str(), n.radix())
                    .ok()
                    .filter(|n| range.contains(n))
                    .ok_or_else(|| bad(i.span(), clip(&n.to_string(), ECHO_WIDTH).into_owned())),
                other => Err(bad(i.span(), other.type_str().to_string())),
            })
            .collect()
    }

    /// The raw value, for keys that take more than one type.
    pub fn raw(&self, key: &str) -> Option<&'a Spanned<DeValue<'i>>> {
        self.get(key)
    }

    /// The dotted name of `key` in this table.
    pub fn dotted(&self, key: &str) -> String {
        self.key(key)
    }
}

fn raw_number(v: &DeValue<'_>) -> String {
    let raw = match v {
        DeValue::Integer(i) => i.to_string(),
        DeValue::Float(f) => f.to_string(),
        other => other.type_str().to_string(),
    };
    clip(&raw, ECHO_WIDTH).into_owned()
}

/// Writes a bound for a message: whole numbers without a decimal point.
pub(crate) fn fmt_num(x: f64) -> String {
    if x.fract() == 0.0 && x.abs() < 1e15 {
        format!("{}", x as i64)
    } else {
        format!("{x}")
    }
}
