//! The `rating` object of `check --json` (null when the design has no rating inputs).
//!
//! Part of the `render` stage: typed views of a [`RatingReport`], fields declared in key order
//! (the keys come out sorted) and every float rounded by [`round_to`], so output is
//! byte-stable. A value that is not finite is written as null.

use serde::{Serialize, Serializer};

use super::rating_words;
use crate::base::Units;
use crate::base::number::round_to;
use crate::rating::conductor::describe;
use crate::rating::test_voltage::{TEST_VOLTAGE_CAUTION, TEST_VOLTAGE_SOURCE};
use crate::rating::{
    Bound, CommutatorData, ConductorData, Currents, Emf, EmfBasis, Losses, RatingCheck,
    RatingReport, Reactance, Resistance, SegmentVoltage, TestVoltage,
};

/// The `rating` object for a computed report.
#[derive(Serialize)]
pub struct RatingJson<'a> {
    #[serde(serialize_with = "checks")]
    checks: &'a [RatingCheck],
    commutator: Option<CommutatorJson>,
    conductor: Option<ConductorJson>,
    conductors: u64,
    currents: Option<CurrentsJson>,
    electric_loading_a_m: Option<f64>,
    emf: Option<EmfJson>,
    losses: Option<LossesJson>,
    notes: Vec<String>,
    paths: u32,
    reactance: Option<ReactanceJson>,
    resistance: Option<ResistanceJson>,
    segment_voltage: Option<SegmentVoltageJson>,
    segments: u32,
    test_voltage: Option<TestVoltageJson>,
}

impl<'a> RatingJson<'a> {
    /// The view of `r`.
    pub fn new(r: &'a RatingReport) -> RatingJson<'a> {
        RatingJson {
            checks: &r.checks,
            commutator: r.commutator.as_ref().map(CommutatorJson::from),
            conductor: r.conductor.as_ref().map(ConductorJson::from),
            conductors: r.conductors,
            currents: r.currents.as_ref().map(CurrentsJson::from),
            electric_loading_a_m: ro(r.electric_loading_a_m, 1),
            emf: r.emf.as_ref().map(EmfJson::from),
            losses: r.losses.as_ref().map(LossesJson::from),
            notes: rating_words::notes(r),
            paths: r.paths,
            reactance: r.reactance.as_ref().map(ReactanceJson::from),
            resistance: r.resistance.as_ref().map(ResistanceJson::from),
            segment_voltage: r.segment_voltage.as_ref().map(SegmentVoltageJson::from),
            segments: r.segments,
            test_voltage: r.test_voltage.as_ref().map(TestVoltageJson::from),
        }
    }
}

fn ro(x: Option<f64>, n: i32) -> Option<f64> {
    x.map(|x| round_to(x, n))
}

/// `conductor`.
#[derive(Serialize)]
struct ConductorJson {
    area_mm2: f64,
    description: String,
    mean_turn_estimated: bool,
    mean_turn_formula: Option<String>,
    mean_turn_mm: Option<f64>,
}

impl From<&ConductorData> for ConductorJson {
    fn from(k: &ConductorData) -> Self {
        let formula = k
            .mean_turn
            .as_ref()
            .and_then(rating_words::mean_turn_formula);
        ConductorJson {
            area_mm2: round_to(k.area_mm2, 6),
            description: describe(&k.shape, Units::Millimetres),
            mean_turn_estimated: formula.is_some(),
            mean_turn_formula: formula,
            mean_turn_mm: k.mean_turn.as_ref().map(|t| round_to(t.mm, 3)),
        }
    }
}

/// `resistance`.
#[derive(Serialize)]
struct ResistanceJson {
    from_thermal_class: bool,
    hot_ohm: f64,
    measured: bool,
    r20_ohm: f64,
    reference_c: f64,
}

impl From<&Resistance> for ResistanceJson {
    fn from(x: &Resistance) -> Self {
        ResistanceJson {
            from_thermal_class: x.from_class,
            hot_ohm: round_to(x.hot_ohm, 6),
            measured: x.measured,
            r20_ohm: round_to(x.r20_ohm, 6),
            reference_c: round_to(x.reference_c, 1),
        }
    }
}

/// `emf`.
#[derive(Serialize)]
struct EmfJson {
    basis: &'static str,
    brush_drop_v: f64,
    brush_grade: &'static str,
    emf_v: f64,
    emf_v_per_1000_rpm: Option<f64>,
    flux_needed_mwb: Option<f64>,
    ir_drop_v: Option<f64>,
    k_phi: Option<f64>,
    mode: &'static str,
    speed_at_flux_rpm: Option<f64>,
    speed_rpm: Option<f64>,
    terminal_v: Option<f64>,
    torque_nm: Option<f64>,
}

impl From<&Emf> for EmfJson {
    fn from(e: &Emf) -> Self {
        EmfJson {
            basis: match e.basis {
                EmfBasis::Terminal => "terminal-voltage",
                EmfBasis::FluxAndSpeed => "flux-and-speed",
            },
            brush_drop_v: round_to(e.brush_drop_v, 3),
            brush_grade: e.brush_grade.as_str(),
            emf_v: round_to(e.emf_v, 4),
            emf_v_per_1000_rpm: ro(e.v_per_1000_rpm, 4),
            flux_needed_mwb: ro(e.flux_needed_mwb, 4),
            ir_drop_v: e.ir_known.then(|| round_to(e.ir_drop_v, 4)),
            k_phi: ro(e.k_phi, 6),
            mode: e.mode.as_str(),
            speed_at_flux_rpm: ro(e.speed_at_flux_rpm, 3),
            speed_rpm: ro(e.speed_rpm, 3),
            terminal_v: ro(e.terminal_v, 3),
            torque_nm: ro(e.torque_nm, 4),
        }
    }
}

/// `segment_voltage`.
#[derive(Serialize)]
struct SegmentVoltageJson {
    average_v: f64,
    c_min_average: Option<u32>,
    c_min_peak: Option<u32>,
    peak_v: f64,
    pole_arc: f64,
}

impl From<&SegmentVoltage> for SegmentVoltageJson {
    fn from(v: &SegmentVoltage) -> Self {
        SegmentVoltageJson {
            average_v: round_to(v.average_v, 4),
            c_min_average: v.c_min_average,
            c_min_peak: v.c_min_peak,
            peak_v: round_to(v.peak_v, 4),
            pole_arc: round_to(v.pole_arc, 4),
        }
    }
}

/// `currents`.
#[derive(Serialize)]
struct CurrentsJson {
    armature_a: f64,
    brush_arms: u32,
    density_a_mm2: Option<f64>,
    per_brush_arm_a: f64,
    per_path_a: f64,
}

impl From<&Currents> for CurrentsJson {
    fn from(c: &Currents) -> Self {
        CurrentsJson {
            armature_a: round_to(c.armature_a, 4),
            brush_arms: c.brush_arms,
            density_a_mm2: ro(c.density_a_mm2, 4),
            per_brush_arm_a: round_to(c.per_brush_arm_a, 4),
            per_path_a: round_to(c.per_path_a, 4),
        }
    }
}

/// `commutator`.
#[derive(Serialize)]
struct CommutatorJson {
    brush_width_mm: Option<f64>,
    brush_width_segments: Option<f64>,
    coils_shorted_max: Option<u32>,
    coils_shorted_min: Option<u32>,
    diameter_mm: Option<f64>,
    peripheral_speed_m_s: Option<f64>,
    segment_pitch_mm: Option<f64>,
    speed_rpm: Option<f64>,
}

impl From<&CommutatorData> for CommutatorJson {
    fn from(k: &CommutatorData) -> Self {
        CommutatorJson {
            brush_width_mm: ro(k.brush_width_mm, 3),
            brush_width_segments: ro(k.brush_width_segments, 4),
            coils_shorted_max: k.coils_shorted_max,
            coils_shorted_min: k.coils_shorted_min,
            diameter_mm: ro(k.diameter_mm, 3),
            peripheral_speed_m_s: ro(k.peripheral_speed_m_s, 4),
            segment_pitch_mm: ro(k.segment_pitch_mm, 4),
            speed_rpm: ro(k.speed_rpm, 3),
        }
    }
}

/// `reactance`: the average reactance voltage of the coil under commutation.
#[derive(Serialize)]
struct ReactanceJson {
    average_v: f64,
    commutation_time_ms: f64,
    inductance_mh: f64,
    interpoles: Option<bool>,
    interpoles_needed: bool,
    overhang_mm: f64,
    overhang_permeance: f64,
    slot_given: bool,
    slot_permeance: f64,
    tooth_tip_permeance: f64,
    turns_per_coil: f64,
}

impl From<&Reactance> for ReactanceJson {
    fn from(x: &Reactance) -> Self {
        ReactanceJson {
            average_v: round_to(x.average_v, 4),
            commutation_time_ms: round_to(x.commutation_time_s * 1000.0, 5),
            inductance_mh: round_to(x.inductance_h * 1000.0, 6),
            interpoles: x.interpoles,
            interpoles_needed: x.interpoles_needed,
            overhang_mm: round_to(x.inputs.overhang_mm, 3),
            overhang_permeance: round_to(x.inputs.overhang_permeance, 4),
            slot_given: x.slot_given,
            slot_permeance: round_to(x.inputs.slot_permeance, 4),
            tooth_tip_permeance: round_to(x.inputs.tooth_tip_permeance, 4),
            turns_per_coil: x.inputs.turns_per_coil,
        }
    }
}

/// `losses`.
#[derive(Serialize)]
struct LossesJson {
    brush_w: f64,
    copper_at_c: f64,
    copper_w: Option<f64>,
}

impl From<&Losses> for LossesJson {
    fn from(l: &Losses) -> Self {
        LossesJson {
            brush_w: round_to(l.brush_w, 3),
            copper_at_c: round_to(l.copper_at_c, 1),
            copper_w: ro(l.copper_w, 3),
        }
    }
}

/// `test_voltage`, with its source and caution.
#[derive(Serialize)]
struct TestVoltageJson {
    caution: &'static str,
    new_v: f64,
    overhauled_v: f64,
    partly_rewound_v: f64,
    rated_v: f64,
    rule: &'static str,
    source: &'static str,
}

impl From<&TestVoltage> for TestVoltageJson {
    fn from(t: &TestVoltage) -> Self {
        TestVoltageJson {
            caution: TEST_VOLTAGE_CAUTION,
            new_v: round_to(t.new_v, 1),
            overhauled_v: round_to(t.overhauled_v, 1),
            partly_rewound_v: round_to(t.partial_v, 1),
            rated_v: round_to(t.rated_v, 3),
            rule: rating_words::test_rule(t.rule),
            source: TEST_VOLTAGE_SOURCE,
        }
    }
}

/// One of `checks`: a rating check with its limit and advice.
#[derive(Serialize)]
struct CheckJson<'a> {
    advice: &'a [String],
    bound: &'static str,
    id: &'static str,
    limit: f64,
    limit_key: &'static str,
    overridden: bool,
    passed: bool,
    severity: &'static str,
    source: &'static str,
    unit: &'static str,
    value: f64,
}

fn checks<S: Serializer>(c: &&[RatingCheck], s: S) -> Result<S::Ok, S::Error> {
    s.collect_seq(c.iter().map(|c| CheckJson {
        advice: &c.advice,
        bound: match c.rule.bound {
            Bound::AtMost => "at-most",
            Bound::AtLeast => "at-least",
        },
        id: c.rule.id,
        limit: round_to(c.limit, 4),
        limit_key: c.rule.key,
        overridden: c.overridden,
        passed: c.passed,
        severity: c.rule.level.as_str(),
        source: c.rule.source,
        unit: c.rule.unit,
        value: round_to(c.value, 4),
    }))
}

/// Writes the `rating` object of `r` alone, pretty-printed, without a final newline.
pub fn write_rating_json<W: std::io::Write>(r: &RatingReport, out: W) -> std::io::Result<()> {
    super::json::write_sorted(&RatingJson::new(r), out)
}
