//! `identify`: from a data card to every winding that fits it, each traced and checked.
//!
//! A feature (`features` stage): it builds candidate [`Design`]s from a [`Card`] and runs each
//! through [`check`] (the one entry to the engine), so a candidate is kept only when its traced
//! winding reproduces the observed throw, span and lead swing exactly. No I/O.
//!
//! The reasoning, for each winding kind, multiplicity m (1 to the design bound) and direction:
//! the kind's commutator pitch y_c on the counted bars C must land the marked coil's end lead
//! on the observed bar (lap: ±m; wave: p·y_c = C ± m) [src: standard textbook relations;
//! docs/domain.md, "Data taking before stripping"]. Coils per slot u: lap uses every coil,
//! so C = u·S; a wave leaves d = u·S − C
//! dummy coils, the fewest that work unless the card lists the dead coils. The lead swing
//! fixes the design's `lead_offset` (the engine's `LeadSwing` convention): the offset is the
//! observed swing less the swing on neutral, then traced again to confirm.

use crate::checks::BAR_RULE;
use crate::checks::{Checked, check};
use crate::design::{
    Card, Commutator, Conductor, Design, DesignSpec, Direction, EqualizerChoice, HalfBars, Limits,
    Mode, SpanSource, WindingType, bounds,
};
use crate::theory::pitch::gcd;
use crate::theory::words::{half_bars_words, multiplicity_word, span_shop};
use crate::theory::{Wave, WindingKind, bar_rule, wave_pitch_whole};
use crate::winding::{EqualizerPlan, place_dummies};

/// One winding that reproduces the card.
#[derive(Clone, Debug)]
pub struct Candidate {
    /// The design, traced and checked.
    pub checked: Checked,
    /// How the observations lead to it, in words.
    pub explanation: String,
}

/// What the card leads to.
#[derive(Clone, Debug)]
pub struct Identified {
    /// Every winding that fits, in a fixed order (lap first, then by m, direction, u).
    pub candidates: Vec<Candidate>,
    /// With several candidates: what tells them apart and which observation decides.
    pub decides: Vec<String>,
    /// With none: which observation conflicts, and the nearest consistent readings.
    pub conflicts: Vec<String>,
    /// The shop's bar-count rule of thumb as a cross-check (common practice), when it speaks
    /// for the pole count.
    pub rule_of_thumb: Option<String>,
}

/// Finds every winding that fits `card`.
pub fn identify(card: &Card) -> Identified {
    let mut candidates = Vec::new();
    let mut rejected = Vec::new();
    let p = card.poles / 2;
    let c = card.bars;
    // Each element puts two leads on every bar, so four leads a bar is a frog-leg: a lap and a
    // wave coil end on every bar [src: a trade association's technical note on frog-leg
    // windings, read in a public copy]. A kind also needs its least poles.
    let kinds: Vec<WindingType> = WindingType::ALL
        .into_iter()
        .filter(|k| {
            2 * k.kind().element_count() == card.leads_per_bar && card.poles >= k.kind().min_poles()
        })
        .collect();
    for kind in kinds {
        for m in 1..=bounds::MAX_MULTIPLICITY as u32 {
            for dir in [Direction::Progressive, Direction::Retrogressive] {
                let k = kind.kind();
                // A kind that may leave dummy coils is only skipped: more coils may suit it.
                if !k.workable(c, c, m, p, dir) {
                    if k.uses_every_coil() {
                        rejected.push(format!(
                            "a {}: {}",
                            kind.as_str(),
                            k.segment_rule(c, c, m, p, dir)
                        ));
                    }
                    continue;
                }
                let yc = k.commutator_pitch(c, m, p, dir);
                if yc.rem_euclid(i64::from(c)) != i64::from(card.throw_bars()) {
                    continue;
                }
                if c < (m + 1) * card.poles {
                    rejected.push(format!(
                        "a {} {} {} throw of 1-{} needs at least {} bars on {} poles ((m + 1) a pole)",
                        dir.as_str(),
                        multiplicity_word(m),
                        kind.as_str(),
                        card.throw_end,
                        (m + 1) * card.poles,
                        card.poles
                    ));
                    continue;
                }
                for u in coil_counts(card, kind, m, p, dir, &mut rejected) {
                    match candidate(card, kind, m, dir, u, yc) {
                        Ok(k) => candidates.push(k),
                        Err(why) => rejected.push(why),
                    }
                }
            }
        }
    }
    let decides = if candidates.len() > 1 {
        what_decides(&candidates)
    } else {
        Vec::new()
    };
    let conflicts = if candidates.is_empty() {
        let mut out = if rejected.is_empty() {
            vec![throw_conflict(card)]
        } else {
            rejected
        };
        out.dedup();
        out
    } else {
        Vec::new()
    };
    let rule_of_thumb = bar_rule(card.poles, c).map(|kind| {
        format!(
            "{c} bars on {} poles suggests {} ({BAR_RULE})",
            card.poles,
            kind.as_str()
        )
    });
    Identified {
        candidates,
        decides,
        conflicts,
        rule_of_thumb,
    }
}

/// The coils per slot that fit `kind`: C = u·S for lap; u·S − C dummies for a wave, the fewest
/// that work (or as many as the card's dead coils).
fn coil_counts(
    card: &Card,
    kind: WindingType,
    m: u32,
    p: u32,
    dir: Direction,
    rejected: &mut Vec<String>,
) -> Vec<u32> {
    let (s, c) = (card.slots, card.bars);
    let us: Vec<u32> = match card.coils_per_slot {
        Some(u) => vec![u],
        None => (1..=bounds::MAX_COILS_PER_SLOT as u32).collect(),
    };
    let name = format!(
        "{} {} {}",
        dir.as_str(),
        multiplicity_word(m),
        kind.as_str()
    );
    let mut out = Vec::new();
    for u in us {
        let n = u * s;
        if n < c || i64::from(n) > bounds::MAX_COILS {
            if card.coils_per_slot.is_some() {
                rejected.push(format!(
                    "a {name}: {c} bars need at least {c} coils, but {u} coil(s) per slot in {s} slots is {n}"
                ));
            }
            continue;
        }
        let fits = if kind.kind().uses_every_coil() {
            n == c
        } else {
            match &card.dead_coils {
                Some(dead) => n - c == dead.len() as u32,
                None => kind.kind().default_segments(n, m, p, dir) == Some(c),
            }
        };
        if fits {
            out.push(u);
        } else if card.coils_per_slot.is_some() || (kind.kind().uses_every_coil() && n > c) {
            rejected.push(match (kind, &card.dead_coils) {
                (k, _) if k.kind().uses_every_coil() => format!(
                    "a {name} uses every coil: {u} coil(s) per slot in {s} slots needs {n} bars, you counted {c}"
                ),
                (_, Some(dead)) => format!(
                    "a {name} with {u} coil(s) per slot in {s} slots leaves {} dummy coil(s), but {} dead coil(s) are listed",
                    n - c,
                    dead.len()
                ),
                _ => format!(
                    "a {name} with {u} coil(s) per slot in {s} slots would take {} bars ({} dummy coil(s)), you counted {c}",
                    kind.kind().default_segments(n, m, p, dir).unwrap_or(0),
                    n - kind.kind().default_segments(n, m, p, dir).unwrap_or(n)
                ),
            });
        }
        if kind.kind().uses_every_coil() && n >= c {
            break;
        }
    }
    out
}

/// Builds, traces and checks one reading; `Err` says why the trace does not reproduce the card.
fn candidate(
    card: &Card,
    kind: WindingType,
    m: u32,
    dir: Direction,
    u: u32,
    yc: i64,
) -> Result<Candidate, String> {
    let name = format!(
        "{} {} {}",
        dir.as_str(),
        multiplicity_word(m),
        kind.as_str()
    );
    let c = card.bars;
    let n = u * card.slots;
    let dummies = dummy_coils(card, u, n - c).map_err(|e| format!("a {name}: {e}"))?;
    let equalizers = equalizer_choice(card, kind).map_err(|e| format!("a {name}: {e}"))?;
    if kind.kind().brush_at_every_pole()
        && let Some(b) = card.brush_sets
        && b != card.poles
    {
        return Err(format!(
            "a {name} needs {} brush sets (one by each pole), you counted {b}",
            card.poles
        ));
    }
    let mut spec = design_spec(card, kind, m, dir, u, dummies.clone(), equalizers);
    let build = |spec: DesignSpec| Design::new(spec).map_err(|e| format!("a {name}: {e}"));
    let neutral = check(build(spec.clone())?)
        .winding
        .lead_swing
        .swing_half_bars(c);
    // Not recorded: symmetric leads, the swing of lead offset 0.
    let observed = card.lead_swing.map_or(neutral, |h| i64::from(h.0));
    let offset = observed - neutral;
    let offset = (offset + i64::from(c)).rem_euclid(2 * i64::from(c)) - i64::from(c);
    if i64::from(card.poles) * offset.abs() >= i64::from(c) {
        return Err(format!(
            "a {name}: a lead swing of {} is {} from neutral (a swing of {}), half a pole pitch or more: the brushes could not sit on neutral",
            half_bars_words(observed),
            half_bars_words(offset),
            half_bars_words(neutral)
        ));
    }
    spec.lead_offset = HalfBars(offset as i32);
    let checked = check(build(spec)?);
    let w = &checked.winding;
    let first = &w.connections[0];
    let swing = w.lead_swing.swing_half_bars(c);
    let span = (first.bottom.slot + card.slots - first.top.slot) % card.slots;
    if first.start_segment != Some(1)
        || first.end_segment != Some(card.throw_end)
        || span != card.coil_span
        || swing != observed
    {
        return Err(format!(
            "a {name} traced with lead offset {} gives a lead swing of {}, not {}",
            HalfBars(offset as i32),
            half_bars_words(swing),
            half_bars_words(observed)
        ));
    }
    if let (Some(e), Some((a, b))) = (w.elements.get(1), card.wave_throw) {
        let k = &w.connections[(e.first_coil - 1) as usize];
        if (k.start_segment, k.end_segment) != (Some(a), Some(b)) {
            return Err(format!(
                "a {name}: its wave coils, traced, throw {}-{} (y_c = {}), not the {a}-{b} seen",
                k.start_segment.unwrap_or(0),
                k.end_segment.unwrap_or(0),
                e.pitches.commutator
            ));
        }
    }
    if let EqualizerPlan::Impossible(why) = &w.equalizers
        && !card.equalizer_taps.is_empty()
    {
        return Err(format!("a {name} cannot take the equalizers seen: {why}"));
    }
    let explanation = explain(card, &checked, yc, n - c, &dummies);
    Ok(Candidate {
        checked,
        explanation,
    })
}

/// The dummy coils for `count` dummies: the default spread when it puts them in the dead
/// slots seen (or when none were listed), else the last coil positions of the dead slots.
fn dummy_coils(card: &Card, u: u32, count: u32) -> Result<Option<Vec<u32>>, String> {
    let Some(dead) = &card.dead_coils else {
        return Ok(None);
    };
    let default = place_dummies(u * card.slots, count);
    let mut slots: Vec<u32> = default.iter().map(|k| (k - 1) / u + 1).collect();
    slots.sort_unstable();
    if &slots == dead {
        return Ok(None);
    }
    let mut coils = Vec::new();
    for (i, &slot) in dead.iter().enumerate() {
        let before = dead[..i].iter().filter(|&&s| s == slot).count() as u32;
        if before >= u {
            return Err(format!(
                "slot {slot} is listed more often than its {u} coil(s)"
            ));
        }
        coils.push(slot * u - before);
    }
    coils.sort_unstable();
    if coils.first() == Some(&1) {
        return Err("the marked coil (coil 1) is listed as dead".to_string());
    }
    Ok(Some(coils))
}

/// The equalizers the taps show: type-A rings C/p bars apart, every k-th ring from bar 1.
fn equalizer_choice(card: &Card, kind: WindingType) -> Result<EqualizerChoice, String> {
    if card.equalizer_taps.is_empty() {
        return Ok(EqualizerChoice::None);
    }
    if !kind.kind().takes_equalizers() {
        return Err(format!(
            "equalizer taps are seen on lap windings; {}",
            kind.kind().no_equalizers_reason()
        ));
    }
    let (c, p) = (card.bars, card.poles / 2);
    if p < 2 || !c.is_multiple_of(p) {
        return Err(format!(
            "type-A equalizers join bars 2C/P = {}/{} apart, which is not whole",
            2 * c,
            card.poles
        ));
    }
    let pitch = c / p;
    let mut k = u64::from(pitch);
    for &(a, b) in &card.equalizer_taps {
        if !(b - a).is_multiple_of(pitch) {
            return Err(format!(
                "bars {a} and {b} are {} apart, not a multiple of the equalizer pitch 2C/P = {pitch}",
                b - a
            ));
        }
        k = gcd(k, u64::from((a - 1) % pitch));
    }
    Ok(if k == 1 {
        EqualizerChoice::Full
    } else {
        EqualizerChoice::EveryNth(k as u32)
    })
}

/// The design a reading of the card gives, for [`Design::new`]; what the card does not say
/// takes the design file's defaults.
fn design_spec(
    card: &Card,
    kind: WindingType,
    m: u32,
    dir: Direction,
    u: u32,
    dummy_coils: Option<Vec<u32>>,
    equalizers: EqualizerChoice,
) -> DesignSpec {
    let n = u * card.slots;
    DesignSpec {
        file_name: card.file_name.clone(),
        job: card.job.clone(),
        poles: card.poles,
        slots: card.slots,
        coils_per_slot: u,
        // The count is written when it leaves dummies or names them, so a reader sees it;
        // otherwise it is the kind's own count for every coil.
        segments: (n != card.bars).then_some(card.bars),
        rotation: card.rotation,
        pole_arc: None,
        winding_type: kind,
        multiplicity: m,
        direction: dir,
        span: card.coil_span,
        span_source: SpanSource::Given,
        turns: card.turns,
        wave_span: card
            .wave_coil_span
            .filter(|_| kind.kind().element_count() > 1),
        wave_turns: None,
        lead_offset: HalfBars::ZERO,
        equalizers,
        dummy_coils,
        flux_per_pole_mwb: None,
        speed_rpm: None,
        mode: Mode::Motor,
        rating: None,
        conductor: card.wire.map(|shape| Conductor {
            shape,
            mean_turn_mm: None,
        }),
        core: None,
        commutator: card.brush_sets.map(|b| Commutator {
            brush_sets: Some(b),
            ..Commutator::default()
        }),
        limits: Limits::default(),
    }
}

fn explain(card: &Card, k: &Checked, yc: i64, dummies: u32, named: &Option<Vec<u32>>) -> String {
    let d = &k.design;
    let (c, p, m) = (card.bars, card.poles / 2, d.multiplicity);
    let sign = if d.direction == Direction::Progressive {
        "+"
    } else {
        "-"
    };
    let wave = k.winding.elements.get(1).map_or(String::new(), |e| {
        format!(
            "; four leads a bar: a frog-leg, whose wave coils' throw {}-{} is y_c = {} = C/p - ({sign}{m}) = {c}/{p} - ({sign}{m}), so y_c(lap) + |y_c(wave)| = C/p (self-equalizing)",
            card.wave_throw.map_or(0, |t| t.0),
            card.wave_throw.map_or(0, |t| t.1),
            e.pitches.commutator
        )
    });
    let pitch = if !d.winding_type.kind().pitch_from_bar_count() {
        format!("the throw 1-{} is y_c = {sign}{m}{wave}", card.throw_end)
    } else {
        format!(
            "the throw 1-{} is y_c = {yc}, and p·y_c = {p}·{yc} = {} = C {sign} {m}",
            card.throw_end,
            i64::from(p) * yc
        )
    };
    let coils = match (dummies, named) {
        (0, _) => format!(
            "{} coil(s) a slot, {} coils, no dummy",
            d.coils_per_slot,
            u64::from(c)
        ),
        (n, None) => format!(
            "{} coil(s) a slot: {} coil positions for {c} bars leaves {n} dummy coil(s), spread evenly",
            d.coils_per_slot,
            c + n
        ),
        (n, Some(list)) => format!(
            "{} coil(s) a slot: {n} dummy coil(s), coil(s) {} in the slots found dead",
            d.coils_per_slot,
            list.iter()
                .map(u32::to_string)
                .collect::<Vec<_>>()
                .join(", ")
        ),
    };
    let equalizers = match (&k.winding.equalizers, d.equalizers) {
        (_, EqualizerChoice::None) => String::new(),
        (EqualizerPlan::Possible(e), choice) => format!(
            "; equalizers {} bars apart (2C/P), {}",
            e.pitch,
            match choice {
                EqualizerChoice::EveryNth(n) => format!("every {n}th possible ring from bar 1"),
                _ => "every possible ring".to_string(),
            }
        ),
        _ => String::new(),
    };
    format!(
        "{} {} {}: {pitch}; {coils}; span {}{equalizers}; with lead offset {} the traced lead swing is {} and the brushes sit on neutral{}",
        d.direction.as_str(),
        multiplicity_word(m),
        d.winding_type.as_str(),
        span_shop(d.span),
        d.lead_offset,
        half_bars_words(k.winding.lead_swing.swing_half_bars(c)),
        if card.lead_swing.is_none() {
            " (the lead swing was not recorded: symmetric leads are assumed, so set the brushes by a neutral test)"
        } else {
            ""
        },
    )
}

/// What tells several candidates apart, and which observation decides.
fn what_decides(list: &[Candidate]) -> Vec<String> {
    let differ = |f: &dyn Fn(&Design) -> String| {
        let mut v: Vec<String> = list.iter().map(|k| f(&k.checked.design)).collect();
        v.dedup();
        (v.len() > 1).then(|| v.join(" or "))
    };
    let mut out = Vec::new();
    if let Some(v) = differ(&|d| d.coils_per_slot.to_string()) {
        out.push(format!(
            "coils per slot {v}: count the leads in one slot (coils_per_slot = leads / 2)"
        ));
    }
    if let Some(v) = differ(&|d| (d.coil_positions() - d.segments).to_string()) {
        out.push(format!(
            "dummy coils {v}: look for coils with their leads cut and taped (dead_coils)"
        ));
    }
    if let Some(v) = differ(&|d| d.winding_type.as_str().to_string()) {
        out.push(format!(
            "{v}: count the brush sets and look for equalizer rings (brush_sets, equalizer_taps)"
        ));
    }
    if let Some(v) = differ(&|d| d.multiplicity.to_string()) {
        out.push(format!(
            "multiplicity {v}: a drop test between neighbouring bars tells the closed windings apart"
        ));
    }
    out
}

/// With no reading left: the throw fits no kind on the counted bars; the nearest counts.
fn throw_conflict(card: &Card) -> String {
    let (c, p, y) = (card.bars, card.poles / 2, card.throw_bars());
    let py = p * y;
    let near: Vec<String> = [py.saturating_sub(1), py + 1]
        .into_iter()
        .filter(|&b| b >= 2 * card.poles)
        .map(|b| b.to_string())
        .collect();
    let wave = if p >= 2 && !near.is_empty() {
        format!(
            "a throw of 1-{} on {} poles needs {} bars (simplex wave); ",
            card.throw_end,
            card.poles,
            near.join(" or ")
        )
    } else {
        String::new()
    };
    let waves: Vec<String> = [Direction::Progressive, Direction::Retrogressive]
        .into_iter()
        .filter(|&dir| p >= 2 && wave_pitch_whole(c, 1, p, dir))
        .map(|dir| format!("1-{}", Wave.commutator_pitch(c, 1, p, dir) + 1))
        .collect();
    let on_bars = if waves.is_empty() {
        format!("on {c} bars a simplex lap throws 1-2 or 1-{c}")
    } else {
        format!(
            "on {c} bars a simplex lap throws 1-2 or 1-{c}, a simplex wave {}",
            waves.join(" or ")
        )
    };
    format!("{wave}you counted {c}; {on_bars}: count the bars and the throw again")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::design::parse_card;

    fn only(observed: &str) -> Candidate {
        let card = parse_card(&format!("[observed]\n{observed}"), "card").unwrap();
        let mut found = identify(&card);
        assert_eq!(found.candidates.len(), 1, "{:?}", found.conflicts);
        found.candidates.remove(0)
    }

    #[test]
    fn what_tells_candidates_apart_names_the_deciding_observation() {
        let a = only(
            "poles = 4\nslots = 25\nbars = 25\ncoil_span = 6\nlead_throw = \"1-14\"\nlead_swing = -3.5\nturns = 2\n",
        );
        let b = only(
            "poles = 4\nslots = 13\nbars = 25\ncoil_span = 3\nlead_throw = \"1-14\"\nlead_swing = -4.5\nturns = 2\n",
        );
        assert_eq!(b.checked.design.coils_per_slot, 2);
        let said = what_decides(&[a, b]);
        assert_eq!(said.len(), 2, "{said:?}");
        assert!(said[0].starts_with("coils per slot 1 or 2: count the leads"));
        assert!(said[1].starts_with("dummy coils 0 or 1"));
    }
}
