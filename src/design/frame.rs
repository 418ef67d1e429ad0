//! `parse_frame`: a frame file (the iron, the commutator and the rating a designer searches
//! windings for, `armsheet explore`) → a validated [`Frame`], or every located
//! [`Diagnostic`] found.
//!
//! Part of the `design` stage: no I/O, the CLI hands the text in. A frame is read with the
//! design file's own table readers, so its errors are located the same way. Its tables:
//! - `[job]`, as in a design file (optional);
//! - `[armature]`: `poles` (required, even), `slots` (required: one count or a list of
//!   counts, each 2 to [`bounds::MAX_SLOTS`]), `rotation`, `pole_arc`, as in a design file;
//! - `[rating]` (required): `voltage`, `current`, `speed_rpm` and `flux_per_pole_mwb`
//!   (all required here: the turns follow from them), `mode`, `thermal_class`;
//! - `[core]` (required: `diameter_mm` and `length_mm` give the mean turn) and
//!   `[commutator]` (optional), as in a design file;
//! - `[limits]`, as in a design file;
//! - `[search]` (optional), the space searched, every key with a default:
//!   - `kinds`: the winding kinds, `["lap", "wave", "frog-leg"]` (default all three);
//!   - `multiplicity_max`: 1 to [`bounds::MAX_MULTIPLICITY`] (default 1);
//!   - `coils_per_slot_from`, `coils_per_slot_to`: 1 to [`bounds::MAX_COILS_PER_SLOT`]
//!     (default 1 and 3);
//!   - `segments`: a list of the segment counts allowed (default every workable count with at
//!     most `dummy_coils_max` dummy coils); or `bar_pitch_min_mm` and `bar_pitch_max_mm`, the
//!     range of the commutator bar pitch π·D_c/C (needs `[commutator] diameter_mm`);
//!   - `dummy_coils_max`: 0 to 16 (default 2);
//!   - `span_slack`: slots either side of the pole pitch S/P the span may take, 0 to 8
//!     (default 1);
//!   - `conductor`: `"r20"` (metric R20 nominal diameters, the default), `"awg"`, or
//!     `"rectangular"` with `strip_widths_mm` and `strip_heights_mm` (lists) and
//!     `corner_radius_mm` (default 0);
//!   - `strands_max`: 1 to 16 (default 4);
//!   - `slot_area_mm2` (the area a slot offers the copper) and `fill_max` (bare copper over
//!     slot area, above 0 and at most 1, default 0.4);
//!   - `speed_tolerance`: how far the speed the whole turns give may stray from the rated
//!     speed, a fraction above 0 and at most 0.5 (default 0.05);
//!   - `mean_turn_mm`: the mean length of one turn (default estimated from `[core]` for each
//!     span, as for a design).

use crate::design::{ConductorShape, Design};
use toml::de::{DeTable, DeValue};

use super::Diagnostic;
use super::diagnostic::Diagnostics;
use super::limits::Limits;
use super::model::{Commutator, Core, Job, Mode, Rating, Rotation, WindingType, bounds};
use super::parse::{expect_table, missing_table, open_document, read_all, tables, utf8};
use super::reader::{Found, Source, TableReader, nearest};
use super::tables::{armature, commutator, core, job, limits, rating};
use crate::base::visible::{ECHO_WIDTH, clip};

/// The tables a frame may hold.
const FRAME_TABLES: &[&str] = &[
    "job",
    "armature",
    "rating",
    "core",
    "commutator",
    "limits",
    "search",
];

/// The keys of a frame's `[armature]`.
const ARMATURE_KEYS: &[&str] = &["poles", "slots", "rotation", "pole_arc"];

/// The keys of `[search]`.
pub const SEARCH_KEYS: &[&str] = &[
    "kinds",
    "multiplicity_max",
    "coils_per_slot_from",
    "coils_per_slot_to",
    "segments",
    "bar_pitch_min_mm",
    "bar_pitch_max_mm",
    "dummy_coils_max",
    "span_slack",
    "conductor",
    "strip_widths_mm",
    "strip_heights_mm",
    "corner_radius_mm",
    "strands_max",
    "slot_area_mm2",
    "fill_max",
    "speed_tolerance",
    "mean_turn_mm",
];

/// The conductor sizes searched.
#[derive(Clone, Debug, PartialEq)]
pub enum ConductorFamily {
    /// Metric round wire, the R20 nominal diameters.
    R20,
    /// Round wire by AWG gauge.
    Awg,
    /// Rectangular strip: every width with every height, one corner radius.
    Rectangular {
        /// Widths, mm.
        widths_mm: Vec<f64>,
        /// Heights, mm.
        heights_mm: Vec<f64>,
        /// Corner radius, mm.
        corner_radius_mm: f64,
    },
}

impl ConductorFamily {
    /// The `[search] conductor` word.
    pub fn as_str(&self) -> &'static str {
        match self {
            ConductorFamily::R20 => "r20",
            ConductorFamily::Awg => "awg",
            ConductorFamily::Rectangular { .. } => "rectangular",
        }
    }
}

/// The segment counts searched.
#[derive(Clone, Debug, PartialEq)]
pub enum SegmentChoice {
    /// Every workable count with at most `dummy_coils_max` dummy coils.
    Workable,
    /// Only these counts.
    List(Vec<u32>),
    /// Counts whose bar pitch π·D_c/C lies in this range, mm.
    BarPitch {
        /// Least bar pitch, mm.
        min_mm: f64,
        /// Greatest bar pitch, mm.
        max_mm: f64,
    },
}

/// `[search]`, defaults filled in (see the module doc).
#[derive(Clone, Debug, PartialEq)]
pub struct Search {
    /// The kinds allowed, in design-file order.
    pub kinds: Vec<WindingType>,
    /// Multiplicity 1 to this.
    pub multiplicity_max: u32,
    /// Coils per slot, from and to.
    pub coils_per_slot: (u32, u32),
    /// The segment counts.
    pub segments: SegmentChoice,
    /// The most dummy coils.
    pub dummy_coils_max: u32,
    /// Slots either side of the pole pitch.
    pub span_slack: u32,
    /// The conductor family.
    pub conductor: ConductorFamily,
    /// Strands in hand, 1 to this.
    pub strands_max: u32,
    /// The slot area for copper, mm², when known.
    pub slot_area_mm2: Option<f64>,
    /// The most bare copper over slot area.
    pub fill_max: f64,
    /// The speed's tolerance, a fraction.
    pub speed_tolerance: f64,
    /// The mean turn, mm, when given.
    pub mean_turn_mm: Option<f64>,
}

impl Default for Search {
    fn default() -> Self {
        Search {
            kinds: WindingType::ALL.to_vec(),
            multiplicity_max: 1,
            coils_per_slot: (1, 3),
            segments: SegmentChoice::Workable,
            dummy_coils_max: 2,
            span_slack: 1,
            conductor: ConductorFamily::R20,
            strands_max: 4,
            slot_area_mm2: None,
            fill_max: 0.4,
            speed_tolerance: 0.05,
            mean_turn_mm: None,
        }
    }
}

/// A frame, validated.
#[derive(Clone, Debug, PartialEq)]
pub struct Frame {
    /// The frame file's name as given.
    pub file_name: String,
    /// `[job]`.
    pub job: Job,
    /// `poles`.
    pub poles: u32,
    /// `slots`: the counts searched, ascending, each once.
    pub slots: Vec<u32>,
    /// `rotation`.
    pub rotation: Option<Rotation>,
    /// `pole_arc`.
    pub pole_arc: Option<f64>,
    /// `[rating]` voltage, current, thermal class.
    pub rating: Rating,
    /// `speed_rpm`.
    pub speed_rpm: f64,
    /// `flux_per_pole_mwb`.
    pub flux_per_pole_mwb: f64,
    /// `mode`.
    pub mode: Mode,
    /// `[core]`.
    pub core: Core,
    /// `[commutator]`.
    pub commutator: Option<Commutator>,
    /// `[limits]`.
    pub limits: Limits,
    /// `[search]`.
    pub search: Search,
    /// The frame's length system: a pick is written in it.
    pub units: crate::base::Units,
}

/// Parses raw bytes: checks UTF-8 first.
pub fn parse_frame_bytes(bytes: &[u8], file: &str) -> Result<Frame, Diagnostics> {
    parse_frame(utf8(bytes, file, "frame")?, file)
}

/// Parses and validates a frame held in `text`; `file` names it in diagnostics.
pub fn parse_frame(text: &str, file: &str) -> Result<Frame, Diagnostics> {
    read_all(text, file, "frame", |found| read_frame(text, file, found))
}

fn read_frame(text: &str, file: &str, found: &Found) -> Result<Option<Frame>, Diagnostic> {
    let (src, root) = open_document(
        Source::new(file, text, found),
        (
            "the frame file is empty: expected [armature], [rating] and [core] tables",
            "run `armsheet new --frame frame.toml` to write a commented starter frame",
        ),
        check_tables,
    )?;
    let empty = DeTable::default();
    let table = tables(src, root.get_ref(), &empty);
    let missing_table = |name: &str, example: &str| missing_table(&src, name, example);
    let job = table("job").map_or_else(Job::default, |t| job::read(&t));
    let arm = table("armature")
        .ok_or_else(|| missing_table("armature", "poles = 4\n    slots = [36, 37]"))?;
    let rat = table("rating").ok_or_else(|| {
        missing_table(
            "rating",
            "voltage = 220\n    current = 85\n    speed_rpm = 1150\n    flux_per_pole_mwb = 12",
        )
    })?;
    let core_t = table("core")
        .ok_or_else(|| missing_table("core", "diameter_mm = 190\n    length_mm = 160"))?;

    let arm_keys = src.keep(arm.deny_unknown(ARMATURE_KEYS));
    let poles = arm.keep(armature::read_poles(&arm));
    let slots = arm.keep(read_slots(&arm));
    let rotation = armature::read_rotation(&arm);
    let pole_arc = armature::read_pole_arc(&arm);
    // No `[winding]` in a frame: the flux and speed are read from `[rating]` alone.
    let no_winding = TableReader {
        src,
        name: "winding",
        table: &empty,
        span: 0..0,
    };
    let r = src.keep(rating::read(&src, &no_winding, Some(&rat)));
    let core = core::read(&core_t);
    let commutator = table("commutator").map(|t| commutator::read(&t, None));
    let limits = table("limits").map(|t| src.keep(limits::read(&t)));
    let search = table("search").map(|t| read_search(&t));
    let r = r.and_then(|r| src.keep(required_rating(&rat, r)));
    let core = core.and_then(|c| src.keep(required_core(&core_t, c)));
    if found.any() {
        return Ok(None);
    }
    let (Some(()), Some(poles), Some(slots), Some(r), Some(core)) =
        (arm_keys, poles, slots, r, core)
    else {
        return Ok(None);
    };
    let search = match search {
        Some(Some(s)) => s,
        Some(None) => return Ok(None),
        None => Search::default(),
    };
    let commutator = commutator.flatten();
    pitch_needs_diameter(&src, table("search").as_ref(), &search, commutator.as_ref())?;
    Ok(Some(Frame {
        file_name: file.to_string(),
        units: src.units,
        job,
        poles: poles.value as u32,
        slots,
        rotation,
        pole_arc,
        rating: r.0,
        speed_rpm: r.1,
        flux_per_pole_mwb: r.2,
        mode: r.3,
        core,
        commutator,
        limits: limits.flatten().unwrap_or_default(),
        search,
    }))
}

/// The rating a search needs: voltage, current, speed and flux.
fn required_rating(
    t: &TableReader<'_, '_>,
    r: rating::RatingTable,
) -> Result<(Rating, f64, f64, Mode), Diagnostic> {
    let rating = r.rating.unwrap_or_default();
    if rating.voltage.is_none() {
        return Err(t.missing(
            "voltage",
            "the rated terminal voltage in V",
            "voltage = 220",
        ));
    }
    if rating.current.is_none() {
        return Err(t.missing("current", "the rated armature current in A", "current = 85"));
    }
    let speed = r
        .speed_rpm
        .ok_or_else(|| t.missing("speed_rpm", "the rated speed in rpm", "speed_rpm = 1150"))?;
    let flux = r.flux_per_pole_mwb.ok_or_else(|| {
        t.missing(
            "flux_per_pole_mwb",
            "the flux per pole in mWb the field gives (the turns follow from it)",
            "flux_per_pole_mwb = 12",
        )
    })?;
    Ok((rating, speed, flux, r.mode))
}

/// The core sizes the mean turn needs.
fn required_core(t: &TableReader<'_, '_>, c: Core) -> Result<Core, Diagnostic> {
    if c.diameter_mm.is_none() {
        return Err(t.missing(
            "diameter_mm",
            "the armature diameter in mm",
            "diameter_mm = 190",
        ));
    }
    if c.length_mm.is_none() {
        return Err(t.missing("length_mm", "the core length in mm", "length_mm = 160"));
    }
    Ok(c)
}

/// `slots`: one count or a list of counts.
fn read_slots(arm: &TableReader<'_, '_>) -> Result<Vec<u32>, Diagnostic> {
    let what = "the number of armature slots";
    let v = arm.raw("slots").ok_or_else(|| {
        arm.missing(
            "slots",
            "the number of armature slots, or a list",
            "slots = [36, 37]",
        )
    })?;
    let mut out: Vec<u32> = match v.get_ref() {
        DeValue::Array(items) if items.is_empty() => {
            return Err(arm
                .src
                .error(
                    v.span(),
                    arm.dotted("slots"),
                    "the list of slot counts is empty",
                )
                .with_hint("write e.g. `slots = [36, 37]` or `slots = 36`"));
        }
        DeValue::Array(_) => arm
            .ints("slots", v, 2..=bounds::MAX_SLOTS, what, "[36, 37]")?
            .into_iter()
            .map(|s| s as u32)
            .collect(),
        _ => vec![
            arm.int(
                "slots",
                2..=bounds::MAX_SLOTS,
                what,
                "count the slots on the stripped core, or list the counts to search",
            )?
            .map_or(0, |a| a.value as u32),
        ],
    };
    out.sort_unstable();
    out.dedup();
    Ok(out)
}

/// The whole-number keys of `[search]`: key, least, most, what, hint.
const INT_KEYS: [(&str, i64, i64, &str, &str); 6] = [
    (
        "multiplicity_max",
        1,
        bounds::MAX_MULTIPLICITY,
        "the highest multiplicity searched",
        "1 for simplex windings only, 2 for duplex as well",
    ),
    (
        "coils_per_slot_from",
        1,
        bounds::MAX_COILS_PER_SLOT,
        "the fewest coils per slot searched",
        "1 for one coil side per layer",
    ),
    (
        "coils_per_slot_to",
        1,
        bounds::MAX_COILS_PER_SLOT,
        "the most coils per slot searched",
        "3 is usual for small machines",
    ),
    (
        "dummy_coils_max",
        0,
        16,
        "the most dummy coils",
        "wave windings may leave one or two coils unconnected",
    ),
    (
        "span_slack",
        0,
        8,
        "the slots either side of the pole pitch the span may take",
        "1 tries the spans next to the pole pitch",
    ),
    (
        "strands_max",
        1,
        16,
        "the most strands in hand",
        "4 is usual for round wire",
    ),
];

/// Reads `[search]`, recording every problem; `None` when any is in error.
fn read_search(t: &TableReader<'_, '_>) -> Option<Search> {
    t.keep(t.deny_unknown(SEARCH_KEYS))?;
    let d = Search::default();
    let int = |k: &str, range: std::ops::RangeInclusive<i64>, what: &str, hint: &str| {
        t.keep(t.int(k, range, what, hint))
            .map(|v| v.map(|a| a.value as u32))
    };
    let num = |k: &str, max: f64, what: &str| {
        t.keep(t.number(k, 0.0, true, max, what))
            .map(|v| v.map(|a| a.value))
    };
    let kinds = t.keep(read_kinds(t));
    let [m, u_from, u_to, dummies, slack, strands] =
        INT_KEYS.map(|(k, lo, hi, what, hint)| int(k, lo..=hi, what, hint));
    let segs = t.raw("segments").map(|v| {
        t.keep(t.ints(
            "segments",
            v,
            2..=bounds::MAX_COILS,
            "the segment counts allowed",
            "[72, 73]",
        ))
    });
    let pmin = num("bar_pitch_min_mm", 1000.0, "the least bar pitch in mm");
    let pmax = num("bar_pitch_max_mm", 1000.0, "the greatest bar pitch in mm");
    let family = t.keep(t.choice("conductor", &["r20", "awg", "rectangular"]));
    let ws = t
        .raw("strip_widths_mm")
        .map(|v| t.keep(numbers(t, "strip_widths_mm", v)));
    let hs = t
        .raw("strip_heights_mm")
        .map(|v| t.keep(numbers(t, "strip_heights_mm", v)));
    let radius = t
        .keep(t.number(
            "corner_radius_mm",
            0.0,
            false,
            10.0,
            "the strip corner radius in mm",
        ))
        .map(|v| v.map(|a| a.value));
    let area = num(
        "slot_area_mm2",
        100_000.0,
        "the slot area for copper in mm2",
    );
    let fill = t
        .keep(t.number(
            "fill_max",
            0.0,
            true,
            1.0,
            "the most bare copper over slot area",
        ))
        .map(|v| v.map(|a| a.value));
    let tol = t
        .keep(t.number(
            "speed_tolerance",
            0.0,
            true,
            0.5,
            "the speed's tolerance as a fraction of the rated speed",
        ))
        .map(|v| v.map(|a| a.value));
    let mean_turn = num(
        "mean_turn_mm",
        100_000.0,
        "the mean length of one turn in mm",
    );
    let (kinds, m, u_from, u_to, pmin, pmax, dummies, slack, family) = (
        kinds?, m?, u_from?, u_to?, pmin?, pmax?, dummies?, slack?, family?,
    );
    let (radius, strands, area, fill, tol, mean_turn) =
        (radius?, strands?, area?, fill?, tol?, mean_turn?);
    let (segs, ws, hs) = (given(segs)?, given(ws)?, given(hs)?);
    let u = t.keep(coils_per_slot(t, u_from, u_to))?;
    let segments = t.keep(segment_choice(t, segs, pmin, pmax))?;
    let conductor = t.keep(conductor_family(t, family.map(|f| f.value), ws, hs, radius))?;
    Some(Search {
        kinds: kinds.unwrap_or(d.kinds),
        multiplicity_max: m.unwrap_or(d.multiplicity_max),
        coils_per_slot: u,
        segments,
        dummy_coils_max: dummies.unwrap_or(d.dummy_coils_max),
        span_slack: slack.unwrap_or(d.span_slack),
        conductor,
        strands_max: strands.unwrap_or(d.strands_max),
        slot_area_mm2: area,
        fill_max: fill.unwrap_or(d.fill_max),
        speed_tolerance: tol.unwrap_or(d.speed_tolerance),
        mean_turn_mm: mean_turn,
    })
}

/// `kinds`: a list of kind words.
fn read_kinds(t: &TableReader<'_, '_>) -> Result<Option<Vec<WindingType>>, Diagnostic> {
    let Some(v) = t.raw("kinds") else {
        return Ok(None);
    };
    let words: Vec<&str> = WindingType::ALL.iter().map(|k| k.as_str()).collect();
    let DeValue::Array(items) = v.get_ref() else {
        return Err(t
            .src
            .error(
                v.span(),
                "search.kinds",
                format!(
                    "expected a list of winding kinds, found {}",
                    v.get_ref().type_str()
                ),
            )
            .with_hint("write e.g. `kinds = [\"lap\", \"wave\"]`"));
    };
    let mut out = Vec::new();
    for i in items {
        let word = match i.get_ref() {
            DeValue::String(s) => s.to_ascii_lowercase(),
            other => other.type_str().to_string(),
        };
        match WindingType::from_word(&word) {
            Some(k) => out.push(k),
            None => {
                let d = t.src.error(
                    i.span(),
                    "search.kinds",
                    format!(
                        "expected \"lap\", \"wave\" or \"frog-leg\", found \"{}\"",
                        clip(&word, ECHO_WIDTH)
                    ),
                );
                return Err(match nearest(&word, &words) {
                    Some(n) => d.with_hint(format!("did you mean \"{n}\"?")),
                    None => d.with_hint("kinds takes a list of \"lap\", \"wave\", \"frog-leg\""),
                });
            }
        }
    }
    if out.is_empty() {
        return Err(t
            .src
            .error(v.span(), "search.kinds", "the list of winding kinds is empty")
            .with_hint("write e.g. `kinds = [\"lap\", \"wave\"]`, or leave the key out to search all three"));
    }
    out.sort();
    out.dedup();
    Ok(Some(out))
}

/// A list of sizes in mm, each above 0 and at most 100.
fn numbers(
    t: &TableReader<'_, '_>,
    key: &str,
    v: &toml::Spanned<DeValue<'_>>,
) -> Result<Vec<f64>, Diagnostic> {
    let bad = |span: std::ops::Range<usize>, found: &str| {
        t.src
            .error(
                span,
                format!("search.{key}"),
                format!(
                    "expected a list of sizes in mm, each above 0 and at most 100, found {found}"
                ),
            )
            .with_hint(format!("write e.g. `{key} = [5.6, 6.3]`"))
    };
    let DeValue::Array(items) = v.get_ref() else {
        return Err(bad(v.span(), v.get_ref().type_str()));
    };
    if items.is_empty() {
        return Err(bad(v.span(), "an empty list"));
    }
    items
        .iter()
        .map(|i| {
            let x = match i.get_ref() {
                DeValue::Integer(n) => i64::from_str_radix(n.as_str(), n.radix())
                    .ok()
                    .map(|n| n as f64),
                DeValue::Float(f) => f.as_str().replace('_', "").parse::<f64>().ok(),
                _ => None,
            };
            x.filter(|x| x.is_finite() && *x > 0.0 && *x <= 100.0)
                .ok_or_else(|| bad(i.span(), &clip(&shown_value(i.get_ref()), ECHO_WIDTH)))
        })
        .collect()
}

/// The top level of a frame: only the tables of [`FRAME_TABLES`], each a table.
fn check_tables(src: &Source<'_>, root_table: &DeTable<'_>) -> Result<(), Diagnostic> {
    for (k, v) in root_table.iter() {
        let word: &str = k.get_ref();
        if !FRAME_TABLES.contains(&word) {
            let d = src.error(
                k.span(),
                word,
                format!(
                    "unknown table or key `{}` at the top level of a frame",
                    clip(word, ECHO_WIDTH)
                ),
            );
            return Err(match (word, nearest(word, FRAME_TABLES)) {
                ("winding" | "conductor", _) => d.with_hint(
                    "a frame leaves the winding and the conductor to the search: narrow them in [search]",
                ),
                (_, Some(n)) => d.with_hint(format!("did you mean [{n}]?")),
                (_, None) => d.with_hint(format!(
                    "a frame holds the tables {}",
                    FRAME_TABLES.iter().map(|t| format!("[{t}]")).collect::<Vec<_>>().join(", ")
                )),
            });
        }
        expect_table(src, word, v)?;
    }
    Ok(())
}

/// A value as a message shows it: a number as written, anything else by its type.
fn shown_value(v: &DeValue<'_>) -> String {
    match v {
        DeValue::Integer(i) => i.to_string(),
        DeValue::Float(f) => f.to_string(),
        other => other.type_str().to_string(),
    }
}

/// The segment counts: a list, a bar pitch range, or every workable count.
fn segment_choice(
    t: &TableReader<'_, '_>,
    segs: Option<Vec<i64>>,
    pmin: Option<f64>,
    pmax: Option<f64>,
) -> Result<SegmentChoice, Diagnostic> {
    Ok(match (segs, pmin, pmax) {
        (Some(list), None, None) => {
            let mut list: Vec<u32> = list.into_iter().map(|c| c as u32).collect();
            list.sort_unstable();
            list.dedup();
            SegmentChoice::List(list)
        }
        (None, None, None) => SegmentChoice::Workable,
        (None, Some(lo), Some(hi)) if lo <= hi => SegmentChoice::BarPitch {
            min_mm: lo,
            max_mm: hi,
        },
        (None, Some(_), Some(_)) => {
            let at = t
                .raw("bar_pitch_max_mm")
                .map_or(t.span.clone(), |v| v.span());
            return Err(t
                .src
                .error(
                    at,
                    "search.bar_pitch_max_mm",
                    "the greatest bar pitch is below the least",
                )
                .with_hint("give bar_pitch_max_mm at least bar_pitch_min_mm"));
        }
        (None, Some(_), None) | (None, None, Some(_)) => {
            let (have, want) = if pmin.is_some() {
                ("bar_pitch_min_mm", "bar_pitch_max_mm")
            } else {
                ("bar_pitch_max_mm", "bar_pitch_min_mm")
            };
            let at = t.raw(have).map_or(t.span.clone(), |v| v.span());
            return Err(t
                .src
                .error(
                    at,
                    format!("search.{have}"),
                    format!("a bar pitch range needs both ends: {want} is missing"),
                )
                .with_hint("give bar_pitch_min_mm and bar_pitch_max_mm together"));
        }
        (Some(_), _, _) => {
            let at = t.raw("segments").map_or(t.span.clone(), |v| v.span());
            return Err(t
                .src
                .error(
                    at,
                    "search.segments",
                    "give the segment counts either as a list or as a bar pitch range, not both",
                )
                .with_hint("remove segments, or bar_pitch_min_mm and bar_pitch_max_mm"));
        }
    })
}

/// The conductor family, with the strip sides for rectangular.
fn conductor_family(
    t: &TableReader<'_, '_>,
    family: Option<&'static str>,
    ws: Option<Vec<f64>>,
    hs: Option<Vec<f64>>,
    radius: Option<f64>,
) -> Result<ConductorFamily, Diagnostic> {
    Ok(match family {
        Some("rectangular") => {
            let (Some(ws), Some(hs)) = (ws, hs) else {
                let key = if t.raw("strip_widths_mm").is_none() {
                    "strip_widths_mm"
                } else {
                    "strip_heights_mm"
                };
                let example = if key == "strip_widths_mm" {
                    "strip_widths_mm = [5.6, 6.3]"
                } else {
                    "strip_heights_mm = [1.8, 2.0]"
                };
                return Err(t.missing(key, "the strip sides in mm to search, a list", example));
            };
            let r = radius.unwrap_or(0.0);
            let smallest = ws.iter().chain(&hs).fold(f64::INFINITY, |a, &b| a.min(b));
            if 2.0 * r > smallest {
                let at = t
                    .raw("corner_radius_mm")
                    .map_or(t.span.clone(), |v| v.span());
                return Err(t.src
                        .error(at, "search.corner_radius_mm", format!("a corner radius of {r} mm does not fit the smallest side, {smallest} mm"))
                        .with_hint("the radius is at most half the smaller side"),
                );
            }
            ConductorFamily::Rectangular {
                widths_mm: ws,
                heights_mm: hs,
                corner_radius_mm: r,
            }
        }
        Some("awg") => ConductorFamily::Awg,
        _ => ConductorFamily::R20,
    })
}

/// A bar pitch range needs the commutator's diameter.
fn pitch_needs_diameter(
    src: &Source<'_>,
    t: Option<&TableReader<'_, '_>>,
    search: &Search,
    commutator: Option<&Commutator>,
) -> Result<(), Diagnostic> {
    if let SegmentChoice::BarPitch { .. } = search.segments
        && commutator.as_ref().and_then(|k| k.diameter_mm).is_none()
    {
        let at = t
            .and_then(|t| {
                t.raw("bar_pitch_min_mm")
                    .or_else(|| t.raw("bar_pitch_max_mm"))
            })
            .map_or(0..0, |v| v.span());
        return Err(src
            .error(
                at,
                "search.bar_pitch_min_mm",
                "a bar pitch range needs the commutator diameter: [commutator] diameter_mm is missing",
            )
            .with_hint("add diameter_mm to [commutator], or list the segment counts with `segments = [...]`"));
    }
    Ok(())
}

/// Coils per slot from and to, defaults filled in, from at most to.
fn coils_per_slot(
    t: &TableReader<'_, '_>,
    from: Option<u32>,
    to: Option<u32>,
) -> Result<(u32, u32), Diagnostic> {
    let d = Search::default().coils_per_slot;
    let u = (
        from.unwrap_or(d.0),
        to.unwrap_or(d.1.max(from.unwrap_or(1))),
    );
    if u.1 < u.0 {
        let at = t
            .raw("coils_per_slot_to")
            .map_or(t.span.clone(), |v| v.span());
        return Err(t
            .src
            .error(
                at,
                "search.coils_per_slot_to",
                format!("coils per slot to {} is below from {}", u.1, u.0),
            )
            .with_hint("give coils_per_slot_to at least coils_per_slot_from"));
    }
    Ok(u)
}

/// A key read when present: `Some(None)` when absent, `None` when in error.
fn given<T>(x: Option<Option<T>>) -> Option<Option<T>> {
    match x {
        None => Some(None),
        Some(v) => v.map(Some),
    }
}

/// The frame of `d`'s own core, for a search of what else it could carry: the same poles,
/// slots, core, commutator size, limits and conductor family, rated at `voltage`, `current`
/// and `speed_rpm` with `flux_mwb` per pole; kinds, coils per slot and every workable segment
/// count free, multiplicity up to 2. `None` without the core's diameter and length (the
/// search needs them).
pub fn frame_of_design(
    d: &Design,
    voltage: f64,
    current: f64,
    speed_rpm: f64,
    flux_mwb: f64,
) -> Option<Frame> {
    let core = d.core.clone()?;
    core.diameter_mm?;
    core.length_mm?;
    let conductor = match d.conductor.as_ref().map(|c| &c.shape) {
        Some(ConductorShape::Round { awg: Some(_), .. }) => ConductorFamily::Awg,
        Some(&ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            ..
        }) => ConductorFamily::Rectangular {
            widths_mm: vec![width_mm],
            heights_mm: vec![height_mm],
            corner_radius_mm,
        },
        _ => ConductorFamily::R20,
    };
    let rating = Rating {
        voltage: Some(voltage),
        current: Some(current),
        ..d.rating.clone().unwrap_or_default()
    };
    Some(Frame {
        file_name: String::new(),
        job: d.job.clone(),
        poles: d.poles,
        slots: vec![d.slots],
        rotation: Some(d.rotation),
        pole_arc: Some(d.pole_arc),
        rating,
        speed_rpm,
        flux_per_pole_mwb: flux_mwb,
        mode: d.mode,
        core,
        commutator: d.commutator.clone(),
        limits: d.limits.clone(),
        units: d.units,
        search: Search {
            multiplicity_max: 2,
            coils_per_slot: (1, d.coils_per_slot.max(3)),
            conductor,
            mean_turn_mm: d.conductor.as_ref().and_then(|c| c.mean_turn_mm),
            ..Search::default()
        },
    })
}
