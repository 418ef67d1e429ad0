//! Source lines for the rules, written once so every finding cites its rule the same way.
//!
//! Part of the `checks` stage.

/// Pitch relations of lap and wave windings.
pub const PITCH_TEXTS: &str = "standard textbook relations (e.g. Theraja, Electrical Technology vol. 2, armature windings; Say & Taylor, Direct Current Machines) [from memory as to chapter]";
/// Arnold's symmetry conditions.
pub const SYMMETRY: &str =
    "classical symmetry conditions, usually credited to Arnold [from memory, not verified]";
/// The span's electrical angle between 90 and 270 degrees.
pub const SPAN_OPPOSITE: &str = "coil sides under poles of opposite polarity, pitch factor sin(y*90/tau) [textbook relation; the half and one and a half pole-pitch limits derived]";
/// The span rule.
pub const SPAN: &str = "full-pitch or slightly short-pitched coils [common practice]";
/// Type-A equalizers.
pub const EQUALIZERS: &str = "type-A equalizers join points two pole pitches apart (textbook lap-winding treatment); 1/3 to 1/2 of the possible number is typical [from memory]";
/// Brushes on multiplex windings.
pub const MULTIPLEX_BRUSH: &str =
    "a multiplex winding needs brushes at least m segments wide [common practice]";
/// The bar-count rule of thumb.
pub const BAR_RULE: &str = "with 4 or 8 poles an even bar count suggests lap and an odd one wave; with 6 poles a count divisible by 3 suggests lap [common practice; seen in a naval training text]";
/// Dummy coils.
pub const DUMMY: &str = "dummy coils in wave windings (textbook treatment, e.g. Theraja ch. 26) [from memory as to chapter]";
/// The engine's own cross-check.
pub const TRACE: &str =
    "armsheet trace of the connection graph, checked against the textbook formulas";
/// The path-balance simulation.
pub const SIMULATION: &str = "armsheet simulation: flat-topped field under the pole arcs, rotor turned through one period of lcm(u, m) segment pitches in 8 steps each";
/// The exact symmetry test.
pub const EXACT_SYMMETRY: &str = "armsheet exact test: rotations of the armature through whole pole pitches that carry each path onto another [derived]";
/// Frog-leg windings.
pub const FROG_LEG: &str = "a trade association's technical note on frog-leg windings, read in a public copy; same wire and turns in both elements [common practice]";
/// Frog-leg rules that are our own derivation.
pub const FROG_LEG_DERIVED: &str = "frog-leg windings (a trade association's technical note, read in a public copy); the rule as read off the traced connections [derived]";
/// The front pitch over a dummy coil, read off the trace.
pub const DUMMY_FRONT_PITCH: &str = "armsheet trace: coil-side numbers with the dummy coils counted, front connection from a coil's bottom side to the top side of the coil that starts at its end segment [derived]";
