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

use crate::base::number::{counted, fmt_fixed, plural};
use crate::checks::BAR_RULE;
use crate::checks::{Checked, check};
use crate::design::{
    Card, Commutator, Conductor, Design, DesignSpec, Direction, EqualizerChoice, HalfBars, Limits,
    Mode, SpanSource, WindingType, bounds,
};
use crate::theory::pitch::{SpanAngle, gcd};
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
    /// When nothing fits, or the most usual fit is unusual (multiplex, dummy coils the card does
    /// not list, or refused by `check`): the readings one off that give a more usual winding.
    pub recount: Option<Recount>,
}

/// The readings one off that give a more usual winding: a bar or a throw miscounted by one
/// turns a simplex wave into a duplex or triplex one [common practice].
#[derive(Clone, Debug)]
pub struct Recount {
    /// Each more usual winding `check` passes, with the readings that give it, e.g. "99 bars,
    /// or a throw of 1-51, gives a progressive simplex wave with no dummy coil".
    pub readings: Vec<String>,
    /// The simplex throws on the bars counted.
    pub simplex_throws: String,
}

impl Identified {
    /// Whether the one fit should be held back until it is picked: it is unusual and a reading
    /// one off gives a more usual winding.
    pub fn doubtful(&self) -> bool {
        self.recount
            .as_ref()
            .is_some_and(|r| !r.readings.is_empty())
    }
}

/// How usual a reading is, least first: refused by `check`, then multiplicity, then dummy
/// coils the card does not list (the trade's first choice is a simplex winding on every coil;
/// listed dead coils are observed, not guessed).
fn usualness(card: &Card, k: &Candidate) -> (bool, u32, u32) {
    let d = &k.checked.design;
    let unlisted = if card.dead_coils.is_some() {
        0
    } else {
        d.dummy_count()
    };
    (k.checked.has_errors(), d.multiplicity, unlisted)
}

/// The most usual reading of all.
const USUAL: (bool, u32, u32) = (false, 1, 0);

/// Finds every winding that fits `card`, the most usual first; when that is not a plain
/// simplex winding `check` passes, also the readings one off that give one.
pub fn identify(card: &Card) -> Identified {
    let mut found = fits(card);
    let best = found.candidates.first().map(|k| usualness(card, k));
    if best != Some(USUAL) {
        let r = recount(card, best);
        // A simplex fit `check` passes whose only oddity is a dummy coil is the wave's usual
        // remedy; it is questioned only when a reading one off avoids the dummy.
        let only_dummies = best.is_some_and(|(fails, m, _)| !fails && m == 1);
        if !(only_dummies && r.readings.is_empty()) {
            found.recount = Some(r);
        }
    }
    found
}

/// The neighbouring cards: the bars and the throw each counted one off.
fn neighbours(card: &Card) -> Vec<(String, Card)> {
    let mut out = Vec::new();
    for bars in [card.bars.checked_sub(1), card.bars.checked_add(1)]
        .into_iter()
        .flatten()
    {
        let fits_bars = |b: u32| b <= bars;
        let in_range = card.throw_end <= bars
            && card.equalizer_taps.iter().all(|&(_, b)| fits_bars(b))
            && card
                .wave_throw
                .is_none_or(|(a, b)| fits_bars(a) && fits_bars(b))
            && bars >= card.poles;
        if in_range {
            out.push((
                format!("{bars} bars"),
                Card {
                    bars,
                    ..card.clone()
                },
            ));
        }
    }
    for end in [card.throw_end - 1, card.throw_end + 1] {
        if (2..=card.bars).contains(&end) {
            out.push((
                format!("a throw of 1-{end}"),
                Card {
                    throw_end: end,
                    ..card.clone()
                },
            ));
        }
    }
    out
}

/// The readings one off whose most usual fit is a simplex winding `check` passes and more
/// usual than `best`, grouped by the winding they give.
fn recount(card: &Card, best: Option<(bool, u32, u32)>) -> Recount {
    let mut readings: Vec<(String, Vec<String>)> = Vec::new();
    for (reading, other) in neighbours(card) {
        let found = fits(&other);
        let Some(k) = found.candidates.first() else {
            continue;
        };
        let key = usualness(&other, k);
        if key.0 || key.1 != 1 || best.is_some_and(|b| key >= b) {
            continue;
        }
        let d = &k.checked.design;
        let dummies = d.dummy_count();
        let words = format!(
            "{} {} {} with {}",
            d.direction.as_str(),
            multiplicity_word(d.multiplicity),
            d.winding_type.as_str(),
            match dummies {
                0 => "no dummy coil".to_string(),
                n => counted(n, "dummy coil", "dummy coils"),
            }
        );
        match readings.iter_mut().find(|(w, _)| *w == words) {
            Some((_, list)) => list.push(reading),
            None => readings.push((words, vec![reading])),
        }
    }
    Recount {
        readings: readings
            .into_iter()
            .map(|(words, list)| format!("{} gives a {words}", list.join(", or ")))
            .collect(),
        simplex_throws: simplex_throws(card),
    }
}

/// Every winding that fits `card`, the most usual first.
fn fits(card: &Card) -> Identified {
    let mut candidates = Vec::new();
    let mut rejected = Vec::new();
    if let Some(why) = span_conflict(card) {
        return Identified {
            candidates,
            decides: Vec::new(),
            conflicts: vec![why],
            rule_of_thumb: None,
            recount: None,
        };
    }
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
    candidates.sort_by_key(|k| usualness(card, k));
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
        recount: None,
    }
}

/// A recorded span whose sides would lie under poles of the same polarity: no winding fits it,
/// whatever the bars and the throw say (the rule is [`SpanAngle`]'s, as `check` applies it).
fn span_conflict(card: &Card) -> Option<String> {
    let spans = [
        Some(("coil span", card.coil_span)),
        card.wave_coil_span.map(|y| ("wave coil span", y)),
    ];
    spans.into_iter().flatten().find_map(|(what, y)| {
        let angle = SpanAngle::new(y, card.slots, card.poles);
        (!angle.opposite_poles()).then(|| {
            format!(
                "the {what} {} is {y} slots, {} pole pitches of {} slots ({} electrical degrees): the coil's sides would lie under poles of the same polarity and it would make little or no EMF; count the span again from the marked slot as 1 (a pole pitch is near {})",
                span_shop(y),
                fmt_fixed(angle.pole_pitches, 2),
                fmt_fixed(f64::from(card.slots) / f64::from(card.poles), 2),
                fmt_fixed(angle.electrical_deg, 1),
                span_shop((card.slots / card.poles).max(1))
            )
        })
    })
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
    let listed = card.dead_coils.as_ref().filter(|dead| !dead.is_empty());
    if let (true, Some(dead)) = (kind.kind().uses_every_coil(), listed) {
        rejected.push(format!(
            "a {name} uses every coil, so none is dead, but dead coils are listed in slot(s) {}: look again at those slots (a dead coil has its leads cut and taped, and a lap never has one)",
            dead.iter().map(u32::to_string).collect::<Vec<_>>().join(", ")
        ));
        return out;
    }
    // A dead-coil count that conflicts is said once, for the fewest coils that hold the bars,
    // so the conflict is laid on the dead coils and not on the bars and throw that fit.
    let mut dead_told = false;
    for u in us {
        let n = u * s;
        if n < c || i64::from(n) > bounds::MAX_COILS {
            if card.coils_per_slot.is_some() {
                rejected.push(format!(
                    "a {name}: {c} bars need at least {c} coils, but {} per slot in {s} slots is {n}",
                    counted(u, "coil", "coils")
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
        } else if card.coils_per_slot.is_some()
            || (kind.kind().uses_every_coil() && n > c)
            || (card.dead_coils.is_some() && !dead_told)
        {
            dead_told |= card.dead_coils.is_some();
            rejected.push(match (kind, &card.dead_coils) {
                (k, _) if k.kind().uses_every_coil() => format!(
                    "a {name} uses every coil: {} per slot in {s} slots needs {n} bars, you counted {c}",
                    counted(u, "coil", "coils")
                ),
                (_, Some(dead)) => format!(
                    "a {name} with {} per slot in {s} slots leaves {}, but {} listed",
                    counted(u, "coil", "coils"),
                    counted(n - c, "dummy coil", "dummy coils"),
                    match dead.len() {
                        1 => "1 dead coil is".to_string(),
                        k => format!("{k} dead coils are"),
                    }
                ),
                _ => format!(
                    "a {name} with {} per slot in {s} slots would take {} bars ({}), you counted {c}",
                    counted(u, "coil", "coils"),
                    kind.kind().default_segments(n, m, p, dir).unwrap_or(0),
                    counted(
                        n - kind.kind().default_segments(n, m, p, dir).unwrap_or(n),
                        "dummy coil",
                        "dummy coils"
                    )
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
        let pole_pitch = f64::from(card.slots) / f64::from(card.poles);
        let off = f64::from(card.coil_span) - pole_pitch;
        let span = if off.abs() > 1.0 {
            format!(
                "; the coil span {} is {} slots {} than the pole pitch ({} slots), which moves neutral: count the span again before the swing",
                span_shop(card.coil_span),
                fmt_fixed(off.abs(), 2),
                if off > 0.0 { "longer" } else { "shorter" },
                fmt_fixed(pole_pitch, 2)
            )
        } else {
            String::new()
        };
        return Err(format!(
            "a {name}: a lead swing of {} is {} from neutral (a swing of {}), half a pole pitch or more: the brushes could not sit on neutral{span}",
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
                "slot {slot} is listed more often than its {}",
                counted(u, "coil", "coils")
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
        units: card.units,
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
            "{} a slot, {} coils, no dummy",
            counted(d.coils_per_slot, "coil", "coils"),
            u64::from(c)
        ),
        (n, None) => format!(
            "{} a slot: {} coil positions for {c} bars leaves {}, spread evenly",
            counted(d.coils_per_slot, "coil", "coils"),
            c + n,
            counted(n, "dummy coil", "dummy coils")
        ),
        (n, Some(list)) => format!(
            "{} a slot: {}, {} {} in the slots found dead",
            counted(d.coils_per_slot, "coil", "coils"),
            counted(n, "dummy coil", "dummy coils"),
            plural(list.len(), "coil", "coils"),
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
    if let Some(v) = differ(&|d| (d.dummy_count()).to_string()) {
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
    format!(
        "{wave}you counted {c}; {}: count the bars and the throw again",
        simplex_throws(card)
    )
}

/// The simplex throws on the bars counted: "on 99 bars a simplex lap throws 1-2 or 1-99, a
/// simplex wave 1-51 or 1-50".
fn simplex_throws(card: &Card) -> String {
    let (c, p) = (card.bars, card.poles / 2);
    let waves: Vec<String> = [Direction::Progressive, Direction::Retrogressive]
        .into_iter()
        .filter(|&dir| p >= 2 && wave_pitch_whole(c, 1, p, dir))
        .map(|dir| format!("1-{}", Wave.commutator_pitch(c, 1, p, dir) + 1))
        .collect();
    if waves.is_empty() {
        format!("on {c} bars a simplex lap throws 1-2 or 1-{c}")
    } else {
        format!(
            "on {c} bars a simplex lap throws 1-2 or 1-{c}, a simplex wave {}",
            waves.join(" or ")
        )
    }
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

    /// The most usual reading first: simplex before multiplex, no dummy before dummies
    /// unless the card lists dead coils, and what `check` refuses last.
    #[test]
    fn candidates_are_ranked_by_how_usual_they_are() {
        let plain = only(
            "poles = 4\nslots = 25\nbars = 25\ncoil_span = 6\nlead_throw = \"1-14\"\nturns = 2\n",
        );
        let dummy = only(
            "poles = 4\nslots = 13\nbars = 25\ncoil_span = 3\nlead_throw = \"1-14\"\nturns = 2\n",
        );
        let triplex = only(
            "poles = 4\nslots = 33\nbars = 99\ncoil_span = 8\nlead_throw = \"1-52\"\nturns = 2\n",
        );
        let refused = only(
            "poles = 4\nslots = 27\nbars = 27\ncoil_span = 6\nlead_throw = \"1-2\"\nturns = 2\n",
        );
        let card = parse_card("[observed]\npoles = 4\nslots = 25\nbars = 25\ncoil_span = 6\nlead_throw = \"1-14\"\nturns = 2\n", "card").unwrap();
        let mut list = [&refused, &triplex, &dummy, &plain];
        list.sort_by_key(|k| usualness(&card, k));
        let m: Vec<(u32, u32, bool)> = list
            .iter()
            .map(|k| {
                let d = &k.checked.design;
                (d.multiplicity, d.dummy_count(), k.checked.has_errors())
            })
            .collect();
        assert_eq!(
            m,
            [(1, 0, false), (1, 1, false), (3, 0, false), (1, 0, true)]
        );
        // Dead coils listed on the card: the dummies are observed, not guessed.
        let listed = Card {
            dead_coils: Some(vec![13]),
            ..card
        };
        assert_eq!(usualness(&listed, &dummy), usualness(&listed, &plain));
    }
}
