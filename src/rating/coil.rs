//! Coil making: the coil a former is set to, the wire to order and the slot fill.
//!
//! Part of the `rating` stage: pure arithmetic on the resolved [`Design`] and its traced
//! [`Winding`]. The geometry and its derivation are in docs/domain.md, "Coil making"; the
//! defaults of the `[core]` keys are on [`Core`]'s accessors.

use std::f64::consts::PI;

use crate::design::{ConductorShape, Core, Design, STRIP_BUILD_MM};
use crate::winding::{EqualizerPlan, Winding};

use super::conductor::{enamel_increase_mm, round_area_mm2, strands, strip_area_mm2};

/// Density of annealed copper, g/cm³ [src: IEC 60028].
pub const COPPER_DENSITY_G_CM3: f64 = 8.89;
/// Density of cured wire enamel, g/cm³ [from memory: polyesterimide and polyamide-imide
/// enamels are about 1.3-1.45 g/cm³].
pub const ENAMEL_DENSITY_G_CM3: f64 = 1.35;

/// One element's coil as made (a frog-leg has two: lap, then wave).
#[derive(Clone, Debug, PartialEq)]
pub struct CoilShape {
    /// Span in slots.
    pub span: u32,
    /// Turns per coil.
    pub turns: u32,
    /// Coils wound of this shape (every coil position, dummies included).
    pub coils: u32,
    /// Straight part of each coil side, knuckle to knuckle: L + 2·e, mm.
    pub straight_mm: f64,
    /// The span's arc at the coil sides' mean radius: 2π·r_m·y/S, mm.
    pub span_arc_mm: f64,
    /// One leg of an end turn, knuckle to nose: (s/2)/cos θ, mm.
    pub end_leg_mm: f64,
    /// Axial reach of the nose past the core end: e + (s/2)·tan θ, mm.
    pub nose_reach_mm: f64,
    /// The nose's drop from the top layer to the bottom one: h/2, mm.
    pub nose_drop_mm: f64,
    /// Mean length of one turn: 2·(L + 2e) + 4·leg + 2·(h/2), mm.
    pub mean_turn_mm: f64,
    /// The unspread loop on the former, tip to tip: half the mean turn, mm.
    pub loop_length_mm: f64,
    /// Both leads together, core end to the risers: 2·riser distance, mm (0 when unknown).
    pub leads_mm: f64,
    /// The mean turn the wire is reckoned with: `[conductor] mean_turn_mm` when given (the
    /// old coil measured, as the resistance takes it), else [`CoilShape::mean_turn_mm`], mm.
    pub wire_turn_mm: f64,
    /// Wire of one coil, all strands, leads included, m.
    pub wire_m_per_coil: f64,
    /// Wire of all coils of this shape, m (no scrap).
    pub wire_m: f64,
}

/// A rectangular conductor's coil side in the slot: turns × strips stacked radially.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CoilSection {
    /// Insulated width, mm.
    pub width_mm: f64,
    /// Insulated height of the stack, mm.
    pub height_mm: f64,
}

/// The slot fill: the insulated conductors against the room the slot insulation leaves.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SlotFill {
    /// Room inside liner, separator and wedge: (W − 2t_l)·(H − t_l − t_s − t_w), mm².
    pub room_mm2: f64,
    /// Insulated conductor area in one slot, mm².
    pub conductors_mm2: f64,
    /// Coil sides in one slot.
    pub sides: u32,
    /// conductors / room, %.
    pub percent: f64,
}

/// The coil making and the wire to order.
#[derive(Clone, Debug, PartialEq)]
pub struct CoilMaking {
    /// Each element's coil.
    pub shapes: Vec<CoilShape>,
    /// Insulation build on each dimension, mm.
    pub build_mm: f64,
    /// Enamel grade used for a round wire's build when not given.
    pub grade: u8,
    /// Whether the leads are counted (`riser_distance_mm` given).
    pub leads_counted: bool,
    /// Equalizers wound from the same wire, and their wire, m.
    pub equalizer_wire_m: Option<f64>,
    /// Scrap allowance, %.
    pub scrap_percent: f64,
    /// Wire to order: every coil and the equalizers, plus scrap, m.
    pub wire_m_total: f64,
    /// Bare copper mass of the wire to order, kg (8.89 g/cm³).
    pub mass_kg_bare: f64,
    /// With the enamel, kg.
    pub mass_kg_insulated: f64,
    /// Reels of `reel_kg` to order (insulated mass), when the shop gave a reel size.
    pub reels: Option<u32>,
    /// A strip conductor's coil side.
    pub section: Option<CoilSection>,
    /// The slot fill, when the slot's size is known.
    pub slot_fill: Option<SlotFill>,
}

/// What the coils of `d` are shaped on: its `[core]`, with the stated defaults for what the
/// core leaves out (no slot depth: the sides at the core surface; no risers: no leads);
/// `None` without the core's diameter and length.
pub fn geometry(d: &Design) -> Option<Geometry> {
    let core = d.core.as_ref()?;
    Some(Geometry {
        diameter_mm: core.diameter_mm?,
        length_mm: core.length_mm?,
        slot_depth_mm: core.slot_depth_mm.unwrap_or(0.0),
        slots: d.slots,
        extension_mm: core.extension(),
        angle_deg: core.end_turn_angle(),
        riser_distance_mm: core.riser_distance_mm.unwrap_or(0.0),
    })
}

/// The coil making of `d`, when it has a conductor and a core of known diameter and length.
pub fn coil_making(d: &Design, w: &Winding) -> Option<CoilMaking> {
    let conductor = d.conductor.as_ref()?;
    let core = d.core.as_ref()?;
    let geometry = geometry(d)?;
    let dia = geometry.diameter_mm;
    let shape = &conductor.shape;
    let n = strands(shape);
    let build = core
        .conductor_build_mm
        .unwrap_or_else(|| default_build(shape, core.grade()));
    let risers = core.riser_distance_mm;
    let shapes: Vec<CoilShape> = d
        .elements()
        .iter()
        .map(|e| {
            coil_shape_with(
                &geometry,
                e.span,
                e.turns,
                d.coil_positions(),
                n,
                conductor.mean_turn_mm,
            )
        })
        .collect();
    let equalizer_wire_m = equalizer_wire_m(d, w, core, dia, n);
    let scrap = core.scrap();
    let net: f64 = shapes.iter().map(|s| s.wire_m).sum::<f64>() + equalizer_wire_m.unwrap_or(0.0);
    let total = net * (1.0 + scrap / 100.0);
    let (bare_mm2, ins_mm2) = strand_areas_mm2(shape, build);
    // m × mm² = cm³ / 100·10 … : 1 m × 1 mm² = 1 cm³.
    let mass_bare = total * bare_mm2 * COPPER_DENSITY_G_CM3 / 1000.0;
    let mass_ins = mass_bare + total * (ins_mm2 - bare_mm2) * ENAMEL_DENSITY_G_CM3 / 1000.0;
    let reels = core
        .reel_kg
        .map(|r| (mass_ins / r - 1e-9).ceil().max(1.0) as u32);
    let section = match *shape {
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            ..
        } => Some(CoilSection {
            width_mm: width_mm + build,
            height_mm: f64::from(d.turns * n) * (height_mm + build),
        }),
        ConductorShape::Round { .. } => None,
    };
    let slot_fill = slot_fill(d, core, &shapes, n, ins_mm2);
    Some(CoilMaking {
        shapes,
        build_mm: build,
        grade: core.grade(),
        leads_counted: risers.is_some(),
        equalizer_wire_m,
        scrap_percent: scrap,
        wire_m_total: total,
        mass_kg_bare: mass_bare,
        mass_kg_insulated: mass_ins,
        reels,
        section,
        slot_fill,
    })
}

/// What a coil's shape depends on.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Geometry {
    /// Core diameter D, mm.
    pub diameter_mm: f64,
    /// Core length L, mm.
    pub length_mm: f64,
    /// Slot depth h, mm (0 when unknown: the sides taken at the core surface).
    pub slot_depth_mm: f64,
    /// Slots S.
    pub slots: u32,
    /// Straight extension e past the core each end, mm.
    pub extension_mm: f64,
    /// End-turn angle θ to the core end face, degrees.
    pub angle_deg: f64,
    /// Core end to the risers, mm (0 leaves the leads out).
    pub riser_distance_mm: f64,
}

/// One coil of `turns` turns and span `span`, `coils` of them, `n` strands in hand
/// [derived: docs/domain.md, "Coil making"].
pub fn coil_shape(g: &Geometry, span: u32, turns: u32, coils: u32, n: u32) -> CoilShape {
    coil_shape_with(g, span, turns, coils, n, None)
}

/// [`coil_shape`], the wire reckoned with `given_turn_mm` when the design gives the mean turn.
pub fn coil_shape_with(
    g: &Geometry,
    span: u32,
    turns: u32,
    coils: u32,
    n: u32,
    given_turn_mm: Option<f64>,
) -> CoilShape {
    let theta = g.angle_deg.to_radians();
    let r_mean = g.diameter_mm / 2.0 - g.slot_depth_mm / 2.0;
    let s = 2.0 * PI * r_mean * f64::from(span) / f64::from(g.slots);
    let straight = g.length_mm + 2.0 * g.extension_mm;
    let leg = s / 2.0 / theta.cos();
    let drop = g.slot_depth_mm / 2.0;
    let mean_turn = 2.0 * straight + 4.0 * leg + 2.0 * drop;
    let leads = 2.0 * g.riser_distance_mm;
    let wire_turn = given_turn_mm.unwrap_or(mean_turn);
    let per_coil = f64::from(n) * (f64::from(turns) * wire_turn + leads) / 1000.0;
    CoilShape {
        span,
        turns,
        coils,
        straight_mm: straight,
        span_arc_mm: s,
        end_leg_mm: leg,
        nose_reach_mm: g.extension_mm + s / 2.0 * theta.tan(),
        nose_drop_mm: drop,
        mean_turn_mm: mean_turn,
        loop_length_mm: mean_turn / 2.0,
        leads_mm: leads,
        wire_turn_mm: wire_turn,
        wire_m_per_coil: per_coil,
        wire_m: per_coil * f64::from(coils),
    }
}

/// The build of an enamelled conductor: by grade for round wire (IEC 60317-0-1), the strip
/// default otherwise.
fn default_build(shape: &ConductorShape, grade: u8) -> f64 {
    match *shape {
        ConductorShape::Round { diameter_mm, .. } => enamel_increase_mm(diameter_mm, grade),
        ConductorShape::Rectangular { .. } => STRIP_BUILD_MM,
    }
}

/// One strand's bare and insulated cross-sections, mm².
fn strand_areas_mm2(shape: &ConductorShape, build: f64) -> (f64, f64) {
    match *shape {
        ConductorShape::Round { diameter_mm, .. } => (
            round_area_mm2(diameter_mm),
            round_area_mm2(diameter_mm + build),
        ),
        ConductorShape::Rectangular {
            width_mm,
            height_mm,
            corner_radius_mm,
            ..
        } => (
            strip_area_mm2(width_mm, height_mm, corner_radius_mm),
            strip_area_mm2(
                width_mm + build,
                height_mm + build,
                corner_radius_mm + build / 2.0,
            ),
        ),
    }
}

/// The equalizers' wire when they are wound from the coils' wire: each a ring through its
/// p points, π·D at the commutator (the core when the commutator's diameter is not given),
/// all strands [derived].
fn equalizer_wire_m(d: &Design, w: &Winding, core: &Core, dia: f64, n: u32) -> Option<f64> {
    if core.equalizer_wire_same != Some(true) {
        return None;
    }
    let EqualizerPlan::Possible(eq) = &w.equalizers else {
        return None;
    };
    let ring = d
        .commutator
        .as_ref()
        .and_then(|c| c.diameter_mm)
        .unwrap_or(dia);
    Some(eq.groups.len() as f64 * PI * ring * f64::from(n) / 1000.0)
}

/// The room a slot offers the copper, inside its liner, separator and wedge, mm², when
/// `[core]` gives the slot's depth and width [derived: docs/domain.md, "Coil making"].
pub fn slot_room_mm2(core: &Core) -> Option<f64> {
    let (h, wd) = (core.slot_depth_mm?, core.slot_width_mm?);
    Some((wd - 2.0 * core.liner()) * (h - core.liner() - core.separator() - core.wedge()))
}

/// The slot fill: every coil side's insulated conductors against the room inside the slot
/// insulation [derived: docs/domain.md, "Coil making"].
fn slot_fill(
    d: &Design,
    core: &Core,
    shapes: &[CoilShape],
    n: u32,
    ins_mm2: f64,
) -> Option<SlotFill> {
    let room = slot_room_mm2(core)?;
    // Each element puts u top and u bottom sides in every slot.
    let per_slot_turns: u32 = shapes.iter().map(|s| 2 * d.coils_per_slot * s.turns).sum();
    let sides = 2 * d.coils_per_slot * shapes.len() as u32;
    let conductors = f64::from(per_slot_turns * n) * ins_mm2;
    Some(SlotFill {
        room_mm2: room,
        conductors_mm2: conductors,
        sides,
        percent: conductors / room * 100.0,
    })
}
