//! Which files the rules look at: every `.rs` file of the workspace's crates, never
//! build output or installed packages.

use std::path::{Path, PathBuf};

use anyhow::{Context as _, Result};

/// Folders never searched: build output, installed packages, version control.
const SKIPPED: [&str; 4] = ["target", "node_modules", ".git", "venv"];

/// Every `.rs` file under `dir`, sorted.
pub fn rust_files(dir: &Path) -> Result<Vec<PathBuf>> {
    let mut found = Vec::new();
    collect(dir, &mut found)?;
    found.sort();
    Ok(found)
}

fn collect(dir: &Path, found: &mut Vec<PathBuf>) -> Result<()> {
    for entry in std::fs::read_dir(dir).with_context(|| format!("listing {}", dir.display()))? {
        let path = entry.with_context(|| format!("listing {}", dir.display()))?.path();
        let name = path.file_name().and_then(|n| n.to_str()).unwrap_or_default();
        if path.is_dir() {
            if !SKIPPED.contains(&name) && !name.starts_with('.') {
                collect(&path, found)?;
            }
        } else if name.ends_with(".rs") {
            found.push(path);
        }
    }
    Ok(())
}

/// Every Rust source file of the workspace at `root`.
pub fn workspace_sources(root: &Path) -> Result<Vec<PathBuf>> {
    rust_files(root)
}

/// `path` relative to `root`, with `/` separators, for messages and rule matching.
pub fn relative(root: &Path, path: &Path) -> String {
    path.strip_prefix(root).unwrap_or(path).to_string_lossy().replace('\\', "/")
}
