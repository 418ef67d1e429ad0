//! Round trip of `identify` over random designs: trace a design, write the data card a
//! rewinder would record from the traced winding (poles, slots, bars, span, the marked coil's
//! throw and the lead swing; sometimes the coils per slot and the dead coils), identify it,
//! and require the original among the candidates (alone when the card's data decide it), with
//! the same connection table and brush positions once checked.

mod support;

use armsheet::design::{parse_card, parse_design};
use armsheet::features::identify::identify;
use armsheet::{Checked, check};
use proptest::prelude::*;

#[derive(Debug, Clone)]
struct Case {
    poles: u32,
    slots: u32,
    u: u32,
    wave: bool,
    m: u32,
    retro: bool,
    span_delta: i32,
    lead_offset: i32,
    ccw: bool,
    count_u: bool,
    record_dead: bool,
    /// Place a wave's dummies explicitly (`[winding] dummy_coils`), this many slots on from
    /// the even spread, each at its slot's last position; `None` keeps the default spread.
    dummy_shift: Option<u32>,
}

impl Case {
    /// The design, with its dummies placed explicitly when the case asks for it.
    fn design(&self) -> String {
        let plain = self.plain();
        let Some(shift) = self.dummy_shift else {
            return plain;
        };
        let w = check(parse_design(&plain, "rt.toml").unwrap()).winding;
        let d = w.coils - w.active_coils;
        if d == 0 {
            return plain;
        }
        let mut slots: Vec<u32> = (1..=d)
            .map(|k| (k * self.slots / d + shift) % self.slots + 1)
            .filter(|&s| s * self.u != 1)
            .collect();
        slots.sort_unstable();
        slots.dedup();
        if slots.len() as u32 != d {
            return plain;
        }
        let coils: Vec<String> = slots.iter().map(|s| (s * self.u).to_string()).collect();
        format!("{plain}dummy_coils = [{}]\n", coils.join(", ")).replace(
            "[winding]",
            &format!("segments = {}\n\n[winding]", w.active_coils),
        )
    }

    fn plain(&self) -> String {
        let pole_pitch = (self.slots / self.poles) as i32;
        let span = (pole_pitch + self.span_delta).clamp(1, self.slots as i32 - 1);
        let lo = if 2 * self.poles * self.lead_offset.unsigned_abs()
            < self.u * self.slots - self.poles
        {
            self.lead_offset
        } else {
            0
        };
        format!(
            "[armature]\npoles = {}\nslots = {}\ncoils_per_slot = {}\nrotation = \"{}\"\n\n[winding]\ntype = \"{}\"\nmultiplicity = {}\ndirection = \"{}\"\nspan = {span}\nturns = 3\nlead_offset = {lo}\n",
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
        )
    }
}

/// The card a rewinder records from the traced winding `k`.
fn card_of(c: &Case, k: &Checked) -> String {
    let (d, w) = (&k.design, &k.winding);
    let first = &w.connections[0];
    let swing = w.lead_swing.swing_half_bars(w.active_coils);
    let mut s = format!(
        "[job]\nid = \"RT-1\"\n\n[observed]\npoles = {}\nslots = {}\nbars = {}\ncoil_span = \"1-{}\"\nlead_throw = \"1-{}\"\nlead_swing = {}\nturns = {}\nrotation = \"{}\"\n",
        d.poles,
        d.slots,
        w.active_coils,
        (first.bottom.slot + d.slots - first.top.slot) % d.slots + 1,
        first.end_segment.unwrap(),
        swing as f64 / 2.0,
        d.turns,
        d.rotation.as_str(),
    );
    if c.count_u {
        s.push_str(&format!("coils_per_slot = {}\n", d.coils_per_slot));
    }
    if c.record_dead {
        let slots: Vec<String> = w
            .dummy_coils
            .iter()
            .map(|k| ((k - 1) / d.coils_per_slot + 1).to_string())
            .collect();
        s.push_str(&format!("dead_coils = [{}]\n", slots.join(", ")));
    }
    s
}

fn case() -> impl Strategy<Value = Case> {
    (
        1u32..=4,
        1u32..=4,
        any::<bool>(),
        1u32..=3,
        any::<bool>(),
        -1i32..=1,
        -2i32..=2,
        any::<bool>(),
        any::<bool>(),
        any::<bool>(),
        proptest::option::of(0u32..5),
    )
        .prop_flat_map(
            |(pp, u, wave, m, retro, span_delta, lo, ccw, count_u, record_dead, dummy_shift)| {
                let pp = if wave { pp.max(2) } else { pp };
                let poles = 2 * pp;
                let min_slots = support::least_slots(m + 1, pp, u, wave);
                (min_slots..=min_slots + 30).prop_map(move |slots| Case {
                    poles,
                    slots,
                    u,
                    wave,
                    m,
                    retro,
                    span_delta,
                    lead_offset: lo,
                    ccw,
                    count_u,
                    record_dead,
                    dummy_shift,
                })
            },
        )
}

proptest! {
    #![proptest_config(support::properties(1000))]

    #[test]
    fn identify_finds_the_original(c in case()) {
        let text = c.design();
        let original = check(parse_design(&text, "rt.toml").unwrap_or_else(|e| panic!("{text}\n{e}")));
        let card_text = card_of(&c, &original);
        let explicit = text.contains("dummy_coils");
        if let Some(named) = &original.design.dummy_coils {
            // The engine winds the dummies where the design names them.
            prop_assert_eq!(&original.winding.dummy_coils, named);
            prop_assert!(original.winding.connections.iter().all(|k| k.dummy == named.contains(&k.coil)));
        }
        // Dummies placed away from the even spread can only be found from the dead coils.
        prop_assume!(!explicit || c.record_dead);
        let card = parse_card(&card_text, "rt-card.toml").unwrap_or_else(|e| panic!("{card_text}\n{e}"));
        let found = identify(&card);
        let (d, w) = (&original.design, &original.winding);
        let same = found.candidates.iter().filter(|k| {
            let (kd, kw) = (&k.checked.design, &k.checked.winding);
            kd.winding_type == d.winding_type
                && kd.multiplicity == d.multiplicity
                && kd.coils_per_slot == d.coils_per_slot
                && kw.connections == w.connections
        }).collect::<Vec<_>>();
        prop_assert!(
            same.len() == 1,
            "original not found once among {} candidate(s)\n{text}\n{card_text}\nconflicts {:?}",
            found.candidates.len(),
            found.conflicts
        );
        let k = &same[0].checked;
        let centres = |x: &Checked| x.winding.brushes.iter().map(|b| (b.centre_segment, b.polarity)).collect::<Vec<_>>();
        prop_assert_eq!(centres(k), centres(&original));
        prop_assert_eq!(k.winding.lead_swing, original.winding.lead_swing);
        // The data decide it when the coils per slot were counted (and, with dummies, the dead
        // coils recorded): then nothing else fits.
        if c.count_u && (c.record_dead || w.dummy_coils.is_empty()) {
            prop_assert_eq!(found.candidates.len(), 1, "{}\n{:?}", card_text,
                found.candidates.iter().map(|k| k.explanation.clone()).collect::<Vec<_>>());
        }
        // The design written for it reads back to the same winding.
        let file = armsheet::features::rewind::design_toml::write_design(&k.design, &["round trip".to_string()]);
        let back = check(parse_design(&file, "back.toml").unwrap_or_else(|e| panic!("{file}\n{e}")));
        prop_assert_eq!(&back.winding.connections, &w.connections);
        prop_assert_eq!(centres(&back), centres(&original));
    }
}
