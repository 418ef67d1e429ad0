//! The remedies of [`super::advice`] in words, one line per option.
//!
//! Part of the `rating` stage for now: the words end up in the rating checks' finding messages
//! (`RatingCheck::advice`, read by `RatingCheck::message`) and in the rewind report, both of
//! which are made from the rating's output. When the finding message moves out of the rating,
//! this file moves to `render` with it; nothing else here computes.

use super::advice::{Advice, PathOption, PathRoute, SegmentOption, TurnsFit, WirePick};
use super::conductor::{WireFamily, awg_name};
use crate::base::number::fmt_fixed;
use crate::design::bounds;

impl Advice {
    /// The remedy in words, one line per option.
    pub fn words(&self) -> Vec<String> {
        match self {
            Advice::MorePaths {
                need,
                poles,
                options,
            } => more_paths(*need, *poles, options),
            Advice::MoreSegments {
                c_min,
                now,
                slots,
                option,
            } => more_segments(*c_min, *now, *slots, option.as_ref()),
            Advice::LargerConductor {
                need_mm2,
                picks,
                copper_rise_pct,
            } => larger_conductor(*need_mm2, picks, *copper_rise_pct),
            Advice::SmallerConductor { most_mm2 } => vec![format!(
                "the conductor is generous: down to {} mm2 keeps the density at the lower limit and frees slot space",
                fmt_fixed(*most_mm2, 3)
            )],
            Advice::SegmentPitch {
                min_diameter_mm,
                segments,
                max_segments,
                diameter_mm,
            } => vec![
                format!(
                    "a commutator of at least {} mm diameter for {segments} segments",
                    fmt_fixed(*min_diameter_mm, 1)
                ),
                format!(
                    "at most {max_segments} segments on the {} mm commutator (fewer coils per slot)",
                    fmt_fixed(*diameter_mm, 1)
                ),
            ],
            Advice::CommutatorSpeed {
                max_diameter_mm,
                speed_rpm,
                max_speed_rpm,
                diameter_mm,
            } => vec![
                format!(
                    "a commutator of at most {} mm diameter at {} rpm",
                    fmt_fixed(*max_diameter_mm, 1),
                    fmt_fixed(*speed_rpm, 0)
                ),
                format!(
                    "at most {} rpm on the {} mm commutator",
                    fmt_fixed(*max_speed_rpm, 0),
                    fmt_fixed(*diameter_mm, 1)
                ),
            ],
            Advice::BrushWidth { min, max, pitch_mm } => vec![match pitch_mm {
                Some(p) => format!(
                    "a brush {} to {} mm wide ({} to {} segment pitches of {} mm)",
                    fmt_fixed(min * p, 1),
                    fmt_fixed(max * p, 1),
                    fmt_fixed(*min, 2),
                    fmt_fixed(*max, 2),
                    fmt_fixed(*p, 2)
                ),
                None => format!(
                    "a brush {} to {} segment pitches wide",
                    fmt_fixed(*min, 2),
                    fmt_fixed(*max, 2)
                ),
            }],
            Advice::BrushArm {
                poles,
                sets,
                arms,
                max_current_a,
            } => {
                let arms = match arms {
                    None => "more brush arms (poles) than can be counted".to_string(),
                    Some(a) if a <= poles => format!("{a} brush sets on the {poles} poles"),
                    Some(a) => format!("{a} brush arms (poles)"),
                };
                vec![format!(
                    "the arm current 2I/(brush sets) is set by the current and the {sets} brush sets fitted: it needs {arms}, or at most {} A armature current",
                    fmt_fixed(*max_current_a, 1)
                )]
            }
            Advice::ElectricLoading {
                min_diameter_mm,
                max_current_a,
            } => vec![format!(
                "an armature of at least {} mm diameter, or at most {} A on this winding",
                fmt_fixed(*min_diameter_mm, 1),
                fmt_fixed(*max_current_a, 1)
            )],
            Advice::Reactance {
                turns_now,
                turns_max,
                one_turn_v,
                with_interpoles_v,
            } => reactance_words(*turns_now, *turns_max, *one_turn_v, *with_interpoles_v),
            Advice::SlotFill {
                room_mm2,
                conductors_mm2,
                most_mm2,
            } => vec![format!(
                "the slot has {} mm2 inside its insulation and the coil sides take {} mm2: at most {} mm2 fits, so a smaller conductor, fewer turns, a thinner enamel grade or thinner slot insulation",
                fmt_fixed(*room_mm2, 1),
                fmt_fixed(*conductors_mm2, 1),
                fmt_fixed(*most_mm2, 1)
            )],
        }
    }
}

/// More paths: each reconnection that gives them, or why none does.
fn more_paths(need: Option<u32>, poles: u32, options: &[PathOption]) -> Vec<String> {
    if options.is_empty() {
        let need = need.map_or_else(
            || "more than can be counted".to_string(),
            |n| format!("at least {n}"),
        );
        return vec![format!(
            "more paths: {need} are needed, which no lap or wave connection up to multiplicity {} gives on {poles} poles",
            bounds::MAX_MULTIPLICITY
        )];
    }
    options.iter().map(path_option).collect()
}

/// More segments: the fewest that do, and a coils-per-slot count that reaches them.
fn more_segments(
    c_min: Option<u32>,
    now: u32,
    slots: u32,
    option: Option<&SegmentOption>,
) -> Vec<String> {
    vec![
        match c_min {
            Some(c) => format!("more segments: at least {c} (now {now})"),
            None => format!("more segments: more than can be counted (now {now})"),
        },
        match (option, c_min) {
            (Some(o), _) => segment_option(o, slots),
            (None, Some(c)) => format!(
                "no coils-per-slot count up to {} on {slots} slots reaches {c} segments",
                bounds::MAX_COILS_PER_SLOT
            ),
            (None, None) => format!(
                "no coils-per-slot count up to {} on {slots} slots comes near",
                bounds::MAX_COILS_PER_SLOT
            ),
        },
        "more paths do not help here: E*P/C does not depend on a".to_string(),
    ]
}

/// A larger conductor: the least area, the wires that give it, and the copper's rise.
fn larger_conductor(
    need_mm2: f64,
    picks: &[Vec<WirePick>],
    copper_rise_pct: Option<f64>,
) -> Vec<String> {
    let mut out = vec![format!(
        "a larger conductor: at least {} mm2",
        fmt_fixed(need_mm2, 3)
    )];
    for family in picks {
        let line: Vec<String> = family.iter().map(wire_pick).collect();
        out.push(line.join(", "));
    }
    if let Some(pct) = copper_rise_pct {
        out.push(format!(
            "copper per slot rises by {} %: check that it fits the slot",
            fmt_fixed(pct, 0)
        ));
    }
    out
}

/// One reconnection: paths, current per path, turns and the conductor for the same density.
fn path_option(o: &PathOption) -> String {
    let k = &o.scheme;
    let route = match o.route {
        PathRoute::LapInsteadOfWave => "lap instead of wave",
        PathRoute::HigherMultiplicity => "a higher multiplicity",
    };
    let mut s = format!(
        "{route}, {}: {} A per path, {} turns per coil for the same EMF ({} exact)",
        k.label(),
        fmt_fixed(o.per_path_a, 1),
        fmt_fixed(o.turns, 0),
        fmt_fixed(o.turns_exact, 2)
    );
    if let Some(a) = o.area_mm2 {
        s.push_str(&format!(
            ", conductor {} mm2 for the same current density",
            fmt_fixed(a, 3)
        ));
    }
    if !k.keeps_commutator {
        s.push_str(&format!(", needs a {}-segment commutator", k.segments));
    }
    if k.multiplicity > 1 {
        s.push_str(&format!(
            ", brushes at least {} segments wide",
            k.multiplicity
        ));
    }
    s
}

/// More coils per slot: the segments and the turns they need.
fn segment_option(o: &SegmentOption, slots: u32) -> String {
    let mut line = format!(
        "{} coils per slot on the {slots} slots gives C = {}; turns per coil {} for the same EMF ({} exact)",
        o.coils_per_slot,
        o.segments,
        fmt_fixed(o.turns, 0),
        fmt_fixed(o.turns_exact, 2)
    );
    if let Some(pct) = o.emf_shift_pct {
        line.push_str(&format!(
            " (whole turns move the EMF by {} %, so try the next count up as well)",
            fmt_fixed(pct, 0)
        ));
    }
    match o.fit {
        TurnsFit::BelowOneTurn => line.push_str(": less than one turn, so not possible with whole turns; more slots or a larger armature is needed"),
        TurnsFit::Area(a) => line.push_str(&format!(
            ", conductor about {} mm2 in the same slot space",
            fmt_fixed(a, 3)
        )),
        TurnsFit::Unknown => {}
    }
    line
}

/// "AWG 9 (6.632 mm2)", "2 x 1.800 mm (5.089 mm2)", "3 x (beyond 5 mm)".
fn wire_pick(p: &WirePick) -> String {
    let n = p.strands;
    let Some(w) = &p.wire else {
        return match p.family {
            WireFamily::Awg => format!("{n} x (beyond AWG 0000)"),
            WireFamily::Metric => format!("{n} x (beyond 5 mm)"),
        };
    };
    let label = match w.awg {
        Some(g) => format!("AWG {}", awg_name(g)),
        None => format!("{} mm", fmt_fixed(w.diameter_mm, 3)),
    };
    if n == 1 {
        format!("{label} ({} mm2)", fmt_fixed(w.area_mm2, 3))
    } else {
        format!("{n} x {label} ({} mm2)", fmt_fixed(w.area_mm2, 3))
    }
}

/// The remedies for a reactance voltage above its limit: interpoles (when the check is the
/// no-interpole one), then fewer turns per coil, or more paths when even one turn is too many.
fn reactance_words(
    turns_now: u32,
    turns_max: u32,
    one_turn_v: f64,
    with_interpoles_v: Option<f64>,
) -> Vec<String> {
    let mut out = Vec::new();
    if let Some(v) = with_interpoles_v {
        out.push(format!(
            "interpoles are needed: fit them (the limit with interpoles is {} V, [limits] reactance_volts_max)",
            fmt_fixed(v, 1)
        ));
    }
    out.push(if turns_max > 0 {
        format!(
            "fewer turns per coil: at most {turns_max} (now {turns_now}; the reactance voltage grows as the turns squared), with more coils or paths to keep the EMF"
        )
    } else {
        format!(
            "even 1 turn per coil gives {} V: more parallel paths (less current per path) or a wider brush",
            fmt_fixed(one_turn_v, 2)
        )
    });
    out
}
