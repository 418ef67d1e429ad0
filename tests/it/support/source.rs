//! The tidy tests' reader of `src/`: every file parsed as Rust with `syn`, so that a rule
//! sees whole items (a `use` over several lines, a path inside a macro call) and never a
//! comment. [`crate_paths`] lists every path a file names into the crate, resolved from
//! `crate::`, `self::` and `super::` to a path from the crate root; [`calls`] lists the
//! functions, methods and macros a file calls outside its unit tests.

use std::path::Path;

use proc_macro2::{Span, TokenStream, TokenTree};
use syn::visit::Visit;

/// The repository's `src/`.
pub const SRC: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/src");

/// Every `.rs` file under `dir`, sorted, as (path relative to `dir` with `/`, text).
pub fn rust_files(dir: &str) -> Vec<(String, String)> {
    fn walk(dir: &Path, out: &mut Vec<std::path::PathBuf>) {
        let mut entries: Vec<_> = std::fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().path())
            .collect();
        entries.sort();
        for p in entries {
            if p.is_dir() {
                walk(&p, out);
            } else if p.extension().is_some_and(|e| e == "rs") {
                out.push(p);
            }
        }
    }
    let mut files = Vec::new();
    walk(Path::new(dir), &mut files);
    files
        .into_iter()
        .map(|p| {
            let rel = p
                .strip_prefix(dir)
                .unwrap()
                .to_string_lossy()
                .replace('\\', "/");
            (rel, std::fs::read_to_string(&p).unwrap())
        })
        .collect()
}

/// The module path of the file `rel` under `src/`: `winding/mod.rs` is `[winding]`,
/// `winding/trace.rs` is `[winding, trace]`, `lib.rs` is `[]`.
pub fn module_of(rel: &str) -> Vec<String> {
    let rel = rel.trim_end_matches(".rs");
    let mut parts: Vec<String> = rel.split('/').map(str::to_string).collect();
    if matches!(
        parts.last().map(String::as_str),
        Some("mod" | "lib" | "main")
    ) {
        parts.pop();
    }
    parts
}

/// A path named into the crate: its segments from the crate root (`*` for a glob) and the
/// line it is on.
#[derive(Debug, Clone, PartialEq)]
pub struct CratePath {
    pub line: usize,
    pub path: Vec<String>,
}

/// Parses `text`, panicking with the file name and syn's message if it is not Rust.
pub fn parse(rel: &str, text: &str) -> syn::File {
    syn::parse_file(text).unwrap_or_else(|e| {
        let at = e.span().start();
        panic!("src/{rel}:{}:{}: not parsed: {e}", at.line, at.column + 1)
    })
}

/// Every path the file `rel` (under `src/`) names into the crate: every leaf of every `use`
/// tree, every path in code (types, expressions, patterns, visibilities) and every
/// `crate`/`self`/`super` path in a macro's tokens, resolved to the crate root. Paths that
/// start elsewhere (`std::…`, a local name) are left out.
pub fn crate_paths(rel: &str, text: &str) -> Vec<CratePath> {
    let file = parse(rel, text);
    let mut v = Paths {
        module: module_of(rel),
        found: Vec::new(),
    };
    v.visit_file(&file);
    v.found
}

struct Paths {
    /// The module the visitor is in (the file's, plus any inline `mod`).
    module: Vec<String>,
    found: Vec<CratePath>,
}

impl Paths {
    /// Resolves `segments` (as written) against the current module; `None` for a path that
    /// does not start at `crate`, `self` or `super`.
    fn resolve(&self, segments: &[String]) -> Option<Vec<String>> {
        let first = segments.first()?;
        let mut base = match first.as_str() {
            "crate" => Vec::new(),
            "self" | "super" => self.module.clone(),
            _ => return None,
        };
        let mut rest = &segments[1..];
        if first == "super" {
            base.pop()?;
        }
        while rest.first().is_some_and(|s| s == "super") {
            base.pop()?;
            rest = &rest[1..];
        }
        base.extend(rest.iter().cloned());
        Some(base)
    }

    fn push(&mut self, span: Span, segments: &[String]) {
        if let Some(path) = self.resolve(segments) {
            self.found.push(CratePath {
                line: span.start().line,
                path,
            });
        }
    }

    /// Walks a `use` tree under `prefix`, pushing every leaf.
    fn use_tree(&mut self, tree: &syn::UseTree, prefix: &mut Vec<String>) {
        match tree {
            syn::UseTree::Path(p) => {
                prefix.push(p.ident.to_string());
                self.use_tree(&p.tree, prefix);
                prefix.pop();
            }
            syn::UseTree::Name(n) => self.use_leaf(prefix, n.ident.to_string(), n.ident.span()),
            syn::UseTree::Rename(r) => self.use_leaf(prefix, r.ident.to_string(), r.ident.span()),
            syn::UseTree::Glob(g) => self.use_leaf(prefix, "*".to_string(), g.star_token.spans[0]),
            syn::UseTree::Group(g) => {
                for t in &g.items {
                    self.use_tree(t, prefix);
                }
            }
        }
    }

    fn use_leaf(&mut self, prefix: &[String], leaf: String, span: Span) {
        let mut segments = prefix.to_vec();
        // `use crate::a::{self, b}`: `self` names `a` itself.
        if leaf != "self" || segments.is_empty() {
            segments.push(leaf);
        }
        self.push(span, &segments);
    }

    /// Every `crate`/`self`/`super` path in a macro's tokens (`a :: b :: c` runs).
    fn tokens(&mut self, tokens: TokenStream) {
        let trees: Vec<TokenTree> = tokens.into_iter().collect();
        let mut i = 0;
        while i < trees.len() {
            match &trees[i] {
                TokenTree::Group(g) => self.tokens(g.stream()),
                TokenTree::Ident(id) => {
                    let start_ok = i == 0 || !is_colon(&trees[i - 1]);
                    let name = id.to_string();
                    if start_ok && matches!(name.as_str(), "crate" | "self" | "super") {
                        let mut segments = vec![name];
                        let mut j = i + 1;
                        while j + 2 < trees.len() && is_colon(&trees[j]) && is_colon(&trees[j + 1])
                        {
                            match &trees[j + 2] {
                                TokenTree::Ident(next) => segments.push(next.to_string()),
                                TokenTree::Group(g) => {
                                    // `crate::{a, b}` inside a macro: each name in the group.
                                    for t in g.stream() {
                                        if let TokenTree::Ident(n) = t {
                                            let mut s = segments.clone();
                                            s.push(n.to_string());
                                            self.push(n.span(), &s);
                                        }
                                    }
                                    break;
                                }
                                _ => break,
                            }
                            j += 3;
                        }
                        if segments.len() > 1 {
                            self.push(id.span(), &segments);
                        }
                        i = j;
                        continue;
                    }
                }
                _ => {}
            }
            i += 1;
        }
    }
}

fn is_colon(t: &TokenTree) -> bool {
    matches!(t, TokenTree::Punct(p) if p.as_char() == ':')
}

impl<'ast> Visit<'ast> for Paths {
    fn visit_item_use(&mut self, u: &'ast syn::ItemUse) {
        self.use_tree(&u.tree, &mut Vec::new());
    }

    fn visit_path(&mut self, p: &'ast syn::Path) {
        let segments: Vec<String> = p.segments.iter().map(|s| s.ident.to_string()).collect();
        if let Some(first) = p.segments.first() {
            self.push(first.ident.span(), &segments);
        }
        syn::visit::visit_path(self, p);
    }

    fn visit_macro(&mut self, m: &'ast syn::Macro) {
        self.tokens(m.tokens.clone());
        syn::visit::visit_macro(self, m);
    }

    fn visit_item_mod(&mut self, m: &'ast syn::ItemMod) {
        self.module.push(m.ident.to_string());
        syn::visit::visit_item_mod(self, m);
        self.module.pop();
    }
}

/// A call in a file: the function's last path segment (`trace_winding` for
/// `crate::winding::trace_winding(…)`), a method's name, or a macro's name with `!`.
#[derive(Debug, Clone, PartialEq)]
pub struct Call {
    pub line: usize,
    pub name: String,
}

/// Every call in `text` outside items marked `#[cfg(test)]` (unit tests may drive the
/// pipeline to build their input).
pub fn calls(rel: &str, text: &str) -> Vec<Call> {
    let file = parse(rel, text);
    let mut v = Calls(Vec::new());
    v.visit_file(&file);
    v.0
}

struct Calls(Vec<Call>);

fn is_test_only(attrs: &[syn::Attribute]) -> bool {
    attrs.iter().any(|a| {
        a.path().is_ident("cfg")
            && a.meta.require_list().is_ok_and(|l| {
                let t = l.tokens.to_string();
                t == "test" || t.starts_with("test ") || t.starts_with("test,")
            })
    })
}

impl<'ast> Visit<'ast> for Calls {
    fn visit_item(&mut self, i: &'ast syn::Item) {
        let attrs = match i {
            syn::Item::Mod(m) => &m.attrs,
            syn::Item::Fn(f) => &f.attrs,
            syn::Item::Impl(x) => &x.attrs,
            syn::Item::Use(u) => &u.attrs,
            _ => return syn::visit::visit_item(self, i),
        };
        if !is_test_only(attrs) {
            syn::visit::visit_item(self, i);
        }
    }

    fn visit_expr_call(&mut self, c: &'ast syn::ExprCall) {
        if let syn::Expr::Path(p) = &*c.func
            && let Some(last) = p.path.segments.last()
        {
            self.0.push(Call {
                line: last.ident.span().start().line,
                name: last.ident.to_string(),
            });
        }
        syn::visit::visit_expr_call(self, c);
    }

    fn visit_expr_method_call(&mut self, c: &'ast syn::ExprMethodCall) {
        self.0.push(Call {
            line: c.method.span().start().line,
            name: c.method.to_string(),
        });
        syn::visit::visit_expr_method_call(self, c);
    }

    fn visit_macro(&mut self, m: &'ast syn::Macro) {
        if let Some(last) = m.path.segments.last() {
            self.0.push(Call {
                line: last.ident.span().start().line,
                name: format!("{}!", last.ident),
            });
        }
        // Calls inside a macro's arguments (`format!("{}", f(x))`): read them as expressions
        // where they parse as such.
        let parser = syn::punctuated::Punctuated::<syn::Expr, syn::Token![,]>::parse_terminated;
        if let Ok(args) = syn::parse::Parser::parse2(parser, m.tokens.clone()) {
            for e in &args {
                self.visit_expr(e);
            }
        }
        syn::visit::visit_macro(self, m);
    }
}

/// A function and its length: from its `fn` line to its closing brace, lines counted whole.
#[derive(Debug, Clone, PartialEq)]
pub struct FnLength {
    pub name: String,
    pub line: usize,
    pub lines: usize,
}

/// Every function and method of the file `rel` (free functions, methods in `impl` and
/// `trait` blocks, and functions nested in other functions), with its length in lines.
pub fn fn_lengths(rel: &str, text: &str) -> Vec<FnLength> {
    struct Lengths(Vec<FnLength>);
    impl Lengths {
        fn add(&mut self, name: &syn::Ident, sig: Span, body: Span) {
            let (from, to) = (sig.start().line, body.end().line);
            self.0.push(FnLength {
                name: name.to_string(),
                line: from,
                lines: to + 1 - from,
            });
        }
    }
    impl<'ast> Visit<'ast> for Lengths {
        fn visit_item_fn(&mut self, f: &'ast syn::ItemFn) {
            self.add(
                &f.sig.ident,
                f.sig.fn_token.span,
                f.block.brace_token.span.close(),
            );
            syn::visit::visit_item_fn(self, f);
        }
        fn visit_impl_item_fn(&mut self, f: &'ast syn::ImplItemFn) {
            self.add(
                &f.sig.ident,
                f.sig.fn_token.span,
                f.block.brace_token.span.close(),
            );
            syn::visit::visit_impl_item_fn(self, f);
        }
        fn visit_trait_item_fn(&mut self, f: &'ast syn::TraitItemFn) {
            if let Some(b) = &f.default {
                self.add(
                    &f.sig.ident,
                    f.sig.fn_token.span,
                    b.brace_token.span.close(),
                );
            }
            syn::visit::visit_trait_item_fn(self, f);
        }
    }
    let mut v = Lengths(Vec::new());
    v.visit_file(&parse(rel, text));
    v.0
}
