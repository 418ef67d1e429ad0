//! `rating`: the winding against its nameplate: resistance, EMF, segment voltage, currents,
//! commutator, losses, test voltage, insulation resistance, and the rewind to a new voltage or speed.
//!
//! Pure stage after `winding` and before `checks`: a resolved [`Design`] and its traced
//! [`Winding`] in, a [`RatingReport`] out (or `None` when the design has no rating inputs:
//! no `[rating]`, `[conductor]`, `[core]` or `[commutator]`). Each quantity is computed only
//! when its inputs are present; what is missing is said in [`RatingReport::notes`]. Every
//! threshold comes from `[limits]`. [`rewind()`](crate::features::rewind::rewind) works out a new winding for a new voltage,
//! speed or connection. Nothing here touches files.

pub mod advice;
mod advice_words;
pub mod coil;
pub mod commutator;
pub mod conductor;
pub mod emf;
pub mod findings;
pub mod insulation;
pub mod limits;
pub mod losses;
pub mod note;
pub mod reactance;
pub mod resistance;
pub mod scheme;
pub mod test_voltage;

pub use advice::{Advice, CheckAdvice};
pub use coil::CoilMaking;
pub use commutator::{CommutatorData, SegmentVoltage};
pub use conductor::{MeanTurn, MeanTurnEstimate, MeanTurnSource};
pub use emf::{Emf, EmfBasis};
pub use findings::findings_of;
pub use insulation::InsulationTest;
pub use limits::{Bound, RatingCheck, Rule, rules};
pub use losses::Losses;
pub use note::RatingNote;
pub use reactance::{Reactance, ReactanceInputs};
pub use resistance::Resistance;
pub use test_voltage::TestVoltage;

use std::f64::consts::PI;

use crate::design::{BrushGrade, ConductorShape, Design, ThermalClass};
use crate::winding::Winding;
use advice::Machine;

/// The conductor as rated.
#[derive(Clone, Debug, PartialEq)]
pub struct ConductorData {
    /// The cross-section as given.
    pub shape: ConductorShape,
    /// Copper area, all strands, mm².
    pub area_mm2: f64,
    /// The mean turn, when given or estimable.
    pub mean_turn: Option<MeanTurn>,
}

/// Currents at the rating.
#[derive(Clone, Debug, PartialEq)]
pub struct Currents {
    /// Armature current I, A.
    pub armature_a: f64,
    /// I/a, A.
    pub per_path_a: f64,
    /// Current per brush arm (one brush set each), 2I/(brush sets), A.
    pub per_brush_arm_a: f64,
    /// Brush arms carrying it: one per brush set fitted.
    pub brush_arms: u32,
    /// (I/a)/A_c, A/mm², when the conductor is known.
    pub density_a_mm2: Option<f64>,
}

/// Everything the rating stage works out for one design.
#[derive(Clone, Debug, PartialEq)]
pub struct RatingReport {
    /// Parallel paths a used (lap m·P, wave 2m).
    pub paths: u32,
    /// Active conductors Z.
    pub conductors: u64,
    /// Segments C.
    pub segments: u32,
    /// The conductor.
    pub conductor: Option<ConductorData>,
    /// The armature resistance.
    pub resistance: Option<Resistance>,
    /// The EMF and constants.
    pub emf: Option<Emf>,
    /// Segment voltage.
    pub segment_voltage: Option<SegmentVoltage>,
    /// Currents.
    pub currents: Option<Currents>,
    /// Electric loading Z·I/(a·π·D), A/m.
    pub electric_loading_a_m: Option<f64>,
    /// The commutator.
    pub commutator: Option<CommutatorData>,
    /// The average reactance voltage of the coil under commutation, when the turns, the core
    /// length, the end-winding length (from the mean turn or the core), the path current and
    /// the commutator's diameter, speed and brush width are known.
    pub reactance: Option<Reactance>,
    /// Losses.
    pub losses: Option<Losses>,
    /// Withstand test voltages.
    pub test_voltage: Option<TestVoltage>,
    /// The insulation-resistance test (test voltage, minimum reading and PI), when the rated
    /// voltage is known.
    pub insulation: Option<InsulationTest>,
    /// The checks, in [`rules::ALL`] order, only those whose inputs are present. A failed
    /// check's `advice` holds its remedy in words.
    pub checks: Vec<RatingCheck>,
    /// The remedies of the failed checks with their numbers, in check order.
    pub advice: Vec<CheckAdvice>,
    /// What could not be worked out and why, and assumptions made.
    pub notes: Vec<RatingNote>,
    /// The coil making and the wire to order, when the conductor and the core are known.
    pub coil_making: Option<CoilMaking>,
}

impl RatingReport {
    /// The check with `id`, if it ran.
    pub fn check(&self, id: &str) -> Option<&RatingCheck> {
        self.checks.iter().find(|c| c.rule.id == id)
    }

    /// The remedy for the failed check with `id`, if it failed.
    pub fn advice_for(&self, id: &str) -> Option<&Advice> {
        self.advice.iter().find(|a| a.id == id).map(|a| &a.advice)
    }
}

/// Whether the design holds any rating input.
pub fn has_rating_inputs(d: &Design) -> bool {
    d.rating.is_some() || d.conductor.is_some() || d.core.is_some() || d.commutator.is_some()
}

/// Rates `design` as traced in `winding`; `None` when it has no rating inputs.
pub fn rate(design: &Design, winding: &Winding) -> Option<RatingReport> {
    has_rating_inputs(design).then(|| rate_with(design, winding, None))
}

/// Rates with an optional measured 20 °C armature resistance in place of the calculated one.
pub fn rate_with(d: &Design, w: &Winding, measured_r20: Option<f64>) -> RatingReport {
    let a = w.paths_formula.max(1);
    let z = w.conductors;
    let c = w.active_coils;
    let mut notes = Vec::new();
    let rating = d.rating.clone().unwrap_or_default();
    let (voltage, current, class) = (rating.voltage, rating.current, rating.thermal_class);

    let (conductor, resistance) = conductor_and_resistance(d, w, measured_r20, class, &mut notes);

    let grade = d
        .commutator
        .as_ref()
        .and_then(|k| k.brush_grade)
        .unwrap_or(BrushGrade::Carbon);
    let emf = emf_block(
        d,
        w,
        voltage,
        current,
        resistance.as_ref(),
        grade,
        &mut notes,
    );
    let speed = emf.as_ref().and_then(|e| e.speed_rpm).or(d.speed_rpm);

    let segment_voltage = emf.as_ref().filter(|e| e.emf_v > 0.0).map(|e| {
        commutator::segment_voltage(
            e.emf_v,
            d.poles,
            c,
            d.pole_arc,
            d.limits.get(crate::design::LimitId::SegmentVoltsAvgMax),
            d.limits.get(crate::design::LimitId::SegmentVoltsPeakMax),
        )
    });

    let currents = current.map(|i| {
        let arms = w.brush_sets().max(2);
        Currents {
            armature_a: i,
            per_path_a: i / f64::from(a),
            per_brush_arm_a: 2.0 * i / f64::from(arms),
            brush_arms: arms,
            density_a_mm2: conductor.as_ref().map(|k| i / f64::from(a) / k.area_mm2),
        }
    });
    if current.is_none() && d.rating.is_some() {
        notes.push(RatingNote::NoCurrent);
    }

    let core_d = d.core.as_ref().and_then(|k| k.diameter_mm);
    let electric_loading_a_m = current
        .zip(core_d)
        .map(|(i, dia)| z as f64 * i / (f64::from(a) * PI * dia / 1000.0));

    let commutator = d.commutator.as_ref().map(|k| {
        commutator::commutator_data(
            k.diameter_mm,
            k.brush_width,
            w.brush_width.given.then_some(w.brush_width.segments),
            c,
            speed,
            d.winding_type,
            d.multiplicity,
            d.pole_pairs(),
        )
    });

    let reactance = reactance_of(
        d,
        conductor.as_ref(),
        currents.as_ref(),
        commutator.as_ref(),
    );

    let losses = current.map(|i| {
        let drop = emf::brush_drop_v(grade);
        losses::losses(
            i,
            resistance.as_ref().map(|r| r.hot_ohm),
            resistance.as_ref().map_or(20.0, |r| r.reference_c),
            drop,
        )
    });

    let test_voltage = voltage.map(|u| test_voltage::test_voltages(u, current.map(|i| u * i)));
    if voltage.is_some_and(|u| u < 100.0) && current.is_none() {
        notes.push(RatingNote::TestVoltageGeneralRow);
    }

    let insulation = voltage.map(|u| insulation::insulation_test(u, class));

    let mut report = RatingReport {
        paths: a,
        conductors: z,
        segments: c,
        conductor,
        resistance,
        emf,
        segment_voltage,
        currents,
        electric_loading_a_m,
        commutator,
        reactance,
        losses,
        test_voltage,
        insulation,
        checks: Vec::new(),
        advice: Vec::new(),
        notes,
        coil_making: coil::coil_making(d, w),
    };
    (report.checks, report.advice) = check_limits(d, &report);
    report
}

/// The reactance voltage of the coil under commutation, when its inputs are present: the
/// turns per coil (a frog-leg's larger element), the core length, the end-winding length of a
/// side (half the mean turn less the core length, the mean turn given or estimated), the path
/// current and the commutator's segment pitch, peripheral speed and brush width.
fn reactance_of(
    d: &Design,
    conductor: Option<&ConductorData>,
    currents: Option<&Currents>,
    com: Option<&CommutatorData>,
) -> Option<Reactance> {
    let core = d.core.as_ref()?;
    let length = core.length_mm?;
    let mean_turn = conductor
        .and_then(|k| k.mean_turn.as_ref())
        .map(|t| t.mm)
        .or_else(|| {
            // The same estimate as the mean turn's, without a conductor.
            let dia = core.diameter_mm?;
            Some(2.0 * length + 2.5 * PI * dia * f64::from(d.span) / f64::from(d.slots))
        })?;
    let overhang = (mean_turn / 2.0 - length).max(0.0);
    let com = com?;
    let (slot_permeance, slot_given) = match (core.slot_depth_mm, core.slot_width_mm) {
        (Some(h), Some(b)) => (reactance::slot_permeance(h, b), true),
        _ => (reactance::default_slot_permeance(), false),
    };
    let turns = d
        .elements()
        .iter()
        .map(|e| e.turns)
        .max()
        .unwrap_or(d.turns);
    let inputs = ReactanceInputs {
        turns_per_coil: f64::from(turns),
        coils_per_slot: f64::from(d.coils_per_slot),
        core_length_mm: length,
        overhang_mm: overhang,
        slot_permeance,
        tooth_tip_permeance: reactance::TOOTH_TIP_PERMEANCE,
        overhang_permeance: reactance::OVERHANG_PERMEANCE,
        path_current_a: currents?.per_path_a,
        brush_width_segments: com.brush_width_segments?,
        segment_pitch_mm: com.segment_pitch_mm?,
        mica_mm: reactance::MICA_MM,
        multiplicity: f64::from(d.multiplicity),
        commutator_speed_m_s: com.peripheral_speed_m_s?,
    };
    reactance::reactance(
        inputs,
        slot_given,
        d.rating.as_ref().and_then(|r| r.interpoles),
        d.limits
            .get(crate::design::LimitId::ReactanceVoltsNoInterpolesMax),
    )
}

/// The conductor as rated and the armature resistance (measured, or calculated from the
/// conductor and the mean turn), with the notes on what is missing.
fn conductor_and_resistance(
    d: &Design,
    w: &Winding,
    measured_r20: Option<f64>,
    class: Option<ThermalClass>,
    notes: &mut Vec<RatingNote>,
) -> (Option<ConductorData>, Option<Resistance>) {
    let (z, a, c) = (w.conductors, w.paths_formula.max(1), w.active_coils);
    let conductor = d.conductor.as_ref().map(|k| ConductorData {
        shape: k.shape,
        area_mm2: conductor::conductor_area_mm2(&k.shape),
        mean_turn: conductor::mean_turn(d, k),
    });
    if let Some(t) = conductor.as_ref().and_then(|k| k.mean_turn.as_ref())
        && let MeanTurnSource::Estimated(_) = t.source
    {
        notes.push(RatingNote::MeanTurnEstimated(*t));
    }
    let calc_r20 = conductor.as_ref().and_then(|k| {
        k.mean_turn.as_ref().map(|t| {
            if w.is_multi_element() {
                let elements: Vec<(u64, u32)> = w
                    .elements
                    .iter()
                    .map(|e| {
                        (
                            2 * u64::from(c) * u64::from(e.turns),
                            e.paths_formula.max(1),
                        )
                    })
                    .collect();
                resistance::elements_resistance_20(&elements, t.mm, k.area_mm2)
            } else {
                resistance::armature_resistance_20(z, a, t.mm, k.area_mm2)
            }
        })
    });
    let resistance = match (measured_r20, calc_r20) {
        (Some(r), _) => Some(Resistance::new(r, class, true)),
        (None, Some(r)) => Some(Resistance {
            elements: w.elements.len() as u32,
            ..Resistance::new(r, class, false)
        }),
        (None, None) => None,
    };
    if resistance.is_none() {
        notes.push(match &conductor {
            None => RatingNote::NoConductor,
            Some(_) => RatingNote::NoMeanTurn,
        });
    } else if class.is_none() {
        notes.push(RatingNote::NoThermalClass);
    }

    (conductor, resistance)
}

#[allow(clippy::too_many_arguments)]
fn emf_block(
    d: &Design,
    w: &Winding,
    voltage: Option<f64>,
    current: Option<f64>,
    r: Option<&Resistance>,
    grade: BrushGrade,
    notes: &mut Vec<RatingNote>,
) -> Option<Emf> {
    // The engine's K = P·Z/(2π·a) and the same conductors and paths.
    let (z, a, k) = (
        w.conductors,
        w.paths_formula.max(1),
        w.constants.machine_constant,
    );
    // The coils link only `linkage` of the pole flux: the flux that counts is linkage·Φ.
    let linkage = w.constants.flux_linkage;
    let flux_wb = d.flux_per_pole_mwb.map(|f| f / 1000.0 * linkage);
    let (basis, e, ir, ir_known, drop) = match (voltage, flux_wb, d.speed_rpm) {
        (Some(v), _, _) => {
            let ir = current.zip(r).map(|(i, r)| i * r.hot_ohm);
            if current.is_some() && ir.is_none() {
                notes.push(RatingNote::EmfWithoutIrDrop);
            }
            let drop = if current.is_some() {
                emf::brush_drop_v(grade)
            } else {
                0.0
            };
            let ir_v = ir.unwrap_or(0.0);
            (
                EmfBasis::Terminal,
                emf::induced_emf(d.mode, v, ir_v, drop),
                ir_v,
                ir.is_some(),
                drop,
            )
        }
        (None, Some(f), Some(n)) => (
            EmfBasis::FluxAndSpeed,
            emf::emf_v(d.poles, z, a, f, n),
            0.0,
            false,
            0.0,
        ),
        _ => {
            notes.push(RatingNote::NoEmf);
            return None;
        }
    };
    let usable = e > 0.0;
    if !usable {
        notes.push(RatingNote::DropsExceedVoltage);
    }
    let flux_needed = d
        .speed_rpm
        .filter(|_| usable && basis == EmfBasis::Terminal)
        .map(|n| emf::flux_for(d.poles, z, a, e, n));
    let speed_at_flux = flux_wb
        .filter(|f| usable && basis == EmfBasis::Terminal && *f > 0.0)
        .map(|f| emf::speed_for(d.poles, z, a, e, f));
    let k_phi = flux_wb.or(flux_needed).map(|f| k * f);
    Some(Emf {
        mode: d.mode,
        basis,
        terminal_v: voltage,
        ir_drop_v: ir,
        ir_known,
        brush_drop_v: drop,
        brush_grade: grade,
        emf_v: e,
        // The pole flux that gives the linked flux needed.
        flux_needed_mwb: flux_needed
            .filter(|_| linkage > 0.0)
            .map(|f| f / linkage * 1000.0),
        speed_at_flux_rpm: speed_at_flux,
        k_phi,
        v_per_1000_rpm: k_phi.map(emf::v_per_1000_rpm),
        torque_nm: k_phi.zip(current).map(|(x, i)| x * i),
        speed_rpm: d.speed_rpm.or(speed_at_flux),
    })
}

fn check_limits(d: &Design, r: &RatingReport) -> (Vec<RatingCheck>, Vec<CheckAdvice>) {
    let l = &d.limits;
    let m = Machine {
        design: d,
        segments: r.segments,
        paths: r.paths,
        conductors: r.conductors,
        area_mm2: r.conductor.as_ref().map(|k| k.area_mm2),
    };
    let mut out = Vec::new();
    let mut remedies = Vec::new();
    let mut push = |rule: Rule, value: Option<f64>, advise: &dyn Fn(&RatingCheck) -> Advice| {
        if let Some(v) = value.filter(|v| v.is_finite()) {
            let mut chk = RatingCheck::new(rule, v, l);
            if !chk.passed {
                let advice = advise(&chk);
                chk.advice = advice.words();
                remedies.push(CheckAdvice {
                    id: rule.id,
                    advice,
                });
            }
            out.push(chk);
        }
    };
    let sv = r.segment_voltage.as_ref();
    let cur = r.currents.as_ref();
    let com = r.commutator.as_ref();
    let i = cur.map_or(0.0, |c| c.armature_a);
    push(rules::SEGMENT_VOLTS_AVG, sv.map(|s| s.average_v), &|_| {
        advice::more_segments(&m, sv.and_then(|s| s.c_min_average))
    });
    push(rules::SEGMENT_VOLTS_PEAK, sv.map(|s| s.peak_v), &|_| {
        advice::more_segments(&m, sv.and_then(|s| s.c_min_peak))
    });
    push(rules::PATH_CURRENT, cur.map(|c| c.per_path_a), &|c| {
        advice::more_paths(&m, i, c.limit)
    });
    push(
        rules::BRUSH_ARM_CURRENT,
        cur.map(|c| c.per_brush_arm_a),
        &|c| advice::brush_arm(i, cur.map_or(d.poles, |k| k.brush_arms), d.poles, c.limit),
    );
    let dc = com.and_then(|k| k.diameter_mm);
    push(
        rules::SEGMENT_PITCH,
        com.and_then(|k| k.segment_pitch_mm),
        &|c| advice::segment_pitch(&m, dc.unwrap_or(0.0), c.limit),
    );
    let spd = com.and_then(|k| k.speed_rpm).unwrap_or(0.0);
    push(
        rules::SPEED_PREFERRED,
        com.and_then(|k| k.peripheral_speed_m_s),
        &|c| advice::commutator_speed(dc.unwrap_or(0.0), spd, c.limit),
    );
    push(
        rules::SPEED_MAX,
        com.and_then(|k| k.peripheral_speed_m_s),
        &|c| advice::commutator_speed(dc.unwrap_or(0.0), spd, c.limit),
    );
    let density = cur.and_then(|c| c.density_a_mm2);
    let per_path = cur.map_or(0.0, |c| c.per_path_a);
    push(rules::DENSITY_MIN, density, &|c| {
        advice::smaller_conductor(per_path / c.limit)
    });
    push(rules::DENSITY_MAX, density, &|c| {
        advice::larger_conductor(&m, per_path / c.limit)
    });
    let pitch = com.and_then(|k| k.segment_pitch_mm);
    let bw = com.and_then(|k| k.brush_width_segments);
    push(rules::BRUSH_WIDTH_MIN, bw, &|_| {
        advice::brush_width(
            pitch,
            l.get(crate::design::LimitId::BrushWidthMin),
            l.get(crate::design::LimitId::BrushWidthMax),
        )
    });
    push(rules::BRUSH_WIDTH_MAX, bw, &|_| {
        advice::brush_width(
            pitch,
            l.get(crate::design::LimitId::BrushWidthMin),
            l.get(crate::design::LimitId::BrushWidthMax),
        )
    });
    let core_d = d.core.as_ref().and_then(|k| k.diameter_mm).unwrap_or(0.0);
    push(rules::ELECTRIC_LOADING, r.electric_loading_a_m, &|c| {
        advice::electric_loading(&m, i, core_d, c.limit)
    });
    let x = r.reactance.as_ref();
    let fitted = x.and_then(|x| x.interpoles) == Some(true);
    let with_interpoles = l.get(crate::design::LimitId::ReactanceVoltsMax);
    push(
        rules::INTERPOLES_NEEDED,
        x.filter(|_| !fitted).map(|x| x.average_v),
        &|c| advice::reactance(&m, c.value, c.limit, Some(with_interpoles)),
    );
    push(rules::REACTANCE_VOLTAGE, x.map(|x| x.average_v), &|c| {
        advice::reactance(&m, c.value, c.limit, None)
    });
    let fill = r.coil_making.as_ref().and_then(|k| k.slot_fill);
    push(rules::SLOT_FILL, fill.map(|f| f.percent), &|c| {
        Advice::SlotFill {
            room_mm2: fill.map_or(0.0, |f| f.room_mm2),
            conductors_mm2: fill.map_or(0.0, |f| f.conductors_mm2),
            most_mm2: fill.map_or(0.0, |f| f.room_mm2 * c.limit / 100.0),
        }
    });
    (out, remedies)
}
