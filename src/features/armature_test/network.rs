//! The armature as a resistor network, solved with faer's sparse Cholesky factorisation.
//!
//! Part of the armature-test feature (under [`super`]): the traced [`Winding`] in, effective
//! resistances between bars out. Each active coil is a resistor of one coil resistance between
//! its start bar and its end bar; dummy coils are left out; an equalizer is an ideal connection,
//! so the bars it ties are one node. Each connected part of the network has one node grounded
//! (left out of the matrix), so the reduced Laplacian is positive definite:
//! R(a, b) = (e_a − e_b)ᵀ L⁻¹ (e_a − e_b). [`Network::effective`] reads a ring or chain part
//! off the resistance along it and every other part off one selected inverse, so all the
//! readings of an armature cost about one factorization (docs/domain.md, "Solving the
//! bar-to-bar network").

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
    /// The shape of each connected part (index: the part's smallest node; other entries unused).
    shape_of_part: Vec<Shape>,
    /// Resistance along the chain from the part's first node to each node, for nodes of a
    /// part whose shape is a cycle or a path (0 elsewhere).
    along: Vec<f64>,
}

/// The shape of one connected part of the network.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Shape {
    /// A simple cycle: every node has exactly two coil ends (a lap or wave winding closed on
    /// itself, without equalizers); the cycle's total resistance.
    Cycle(f64),
    /// A simple path (a closed winding with one coil left out), or a single node.
    Path,
    /// Anything else (equalizers, the two elements of a frog-leg, branches).
    General,
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
        let (shape_of_part, along) = shapes(&coils, &node_of_bar, &part_of_node);
        Network {
            bars,
            coils,
            node_of_bar,
            part_of_node,
            row_of_node,
            factor,
            rows,
            shape_of_part,
            along,
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
    /// on the same two nodes (bars the equalizers tie) are worked out once.
    ///
    /// No pair costs a solve of its own (docs/domain.md, "Solving the bar-to-bar network"): a
    /// pair on a part that is a simple cycle or path is read off the resistance along it, and
    /// the pairs on every other part come from one factorization and its selected inverse
    /// (the `selected` module), O(fill) for all of them together.
    pub fn effective(&self, pairs: &[(u32, u32)]) -> Vec<Option<f64>> {
        let key = |&(a, b): &(u32, u32)| {
            let (x, y) = (self.node(a), self.node(b));
            (x.min(y), x.max(y))
        };
        let mut general: Vec<(usize, usize)> = pairs
            .iter()
            .filter(|p| self.connected(p.0, p.1))
            .map(key)
            .filter(|&(x, y)| x != y && self.shape_of_part[self.part_of_node[x]] == Shape::General)
            .collect();
        general.sort_unstable();
        general.dedup();
        let solved = self.general_effective(&general);
        pairs
            .iter()
            .map(|p| {
                let (x, y) = key(p);
                if !self.connected(p.0, p.1) {
                    return None;
                }
                if x == y {
                    return Some(0.0);
                }
                let d = (self.along[x] - self.along[y]).abs();
                Some(match self.shape_of_part[self.part_of_node[x]] {
                    // Two paths in parallel, d and T − d [derived, series and parallel
                    // resistances].
                    Shape::Cycle(total) => d * (total - d) / total,
                    Shape::Path => d,
                    Shape::General => {
                        solved[general
                            .binary_search(&(x, y))
                            .expect("every joined pair is solved")]
                    }
                })
            })
            .collect()
    }

    /// Effective resistances between the node pairs `pairs` (distinct nodes of one general
    /// part each), from the selected inverse of the reduced Laplacian of the general parts,
    /// with each pair added to the matrix's pattern as a structural zero so that its entry of
    /// the inverse is on the factor's pattern: R(a, b) = Z_aa + Z_bb − 2·Z_ab [derived, from
    /// R(a, b) = (e_a − e_b)ᵀ Z (e_a − e_b); a grounded node's row of Z is zero].
    fn general_effective(&self, pairs: &[(usize, usize)]) -> Vec<f64> {
        if pairs.is_empty() {
            return Vec::new();
        }
        // Rows of the general parts' reduced Laplacian.
        let mut local = vec![None; self.nodes()];
        let mut n = 0;
        for (node, slot) in local.iter_mut().enumerate() {
            let general = self.shape_of_part[self.part_of_node[node]] == Shape::General;
            if general && self.row_of_node[node].is_some() {
                *slot = Some(n);
                n += 1;
            }
        }
        let mut diagonal = vec![0.0; n];
        let mut off: Vec<(usize, usize, f64)> = Vec::new();
        for c in &self.coils {
            let (a, b) = (self.node(c.from_bar), self.node(c.to_bar));
            if a == b {
                continue;
            }
            let g = 1.0 / c.resistance;
            for x in [local[a], local[b]].into_iter().flatten() {
                diagonal[x] += g;
            }
            if let (Some(x), Some(y)) = (local[a], local[b]) {
                off.push((x, y, -g));
            }
        }
        for &(a, b) in pairs {
            if let (Some(x), Some(y)) = (local[a], local[b]) {
                off.push((x, y, 0.0));
            }
        }
        let z = selected::SelectedInverse::of(n, &diagonal, &off);
        let entry = |a: usize, b: usize| match (local[a], local[b]) {
            (Some(x), Some(y)) => z.get(x, y),
            _ => 0.0,
        };
        pairs
            .iter()
            .map(|&(a, b)| (entry(a, a) + entry(b, b) - 2.0 * entry(a, b)).max(0.0))
            .collect()
    }

    /// Effective resistances between `pairs` with the resistance of the coil at `index` of
    /// [`Network::coils`] changed to `resistance`, from `base` (this network's
    /// [`Network::effective`] of the same pairs) and one solve: changing a coil's
    /// conductance g by δ between nodes u and v is the rank-one update K + δ·w·wᵀ
    /// (w = e_u − e_v), so by Sherman–Morrison R'(a, b) = R(a, b) − δ·(φ_a − φ_b)²/(1 + δ·R(u, v)),
    /// with φ the potentials of a unit current fed in at u and out at v \[derived\].
    pub fn effective_with_coil(
        &self,
        pairs: &[(u32, u32)],
        base: &[Option<f64>],
        index: usize,
        resistance: f64,
    ) -> Vec<Option<f64>> {
        let c = self.coils[index];
        if self.node(c.from_bar) == self.node(c.to_bar) {
            return base.to_vec();
        }
        let delta = 1.0 / resistance - 1.0 / c.resistance;
        let phi = self.potentials(c.from_bar, c.to_bar);
        let at = |bar: u32| phi[bar as usize - 1].unwrap_or(0.0);
        let r_uv = at(c.from_bar) - at(c.to_bar);
        let joined = |bar: u32| phi[bar as usize - 1].is_some();
        pairs
            .iter()
            .zip(base)
            .map(|(&(a, b), r)| {
                r.map(|r| {
                    if joined(a) && joined(b) {
                        let x = at(a) - at(b);
                        (r - delta * x * x / (1.0 + delta * r_uv)).max(0.0)
                    } else {
                        r
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

/// The shape of each connected part, and the resistance along each chain part from its first
/// node (see [`Shape`]).
fn shapes(
    coils: &[NetCoil],
    node_of_bar: &[usize],
    part_of_node: &[usize],
) -> (Vec<Shape>, Vec<f64>) {
    let nodes = part_of_node.len();
    // Each node's coil ends (a coil whose two ends are one node carries nothing and is left
    // out).
    let mut ends: Vec<Vec<usize>> = vec![Vec::new(); nodes];
    let ends_of = |c: &NetCoil| {
        (
            node_of_bar[c.from_bar as usize - 1],
            node_of_bar[c.to_bar as usize - 1],
        )
    };
    for (i, c) in coils.iter().enumerate() {
        let (a, b) = ends_of(c);
        if a != b {
            ends[a].push(i);
            ends[b].push(i);
        }
    }
    let mut shape = vec![Shape::Path; nodes];
    let mut most = vec![0usize; nodes];
    let mut ones = vec![0usize; nodes];
    let mut count = vec![0usize; nodes];
    for (node, e) in ends.iter().enumerate() {
        let p = part_of_node[node];
        most[p] = most[p].max(e.len());
        ones[p] += usize::from(e.len() == 1);
        count[p] += 1;
    }
    let mut along = vec![0.0; nodes];
    for p in 0..nodes {
        if part_of_node[p] != p {
            continue;
        }
        // The part's root is its smallest node; walk from it (a cycle) or from an end (a path).
        let start = if most[p] == 2 && ones[p] == 0 {
            p
        } else if count[p] == 1 {
            continue;
        } else if most[p] <= 2 && ones[p] == 2 {
            (p..nodes)
                .find(|&n| part_of_node[n] == p && ends[n].len() == 1)
                .expect("a path has two ends")
        } else {
            shape[p] = Shape::General;
            continue;
        };
        let (mut node, mut came, mut d) = (start, usize::MAX, 0.0);
        shape[p] = loop {
            along[node] = d;
            let Some(&next) = ends[node].iter().find(|&&e| e != came) else {
                break Shape::Path;
            };
            let (a, b) = ends_of(&coils[next]);
            d += coils[next].resistance;
            node = if a == node { b } else { a };
            came = next;
            if node == start {
                break Shape::Cycle(d);
            }
        };
    }
    (shape, along)
}

/// The selected inverse of a sparse symmetric positive definite matrix: the entries of its
/// inverse on the pattern of its Cholesky factor, from one LDLᵀ factorization (up-looking,
/// after faer's approximate-minimum-degree ordering) and the Takahashi recurrences
/// (docs/domain.md, "Solving the bar-to-bar network").
mod selected {
    use faer::dyn_stack::{MemBuffer, MemStack};
    use faer::sparse::SymbolicSparseColMatRef;
    use faer::sparse::linalg::amd;

    const NONE: usize = usize::MAX;

    /// The inverse Z on the pattern of the factor L (unit lower triangular, rows of each
    /// column ascending), in the elimination order.
    pub(super) struct SelectedInverse {
        /// Position in the elimination order of each row of the matrix.
        order_of: Vec<usize>,
        /// Column starts of L (strictly below the diagonal).
        col: Vec<usize>,
        /// Row of each entry of L.
        row: Vec<usize>,
        /// Z on L's pattern.
        z: Vec<f64>,
        /// Z's diagonal.
        z_diagonal: Vec<f64>,
    }

    impl SelectedInverse {
        /// Of the n × n matrix with `diagonal` and the off-diagonal entries `off` (each
        /// (i, j, v), i ≠ j, given once for the pair; repeats add up; a 0 keeps the pair on the
        /// pattern).
        pub(super) fn of(n: usize, diagonal: &[f64], off: &[(usize, usize, f64)]) -> Self {
            // The whole pattern, both triangles, for the ordering.
            let mut full: Vec<(usize, usize, f64)> = Vec::with_capacity(2 * off.len());
            for &(i, j, v) in off {
                full.push((j, i, v));
                full.push((i, j, v));
            }
            full.sort_unstable_by_key(|&(c, r, _)| (c, r));
            full.dedup_by(|next, kept| {
                let same = next.0 == kept.0 && next.1 == kept.1;
                if same {
                    kept.2 += next.2;
                }
                same
            });
            let mut ptr = vec![0usize; n + 1];
            for &(c, _, _) in &full {
                ptr[c + 1] += 1;
            }
            for c in 0..n {
                ptr[c + 1] += ptr[c];
            }
            let rows: Vec<usize> = full.iter().map(|&(_, r, _)| r).collect();
            let mut order = vec![0usize; n];
            let mut order_of = vec![0usize; n];
            let pattern = SymbolicSparseColMatRef::new_checked(n, n, &ptr, None, &rows);
            let mut mem = MemBuffer::new(amd::order_maybe_unsorted_scratch::<usize>(n, rows.len()));
            amd::order_maybe_unsorted(
                &mut order,
                &mut order_of,
                pattern,
                amd::Control::default(),
                MemStack::new(&mut mem),
            )
            .expect("the ordering of a valid pattern");
            // The upper triangle of the permuted matrix, by columns: (row, value), row < column.
            let mut upper_ptr = vec![0usize; n + 1];
            let permuted = |&(c, r, v): &(usize, usize, f64)| (order_of[c], order_of[r], v);
            for e in &full {
                let (c, r, _) = permuted(e);
                if r < c {
                    upper_ptr[c + 1] += 1;
                }
            }
            for c in 0..n {
                upper_ptr[c + 1] += upper_ptr[c];
            }
            let mut upper = vec![(0usize, 0.0f64); upper_ptr[n]];
            let mut fill = upper_ptr.clone();
            for e in &full {
                let (c, r, v) = permuted(e);
                if r < c {
                    upper[fill[c]] = (r, v);
                    fill[c] += 1;
                }
            }
            let diagonal: Vec<f64> = order.iter().map(|&old| diagonal[old]).collect();
            let (col, row, l, d) = factor(&upper_ptr, &upper, &diagonal);
            let (z, z_diagonal) = takahashi(&col, &row, &l, &d);
            SelectedInverse {
                order_of,
                col,
                row,
                z,
                z_diagonal,
            }
        }

        /// Z_ab, for a pair on the pattern (a structural entry of the matrix, or a = b).
        pub(super) fn get(&self, a: usize, b: usize) -> f64 {
            let (x, y) = (self.order_of[a], self.order_of[b]);
            if x == y {
                return self.z_diagonal[x];
            }
            let (c, r) = (x.min(y), x.max(y));
            let rows = &self.row[self.col[c]..self.col[c + 1]];
            let at = rows
                .binary_search(&r)
                .expect("the pair is on the factor's pattern");
            self.z[self.col[c] + at]
        }
    }

    /// The LDLᵀ factor of the matrix with the strictly upper entries `upper` (by columns, from
    /// `upper_ptr`) and `diagonal`: L's column starts, rows (ascending in each column) and
    /// values below the diagonal, and D.
    #[allow(clippy::type_complexity)]
    fn factor(
        upper_ptr: &[usize],
        upper: &[(usize, f64)],
        diagonal: &[f64],
    ) -> (Vec<usize>, Vec<usize>, Vec<f64>, Vec<f64>) {
        let n = diagonal.len();
        // Symbolic: the elimination tree and the count of each column of L.
        let mut parent = vec![NONE; n];
        let mut flag = vec![NONE; n];
        let mut count = vec![0usize; n];
        for k in 0..n {
            flag[k] = k;
            for &(mut i, _) in &upper[upper_ptr[k]..upper_ptr[k + 1]] {
                while flag[i] != k {
                    if parent[i] == NONE {
                        parent[i] = k;
                    }
                    count[i] += 1;
                    flag[i] = k;
                    i = parent[i];
                }
            }
        }
        let mut col = vec![0usize; n + 1];
        for k in 0..n {
            col[k + 1] = col[k] + count[k];
        }
        // Numeric, row by row of L (up-looking): L's columns fill in ascending rows.
        let nnz = col[n];
        let mut row = vec![0usize; nnz];
        let mut l = vec![0.0f64; nnz];
        let mut d = vec![0.0f64; n];
        let mut y = vec![0.0f64; n];
        let mut len = vec![0usize; n];
        let mut stack = vec![0usize; n];
        flag.fill(NONE);
        for k in 0..n {
            let mut top = n;
            flag[k] = k;
            for &(i0, v) in &upper[upper_ptr[k]..upper_ptr[k + 1]] {
                y[i0] += v;
                let mut i = i0;
                let mut depth = 0;
                while flag[i] != k {
                    stack[depth] = i;
                    depth += 1;
                    flag[i] = k;
                    i = parent[i];
                }
                while depth > 0 {
                    depth -= 1;
                    top -= 1;
                    stack.swap(top, depth);
                }
            }
            let mut dk = diagonal[k];
            for &i in &stack[top..n] {
                let yi = y[i];
                y[i] = 0.0;
                let end = col[i] + len[i];
                for p in col[i]..end {
                    y[row[p]] -= l[p] * yi;
                }
                let lki = yi / d[i];
                dk -= lki * yi;
                row[end] = k;
                l[end] = lki;
                len[i] += 1;
            }
            d[k] = dk;
        }
        (col, row, l, d)
    }

    /// Z on L's pattern and Z's diagonal, from the factor.
    fn takahashi(col: &[usize], row: &[usize], l: &[f64], d: &[f64]) -> (Vec<f64>, Vec<f64>) {
        let n = d.len();
        let nnz = row.len();
        // Takahashi: with K = L·D·Lᵀ, Lᵀ·Z = D⁻¹·L⁻¹ is lower triangular with diagonal D⁻¹,
        // so for j from the last column down, with R_j the rows of column j:
        // Z_kj = −Σ_{i∈R_j} L_ij·Z_ik (k ∈ R_j) and Z_jj = 1/d_j − Σ_{k∈R_j} L_kj·Z_kj
        // [derived]; every Z_ik it reads is on L's pattern (R_j is a clique of the filled
        // graph) and already known.
        let mut z = vec![0.0f64; nnz];
        let mut z_diagonal = vec![0.0f64; n];
        let mut slot = vec![NONE; n];
        let mut acc = vec![0.0f64; n];
        for j in (0..n).rev() {
            let cols = col[j]..col[j + 1];
            for (t, p) in cols.clone().enumerate() {
                slot[row[p]] = t;
                acc[t] = 0.0;
            }
            for (t, p) in cols.clone().enumerate() {
                let (k, lkj) = (row[p], l[p]);
                acc[t] += z_diagonal[k] * lkj;
                for q in col[k]..col[k + 1] {
                    let s = slot[row[q]];
                    if s != NONE {
                        // Z_ik with i = row[q] > k, both in R_j.
                        acc[s] += z[q] * lkj;
                        acc[t] += z[q] * l[col[j] + s];
                    }
                }
            }
            let mut zjj = 1.0 / d[j];
            for (t, p) in cols.clone().enumerate() {
                z[p] = -acc[t];
                zjj += l[p] * acc[t];
                slot[row[p]] = NONE;
            }
            z_diagonal[j] = zjj;
        }
        (z, z_diagonal)
    }
}
