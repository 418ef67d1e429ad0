//! The `check --json` object. Key names listed in the README are fixed; more may be added.
//!
//! Part of the `render` stage: typed views that borrow from [`Checked`] and serialize straight
//! to a writer, no value tree in between. The fields of every view are declared in sorted
//! order, so the keys come out sorted (the order the format has always had); every float is
//! rounded with [`round_to`], so the same design gives the same bytes.

use std::io::{self, Write};

use serde::{Serialize, Serializer};

use crate::base::Finding;
use crate::base::number::round_to;
use crate::checks::Checked;
use crate::design::{HalfBars, Job, SpanSource};
use crate::theory::words::span_shop;
use crate::winding::{
    BrushSet, ClosedWinding, Connection, EqualizerPlan, Equalizers, LeadSwing, ParallelPath,
    PathBalance,
};

use super::rating_json::RatingJson;

/// Writes the report as pretty-printed JSON (two-space indent) with a final newline.
pub fn write_report_json<W: Write>(r: &Checked, mut out: W) -> io::Result<()> {
    let mut ser = serde_json::Serializer::with_formatter(&mut out, Pretty::default());
    ReportJson::new(r).serialize(&mut ser)?;
    out.write_all(b"\n")
}

/// Writes `value` pretty-printed (two-space indent) with the keys of every object sorted, as
/// every JSON armsheet writes has them, without a final newline: the one writer of the
/// smaller JSON objects (the `check` report, large on big armatures, is streamed from views
/// declared in sorted order instead).
pub fn write_sorted<W: Write, T: Serialize + ?Sized>(value: &T, out: W) -> io::Result<()> {
    let tree = serde_json::to_value(value).map_err(io::Error::other)?;
    serde_json::to_writer_pretty(out, &tree).map_err(io::Error::other)
}

/// `,\n` and then spaces: a line break and its indent are one slice of this.
const BREAK: &[u8] = b",\n                                                                ";

/// Two-space pretty printing, byte for byte what `serde_json::to_writer_pretty` writes, in
/// fewer pieces: a line break and its indent go out as one slice of [`BREAK`], and an object
/// key's quotes go out with the break before it and the `": "` after it. (The stock formatter
/// writes every indent level and every quote on its own; on the 1,152-bar lap that was a third
/// of the report's cost.)
#[derive(Default)]
struct Pretty {
    /// Nesting depth of the open arrays and objects.
    depth: usize,
    /// Whether the innermost open array or object has a value yet.
    has_value: bool,
    /// Between an object key's opening quote (written with its line break) and its closing
    /// quote (written with the `": "`).
    in_key: bool,
}

impl Pretty {
    /// A line break (after a comma when `comma`) and the indent of the current depth.
    #[inline]
    fn line<W: ?Sized + Write>(&self, w: &mut W, comma: bool) -> io::Result<()> {
        let start = usize::from(!comma);
        let end = 2 + 2 * self.depth;
        if end <= BREAK.len() {
            return w.write_all(&BREAK[start..end]);
        }
        w.write_all(&BREAK[start..2])?;
        (0..self.depth).try_for_each(|_| w.write_all(b"  "))
    }
}

impl serde_json::ser::Formatter for Pretty {
    fn begin_array<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.depth += 1;
        self.has_value = false;
        w.write_all(b"[")
    }

    fn end_array<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.depth -= 1;
        if self.has_value {
            self.line(w, false)?;
        }
        w.write_all(b"]")
    }

    fn begin_array_value<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        self.line(w, !first)
    }

    fn end_array_value<W: ?Sized + Write>(&mut self, _w: &mut W) -> io::Result<()> {
        self.has_value = true;
        Ok(())
    }

    fn begin_object<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.depth += 1;
        self.has_value = false;
        w.write_all(b"{")
    }

    fn end_object<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.depth -= 1;
        if self.has_value {
            self.line(w, false)?;
        }
        w.write_all(b"}")
    }

    fn begin_object_key<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        self.line(w, !first)?;
        self.in_key = true;
        w.write_all(b"\"")
    }

    fn begin_string<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        if self.in_key {
            return Ok(());
        }
        w.write_all(b"\"")
    }

    fn end_string<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        if self.in_key {
            return Ok(());
        }
        w.write_all(b"\"")
    }

    fn begin_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.in_key = false;
        w.write_all(b"\": ")
    }

    fn end_object_value<W: ?Sized + Write>(&mut self, _w: &mut W) -> io::Result<()> {
        self.has_value = true;
        Ok(())
    }
}

/// The report as pretty-printed JSON with a final newline.
pub fn report_json(r: &Checked) -> String {
    let mut buf = Vec::with_capacity(512 * (r.winding.connections.len() + 16));
    // Writing to a Vec cannot fail, and serde_json writes UTF-8 only.
    let _ = write_report_json(r, &mut buf);
    String::from_utf8(buf).unwrap_or_default()
}

/// The whole `check --json` object. Fields in key order.
#[derive(Serialize)]
struct ReportJson<'a> {
    active_coils: u32,
    back_pitch: i64,
    brush_sets: u32,
    brush_sets_minimum: u32,
    #[serde(serialize_with = "brushes")]
    brushes: &'a [BrushSet],
    #[serde(serialize_with = "findings")]
    checks: &'a [Finding],
    coil_making: Option<super::coil_json::CoilMakingJson>,
    coils: u32,
    coils_per_slot: u32,
    commutator_pitch: i64,
    conductors: u64,
    connections: ConnectionsJson<'a>,
    dummy_coils: usize,
    dummy_positions: &'a [u32],
    /// The winding elements, on a winding of several elements (frog-leg) only.
    #[serde(skip_serializing_if = "Option::is_none")]
    elements: Option<Vec<ElementJson>>,
    /// Present only when the flux per pole is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    emf_constant_v_per_rad_s: Option<f64>,
    /// Present only when the EMF is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    emf_v: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    emf_v_per_1000_rpm: Option<Option<f64>>,
    equalizer_status: EqualizerStatus<'a>,
    equalizers: Option<EqualizersJson<'a>>,
    file: &'a str,
    flux_linkage: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    flux_per_pole_mwb: Option<Option<f64>>,
    front_pitch: i64,
    job: JobJson<'a>,
    #[serde(serialize_with = "half_bars")]
    lead_offset: HalfBars,
    lead_swing: LeadSwingJson,
    machine_constant: f64,
    mode: &'static str,
    parallel_paths: u32,
    parallel_paths_formula: u32,
    path_balance: BalanceJson,
    #[serde(serialize_with = "paths")]
    paths: &'a [ParallelPath],
    pole_arc: f64,
    poles: u32,
    rating: Option<RatingJson<'a>>,
    reentrancy: u32,
    reentrancy_formula: u32,
    resultant_pitch: i64,
    rotation: &'static str,
    segments: u32,
    segments_derived: bool,
    #[serde(serialize_with = "sequence")]
    sequence: &'a [ClosedWinding],
    shorted_coils: &'a [u32],
    slots: u32,
    span: u32,
    span_defaulted: bool,
    span_shop: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    speed_rpm: Option<Option<f64>>,
    symmetric: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    torque_constant_nm_per_a: Option<Option<f64>>,
    turns: u32,
    /// The length system the design file used (`mm` or `in`); every length in the JSON is
    /// in SI units (mm) whatever it is.
    units: &'static str,
    winding: WindingJson,
}

impl<'a> ReportJson<'a> {
    fn new(r: &'a Checked) -> ReportJson<'a> {
        let (d, w) = (&r.design, &r.winding);
        let k = &w.constants;
        let p = &w.pitches;
        let round = |x: Option<f64>, n| x.map(|v| round_to(v, n));
        let with_flux = |x: Option<f64>| k.emf_constant_v_per_rad_s.map(|_| x);
        let with_emf = |x: Option<f64>| k.emf_v.map(|_| x);
        let (equalizers, equalizer_status) = match &w.equalizers {
            EqualizerPlan::Possible(e) => (
                Some(EqualizersJson::from(e)),
                EqualizerStatus {
                    reason: None,
                    status: "possible",
                },
            ),
            EqualizerPlan::Impossible(why) => (
                None,
                EqualizerStatus {
                    reason: Some(why),
                    status: "impossible",
                },
            ),
            EqualizerPlan::NotNeeded => (
                None,
                EqualizerStatus {
                    reason: Some(if w.is_multi_element() {
                        d.winding_type.kind().no_equalizers_reason()
                    } else {
                        "wave windings need none"
                    }),
                    status: "not needed",
                },
            ),
        };
        ReportJson {
            active_coils: w.active_coils,
            back_pitch: p.back,
            brush_sets: w.brush_sets(),
            brush_sets_minimum: w.brush_sets_minimum,
            brushes: &w.brushes,
            checks: &r.findings,
            coil_making: r
                .rating
                .as_ref()
                .and_then(|k| k.coil_making.as_ref())
                .map(super::coil_json::CoilMakingJson::new),
            coils: w.coils,
            coils_per_slot: d.coils_per_slot,
            commutator_pitch: p.commutator,
            conductors: w.conductors,
            connections: ConnectionsJson {
                rows: &w.connections,
                multi: w.is_multi_element(),
            },
            dummy_coils: w.dummy_coils.len(),
            dummy_positions: &w.dummy_coils,
            elements: w.is_multi_element().then(|| {
                w.elements
                    .iter()
                    .map(|e| ElementJson {
                        back_pitch: e.pitches.back,
                        commutator_pitch: e.pitches.commutator,
                        direction: e.direction.as_str(),
                        front_pitch: e.pitches.front,
                        kind: e.kind.as_str(),
                        multiplicity: e.multiplicity,
                        parallel_paths: e.paths,
                        reentrancy: e.reentrancy,
                        span: e.pitches.span,
                        turns: e.turns,
                    })
                    .collect()
            }),
            emf_constant_v_per_rad_s: round(k.emf_constant_v_per_rad_s, 6),
            emf_v: round(k.emf_v, 4),
            emf_v_per_1000_rpm: with_flux(round(k.emf_v_per_1000_rpm, 4)),
            equalizer_status,
            equalizers,
            file: &d.file_name,
            flux_linkage: round_to(k.flux_linkage, 6),
            flux_per_pole_mwb: with_flux(round(d.flux_per_pole_mwb, 6)),
            front_pitch: p.front,
            job: JobJson::from(&d.job),
            lead_offset: d.lead_offset,
            lead_swing: LeadSwingJson::new(&w.lead_swing, w.active_coils),
            machine_constant: round_to(k.machine_constant, 6),
            mode: d.mode.as_str(),
            parallel_paths: w.parallel_paths(),
            parallel_paths_formula: w.paths_formula,
            path_balance: BalanceJson::from(&w.balance),
            paths: &w.paths,
            pole_arc: round_to(d.pole_arc, 4),
            poles: d.poles,
            rating: r.rating.as_ref().map(RatingJson::new),
            reentrancy: w.reentrancy(),
            reentrancy_formula: w.reentrancy_formula,
            resultant_pitch: p.resultant,
            rotation: d.rotation.as_str(),
            segments: w.active_coils,
            segments_derived: w.segments_derived,
            sequence: &w.closed_windings,
            shorted_coils: &w.shorted_coils,
            slots: d.slots,
            span: p.span,
            span_defaulted: d.span_source == SpanSource::Default,
            span_shop: span_shop(p.span),
            speed_rpm: with_emf(round(d.speed_rpm, 3)),
            symmetric: r.symmetric,
            torque_constant_nm_per_a: with_flux(round(k.torque_constant_nm_per_a, 6)),
            turns: d.turns,
            units: d.units.symbol(),
            winding: WindingJson {
                direction: d.direction.as_str(),
                multiplicity: d.multiplicity,
                kind: d.winding_type.as_str(),
            },
        }
    }
}

/// `job`: the `[job]` table, every key present (null when not given).
#[derive(Serialize)]
struct JobJson<'a> {
    customer: Option<&'a str>,
    date: Option<&'a str>,
    id: Option<&'a str>,
    notes: Option<&'a str>,
    title: Option<&'a str>,
}

impl<'a> From<&'a Job> for JobJson<'a> {
    fn from(j: &'a Job) -> Self {
        JobJson {
            customer: j.customer.as_deref(),
            date: j.date.as_deref(),
            id: j.id.as_deref(),
            notes: j.notes.as_deref(),
            title: j.title.as_deref(),
        }
    }
}

/// One entry of `elements`: a winding element's kind, pitches, turns, reentrancy and paths.
#[derive(Serialize)]
struct ElementJson {
    back_pitch: i64,
    commutator_pitch: i64,
    direction: &'static str,
    front_pitch: i64,
    kind: &'static str,
    multiplicity: u32,
    parallel_paths: u32,
    reentrancy: u32,
    span: u32,
    turns: u32,
}

/// `winding`: kind, multiplicity and direction.
#[derive(Serialize)]
struct WindingJson {
    direction: &'static str,
    multiplicity: u32,
    #[serde(rename = "type")]
    kind: &'static str,
}

/// `path_balance`: the simulated balance of the parallel paths.
#[derive(Serialize)]
struct BalanceJson {
    balanced: bool,
    mean_spread_coils: f64,
    peak_spread_coils: f64,
    samples: u32,
}

impl From<&PathBalance> for BalanceJson {
    fn from(b: &PathBalance) -> Self {
        BalanceJson {
            balanced: b.balanced,
            mean_spread_coils: round_to(b.mean_spread_coils, 4),
            peak_spread_coils: round_to(b.peak_spread_coils, 4),
            samples: b.samples,
        }
    }
}

/// `lead_offset` as given: an integer when whole, else the half (`1.5`).
pub(crate) fn half_bars<S: Serializer>(h: &HalfBars, s: S) -> Result<S::Ok, S::Error> {
    if h.0 % 2 == 0 {
        s.serialize_i32(h.0 / 2)
    } else {
        s.serialize_f64(h.bars())
    }
}

/// `lead_swing`: the brush position from the pole axis and the bar in line with slot 1.
#[derive(Serialize)]
struct LeadSwingJson {
    brush_from_pole_axis_bars: f64,
    brush_from_pole_axis_deg: f64,
    in_line_mica: bool,
    in_line_segment: f64,
    in_line_segment_nearest: u32,
    swing_bars: f64,
}

impl LeadSwingJson {
    fn new(l: &LeadSwing, c: u32) -> LeadSwingJson {
        let (bar, right) = l.in_line(c);
        LeadSwingJson {
            brush_from_pole_axis_bars: l.from_pole_axis_bars,
            brush_from_pole_axis_deg: round_to(l.from_pole_axis_deg, 4),
            in_line_mica: right.is_some(),
            in_line_segment: round_to(l.in_line_segment, 4),
            in_line_segment_nearest: bar,
            swing_bars: l.swing_half_bars(c) as f64 / 2.0,
        }
    }
}

/// One of `brushes`.
#[derive(Serialize)]
struct BrushJson<'a> {
    angle_deg: f64,
    centre_segment: f64,
    contacts: &'a [u32],
    index: u32,
    polarity: &'static str,
    under: &'a [u32],
    width_segments: f64,
}

fn brushes<S: Serializer>(b: &&[BrushSet], s: S) -> Result<S::Ok, S::Error> {
    s.collect_seq(b.iter().map(|b| BrushJson {
        angle_deg: round_to(b.angle_deg, 4),
        centre_segment: round_to(b.centre_segment, 4),
        contacts: &b.contacts,
        index: b.index,
        polarity: b.polarity.sign(),
        under: &b.under,
        width_segments: round_to(b.width_segments, 4),
    }))
}

/// One of `paths`.
#[derive(Serialize)]
struct PathJson<'a> {
    coils: &'a [u32],
    current: i8,
    emf_units: i64,
    from_brush: u32,
    index: u32,
    to_brush: u32,
}

fn paths<S: Serializer>(p: &&[ParallelPath], s: S) -> Result<S::Ok, S::Error> {
    s.collect_seq(p.iter().map(|p| PathJson {
        coils: &p.coils,
        current: p.current,
        emf_units: p.emf_units,
        from_brush: p.from_brush,
        index: p.index,
        to_brush: p.to_brush,
    }))
}

/// One of `checks`: a finding.
#[derive(Serialize)]
struct FindingJson<'a> {
    id: &'a str,
    message: &'a str,
    passed: bool,
    severity: &'static str,
    source: &'a str,
}

fn findings<S: Serializer>(f: &&[Finding], s: S) -> Result<S::Ok, S::Error> {
    s.collect_seq(f.iter().map(|f| FindingJson {
        id: &f.id,
        message: &f.message,
        passed: f.passed,
        severity: f.severity.as_str(),
        source: &f.source,
    }))
}

/// One of `connections`: a row of the connection table.
#[derive(Serialize)]
struct ConnectionJson {
    bottom_position: u32,
    bottom_slot: u32,
    coil: u32,
    dummy: bool,
    /// The row's element (`"lap"`, `"wave"`), on a winding of several elements only.
    #[serde(skip_serializing_if = "Option::is_none")]
    element: Option<&'static str>,
    end_segment: Option<u32>,
    front_pitch: Option<i64>,
    start_segment: Option<u32>,
    top_position: u32,
    top_slot: u32,
}

/// `connections`: the rows, and whether the winding has several elements.
struct ConnectionsJson<'a> {
    rows: &'a [Connection],
    multi: bool,
}

impl Serialize for ConnectionsJson<'_> {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        connections(self.rows, self.multi, s)
    }
}

fn connections<S: Serializer>(c: &[Connection], multi: bool, s: S) -> Result<S::Ok, S::Error> {
    s.collect_seq(c.iter().map(|c| ConnectionJson {
        bottom_position: c.bottom.position,
        bottom_slot: c.bottom.slot,
        coil: c.coil,
        dummy: c.dummy,
        element: multi.then(|| c.element.as_str()),
        end_segment: c.end_segment,
        front_pitch: c.front_pitch,
        start_segment: c.start_segment,
        top_position: c.top.position,
        top_slot: c.top.slot,
    }))
}

/// `sequence`: per closed winding, `[from segment, coil, to segment]` in trace order.
fn sequence<S: Serializer>(w: &&[ClosedWinding], s: S) -> Result<S::Ok, S::Error> {
    struct Steps<'a>(&'a ClosedWinding);
    impl Serialize for Steps<'_> {
        fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
            s.collect_seq(
                self.0
                    .steps
                    .iter()
                    .map(|t| [t.from_segment, t.coil, t.to_segment]),
            )
        }
    }
    s.collect_seq(w.iter().map(Steps))
}

/// `equalizers`, when they are possible.
#[derive(Serialize)]
struct EqualizersJson<'a> {
    groups: &'a [Vec<u32>],
    pitch: u32,
    possible: u32,
}

impl<'a> From<&'a Equalizers> for EqualizersJson<'a> {
    fn from(e: &'a Equalizers) -> Self {
        EqualizersJson {
            groups: &e.groups,
            pitch: e.pitch,
            possible: e.possible,
        }
    }
}

/// `equalizer_status`: possible, impossible (with the reason) or not needed.
#[derive(Serialize)]
struct EqualizerStatus<'a> {
    reason: Option<&'a str>,
    status: &'static str,
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::design::parse_design;

    /// Keys sorted and pretty-printed exactly as serde_json writes a value tree: parsing the
    /// output into a `Value` (sorted map) and printing it again gives the same bytes.
    #[test]
    fn keys_come_out_sorted() {
        for text in [
            "[armature]\npoles = 4\nslots = 12\ncoils_per_slot = 1\n\n[winding]\ntype = \"lap\"\nturns = 3\nflux_per_pole_mwb = 10\nspeed_rpm = 1500\nequalizers = 2\n\n[rating]\nvoltage = 110\ncurrent = 20\n\n[conductor]\ndiameter_mm = 1.2\n\n[core]\ndiameter_mm = 120\nlength_mm = 100\n\n[commutator]\ndiameter_mm = 80\nbrush_width_segments = 2\n",
            "[armature]\npoles = 6\nslots = 36\ncoils_per_slot = 1\n\n[winding]\ntype = \"wave\"\nturns = 2\n",
        ] {
            let d = parse_design(text, "t.toml").unwrap();
            let out = report_json(&crate::check(d));
            let tree: serde_json::Value = serde_json::from_str(&out).unwrap();
            let again = serde_json::to_string_pretty(&tree).unwrap() + "\n";
            assert_eq!(out, again);
        }
    }
}
