//! Paper sizes for printed sheets, in millimetres.
//!
//! Part of the `layout` stage. Sheets are laid out landscape, so the developed diagram gets
//! the long edge. ISO 216 sizes are exact in millimetres; the ANSI sizes are converted from
//! inches at 25.4 mm per inch [src: ISO 216:2007; ANSI/ASME Y14.1 for Letter (8.5 × 11 in)
//! and Tabloid/B (11 × 17 in)].

use std::fmt;
use std::str::FromStr;

/// A paper size (`--paper`, default A4).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Paper {
    /// ISO A4, 297 × 210 mm landscape.
    #[default]
    A4,
    /// ISO A3, 420 × 297 mm landscape.
    A3,
    /// ANSI Letter, 279.4 × 215.9 mm landscape.
    Letter,
    /// ANSI Tabloid, 431.8 × 279.4 mm landscape.
    Tabloid,
}

impl Paper {
    /// All sizes, in the order the CLI lists them.
    pub const ALL: [Paper; 4] = [Paper::A4, Paper::A3, Paper::Letter, Paper::Tabloid];

    /// Width and height in mm, landscape.
    pub fn size_mm(self) -> (f64, f64) {
        match self {
            Paper::A4 => (297.0, 210.0),
            Paper::A3 => (420.0, 297.0),
            Paper::Letter => (279.4, 215.9),
            Paper::Tabloid => (431.8, 279.4),
        }
    }

    /// The command-line word.
    pub fn as_str(self) -> &'static str {
        match self {
            Paper::A4 => "a4",
            Paper::A3 => "a3",
            Paper::Letter => "letter",
            Paper::Tabloid => "tabloid",
        }
    }

    /// The name printed in the title block.
    pub fn label(self) -> &'static str {
        match self {
            Paper::A4 => "A4",
            Paper::A3 => "A3",
            Paper::Letter => "Letter",
            Paper::Tabloid => "Tabloid",
        }
    }
}

impl fmt::Display for Paper {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.as_str())
    }
}

impl FromStr for Paper {
    type Err = String;

    fn from_str(s: &str) -> Result<Paper, String> {
        Paper::ALL
            .into_iter()
            .find(|p| p.as_str().eq_ignore_ascii_case(s))
            .ok_or_else(|| {
                format!("unknown paper size \"{s}\": expected a4, a3, letter or tabloid")
            })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_are_landscape_and_parse_back() {
        for p in Paper::ALL {
            let (w, h) = p.size_mm();
            assert!(w > h, "{p} is landscape");
            assert_eq!(p.as_str().parse::<Paper>(), Ok(p));
        }
        // ISO 216: A3 is A4 doubled along its short side.
        assert_eq!(Paper::A3.size_mm().1, Paper::A4.size_mm().0);
        // ANSI: 11 in × 25.4 mm/in.
        assert!((Paper::Letter.size_mm().0 - 279.4).abs() < 1e-9);
        assert!("b5".parse::<Paper>().is_err());
    }
}
