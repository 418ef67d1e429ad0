//! armsheet designs, checks and prints DC machine armature windings.
//!
//! The pipeline, one folder a stage:
//! 1. [`design`] parses and validates a TOML design into a resolved [`design::Design`];
//! 2. [`winding`] traces the winding (segments are nodes, coils are edges) into a [`winding::Winding`];
//! 3. [`checks`] applies the trade's rules and returns findings;
//! 4. [`layout`] turns design and winding into drawing geometry;
//! 5. [`render`] writes text, JSON, CSV, SVG and PDF bytes; [`cli`] alone touches files.
#![deny(missing_docs)]

pub mod checks;
pub mod cli;
pub mod design;
pub mod layout;
pub mod rating;
pub mod render;
pub mod winding;
