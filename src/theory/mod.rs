//! `theory`: the winding theory every stage shares, written once.
//!
//! Stage 1 of the pipeline (see [`crate::STAGES`]), below `design`: the winding kinds and what
//! differs between them ([`WindingKind`]), the pitch arithmetic ([`pitch`]), the EMF and torque
//! constants ([`emf`]) and the trade's words for them ([`words`]). Pure functions of numbers;
//! it imports only [`crate::base`].
//!
//! To add a winding kind, add a variant to [`WindingType`] and a type implementing
//! [`WindingKind`] in `kind.rs`; `WindingType::kind` is the one `match` on the kind.

pub mod emf;
mod kind;
pub mod pitch;
pub mod words;

pub use kind::{
    Direction, ElementSpec, FrogLeg, Lap, Wave, WindingKind, WindingType, bar_rule,
    wave_pitch_whole,
};
pub use pitch::gcd;
