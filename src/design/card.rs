//! `parse_card`: a data card (what a rewinder records before stripping an armature) → a
//! validated [`Card`], or every located [`Diagnostic`] found.
//!
//! Part of the `design` stage: no I/O, the CLI hands the text in. A card holds `[job]` (as in
//! a design file) and `[observed]`, whose keys are [`OBSERVED_KEYS`]:
//! - `poles`, `slots`, `bars` (required): poles even, 2 to [`bounds::MAX_POLES`]; at least
//!   2·P bars (two per pole: the least any winding takes, (m + 1)·P for m = 1);
//! - `coil_span` (required): the marked coil's slots in the shop form `"1-8"` (a span of 7),
//!   or a number of slots, 1 to slots − 1;
//! - `lead_throw` (required): the bars of the marked coil's start and end leads, `"1-14"`;
//!   the start lead is bar 1, and bars and slots are numbered the same way round from the
//!   marked coil; the end bar is 2 to `bars`;
//! - `lead_swing` (optional; without it symmetric leads are assumed): bar pitches from slot 1's centre line to bar 1's centre,
//!   positive towards rising slot numbers; whole or half bars, at most half the bars either way (the
//!   winding's `LeadSwing` convention);
//! - `coils_per_slot`: counted leads per slot (u), 1 to [`bounds::MAX_COILS_PER_SLOT`];
//!   inferred when absent;
//! - `turns` (required): turns per coil; the wire as `diameter_mm` or `awg`, with `strands`
//!   (default 1), read as in `[conductor]`;
//! - `brush_sets`: even, 2 to P;
//! - `dead_coils`: slots (1 to `slots`, counted from the marked slot) whose coil was found with
//!   its leads cut and taped; a slot is listed once for each such coil in it;
//! - `equalizer_taps`: pairs of bars seen joined by one equalizer ring, `[[1, 13], [4, 16]]`;
//! - `rotation`: `"cw"` or `"ccw"`, as in `[armature]`;
//! - `leads_per_bar`: the leads counted on one bar, 2 (lap or wave; default) or 4 (frog-leg:
//!   a lap and a wave coil end on every bar);
//! - `wave_throw` (with four leads a bar, required): the bars of the marked slot's first wave
//!   coil's start and end leads, counted from bar 1 like the rest, e.g. `"16-44"`;
//! - `wave_coil_span` (with four leads a bar): the wave coil's slots, as `coil_span`; default
//!   `coil_span`.

use toml::de::{DeTable, DeValue};

use super::Diagnostic;
use super::diagnostic::Diagnostics;
use super::model::{ConductorShape, HalfBars, Job, Rotation, bounds};
use super::parse::{missing_table, open_document, read_all, tables, utf8};
use super::reader::{At, Found, Source, TableReader, nearest};
use super::tables::{armature, conductor, job, winding};
use crate::base::visible::{ECHO_WIDTH, clip};

/// The keys of a card's `[observed]`, in the order of the card reference.
pub const OBSERVED_KEYS: &[&str] = &[
    "poles",
    "slots",
    "bars",
    "coil_span",
    "lead_throw",
    "lead_swing",
    "coils_per_slot",
    "turns",
    "diameter_mm",
    "awg",
    "strands",
    "brush_sets",
    "dead_coils",
    "equalizer_taps",
    "rotation",
    "leads_per_bar",
    "wave_throw",
    "wave_coil_span",
];

/// The tables of a card.
const CARD_TABLES: &[&str] = &["job", "observed"];

/// What the rewinder recorded, validated (see the module doc for each key).
#[derive(Clone, Debug, PartialEq)]
pub struct Card {
    /// The card's file name as given.
    pub file_name: String,
    /// The length system of the card (`_mm` or `_in` keys); the design identified from it
    /// is written in the same.
    pub units: crate::base::Units,
    /// `[job]`.
    pub job: Job,
    /// `poles` (P).
    pub poles: u32,
    /// `slots` (S).
    pub slots: u32,
    /// `bars` (C).
    pub bars: u32,
    /// `coil_span`, slots (y_s).
    pub coil_span: u32,
    /// `lead_throw`: the end lead's bar (the start lead is bar 1).
    pub throw_end: u32,
    /// `lead_swing`, half bars; `None` when not recorded (symmetric leads are then assumed,
    /// and the brushes must be set by a neutral test).
    pub lead_swing: Option<HalfBars>,
    /// `coils_per_slot` (u), when counted.
    pub coils_per_slot: Option<u32>,
    /// `turns` per coil.
    pub turns: u32,
    /// The wire, when recorded.
    pub wire: Option<ConductorShape>,
    /// `brush_sets`, when recorded.
    pub brush_sets: Option<u32>,
    /// `dead_coils`: slots, sorted; `None` when not recorded.
    pub dead_coils: Option<Vec<u32>>,
    /// `equalizer_taps`: bar pairs, each with the lower bar first, sorted.
    pub equalizer_taps: Vec<(u32, u32)>,
    /// `rotation`, when recorded.
    pub rotation: Option<Rotation>,
    /// `leads_per_bar`: 2, or 4 for a frog-leg.
    pub leads_per_bar: u32,
    /// `wave_throw`: the start and end bars of the marked slot's first wave coil (four leads a
    /// bar only).
    pub wave_throw: Option<(u32, u32)>,
    /// `wave_coil_span`, slots (four leads a bar only; default `coil_span`).
    pub wave_coil_span: Option<u32>,
}

impl Card {
    /// The commutator pitch the throw shows, as a bar count forward from bar 1 (1 … C − 1).
    pub fn throw_bars(&self) -> u32 {
        self.throw_end - 1
    }
}

/// Parses raw bytes: checks UTF-8 first, naming the line and column of the first bad byte.
pub fn parse_card_bytes(bytes: &[u8], file: &str) -> Result<Card, Diagnostics> {
    parse_card(utf8(bytes, file, "card")?, file)
}

/// Parses and validates a data card held in `text`; `file` names it in diagnostics.
pub fn parse_card(text: &str, file: &str) -> Result<Card, Diagnostics> {
    read_all(text, file, "card", |found| read_card(text, file, found))
}

fn read_card(text: &str, file: &str, found: &Found) -> Result<Option<Card>, Diagnostic> {
    let (src, root) = open_document(
        Source::new(file, text, found),
        (
            "the card is empty: expected an [observed] table",
            "run `armsheet new --card card.toml` to write a commented starter card",
        ),
        check_tables,
    )?;
    let empty = DeTable::default();
    let table = tables(src, root.get_ref(), &empty);
    let job = table("job").map_or_else(Job::default, |t| job::read(&t));
    let Some(obs) = table("observed") else {
        return Err(missing_table(
            &src,
            "observed",
            "poles = 4\n    slots = 25\n    bars = 25",
        ));
    };
    obs.deny_unknown(OBSERVED_KEYS)?;
    let o = &obs;
    let Counts {
        poles,
        slots,
        bars,
        coils_per_slot: u,
        turns,
    } = read_counts(o);
    let wire = read_card_wire(o);
    let rotation = o
        .keep(o.choice("rotation", &["cw", "ccw"]))
        .map(|r| match r {
            Some(At { value: "ccw", .. }) => Some(Rotation::CounterClockwise),
            Some(_) => Some(Rotation::Clockwise),
            None => None,
        });
    let (Some(poles), Some(slots), Some(bars)) = (poles, slots, bars) else {
        return Ok(None);
    };
    let (p, s, c) = (poles.value, slots.value, bars.value);
    // A count in error is recorded; the rest of the card is still read.
    let u = u.flatten();
    check_counts(o, &bars, p, s, u.as_ref());
    let span = o.keep(read_coil_span(o, s, p));
    let frog = o.keep(read_frog_leg(o, s, p, c));
    let throw = o.keep(read_throw(o, c));
    let swing = o.keep(read_swing(o, c));
    let brush_sets = o.keep(read_brush_sets(o, p));
    let dead = o.keep(read_dead(o, s));
    let taps = o.keep(read_taps(o, c));
    if found.any() {
        return Ok(None);
    }
    let (Some(span), Some(throw), Some(swing), Some(turns), Some(wire), Some(rotation)) =
        (span, throw, swing, turns, wire, rotation)
    else {
        return Ok(None);
    };
    let (Some(brush_sets), Some(dead), Some(taps), Some(frog)) = (brush_sets, dead, taps, frog)
    else {
        return Ok(None);
    };
    Ok(Some(Card {
        file_name: file.to_string(),
        units: src.units,
        job,
        poles: p as u32,
        slots: s as u32,
        bars: c as u32,
        coil_span: span,
        throw_end: throw,
        lead_swing: swing,
        coils_per_slot: u.map(|a| a.value as u32),
        turns: turns.value as u32,
        wire,
        brush_sets,
        dead_coils: dead,
        equalizer_taps: taps,
        rotation,
        leads_per_bar: frog.leads,
        wave_throw: frog.throw,
        wave_coil_span: frog.span,
    }))
}

/// The top level of a card: only the tables [job] and [observed].
fn check_tables(src: &Source<'_>, root_table: &DeTable<'_>) -> Result<(), Diagnostic> {
    for (k, v) in root_table.iter() {
        let word: &str = k.get_ref();
        if !CARD_TABLES.contains(&word) || !v.get_ref().is_table() {
            let d = src.error(
                k.span(),
                word,
                format!(
                    "unknown table or key `{}` at the top level of a card",
                    clip(word, ECHO_WIDTH)
                ),
            );
            return Err(match nearest(word, CARD_TABLES) {
                Some(n) if n != word => d.with_hint(format!("did you mean [{n}]?")),
                _ => d.with_hint("a card holds the tables [job] and [observed]"),
            });
        }
    }
    Ok(())
}

/// The counts on a card, each `None` when in error (and recorded).
struct Counts {
    /// `poles`.
    poles: Option<At<i64>>,
    /// `slots`.
    slots: Option<At<i64>>,
    /// `bars`.
    bars: Option<At<i64>>,
    /// `coils_per_slot`, `Some(None)` when not given.
    coils_per_slot: Option<Option<At<i64>>>,
    /// `turns`.
    turns: Option<At<i64>>,
}

/// Reads poles, slots, bars, coils per slot and turns, recording every problem.
fn read_counts(o: &TableReader<'_, '_>) -> Counts {
    let poles = o.keep(armature::read_poles(o));
    let slots = o.keep(required(
        o,
        o.int(
            "slots",
            2..=bounds::MAX_SLOTS,
            "the armature slots",
            "count the slots",
        ),
        "the armature slots",
        "slots = 25",
    ));
    let bars = o.keep(required(
        o,
        o.int(
            "bars",
            2..=bounds::MAX_COILS,
            "the commutator bars",
            "count the bars",
        ),
        "the commutator bars",
        "bars = 25",
    ));
    let coils_per_slot = o.keep(o.int(
        "coils_per_slot",
        1..=bounds::MAX_COILS_PER_SLOT,
        "coils per slot (leads counted in one slot, over two)",
        "leave the key out when the leads cannot be counted",
    ));
    let turns = o.keep(required(
        o,
        o.int(
            "turns",
            1..=bounds::MAX_TURNS,
            "turns per coil",
            "count the turns of one coil",
        ),
        "turns per coil",
        "turns = 3",
    ));
    Counts {
        poles,
        slots,
        bars,
        coils_per_slot,
        turns,
    }
}

/// The wire on the card: `Some(None)` when no size is given, `None` when in error (and
/// recorded).
fn read_card_wire(o: &TableReader<'_, '_>) -> Option<Option<ConductorShape>> {
    let (Some(d), Some(awg), Some(strands)) = conductor::read_wire(o) else {
        return None;
    };
    let given = strands.is_some();
    let strands = strands.map_or(1, |a| a.value as u32);
    if d.is_none() && awg.is_none() {
        if given {
            o.src.found.push(
                o.src
                    .error(
                        o.raw("strands").map_or(o.span.clone(), |v| v.span()),
                        o.dotted("strands"),
                        "strands without a wire size",
                    )
                    .with_hint("add diameter_mm or awg, or remove strands"),
            );
        }
        Some(None)
    } else {
        o.keep(conductor::shape(o, d, awg, None, None, None, strands))
            .map(Some)
    }
}

/// Records the counts that do not go together: fewer than 2 bars a pole, or more coils than
/// any real machine.
fn check_counts(o: &TableReader<'_, '_>, bars: &At<i64>, p: i64, s: i64, u: Option<&At<i64>>) {
    let c = bars.value;
    if c < 2 * p {
        o.src.found.push(
            o.src
                .error(
                    bars.span.clone(),
                    o.dotted("bars"),
                    format!(
                        "{c} bars is too few for {p} poles: every winding takes at least 2 bars a pole ({})",
                        2 * p
                    ),
                )
                .with_hint("count the bars again, and the poles on the field frame"),
        );
    }
    if let Some(u) = u
        && u.value * s > bounds::MAX_COILS
    {
        o.src.found.push(
            o.src
                .error(
                    u.span.clone(),
                    o.dotted("coils_per_slot"),
                    format!(
                        "{s} slots × {} coils per slot is beyond any real machine: at most {} coils",
                        u.value,
                        bounds::MAX_COILS
                    ),
                )
                .with_hint("count the leads in one slot and halve it"),
        );
    }
}

/// What a card says of a frog-leg: the leads a bar, and the wave coil's throw and span.
struct FrogLegSeen {
    leads: u32,
    throw: Option<(u32, u32)>,
    span: Option<u32>,
}

/// `leads_per_bar`, `wave_throw` and `wave_coil_span`: the wave keys only with four leads a
/// bar, and the throw then required.
fn read_frog_leg(
    o: &TableReader<'_, '_>,
    slots: i64,
    poles: i64,
    bars: i64,
) -> Result<FrogLegSeen, Diagnostic> {
    let leads = o.int(
        "leads_per_bar",
        2..=4,
        "the leads on one bar: 2, or 4 for a frog-leg",
        "count the leads soldered into one bar's riser",
    )?;
    if let Some(l) = &leads
        && l.value == 3
    {
        return Err(o
            .src
            .error(
                l.span.clone(),
                o.dotted("leads_per_bar"),
                "3 leads on a bar fits no winding: expected 2 (lap or wave) or 4 (frog-leg)",
            )
            .with_hint("count the leads in one bar's riser again"));
    }
    let leads = leads.map_or(2, |l| l.value as u32);
    if leads == 2 {
        for key in ["wave_throw", "wave_coil_span"] {
            if let Some(v) = o.raw(key) {
                return Err(o
                    .src
                    .error(
                        v.span(),
                        o.dotted(key),
                        format!("{key} belongs to a frog-leg, which has four leads a bar"),
                    )
                    .with_hint("set leads_per_bar = 4, or remove the key"));
            }
        }
        return Ok(FrogLegSeen {
            leads,
            throw: None,
            span: None,
        });
    }
    let key = "wave_throw";
    let hint = "the marked slot's first wave coil: its start lead's bar, then its end lead's bar, counted from bar 1 the way the slots are numbered";
    let Some(v) = o.raw(key) else {
        return Err(o.missing(
            key,
            "the bars of the marked slot's wave coil, e.g. \"16-44\"",
            "wave_throw = \"16-44\"",
        ));
    };
    let pair = match v.get_ref() {
        DeValue::String(s) => winding::shop_pair(s),
        _ => None,
    };
    let Some((a, b)) =
        pair.filter(|&(a, b)| (1..=bars).contains(&a) && (1..=bars).contains(&b) && a != b)
    else {
        return Err(o
            .src
            .error(
                v.span(),
                o.dotted(key),
                format!("expected two different bars of 1 to {bars} such as \"16-44\""),
            )
            .with_hint(hint));
    };
    let span = if o.raw("wave_coil_span").is_some() {
        Some(read_coil_span_key(o, "wave_coil_span", slots, poles)?)
    } else {
        None
    };
    Ok(FrogLegSeen {
        leads,
        throw: Some((a as u32, b as u32)),
        span,
    })
}

/// A required key: its value, or the located "missing key" error.
fn required<T>(
    t: &TableReader<'_, '_>,
    r: Result<Option<At<T>>, Diagnostic>,
    expected: &str,
    example: &str,
) -> Result<At<T>, Diagnostic> {
    let key = example.split(' ').next().unwrap_or(example);
    r?.ok_or_else(|| t.missing(key, expected, example))
}

/// `coil_span`: `"1-8"` or a number of slots, 1 to slots − 1.
fn read_coil_span(o: &TableReader<'_, '_>, slots: i64, poles: i64) -> Result<u32, Diagnostic> {
    read_coil_span_key(o, "coil_span", slots, poles)
}

/// A coil's slots under `key` (`coil_span`, `wave_coil_span`), as `coil_span`.
fn read_coil_span_key(
    o: &TableReader<'_, '_>,
    key: &str,
    slots: i64,
    poles: i64,
) -> Result<u32, Diagnostic> {
    let Some(v) = o.raw(key) else {
        return Err(o.missing(
            key,
            "the marked coil's slots, e.g. \"1-8\"",
            "coil_span = \"1-8\"",
        ));
    };
    let hint = "the shop form \"1-8\" means the coil lies in slots 1 and 8, a span of 7 slots";
    let value = match v.get_ref() {
        DeValue::Integer(_) => o
            .int(key, i64::MIN..=i64::MAX, "the coil span in slots", hint)?
            .map_or(0, |a| a.value),
        DeValue::String(s) => match winding::shop_pair(s) {
            Some((1, b)) => b - 1,
            _ => {
                return Err(o
                    .src
                    .error(
                        v.span(),
                        o.dotted(key),
                        format!(
                            "expected the marked coil's slots such as \"1-8\" (slot 1 first), found \"{}\"",
                            clip(s, ECHO_WIDTH)
                        ),
                    )
                    .with_hint(hint));
            }
        },
        other => {
            return Err(o
                .src
                .error(
                    v.span(),
                    o.dotted(key),
                    format!(
                        "expected a span such as \"1-8\" or 7, found {}",
                        other.type_str()
                    ),
                )
                .with_hint(hint));
        }
    };
    if value < 1 || value >= slots {
        return Err(o
            .src
            .error(
                v.span(),
                o.dotted(key),
                format!("a coil span of {value} slots does not fit {slots} slots: expected 1 to {}", slots - 1),
            )
            .with_hint(format!(
                "count from the marked slot as 1 to the slot of the coil's other side: near {slots}/{poles} slots, one pole pitch"
            )));
    }
    Ok(value as u32)
}

/// `lead_throw`: `"1-14"`, the end bar 2 to `bars`.
fn read_throw(o: &TableReader<'_, '_>, bars: i64) -> Result<u32, Diagnostic> {
    let key = "lead_throw";
    let Some(v) = o.raw(key) else {
        return Err(o.missing(
            key,
            "the bars of the marked coil's two leads, e.g. \"1-14\"",
            "lead_throw = \"1-14\"",
        ));
    };
    let hint = "the start lead (from the coil's top side) is on bar 1; count on to the end lead's bar the way the slots are numbered";
    let DeValue::String(s) = v.get_ref() else {
        return Err(o
            .src
            .error(
                v.span(),
                o.dotted(key),
                format!(
                    "expected a throw such as \"1-14\", found {}",
                    v.get_ref().type_str()
                ),
            )
            .with_hint(hint));
    };
    let Some((1, end)) = winding::shop_pair(s) else {
        return Err(o
            .src
            .error(
                v.span(),
                o.dotted(key),
                format!(
                    "expected a throw such as \"1-14\" (bar 1 first), found \"{}\"",
                    clip(s, ECHO_WIDTH)
                ),
            )
            .with_hint(hint));
    };
    if end < 2 || end > bars {
        return Err(o
            .src
            .error(
                v.span(),
                o.dotted(key),
                format!("a throw to bar {end} does not fit {bars} bars: expected the end lead on bar 2 to {bars}"),
            )
            .with_hint(hint));
    }
    Ok(end as u32)
}

/// `lead_swing`: whole or half bars, −C/2 < swing ≤ C/2.
fn read_swing(o: &TableReader<'_, '_>, bars: i64) -> Result<Option<HalfBars>, Diagnostic> {
    let key = "lead_swing";
    let Some(x) = o.number(
        key,
        -1000.0,
        false,
        1000.0,
        "bar pitches from slot 1's centre line to bar 1",
    )?
    else {
        return Ok(None);
    };
    let halves = x.value * 2.0;
    if halves != halves.round() {
        return Err(o
            .src
            .error(
                x.span.clone(),
                o.dotted(key),
                format!(
                    "a lead swing of {} bars is not a whole number of half bars: expected e.g. 3, 0.5 or -1.5",
                    super::reader::fmt_num(x.value)
                ),
            )
            .with_hint("the cord through slot 1's centre meets a bar or a mica: count to bar 1 in whole bars, or a half for a mica"));
    }
    let (h, c2) = (halves as i64, 2 * bars);
    if h <= -bars || h > bars {
        let short = (h + bars).rem_euclid(c2) - bars;
        return Err(o
            .src
            .error(
                x.span.clone(),
                o.dotted(key),
                format!(
                    "a lead swing of {} bars is more than half of the {bars} bars: expected more than -{} and at most {}",
                    HalfBars(h as i32),
                    HalfBars(bars as i32),
                    HalfBars(bars as i32)
                ),
            )
            .with_hint(format!(
                "count the short way round from slot 1's centre line: {} bars",
                HalfBars(short as i32)
            )));
    }
    Ok(Some(HalfBars(h as i32)))
}

/// `brush_sets`: even, 2 to P.
fn read_brush_sets(o: &TableReader<'_, '_>, poles: i64) -> Result<Option<u32>, Diagnostic> {
    let Some(b) = o.int(
        "brush_sets",
        2..=poles,
        "the brush sets (brush arms) fitted",
        "count the brush arms; at most one by each pole",
    )?
    else {
        return Ok(None);
    };
    if b.value % 2 != 0 {
        return Err(o
            .src
            .error(
                b.span,
                o.dotted("brush_sets"),
                format!("brush sets come in pairs, found {}", b.value),
            )
            .with_hint("count the brush arms again: there are as many positive as negative"));
    }
    Ok(Some(b.value as u32))
}

/// `dead_coils`: slots 1 to S, sorted.
fn read_dead(o: &TableReader<'_, '_>, slots: i64) -> Result<Option<Vec<u32>>, Diagnostic> {
    let Some(v) = o.raw("dead_coils") else {
        return Ok(None);
    };
    let mut list: Vec<u32> = o
        .ints(
            "dead_coils",
            v,
            1..=slots,
            "the slots of the dead (cut and taped) coils",
            "[13]",
        )?
        .into_iter()
        .map(|n| n as u32)
        .collect();
    list.sort_unstable();
    Ok(Some(list))
}

/// `equalizer_taps`: pairs of distinct bars, each 1 to C.
fn read_taps(o: &TableReader<'_, '_>, bars: i64) -> Result<Vec<(u32, u32)>, Diagnostic> {
    let key = "equalizer_taps";
    let Some(v) = o.raw(key) else {
        return Ok(Vec::new());
    };
    let example = "[[1, 13], [4, 16]]";
    let pair_error = |span| {
        o.src
            .error(
                span,
                o.dotted(key),
                "expected pairs of two different bars joined by one equalizer ring",
            )
            .with_hint(format!("write e.g. `{key} = {example}`"))
    };
    let DeValue::Array(items) = v.get_ref() else {
        return Err(pair_error(v.span()));
    };
    let mut out = Vec::new();
    for item in items {
        let pair = o.ints(key, item, 1..=bars, "two bars", example)?;
        match pair.as_slice() {
            [a, b] if a != b => out.push(((*a).min(*b) as u32, (*a).max(*b) as u32)),
            _ => return Err(pair_error(item.span())),
        }
    }
    out.sort_unstable();
    Ok(out)
}
