//! The one random-design strategy and design-file writer of the property tests. A
//! [`Space`] says what a property draws (pole pairs, coils per slot, multiplicity, which
//! flags vary, how many slots above the fewest); [`designs`] draws a [`RandomDesign`] from it,
//! always a feasible one (at least [`least_slots`](super::least_slots) slots), and
//! [`RandomDesign::toml`] writes it as a design file for armsheet's own parser.

use std::ops::RangeInclusive;

use proptest::prelude::*;
use proptest::sample::select;

/// A flag drawn either way.
pub const EITHER: &[bool] = &[false, true];
/// A flag held off.
pub const OFF: &[bool] = &[false];
/// A flag held on.
pub const ON: &[bool] = &[true];

/// What a property draws. Start from [`Space::default`] (the engine properties' space) and
/// change what the property needs.
#[derive(Debug, Clone)]
pub struct Space {
    /// Pole pairs p; a wave takes at least 2.
    pub pole_pairs: RangeInclusive<u32>,
    /// Coils per slot u.
    pub coils_per_slot: RangeInclusive<u32>,
    /// Multiplicity m.
    pub multiplicity: RangeInclusive<u32>,
    /// Wave (true) or lap (false).
    pub wave: &'static [bool],
    /// Retrogressive (true) or progressive (false).
    pub retrogressive: &'static [bool],
    /// Counter-clockwise (true) or clockwise (false) rotation.
    pub ccw: &'static [bool],
    /// Generator (true) or motor (false).
    pub generator: &'static [bool],
    /// The coil span against the pole pitch S/P (rounded down), in slots.
    pub span_delta: RangeInclusive<i32>,
    /// The lead offset, in half bars, or in whole bars when `whole_bars` is set.
    pub lead_offset: RangeInclusive<i32>,
    /// Draw the lead offset in whole bars.
    pub whole_bars: bool,
    /// Turns per coil.
    pub turns: RangeInclusive<u32>,
    /// Segments a pole at least, above m: 1 for m + 1, 2 for m + 2 (more room between the
    /// brushes of neighbouring poles).
    pub room: u32,
    /// Slots drawn above the fewest.
    pub more_slots: u32,
}

impl Default for Space {
    fn default() -> Self {
        Space {
            pole_pairs: 1..=8,
            coils_per_slot: 1..=4,
            multiplicity: 1..=3,
            wave: EITHER,
            retrogressive: EITHER,
            ccw: EITHER,
            generator: EITHER,
            span_delta: -1..=1,
            lead_offset: -1..=1,
            whole_bars: true,
            turns: 3..=3,
            room: 1,
            more_slots: 160,
        }
    }
}

/// One random design: the keys of `[armature]`, `[winding]` and the rating mode.
#[derive(Debug, Clone)]
pub struct RandomDesign {
    pub poles: u32,
    pub slots: u32,
    /// Coils per slot.
    pub u: u32,
    pub wave: bool,
    /// Multiplicity.
    pub m: u32,
    pub retro: bool,
    /// The coil span against the pole pitch S/P (rounded down), in slots; the span written
    /// stays within 1…S − 1.
    pub span_delta: i32,
    /// The lead offset in half bars; written as 0 where it would not fit (2·P·|offset| must
    /// stay below N − P, N the coils).
    pub lead_halves: i32,
    pub ccw: bool,
    pub generator: bool,
    pub turns: u32,
    /// `[armature] segments`, when set (otherwise the parser's own count).
    pub segments: Option<u32>,
}

/// Random feasible designs from `space`.
pub fn designs(space: Space) -> impl Strategy<Value = RandomDesign> {
    let Space {
        pole_pairs,
        coils_per_slot,
        multiplicity,
        wave,
        retrogressive,
        ccw,
        generator,
        span_delta,
        lead_offset,
        whole_bars,
        turns,
        room,
        more_slots,
    } = space;
    (
        pole_pairs,
        coils_per_slot,
        select(wave),
        multiplicity,
        select(retrogressive),
        span_delta,
        lead_offset,
        select(ccw),
        select(generator),
        turns,
    )
        .prop_flat_map(
            move |(pp, u, wave, m, retro, span_delta, lead, ccw, generator, turns)| {
                let pp = if wave { pp.max(2) } else { pp };
                let poles = 2 * pp;
                let least = super::least_slots(m + room, pp, u, wave);
                (least..=least + more_slots).prop_map(move |slots| RandomDesign {
                    poles,
                    slots,
                    u,
                    wave,
                    m,
                    retro,
                    span_delta,
                    lead_halves: if whole_bars { 2 * lead } else { lead },
                    ccw,
                    generator,
                    turns,
                    segments: None,
                })
            },
        )
}

impl RandomDesign {
    /// The coil span written: the pole pitch plus `span_delta`, within 1…S − 1.
    pub fn span(&self) -> u32 {
        let pole_pitch = (self.slots / self.poles) as i32;
        (pole_pitch + self.span_delta).clamp(1, self.slots as i32 - 1) as u32
    }

    /// The lead offset written, in bars: the drawn one where it fits, else 0.
    pub fn lead_offset(&self) -> f64 {
        let fits = self.poles * self.lead_halves.unsigned_abs() < self.u * self.slots - self.poles;
        if fits {
            f64::from(self.lead_halves) / 2.0
        } else {
            0.0
        }
    }

    /// The design file.
    pub fn toml(&self) -> String {
        self.toml_with("")
    }

    /// The design file with `winding_keys` (whole lines) added to its `[winding]` table.
    /// Further tables may be appended to the text; a generator's `[rating] mode` is then
    /// already written.
    pub fn toml_with(&self, winding_keys: &str) -> String {
        let segments = match self.segments {
            Some(c) => format!("segments = {c}\n"),
            None => String::new(),
        };
        let mode = if self.generator {
            "\n[rating]\nmode = \"generator\"\n"
        } else {
            ""
        };
        format!(
            "[armature]\npoles = {}\nslots = {}\ncoils_per_slot = {}\n{segments}rotation = \"{}\"\n\n[winding]\ntype = \"{}\"\nmultiplicity = {}\ndirection = \"{}\"\nspan = {}\nturns = {}\nlead_offset = {}\n{winding_keys}{mode}",
            self.poles,
            self.slots,
            self.u,
            if self.ccw { "ccw" } else { "cw" },
            if self.wave { "wave" } else { "lap" },
            self.m,
            if self.retro {
                "retrogressive"
            } else {
                "progressive"
            },
            self.span(),
            self.turns,
            self.lead_offset(),
        )
    }
}

/// A fixed design in the same writer: `poles`, `slots`, u, lap or wave, m and the span given,
/// progressive, clockwise, motor, no lead offset.
pub fn fixed(poles: u32, slots: u32, u: u32, wave: bool, m: u32, span: u32) -> RandomDesign {
    RandomDesign {
        poles,
        slots,
        u,
        wave,
        m,
        retro: false,
        span_delta: span as i32 - (slots / poles) as i32,
        lead_halves: 0,
        ccw: false,
        generator: false,
        turns: 3,
        segments: None,
    }
}

/// The design file of the armature-test and fault-locator examples: one coil a slot, `kind`
/// "lap" or "wave", multiplicity `m`, the span `span`, 3 turns, and the `winding_key` line
/// (empty, or for instance `equalizers = "full"`).
pub fn one_coil_a_slot(
    poles: u32,
    slots: u32,
    kind: &str,
    m: u32,
    span: u32,
    winding_key: &str,
) -> String {
    fixed(poles, slots, 1, kind == "wave", m, span).toml_with(&format!("{winding_key}\n"))
}
