//! `Design::new`: the one constructor of a [`Design`], from a [`DesignSpec`].
//!
//! Part of the `design` stage. The parser, identify and the rewind all build their design
//! here, so a `Design` that a later stage sees has passed one set of checks: the ranges of
//! [`bounds`], the winding kind's rules (least poles, a workable segment count, equalizers,
//! dummy coils, a frog-leg's wave coils), the lead offset and the brush sets. The defaults are
//! written here once: the pole arc ([`DEFAULT_POLE_ARC`]), the rotation, the segment count
//! (worked out for the kind), the wave coils' span and turns.
//!
//! The parser checks the same rules first, table by table, to point at the key in the file;
//! for a parsed file these checks are a second guard. For identify and the rewind they are
//! the guard, and the CLI parses every file it writes back as a third.

use super::model::*;
use crate::base::Units;

/// `[armature] pole_arc` when the file gives none: pole arc / pole pitch.
pub const DEFAULT_POLE_ARC: f64 = 0.7;

/// Least and largest `[armature] pole_arc`.
pub const POLE_ARC_RANGE: std::ops::RangeInclusive<f64> = 0.3..=1.0;

/// Largest `[winding] lead_offset`, in half bars (1,000 segments either way).
pub const MAX_LEAD_OFFSET_HALF_BARS: i32 = 2_000;

/// Largest `equalizers = n` (every n-th possible connection).
pub const MAX_EQUALIZER_STEP: u32 = 10_000;

/// The values of a design before they are checked: what the parser read, what identify
/// observed on a card, what a rewind asks for. `None` takes the default.
#[derive(Clone, Debug, PartialEq)]
pub struct DesignSpec {
    /// The file name as given.
    pub file_name: String,
    /// The length system the design is written in (lengths are held in mm either way).
    pub units: Units,
    /// `[job]`.
    pub job: Job,
    /// `[armature] poles`.
    pub poles: u32,
    /// `[armature] slots`.
    pub slots: u32,
    /// `[armature] coils_per_slot` (u).
    pub coils_per_slot: u32,
    /// `[armature] segments`; `None` works it out for the winding kind.
    pub segments: Option<u32>,
    /// `[armature] rotation`; `None` is clockwise.
    pub rotation: Option<Rotation>,
    /// `[armature] pole_arc`; `None` is [`DEFAULT_POLE_ARC`].
    pub pole_arc: Option<f64>,
    /// `[winding] type`.
    pub winding_type: WindingType,
    /// `[winding] multiplicity`.
    pub multiplicity: u32,
    /// `[winding] direction`.
    pub direction: Direction,
    /// `[winding] span`, slots.
    pub span: u32,
    /// Whether the span was given or defaulted.
    pub span_source: SpanSource,
    /// `[winding] turns`.
    pub turns: u32,
    /// `[winding] wave_span` (a frog-leg's wave coils); `None` is `span`.
    pub wave_span: Option<u32>,
    /// `[winding] wave_turns`; `None` is `turns`.
    pub wave_turns: Option<u32>,
    /// `[winding] lead_offset`, half bars.
    pub lead_offset: HalfBars,
    /// `[winding] equalizers`.
    pub equalizers: EqualizerChoice,
    /// `[winding] dummy_coils`.
    pub dummy_coils: Option<Vec<u32>>,
    /// Flux per pole, mWb.
    pub flux_per_pole_mwb: Option<f64>,
    /// Speed, rpm.
    pub speed_rpm: Option<f64>,
    /// `[rating] mode`.
    pub mode: Mode,
    /// `[rating]`.
    pub rating: Option<Rating>,
    /// `[conductor]`.
    pub conductor: Option<Conductor>,
    /// `[core]`.
    pub core: Option<Core>,
    /// `[commutator]`.
    pub commutator: Option<Commutator>,
    /// `[limits]`, defaults filled in.
    pub limits: super::Limits,
}

/// Why a [`DesignSpec`] is not a design that can be wound: the design-file key and the
/// reason, in words.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct DesignError {
    /// The design-file key, e.g. `winding.dummy_coils`.
    pub key: &'static str,
    /// What is wrong, lower-case.
    pub message: String,
}

impl std::fmt::Display for DesignError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: {}", self.key, self.message)
    }
}

impl std::error::Error for DesignError {}

/// `Err` with `key` and `message` unless `ok`.
fn ensure(
    ok: bool,
    key: &'static str,
    message: impl FnOnce() -> String,
) -> Result<(), DesignError> {
    if ok {
        Ok(())
    } else {
        Err(DesignError {
            key,
            message: message(),
        })
    }
}

/// Whether `v` lies in `lo..=hi` (as i64, so a `u32` never wraps).
fn within(v: u32, lo: i64, hi: i64) -> bool {
    (lo..=hi).contains(&i64::from(v))
}

/// Whether an optional quantity is above zero and at most `max`.
fn positive_up_to(v: Option<f64>, max: f64) -> bool {
    v.is_none_or(|x| x > 0.0 && x <= max)
}

impl Design {
    /// The one constructor: checks `spec` and fills in its defaults.
    pub fn new(spec: DesignSpec) -> Result<Design, DesignError> {
        check_armature(&spec)?;
        let segments = resolve_segments(&spec)?;
        check_winding(&spec, segments)?;
        let dummy_coils = check_dummy_coils(&spec, segments)?;
        check_ratings(&spec)?;
        let several = spec.winding_type.kind().element_count() > 1;
        Ok(Design {
            file_name: spec.file_name,
            job: spec.job,
            poles: spec.poles,
            slots: spec.slots,
            coils_per_slot: spec.coils_per_slot,
            segments,
            segments_derived: spec.segments.is_none(),
            rotation: spec.rotation.unwrap_or(Rotation::Clockwise),
            pole_arc: spec.pole_arc.unwrap_or(DEFAULT_POLE_ARC),
            winding_type: spec.winding_type,
            multiplicity: spec.multiplicity,
            direction: spec.direction,
            span: spec.span,
            span_source: spec.span_source,
            turns: spec.turns,
            wave_coils: several.then(|| WaveCoils {
                span: spec.wave_span.unwrap_or(spec.span),
                turns: spec.wave_turns.unwrap_or(spec.turns),
            }),
            lead_offset: spec.lead_offset,
            equalizers: spec.equalizers,
            dummy_coils,
            flux_per_pole_mwb: spec.flux_per_pole_mwb,
            speed_rpm: spec.speed_rpm,
            mode: spec.mode,
            rating: spec.rating,
            conductor: spec.conductor,
            core: spec.core,
            commutator: spec.commutator,
            limits: spec.limits,
            units: spec.units,
            sealed: Sealed(()),
        })
    }

    /// The values this design was built from, to change some and build a new one with
    /// [`Design::new`] (a worked-out segment count stays worked out).
    pub fn spec(&self) -> DesignSpec {
        DesignSpec {
            file_name: self.file_name.clone(),
            units: self.units,
            job: self.job.clone(),
            poles: self.poles,
            slots: self.slots,
            coils_per_slot: self.coils_per_slot,
            segments: (!self.segments_derived).then_some(self.segments),
            rotation: Some(self.rotation),
            pole_arc: Some(self.pole_arc),
            winding_type: self.winding_type,
            multiplicity: self.multiplicity,
            direction: self.direction,
            span: self.span,
            span_source: self.span_source,
            turns: self.turns,
            wave_span: self.wave_coils.map(|w| w.span),
            wave_turns: self.wave_coils.map(|w| w.turns),
            lead_offset: self.lead_offset,
            equalizers: self.equalizers,
            dummy_coils: self.dummy_coils.clone(),
            flux_per_pole_mwb: self.flux_per_pole_mwb,
            speed_rpm: self.speed_rpm,
            mode: self.mode,
            rating: self.rating.clone(),
            conductor: self.conductor.clone(),
            core: self.core.clone(),
            commutator: self.commutator.clone(),
            limits: self.limits.clone(),
        }
    }
}

/// Poles, slots, coils per slot, the coil count and the pole arc.
fn check_armature(s: &DesignSpec) -> Result<(), DesignError> {
    ensure(
        s.poles.is_multiple_of(2) && within(s.poles, 2, bounds::MAX_POLES),
        "armature.poles",
        || {
            format!(
                "expected an even pole count, 2 to {}, found {}",
                bounds::MAX_POLES,
                s.poles
            )
        },
    )?;
    ensure(
        within(s.slots, 2, bounds::MAX_SLOTS),
        "armature.slots",
        || {
            format!(
                "expected 2 to {} slots, found {}",
                bounds::MAX_SLOTS,
                s.slots
            )
        },
    )?;
    ensure(
        within(s.coils_per_slot, 1, bounds::MAX_COILS_PER_SLOT),
        "armature.coils_per_slot",
        || {
            format!(
                "expected 1 to {} coils per slot, found {}",
                bounds::MAX_COILS_PER_SLOT,
                s.coils_per_slot
            )
        },
    )?;
    let positions = u64::from(s.slots) * u64::from(s.coils_per_slot);
    ensure(
        positions <= bounds::MAX_COILS as u64,
        "armature.coils_per_slot",
        || {
            format!(
                "{positions} coils is beyond any real machine: at most {}",
                bounds::MAX_COILS
            )
        },
    )?;
    ensure(
        s.pole_arc.is_none_or(|a| POLE_ARC_RANGE.contains(&a)),
        "armature.pole_arc",
        || format!("expected a pole arc of 0.3 to 1, found {:?}", s.pole_arc),
    )
}

/// The segment count: as given when the kind can wind it, or worked out for the kind; at
/// least (m + 1) segments a pole.
fn resolve_segments(s: &DesignSpec) -> Result<u32, DesignError> {
    let kind = s.winding_type.kind();
    ensure(
        within(s.multiplicity, 1, bounds::MAX_MULTIPLICITY),
        "winding.multiplicity",
        || {
            format!(
                "expected 1 to {}, found {}",
                bounds::MAX_MULTIPLICITY,
                s.multiplicity
            )
        },
    )?;
    ensure(s.poles >= kind.min_poles(), "winding.type", || {
        format!(
            "a {} winding needs at least {} poles",
            kind.word(),
            kind.min_poles()
        )
    })?;
    let (n, m, p) = (s.slots * s.coils_per_slot, s.multiplicity, s.poles / 2);
    let c = match s.segments {
        Some(c) => c,
        None => kind
            .default_segments(n, m, p, s.direction)
            .ok_or_else(|| DesignError {
                key: "winding.type",
                message: "no segment count up to the coil count gives a whole commutator pitch"
                    .to_string(),
            })?,
    };
    ensure(
        kind.workable(c, n, m, p, s.direction),
        "armature.segments",
        || kind.segment_rule(c, n, m, p, s.direction),
    )?;
    ensure(
        u64::from(c) >= u64::from(m + 1) * u64::from(s.poles),
        "armature.segments",
        || {
            format!(
                "{c} segments is too few for {} poles and multiplicity {m}",
                s.poles
            )
        },
    )?;
    Ok(c)
}

/// Span, turns, a frog-leg's wave coils, the lead offset, equalizers and brush sets.
fn check_winding(s: &DesignSpec, segments: u32) -> Result<(), DesignError> {
    let kind = s.winding_type.kind();
    let span_ok = |span: u32| span >= 1 && span < s.slots;
    let turns_ok = |t: u32| within(t, 1, bounds::MAX_TURNS);
    ensure(span_ok(s.span), "winding.span", || {
        format!(
            "expected a span of 1 to {} slots, found {}",
            s.slots - 1,
            s.span
        )
    })?;
    ensure(turns_ok(s.turns), "winding.turns", || {
        format!(
            "expected 1 to {} turns, found {}",
            bounds::MAX_TURNS,
            s.turns
        )
    })?;
    let several = kind.element_count() > 1;
    for (key, given, ok) in [
        (
            "winding.wave_span",
            s.wave_span,
            s.wave_span.is_none_or(span_ok),
        ),
        (
            "winding.wave_turns",
            s.wave_turns,
            s.wave_turns.is_none_or(turns_ok),
        ),
    ] {
        ensure(given.is_none() || several, key, || {
            format!(
                "{key} belongs to frog-leg windings: a {} winding has one element",
                kind.word()
            )
        })?;
        ensure(ok, key, || format!("out of range: {given:?}"))?;
    }
    let lo = s.lead_offset.0.unsigned_abs();
    ensure(
        lo <= MAX_LEAD_OFFSET_HALF_BARS as u32
            && u64::from(s.poles) * u64::from(lo) < u64::from(segments),
        "winding.lead_offset",
        || format!("lead offset {} is half a pole pitch or more", s.lead_offset),
    )?;
    ensure(
        kind.takes_equalizers() || s.equalizers == EqualizerChoice::None,
        "winding.equalizers",
        || kind.no_equalizers_reason().to_string(),
    )?;
    ensure(
        !matches!(s.equalizers, EqualizerChoice::EveryNth(k) if !(2..=MAX_EQUALIZER_STEP).contains(&k)),
        "winding.equalizers",
        || format!("expected every n-th connection, n = 2 to {MAX_EQUALIZER_STEP}"),
    )?;
    if let Some(sets) = s.commutator.as_ref().and_then(|k| k.brush_sets) {
        ensure(
            sets.is_multiple_of(2) && sets <= s.poles && sets >= kind.fewest_brush_sets(s.poles),
            "commutator.brush_sets",
            || {
                format!(
                    "{sets} brush sets on a {}-pole {} winding: expected an even number from {} to {}",
                    s.poles,
                    kind.word(),
                    kind.fewest_brush_sets(s.poles),
                    s.poles
                )
            },
        )?;
    }
    Ok(())
}

/// The dummy coils, sorted: only for a kind that may leave them, distinct, 2 to N, N − C of
/// them.
fn check_dummy_coils(s: &DesignSpec, segments: u32) -> Result<Option<Vec<u32>>, DesignError> {
    let Some(list) = &s.dummy_coils else {
        return Ok(None);
    };
    let kind = s.winding_type.kind();
    let key = "winding.dummy_coils";
    ensure(!kind.uses_every_coil(), key, || {
        format!(
            "dummy coils belong to wave windings: a {} winding uses every coil",
            kind.word()
        )
    })?;
    let n = s.slots * s.coils_per_slot;
    let mut list = list.clone();
    list.sort_unstable();
    ensure(list.iter().all(|&d| (2..=n).contains(&d)), key, || {
        format!("expected coils 2 to {n}")
    })?;
    ensure(list.windows(2).all(|w| w[0] != w[1]), key, || {
        "a coil is listed twice".to_string()
    })?;
    ensure(list.len() as u64 == u64::from(n - segments), key, || {
        format!(
            "{} dummy coil(s) listed, but {n} coils on {segments} segments leave {}",
            list.len(),
            n - segments
        )
    })?;
    Ok(Some(list))
}

/// Flux, speed, rated voltage and current and turns in range.
fn check_ratings(s: &DesignSpec) -> Result<(), DesignError> {
    ensure(
        positive_up_to(s.flux_per_pole_mwb, bounds::MAX_FLUX_MWB),
        "rating.flux_per_pole_mwb",
        || format!("expected above 0 and at most {} mWb", bounds::MAX_FLUX_MWB),
    )?;
    ensure(
        positive_up_to(s.speed_rpm, bounds::MAX_SPEED_RPM),
        "rating.speed_rpm",
        || format!("expected above 0 and at most {} rpm", bounds::MAX_SPEED_RPM),
    )?;
    let r = s.rating.as_ref();
    ensure(
        positive_up_to(r.and_then(|r| r.voltage), bounds::MAX_VOLTAGE),
        "rating.voltage",
        || format!("expected above 0 and at most {} V", bounds::MAX_VOLTAGE),
    )?;
    ensure(
        positive_up_to(r.and_then(|r| r.current), bounds::MAX_CURRENT_A),
        "rating.current",
        || format!("expected above 0 and at most {} A", bounds::MAX_CURRENT_A),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::design::parse_design;

    const FROG: &str = "[armature]\npoles = 6\nslots = 75\ncoils_per_slot = 2\n\n[winding]\ntype = \"frog-leg\"\nspan = 12\nwave_span = 13\nturns = 1\n";
    const WAVE: &str = "[armature]\npoles = 4\nslots = 26\n\n[winding]\ntype = \"wave\"\nturns = 2\ndummy_coils = [13]\n";

    #[test]
    fn a_design_builds_again_from_its_spec() {
        for text in [FROG, WAVE] {
            let d = parse_design(text, "t.toml").unwrap();
            assert_eq!(Design::new(d.spec()), Ok(d));
        }
    }

    #[test]
    fn defaults_are_filled_in_once() {
        let mut s = parse_design(FROG, "t.toml").unwrap().spec();
        (s.pole_arc, s.rotation, s.wave_turns) = (None, None, None);
        let d = Design::new(s).unwrap();
        assert_eq!(d.pole_arc, DEFAULT_POLE_ARC);
        assert_eq!(d.rotation, Rotation::Clockwise);
        assert_eq!(d.wave_coils, Some(WaveCoils { span: 13, turns: 1 }));
    }

    #[test]
    fn the_constructor_refuses_what_the_parser_refuses() {
        let frog = parse_design(FROG, "t.toml").unwrap();
        let wave = parse_design(WAVE, "t.toml").unwrap();
        let refused = |s: DesignSpec| Design::new(s).unwrap_err().key;
        let mut s = frog.spec();
        s.dummy_coils = Some(vec![26]);
        assert_eq!(refused(s), "winding.dummy_coils");
        let mut s = wave.spec();
        s.dummy_coils = Some(vec![13, 14]);
        assert_eq!(refused(s), "winding.dummy_coils");
        let mut s = wave.spec();
        s.segments = Some(24);
        assert_eq!(refused(s), "armature.segments");
        let mut s = wave.spec();
        s.equalizers = EqualizerChoice::Full;
        assert_eq!(refused(s), "winding.equalizers");
        let mut s = wave.spec();
        s.wave_span = Some(6);
        assert_eq!(refused(s), "winding.wave_span");
        let mut s = frog.spec();
        s.lead_offset = HalfBars(50);
        assert_eq!(refused(s), "winding.lead_offset");
        let mut s = frog.spec();
        s.poles = 5;
        assert_eq!(refused(s), "armature.poles");
        let mut s = frog.spec();
        s.speed_rpm = Some(0.0);
        assert_eq!(refused(s), "rating.speed_rpm");
    }
}
