//! The page tree: every drawing and sheet fully resolved into positioned, styled items.
//!
//! Part of the `layout` stage; it is what layout hands to the renderers. A [`Page`] holds
//! [`Node`]s in paint order, every coordinate in millimetres from the page's top-left corner
//! (a [`Group`] may shift its children by a translation). Looks are named by class; the
//! classes resolve through the one style table in [`super::style`]. Every [`Text`] carries its
//! face, its anchor and its width as measured in the embedded font, so a renderer never
//! measures, fits, wraps or decides anything: it walks the tree and writes bytes.

use super::font::{Weight, text_width};
use super::style::{Anchor, text_face};

/// Ordered data attributes (`data-coil="12"`), written in order.
pub type Data = Vec<(&'static str, String)>;

/// What a page shows.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PageKind {
    /// `armsheet draw`: the developed diagram alone, for a screen.
    Screen,
    /// Sheet 1: the developed diagram with the title, data and legend blocks.
    Diagram,
    /// The commutator end view.
    CommutatorEnd,
    /// The coil making: the coil for the former, the wire to order, the slot insulation.
    CoilMaking,
    /// A page of the winding order with check-off boxes.
    WindingOrder,
    /// The winding data in full, when sheet 1 cannot hold every row.
    WindingData,
    /// A page of the connection table.
    Connections,
    /// A page of the equalizer table.
    Equalizers,
    /// A test and sign-off sheet: the expected bar-to-bar readings with boxes for the measured
    /// ones; the first also the insulation and withstand tests, notes and signatures.
    Tests,
    /// `armsheet test`: the readings round the commutator.
    TestPlot,
    /// `armsheet explore --plot`: the search's candidates, one figure against another.
    FrontPlot,
}

impl PageKind {
    /// The page's name in the root `data-page` attribute: `developed`, `commutator-end`, `coil-making`, `winding-order`, `winding-data`,
    /// `connections`, `equalizers`, `tests`, `test-readings` or `search-front`.
    pub fn data_page(self) -> &'static str {
        match self {
            PageKind::Screen | PageKind::Diagram => "developed",
            PageKind::CommutatorEnd => "commutator-end",
            PageKind::CoilMaking => "coil-making",
            PageKind::WindingOrder => "winding-order",
            PageKind::WindingData => "winding-data",
            PageKind::Connections => "connections",
            PageKind::Equalizers => "equalizers",
            PageKind::Tests => "tests",
            PageKind::TestPlot => "test-readings",
            PageKind::FrontPlot => "search-front",
        }
    }
}

/// How the page's size is declared to a viewer.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum PageUnit {
    /// True size in millimetres (a printed sheet).
    Millimetres,
    /// Screen pixels, this many to the millimetre.
    Pixels(f64),
}

/// One page: a sheet, or the screen diagram.
#[derive(Clone, Debug, PartialEq)]
pub struct Page {
    /// What the page shows.
    pub kind: PageKind,
    /// A short title (the job, or the sheet's name).
    pub title: String,
    /// The document's title, from the job (the PDF's title).
    pub document: String,
    /// Width, mm.
    pub width_mm: f64,
    /// Height, mm.
    pub height_mm: f64,
    /// How the size is declared.
    pub unit: PageUnit,
    /// Data attributes of the page (e.g. `data-paper`).
    pub data: Data,
    /// The content, in paint order.
    pub children: Vec<Node>,
}

/// An item on a page.
#[derive(Clone, Debug, PartialEq)]
pub enum Node {
    /// A group of items.
    Group(Group),
    /// A line of text.
    Text(Text),
    /// A straight line.
    Line(Line),
    /// A path of straight pieces.
    Path(Path),
    /// An axis-aligned rectangle.
    Rect(Rect),
    /// A circle.
    Circle(Circle),
}

/// A group: an id and classes from the domain, data attributes, children.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Group {
    /// Id (`coil-12`, `seg-7`, `title-block`).
    pub id: Option<String>,
    /// Classes, space-separated; children inherit their looks.
    pub class: Option<String>,
    /// Data attributes.
    pub data: Data,
    /// Shift of the children, mm.
    pub translate: Option<(f64, f64)>,
    /// The items, in paint order.
    pub children: Vec<Node>,
}

impl Group {
    /// A group with an id.
    pub fn id(id: impl Into<String>) -> Group {
        Group {
            id: Some(id.into()),
            ..Group::default()
        }
    }

    /// A group with classes.
    pub fn class(class: impl Into<String>) -> Group {
        Group {
            class: Some(class.into()),
            ..Group::default()
        }
    }

    /// Adds classes.
    pub fn with_class(mut self, class: impl Into<String>) -> Group {
        self.class = Some(class.into());
        self
    }

    /// Adds a data attribute.
    pub fn with_data(mut self, key: &'static str, value: impl ToString) -> Group {
        self.data.push((key, value.to_string()));
        self
    }

    /// Appends a child.
    pub fn push(&mut self, node: impl Into<Node>) {
        self.children.push(node.into());
    }
}

/// A line of text, its baseline starting, centred or ending at (x, y).
#[derive(Clone, Debug, PartialEq)]
pub struct Text {
    /// Anchor x, mm.
    pub x: f64,
    /// Baseline y, mm.
    pub y: f64,
    /// Font size (em), mm.
    pub size_mm: f64,
    /// Classes (may be empty).
    pub class: String,
    /// Data attributes.
    pub data: Data,
    /// A fill given on the element itself (the style table still wins, as in CSS).
    pub fill: Option<&'static str>,
    /// Rotation in degrees about (x, y), clockwise on the page.
    pub rotate: Option<f64>,
    /// The class is declared before the size (the screen title's attribute order).
    pub class_first: bool,
    /// The face, from the style table.
    pub weight: Weight,
    /// The anchor, from the style table.
    pub anchor: Anchor,
    /// Advance width in the embedded font, mm.
    pub width_mm: f64,
    /// The characters.
    pub content: String,
}

impl Text {
    /// Text at (x, y) of `size` mm in the looks of `class`; face, anchor and width resolved.
    pub fn new(x: f64, y: f64, size: f64, class: &str, content: impl Into<String>) -> Text {
        let content = content.into();
        let (weight, anchor) = text_face(class);
        Text {
            x,
            y,
            size_mm: size,
            class: class.to_string(),
            data: Vec::new(),
            fill: None,
            rotate: None,
            class_first: false,
            weight,
            anchor,
            width_mm: text_width(&content, size, weight),
            content,
        }
    }

    /// Turned by `deg` degrees about its anchor.
    pub fn rotated(mut self, deg: f64) -> Text {
        self.rotate = Some(deg);
        self
    }

    /// With a data attribute.
    pub fn with_data(mut self, key: &'static str, value: impl ToString) -> Text {
        self.data.push((key, value.to_string()));
        self
    }

    /// Left and right x of the inked advance, before rotation, mm.
    pub fn span(&self) -> (f64, f64) {
        let left = match self.anchor {
            Anchor::Start => self.x,
            Anchor::Middle => self.x - self.width_mm / 2.0,
            Anchor::End => self.x - self.width_mm,
        };
        (left, left + self.width_mm)
    }
}

/// A straight line.
#[derive(Clone, Debug, PartialEq)]
pub struct Line {
    /// Classes.
    pub class: String,
    /// Data attributes.
    pub data: Data,
    /// Start, mm.
    pub from: (f64, f64),
    /// End, mm.
    pub to: (f64, f64),
    /// A stroke colour given on the element itself (a legend sample).
    pub stroke: Option<&'static str>,
    /// A dash pattern given on the element itself, mm.
    pub dash: Option<&'static [f64]>,
}

impl Line {
    /// A line in the looks of `class`.
    pub fn new(class: &str, from: (f64, f64), to: (f64, f64)) -> Line {
        Line {
            class: class.to_string(),
            data: Vec::new(),
            from,
            to,
            stroke: None,
            dash: None,
        }
    }
}

/// A step of a path.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum PathOp {
    /// Start a piece at (x, y).
    Move(f64, f64),
    /// A straight line to (x, y).
    Line(f64, f64),
    /// Close the piece.
    Close,
}

/// A path of straight pieces.
#[derive(Clone, Debug, PartialEq)]
pub struct Path {
    /// Classes.
    pub class: Option<String>,
    /// Data attributes.
    pub data: Data,
    /// The steps.
    pub ops: Vec<PathOp>,
    /// A fill given on the element itself.
    pub fill: Option<&'static str>,
}

impl Path {
    /// An open polyline through `pts` in the looks of `class`.
    pub fn polyline(class: &str, pts: &[(f64, f64)]) -> Path {
        let ops = pts
            .iter()
            .enumerate()
            .map(|(i, &(x, y))| {
                if i == 0 {
                    PathOp::Move(x, y)
                } else {
                    PathOp::Line(x, y)
                }
            })
            .collect();
        Path {
            class: Some(class.to_string()),
            data: Vec::new(),
            ops,
            fill: None,
        }
    }

    /// A closed triangle.
    pub fn triangle(class: Option<&str>, pts: [(f64, f64); 3]) -> Path {
        Path {
            class: class.map(str::to_string),
            data: Vec::new(),
            ops: vec![
                PathOp::Move(pts[0].0, pts[0].1),
                PathOp::Line(pts[1].0, pts[1].1),
                PathOp::Line(pts[2].0, pts[2].1),
                PathOp::Close,
            ],
            fill: None,
        }
    }
}

/// An axis-aligned rectangle.
#[derive(Clone, Debug, PartialEq)]
pub struct Rect {
    /// Classes.
    pub class: Option<String>,
    /// Left, mm.
    pub x: f64,
    /// Top, mm.
    pub y: f64,
    /// Width, mm.
    pub w: f64,
    /// Height, mm.
    pub h: f64,
    /// A fill given on the element itself.
    pub fill: Option<&'static str>,
}

impl Rect {
    /// A rectangle in the looks of `class`.
    pub fn new(class: &str, x: f64, y: f64, w: f64, h: f64) -> Rect {
        Rect {
            class: Some(class.to_string()),
            x,
            y,
            w,
            h,
            fill: None,
        }
    }

    /// A rectangle filled with `fill` and no class.
    pub fn filled(fill: &'static str, x: f64, y: f64, w: f64, h: f64) -> Rect {
        Rect {
            class: None,
            x,
            y,
            w,
            h,
            fill: Some(fill),
        }
    }
}

/// A circle.
#[derive(Clone, Debug, PartialEq)]
pub struct Circle {
    /// Classes.
    pub class: String,
    /// Centre x, mm.
    pub cx: f64,
    /// Centre y, mm.
    pub cy: f64,
    /// Radius, mm.
    pub r: f64,
}

impl Circle {
    /// A circle in the looks of `class`.
    pub fn new(class: &str, cx: f64, cy: f64, r: f64) -> Circle {
        Circle {
            class: class.to_string(),
            cx,
            cy,
            r,
        }
    }
}

macro_rules! into_node {
    ($($t:ident),*) => {$(
        impl From<$t> for Node {
            fn from(n: $t) -> Node {
                Node::$t(n)
            }
        }
    )*};
}
into_node!(Group, Text, Line, Path, Rect, Circle);

impl Page {
    /// Every text on the page with its absolute anchor (group shifts applied).
    pub fn texts(&self) -> Vec<(f64, f64, &Text)> {
        fn walk<'a>(nodes: &'a [Node], dx: f64, dy: f64, out: &mut Vec<(f64, f64, &'a Text)>) {
            for n in nodes {
                match n {
                    Node::Group(g) => {
                        let (tx, ty) = g.translate.unwrap_or((0.0, 0.0));
                        walk(&g.children, dx + tx, dy + ty, out);
                    }
                    Node::Text(t) => out.push((dx, dy, t)),
                    _ => {}
                }
            }
        }
        let mut out = Vec::new();
        walk(&self.children, 0.0, 0.0, &mut out);
        out
    }
}
