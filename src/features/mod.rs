//! `features`: the commands that read a checked design and work on it, each in a room of its
//! own: [`archive`] (the shop's winding archive: what a job records and the match rules), [`explore`] (the designer's search: every winding that fits a frame), [`identify`] (data taking: which winding an old armature had), [`rewind`] (a new winding
//! on the same core) and [`armature_test`] (the bar-to-bar network, the fault locator and the
//! shop's readings file).
//!
//! Stage 6, after `checks` and before `layout`: each feature takes a [`crate::Checked`] (or
//! calls [`crate::check`], the one entry to the engine) and returns an inert, typed result that
//! layout and render only read. A feature never imports another feature; nothing here touches
//! files.

pub mod archive;
pub mod armature_test;
pub mod explore;
pub mod identify;
pub mod rewind;
