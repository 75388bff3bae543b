//! The rules read file by file: module docs, unfinished work, where SQL and HTTP may
//! appear, file sizes, and the pure crates' dependencies.

use std::path::{Path, PathBuf};

use anyhow::{Context as _, Result};
use proc_macro2::{TokenStream, TokenTree};

use super::files::relative;
use super::{Findings, MAX_LINES, WARN_LINES};

/// Macros that mark unfinished work or debugging left behind (spelled in pieces so this
/// file does not trip its own rule).
const BANNED: [&str; 3] = [concat!("todo", "!("), concat!("unimplemented", "!("), concat!("dbg", "!(")];

/// The only server folder that may run SQL.
const SQL_HOME: &str = "server/src/store/";
/// Words that begin an SQL statement in a string.
const SQL_STARTS: [&str; 9] =
    ["SELECT ", "INSERT ", "UPDATE ", "DELETE ", "CREATE ", "DROP ", "ALTER ", "PRAGMA ", "WITH "];
/// rusqlite's calls that run SQL.
const SQL_CALLS: [&str; 6] = ["prepare", "prepare_cached", "execute", "execute_batch", "query_row", "query_map"];

/// The only server files that may know HTTP: the server's own surface, and the
/// responders' webhook (an outgoing call).
const HTTP_HOMES: [&str; 4] =
    ["server/src/handlers/", "server/src/router.rs", "server/src/error.rs", "server/src/notify/webhook.rs"];
/// Crates and names that are HTTP.
const HTTP_NAMES: [&str; 7] = ["axum", "http", "hyper", "tower", "tower_http", "reqwest", "StatusCode"];

/// Crates that must stay pure, and what they may not depend on.
const PURE_CRATES: [&str; 3] = ["shared-types", "species-key", "analysis"];
const IMPURE_DEPENDENCIES: [&str; 11] = [
    "axum",
    "tokio",
    "rusqlite",
    "hyper",
    "tower",
    "tower-http",
    "reqwest",
    "web-sys",
    "js-sys",
    "wasm-bindgen",
    "leptos",
];

/// Checks every file's own rules.
pub fn check_files(root: &Path, files: &[PathBuf], findings: &mut Findings) -> Result<()> {
    for file in files {
        let text = std::fs::read_to_string(file).with_context(|| format!("reading {}", file.display()))?;
        let name = relative(root, file);
        if !text.starts_with("//!") {
            findings.breaches.push(format!("{name}: does not open with a `//!` doc saying why it exists"));
        }
        for banned in BANNED {
            if text.contains(banned) {
                findings.breaches.push(format!("{name}: contains {banned}"));
            }
        }
        let lines = text.lines().count();
        if lines >= MAX_LINES {
            findings.breaches.push(format!("{name}: {lines} lines (split it; the limit is {MAX_LINES})"));
        } else if lines >= WARN_LINES {
            findings.warnings.push(format!("{name}: {lines} lines; consider splitting it"));
        }
        if name.starts_with("server/src/") {
            let tokens: TokenStream = text.parse().map_err(|err| anyhow::anyhow!("tokenising {name}: {err:?}"))?;
            let trees = flatten(tokens);
            if !name.starts_with(SQL_HOME) {
                findings.breaches.extend(sql_outside_store(&name, &trees));
            }
            if !HTTP_HOMES.iter().any(|home| name.starts_with(home)) {
                findings.breaches.extend(http_outside_handlers(&name, &trees));
            }
        }
    }
    Ok(())
}

/// Every token of a stream, groups opened, in order.
fn flatten(tokens: TokenStream) -> Vec<TokenTree> {
    let mut out = Vec::new();
    for tree in tokens {
        match tree {
            TokenTree::Group(group) => {
                out.push(TokenTree::Group(group.clone()));
                out.extend(flatten(group.stream()));
            }
            other => out.push(other),
        }
    }
    out
}

fn sql_outside_store(name: &str, trees: &[TokenTree]) -> Vec<String> {
    let mut found = Vec::new();
    for (i, tree) in trees.iter().enumerate() {
        match tree {
            TokenTree::Literal(literal) => {
                let text = literal.to_string();
                let body = text.trim_start_matches('r').trim_start_matches('#').trim_start_matches('"').trim_start();
                if text.starts_with(['"', 'r']) && SQL_STARTS.iter().any(|start| body.starts_with(start)) {
                    let shown: String = body.chars().take(40).collect();
                    found.push(format!("{name}: SQL outside server/src/store: \"{shown}…\""));
                }
            }
            TokenTree::Ident(ident) if SQL_CALLS.contains(&ident.to_string().as_str()) => {
                let after_dot = i > 0 && matches!(&trees[i - 1], TokenTree::Punct(p) if p.as_char() == '.');
                if after_dot {
                    found.push(format!("{name}: `.{ident}(` runs SQL outside server/src/store"));
                }
            }
            _ => {}
        }
    }
    found
}

fn http_outside_handlers(name: &str, trees: &[TokenTree]) -> Vec<String> {
    let mut found = Vec::new();
    for (i, tree) in trees.iter().enumerate() {
        let TokenTree::Ident(ident) = tree else { continue };
        let word = ident.to_string();
        if !HTTP_NAMES.contains(&word.as_str()) {
            continue;
        }
        let colon = |at: usize| matches!(trees.get(at), Some(TokenTree::Punct(p)) if p.as_char() == ':');
        let is_path_start = colon(i + 1) && colon(i + 2);
        let after_path = i > 0 && matches!(&trees[i - 1], TokenTree::Punct(p) if p.as_char() == ':');
        if word == "StatusCode" || (is_path_start && !after_path) {
            found.push(format!("{name}: HTTP (`{word}`) outside handlers/, router.rs, error.rs and notify/webhook.rs"));
        }
    }
    found.dedup();
    found
}

/// The pure crates' `[dependencies]` name no web server, database or browser crate.
pub fn check_pure_crates(root: &Path, findings: &mut Findings) -> Result<()> {
    for name in PURE_CRATES {
        let manifest = root.join(name).join("Cargo.toml");
        let text = std::fs::read_to_string(&manifest).with_context(|| format!("reading {}", manifest.display()))?;
        for dependency in dependencies(&text) {
            if IMPURE_DEPENDENCIES.contains(&dependency.as_str()) {
                findings.breaches.push(format!("{name}: depends on {dependency}, but it must stay pure Rust"));
            }
        }
    }
    Ok(())
}

/// The names in a manifest's `[dependencies]` table.
fn dependencies(manifest: &str) -> Vec<String> {
    let mut inside = false;
    let mut names = Vec::new();
    for line in manifest.lines().map(str::trim) {
        if line.starts_with('[') {
            inside = line == "[dependencies]";
        } else if inside && let Some((key, _)) = line.split_once('=') {
            names.push(key.trim().split('.').next().unwrap_or_default().to_owned());
        }
    }
    names
}

#[cfg(test)]
mod tests {
    use super::*;

    fn tokens(code: &str) -> Vec<TokenTree> {
        flatten(code.parse().unwrap())
    }

    #[test]
    fn sql_in_a_string_or_a_call_is_found() {
        let found = sql_outside_store("x.rs", &tokens(r#"fn f(c: &C) { c.query_row("SELECT 1", [], |_| Ok(())) }"#));
        assert_eq!(found.len(), 2, "{found:?}");
        assert!(sql_outside_store("x.rs", &tokens(r#"fn f() { prepare_photo("a selection") }"#)).is_empty());
    }

    #[test]
    fn http_paths_are_found_but_not_words_inside_other_paths() {
        assert_eq!(http_outside_handlers("x.rs", &tokens("use axum::Json;")).len(), 1);
        assert_eq!(http_outside_handlers("x.rs", &tokens("fn f() -> StatusCode { todo() }")).len(), 1);
        assert!(http_outside_handlers("x.rs", &tokens("use crate::store::http_like; let http = 1;")).is_empty());
        assert!(http_outside_handlers("x.rs", &tokens("struct S { http: Client }")).is_empty(), "a field is no path");
    }

    #[test]
    fn dependencies_are_read_from_their_table_only() {
        let manifest = "[package]\nname = \"x\"\n[dependencies]\nserde.workspace = true\naxum = \"0.8\"\n[dev-dependencies]\ntokio = \"1\"\n";
        assert_eq!(dependencies(manifest), ["serde", "axum"]);
    }
}
