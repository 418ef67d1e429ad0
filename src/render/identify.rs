//! The words and JSON of `armsheet identify`: the candidates a data card leads to, what tells
//! them apart, or why none fits; and the header of the design file it writes.
//!
//! Part of the `render` stage: it words what [`crate::features::identify::identify`] found and
//! never traces or checks anything itself. Every text from the card is shown through
//! `base::visible`.

use std::fmt::Write as _;
use std::io::{self, Write};

use serde::Serialize;

use crate::base::number::counted;
use crate::base::visible::visible;
use crate::design::{Card, ConductorShape, HalfBars, Rotation};
use crate::features::identify::{Candidate, Identified};
use crate::theory::words::{half_bars_words, multiplicity_word, span_shop};

/// The observations of `card`, one per line, as the design file's header lists them.
pub fn observations(card: &Card) -> Vec<String> {
    let mut out = vec![
        format!(
            "poles {}, slots {}, bars {}",
            card.poles, card.slots, card.bars
        ),
        format!(
            "coil span {}, lead throw 1-{}, {}",
            span_shop(card.coil_span),
            card.throw_end,
            card.lead_swing.map_or(
                "lead swing not recorded (symmetric leads assumed: set the brushes by a neutral test)".to_string(),
                |h| format!("lead swing {} from slot 1's centre line", half_bars_words(i64::from(h.0)))
            )
        ),
    ];
    let u = card
        .coils_per_slot
        .map_or("not counted".to_string(), |u| u.to_string());
    let mut coil = format!("coils per slot {u}, turns {}", card.turns);
    match card.wire {
        Some(ConductorShape::Round {
            diameter_mm,
            awg,
            strands,
        }) => {
            let size = match awg {
                Some(g) => format!("AWG {g}"),
                None => card.units.length(diameter_mm, 3),
            };
            let _ = write!(coil, ", wire {size} x {strands} in hand");
        }
        Some(ConductorShape::Rectangular { .. }) | None => {}
    }
    out.push(coil);
    let mut more = Vec::new();
    if let Some((a, b)) = card.wave_throw {
        more.push(format!(
            "{} leads a bar, wave coil throw {a}-{b}, wave coil span {}",
            card.leads_per_bar,
            span_shop(card.wave_coil_span.unwrap_or(card.coil_span))
        ));
    }
    if let Some(b) = card.brush_sets {
        more.push(format!("brush sets {b}"));
    }
    if let Some(dead) = &card.dead_coils {
        more.push(if dead.is_empty() {
            "no dead coils".to_string()
        } else {
            format!("dead coils in slots {}", join(dead))
        });
    }
    if !card.equalizer_taps.is_empty() {
        let taps: Vec<String> = card
            .equalizer_taps
            .iter()
            .map(|(a, b)| format!("{a}-{b}"))
            .collect();
        more.push(format!("equalizer taps {}", taps.join(", ")));
    }
    if let Some(r) = card.rotation {
        more.push(format!(
            "rotation {}",
            match r {
                Rotation::Clockwise => "cw",
                Rotation::CounterClockwise => "ccw",
            }
        ));
    }
    if !more.is_empty() {
        out.push(more.join(", "));
    }
    out
}

/// The header of the design file written for `k`: where it came from and the observations.
pub fn design_header(card: &Card, k: &Candidate, version: &str) -> Vec<String> {
    let mut out = vec![
        format!(
            "Identified by armsheet {version} identify from the data card {}.",
            visible(&card.file_name)
        ),
        "Observed before stripping:".to_string(),
    ];
    out.extend(observations(card).into_iter().map(|l| format!("  {l}")));
    out.push(format!("Reading: {}", k.explanation));
    out
}

/// One candidate's line: kind, u, C, dummies, y_c, span and lead offset.
fn summary(k: &Candidate) -> String {
    let d = &k.checked.design;
    let dummies = d.dummy_count();
    format!(
        "{} {} {}, {} a slot, {} bars, {}, y_c {}, span {}, lead offset {}",
        d.direction.as_str(),
        multiplicity_word(d.multiplicity),
        d.winding_type.as_str(),
        counted(d.coils_per_slot, "coil", "coils"),
        d.segments,
        counted(dummies, "dummy coil", "dummy coils"),
        k.checked.winding.pitches.commutator,
        span_shop(d.span),
        d.lead_offset
    )
}

/// Why the most usual fit is still unusual: multiplex, dummy coils, or refused by `check`.
fn unusual_words(k: &Candidate) -> String {
    let d = &k.checked.design;
    let mut why = Vec::new();
    if d.multiplicity > 1 {
        why.push(format!(
            "a {} winding is rare in repair work",
            multiplicity_word(d.multiplicity)
        ));
    }
    let dummies = d.dummy_count();
    if dummies > 0 {
        why.push(format!(
            "{} the card does not list",
            counted(dummies, "dummy coil", "dummy coils")
        ));
    }
    if k.checked.has_errors() {
        why.push("check refuses it".to_string());
    }
    why.join("; ")
}

/// The text report of `armsheet identify`.
pub fn render_identify(card: &Card, r: &Identified) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "data card {}", visible(&card.file_name));
    for l in observations(card) {
        let _ = writeln!(s, "  {l}");
    }
    s.push('\n');
    match r.candidates.len() {
        0 => {
            s.push_str("no winding fits these observations:\n");
            for c in &r.conflicts {
                let _ = writeln!(s, "  - {c}");
            }
        }
        1 => {
            let k = &r.candidates[0];
            let _ = writeln!(s, "one winding fits: {}", summary(k));
            let _ = writeln!(s, "  {}", k.explanation);
        }
        n => {
            let _ = writeln!(s, "{n} windings fit:");
            for (i, k) in r.candidates.iter().enumerate() {
                let _ = writeln!(s, "  {}. {}", i + 1, summary(k));
                let _ = writeln!(s, "     {}", k.explanation);
            }
            s.push_str("what tells them apart:\n");
            for d in &r.decides {
                let _ = writeln!(s, "  - {d}");
            }
            s.push_str("add the deciding observation to the card, or choose one with --pick N\n");
        }
    }
    if let Some(recount) = &r.recount {
        if !recount.readings.is_empty() {
            s.push_str(
                "\na reading one off gives a more usual winding (count the bars and the throw again before stripping):\n",
            );
            for l in &recount.readings {
                let _ = writeln!(s, "  - {l}");
            }
        }
        if let Some(k) = r.candidates.first() {
            let d = &k.checked.design;
            let _ = writeln!(
                s,
                "\nthe best fit is unusual ({}): {}",
                unusual_words(k),
                recount.simplex_throws
            );
            if r.doubtful() && r.candidates.len() == 1 && !k.checked.has_errors() {
                let _ = writeln!(
                    s,
                    "nothing is written until you confirm the {} {} with --pick 1",
                    multiplicity_word(d.multiplicity),
                    d.winding_type.as_str()
                );
            }
        }
    }
    if let Some(rule) = &r.rule_of_thumb {
        let _ = writeln!(s, "\ncross-check (common practice): {rule}");
    }
    s
}

#[derive(Serialize)]
struct IdentifyJson<'a> {
    card: String,
    candidates: Vec<CandidateJson<'a>>,
    conflicts: &'a [String],
    decides: &'a [String],
    doubtful: bool,
    recount: Option<RecountJson<'a>>,
    rule_of_thumb: Option<&'a str>,
}

#[derive(Serialize)]
struct RecountJson<'a> {
    readings: &'a [String],
    simplex_throws: &'a str,
}

#[derive(Serialize)]
struct CandidateJson<'a> {
    coils_per_slot: u32,
    commutator_pitch: i64,
    direction: &'static str,
    dummy_coils: usize,
    dummy_positions: &'a [u32],
    explanation: &'a str,
    #[serde(serialize_with = "super::json::half_bars")]
    lead_offset: HalfBars,
    multiplicity: u32,
    segments: u32,
    span: u32,
    #[serde(rename = "type")]
    kind: &'static str,
}

/// Writes the identify result as pretty-printed JSON with a final newline.
pub fn write_identify_json<W: Write>(card: &Card, r: &Identified, mut out: W) -> io::Result<()> {
    let view = IdentifyJson {
        card: card.file_name.clone(),
        candidates: r
            .candidates
            .iter()
            .map(|k| {
                let (d, w) = (&k.checked.design, &k.checked.winding);
                CandidateJson {
                    coils_per_slot: d.coils_per_slot,
                    commutator_pitch: w.pitches.commutator,
                    direction: d.direction.as_str(),
                    dummy_coils: w.dummy_coils.len(),
                    dummy_positions: &w.dummy_coils,
                    explanation: &k.explanation,
                    lead_offset: d.lead_offset,
                    multiplicity: d.multiplicity,
                    segments: d.segments,
                    span: d.span,
                    kind: d.winding_type.as_str(),
                }
            })
            .collect(),
        conflicts: &r.conflicts,
        decides: &r.decides,
        doubtful: r.doubtful(),
        recount: r.recount.as_ref().map(|c| RecountJson {
            readings: &c.readings,
            simplex_throws: &c.simplex_throws,
        }),
        rule_of_thumb: r.rule_of_thumb.as_deref(),
    };
    super::json::write_sorted(&view, &mut out)?;
    out.write_all(b"\n")
}

fn join(v: &[u32]) -> String {
    v.iter().map(u32::to_string).collect::<Vec<_>>().join(", ")
}

/// The identified winding `check` refuses: its failed error-level checks, and that no design
/// file was written (the command exits 1).
pub fn render_refused(k: &crate::checks::Checked) -> String {
    let mut s = String::from(
        "check refuses the identified winding, so no design file was written (exit 1); look again at the card (a bar or a throw counted one off gives an unusual winding):\n",
    );
    for f in k.findings.iter().filter(|f| f.is_failure()) {
        s.push_str(&format!(
            "  [error] {}: {}\n",
            f.id,
            crate::base::visible::visible(&f.message)
        ));
    }
    s
}
