//! `[winding]`: the kind of winding, its span, turns, leads and equalizers.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys:
//! - `type` (required): `"lap"`, `"wave"` or `"frog-leg"`; wave and frog-leg need at least 4
//!   poles; a frog-leg winding needs C/p whole;
//! - `multiplicity` (m, default 1): 1 to [`bounds::MAX_MULTIPLICITY`];
//! - `direction`: `"progressive"` (default) or `"retrogressive"`;
//! - `span`: slots, 1 to slots − 1, as a number or the shop form `"1-8"` (= 7); default
//!   floor(slots / poles), at least 1;
//! - `turns` (required): turns per coil, 1 to [`bounds::MAX_TURNS`];
//! - `lead_offset` (default 0): segments, a whole number of half bars (`1`, `0.5`, `-1.5`),
//!   less than half a pole pitch either way;
//! - `equalizers` (lap only, default `"none"`): `"none"`, `"full"` or every n-th connection;
//! - `wave_span` (frog-leg only): the wave coils' span in slots, read like `span`; default
//!   `span`;
//! - `wave_turns` (frog-leg only): the wave coils' turns; default `turns`;
//! - `dummy_coils` (wave only): the coils left unconnected, e.g. `[13, 26]`, exactly N − C of
//!   them and never coil 1; default: spread evenly (⌊k·N/d⌋ for k = 1…d);
//! - `flux_per_pole_mwb`, `speed_rpm`: also accepted in `[rating]`, and read with it
//!   (`tables/rating.rs`).
//!
//! The segment count is resolved here, between the span and the lead offset, by
//! `tables/segments.rs`.

use toml::de::DeValue;

use super::armature::Armature;
use super::segments;
use crate::base::visible::{ECHO_WIDTH, clip};
use crate::design::Diagnostic;
use crate::design::build::{MAX_EQUALIZER_STEP, MAX_LEAD_OFFSET_HALF_BARS};
use crate::design::model::{Direction, EqualizerChoice, HalfBars, SpanSource, WindingType, bounds};
use crate::design::reader::{At, TableReader, fmt_num};

/// The keys of `[winding]`.
pub(crate) const KEYS: &[&str] = &[
    "type",
    "multiplicity",
    "direction",
    "span",
    "turns",
    "lead_offset",
    "equalizers",
    "dummy_coils",
    "wave_span",
    "wave_turns",
    "flux_per_pole_mwb",
    "speed_rpm",
];

/// `[winding]` as read and validated against `[armature]`.
pub(crate) struct Winding {
    /// `type`.
    pub winding_type: WindingType,
    /// `multiplicity`.
    pub multiplicity: i64,
    /// `direction`.
    pub direction: Direction,
    /// `span` in slots.
    pub span: u32,
    /// Whether the span was given.
    pub span_source: SpanSource,
    /// `turns`.
    pub turns: i64,
    /// Active coils = segments, resolved.
    pub segments: i64,
    /// `lead_offset`, in half bars.
    pub lead_offset: i64,
    /// `equalizers`.
    pub equalizers: EqualizerChoice,
    /// `dummy_coils`, sorted.
    pub dummy_coils: Option<Vec<u32>>,
    /// `wave_span` and `wave_turns` as given (frog-leg only; the defaults are filled in by
    /// [`crate::design::Design::new`]).
    pub wave_coils: (Option<u32>, Option<u32>),
}

/// Reads the values of `[winding]` (its keys were checked by the caller) against the
/// armature read from `arm`, recording every problem: the keys that stand alone are read even
/// when `[armature]` is in error (`a` is `None`), the rest only with it. `None` when any value
/// is in error.
pub(crate) fn read(
    win: &TableReader<'_, '_>,
    arm: &TableReader<'_, '_>,
    a: Option<&Armature>,
) -> Option<Winding> {
    let src = win.src;
    let words = WindingType::ALL.map(WindingType::as_str);
    let wtype = win.keep(win.choice("type", &words).and_then(|t| match t {
        // `choice` answers with one of `words`, which are the kinds' words in order.
        Some(At { value, .. }) => {
            Ok(WindingType::ALL[words.iter().position(|w| *w == value).unwrap_or_default()])
        }
        None => Err(win.missing("type", "\"lap\" or \"wave\"", "type = \"lap\"")),
    }));
    let m = win.keep(win.int(
        "multiplicity",
        1..=bounds::MAX_MULTIPLICITY,
        "the multiplicity (1 simplex, 2 duplex, 3 triplex)",
        "use 1 for a simplex winding",
    ));
    let direction = win.keep(win.choice("direction", &["progressive", "retrogressive"]));
    let turns = win.keep(
        win.int(
            "turns",
            1..=bounds::MAX_TURNS,
            "turns per coil",
            "count the turns of one coil",
        )
        .and_then(|t| t.ok_or_else(|| win.missing("turns", "turns per coil", "turns = 3"))),
    );
    let lead_offset = win.keep(read_lead_offset(win));
    let equalizers = wtype.and_then(|t| win.keep(read_equalizers(win, t)));

    // From here on the values are read against the armature.
    let a = a?;
    let poles = &a.poles;
    let span = win.keep(read_span(win, a.slots.value, poles.value));
    let (wtype, m, direction) = (wtype?, m?.map_or(1, |a| a.value), direction?);
    let direction = match direction {
        Some(At {
            value: "retrogressive",
            ..
        }) => Direction::Retrogressive,
        _ => Direction::Progressive,
    };
    let p = poles.value / 2;
    let kind = wtype.kind();
    if poles.value < i64::from(kind.min_poles()) {
        let at = win.raw("type").map_or(win.span.clone(), |v| v.span());
        src.found.push(
            src.error(
                at,
                "winding.type",
                format!(
                    "a {} winding needs at least {} poles; with 2 poles it is a lap winding",
                    kind.word(),
                    kind.min_poles()
                ),
            )
            .with_hint("use type = \"lap\" for a 2-pole armature"),
        );
        return None;
    }

    // Active coils: lap uses every position; wave may need dummies.
    let active = win.keep(segments::resolve(
        &src,
        win,
        arm,
        wtype,
        direction,
        a.positions,
        m,
        p,
        a.segments.as_ref(),
    ))?;
    win.keep(enough_segments(win, a, active, m))?;
    let lead_offset = lead_offset?;
    win.keep(lead_offset_within(
        win,
        lead_offset.as_ref(),
        active,
        poles.value,
    ))?;
    let dummy_coils = win.keep(read_dummy_coils(win, wtype, a.positions, active))?;
    let (span, span_source) = span?;
    let turns = turns?.value;
    let wave_coils = win.keep(read_wave_coils(win, wtype, a.slots.value, poles.value))?;
    Some(Winding {
        winding_type: wtype,
        multiplicity: m,
        direction,
        span,
        span_source,
        turns,
        segments: active,
        lead_offset: lead_offset.map_or(0, |l| l.value),
        equalizers: equalizers?,
        dummy_coils,
        wave_coils,
    })
}

/// At least (m + 1) segments a pole, so the brushes of neighbouring poles do not touch.
fn enough_segments(
    win: &TableReader<'_, '_>,
    a: &Armature,
    active: i64,
    m: i64,
) -> Result<(), Diagnostic> {
    let poles = a.poles.value;
    if active >= (m + 1) * poles {
        return Ok(());
    }
    let at = a
        .segments
        .as_ref()
        .map_or(a.slots.span.clone(), |s| s.span.clone());
    Err(win.src
        .error(
            at,
            "armature.segments",
            format!(
                "{active} segments is too few for {poles} poles and multiplicity {m}: expected at least {} ((m + 1) segments per pole)",
                (m + 1) * poles
            ),
        )
        .with_hint("the brushes of neighbouring poles would touch; check the poles, slots and coils per slot"))
}

/// The lead offset less than half a pole pitch either way.
fn lead_offset_within(
    win: &TableReader<'_, '_>,
    lead_offset: Option<&At<i64>>,
    active: i64,
    poles: i64,
) -> Result<(), Diagnostic> {
    let Some(lo) = lead_offset.filter(|lo| poles * lo.value.abs() >= active) else {
        return Ok(());
    };
    Err(win.src
        .error(
            lo.span.clone(),
            "winding.lead_offset",
            format!(
                "lead offset {} is half a pole pitch or more: expected |lead_offset| < {} segments ({active} segments, {poles} poles)",
                HalfBars(lo.value as i32),
                fmt_half_pitch(active, poles),
            ),
        )
        .with_hint("the offset swings the leads a few segments from the symmetric position; measure it on the old winding"))
}

/// `wave_span` and `wave_turns`, when given: the wave element's coils of a frog-leg winding;
/// refused for lap and wave.
fn read_wave_coils(
    win: &TableReader<'_, '_>,
    wtype: WindingType,
    slots: i64,
    poles: i64,
) -> Result<(Option<u32>, Option<u32>), Diagnostic> {
    let frog = wtype.kind().element_count() > 1;
    if !frog {
        for key in ["wave_span", "wave_turns"] {
            if let Some(v) = win.raw(key) {
                return Err(win
                    .src
                    .error(
                        v.span(),
                        win.dotted(key),
                        format!(
                            "{key} belongs to frog-leg windings: a {} winding has one element",
                            wtype.as_str()
                        ),
                    )
                    .with_hint("remove the key, or set type = \"frog-leg\""));
            }
        }
        return Ok((None, None));
    }
    let wave_span = match win.raw("wave_span") {
        None => None,
        Some(_) => Some(read_span_key(win, "wave_span", slots, poles)?.0),
    };
    let wave_turns = win
        .int(
            "wave_turns",
            1..=bounds::MAX_TURNS,
            "the wave coils' turns",
            "the trade winds both elements with the same turns",
        )?
        .map(|t| t.value as u32);
    Ok((wave_span, wave_turns))
}

/// `dummy_coils`: the coil positions left unconnected (wave only), distinct, 2 to N (coil 1
/// takes segment 1), exactly N − C of them.
fn read_dummy_coils(
    win: &TableReader<'_, '_>,
    wtype: WindingType,
    positions: i64,
    active: i64,
) -> Result<Option<Vec<u32>>, Diagnostic> {
    let key = "dummy_coils";
    let Some(v) = win.raw(key) else {
        return Ok(None);
    };
    let err = |msg: String, hint: String| {
        win.src
            .error(v.span(), win.dotted(key), msg)
            .with_hint(hint)
    };
    if wtype.kind().uses_every_coil() {
        return Err(err(
            format!(
                "dummy coils belong to wave windings: a {} winding uses every coil",
                wtype.as_str()
            ),
            "remove the key".into(),
        ));
    }
    let mut list = win.ints(
        key,
        v,
        2..=positions,
        "the coils left unconnected (coil 1 takes segment 1)",
        "[26]",
    )?;
    list.sort_unstable();
    if let Some(w) = list.windows(2).find(|w| w[0] == w[1]) {
        return Err(err(
            format!("coil {} is listed twice", w[0]),
            "list each dummy coil once".into(),
        ));
    }
    let want = positions - active;
    if list.len() as i64 != want {
        return Err(err(
            format!(
                "{} dummy coil(s) listed, but {positions} coils on {active} segments leave {want}",
                list.len()
            ),
            format!(
                "list {want} coil(s): the dummies are the coils without a segment, N − C of them"
            ),
        ));
    }
    Ok(Some(list.into_iter().map(|n| n as u32).collect()))
}

/// `lead_offset` in half bars: a number from −1000 to 1000 segments that is a whole number of
/// half segment pitches.
fn read_lead_offset(win: &TableReader<'_, '_>) -> Result<Option<At<i64>>, Diagnostic> {
    let most = f64::from(MAX_LEAD_OFFSET_HALF_BARS) / 2.0;
    let Some(lo) = win.number(
        "lead_offset",
        -most,
        false,
        most,
        "the lead offset in segments",
    )?
    else {
        return Ok(None);
    };
    let halves = lo.value * 2.0;
    if halves != halves.round() {
        return Err(win
            .src
            .error(
                lo.span.clone(),
                "winding.lead_offset",
                format!(
                    "lead offset {} is not a whole number of half bars: expected a whole number of segments or a half (e.g. 1, 0.5, -1.5)",
                    fmt_num(lo.value)
                ),
            )
            .with_hint("0 puts the slot's coil group symmetric about its centre line; the brush then sits on neutral. Round to the nearest half bar"));
    }
    Ok(Some(At {
        value: halves as i64,
        span: lo.span,
    }))
}

fn fmt_half_pitch(c: i64, poles: i64) -> String {
    let half = c as f64 / (2.0 * poles as f64);
    fmt_num((half * 100.0).round() / 100.0)
}

/// The two numbers of a shop form such as `"1-8"` (a span: slots 1 and 8) or `"1-14"` (a
/// lead throw: bars 1 and 14); an en or em dash reads as a hyphen.
pub(crate) fn shop_pair(s: &str) -> Option<(i64, i64)> {
    let norm = s.replace(['–', '—'], "-");
    let (a, b) = norm.split_once('-')?;
    Some((a.trim().parse().ok()?, b.trim().parse().ok()?))
}

fn read_span(
    t: &TableReader<'_, '_>,
    slots: i64,
    poles: i64,
) -> Result<(u32, SpanSource), Diagnostic> {
    read_span_key(t, "span", slots, poles)
}

/// A span in slots under `key` (`span`, `wave_span`): a number or the shop form.
fn read_span_key(
    t: &TableReader<'_, '_>,
    key: &str,
    slots: i64,
    poles: i64,
) -> Result<(u32, SpanSource), Diagnostic> {
    let Some(v) = t.raw(key) else {
        return Ok(((slots / poles).max(1) as u32, SpanSource::Default));
    };
    let src = t.src;
    let max = slots - 1;
    let hint = format!("the span is in slots: 1 to {max}; near {slots}/{poles} = one pole pitch");
    let value = match v.get_ref() {
        DeValue::Integer(_) => t
            .int(key, i64::MIN..=i64::MAX, "the coil span in slots", &hint)?
            .map(|a| a.value),
        DeValue::String(s) => shop_pair(s)
            .filter(|&(a, b)| a >= 1 && b > a)
            .map(|(a, b)| b - a)
            .ok_or_else(|| {
                src.error(
                    v.span(),
                    t.dotted(key),
                    format!(
                        "expected a span such as 7 or \"1-8\", found \"{}\"",
                        clip(s, ECHO_WIDTH)
                    ),
                )
                .with_hint(
                    "the shop form \"1-8\" means the coil lies in slots 1 and 8, a span of 7 slots",
                )
            })
            .map(Some)?,
        other => {
            return Err(src
                .error(
                    v.span(),
                    t.dotted(key),
                    format!(
                        "expected a span such as 7 or \"1-8\", found {}",
                        other.type_str()
                    ),
                )
                .with_hint(hint));
        }
    };
    let value = value.unwrap_or(0);
    if value < 1 || value > max {
        return Err(src
            .error(
                v.span(),
                t.dotted(key),
                format!(
                    "{key} {value} is out of range: expected 1 to {max} slots for {slots} slots"
                ),
            )
            .with_hint(hint));
    }
    Ok((value as u32, SpanSource::Given))
}

fn read_equalizers(
    t: &TableReader<'_, '_>,
    wtype: WindingType,
) -> Result<EqualizerChoice, Diagnostic> {
    let Some(v) = t.raw("equalizers") else {
        return Ok(EqualizerChoice::None);
    };
    let choice = match v.get_ref() {
        DeValue::String(_) => match t.choice("equalizers", &["none", "full"])? {
            Some(At { value: "full", .. }) => EqualizerChoice::Full,
            _ => EqualizerChoice::None,
        },
        DeValue::Integer(_) => {
            let n = t
                .int(
                    "equalizers",
                    1..=i64::from(MAX_EQUALIZER_STEP),
                    "\"none\", \"full\" or every n-th possible connection",
                    "2 fits every second connection",
                )?
                .map_or(1, |a| a.value);
            if n == 1 {
                EqualizerChoice::Full
            } else {
                EqualizerChoice::EveryNth(n as u32)
            }
        }
        other => {
            return Err(t
                .src
                .error(
                    v.span(),
                    "winding.equalizers",
                    format!(
                        "expected \"none\", \"full\" or a whole number n, found {}",
                        other.type_str()
                    ),
                )
                .with_hint("equalizers = 3 fits every third possible connection"));
        }
    };
    if !wtype.kind().takes_equalizers() && choice != EqualizerChoice::None {
        return Err(t
            .src
            .error(
                v.span(),
                "winding.equalizers",
                format!(
                    "equalizers belong to lap windings: {}",
                    wtype.kind().no_equalizers_reason()
                ),
            )
            .with_hint("remove the key or set equalizers = \"none\""));
    }
    Ok(choice)
}
