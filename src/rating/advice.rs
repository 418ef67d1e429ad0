//! What would fix a failed rating check, with the numbers for each option.
//!
//! Part of the `rating` stage. Options follow the trade's usual remedies: more parallel paths
//! (lap instead of wave, a higher multiplicity), more segments, a larger conductor, or a
//! different commutator [common practice].

use std::f64::consts::PI;

use super::conductor::WireFamily;
use super::connection::{Connection, connect};
use crate::base::number::fmt_fixed;
use crate::design::{Design, WindingType, bounds};

/// What the advice needs to know about the machine as designed.
#[derive(Clone, Copy, Debug)]
pub struct Machine<'a> {
    /// The design.
    pub design: &'a Design,
    /// Segments C.
    pub segments: u32,
    /// Parallel paths a.
    pub paths: u32,
    /// Conductors Z.
    pub conductors: u64,
    /// Conductor area, mm², when known.
    pub area_mm2: Option<f64>,
}

impl Machine<'_> {
    /// Conductors per path Z/a, which fixes the EMF at a given flux and speed.
    fn per_path(&self) -> f64 {
        self.conductors as f64 / f64::from(self.paths)
    }

    /// Turns per coil on connection `k` for the same EMF, before rounding.
    fn turns_for(&self, k: &Connection) -> f64 {
        self.per_path() * f64::from(k.paths) / (2.0 * f64::from(k.segments))
    }

    /// One option in words: paths, current per path, turns and the conductor for the same
    /// current density.
    fn describe(&self, k: &Connection, current: f64) -> String {
        let t = self.turns_for(k);
        let whole = t.round().max(1.0);
        let mut s = format!(
            "{}: {} A per path, {} turns per coil for the same EMF ({} exact)",
            k.label(),
            fmt_fixed(current / f64::from(k.paths), 1),
            fmt_fixed(whole, 0),
            fmt_fixed(t, 2)
        );
        if let Some(a) = self.area_mm2 {
            s.push_str(&format!(
                ", conductor {} mm2 for the same current density",
                fmt_fixed(a * f64::from(self.paths) / f64::from(k.paths), 3)
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
}

/// More paths for a path current above `limit`: lap instead of wave, or a higher multiplicity.
pub fn more_paths(m: &Machine<'_>, current: f64, limit: f64) -> Vec<String> {
    let d = m.design;
    let need = super::commutator::ceil_u32(current / limit).max(1);
    let mut out = Vec::new();
    if d.winding_type == WindingType::Wave
        && let Some(k) = (d.multiplicity..=bounds::MAX_MULTIPLICITY as u32)
            .filter_map(|mm| connect(d, m.segments, WindingType::Lap, mm).ok())
            .find(|k| k.paths >= need)
    {
        out.push(format!("lap instead of wave, {}", m.describe(&k, current)));
    }
    if let Some(k) = (d.multiplicity + 1..=bounds::MAX_MULTIPLICITY as u32)
        .filter_map(|mm| connect(d, m.segments, d.winding_type, mm).ok())
        .find(|k| k.paths >= need)
    {
        out.push(format!(
            "a higher multiplicity, {}",
            m.describe(&k, current)
        ));
    }
    if out.is_empty() {
        out.push(format!(
            "more paths: at least {need} are needed, which no lap or wave connection up to multiplicity {} gives on {} poles",
            bounds::MAX_MULTIPLICITY,
            d.poles
        ));
    }
    out
}

/// More segments for a segment voltage above its limit: at least `c_min`.
pub fn more_segments(m: &Machine<'_>, c_min: u32) -> Vec<String> {
    let d = m.design;
    let s = d.slots;
    let mut out = vec![format!(
        "more segments: at least {c_min} (now {})",
        m.segments
    )];
    let first_u = c_min.div_ceil(s).max(d.coils_per_slot + 1);
    let found = (first_u..=bounds::MAX_COILS_PER_SLOT as u32).find_map(|u| {
        let mut dd = d.clone();
        dd.coils_per_slot = u;
        let k = connect(&dd, 0, d.winding_type, d.multiplicity).ok()?;
        (k.segments >= c_min).then_some((u, k))
    });
    match found {
        Some((u, k)) => {
            let t = m.per_path() * f64::from(k.paths) / (2.0 * f64::from(k.segments));
            let whole = t.round();
            let mut line = format!(
                "{u} coils per slot on the {s} slots gives C = {}; turns per coil {} for the same EMF ({} exact)",
                k.segments,
                fmt_fixed(whole, 0),
                fmt_fixed(t, 2)
            );
            if whole >= 1.0 && (whole - t).abs() > 0.1 * t {
                line.push_str(&format!(
                    " (whole turns move the EMF by {} %, so try the next count up as well)",
                    fmt_fixed((whole / t - 1.0) * 100.0, 0)
                ));
            }
            if whole < 1.0 {
                line.push_str(": less than one turn, so not possible with whole turns; more slots or a larger armature is needed");
            } else if let Some(a) = m.area_mm2 {
                let ratio =
                    f64::from(d.turns) * f64::from(d.coils_per_slot) / (whole * f64::from(u));
                line.push_str(&format!(
                    ", conductor about {} mm2 in the same slot space",
                    fmt_fixed(a * ratio, 3)
                ));
            }
            out.push(line);
        }
        None => out.push(format!(
            "no coils-per-slot count up to {} on {s} slots reaches {c_min} segments",
            bounds::MAX_COILS_PER_SLOT
        )),
    }
    out.push("more paths do not help here: E*P/C does not depend on a".to_string());
    out
}

/// A larger conductor for a current density above its limit: area `need_mm2` or more.
pub fn larger_conductor(m: &Machine<'_>, need_mm2: f64) -> Vec<String> {
    let mut out = vec![format!(
        "a larger conductor: at least {} mm2",
        fmt_fixed(need_mm2, 3)
    )];
    for family in [WireFamily::Awg, WireFamily::Metric] {
        let picks: Vec<String> = (1..=4)
            .map(|n| bigger_or_equal(family, n, need_mm2))
            .collect();
        out.push(picks.join(", "));
    }
    if let Some(a) = m.area_mm2 {
        out.push(format!(
            "copper per slot rises by {} %: check that it fits the slot",
            fmt_fixed((need_mm2 / a - 1.0) * 100.0, 0)
        ));
    }
    out
}

/// The smallest size of `family` whose `strands` wires reach `need` mm².
fn bigger_or_equal(family: WireFamily, strands: u32, need: f64) -> String {
    use super::conductor::{AWG_RANGE, awg_name, r20_diameters_mm, round_area_mm2};
    use crate::design::awg_diameter_mm;
    let n = f64::from(strands);
    let (label, d) = match family {
        WireFamily::Awg => match AWG_RANGE
            .rev()
            .find(|&g| round_area_mm2(awg_diameter_mm(g)) * n >= need * (1.0 - 1e-9))
        {
            Some(g) => (format!("AWG {}", awg_name(g)), awg_diameter_mm(g)),
            None => return format!("{strands} x (beyond AWG 0000)"),
        },
        WireFamily::Metric => match r20_diameters_mm()
            .into_iter()
            .find(|&d| round_area_mm2(d) * n >= need * (1.0 - 1e-9))
        {
            Some(d) => (format!("{} mm", fmt_fixed(d, 3)), d),
            None => return format!("{strands} x (beyond 5 mm)"),
        },
    };
    let area = round_area_mm2(d) * n;
    if strands == 1 {
        format!("{label} ({} mm2)", fmt_fixed(area, 3))
    } else {
        format!("{strands} x {label} ({} mm2)", fmt_fixed(area, 3))
    }
}

/// A smaller conductor is possible when the density is below its lower limit.
pub fn smaller_conductor(most_mm2: f64) -> Vec<String> {
    vec![format!(
        "the conductor is generous: down to {} mm2 keeps the density at the lower limit and frees slot space",
        fmt_fixed(most_mm2, 3)
    )]
}

/// A wider commutator or fewer segments for a segment pitch below `min_mm`.
pub fn segment_pitch(m: &Machine<'_>, diameter_mm: f64, min_mm: f64) -> Vec<String> {
    let c_max = (PI * diameter_mm / min_mm).floor() as u32;
    vec![
        format!(
            "a commutator of at least {} mm diameter for {} segments",
            fmt_fixed(f64::from(m.segments) * min_mm / PI, 1),
            m.segments
        ),
        format!(
            "at most {c_max} segments on the {} mm commutator (fewer coils per slot)",
            fmt_fixed(diameter_mm, 1)
        ),
    ]
}

/// A smaller commutator or a lower speed for a peripheral speed above `max_m_s`.
pub fn commutator_speed(diameter_mm: f64, speed_rpm: f64, max_m_s: f64) -> Vec<String> {
    vec![
        format!(
            "a commutator of at most {} mm diameter at {} rpm",
            fmt_fixed(max_m_s * 60_000.0 / (PI * speed_rpm), 1),
            fmt_fixed(speed_rpm, 0)
        ),
        format!(
            "at most {} rpm on the {} mm commutator",
            fmt_fixed(max_m_s * 60_000.0 / (PI * diameter_mm), 0),
            fmt_fixed(diameter_mm, 1)
        ),
    ]
}

/// A brush of the right width when it is outside `min..=max` segment pitches.
pub fn brush_width(pitch_mm: Option<f64>, min: f64, max: f64) -> Vec<String> {
    match pitch_mm {
        Some(p) => vec![format!(
            "a brush {} to {} mm wide ({} to {} segment pitches of {} mm)",
            fmt_fixed(min * p, 1),
            fmt_fixed(max * p, 1),
            fmt_fixed(min, 2),
            fmt_fixed(max, 2),
            fmt_fixed(p, 2)
        )],
        None => vec![format!(
            "a brush {} to {} segment pitches wide",
            fmt_fixed(min, 2),
            fmt_fixed(max, 2)
        )],
    }
}

/// More brush arms (poles) or less current for a brush-arm current above `limit`.
pub fn brush_arm(current: f64, poles: u32, limit: f64) -> Vec<String> {
    let arms = super::commutator::ceil_u32(2.0 * current / limit);
    let arms = arms + arms % 2;
    vec![format!(
        "the arm current 2I/P is set by the current and the {poles} poles: it needs {} brush arms (poles), or at most {} A armature current",
        arms.max(poles + 2),
        fmt_fixed(limit * f64::from(poles) / 2.0, 1)
    )]
}

/// A larger armature or less current for an electric loading above `limit` A/m.
pub fn electric_loading(
    m: &Machine<'_>,
    current: f64,
    diameter_mm: f64,
    limit: f64,
) -> Vec<String> {
    let x = m.per_path();
    let dmin = x * current / (PI * limit) * 1000.0;
    let imax = limit * PI * diameter_mm / 1000.0 / x;
    vec![format!(
        "an armature of at least {} mm diameter, or at most {} A on this winding",
        fmt_fixed(dmin, 1),
        fmt_fixed(imax, 1)
    )]
}
