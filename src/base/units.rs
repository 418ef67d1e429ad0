//! `Units`: the length system a design is written in, and the one writer of its lengths.
//!
//! Part of the `base` stage. Every length inside armsheet is in mm; a design written with
//! `_in` keys is converted on reading (exactly, 25.4 mm to the inch) and prints its lengths
//! back in inches. The precision of a printed length is stated here once: a length a
//! report gives to `d` decimals of a millimetre is given to `d + 2` decimals of an inch (at
//! most 4), so the dimensions the trade reads to a tenth of a millimetre read to a
//! thousandth of an inch (6.300 in) [common practice]. A design in inches also reads its
//! wire areas in circular mils, current density in circular mils per ampere, surface speed
//! in ft/min, loading in A/in, slot areas in in², wire in feet and pounds; `[limits]` keep
//! the units their keys name, and the JSON stays SI.

use super::number::{fmt_fixed, fmt_trimmed};

/// Millimetres in one inch (exact, by the 1959 international inch).
pub const MM_PER_INCH: f64 = 25.4;

/// The length system of a design file.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Units {
    /// `_mm` keys (the default).
    #[default]
    Millimetres,
    /// `_in` keys.
    Inches,
}

/// Square millimetres in one circular mil, the area of a circle a thousandth of an inch
/// across: π/4 × 0.0254² (exact by definition, the inch being exact).
pub const MM2_PER_CMIL: f64 = std::f64::consts::PI / 4.0 * 0.0254 * 0.0254;

/// Metres in a foot, exactly.
pub const M_PER_FOOT: f64 = 0.3048;
/// Kilograms in a pound, exactly.
pub const KG_PER_POUND: f64 = 0.453_592_37;

impl Units {
    /// The unit's symbol, as printed and as the JSON `units` value: `mm` or `in`.
    pub fn symbol(self) -> &'static str {
        match self {
            Units::Millimetres => "mm",
            Units::Inches => "in",
        }
    }

    /// The suffix of a length key in this system: `_mm` or `_in`.
    pub fn key_suffix(self) -> &'static str {
        match self {
            Units::Millimetres => "_mm",
            Units::Inches => "_in",
        }
    }

    /// The other system.
    pub fn other(self) -> Units {
        match self {
            Units::Millimetres => Units::Inches,
            Units::Inches => Units::Millimetres,
        }
    }

    /// Decimals in this system of a length given to `mm_decimals` decimals of a mm.
    pub fn decimals(self, mm_decimals: usize) -> usize {
        match self {
            Units::Millimetres => mm_decimals,
            Units::Inches => (mm_decimals + 2).min(4),
        }
    }

    /// Decimals to write in a design file a length held to `mm_decimals` decimals of a mm,
    /// losing nothing a reader would see: two more for inches.
    pub fn file_decimals(self, mm_decimals: usize) -> usize {
        match self {
            Units::Millimetres => mm_decimals,
            Units::Inches => mm_decimals + 2,
        }
    }

    /// `mm` in this system, without the unit.
    pub fn value(self, mm: f64) -> f64 {
        match self {
            Units::Millimetres => mm,
            Units::Inches => mm / MM_PER_INCH,
        }
    }

    /// A length of `mm` as printed, the number alone: `mm_decimals` decimals of a mm, or
    /// the matching decimals of an inch.
    pub fn number(self, mm: f64, mm_decimals: usize) -> String {
        fmt_fixed(self.value(mm), self.decimals(mm_decimals))
    }

    /// A length of `mm` as printed with its unit: `160.0 mm` or `6.299 in`.
    pub fn length(self, mm: f64, mm_decimals: usize) -> String {
        format!("{} {}", self.number(mm, mm_decimals), self.symbol())
    }

    /// A length of wire, `m` metres, as printed with its unit: metres, or feet for a design in
    /// inches (a foot is 0.3048 m exactly, by the 1959 international yard), to `decimals`.
    pub fn wire_length(self, m: f64, decimals: usize) -> String {
        match self {
            Units::Millimetres => format!("{} m", fmt_fixed(m, decimals)),
            Units::Inches => format!("{} ft", fmt_fixed(m / M_PER_FOOT, decimals)),
        }
    }

    /// A mass of `kg` as printed with its unit: kilograms, or pounds for a design in inches
    /// (a pound is 0.45359237 kg exactly, by the 1959 international pound), to `decimals`.
    pub fn mass(self, kg: f64, decimals: usize) -> String {
        match self {
            Units::Millimetres => format!("{} kg", fmt_fixed(kg, decimals)),
            Units::Inches => format!("{} lb", fmt_fixed(kg / KG_PER_POUND, decimals)),
        }
    }

    /// An area of `mm2` (a slot's, an insulation's) as printed with its unit: mm² to
    /// `mm2_decimals`, or in² to three decimals more (at most 6).
    pub fn area(self, mm2: f64, mm2_decimals: usize) -> String {
        match self {
            Units::Millimetres => format!("{} mm2", fmt_fixed(mm2, mm2_decimals)),
            Units::Inches => format!(
                "{} in2",
                fmt_fixed(mm2 / (MM_PER_INCH * MM_PER_INCH), (mm2_decimals + 3).min(6))
            ),
        }
    }

    /// A conductor's cross-section of `mm2` as printed with its unit: mm² to three decimals,
    /// or whole circular mils for a design in inches, as the inch trade sizes wire
    /// [common practice].
    pub fn wire_area(self, mm2: f64) -> String {
        match self {
            Units::Millimetres => format!("{} mm2", fmt_fixed(mm2, 3)),
            Units::Inches => format!("{} cmil", fmt_fixed(mm2 / MM2_PER_CMIL, 0)),
        }
    }

    /// A current density of `a_mm2` A/mm² as printed: A/mm², or the circular mils per ampere
    /// an inch shop judges a winding by [common practice].
    pub fn current_density(self, a_mm2: f64) -> String {
        match self {
            Units::Millimetres => format!("{} A/mm2", fmt_fixed(a_mm2, 2)),
            Units::Inches => format!("{} cmil/A", fmt_fixed(1.0 / (a_mm2 * MM2_PER_CMIL), 0)),
        }
    }

    /// A surface speed of `m_s` m/s as printed: m/s to two decimals, or feet per minute.
    pub fn surface_speed(self, m_s: f64) -> String {
        match self {
            Units::Millimetres => format!("{} m/s", fmt_fixed(m_s, 2)),
            Units::Inches => format!("{} ft/min", fmt_fixed(m_s * 60.0 / M_PER_FOOT, 0)),
        }
    }

    /// An electric loading of `a_m` ampere-conductors per metre of circumference as printed:
    /// A/m, or A/in.
    pub fn loading(self, a_m: f64) -> String {
        match self {
            Units::Millimetres => format!("{} A/m", fmt_fixed(a_m, 0)),
            Units::Inches => format!("{} A/in", fmt_fixed(a_m * MM_PER_INCH / 1000.0, 1)),
        }
    }

    /// A length as an input message echoes it, with its unit: the shortest digits in mm
    /// (`2 mm`, `0.25 mm`), or up to 4 decimals of an inch (`0.0787 in`).
    pub fn echo(self, mm: f64) -> String {
        match self {
            Units::Millimetres => format!("{mm} mm"),
            Units::Inches => format!("{} in", fmt_trimmed(self.value(mm), 4)),
        }
    }
}
