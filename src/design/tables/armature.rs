//! `[armature]`: the iron and the commutator bar count.
//!
//! Part of the `design` stage (a table reader, see `tables/mod.rs`). Keys:
//! - `poles` (required): even, 2 to [`bounds::MAX_POLES`];
//! - `slots` (required): 2 to [`bounds::MAX_SLOTS`];
//! - `coils_per_slot` (u, default 1): 1 to [`bounds::MAX_COILS_PER_SLOT`], with u·slots at
//!   most [`bounds::MAX_COILS`];
//! - `segments` (default: worked out for the winding kind, see `tables/segments.rs`);
//! - `rotation` (`"cw"` or `"ccw"`, default `"cw"`);
//! - `pole_arc` (pole arc / pole pitch, 0.3 to 1, default 0.7).
//!
//! The defaults are filled in by [`crate::design::Design::new`].

use crate::design::Diagnostic;
use crate::design::build::POLE_ARC_RANGE;
use crate::design::model::{Rotation, bounds};
use crate::design::reader::{At, TableReader};

/// The keys of `[armature]`.
pub(crate) const KEYS: &[&str] = &[
    "poles",
    "slots",
    "coils_per_slot",
    "segments",
    "rotation",
    "pole_arc",
];

/// `[armature]` as read, with the spans later checks point at.
pub(crate) struct Armature {
    /// `poles`, even.
    pub poles: At<i64>,
    /// `slots`.
    pub slots: At<i64>,
    /// `coils_per_slot` (u).
    pub coils_per_slot: i64,
    /// Coil positions u·S.
    pub positions: i64,
    /// `segments` as given, not yet checked against the winding.
    pub segments: Option<At<i64>>,
    /// `rotation`, when given.
    pub rotation: Option<Rotation>,
    /// `pole_arc`, when given.
    pub pole_arc: Option<f64>,
}

/// Reads the values of `[armature]` (its keys were checked by the caller), recording every
/// problem; `None` when a value the winding needs is in error.
pub(crate) fn read(arm: &TableReader<'_, '_>) -> Option<Armature> {
    let poles = arm.keep(read_poles(arm));
    let slots = arm.keep(
        arm.int(
            "slots",
            2..=bounds::MAX_SLOTS,
            "the number of armature slots",
            "count the slots on the stripped core",
        )
        .and_then(|s| {
            s.ok_or_else(|| arm.missing("slots", "the number of armature slots", "slots = 24"))
        }),
    );
    let u = arm.keep(arm.int(
        "coils_per_slot",
        1..=bounds::MAX_COILS_PER_SLOT,
        "coil sides per slot per layer",
        "1 for one coil side per layer; 2 or 3 when each slot holds several coils",
    ));
    let segments = arm.keep(arm.int(
        "segments",
        2..=bounds::MAX_COILS,
        "the number of commutator segments (bars)",
        "count the bars; leave the key out to let armsheet work it out",
    ));
    let rotation = read_rotation(arm);
    let pole_arc = read_pole_arc(arm);
    let (slots, u, segments) = (slots?, u?.map_or(1, |a| a.value), segments?);
    let positions = slots.value * u;
    if positions > bounds::MAX_COILS {
        let at = arm
            .raw("coils_per_slot")
            .map_or(slots.span.clone(), |v| v.span());
        arm.src.found.push(
            arm.src
                .error(
                    at,
                    "armature.coils_per_slot",
                    format!(
                        "{} slots × {u} coils per slot = {positions} coils is beyond any real machine: at most {} coils",
                        slots.value,
                        bounds::MAX_COILS
                    ),
                )
                .with_hint("check the slot count and coils per slot"),
        );
        return None;
    }
    Some(Armature {
        poles: poles?,
        slots,
        coils_per_slot: u,
        positions,
        segments,
        rotation,
        pole_arc,
    })
}

/// `rotation`, when given (`cw` or `ccw`; a problem is recorded).
pub(crate) fn read_rotation(arm: &TableReader<'_, '_>) -> Option<Rotation> {
    match arm.keep(arm.choice("rotation", &["cw", "ccw"])).flatten() {
        Some(At { value: "ccw", .. }) => Some(Rotation::CounterClockwise),
        Some(_) => Some(Rotation::Clockwise),
        None => None,
    }
}

/// `pole_arc`, when given, as a fraction of the pole pitch (a problem is recorded).
pub(crate) fn read_pole_arc(arm: &TableReader<'_, '_>) -> Option<f64> {
    arm.keep(arm.number(
        "pole_arc",
        *POLE_ARC_RANGE.start(),
        false,
        *POLE_ARC_RANGE.end(),
        "the pole arc as a fraction of the pole pitch",
    ))
    .flatten()
    .map(|a| a.value)
}

/// `poles`: present, in range and even.
pub(crate) fn read_poles(arm: &TableReader<'_, '_>) -> Result<At<i64>, Diagnostic> {
    let poles = arm
        .int(
            "poles",
            2..=bounds::MAX_POLES,
            "the number of poles",
            "a DC machine has 2, 4, 6, 8 … poles",
        )?
        .ok_or_else(|| arm.missing("poles", "the number of poles", "poles = 4"))?;
    if poles.value % 2 != 0 {
        return Err(arm
            .src
            .error(
                poles.span.clone(),
                arm.dotted("poles"),
                format!("poles must be even, found {}", poles.value),
            )
            .with_hint(format!(
                "poles come in north-south pairs: try {} or {}",
                poles.value - 1,
                poles.value + 1
            )));
    }
    Ok(poles)
}
