//! What the rating could not work out, and the assumptions it made, as typed notes.
//!
//! Part of the `rating` stage: the notes carry their numbers; `render::rating_words` words
//! them for the report and the JSON.

use super::MeanTurn;

/// One note of a [`super::RatingReport`], in the order the rating met it.
#[derive(Clone, Debug, PartialEq)]
pub enum RatingNote {
    /// The mean turn was estimated from `[core]`; a measured `mean_turn_mm` is better.
    MeanTurnEstimated(MeanTurn),
    /// No `[conductor]`, so no armature resistance.
    NoConductor,
    /// A conductor but no mean turn and no core to estimate it, so no armature resistance.
    NoMeanTurn,
    /// No thermal class: resistance and losses are taken at 20 °C.
    NoThermalClass,
    /// A current but no resistance: the EMF leaves I·R_a out.
    EmfWithoutIrDrop,
    /// Neither a voltage nor a flux with a speed: no EMF.
    NoEmf,
    /// The drops exceed the terminal voltage: no positive EMF.
    DropsExceedVoltage,
    /// `[rating]` without a current.
    NoCurrent,
    /// A low voltage but no current, so the small-machine test row is not taken.
    TestVoltageGeneralRow,
}
