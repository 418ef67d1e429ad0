//! The fault locator: which single fault best explains the measured readings.
//!
//! Part of the armature-test feature (under [`super`]): the solved [`Network`] and the measured
//! readings in, ranked hypotheses out. Every position of every kind is tried. A hypothesis
//! that changes one coil or joins two bars of one winding is a rank-one change of the
//! Laplacian, so by the Sherman–Morrison formula its readings follow from the healthy
//! network's grounded inverse Z without a new factorisation: R'_q = R_q − τ·w_q², with
//! w_q = c_qᵀ Z b, d = bᵀ Z b and τ = Δg/(1 + Δg·d). Crossed leads change four terms at once
//! and go through the Woodbury form with a 4 × 4 capacitance matrix. A bad riser-to-bar joint
//! adds its resistance to the readings that probe its bar and to no other (the probe current
//! alone crosses it); a bar cut off reads open to both neighbours; a track between bars of two
//! windings of a multiplex winding joins them, so a reading across the two reads
//! R(x, j) + track + R(k, y) and every reading within one winding is unchanged [derived,
//! series and parallel resistances; docs/domain.md, "Faults the armature tests find"].
//!
//! The score is scale-free: the readings' unit (the scale) and the fault's size are fitted by
//! weighted least squares, each reading against its own expected value, so the large readings
//! of a wave or a singly re-entrant multiplex winding do not swamp the small telling ones. A
//! hypothesis whose fitted readings do not differ from healthy by half the tolerance is not
//! ranked. Only the best [`KEPT`] hypotheses are kept while ranking, so memory does not grow
//! with the number tried.

use std::collections::BTreeMap;

use faer::Mat;
use faer::linalg::solvers::Solve;

use super::network::{NetCoil, Network};
use super::readings::{MeasuredReadings, ReadingKind, ReadingValue};
use super::{ArmatureTest, Reading, Unit};

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
    /// A poor joint of one lead of coil k (fitted extra resistance in the coil's circuit).
    HighResistanceJoint,
    /// A poor riser-to-bar joint at bar j, both leads behind it (fitted resistance): only the
    /// two readings that probe bar j rise, by the same amount.
    RiserJoint,
    /// Bar j cut off the winding (its riser joint open, or two neighbouring end leads
    /// exchanged so that a coil closes on itself): bar j reads open to both neighbours.
    BarCutOff,
    /// Bars j and j+1 joined by a mica or carbon track (fitted track resistance); on a
    /// multiplex winding the two bars may lie on different windings.
    ShortedBars,
    /// The start leads at bars j and j+1 exchanged.
    CrossedLeads,
}

impl FaultKind {
    /// Every kind, in report order.
    pub const ALL: [FaultKind; 7] = [
        FaultKind::OpenCoil,
        FaultKind::ShortedCoil,
        FaultKind::HighResistanceJoint,
        FaultKind::RiserJoint,
        FaultKind::BarCutOff,
        FaultKind::ShortedBars,
        FaultKind::CrossedLeads,
    ];

    /// The JSON key.
    pub fn key(self) -> &'static str {
        match self {
            FaultKind::OpenCoil => "open-coil",
            FaultKind::ShortedCoil => "shorted-coil",
            FaultKind::HighResistanceJoint => "high-resistance-joint",
            FaultKind::RiserJoint => "riser-joint",
            FaultKind::BarCutOff => "bar-cut-off",
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
    /// Misfit: the rms over the readings of (measured − fitted) relative to each reading's
    /// own fitted value, plus 1 for each reading open where the hypothesis says closed or the
    /// other way round. Lower is better; scale-free.
    pub score: f64,
    /// The largest misfit of one reading, relative to its own fitted value; infinite when a
    /// reading is open where the fault predicts it closed, or the other way round.
    pub worst: f64,
    /// Every reading lies within the tolerance of what this fault predicts.
    pub explains: bool,
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
    /// The faults after the best that explain the readings as well (their misfits within
    /// [`ALIKE`] of the best's): these readings cannot tell them from the best.
    pub alike: usize,
    /// A drop test whose expected millivolts are absolute (the winding's resistance known):
    /// the measured over the expected, when it lies more than the tolerance from 1 (a wrong
    /// test current or meter range, or a winding wound other than the design).
    pub off_scale: Option<f64>,
    /// Bar-to-bar resistances or drop-test millivolts.
    pub kind: ReadingKind,
    /// Every reading within tolerance of the healthy pattern.
    pub healthy: bool,
    /// Every reading is zero where the winding reads a resistance: a shorted commutator or
    /// the meter on the wrong range; nothing is ranked.
    pub all_zero: bool,
    /// The tolerance used.
    pub tolerance: f64,
    /// The healthy network's scale: measured units per unit of the test's readings (median of
    /// measured/expected).
    pub healthy_scale: f64,
    /// Bars of readings outside tolerance.
    pub suspect_bars: Vec<u32>,
    /// The pairs read outside tolerance (from bar, to bar), in the test's order.
    pub suspect_pairs: Vec<(u32, u32)>,
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

/// A hypothesis's readings judged against the measured ones: its prediction for each group
/// of readings, and for the few readings it tells apart from their group.
#[derive(Clone)]
struct Fit {
    score: f64,
    worst: f64,
    explains: bool,
    scale: f64,
    predicted: Vec<Option<f64>>,
    own: Vec<(usize, Option<f64>)>,
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

/// The measured readings of one cell: a group's readings, or one reading alone.
#[derive(Clone, Copy, Debug, Default)]
struct Stats {
    /// Numeric readings.
    n: f64,
    /// Readings shown open.
    open: usize,
    /// Σ m and Σ m² over the numeric readings.
    sm: f64,
    sm2: f64,
    /// Least and largest numeric reading.
    lo: f64,
    hi: f64,
}

impl Stats {
    fn add(&mut self, v: ReadingValue) {
        match v {
            ReadingValue::Value(m) => {
                if self.n == 0.0 {
                    (self.lo, self.hi) = (m, m);
                }
                self.n += 1.0;
                self.sm += m;
                self.sm2 += m * m;
                self.lo = self.lo.min(m);
                self.hi = self.hi.max(m);
            }
            ReadingValue::Open => self.open += 1,
        }
    }
}

/// The readings on one pair of network nodes: every hypothesis that changes coils or joins
/// nodes predicts them alike (bars an equalizer ties share a node, so a large equalized
/// winding has few groups).
struct Group {
    stats: Stats,
    members: Vec<usize>,
}

/// The readings the locator works on: the measured pairs (as bars, and grouped by their
/// network nodes), the healthy pattern in coil resistances and the healthy network's
/// grounded inverse. `pairs` and `base` are per group.
struct Problem<'a> {
    net: &'a Network,
    z: Transfer<'a>,
    meas: Vec<ReadingValue>,
    bars: Vec<(u32, u32)>,
    group_of: Vec<usize>,
    /// The readings that probe each bar (index bar − 1).
    by_bar: Vec<Vec<usize>>,
    groups: Vec<Group>,
    pairs: Vec<(usize, usize)>,
    /// Where each group's test current goes in and out: its own two nodes for a bar-to-bar
    /// reading, the feed's for a drop-test reading.
    sources: Vec<(usize, usize)>,
    /// The sign of each group's reading as solved, t(pair, source) (a meter shows its size).
    signs: Vec<f64>,
    /// Drop-test millivolts: the meter draws no current, so only faults in the feed current's
    /// way are tried.
    drop: bool,
    base: Vec<Option<f64>>,
    /// The least reference a reading is judged against: a hundredth of the mean healthy
    /// reading (bars an equalizer ties read zero).
    floor: f64,
    tolerance: f64,
}

impl Problem<'_> {
    /// w_g = c_gᵀ Z b for every group g, with b the branch between nodes `e`.
    fn transfer_to(&self, e: (usize, usize)) -> Vec<f64> {
        self.pairs.iter().map(|&q| self.z.t(q, e)).collect()
    }

    /// What group `g`'s readings are judged against: their healthy value, or the
    /// hypothesis's own where the healthy winding reads open, never below the floor.
    fn reference(&self, g: usize, predicted: Option<f64>) -> f64 {
        self.base[g].or(predicted).unwrap_or(0.0).max(self.floor)
    }

    /// Visits the measured readings in cells: a whole group where the hypothesis gives all
    /// its readings `groups[g]`, one reading alone where `own` gives it a value of its own.
    fn cells<T: Copy>(
        &self,
        groups: &[T],
        own: &[(usize, T)],
        mut f: impl FnMut(&Stats, usize, T),
    ) {
        for (g, group) in self.groups.iter().enumerate() {
            if !own.iter().any(|(q, _)| self.group_of[*q] == g) {
                f(&group.stats, g, groups[g]);
                continue;
            }
            for &q in &group.members {
                let mut one = Stats::default();
                one.add(self.meas[q]);
                let v = own
                    .iter()
                    .find(|(r, _)| *r == q)
                    .map_or(groups[g], |(_, v)| *v);
                f(&one, g, v);
            }
        }
    }

    /// Judges a prediction (coil resistances, per group, and `own` readings): the scale by
    /// weighted least squares (each reading weighted by its reference's inverse square), then
    /// the rms and the worst relative misfit, and whether every reading is within the
    /// tolerance.
    fn judge_with(&self, predicted: Vec<Option<f64>>, own: Vec<(usize, Option<f64>)>) -> Fit {
        let (mut mp, mut pp, mut bad) = (0.0, 0.0, 0usize);
        self.cells(&predicted, &own, |st, g, p| match p {
            Some(p) => {
                let w = self.reference(g, Some(p)).powi(-2);
                mp += w * p * st.sm;
                pp += w * p * p * st.n;
                bad += st.open;
            }
            None => bad += st.n as usize,
        });
        let scale = if pp > 0.0 { (mp / pp).max(0.0) } else { 0.0 };
        let (mut sum, mut n, mut worst) = (0.0, 0.0, 0.0f64);
        self.cells(&predicted, &own, |st, g, p| {
            if let (Some(p), true) = (p, st.n > 0.0) {
                let at = scale * self.reference(g, Some(p));
                let fitted = scale * p;
                let off2 = (st.sm2 - 2.0 * fitted * st.sm + st.n * fitted * fitted).max(0.0);
                let far = (st.hi - fitted).abs().max((st.lo - fitted).abs());
                if at > 0.0 {
                    sum += off2 / (at * at);
                    worst = worst.max(far / at);
                } else {
                    sum += st.n;
                    worst = f64::INFINITY;
                }
                n += st.n;
            }
        });
        let rms = if n > 0.0 { (sum / n).sqrt() } else { 0.0 };
        Fit {
            score: rms + bad as f64,
            worst: if bad > 0 { f64::INFINITY } else { worst },
            explains: bad == 0 && worst <= self.tolerance,
            scale,
            predicted,
            own,
        }
    }

    fn judge(&self, predicted: Vec<Option<f64>>) -> Fit {
        self.judge_with(predicted, Vec::new())
    }

    /// Fits `ratio` in [lo, hi] for m ≈ α·(a + ratio·c) by weighted least squares over the
    /// numeric readings (m ≈ α a + β c, ratio = β/α), with (a, c) per group and for the `own`
    /// readings; the upper bound when the fit runs away.
    fn fit_ratio_with(
        &self,
        model: &[(Option<f64>, f64)],
        own: &[(usize, (Option<f64>, f64))],
        lo: f64,
        hi: f64,
    ) -> f64 {
        let (mut a11, mut a12, mut a22, mut b1, mut b2) = (0.0, 0.0, 0.0, 0.0, 0.0);
        self.cells(model, own, |st, g, (x, v)| {
            if let Some(x) = x {
                let w = self.reference(g, Some(x)).powi(-2);
                a11 += w * x * x * st.n;
                a12 += w * x * v * st.n;
                a22 += w * v * v * st.n;
                b1 += w * x * st.sm;
                b2 += w * v * st.sm;
            }
        });
        let det = a11 * a22 - a12 * a12;
        let ratio = if det.abs() > 1e-12 * a11 * a22.max(1e-300) && a11 > 0.0 {
            let alpha = (b1 * a22 - b2 * a12) / det;
            let beta = (a11 * b2 - a12 * b1) / det;
            if alpha > 0.0 { beta / alpha } else { hi }
        } else {
            0.0
        };
        if ratio.is_finite() {
            ratio.clamp(lo, hi)
        } else {
            hi
        }
    }

    fn fit_ratio(&self, a: &[Option<f64>], c: &[f64], lo: f64, hi: f64) -> f64 {
        let model: Vec<(Option<f64>, f64)> = a.iter().copied().zip(c.iter().copied()).collect();
        self.fit_ratio_with(&model, &[], lo, hi)
    }

    /// How each group's reading moves with a rank-one change along the branch between nodes
    /// `e`: t'(pair, source) = t(pair, source) − τ·t(pair, e)·t(source, e), signed as the
    /// reading is (w² for a bar-to-bar reading, whose source is its own pair).
    fn coupling(&self, w: &[f64], e: (usize, usize)) -> Vec<f64> {
        if !self.drop {
            return w.iter().map(|w| w * w).collect();
        }
        w.iter()
            .zip(&self.sources)
            .zip(&self.signs)
            .map(|((w, &f), s)| s * w * self.z.t(f, e))
            .collect()
    }

    /// The healthy readings changed by τ·wv (a rank-one change); a meter shows the size.
    fn rank_one(&self, wv: &[f64], tau: f64) -> Vec<Option<f64>> {
        self.base
            .iter()
            .zip(wv)
            .map(|(r, wv)| r.map(|r| (r - tau * wv).abs()))
            .collect()
    }

    /// Fits τ in [lo, hi] for the rank-one change of coupling `wv`; returns τ and its fit.
    ///
    /// A drop-test reading may pass through zero and change sign under the fault, which the
    /// meter does not show: the fit is repeated with each reading signed as the last fit
    /// predicts it, until the signs settle, from several starting sizes across [lo, hi] (a
    /// fit that starts with the wrong signs can settle on them), keeping the best.
    fn fit_rank_one(&self, wv: &[f64], lo: f64, hi: f64) -> (f64, Fit) {
        let c: Vec<f64> = wv.iter().map(|wv| -wv).collect();
        let signs = |tau: f64| -> Vec<f64> {
            self.base
                .iter()
                .zip(wv)
                .map(|(b, wv)| match b {
                    Some(b) if b - tau * wv < 0.0 => -1.0,
                    _ => 1.0,
                })
                .collect()
        };
        let settle = |start: f64| -> f64 {
            let mut flip = signs(start);
            let mut tau = start;
            for _ in 0..6 {
                let model: Vec<(Option<f64>, f64)> = self
                    .base
                    .iter()
                    .zip(&c)
                    .zip(&flip)
                    .map(|((b, c), f)| (b.map(|b| f * b), f * c))
                    .collect();
                tau = self.fit_ratio_with(&model, &[], lo, hi);
                let next = signs(tau);
                if next == flip {
                    break;
                }
                flip = next;
            }
            tau
        };
        let starts: &[f64] = if self.drop { &[0.0, 0.5, 0.9] } else { &[0.0] };
        let mut best: Option<(f64, Fit)> = None;
        for &s in starts {
            let tau = settle(if s == 0.0 {
                0.0f64.clamp(lo, hi)
            } else {
                lo + s * (hi - lo)
            });
            let fit = self.judge(self.rank_one(wv, tau));
            if best.as_ref().is_none_or(|(_, b)| fit.score < b.score) {
                best = Some((tau, fit));
            }
        }
        best.expect("one start at least")
    }

    /// The largest relative change a prediction makes to the healthy readings (infinite
    /// where it opens or closes one).
    fn effect(&self, fit: &Fit) -> f64 {
        let mut most = 0.0f64;
        self.cells(&fit.predicted, &fit.own, |_, g, p| {
            let change = match (p, self.base[g]) {
                (Some(p), Some(b)) => (p - b).abs() / b.max(self.floor),
                (None, None) => 0.0,
                _ => f64::INFINITY,
            };
            most = most.max(change);
        });
        most
    }

    /// The prediction of every measured reading, in their order.
    fn readings_of(&self, fit: &Fit) -> Vec<Option<f64>> {
        (0..self.meas.len())
            .map(|q| {
                fit.own
                    .iter()
                    .find(|(r, _)| *r == q)
                    .map_or(fit.predicted[self.group_of[q]], |(_, v)| *v)
            })
            .collect()
    }
}

/// A rank-one change is seen by a reading only where w_q ≠ 0.
fn seen(w: &[f64]) -> bool {
    w.iter().any(|w| w.abs() > 1e-9)
}

/// One hypothesis as it is offered to the ranking.
struct Hypothesis {
    kind: FaultKind,
    coils: Vec<u32>,
    bars: Vec<u32>,
    size: Option<f64>,
    words: String,
}

/// The hypotheses as they are tried: the best [`KEPT`] kept in order, the invisible ones
/// counted; one that changes no reading by half the tolerance is not ranked.
struct Ranking<'a> {
    slots: &'a [(u32, u32)],
    faults: Vec<Fault>,
    invisible: Vec<usize>,
}

impl Ranking<'_> {
    fn push(&mut self, pr: &Problem, h: Hypothesis, fit: Fit, visible: bool) {
        if !visible {
            self.invisible[h.kind as usize] += 1;
            return;
        }
        let order = |f: &Fault| (f.score, f.kind, f.bars.clone());
        let before = |a: &(f64, FaultKind, Vec<u32>), b: &(f64, FaultKind, Vec<u32>)| {
            a.0.total_cmp(&b.0)
                .then(a.1.cmp(&b.1))
                .then(a.2.cmp(&b.2))
                .is_lt()
        };
        let key = (fit.score, h.kind, h.bars.clone());
        // A fault that would not be kept needs no more thought; one that would, but changes no
        // reading by half the tolerance, is not ranked.
        if self.faults.len() == KEPT && !before(&key, &order(&self.faults[KEPT - 1])) {
            return;
        }
        if pr.effect(&fit) < 0.5 * pr.tolerance {
            return;
        }
        let at = self.faults.partition_point(|f| before(&order(f), &key));
        self.faults.insert(
            at,
            Fault {
                kind: h.kind,
                slots: slots_of(&h.coils, self.slots),
                coils: h.coils,
                bars: h.bars,
                score: fit.score,
                worst: fit.worst,
                explains: fit.explains,
                size: h.size,
                scale: fit.scale,
                predicted: pr
                    .readings_of(&fit)
                    .iter()
                    .map(|p| p.map(|p| p * fit.scale))
                    .collect(),
                explanation: h.words,
            },
        );
        self.faults.truncate(KEPT);
    }
}

/// Two faults whose misfits differ by no more than this read alike: the readings cannot tell
/// them apart (the misfit is printed to three places).
pub const ALIKE: f64 = 0.0005;

/// Ranks every single-fault hypothesis against `measured`; `slots` gives each coil
/// position's (top, bottom) slots.
pub fn locate(
    t: &ArmatureTest,
    measured: &MeasuredReadings,
    slots: &[(u32, u32)],
    tolerance: f64,
) -> Location {
    let net: &Network = &t.network;
    let drop = measured.kind == ReadingKind::Drop;
    // One coil resistance in the test's unit: ohms (or coils) bar to bar; millivolts (or
    // coil resistances × amperes) per coil resistance of transfer in the drop test.
    let coil = t.coil_resistance_ohm.unwrap_or(1.0);
    let unit0 = if !drop {
        coil
    } else if t.unit == Unit::Ohm {
        coil * t.drop_test.current_a * 1000.0
    } else {
        t.drop_test.current_a
    };
    // Each listed pair with where its test current goes in and out.
    let listed: Vec<(Reading, (u32, u32))> = if drop {
        t.drop_test
            .feeds
            .iter()
            .flat_map(|f| f.readings.iter().map(|r| (*r, (f.from_bar, f.to_bar))))
            .collect()
    } else {
        t.listed().map(|r| (*r, (r.from_bar, r.to_bar))).collect()
    };
    let mut rows: Vec<(Reading, ReadingValue)> = Vec::new();
    let mut sources = Vec::new();
    let mut missing = 0;
    for (r, source) in listed {
        match measured.values.get(&(r.from_bar, r.to_bar)) {
            Some(v) => {
                rows.push((r, *v));
                sources.push(source);
            }
            None => missing += 1,
        }
    }
    let zv = net.inverse();
    let problem = problem(net, &zv, &rows, &sources, unit0, drop, tolerance);
    let healthy = healthy_pattern(&problem, &rows, tolerance);
    let mut ranking = Ranking {
        slots,
        faults: Vec::new(),
        invisible: vec![0usize; FaultKind::ALL.len()],
    };
    if !healthy.all_zero {
        rank_all(&problem, &mut ranking);
    }
    let alike = ranking.faults.first().map_or(0, |best| {
        ranking.faults[1..]
            .iter()
            .take_while(|f| f.explains == best.explains && f.score - best.score <= ALIKE)
            .count()
    });
    let scale = healthy.scale / unit0;
    let absolute = drop && t.unit == Unit::Ohm;
    Location {
        alike,
        off_scale: (absolute && !healthy.all_zero && (scale - 1.0).abs() > tolerance)
            .then_some(scale),
        measured: rows,
        missing,
        kind: measured.kind,
        healthy: healthy.suspect_bars.is_empty(),
        all_zero: healthy.all_zero,
        tolerance,
        healthy_scale: scale,
        suspect_bars: healthy.suspect_bars,
        suspect_pairs: healthy.suspect_pairs,
        faults: ranking.faults,
        invisible: FaultKind::ALL
            .iter()
            .zip(ranking.invisible)
            .filter(|(_, n)| *n > 0)
            .map(|(k, n)| (*k, n))
            .collect(),
    }
}

/// The readings grouped by their two nodes and their test current's (a bar-to-bar reading's
/// pair with the lower node first, as its own source), in units of one coil resistance.
fn problem<'a>(
    net: &'a Network,
    zv: &'a [f64],
    rows: &[(Reading, ReadingValue)],
    sources: &[(u32, u32)],
    unit0: f64,
    drop: bool,
    tolerance: f64,
) -> Problem<'a> {
    let z = Transfer {
        z: zv,
        n: net.nodes(),
    };
    let mut index = BTreeMap::new();
    let (mut groups, mut pairs, mut feeds, mut signs, mut base, mut group_of) = (
        Vec::new(),
        Vec::new(),
        Vec::new(),
        Vec::new(),
        Vec::new(),
        Vec::new(),
    );
    for (q, ((r, v), &(fa, fb))) in rows.iter().zip(sources).enumerate() {
        let (a, b) = (net.node(r.from_bar), net.node(r.to_bar));
        let (pair, source) = if drop {
            ((a, b), (net.node(fa), net.node(fb)))
        } else {
            ((a.min(b), a.max(b)), (a.min(b), a.max(b)))
        };
        let g = *index.entry((pair, source)).or_insert_with(|| {
            groups.push(Group {
                stats: Stats::default(),
                members: Vec::new(),
            });
            pairs.push(pair);
            feeds.push(source);
            signs.push(if drop && z.t(pair, source) < 0.0 {
                -1.0
            } else {
                1.0
            });
            base.push(r.expected.map(|e| e / unit0));
            groups.len() - 1
        });
        groups[g].stats.add(*v);
        groups[g].members.push(q);
        group_of.push(g);
    }
    let mut by_bar = vec![Vec::new(); net.bars as usize];
    for (q, (r, _)) in rows.iter().enumerate() {
        by_bar[r.from_bar as usize - 1].push(q);
        if r.to_bar != r.from_bar {
            by_bar[r.to_bar as usize - 1].push(q);
        }
    }
    let positive: Vec<f64> = base
        .iter()
        .flatten()
        .copied()
        .filter(|&b| b > 0.0)
        .collect();
    let mean = positive.iter().sum::<f64>() / positive.len().max(1) as f64;
    Problem {
        net,
        z,
        meas: rows.iter().map(|(_, v)| *v).collect(),
        bars: rows.iter().map(|(r, _)| (r.from_bar, r.to_bar)).collect(),
        by_bar,
        group_of,
        groups,
        pairs,
        sources: feeds,
        signs,
        drop,
        base,
        floor: (0.01 * mean).max(1e-12),
        tolerance,
    }
}

/// Offers every hypothesis to the ranking.
fn rank_all(problem: &Problem, ranking: &mut Ranking) {
    let net = problem.net;
    // Hypotheses on the same nodes with the same resistances read alike (bars an
    // equalizer ties share a node): each such set is fitted once.
    let key = |c: &NetCoil| {
        (
            net.node(c.from_bar),
            net.node(c.to_bar),
            c.resistance.to_bits(),
        )
    };
    let mut coils: BTreeMap<(usize, usize, u64), Vec<NetCoil>> = BTreeMap::new();
    for c in &net.coils {
        let (a, b, r) = key(c);
        coils.entry((a.min(b), a.max(b), r)).or_default().push(*c);
    }
    for alike in coils.values() {
        coil_faults(problem, alike, ranking);
    }
    let c_bars = net.bars;
    let mut tracks: BTreeMap<(usize, usize), Vec<(u32, u32)>> = BTreeMap::new();
    let mut crossings: BTreeMap<Vec<(usize, usize, u64)>, Vec<Crossing>> = BTreeMap::new();
    for j in 1..=c_bars {
        let k = j % c_bars + 1;
        bar_faults(problem, j, ranking);
        tracks
            .entry((net.node(j), net.node(k)))
            .or_default()
            .push((j, k));
        if let Some(moves) = crossed_leads(&net.coils, j, k) {
            let changed = [
                moves[0].1,
                net.coils[moves[0].0],
                moves[1].1,
                net.coils[moves[1].0],
            ];
            crossings
                .entry(changed.iter().map(key).collect())
                .or_default()
                .push((j, k, moves));
        }
    }
    for alike in tracks.values() {
        shorted_bars(problem, alike, ranking);
    }
    for alike in crossings.values() {
        crossed_lead_fault(problem, alike, ranking);
    }
}

/// The healthy pattern fitted to the readings.
struct Healthy {
    scale: f64,
    suspect_bars: Vec<u32>,
    suspect_pairs: Vec<(u32, u32)>,
    all_zero: bool,
}

/// Healthy: a robust scale (the median of measured over expected, over the readings above
/// zero), and the bars of every reading outside tolerance of the healthy pattern at that
/// scale; every reading zero where the winding reads a resistance is said as such.
fn healthy_pattern(pr: &Problem, rows: &[(Reading, ReadingValue)], tolerance: f64) -> Healthy {
    let base: Vec<Option<f64>> = pr.group_of.iter().map(|&g| pr.base[g]).collect();
    let numeric: Vec<(f64, f64)> = pr
        .meas
        .iter()
        .zip(&base)
        .filter_map(|(m, b)| match (m, b) {
            (ReadingValue::Value(m), Some(b)) if *b > 0.0 => Some((*m, *b)),
            _ => None,
        })
        .collect();
    let mut ratios: Vec<f64> = numeric
        .iter()
        .filter(|(m, _)| *m > 0.0)
        .map(|(m, b)| m / b)
        .collect();
    ratios.sort_by(f64::total_cmp);
    let all_zero = !numeric.is_empty() && ratios.is_empty();
    let scale = ratios.get(ratios.len() / 2).copied().unwrap_or(1.0);
    let mut suspect_bars = Vec::new();
    let mut suspect_pairs = Vec::new();
    for ((r, m), b) in rows.iter().zip(&base) {
        let ok = match (m, b) {
            (ReadingValue::Value(m), Some(b)) => {
                !all_zero && (m - scale * b).abs() <= tolerance * scale * b.max(pr.floor)
            }
            (ReadingValue::Open, None) => true,
            _ => false,
        };
        if !ok {
            suspect_bars.extend([r.from_bar, r.to_bar]);
            suspect_pairs.push((r.from_bar, r.to_bar));
        }
    }
    suspect_bars.sort_unstable();
    suspect_bars.dedup();
    Healthy {
        scale,
        suspect_bars,
        suspect_pairs,
        all_zero,
    }
}

/// The faults of one coil: open, shorted (a fitted fraction) and a high-resistance joint of
/// one lead (a fitted extra resistance), for a coil of conductance g = 1/r. `alike` are coils
/// between the same two nodes with the same resistance (bars an equalizer ties): they read
/// alike, so the fits are made once and offered for each.
fn coil_faults(pr: &Problem, alike: &[NetCoil], out: &mut Ranking) {
    let c = alike[0];
    let e = (pr.net.node(c.from_bar), pr.net.node(c.to_bar));
    if e.0 == e.1 {
        return;
    }
    let (r, g) = (c.resistance, 1.0 / c.resistance);
    let d = pr.z.t(e, e);
    let w = pr.transfer_to(e);
    let wv = pr.coupling(&w, e);
    let visible = seen(&wv);
    // Open coil: Δg = −g.
    let bridge = 1.0 - g * d < 1e-9;
    let open = if !bridge {
        Some(pr.judge(pr.rank_one(&wv, -g / (1.0 - g * d))))
    } else if !pr.drop {
        // The coil is a bridge: every reading through it opens.
        Some(
            pr.judge(
                pr.base
                    .iter()
                    .zip(&w)
                    .map(|(r, w)| if w.abs() > 1e-9 { None } else { *r })
                    .collect(),
            ),
        )
    } else {
        // A bridge open stops the feed current: no drop test reads it.
        None
    };
    // Shorted coil: fraction f in (0, 1], Δg = g·f/(1 − f), τ in [0, 1/d].
    let (tau, shorted) = pr.fit_rank_one(&wv, 0.0, 1.0 / d);
    let dg = tau / (1.0 - tau * d).max(1e-300);
    let f = (dg / (g + dg)).clamp(0.0, 1.0);
    // High-resistance joint: extra x in [0, JOINT_MAX_COILS], Δg = 1/(r + x) − g.
    let dg_min = 1.0 / (r + JOINT_MAX_COILS) - g;
    let lo = dg_min / (1.0 + dg_min * d);
    let (tau, joint) = pr.fit_rank_one(&wv, lo, 0.0);
    let dg = tau / (1.0 - tau * d);
    let x = (1.0 / (g + dg) - r).max(0.0);
    for c in alike {
        let hypothesis = |kind, size, words| Hypothesis {
            kind,
            coils: vec![c.coil],
            bars: vec![c.from_bar, c.to_bar],
            size,
            words,
        };
        let words = format!(
            "coil {} open (broken or unsoldered) between bars {} and {}",
            c.coil, c.from_bar, c.to_bar
        );
        if let Some(open) = &open {
            out.push(
                pr,
                hypothesis(FaultKind::OpenCoil, None, words),
                open.clone(),
                visible,
            );
        }
        let words = format!(
            "coil {} shorted, about {:.0} % of it (fitted)",
            c.coil,
            100.0 * f
        );
        out.push(
            pr,
            hypothesis(FaultKind::ShortedCoil, Some(f), words),
            shorted.clone(),
            visible,
        );
        let words = format!(
            "a poor joint of one lead of coil {} (at bar {} or bar {}, the two read alike), about {:.2} coil resistances extra (fitted)",
            c.coil, c.from_bar, c.to_bar, x
        );
        out.push(
            pr,
            hypothesis(FaultKind::HighResistanceJoint, Some(x), words),
            joint.clone(),
            visible,
        );
    }
}

/// The faults of bar `j` itself: a poor riser-to-bar joint (a fitted resistance added to
/// each reading that probes bar j, as many times as the reading's ends lie on it), and the
/// bar cut off the winding (every reading that probes it open).
fn bar_faults(pr: &Problem, j: u32, out: &mut Ranking) {
    if pr.drop {
        // The meter draws no current: a riser joint shows only where the feed goes in, and a
        // bar cut off floats; the bar-to-bar test finds them.
        return;
    }
    let touch: Vec<(usize, f64)> = pr.by_bar[j as usize - 1]
        .iter()
        .map(|&q| {
            let (a, b) = pr.bars[q];
            (q, f64::from(u8::from(a == j) + u8::from(b == j)))
        })
        .collect();
    let visible = !touch.is_empty();
    let model: Vec<(Option<f64>, f64)> = pr.base.iter().map(|&b| (b, 0.0)).collect();
    let own: Vec<(usize, (Option<f64>, f64))> = touch
        .iter()
        .map(|&(q, k)| (q, (pr.base[pr.group_of[q]], k)))
        .collect();
    let x = pr.fit_ratio_with(&model, &own, 0.0, JOINT_MAX_COILS);
    let raised = touch
        .iter()
        .map(|&(q, k)| (q, pr.base[pr.group_of[q]].map(|r| r + x * k)))
        .collect();
    out.push(
        pr,
        Hypothesis {
            kind: FaultKind::RiserJoint,
            coils: Vec::new(),
            bars: vec![j],
            size: Some(x),
            words: format!(
                "a poor riser-to-bar joint at bar {j} (both leads behind it), about {x:.2} coil resistances (fitted): reheat and resolder the riser"
            ),
        },
        pr.judge_with(pr.base.clone(), raised),
        visible,
    );
    let open = touch.iter().map(|&(q, _)| (q, None)).collect();
    out.push(
        pr,
        Hypothesis {
            kind: FaultKind::BarCutOff,
            coils: Vec::new(),
            bars: vec![j],
            size: None,
            words: format!(
                "bar {j} cut off the winding: its riser joint open, or two neighbouring end leads exchanged so that a coil closes on itself"
            ),
        },
        pr.judge_with(pr.base.clone(), open),
        visible,
    );
}

/// Shorted bars: a track of fitted resistance between j and k = j + 1. Within one winding a
/// rank-one change; between two windings of a multiplex winding, a bridge: a reading across
/// the two reads R(x, j) + track + R(k, y), and every reading within one winding is
/// unchanged.
fn shorted_bars(pr: &Problem, alike: &[(u32, u32)], out: &mut Ranking) {
    let (j, k) = alike[0];
    let e = (pr.net.node(j), pr.net.node(k));
    if e.0 == e.1 {
        return;
    }
    let (visible, fit, track, across) = if pr.net.connected(j, k) {
        let d = pr.z.t(e, e);
        let w = pr.transfer_to(e);
        let wv = pr.coupling(&w, e);
        let (tau, fit) = pr.fit_rank_one(&wv, 0.0, 1.0 / d);
        let dg = tau / (1.0 - tau * d).max(1e-300);
        let track = if dg > 0.0 { 1.0 / dg } else { f64::INFINITY };
        (seen(&wv), fit, track, "")
    } else if pr.drop {
        // Each winding is fed on its own: a single track to another carries no current.
        return;
    } else {
        let net = pr.net;
        let (mut a, mut c) = (pr.base.clone(), vec![0.0; pr.base.len()]);
        let (pj, pk) = (net.part(j), net.part(k));
        for (g, &(x, y)) in pr.pairs.iter().enumerate() {
            if pr.base[g].is_some() {
                continue;
            }
            let (px, py) = (net.part_of_node(x), net.part_of_node(y));
            let (nx, ny) = if (px, py) == (pj, pk) {
                (x, y)
            } else if (py, px) == (pj, pk) {
                (y, x)
            } else {
                continue;
            };
            a[g] = Some(pr.z.t((nx, e.0), (nx, e.0)) + pr.z.t((e.1, ny), (e.1, ny)));
            c[g] = 1.0;
        }
        let visible = c.iter().any(|&c| c > 0.0);
        let track = pr.fit_ratio(&a, &c, 0.0, f64::MAX);
        let predicted = a
            .iter()
            .zip(&c)
            .map(|(a, c)| a.map(|a| a + track * c))
            .collect();
        (
            visible,
            pr.judge(predicted),
            track,
            ", on different windings,",
        )
    };
    for &(j, k) in alike {
        out.push(
            pr,
            Hypothesis {
                kind: FaultKind::ShortedBars,
                coils: Vec::new(),
                bars: vec![j, k],
                size: Some(track),
                words: format!(
                    "bars {j} and {k}{across} joined by a mica or carbon track of about {track:.3} coil resistances (fitted)"
                ),
            },
            fit.clone(),
            visible,
        );
    }
}

/// Crossed leads: the lead ending at bar j and the lead starting at bar k exchanged (see
/// [`crossed_leads`]); four terms change, through the Woodbury form.
fn crossed_lead_fault(pr: &Problem, alike: &[Crossing], out: &mut Ranking) {
    let net = pr.net;
    let (j, k, moves) = alike[0];
    let (c1, c2) = (moves[0].1, moves[1].1);
    let (o1, o2) = (net.coils[moves[0].0], net.coils[moves[1].0]);
    let offer = |fit: Fit, shown: bool, out: &mut Ranking| {
        for &(j, k, moves) in alike {
            let (c1, c2) = (moves[0].1, moves[1].1);
            let words = format!(
                "the leads of coils {} and {} exchanged at bars {j} and {k}",
                c1.coil, c2.coil
            );
            let hypothesis = Hypothesis {
                kind: FaultKind::CrossedLeads,
                coils: vec![c1.coil, c2.coil],
                bars: vec![j, k],
                size: None,
                words,
            };
            out.push(pr, hypothesis, fit.clone(), shown);
        }
    };
    if !net.connected(j, k) {
        if pr.drop {
            return;
        }
        // The exchange joins two windings of a multiplex winding: one coil leaves each, and
        // the two moved coils run between them.
        let Some(predicted) = joined(pr, &[o1, o2], &[c1, c2]) else {
            return;
        };
        let fit = pr.judge(predicted);
        let shown = pr.effect(&fit) > 1e-9;
        offer(fit, shown, out);
        return;
    }
    let nodes = |c: NetCoil| (net.node(c.from_bar), net.node(c.to_bar));
    let u = [nodes(c1), nodes(o1), nodes(c2), nodes(o2)];
    let g = [
        1.0 / c1.resistance,
        -1.0 / o1.resistance,
        1.0 / c2.resistance,
        -1.0 / o2.resistance,
    ];
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
    // t'(pair, source) = t(pair, source) − Σ t(pair, u_a)·M⁻¹_ab·t(source, u_b), signed as the
    // reading is.
    let predicted: Vec<Option<f64>> = pr
        .pairs
        .iter()
        .zip(&pr.sources)
        .zip(pr.base.iter().zip(&pr.signs))
        .map(|((&q, &f), (r, sign))| {
            r.map(|r| {
                let wq: Vec<f64> = u.iter().map(|&x| pr.z.t(q, x)).collect();
                let wf: Vec<f64> = u.iter().map(|&x| pr.z.t(f, x)).collect();
                let mut quad = 0.0;
                for a in 0..4 {
                    for b in 0..4 {
                        quad += wq[a] * inv[(a, b)] * wf[b];
                    }
                }
                (r - sign * quad).abs()
            })
        })
        .collect();
    let fit = pr.judge(predicted);
    let shown = pr.effect(&fit) > 1e-9;
    offer(fit, shown, out);
}

/// Crossed leads at bars j and k, with the two coils that change (see [`crossed_leads`]).
type Crossing = (u32, u32, [(usize, NetCoil); 2]);

/// The readings when coils `removed` (each within one winding) leave and coils `added` run
/// between windings of a multiplex winding, which the grounded inverse of the windings apart
/// cannot carry by a low-rank update. Each winding keeps its grounded inverse, updated for its
/// removed coil by Sherman–Morrison; the unknowns are the current in each added coil and the
/// potential of each joined winding's ground against the first one's. For a reading fed
/// with one unit in at x and out at y: each added coil's drop is its current times its
/// resistance, and no winding gains or loses current; then R = φ(x) − φ(y) [derived,
/// superposition and Kirchhoff's laws]. `None` when a removed coil was a bridge.
fn joined(pr: &Problem, removed: &[NetCoil], added: &[NetCoil]) -> Option<Vec<Option<f64>>> {
    let net = pr.net;
    let z = |a: usize, b: usize| pr.z.z[a * pr.z.n + b];
    // Sherman–Morrison for each removed coil: Z' = Z − τ u uᵀ, u = Z (e_p − e_q).
    let mut updates = Vec::new();
    for c in removed {
        let (p, q) = (net.node(c.from_bar), net.node(c.to_bar));
        let g = 1.0 / c.resistance;
        let d = pr.z.t((p, q), (p, q));
        if 1.0 - g * d < 1e-9 {
            return None;
        }
        updates.push((p, q, -g / (1.0 - g * d)));
    }
    let zz = |a: usize, b: usize| {
        updates.iter().fold(z(a, b), |acc, &(p, q, tau)| {
            acc - tau * (z(a, p) - z(a, q)) * (z(b, p) - z(b, q))
        })
    };
    // The added coils as (from node, to node, resistance), and the windings they join.
    let ends: Vec<(usize, usize, f64)> = added
        .iter()
        .map(|c| (net.node(c.from_bar), net.node(c.to_bar), c.resistance))
        .collect();
    let mut parts: Vec<usize> = ends
        .iter()
        .flat_map(|&(u, v, _)| [net.part_of_node(u), net.part_of_node(v)])
        .collect();
    parts.sort_unstable();
    parts.dedup();
    let nc = ends.len();
    // Unknowns: the added coils' currents, then the grounds of parts[1..].
    let unknowns = nc + parts.len() - 1;
    let ground = |node: usize| {
        let k = parts.binary_search(&net.part_of_node(node)).ok()?;
        Some((k > 0).then(|| nc + k - 1))
    };
    let out = pr
        .pairs
        .iter()
        .zip(&pr.base)
        .map(|(&(x, y), base)| {
            let (gx, gy) = (ground(x), ground(y));
            if gx.is_none() && gy.is_none() {
                return *base;
            }
            let (gx, gy) = (gx?, gy?);
            // φ(n) = V(n) + s(n) + Σ_c i_c t_c(n).
            let s = |n: usize| zz(n, x) - zz(n, y);
            let t = |c: usize, n: usize| zz(n, ends[c].1) - zz(n, ends[c].0);
            let mut a = vec![vec![0.0; unknowns]; unknowns];
            let mut b = vec![0.0; unknowns];
            for (c, &(u, v, r)) in ends.iter().enumerate() {
                for (d, cell) in a[c].iter_mut().enumerate().take(nc) {
                    *cell = t(d, u) - t(d, v);
                }
                a[c][c] -= r;
                if let Some(k) = ground(u).flatten() {
                    a[c][k] += 1.0;
                }
                if let Some(k) = ground(v).flatten() {
                    a[c][k] -= 1.0;
                }
                b[c] = -(s(u) - s(v));
            }
            // No winding but the first gains or loses current.
            for (k, &part) in parts.iter().enumerate().skip(1) {
                let row = nc + k - 1;
                let inside = |n: usize| f64::from(u8::from(net.part_of_node(n) == part));
                for (c, &(u, v, _)) in ends.iter().enumerate() {
                    a[row][c] = inside(v) - inside(u);
                }
                b[row] = inside(y) - inside(x);
            }
            let sol = solve_small(a, b)?;
            let potential = |n: usize, g: Option<usize>| {
                g.map_or(0.0, |k| sol[k]) + s(n) + (0..nc).map(|c| sol[c] * t(c, n)).sum::<f64>()
            };
            let r = potential(x, gx) - potential(y, gy);
            r.is_finite().then_some(r.max(0.0))
        })
        .collect();
    Some(out)
}

/// Solves the small dense system a·x = b by Gaussian elimination with partial pivoting;
/// `None` when it is singular.
fn solve_small(mut a: Vec<Vec<f64>>, mut b: Vec<f64>) -> Option<Vec<f64>> {
    let n = b.len();
    for col in 0..n {
        let piv = (col..n).max_by(|&i, &j| a[i][col].abs().total_cmp(&a[j][col].abs()))?;
        if a[piv][col].abs() < 1e-300 {
            return None;
        }
        a.swap(col, piv);
        b.swap(col, piv);
        let (top, rest) = a.split_at_mut(col + 1);
        let pivot = &top[col];
        for (i, line) in rest.iter_mut().enumerate() {
            let f = line[col] / pivot[col];
            if f != 0.0 {
                for (x, p) in line.iter_mut().zip(pivot).skip(col) {
                    *x -= f * p;
                }
                b[col + 1 + i] -= f * b[col];
            }
        }
    }
    let mut x = vec![0.0; n];
    for row in (0..n).rev() {
        let rest: f64 = (row + 1..n).map(|k| a[row][k] * x[k]).sum();
        x[row] = (b[row] - rest) / a[row][row];
    }
    Some(x)
}
