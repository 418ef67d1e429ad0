//! The fault locator: which single fault best explains the measured readings.
//!
//! Part of the armature-test feature (under [`super`]): the solved [`Network`] and the measured
//! readings in, ranked hypotheses out. Every position of every kind is tried. A hypothesis
//! changes one coil or joins two bars, a rank-one change of the Laplacian, so by the
//! Sherman–Morrison formula its readings follow from the healthy network's grounded inverse Z
//! without a new factorisation: R'_q = R_q − τ·w_q², with w_q = c_qᵀ Z b, d = bᵀ Z b and
//! τ = Δg/(1 + Δg·d). Crossed leads change four terms at once and go through the Woodbury
//! form with a 4 × 4 capacitance matrix. The scale of the readings (their unit) and the
//! fault's size (τ) are fitted by linear least squares, τ kept within the fault's physical
//! range. Crossed leads are defined by [`crossed_leads`]; the exchange keeps the winding one
//! ring, so the 4 × 4 matrix stays regular.

use faer::Mat;
use faer::linalg::solvers::Solve;

use super::network::{NetCoil, Network};
use super::readings::{MeasuredReadings, ReadingValue};
use super::{ArmatureTest, Reading};

/// Default healthy tolerance: each reading within 5 % of the healthy pattern, scaled to the
/// readings [common practice for bar-to-bar readings, from memory].
pub const DEFAULT_TOLERANCE: f64 = 0.05;

/// Largest extra resistance a high-resistance joint is fitted with, coil resistances; beyond
/// it the coil is as good as open.
pub const JOINT_MAX_COILS: f64 = 20.0;

/// Most network nodes the locator takes on: it keeps the dense grounded inverse (nodes² numbers,
/// 128 MiB at this size).
pub const MAX_NODES: usize = 4096;

/// Hypotheses kept in the ranked list.
pub const KEPT: usize = 10;

/// The kinds of single fault the locator tries.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum FaultKind {
    /// Coil k broken or unsoldered.
    OpenCoil,
    /// Coil k short-circuited, wholly or partly (fitted fraction).
    ShortedCoil,
    /// A poor riser joint of coil k (fitted extra resistance).
    HighResistanceJoint,
    /// Bars j and j+1 joined by a mica or carbon track (fitted track resistance).
    ShortedBars,
    /// The start leads at bars j and j+1 exchanged.
    CrossedLeads,
}

impl FaultKind {
    /// Every kind, in report order.
    pub const ALL: [FaultKind; 5] = [
        FaultKind::OpenCoil,
        FaultKind::ShortedCoil,
        FaultKind::HighResistanceJoint,
        FaultKind::ShortedBars,
        FaultKind::CrossedLeads,
    ];

    /// The JSON key.
    pub fn key(self) -> &'static str {
        match self {
            FaultKind::OpenCoil => "open-coil",
            FaultKind::ShortedCoil => "shorted-coil",
            FaultKind::HighResistanceJoint => "high-resistance-joint",
            FaultKind::ShortedBars => "shorted-bars",
            FaultKind::CrossedLeads => "crossed-leads",
        }
    }
}

/// One ranked hypothesis.
#[derive(Clone, Debug, PartialEq)]
pub struct Fault {
    /// What.
    pub kind: FaultKind,
    /// Coil position numbers involved.
    pub coils: Vec<u32>,
    /// Bars to inspect.
    pub bars: Vec<u32>,
    /// Slots of those coils (top, then bottom), ascending.
    pub slots: Vec<u32>,
    /// Misfit: rms of (measured − fitted) over rms of measured, plus 1 for each reading open
    /// where the hypothesis says closed or the other way round. Lower is better.
    pub score: f64,
    /// The fitted size: fraction shorted, extra resistance or track resistance in coil
    /// resistances; `None` for a fault of fixed size.
    pub size: Option<f64>,
    /// The fitted scale: measured units per coil resistance.
    pub scale: f64,
    /// The readings it predicts (in coil resistances × scale), in measured-pair order.
    pub predicted: Vec<Option<f64>>,
    /// In words.
    pub explanation: String,
}

/// The locator's result.
#[derive(Clone, Debug, PartialEq)]
pub struct Location {
    /// The pairs read, in the test's order, with their measured values.
    pub measured: Vec<(Reading, ReadingValue)>,
    /// Pairs the test lists that the file leaves out.
    pub missing: usize,
    /// Every reading within tolerance of the healthy pattern.
    pub healthy: bool,
    /// The tolerance used.
    pub tolerance: f64,
    /// The healthy network's scale: measured units per unit of the test's readings (median of
    /// measured/expected).
    pub healthy_scale: f64,
    /// Bars of readings outside tolerance.
    pub suspect_bars: Vec<u32>,
    /// The healthy pattern's misfit, as [`Fault::score`].
    pub healthy_score: f64,
    /// The best hypotheses, best first (at most [`KEPT`]).
    pub faults: Vec<Fault>,
    /// Hypotheses that change no reading (cannot be seen by this test), by kind.
    pub invisible: Vec<(FaultKind, usize)>,
}

/// Crossed leads at bars `j` and `k` = j + 1: the lead of the coil that ends at bar j and the
/// lead of the coil that starts at bar k change places, which keeps the winding one closed
/// ring (on a lap the readings either side of the pair go up). Where one coil does both (a
/// retrogressive lap coil from k to j, whose exchange only reverses it), the coil starting at
/// j and the coil ending at k are taken instead. Returns each changed coil's index in `coils`
/// with its new bars; `None` when the bars have no such two coils.
pub fn crossed_leads(coils: &[NetCoil], j: u32, k: u32) -> Option<[(usize, NetCoil); 2]> {
    let ends = |b: u32| coils.iter().position(|c| c.to_bar == b);
    let starts = |b: u32| coils.iter().position(|c| c.from_bar == b);
    let (a, b) = (ends(j)?, starts(k)?);
    if a != b {
        let (mut ca, mut cb) = (coils[a], coils[b]);
        ca.to_bar = k;
        cb.from_bar = j;
        return Some([(a, ca), (b, cb)]);
    }
    let (a, b) = (starts(j)?, ends(k)?);
    if a == b {
        return None;
    }
    let (mut ca, mut cb) = (coils[a], coils[b]);
    ca.from_bar = k;
    cb.to_bar = j;
    Some([(a, ca), (b, cb)])
}

/// Grounded-inverse lookups on nodes.
struct Transfer<'a> {
    z: &'a [f64],
    n: usize,
}

impl Transfer<'_> {
    /// (e_x − e_y)ᵀ Z (e_s − e_t).
    fn t(&self, (x, y): (usize, usize), (s, t): (usize, usize)) -> f64 {
        let z = |i: usize, j: usize| self.z[i * self.n + j];
        z(x, s) - z(x, t) - z(y, s) + z(y, t)
    }
}

struct Fit {
    score: f64,
    scale: f64,
    tau: f64,
    predicted: Vec<Option<f64>>,
}

/// Misfit of `pred` against `meas` with the best scale.
fn misfit(meas: &[ReadingValue], pred: &[Option<f64>]) -> (f64, f64) {
    let (mut mp, mut pp, mut mm, mut bad) = (0.0, 0.0, 0.0, 0usize);
    for (m, p) in meas.iter().zip(pred) {
        match (m, p) {
            (ReadingValue::Value(m), Some(p)) => {
                mp += m * p;
                pp += p * p;
                mm += m * m;
            }
            (ReadingValue::Open, None) => {}
            _ => bad += 1,
        }
    }
    let scale = if pp > 0.0 { mp / pp } else { 0.0 };
    let mut res = 0.0;
    for (m, p) in meas.iter().zip(pred) {
        if let (ReadingValue::Value(m), Some(p)) = (m, p) {
            res += (m - scale * p).powi(2);
        }
    }
    let rel = if mm > 0.0 { (res / mm).sqrt() } else { 0.0 };
    (rel + bad as f64, scale)
}

/// Fits τ in [lo, hi] for R'_q = R_q − τ w_q², with the scale.
fn fit_rank_one(meas: &[ReadingValue], base: &[Option<f64>], w: &[f64], lo: f64, hi: f64) -> Fit {
    // Least squares of m ≈ α R − β w² over the numeric pairs, τ = β/α.
    let (mut a11, mut a12, mut a22, mut b1, mut b2) = (0.0, 0.0, 0.0, 0.0, 0.0);
    for ((m, r), w) in meas.iter().zip(base).zip(w) {
        if let (ReadingValue::Value(m), Some(r)) = (m, r) {
            let v = -w * w;
            a11 += r * r;
            a12 += r * v;
            a22 += v * v;
            b1 += r * m;
            b2 += v * m;
        }
    }
    let det = a11 * a22 - a12 * a12;
    let tau = if det.abs() > 1e-12 * a11 * a22.max(1e-300) && a11 > 0.0 {
        let alpha = (b1 * a22 - b2 * a12) / det;
        let beta = (a11 * b2 - a12 * b1) / det;
        if alpha.abs() > 0.0 { beta / alpha } else { 0.0 }
    } else {
        0.0
    };
    let tau = if tau.is_finite() {
        tau.clamp(lo, hi)
    } else {
        hi
    };
    let predicted: Vec<Option<f64>> = base
        .iter()
        .zip(w)
        .map(|(r, w)| r.map(|r| (r - tau * w * w).max(0.0)))
        .collect();
    let (score, scale) = misfit(meas, &predicted);
    Fit {
        score,
        scale,
        tau,
        predicted,
    }
}

fn slots_of(coils: &[u32], net_slots: &[(u32, u32)]) -> Vec<u32> {
    let mut s: Vec<u32> = coils
        .iter()
        .flat_map(|&k| {
            let (a, b) = net_slots[k as usize - 1];
            [a, b]
        })
        .collect();
    s.sort_unstable();
    s.dedup();
    s
}

/// The readings the locator works on: the measured pairs, their network nodes, the healthy
/// pattern in coil resistances and the healthy network's grounded inverse.
struct Problem<'a> {
    net: &'a Network,
    z: Transfer<'a>,
    meas: Vec<ReadingValue>,
    pairs: Vec<(usize, usize)>,
    base: Vec<Option<f64>>,
}

impl Problem<'_> {
    /// w_q = c_qᵀ Z b for every reading q, with b the branch between nodes `e`.
    fn transfer_to(&self, e: (usize, usize)) -> Vec<f64> {
        self.pairs.iter().map(|&q| self.z.t(q, e)).collect()
    }

    /// The largest relative change a prediction makes to the healthy readings.
    fn effect(&self, pred: &[Option<f64>]) -> f64 {
        pred.iter()
            .zip(&self.base)
            .map(|(p, b)| match (p, b) {
                (Some(p), Some(b)) if *b > 0.0 => (p - b).abs() / b,
                (None, None) => 0.0,
                (Some(_), Some(_)) => 0.0,
                _ => f64::INFINITY,
            })
            .fold(0.0, f64::max)
    }

    /// A fit of a fixed prediction (no size to fit).
    fn fixed(&self, predicted: Vec<Option<f64>>) -> Fit {
        let (score, scale) = misfit(&self.meas, &predicted);
        Fit {
            score,
            scale,
            tau: 0.0,
            predicted,
        }
    }
}

/// A rank-one change is seen by a reading only where w_q ≠ 0.
fn seen(w: &[f64]) -> bool {
    w.iter().any(|w| w.abs() > 1e-9)
}

/// The hypotheses as they are tried: the visible ones kept, the invisible ones counted.
struct Ranking<'a> {
    slots: &'a [(u32, u32)],
    faults: Vec<Fault>,
    invisible: Vec<usize>,
}

impl Ranking<'_> {
    #[allow(clippy::too_many_arguments)]
    fn push(
        &mut self,
        kind: FaultKind,
        coils: Vec<u32>,
        bars: Vec<u32>,
        fit: Fit,
        size: Option<f64>,
        words: String,
        visible: bool,
    ) {
        if !visible {
            self.invisible[kind as usize] += 1;
            return;
        }
        self.faults.push(Fault {
            kind,
            slots: slots_of(&coils, self.slots),
            coils,
            bars,
            score: fit.score,
            size,
            scale: fit.scale,
            predicted: fit
                .predicted
                .iter()
                .map(|p| p.map(|p| p * fit.scale))
                .collect(),
            explanation: words,
        });
    }
}

/// Ranks every single-fault hypothesis against `measured`; `slots` gives each coil
/// position's (top, bottom) slots.
pub fn locate(
    t: &ArmatureTest,
    measured: &MeasuredReadings,
    slots: &[(u32, u32)],
    tolerance: f64,
) -> Location {
    let net: &Network = &t.network;
    let scale0 = t.coil_resistance_ohm.unwrap_or(1.0);
    let listed = t
        .readings
        .iter()
        .chain(t.readings_within_winding.iter().flatten());
    let mut rows: Vec<(Reading, ReadingValue)> = Vec::new();
    let mut missing = 0;
    for r in listed {
        match measured.values.get(&(r.from_bar, r.to_bar)) {
            Some(v) => rows.push((*r, *v)),
            None => missing += 1,
        }
    }
    let zv = net.inverse();
    let problem = Problem {
        net,
        z: Transfer {
            z: &zv,
            n: net.nodes(),
        },
        meas: rows.iter().map(|(_, v)| *v).collect(),
        pairs: rows
            .iter()
            .map(|(r, _)| (net.node(r.from_bar), net.node(r.to_bar)))
            .collect(),
        base: rows
            .iter()
            .map(|(r, _)| r.expected.map(|e| e / scale0))
            .collect(),
    };
    let (healthy_scale, suspect_bars) = healthy_pattern(&problem, &rows, tolerance);
    let (healthy_score, _) = misfit(&problem.meas, &problem.base);

    let mut ranking = Ranking {
        slots,
        faults: Vec::new(),
        invisible: vec![0usize; FaultKind::ALL.len()],
    };
    for c in &net.coils {
        coil_faults(&problem, c, &mut ranking);
    }
    let c_bars = net.bars;
    for j in 1..=c_bars {
        let k = j % c_bars + 1;
        shorted_bars(&problem, j, k, &mut ranking);
        crossed_lead_fault(&problem, j, k, &mut ranking);
    }
    let Ranking {
        mut faults,
        invisible,
        ..
    } = ranking;
    faults.sort_by(|a, b| {
        a.score
            .total_cmp(&b.score)
            .then(a.kind.cmp(&b.kind))
            .then(a.bars.cmp(&b.bars))
    });
    faults.truncate(KEPT);
    Location {
        measured: rows,
        missing,
        healthy: suspect_bars.is_empty(),
        tolerance,
        healthy_scale: healthy_scale / scale0,
        suspect_bars,
        healthy_score,
        faults,
        invisible: FaultKind::ALL
            .iter()
            .zip(invisible)
            .filter(|(_, n)| *n > 0)
            .map(|(k, n)| (*k, n))
            .collect(),
    }
}

/// Healthy: a robust scale (the median of measured over expected), and the bars of every
/// reading outside tolerance of the healthy pattern at that scale.
fn healthy_pattern(
    pr: &Problem,
    rows: &[(Reading, ReadingValue)],
    tolerance: f64,
) -> (f64, Vec<u32>) {
    let mut ratios: Vec<f64> = pr
        .meas
        .iter()
        .zip(&pr.base)
        .filter_map(|(m, b)| match (m, b) {
            (ReadingValue::Value(m), Some(b)) if *b > 0.0 => Some(m / b),
            _ => None,
        })
        .collect();
    ratios.sort_by(f64::total_cmp);
    let healthy_scale = ratios.get(ratios.len() / 2).copied().unwrap_or(1.0);
    let mut suspect_bars = Vec::new();
    for ((r, m), b) in rows.iter().zip(&pr.base) {
        let ok = match (m, b) {
            (ReadingValue::Value(m), Some(b)) => {
                (m - healthy_scale * b).abs() <= tolerance * healthy_scale * b.max(1e-300)
            }
            (ReadingValue::Open, None) => true,
            _ => false,
        };
        if !ok {
            suspect_bars.extend([r.from_bar, r.to_bar]);
        }
    }
    suspect_bars.sort_unstable();
    suspect_bars.dedup();
    (healthy_scale, suspect_bars)
}

/// The faults of one coil: open, shorted (a fitted fraction) and a high-resistance joint (a
/// fitted extra resistance).
fn coil_faults(pr: &Problem, c: &NetCoil, out: &mut Ranking) {
    let e = (pr.net.node(c.from_bar), pr.net.node(c.to_bar));
    if e.0 == e.1 {
        return;
    }
    let d = pr.z.t(e, e);
    let w = pr.transfer_to(e);
    let bars = vec![c.from_bar, c.to_bar];
    // Open coil: Δg = −1.
    let fit = if 1.0 - d < 1e-9 {
        // The coil is a bridge: every reading through it opens.
        pr.fixed(
            pr.base
                .iter()
                .zip(&w)
                .map(|(r, w)| if w.abs() > 1e-9 { None } else { *r })
                .collect(),
        )
    } else {
        let tau = -1.0 / (1.0 - d);
        fit_rank_one(&pr.meas, &pr.base, &w, tau, tau)
    };
    out.push(
        FaultKind::OpenCoil,
        vec![c.coil],
        bars.clone(),
        fit,
        None,
        format!(
            "coil {} open (broken or unsoldered) between bars {} and {}",
            c.coil, c.from_bar, c.to_bar
        ),
        seen(&w),
    );
    // Shorted coil: fraction f in (0, 1], τ in [0, 1/d].
    let fit = fit_rank_one(&pr.meas, &pr.base, &w, 0.0, 1.0 / d);
    let dg = fit.tau / (1.0 - fit.tau * d).max(1e-300);
    let f = (dg / (1.0 + dg)).clamp(0.0, 1.0);
    out.push(
        FaultKind::ShortedCoil,
        vec![c.coil],
        bars.clone(),
        fit,
        Some(f),
        format!(
            "coil {} shorted, about {:.0} % of it (fitted)",
            c.coil,
            100.0 * f
        ),
        seen(&w),
    );
    // High-resistance joint: extra x in [0, JOINT_MAX_COILS].
    let dg_min = -JOINT_MAX_COILS / (1.0 + JOINT_MAX_COILS);
    let lo = dg_min / (1.0 + dg_min * d);
    let fit = fit_rank_one(&pr.meas, &pr.base, &w, lo, 0.0);
    let dg = fit.tau / (1.0 - fit.tau * d);
    let x = (-dg / (1.0 + dg)).max(0.0);
    out.push(
        FaultKind::HighResistanceJoint,
        vec![c.coil],
        bars,
        fit,
        Some(x),
        format!(
            "a poor riser joint of coil {} at bar {} or bar {} (the two read alike), about {:.2} coil resistances extra (fitted)",
            c.coil, c.from_bar, c.to_bar, x
        ),
        seen(&w),
    );
}

/// Shorted bars: a track of fitted resistance between j and k = j + 1 (same part only: a
/// track between two windings carries no current in any reading within one).
fn shorted_bars(pr: &Problem, j: u32, k: u32, out: &mut Ranking) {
    let e = (pr.net.node(j), pr.net.node(k));
    if e.0 == e.1 || !pr.net.connected(j, k) {
        return;
    }
    let d = pr.z.t(e, e);
    let w = pr.transfer_to(e);
    let fit = fit_rank_one(&pr.meas, &pr.base, &w, 0.0, 1.0 / d);
    let dg = fit.tau / (1.0 - fit.tau * d).max(1e-300);
    let track = if dg > 0.0 { 1.0 / dg } else { f64::INFINITY };
    out.push(
        FaultKind::ShortedBars,
        Vec::new(),
        vec![j, k],
        fit,
        Some(track),
        format!(
            "bars {j} and {k} joined by a mica or carbon track of about {:.3} coil resistances (fitted)",
            track
        ),
        seen(&w),
    );
}

/// Crossed leads: the lead ending at bar j and the lead starting at bar k exchanged (see
/// [`crossed_leads`]); four terms change, through the Woodbury form.
fn crossed_lead_fault(pr: &Problem, j: u32, k: u32, out: &mut Ranking) {
    let net = pr.net;
    let Some(moves) = crossed_leads(&net.coils, j, k) else {
        return;
    };
    let (c1, c2) = (moves[0].1, moves[1].1);
    let (o1, o2) = (net.coils[moves[0].0], net.coils[moves[1].0]);
    let nodes = |c: NetCoil| (net.node(c.from_bar), net.node(c.to_bar));
    let u = [nodes(c1), nodes(o1), nodes(c2), nodes(o2)];
    let g = [1.0, -1.0, 1.0, -1.0];
    let mut m = Mat::<f64>::zeros(4, 4);
    for a in 0..4 {
        for b in 0..4 {
            m[(a, b)] = pr.z.t(u[a], u[b]) + if a == b { 1.0 / g[a] } else { 0.0 };
        }
    }
    let inv = m.partial_piv_lu().solve(Mat::<f64>::identity(4, 4));
    if !(0..4).all(|a| (0..4).all(|b| inv[(a, b)].abs() < 1e12)) {
        return;
    }
    let predicted: Vec<Option<f64>> = pr
        .pairs
        .iter()
        .zip(&pr.base)
        .map(|(&q, r)| {
            r.map(|r| {
                let wq: Vec<f64> = u.iter().map(|&x| pr.z.t(q, x)).collect();
                let mut quad = 0.0;
                for a in 0..4 {
                    for b in 0..4 {
                        quad += wq[a] * inv[(a, b)] * wq[b];
                    }
                }
                (r - quad).max(0.0)
            })
        })
        .collect();
    let shown = pr.effect(&predicted) > 1e-9;
    out.push(
        FaultKind::CrossedLeads,
        vec![c1.coil, c2.coil],
        vec![j, k],
        pr.fixed(predicted),
        None,
        format!(
            "the leads of coils {} and {} exchanged at bars {j} and {k}",
            c1.coil, c2.coil
        ),
        shown,
    );
}
