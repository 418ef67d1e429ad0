//! The `coil_making` object of `check --json` (null when the design has no conductor or no
//! core diameter and length): the coil as made, the wire to order and the slot fill, in SI
//! (mm for the coil, m and kg for the wire) whatever the design's units.
//!
//! Part of the `render` stage: typed views of a [`CoilMaking`], fields declared in key order
//! and every float rounded by [`round_to`], so output is byte-stable.

use serde::Serialize;

use crate::base::number::round_to;
use crate::rating::CoilMaking;
use crate::rating::coil::{CoilSection, CoilShape, SlotFill};

/// The `coil_making` object.
#[derive(Serialize)]
pub struct CoilMakingJson {
    build_mm: f64,
    coils: Vec<CoilJson>,
    enamel_grade: u8,
    equalizer_wire_m: Option<f64>,
    leads_counted: bool,
    reels: Option<u32>,
    scrap_percent: f64,
    section: Option<SectionJson>,
    slot_fill: Option<SlotFillJson>,
    wire_length_m_per_coil: f64,
    wire_length_m_total: f64,
    wire_mass_kg_insulated: f64,
    wire_mass_kg_total: f64,
}

impl CoilMakingJson {
    /// The view of `k`.
    pub fn new(k: &CoilMaking) -> CoilMakingJson {
        CoilMakingJson {
            build_mm: round_to(k.build_mm, 4),
            coils: k.shapes.iter().map(CoilJson::from).collect(),
            enamel_grade: k.grade,
            equalizer_wire_m: k.equalizer_wire_m.map(|x| round_to(x, 3)),
            leads_counted: k.leads_counted,
            reels: k.reels,
            scrap_percent: round_to(k.scrap_percent, 3),
            section: k.section.as_ref().map(SectionJson::from),
            slot_fill: k.slot_fill.as_ref().map(SlotFillJson::from),
            wire_length_m_per_coil: round_to(
                k.shapes.first().map_or(0.0, |s| s.wire_m_per_coil),
                4,
            ),
            wire_length_m_total: round_to(k.wire_m_total, 3),
            wire_mass_kg_insulated: round_to(k.mass_kg_insulated, 4),
            wire_mass_kg_total: round_to(k.mass_kg_bare, 4),
        }
    }
}

/// One element's coil.
#[derive(Serialize)]
struct CoilJson {
    coils: u32,
    end_leg_mm: f64,
    leads_mm: f64,
    loop_length_mm: f64,
    mean_turn_mm: f64,
    nose_drop_mm: f64,
    nose_reach_mm: f64,
    span: u32,
    span_arc_mm: f64,
    straight_mm: f64,
    turns: u32,
    wire_length_m: f64,
    wire_length_m_per_coil: f64,
    wire_turn_mm: f64,
}

impl From<&CoilShape> for CoilJson {
    fn from(s: &CoilShape) -> Self {
        CoilJson {
            coils: s.coils,
            end_leg_mm: round_to(s.end_leg_mm, 2),
            leads_mm: round_to(s.leads_mm, 2),
            loop_length_mm: round_to(s.loop_length_mm, 2),
            mean_turn_mm: round_to(s.mean_turn_mm, 2),
            nose_drop_mm: round_to(s.nose_drop_mm, 2),
            nose_reach_mm: round_to(s.nose_reach_mm, 2),
            span: s.span,
            span_arc_mm: round_to(s.span_arc_mm, 2),
            straight_mm: round_to(s.straight_mm, 2),
            turns: s.turns,
            wire_length_m: round_to(s.wire_m, 3),
            wire_length_m_per_coil: round_to(s.wire_m_per_coil, 4),
            wire_turn_mm: round_to(s.wire_turn_mm, 2),
        }
    }
}

/// A strip coil side.
#[derive(Serialize)]
struct SectionJson {
    height_mm: f64,
    width_mm: f64,
}

impl From<&CoilSection> for SectionJson {
    fn from(s: &CoilSection) -> Self {
        SectionJson {
            height_mm: round_to(s.height_mm, 3),
            width_mm: round_to(s.width_mm, 3),
        }
    }
}

/// The slot fill.
#[derive(Serialize)]
struct SlotFillJson {
    conductors_mm2: f64,
    percent: f64,
    room_mm2: f64,
    sides: u32,
}

impl From<&SlotFill> for SlotFillJson {
    fn from(f: &SlotFill) -> Self {
        SlotFillJson {
            conductors_mm2: round_to(f.conductors_mm2, 2),
            percent: round_to(f.percent, 2),
            room_mm2: round_to(f.room_mm2, 2),
            sides: f.sides,
        }
    }
}
