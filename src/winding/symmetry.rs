//! Rotations of the armature that map the winding onto itself, and the paths they carry onto
//! one another.
//!
//! Part of the `winding` stage. A rotation by k slots moves coil position n to n + k·u (mod N),
//! keeping each coil's place in its slot. It maps the winding onto itself when it carries
//! dummies to dummies and shifts every active coil's start and end segment by one constant j
//! (mod C): then it maps slots to slots, coils to coils and segments to segments and keeps
//! every connection [derived]. The equalizer plan uses it.
//!
//! ## The path classes of the exact symmetry test [derived]
//! The field and the brushes repeat, with the polarity reversed, every pole pitch. Turning the
//! armature k slots keeps every coil under the same field (up to sign) when k·P ≡ 0 (mod S).
//! A closed winding W is *carried onto* a closed winding W' by a segment shift j when, for every
//! coil of W, the coil whose start lead is j segments on lies in W' exactly k slots on (one
//! such k for all of W). Every path of W then goes where its middle coil goes, onto a path of
//! W'; the relation sorts the paths into classes ([`PathClasses`]).
//!
//! - When every map used moves each coil n to n + k·u (a rigid rotation of the whole armature,
//!   which then maps slots, coils and segments onto themselves and keeps every connection) and
//!   joins all paths into one class, the paths carry one EMF at every rotor position, whatever
//!   the brushes short: [`Congruence::Proven`].
//! - Two looser congruences hold the paths equal only where the brushes cut them among coils
//!   that carry no EMF: paths joined through the u coils of a slot, which share a centre line
//!   (with m dividing u the m closed windings lie in the same slots, k = 0, j not a rigid
//!   shift); and two classes of a/2 paths, one for each current sense, paired by the two layers
//!   (a path with its top sides under the north poles and one with its top sides under the
//!   south poles have the tops of one where the bottoms of the other are). These are
//!   [`Congruence::UpToCommutation`] and hold only when the simulated balance over a whole
//!   period confirms them: a short pitch, brushes off neutral or a dummy coil leave EMF in the
//!   coils under commutation and the simulation sees it.
//! - Otherwise some paths have no congruent partner and the winding is unsymmetrical.

use super::{Connection, ParallelPath, Winding, WindingElement};
use crate::design::Design;

/// The segment shift j of the rotation by `k_slots` slots, when that rotation maps the winding
/// onto itself; `None` when it breaks a connection or moves a dummy onto an active coil.
pub fn rotation_segment_shift(
    connections: &[Connection],
    coils_per_slot: u32,
    segments: u32,
    k_slots: u32,
) -> Option<u32> {
    let n = connections.len();
    if n == 0 {
        return None;
    }
    let t = (k_slots as usize * coils_per_slot as usize) % n;
    let c = i64::from(segments);
    let mut shift: Option<i64> = None;
    for (i, from) in connections.iter().enumerate() {
        let to = &connections[(i + t) % n];
        match (
            from.start_segment,
            from.end_segment,
            to.start_segment,
            to.end_segment,
        ) {
            (None, None, None, None) => {}
            (Some(s0), Some(e0), Some(s1), Some(e1)) => {
                let js = (i64::from(s1) - i64::from(s0)).rem_euclid(c);
                let je = (i64::from(e1) - i64::from(e0)).rem_euclid(c);
                if js != je || shift.is_some_and(|j| j != js) {
                    return None;
                }
                shift = Some(js);
            }
            _ => return None,
        }
    }
    shift.map(|j| j as u32)
}

/// The paths sorted into classes by the exact test: each class lists path indices (0-based)
/// carried onto one another.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct PathClasses {
    /// The classes, each ascending, in order of their first path.
    pub classes: Vec<Vec<usize>>,
    /// Per class: whether all its paths carry current one way along the trace (all paths
    /// under the north poles' top sides, or all under the south poles').
    pub one_sense: Vec<bool>,
    /// Whether every join between classes came from a rigid rotation of the whole armature
    /// (coil n to n + k·u): then the joined paths carry the same EMF at every rotor position
    /// whatever the brushes short.
    pub rigid: bool,
}

/// What the structure of the winding says about its paths.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Congruence {
    /// Rigid rotations through whole pole pitches carry every path onto every other: the paths
    /// carry the same EMF at every rotor position, whatever the brushes short.
    Proven,
    /// The paths are congruent coil by coil up to where the brushes cut them (paths joined
    /// through the coils of one slot, or two classes of a/2 paths, one for each current sense,
    /// paired by the two layers): equal when the coils under commutation carry no EMF, which
    /// the simulated balance confirms or refutes.
    UpToCommutation,
    /// Some paths are carried onto no congruent partner.
    No,
}

impl PathClasses {
    /// The structural verdict (see the module doc).
    pub fn congruence(&self, paths: usize) -> Congruence {
        match self.classes.len() {
            0 => Congruence::Proven,
            1 if self.rigid => Congruence::Proven,
            1 => Congruence::UpToCommutation,
            2 if self.one_sense.iter().all(|x| *x)
                && self.classes.iter().all(|c| 2 * c.len() == paths) =>
            {
                Congruence::UpToCommutation
            }
            _ => Congruence::No,
        }
    }

    /// The exact verdict: proven by the structure, or congruent up to the commutation zone and
    /// confirmed by the simulated balance.
    pub fn symmetric(&self, paths: usize, balanced: bool) -> bool {
        match self.congruence(paths) {
            Congruence::Proven => true,
            Congruence::UpToCommutation => balanced,
            Congruence::No => false,
        }
    }
}

/// Sorts the traced paths of one element `e` of `w` into classes carried onto one another (see
/// the module doc; path indices in the classes count the element's paths only, in order).
/// [`super::trace_winding`] stores them in [`WindingElement::path_classes`].
pub(crate) fn path_classes_of(d: &Design, w: &Winding, e: &WindingElement) -> PathClasses {
    let c = w.active_coils;
    let s = d.slots;
    let mut local_of = vec![usize::MAX; w.paths.len()];
    let paths: Vec<&ParallelPath> = w
        .paths
        .iter()
        .filter(|p| p.coils.first().is_some_and(|&k| e.holds(k)))
        .collect();
    for (i, p) in paths.iter().enumerate() {
        local_of[(p.index - 1) as usize] = i;
    }
    let mut parent: Vec<usize> = (0..paths.len()).collect();
    let mut rigid = true;
    // Segment (0-based) -> coil whose start lead is on it; coil -> closed winding.
    let mut out = vec![0u32; c as usize];
    for conn in w.connections.iter().filter(|k| e.holds(k.coil)) {
        if let Some(st) = conn.start_segment {
            out[(st - 1) as usize] = conn.coil;
        }
    }
    let mut winding_of = vec![usize::MAX; w.connections.len()];
    for (i, cw) in w.closed_windings.iter().enumerate() {
        for step in &cw.steps {
            winding_of[(step.coil - 1) as usize] = i;
        }
    }
    let slot_of = |coil: u32| w.connections[(coil - 1) as usize].top.slot;
    let start_of = |coil: u32| {
        w.connections[(coil - 1) as usize]
            .start_segment
            .unwrap_or(1)
    };
    let image = |coil: u32, j: i64| {
        let seg = (i64::from(start_of(coil)) - 1 + j).rem_euclid(i64::from(c));
        out[seg as usize]
    };
    // Slot shifts that keep the field up to sign: k·P ≡ 0 (mod S).
    let shifts: Vec<u32> = (0..s)
        .filter(|k| (u64::from(*k) * u64::from(d.poles)).is_multiple_of(u64::from(s)))
        .collect();
    // Slot (0-based) -> the element's active coils with their top side in it, in coil order.
    let mut in_slot: Vec<Vec<&Connection>> = vec![Vec::new(); s as usize];
    for cn in w
        .connections
        .iter()
        .filter(|cn| !cn.dummy && e.holds(cn.coil))
    {
        in_slot[(cn.top.slot - 1) as usize].push(cn);
    }
    // Classes left; once the paths are one class no later join can change the classes or
    // `rigid` (a join between two classes is the only thing that clears it), so the search
    // stops there.
    let mut left = paths.len();
    'windings: for cw in &w.closed_windings {
        let Some(first) = cw.steps.first().map(|st| st.coil).filter(|&k| e.holds(k)) else {
            continue;
        };
        for &k in &shifts {
            if left <= 1 {
                break 'windings;
            }
            let target_slot = (slot_of(first) - 1 + k) % s + 1;
            for cand in &in_slot[(target_slot - 1) as usize] {
                let j = i64::from(start_of(cand.coil)) - i64::from(start_of(first));
                let onto = winding_of[(cand.coil - 1) as usize];
                if onto == usize::MAX {
                    continue;
                }
                let carried = cw.steps.iter().all(|st| {
                    let im = image(st.coil, j);
                    winding_of[(im - 1) as usize] == onto
                        && (slot_of(im) + s - slot_of(st.coil)) % s == k
                });
                if !carried {
                    continue;
                }
                let (n, f) = (e.coils, e.first_coil);
                let rigid_map = cw
                    .steps
                    .iter()
                    .all(|st| image(st.coil, j) == (st.coil - f + k * d.coils_per_slot) % n + f);
                // The rotated winding lies on `onto` under the same field: each path goes where
                // its middle coil goes (the ends of a path move with the brush cut).
                for (x, path) in paths.iter().enumerate() {
                    let Some(&mid) = path.coils.get(path.coils.len() / 2) else {
                        continue;
                    };
                    if winding_of[(mid - 1) as usize] != winding_of[(first - 1) as usize] {
                        continue;
                    }
                    let y = w.coil_path[(image(mid, j) - 1) as usize];
                    let y = if y == 0 {
                        usize::MAX
                    } else {
                        local_of.get(y as usize - 1).copied().unwrap_or(usize::MAX)
                    };
                    if y < paths.len() {
                        let (a, b) = (root(&mut parent, x), root(&mut parent, y));
                        if a != b {
                            rigid &= rigid_map;
                            left -= 1;
                        }
                        parent[a.max(b)] = a.min(b);
                    }
                }
            }
        }
    }
    collect_classes(&mut parent, &paths, rigid)
}

/// The union-find forest `parent` over `paths` read off as classes, each with whether its
/// paths carry current one way.
fn collect_classes(parent: &mut [usize], paths: &[&ParallelPath], rigid: bool) -> PathClasses {
    let mut classes: Vec<Vec<usize>> = Vec::new();
    let mut index_of_root = vec![usize::MAX; paths.len()];
    for x in 0..paths.len() {
        let r = root(parent, x);
        if index_of_root[r] == usize::MAX {
            index_of_root[r] = classes.len();
            classes.push(Vec::new());
        }
        classes[index_of_root[r]].push(x);
    }
    let senses = classes
        .iter()
        .map(|cl| {
            let first = paths[cl[0]].current;
            cl.iter().all(|&x| paths[x].current == first)
        })
        .collect();
    PathClasses {
        classes,
        one_sense: senses,
        rigid,
    }
}

/// The root of `x` in the union-find forest `parent`, halving the path on the way.
fn root(parent: &mut [usize], mut x: usize) -> usize {
    while parent[x] != x {
        parent[x] = parent[parent[x]];
        x = parent[x];
    }
    x
}

impl Winding {
    /// The exact symmetry verdict, for every element: its paths are proven congruent by the
    /// structure, or congruent up to the commutation zone and confirmed by the simulated
    /// balance. The symmetry checks report it (`symmetry.exact`) and `Checked::symmetric` is it.
    pub fn exact_symmetric(&self) -> bool {
        self.elements.iter().all(|e| {
            e.path_classes
                .symmetric(self.element_paths(e) as usize, self.balance.balanced)
        })
    }

    /// The parallel paths of element `e`: all of them for a winding of one element.
    pub fn element_paths(&self, e: &WindingElement) -> u32 {
        if self.is_multi_element() {
            e.paths
        } else {
            self.parallel_paths()
        }
    }
}
