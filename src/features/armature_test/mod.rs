//! The armature test: expected bar-to-bar and drop-test readings from the traced winding solved
//! as a resistor network, and the fault locator for measured readings.
//!
//! A feature (`features` stage): a resolved [`Design`] and its traced [`Winding`] in, an inert
//! [`ArmatureTest`] out; [`armature_test`] is the one entry point and the renderers only read
//! its result. The network is in [`network`], the fault locator in [`locator`], the reader of the
//! shop's readings file in [`readings`].

pub mod locator;
pub mod network;
pub mod readings;

pub use locator::{Fault, FaultKind, Location};
pub use network::{NetCoil, Network};
pub use readings::{
    MeasuredReadings, ReadingKind, ReadingValue, ReadingsError, parse_readings, readings_text,
};

use crate::base::number::Prefix;
use crate::design::Design;
use crate::rating::conductor::{conductor_area_mm2, mean_turn};
use crate::rating::resistance::{copper_resistance_20, correct_temperature};
use crate::theory::WindingType;
use crate::winding::Winding;

/// Default test current of the drop test, A (`--current`).
pub const DEFAULT_CURRENT_A: f64 = 10.0;
/// Default winding temperature, °C (`--temperature`).
pub const DEFAULT_TEMPERATURE_C: f64 = 20.0;

/// What the caller chose.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TestOptions {
    /// Drop-test current, A.
    pub current_a: f64,
    /// Winding temperature, °C.
    pub temperature_c: f64,
    /// Healthy tolerance of the locator, as a fraction of each expected reading.
    pub tolerance: f64,
}

impl Default for TestOptions {
    fn default() -> Self {
        TestOptions {
            current_a: DEFAULT_CURRENT_A,
            temperature_c: DEFAULT_TEMPERATURE_C,
            tolerance: locator::DEFAULT_TOLERANCE,
        }
    }
}

/// The unit of the readings.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Unit {
    /// Ohms (the design gives `[conductor]` and a mean turn).
    Ohm,
    /// Units of one coil's resistance.
    Coil,
}

impl Unit {
    /// `"ohm"` or `"coil"`, as in the JSON.
    pub fn key(self) -> &'static str {
        match self {
            Unit::Ohm => "ohm",
            Unit::Coil => "coil",
        }
    }
}

/// One expected reading between two bars.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Reading {
    /// First bar.
    pub from_bar: u32,
    /// Second bar.
    pub to_bar: u32,
    /// Expected resistance in the test's unit; `None` when the two bars are not joined (open).
    pub expected: Option<f64>,
}

/// The pattern the readings round the commutator make.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Pattern {
    /// Every reading the same.
    AllEqual,
    /// Two values, one after the other.
    TwoAlternating,
    /// The same run of readings every `period` bars.
    Repeats {
        /// Bars.
        period: u32,
    },
    /// No repeat shorter than the commutator.
    Irregular,
    /// Every pair reads open.
    AllOpen,
}

/// One feed of the drop test.
#[derive(Clone, Debug, PartialEq)]
pub struct DropFeed {
    /// The bar the current goes in at.
    pub from_bar: u32,
    /// The bar it leaves at.
    pub to_bar: u32,
    /// The bar the trade's rule gives, when an equalizer ties it to the other feed bar and the
    /// feed was moved.
    pub moved_from: Option<u32>,
    /// Millivolts between the bars of each pair the feed reaches (neighbouring bars, or bars m
    /// apart when the neighbours lie on another winding); in units of I × one coil's
    /// resistance when the unit is `coil`.
    pub readings: Vec<Reading>,
    /// For each of `readings`, the feed bar its two bars are joined through, when the
    /// shortest run of coils between them passes the bar the current goes in or out at: the
    /// current flows away from that bar (or towards it) through the coils on both sides, so
    /// their drops oppose and the pair reads far less than the others, though sound. `None`
    /// for the other pairs.
    pub through_feed: Vec<Option<u32>>,
}

/// The drop test.
#[derive(Clone, Debug, PartialEq)]
pub struct DropTest {
    /// Test current, A.
    pub current_a: f64,
    /// The feeds, one per closed winding that the trade feeds separately.
    pub feeds: Vec<DropFeed>,
}

/// How a winding of several elements (frog-leg) reads bar to bar, worked out on the network:
/// the lap element alone against the combined winding, and how many neighbouring readings
/// one open coil of each element moves.
#[derive(Clone, Debug, PartialEq)]
pub struct ElementsPattern {
    /// Mean neighbouring reading of the combined winding, in the test's unit.
    pub combined: f64,
    /// Mean neighbouring reading of the lap element alone (the wave element's leads lifted),
    /// in the test's unit.
    pub lap_alone: f64,
    /// Neighbouring readings that an open lap coil (coil 1) moves by more than 5 %.
    pub open_lap_moves: u32,
    /// Neighbouring readings that an open wave coil (the wave element's first) moves by more
    /// than 5 %.
    pub open_wave_moves: u32,
}

/// The armature test of one design.
pub struct ArmatureTest {
    /// Bars C.
    pub bars: u32,
    /// Poles P.
    pub poles: u32,
    /// Multiplicity m.
    pub multiplicity: u32,
    /// Lap or wave.
    pub winding_type: WindingType,
    /// Closed windings.
    pub reentrancy: u32,
    /// Closed windings the drop test feeds each on its own: the first element's (a frog-leg's
    /// lap element ties every bar, so its wave element is fed through it).
    pub feed_windings: u32,
    /// Whether equalizers are fitted.
    pub equalized: bool,
    /// The unit of every reading.
    pub unit: Unit,
    /// One coil's resistance at [`ArmatureTest::temperature_c`], Ω; `None` without conductor
    /// data.
    pub coil_resistance_ohm: Option<f64>,
    /// Winding temperature, °C.
    pub temperature_c: f64,
    /// Neighbouring bars 1–2 … C–1.
    pub readings: Vec<Reading>,
    /// Bars m apart, within one winding (multiplex windings only).
    pub readings_within_winding: Option<Vec<Reading>>,
    /// The pattern of the neighbouring readings (of the within-winding readings when every
    /// neighbouring pair reads open).
    pub pattern: Pattern,
    /// (largest − smallest)/mean of the readings the pattern is taken from, %.
    pub spread_pct: f64,
    /// The drop test.
    pub drop_test: DropTest,
    /// The bar-to-bar pattern of a frog-leg winding's elements; `None` for lap and wave.
    pub elements: Option<ElementsPattern>,
    /// The fault locator's result, with measured readings.
    pub location: Option<Location>,
    /// The solved network (kept for the locator and the plot).
    pub network: Network,
}

impl ArmatureTest {
    /// Open neighbouring pairs.
    pub fn open_pairs(&self) -> usize {
        self.readings
            .iter()
            .filter(|r| r.expected.is_none())
            .count()
    }

    /// Every bar-to-bar reading the test lists: the neighbouring pairs, then the pairs m apart
    /// within one winding of a multiplex winding.
    pub fn listed(&self) -> impl Iterator<Item = &Reading> {
        self.readings
            .iter()
            .chain(self.readings_within_winding.iter().flatten())
    }

    /// The one prefix every bar-to-bar reading of this test is written in (ohms: Ω, mΩ or
    /// µΩ from the largest expected reading; none for units of a coil), so a table's rows and
    /// the plot's scale compare.
    pub fn reading_prefix(&self) -> Prefix {
        match self.unit {
            Unit::Ohm => {
                Prefix::for_largest(self.listed().filter_map(|r| r.expected).fold(0.0, f64::max))
            }
            Unit::Coil => Prefix::NONE,
        }
    }

    /// The one prefix every drop-test reading is written in, for volts (mV from a few
    /// millivolts up); none for units of I × a coil.
    pub fn drop_prefix(&self) -> Prefix {
        match self.unit {
            Unit::Ohm => Prefix::for_largest(
                self.drop_test
                    .feeds
                    .iter()
                    .flat_map(|f| &f.readings)
                    .filter_map(|r| r.expected)
                    .fold(0.0, f64::max)
                    / 1000.0,
            ),
            Unit::Coil => Prefix::NONE,
        }
    }

    /// The readings the trade judges: the neighbouring ones, or the within-winding ones when
    /// every neighbouring pair reads open.
    pub fn judged(&self) -> &[Reading] {
        match &self.readings_within_winding {
            Some(w) if self.open_pairs() == self.readings.len() => w,
            _ => &self.readings,
        }
    }
}

/// One coil's resistance at `temperature_c`, Ω: ρ_T·turns·L_mt/A_c with IEC 60028 copper and
/// the 234.5 °C rule; `None` without `[conductor]` or a mean turn.
pub fn coil_resistance_ohm(design: &Design, temperature_c: f64) -> Option<f64> {
    let k = design.conductor.as_ref()?;
    let lmt = mean_turn(design, k)?;
    let length_m = f64::from(design.turns) * lmt.mm / 1000.0;
    let r20 = copper_resistance_20(length_m, conductor_area_mm2(&k.shape));
    Some(correct_temperature(r20, 20.0, temperature_c))
}

/// Neighbouring pairs 1–2, 2–3, …, C–1.
pub fn neighbour_pairs(bars: u32) -> Vec<(u32, u32)> {
    (1..=bars).map(|j| (j, j % bars + 1)).collect()
}

/// Pairs `step` bars apart: j and j + step, round the commutator.
pub fn pairs_apart(bars: u32, step: u32) -> Vec<(u32, u32)> {
    (1..=bars).map(|j| (j, (j - 1 + step) % bars + 1)).collect()
}

/// Computes the armature test of `design` from its traced `winding` (see [`expected`]), and
/// with the text of a measured-readings file reads it against the test's pairs and runs the
/// fault locator; a problem in that file is the error, located.
pub fn armature_test(
    design: &Design,
    winding: &Winding,
    options: &TestOptions,
    readings: Option<&str>,
) -> Result<ArmatureTest, ReadingsError> {
    let mut t = expected(design, winding, options);
    if let Some(text) = readings {
        if t.network.nodes() > locator::MAX_NODES {
            return Err(ReadingsError {
                line: 1,
                column: 1,
                hint: None,
                message: format!(
                    "the locator works on armatures of up to {} bars (equalizer-tied bars counted once); this one has {}",
                    locator::MAX_NODES,
                    t.network.nodes()
                ),
            });
        }
        let pairs: Vec<(u32, u32)> = t.listed().map(|r| (r.from_bar, r.to_bar)).collect();
        let drop_pairs: Vec<(u32, u32)> = t
            .drop_test
            .feeds
            .iter()
            .flat_map(|f| f.readings.iter().map(|r| (r.from_bar, r.to_bar)))
            .collect();
        let measured = parse_readings(text, t.bars, &pairs, &drop_pairs)?;
        let slots: Vec<(u32, u32)> = winding
            .connections
            .iter()
            .map(|c| (c.top.slot, c.bottom.slot))
            .collect();
        t.location = Some(locator::locate(&t, &measured, &slots, options.tolerance));
    }
    Ok(t)
}

/// The expected readings alone: the network solved once, every neighbouring and
/// within-winding pair, the pattern, the spread and the drop test.
pub fn expected(design: &Design, winding: &Winding, options: &TestOptions) -> ArmatureTest {
    let network = Network::of_winding(winding);
    let bars = winding.active_coils;
    let r_coil = coil_resistance_ohm(design, options.temperature_c);
    let scale = r_coil.unwrap_or(1.0);
    let to_readings = |pairs: &[(u32, u32)]| -> Vec<Reading> {
        pairs
            .iter()
            .zip(network.effective(pairs))
            .map(|(&(a, b), r)| Reading {
                from_bar: a,
                to_bar: b,
                expected: r.map(|x| x * scale),
            })
            .collect()
    };
    let readings = to_readings(&neighbour_pairs(bars));
    let m = design.multiplicity;
    let readings_within_winding = (m > 1 && bars > m).then(|| to_readings(&pairs_apart(bars, m)));
    let mut test = ArmatureTest {
        bars,
        poles: design.poles,
        multiplicity: m,
        winding_type: design.winding_type,
        reentrancy: winding.reentrancy(),
        feed_windings: winding.elements[0].reentrancy,
        equalized: matches!(&winding.equalizers, crate::winding::EqualizerPlan::Possible(e) if !e.groups.is_empty()),
        unit: if r_coil.is_some() {
            Unit::Ohm
        } else {
            Unit::Coil
        },
        coil_resistance_ohm: r_coil,
        temperature_c: options.temperature_c,
        readings,
        readings_within_winding,
        pattern: Pattern::AllOpen,
        spread_pct: 0.0,
        drop_test: DropTest {
            current_a: options.current_a,
            feeds: Vec::new(),
        },
        elements: None,
        location: None,
        network,
    };
    let values: Vec<f64> = test.judged().iter().filter_map(|r| r.expected).collect();
    test.pattern = pattern_of(&values);
    test.spread_pct = spread_pct(&values);
    test.drop_test = drop_test(&test, options.current_a, scale);
    test.elements = winding
        .is_multi_element()
        .then(|| elements_pattern(winding, &test, scale));
    test
}

/// [`ElementsPattern`]: the lap element alone (a network of its own), and the winding with one
/// lap coil and one wave coil opened (a resistance 10⁶ times a coil's), each a rank-one update
/// of the solved network ([`Network::effective_with_coil`], one solve each).
fn elements_pattern(w: &Winding, t: &ArmatureTest, scale: f64) -> ElementsPattern {
    let pairs = neighbour_pairs(t.bars);
    let mean = |v: &[Option<f64>]| {
        let x: Vec<f64> = v.iter().flatten().copied().collect();
        x.iter().sum::<f64>() / x.len().max(1) as f64
    };
    let base: Vec<Option<f64>> = t.readings.iter().map(|r| r.expected).collect();
    let unscaled: Vec<Option<f64>> = base.iter().map(|r| r.map(|x| x / scale)).collect();
    let lap = &w.elements[0];
    let lap_coils: Vec<NetCoil> = t
        .network
        .coils
        .iter()
        .filter(|c| lap.holds(c.coil))
        .copied()
        .collect();
    let lap_alone = Network::new(t.bars, lap_coils, &[]).effective(&pairs);
    let moved = |coil: u32| {
        let open = match t.network.coils.iter().position(|c| c.coil == coil) {
            Some(i) => t.network.effective_with_coil(&pairs, &unscaled, i, 1e6),
            None => unscaled.clone(),
        };
        open.iter()
            .zip(&base)
            .filter(|(o, b)| match (o, b) {
                (Some(o), Some(b)) => (o * scale - b).abs() > 0.05 * b.abs(),
                _ => o.is_some() != b.is_some(),
            })
            .count() as u32
    };
    let wave_first = w.elements.get(1).map_or(lap.first_coil, |e| e.first_coil);
    ElementsPattern {
        combined: mean(&base),
        lap_alone: mean(&lap_alone) * scale,
        open_lap_moves: moved(lap.first_coil),
        open_wave_moves: moved(wave_first),
    }
}

fn same(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * a.abs().max(b.abs()).max(1e-300)
}

/// The pattern of `values` round the commutator.
pub fn pattern_of(values: &[f64]) -> Pattern {
    let n = values.len();
    if n == 0 {
        return Pattern::AllOpen;
    }
    let period = (1..=n)
        .find(|&k| n.is_multiple_of(k) && (0..n).all(|i| same(values[i], values[(i + k) % n])))
        .unwrap_or(n);
    match period {
        1 => Pattern::AllEqual,
        2 => Pattern::TwoAlternating,
        k if k == n => Pattern::Irregular,
        k => Pattern::Repeats { period: k as u32 },
    }
}

/// (largest − smallest)/mean, %.
pub fn spread_pct(values: &[f64]) -> f64 {
    if values.is_empty() {
        return 0.0;
    }
    let max = values.iter().copied().fold(f64::MIN, f64::max);
    let min = values.iter().copied().fold(f64::MAX, f64::min);
    let mean = values.iter().sum::<f64>() / values.len() as f64;
    if mean > 0.0 {
        100.0 * (max - min) / mean
    } else {
        0.0
    }
}

/// The feed bars the trade uses [src: a published trade training text on growlers and
/// armature testers]: simplex lap, bar 1 and the bar opposite; simplex wave, bar 1 and the bar
/// one pole pitch away; duplex singly re-entrant, bars 1 and 2; a multiply re-entrant
/// winding, each closed winding on its own, from its first bar to its bar opposite.
fn feed_bars(t: &ArmatureTest) -> Vec<(u32, u32)> {
    let c = t.bars;
    let r = t.feed_windings.max(1);
    if t.multiplicity > 1 && r == 1 {
        return vec![(1, 2)];
    }
    let pitch = t.winding_type.kind().feed_pitch(c, t.poles);
    (1..=r)
        .map(|w| {
            // The bar of winding w nearest `pitch` bars on.
            let k = ((pitch + r / 2) / r).max(1) * r;
            (w, (w - 1 + k) % c + 1)
        })
        .collect()
}

fn drop_test(t: &ArmatureTest, current_a: f64, scale: f64) -> DropTest {
    let net = &t.network;
    let c = t.bars;
    // The nodes each node shares a coil with.
    let mut adjacent: Vec<Vec<usize>> = vec![Vec::new(); net.nodes()];
    for c in &net.coils {
        let (p, q) = (net.node(c.from_bar), net.node(c.to_bar));
        if p != q {
            adjacent[p].push(q);
            adjacent[q].push(p);
        }
    }
    let feeds = feed_bars(t)
        .into_iter()
        .map(|(a, wanted)| {
            // Never two bars an equalizer ties: move on within the same winding.
            let step = t.feed_windings.max(1);
            let mut b = wanted;
            let mut tries = 0;
            while net.node(a) == net.node(b) && tries < c {
                b = (b - 1 + step) % c + 1;
                tries += 1;
            }
            let phi = net.potentials(a, b);
            let pairs = if t.feed_windings > 1 {
                pairs_apart(c, t.multiplicity)
            } else {
                neighbour_pairs(c)
            };
            let readings: Vec<Reading> = pairs
                .into_iter()
                .filter(|&(x, y)| net.connected(x, a) && net.connected(y, a))
                .map(|(x, y)| {
                    let v = match (phi[x as usize - 1], phi[y as usize - 1]) {
                        (Some(p), Some(q)) => Some((p - q).abs() * scale * current_a),
                        _ => None,
                    };
                    Reading {
                        from_bar: x,
                        to_bar: y,
                        // Ω·A = V; millivolts with conductor data.
                        expected: v.map(|v| if t.unit == Unit::Ohm { v * 1000.0 } else { v }),
                    }
                })
                .collect();
            let through_feed = readings
                .iter()
                .map(|r: &Reading| through_feed(net, &adjacent, r.from_bar, r.to_bar, [a, b]))
                .collect();
            DropFeed {
                from_bar: a,
                to_bar: b,
                moved_from: (b != wanted).then_some(wanted),
                readings,
                through_feed,
            }
        })
        .collect();
    DropTest { current_a, feeds }
}

/// The feed bar (of `feed`) that the shortest run of coils from bar `x` to bar `y` passes
/// through, between its ends; `None` when it passes neither. A breadth-first search over the
/// network's nodes (equalizer-tied bars one node; `adjacent` lists the nodes each shares a
/// coil with) that stops on reaching `y`, so a pair one coil apart (a lap's neighbours) costs
/// one step, a wave's P/2; it gives up after [`THROUGH_SEARCH`] nodes.
fn through_feed(
    net: &Network,
    adjacent: &[Vec<usize>],
    x: u32,
    y: u32,
    feed: [u32; 2],
) -> Option<u32> {
    let (from, to) = (net.node(x), net.node(y));
    let mut parent: std::collections::BTreeMap<usize, usize> = std::collections::BTreeMap::new();
    let mut queue = std::collections::VecDeque::from([from]);
    parent.insert(from, from);
    'search: while let Some(n) = queue.pop_front() {
        for &next in &adjacent[n] {
            if parent.contains_key(&next) {
                continue;
            }
            parent.insert(next, n);
            if next == to || parent.len() > THROUGH_SEARCH {
                break 'search;
            }
            queue.push_back(next);
        }
    }
    if from == to || !parent.contains_key(&to) {
        return None;
    }
    let mut at = parent[&to];
    while at != from {
        if let Some(&f) = feed.iter().find(|&&f| net.node(f) == at) {
            return Some(f);
        }
        at = parent[&at];
    }
    None
}

/// Most nodes [`through_feed`] visits for one pair.
const THROUGH_SEARCH: usize = 4096;
