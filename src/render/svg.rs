//! SVG of a page tree: a plain walk that writes every node as one element.
//!
//! Part of the `render` stage. Nothing is decided here: positions, sizes, texts and classes
//! come from the `layout` page tree, and the `<style>` sheet is the layout's style table
//! printed as CSS. Printed sheets are sized in millimetres with a matching viewBox so that
//! they print at true scale; the screen diagram is sized in pixels. Every text is escaped.

use crate::layout::style::{Anchor, Decl, Selector, style_table};
use crate::layout::tree::{Node, Page, PageUnit, PathOp};

use super::svg_writer::{MM_DECIMALS, SvgWriter, Val};
use crate::base::number::fmt_trimmed;

/// The style table as a CSS style sheet, rule by rule.
pub fn style_sheet() -> String {
    let mut css = String::new();
    for rule in style_table() {
        let sels: Vec<String> = rule
            .selectors
            .iter()
            .map(|s| match s {
                Selector::Text => "text".to_string(),
                Selector::Class(c) => format!(".{c}"),
                Selector::Inside(a, c) => format!(".{a} .{c}"),
            })
            .collect();
        let decls: Vec<String> = rule.decls.iter().map(decl_css).collect();
        css.push_str(&sels.join(","));
        css.push('{');
        css.push_str(&decls.join(";"));
        css.push('}');
    }
    css
}

fn colour(c: Option<&str>) -> &str {
    c.unwrap_or("none")
}

fn dash_css(d: &[f64]) -> String {
    if d.is_empty() {
        "none".to_string()
    } else {
        d.iter()
            .map(|&x| fmt_trimmed(x, MM_DECIMALS))
            .collect::<Vec<_>>()
            .join(" ")
    }
}

fn decl_css(d: &Decl) -> String {
    match d {
        Decl::FontFamily => "font-family:'DejaVu Sans',Verdana,sans-serif".to_string(),
        Decl::Fill(c) => format!("fill:{}", colour(*c)),
        Decl::Stroke(c) => format!("stroke:{}", colour(*c)),
        Decl::StrokeWidth(w) => format!("stroke-width:{}", fmt_trimmed(*w, MM_DECIMALS)),
        Decl::Dash(a) => format!("stroke-dasharray:{}", dash_css(a)),
        Decl::RoundCap => "stroke-linecap:round".to_string(),
        Decl::RoundJoin => "stroke-linejoin:round".to_string(),
        Decl::StrokeUnder => "paint-order:stroke".to_string(),
        Decl::Bold => "font-weight:bold".to_string(),
        Decl::Anchor(a) => format!(
            "text-anchor:{}",
            match a {
                Anchor::Start => "start",
                Anchor::Middle => "middle",
                Anchor::End => "end",
            }
        ),
    }
}

/// The SVG document of `page`.
pub fn page_svg(page: &Page) -> String {
    let mut w = SvgWriter::new();
    w.raw("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    let (wd, ht) = match page.unit {
        PageUnit::Millimetres => (
            format!("{}mm", fmt_trimmed(page.width_mm, MM_DECIMALS)),
            format!("{}mm", fmt_trimmed(page.height_mm, MM_DECIMALS)),
        ),
        PageUnit::Pixels(k) => (
            format!("{}px", fmt_trimmed(page.width_mm * k, MM_DECIMALS)),
            format!("{}px", fmt_trimmed(page.height_mm * k, MM_DECIMALS)),
        ),
    };
    let mut attrs: Vec<(&str, Val<'_>)> = vec![
        ("xmlns", "http://www.w3.org/2000/svg".into()),
        ("width", wd.into()),
        ("height", ht.into()),
        (
            "viewBox",
            format!(
                "0 0 {} {}",
                fmt_trimmed(page.width_mm, MM_DECIMALS),
                fmt_trimmed(page.height_mm, MM_DECIMALS)
            )
            .into(),
        ),
    ];
    for (k, v) in &page.data {
        attrs.push((k, v.as_str().into()));
    }
    w.open("svg", &attrs);
    w.text_elem("style", &[], &style_sheet());
    for n in &page.children {
        node(&mut w, n);
    }
    w.close("svg");
    w.finish()
}

fn data<'a>(attrs: &mut Vec<(&'a str, Val<'a>)>, data: &'a [(&'static str, String)]) {
    for (k, v) in data {
        attrs.push((k, v.as_str().into()));
    }
}

fn path_d(ops: &[PathOp]) -> String {
    let mut d = String::with_capacity(ops.len() * 14);
    for op in ops {
        match *op {
            PathOp::Move(x, y) | PathOp::Line(x, y) => {
                d.push(if matches!(op, PathOp::Move(..)) {
                    'M'
                } else {
                    'L'
                });
                d.push_str(&fmt_trimmed(x, MM_DECIMALS));
                d.push(' ');
                d.push_str(&fmt_trimmed(y, MM_DECIMALS));
            }
            PathOp::Close => d.push('Z'),
        }
    }
    d
}

/// A group: its id, class, data attributes and translation, then its children.
fn group(w: &mut SvgWriter, g: &crate::layout::tree::Group) {
    let mut attrs: Vec<(&str, Val<'_>)> = Vec::new();
    if let Some(id) = &g.id {
        attrs.push(("id", id.as_str().into()));
    }
    if let Some(c) = &g.class {
        attrs.push(("class", c.as_str().into()));
    }
    data(&mut attrs, &g.data);
    if let Some((x, y)) = g.translate {
        attrs.push((
            "transform",
            format!(
                "translate({} {})",
                fmt_trimmed(x, MM_DECIMALS),
                fmt_trimmed(y, MM_DECIMALS)
            )
            .into(),
        ));
    }
    w.open("g", &attrs);
    for c in &g.children {
        node(w, c);
    }
    w.close("g");
}

fn node(w: &mut SvgWriter, n: &Node) {
    match n {
        Node::Group(g) => group(w, g),
        Node::Text(t) => {
            let mut attrs: Vec<(&str, Val<'_>)> = vec![("x", t.x.into()), ("y", t.y.into())];
            if t.class_first {
                attrs.push(("class", t.class.as_str().into()));
                attrs.push(("font-size", t.size_mm.into()));
            } else {
                attrs.push(("font-size", t.size_mm.into()));
                if !t.class.is_empty() {
                    attrs.push(("class", t.class.as_str().into()));
                }
            }
            data(&mut attrs, &t.data);
            if let Some(f) = t.fill {
                attrs.push(("fill", f.into()));
            }
            if let Some(deg) = t.rotate {
                attrs.push((
                    "transform",
                    format!(
                        "rotate({} {} {})",
                        fmt_trimmed(deg, MM_DECIMALS),
                        fmt_trimmed(t.x, MM_DECIMALS),
                        fmt_trimmed(t.y, MM_DECIMALS)
                    )
                    .into(),
                ));
            }
            w.text_elem("text", &attrs, &t.content);
        }
        Node::Line(l) => {
            let mut attrs: Vec<(&str, Val<'_>)> = vec![("class", l.class.as_str().into())];
            data(&mut attrs, &l.data);
            attrs.extend([
                ("x1", l.from.0.into()),
                ("y1", l.from.1.into()),
                ("x2", l.to.0.into()),
                ("y2", l.to.1.into()),
            ]);
            if let Some(s) = l.stroke {
                attrs.push(("stroke", s.into()));
            }
            if let Some(d) = l.dash {
                attrs.push(("stroke-dasharray", dash_css(d).into()));
            }
            w.empty("line", &attrs);
        }
        Node::Path(p) => {
            let mut attrs: Vec<(&str, Val<'_>)> = Vec::new();
            if let Some(c) = &p.class {
                attrs.push(("class", c.as_str().into()));
            }
            data(&mut attrs, &p.data);
            attrs.push(("d", path_d(&p.ops).into()));
            if let Some(f) = p.fill {
                attrs.push(("fill", f.into()));
            }
            w.empty("path", &attrs);
        }
        Node::Rect(r) => {
            let geometry: [(&str, Val<'_>); 4] = [
                ("x", r.x.into()),
                ("y", r.y.into()),
                ("width", r.w.into()),
                ("height", r.h.into()),
            ];
            let mut attrs: Vec<(&str, Val<'_>)> = Vec::new();
            if let Some(f) = r.fill {
                attrs.extend(geometry);
                attrs.push(("fill", f.into()));
                if let Some(c) = &r.class {
                    attrs.push(("class", c.as_str().into()));
                }
            } else {
                if let Some(c) = &r.class {
                    attrs.push(("class", c.as_str().into()));
                }
                attrs.extend(geometry);
            }
            w.empty("rect", &attrs);
        }
        Node::Circle(c) => {
            w.empty(
                "circle",
                &[
                    ("class", c.class.as_str().into()),
                    ("cx", c.cx.into()),
                    ("cy", c.cy.into()),
                    ("r", c.r.into()),
                ],
            );
        }
    }
}
