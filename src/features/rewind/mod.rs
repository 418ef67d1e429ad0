//! The rewind: a new winding on the same core for a new voltage, speed or connection.
//!
//! A feature above `checks`: pure. The flux per pole and the slot space are kept. The new
//! conductors per path follow from the ratio of the EMFs; the turns per coil from the new
//! connection's paths and segments, rounded to whole turns; the conductor from the same current
//! density (so the same copper in the slot and the same power). A request that cannot be met is
//! a [`RewindError`] carrying the numbers; the CLI words it (naming its flags) and writes the
//! result. Every number the new design file takes (flux, speed, voltage, current) is first
//! range-checked against what a design file holds, so a rewind never asks for a file armsheet
//! would refuse; the CLI still parses the file back before writing it.

use crate::rating::conductor::{self, OldWire, WireFamily, WireOption};
pub mod alternatives;
pub mod design_toml;

use crate::base::number::{counted, fmt_fixed, fmt_signed, round_sig};
use crate::design::{
    ConductorShape, Design, DesignError, EqualizerChoice, Mode, Rating, WindingType, bounds,
};
use crate::rating::scheme::{ConnectError, Scheme, connect_with_coils};
use crate::rating::{RatingReport, emf, rate_with};
use crate::winding::Winding;

/// What the rewinder asks for.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct RewindRequest {
    /// New terminal voltage, V (`--voltage`).
    pub voltage: f64,
    /// New speed, rpm (`--speed`; default the design's speed).
    pub speed_rpm: Option<f64>,
    /// New connection (`--type`; default the design's).
    pub kind: Option<WindingType>,
    /// New multiplicity (`--multiplicity`; default the design's).
    pub multiplicity: Option<u32>,
    /// A no-load test of the old machine, (volts, rpm) (`--from-test V0 N0`).
    pub from_test: Option<(f64, f64)>,
    /// Measured armature resistance, Ω, taken as at 20 °C (`--ra`).
    pub measured_r20: Option<f64>,
    /// New coils per slot u, the same slot space shared by more (or fewer) coils
    /// (`--coils-per-slot`; default the design's).
    pub coils_per_slot: Option<u32>,
}

/// Where the kept flux came from.
#[derive(Clone, Debug, PartialEq)]
pub enum FluxSource {
    /// `flux_per_pole_mwb` in the design.
    Design,
    /// Worked out from `[rating]` voltage and speed (with the drops).
    Rating,
    /// Back-solved from a no-load test: volts, rpm.
    Test(f64, f64),
}

impl FluxSource {
    /// In words.
    pub fn describe(&self) -> String {
        match self {
            FluxSource::Design => "as given in the design".to_string(),
            FluxSource::Rating => "worked out from the rated voltage and speed".to_string(),
            FluxSource::Test(v, n) => {
                format!(
                    "back-solved from the no-load test, {} V at {} rpm",
                    fmt_fixed(*v, 1),
                    fmt_fixed(*n, 0)
                )
            }
        }
    }
}

/// The bounds a rewind works within are the design file's own ([`bounds`]): the highest
/// voltage and speed it is worked out for, and the largest flux and current it writes.
pub use crate::design::bounds::{MAX_CURRENT_A, MAX_FLUX_MWB, MAX_SPEED_RPM, MAX_VOLTAGE};

/// True for a value a design file holds in a key that takes a number above 0 and at most `max`.
fn in_file_range(x: f64, max: f64) -> bool {
    x > 0.0 && x <= max
}

/// A request that cannot be met. The numbers are fields; the words, which name the command
/// line's flags, are the CLI's (the CLI exits 2).
#[derive(Clone, Debug, PartialEq)]
pub enum RewindError {
    /// The no-load test needs a positive, finite voltage and speed.
    TestNotPositive {
        /// Open-circuit volts as given.
        volts: f64,
        /// Speed as given, rpm.
        rpm: f64,
    },
    /// The new voltage is not a positive number up to [`MAX_VOLTAGE`].
    VoltageOutOfRange {
        /// As given, V.
        volts: f64,
    },
    /// The new speed is not a positive number up to [`MAX_SPEED_RPM`].
    SpeedOutOfRange {
        /// As given, rpm.
        rpm: f64,
    },
    /// The coils per slot asked for are not 1 to `max`, or give more coils than a design holds.
    CoilsPerSlotOutOfRange {
        /// As given.
        coils_per_slot: u32,
        /// The most on this armature's slots.
        max: u32,
    },
    /// The measured resistance is not a positive number.
    ResistanceNotPositive {
        /// As given, Ω.
        ohms: f64,
    },
    /// Neither the design nor a test gives the flux per pole.
    FluxUnknown,
    /// The flux per pole worked out is not a number a design file holds (above 0, at most
    /// [`MAX_FLUX_MWB`]), so it cannot be written or kept.
    FluxOutOfRange {
        /// The flux worked out, mWb (may be infinite or NaN).
        flux_mwb: f64,
        /// Where it came from.
        source: FluxSource,
    },
    /// The old machine's speed, worked out from its EMF and the flux because neither the
    /// request nor the design gives one, is not a number a design file holds (above 0, at most
    /// [`MAX_SPEED_RPM`]).
    WorkedSpeedOutOfRange {
        /// The speed worked out, rpm.
        rpm: f64,
    },
    /// The new armature current (the rated current scaled by the conductor ratio) is not a
    /// number a design file holds (above 0, at most [`MAX_CURRENT_A`]).
    CurrentOutOfRange {
        /// The current worked out, A.
        amps: f64,
    },
    /// Neither the request nor the design gives a speed.
    SpeedUnknown,
    /// The coils cannot be connected as asked.
    Connect(ConnectError),
    /// Generator: the I·R drop per conductor exceeds the EMF per conductor.
    DropExceedsEmf,
    /// The voltage does not cover the brush drop.
    BelowBrushDrop {
        /// The new voltage, V.
        volts: f64,
        /// The brush drop, V.
        brush_drop_v: f64,
    },
    /// The turns per coil round to zero on this connection.
    TurnsRoundToZero {
        /// Turns per coil before rounding.
        exact_turns: f64,
        /// The new connection.
        scheme: Scheme,
    },
    /// More turns per coil than any real coil has.
    TooManyTurns {
        /// The whole turns per coil.
        turns: f64,
        /// The most armsheet accepts.
        max: i64,
    },
    /// With whole turns the drops take the whole voltage.
    NoSpeedAtWholeTurns,
    /// The new design fails the checks every design passes ([`Design::new`]).
    Design(DesignError),
    /// A strip of the old width would be lower than twice its corner radius.
    StripTooThin {
        /// The kept strip width, mm.
        width_mm: f64,
        /// The height it would need, mm.
        height_mm: f64,
    },
}

impl From<ConnectError> for RewindError {
    fn from(e: ConnectError) -> Self {
        RewindError::Connect(e)
    }
}

/// The figures of one winding, old or new, as the rewind compares them.
#[derive(Clone, Debug, PartialEq)]
pub struct WindingFigures {
    /// The connection.
    pub scheme: Scheme,
    /// Turns per coil.
    pub turns: u32,
    /// Conductors Z = 2·C·T.
    pub conductors: u64,
    /// Terminal voltage, V.
    pub voltage: Option<f64>,
    /// Speed, rpm.
    pub speed_rpm: f64,
    /// Armature current, A.
    pub current: Option<f64>,
    /// Induced EMF, V.
    pub emf_v: f64,
    /// Conductor area, mm².
    pub area_mm2: Option<f64>,
    /// The conductor.
    pub conductor: Option<ConductorShape>,
}

/// The worked-out rewind.
#[derive(Clone, Debug, PartialEq)]
pub struct RewindPlan {
    /// The flux per pole kept, mWb.
    pub flux_mwb: f64,
    /// Where it came from.
    pub flux_source: FluxSource,
    /// The winding as it is.
    pub old: WindingFigures,
    /// The new winding.
    pub new: WindingFigures,
    /// Turns per coil before rounding.
    pub exact_turns: f64,
    /// The speed the whole turns give at the new voltage, rpm.
    pub speed_at_whole_turns: f64,
    /// (speed at whole turns − asked speed)/asked speed.
    pub speed_error: f64,
    /// Conductor area for the same current density, mm².
    pub area_needed_mm2: Option<f64>,
    /// Standard round sizes near it, up to 4 in hand.
    pub options: Vec<WireOption>,
    /// Copper per slot against the original with the exact area (1.0 = the same).
    pub fill_exact: Option<f64>,
    /// Copper per slot against the original with the chosen conductor.
    pub fill_chosen: Option<f64>,
    /// Current density with the chosen conductor, A/mm².
    pub density_a_mm2: Option<f64>,
    /// Average segment voltage of the new winding, V.
    pub segment_volts_avg: f64,
    /// Segment counts, dummy coils, equalizers, lead offset: what the rewinder must know.
    pub notes: Vec<String>,
    /// The new design.
    pub design: Design,
}

/// The flux per pole from a no-load test: the coils link Φ_l = 60·a·V0/(P·Z·N0), Wb, open
/// circuit so E = V0, and Φ = Φ_l/k with k the share of the pole flux they link.
/// A flux a design file cannot hold (above [`MAX_FLUX_MWB`], or rounding to nothing) is
/// [`RewindError::FluxOutOfRange`]: the readings are wrong (volts and rpm swapped, say).
pub fn flux_from_test(d: &Design, w: &Winding, volts: f64, rpm: f64) -> Result<f64, RewindError> {
    if !(volts > 0.0 && volts.is_finite() && rpm > 0.0 && rpm.is_finite()) {
        return Err(RewindError::TestNotPositive { volts, rpm });
    }
    let flux_wb = emf::flux_for(d.poles, w.conductors, w.paths_formula.max(1), volts, rpm)
        / w.constants.flux_linkage;
    check_flux(flux_wb, FluxSource::Test(volts, rpm))?;
    Ok(flux_wb)
}

/// `flux_wb` if a design file can hold it in mWb, else [`RewindError::FluxOutOfRange`].
fn check_flux(flux_wb: f64, source: FluxSource) -> Result<f64, RewindError> {
    let flux_mwb = flux_wb * 1000.0;
    if in_file_range(flux_mwb, MAX_FLUX_MWB) {
        Ok(flux_wb)
    } else {
        Err(RewindError::FluxOutOfRange { flux_mwb, source })
    }
}

/// The design with its flux per pole set to `flux_mwb` (for `--from-test` without `--voltage`).
pub fn with_flux(d: &Design, flux_mwb: f64) -> Result<Design, RewindError> {
    let mut n = d.spec();
    n.flux_per_pole_mwb = Some(flux_mwb);
    Design::new(n).map_err(RewindError::Design)
}

/// What a no-load (open-circuit) test of the old machine tells: the flux per pole, and the
/// design rated with it.
#[derive(Clone, Debug, PartialEq)]
pub struct NoLoadTest {
    /// Measured open-circuit voltage V0, V.
    pub volts: f64,
    /// Measured speed N0, rpm.
    pub rpm: f64,
    /// Flux per pole Φ = 60·a·V0/(P·Z·N0), mWb.
    pub flux_mwb: f64,
    /// The parallel paths a used (the textbook formula).
    pub paths: u32,
    /// The active conductors Z.
    pub conductors: u64,
    /// The flux per pole the design file gave, mWb, to compare with the test's.
    pub design_flux_mwb: Option<f64>,
    /// The design with its flux per pole set to the test's.
    pub design: Design,
    /// That design rated (with the measured 20 °C resistance when given).
    pub rated: RatingReport,
}

/// Back-solves the flux per pole from a no-load test of `d` (traced as `w`) and rates the
/// design with it; `measured_r20` replaces the calculated armature resistance.
pub fn no_load_test(
    d: &Design,
    w: &Winding,
    volts: f64,
    rpm: f64,
    measured_r20: Option<f64>,
) -> Result<NoLoadTest, RewindError> {
    let flux_mwb = flux_from_test(d, w, volts, rpm)? * 1000.0;
    let design = with_flux(d, flux_mwb)?;
    let rated = rate_with(&design, w, measured_r20);
    Ok(NoLoadTest {
        volts,
        rpm,
        flux_mwb,
        paths: w.paths_formula,
        conductors: w.conductors,
        design_flux_mwb: d.flux_per_pole_mwb,
        design,
        rated,
    })
}

/// Works out the rewind of `d` (traced as `w`) for `req`, rating the old winding afresh.
pub fn rewind(d: &Design, w: &Winding, req: &RewindRequest) -> Result<RewindPlan, RewindError> {
    rewind_rated(d, w, None, req)
}

/// Works out the rewind of `d` (traced as `w`) for `req`. `rated` is the old winding's rating
/// as already computed; it is used unless the request brings a measured resistance, which
/// changes the rating.
pub fn rewind_rated(
    d: &Design,
    w: &Winding,
    rated: Option<&RatingReport>,
    req: &RewindRequest,
) -> Result<RewindPlan, RewindError> {
    check_request(req)?;
    let u = req.coils_per_slot.unwrap_or(d.coils_per_slot);
    let most_u = (bounds::MAX_COILS / i64::from(d.slots.max(1))).min(bounds::MAX_COILS_PER_SLOT);
    if !(1..=most_u).contains(&i64::from(u)) {
        return Err(RewindError::CoilsPerSlotOutOfRange {
            coils_per_slot: u,
            max: u32::try_from(most_u).unwrap_or(0),
        });
    }
    let fresh;
    let rated: &RatingReport = match (rated, req.measured_r20) {
        (Some(r), None) => r,
        _ => {
            fresh = rate_with(d, w, req.measured_r20);
            &fresh
        }
    };
    let old = old_machine(d, w, rated, req)?;

    // The new connection.
    let kind = req.kind.unwrap_or(d.winding_type);
    let m = req.multiplicity.unwrap_or(d.multiplicity);
    // New coils per slot take new coils and a new commutator: every coil on it when the kind
    // can, else the kind's own count (the fewest dummy coils).
    let keep = if u == d.coils_per_slot {
        old.c0
    } else {
        u * d.slots
    };
    let mut conn = connect_with_coils(d, u, keep, kind, m)?;
    conn.keeps_commutator = conn.segments == old.c0;
    let new = new_turns(d, &old, &conn, req.voltage)?;
    let mut notes = Vec::new();
    let copper = new_conductor(d, rated, &old, &conn, &new, &mut notes)?;
    let design = new_design(d, &old, &conn, &new, copper.shape, req, &mut notes)?;

    let old_conn = Scheme {
        kind: d.winding_type,
        multiplicity: d.multiplicity,
        paths: old.a0,
        segments: old.c0,
        dummies: d.coil_positions() - old.c0,
        keeps_commutator: true,
    };
    Ok(RewindPlan {
        flux_mwb: old.pole_flux_wb() * 1000.0,
        flux_source: old.flux_source,
        old: WindingFigures {
            scheme: old_conn,
            turns: d.turns,
            conductors: old.z0,
            voltage: old.rating.voltage,
            speed_rpm: old.speed_rpm.unwrap_or(old.speed),
            current: old.rating.current,
            emf_v: old.emf_v,
            area_mm2: copper.area_old,
            conductor: d.conductor.as_ref().map(|k| k.shape),
        },
        new: WindingFigures {
            scheme: conn,
            turns: new.turns,
            conductors: new.z1,
            voltage: Some(req.voltage),
            speed_rpm: old.speed,
            current: new.current,
            emf_v: new.emf_v,
            area_mm2: copper.area_new,
            conductor: copper.shape,
        },
        exact_turns: new.exact_turns,
        speed_at_whole_turns: new.speed_whole,
        speed_error: new.speed_whole / old.speed - 1.0,
        area_needed_mm2: copper.area_needed,
        options: copper.options,
        fill_exact: copper.fill_exact,
        fill_chosen: copper.fill_chosen,
        density_a_mm2: copper.density,
        segment_volts_avg: new.segment_volts_avg,
        notes,
        design,
    })
}

/// The request's own numbers in range: the voltage, the speed and a measured resistance.
fn check_request(req: &RewindRequest) -> Result<(), RewindError> {
    if !(req.voltage > 0.0 && req.voltage.is_finite() && req.voltage <= MAX_VOLTAGE) {
        return Err(RewindError::VoltageOutOfRange { volts: req.voltage });
    }
    if let Some(rpm) = req.speed_rpm
        && !(rpm > 0.0 && rpm.is_finite() && rpm <= MAX_SPEED_RPM)
    {
        return Err(RewindError::SpeedOutOfRange { rpm });
    }
    if let Some(ohms) = req.measured_r20
        && !(ohms > 0.0 && ohms.is_finite())
    {
        return Err(RewindError::ResistanceNotPositive { ohms });
    }
    Ok(())
}

/// The old machine as the rewind keeps it: its paths, conductors and drops, the flux, and the
/// speed to rewind for.
struct OldMachine {
    /// Parallel paths a0.
    a0: u32,
    /// Active conductors Z0.
    z0: u64,
    /// Conductors per path x0 = Z0/a0.
    x0: f64,
    /// Active coils (segments) C0.
    c0: u32,
    /// `[rating]`, or all `None`.
    rating: Rating,
    /// I·R drop at the rated current, hot, V.
    ir: f64,
    /// Brush drop, V.
    brush_drop_v: f64,
    /// The flux the coils link, Wb: the share `linkage` of the pole flux kept (see
    /// [`crate::winding::Constants::flux_linkage`]); every EMF here is worked from it.
    flux_wb: f64,
    /// The share of the pole flux the coils link (the span is kept, so the new coils link the
    /// same share).
    linkage: f64,
    /// Where the flux came from.
    flux_source: FluxSource,
    /// The old EMF at that flux, V.
    emf_v: f64,
    /// The old speed, rpm, when known.
    speed_rpm: Option<f64>,
    /// The speed to rewind for, rpm.
    speed: f64,
}

impl OldMachine {
    /// The pole flux kept, Wb: the linked flux over the share linked.
    fn pole_flux_wb(&self) -> f64 {
        self.flux_wb / self.linkage
    }
}

/// The flux to keep, and the old machine's EMF and speed at that flux.
fn old_machine(
    d: &Design,
    w: &Winding,
    rated: &RatingReport,
    req: &RewindRequest,
) -> Result<OldMachine, RewindError> {
    let a0 = w.paths_formula.max(1);
    let z0 = w.conductors;
    let rating = d.rating.clone().unwrap_or_default();
    let r_hot = rated.resistance.as_ref().map(|r| r.hot_ohm);
    let ir = rating.current.zip(r_hot).map_or(0.0, |(i, r)| i * r);
    let brush_drop_v = rated.emf.as_ref().map_or(0.0, |e| e.brush_drop_v);
    let old_emf = rated.emf.as_ref();

    // The flux to keep, as the coils link it.
    let linkage = w.constants.flux_linkage;
    let (flux_wb, flux_source) = match (
        req.from_test,
        d.flux_per_pole_mwb,
        old_emf.and_then(|e| e.flux_needed_mwb),
    ) {
        (Some((v, n)), _, _) => (
            flux_from_test(d, w, v, n)? * linkage,
            FluxSource::Test(v, n),
        ),
        (None, Some(f), _) => (f / 1000.0 * linkage, FluxSource::Design),
        (None, None, Some(f)) => (
            check_flux(f / 1000.0, FluxSource::Rating)? * linkage,
            FluxSource::Rating,
        ),
        (None, None, None) => {
            return Err(RewindError::FluxUnknown);
        }
    };

    // The old machine's EMF and speed at that flux.
    let emf_v = match old_emf {
        Some(e) if e.basis == crate::rating::EmfBasis::Terminal => e.emf_v,
        _ => d
            .speed_rpm
            .map_or(0.0, |n| emf::emf_v(d.poles, z0, a0, flux_wb, n)),
    };
    let speed_rpm = d
        .speed_rpm
        .or_else(|| (emf_v > 0.0).then(|| emf::speed_for(d.poles, z0, a0, emf_v, flux_wb)));
    let speed = match (req.speed_rpm, d.speed_rpm, speed_rpm) {
        (Some(n), _, _) | (None, Some(n), _) => n,
        (None, None, Some(n)) if in_file_range(n, MAX_SPEED_RPM) => n,
        (None, None, Some(rpm)) => return Err(RewindError::WorkedSpeedOutOfRange { rpm }),
        (None, None, None) => return Err(RewindError::SpeedUnknown),
    };
    Ok(OldMachine {
        a0,
        z0,
        x0: z0 as f64 / f64::from(a0),
        c0: w.active_coils,
        rating,
        ir,
        brush_drop_v,
        flux_wb,
        linkage,
        flux_source,
        emf_v,
        speed_rpm,
        speed,
    })
}

/// The new winding's turns and what they give.
struct NewTurns {
    /// Turns per coil before rounding.
    exact_turns: f64,
    /// Whole turns per coil.
    turns: u32,
    /// Active conductors Z1.
    z1: u64,
    /// The speed the whole turns give at the new voltage, rpm.
    speed_whole: f64,
    /// The new current, A, when the old one is known.
    current: Option<f64>,
    /// The new EMF at that speed, V.
    emf_v: f64,
    /// The new average segment voltage E·P/C, V.
    segment_volts_avg: f64,
}

/// Conductors per path x: V = x·(P·Φ·N/60) ± IR0·x/x0 ± Vb, the I·R drop scaling with x at
/// the same current density; then whole turns per coil and the speed they give.
fn new_turns(
    d: &Design,
    old: &OldMachine,
    conn: &Scheme,
    voltage: f64,
) -> Result<NewTurns, RewindError> {
    let (vb, ir0, x0, flux_wb) = (old.brush_drop_v, old.ir, old.x0, old.flux_wb);
    let ke = f64::from(d.poles) * flux_wb * old.speed / 60.0;
    let x = match d.mode {
        Mode::Motor => (voltage - vb) / (ke + ir0 / x0),
        Mode::Generator => {
            let den = ke - ir0 / x0;
            if den <= 0.0 {
                return Err(RewindError::DropExceedsEmf);
            }
            (voltage + vb) / den
        }
    };
    if !(x > 0.0 && x.is_finite()) {
        return Err(RewindError::BelowBrushDrop {
            volts: voltage,
            brush_drop_v: vb,
        });
    }
    let a1 = conn.paths;
    let c1 = conn.segments;
    // Each element carries its own paths: a frog-leg's a is shared by its two elements, each
    // of C coils, so a path holds x = 2·C·T/(a/2) conductors.
    let elements = conn.kind.kind().element_count().max(1);
    let exact_turns = x * f64::from(a1 / elements) / (2.0 * f64::from(c1));
    let turns = exact_turns.round();
    if turns < 1.0 {
        return Err(RewindError::TurnsRoundToZero {
            exact_turns,
            scheme: *conn,
        });
    }
    if turns > bounds::MAX_TURNS as f64 {
        return Err(RewindError::TooManyTurns {
            turns,
            max: bounds::MAX_TURNS,
        });
    }
    let turns = turns as u32;
    let z1 = 2 * u64::from(c1) * u64::from(turns) * u64::from(elements);
    let x1 = z1 as f64 / f64::from(a1);
    let ir1 = ir0 * x1 / x0;
    let speed_whole = match d.mode {
        Mode::Motor => 60.0 * (voltage - vb - ir1) / (f64::from(d.poles) * flux_wb * x1),
        Mode::Generator => 60.0 * (voltage + vb + ir1) / (f64::from(d.poles) * flux_wb * x1),
    };
    if speed_whole <= 0.0 {
        return Err(RewindError::NoSpeedAtWholeTurns);
    }
    let emf_v = emf::emf_v(d.poles, z1, a1, flux_wb, speed_whole);
    Ok(NewTurns {
        exact_turns,
        turns,
        z1,
        speed_whole,
        current: old.rating.current.map(|i| i * x0 / x1),
        emf_v,
        segment_volts_avg: crate::rating::commutator::average_segment_volts(emf_v, d.poles, c1),
    })
}

/// The new conductor and the copper it puts in a slot.
struct NewConductor {
    /// The old conductor's area, mm².
    area_old: Option<f64>,
    /// The area for the same current density, mm².
    area_needed: Option<f64>,
    /// Standard round sizes near it.
    options: Vec<WireOption>,
    /// The conductor chosen.
    shape: Option<ConductorShape>,
    /// Its area, mm².
    area_new: Option<f64>,
    /// Copper per slot against the original, with the exact area.
    fill_exact: Option<f64>,
    /// Copper per slot against the original, with the chosen conductor.
    fill_chosen: Option<f64>,
    /// Current density with the chosen conductor, A/mm².
    density: Option<f64>,
}

/// Conductor: same current density, so A1·Z1 = A0·Z0.
fn new_conductor(
    d: &Design,
    rated: &RatingReport,
    old: &OldMachine,
    conn: &Scheme,
    new: &NewTurns,
    notes: &mut Vec<String>,
) -> Result<NewConductor, RewindError> {
    let area_old = rated.conductor.as_ref().map(|k| k.area_mm2);
    let area_needed = area_old.map(|a| a * old.z0 as f64 / new.z1 as f64);
    let options = area_needed.map_or_else(Vec::new, |a| conductor::nearest_sizes(a, 4));
    let shape = match (d.conductor.as_ref().map(|k| k.shape), area_needed) {
        (
            Some(ConductorShape::Rectangular {
                width_mm,
                corner_radius_mm,
                strands,
                ..
            }),
            Some(a),
        ) => Some(new_strip(width_mm, corner_radius_mm, strands, a, notes)?),
        (
            Some(ConductorShape::Round {
                diameter_mm,
                awg,
                strands,
            }),
            Some(_),
        ) => {
            let family = if awg.is_some() {
                WireFamily::Awg
            } else {
                WireFamily::Metric
            };
            let old_wire = OldWire {
                diameter_mm,
                strands,
            };
            conductor::choose_size(&options, family, Some(old_wire)).map(WireOption::shape)
        }
        _ => None,
    };
    let area_new = shape.as_ref().map(conductor::conductor_area_mm2);
    // Copper in the slots: every coil position (dummy coils too) holds T turns.
    let n1 = conn.dummies + conn.segments;
    let (t0, turns) = (
        f64::from(d.turns) * f64::from(d.coil_positions()),
        f64::from(new.turns) * f64::from(n1),
    );
    let fill = |area: Option<f64>| area.zip(area_old).map(|(an, ao)| turns * an / (t0 * ao));
    let (fill_exact, fill_chosen) = (fill(area_needed), fill(area_new));
    let density = new
        .current
        .zip(area_new)
        .map(|(i, a)| i / f64::from(conn.paths) / a);
    if let Some(f) = fill_chosen
        && f > 1.0 + conductor::SIZE_ABOVE
    {
        notes.push(format!(
                "the chosen conductor puts {} % more copper in each slot than the original: check that it fits, or take the next size down",
                fmt_fixed((f - 1.0) * 100.0, 0)
            ));
    }
    if d.conductor.is_none() {
        notes.push("no [conductor] in the design: the conductor size cannot be worked out; scale the old area by the old/new conductor ratio Z0/Z1".to_string());
    }
    Ok(NewConductor {
        area_old,
        area_needed,
        options,
        shape,
        area_new,
        fill_exact,
        fill_chosen,
        density,
    })
}

/// A strip of the old width `width_mm` with the height for `area` mm² (the same current
/// density), rounded to 0.01 mm; refused when lower than twice its corner radius.
fn new_strip(
    width_mm: f64,
    corner_radius_mm: f64,
    strands: u32,
    area: f64,
    notes: &mut Vec<String>,
) -> Result<ConductorShape, RewindError> {
    let per = area / f64::from(strands);
    let h = ((per + (4.0 - std::f64::consts::PI) * corner_radius_mm * corner_radius_mm) / width_mm
        * 100.0)
        .round()
        / 100.0;
    if h < 2.0 * corner_radius_mm || h <= 0.0 {
        return Err(RewindError::StripTooThin {
            width_mm,
            height_mm: h,
        });
    }
    notes.push(format!(
        "strip: width {} mm kept, height {} mm for the same current density; round-wire equivalents are listed too",
        fmt_fixed(width_mm, 2),
        fmt_fixed(h, 2)
    ));
    Ok(ConductorShape::Rectangular {
        width_mm,
        height_mm: h,
        corner_radius_mm,
        strands,
    })
}

/// The new design: the old one with the new connection, turns, flux, speed, rating and
/// conductor, built again by [`Design::new`]; the notes say what else had to change
/// (segments, dummy coils, equalizers, lead offset, brush sets).
fn new_design(
    d: &Design,
    old: &OldMachine,
    conn: &Scheme,
    new: &NewTurns,
    shape: Option<ConductorShape>,
    req: &RewindRequest,
    notes: &mut Vec<String>,
) -> Result<Design, RewindError> {
    let (kind, c0, c1) = (conn.kind, old.c0, conn.segments);
    // Segments and dummy coils.
    if !conn.keeps_commutator {
        let why = kind.kind().segment_rule(
            c0,
            conn.segments + conn.dummies,
            conn.multiplicity,
            d.pole_pairs(),
            d.direction,
        );
        notes.push(format!("segments: the commutator has {c0} segments, the new winding needs {c1} ({why}): fit a new commutator"));
    }
    if conn.dummies > 0 {
        notes.push(format!(
            "{}: wound for balance, ends cut back and taped, not connected",
            counted(conn.dummies, "dummy coil", "dummy coils")
        ));
    }
    let mut nd = d.spec();
    let u1 = (conn.segments + conn.dummies) / d.slots.max(1);
    if u1 != d.coils_per_slot {
        notes.push(format!(
            "coils per slot {} -> {u1}: the same slot space shared by {} a slot, the span in slots kept; new coils and, with more segments, a new commutator",
            d.coils_per_slot,
            counted(u1, "coil", "coils")
        ));
        nd.coils_per_slot = u1;
    }
    if !kind.kind().takes_equalizers() && d.equalizers != EqualizerChoice::None {
        notes.push(format!(
            "equalizers removed: {}",
            kind.kind().no_equalizers_reason()
        ));
        nd.equalizers = EqualizerChoice::None;
    }
    if i64::from(d.poles) * i64::from(d.lead_offset.0).abs() >= i64::from(c1) {
        notes.push(format!(
            "lead offset {} reset to 0: it is half a pole pitch or more on {c1} segments",
            d.lead_offset
        ));
        nd.lead_offset = crate::design::HalfBars::ZERO;
    }
    let limit = d.limits.get(crate::design::LimitId::SegmentVoltsAvgMax);
    if new.segment_volts_avg > limit {
        notes.push(format!(
            "the new average segment voltage {} V is above the {} V limit, so `check` refuses it; the rewind report offers windings that pass",
            fmt_fixed(new.segment_volts_avg, 2),
            crate::rating::limits::fmt_limit(limit)
        ));
    }
    if let Some(k) = nd.commutator.as_mut()
        && let Some(sets) = k.brush_sets
        && sets < kind.kind().fewest_brush_sets(d.poles)
    {
        notes.push(format!(
            "brush sets {sets} reset to {}: a {} winding needs one by each pole",
            d.poles,
            kind.as_str()
        ));
        k.brush_sets = None;
    }
    nd.winding_type = kind;
    nd.multiplicity = conn.multiplicity;
    nd.turns = new.turns;
    // A frog-leg keeps its wave coils' span and takes the new turns in both elements.
    nd.wave_span = d
        .wave_coils
        .map(|w| w.span)
        .filter(|_| kind.kind().element_count() > 1);
    nd.wave_turns = None;
    nd.segments = Some(c1);
    if nd.dummy_coils.is_some()
        && (c1 != c0 || u1 != d.coils_per_slot || kind.kind().uses_every_coil())
    {
        notes.push(format!(
            "dummy coils: the positions the old design names are dropped; {}",
            if kind.kind().uses_every_coil() {
                format!("a {} winding uses every coil", kind.as_str())
            } else {
                "the new count is spread evenly".to_string()
            }
        ));
        nd.dummy_coils = None;
    }
    nd.flux_per_pole_mwb = Some(old.pole_flux_wb() * 1000.0);
    nd.speed_rpm = Some(old.speed);
    let mut r = d.rating.clone().unwrap_or(Rating {
        voltage: None,
        current: None,
        thermal_class: None,
        interpoles: None,
    });
    r.voltage = Some(req.voltage);
    r.current = new.current.map(|i| round_sig(i, 4));
    if let Some(amps) = r.current
        && !in_file_range(amps, MAX_CURRENT_A)
    {
        return Err(RewindError::CurrentOutOfRange { amps });
    }
    nd.rating = Some(r);
    if let (Some(k), Some(shape)) = (nd.conductor.as_mut(), shape) {
        k.shape = shape;
    }
    Design::new(nd).map_err(RewindError::Design)
}

impl RewindPlan {
    /// The comment header of the new design file: what changed and why.
    pub fn header(&self, old_file: &str, command: &str) -> Vec<String> {
        let (o, n) = (&self.old, &self.new);
        let mut h = vec![
            format!("armsheet rewind of {old_file}"),
            format!("asked: {command}"),
            if o.scheme.segments + o.scheme.dummies == n.scheme.segments + n.scheme.dummies {
                "kept: the core, the slots and coils per slot, the span, the flux per pole and the slot space"
            } else {
                "kept: the core, the slots, the span, the flux per pole and the slot space"
            }
            .to_string(),
            format!(
                "flux per pole {} mWb, {}",
                fmt_fixed(self.flux_mwb, 4),
                self.flux_source.describe()
            ),
        ];
        let v = |x: Option<f64>| {
            x.map_or("(not given)".to_string(), |v| {
                format!("{} V", fmt_fixed(v, 1))
            })
        };
        h.push(format!("voltage: {} -> {}", v(o.voltage), v(n.voltage)));
        h.push(format!(
            "speed: {} rpm -> {} rpm",
            fmt_fixed(o.speed_rpm, 0),
            fmt_fixed(n.speed_rpm, 0)
        ));
        h.push(format!(
            "connection: {} -> {}",
            o.scheme.label(),
            n.scheme.label()
        ));
        h.push(format!(
            "turns per coil: {} -> {} ({} exact, from the EMF ratio and the new paths and segments)",
            o.turns,
            n.turns,
            fmt_fixed(self.exact_turns, 3)
        ));
        h.push(format!(
            "whole turns give {} rpm at {}: {} % against {} rpm",
            fmt_fixed(self.speed_at_whole_turns, 0),
            v(n.voltage),
            fmt_signed(self.speed_error * 100.0, 2),
            fmt_fixed(n.speed_rpm, 0)
        ));
        if let (Some(oc), Some(nc), Some(need)) = (&o.conductor, &n.conductor, self.area_needed_mm2)
        {
            h.push(format!(
                "conductor: {} -> {} ({} needed for the same current density, {} chosen)",
                conductor::describe(oc, self.design.units),
                conductor::describe(nc, self.design.units),
                self.design.units.wire_area(need),
                self.design
                    .units
                    .wire_area(conductor::conductor_area_mm2(nc))
            ));
        }
        if let Some(i) = n.current {
            h.push(format!(
                "current: {} A -> {} A (same power, same copper)",
                fmt_fixed(o.current.unwrap_or(0.0), 2),
                fmt_fixed(i, 2)
            ));
        }
        if let Some(f) = self.fill_chosen {
            h.push(format!(
                "slot fill: copper per slot {} % of the original",
                fmt_fixed(f * 100.0, 1)
            ));
        }
        for note in &self.notes {
            h.push(note.clone());
        }
        h.push("before service: check the new file with `armsheet check`, verify against the old winding, and run the".to_string());
        h.push("insulation-resistance and withstand tests per the applicable standard; local codes and licensed practice govern".to_string());
        h
    }

    /// The new design file: the header as comments, then the design.
    pub fn design_file(&self, old_file: &str, command: &str) -> String {
        design_toml::write_design(&self.design, &self.header(old_file, command))
    }
}
