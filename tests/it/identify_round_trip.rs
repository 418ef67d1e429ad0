//! Round trip of `identify` over random designs: trace a design, write the data card a
//! rewinder would record from the traced winding (poles, slots, bars, span, the marked coil's
//! throw and the lead swing; sometimes the coils per slot and the dead coils), identify it,
//! and require the original among the candidates (alone when the card's data decide it), with
//! the same connection table and brush positions once checked.

use crate::support;
use crate::support::random_design::{OFF, RandomDesign, Space, designs};

use armsheet::design::{parse_card, parse_design};
use armsheet::features::identify::identify;
use armsheet::{Checked, check};
use proptest::prelude::*;

#[derive(Debug, Clone)]
struct Case {
    design: RandomDesign,
    /// The card counts the coils per slot.
    count_u: bool,
    /// The card records the dead coils.
    record_dead: bool,
    /// Place a wave's dummies explicitly (`[winding] dummy_coils`), this many slots on from
    /// the even spread, each at its slot's last position; `None` keeps the default spread.
    dummy_shift: Option<u32>,
}

impl Case {
    /// The design, with its dummies placed explicitly when the case asks for it.
    fn design(&self) -> String {
        let plain = self.design.toml();
        let Some(shift) = self.dummy_shift else {
            return plain;
        };
        let w = check(parse_design(&plain, "rt.toml").unwrap()).winding;
        let d = w.coils - w.active_coils;
        if d == 0 {
            return plain;
        }
        let (slots, u) = (self.design.slots, self.design.u);
        let mut dead: Vec<u32> = (1..=d)
            .map(|k| (k * slots / d + shift) % slots + 1)
            .filter(|&s| s * u != 1)
            .collect();
        dead.sort_unstable();
        dead.dedup();
        if dead.len() as u32 != d {
            return plain;
        }
        let coils: Vec<String> = dead.iter().map(|s| (s * u).to_string()).collect();
        let placed = RandomDesign {
            segments: Some(w.active_coils),
            ..self.design.clone()
        };
        placed.toml_with(&format!("dummy_coils = [{}]\n", coils.join(", ")))
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

/// P 2-8, u 1-4, m 1-3, either direction and rotation, the span within a slot of the pole
/// pitch, the lead offset within two bars, up to 30 slots above the fewest.
fn case() -> impl Strategy<Value = Case> {
    let space = Space {
        pole_pairs: 1..=4,
        generator: OFF,
        lead_offset: -2..=2,
        more_slots: 30,
        ..Space::default()
    };
    (
        designs(space),
        any::<bool>(),
        any::<bool>(),
        proptest::option::of(0u32..5),
    )
        .prop_map(|(design, count_u, record_dead, dummy_shift)| Case {
            design,
            count_u,
            record_dead,
            dummy_shift,
        })
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
        // A span whose sides lie under poles of the same polarity cannot be wound: identify
        // says so up front instead of blaming another reading.
        if original.findings.iter().any(|f| f.id == "span.opposite-poles" && f.is_failure()) {
            prop_assert!(found.candidates.is_empty(), "{card_text}");
            prop_assert!(found.conflicts[0].contains("coil span"), "{:?}", found.conflicts);
            return Ok(());
        }
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

/// A card with the bars or the throw counted one off (`which`: 0 bars − 1, 1 bars + 1, 2 throw
/// − 1, 3 throw + 1), or `None` where that reading cannot be one off.
fn miscounted(card: &str, bars: u32, throw_end: u32, which: u8) -> Option<String> {
    let (from, to) = match which {
        0 if bars > throw_end => (format!("bars = {bars}\n"), format!("bars = {}\n", bars - 1)),
        1 => (format!("bars = {bars}\n"), format!("bars = {}\n", bars + 1)),
        2 if throw_end > 2 => (
            format!("lead_throw = \"1-{throw_end}\""),
            format!("lead_throw = \"1-{}\"", throw_end - 1),
        ),
        3 if throw_end < bars => (
            format!("lead_throw = \"1-{throw_end}\""),
            format!("lead_throw = \"1-{}\"", throw_end + 1),
        ),
        _ => return None,
    };
    Some(card.replacen(&from, &to, 1))
}

proptest! {
    #![proptest_config(support::properties(300))]

    /// One reading miscounted: every candidate's design file, written and parsed back, gets
    /// the verdict the candidate was given (so identify writes a design only when `check`
    /// passes it, and says so otherwise); and when the original is a plain simplex winding
    /// `check` passes and the miscounted card's best fit is not, the readings one off give
    /// the original's kind of winding back.
    #[test]
    fn a_miscount_is_caught(c in case(), which in 0u8..4) {
        let text = c.design.toml();
        let original = check(parse_design(&text, "rt.toml").unwrap_or_else(|e| panic!("{text}\n{e}")));
        let card_text = card_of(&Case { record_dead: false, ..c.clone() }, &original);
        let w = &original.winding;
        let throw_end = w.connections[0].end_segment.unwrap();
        let Some(miscounted) = miscounted(&card_text, w.active_coils, throw_end, which) else {
            return Ok(());
        };
        let Ok(card) = parse_card(&miscounted, "rt-card.toml") else {
            return Ok(());
        };
        let found = identify(&card);
        for k in &found.candidates {
            let file = armsheet::features::rewind::design_toml::write_design(&k.checked.design, &["miscount".to_string()]);
            let back = check(parse_design(&file, "back.toml").unwrap_or_else(|e| panic!("{file}\n{e}")));
            prop_assert_eq!(back.has_errors(), k.checked.has_errors(), "{}", file);
        }
        let d = &original.design;
        let plain = !original.has_errors() && d.multiplicity == 1 && w.dummy_coils.is_empty();
        let best_plain = found.candidates.first().is_some_and(|k| {
            let kd = &k.checked.design;
            !k.checked.has_errors() && kd.multiplicity == 1 && kd.coil_positions() == kd.segments
        });
        if plain && !best_plain {
            let recount = found.recount.as_ref();
            let kind = d.winding_type.as_str();
            prop_assert!(
                recount.is_some_and(|r| r.readings.iter().any(|l| l.contains(&format!("simplex {kind}")))),
                "{miscounted}\n{:?}", recount
            );
        }
    }
}
