//! The module graph of one crate, read from its source: which module each file is, and
//! which modules each file names through `crate::`, `super::`, `self::` or a child
//! module's name — in `use` items, in code and inside macro calls.

use std::collections::{BTreeMap, BTreeSet};
use std::path::{Path, PathBuf};

use anyhow::{Context as _, Result};
use proc_macro2::{TokenStream, TokenTree};
use syn::visit::Visit;

/// A module's path below the crate root: `["duplicates", "judge"]`; the root is empty.
pub type ModPath = Vec<String>;

/// One crate's modules and what each file refers to.
#[derive(Debug, Default)]
pub struct ModuleGraph {
    /// Every module that has a file of its own, and its file.
    pub files: BTreeMap<ModPath, PathBuf>,
    /// For each file's module, the modules its code names (the longest module prefix of
    /// each path, so `crate::store::Store` names `store`).
    pub uses: BTreeMap<ModPath, BTreeSet<ModPath>>,
}

impl ModuleGraph {
    /// Reads the crate whose sources are in `src` (with `lib.rs`, else `main.rs`, as root).
    pub fn read(src: &Path) -> Result<Self> {
        let mut graph = Self::default();
        let root_file = if src.join("lib.rs").exists() { "lib.rs" } else { "main.rs" };
        for file in super::files::rust_files(src)? {
            let relative = file.strip_prefix(src).unwrap_or(&file).to_string_lossy().replace('\\', "/");
            if (relative == "main.rs" && root_file == "lib.rs") || relative.starts_with("bin/") {
                continue; // a binary is a crate of its own, using the library by name
            }
            graph.files.insert(module_path(&relative, root_file), file);
        }
        let modules: BTreeSet<ModPath> = graph.files.keys().cloned().collect();
        for (module, file) in &graph.files {
            let text = std::fs::read_to_string(file).with_context(|| format!("reading {}", file.display()))?;
            let parsed = syn::parse_file(&text).with_context(|| format!("parsing {}", file.display()))?;
            let mut finder = PathFinder { here: module.clone(), inline: Vec::new(), found: Vec::new() };
            finder.visit_file(&parsed);
            let named = finder.found.iter().filter_map(|path| longest_module(&modules, path)).collect();
            graph.uses.insert(module.clone(), named);
        }
        Ok(graph)
    }

    /// The top-level module a module belongs to (`""` for the crate root).
    pub fn top(module: &ModPath) -> String {
        module.first().cloned().unwrap_or_default()
    }

    /// Every use between two different top-level modules: (from, to) → one file that
    /// makes it, for messages.
    pub fn top_level_edges(&self) -> BTreeMap<(String, String), ModPath> {
        let mut edges = BTreeMap::new();
        for (from, targets) in &self.uses {
            for to in targets {
                let (a, b) = (Self::top(from), Self::top(to));
                if a != b {
                    edges.entry((a, b)).or_insert_with(|| from.clone());
                }
            }
        }
        edges
    }

    /// Every use between two files, leaving out a module naming one of its own ancestors
    /// (a child using its parent's items is how a module shares its vocabulary).
    pub fn file_edges(&self) -> BTreeSet<(ModPath, ModPath)> {
        let mut edges = BTreeSet::new();
        for (from, targets) in &self.uses {
            for to in targets {
                if to != from && !from.starts_with(to) {
                    edges.insert((from.clone(), to.clone()));
                }
            }
        }
        edges
    }
}

/// `duplicates/judge.rs` → `["duplicates", "judge"]`; `intake/mod.rs` → `["intake"]`.
fn module_path(relative: &str, root_file: &str) -> ModPath {
    if relative == root_file {
        return Vec::new();
    }
    let without = relative.trim_end_matches(".rs");
    let mut parts: Vec<String> = without.split('/').map(str::to_owned).collect();
    if parts.last().is_some_and(|p| p == "mod") {
        parts.pop();
    }
    parts
}

/// The longest prefix of `path` that is a module with a file.
fn longest_module(modules: &BTreeSet<ModPath>, path: &[String]) -> Option<ModPath> {
    (0..=path.len()).rev().map(|n| path[..n].to_vec()).find(|prefix| modules.contains(prefix))
}

/// Collects every path the file names, made absolute (from the crate root).
struct PathFinder {
    /// The file's module.
    here: ModPath,
    /// Inline modules (`mod tests { … }`) the visitor is inside.
    inline: Vec<String>,
    found: Vec<ModPath>,
}

impl PathFinder {
    /// The module the code being visited is in.
    fn current(&self) -> ModPath {
        let mut current = self.here.clone();
        current.extend(self.inline.iter().cloned());
        current
    }

    /// Makes `segments` absolute; `None` for paths into other crates or local names.
    fn resolve(&self, segments: &[String]) -> Option<ModPath> {
        let (first, rest) = segments.split_first()?;
        let mut base = self.current();
        match first.as_str() {
            "crate" => base.clear(),
            "self" => {}
            "super" => {
                let mut rest = rest;
                base.pop();
                while rest.first().is_some_and(|s| s == "super") {
                    base.pop();
                    rest = &rest[1..];
                }
                base.extend(rest.iter().cloned());
                return Some(base);
            }
            _ => {
                // A child module's name used directly (`images::decode` in `intake/mod.rs`).
                base.push(first.clone());
                base.extend(rest.iter().cloned());
                return Some(base);
            }
        }
        base.extend(rest.iter().cloned());
        Some(base)
    }

    fn record(&mut self, segments: Vec<String>) {
        if let Some(path) = self.resolve(&segments) {
            self.found.push(path);
        }
    }

    /// `crate :: a :: b` and `super :: a` token runs inside macro calls (`view!`, `format!`).
    fn scan_tokens(&mut self, tokens: TokenStream) {
        let trees: Vec<TokenTree> = tokens.into_iter().collect();
        let mut i = 0;
        while i < trees.len() {
            if let TokenTree::Group(group) = &trees[i] {
                self.scan_tokens(group.stream());
            }
            if let TokenTree::Ident(ident) = &trees[i]
                && matches!(ident.to_string().as_str(), "crate" | "super")
            {
                let mut segments = vec![ident.to_string()];
                let mut j = i + 1;
                while let (Some(TokenTree::Punct(a)), Some(TokenTree::Punct(b)), Some(TokenTree::Ident(next))) =
                    (trees.get(j), trees.get(j + 1), trees.get(j + 2))
                {
                    if a.as_char() != ':' || b.as_char() != ':' {
                        break;
                    }
                    segments.push(next.to_string());
                    j += 3;
                }
                if segments.len() > 1 {
                    self.record(segments);
                }
                i = j;
                continue;
            }
            i += 1;
        }
    }
}

/// Flattens a `use` tree into whole paths: `a::{b, c::d}` → `a::b`, `a::c::d`.
fn flatten(tree: &syn::UseTree, prefix: &mut Vec<String>, out: &mut Vec<Vec<String>>) {
    match tree {
        syn::UseTree::Path(p) => {
            prefix.push(p.ident.to_string());
            flatten(&p.tree, prefix, out);
            prefix.pop();
        }
        syn::UseTree::Name(n) => {
            let mut path = prefix.clone();
            if n.ident != "self" {
                path.push(n.ident.to_string());
            }
            out.push(path);
        }
        syn::UseTree::Rename(r) => {
            let mut path = prefix.clone();
            path.push(r.ident.to_string());
            out.push(path);
        }
        syn::UseTree::Glob(_) => out.push(prefix.clone()),
        syn::UseTree::Group(g) => g.items.iter().for_each(|item| flatten(item, prefix, out)),
    }
}

impl<'ast> Visit<'ast> for PathFinder {
    fn visit_item_mod(&mut self, item: &'ast syn::ItemMod) {
        if item.content.is_some() {
            self.inline.push(item.ident.to_string());
            syn::visit::visit_item_mod(self, item);
            self.inline.pop();
        }
    }

    fn visit_item_use(&mut self, item: &'ast syn::ItemUse) {
        let mut paths = Vec::new();
        flatten(&item.tree, &mut Vec::new(), &mut paths);
        for path in paths {
            // `use a::b` names a child module `a` or another crate `a`; only `crate`,
            // `self`, `super` and child modules are this crate's, sorted out by the caller.
            if !path.is_empty() {
                self.record(path);
            }
        }
    }

    fn visit_path(&mut self, path: &'ast syn::Path) {
        if path.leading_colon.is_none() && path.segments.len() > 1 {
            self.record(path.segments.iter().map(|s| s.ident.to_string()).collect());
        }
        syn::visit::visit_path(self, path);
    }

    fn visit_macro(&mut self, mac: &'ast syn::Macro) {
        self.scan_tokens(mac.tokens.clone());
        syn::visit::visit_macro(self, mac);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn files_map_to_their_modules() {
        assert_eq!(module_path("lib.rs", "lib.rs"), Vec::<String>::new());
        assert_eq!(module_path("intake/mod.rs", "lib.rs"), ["intake"]);
        assert_eq!(module_path("duplicates/judge.rs", "lib.rs"), ["duplicates", "judge"]);
    }

    #[test]
    fn use_trees_flatten_into_paths() {
        let item: syn::ItemUse = syn::parse_str("use crate::{store::{self, Store}, taxa::TaxonIndex};").unwrap();
        let mut paths = Vec::new();
        flatten(&item.tree, &mut Vec::new(), &mut paths);
        let shown: Vec<String> = paths.iter().map(|p| p.join("::")).collect();
        assert_eq!(shown, ["crate::store", "crate::store::Store", "crate::taxa::TaxonIndex"]);
    }
}
