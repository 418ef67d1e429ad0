//! `layout`: every drawing and sheet resolved into a page tree, in millimetres.
//!
//! Sixth stage of the pipeline, between the checks and the renderers: it takes a
//! [`Checked`](crate::Checked) (design, traced winding, rating, findings) and options, and
//! returns [`tree::Page`]s in which every item is placed, every look is named by a class of
//! the one [`style`] table, and every text carries its face, anchor and width measured in the
//! embedded font ([`font`]). All layout decisions live here: type sizes, fitting and cutting
//! text to its box, wrapping, table columns and pagination, legend and label placement.
//!
//! ## The house
//! - [`tree`]: the page tree ([`Page`], [`Node`](tree::Node): group, text, line, path, rect,
//!   circle) that the renderers walk.
//! - [`style`]: class name → stroke, fill, dash, face; written once, printed by the SVG
//!   writer as the style sheet and resolved by the PDF writer.
//! - [`font`]: the embedded DejaVu Sans and the text measurer (real advance widths).
//! - [`developed`]: the developed winding diagram: view and strip mapping, bands, coils,
//!   labels, equalizers, then [`developed::nodes`] turns that geometry into tree nodes.
//! - [`sheet`]: the printed sheets ([`sheet_pages`]): page frame and pagination, title block,
//!   data block, legend, caution box, tables, the commutator end view, the winding order and
//!   the test and sign-off sheets (which print an armature test computed before layout). [`paper`] holds the paper sizes.
//! - [`screen`]: the diagram alone for a screen ([`draw_page`]).
//! - [`readings_plot`]: the armature test's readings round the commutator; [`front_plot`]:
//!   the designer's search, one figure against another, the Pareto front marked.
//!
//! ## Adding a drawing
//! Write a function here that takes `&Checked` and options and returns a [`Page`] (or adds
//! nodes to one), using the classes of [`style`] (add a rule there for a new look) and
//! [`tree::Text::new`] for every text, so that it is measured. Nothing in `render` needs to
//! change: `render::svg` and `render::pdf` only walk the tree.

pub mod developed;
pub mod font;
pub mod front_plot;
pub mod paper;
pub mod readings_plot;
pub mod screen;
pub mod sheet;
pub mod style;
pub mod tree;

pub use developed::{
    Diagram, DiagramOptions, WholeRefused, Window, layout_developed, printed_diagrams,
};
pub use paper::Paper;
pub use screen::draw_page;
pub use sheet::{SheetOptions, sheet_pages};
pub use tree::Page;
