//! Running other programs, with the command shown and a failure that names it.

use std::path::Path;
use std::process::Command;

use anyhow::{Context as _, Result, bail};

use crate::root;

/// Runs a command in the workspace root; an unsuccessful exit is an error.
pub fn check(mut command: Command) -> Result<()> {
    command.current_dir(root());
    let shown = format!("{command:?}");
    eprintln!("xtask: running {shown}");
    let status = command.status().with_context(|| format!("could not start {shown}"))?;
    if !status.success() {
        bail!("{shown} failed ({status})");
    }
    Ok(())
}

pub fn cargo(args: &[&str]) -> Result<()> {
    let mut command = Command::new(std::env::var("CARGO").unwrap_or_else(|_| "cargo".into()));
    command.args(args);
    check(command)
}

/// Runs a command to the end and exits with its status.
pub fn exec(mut command: Command) -> Result<()> {
    command.current_dir(root());
    let status = command.status().with_context(|| format!("could not start {command:?}"))?;
    std::process::exit(status.code().unwrap_or(1));
}

/// The browser tests: node's test runner over `tests/browser`, against the real
/// server binary and the built app.
pub fn browser_tests(dist: &Path, server: &Path) -> Result<()> {
    let folder = root().join("tests/browser");
    let mut command = Command::new("node");
    command
        .arg("--test")
        .arg("--test-concurrency=1")
        .arg(folder.join("offline_capture.test.mjs"))
        .arg(folder.join("photos.test.mjs"))
        .env("WRACKLINE_BIN", server)
        .env("WRACKLINE_APP_DIR", dist)
        .env("WRACKLINE_DEMO_PHOTOS", root().join("demo-records/photos"));
    check(command)
}

/// The phone-side benchmark: the 12 MP upload copy in headless Chromium.
pub fn browser_bench(dist: &Path, bench_wasm: &Path, server: &Path) -> Result<()> {
    let mut command = Command::new("node");
    command
        .arg(root().join("tests/browser/bench_prepare.mjs"))
        .env("WRACKLINE_BENCH_WASM", bench_wasm)
        .env("WRACKLINE_BIN", server)
        .env("WRACKLINE_APP_DIR", dist)
        .env("WRACKLINE_DEMO_PHOTOS", root().join("demo-records/photos"));
    check(command)
}
