//! The resolved design: every default applied, every value validated.
//!
//! Part of the `design` stage. Later stages take a `Design` and never see TOML. Units are in
//! the field names or docs; design-file keys are named in each doc comment.

pub use crate::theory::{Direction, ElementSpec, WindingType};

/// Sense of rotation seen from the commutator end (`[armature] rotation`, default `"cw"`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Rotation {
    /// Clockwise from the commutator end: with slots numbered clockwise from that end, the
    /// armature surface moves towards rising slot numbers (a fixed pole sees them fall).
    Clockwise,
    /// Counter-clockwise from the commutator end.
    CounterClockwise,
}

impl Rotation {
    /// The design-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            Rotation::Clockwise => "cw",
            Rotation::CounterClockwise => "ccw",
        }
    }
}

/// Motor or generator (`[rating] mode`, default motor). Sets the current's sense against the EMF.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Mode {
    /// Current flows against the induced EMF.
    Motor,
    /// Current flows with the induced EMF.
    Generator,
}

impl Mode {
    /// The design-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            Mode::Motor => "motor",
            Mode::Generator => "generator",
        }
    }
}

/// Which type-A equalizers to fit (`[winding] equalizers`, lap only, default none).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum EqualizerChoice {
    /// `"none"`.
    None,
    /// `"full"`: every possible connection (2C/P of them).
    Full,
    /// An integer n: every n-th possible connection, starting at segment 1.
    EveryNth(u32),
}

/// Where the span came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SpanSource {
    /// Given in the design file.
    Given,
    /// Defaulted to floor(slots / poles).
    Default,
}

/// The wave element's coils of a frog-leg winding (`[winding] wave_span`, `wave_turns`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct WaveCoils {
    /// `wave_span`, slots (default `span`).
    pub span: u32,
    /// `wave_turns` per coil (default `turns`).
    pub turns: u32,
}

/// One winding element as the design gives it: the kind's element ([`ElementSpec`]) with its
/// coils' span and turns.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct DesignElement {
    /// Kind, multiplicity and direction.
    pub spec: ElementSpec,
    /// Span in slots.
    pub span: u32,
    /// Turns per coil.
    pub turns: u32,
}

/// Optional text that identifies the job (`[job]`).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Job {
    /// `id`: the shop's job number.
    pub id: Option<String>,
    /// `title`.
    pub title: Option<String>,
    /// `customer`.
    pub customer: Option<String>,
    /// `date`: any text; the only date that ever appears on output.
    pub date: Option<String>,
    /// `notes`.
    pub notes: Option<String>,
}

/// Thermal class of the insulation system (`[rating] thermal_class`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ThermalClass {
    /// 105 (A).
    A,
    /// 120 (E).
    E,
    /// 130 (B).
    B,
    /// 155 (F).
    F,
    /// 180 (H).
    H,
}

impl ThermalClass {
    /// Every class with its temperature in °C and its letter, coolest first: the one place the
    /// class and its number meet (the design reader, the design writer and the words use it).
    pub const TABLE: [(ThermalClass, u32, &'static str); 5] = [
        (ThermalClass::A, 105, "A"),
        (ThermalClass::E, 120, "E"),
        (ThermalClass::B, 130, "B"),
        (ThermalClass::F, 155, "F"),
        (ThermalClass::H, 180, "H"),
    ];

    fn row(self) -> (ThermalClass, u32, &'static str) {
        Self::TABLE
            .into_iter()
            .find(|r| r.0 == self)
            .unwrap_or(Self::TABLE[0])
    }

    /// The class temperature in °C (`thermal_class = 155`).
    pub fn celsius(self) -> u32 {
        self.row().1
    }

    /// The class letter (`thermal_class = "F"`).
    pub fn letter(self) -> &'static str {
        self.row().2
    }

    /// The class named by its temperature ("155") or its letter ("F", upper case).
    pub fn from_word(word: &str) -> Option<ThermalClass> {
        Self::TABLE
            .into_iter()
            .find(|&(_, c, l)| word == l || word == c.to_string())
            .map(|r| r.0)
    }

    /// The class temperature in °C and the letter: "155 (F)".
    pub fn label(self) -> String {
        format!("{} ({})", self.celsius(), self.letter())
    }
}

/// Brush material (`[commutator] brush_grade`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum BrushGrade {
    /// Carbon or electrographite.
    Carbon,
    /// Metal-graphite.
    MetalGraphite,
}

impl BrushGrade {
    /// The design-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            BrushGrade::Carbon => "carbon",
            BrushGrade::MetalGraphite => "metal-graphite",
        }
    }
}

/// Nameplate rating (`[rating]`); every field optional.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Rating {
    /// `voltage`, V at the terminals.
    pub voltage: Option<f64>,
    /// `current`, A in the armature.
    pub current: Option<f64>,
    /// `thermal_class`.
    pub thermal_class: Option<ThermalClass>,
    /// `interpoles`: whether interpoles (commutating poles) are fitted; `None` when not said.
    pub interpoles: Option<bool>,
}

/// Cross-section of the conductor.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ConductorShape {
    /// Round wire, `diameter_mm` (bare), with `strands` in hand.
    Round {
        /// Bare diameter, mm.
        diameter_mm: f64,
        /// The AWG gauge when the diameter came from `awg`.
        awg: Option<i32>,
        /// Strands in hand (default 1).
        strands: u32,
    },
    /// Rectangular strip `width_mm` × `height_mm` with `corner_radius_mm` (default 0).
    Rectangular {
        /// Width, mm.
        width_mm: f64,
        /// Height, mm.
        height_mm: f64,
        /// Corner radius, mm.
        corner_radius_mm: f64,
        /// Strips in hand (default 1).
        strands: u32,
    },
}

/// The conductor of one turn (`[conductor]`).
#[derive(Clone, Debug, PartialEq)]
pub struct Conductor {
    /// The cross-section.
    pub shape: ConductorShape,
    /// `mean_turn_mm`: mean length of one turn, mm; estimated from `[core]` when absent.
    pub mean_turn_mm: Option<f64>,
}

/// The armature core (`[core]`).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Core {
    /// `diameter_mm`, armature outside diameter.
    pub diameter_mm: Option<f64>,
    /// `length_mm`, core (stack) length.
    pub length_mm: Option<f64>,
    /// `slot_depth_mm`, from the core surface to the slot bottom.
    pub slot_depth_mm: Option<f64>,
    /// `slot_width_mm` (a parallel-sided slot).
    pub slot_width_mm: Option<f64>,
    /// `liner_mm`, see [`Core::liner`].
    pub liner_mm: Option<f64>,
    /// `separator_mm`, see [`Core::separator`].
    pub separator_mm: Option<f64>,
    /// `wedge_mm`, see [`Core::wedge`].
    pub wedge_mm: Option<f64>,
    /// `extension_mm`, see [`Core::extension`].
    pub extension_mm: Option<f64>,
    /// `end_turn_angle_deg`, see [`Core::end_turn_angle`].
    pub end_turn_angle_deg: Option<f64>,
    /// `riser_distance_mm`: from the core end to the risers; the leads are left out without it.
    pub riser_distance_mm: Option<f64>,
    /// `scrap_percent`, see [`Core::scrap`].
    pub scrap_percent: Option<f64>,
    /// `reel_kg`: the copper on one reel the shop buys, kg.
    pub reel_kg: Option<f64>,
    /// `enamel_grade`, see [`Core::grade`].
    pub enamel_grade: Option<u8>,
    /// `conductor_build_mm`: the insulation's increase of each conductor dimension, mm
    /// (default by grade for round wire, [`STRIP_BUILD_MM`] for strip).
    pub conductor_build_mm: Option<f64>,
    /// `equalizer_wire = "same"`: the equalizers are wound from the coils' wire (default
    /// `"separate"`).
    pub equalizer_wire_same: Option<bool>,
}

/// Slot liner default, mm [common practice, from memory: 0.2-0.3 mm of film or
/// film-and-paper laminate in small and medium armatures].
pub const LINER_MM: f64 = 0.25;
/// Layer separator default, mm [common practice, from memory, as the liner].
pub const SEPARATOR_MM: f64 = 0.25;
/// Slot wedge default, mm [common practice, from memory: 1.5-3 mm fibre or laminate].
pub const WEDGE_MM: f64 = 2.0;
/// Straight extension of the coil past the core at each end, mm [common practice, from
/// memory: 5-15 mm, enough to clear the core's end plate].
pub const EXTENSION_MM: f64 = 10.0;
/// End-turn angle to the core end face, degrees [common practice, from memory: 20-30°].
pub const END_TURN_ANGLE_DEG: f64 = 25.0;
/// Scrap allowance on the wire ordered, percent [common practice, from memory].
pub const SCRAP_PERCENT: f64 = 5.0;
/// Enamel grade by default: 2 [IEC 60317 grades; grade 2 is the usual armature wire, common
/// practice].
pub const ENAMEL_GRADE: u8 = 2;
/// Insulation build of an enamelled strip on each dimension by default, mm [from memory:
/// IEC 60317-0-2 grade 2 runs about 0.10-0.15 mm on each dimension].
pub const STRIP_BUILD_MM: f64 = 0.15;

impl Core {
    /// `liner_mm` or [`LINER_MM`].
    pub fn liner(&self) -> f64 {
        self.liner_mm.unwrap_or(LINER_MM)
    }
    /// `separator_mm` or [`SEPARATOR_MM`].
    pub fn separator(&self) -> f64 {
        self.separator_mm.unwrap_or(SEPARATOR_MM)
    }
    /// `wedge_mm` or [`WEDGE_MM`].
    pub fn wedge(&self) -> f64 {
        self.wedge_mm.unwrap_or(WEDGE_MM)
    }
    /// `extension_mm` or [`EXTENSION_MM`].
    pub fn extension(&self) -> f64 {
        self.extension_mm.unwrap_or(EXTENSION_MM)
    }
    /// `end_turn_angle_deg` or [`END_TURN_ANGLE_DEG`].
    pub fn end_turn_angle(&self) -> f64 {
        self.end_turn_angle_deg.unwrap_or(END_TURN_ANGLE_DEG)
    }
    /// `scrap_percent` or [`SCRAP_PERCENT`].
    pub fn scrap(&self) -> f64 {
        self.scrap_percent.unwrap_or(SCRAP_PERCENT)
    }
    /// `enamel_grade` or [`ENAMEL_GRADE`].
    pub fn grade(&self) -> u8 {
        self.enamel_grade.unwrap_or(ENAMEL_GRADE)
    }
}

/// Brush width as given.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum BrushWidth {
    /// `brush_width_mm`.
    Millimetres(f64),
    /// `brush_width_segments`.
    Segments(f64),
}

/// The commutator and brushes (`[commutator]`).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Commutator {
    /// `diameter_mm`.
    pub diameter_mm: Option<f64>,
    /// `brush_width_mm` or `brush_width_segments`.
    pub brush_width: Option<BrushWidth>,
    /// `brush_grade` (default carbon).
    pub brush_grade: Option<BrushGrade>,
    /// `brush_sets`: brush sets fitted (default P, see [`Design::brush_sets`]); even, at most
    /// P, and P for a lap winding.
    pub brush_sets: Option<u32>,
}

/// Hard limits on the size of a design, so no input can exhaust memory.
pub mod bounds {
    /// Largest pole count accepted.
    pub const MAX_POLES: i64 = 96;
    /// Largest slot count accepted.
    pub const MAX_SLOTS: i64 = 4_000;
    /// Largest coils per slot accepted.
    pub const MAX_COILS_PER_SLOT: i64 = 16;
    /// Largest number of coil positions u·S (and so of segments) accepted.
    pub const MAX_COILS: i64 = 20_000;
    /// Largest multiplicity accepted.
    pub const MAX_MULTIPLICITY: i64 = 6;
    /// Largest turns per coil accepted.
    pub const MAX_TURNS: i64 = 10_000;
    /// Largest `[rating] voltage` accepted, V.
    pub const MAX_VOLTAGE: f64 = 100_000.0;
    /// Largest `[rating] current` accepted, A.
    pub const MAX_CURRENT_A: f64 = 100_000.0;
    /// Largest `speed_rpm` accepted, rpm.
    pub const MAX_SPEED_RPM: f64 = 200_000.0;
    /// Largest `flux_per_pole_mwb` accepted, mWb.
    pub const MAX_FLUX_MWB: f64 = 100_000.0;
}

/// A signed length round the commutator in half segment pitches ("half bars"), exact: the
/// lead offset `1.5` is `HalfBars(3)` (`[winding] lead_offset`).
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, PartialOrd, Ord)]
pub struct HalfBars(pub i32);

impl HalfBars {
    /// No offset.
    pub const ZERO: HalfBars = HalfBars(0);

    /// The length in segment pitches (bars).
    pub fn bars(self) -> f64 {
        f64::from(self.0) / 2.0
    }
}

impl std::fmt::Display for HalfBars {
    /// Whole bars as an integer (`-2`), half bars with one decimal (`1.5`), so the text reads
    /// back as the same value.
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        let sign = if self.0 < 0 { "-" } else { "" };
        let a = self.0.unsigned_abs();
        if a.is_multiple_of(2) {
            write!(f, "{sign}{}", a / 2)
        } else {
            write!(f, "{sign}{}.5", a / 2)
        }
    }
}

/// A fully resolved, validated armature design, built by [`Design::new`] alone
/// (`design/build.rs`).
#[derive(Clone, Debug, PartialEq)]
pub struct Design {
    /// The file name as given (shown on reports and sheets).
    pub file_name: String,
    /// `[job]`.
    pub job: Job,
    /// `[armature] poles`: even, 2…96.
    pub poles: u32,
    /// `[armature] slots`.
    pub slots: u32,
    /// `[armature] coils_per_slot` (u).
    pub coils_per_slot: u32,
    /// Commutator segments C, resolved: `[armature] segments` as given and validated, or
    /// worked out for the winding kind when absent ([`crate::theory::WindingKind::default_segments`]).
    pub segments: u32,
    /// Whether `segments` was worked out rather than given.
    pub segments_derived: bool,
    /// `[armature] rotation`.
    pub rotation: Rotation,
    /// `[armature] pole_arc`: pole arc / pole pitch (default [`super::DEFAULT_POLE_ARC`]).
    pub pole_arc: f64,
    /// `[winding] type`.
    pub winding_type: WindingType,
    /// `[winding] multiplicity` (m, default 1).
    pub multiplicity: u32,
    /// `[winding] direction`.
    pub direction: Direction,
    /// `[winding] span`, slots (y_s); `"1-8"` is 7.
    pub span: u32,
    /// Whether the span was given or defaulted.
    pub span_source: SpanSource,
    /// `[winding] turns` per coil.
    pub turns: u32,
    /// The wave element of a frog-leg winding (`[winding] wave_span`, `wave_turns`); `None`
    /// for lap and wave.
    pub wave_coils: Option<WaveCoils>,
    /// `[winding] lead_offset`, in half bars (default 0; `0.5`, `-1.5` allowed). See `winding`
    /// for the convention.
    pub lead_offset: HalfBars,
    /// `[winding] equalizers`.
    pub equalizers: EqualizerChoice,
    /// `[winding] dummy_coils`: the coil positions left unconnected, sorted, as many as
    /// N − C; `None` spreads the dummies evenly (the engine's default placement).
    pub dummy_coils: Option<Vec<u32>>,
    /// Flux per pole, mWb (`[winding]` or `[rating] flux_per_pole_mwb`).
    pub flux_per_pole_mwb: Option<f64>,
    /// Speed, rpm (`[winding]` or `[rating] speed_rpm`).
    pub speed_rpm: Option<f64>,
    /// `[rating] mode`.
    pub mode: Mode,
    /// `[rating]`, when present.
    pub rating: Option<Rating>,
    /// `[conductor]`, when present.
    pub conductor: Option<Conductor>,
    /// `[core]`, when present.
    pub core: Option<Core>,
    /// `[commutator]`, when present.
    pub commutator: Option<Commutator>,
    /// `[limits]` with defaults filled in (see [`super::LIMITS`]).
    pub limits: super::Limits,
    /// The length system of the file (`_mm` or `_in` keys): reports and sheets print
    /// lengths in it; every length field is in mm either way.
    pub units: crate::base::Units,
    /// Only [`Design::new`] makes a design: no code outside `design` can write this field.
    pub(super) sealed: Sealed,
}

/// The mark of a [`Design`] built by [`Design::new`], which alone checks it.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Sealed(pub(super) ());

impl Design {
    /// Pole pairs p = P/2.
    pub fn pole_pairs(&self) -> u32 {
        self.poles / 2
    }

    /// Coil positions N = u·S.
    pub fn coil_positions(&self) -> u32 {
        self.coils_per_slot * self.slots
    }

    /// Dummy coils: the coil positions left without a segment of their own.
    pub fn dummy_count(&self) -> u32 {
        self.coil_positions() - self.segments
    }

    /// The winding elements on the commutator, in order (the lap element first): the kind's
    /// elements ([`crate::theory::WindingKind::elements`]) with their spans and turns.
    pub fn elements(&self) -> Vec<DesignElement> {
        let kind = self.winding_type.kind();
        kind.elements(self.multiplicity, self.pole_pairs(), self.direction)
            .into_iter()
            .enumerate()
            .map(|(i, spec)| {
                let wave = self.wave_coils.filter(|_| i > 0);
                DesignElement {
                    spec,
                    span: wave.map_or(self.span, |w| w.span),
                    turns: wave.map_or(self.turns, |w| w.turns),
                }
            })
            .collect()
    }

    /// Brush sets fitted: `[commutator] brush_sets`, default P (one by each pole).
    pub fn brush_sets(&self) -> u32 {
        self.commutator
            .as_ref()
            .and_then(|k| k.brush_sets)
            .unwrap_or(self.poles)
    }
}

/// Bare diameter in mm of AWG gauge `n` (0000 is −3, 000 is −2, 00 is −1).
///
/// d = 0.127 mm × 92^((36 − n)/39) [src: ASTM B258, Standard Specification for Standard
/// Nominal Diameters and Cross-Sectional Areas of AWG Sizes of Solid Round Wires].
pub fn awg_diameter_mm(n: i32) -> f64 {
    0.127 * 92f64.powf(f64::from(36 - n) / 39.0)
}
