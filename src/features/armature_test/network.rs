//! The armature as a resistor network, solved with faer's sparse Cholesky factorisation.
//!
//! Part of the armature-test feature (under [`super`]): the traced [`Winding`] in, effective
//! resistances between bars out. Each active coil is a resistor of one coil resistance between
//! its start bar and its end bar; dummy coils are left out; an equalizer is an ideal connection,
//! so the bars it ties are one node. Each connected part of the network has one node grounded
//! (left out of the matrix), so the reduced Laplacian is positive definite and its Cholesky
//! factor gives every effective resistance: R(a, b) = (e_a − e_b)ᵀ L⁻¹ (e_a − e_b).

use std::collections::BTreeMap;

use faer::linalg::solvers::Solve;
use faer::sparse::linalg::solvers::Llt;
use faer::sparse::{SparseColMat, Triplet};
use faer::{Mat, Side};

use crate::winding::{EqualizerPlan, Winding};

/// One coil of the network, in bars.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct NetCoil {
    /// Coil position number.
    pub coil: u32,
    /// Start bar, 1…C.
    pub from_bar: u32,
    /// End bar, 1…C.
    pub to_bar: u32,
    /// Resistance in coil resistances (1 for a sound coil; > 0).
    pub resistance: f64,
}

/// The solved network. Resistances are in units of one coil's resistance.
///
/// The equalizers are ideal (no resistance of their own): a resistance key for them is not
/// read.
pub struct Network {
    /// Bars C.
    pub bars: u32,
    /// The active coils, in coil order.
    pub coils: Vec<NetCoil>,
    /// Node of each bar (index bar − 1); bars an equalizer ties share a node.
    node_of_bar: Vec<usize>,
    /// Connected part of each node.
    part_of_node: Vec<usize>,
    /// Row of each node in the reduced matrix; `None` for a grounded node.
    row_of_node: Vec<Option<usize>>,
    /// The factor of the reduced Laplacian (`None` when every node is grounded).
    factor: Option<Llt<usize, f64>>,
    rows: usize,
}

fn find(parent: &mut [usize], mut i: usize) -> usize {
    while parent[i] != i {
        parent[i] = parent[parent[i]];
        i = parent[i];
    }
    i
}

fn union(parent: &mut [usize], a: usize, b: usize) {
    let (ra, rb) = (find(parent, a), find(parent, b));
    if ra != rb {
        parent[ra.max(rb)] = ra.min(rb);
    }
}

impl Network {
    /// Builds and factors the network of `winding`.
    ///
    /// A coil's resistance is its element's turns over the first element's (one wire and one
    /// mean turn for the whole winding), so a frog-leg's wave coils of `wave_turns` weigh as
    /// they are wound; the unit stays one coil of the first element.
    pub fn of_winding(winding: &Winding) -> Network {
        let unit = f64::from(winding.elements[0].turns.max(1));
        let coils: Vec<NetCoil> = winding
            .connections
            .iter()
            .filter_map(|c| match (c.start_segment, c.end_segment) {
                (Some(a), Some(b)) if !c.dummy => Some(NetCoil {
                    coil: c.coil,
                    from_bar: a,
                    to_bar: b,
                    resistance: winding
                        .elements
                        .iter()
                        .find(|e| e.holds(c.coil))
                        .map_or(1.0, |e| f64::from(e.turns) / unit),
                }),
                _ => None,
            })
            .collect();
        let ties = match &winding.equalizers {
            EqualizerPlan::Possible(e) => e.groups.clone(),
            _ => Vec::new(),
        };
        Network::new(winding.active_coils, coils, &ties)
    }

    /// Builds and factors a network of `bars` bars, `coils` and ideal `ties` (groups of bars
    /// joined by an equalizer).
    pub fn new(bars: u32, coils: Vec<NetCoil>, ties: &[Vec<u32>]) -> Network {
        let n = bars as usize;
        // Nodes: bars merged by the equalizers.
        let mut tie = (0..n).collect::<Vec<_>>();
        for g in ties {
            for w in g.windows(2) {
                union(&mut tie, w[0] as usize - 1, w[1] as usize - 1);
            }
        }
        let mut node_of_root = BTreeMap::new();
        let node_of_bar: Vec<usize> = (0..n)
            .map(|b| {
                let r = find(&mut tie, b);
                let next = node_of_root.len();
                *node_of_root.entry(r).or_insert(next)
            })
            .collect();
        let nodes = node_of_root.len();
        // Connected parts through the coils.
        let mut part = (0..nodes).collect::<Vec<_>>();
        for c in &coils {
            let (a, b) = (
                node_of_bar[c.from_bar as usize - 1],
                node_of_bar[c.to_bar as usize - 1],
            );
            union(&mut part, a, b);
        }
        let part_of_node: Vec<usize> = (0..nodes).map(|i| find(&mut part, i)).collect();
        // Ground the first node of each part (the part's root is its smallest node).
        let mut row_of_node = vec![None; nodes];
        let mut rows = 0;
        for (i, row) in row_of_node.iter_mut().enumerate() {
            if part_of_node[i] != i {
                *row = Some(rows);
                rows += 1;
            }
        }
        let mut entries: BTreeMap<(usize, usize), f64> = BTreeMap::new();
        for c in &coils {
            let (a, b) = (
                node_of_bar[c.from_bar as usize - 1],
                node_of_bar[c.to_bar as usize - 1],
            );
            if a == b {
                continue;
            }
            let g = 1.0 / c.resistance;
            let (ra, rb) = (row_of_node[a], row_of_node[b]);
            for r in [ra, rb].into_iter().flatten() {
                *entries.entry((r, r)).or_default() += g;
            }
            if let (Some(x), Some(y)) = (ra, rb) {
                // Lower triangle only.
                *entries.entry((x.max(y), x.min(y))).or_default() -= g;
            }
        }
        let factor = (rows > 0).then(|| {
            let triplets: Vec<Triplet<usize, usize, f64>> = entries
                .iter()
                .map(|(&(r, c), &v)| Triplet::new(r, c, v))
                .collect();
            let m = SparseColMat::<usize, f64>::try_new_from_triplets(rows, rows, &triplets)
                .expect("indices are within the matrix");
            m.sp_cholesky(Side::Lower)
                .expect("a grounded, connected Laplacian is positive definite")
        });
        Network {
            bars,
            coils,
            node_of_bar,
            part_of_node,
            row_of_node,
            factor,
            rows,
        }
    }

    /// Node of `bar` (1…C).
    pub fn node(&self, bar: u32) -> usize {
        self.node_of_bar[bar as usize - 1]
    }

    /// The connected part a bar belongs to (its smallest node).
    pub fn part(&self, bar: u32) -> usize {
        self.part_of_node[self.node(bar)]
    }

    /// The connected part of a node.
    pub fn part_of_node(&self, node: usize) -> usize {
        self.part_of_node[node]
    }

    /// Nodes in the network (bars after the equalizers' ties).
    pub fn nodes(&self) -> usize {
        self.row_of_node.len()
    }

    /// True when bars `a` and `b` are joined through the network.
    pub fn connected(&self, a: u32, b: u32) -> bool {
        self.part_of_node[self.node(a)] == self.part_of_node[self.node(b)]
    }

    /// Solves L x = b for each column of `rhs` (node-indexed right-hand sides, grounded
    /// nodes ignored) and returns the node potentials, column by column.
    fn solve_nodes(&self, rhs: &[Vec<(usize, f64)>]) -> Mat<f64> {
        let mut m = Mat::<f64>::zeros(self.rows, rhs.len());
        for (j, col) in rhs.iter().enumerate() {
            for &(node, v) in col {
                if let Some(r) = self.row_of_node[node] {
                    m[(r, j)] += v;
                }
            }
        }
        if let Some(f) = &self.factor {
            f.solve_in_place(m.as_mut());
        }
        m
    }

    fn potential(&self, x: &Mat<f64>, node: usize, col: usize) -> f64 {
        self.row_of_node[node].map_or(0.0, |r| x[(r, col)])
    }

    /// Effective resistance between each pair of bars, in coil resistances; `None` for a pair
    /// with no connection at all (open), 0 for bars an equalizer ties together. Pairs of bars
    /// on the same two nodes (bars the equalizers tie) are solved once.
    pub fn effective(&self, pairs: &[(u32, u32)]) -> Vec<Option<f64>> {
        const BLOCK: usize = 64;
        let key = |&(a, b): &(u32, u32)| {
            let (x, y) = (self.node(a), self.node(b));
            (x.min(y), x.max(y))
        };
        let mut distinct: Vec<(usize, usize)> = pairs
            .iter()
            .filter(|p| self.connected(p.0, p.1))
            .map(key)
            .filter(|(x, y)| x != y)
            .collect();
        distinct.sort_unstable();
        distinct.dedup();
        let mut solved = Vec::with_capacity(distinct.len());
        for chunk in distinct.chunks(BLOCK) {
            let rhs: Vec<Vec<(usize, f64)>> = chunk
                .iter()
                .map(|&(x, y)| vec![(x, 1.0), (y, -1.0)])
                .collect();
            let x = self.solve_nodes(&rhs);
            for (j, &(a, b)) in chunk.iter().enumerate() {
                solved.push((self.potential(&x, a, j) - self.potential(&x, b, j)).max(0.0));
            }
        }
        pairs
            .iter()
            .map(|p| {
                let k = key(p);
                self.connected(p.0, p.1).then(|| {
                    if k.0 == k.1 {
                        0.0
                    } else {
                        solved[distinct
                            .binary_search(&k)
                            .expect("every joined pair is solved")]
                    }
                })
            })
            .collect()
    }

    /// The grounded inverse Z (nodes × nodes, row-major; zero on grounded rows and columns):
    /// (e_a − e_b)ᵀ Z (e_c − e_d) for nodes of one part is the transfer resistance the rank-one
    /// updates of the fault locator need.
    pub fn inverse(&self) -> Vec<f64> {
        const BLOCK: usize = 64;
        let n = self.nodes();
        let mut z = vec![0.0; n * n];
        let solved: Vec<usize> = (0..n).filter(|&i| self.row_of_node[i].is_some()).collect();
        for chunk in solved.chunks(BLOCK) {
            let rhs: Vec<Vec<(usize, f64)>> = chunk.iter().map(|&i| vec![(i, 1.0)]).collect();
            let x = self.solve_nodes(&rhs);
            for (j, &col) in chunk.iter().enumerate() {
                for row in 0..n {
                    z[row * n + col] = self.potential(&x, row, j);
                }
            }
        }
        z
    }
}

impl Network {
    /// The armature under load: `winding`'s network with every brush set's contacts tied as
    /// one node (an ideal brush), each coil an EMF `coil_emf` (index coil − 1, start→end) in
    /// series with one coil resistance, and `current` fed in at the positive brush sets and
    /// out at the negative ones, shared evenly between the sets of each polarity. Returns the
    /// bar potentials (index bar − 1) relative to the grounded node, in units of one coil EMF
    /// and one coil resistance (current × resistance and EMF in the same unit).
    ///
    /// Node equations: a coil from bar a to bar b carries (V_a − V_b + e)/r, so the EMF enters
    /// the right-hand side as −e/r at a and +e/r at b (a Norton source) [derived, Kirchhoff's
    /// current law].
    pub fn under_load(winding: &Winding, coil_emf: &[f64], current: f64) -> Vec<f64> {
        let base = Network::of_winding(winding);
        let mut ties: Vec<Vec<u32>> = match &winding.equalizers {
            EqualizerPlan::Possible(e) => e.groups.clone(),
            _ => Vec::new(),
        };
        ties.extend(
            winding
                .brushes
                .iter()
                .filter(|b| b.contacts.len() > 1)
                .map(|b| b.contacts.clone()),
        );
        let net = Network::new(winding.active_coils, base.coils, &ties);
        let positive =
            |b: &&crate::winding::BrushSet| b.polarity == crate::winding::Polarity::Positive;
        let plus = winding.brushes.iter().filter(positive).count().max(1) as f64;
        let minus = (winding.brushes.len() as f64 - plus).max(1.0);
        let mut rhs: BTreeMap<usize, f64> = BTreeMap::new();
        for c in &net.coils {
            let g = 1.0 / c.resistance;
            let e = coil_emf.get((c.coil - 1) as usize).copied().unwrap_or(0.0);
            *rhs.entry(net.node(c.from_bar)).or_default() -= g * e;
            *rhs.entry(net.node(c.to_bar)).or_default() += g * e;
        }
        for b in &winding.brushes {
            let Some(&bar) = b.contacts.first().or(b.under.first()) else {
                continue;
            };
            let i = if positive(&b) {
                current / plus
            } else {
                -current / minus
            };
            *rhs.entry(net.node(bar)).or_default() += i;
        }
        let col: Vec<(usize, f64)> = rhs.into_iter().collect();
        let x = net.solve_nodes(&[col]);
        (1..=net.bars)
            .map(|bar| net.potential(&x, net.node(bar), 0))
            .collect()
    }

    /// Bar potentials (index bar − 1) with a unit current fed in at `a` and out at `b`, in coil
    /// resistances, relative to the grounded node of each part; `None` for bars not joined to
    /// the feed.
    pub fn potentials(&self, a: u32, b: u32) -> Vec<Option<f64>> {
        let x = self.solve_nodes(&[vec![(self.node(a), 1.0), (self.node(b), -1.0)]]);
        (1..=self.bars)
            .map(|bar| {
                self.connected(bar, a)
                    .then(|| self.potential(&x, self.node(bar), 0))
            })
            .collect()
    }
}
