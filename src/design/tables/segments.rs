//! The commutator segment count, resolved from `[armature] segments` and the winding kind.
//!
//! Part of the `design` stage, called by the `[winding]` reader (`tables/winding.rs`) once the
//! kind, multiplicity and direction are known. A lap winding uses every coil position; a wave
//! winding needs (C ± m)/p to be whole, so a given count is checked (with the nearest workable
//! counts as the hint) and an absent one is worked out by the winding kind, leaving dummy
//! coils where needed.

use crate::design::Diagnostic;
use crate::design::model::{Direction, WindingType};
use crate::design::reader::{At, Source, TableReader};

/// The active coil (= segment) count; `given` is `[armature] segments` when present.
#[allow(clippy::too_many_arguments)]
pub(crate) fn resolve(
    src: &Source<'_>,
    win: &TableReader<'_, '_>,
    arm: &TableReader<'_, '_>,
    wtype: WindingType,
    direction: Direction,
    positions: i64,
    m: i64,
    p: i64,
    given: Option<&At<i64>>,
) -> Result<i64, Diagnostic> {
    let kind = wtype.kind();
    if kind.uses_every_coil() {
        let c = match given {
            Some(c) if c.value != positions => {
                return Err(src
                    .error(
                        c.span.clone(),
                        arm.dotted("segments"),
                        format!(
                            "a {} winding uses every coil: expected {positions} segments (slots × coils_per_slot), found {}",
                            kind.word(),
                            c.value
                        ),
                    )
                    .with_hint(format!(
                        "set segments = {positions}, or change coils_per_slot; dummy coils belong to wave windings"
                    )));
            }
            _ => positions,
        };
        if !kind.workable(c as u32, positions as u32, m as u32, p as u32, direction) {
            let at = given.map_or_else(
                || win.raw("type").map_or(win.span.clone(), |v| v.span()),
                |g| g.span.clone(),
            );
            let key = if given.is_some() {
                arm.dotted("segments")
            } else {
                "winding.type".to_string()
            };
            return Err(src
                .error(
                    at,
                    key,
                    kind.segment_rule(c as u32, positions as u32, m as u32, p as u32, direction),
                )
                .with_hint(kind.segment_hint(positions as u32, m as u32, p as u32)));
        }
        return Ok(c);
    }
    match given {
        None => kind
            .default_segments(positions as u32, m as u32, p as u32, direction)
            .map(i64::from)
            .ok_or_else(|| {
                let at = win.raw("type").map_or(win.span.clone(), |v| v.span());
                src.error(
                    at,
                    "winding.type",
                    "no segment count up to the coil count gives a whole commutator pitch",
                )
                .with_hint("check poles and multiplicity")
            }),
        Some(c) => {
            let works = |n: i64, dir: Direction| {
                kind.workable(n as u32, positions as u32, m as u32, p as u32, dir)
            };
            let workable = |n: i64| works(n, direction);
            if c.value > positions {
                let below = (2..=positions).rev().find(|&n| workable(n));
                return Err(src
                    .error(
                        c.span.clone(),
                        arm.dotted("segments"),
                        format!(
                            "{} segments is more than the {positions} coils (slots × coils_per_slot): each segment needs a coil",
                            c.value
                        ),
                    )
                    .with_hint(match below {
                        Some(b) => format!("the nearest workable count is {b} ({} dummy coil(s))", positions - b),
                        None => "raise coils_per_slot or slots".to_string(),
                    }));
            }
            if !workable(c.value) {
                let below = (2..c.value).rev().find(|&n| workable(n));
                let above = (c.value + 1..=positions).find(|&n| workable(n));
                let near: Vec<String> = below
                    .into_iter()
                    .chain(above)
                    .map(|n| format!("{n} ({} dummy coil(s))", positions - n))
                    .collect();
                let other = works(c.value, direction.other());
                let mut hint = if near.is_empty() {
                    "no count up to the coil count works".to_string()
                } else {
                    format!("the nearest workable count(s): {}", near.join(" or "))
                };
                if other {
                    let other_dir = direction.other().as_str();
                    hint.push_str(&format!(
                        "; or keep {} and make the winding {other_dir}",
                        c.value
                    ));
                }
                return Err(src
                    .error(
                        c.span.clone(),
                        arm.dotted("segments"),
                        kind.pitch_rule(c.value as u32, m as u32, p as u32, direction),
                    )
                    .with_hint(hint));
            }
            Ok(c.value)
        }
    }
}
