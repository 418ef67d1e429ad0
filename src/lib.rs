//! armsheet designs, checks and prints DC machine armature windings.
//!
//! The pipeline, one folder a stage, every import pointing down this list ([`STAGES`]; the
//! architecture test in `tests/it/architecture.rs` enforces it):
//! 0. [`base`]: findings with their severity, and the one number writer;
//! 1. [`theory`]: the winding kinds and the formulas of the trade, written once;
//! 2. [`design`] parses, validates and resolves a TOML design into a [`design::Design`];
//! 3. [`winding`] traces it (segments are nodes, coils are edges) into a [`winding::Winding`];
//! 4. [`rating`] rates the traced winding against its nameplate and limits;
//! 5. [`checks`] applies the trade's rules; [`check`] runs stages 3–5 once into a [`Checked`];
//! 6. [`features`] read a checked design, each in a room of its own: identify, rewind and the
//!    armature test;
//! 7. [`layout`] resolves every drawing and sheet into positioned items in millimetres;
//! 8. [`render`] walks the computed results into text, JSON, CSV, SVG and PDF bytes;
//! 9. [`cli`], the only stage that touches files, the terminal or the environment.
#![deny(missing_docs)]

pub mod base;
pub mod checks;
pub mod cli;
pub mod design;
pub mod features;
pub mod layout;
pub mod rating;
pub mod render;
pub mod theory;
pub mod winding;

pub use checks::{Checked, check};

/// The pipeline's stages in order. A module may import only from stages before its own.
pub const STAGES: [&str; 10] = [
    "base", "theory", "design", "winding", "rating", "checks", "features", "layout", "render",
    "cli",
];
