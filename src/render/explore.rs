//! The words, JSON and CSV of `armsheet explore`: the fits ranked with every figure, the front,
//! the near misses, and what cut the space.
//!
//! Part of the `render` stage: it formats what [`crate::features::explore::explore`] found and
//! computes nothing. Numbers through `base::number`.

use std::fmt::Write as _;
use std::io::{self, Write};

use serde::Serialize;

use crate::base::Units;
use crate::base::number::{counted, fmt_fixed};
use crate::base::visible::visible;
use crate::design::{ConductorShape, Frame};
use crate::features::explore::{Candidate, Explored};
use crate::rating::conductor::describe;

/// The text report: the top `top` fits, the near misses and the cuts.
pub fn render_explore(f: &Frame, r: &Explored, top: usize) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "armsheet explore {}", visible(&f.file_name));
    let _ = writeln!(
        s,
        "{} poles, slots {}; {} V, {} A, {} rpm, flux {} mWb per pole",
        f.poles,
        f.slots
            .iter()
            .map(|x| x.to_string())
            .collect::<Vec<_>>()
            .join(", "),
        fmt_fixed(f.rating.voltage.unwrap_or(0.0), 1),
        fmt_fixed(f.rating.current.unwrap_or(0.0), 1),
        fmt_fixed(f.speed_rpm, 0),
        fmt_fixed(f.flux_per_pole_mwb, 3)
    );
    let _ = writeln!(
        s,
        "evaluated {} candidates on {} traced windings; {} fit, {} on the front, {} fail one limit",
        r.evaluated,
        r.traced,
        r.fits.len(),
        r.fits.iter().filter(|k| k.on_front).count(),
        r.near_miss_count
    );
    for x in &r.refused {
        let _ = writeln!(
            s,
            "refused before tracing: {} at {}",
            counted(x.structures, "structure", "structures"),
            x.key
        );
    }
    s.push_str("order: the front first, then copper loss, peak segment voltage, slot fill\n");
    if !r.fits.is_empty() {
        let _ = writeln!(s, "\ntop {} of {}:", top.min(r.fits.len()), r.fits.len());
        listed(&mut s, r.fits.iter().take(top));
    }
    if !r.near_misses.is_empty() {
        let _ = writeln!(
            s,
            "\nnear misses (fail exactly one limit; {} of {} shown):",
            r.near_misses.len(),
            r.near_miss_count
        );
        listed(&mut s, r.near_misses.iter());
    }
    if r.fits.is_empty() {
        match &r.last_cut {
            Some((limit, n, fewest)) => {
                let _ = writeln!(
                    s,
                    "\nnothing fits: {limit} cut the last candidates ({n} of those failing the fewest limits, {fewest} each)"
                );
            }
            None => s.push_str("\nnothing fits: no candidate could be evaluated\n"),
        }
    }
    s.push_str("\nthe space searched (within [search]):\n");
    for c in &r.cut_short {
        let _ = writeln!(s, "  {c}");
    }
    s
}

/// Candidates numbered from 1; one that differs from the one before only in its direction
/// (progressive and retrogressive, every figure the same) takes one line saying so.
fn listed<'a>(s: &mut String, ks: impl Iterator<Item = &'a Candidate>) {
    let mut before: Option<&Candidate> = None;
    for (i, k) in ks.enumerate() {
        match before {
            Some(b) if direction_twins(b, k) => {
                let _ = writeln!(
                    s,
                    "{:>3}. as no. {} wound {}: every figure the same",
                    i + 1,
                    i,
                    k.structure.direction.as_str()
                );
            }
            _ => line(s, i + 1, k),
        }
        before = Some(k);
    }
}

/// Whether `a` and `b` are one winding wound each way: the same in everything but the
/// direction.
fn direction_twins(a: &Candidate, b: &Candidate) -> bool {
    let mut flipped = b.structure.clone();
    flipped.direction = a.structure.direction;
    a.structure.direction != b.structure.direction
        && flipped == a.structure
        && a.turns == b.turns
        && a.conductor == b.conductor
        && a.figures == b.figures
        && a.fails == b.fails
        && a.on_front == b.on_front
}

/// Fits as the text report lists them, numbered from 1: each its winding, then its figures
/// and, on the front, why (two or three lines); a direction twin of the one before in one.
pub fn candidates_text<'a>(ks: impl IntoIterator<Item = &'a Candidate>) -> String {
    let mut s = String::new();
    listed(&mut s, ks.into_iter());
    s
}

fn line(s: &mut String, n: usize, k: &Candidate) {
    let st = &k.structure;
    let g = &k.figures;
    let _ = writeln!(
        s,
        "{n:>3}. S={} {} m={} {} u={} C={} dummies={} span={} turns={} conductor {}",
        st.slots,
        st.kind.as_str(),
        st.multiplicity,
        st.direction.as_str(),
        st.coils_per_slot,
        st.segments,
        st.dummy_coils(),
        st.span,
        k.turns,
        describe(&k.conductor, Units::Millimetres)
    );
    let _ = writeln!(
        s,
        "     {}copper loss {} W, peak segment {} V (average {} V), {}, speed {} rpm, density {} A/mm2, loading {} A/m, a = {}",
        g.reactance_v
            .map(|v| format!("reactance {} V, ", fmt_fixed(v, 2)))
            .unwrap_or_default(),
        fmt_fixed(g.copper_loss_w, 1),
        fmt_fixed(g.segment_volts_peak, 2),
        fmt_fixed(g.segment_volts_avg, 2),
        g.fill.map_or_else(
            || format!(
                "copper per slot {} mm2 (no fill: [search] gives no slot_area_mm2)",
                fmt_fixed(g.copper_per_slot_mm2, 1)
            ),
            |x| format!("fill {}", fmt_fixed(x, 3))
        ),
        fmt_fixed(g.speed_rpm, 0),
        fmt_fixed(g.density_a_mm2, 2),
        fmt_fixed(g.electric_loading_a_m, 0),
        g.paths
    );
    if let Some(w) = &k.front_reason {
        let _ = writeln!(s, "     on the front: {w}");
    }
    if !k.fails.is_empty() {
        let _ = writeln!(s, "     fails: {}", k.fails.join(", "));
    }
}

#[derive(Serialize)]
struct ExploreJson<'a> {
    frame: String,
    evaluated: u64,
    traced: u64,
    candidates: Vec<CandidateJson<'a>>,
    near_misses: Vec<CandidateJson<'a>>,
    near_miss_count: u64,
    cut_by: Vec<CutJson<'a>>,
    last_cut: Option<&'a str>,
}

#[derive(Serialize)]
struct CutJson<'a> {
    limit: &'a str,
    candidates: u64,
}

#[derive(Serialize)]
struct ConductorJson {
    shape: &'static str,
    diameter_mm: Option<f64>,
    awg: Option<i32>,
    width_mm: Option<f64>,
    height_mm: Option<f64>,
    corner_radius_mm: Option<f64>,
    strands: u32,
}

#[derive(Serialize)]
struct CandidateJson<'a> {
    #[serde(rename = "type")]
    kind: &'static str,
    slots: u32,
    multiplicity: u32,
    direction: &'static str,
    coils_per_slot: u32,
    segments: u32,
    dummy_coils: u32,
    span: u32,
    turns: u32,
    conductor: ConductorJson,
    on_front: bool,
    front_reason: Option<&'a str>,
    reactance_v: Option<f64>,
    copper_loss_w: f64,
    segment_volts_peak: f64,
    segment_volts_avg: f64,
    fill: Option<f64>,
    copper_per_slot_mm2: f64,
    speed_rpm: f64,
    emf_v: f64,
    resistance_ohm: f64,
    density_a_mm2: f64,
    electric_loading_a_m: f64,
    paths: u32,
    fails: &'a [String],
}

fn round(x: f64, d: usize) -> f64 {
    fmt_fixed(x, d).parse().unwrap_or(x)
}

fn conductor_json(c: &ConductorShape) -> ConductorJson {
    match *c {
        ConductorShape::Round {
            diameter_mm,
            awg,
            strands,
        } => ConductorJson {
            shape: "round",
            diameter_mm: Some(round(diameter_mm, 4)),
            awg,
            width_mm: None,
            height_mm: None,
            corner_radius_mm: None,
            strands,
        },
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            strands,
        } => ConductorJson {
            shape: "rectangular",
            diameter_mm: None,
            awg: None,
            width_mm: Some(width_mm),
            height_mm: Some(height_mm),
            corner_radius_mm: Some(corner_radius_mm),
            strands,
        },
    }
}

fn candidate_json(k: &Candidate) -> CandidateJson<'_> {
    let st = &k.structure;
    let g = &k.figures;
    CandidateJson {
        kind: st.kind.as_str(),
        slots: st.slots,
        multiplicity: st.multiplicity,
        direction: st.direction.as_str(),
        coils_per_slot: st.coils_per_slot,
        segments: st.segments,
        dummy_coils: st.dummy_coils(),
        span: st.span,
        turns: k.turns,
        conductor: conductor_json(&k.conductor),
        on_front: k.on_front,
        front_reason: k.front_reason.as_deref(),
        reactance_v: g.reactance_v.map(|v| round(v, 4)),
        copper_loss_w: round(g.copper_loss_w, 3),
        segment_volts_peak: round(g.segment_volts_peak, 4),
        segment_volts_avg: round(g.segment_volts_avg, 4),
        fill: g.fill.map(|x| round(x, 4)),
        copper_per_slot_mm2: round(g.copper_per_slot_mm2, 3),
        speed_rpm: round(g.speed_rpm, 2),
        emf_v: round(g.emf_v, 3),
        resistance_ohm: round(g.resistance_ohm, 6),
        density_a_mm2: round(g.density_a_mm2, 4),
        electric_loading_a_m: round(g.electric_loading_a_m, 1),
        paths: g.paths,
        fails: &k.fails,
    }
}

/// The JSON: `evaluated`, `candidates` (the top `top` fits, ranked), `near_misses`.
pub fn write_explore_json<W: Write>(
    f: &Frame,
    r: &Explored,
    top: usize,
    mut out: W,
) -> io::Result<()> {
    let view = ExploreJson {
        frame: f.file_name.clone(),
        evaluated: r.evaluated,
        traced: r.traced,
        candidates: r.fits.iter().take(top).map(candidate_json).collect(),
        near_misses: r.near_misses.iter().map(candidate_json).collect(),
        near_miss_count: r.near_miss_count,
        cut_by: r
            .cut_by
            .iter()
            .map(|(l, n)| CutJson {
                limit: l,
                candidates: *n,
            })
            .collect(),
        last_cut: r.last_cut.as_ref().map(|l| l.0.as_str()),
    };
    super::json::write_sorted(&view, &mut out)?;
    out.write_all(b"\n")
}

/// The CSV: every fit, ranked, one row each with every figure, through the one CSV writer
/// ([`super::csv::csv_file`]).
pub fn explore_csv(r: &Explored) -> String {
    use super::csv::{Cell, csv_file};
    let header = [
        "rank",
        "type",
        "slots",
        "multiplicity",
        "direction",
        "coils_per_slot",
        "segments",
        "dummy_coils",
        "span",
        "turns",
        "conductor",
        "on_front",
        "reactance_v",
        "copper_loss_w",
        "segment_volts_peak",
        "segment_volts_avg",
        "fill",
        "copper_per_slot_mm2",
        "speed_rpm",
        "density_a_mm2",
        "electric_loading_a_m",
        "paths",
    ]
    .map(|c| Cell::Text(c.to_string()));
    let rows = r.fits.iter().enumerate().map(|(i, k)| {
        let st = &k.structure;
        let g = &k.figures;
        let text = |s: &str| Cell::Text(s.to_string());
        vec![
            Cell::Num((i + 1).to_string()),
            text(st.kind.as_str()),
            Cell::Num(st.slots.to_string()),
            Cell::Num(st.multiplicity.to_string()),
            text(st.direction.as_str()),
            Cell::Num(st.coils_per_slot.to_string()),
            Cell::Num(st.segments.to_string()),
            Cell::Num(st.dummy_coils().to_string()),
            Cell::Num(st.span.to_string()),
            Cell::Num(k.turns.to_string()),
            Cell::Text(describe(&k.conductor, Units::Millimetres)),
            Cell::Text(k.on_front.to_string()),
            Cell::Num(g.reactance_v.map_or(String::new(), |v| fmt_fixed(v, 4))),
            Cell::Num(fmt_fixed(g.copper_loss_w, 3)),
            Cell::Num(fmt_fixed(g.segment_volts_peak, 4)),
            Cell::Num(fmt_fixed(g.segment_volts_avg, 4)),
            Cell::Num(g.fill.map_or(String::new(), |x| fmt_fixed(x, 4))),
            Cell::Num(fmt_fixed(g.copper_per_slot_mm2, 3)),
            Cell::Num(fmt_fixed(g.speed_rpm, 2)),
            Cell::Num(fmt_fixed(g.density_a_mm2, 4)),
            Cell::Num(fmt_fixed(g.electric_loading_a_m, 1)),
            Cell::Num(g.paths.to_string()),
        ]
    });
    csv_file(std::iter::once(header.into()).chain(rows))
}
