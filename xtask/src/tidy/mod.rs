//! The workspace's written rules, checked as code rather than remembered by reviewers:
//! `cargo xtask tidy` prints what they find, and `cargo test -p xtask` fails on any
//! breach (so the README test command enforces them).
//!
//! - every Rust file opens with a `//!` doc saying why it exists;
//! - no `todo!`, `unimplemented!` or `dbg!` is left behind;
//! - only `server/src/store/` runs SQL; only `server/src/handlers/`, `router.rs` and
//!   `error.rs` know HTTP (and `notify/webhook.rs`, which calls out);
//! - the pure crates (`shared-types`, `species-key`, `analysis`) depend on no web
//!   server, database or browser crate;
//! - modules use only modules on their own layer or below ([`layers`]), with no import
//!   circles;
//! - files stay readable: a warning from [`WARN_LINES`] lines, a breach from
//!   [`MAX_LINES`].

pub mod files;
pub mod graph;
pub mod layers;
pub mod rules;

use std::path::Path;

use anyhow::Result;

/// A file this long is worth splitting; `cargo xtask tidy` says so.
pub const WARN_LINES: usize = 600;
/// A file this long hides its structure; the tidy test fails.
pub const MAX_LINES: usize = 1000;

/// What the checks found: breaches fail the test, warnings are printed.
#[derive(Debug, Default)]
pub struct Findings {
    pub breaches: Vec<String>,
    pub warnings: Vec<String>,
}

/// Runs every check over the workspace at `root`.
pub fn check(root: &Path) -> Result<Findings> {
    let sources = files::workspace_sources(root)?;
    let mut findings = Findings::default();
    rules::check_files(root, &sources, &mut findings)?;
    rules::check_pure_crates(root, &mut findings)?;
    for layering in layers::LAYERINGS {
        let crate_root = root.join(layering.src);
        let graph = graph::ModuleGraph::read(&crate_root)?;
        findings.breaches.extend(layers::check(layering, &graph));
    }
    Ok(findings)
}

/// `cargo xtask tidy`: prints the module layers of each checked crate, the warnings and
/// the breaches; fails when there is a breach.
pub fn run(root: &Path) -> Result<()> {
    for layering in layers::LAYERINGS {
        let graph = graph::ModuleGraph::read(&root.join(layering.src))?;
        println!("{}", layers::describe(layering, &graph));
    }
    let findings = check(root)?;
    for warning in &findings.warnings {
        println!("warning: {warning}");
    }
    for breach in &findings.breaches {
        println!("breach: {breach}");
    }
    if !findings.breaches.is_empty() {
        anyhow::bail!("{} breaches of the workspace's rules", findings.breaches.len());
    }
    println!("tidy: every rule holds ({} warnings)", findings.warnings.len());
    Ok(())
}

#[cfg(test)]
mod tests {
    #[test]
    fn the_workspace_keeps_its_rules() {
        let findings = super::check(&crate::root()).expect("reading the workspace");
        assert!(findings.breaches.is_empty(), "breaches of the workspace's rules:\n{}", findings.breaches.join("\n"));
    }
}
