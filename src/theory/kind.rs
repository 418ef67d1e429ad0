//! The winding kinds and every fact that differs between them.
//!
//! Part of the `theory` stage. Each kind is a type implementing [`WindingKind`];
//! [`WindingType::kind`] is the only place that matches on the kind. Sources: the standard
//! textbook relations (docs/domain.md, "Lap windings", "Wave windings"; Theraja, *Electrical
//! Technology* vol. 2, ch. 26, from memory as to chapter). Frog-leg: a trade association's
//! technical note on frog-leg windings, read in a public copy
//! (docs/domain.md, "Frog-leg windings");
//! the self-equalizing condition is derived.

/// Lap, wave or frog-leg (`[winding] type`).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum WindingType {
    /// Coil ends go to neighbouring segments; a = m·P.
    Lap,
    /// Coil ends go about two pole pitches apart; a = 2m.
    Wave,
    /// A lap element and a wave element in the same slots on one commutator; a = 2·m·P.
    FrogLeg,
}

impl WindingType {
    /// Every kind, in design-file order.
    pub const ALL: [WindingType; 3] = [WindingType::Lap, WindingType::Wave, WindingType::FrogLeg];

    /// The facts of this kind.
    pub fn kind(self) -> &'static dyn WindingKind {
        match self {
            WindingType::Lap => &Lap,
            WindingType::Wave => &Wave,
            WindingType::FrogLeg => &FrogLeg,
        }
    }

    /// The kind whose design-file word is `word`.
    pub fn from_word(word: &str) -> Option<WindingType> {
        WindingType::ALL.into_iter().find(|t| t.as_str() == word)
    }

    /// The design-file word (`"lap"`, `"wave"`, `"frog-leg"`).
    pub fn as_str(self) -> &'static str {
        self.kind().word()
    }
}

/// Progressive or retrogressive (`[winding] direction`, default progressive).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Direction {
    /// Lap: y_c = +m. Wave: y_c = (C + m)/p, the trace lands m segments ahead after one round.
    Progressive,
    /// Lap: y_c = −m. Wave: y_c = (C − m)/p, the trace lands m segments behind after one round.
    Retrogressive,
}

impl Direction {
    /// The design-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            Direction::Progressive => "progressive",
            Direction::Retrogressive => "retrogressive",
        }
    }

    /// +1 progressive, −1 retrogressive.
    pub fn sign(self) -> i64 {
        match self {
            Direction::Progressive => 1,
            Direction::Retrogressive => -1,
        }
    }

    /// The other direction.
    pub fn other(self) -> Direction {
        match self {
            Direction::Progressive => Direction::Retrogressive,
            Direction::Retrogressive => Direction::Progressive,
        }
    }
}

/// One winding element: a plain lap or wave coil set on the commutator. A lap or a wave
/// winding is one element; a frog-leg winding is two, a lap and a wave, each with its own
/// coils, pitches and trace.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ElementSpec {
    /// [`WindingType::Lap`] or [`WindingType::Wave`].
    pub kind: WindingType,
    /// The element's multiplicity.
    pub multiplicity: u32,
    /// The element's direction.
    pub direction: Direction,
}

/// What one winding kind decides. `n` is the coil positions u·S, `c` the segments, `m` the
/// multiplicity, `p` the pole pairs.
pub trait WindingKind: Sync {
    /// The design-file word.
    fn word(&self) -> &'static str;

    /// Whether `c` segments can be wound on `n` coil positions (the commutator pitch is whole
    /// and every segment has a coil).
    fn workable(&self, c: u32, n: u32, m: u32, p: u32, dir: Direction) -> bool;

    /// The segment count when the design gives none: lap every coil, wave the largest workable
    /// count (fewest dummy coils). `None` when no count works.
    fn default_segments(&self, n: u32, m: u32, p: u32, dir: Direction) -> Option<u32>;

    /// Signed commutator pitch y_c in segments, for a workable `c`.
    fn commutator_pitch(&self, c: u32, m: u32, p: u32, dir: Direction) -> i64;

    /// Front pitch y_f from the back pitch y_b and y_c, in coil-side units.
    fn front_pitch(&self, back: i64, yc: i64) -> i64;

    /// Parallel paths a by the textbook formula.
    fn parallel_paths(&self, m: u32, poles: u32) -> u32;

    /// The path formula in words with its numbers, e.g. `"m x P = 2 x 4"`.
    fn paths_formula(&self, m: u32, poles: u32) -> String;

    /// Whether the kind needs a brush set by every pole (a lap's paths lie under different
    /// poles); otherwise two sets collect every path (a wave's paths each run under every pole).
    fn brush_at_every_pole(&self) -> bool;

    /// Fewest brush sets that collect every path: P by every pole, or 2.
    fn fewest_brush_sets(&self, poles: u32) -> u32 {
        if self.brush_at_every_pole() { poles } else { 2 }
    }

    /// Whether type-A equalizer rings apply (a lap's paths lie under different poles).
    fn takes_equalizers(&self) -> bool;

    /// Coils in series between neighbouring segments, which one bridged gap under a brush shorts.
    fn coils_per_gap(&self, p: u32) -> u32;

    /// Why a brush shorts the coils it does, in words (for the rating's "coils shorted").
    fn shorting_rule(&self, m: u32, p: u32) -> String;

    /// Least poles the kind can be wound on.
    fn min_poles(&self) -> u32;

    /// How to get fewer parallel paths from the same coils, in words ending in ", " (empty when
    /// there is no way: a simplex wave has the fewest).
    fn fewer_paths_remedy(&self, m: u32) -> &'static str;

    /// Whether the symmetry rules also ask for whole pole pairs per pair of paths (a wave's
    /// paths each run under every pole) [from memory: Arnold's conditions, docs/domain.md,
    /// "Symmetry"].
    fn symmetry_counts_pole_pairs(&self) -> bool;

    /// Why `c` segments do not suit this kind, in words (for a rewind that needs a new
    /// commutator).
    fn segment_rule(&self, c: u32, n: u32, m: u32, p: u32, dir: Direction) -> String;

    /// The hint when `n` coil positions do not suit a kind that uses every coil (a frog-leg
    /// with C/p not whole): what must hold, and the nearest counts that work.
    fn segment_hint(&self, n: u32, m: u32, p: u32) -> String;

    /// Whether the kind uses every coil position (no dummy coils): C = u·S. A kind that does
    /// not may leave dummy coils (`[winding] dummy_coils`).
    fn uses_every_coil(&self) -> bool;

    /// Why `c` segments give no whole commutator pitch, in the design file's words (the
    /// parser's refusal of a given `[armature] segments` for a kind that may leave dummy
    /// coils).
    fn pitch_rule(&self, c: u32, m: u32, p: u32, dir: Direction) -> String;

    /// Whether the commutator pitch is worked out from the bar count, y_c = (C ± m)/p (a
    /// wave), rather than from the multiplicity alone, y_c = ±m (a lap, and a frog-leg's
    /// first element).
    fn pitch_from_bar_count(&self) -> bool;

    /// The kind the same coils can be reconnected as for more parallel paths (lap instead of
    /// wave); `None` when no plain reconnection gives more.
    fn more_paths_kind(&self) -> Option<WindingType>;

    /// How many bars on the armature test feeds a simplex singly re-entrant winding of `c`
    /// bars on `poles` poles: a lap, the bar opposite; a wave, the bar one pole pitch away
    /// [src: a published trade training text on growlers and armature testers].
    fn feed_pitch(&self, c: u32, poles: u32) -> u32;

    /// Why the kind takes no equalizer rings, in words (empty for a lap, which takes them).
    fn no_equalizers_reason(&self) -> &'static str;

    /// The winding elements on the commutator, from the design's multiplicity `m` and
    /// direction (the first element's): one for lap or wave, two for frog-leg (the lap
    /// element first, then the wave element).
    fn elements(&self, m: u32, p: u32, dir: Direction) -> Vec<ElementSpec>;

    /// How many elements [`WindingKind::elements`] gives: each holds C coils and a share
    /// 1/element_count of the paths.
    fn element_count(&self) -> u32 {
        self.elements(1, 2, Direction::Progressive).len() as u32
    }
}

/// Lap winding: y_c = ±m, a = m·P, uses every coil.
#[derive(Clone, Copy, Debug)]
pub struct Lap;

/// Wave winding: y_c = (C ± m)/p, a = 2m, may leave dummy coils.
#[derive(Clone, Copy, Debug)]
pub struct Wave;

impl WindingKind for Lap {
    fn word(&self) -> &'static str {
        "lap"
    }
    fn workable(&self, c: u32, n: u32, _m: u32, _p: u32, _dir: Direction) -> bool {
        c == n
    }
    fn default_segments(&self, n: u32, _m: u32, _p: u32, _dir: Direction) -> Option<u32> {
        Some(n)
    }
    fn commutator_pitch(&self, _c: u32, m: u32, _p: u32, dir: Direction) -> i64 {
        dir.sign() * i64::from(m)
    }
    fn front_pitch(&self, back: i64, yc: i64) -> i64 {
        back - 2 * yc
    }
    fn parallel_paths(&self, m: u32, poles: u32) -> u32 {
        m * poles
    }
    fn paths_formula(&self, m: u32, poles: u32) -> String {
        format!("m x P = {m} x {poles}")
    }
    fn brush_at_every_pole(&self) -> bool {
        true
    }
    fn takes_equalizers(&self) -> bool {
        true
    }
    fn coils_per_gap(&self, _p: u32) -> u32 {
        1
    }
    fn shorting_rule(&self, m: u32, _p: u32) -> String {
        format!("lap: a brush touching k segments shorts k - m coils (m = {m})")
    }
    fn min_poles(&self) -> u32 {
        2
    }
    fn fewer_paths_remedy(&self, _m: u32) -> &'static str {
        "a connection with fewer paths (wave instead of lap), "
    }
    fn symmetry_counts_pole_pairs(&self) -> bool {
        false
    }
    fn segment_rule(&self, _c: u32, n: u32, _m: u32, _p: u32, _dir: Direction) -> String {
        format!("a lap winding uses all {n} coils")
    }
    fn segment_hint(&self, n: u32, _m: u32, _p: u32) -> String {
        format!("a lap winding takes {n} segments, one a coil")
    }
    fn uses_every_coil(&self) -> bool {
        true
    }
    fn pitch_rule(&self, _c: u32, m: u32, _p: u32, _dir: Direction) -> String {
        format!("a lap winding's commutator pitch ±{m} is whole for every count")
    }
    fn pitch_from_bar_count(&self) -> bool {
        false
    }
    fn more_paths_kind(&self) -> Option<WindingType> {
        None
    }
    fn feed_pitch(&self, c: u32, _poles: u32) -> u32 {
        c / 2
    }
    fn no_equalizers_reason(&self) -> &'static str {
        ""
    }
    fn elements(&self, m: u32, _p: u32, dir: Direction) -> Vec<ElementSpec> {
        vec![ElementSpec {
            kind: WindingType::Lap,
            multiplicity: m,
            direction: dir,
        }]
    }
}

impl WindingKind for Wave {
    fn word(&self) -> &'static str {
        "wave"
    }
    fn workable(&self, c: u32, n: u32, m: u32, p: u32, dir: Direction) -> bool {
        c >= 2 && c <= n && wave_pitch_whole(c, m, p, dir)
    }
    fn default_segments(&self, n: u32, m: u32, p: u32, dir: Direction) -> Option<u32> {
        (2..=n).rev().find(|&c| wave_pitch_whole(c, m, p, dir))
    }
    fn commutator_pitch(&self, c: u32, m: u32, p: u32, dir: Direction) -> i64 {
        (i64::from(c) + dir.sign() * i64::from(m)) / i64::from(p)
    }
    fn front_pitch(&self, back: i64, yc: i64) -> i64 {
        2 * yc - back
    }
    fn parallel_paths(&self, m: u32, _poles: u32) -> u32 {
        2 * m
    }
    fn paths_formula(&self, m: u32, _poles: u32) -> String {
        format!("2m = 2 x {m}")
    }
    fn brush_at_every_pole(&self) -> bool {
        false
    }
    fn takes_equalizers(&self) -> bool {
        false
    }
    fn coils_per_gap(&self, p: u32) -> u32 {
        p
    }
    fn shorting_rule(&self, m: u32, p: u32) -> String {
        format!("wave: each bridged gap shorts p = {p} coils in series (k - m gaps, m = {m})")
    }
    fn min_poles(&self) -> u32 {
        4
    }
    fn fewer_paths_remedy(&self, m: u32) -> &'static str {
        if m >= 2 { "a lower multiplicity, " } else { "" }
    }
    fn symmetry_counts_pole_pairs(&self) -> bool {
        true
    }
    fn segment_rule(&self, c: u32, _n: u32, m: u32, p: u32, dir: Direction) -> String {
        let sign = if dir.sign() > 0 { "+" } else { "-" };
        format!(
            "a {} wave needs (C {sign} {m})/{p} whole, which {c} does not give",
            dir.as_str()
        )
    }
    fn segment_hint(&self, _n: u32, _m: u32, _p: u32) -> String {
        "a wave winding may leave dummy coils: give fewer segments".to_string()
    }
    fn uses_every_coil(&self) -> bool {
        false
    }
    fn pitch_rule(&self, c: u32, m: u32, p: u32, dir: Direction) -> String {
        let sym = if dir.sign() > 0 { "+" } else { "−" };
        format!(
            "a {} wave winding needs (C {sym} m)/p to be a whole number: ({c} {sym} {m})/{p} is not",
            dir.as_str()
        )
    }
    fn pitch_from_bar_count(&self) -> bool {
        true
    }
    fn more_paths_kind(&self) -> Option<WindingType> {
        Some(WindingType::Lap)
    }
    fn feed_pitch(&self, c: u32, poles: u32) -> u32 {
        (c + poles / 2) / poles
    }
    fn no_equalizers_reason(&self) -> &'static str {
        "a wave winding needs none"
    }
    fn elements(&self, m: u32, _p: u32, dir: Direction) -> Vec<ElementSpec> {
        vec![ElementSpec {
            kind: WindingType::Wave,
            multiplicity: m,
            direction: dir,
        }]
    }
}

/// Frog-leg winding: a lap element (multiplicity m, the design's direction) and a wave element
/// (m_w = m·p, the other direction) in the same slots on one commutator; every bar takes four
/// leads, a = 2·m·P, and it needs no equalizers [src: a trade association's technical note on
/// frog-leg windings, read in a public copy; docs/domain.md, "Frog-leg windings"].
///
/// The lap element's y_c = ±m and the wave element's y_c = (C ∓ m·p)/p = C/p ∓ m, so
/// y_c(lap) + |y_c(wave)| = C/p: a lap coil and a wave coil in series span two pole pitches
/// \[derived\]. Both are whole exactly when C/p is.
#[derive(Clone, Copy, Debug)]
pub struct FrogLeg;

impl WindingKind for FrogLeg {
    fn word(&self) -> &'static str {
        "frog-leg"
    }
    fn workable(&self, c: u32, n: u32, _m: u32, p: u32, _dir: Direction) -> bool {
        c == n && p >= 2 && c.is_multiple_of(p)
    }
    fn default_segments(&self, n: u32, _m: u32, _p: u32, _dir: Direction) -> Option<u32> {
        Some(n)
    }
    fn commutator_pitch(&self, c: u32, m: u32, p: u32, dir: Direction) -> i64 {
        Lap.commutator_pitch(c, m, p, dir)
    }
    fn front_pitch(&self, back: i64, yc: i64) -> i64 {
        Lap.front_pitch(back, yc)
    }
    fn parallel_paths(&self, m: u32, poles: u32) -> u32 {
        2 * m * poles
    }
    fn paths_formula(&self, m: u32, poles: u32) -> String {
        format!("2 x m x P = 2 x {m} x {poles}")
    }
    fn brush_at_every_pole(&self) -> bool {
        Lap.brush_at_every_pole()
    }
    fn takes_equalizers(&self) -> bool {
        false
    }
    fn coils_per_gap(&self, p: u32) -> u32 {
        Lap.coils_per_gap(p) + Wave.coils_per_gap(p)
    }
    fn shorting_rule(&self, m: u32, p: u32) -> String {
        format!(
            "frog-leg: each bridged gap shorts one lap coil and p = {p} wave coils in series (k - m gaps, m = {m})"
        )
    }
    fn min_poles(&self) -> u32 {
        Wave.min_poles()
    }
    fn fewer_paths_remedy(&self, _m: u32) -> &'static str {
        "a plain lap or wave connection, "
    }
    fn symmetry_counts_pole_pairs(&self) -> bool {
        false
    }
    fn segment_rule(&self, c: u32, n: u32, _m: u32, p: u32, _dir: Direction) -> String {
        format!(
            "a frog-leg winding uses all {n} coils in each element and needs C/p whole, which {c}/{p} is not"
        )
    }
    // The wave element's pitch C/p ∓ m must be whole: the nearest counts.
    fn segment_hint(&self, n: u32, m: u32, p: u32) -> String {
        let p = p.max(1);
        let below = n - n % p;
        let above = below + p;
        format!(
            "the wave element's commutator pitch C/p - {m} must be whole: slots × coils_per_slot must divide by the {p} pole pairs (e.g. {below} or {above} coils)"
        )
    }
    fn uses_every_coil(&self) -> bool {
        true
    }
    fn pitch_rule(&self, c: u32, _m: u32, p: u32, _dir: Direction) -> String {
        format!("a frog-leg winding needs C/p to be a whole number: {c}/{p} is not")
    }
    fn pitch_from_bar_count(&self) -> bool {
        Lap.pitch_from_bar_count()
    }
    fn more_paths_kind(&self) -> Option<WindingType> {
        None
    }
    // The lap element sets the pattern: bar 1 and the bar opposite.
    fn feed_pitch(&self, c: u32, poles: u32) -> u32 {
        Lap.feed_pitch(c, poles)
    }
    fn no_equalizers_reason(&self) -> &'static str {
        "a frog-leg winding needs none, its wave element equalizes the lap element"
    }
    fn elements(&self, m: u32, p: u32, dir: Direction) -> Vec<ElementSpec> {
        vec![
            ElementSpec {
                kind: WindingType::Lap,
                multiplicity: m,
                direction: dir,
            },
            ElementSpec {
                kind: WindingType::Wave,
                multiplicity: m * p,
                direction: dir.other(),
            },
        ]
    }
}

/// The kind the shop's bar-count rule of thumb suggests for `c` bars on `poles` poles, when
/// the rule speaks for that pole count: on 4 and 8 poles an even count is lap and an odd one
/// wave, on 6 poles a count divisible by 3 is lap [common practice; `checks` names the source].
pub fn bar_rule(poles: u32, c: u32) -> Option<WindingType> {
    let lap_divisor = match poles {
        4 | 8 => 2,
        6 => 3,
        _ => return None,
    };
    Some(if c.is_multiple_of(lap_divisor) {
        WindingType::Lap
    } else {
        WindingType::Wave
    })
}

/// Whether (C ± m)/p is whole: the wave commutator pitch [src: standard textbook relation].
pub fn wave_pitch_whole(c: u32, m: u32, p: u32, dir: Direction) -> bool {
    p > 0 && (i64::from(c) + dir.sign() * i64::from(m)).rem_euclid(i64::from(p)) == 0
}

#[cfg(test)]
mod tests {
    use super::*;
    use Direction::*;

    #[test]
    fn wave_count_takes_fewest_dummies() {
        // 36 positions, 6 poles: (36+1)/3 is not whole, (35+1)/3 = 12 is.
        assert_eq!(Wave.default_segments(36, 1, 3, Progressive), Some(35));
        // Retrogressive: (34−1)/3 = 11 is the first at or below 36.
        assert_eq!(Wave.default_segments(36, 1, 3, Retrogressive), Some(34));
        assert_eq!(Wave.default_segments(25, 1, 2, Progressive), Some(25));
        assert!(Wave.workable(25, 25, 1, 2, Progressive));
        assert!(!Wave.workable(26, 26, 1, 2, Progressive));
        assert!(!Wave.workable(27, 26, 1, 2, Retrogressive));
    }

    #[test]
    fn kind_facts() {
        assert_eq!(WindingType::Lap.kind().parallel_paths(2, 4), 8);
        assert_eq!(WindingType::Wave.kind().parallel_paths(2, 8), 4);
        assert_eq!(Lap.commutator_pitch(36, 2, 2, Retrogressive), -2);
        assert_eq!(Wave.commutator_pitch(35, 1, 3, Progressive), 12);
        assert_eq!(WindingType::Wave.as_str(), "wave");
    }

    #[test]
    fn each_kind_answers_one_rule_family() {
        // `checks::run_checks` runs the equalizer rules, the dummy-coil rules or the element
        // rules on these answers: each kind must pick exactly one family.
        for t in WindingType::ALL {
            let k = t.kind();
            let families = [
                k.takes_equalizers(),
                !k.uses_every_coil(),
                k.element_count() > 1,
            ];
            assert_eq!(families.iter().filter(|&&f| f).count(), 1, "{}", t.as_str());
        }
        assert_eq!(bar_rule(4, 25), Some(WindingType::Wave));
        assert_eq!(bar_rule(6, 36), Some(WindingType::Lap));
        assert_eq!(bar_rule(2, 36), None);
        assert_eq!(Wave.feed_pitch(25, 4), 6);
        assert_eq!(FrogLeg.fewest_brush_sets(6), 6);
        assert_eq!(Wave.more_paths_kind(), Some(WindingType::Lap));
    }

    #[test]
    fn frog_leg_elements() {
        // 4 poles, 58 bars: lap 1-2, wave y_c = (58 - 2)/2 = 28, 8 paths [derived; docs/domain.md,
        // "Frog-leg windings"].
        let k = WindingType::FrogLeg.kind();
        let e = k.elements(1, 2, Progressive);
        assert_eq!(e.len(), 2);
        let yc: Vec<i64> = e
            .iter()
            .map(|x| {
                x.kind
                    .kind()
                    .commutator_pitch(58, x.multiplicity, 2, x.direction)
            })
            .collect();
        assert_eq!(yc, vec![1, 28]);
        assert_eq!(yc[0] + yc[1].abs(), 58 / 2);
        assert_eq!(k.parallel_paths(1, 4), 8);
        assert!(k.workable(58, 58, 1, 2, Progressive));
        assert!(!k.workable(57, 57, 1, 2, Progressive));
        assert_eq!(
            WindingType::from_word("frog-leg"),
            Some(WindingType::FrogLeg)
        );
    }
}
